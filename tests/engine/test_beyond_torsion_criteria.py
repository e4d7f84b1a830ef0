"""The criteria beyond torsion as `rate` lists them: inputs by name, +inf where not given.

Outside sources: torsional buckling of a long thin tube, tau = E/(3 sqrt 2 (1 - nu^2)^(3/4)) (t/r)^(3/2)
(Timoshenko & Gere, Theory of Elastic Stability, from memory) and of a moderate one,
0.85 Z^(3/4) pi^2 E/(12(1 - nu^2)) (t/L)^2 (Batdorf, from memory), the larger governing, with the
knock-down 0.67 (common practice); maximum-shear combination sqrt(sigma^2 + 4 tau^2) (textbook).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from twistshare.engine.core import AllowableRule, Criterion, Duty, EndSupport, LayerStack, rate, thin_walled

NEW = (Criterion.COMBINED_STRESS, Criterion.WHIRL, Criterion.TORSIONAL_BUCKLING)


def _stack(do, di, rule=AllowableRule.GIVEN):
    return LayerStack.from_arrays([[do]], [[di]], [[80e9]], [[100e6]], 1.0, allowable_rule=[[rule]])


def test_torsion_only_books_set_no_new_limit():
    stack = LayerStack.from_arrays([[0.04, 0.05]], [[0.0, 0.04]], [[80e9, 77e9]], [[120e6, 100e6]], 1.0,
                                   present=[[True, True]])
    r = rate(stack, Duty.from_arrays(1000.0, 1.0))
    for c in NEW:
        assert np.all(np.isinf(r.criterion_capacity[c])), c
    assert r.governing_criterion[0] == Criterion.LAYER_STRESS


def test_thin_tube_buckling_against_the_closed_forms():
    do, di, span, e, nu = 0.204, 0.200, 3.0, 200e9, 0.3
    r_mean, t = (do + di) / 4, (do - di) / 2
    long = e / (3 * math.sqrt(2) * (1 - nu**2) ** 0.75) * (t / r_mean) ** 1.5
    z = span**2 * math.sqrt(1 - nu**2) / (r_mean * t)
    moderate = 0.85 * z**0.75 * math.pi**2 * e / (12 * (1 - nu**2)) * (t / span) ** 2
    expected = 2 * math.pi * r_mean**2 * t * 0.67 * max(long, moderate) / 2.0
    inputs = {"youngs_modulus": np.array([[e]]), "poisson_ratio": np.array([[nu]]),
              "factor_of_safety": np.array([[2.0]])}
    r = rate(_stack(do, di), Duty.from_arrays(100.0, span), inputs=inputs)
    assert r.criterion_capacity[Criterion.TORSIONAL_BUCKLING][0] == pytest.approx(expected, rel=1e-9)


def test_thick_wall_is_not_checked_for_buckling():
    inputs = {"youngs_modulus": np.array([[200e9]]), "poisson_ratio": np.array([[0.3]])}
    r = rate(_stack(0.05, 0.04), Duty.from_arrays(100.0, 1.0), inputs=inputs)
    assert r.criterion_capacity[Criterion.TORSIONAL_BUCKLING][0] == math.inf


def test_moment_without_modulus_gives_no_capacity():
    # A load that cannot be checked must not pass silently: capacity 0, the criterion governs.
    r = rate(_stack(0.05, 0.04), Duty.from_arrays(100.0, 1.0), inputs={"bending_moment": np.array([50.0])})
    assert r.criterion_capacity[Criterion.COMBINED_STRESS][0, 0] == 0.0
    assert r.governing_criterion[0] == Criterion.COMBINED_STRESS


def test_bending_alone_beyond_the_allowable_gives_zero():
    # sigma = 32 M D / (pi (D^4 - d^4)) above 2 tau_a: no torque can be carried (max shear, textbook)
    k = math.pi * (0.05**4 - 0.04**4)
    moment = 2.2 * 100e6 * k / (32 * 0.05)
    inputs = {"bending_moment": np.array([moment]), "youngs_modulus": np.array([[200e9]])}
    r = rate(_stack(0.05, 0.04), Duty.from_arrays(100.0, 1.0), inputs=inputs)
    assert r.criterion_capacity[Criterion.COMBINED_STRESS][0, 0] == 0.0
    assert r.margin[0] == -1.0


def test_speed_without_properties_is_not_a_whirl_failure():
    r = rate(_stack(0.05, 0.04), Duty.from_arrays(100.0, 1.0), inputs={"speed": np.array([300.0])})
    assert r.criterion_capacity[Criterion.WHIRL][0] == math.inf


def test_unused_slots_are_nan_for_the_per_layer_criterion():
    stack = LayerStack.from_arrays([[0.05, np.nan]], [[0.04, np.nan]], [[80e9, np.nan]], [[100e6, np.nan]], 1.0,
                                   present=[[True, False]])
    inputs = {"bending_moment": np.array([100.0]), "youngs_modulus": np.array([[200e9, np.nan]])}
    cap = rate(stack, Duty.from_arrays(100.0, 1.0), inputs=inputs).criterion_capacity[Criterion.COMBINED_STRESS]
    assert np.isfinite(cap[0, 0]) and np.isnan(cap[0, 1])


def _buckling_expected(do, di, span, e, nu, fs):
    # The closed forms of the module notes (Timoshenko & Gere; Batdorf; knock-down 0.67).
    r_mean, t = (do + di) / 4, (do - di) / 2
    long = e / (3 * math.sqrt(2) * (1 - nu**2) ** 0.75) * (t / r_mean) ** 1.5
    z = span**2 * math.sqrt(1 - nu**2) / (r_mean * t)
    moderate = 0.85 * z**0.75 * math.pi**2 * e / (12 * (1 - nu**2)) * (t / span) ** 2
    return 2 * math.pi * r_mean**2 * t * 0.67 * max(long, moderate) / fs


def _two(do, di):
    return LayerStack.from_arrays([[do], [do]], [[di], [di]], [[80e9], [80e9]], [[100e6], [100e6]], 1.0)


class TestPartsThatCannotBeCheckedBesideOnesThatCan:
    """A batch rated together: each part's criteria are its own (+inf where not given)."""

    def test_an_unloaded_part_has_no_combined_limit_beside_a_loaded_one(self):
        inputs = {"bending_moment": np.array([400.0, np.nan]), "youngs_modulus": np.array([[200e9], [200e9]])}
        cap = rate(_two(0.05, 0.0), Duty.from_arrays([100.0, 100.0], 1.0), inputs=inputs).criterion_capacity[
            Criterion.COMBINED_STRESS]
        assert np.isfinite(cap[0, 0]) and cap[1, 0] == np.inf

    def test_an_axial_force_alone_is_a_load(self):
        inputs = {"axial_force": np.array([-200e3]), "youngs_modulus": np.array([[200e9]])}
        cap = rate(_stack(0.05, 0.0), Duty.from_arrays(100.0, 1.0), inputs=inputs).criterion_capacity[
            Criterion.COMBINED_STRESS]
        # sigma = F / A; maximum shear: tau_a^2 = (sigma/2)^2 + tau^2, tau = 16 T / (pi d^3)
        sigma = 200e3 / (math.pi / 4 * 0.05**2)
        tau = math.sqrt(100e6**2 - (sigma / 2) ** 2)
        assert cap[0, 0] == pytest.approx(tau * math.pi * 0.05**3 / 16, rel=1e-9)

    def test_buckling_where_the_properties_are_given_and_inf_where_not(self):
        do, di, span, e, nu = 0.204, 0.200, 3.0, 200e9, 0.3
        inputs = {"youngs_modulus": np.array([[e], [e], [e]]), "poisson_ratio": np.array([[nu], [np.nan], [0.7]])}
        stack = LayerStack.from_arrays([[do]] * 3, [[di]] * 3, [[80e9]] * 3, [[100e6]] * 3, 1.0)
        cap = rate(stack, Duty.from_arrays([100.0] * 3, [span, span, span]), inputs=inputs).criterion_capacity[
            Criterion.TORSIONAL_BUCKLING]
        # no factor of safety given: 1
        assert cap[0] == pytest.approx(_buckling_expected(do, di, span, e, nu, 1.0), rel=1e-9)
        assert cap[1] == np.inf  # no Poisson's ratio: not checked
        assert cap[2] == np.inf  # a Poisson's ratio the check refuses: no buckling limit from it

    def test_a_blank_factor_of_safety_is_one_and_a_given_one_divides(self):
        do, di, span, e, nu = 0.204, 0.200, 3.0, 200e9, 0.3
        inputs = {"youngs_modulus": np.array([[e], [e]]), "poisson_ratio": np.array([[nu], [nu]]),
                  "factor_of_safety": np.array([[np.nan], [2.5]])}
        cap = rate(_two(do, di), Duty.from_arrays([100.0, 100.0], span), inputs=inputs).criterion_capacity[
            Criterion.TORSIONAL_BUCKLING]
        assert cap[0] == pytest.approx(_buckling_expected(do, di, span, e, nu, 1.0), rel=1e-9)
        assert cap[1] == pytest.approx(_buckling_expected(do, di, span, e, nu, 2.5), rel=1e-9)

    def test_a_part_without_a_length_is_not_checked_for_buckling(self):
        do, di, e, nu = 0.204, 0.200, 200e9, 0.3
        inputs = {"youngs_modulus": np.array([[e], [e]]), "poisson_ratio": np.array([[nu], [nu]])}
        cap = rate(_two(do, di), Duty.from_arrays([100.0, 100.0], [3.0, np.nan]), inputs=inputs).criterion_capacity[
            Criterion.TORSIONAL_BUCKLING]
        assert np.isfinite(cap[0]) and cap[1] == np.inf

    def test_buckling_in_a_batch_of_thin_thick_and_solid_parts(self):
        """Thin walls (mean radius / wall >= 10, common practice) get the closed forms, each
        with its own span and factor of safety; thick and solid parts +inf beside them, even
        with an E the check would refuse."""
        parts = [  # outer, inner, span, E, FS
            (0.204, 0.200, 3.0, 200e9, 2.0),   # r/t = 50.5: checked
            (0.100, 0.060, 3.0, 200e9, 1.0),   # r/t = 2: thick
            (0.300, 0.296, 0.8, 70e9, 1.5),    # r/t = 74.5: checked, a short span
            (0.050, 0.000, 3.0, 200e9, 1.0),   # solid
            (0.100, 0.060, 3.0, -5.0, 1.0),    # thick, E out of range: not checked either
            (0.110, 0.100, 1.0, 200e9, 1.0),   # r/t = 10.5: checked
        ]
        stack = LayerStack.from_arrays([[p[0]] for p in parts], [[p[1]] for p in parts],
                                       [[80e9]] * 6, [[100e6]] * 6, 1.0)
        inputs = {"youngs_modulus": np.array([[p[3]] for p in parts]),
                  "poisson_ratio": np.full((6, 1), 0.3),
                  "factor_of_safety": np.array([[p[4]] for p in parts])}
        cap = rate(stack, Duty.from_arrays([100.0] * 6, [p[2] for p in parts]),
                   inputs=inputs).criterion_capacity[Criterion.TORSIONAL_BUCKLING]
        for i, (do, di, span, e, fs) in enumerate(parts):
            if i in (0, 2, 5):
                assert cap[i] == pytest.approx(_buckling_expected(do, di, span, e, 0.3, fs), rel=1e-9)
            else:
                assert cap[i] == np.inf, i
        assert thin_walled([[p[0]] for p in parts], [[p[1]] for p in parts],
                           np.ones((6, 1), bool)).tolist() == [True, False, True, False, False, True]

    def test_the_end_support_changes_the_whirl_gate(self):
        # omega_1 = beta^2 sqrt(EI / m) / L^2: beta^2 = pi^2 pinned-pinned, 3.516 fixed-free
        # (Blevins, Formulas for Natural Frequency and Mode Shape; from memory).
        do, span, e, rho = 0.05, 1.0, 200e9, 7850.0
        omega_pinned = math.pi**2 * math.sqrt(e * math.pi / 64 * do**4 / (rho * math.pi / 4 * do**2)) / span**2
        speed = 0.5 * omega_pinned  # ratio 0.5 pinned (passes), 0.5 * 9.87 / 3.516 = 1.4 fixed-free
        inputs = {"speed": np.array([speed, speed]), "youngs_modulus": np.array([[e], [e]]),
                  "density": np.array([[rho], [rho]]), "end_support": np.array([np.nan, float(EndSupport.FIXED_FREE)])}
        cap = rate(_two(do, 0.0), Duty.from_arrays([100.0, 100.0], span), inputs=inputs).criterion_capacity[
            Criterion.WHIRL]
        assert cap[0] == np.inf and cap[1] == 0.0
