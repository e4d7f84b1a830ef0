"""A part's loads beyond torsion read from its table, and the layer properties they need.

Expected values come from the sheet each test writes (the cells, the SI values: N·m, N and mm to
m by the SI prefixes, NIST SP 811) and the end conditions named in the whirl module's docstring
(simply supported, clamped, overhung: the textbook beam cases, e.g. Roark's Formulas for Stress
and Strain, from memory)."""

import numpy as np
import pytest
from twistshare.engine.core import EndSupport
from twistshare.engine.intake._cellrefs import CellRefs
from twistshare.engine.intake._grid import SheetGrid
from twistshare.engine.intake._loads import load_problems, read_loads
from twistshare.engine.intake._problems import Severity
from twistshare.engine.intake._schema import PART_FIELDS
from twistshare.engine.intake._tables import locate_table

NAN = np.nan


def _read(rows):
    grid = SheetGrid("Parts", [["Part", "Torque [N·m]", "Bending moment [N·m]", "Axial force [kN]",
                                "Bearing span [mm]", "Supports"], *rows])
    spot = locate_table(grid, PART_FIELDS, "part")
    data = list(spot.data_rows)
    ids = [grid.rows[r][0] for r in data]
    findings, cells = [], CellRefs("Parts", data)
    loads = read_loads(grid, spot, data, ids, lambda r: f"part {grid.rows[r][0]}", findings, set(), cells)
    return loads, findings, cells


def test_loads_are_read_in_si_and_their_cells_remembered():
    loads, findings, cells = _read([["P1", 10, 20, 3, 500, "clamped"], ["P2", 10, None, None, None, None]])
    assert findings == []
    assert loads.inputs["bending_moment"] == pytest.approx([20.0, NAN], nan_ok=True)
    assert loads.inputs["axial_force"] == pytest.approx([3000.0, NAN], nan_ok=True)
    assert loads.inputs["bearing_span"] == pytest.approx([0.5, NAN], nan_ok=True)
    assert loads.inputs["end_support"][0] == float(EndSupport.FIXED_FIXED)
    assert np.isnan(loads.inputs["end_support"][1])  # blank: simply supported, by the core's default
    assert loads.bad.tolist() == [False, False]
    assert cells[(1, "bending_moment")] == ("Parts", "C3")
    assert cells[(0, "axial_force")] == ("Parts", "D2")
    assert cells[(0, "bearing_span")] == ("Parts", "E2")
    assert cells[(1, "end_support")] == ("Parts", "F3")


def test_a_blank_support_does_not_stop_the_next_word_being_read():
    loads, findings, _ = _read([["P1", 10, None, None, None, None], ["P2", 10, None, None, None, "overhung"]])
    assert findings == []
    assert loads.inputs["end_support"][1] == float(EndSupport.FIXED_FREE)


def test_an_unknown_support_word_refuses_the_part_at_its_cell():
    loads, findings, _ = _read([["P1", 10, None, None, None, "welded"], ["P2", 10, None, None, None, "clamped"]])
    (p,) = findings
    assert (p.severity, p.sheet, p.cell, p.part, p.code) == (Severity.ERROR, "Parts", "F2", "P1", "support-word")
    assert p.message.startswith("part P1: supports ") and "welded" in p.message
    assert "clamped" in p.message and p.message.endswith("the part is not rated")
    assert loads.bad.tolist() == [True, False]
    assert loads.inputs["end_support"][1] == float(EndSupport.FIXED_FIXED)


def test_a_table_without_load_columns_reads_none():
    grid = SheetGrid("Parts", [["Part", "Torque [N·m]", "Supports"], ["P1", 5, None], ["P2", 5, "clamped"]])
    spot = locate_table(grid, PART_FIELDS, "part")
    data = list(spot.data_rows)
    loads = read_loads(grid, spot, data, ["P1", "P2"], lambda r: "x", [], set(), CellRefs("Parts", data))
    assert set(loads.inputs) == {"end_support"}
    assert loads.inputs["end_support"][1] == float(EndSupport.FIXED_FIXED)


