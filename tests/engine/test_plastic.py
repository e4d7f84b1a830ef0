"""Plastic reserve: elastic-perfectly-plastic torsion of compound shafts."""

import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._plastic as plastic_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    Duty,
    LayerStack,
    PlasticFlag,
    fully_plastic_torque,
    permanent_twist,
    plastic_reserve,
    plastic_torque,
    rate,
    residual_stress_profile,
    torque_twist_curve,
    twist_per_length_at_torque,
)

SETTINGS = settings(max_examples=60, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)
# Beer & Johnston, Mechanics of Materials, plastic deformations of circular shafts (standard
# mechanics-of-materials results, from memory): for a solid bar of radius c,
# T_Y = (pi/2) c^3 tau_y, T_p = (4/3) T_Y, and with an elastic core of radius rho
# T = (4/3) T_Y (1 - rho^3 / (4 c^3)).
BEER = "Beer & Johnston, Mechanics of Materials"


def _one(outer, inner, modulus, tau_y):
    as_row = lambda v: np.atleast_2d(np.asarray(v, dtype=float))  # noqa: E731
    outer = as_row(outer)
    return outer, as_row(inner), as_row(modulus), as_row(tau_y), np.ones(outer.shape, bool)


def test_docstring_examples():
    assert doctest.testmod(plastic_module).failed == 0


class TestClosedForms:
    @pytest.mark.parametrize("diameter", [0.01, 0.05, 0.3])
    @pytest.mark.parametrize("modulus", [26.9e9, 79.3e9])
    @pytest.mark.parametrize("tau_y", [50e6, 400e6])
    def test_solid_bar_reserve_is_four_thirds(self, diameter, modulus, tau_y):
        """Beer & Johnston: T_Y = (pi/2) c^3 tau_y and T_p / T_Y = 4/3. rtol 1e-12."""
        reserve = plastic_reserve(*_one([diameter], [0.0], [modulus], [tau_y]))
        c = diameter / 2
        assert reserve.first_yield_torque[0] == pytest.approx(math.pi / 2 * c**3 * tau_y, rel=1e-12)
        assert reserve.reserve_ratio[0] == pytest.approx(4 / 3, rel=1e-12)
        assert reserve.first_yield_layer[0] == 0

    @pytest.mark.parametrize("k", [0.2, 0.5, 0.8, 0.95])
    def test_tube_reserve(self, k):
        """Beer & Johnston for a tube, radius ratio k: T_Y = (pi/2) tau_y (c^4 - (kc)^4)/c and
        T_p = (2 pi/3) tau_y (c^3 - (kc)^3), so T_p / T_Y = (4/3)(1 - k^3)/(1 - k^4). rtol 1e-12."""
        reserve = plastic_reserve(*_one([0.08], [0.08 * k], [79.3e9], [150e6]))
        assert reserve.reserve_ratio[0] == pytest.approx(4 / 3 * (1 - k**3) / (1 - k**4), rel=1e-12)

    @pytest.mark.parametrize("core_fraction", [1.0, 0.9, 0.6, 0.3, 0.05])
    def test_partial_yield_of_a_solid_bar(self, core_fraction):
        """Beer & Johnston: T = (4/3) T_Y (1 - rho^3 / (4 c^3)) at the twist rate that leaves
        an elastic core of radius rho = tau_y / (G theta'). rtol 1e-12."""
        c, g, tau_y = 0.03, 79.3e9, 200e6
        rho = core_fraction * c
        t_y = math.pi / 2 * c**3 * tau_y
        got = plastic_torque([tau_y / (g * rho)], *_one([2 * c], [0.0], [g], [tau_y]))
        assert got[0] == pytest.approx(4 / 3 * t_y * (1 - rho**3 / (4 * c**3)), rel=1e-12)

    def test_residual_surface_stress_after_full_plasticity(self):
        """Beer & Johnston, residual stresses: unloading a solid bar from T_p leaves
        tau_y - (4/3) tau_y = -tau_y/3 at the surface, against the sense of the torque that
        was applied, and tau_y - (2/3) tau_y = +tau_y/3 at half the radius. rtol 1e-12."""
        c, g, tau_y = 0.025, 80e9, 120e6
        layers = _one([2 * c], [0.0], [g], [tau_y])
        t_p = fully_plastic_torque(layers[0], layers[1], layers[3], layers[4])
        radius, stress, flags = residual_stress_profile(t_p, *layers, points_per_layer=3)
        assert stress[0, 0, 2] == pytest.approx(-tau_y / 3, rel=1e-12)
        assert stress[0, 0, 1] == pytest.approx(tau_y / 3, rel=1e-12)
        assert radius[0, 0, 2] == pytest.approx(c, rel=1e-15)
        assert flags[0] == 0
        # A negative torque leaves the mirror image.
        _, mirrored, _ = residual_stress_profile(-t_p, *layers, points_per_layer=3)
        assert mirrored[0, 0, 2] == pytest.approx(tau_y / 3, rel=1e-12)

    @pytest.mark.parametrize("ratio", [1.05, 1.2, 1.3])
    def test_permanent_twist_of_a_solid_bar(self, ratio):
        """Beer & Johnston: at T = r T_Y the elastic core is rho = c (4 - 3 r)^(1/3) and the
        twist rate tau_y / (G rho); unloading removes T / (G J). rtol 1e-10."""
        c, g, tau_y, length = 0.02, 79.3e9, 180e6, 1.5
        t_y = math.pi / 2 * c**3 * tau_y
        rho = c * (4 - 3 * ratio) ** (1 / 3)
        j = math.pi / 2 * c**4
        expected = (tau_y / (g * rho) - ratio * t_y / (g * j)) * length
        angle, flags = permanent_twist([ratio * t_y], [length], *_one([2 * c], [0.0], [g], [tau_y]))
        assert angle[0] == pytest.approx(expected, rel=1e-10)
        assert flags[0] == 0

    def test_no_permanent_twist_below_first_yield(self):
        angle, _ = permanent_twist([100.0], [2.0], *_one([0.05], [0.0], [79.3e9], [150e6]))
        assert angle[0] == 0.0


