"""The column reader (`_columns`): a cell's SI value, the finding it raises and what the finding names.

SI factors are checked against pint's own definitions (a fresh registry, not the engine's) or
NIST SP 811 (1 mm = 1e-3 m, 1 MPa = 1e6 Pa, 0 °C = 273.15 K); the plausible ranges are the
schema's own (common practice), so boundaries are taken from the field the test reads.
"""

from __future__ import annotations

import datetime as dt
import math

import numpy as np
import pint
import pytest
from twistshare.engine.core import ADHESIVE_DESIGN_FACTOR, adhesive_library, find_adhesive
from twistshare.engine.intake._columns import (
    cell_value,
    describe_kind,
    error_problem,
    example_unit,
    first_seen_index,
    header_factor,
    library_note,
    read_flag,
    read_numeric,
    read_text,
)
from twistshare.engine.intake._grid import SheetGrid
from twistshare.engine.intake._problems import Severity
from twistshare.engine.intake._schema import LAYER_FIELDS, MATERIAL_FIELDS, PART_FIELDS, Column

UREG = pint.UnitRegistry()
LAYER = {f.key: f for f in LAYER_FIELDS}
MATERIAL = {f.key: f for f in MATERIAL_FIELDS}
PART = {f.key: f for f in PART_FIELDS}
OD, BORE, KT, BOND = LAYER["outer_diameter"], LAYER["inner_diameter"], LAYER["kt"], LAYER["bond_allowable"]
ALLOW = LAYER["allowable_shear"]
TEMP = PART["operating_temperature"]
MM = UREG("mm").to("m").magnitude  # pint: 1e-3 (NIST SP 811)


def pint_factor(unit: str) -> float:
    return UREG(unit).to_base_units().magnitude


# ---- header_factor ---------------------------------------------------------------------------

def test_header_factor_of_a_unit_is_pints():
    factor, issue = header_factor(OD, "mm", "Outer diameter [mm]")
    assert issue is None
    assert factor == pytest.approx(pint_factor("mm"), rel=1e-12)
    factor, _ = header_factor(ALLOW, "MPa", "Allowable [MPa]")
    assert factor == pytest.approx(pint_factor("MPa"), rel=1e-12)


def test_header_factor_of_a_unit_of_the_wrong_kind_is_worded():
    factor, issue = header_factor(OD, "kg", "Outer diameter [kg]")
    assert factor is None
    assert issue.startswith("header unit: ")
    assert "kg" in issue and "length" in issue


def test_header_without_unit_names_the_header_and_an_example():
    factor, issue = header_factor(OD, None, "  Outer diameter ")
    assert factor is None
    assert f"no unit for {OD.description}" in issue
    assert "'Outer diameter [mm]'" in issue
    assert "or in each cell" in issue


def test_header_without_unit_dimensionless_is_one_text_is_none():
    assert header_factor(KT, None, "Kt") == (1.0, None)
    assert header_factor(MATERIAL["name"], None, "Material") == (None, None)


def test_example_units():
    assert example_unit("length") == "mm"
    assert example_unit("stress") == "MPa"
    assert example_unit("temperature") == "°C"
    assert example_unit("no such kind") == ""


# ---- cell_value --------------------------------------------------------------------------------

def test_bare_number_takes_the_header_factor():
    v, problem, code = cell_value(52, OD, "mm", MM)
    assert (problem, code) == (None, "")
    assert v == pytest.approx(52 * MM, rel=1e-12)
    assert isinstance(v, float)


def test_cell_text_with_its_own_unit_overrides_the_header():
    v, problem, code = cell_value("2 in", OD, "mm", MM)  # 1 in = 25.4 mm exactly (NIST SP 811)
    assert problem is None and code == ""
    assert v == pytest.approx(2 * 25.4e-3, rel=1e-12)


def test_text_without_unit_takes_the_header_unit():
    v, problem, _ = cell_value("52", OD, "mm", MM)
    assert problem is None
    assert v == pytest.approx(0.052, rel=1e-12)


def test_text_without_unit_when_the_header_has_none_is_refused():
    v, problem, code = cell_value("52", OD, None, None, "no unit here")
    assert math.isnan(v) and code == "unit"
    assert "'52'" in problem


