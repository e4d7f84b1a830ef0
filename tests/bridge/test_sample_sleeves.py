"""The sample catalogue's rebuilt, sleeved shafts show the slip and bond checks when rated.

Outside sources: the contact pressure of a shrink fit between a solid shaft and a hub of
different materials, p = δ / (d·[(1/Eo)((do²+d²)/(do²−d²) + νo) + (1/Ei)(1 − νi)]), and the slip
torque (π/2)·μ·p·d²·L (Shigley's Mechanical Engineering Design, press and shrink fits); the
interface of a core-driven part passes the sleeve's share G·J/ΣG·J (twist compatibility, BRIEF
§2); the average bond shear T/(2·π·r²·L) (BRIEF §2). The parts and the works' own materials are
invented (Marrowby Pump & Drive, BRIEF §4); the adhesive's allowable is the library's (typical,
from memory).
"""

from __future__ import annotations

import math
from pathlib import Path

import openpyxl
import pytest
from twistshare.engine.core import adhesive_library, material_library
from twistshare.workbook_bridge.commands import main

CATALOGUE = Path(__file__).resolve().parents[2] / "sample_books" / "marrowby_catalogue.xlsx"


@pytest.fixture(scope="module")
def rows(tmp_path_factory):
    out = tmp_path_factory.mktemp("sample_sleeves") / "rated.xlsx"
    assert main(["rate", str(CATALOGUE), "-o", str(out), "-q", "--lenient"]) == 0
    sheet = openpyxl.load_workbook(out)["Twistshare results"]
    head = [c.value for c in sheet[1]]
    return {r[0]: dict(zip(head, r)) for r in sheet.iter_rows(min_row=2, values_only=True)}


def _sleeve_share(g_core, g_sleeve, d, do):
    core, sleeve = g_core * d**4, g_sleeve * (do**4 - d**4)
    return sleeve / (core + sleeve)


def test_the_shrink_fitted_duplex_sleeve_is_limited_by_slip(rows):
    # The works' own MPD core steel Q2 (E 207 GPa, nu 0.29, G 80 GPa) and MPD duplex sleeve
    # (E 200 GPa, nu 0.30, G 77 GPa), as the sample's Materials sheet gives them.
    d, do, delta, length, mu = 0.050, 0.062, 0.03e-3, 0.050, 0.14
    p = delta / (d * ((1 / 200e9) * ((do**2 + d**2) / (do**2 - d**2) + 0.30) + (1 / 207e9) * (1 - 0.29)))
    slip = math.pi / 2 * mu * p * d**2 * length / _sleeve_share(80e9, 77e9, d, do)
    row = rows["MPD-S-030"]
    assert row["Capacity: slip of a fit [N·m]"] == pytest.approx(slip, rel=1e-9)
    assert row["Governs"].startswith("slip of the fit between layers 1 and 2")
    assert row["Status"] == "ok"


def test_the_hot_stainless_sleeve_loses_grip_and_fails_by_slip(rows):
    row = rows["MPD-S-031"]
    assert row["Status"] == "FAILS"
    assert row["Governs"].startswith("slip of the fit between layers 1 and 2")


def test_the_bonded_sleeve_shows_its_bond_capacity_and_the_clamped_one_none(rows):
    # Library AISI 1045 core and aluminium-bronze sleeve, their G as the library gives them.
    row = rows["MPD-S-032"]
    lib = material_library()
    g_core = lib["AISI 1045 hot rolled"].shear_modulus
    g_sleeve = lib["Aluminium bronze C95400 as cast"].shear_modulus
    allowable = adhesive_library()["toughened epoxy"].allowable
    own = allowable * 2 * math.pi * 0.0275**2 * 0.045  # torque the bond itself allows
    expected = own / _sleeve_share(g_core, g_sleeve, 0.055, 0.062)
    assert row["Capacity: average bond shear [N·m]"] == pytest.approx(expected, rel=1e-9)
    assert row["Status"] == "ok"
    clamped = rows["MPD-S-033"]
    assert clamped["Load path"] == "every layer"
    assert clamped["Capacity: average bond shear [N·m]"] is None
