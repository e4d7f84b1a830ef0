"""Interface slip, bond shear and fit stress as criteria of `rate` (engine/core/_interface_criteria.py).

Closed forms: same-material shrink fit on a solid shaft, p = E·δ·(do² − d²)/(2·d·do²)
(Shigley's Mechanical Engineering Design, press and shrink fits, same material, solid shaft);
slip torque (π/2)·μ·p·d²·L (BRIEF §2, Shigley's). Torque passed through the core: the
sleeve's share GJ_sleeve/ΣGJ crosses the interface (twist compatibility, BRIEF §2).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from twistshare.engine.core import Criterion, Duty, LayerStack, LoadPath, rate

E, NU = 207e9, 0.3
G = E / (2 * (1 + NU))


def _stack(d, do, n=1):
    return LayerStack(outer_diameter=[[d, do]] * n, inner_diameter=[[0.0, d]] * n,
                      shear_modulus=[[G, G]] * n, allowable_shear=[[300e6, 300e6]] * n,
                      stress_concentration=[[1.0, 1.0]] * n, present=[[True, True]] * n)


def _duty(n=1):
    return Duty(torque=[100.0] * n, length=[0.5] * n, twist_limit_angle=[np.nan] * n,
                twist_limit_per_length=[np.nan] * n)


def _inputs(delta, length, mu, **more):
    nan = np.nan
    out = dict(interference=[[nan, delta]], fit_length=[[nan, length]], friction=[[nan, mu]],
               youngs_modulus=[[E, E]], poisson_ratio=[[NU, NU]], yield_strength=[[600e6, 600e6]])
    out.update(more)
    return out


@pytest.mark.parametrize("d, do, delta, length, mu", [
    (0.040, 0.060, 0.02e-3, 0.050, 0.12),
    (0.030, 0.045, 0.015e-3, 0.040, 0.15),
    (0.080, 0.130, 0.06e-3, 0.100, 0.10),
])
def test_slip_capacity_matches_the_same_material_closed_form(d, do, delta, length, mu):
    r = rate(_stack(d, do), _duty(), inputs=_inputs(delta, length, mu))
    p = E * delta * (do**2 - d**2) / (2 * d * do**2)  # Shigley's, same material, solid shaft
    slip = math.pi / 2 * mu * p * d**2 * length
    share = (do**4 - d**4) / do**4  # the sleeve's share of ΣGJ, same G
    got = r.criterion_capacity[Criterion.INTERFACE_SLIP][0, 1]
    assert got == pytest.approx(slip / share, rel=1e-9)
    assert r.governing_criterion[0] == Criterion.INTERFACE_SLIP  # small fit: slip governs
    assert r.governing_layer[0] == 1


def test_every_layer_driven_has_no_interface_limit():
    # every layer gripped at both ends: no interface passes torque (load path, BRIEF §2)
    r = rate(_stack(0.04, 0.06), _duty(),
             inputs=_inputs(0.02e-3, 0.05, 0.12, load_path=[float(LoadPath.THROUGH_EVERY_LAYER)]))
    assert np.isinf(r.criterion_capacity[Criterion.INTERFACE_SLIP][0, 1])
    assert r.governing_criterion[0] != Criterion.INTERFACE_SLIP


def test_no_interface_input_costs_one_infinite_value_per_part():
    r = rate(_stack(0.04, 0.06, n=3), _duty(3))
    for c in (Criterion.INTERFACE_SLIP, Criterion.BOND_SHEAR, Criterion.FIT_STRESS):
        values = r.criterion_capacity[c]
        assert values.shape == (3,) and np.isinf(values).all()
    assert (r.governing_criterion == Criterion.LAYER_STRESS).all()


def test_contact_lost_at_temperature_gives_zero_slip_capacity():
    # aluminium-like sleeve (α 23e-6/K, from memory) on steel (11.7e-6/K, from memory),
    # heated 150 K: the interference change (αi − αo)·ΔT·d = −0.069 mm exceeds 0.02 mm
    more = dict(expansion_coefficient=[[11.7e-6, 23e-6]], operating_temperature=[443.15],
                assembly_temperature=[293.15])
    r = rate(_stack(0.04, 0.06), _duty(), inputs=_inputs(0.02e-3, 0.05, 0.12, **more))
    assert r.criterion_capacity[Criterion.INTERFACE_SLIP][0, 1] == 0.0
    assert r.governing_criterion[0] == Criterion.INTERFACE_SLIP


def test_bond_capacity_is_the_average_shear_closed_form():
    # T_bond = τ·2π·r²·L (BRIEF §2), passed by the sleeve's share
    d, do, tau, length = 0.04, 0.06, 10e6, 0.03
    nan = np.nan
    r = rate(_stack(d, do), _duty(), inputs=dict(bond_allowable=[[nan, tau]],
                                                 bond_length=[[nan, length]]))
    share = (do**4 - d**4) / do**4
    expected = tau * 2 * math.pi * (d / 2) ** 2 * length / share
    assert r.criterion_capacity[Criterion.BOND_SHEAR][0, 1] == pytest.approx(expected, rel=1e-12)


def test_a_fit_input_in_error_is_not_a_capacity():
    # a negative fit length: the check cannot be made; NaN (never a silent +inf)
    r = rate(_stack(0.04, 0.06), _duty(), inputs=_inputs(0.02e-3, -0.05, 0.12))
    assert np.isnan(r.criterion_capacity[Criterion.INTERFACE_SLIP][0, 1])