def test_error_value_names_it_and_the_kind():
    v, problem, code = cell_value("#N/A", OD, "mm", MM, is_error=True)
    assert math.isnan(v) and code == "error-value"
    assert problem == "the cell holds the error value #N/A; expected a length"


@pytest.mark.parametrize("raw, word", [(True, "TRUE"), (False, "FALSE")])
def test_yes_no_is_not_a_number(raw, word):
    v, problem, code = cell_value(raw, OD, "mm", MM)
    assert math.isnan(v) and code == "not-a-number"
    assert problem == f"expected a length, got {word}"


@pytest.mark.parametrize("raw", [dt.date(2026, 1, 2), dt.datetime(2026, 1, 2, 3, 4), dt.time(3, 4),
                                 dt.timedelta(hours=2)])
def test_a_date_or_time_is_refused(raw):
    v, problem, code = cell_value(raw, OD, "mm", MM)
    assert math.isnan(v) and code == "not-a-number"
    assert problem == f"expected a length, got a date or time ({raw})"


@pytest.mark.parametrize("raw", [math.inf, -math.inf, math.nan])
def test_not_finite_is_refused(raw):
    v, problem, code = cell_value(raw, OD, "mm", MM)
    assert math.isnan(v) and code == "not-a-number"
    assert problem == f"expected a finite number, got {raw}"


def test_bare_number_without_header_unit_gives_the_header_issue():
    v, problem, code = cell_value(3.5, OD, None, None, "put a unit in")
    assert math.isnan(v) and (problem, code) == ("put a unit in", "unit")
    v, problem, code = cell_value(3.5, OD, None, None)
    assert (problem, code) == ("no unit", "unit")


def test_zero_is_zero_in_every_unit_but_not_a_temperature():
    v, problem, code = cell_value(0, BORE, None, None, "why")
    assert (v, problem, code) == (0.0, None, "")
    v, problem, code = cell_value(0, TEMP, None, None, "why")
    assert math.isnan(v) and (problem, code) == ("why", "unit")


def test_temperature_in_celsius_adds_the_offset():
    # 20 °C = 293.15 K (NIST SP 811: T/K = t/°C + 273.15)
    v, problem, _ = cell_value(20, TEMP, "degC", 1.0)
    assert problem is None
    assert v == pytest.approx(UREG.Quantity(20, "degC").to("K").magnitude, rel=1e-12)
    v, problem, _ = cell_value(293.15, TEMP, "K", 1.0)
    assert v == pytest.approx(293.15, rel=1e-12)


def test_other_objects_are_refused_with_their_repr():
    v, problem, code = cell_value([1, 2], OD, "mm", MM)
    assert math.isnan(v) and code == "not-a-number"
    assert problem == "expected a length, got [1, 2]"


def test_adhesive_name_reads_its_library_allowable():
    name = next(iter(adhesive_library()))
    v, problem, code = cell_value(name, BOND, "MPa", 1e6)
    assert (problem, code) == (None, "library")
    entry = find_adhesive(name)
    assert v == pytest.approx(entry.typical_strength / ADHESIVE_DESIGN_FACTOR, rel=1e-12)


def test_unknown_name_lists_the_library():
    v, problem, code = cell_value("superglue", BOND, "MPa", 1e6)
    assert math.isnan(v) and code == "unknown-name"
    assert problem.startswith(f"'superglue' is neither {describe_kind('stress')} with its unit "
                              "nor a built-in adhesive: ")
    for name in adhesive_library():
        assert repr(name) in problem


def test_a_text_with_digits_in_an_adhesive_column_is_a_unit_problem():
    v, problem, code = cell_value("12 kg", BOND, "MPa", 1e6)
    assert math.isnan(v) and code == "unit"
    assert problem.startswith("'12 kg': ")
    assert "kg" in problem[len("'12 kg': "):]


def test_unknown_word_in_a_column_that_names_nothing_is_a_unit_problem():
    v, problem, code = cell_value("abc", OD, "mm", MM)
    assert math.isnan(v) and code == "unit"
    assert problem.startswith("'abc': ")


