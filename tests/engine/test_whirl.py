"""First bending critical speed of uniform compound tubes (Euler-Bernoulli) and the whirl gate."""

import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._whirl as whirl_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    WHIRL_SPEED_RATIO_LIMIT,
    EndSupport,
    LoadFlag,
    critical_speed,
    frequency_parameter,
    mass_per_length,
    whirl_check,
    whirl_gate_capacity,
    whirl_reserve,
)

SETTINGS = settings(max_examples=100, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)
STEEL_E, STEEL_RHO = 207e9, 7850.0


def test_docstring_examples():
    assert doctest.testmod(whirl_module).failed == 0


def _bisect(function, low, high, steps=200):
    """Plain bisection: a root of a continuous function that changes sign on [low, high]."""
    f_low = function(low)
    for _ in range(steps):
        middle = 0.5 * (low + high)
        f_middle = function(middle)
        if (f_middle < 0) == (f_low < 0):
            low, f_low = middle, f_middle
        else:
            high = middle
    return 0.5 * (low + high)


# Characteristic equations of a uniform Euler-Bernoulli beam (Blevins, Formulas for Natural
# Frequency and Mode Shape; any vibration text), first root x = beta L, bracketed by hand.
CHARACTERISTIC = {
    EndSupport.PINNED_PINNED: (lambda x: math.sin(x), 2.0, 4.0),
    EndSupport.FIXED_FIXED: (lambda x: math.cos(x) * math.cosh(x) - 1.0, 4.0, 5.5),
    EndSupport.FIXED_FREE: (lambda x: math.cos(x) * math.cosh(x) + 1.0, 1.0, 3.0),
    EndSupport.FIXED_PINNED: (lambda x: math.tan(x) - math.tanh(x), 3.2, 4.5),
}


@pytest.mark.parametrize("support", list(EndSupport))
def test_eigenvalues_are_roots_of_the_characteristic_equations(support):
    """(beta L)^2 tabulated to 3 decimals (Blevins, from memory) against the root of the
    characteristic equation found here by bisection (an independent numerical method)."""
    function, low, high = CHARACTERISTIC[support]
    root = _bisect(function, low, high)
    assert frequency_parameter(support) == pytest.approx(root**2, abs=6e-4)


def test_unknown_support_is_nan():
    assert np.isnan(frequency_parameter(0))
    assert np.isnan(frequency_parameter(9))


class TestSingleTube:
    @pytest.mark.parametrize("outer", [0.02, 0.08, 0.3])
    @pytest.mark.parametrize("ratio", [0.0, 0.6, 0.9])
    @pytest.mark.parametrize("length", [0.5, 2.0, 6.0])
    def test_pinned_ends_closed_form(self, outer, ratio, length):
        """omega = (pi / L)^2 sqrt(E I / m), simply supported uniform beam (Blevins; any
        vibration text); rtol 1e-12."""
        inner = ratio * outer
        ei = STEEL_E * math.pi / 64 * (outer**4 - inner**4)
        m = STEEL_RHO * math.pi / 4 * (outer**2 - inner**2)
        result = whirl_check([outer], [inner], [STEEL_E], [STEEL_RHO], length, np.nan)
        assert result.critical_speed[0] == pytest.approx((math.pi / length) ** 2
                                                         * math.sqrt(ei / m), rel=1e-12)

    def test_overhung_tube(self):
        """Fixed-free: omega = 3.516 / L^2 sqrt(E I / m) (Blevins, from memory)."""
        outer, inner, length = 0.05, 0.04, 1.2
        ei = STEEL_E * math.pi / 64 * (outer**4 - inner**4)
        m = STEEL_RHO * math.pi / 4 * (outer**2 - inner**2)
        result = whirl_check([outer], [inner], [STEEL_E], [STEEL_RHO], length, np.nan,
                             EndSupport.FIXED_FREE)
        assert result.critical_speed[0] == pytest.approx(3.516 / length**2 * math.sqrt(ei / m),
                                                         rel=1e-12)

    def test_finite_difference_beam(self):
        """Independent numerical method: central differences for E I w'''' = m omega^2 w on
        a pinned-pinned beam (w = w'' = 0 at the ends, so the operator is the square of the
        Dirichlet second difference); numpy's eigvalsh gives omega_1; rtol 1e-4 at 400 nodes."""
        outer, inner, length, n = 0.06, 0.05, 2.5, 400
        ei = STEEL_E * math.pi / 64 * (outer**4 - inner**4)
        m = STEEL_RHO * math.pi / 4 * (outer**2 - inner**2)
        h = length / (n + 1)
        second = (np.diag(-2.0 * np.ones(n)) + np.diag(np.ones(n - 1), 1)
                  + np.diag(np.ones(n - 1), -1)) / h**2
        lowest = np.linalg.eigvalsh(second @ second)[0]
        omega_fd = math.sqrt(ei / m * lowest)
        result = whirl_check([outer], [inner], [STEEL_E], [STEEL_RHO], length, np.nan)
        assert result.critical_speed[0] == pytest.approx(omega_fd, rel=1e-4)