# load_problems: what a loaded part needs of its layers

def _problems(inputs, present, materials, duty_source=None, cells=None):
    findings, error = [], np.zeros(len(present), bool)
    load_problems(inputs, np.array(present), np.array(materials, object), [f"S{i + 1}" for i in range(len(present))],
                  cells, "Parts", findings, error, duty_source)
    return findings, error


def test_an_axial_force_without_e_names_the_layer_its_material_and_the_force_cell():
    cells = CellRefs("Parts", [1, 2])
    cells.column(("axial_force",), 3)
    cells.column(("bending_moment",), 2)
    inputs = {"axial_force": np.array([NAN, 1000.0]), "youngs_modulus": np.array([[200e9, NAN], [200e9, NAN]])}
    findings, error = _problems(inputs, [[True, True], [True, True]], [["A", "B"], ["Steel", "Bronze X"]],
                                cells=cells)
    (p,) = findings
    assert error.tolist() == [False, True]
    assert (p.severity, p.sheet, p.cell, p.part, p.layer, p.code) == (Severity.ERROR, "Parts", "D3", "S2", 2,
                                                                      "missing")
    assert p.message.startswith("part S2, layer 2: an axial force is given, so the combined stress needs every "
                                "layer's Young's modulus E")
    assert "its material 'Bronze X' gives none" in p.message
    assert p.message.endswith("the part is not rated")


def test_a_bending_moment_is_named_before_a_force_and_a_g_only_layer_is_told():
    cells = CellRefs("Parts", [1])
    cells.column(("axial_force",), 3)
    cells.column(("bending_moment",), 2)
    inputs = {"bending_moment": np.array([5.0]), "axial_force": np.array([10.0]),
              "youngs_modulus": np.array([[NAN, 200e9]])}
    findings, _ = _problems(inputs, [[True, True]], [[None, "Steel"]], cells=cells)
    (p,) = findings
    assert p.cell == "C2" and p.layer == 1
    assert "a bending moment is given" in p.message
    assert "it is given by its G alone and has none" in p.message


def test_an_absent_layer_needs_no_e_and_no_cell_map_leaves_the_cell_blank():
    inputs = {"bending_moment": np.array([5.0]), "youngs_modulus": np.array([[200e9, NAN]])}
    findings, error = _problems(inputs, [[True, False]], [["Steel", None]])
    assert findings == [] and error.tolist() == [False]
    findings, _ = _problems({"bending_moment": np.array([5.0])}, [[True]], [["Steel"]])
    (p,) = findings
    assert (p.sheet, p.cell) == ("Parts", None)


def _whirl(support, speed, e, rho, duty_source=None, present=((True,),)):
    inputs = {"speed": np.array([speed]), "youngs_modulus": np.array([e]), "density": np.array([rho])}
    if support is not None:
        inputs["end_support"] = np.array([support])
    findings, _ = _problems(inputs, [list(present[0])], [["Steel"] * len(e)], duty_source)
    return [p for p in findings if p.code == "whirl-not-checked"]


def test_whirl_asked_by_a_support_word_is_noted_when_e_or_density_is_missing():
    (p,) = _whirl(1.0, 100.0, [200e9], [NAN])
    assert p.severity is Severity.NOTE and p.part == "S1"
    assert p.message.startswith("part S1: whirl is not checked")
    assert "Young's modulus E" in p.message
    assert p.message.endswith("density (both are needed for the first critical speed)")
    assert len(_whirl(1.0, 100.0, [NAN], [7850.0])) == 1
    assert _whirl(1.0, 100.0, [200e9], [7850.0]) == []  # both known: checked, nothing to say
    assert _whirl(1.0, NAN, [200e9], [NAN]) == []  # no speed: nothing to check
    assert _whirl(None, 100.0, [200e9], [NAN]) == []  # not asked for: silent
    assert _whirl(1.0, 100.0, [200e9, NAN], [7850.0, NAN], present=((True, False),)) == []  # absent layer


