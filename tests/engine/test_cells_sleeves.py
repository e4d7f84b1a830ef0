"""Cell functions for fits, bonds and the plastic reserve (engine/cells/_functions_sleeves.py).

Closed forms: Lamé contact pressure of a fit (BRIEF §2; Shigley's Mechanical Engineering
Design, press and shrink fits), the same-material solid-shaft form p = E·δ·(do² − d²)/(2·d·do²);
slip torque (π/2)·μ·p·d²·L; average bond shear T/(2π·r²·L); fully plastic torque of a solid
round bar 2π/3·τy·r³ and first yield π/2·τy·r³, ratio 4/3 (Timoshenko, Strength of
Materials, elastic–perfectly plastic torsion).
"""

from __future__ import annotations

import math

import pytest
from twistshare.engine.cells import (
    TWS_BOND_STRESS,
    TWS_FIT_PRESSURE,
    TWS_PLASTIC_TORQUE,
    TWS_SLIP_TORQUE,
    TWS_TORQUE_TWIST,
    registry,
)

MATS = [["Material", "G [GPa]", "Yield strength [MPa]", "Allowable shear [MPa]"],
        ["Marrowby core", 80, 400, 200]]  # invented demo material (BRIEF §4)


def test_registered():
    names = {f.name for f in registry()}
    assert {"TWS_FIT_PRESSURE", "TWS_SLIP_TORQUE", "TWS_BOND_STRESS", "TWS_PLASTIC_TORQUE",
            "TWS_TORQUE_TWIST"} <= names


@pytest.mark.parametrize("delta_mm, d_mm, do_mm", [(0.02, 40, 60), (0.05, 80, 130), (0.01, 20, 32)])
def test_fit_pressure_same_material_closed_form(delta_mm, d_mm, do_mm):
    e = 207e9
    d, do, delta = d_mm / 1e3, do_mm / 1e3, delta_mm / 1e3
    expected = e * delta * (do**2 - d**2) / (2 * d * do**2) / 1e6  # Shigley's, MPa
    got = TWS_FIT_PRESSURE(f"{delta_mm} mm", f"{d_mm} mm", f"{do_mm} mm", "207 GPa", 0.3)
    assert got == pytest.approx(expected, rel=1e-12)


def test_fit_pressure_of_a_hollow_inner_member_is_lame():
    # two materials, hollow inner member: the general Lamé form written out (BRIEF §2)
    d, di, do, delta = 0.05, 0.02, 0.08, 0.04e-3
    eo, nuo, ei, nui = 110e9, 0.34, 207e9, 0.30
    expected = delta / (d * ((1 / eo) * ((do**2 + d**2) / (do**2 - d**2) + nuo)
                             + (1 / ei) * ((d**2 + di**2) / (d**2 - di**2) - nui)))
    got = TWS_FIT_PRESSURE("0.04 mm", "50 mm", "80 mm", "110 GPa", 0.34, "20 mm", "207 GPa", 0.30,
                           "Pa")
    assert got == pytest.approx(expected, rel=1e-12)


def test_slip_torque_closed_form():
    got = TWS_SLIP_TORQUE("28.75 MPa", 0.12, "40 mm", "50 mm")
    assert got == pytest.approx(math.pi / 2 * 0.12 * 28.75e6 * 0.04**2 * 0.05, rel=1e-12)


def test_bond_stress_is_the_average():
    got = TWS_BOND_STRESS("400 N·m", "40 mm", "30 mm")
    assert got == pytest.approx(400 / (2 * math.pi * 0.02**2 * 0.03) / 1e6, rel=1e-12)


def test_fully_plastic_over_first_yield_of_a_solid_bar():
    layers = [["Material", "Outer diameter [mm]", "Inner diameter [mm]"], ["Marrowby core", 40, None]]
    tau_y = 400e6 / math.sqrt(3)  # distortion energy (textbook factor 1/√3)
    plastic = TWS_PLASTIC_TORQUE(layers, None, None, MATS)
    assert plastic == pytest.approx(2 * math.pi / 3 * tau_y * 0.02**3, rel=1e-12)
    curve = TWS_TORQUE_TWIST(layers, "max shear", 50, "rad/m", None, MATS)
    assert curve[0] == ["twist per length [rad/m]", "torque [N·m]"]
    torques = [row[1] for row in curve[1:]]
    assert torques == sorted(torques)  # the curve never falls
    first_yield = math.pi / 2 * 200e6 * 0.02**3  # max shear 0.5·Sy
    assert max(torques) < 4 / 3 * first_yield
    assert max(torques) > first_yield


@pytest.mark.parametrize("call, words", [
    (lambda: TWS_SLIP_TORQUE("28 MPa", 3, "40 mm", "50 mm"), "friction: 3 is outside the plausible range"),
    (lambda: TWS_FIT_PRESSURE("0.02 mm", "70 mm", "60 mm", "207 GPa", 0.3), "no fit"),
    (lambda: TWS_BOND_STRESS("400 N·m", "40 kg", "30 mm"), "bond diameter"),
    (lambda: TWS_TORQUE_TWIST([["Material", "Outer diameter [mm]"], ["Marrowby core", 40]], None, 2.5,
                              None, None, MATS), "points"),
])
def test_bad_arguments_say_why(call, words):
    got = call()
    assert isinstance(got, str) and got.startswith("⚠") and words in got


FIT_MATS = [["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Yield strength [MPa]", "Allowable shear [MPa]"],
            ["Marrowby core", 79.6, 207, 0.3, 400, 200]]
FIT_BLOCK = [["Material", "Outer diameter [mm]", "Inner diameter [mm]", "Interference [mm]", "Fit length [mm]",
              "Friction"],
             ["Marrowby core", 40, None, None, None, None], ["Marrowby core", 60, 40, 0.02, 50, 0.12]]


def test_a_layer_block_with_a_fit_is_governed_by_its_slip():
    # Shigley's same-material closed form, passed by the sleeve's share (twist compatibility)
    from twistshare.engine.cells import TWS_GOVERNING_LIMIT, TWS_GOVERNS
    d, do = 0.04, 0.06
    p = 207e9 * 0.02e-3 * (do**2 - d**2) / (2 * d * do**2)
    expected = math.pi / 2 * 0.12 * p * d**2 * 0.05 / ((do**4 - d**4) / do**4)
    assert TWS_GOVERNING_LIMIT(FIT_BLOCK, None, None, None, None, FIT_MATS) == pytest.approx(expected, rel=1e-9)
    assert TWS_GOVERNS(FIT_BLOCK, None, None, None, FIT_MATS).startswith("slip of the fit between layers 1 and 2")


def test_a_fit_missing_its_length_is_refused_not_ignored():
    from twistshare.engine.cells import TWS_GOVERNING_LIMIT
    block = [row[:] for row in FIT_BLOCK]
    block[2][4] = None
    got = TWS_GOVERNING_LIMIT(block, None, None, None, None, FIT_MATS)
    assert isinstance(got, str) and "a fit input is missing or out of range" in got