def test_negative_is_a_sign_slip():
    v, problem, code = cell_value(-52, OD, "mm", MM)
    assert math.isnan(v) and code == "sign"
    assert problem == "-52 mm is negative; expected a length greater than zero"
    v, problem, code = cell_value(-2.0, BORE, "mm", MM)
    assert code == "sign"
    assert problem == "-2 mm is negative; expected a length zero or more"


def test_zero_where_the_range_starts_above_zero_is_a_sign_slip():
    v, problem, code = cell_value(0, OD, "mm", MM)
    assert math.isnan(v) and code == "sign"
    assert problem == "0 mm is zero; expected a length greater than zero"
    v, problem, code = cell_value(0.0, BORE, "mm", MM)  # a bore may be zero
    assert (v, problem, code) == (0.0, None, "")


def test_not_positive_field_takes_negative_to_the_range_check():
    v, problem, code = cell_value(-1, KT, None, 1.0)
    assert code == "plausible"
    assert problem.startswith("-1 is outside the plausible range 1 to 10")
    assert problem.endswith("(common practice); check the value")
    assert "  " not in problem


def test_plausible_range_boundaries_are_inside():
    lo, hi = OD.plausible.low, OD.plausible.high
    assert cell_value(lo / MM, OD, "mm", MM)[1] is None
    assert cell_value(hi / MM, OD, "mm", MM)[1] is None
    v, problem, code = cell_value(hi / MM * 1.001, OD, "mm", MM)
    assert math.isnan(v) and code == "plausible"
    v, problem, code = cell_value(lo / MM * 0.999, OD, "mm", MM)
    assert code == "plausible"
    assert cell_value(1.0, KT, None, 1.0)[1] is None
    assert cell_value(10.0, KT, None, 1.0)[1] is None


def test_out_of_range_shows_the_value_converted_and_the_range():
    # 7 m outer diameter: range 0.1 mm to 5 m (the schema's), shown in mm
    v, problem, code = cell_value(7, OD, "m", 1.0)
    assert code == "plausible"
    assert problem == ("7 m = 7000 mm is outside the plausible range 0.1 to 5000 mm "
                       "(common practice); check the unit")


def test_out_of_range_in_the_shown_unit_is_not_repeated():
    v, problem, code = cell_value(7000.0, OD, "mm", MM)
    assert problem == "7000 mm is outside the plausible range 0.1 to 5000 mm (common practice); check the unit"


def test_out_of_range_text_is_quoted():
    v, problem, code = cell_value("7 m", OD, None, None)
    assert code == "plausible"
    assert problem.startswith("'7 m' = 7000 mm is outside")


def test_long_unit_problem_quotes_the_text_by_its_start():
    raw = "x" * 200 + " mm"
    v, problem, code = cell_value(raw, OD, "mm", MM)
    assert code == "unit"
    assert len(problem) <= 4 * 60 + len(repr(raw[:60])) + 30
    assert repr(raw) not in problem


def test_short_unit_problem_keeps_the_whole_message():
    raw = "y" * 70  # over 60 characters, but the message stays under 240
    v, problem, code = cell_value(raw, OD, "mm", MM)
    assert code == "unit"
    assert not problem.endswith(" …")


# ---- first_seen_index ---------------------------------------------------------------------------

def test_first_seen_index():
    distinct, index = first_seen_index(["b", "a", "b", "c", "a"])
    assert distinct == ["b", "a", "c"]
    assert index.tolist() == [0, 1, 0, 2, 1]
    assert index.dtype == np.intp
    distinct, index = first_seen_index([])
    assert distinct == [] and index.tolist() == []


# ---- read_numeric ---------------------------------------------------------------------------------

def who(r):
    return f"part P{r}"


who.tag = lambda r: (f"P{r}", 2)


def read(rows_data, field=OD, unit="mm", header="Outer diameter [mm]", rows=None, errors=None,
         uncached=frozenset(), header_row=0, reported=None, name="Parts", who_fn=who):
    grid = SheetGrid(name, [[header]] + [[x] for x in rows_data], errors=errors or {}, uncached=uncached)
    rows = list(range(1, len(rows_data) + 1)) if rows is None else rows
    findings = []
    reported = set() if reported is None else reported
    col = read_numeric(grid, Column(field, 0, header, unit), rows, who_fn, findings, header_row, reported)
    return col, findings


