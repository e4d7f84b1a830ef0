"""Checks of a table as a whole (`_table_checks`): hidden rows, merged cells, a column given
twice, headers that name no input, and which cells those findings name (the cells this test
wrote)."""

from __future__ import annotations

import sys
from pathlib import Path

from twistshare.engine.intake import Severity, rate_tables
from twistshare.engine.intake._grid import SheetGrid
from twistshare.engine.intake._problems import Problem
from twistshare.engine.intake._schema import MATERIAL_FIELDS, PART_FIELDS
from twistshare.engine.intake._table_checks import anchor_merged, hidden_and_merged, unknown_headers
from twistshare.engine.intake._tables import locate_table

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _membook import MATERIALS, MemoryBook  # noqa: E402

PARTS_HEAD = ["Part", "Torque [N·m]", "Length [m]", "Layer 1 material", "Layer 1 outer diameter [mm]"]


def spot_of(grid, fields=PART_FIELDS, key="part"):
    return locate_table(grid, fields, key, layer_groups=True)


def test_hidden_rows_are_named_at_their_key_cell():
    grid = SheetGrid("Parts", [["x"], PARTS_HEAD, ["P1", 1, 1, "a", 40], ["P2", 1, 1, "a", 40]],
                     hidden_rows=frozenset({3, 7}))
    findings = []
    hidden_and_merged(grid, spot_of(grid), findings, "parts")
    (f,) = findings
    assert (f.severity, f.sheet, f.cell) == (Severity.WARNING, "Parts", "A4")
    assert f.message == "parts row 4 is hidden; it is rated like any other row"


def test_hidden_rows_of_a_table_without_part_column_use_its_name_or_first_column():
    grid = SheetGrid("Materials", [["Allowable [MPa]", "Material", "G [GPa]"], [120, "steel", 80]],
                     hidden_rows=frozenset({1}))
    findings = []
    hidden_and_merged(grid, locate_table(grid, MATERIAL_FIELDS, "name"), findings, "materials")
    assert [f.cell for f in findings] == ["B2"]
    grid = SheetGrid("M", [["G [GPa]", "Allowable [MPa]"], [80, 120]], hidden_rows=frozenset({1}))
    findings = []
    hidden_and_merged(grid, locate_table(grid, MATERIAL_FIELDS, None), findings, "materials")
    assert [f.cell for f in findings] == ["A2"]


def test_merged_cells_inside_the_table_each_named():
    rows = [PARTS_HEAD, ["P1", 1, 1, "a", 40], ["P2", 1, 1, "a", 40], ["P3", 1, 1, "a", 40], [], [None] * 8]
    # B2:C3 covers three cells of the table; F1:H6 lies outside its columns; A6 is outside its rows
    grid = SheetGrid("Parts", rows, merged=(((1, 1), (2, 2)), ((0, 5), (5, 7)), ((5, 0), (5, 1))))
    findings = []
    hidden_and_merged(grid, spot_of(grid), findings, "parts")
    assert [f.cell for f in findings] == ["C2", "B3", "C3"]
    assert all(f.severity is Severity.WARNING for f in findings)
    assert findings[0].message == ("parts: cell C2 is inside the merged range B2:C3; a merged cell holds one "
                                   "value only, so this cell reads as empty")


def test_merged_range_over_the_header_row():
    grid = SheetGrid("Parts", [PARTS_HEAD, ["P1", 1, 1, "a", 40]], merged=(((0, 0), (1, 0)),))
    findings = []
    hidden_and_merged(grid, spot_of(grid), findings, "parts")
    assert [f.cell for f in findings] == ["A2"]


