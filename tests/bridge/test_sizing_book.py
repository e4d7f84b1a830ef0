"""Sizing through both front ends: a parts table rated by `twistshare rate`, and the cell functions.

Books are built here with openpyxl and read back with openpyxl. Expected values come from closed
forms computed in the test, never from the engine: the torsion formula of a solid shaft
tau = 16 T / (pi d^3) (any mechanics-of-materials text; Roark's Formulas for Stress and Strain,
torsion of circular sections), and for compound shafts the twist-compatibility capacity
T_cap,i = tau_a,i * sum(G J) / (G_i * r_o,i), J = pi/32 (Do^4 - Di^4) (BRIEF §2; Timoshenko,
Strength of Materials, composite shafts). Demo data is the invented Marrowby Pump & Drive
scenario; no number describes a real part.
"""

from __future__ import annotations

import math
import warnings

import numpy as np
import openpyxl
import pytest
from twistshare.engine.cells import TWS_RESTORE_SLEEVE, TWS_SIZE_FOR, TWS_STOCK_SIZE
from twistshare.workbook_bridge.commands import main

CORE, SLEEVE = "MPD core steel S9", "MPD bronze sleeve B4"
G_CORE, TAU_CORE = 80e9, 60e6  # Pa, invented
G_SLEEVE, TAU_SLEEVE = 40e9, 50e6
MATERIALS = [["Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule"],
             [CORE, 80, 60, "given"], [SLEEVE, 40, 50, "given"]]
HEADER = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
          "Layer 1 inner diameter [mm]", "Layer 2 material", "Layer 2 outer diameter [mm]",
          "Layer 2 inner diameter [mm]", "Size", "Target reserve factor", "Stock sizes [mm]", "Outer layers"]
TOL_MM = 0.001  # the default tolerance on a solved size


def solid_diameter(torque, target, allowable):
    """d = (16 T RF / (pi tau_a))^(1/3): the torsion formula solved for d (Roark's)."""
    return (16.0 * torque * target / (math.pi * allowable)) ** (1.0 / 3.0)


def capacity(outer, inner, moduli, allowables):
    """Governing stress capacity of concentric layers, twist compatibility (BRIEF §2, Timoshenko)."""
    outer, inner = np.asarray(outer, float), np.asarray(inner, float)
    moduli, allowables = np.asarray(moduli, float), np.asarray(allowables, float)
    gj = moduli * math.pi / 32.0 * (outer**4 - inner**4)
    return float(np.min(allowables * gj.sum() / (moduli * outer / 2.0)))


def _two_layer_rf(od2, torque):
    return capacity([0.040, od2], [0.0, 0.040], [G_CORE, G_SLEEVE], [TAU_CORE, TAU_SLEEVE]) / torque


ROWS = [
    # 0: solid shaft, solved for its diameter
    ["MPD-S-101", 500, 1000, CORE, 50, None, None, None, None, "layer 1 outer diameter", 1.5, None, None],
    # 1: steel core 40 mm, bronze sleeve: the sleeve's outer diameter with a stock list
    ["MPD-S-102", 500, 2000, CORE, 40, None, SLEEVE, 60, 40, "layer 2 outer diameter", 1.2,
     "55, 58, 60, 63, 65, 70", None],
    # 2-4: bad sizing inputs, one each
    ["MPD-S-103", 500, 2000, CORE, 40, None, SLEEVE, 60, 40, "layer 2 diametre", 1.2, None, None],
    ["MPD-S-104", 500, 2000, CORE, 40, None, SLEEVE, 60, 40, "layer 2 wall", -1.5, None, None],
    ["MPD-S-105", 500, 2000, CORE, 40, None, SLEEVE, 60, 40, "layer 2 wall", 1.5, "60; sixty-three", None],
    # 5: no sizing asked
    ["MPD-S-106", 500, 2000, CORE, 40, None, SLEEVE, 60, 40, None, None, None, None],
]


def _load(path):
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        return openpyxl.load_workbook(path)


@pytest.fixture(scope="module")
def rated(tmp_path_factory):
    folder = tmp_path_factory.mktemp("sizing")
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Materials"
    for row in MATERIALS:
        ws.append(row)
    parts = wb.create_sheet("Parts")
    parts.append(HEADER)
    for row in ROWS:
        parts.append(row)
    src = folder / "marrowby_sizing.xlsx"
    wb.save(src)
    out = folder / "rated.xlsx"
    code = main(["rate", str(src), "-o", str(out), "-q"])
    book = _load(out)
    sheet = book["Twistshare sizing"]
    head = [c.value for c in sheet[1]]
    sizing = {r[0]: dict(zip(head, r)) for r in sheet.iter_rows(min_row=2, values_only=True)
              if r[0] and str(r[0]).startswith("MPD-")}
    res = book["Twistshare results"]
    rhead = [c.value for c in res[1]]
    results = {r[0]: dict(zip(rhead, r)) for r in res.iter_rows(min_row=2, values_only=True) if r[0]}
    return {"code": code, "book": book, "sizing": sizing, "results": results}