def test_numbers_column_in_si():
    col, findings = read([52, 40.5, 100])
    assert findings == []
    np.testing.assert_allclose(col.values, np.array([52, 40.5, 100]) * MM, rtol=1e-12)
    assert not col.bad.any() and not col.empty.any()


def test_numbers_column_outside_range_names_the_cell():
    col, findings = read([52, 7000.0, -3])
    assert np.isnan(col.values[1:]).all() and col.values[0] == pytest.approx(0.052)
    assert col.bad.tolist() == [False, True, True]
    assert [f.cell for f in findings] == ["A3", "A4"]
    assert [f.code for f in findings] == ["plausible", "sign"]
    f = findings[0]
    assert f.severity is Severity.ERROR and f.sheet == "Parts"
    assert f.message.startswith(f"part P2: {OD.description}: 7000 mm is outside")
    assert (f.part, f.layer) == ("P2", 2)
    assert f.values == (7000.0,)


def test_mixed_column_numbers_texts_and_empties():
    col, findings = read([52, "2 in", None, "  ", 30.0])
    np.testing.assert_allclose(col.values[[0, 1, 4]], [0.052, 0.0508, 0.030], rtol=1e-12)
    assert np.isnan(col.values[[2, 3]]).all()
    assert col.empty.tolist() == [False, False, True, True, False]
    assert not col.bad.any() and findings == []


def test_non_consecutive_rows():
    col, findings = read([1, 2, 3, 4], rows=[1, 3, 4])
    np.testing.assert_allclose(col.values, np.array([1, 3, 4]) * MM, rtol=1e-12)


def test_texts_column_read_once_each_and_problems_per_cell():
    col, findings = read(["52 mm", "bad", "52 mm", "bad", " ", "0.06 m"], unit=None, header="OD")
    np.testing.assert_allclose(col.values[[0, 2, 5]], [0.052, 0.052, 0.06], rtol=1e-12)
    assert np.isnan(col.values[[1, 3, 4]]).all()
    assert col.bad.tolist() == [False, True, False, True, False, False]
    assert col.empty.tolist() == [False, False, False, False, True, False]
    assert [f.cell for f in findings] == ["A3", "A5"]
    assert all(f.code == "unit" and "'bad'" in f.message for f in findings)
    assert findings[1].message.startswith(f"part P4: {OD.description}: 'bad'")


def test_texts_column_with_error_texts():
    col, findings = read(["52 mm", "#DIV/0!"], unit=None, header="OD")
    assert col.values[0] == pytest.approx(0.052)
    assert [(f.cell, f.code) for f in findings] == [("A3", "error-value")]
    assert "#DIV/0!" in findings[0].message


def test_error_cells_of_a_saved_book_are_named():
    col, findings = read([52, 0.0, 40], errors={(2, 0): "#REF!"})
    np.testing.assert_allclose(col.values[[0, 2]], [0.052, 0.040], rtol=1e-12)
    assert math.isnan(col.values[1]) and col.bad.tolist() == [False, True, False]
    assert [(f.cell, f.code) for f in findings] == [("A3", "error-value")]
    assert "the cell holds the error value #REF!; expected a length" in findings[0].message


def test_error_cells_among_texts_of_a_saved_book():
    col, findings = read(["52 mm", "x", "40 mm"], unit=None, header="OD", errors={(2, 0): "#N/A"})
    assert [(f.cell, f.code) for f in findings] == [("A3", "error-value")]
    np.testing.assert_allclose(col.values[[0, 2]], [0.052, 0.040], rtol=1e-12)


def test_uncached_formula_cells_are_named():
    col, findings = read([52, None, 40], uncached=frozenset({(2, 0)}))
    assert col.bad.tolist() == [False, True, False] and not col.empty[1]
    (f,) = findings
    assert (f.cell, f.code, f.part, f.layer) == ("A3", "uncached", "P2", 2)
    assert f.message.startswith(f"part P2: {OD.description}: the cell's formula has no saved result")
    assert "open and save it in Excel or LibreOffice" in f.message