class TestCompound:
    STACK = ([0.05, 0.06], [0.0, 0.05], [79.3e9, 41.4e9], [180e6, 80e6])

    def test_first_yield_layer_by_hand(self):
        """Each layer yields at its outer radius at theta'_i = tau_y,i / (G_i r_o,i):
        core 180 MPa / (79.3 GPa x 25 mm) = 0.0908 rad/m, sleeve 80 MPa / (41.4 GPa x 30 mm)
        = 0.0644 rad/m: the sleeve yields first."""
        reserve = plastic_reserve(*_one(*self.STACK))
        assert reserve.first_yield_layer[0] == 1
        assert reserve.first_yield_twist_per_length[0] == pytest.approx(80e6 / (41.4e9 * 0.03), rel=1e-12)

    def test_first_yield_equals_the_elastic_layer_capacity(self):
        """The elastic engine's governing layer capacity with the allowable set to tau_y and
        no Kt is the first-yield torque (twist compatibility, the same physics)."""
        outer, inner, modulus, tau_y = self.STACK
        rating = rate(LayerStack.from_layers(outer, inner, modulus, tau_y), Duty.from_arrays(torque=1.0))
        reserve = plastic_reserve(*_one(*self.STACK))
        assert reserve.first_yield_torque[0] == pytest.approx(rating.governing_capacity[0], rel=1e-12)
        assert reserve.first_yield_layer[0] == rating.governing_layer[0]

    def test_fully_plastic_torque_by_hand(self):
        """sum 2 pi/3 tau_y (r_o^3 - r_i^3): 2 pi/3 (180e6 x 0.025^3 + 80e6 x (0.03^3 - 0.025^3))."""
        expected = 2 * math.pi / 3 * (180e6 * 0.025**3 + 80e6 * (0.03**3 - 0.025**3))
        outer, inner, _, tau_y = self.STACK
        got = fully_plastic_torque([outer], [inner], [tau_y], [[True, True]])
        assert got[0] == pytest.approx(expected, rel=1e-12)

    @pytest.mark.parametrize("ratio", [0.5, 1.5, 3.0, 12.0])
    def test_curve_against_numerical_integration(self, ratio):
        """Independent numerical method: T = sum of integral tau(r) 2 pi r^2 dr with
        tau = min(G_i r theta', tau_y,i), by the trapezoid rule (numpy.trapezoid) on 200 001
        points per layer with each elastic-core radius inserted. rtol 1e-8."""
        outer = [0.03, 0.042, 0.05]
        inner = [0.008, 0.03, 0.042]
        modulus = [79.3e9, 41.4e9, 73.1e9]
        tau_y = [200e6, 90e6, 140e6]
        layers = _one(outer, inner, modulus, tau_y)
        theta = ratio * plastic_reserve(*layers).first_yield_twist_per_length[0]
        total = 0.0
        for i in range(3):
            a, b = inner[i] / 2, outer[i] / 2
            rho = tau_y[i] / (modulus[i] * theta)
            r = np.union1d(np.linspace(a, b, 200_001), [min(max(rho, a), b)])
            tau = np.minimum(modulus[i] * r * theta, tau_y[i])
            total += np.trapezoid(tau * 2 * np.pi * r**2, r)
        assert plastic_torque([theta], *layers)[0] == pytest.approx(total, rel=1e-8)

    def test_reverse_yield_of_a_soft_sleeve_is_flagged(self):
        """A weak sleeve on a strong core, loaded near T_p: the spring-back G_s r_o T/sum(GJ)
        is far above twice the sleeve's yield, so it yields in reverse (Bauschinger and
        reverse yield are outside the elastic-unloading model)."""
        layers = _one([0.05, 0.07], [0.0, 0.05], [80e9, 40e9], [400e6, 30e6])
        t_p = fully_plastic_torque(layers[0], layers[1], layers[3], layers[4])
        _, stress, flags = residual_stress_profile(0.95 * t_p, *layers)
        assert flags[0] & PlasticFlag.REVERSE_YIELD_ON_UNLOADING
        assert abs(stress[0, 1, 1]) > 30e6

    def test_above_fully_plastic_has_no_answer(self):
        layers = tuple(np.repeat(a, 2, axis=0) for a in _one(*self.STACK))
        t_p = fully_plastic_torque(layers[0], layers[1], layers[3], layers[4])[0]
        theta, flags = twist_per_length_at_torque([1.01 * t_p, t_p], *layers)
        assert np.isnan(theta[0]) and flags[0] & PlasticFlag.TORQUE_ABOVE_PLASTIC
        assert np.isinf(theta[1]) and flags[1] == 0

    def test_unusable_layer_is_flagged_and_nan(self):
        reserve = plastic_reserve([[0.05, 0.06]], [[0.0, 0.05]], [[79e9, -1.0]], [[1e8, 1e8]],
                                  [[True, True]])
        assert np.isnan(reserve.fully_plastic_torque[0])
        assert reserve.flags[0] & PlasticFlag.LAYER_INPUT_INVALID

    def test_curve_shape_and_arguments(self):
        theta, torque = torque_twist_curve(*_one(*self.STACK), n_points=7)
        assert theta.shape == torque.shape == (1, 7)
        assert theta[0, 0] == 0 and torque[0, 0] == 0
        with pytest.raises(ValueError, match="n_points must be at least 2; got 1"):
            torque_twist_curve(*_one(*self.STACK), n_points=1)
        with pytest.raises(ValueError, match="max_twist_ratio must be positive; got 0"):
            torque_twist_curve(*_one(*self.STACK), max_twist_ratio=0)