def _block(od_mm, inner_mm=None):
    return [["Material", "Outer diameter [mm]", "Inner diameter [mm]"], [CORE, od_mm, inner_mm]]


class TestSolidShaft:
    """The solid shaft solved through the book and through the cell function: the same diameter."""

    def test_book_gives_the_torsion_formula(self, rated):
        exact = solid_diameter(1000.0, 1.5, TAU_CORE) * 1e3  # mm
        row = rated["sizing"]["MPD-S-101"]
        assert row["Sizing status"] == "solved"
        assert exact - 1e-9 <= row["Solved size [mm]"] <= exact + TOL_MM + 1e-9
        assert row["Reserve factor at the solved size"] == pytest.approx(1.5, rel=1e-4)
        assert row["Governs at the solved size"].startswith("layer 1 stress")

    def test_cell_function_agrees_with_the_book(self, rated):
        got = TWS_SIZE_FOR(_block(50), "1000 N·m", "outer diameter", 1.5,
                           materials=MATERIALS)
        assert isinstance(got, float), got
        assert got == pytest.approx(rated["sizing"]["MPD-S-101"]["Solved size [mm]"], abs=1e-9)
        assert got == pytest.approx(solid_diameter(1000.0, 1.5, TAU_CORE) * 1e3, abs=TOL_MM)

    def test_result_unit(self):
        got = TWS_SIZE_FOR(_block(50), "1000 N·m", "core outer diameter", 1.5, result_unit="in",
                           materials=MATERIALS)
        # 1 in = 25.4 mm exactly (international inch)
        assert got == pytest.approx(solid_diameter(1000.0, 1.5, TAU_CORE) / 0.0254, abs=TOL_MM / 25.4)


class TestTwoLayers:
    """A steel core with a bronze sleeve: the core governs (its G·r is the larger), so the sleeve's
    outer diameter is solved until the core's capacity reaches the target."""

    def test_solved_size_rerated_meets_the_target(self, rated):
        row = rated["sizing"]["MPD-S-102"]
        assert row["Sizing status"] == "solved"
        od2 = row["Solved size [mm]"] * 1e-3
        # re-rated by hand: within the tolerance of the target, on the safe side
        assert _two_layer_rf(od2, 2000.0) >= 1.2 * (1 - 1e-9)
        assert _two_layer_rf(od2 - TOL_MM * 1e-3, 2000.0) < 1.2
        # which layer governs, by hand: the smaller of the two capacities
        gj = [G_CORE * math.pi / 32 * 0.040**4, G_SLEEVE * math.pi / 32 * (od2**4 - 0.040**4)]
        core = TAU_CORE * sum(gj) / (G_CORE * 0.020)
        sleeve = TAU_SLEEVE * sum(gj) / (G_SLEEVE * od2 / 2)
        expected = "layer 1 stress" if core < sleeve else "layer 2 stress"
        assert row["Governs at the solved size"].startswith(expected)

    def test_stock_size_holds_and_one_down_does_not(self, rated):
        row = rated["sizing"]["MPD-S-102"]
        stock = [55, 58, 60, 63, 65, 70]
        chosen = row["Stock size chosen [mm]"]
        assert row["Stock status"] == "stock size found"
        assert chosen in stock
        assert _two_layer_rf(chosen * 1e-3, 2000.0) >= 1.2
        assert row["Reserve factor at the stock size"] == pytest.approx(_two_layer_rf(chosen * 1e-3, 2000.0),
                                                                        rel=1e-9)
        below = stock[stock.index(chosen) - 1]
        assert _two_layer_rf(below * 1e-3, 2000.0) < 1.2

    def test_cell_functions_agree(self, rated):
        block = [["Material", "Outer diameter [mm]", "Inner diameter [mm]"], [CORE, 40, None], [SLEEVE, 60, 40]]
        size = TWS_SIZE_FOR(block, "2000 N·m", "layer 2 outer diameter", 1.2, materials=MATERIALS)
        assert size == pytest.approx(rated["sizing"]["MPD-S-102"]["Solved size [mm]"], abs=1e-9)
        stock = TWS_STOCK_SIZE(block, "2000 N·m", "layer 2 outer diameter", "55, 58, 60, 63, 65, 70 mm", 1.2,
                               materials=MATERIALS)
        assert stock == rated["sizing"]["MPD-S-102"]["Stock size chosen [mm]"]

    def test_wall_and_diameter_are_the_same_answer(self):
        block = [["Material", "Outer diameter [mm]", "Inner diameter [mm]"], [CORE, 40, None], [SLEEVE, 60, 40]]
        od = TWS_SIZE_FOR(block, "2000 N·m", "layer 2 outer diameter", 1.2, materials=MATERIALS)
        wall = TWS_SIZE_FOR(block, "2000 N·m", "sleeve wall", 1.2, materials=MATERIALS)
        # wall = (Do - Di) / 2 (geometry)
        assert wall == pytest.approx((od - 40) / 2, abs=TOL_MM)