def test_anchor_merged_moves_findings_to_the_top_left():
    grid = SheetGrid("Parts", [[None] * 4] * 4, merged=(((1, 1), (2, 3)),))
    other = SheetGrid("Other", [[None]])
    findings = [Problem(Severity.ERROR, "Parts", "C3", "a"), Problem(Severity.ERROR, "Parts", "B2", "b"),
                Problem(Severity.ERROR, "Parts", "A3", "c"), Problem(Severity.ERROR, "Parts", None, "d"),
                Problem(Severity.ERROR, "Other", "C3", "e"), Problem(Severity.ERROR, "Parts", "D3", "f"),
                Problem(Severity.ERROR, "Parts", "E2", "g"), Problem(Severity.ERROR, "Parts", "B4", "h")]
    anchor_merged(findings, [grid, other, None])
    assert [f.cell for f in findings] == ["B2", "B2", "A3", None, "C3", "B2", "E2", "B4"]
    assert [f.message for f in findings] == list("abcdefgh")
    unmoved = [Problem(Severity.ERROR, "Parts", "C3", "a")]
    anchor_merged(unmoved, [other])
    assert unmoved[0].cell == "C3"


def _unknown(head, fields=PART_FIELDS, layer_groups=True, what="parts"):
    grid = SheetGrid("Parts", [head, ["P1"] + [1] * (len(head) - 1)])
    spot = locate_table(grid, fields, None, layer_groups=layer_groups)
    return unknown_headers(grid, spot, fields, layer_groups, what)


def test_descriptive_headers_pass_silently():
    assert _unknown(["Part", "Torque [N·m]", "Description", "Notes"]) == []


def test_a_near_miss_stops_the_rating():
    (f,) = _unknown(["Part", "Torque [N·m]", "Twist limt [deg]"])
    assert (f.severity, f.cell) == (Severity.ERROR, "C1")
    assert f.message == ("parts column 'Twist limt [deg]' looks like 'Twist limit' but is not spelled as "
                         "twistshare reads it; no part is rated until it is renamed or removed")


def test_a_layer_group_near_miss():
    (f,) = _unknown(["Part", "Torque [N·m]", "Layer 2 outer diamter [mm]"])
    assert f.severity is Severity.ERROR and f.cell == "C1"
    assert "looks like 'Layer 2 outer diameter'" in f.message


def test_a_layer_group_header_naming_nothing_is_told():
    (f,) = _unknown(["Part", "Torque [N·m]", "Layer 2 colour"])
    assert (f.severity, f.cell) == (Severity.WARNING, "C1")
    assert f.message == "parts column 'Layer 2 colour' is not an input twistshare reads, so it is ignored"
    assert _unknown(["Part", "Torque [N·m]", "Layer 2 colour"], layer_groups=False) == []


def test_a_header_with_a_unit_naming_nothing_is_told():
    (f,) = _unknown(["Part", "Torque [N·m]", " Colour [RAL] "])
    assert (f.severity, f.cell) == (Severity.WARNING, "C1")
    assert f.message == "parts column 'Colour [RAL]' is not an input twistshare reads, so it is ignored"


def test_short_labels_are_not_suggested():
    # 'od' (two letters) is a label of the outer diameter but too short to suggest for 'ox'
    assert _unknown(["Part", "Torque [N·m]", "ox"]) == []


def _book(parts, materials=MATERIALS, layers=None):
    sheets = {"Materials": materials, "Parts": parts}
    if layers is not None:
        sheets["Layers"] = layers
    return rate_tables(MemoryBook(sheets))


HEAD = ["Part", "Torque [N·m]", "Length [m]", "Layer 1 material", "Layer 1 outer diameter [mm]"]


