"""Layers from ``Layer n ...`` column groups on each part's row (`_layers`): SI values (NIST SP 811:
1 mm = 1e-3 m, 1 GPa = 1e9 Pa), a material cell read as a name or as G with its unit, and which
cell, part and layer each finding names (the cells this test wrote)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from twistshare.engine.intake._grid import SheetGrid
from twistshare.engine.intake._layers import LayerArrays, layers_from_groups, row_labels, row_position
from twistshare.engine.intake._problems import Severity
from twistshare.engine.intake._schema import PART_FIELDS
from twistshare.engine.intake._tables import locate_table

HEAD = ["Part", "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 1 inner diameter [mm]",
        "Layer 2 material", "Layer 2 outer diameter [mm]", "Layer 2 inner diameter [mm]", "Layer 2 Kt",
        "Layer 2 allowable [MPa]"]


def read(rows, head=HEAD, errors=None):
    grid = SheetGrid("Parts", [head, *rows], errors=errors or {})
    spot = locate_table(grid, PART_FIELDS, "part", layer_groups=True)
    ids = [r[0] for r in rows]
    findings = []
    out = layers_from_groups(grid, spot, list(spot.data_rows), ids, findings, set())
    return out, findings


def test_two_layers_in_si():
    out, findings = read([["P1", "steel", 40, None, "bronze", 60, 40, 1.5, 90],
                          ["P2", "steel", 30, 10, None, None, None, None, None]])
    assert findings == []
    np.testing.assert_allclose(out.outer_diameter, [[0.040, 0.060], [0.030, np.nan]], rtol=1e-12)
    np.testing.assert_allclose(out.inner_diameter, [[0.0, 0.040], [0.010, np.nan]], rtol=1e-12)
    np.testing.assert_allclose(out.kt, [[1.0, 1.5], [1.0, 1.0]])
    np.testing.assert_allclose(out.allowable_shear, [[np.nan, 90e6], [np.nan, np.nan]], rtol=1e-12)
    assert out.present.tolist() == [[True, True], [True, False]]
    assert out.materials.tolist() == [["steel", "bronze"], ["steel", None]]
    assert not out.bad.any()
    assert out.cells[(0, 1, "outer_diameter")] == ("Parts", "F2")
    assert out.cells[(1, 0, "material")] == ("Parts", "B3")


def test_no_layer_columns():
    grid = SheetGrid("Parts", [["Part", "Torque [N·m]"], ["P1", 5], ["P2", 6]])
    spot = locate_table(grid, PART_FIELDS, "part", layer_groups=True)
    findings = []
    out = layers_from_groups(grid, spot, [1, 2], ["P1", "P2"], findings, set())
    (f,) = findings
    assert (f.code, f.cell, f.severity) == ("no-layers", "A1", Severity.ERROR)
    assert "expected 'Layer 1 material', 'Layer 1 outer diameter [mm]'" in f.message
    assert out.bad.tolist() == [True, True]


def test_a_kt_alone_is_not_a_layer():
    out, findings = read([["P1", "steel", 40, None, None, None, None, 2.0, None]])
    (f,) = findings
    assert (f.code, f.severity, f.cell, f.part, f.layer) == ("stray-kt", Severity.WARNING, "H2", "P1", 2)
    assert f.message == ("part P1, layer 2: Kt is given but the layer has no material and no diameters; "
                         "the slot is ignored")
    assert out.present.tolist() == [[True, False]] and not out.bad.any()


def test_missing_diameters_name_their_cells():
    out, findings = read([["P1", "steel", None, None, "bronze", 60, None, None, None],
                          ["P2", "steel", 30, None, "bronze", 50, None, None, None]])
    got = [(f.code, f.cell, f.part, f.layer, f.message) for f in findings]
    assert got == [
        ("missing", "C2", "P1", 1, "part P1, layer 1: outer diameter is missing"),
        ("missing", "G3", "P2", 2, "part P2, layer 2: inner diameter is missing; expected the outer diameter "
                                  "of layer 1"),
    ]
    assert out.bad.tolist() == [True, True]


def test_one_message_per_part_and_cause():
    out, findings = read([["P1", "steel", -40, None, "bronze", None, None, None, None]])
    # the bad outer diameter of layer 1 marks the part: layer 2's missing diameters are not told again
    assert [(f.code, f.cell) for f in findings] == [("sign", "C2")]
    assert findings[0].message.startswith("part P1, layer 1: outer diameter: -40 mm is negative")
    assert (findings[0].part, findings[0].layer) == ("P1", 1)


def test_a_material_cell_holding_a_modulus():
    out, findings = read([["P1", "79.3 GPa", 40, None, "1045", 60, 40, None, None],
                          ["P2", "+80GPa", 40, None, None, None, None, None, None]])
    assert findings == []
    assert out.shear_modulus[0, 0] == pytest.approx(79.3e9, rel=1e-12)
    assert out.shear_modulus[1, 0] == pytest.approx(80e9, rel=1e-12)
    assert out.materials.tolist() == [[None, "1045"], [None, None]]
    assert math.isnan(out.shear_modulus[0, 1])
    assert out.present.tolist() == [[True, True], [True, False]]


def test_a_material_cell_starting_with_a_point():
    out, findings = read([["P1", ".08 TPa", 40, None, None, None, None, None, None],
                          ["P2", "-alloy", 40, None, None, None, None, None, None]])
    assert out.shear_modulus[0, 0] == pytest.approx(80e9, rel=1e-12)  # 1 TPa = 1e12 Pa (SI prefix)
    assert out.materials.tolist() == [[None, None], ["-alloy", None]]


def test_a_negative_or_huge_modulus_is_refused_in_gpa():
    out, findings = read([["P1", "900 GPa", 40, None, None, None, None, None, None],
                          ["P2", "-5 GPa", 40, None, None, None, None, None, None]])
    assert [(f.code, f.cell, f.part, f.layer) for f in findings] == [("plausible", "B2", "P1", 1),
                                                                     ("plausible", "B3", "P2", 1)]
    assert findings[0].message == ("part P1, layer 1: shear modulus G: '900 GPa' is outside the plausible "
                                   "range 0.1 to 200 GPa (common practice); check the unit")
    assert out.bad.tolist() == [True, True]
    assert out.present.tolist() == [[True, False], [True, False]]  # a refused G still makes the layer


def test_range_edges_of_the_modulus():
    out, findings = read([["P1", "200 GPa", 40, None, None, None, None, None, None],
                          ["P2", "0.1 GPa", 40, None, None, None, None, None, None]])
    assert findings == []
    np.testing.assert_allclose(out.shear_modulus[:, 0], [200e9, 0.1e9], rtol=1e-12)


def test_a_material_column_with_a_unit_reads_moduli():
    head = ["Part", "Layer 1 G [GPa]", "Layer 1 outer diameter [mm]"]
    out, findings = read([["P1", 80, 40], ["P2", 900, 40]], head=head)
    assert out.shear_modulus[0, 0] == pytest.approx(80e9, rel=1e-12)
    assert out.materials.tolist() == [[None], [None]]
    (f,) = findings
    assert (f.code, f.cell) == ("plausible", "B3")
    assert f.message.startswith("part P2, layer 1: shear modulus G: 900 GPa is outside")
    assert out.bad.tolist() == [False, True]


def test_material_error_values():
    out, findings = read([["P1", "#N/A", 40, None, None, None, None, None, None],
                          ["P2", "Err:502", 40, None, None, None, None, None, None],
                          ["P3", "Elastomer", 40, None, None, None, None, None, None]])
    assert [(f.code, f.cell, f.part, f.layer) for f in findings] == [("error-value", "B2", "P1", 1),
                                                                     ("error-value", "B3", "P2", 1)]
    assert findings[0].message == "part P1, layer 1: material: the cell holds the error value #N/A; expected a " \
                                  "material name"
    assert out.materials[:, 0].tolist() == [None, None, "Elastomer"]
    assert out.bad.tolist() == [True, True, False]


def test_material_error_of_a_saved_book():
    out, findings = read([["P1", None, 40, None, None, None, None, None, None],
                          ["P2", "steel", 40, None, None, None, None, None, None]], errors={(1, 1): "#REF!"})
    assert [(f.code, f.cell) for f in findings] == [("error-value", "B2")]
    assert out.bad.tolist() == [True, False]


def test_row_labels_and_tags():
    who = row_labels(["P1", None], [4, 6], layer=2)
    assert who(4) == "part P1, layer 2" and who.tag(4) == ("P1", 2)
    assert who(6) == "row 7, layer 2" and who.tag(6) == (None, 2)
    assert who(9) == "row 10, layer 2" and who.tag(9) == (None, 2)
    plain = row_labels(["P1"], [4])
    assert plain(4) == "part P1" and plain.tag(4) == ("P1", None)


def test_row_position():
    pos = row_position([3, 5, 9])
    assert (pos(3), pos(9), pos(4)) == (0, 2, None)
    assert row_position([])(0) is None


def test_empty_layer_arrays():
    from twistshare.engine.intake._cellrefs import CellRefs

    a = LayerArrays.empty(2, 0, CellRefs("S", []))
    assert a.outer_diameter.shape == (2, 1) and np.isnan(a.outer_diameter).all()
    assert (a.kt == 1.0).all() and not a.present.any() and not a.bad.any()
    assert a.materials.tolist() == [[None], [None]]
    assert a.source_part is None and a.source_slot is None


def test_a_modulus_after_a_name_in_the_same_column():
    out, findings = read([["P1", "steel", 40, None, None, None, None, None, None],
                          ["P2", "80 GPa", 40, None, None, None, None, None, None],
                          ["P3", "1045", 40, None, None, None, None, None, None],
                          ["P4", "70 GPa", 40, None, None, None, None, None, None]])
    assert findings == []
    assert out.materials[:, 0].tolist() == ["steel", None, "1045", None]
    np.testing.assert_allclose(out.shear_modulus[[1, 3], 0], [80e9, 70e9], rtol=1e-12)


def test_a_missing_bore_above_the_innermost_layer_stays_unknown():
    out, findings = read([["P1", "steel", 40, None, "bronze", 60, None, None, None]])
    assert out.inner_diameter[0, 0] == 0.0 and math.isnan(out.inner_diameter[0, 1])


def test_a_layer_group_without_outer_diameter_or_material_column():
    head = ["Part", "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 2 inner diameter [mm]"]
    out, findings = read([["P1", "steel", 40, 40]], head=head)
    (f,) = findings
    assert (f.code, f.part, f.layer) == ("missing", "P1", 2)
    assert f.message == "part P1, layer 2: outer diameter is missing"
    assert out.inner_diameter[0, 1] == pytest.approx(0.040, rel=1e-12)
    assert out.materials.tolist() == [["steel", None]]


def test_a_layer_given_by_its_modulus_alone():
    out, findings = read([["P1", "steel", 40, None, "80 GPa", None, None, None, None]])
    assert out.present.tolist() == [[True, True]]
    # the missing outer diameter marks the part; its missing bore is not told again
    assert [(f.code, f.layer, f.cell) for f in findings] == [("missing", 2, "F2")]


def test_an_error_text_after_a_name():
    out, findings = read([["P1", "steel", 40, None, None, None, None, None, None],
                          ["P2", "#N/A", 40, None, None, None, None, None, None]])
    assert [(f.code, f.cell) for f in findings] == [("error-value", "B3")]