@st.composite
def parts(draw, max_layers=4):
    n = draw(st.integers(1, max_layers))
    core = draw(st.floats(0.005, 0.3, **finite))
    bore = draw(st.one_of(st.just(0.0), st.floats(0.05, 0.9, **finite))) * core
    outer = [core]
    for _ in range(n - 1):
        outer.append(outer[-1] + 2 * draw(st.floats(0.0005, 0.05, **finite)))
    inner = [bore] + outer[:-1]
    modulus = draw(st.lists(st.floats(5e9, 120e9, **finite), min_size=n, max_size=n))
    tau_y = draw(st.lists(st.floats(10e6, 600e6, **finite), min_size=n, max_size=n))
    return outer, inner, modulus, tau_y


def _batch(many, width=4):
    arrays = [np.full((len(many), width), np.nan) for _ in range(4)]
    present = np.zeros((len(many), width), bool)
    for row, part in enumerate(many):
        n = len(part[0])
        for array, values in zip(arrays, part):
            array[row, :n] = values
        present[row, :n] = True
    return (*arrays, present)


@SETTINGS
@given(parts())
def test_plastic_torque_exceeds_first_yield(part):
    reserve = plastic_reserve(*_one(*part))
    assert reserve.fully_plastic_torque[0] > reserve.first_yield_torque[0]
    assert reserve.reserve_ratio[0] > 1.0


