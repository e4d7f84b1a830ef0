"""The parts reader word for word: each finding's text, cell, part, layer and code, on tables where
the reader must go on past the first part it reports.

The expected cells and row numbers are those of the sheet each test writes (rows counted from 1,
columns A, B, ...; row 1 is the header); the message wording is the reader's rule as stated in
`_parts.py`. Unit factors: NIST SP 811 (1 GPa = 1e9 Pa, 1 MPa = 1e6 Pa, 1 r/min = 2π/60 rad/s,
1 kW = 1000 W). The library's non-steel material (aluminium bronze) has no allowable of its own
by the library's rule that the shafting code allowable is for steel only.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from _membook import MemoryBook
from twistshare.engine.intake import (
    LAYER_ROW_FIELDS,
    PART_FIELDS,
    MaterialSet,
    SheetGrid,
    locate_table,
    rate_tables,
    read_layer_table_parts,
    read_parts,
)
from twistshare.engine.intake._columns import first_seen_index
from twistshare.engine.intake._parts import _in_order_of_use
from twistshare.engine.intake._problems import Severity

MATS = [["Material", "G [GPa]", "Allowable shear [MPa]", "E [GPa]", "Keyway", "Allowable rule",
         "Yield strength [MPa]", "Ultimate strength [MPa]"],
        ["Core steel", 80, 120, 200, None, None, None, None],
        ["Key steel", 80, None, 205, "yes", "shafting code", 300, 500]]
BRONZE = "Aluminium bronze C95400 as cast"  # in the library, not a steel: no allowable of its own
UNCACHED = ("the cell's formula has no saved result (the book was written by a program that does not "
            "calculate): open and save it in Excel or LibreOffice, then run again")
NO_ALLOWABLE = ("allowable: the layer is given by its shear modulus, so no material gives an allowable; "
                "give the allowable shear stress (e.g. from TWS_ALLOWABLE)")
H1 = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]"]


class Book(MemoryBook):
    """A memory book whose sheets may hold error values and formulas without a saved result."""

    def __init__(self, sheets, errors=None, uncached=None):
        super().__init__(sheets)
        self.errors, self.uncached = errors or {}, uncached or {}

    def grid(self, sheet):
        return SheetGrid(sheet, self.sheets[sheet], errors=self.errors.get(sheet, {}),
                         uncached=frozenset(self.uncached.get(sheet, ())))


def _rate(parts, layers=None, mats=MATS, **kw):
    sheets = {"Materials": mats, "Parts": parts}
    if layers is not None:
        sheets["Layers"] = layers
    result = rate_tables(Book(sheets, **kw))
    return result, {(p.code, p.cell): p for p in result.problems}


def _where(result, code):
    return [(p.sheet, p.cell, p.part, p.layer) for p in result.problems if p.code == code]


# --- part ids -----------------------------------------------------------------------------

def test_a_part_id_cell_holding_an_error_value_is_refused_and_named_by_its_row():
    result, found = _rate([H1, ["P1", 500, 100, "Core steel", 30], ["#N/A", 500, 100, "Core steel", 30],
                           [None, 500, 100, "Core steel", 30]], errors={"Parts": {(2, 0): "#N/A"}})
    p = found["part-id", "A3"]
    assert p.severity is Severity.ERROR
    assert p.message == ("row 3: the part id: the cell holds the error value #N/A; expected a part id; "
                         "it is not rated")
    assert found["part-id", "A4"].message == "row 4: the part has no id; it is not rated"
    # a part without a usable id is named by its sheet row
    assert result.parts.ids == ["P1", "(row 3)", "(row 4)"]
    assert result.rated.tolist() == [True, False, False]


def test_an_id_on_exactly_two_rows_after_a_unique_one_refuses_both():
    result, found = _rate([H1, ["P1", 500, 100, "Core steel", 30], ["P2", 500, 100, "Core steel", 30],
                           ["P2", 500, 100, "Core steel", 30]])
    assert found["part-id-twice", "A3"].message == ("part P2: the id is also on row 4; neither row is rated "
                                                    "until each part has its own id")
    assert found["part-id-twice", "A4"].message.startswith("part P2: the id is also on row 3;")
    assert _where(result, "part-id-twice") == [("Parts", "A3", "P2", None), ("Parts", "A4", "P2", None)]
    assert result.rated.tolist() == [True, False, False]


def test_a_block_without_a_part_column_names_its_parts_by_their_sheet_rows():
    grid = SheetGrid("Block", [["Layer 1 material", "Layer 1 outer diameter [mm]"], ["Core steel", 30],
                               ["Core steel", 40]])
    spot = locate_table(grid, PART_FIELDS, None, layer_groups=True, header_row=0)
    findings: list = []
    parts = read_parts(grid, spot, MaterialSet(), findings, need_allowable=False, with_duty=False)
    assert parts.ids == ["row 2", "row 3"]
    # without the duty columns: no duty, NaN torque, every part's duty source "none"
    assert parts.duty_source == ["none", "none"]
    assert np.isnan(parts.torque).all() and parts.torque.shape == (2,)


# --- the read_parts defaults ---------------------------------------------------------------

def _plain_table(rows):
    grid = SheetGrid("Parts", [H1, *rows])
    return grid, locate_table(grid, PART_FIELDS, "part", layer_groups=True, header_row=0)


def test_read_parts_reads_the_duty_and_needs_an_allowable_by_default():
    grid, spot = _plain_table([["P1", 500, 100, "AISI 1045 hot rolled", 30], ["P2", 500, 250, BRONZE, 30]])
    findings: list = []
    parts = read_parts(grid, spot, MaterialSet(), findings)
    assert parts.torque.tolist() == [100.0, 250.0]  # N·m as written
    assert parts.duty_source == ["torque", "torque"]
    assert parts.input_error.tolist() == [False, True]
    (p,) = [f for f in findings if f.code == "material"]
    assert (p.cell, p.part, p.layer) == ("D3", "P2", 1)
    assert p.message.startswith(f"part P2, layer 1: material {BRONZE!r} has no allowable in the book: ")


def test_with_need_allowable_false_a_modulus_only_material_serves():
    grid, spot = _plain_table([["P1", 500, 100, BRONZE, 30]])
    findings: list = []
    parts = read_parts(grid, spot, MaterialSet(), findings, need_allowable=False)
    assert parts.input_error.tolist() == [False]
    assert not [f for f in findings if f.code == "material"]


def test_a_layer_table_block_needs_an_allowable_by_default():
    grid = SheetGrid("Block", [["Part", "Material", "Outer diameter [mm]"], ["A", "AISI 1045 hot rolled", 30],
                               ["B", BRONZE, 30]])
    spot = locate_table(grid, LAYER_ROW_FIELDS, None, header_row=0)
    findings: list = []
    parts = read_layer_table_parts(grid, spot, MaterialSet(), findings)
    assert parts.ids == ["A", "B"]
    assert parts.input_error.tolist() == [False, True]
    (p,) = [f for f in findings if f.code == "material"]
    assert (p.cell, p.part, p.layer) == ("B3", "B", 1)


@pytest.mark.parametrize("unit, system", [("mm", "SI"), ("in", "US")])
def test_a_layer_block_without_a_part_column_is_one_unnamed_part(unit, system):
    grid = SheetGrid("Block", [["Material", f"Outer diameter [{unit}]", f"Inner diameter [{unit}]"],
                               ["Core steel", 1, 0], ["Core steel", 2, 1]])
    spot = locate_table(grid, LAYER_ROW_FIELDS, None, header_row=0)
    findings: list = []
    mats = MaterialSet()
    parts = read_layer_table_parts(grid, spot, mats, findings, need_allowable=False)
    assert parts.ids == [""]  # one part, named by its layers alone
    assert parts.duty_source == ["none"]
    assert np.isnan(parts.torque).all() and parts.torque.shape == (1,)
    assert parts.system == system
    assert parts.present.tolist() == [[True, True]]


# --- the unit system -----------------------------------------------------------------------

def test_an_unreadable_diameter_unit_is_passed_over_for_the_next_layer_s():
    head = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [furlongx]",
            "Layer 2 material", "Layer 2 outer diameter [in]"]
    result, found = _rate([head, ["P1", 500, 100, "Core steel", 1, "Core steel", 2]])
    # the header is told once, on its cell, and the system comes from layer 2's inches
    assert [p.cell for p in result.problems if p.code == "header-unit"] == ["E1"]
    assert result.system == "US" and result.parts.system == "US"


@pytest.mark.parametrize("length, torque, system", [("in", "N·m", "US"), ("furlongx", "lbf·ft", "US"),
                                                    ("furlongx", "N·m", "SI"), ("furlongx", "furlongw", "SI")])
def test_without_a_diameter_unit_the_length_then_the_torque_choose_the_system(length, torque, system):
    head = ["Part", f"Length [{length}]", f"Torque [{torque}]", "Layer 1 material",
            "Layer 1 outer diameter [furlongy]"]
    result, _ = _rate([head, ["P1", 20, 100, "Core steel", 1]])
    assert result.system == system


@pytest.mark.parametrize("part_unit, layer_unit, system", [("mm", "in", "US"), ("in", "mm", "US"),
                                                           ("mm", "mm", "SI")])
def test_a_layers_table_s_diameter_unit_decides_when_the_parts_table_says_si(part_unit, layer_unit, system):
    result, _ = _rate([["Part", f"Length [{part_unit}]", "Torque [N·m]"], ["P1", 20, 100]],
                      layers=[["Part", "Layer", "Material", f"Outer diameter [{layer_unit}]"], ["P1", 1, "Core steel", 1]])
    assert result.system == system
    assert result.rated.tolist() == [True]


# --- materials of the layers ---------------------------------------------------------------

def test_material_cells_with_errors_and_unsaved_formulas_are_each_told_once():
    rows = [["P1", 500, 100, "80 GPa", 30], ["P2", 500, 100, None, 30], ["P3", 500, 100, None, 30],
            ["P4", 500, 100, None, 30], ["P5", 500, 100, None, 30], ["P6", 500, 100, "Core steel", 30]]
    head = [*H1, "Layer 1 allowable shear [MPa]"]
    rows[0].append(100)
    result, found = _rate([head, *rows], errors={"Parts": {(2, 3): "#N/A"}}, uncached={"Parts": [(3, 3), (4, 3)]})
    # P2: the error value is told by the column reader only
    assert [(p.code, p.cell) for p in result.problems if p.part == "P2"] == [("error-value", "D3")]
    for part, cell in (("P3", "D4"), ("P4", "D5")):
        p = found["uncached", cell]
        assert (p.severity, p.sheet, p.part, p.layer) == (Severity.ERROR, "Parts", part, 1)
        assert p.message == f"part {part}, layer 1: material: {UNCACHED}"
    p = found["missing", "D6"]
    assert (p.part, p.layer, p.message) == ("P5", 1, "part P5, layer 1: no material given")
    assert len(result.problems) == 4
    assert result.rated.tolist() == [True, False, False, False, False, True]


def test_material_cells_of_a_layers_table_are_checked_on_that_sheet():
    result, found = _rate([["Part", "Length [mm]", "Torque [N·m]"], ["P1", 500, 100], ["P2", 500, 100],
                           ["P3", 500, 100]],
                          layers=[["Part", "Layer", "Material", "Outer diameter [mm]"], ["P1", 1, None, 30],
                                  ["P2", 1, None, 30], ["P3", 1, None, 30]],
                          errors={"Layers": {(1, 2): "#DIV/0!"}}, uncached={"Layers": [(2, 2)]})
    assert [(p.code, p.sheet, p.cell) for p in result.problems if p.part == "P1"] == [("error-value", "Layers", "C2")]
    assert found["uncached", "C3"].message == f"part P2, layer 1: material: {UNCACHED}"
    assert found["missing", "C4"].sheet == "Layers"
    assert result.rated.tolist() == [False, False, False]


def test_a_layer_without_a_material_column_is_told_on_its_part():
    result, found = _rate([["Part", "Length [mm]", "Torque [N·m]", "Layer 1 outer diameter [mm]"], ["P1", 500, 100, 30],
                           ["P2", 500, 100, 40]])
    assert [(p.code, p.sheet, p.cell, p.part, p.layer, p.message) for p in result.problems] == [
        ("missing", "Parts", None, "P1", 1, "part P1, layer 1: no material given"),
        ("missing", "Parts", None, "P2", 1, "part P2, layer 1: no material given")]
    assert result.rated.tolist() == [False, False]


def test_a_layers_sheet_without_a_table_leaves_the_parts_column_groups_in_use():
    result, _ = _rate([H1, ["P1", 500, 100, "Core steel", 30]], layers=[["nothing here"], [1, 2]])
    assert result.rated.tolist() == [True]


def test_a_layer_s_own_allowable_replaces_its_material_s_and_rule():
    head = [*H1, "Layer 1 allowable shear [MPa]"]
    result, _ = _rate([head, ["P1", 500, 100, "Key steel", 30, 90], ["P2", 500, 100, "Key steel", 30, None]])
    tau = result.parts.allowable_shear[:, 0]
    assert tau[0] == pytest.approx(90e6)  # MPa → Pa (NIST SP 811)
    # the material's: the shafting code allowable min(0.30·300, 0.18·500) = 90 MPa with its keyway
    # factor 0.75 (ASME shafting code, as the library's rule states it), by hand
    assert tau[1] == pytest.approx(0.75 * 90e6)
    assert result.parts.allowable_rule[:, 0].tolist() == [0, 3]  # GIVEN for the layer's own; shafting code


def test_a_layer_given_by_its_modulus_needs_its_own_allowable():
    head = [*H1, "Layer 1 allowable shear [MPa]", "Layer 2 material", "Layer 2 outer diameter [mm]",
            "Layer 2 inner diameter [mm]"]
    rows = [["P1", 500, 100, "80 GPa", 30, 100, None, None, None],  # own G and own allowable: rated
            ["P2", 500, 100, "80 GPa", 30, None, "Unobtainium", 40, 30],  # refused for its material first
            ["P3", 500, 100, "80 GPa", 30, None, "80 GPa", 40, 30],  # both layers lack one: told once, layer 1
            ["P4", 500, 100, "80 GPa", 30, None, None, None, None]]
    result, found = _rate([head, *rows])
    assert _where(result, "no-allowable") == [("Parts", "F4", "P3", 1), ("Parts", "F5", "P4", 1)]
    p = found["no-allowable", "F4"]
    assert (p.severity, p.message) == (Severity.ERROR, f"part P3, layer 1: {NO_ALLOWABLE}")
    assert result.parts.input_error.tolist() == [False, True, True, True]
    assert result.parts.shear_modulus[0, 0] == pytest.approx(80e9)
    assert result.parts.allowable_shear[0, 0] == pytest.approx(100e6)


def test_without_an_allowable_column_the_finding_is_on_the_material_cell():
    result, found = _rate([H1, ["P1", 500, 100, "Core steel", 30], ["P2", 500, 100, "80 GPa", 30]])
    p = found["no-allowable", "D3"]
    assert (p.part, p.layer, p.message) == ("P2", 1, f"part P2, layer 1: {NO_ALLOWABLE}")


def test_a_layer_s_own_g_is_passed_over_for_the_next_part_without_material():
    result, found = _rate([[*H1, "Layer 1 allowable shear [MPa]"], ["P1", 500, 100, "80 GPa", 30, 100],
                           ["P2", 500, 100, None, 30, None]])
    assert found["missing", "D3"].message == "part P2, layer 1: no material given"
    assert result.rated.tolist() == [True, False]


def test_an_unknown_material_with_a_layer_s_own_allowable_is_still_refused():
    head = [*H1, "Layer 1 allowable shear [MPa]"]
    result, found = _rate([head, ["P1", 500, 100, "Unobtainium", 30, 100], ["P2", 500, 100, "Core steel", 30, None]])
    p = found["material", "D2"]
    assert p.message == ("part P1, layer 1: unknown material 'Unobtainium': not in the materials table nor the "
                         "built-in library")
    assert result.parts.input_error.tolist() == [True, False]
    assert math.isnan(result.parts.shear_modulus[0, 0])


def test_a_material_refused_for_want_of_an_allowable_gives_no_values_and_its_reason():
    result, found = _rate([H1, ["P1", 500, 100, "Core steel", 30], ["P2", 500, 100, BRONZE, 30]])
    p = found["material", "D3"]
    assert p.message.startswith(f"part P2, layer 1: material {BRONZE!r} has no allowable in the book: the "
                                "shafting code rule")
    assert result.parts.input_error.tolist() == [False, True]
    assert result.parts.shear_modulus[0, 0] == pytest.approx(80e9)  # GPa → Pa (NIST SP 811)
    assert math.isnan(result.parts.shear_modulus[1, 0])


def test_the_materials_properties_reach_the_criteria_inputs():
    result, _ = _rate([H1, ["P1", 500, 100, "Core steel", 30], ["P2", 500, 100, "Key steel", 30]])
    assert result.parts.inputs["youngs_modulus"][:, 0] == pytest.approx([200e9, 205e9])  # GPa → Pa


def test_a_speed_beside_a_power_reaches_the_criteria_inputs_in_radians_per_second():
    head = ["Part", "Length [mm]", "Power [kW]", "Speed [rpm]", "Layer 1 material", "Layer 1 outer diameter [mm]"]
    result, _ = _rate([head, ["P1", 500, 10, 1500, "Core steel", 30], ["P2", 500, 10, 3000, "Core steel", 30]])
    speed = result.parts.inputs["speed"]
    assert speed == pytest.approx([1500 * 2 * math.pi / 60, 3000 * 2 * math.pi / 60])  # NIST SP 811
    assert result.parts.torque == pytest.approx([10e3 / s for s in speed])  # T = P / ω


def test_no_speed_column_puts_no_speed_among_the_inputs():
    result, _ = _rate([H1, ["P1", 500, 100, "Core steel", 30]])
    assert "speed" not in result.parts.inputs


def test_notes_go_on_past_an_unknown_material():
    result, _ = _rate([H1, ["P1", 500, 100, "Unobtainium", 30], ["P2", 500, 100, "AISI 1045 hot rolled", 30]])
    assert _where(result, "library-default") == [("Parts", "D3", "P2", 1)]


def test_the_keyway_note_word_for_word():
    result, found = _rate([[*H1, "Layer 1 Kt"], ["P1", 500, 100, "Key steel", 30, 2]])
    p = found["keyway-and-kt", "F2"]
    assert p.message == ("part P1, layer 1: Kt 2 and the keyway factor 0.75 of material 'Key steel' are both "
                         "applied (here and on every layer of that material with a Kt); the shafting code's "
                         "keyway factor already allows for a keyway, so if Kt describes the same keyway it is "
                         "counted twice (conservative)")


def test_a_duty_cell_s_problem_names_its_part():
    result, found = _rate([H1, ["P1", 500, 100, "Core steel", 30], ["P2", 500, "lots", "Core steel", 30]])
    (p,) = [p for p in result.problems if p.cell == "C3"]
    assert p.message.startswith("part P2: torque")
    assert result.rated.tolist() == [True, False]


# --- names in order of use ---------------------------------------------------------------

@pytest.mark.parametrize("distinct, codes", [(["B", "A", "C"], [1, 0, 1, 2]), (["A", "B", "C", "D"], [3, 3, 1]),
                                             (["x", "y"], [1, 1, 1]), (["p", "q", "r"], [2, 0, 2, 1, 0])])
def test_names_in_order_of_use_match_first_seen_order(distinct, codes):
    names, position = _in_order_of_use(distinct, np.array(codes))
    used = [distinct[c] for c in codes]
    expected, index = first_seen_index(used)
    # reference, plain Python: each name once, in the order of its first use
    assert names == list(dict.fromkeys(used)) == expected
    assert position.tolist() == [names.index(u) for u in used] == index.tolist()
