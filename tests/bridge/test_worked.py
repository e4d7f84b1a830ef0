"""The worked calculation sheet: native formulas a checker can audit and change.

LibreOffice recalculates the sheet (its own arithmetic, not ours) and every value equals the
engine's; a changed input changes the results as the engine says it should. The hand method the
formulas spell out is BRIEF §2 (Roark's Formulas for Stress and Strain, torsion of circular
sections).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import openpyxl
import pytest
from twistshare.engine.core import Duty, LayerStack, rate
from twistshare.workbook_bridge.commands import main
from twistshare.workbook_bridge.hosts import calc as calc_host
from twistshare.workbook_bridge.hosts.calc import _office
from twistshare.workbook_bridge.sheets._worked import worked_sheet_name

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"
PART = "MPD-S-005"  # three layers, a power duty: every step of the method is used
SHEET = worked_sheet_name(PART)


def _office_or_reason():
    try:
        return _office.find_office(), ""
    except calc_host.LibreOfficeMissing as error:
        return None, str(error)


OFFICE, WHY_NOT = _office_or_reason()
needs_office = pytest.mark.skipif(OFFICE is None, reason=f"LibreOffice is not usable here: {WHY_NOT}")


@pytest.fixture(scope="module")
def rated(tmp_path_factory):
    out = tmp_path_factory.mktemp("worked") / "rated.xlsx"
    assert main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", str(out), "-q", "--lenient",
                 "--worked", PART]) == 0
    return out


def _sheet_values(path: Path) -> dict[str, object]:
    ws = openpyxl.load_workbook(path)[SHEET]
    return {c.coordinate: c.value for row in ws.iter_rows() for c in row if c.value is not None}


def _row_of(values: dict[str, object], label: str) -> int:
    return next(int(ref[1:]) for ref, v in values.items() if ref.startswith("A") and v == label)


def test_every_step_is_a_formula_on_the_sheet(rated):
    values = _sheet_values(rated)
    formulas = {ref: v for ref, v in values.items() if isinstance(v, str) and v.startswith("=")}
    assert any("PI()/32" in f for f in formulas.values())           # J per layer
    assert any(f.startswith("=SUM(") for f in formulas.values())     # ΣGJ
    assert any(f.startswith("=MIN(") for f in formulas.values())     # the governing limit
    # the formulas read only this sheet's cells
    assert not any("!" in f for f in formulas.values())


def test_the_default_is_the_lowest_margin(tmp_path):
    out = tmp_path / "r.xlsx"
    assert main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", str(out), "-q", "--lenient"]) == 0
    names = openpyxl.load_workbook(out).sheetnames
    results = openpyxl.load_workbook(out)["Twistshare results"]
    head = [c.value for c in results[1]]
    rows = [dict(zip(head, r)) for r in results.iter_rows(min_row=2, values_only=True)]
    lowest = min((r for r in rows if r["Margin [%]"] is not None), key=lambda r: r["Margin [%]"])
    assert [n for n in names if n.startswith("Twistshare calc ")] == [worked_sheet_name(lowest["Part"])]


def test_an_unknown_part_is_warned(tmp_path):
    out = tmp_path / "r.xlsx"
    main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", str(out), "-q", "--lenient", "--worked", "NOPE"])
    warnings = openpyxl.load_workbook(out)["Twistshare warnings"]
    assert any("--worked 'NOPE' is not in the parts table" in str(c.value) for row in warnings.iter_rows()
               for c in row)


def _engine(values: dict[str, object]) -> tuple:
    """The same part rated by the engine core from the sheet's own input cells."""
    t_row, head = _row_of(values, "Demand torque T"), _row_of(values, "Layer")
    layers = []
    r = head + 1
    while isinstance(values.get(f"A{r}"), int):
        layers.append([values.get(f"{c}{r}") for c in "CDEFG"])
        r += 1
    do, di, g, tau, kt = (np.array([row[k] for row in layers], dtype=float) for k in range(5))
    stack = LayerStack.from_layers(do / 1e3, di / 1e3, g * 1e9, tau * 1e6, kt)
    torque, length = float(values[f"B{t_row}"]), float(values[f"B{t_row + 1}"]) / 1e3
    return rate(stack, Duty.from_arrays(torque=torque, length=length)), t_row, head


@needs_office
def test_libreoffice_recomputes_the_engine_values(rated):
    values = _sheet_values(rated)
    formulas = [ref for ref, v in values.items() if isinstance(v, str) and v.startswith("=")]
    got = calc_host.computed_values(rated, [(SHEET, ref) for ref in formulas], timeout=240)
    assert not got.not_computed, got.not_computed
    cached = {c.coordinate: c.value for row in openpyxl.load_workbook(rated, data_only=True)[SHEET].iter_rows()
              for c in row}
    for ref in formulas:
        computed = got.values[(SHEET, ref)]
        if cached[ref] is None:  # a blank twist limit: no capacity
            assert computed in ("", None), (ref, computed)
        else:
            assert computed == pytest.approx(cached[ref], rel=1e-9), ref
    rating, _, _ = _engine(values)
    gov = _row_of(values, "Governing limit")
    assert got.values[(SHEET, f"B{gov}")] == pytest.approx(float(rating.governing_capacity[0]), rel=1e-9)


@needs_office
def test_a_changed_input_changes_the_limit_as_the_engine_says(rated, tmp_path):
    # A checker's edit of a copy (openpyxl may re-save this test copy; the user's book is never so).
    wb = openpyxl.load_workbook(rated)
    ws = wb[SHEET]
    values = _sheet_values(rated)
    head = _row_of(values, "Layer")
    ws[f"C{head + 3}"] = 60.0          # the outer sleeve's outer diameter: 58 -> 60 mm
    ws[f"B{_row_of(values, 'Demand torque T')}"] = 2 * float(ws[f"B{_row_of(values, 'Demand torque T')}"].value)
    edited = tmp_path / "edited.xlsx"
    wb.save(edited)
    changed = _sheet_values(edited)
    rating, _, _ = _engine(changed)
    gov, margin = _row_of(changed, "Governing limit"), _row_of(changed, "Margin")
    got = calc_host.computed_values(edited, [(SHEET, f"B{gov}"), (SHEET, f"B{margin}")], timeout=240)
    assert got.values[(SHEET, f"B{gov}")] == pytest.approx(float(rating.governing_capacity[0]), rel=1e-9)
    assert got.values[(SHEET, f"B{margin}")] == pytest.approx(100 * float(rating.margin[0]), rel=1e-9)
    assert not math.isclose(float(rating.governing_capacity[0]), float(_engine(values)[0].governing_capacity[0]))