def test_uncached_in_a_text_column():
    col, findings = read(["52 mm", None], unit=None, header="OD", uncached=frozenset({(2, 0)}))
    assert [f.code for f in findings] == ["uncached"]
    assert col.values[0] == pytest.approx(0.052)


def test_bad_header_unit_told_once_on_the_header():
    reported = set()
    col, findings = read([52, 40], unit="kg", header="OD [kg]", reported=reported)
    header = [f for f in findings if f.code == "header-unit"]
    assert len(header) == 1
    assert header[0].cell == "A1" and header[0].values == ("OD [kg]",)
    assert header[0].message.startswith("header unit: ")
    assert ("Parts", 0) in reported
    # the numbers themselves cannot be read: each named
    assert [f.cell for f in findings if f.code == "unit"] == ["A2", "A3"]
    col, again = read([52], unit="kg", header="OD [kg]", reported=reported)
    assert not any(f.code == "header-unit" for f in again)


def test_missing_header_unit_told_once_on_the_header_for_bare_numbers():
    col, findings = read([52, 40, "30 mm"], unit=None, header="Outer diameter")
    head = [f for f in findings if f.code == "header-no-unit"]
    assert len(head) == 1 and head[0].cell == "A1" and head[0].values == ("Outer diameter",)
    assert "'Outer diameter [mm]'" in head[0].message
    cells = [f for f in findings if f.code == "unit"]
    assert [f.cell for f in cells] == ["A2", "A3"]
    assert col.values[2] == pytest.approx(0.030)


def test_missing_header_unit_no_header_finding_for_a_block_without_header():
    col, findings = read([52], unit=None, header="Outer diameter", header_row=-1)
    assert [f.code for f in findings] == ["unit"]


def test_missing_header_unit_text_without_unit_not_told_on_header():
    col, findings = read(["52", "40"], unit=None, header="Outer diameter")
    assert [f.code for f in findings] == ["unit", "unit"]


def test_temperature_column_in_celsius():
    col, findings = read([20, 100.0], field=TEMP, unit="degC", header="Operating temperature [°C]")
    assert findings == []
    np.testing.assert_allclose(col.values, [293.15, 373.15], rtol=1e-12)  # NIST SP 811


def test_temperature_column_mixed():
    col, findings = read([20, "30 degC"], field=TEMP, unit="degC", header="T [°C]")
    np.testing.assert_allclose(col.values, [293.15, 303.15], rtol=1e-12)


def test_adhesive_names_give_a_note_naming_the_source():
    name = next(iter(adhesive_library()))
    col, findings = read([name, 10, name], field=BOND, unit="MPa", header="Bond allowable [MPa]")
    entry = find_adhesive(name)
    expected = entry.typical_strength / ADHESIVE_DESIGN_FACTOR
    np.testing.assert_allclose(col.values, [expected, 10e6, expected], rtol=1e-12)
    notes = [f for f in findings if f.code == "library-value"]
    assert [f.cell for f in notes] == ["A2", "A4"]
    assert all(f.severity is Severity.NOTE for f in notes)
    assert notes[0].message.startswith(f"part P1: {BOND.description}: {name!r} from the built-in adhesives")


def test_adhesive_names_only_column():
    name = next(iter(adhesive_library()))
    col, findings = read([name, name], field=BOND, unit="MPa", header="Bond allowable [MPa]")
    assert [f.code for f in findings] == ["library-value", "library-value"]
    assert not np.isnan(col.values).any()


def test_who_without_tag():
    col, findings = read([-1], who_fn=lambda r: "x")
    assert (findings[0].part, findings[0].layer) == (None, None)


def test_no_rows():
    col, findings = read([], rows=[])
    assert col.values.shape == (0,) and findings == []


