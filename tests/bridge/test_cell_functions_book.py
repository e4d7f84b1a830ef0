"""The cell-functions sample book evaluated headless (`twistshare share`) against the engine.

The book's formulas are evaluated by our small evaluator with their cell and range arguments;
the expected numbers are computed here from the same inputs with the closed forms (Roark's
Formulas for Stress and Strain, torsion of circular sections: J = π/32·(Do⁴ − Di⁴), one twist
rate θ' = T/ΣGJ, τ = G·r·θ'); the governing limit is the smallest capacity (common practice) and
the margin the governing limit over the demand, less one. Only the materials' shear moduli are
taken from the library (its data, not its arithmetic).
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import numpy as np
import openpyxl
import pytest
from twistshare.engine.cells import list_functions
from twistshare.engine.core import find_material
from twistshare.workbook_bridge.commands import main

ROOT = Path(__file__).resolve().parents[2]
BOOK = ROOT / "sample_books" / "marrowby_cell_functions.xlsx"


@pytest.fixture(scope="module")
def shared(tmp_path_factory):
    out = tmp_path_factory.mktemp("cells") / "shared.xlsx"
    assert main(["handout", str(BOOK), "-o", str(out), "-q"]) == 0
    return openpyxl.load_workbook(out)["Shaft MPD-S-061"]


@pytest.fixture(scope="module")
def expected():
    g = [80e9, find_material("Aluminium bronze C95400 as cast").shear_modulus,
         find_material("Stainless 316 annealed").shear_modulus]
    od, idd = np.array([48, 52, 58]) * 1e-3, np.array([0, 48, 52]) * 1e-3
    tau = [650e6 / (math.sqrt(3) * 2), 55.6e6, 51.2e6]  # distortion energy, FS 2; the two given
    kt = [1.5, 1.0, 1.0]
    torque = 1.25 * 45e3 / (2950 * 2 * math.pi / 60)  # T = SF·P/ω
    j = math.pi / 32 * (od**4 - idd**4)
    sum_gj = float(np.sum(np.array(g) * j))
    # each layer's capacity τa·ΣGJ/(G·ro·Kt) and the twist limit's φ·ΣGJ/L
    caps = [tau[i] * sum_gj / (g[i] * od[i] / 2 * kt[i]) for i in range(3)]
    twist_cap = math.radians(0.25) * sum_gj / 0.8
    return {"g": g, "od": od, "j": j, "sum_gj": sum_gj, "torque": torque, "tau": tau, "kt": kt,
            "caps": caps, "twist_cap": twist_cap}


def test_torque_from_power(shared, expected):
    assert shared["B20"].value == pytest.approx(expected["torque"], rel=1e-12)


def test_shares_capacities_and_stresses(shared, expected):
    e = expected
    theta = e["torque"] / e["sum_gj"]
    for i, row in enumerate((24, 25, 26)):
        share = e["g"][i] * e["j"][i] / e["sum_gj"]
        cap = e["tau"][i] * e["sum_gj"] / (e["g"][i] * e["od"][i] / 2 * e["kt"][i])
        stress = e["g"][i] * e["od"][i] / 2 * theta
        assert shared[f"B{row}"].value == pytest.approx(share, rel=1e-9)
        assert shared[f"C{row}"].value == pytest.approx(cap, rel=1e-9)
        assert shared[f"D{row}"].value == pytest.approx(stress / 1e6, rel=1e-9)


def test_governing_limit_margin_and_twist(shared, expected):
    e = expected
    governing = min(e["caps"] + [e["twist_cap"]])
    assert shared["B29"].value == pytest.approx(governing, rel=1e-9)
    assert shared["B31"].value == pytest.approx(100 * (governing / e["torque"] - 1), rel=1e-9)  # Margin [%]
    phi = expected["torque"] * 0.8 / expected["sum_gj"]  # φ = T·L/ΣGJ
    assert shared["B32"].value == pytest.approx(math.degrees(phi), rel=1e-9)
    assert shared["B33"].value == pytest.approx(math.degrees(phi / 0.8), rel=1e-9)
    # Exactly what governs, from the hand method (the smallest capacity governs, common
    # practice): each layer's τa·ΣGJ/(G·ro·Kt) against the twist limit's φ·ΣGJ/L.
    caps, twist_cap = e["caps"], e["twist_cap"]
    if twist_cap < min(caps):
        assert shared["B30"].value == "twist angle limit"
    else:
        k = caps.index(min(caps))
        assert shared["B30"].value == f"layer {k + 1} stress ({shared[f'B{6 + k}'].value})"


def test_stress_jumps_at_the_interface(shared, expected):
    theta = expected["torque"] / expected["sum_gj"]
    assert shared["B34"].value == pytest.approx(expected["g"][0] * 0.024 * theta / 1e6, rel=1e-9)
    assert shared["B35"].value == pytest.approx(expected["g"][1] * 0.024 * theta / 1e6, rel=1e-9)


def test_allowables_by_rule(shared):
    assert shared["B38"].value == pytest.approx(241 / (math.sqrt(3) * 2.5), rel=1e-12)  # von Mises
    assert shared["B39"].value == pytest.approx(0.5 * 205 / 2, rel=1e-12)  # Tresca


def test_readme_lists_every_cell_function():
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    for fn in list_functions():
        assert re.search(rf"`{fn['name']}`\(", readme), fn["name"]