@SETTINGS
@given(parts(), st.floats(1.0, 30.0, **finite))
def test_curve_never_falls_and_stays_below_full_plasticity(part, reach):
    layers = _one(*part)
    _, torque = torque_twist_curve(*layers, n_points=40, max_twist_ratio=reach)
    plastic = plastic_reserve(*layers).fully_plastic_torque[0]
    assert np.all(np.diff(torque[0]) >= -1e-12 * plastic)
    assert torque[0, -1] <= plastic * (1 + 1e-12)


@SETTINGS
@given(parts(), st.floats(0.01, 0.999, **finite))
def test_twist_at_torque_inverts_the_curve(part, fraction):
    layers = _one(*part)
    torque = fraction * plastic_reserve(*layers).fully_plastic_torque
    theta, flags = twist_per_length_at_torque(torque, *layers)
    assert flags[0] == 0
    assert plastic_torque(theta, *layers)[0] == pytest.approx(torque[0], rel=1e-10)


@SETTINGS
@given(parts(), st.floats(0.05, 0.99, **finite))
def test_residual_stresses_carry_no_torque(part, fraction):
    """Self-equilibrium after unloading: the residual stresses integrate to zero torque
    (trapezoid rule on 2001 points per layer, numpy.trapezoid; the profile is piecewise
    linear, so only the kink at each elastic core is approximated)."""
    layers = _one(*part)
    torque = fraction * plastic_reserve(*layers).fully_plastic_torque
    radius, stress, _ = residual_stress_profile(torque, *layers, points_per_layer=2001)
    moment = sum(np.trapezoid(stress[0, i] * 2 * np.pi * radius[0, i] ** 2, radius[0, i])
                 for i in range(len(part[0])))
    scale = torque[0]
    assert abs(moment) <= 1e-5 * scale


@SETTINGS
@given(st.lists(parts(), min_size=2, max_size=5), st.floats(0.1, 0.95, **finite))
def test_one_part_alone_equals_the_same_part_in_a_batch(many, fraction):
    outer, inner, modulus, tau_y, present = _batch(many)
    together = plastic_reserve(outer, inner, modulus, tau_y, present)
    _, curve = torque_twist_curve(outer, inner, modulus, tau_y, present, n_points=9)
    torque = fraction * together.fully_plastic_torque
    twist, _ = permanent_twist(torque, 1.0, outer, inner, modulus, tau_y, present)
    for row in range(len(many)):
        one = tuple(a[row:row + 1] for a in (outer, inner, modulus, tau_y, present))
        alone = plastic_reserve(*one)
        assert alone.fully_plastic_torque[0] == together.fully_plastic_torque[row]
        assert alone.first_yield_torque[0] == together.first_yield_torque[row]
        np.testing.assert_array_equal(torque_twist_curve(*one, n_points=9)[1][0], curve[row])
        assert permanent_twist(torque[row:row + 1], 1.0, *one)[0][0] == pytest.approx(twist[row], rel=1e-12)


class TestInputEdges:
    """The documented ranges at their edges (NaN for a part with an unusable layer), and the
    closed forms of Beer & Johnston (as above) for the smallest sections."""

    def test_any_positive_yield_gives_the_closed_form(self):
        # T_p = (2 pi / 3) tau_y c^3 for a solid bar, for tau_y = 0.5 Pa as for 250 MPa.
        c = 0.01
        got = fully_plastic_torque(*_one(2 * c, 0.0, 80e9, 0.5)[:2], [[0.5]], [[True]])
        assert got[0] == pytest.approx(2 * math.pi / 3 * 0.5 * c**3, rel=1e-12)

    @pytest.mark.parametrize("outer, inner, modulus, tau_y", [
        (0.02, 0.02, 80e9, 250e6),   # no wall
        (0.02, 0.0, 0.0, 250e6),     # no stiffness
        (0.02, 0.0, 80e9, 0.0),      # no yield strength
    ])
    def test_an_unusable_layer_gives_nan(self, outer, inner, modulus, tau_y):
        args = _one(outer, inner, modulus, tau_y)
        assert np.isnan(plastic_reserve(*args).fully_plastic_torque[0])

    def test_an_absent_slot_adds_nothing(self):
        alone = _one([0.03, 0.04], [0.0, 0.03], [80e9, 40e9], [200e6, 100e6])
        padded = (np.array([[0.03, 0.04, np.nan]]), np.array([[0.0, 0.03, np.nan]]),
                  np.array([[80e9, 40e9, np.nan]]), np.array([[200e6, 100e6, np.nan]]),
                  np.array([[True, True, False]]))
        one, two = plastic_reserve(*alone), plastic_reserve(*padded)
        assert two.fully_plastic_torque[0] == pytest.approx(one.fully_plastic_torque[0], rel=1e-15)
        assert two.first_yield_torque[0] == pytest.approx(one.first_yield_torque[0], rel=1e-15)
        theta = plastic_torque([[0.5 * float(one.first_yield_twist_per_length[0])]], *padded[:4], padded[4])
        expected = plastic_torque([[0.5 * float(one.first_yield_twist_per_length[0])]], *alone)
        assert theta[0, 0] == pytest.approx(expected[0, 0], rel=1e-15)

    def test_one_dimensional_inputs_are_refused_by_name(self):
        with pytest.raises(ValueError) as error:
            fully_plastic_torque([0.02], [0.0], [250e6], [True])
        assert str(error.value) == "plastic torsion needs (parts, layers) arrays; got shape (1,)"


