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


def test_interference_at_temperature_from_the_assembly_temperature():
    # The interference at the operating temperature: δ + (α_shaft − α_sleeve)·(T_op − T_asm)·d
    # (thermal expansion of each member's diameter, BRIEF §2); the same-material Lamé pressure
    # and slip torque then as above (Shigley's). Assembled warm at 40 °C, run at 80 °C.
    d, do, delta, length, mu = 0.040, 0.060, 0.030e-3, 0.050, 0.12
    alpha_shaft, alpha_sleeve = 11.7e-6, 17.3e-6  # steel and stainless (from memory)
    more = dict(expansion_coefficient=[[alpha_shaft, alpha_sleeve]], operating_temperature=[353.15],
                assembly_temperature=[313.15])
    r = rate(_stack(d, do), _duty(), inputs=_inputs(delta, length, mu, **more))
    hot = delta + (alpha_shaft - alpha_sleeve) * (353.15 - 313.15) * d
    p = E * hot * (do**2 - d**2) / (2 * d * do**2)
    share = (do**4 - d**4) / do**4
    expected = math.pi / 2 * mu * p * d**2 * length / share
    assert r.criterion_capacity[Criterion.INTERFACE_SLIP][0, 1] == pytest.approx(expected, rel=1e-9)
    # without the assembly temperature the change is counted from 20 °C: a larger loss
    del more["assembly_temperature"]
    r20 = rate(_stack(d, do), _duty(), inputs=_inputs(delta, length, mu, **more))
    from_20 = delta + (alpha_shaft - alpha_sleeve) * (353.15 - 293.15) * d
    assert r20.criterion_capacity[Criterion.INTERFACE_SLIP][0, 1] == pytest.approx(expected * from_20 / hot,
                                                                                    rel=1e-9)


def _fit_stress_capacity(d, do, p, sy_over_fs):
    """Section torque at which each layer of a same-material shrink fit reaches Sy/FS by distortion
    energy, checked at both faces of each layer: Lamé stresses of a solid shaft (σr = σθ = −p)
    and of a sleeve pressed at its bore (σθ = p(do² + d²)/(do² − d²), σr = −p at the bore;
    σθ = 2pd²/(do² − d²), σr = 0 outside) (Shigley's, thick-walled cylinders), with
    τ = G·r·T/ΣGJ; σ_vm² = σθ² − σθσr + σr² + 3τ²."""
    sum_gj = G * math.pi * do**4 / 32
    def torque(r, s_theta, s_r):
        tau = math.sqrt(max(sy_over_fs**2 - (s_theta**2 - s_theta * s_r + s_r**2), 0.0) / 3)
        return tau * sum_gj / (G * r)
    shaft = torque(d / 2, -p, -p)
    sleeve = min(torque(d / 2, p * (do**2 + d**2) / (do**2 - d**2), -p),
                 torque(do / 2, 2 * p * d**2 / (do**2 - d**2), 0.0))
    return shaft, sleeve


def test_fit_stress_capacity_by_distortion_energy_with_a_factor_of_safety_per_layer():
    d, do, delta, length, mu, sy = 0.040, 0.060, 0.030e-3, 0.050, 0.12, 600e6
    p = E * delta * (do**2 - d**2) / (2 * d * do**2)
    for fs in ([[1.0, 1.0]], [[1.0, 2.0]], [[1.5, 1.0]]):
        r = rate(_stack(d, do), _duty(), inputs=_inputs(delta, length, mu, factor_of_safety=fs))
        shaft, sleeve = (_fit_stress_capacity(d, do, p, sy / fs[0][k])[k] for k in (0, 1))
        got = r.criterion_capacity[Criterion.FIT_STRESS][0]
        assert got.tolist() == pytest.approx([shaft, sleeve], rel=1e-9)
    # a blank factor of safety is 1
    blank = rate(_stack(d, do), _duty(), inputs=_inputs(delta, length, mu))
    one = rate(_stack(d, do), _duty(), inputs=_inputs(delta, length, mu, factor_of_safety=[[1.0, 1.0]]))
    assert blank.criterion_capacity[Criterion.FIT_STRESS].tolist() == one.criterion_capacity[
        Criterion.FIT_STRESS].tolist()


def test_inputs_of_other_criteria_alone_start_no_interface_check():
    # E and ν given for buckling, no interference and no bond: one +inf per part, as with no inputs
    r = rate(_stack(0.04, 0.06, n=2), _duty(2), inputs=dict(youngs_modulus=[[E, E]] * 2,
                                                             poisson_ratio=[[NU, NU]] * 2))
    # and an interference column left blank (a template's) is no interface either
    blank = rate(_stack(0.04, 0.06, n=2), _duty(2), inputs=dict(interference=[[np.nan, np.nan]] * 2,
                                                                 bond_allowable=[[np.nan, np.nan]] * 2))
    for got in (r, blank):
        for c in (Criterion.INTERFACE_SLIP, Criterion.BOND_SHEAR, Criterion.FIT_STRESS):
            assert got.criterion_capacity[c].shape == (2,) and np.isinf(got.criterion_capacity[c]).all()