def test_library_note_words():
    name = next(iter(adhesive_library()))
    entry = find_adhesive(name)
    note = library_note(name, BOND)
    allowable_mpa = entry.typical_strength / ADHESIVE_DESIGN_FACTOR / 1e6
    assert note.startswith(f"{BOND.description}: {name!r} from the built-in adhesives: "
                           f"{allowable_mpa:.6g} MPa, its typical strength {entry.typical_strength / 1e6:.6g} MPa")
    assert f"over a design factor of {ADHESIVE_DESIGN_FACTOR:.6g}" in note
    assert entry.test in note
    assert library_note(name, OD) == ""
    assert library_note("not an adhesive", BOND) == ""


# ---- read_text, read_flag, error_problem ---------------------------------------------------------

def test_read_text_strips_and_blanks():
    grid = SheetGrid("M", [[" steel "], [""], ["brass"]])
    assert read_text(grid, 0, [0, 1, 2]) == ["steel", None, "brass"]
    grid = SheetGrid("M", [["a"], ["b"]])
    assert read_text(grid, 0, [0, 1]) == ["a", "b"]


def test_read_text_numbers_and_errors():
    grid = SheetGrid("M", [[" a "], [3.0], [2.5], [None], [7], ["  "]], errors={(6, 0): "#N/A"})
    assert read_text(grid, 0, [0, 1, 2, 3, 4, 5]) == ["a", "3", "2.5", None, "7", None]
    grid = SheetGrid("M", [[" a "], [3.0], ["x"]], errors={(2, 0): "#N/A"})
    assert read_text(grid, 0, [0, 1, 2]) == ["a", "3", "#N/A"]


def test_read_flag():
    assert read_flag("yes") is True and read_flag(0) is False and read_flag("maybe") is None


def test_error_problem():
    grid = SheetGrid("M", [["#N/A", 1.0]], errors={(0, 1): "#VALUE!"})
    assert error_problem(grid, 0, 0, "a length") == "the cell holds the error value #N/A; expected a length"
    assert error_problem(grid, 0, 1, "x") == "the cell holds the error value #VALUE!; expected x"
    grid = SheetGrid("M", [[5.0]])
    assert error_problem(grid, 0, 0, "x") is None


# ---- wording in full, and the paths a column can take ---------------------------------------------

def test_header_without_unit_message_in_full():
    _, issue = header_factor(OD, None, "Outer diameter")
    assert issue == (f"no unit for {OD.description}: put it in the header, e.g. 'Outer diameter [mm]', "
                     "or in each cell")


def test_unknown_name_lists_the_library_comma_separated():
    _, problem, _ = cell_value("superglue", BOND, "MPa", 1e6)
    assert problem.endswith("nor a built-in adhesive: " + ", ".join(repr(n) for n in adhesive_library()))


def test_library_note_in_full():
    name = next(iter(adhesive_library()))
    entry = find_adhesive(name)
    allowable = entry.typical_strength / ADHESIVE_DESIGN_FACTOR
    assert library_note(name, BOND) == (
        f"{BOND.description}: {name!r} from the built-in adhesives: {allowable / 1e6:.6g} MPa, its typical "
        f"strength {entry.typical_strength / 1e6:.6g} MPa ({entry.test}, typical, from memory) over a design "
        f"factor of {ADHESIVE_DESIGN_FACTOR:.6g} (common practice, from memory); use the maker's data for your "
        "product, gap and temperature")


def test_range_without_a_shown_unit_has_single_spaces():
    _, problem, _ = cell_value(-1, KT, None, 1.0)
    assert problem == "-1 is outside the plausible range 1 to 10 (common practice); check the value"


@pytest.mark.parametrize("rows", [[300, 500.0], [300, 500.0, "30 degC"]])
def test_temperature_columns_hot_in_celsius(rows):
    # 300 °C = 573.15 K, 500 °C = 773.15 K (NIST SP 811); numbers alone and beside a text
    col, findings = read(rows, field=TEMP, unit="degC", header="T [°C]")
    assert findings == []
    np.testing.assert_allclose(col.values[:2], [573.15, 773.15], rtol=1e-12)