class TestRestore:
    """A 60 mm solid steel shaft turned down to 54 mm and sleeved with bronze: the restored section,
    rated by hand, has the original capacity tau_a pi D^3 / 16 (Roark's)."""

    def test_restored_capacity_is_the_original(self):
        rows = TWS_RESTORE_SLEEVE("60 mm", None, CORE, "54 mm", SLEEVE, materials=MATERIALS)
        od_mm, ratio = rows[0]
        assert isinstance(od_mm, float), rows
        original = TAU_CORE * math.pi * 0.060**3 / 16.0
        restored = capacity([0.054, od_mm * 1e-3], [0.0, 0.054], [G_CORE, G_SLEEVE], [TAU_CORE, TAU_SLEEVE])
        assert restored >= original * (1 - 1e-9)
        smaller = capacity([0.054, od_mm * 1e-3 - TOL_MM * 1e-3], [0.0, 0.054], [G_CORE, G_SLEEVE],
                           [TAU_CORE, TAU_SLEEVE])
        assert smaller < original
        # stiffness ratio: sum(G J) restored over G J original (BRIEF §2)
        gj = G_CORE * 0.054**4 + G_SLEEVE * ((od_mm * 1e-3) ** 4 - 0.054**4)
        assert ratio == pytest.approx(gj / (G_CORE * 0.060**4), rel=1e-6)

    def test_candidates_one_row_each_and_an_unknown_one_worded(self):
        rows = TWS_RESTORE_SLEEVE("60 mm", None, CORE, "54 mm", [[SLEEVE], [CORE], ["MPD unobtainium"]],
                                  materials=MATERIALS)
        assert len(rows) == 3
        # a sleeve of the core's own material restores the original diameter (same G and allowable)
        assert rows[1][0] == pytest.approx(60.0, abs=TOL_MM)
        assert rows[1][1] == pytest.approx(1.0, abs=1e-4)
        assert rows[2][0].startswith("⚠") and "unobtainium" in rows[2][0]

    def test_reduced_diameter_outside_the_section(self):
        got = TWS_RESTORE_SLEEVE("60 mm", None, CORE, "64 mm", SLEEVE, materials=MATERIALS)
        assert got.startswith("⚠ reduced diameter")


class TestBadInputs:
    """Each bad sizing cell gets a comment naming it; that part is not rated, the others are."""

    @pytest.mark.parametrize("part, column, words", [
        ("MPD-S-103", "J", ("diametre", "not a dimension")),
        ("MPD-S-104", "K", ("target reserve factor", "negative")),
        ("MPD-S-105", "L", ("stock", "sixty-three")),
    ])
    def test_comment_on_the_cell(self, rated, part, column, words):
        row = 2 + [r[0] for r in ROWS].index(part)
        comment = rated["book"]["Parts"][f"{column}{row}"].comment
        assert comment is not None
        for word in words:
            assert word in comment.text
        assert rated["results"][part]["Status"] == "not rated"

    def test_other_parts_still_rated(self, rated):
        for part in ("MPD-S-101", "MPD-S-102", "MPD-S-106"):
            assert rated["results"][part]["Status"] == "ok"
        assert "MPD-S-106" not in rated["sizing"]  # it asked for nothing
        assert rated["code"] != 0  # errors in the book are reported in the exit code

    def test_summary_has_a_sizing_section(self, rated):
        col_a = [r[0] for r in rated["book"]["Twistshare summary"].iter_rows(values_only=True)]
        at = col_a.index("Sizing")
        assert col_a[at + 1] == "asked to be sized"

    @pytest.mark.parametrize("args, words", [
        (("layer 2 diametre", 1.2), "not a dimension"),
        (("layer 2 outer diameter", -1.2), "negative"),
        (("layer 3 outer diameter", 1.2), "2 layer(s)"),
    ])
    def test_cell_function_messages(self, args, words):
        block = [["Material", "Outer diameter [mm]", "Inner diameter [mm]"], [CORE, 40, None], [SLEEVE, 60, 40]]
        got = TWS_SIZE_FOR(block, "2000 N·m", *args, materials=MATERIALS)
        assert isinstance(got, str) and got.startswith("⚠") and words in got

    def test_stock_list_with_text_in_a_cell(self):
        got = TWS_STOCK_SIZE(_block(50), "1000 N·m", "outer diameter", "55 mm; about 60 mm", 1.5,
                             materials=MATERIALS)
        assert got.startswith("⚠ stock")

    def test_no_sizing_sheet_without_a_size_column(self, tmp_path):
        wb = openpyxl.Workbook()
        ws = wb.active
        ws.title = "Materials"
        for row in MATERIALS:
            ws.append(row)
        parts = wb.create_sheet("Parts")
        parts.append(HEADER[:9])
        parts.append(ROWS[5][:9])
        src = tmp_path / "plain.xlsx"
        wb.save(src)
        out = tmp_path / "plain_rated.xlsx"
        assert main(["rate", str(src), "-o", str(out), "-q"]) == 0
        assert "Twistshare sizing" not in _load(out).sheetnames