def test_a_part_column_given_twice_that_disagrees():
    parts = [HEAD + ["Design torque [N·m]"], ["P1", 100, 1, "Core steel", 40, 100],
             ["P2", 100, 1, "Core steel", 40, 200], ["P3", 100.0, 1, "Core steel", 40, None]]
    result = _book(parts)
    warn = [f for f in result.problems if f.cell == "F1"]
    assert len(warn) == 1 and warn[0].severity is Severity.WARNING
    assert warn[0].message == ("parts: the column 'Design torque [N·m]' names the same input as 'Torque [N·m]' "
                               "(B1); that one is read and this one only checked against it: remove one of the two")
    (clash,) = [f for f in result.problems if f.cell and f.cell.startswith("F") and f.cell != "F1"]
    assert clash.cell == "F3" and clash.severity is Severity.ERROR
    assert clash.message == ("part P2: torque is given twice: B3 holds 100 under 'Torque [N·m]' and F3 holds 200 "
                             "under 'Design torque [N·m]'; not rated until one column is removed")
    assert result.parts.input_error.tolist() == [False, True, False]


def test_a_copy_in_another_unit_is_a_conflict_and_nothing_is_shown_as_nothing():
    parts = [HEAD + ["Design torque [kN·m]"], ["P1", 100, 1, "Core steel", 40, 0.1],
             ["P2", None, 1, "Core steel", 40, "0.2 kN·m"]]
    result = _book(parts)
    clashes = [f for f in result.problems if f.cell in ("F2", "F3")]
    assert [f.cell for f in clashes] == ["F2", "F3"]
    assert "B2 holds 100 under" in clashes[0].message and "F2 holds 0.1 under" in clashes[0].message
    assert "B3 holds nothing under" in clashes[1].message and "F3 holds '0.2 kN·m' under" in clashes[1].message
    assert result.parts.input_error.tolist() == [True, True]


def test_a_materials_column_given_twice():
    materials = [["Material", "G [GPa]", "Allowable shear [MPa]", "Shear modulus [GPa]"],
                 ["Core steel", 80, 120, 81], ["Other", 80, 120, 80], [None, 80, 120, 70]]
    parts = [HEAD, ["P1", 100, 1, "Core steel", 40], ["P2", 100, 1, "Other", 40]]
    result = _book(parts, materials)
    clashes = [f for f in result.problems if f.sheet == "Materials" and f.cell in ("D2", "D3", "D4")]
    assert [f.cell for f in clashes] == ["D2", "D4"]
    assert clashes[0].message.startswith("material 'Core steel': shear modulus G is given twice: B2 holds 80")
    assert clashes[1].message.startswith("materials row 4: shear modulus G is given twice")
    core = result.materials.by_name["core steel"]
    assert core.problem == ("material 'Core steel' has a property given twice with different values "
                            "(see the comments on its row)")
    assert result.materials.by_name["other"].problem is None
    assert result.rated.tolist() == [False, True]


def test_a_layers_column_given_twice():
    parts = [["Part", "Torque [N·m]", "Length [m]"], ["P1", 100, 1], ["P2", 100, 1]]
    layers = [["Part", "Layer", "Material", "Outer diameter [mm]", "OD [mm]"],
              ["P1", 1, "Core steel", 40, 40], ["P2", 1, "Core steel", 40, 41], ["P9", 1, "Core steel", 40, 41]]
    result = _book(parts, layers=layers)
    clashes = [f for f in result.problems if f.sheet == "Layers" and f.cell in ("E2", "E3", "E4")]
    assert [f.cell for f in clashes] == ["E3", "E4"]
    assert clashes[0].message.startswith("part P2, Layers row 3: outer diameter is given twice: D3 holds 40")
    assert result.parts.input_error.tolist() == [False, True]


def test_hidden_row_named_at_the_part_cell_wherever_it_sits():
    grid = SheetGrid("Parts", [["Torque [N·m]", "Part", "Length [m]"], [1, "P1", 1]], hidden_rows=frozenset({1}))
    findings = []
    hidden_and_merged(grid, spot_of(grid), findings, "parts")
    assert [f.cell for f in findings] == ["B2"]


def test_anchor_merged_in_the_top_row_and_left_column_of_a_range():
    grid = SheetGrid("Parts", [[None] * 4] * 4, merged=(((1, 1), (2, 3)),))
    findings = [Problem(Severity.ERROR, "Parts", "C2", "a"), Problem(Severity.ERROR, "Parts", "B3", "b")]
    anchor_merged(findings, [grid])
    assert [f.cell for f in findings] == ["B2", "B2"]


