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
from twistshare.engine.core import AllowableRule, Criterion, Duty, LayerStack, rate

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