class TestResidualOfAPartlyYieldedWire:
    """A 1 mm wire, tau_y = 100 MPa, loaded between T_Y and T_p and unloaded: the surface,
    at tau_y when loaded, springs back by T c / J (Beer & Johnston, residual stresses)."""

    C = 0.5e-3
    TAU_Y = 100e6

    def _args(self):
        return _one(2 * self.C, 0.0, 80e9, self.TAU_Y)

    @pytest.mark.parametrize("sign", [1.0, -1.0])
    def test_surface_residual(self, sign):
        t_y = math.pi / 2 * self.C**3 * self.TAU_Y  # about 0.0196 N*m: under 1 N*m
        torque = sign * 1.2 * t_y
        j = math.pi / 2 * self.C**4
        radius, stress, _ = residual_stress_profile([torque], *self._args())
        assert radius.shape == (1, 1, 2)  # the default: each layer's inner and outer radius
        assert radius[0, 0, -1] == pytest.approx(self.C, rel=1e-12)
        expected = sign * (self.TAU_Y - abs(torque) * self.C / j)
        assert stress[0, 0, -1] == pytest.approx(expected, rel=1e-9)

    def test_too_few_points_are_refused_by_name(self):
        with pytest.raises(ValueError) as error:
            residual_stress_profile([0.01], *self._args(), points_per_layer=1)
        assert str(error.value) == "points_per_layer must be at least 2; got 1"