class TestCompound:
    def test_sums_of_layers(self):
        """m = sum(rho_i A_i), sum(E I) over the layers (BRIEF section 2): an aluminium tube
        with a carbon over-wrap (invented moduli and densities)."""
        outer, inner = [0.060, 0.064], [0.052, 0.060]
        e, rho = [68.9e9, 100e9], [2700.0, 1550.0]
        ei = sum(ei_ * math.pi / 64 * (do**4 - di**4) for ei_, do, di in zip(e, outer, inner))
        m = sum(r * math.pi / 4 * (do**2 - di**2) for r, do, di in zip(rho, outer, inner))
        assert mass_per_length(outer, inner, rho)[0] == pytest.approx(m, rel=1e-12)
        result = whirl_check(outer, inner, e, rho, 3.0, np.nan, EndSupport.FIXED_FIXED)
        assert result.sum_ei[0] == pytest.approx(ei, rel=1e-12)
        assert result.critical_speed[0] == pytest.approx(22.373 / 9.0 * math.sqrt(ei / m),
                                                         rel=1e-12)


class TestReserveAndGate:
    def test_margin_rule(self):
        """Run at no more than 0.70 of the first critical (common practice)."""
        assert WHIRL_SPEED_RATIO_LIMIT == 0.70
        assert whirl_reserve(100.0, 70.0) == pytest.approx(1.0, rel=1e-12)
        assert whirl_reserve(100.0, -35.0) == pytest.approx(2.0, rel=1e-12)
        assert whirl_reserve(100.0, 0.0) == np.inf

    def test_gate(self):
        """+inf passes (never governs a torque), 0 fails (governs at any torque); NaN
        (no speed) counts as no limit, like an absent twist limit."""
        gate = whirl_gate_capacity([1.0, 1.5, 0.99, np.nan])
        assert list(gate) == [np.inf, np.inf, 0.0, np.inf]

    def test_check_fails_above_the_limit(self):
        base = whirl_check([0.05], [0.04], [STEEL_E], [STEEL_RHO], 2.0, np.nan)
        omega_1 = base.critical_speed[0]
        result = whirl_check([[0.05], [0.05]], [[0.04], [0.04]], [[STEEL_E]], [[STEEL_RHO]], 2.0,
                             [0.69 * omega_1, 0.71 * omega_1])
        assert list(result.passes) == [True, False]
        assert list(result.gate_capacity) == [np.inf, 0.0]
        assert result.part_flags[1] == LoadFlag.SPEED_ABOVE_WHIRL_LIMIT
        assert result.speed_ratio[0] == pytest.approx(0.69, rel=1e-12)

    def test_no_speed_is_a_note(self):
        result = whirl_check([0.05], [0.04], [STEEL_E], [STEEL_RHO], 2.0, np.nan)
        assert result.part_flags[0] == LoadFlag.SPEED_NOT_GIVEN
        assert result.valid[0] and result.passes[0]
        assert np.isfinite(result.critical_speed[0])