def test_mixed_temperature_column_in_fahrenheit():
    # T/K = (t/°F + 459.67) × 5/9 (NIST SP 811): 100 °F = 310.927... K
    col, findings = read([100, "20 degC"], field=TEMP, unit="degF", header="T [°F]")
    assert findings == []
    assert col.values[0] == pytest.approx((100 + 459.67) * 5 / 9, rel=1e-12)
    assert col.values[0] == pytest.approx(UREG.Quantity(100, "degF").to("K").magnitude, rel=1e-9)


def test_an_error_cell_is_refused_whatever_number_the_grid_holds_there():
    col, findings = read([52, 45, 40], errors={(2, 0): "#N/A"})
    assert [(f.cell, f.code) for f in findings] == [("A3", "error-value")]
    assert math.isnan(col.values[1]) and col.bad.tolist() == [False, True, False]


def test_cells_after_an_uncached_one_are_still_read():
    col, findings = read([None, -3, 40], uncached=frozenset({(1, 0)}))
    assert [(f.cell, f.code) for f in findings] == [("A2", "uncached"), ("A3", "sign")]


def test_a_yes_after_a_one_is_told_as_a_yes():
    friction = LAYER["friction"]
    col, findings = read([1, True], field=friction, unit=None, header="Friction")
    assert [f.code for f in findings] == ["plausible", "not-a-number"]
    assert findings[1].message.endswith("got TRUE") and findings[1].values == (True,)


def test_long_unit_problem_cut_at_four_quote_lengths():
    # the cell text is not quoted whole in this message (its unit part is), so it is cut at 240 characters
    for n, cut in ((100, True), (200, True)):
        raw = "5 " + "q" * n
        _, problem, code = cell_value(raw, OD, "mm", MM)
        body = problem[len(f"{raw!r}: "):] if problem.startswith(repr(raw)) else problem.split(": ", 1)[1]
        assert code == "unit"
        assert body.endswith(" …") == cut
        assert len(body) == 4 * 60 + 2


def test_a_message_of_exactly_four_quote_lengths_is_kept_whole():
    from twistshare.engine.units import UnitProblem, parse_value

    for n in range(120, 260):
        raw = "x" * n + " mm"
        try:
            parse_value(raw, "length", None)
        except UnitProblem as exc:
            if len(str(exc)) == 240:
                break
    else:
        pytest.skip("no text length gives a 240-character unit message")
    _, problem, _ = cell_value(raw, OD, None, None)
    assert repr(raw) in problem  # not shortened: the rule cuts only above 240 characters


def test_a_text_a_little_over_the_quote_length_is_quoted_whole():
    raw = "y" * 70
    _, problem, _ = cell_value(raw, OD, "mm", MM)
    assert repr(raw) in problem


@pytest.mark.parametrize("kind, unit", [("length", "mm"), ("stress", "MPa"), ("torque", "N*m"), ("power", "kW"),
                                        ("speed", "rpm"), ("angle", "deg"), ("angle_per_length", "deg/m"),
                                        ("density", "kg/m**3"), ("temperature", "degC"), ("expansion", "1/K")])
def test_example_units_are_units_of_their_kind(kind, unit):
    from twistshare.engine.units import si_factor

    # the suggestion reads as a unit of that kind, with pint's factor for the same unit
    expected = 1.0 if kind == "temperature" else UREG(unit).to_base_units().magnitude
    assert example_unit(kind)
    assert si_factor(example_unit(kind), kind) == pytest.approx(expected, rel=1e-9)


def test_read_text_numbers_without_errors():
    grid = SheetGrid("M", [[" a "], [3.0], ["b"], [None], [2.5], [" "]])
    assert read_text(grid, 0, [0, 1, 2, 3, 4, 5]) == ["a", "3", "b", None, "2.5", None]


def test_uncached_message_in_full():
    col, findings = read([None], uncached=frozenset({(1, 0)}))
    assert findings[0].message == (
        f"part P1: {OD.description}: the cell's formula has no saved result (the book was written by a program "
        "that does not calculate): open and save it in Excel or LibreOffice, then run again")


def test_a_long_text_quoted_short_is_not_cut_further():
    raw = "x" * 200 + " mm"
    _, problem, _ = cell_value(raw, OD, "mm", MM)
    assert not problem.endswith(" …")
    assert f"(… {len(raw)} characters)" in problem