class TestContracts:
    """What the functions promise beyond the closed forms: the defaults, the refusals word for
    word, the Newton slope, a record that cannot be altered, the reverse-yield threshold."""

    STACK = ([0.05, 0.07], [0.0, 0.05], [80e9, 40e9], [400e6, 30e6])

    def test_the_newton_slope_is_the_elastic_cores_stiffness(self):
        # dT/dtheta' = sum G_i (pi/2)(rho_i^4 - a_i^4): checked against a central difference of
        # the torque itself (an independent numerical method), in the elastic range, with the
        # sleeve partly yielded and with both layers partly yielded.
        outer, inner, modulus, tau_y = (np.array([v]) for v in self.STACK)
        a, b = inner / 2, outer / 2
        theta_sleeve = 30e6 / (40e9 * 0.035)
        for theta in (0.5 * theta_sleeve, 1.7 * theta_sleeve, 12.0 * theta_sleeve):
            grid = np.array([[theta]])
            _, slope = plastic_module._torque_and_tangent(grid, a, b, modulus, tau_y, tangent=True)
            h = 1e-6 * theta
            up = plastic_torque([theta + h], outer, inner, modulus, tau_y, [[True, True]])[0]
            down = plastic_torque([theta - h], outer, inner, modulus, tau_y, [[True, True]])[0]
            assert slope[0, 0] == pytest.approx((up - down) / (2 * h), rel=1e-6), theta
            rho = np.clip(tau_y / (modulus * theta), a, b)
            hand = float(np.sum(modulus * math.pi / 2 * (rho**4 - a**4)))
            assert slope[0, 0] == pytest.approx(hand, rel=1e-12), theta

    def test_the_reserve_record_cannot_be_altered(self):
        import dataclasses
        reserve = plastic_reserve(*_one(*self.STACK))
        with pytest.raises(dataclasses.FrozenInstanceError):
            reserve.reserve_ratio = np.array([2.0])

    def test_a_part_not_rated_has_no_first_yield_layer(self):
        # documented: -1 if not rated (a layer with no wall); the good part beside it is rated
        reserve = plastic_reserve([[0.05, 0.07], [0.05, 0.07]], [[0.0, 0.05], [0.0, 0.07]],
                                  [[80e9, 40e9]] * 2, [[400e6, 30e6]] * 2, [[True, True]] * 2)
        assert reserve.first_yield_layer.tolist() == [1, -1]

    def test_the_curve_defaults_to_fifty_points_to_four_times_first_yield(self):
        layers = _one(*self.STACK)
        theta_y = plastic_reserve(*layers).first_yield_twist_per_length[0]
        theta, torque = torque_twist_curve(*layers)
        assert theta.shape == torque.shape == (1, 50)
        assert theta[0, -1] == pytest.approx(4.0 * theta_y, rel=1e-15)
        assert theta[0, 1] == pytest.approx(4.0 * theta_y / 49, rel=1e-12)

    def test_two_points_are_enough_and_one_is_refused_word_for_word(self):
        layers = _one(*self.STACK)
        theta_y = plastic_reserve(*layers).first_yield_twist_per_length[0]
        theta, _ = torque_twist_curve(*layers, n_points=2, max_twist_ratio=1.0)
        assert theta[0].tolist() == [0.0, pytest.approx(theta_y, rel=1e-15)]
        with pytest.raises(ValueError) as error:
            torque_twist_curve(*layers, n_points=1)
        assert str(error.value) == "n_points must be at least 2; got 1"
        with pytest.raises(ValueError) as error:
            torque_twist_curve(*layers, max_twist_ratio=-0.5)
        assert str(error.value) == "max_twist_ratio must be positive; got -0.5"

    def test_the_axis_carries_no_residual_stress_after_full_plasticity(self):
        # tau = G r theta' is 0 on the axis at every finite twist (common practice), so the
        # limit at the fully plastic torque is 0 there too, not tau_y and not NaN; the surface
        # is at -tau_y/3 (Beer & Johnston, as above)
        layers = _one([0.05], [0.0], [80e9], [120e6])
        t_p = fully_plastic_torque(layers[0], layers[1], layers[3], layers[4])
        radius, stress, flags = residual_stress_profile(t_p, *layers, points_per_layer=5)
        assert radius[0, 0, 0] == 0.0 and stress[0, 0, 0] == 0.0
        assert stress[0, 0, -1] == pytest.approx(-40e6, rel=1e-12)
        assert flags[0] == 0

    def test_an_absent_slot_has_no_residual_profile(self):
        padded = (np.array([[0.05, np.nan]]), np.array([[0.0, np.nan]]), np.array([[80e9, np.nan]]),
                  np.array([[120e6, np.nan]]), np.array([[True, False]]))
        radius, stress, _ = residual_stress_profile([1.2 * math.pi / 2 * 0.025**3 * 120e6], *padded)
        assert np.isnan(stress[0, 1]).all() and np.isnan(radius[0, 1]).all()
        assert np.isfinite(stress[0, 0]).all()

    def test_reverse_yield_is_flagged_from_once_the_yield_not_twice(self):
        # The sleeve's outer fibre, at tau_y when loaded, springs back by G_s r_o T / sum(GJ)
        # (elastic unloading, Beer & Johnston, residual stresses). T is chosen so that the
        # spring-back is 2.5 tau_y: the residual is -1.5 tau_y, past yield but under 2 tau_y.
        layers = _one(*self.STACK)
        sum_gj = math.pi / 2 * (80e9 * 0.025**4 + 40e9 * (0.035**4 - 0.025**4))
        torque = 2.5 * 30e6 / (40e9 * 0.035) * sum_gj
        _, stress, flags = residual_stress_profile([torque], *layers)
        assert stress[0, 1, -1] == pytest.approx(30e6 - 2.5 * 30e6, rel=1e-9)
        assert flags[0] & PlasticFlag.REVERSE_YIELD_ON_UNLOADING
        # half that torque: the residual is tau_y - 1.25 tau_y, inside yield, no flag
        _, stress, flags = residual_stress_profile([0.5 * torque], *layers)
        assert stress[0, 1, -1] == pytest.approx(30e6 - 1.25 * 30e6, rel=1e-9)
        assert not flags[0] & PlasticFlag.REVERSE_YIELD_ON_UNLOADING
