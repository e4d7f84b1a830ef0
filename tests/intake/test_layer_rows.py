"""Layers from a table with one row per layer (`_layer_rows`): which part and layer each row
becomes, its SI values (1 mm = 1e-3 m, 1 MPa = 1e6 Pa, 1 GPa = 1e9 Pa: NIST SP 811) and which
cell, part and layer each refusal names (the cells this test wrote)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from twistshare.engine.intake._grid import SheetGrid
from twistshare.engine.intake._layer_rows import layers_from_rows, part_keys, part_positions
from twistshare.engine.intake._schema import LAYER_ROW_FIELDS
from twistshare.engine.intake._tables import locate_table

HEAD = ["Part", "Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]", "Allowable [MPa]", "Kt"]


def read(rows, ids=("P1", "P2"), head=HEAD, errors=None):
    grid = SheetGrid("Layers", [head, *rows], errors=errors or {})
    spot = locate_table(grid, LAYER_ROW_FIELDS, "part" if "Part" in head else None)
    findings = []
    out = layers_from_rows(grid, spot, list(ids), findings)
    return out, findings


def by_code(findings, code):
    return [f for f in findings if f.code == code]


def test_two_parts_two_layers_in_si():
    out, findings = read([["P1", 1, "steel", 40, None, 120, None],
                          ["P1", 2, "bronze", 60, 40, None, 2.0],
                          ["P2", 1, "steel", 30, 10, None, None]])
    assert findings == []
    np.testing.assert_allclose(out.outer_diameter, [[0.040, 0.060], [0.030, np.nan]], rtol=1e-12)
    np.testing.assert_allclose(out.inner_diameter, [[0.0, 0.040], [0.010, np.nan]], rtol=1e-12)
    np.testing.assert_allclose(out.allowable_shear[0], [120e6, np.nan], rtol=1e-12)
    np.testing.assert_allclose(out.kt, [[1.0, 2.0], [1.0, 1.0]])
    assert out.present.tolist() == [[True, True], [True, False]]
    assert out.materials.tolist() == [["steel", "bronze"], ["steel", None]]
    assert not out.bad.any()
    assert out.source_part.tolist() == [0, 0, 1] and out.source_slot.tolist() == [0, 1, 0]
    assert out.cells.get((0, 1, "outer_diameter")) == ("Layers", "D3")
    assert out.cells.get((1, 0, "material")) == ("Layers", "C4")


def test_without_a_layer_column_the_rows_of_a_part_are_its_layers_in_order():
    head = ["Part", "Material", "Outer diameter [mm]", "Inner diameter [mm]"]
    out, findings = read([["P2", "a", 20, 0], ["P1", "b", 30, 0], ["P2", "c", 40, 20], ["P2", "d", 50, 40]],
                         head=head)
    assert findings == []
    assert out.materials.tolist() == [["b", None, None], ["a", "c", "d"]]
    np.testing.assert_allclose(out.outer_diameter[1], [0.020, 0.040, 0.050], rtol=1e-12)
    assert out.source_slot.tolist() == [0, 0, 1, 2]


def test_a_blank_part_cell_continues_the_part_above():
    out, findings = read([["P1", 1, "a", 40], [None, 2, "b", 60, 40], ["P2", 1, "c", 30]])
    assert findings == []
    assert out.materials.tolist() == [["a", "b"], ["c", None]]


def test_the_first_row_without_a_part_is_refused():
    out, findings = read([[None, 1, "a", 40], ["P1", 1, "a", 40], ["P2", 1, "c", 30]])
    (f,) = findings
    assert (f.code, f.cell, f.values) == ("missing", "A2", (2,))
    assert f.message.startswith("Layers row 2: the layer names no part")
    assert f.message.endswith("; the row is ignored")
    assert out.source_part.tolist() == [-1, 0, 1]


def test_a_part_not_in_the_parts_table():
    out, findings = read([["P1", 1, "a", 40], ["P9", 1, "a", 40], ["P2", 1, "c", 30]])
    (f,) = findings
    assert (f.code, f.cell) == ("unknown-part", "A3")
    assert f.message == "Layers row 3: part P9 is not in the parts table; the layer is ignored"
    assert not out.bad.any()


def test_error_value_in_the_part_cell_of_a_saved_book():
    out, findings = read([["P1", 1, "a", 40], [None, 2, "b", 60], ["P2", 1, "c", 30]], errors={(2, 0): "#N/A"})
    (f,) = findings
    assert (f.code, f.cell) == ("error-value", "A3")
    assert f.message == ("Layers row 3: the part id: the cell holds the error value #N/A; expected a part id; "
                         "the layer is ignored")
    assert out.present.tolist() == [[True, False], [True, False]]


def test_error_text_in_the_part_cell_stops_the_part_above():
    out, findings = read([["P1", 1, "a", 40], ["#REF!", 2, "b", 60], [None, 3, "b", 60], ["P2", 1, "c", 30]])
    codes = [(f.code, f.cell) for f in findings]
    assert codes == [("error-value", "A3"), ("missing", "A4")]
    assert "#REF!" in findings[0].message


def test_layer_number_not_whole():
    out, findings = read([["P1", 1, "a", 40], ["P1", 1.5, "b", 60], ["P2", 1, "c", 30]])
    (f,) = findings
    assert (f.code, f.cell, f.part) == ("layer-number", "B3", "P1")
    assert f.message == "part P1: layer number must be a whole number from 1 (innermost)"
    assert out.bad.tolist() == [True, False]


def test_layer_number_out_of_range_is_told_once():
    out, findings = read([["P1", 0, "a", 40], ["P2", 1, "c", 30]])
    assert [(f.code, f.cell) for f in findings] == [("plausible", "B2")]
    assert findings[0].message.startswith("part P1: layer number (1 = innermost): 0 is outside")
    assert out.bad.tolist() == [True, False]


def test_a_layer_given_twice():
    out, findings = read([["P1", 1, "a", 40], ["P1", 1, "b", 60], ["P2", 1, "c", 30], ["P2", 2, "c", 50, 30]])
    (f,) = findings
    assert (f.code, f.cell, f.part, f.layer) == ("layer-twice", "B3", "P1", 1)
    assert f.message == "part P1, layer 1: the layer is given twice; the part is not rated"
    assert out.bad.tolist() == [True, False]
    assert out.materials[0, 0] == "a"  # the first row is kept
    assert out.present[1].tolist() == [True, True]


def test_missing_diameters_name_their_cells():
    out, findings = read([["P1", 1, "a", None, None], ["P2", 1, "b", 30, None], ["P2", 2, "c", 50, None]])
    got = [(f.code, f.cell, f.part, f.layer, f.message) for f in findings]
    assert got == [
        ("missing", "D2", "P1", 1, "part P1, layer 1: outer diameter is missing"),
        ("missing", "E4", "P2", 2, "part P2, layer 2: inner diameter is missing; expected the outer diameter of "
                                  "layer 1"),
    ]
    assert out.bad.tolist() == [True, True]
    assert out.inner_diameter[1, 0] == 0.0  # blank bore of the innermost layer: solid


def test_a_bad_number_names_part_and_layer():
    out, findings = read([["P1", 1, "a", 40], ["P1", 2, "b", -60], ["P2", 1, "c", 30]])
    (f,) = findings
    assert (f.code, f.cell, f.part, f.layer) == ("sign", "D3", "P1", 2)
    assert f.message.startswith("part P1, layer 2: outer diameter: -60 mm is negative")
    assert out.bad.tolist() == [True, False]


def test_a_part_with_no_layer_rows():
    out, findings = read([["P1", 1, "a", 40]])
    (f,) = findings
    assert (f.code, f.sheet, f.cell, f.part) == ("no-layers", None, None, "P2")
    assert f.message == "part P2: no layers in the Layers table"
    assert out.bad.tolist() == [False, True]


def test_material_cell_with_a_modulus_and_an_error():
    out, findings = read([["P1", 1, "80 GPa", 40], ["P1", 2, "#N/A", 60], ["P2", 1, "1045", 30]])
    assert out.shear_modulus[0, 0] == pytest.approx(80e9, rel=1e-12)
    assert out.materials.tolist() == [[None, None], ["1045", None]]
    (f,) = findings
    assert (f.code, f.cell, f.part, f.layer) == ("error-value", "C3", "P1", 2)
    assert f.message == "part P1, layer 2: material: the cell holds the error value #N/A; expected a material name"
    assert out.bad.tolist() == [True, False]


def test_material_error_in_a_saved_book():
    out, findings = read([["P1", 1, "a", 40], ["P2", 1, None, 30]], errors={(2, 2): "#VALUE!"})
    assert [(f.code, f.cell, f.part) for f in findings] == [("error-value", "C3", "P2")]
    assert out.materials[1, 0] is None and out.bad.tolist() == [False, True]


def test_implausible_modulus_is_refused():
    out, findings = read([["P1", 1, "900 GPa", 40], ["P2", 1, "b", 30]])
    (f,) = findings
    assert (f.code, f.cell, f.part, f.layer) == ("plausible", "C2", "P1", 1)
    assert f.message == ("part P1, layer 1: shear modulus G: '900 GPa' is outside the plausible range "
                         "0.1 to 200 GPa (common practice); check the unit")
    assert out.bad.tolist() == [True, False]
    assert math.isnan(out.shear_modulus[0, 0])


def test_a_block_without_part_column_names_rows():
    head = ["Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]"]
    grid = SheetGrid("B", [head, [1, "a", 40, None], [2, "b", -5, 40]])
    spot = locate_table(grid, LAYER_ROW_FIELDS, None)
    assert part_keys(grid, spot) == ([None, None], [False, False])
    findings = []
    out = layers_from_rows(grid, spot, [""], findings)
    (f,) = findings
    assert (f.code, f.cell) == ("sign", "C3")
    assert f.message.startswith("row 3, layer 2: outer diameter:")
    assert out.materials.tolist() == [["a", "b"]]


def test_a_block_without_part_and_layer_columns():
    head = ["Material", "Outer diameter [mm]"]
    grid = SheetGrid("B", [head, ["a", -4]])
    spot = locate_table(grid, LAYER_ROW_FIELDS, None)
    findings = []
    out = layers_from_rows(grid, spot, [""], findings, positions=None)
    assert findings[0].message.startswith("row 2, layer 1: outer diameter:")
    assert out.present.tolist() == [[True]]


def test_bad_layer_cell_names_the_row():
    out, findings = read([["P1", "x", "a", 40], ["P2", 1, "c", 30]])
    assert [(f.code, f.cell) for f in findings] == [("unit", "B2")]
    assert findings[0].message.startswith("part P1: layer number (1 = innermost): 'x'")


def test_part_keys_and_positions():
    grid = SheetGrid("L", [["Part", "Layer", "OD [mm]"], ["A", 1, 1], [None, 2, 1], ["B", 1, 1]])
    spot = locate_table(grid, LAYER_ROW_FIELDS, "part")
    keys, errors = part_keys(grid, spot)
    assert keys == ["A", "A", "B"] and errors == [False, False, False]
    ids, group = part_positions([None, "A", "B", None, "A"])
    assert ids == ["A", "B"] and group.tolist() == [-2, 0, 1, -2, 0]
    ids, group = part_positions(["A", None, "B"])
    assert ids == ["A", "B"] and group.tolist() == [0, -2, 1]
    ids, group = part_positions(["A", "B"])
    assert ids == ["A", "B"] and group.tolist() == [0, 1]


def test_positions_given_as_from_the_table_itself():
    grid = SheetGrid("L", [HEAD, ["B", 1, "x", 10], ["A", 1, "y", 20], [None, 2, "z", 30, 20]])
    spot = locate_table(grid, LAYER_ROW_FIELDS, "part")
    keys = part_keys(grid, spot)
    ids, positions = part_positions(keys[0])
    findings = []
    out = layers_from_rows(grid, spot, ids, findings, keys, positions)
    assert ids == ["B", "A"] and findings == []
    assert out.materials.tolist() == [["x", None], ["y", "z"]]


def test_every_row_named_and_one_is_an_error_text():
    out, findings = read([["P1", 1, "a", 40], ["#REF!", 2, "b", 60, 40], ["P2", 1, "c", 30]])
    assert [(f.code, f.cell) for f in findings] == [("error-value", "A3")]


def test_a_bad_header_unit_is_told_once():
    head = ["Part", "Layer", "Material", "Outer diameter [kg]"]
    out, findings = read([["P1", 1, "a", 40], ["P2", 1, "c", 30]], head=head)
    assert [f.cell for f in findings if f.code == "header-unit"] == ["D1"]


def test_a_table_with_a_header_only():
    out, findings = read([])
    assert out.present.shape == (2, 1)
    assert [(f.code, f.part) for f in findings] == [("no-layers", "P1"), ("no-layers", "P2")]


def test_a_row_whose_layer_cell_is_bad_is_named_without_a_layer():
    out, findings = read([["P1", "x", "a", -40], ["P2", 1, "c", 30]])
    msgs = [f.message for f in findings]
    assert any(m.startswith("part P1: outer diameter: -40 mm is negative") for m in msgs)
    head = ["Layer", "Material", "Outer diameter [mm]"]
    grid = SheetGrid("B", [head, ["x", "a", -40]])
    findings = []
    layers_from_rows(grid, locate_table(grid, LAYER_ROW_FIELDS, None), [""], findings)
    assert any(f.message.startswith("row 2: outer diameter: -40 mm is negative") for f in findings)


def test_a_table_without_material_column():
    head = ["Part", "Layer", "Outer diameter [mm]"]
    out, findings = read([["P1", 1, 40], ["P2", 1, 30]], head=head)
    assert findings == [] and out.materials.tolist() == [[None], [None]]
    np.testing.assert_allclose(out.outer_diameter[:, 0], [0.040, 0.030], rtol=1e-12)


def test_layers_of_different_parts_never_count_as_twice():
    out, findings = read([["P1", 1, "a", 40], ["P1", 2, "b", 60, 40], ["P3", 1, "c", 30]], ids=("P1", "P2", "P3"))
    assert [f.code for f in findings] == ["no-layers"] and findings[0].part == "P2"
    assert out.present.tolist() == [[True, True], [False, False], [True, False]]


def test_absent_layers_have_no_cell_and_refused_rows_no_slot():
    out, findings = read([["P9", 1, "a", 40], ["P1", 1, "a", 40], ["P2", 1, "c", 30], ["P2", 2, "c", 50, 30]])
    assert out.cells.get((0, 1, "outer_diameter")) is None
    assert out.cells.get((1, 1, "outer_diameter")) == ("Layers", "D5")
    assert out.source_part.tolist() == [-1, 0, 1, 1]
    assert out.source_slot.tolist() == [-1, 0, 0, 1]


def test_an_error_cell_in_a_table_without_material_column():
    head = ["Part", "Layer", "Outer diameter [mm]"]
    out, findings = read([["P1", 1, None], ["P2", 1, 30]], head=head, errors={(1, 2): "#N/A"})
    assert [(f.code, f.cell) for f in findings] == [("error-value", "C2")]