class TestFlags:
    @pytest.mark.parametrize(("kwargs", "flag"), [
        (dict(density=[0.0]), LoadFlag.DENSITY_NOT_POSITIVE),
        (dict(youngs_modulus=[-1.0]), LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE),
        (dict(length=0.0), LoadFlag.LENGTH_NOT_POSITIVE),
        (dict(support=7), LoadFlag.SUPPORT_UNKNOWN),
        (dict(speed=np.inf), LoadFlag.SPEED_NOT_FINITE),
    ])
    def test_errors(self, kwargs, flag):
        values = dict(outer_diameter=[0.05], inner_diameter=[0.0], youngs_modulus=[STEEL_E],
                      density=[STEEL_RHO], length=1.0, speed=100.0)
        values.update(kwargs)
        result = whirl_check(**values)
        assert result.part_flags[0] & flag
        assert not result.valid[0] and not result.passes[0]
        assert np.isnan(result.critical_speed[0]) and np.isnan(result.gate_capacity[0])


@SETTINGS
@given(st.floats(0.005, 0.5, **finite), st.floats(0.0, 0.95, **finite),
       st.floats(0.1, 20.0, **finite), st.floats(0.1, 10.0, **finite),
       st.sampled_from(list(EndSupport)))
def test_critical_speed_scales_as_one_over_length_squared(outer, ratio, length, scale, support):
    one = critical_speed(1e5, 10.0, length, support)
    other = critical_speed(1e5, 10.0, length * scale, support)
    assert other == pytest.approx(one / scale**2, rel=1e-12)
    full = whirl_check([outer], [ratio * outer], [STEEL_E], [STEEL_RHO], length, np.nan, support)
    longer = whirl_check([outer], [ratio * outer], [STEEL_E], [STEEL_RHO], length * scale,
                         np.nan, support)
    assert longer.critical_speed[0] == pytest.approx(full.critical_speed[0] / scale**2, rel=1e-12)


@SETTINGS
@given(st.lists(st.tuples(st.floats(0.01, 0.3, **finite), st.floats(0.0, 0.9, **finite),
                          st.floats(0.2, 10.0, **finite), st.floats(0.0, 2000.0, **finite),
                          st.sampled_from(list(EndSupport))), min_size=2, max_size=6),
       st.data())
def test_one_part_alone_equals_the_same_part_in_a_batch(batch, data):
    outer = [[b[0]] for b in batch]
    inner = [[b[0] * b[1]] for b in batch]
    together = whirl_check(outer, inner, [[STEEL_E]], [[STEEL_RHO]], [b[2] for b in batch],
                           [b[3] for b in batch], [int(b[4]) for b in batch])
    pick = data.draw(st.integers(0, len(batch) - 1))
    b = batch[pick]
    alone = whirl_check([b[0]], [b[0] * b[1]], [STEEL_E], [STEEL_RHO], b[2], b[3], b[4])
    assert alone.critical_speed[0] == together.critical_speed[pick]
    assert alone.reserve[0] == together.reserve[pick]