def test_whirl_asked_by_a_speed_beside_a_torque_only():
    assert len(_whirl(None, 100.0, [200e9], [NAN], duty_source=["torque"])) == 1
    assert _whirl(None, 100.0, [200e9], [NAN], duty_source=["power"]) == []
    assert len(_whirl(1.0, 100.0, [200e9], [NAN], duty_source=["power"])) == 1  # the support word still asks


def test_a_part_refused_already_gets_no_whirl_note():
    inputs = {"speed": np.array([100.0]), "end_support": np.array([1.0]), "bending_moment": np.array([1.0]),
              "youngs_modulus": np.array([[NAN]]), "density": np.array([[NAN]])}
    findings, _ = _problems(inputs, [[True]], [["Steel"]])
    assert [p.code for p in findings] == ["missing"]


def test_the_whirl_note_sits_on_the_speed_cell():
    cells = CellRefs("Parts", [6])
    cells.column(("speed",), 4)
    inputs = {"speed": np.array([100.0]), "end_support": np.array([1.0]),
              "youngs_modulus": np.array([[200e9]]), "density": np.array([[NAN]])}
    findings, _ = _problems(inputs, [[True]], [["Steel"]], cells=cells)
    (p,) = findings
    assert (p.sheet, p.cell) == ("Parts", "E7")


def test_an_axial_force_column_alone_is_read():
    grid = SheetGrid("Parts", [["Part", "Torque [N·m]", "Axial force [N]"], ["P1", 5, 250]])
    spot = locate_table(grid, PART_FIELDS, "part")
    data = list(spot.data_rows)
    loads = read_loads(grid, spot, data, ["P1"], lambda r: "part P1", [], set(), CellRefs("Parts", data))
    assert loads.inputs["axial_force"].tolist() == [250.0]
    assert "bending_moment" not in loads.inputs


def test_an_unreadable_load_cell_makes_its_part_unratable_whichever_column():
    loads, findings, _ = _read([["P1", 10, "abc", 1, None, None], ["P2", 10, 5, "xyz", None, None],
                                ["P3", 10, 5, 1, None, None]])
    assert loads.bad.tolist() == [True, True, False]
    assert {p.cell for p in findings} == {"C2", "D3"}


def test_the_layer_properties_reach_the_load_checks_from_the_materials_table():
    import sys
    from pathlib import Path
    sys.path.insert(0, str(Path(__file__).parent))
    from _membook import MemoryBook
    from twistshare.engine.intake import rate_tables

    mats = [["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Density [kg/m3]", "Allowable shear [MPa]",
             "Factor of safety"],
            ["Alpha", 80, 200, 0.3, 7850, 120, None], ["Bare", 80, None, None, None, 120, None]]
    head = ["Part", "Length [mm]", "Torque [N·m]", "Speed [rpm]", "Supports", "Bending moment [N·m]",
            "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 1 inner diameter [mm]"]
    parts = [head, ["P1", 500, 100, 1000, "clamped", 5, "Alpha", 30, 0],
             ["P2", 500, 100, 1000, "clamped", 5, "Bare", 30, 0],
             ["P3", 500, 100, 1000, "clamped", None, "Bare", 30, 0]]
    result = rate_tables(MemoryBook({"Materials": mats, "Parts": parts}))
    codes = {(p.part, p.code) for p in result.problems}
    assert ("P1", "missing") not in codes and ("P1", "whirl-not-checked") not in codes
    assert ("P2", "missing") in codes  # a bending moment without E
    assert ("P3", "whirl-not-checked") in codes  # a speed and supports without E or density
    assert result.rated.tolist() == [True, False, True]