def test_a_two_letter_label_is_not_suggested():
    from twistshare.engine.intake._schema import LAYER_ROW_FIELDS

    assert _unknown(["Part", "Layer", "Kts"], fields=LAYER_ROW_FIELDS, layer_groups=False, what="layers") == []
    (f,) = _unknown(["Part", "Torque [N·m]", "Layer 2 kts"])
    assert f.severity is Severity.WARNING


def test_a_near_miss_after_a_descriptive_column():
    found = _unknown(["Part", "Torque [N·m]", "Notes", "Twist limt [deg]"])
    assert [f.cell for f in found] == ["D1"]


def test_copies_without_unit_that_agree_are_not_conflicts():
    parts = [HEAD + ["Service factor", "Service factor"], ["P1", 100, 1, "Core steel", 40, 1.5, 1.5]]
    result = _book(parts)
    assert not [f for f in result.problems if f.cell == "G2"]
    assert result.parts.input_error.tolist() == [False]


def test_a_blank_copy_then_a_conflict_and_a_float_shown_whole():
    parts = [HEAD + ["Design torque [N·m]"], ["P1", 100, 1, "Core steel", 40, None],
             ["P2", 100.0, 1, "Core steel", 40, 200]]
    result = _book(parts)
    (clash,) = [f for f in result.problems if f.cell == "F3"]
    assert "B3 holds 100 under 'Torque [N·m]' and F3 holds 200 under" in clash.message
    assert result.parts.input_error.tolist() == [False, True]


def test_materials_duplicate_header_named_and_a_nameless_row_first():
    materials = [["Material", "G [GPa]", "Allowable shear [MPa]", "Shear modulus [GPa]"],
                 [None, 80, 120, 70], ["Core steel", 80, 120, 81]]
    parts = [HEAD, ["P1", 100, 1, "Core steel", 40]]
    result = _book(parts, materials)
    (head,) = [f for f in result.problems if f.sheet == "Materials" and f.cell == "D1"]
    assert head.message.startswith("materials: the column 'Shear modulus [GPa]' names the same input as 'G [GPa]' (B1)")
    assert result.materials.by_name["core steel"].problem.startswith("material 'Core steel' has a property given twice")


def test_layers_duplicate_header_named():
    parts = [["Part", "Torque [N·m]", "Length [m]"], ["P1", 100, 1]]
    layers = [["Part", "Layer", "Material", "Outer diameter [mm]", "OD [mm]"], ["P1", 1, "Core steel", 40, 40]]
    result = _book(parts, layers=layers)
    (head,) = [f for f in result.problems if f.sheet == "Layers" and f.cell == "E1"]
    assert head.message.startswith("layers: the column 'OD [mm]' names the same input as 'Outer diameter [mm]' (D1)")


def test_a_material_refused_already_keeps_its_own_reason():
    materials = [["Material", "G [GPa]", "Allowable shear [MPa]", "Shear modulus [GPa]"],
                 ["Core steel", 80, 120, 80], ["Odd", 80, "abc", 70]]
    result = _book([HEAD, ["P1", 100, 1, "Core steel", 40]], materials)
    assert result.materials.by_name["odd"].problem.startswith("material 'Odd' has an unusable property: "
                                                              "allowable shear stress: 'abc'")


def test_a_near_miss_of_a_three_letter_label():
    grid = SheetGrid("Materials", [["Material", "G [GPa]", "G12x"], ["a", 80, 5]])
    spot = locate_table(grid, MATERIAL_FIELDS, "name")
    (f,) = unknown_headers(grid, spot, MATERIAL_FIELDS, False, "materials")
    assert (f.severity, f.cell) == (Severity.ERROR, "C1")
    assert "looks like 'G12'" in f.message