class TestEdges:
    """whirl_check's stated rules at their edges. The steel tube is the demo's: 60/40 mm,
    1.2 m between pinned ends; sum(EI) and m are written here by their textbook forms."""

    OUTER, INNER, SPAN = [[0.060]], [[0.040]], 1.2

    def _check(self, speed=100.0, **kw):
        args = dict(outer_diameter=kw.pop("outer", self.OUTER), inner_diameter=kw.pop("inner", self.INNER),
                    youngs_modulus=kw.pop("modulus", [[STEEL_E]]), density=kw.pop("density", [[STEEL_RHO]]),
                    length=kw.pop("length", self.SPAN), speed=speed)
        args.update(kw)
        return whirl_check(**args)

    def test_unknown_support_codes_give_nan(self):
        assert np.isnan(frequency_parameter(len(whirl_module._FIRST_EIGENVALUE)))
        assert np.isnan(frequency_parameter(0)) and np.isnan(frequency_parameter(-1))

    def test_an_absent_slot_weighs_nothing(self):
        # m = rho pi/4 (Do^2 - Di^2) of the one layer present; the absent slot holds numbers
        got = mass_per_length([[0.060, 0.080]], [[0.040, 0.060]], [[STEEL_RHO, 8900.0]],
                              present=[[True, False]])
        assert got[0] == pytest.approx(STEEL_RHO * math.pi / 4 * (0.060**2 - 0.040**2), rel=1e-12)

    def test_a_reserve_of_exactly_one_passes(self):
        ratio = float(self._check().speed_ratio[0])
        check = self._check(ratio_limit=ratio)  # reserve = ratio / ratio = 1.0 exactly
        assert check.reserve[0] == 1.0 and bool(check.passes[0])
        assert not (int(check.part_flags[0]) & int(LoadFlag.SPEED_ABOVE_WHIRL_LIMIT))

    def test_any_positive_material_is_a_material_and_infinity_is_not(self):
        assert bool(self._check(modulus=[[0.5]], density=[[0.5]]).valid[0])
        for field, flag in (("modulus", LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE),
                            ("density", LoadFlag.DENSITY_NOT_POSITIVE)):
            check = self._check(**{field: [[np.inf]]})
            assert int(check.part_flags[0]) & int(flag) and not bool(check.valid[0])

    def test_an_infinite_span_is_refused(self):
        check = self._check(length=np.inf)
        assert int(check.part_flags[0]) & int(LoadFlag.LENGTH_NOT_POSITIVE) and not bool(check.valid[0])

    def test_a_given_bending_stiffness_is_used(self):
        ei = STEEL_E * math.pi / 64 * (0.060**4 - 0.040**4)
        computed = self._check()
        given = self._check(sum_bending_stiffness=ei)
        assert given.sum_ei[0] == pytest.approx(ei, rel=1e-15)
        assert given.critical_speed[0] == pytest.approx(computed.critical_speed[0], rel=1e-12)
        halved = self._check(sum_bending_stiffness=ei / 4)  # omega_1 grows with sqrt(EI)
        assert halved.critical_speed[0] == pytest.approx(computed.critical_speed[0] / 2, rel=1e-12)

    @pytest.mark.parametrize("field, value, shape", [("length", [1.0, 2.0, 3.0], "(3,)"),
                                                     ("speed", [1.0, 2.0, 3.0], "(3,)"),
                                                     ("sum_bending_stiffness", [1.0, 2.0, 3.0], "(3,)")])
    def test_per_part_inputs_of_the_wrong_length_are_named(self, field, value, shape):
        two = dict(outer=[[0.06], [0.06]], inner=[[0.04], [0.04]], modulus=[[STEEL_E], [STEEL_E]],
                   density=[[STEEL_RHO], [STEEL_RHO]])
        kw = {field: value} if field != "speed" else {}
        with pytest.raises(ValueError) as error:
            self._check(speed=value if field == "speed" else 100.0, **two, **kw)
        assert str(error.value) == f"{field} must hold one value or one per part (2); got shape {shape}"

    def test_support_of_the_wrong_shape_is_named(self):
        with pytest.raises(ValueError) as error:
            self._check(outer=[[0.06], [0.06]], inner=[[0.04], [0.04]], modulus=[[STEEL_E], [STEEL_E]],
                        density=[[STEEL_RHO], [STEEL_RHO]], support=np.ones((2, 1), int))
        assert str(error.value) == "support must hold one value or one per part (2); got shape (2, 1)"

    def test_the_result_is_frozen_and_counts_its_parts(self):
        check = self._check(outer=[[0.06], [0.06]], inner=[[0.04], [0.04]], modulus=[[STEEL_E], [STEEL_E]],
                            density=[[STEEL_RHO], [STEEL_RHO]])
        assert check.n_parts == 2
        with pytest.raises(AttributeError):
            check.reserve = None  # type: ignore[misc]
