"""The whole-column readings of a layer table: the type counts, the grouping of repeated texts,
the runs of part ids and the grouped material names.

Each fast path must give what the table says, cell by cell: the expected values come from the
rows each test writes (which part a row names, which layer it is, which material), and the
library's shear moduli from `find_material` (the library's own cited values).
"""

from __future__ import annotations

import numpy as np
import pytest
from twistshare.engine.core import find_material
from twistshare.engine.intake import (
    LAYER_ROW_FIELDS,
    MaterialSet,
    SheetGrid,
    all_of_type,
    locate_table,
    number_count,
    read_layer_table_parts,
    row_array,
)
from twistshare.engine.intake._columns import drop_key, first_seen_index
from twistshare.engine.intake._layer_rows import part_keys, part_positions, part_rows

HEADER = ["Part", "Material", "Outer diameter [mm]", "Inner diameter [mm]", "Allowable [MPa]", "Kt"]
STEEL, BRONZE = "AISI 1045 hot rolled", "Aluminium bronze C95400 as cast"


def _table(rows, rectangular=True):
    grid = SheetGrid("Layers", [HEADER, *rows], rectangular=rectangular)
    spot = locate_table(grid, LAYER_ROW_FIELDS, None, header_row=0)
    assert spot is not None
    return grid, spot


def _parts(rows, rectangular=True):
    grid, spot = _table(rows, rectangular)
    problems: list = []
    return read_layer_table_parts(grid, spot, MaterialSet(), problems), problems


# --- type counts -------------------------------------------------------------------------

def test_number_count_counts_plain_numbers_only():
    # A yes/no is a bool (a subclass of int) and a numpy scalar is not a cell value: neither
    # is a plain number, so a column holding one is read cell by cell.
    assert number_count([1.0, 2, 3.5]) == 3
    assert number_count([1.0, True, "2", None, np.float64(3.0)]) == 1
    assert number_count([]) == 0


def test_all_of_type_is_exact():
    class Name(str):
        pass

    assert all_of_type(["a", "b"], str)
    assert not all_of_type(["a", Name("b")], str)
    assert not all_of_type(["a", None], str)
    assert all_of_type([], str)


# --- grouping ----------------------------------------------------------------------------

def test_first_seen_index_and_drop_key():
    distinct, index = first_seen_index(["B", "A", "B", None, "C", "A"])
    assert distinct == ["B", "A", None, "C"]
    assert index.tolist() == [0, 1, 0, 2, 3, 1]
    kept, index = drop_key(distinct, index, None, -1)
    assert kept == ["B", "A", "C"]
    assert index.tolist() == [0, 1, 0, -1, 2, 1]
    same, again = drop_key(["x"], np.array([0, 0]), None, -1)
    assert same == ["x"] and again.tolist() == [0, 0]


@pytest.mark.parametrize("rows", [[3, 4, 5, 6], [3, 5, 9], [0, 3], [0, 1, 4], [7], []])
def test_row_array_gives_the_rows(rows):
    got = row_array(rows)
    assert got.dtype == np.intp
    assert got.tolist() == rows


# --- part ids by runs ----------------------------------------------------------------------

def _layer(part, material, outer, inner):
    return [part, material, outer, inner, 80.0, 1.0]


@pytest.mark.parametrize("ids, expect_ids, expect_positions", [
    (["P1", "P1", "P2", "P3", "P3"], ["P1", "P2", "P3"], [0, 0, 1, 2, 2]),
    # a part whose rows are split: still one part, in order of first appearance
    (["P1", "P2", "P1", "P3"], ["P1", "P2", "P3"], [0, 1, 0, 2]),
    # spaces around an id and a blank (continuing the part above) are read cell by cell
    (["P1", " P1 ", "P2", None], ["P1", "P2"], [0, 0, 1, 1]),
    # an empty text (as a host passes an empty cell) continues the part above, like None
    (["P1", "", "P2"], ["P1", "P2"], [0, 0, 1]),
    # spaces around an id, no blank: the same part
    (["P1", " P1 ", "P2"], ["P1", "P2"], [0, 0, 1]),
    # ids typed as numbers read as their text
    ([1001.0, 1001.0, 1002.0], ["1001", "1002"], [0, 0, 1]),
])
def test_part_rows_match_the_part_column(ids, expect_ids, expect_positions):
    grid, spot = _table([_layer(pid, STEEL, 40.0, 0.0) for pid in ids])
    (keys, errors), got_ids, positions = part_rows(grid, spot)
    assert got_ids == expect_ids
    assert positions.tolist() == expect_positions
    assert errors == [False] * len(ids)
    # the same as the cell-by-cell reading of the column
    slow_keys, slow_errors = part_keys(grid, spot)
    assert slow_errors == [False] * len(ids)
    assert list(keys) == slow_keys
    assert part_positions(slow_keys)[0] == expect_ids


def test_part_rows_error_value_names_no_part():
    grid, spot = _table([_layer("P1", STEEL, 40.0, 0.0), _layer("#N/A", STEEL, 40.0, 0.0),
                         _layer("P2", STEEL, 40.0, 0.0)])
    (keys, errors), ids, positions = part_rows(grid, spot)
    assert ids == ["P1", "P2"]
    assert errors == [False, True, False]
    assert positions.tolist() == [0, -2, 1]


# --- the block read whole ------------------------------------------------------------------

def test_split_part_is_rated_as_one_with_its_layers_in_order():
    # P1's second layer comes after P2's row: it is still P1's layer 2.
    parts, problems = _parts([_layer("P1", STEEL, 40.0, 0.0), _layer("P2", BRONZE, 30.0, 0.0),
                              _layer("P1", BRONZE, 50.0, 40.0)])
    assert parts.ids == ["P1", "P2"]
    assert parts.present.tolist() == [[True, True], [True, False]]
    assert parts.outer_diameter[0].tolist() == pytest.approx([0.040, 0.050])  # mm -> m, by the header
    assert parts.materials[0].tolist() == [STEEL, BRONZE]
    assert parts.materials[1, 0] == BRONZE
    assert parts.source_part.tolist() == [0, 1, 0]
    assert parts.source_slot.tolist() == [0, 0, 1]
    assert not [p for p in problems if p.code not in ("library-default",)]


def test_material_names_differing_by_spaces_are_one_material():
    parts, problems = _parts([_layer("P1", STEEL, 40.0, 0.0), _layer("P1", f"  {BRONZE} ", 50.0, 40.0),
                       _layer("P2", BRONZE, 30.0, 0.0), _layer("P2", f"{STEEL} ", 45.0, 30.0)])
    assert parts.materials.tolist() == [[STEEL, BRONZE], [BRONZE, STEEL]]
    steel, bronze = find_material(STEEL).shear_modulus, find_material(BRONZE).shear_modulus
    assert parts.shear_modulus.tolist() == [[steel, bronze], [bronze, steel]]
    # the library note is given once per material, where it is first used
    notes = [(p.part, p.layer) for p in problems if p.code == "library-default"]
    assert notes == [("P1", 1)]


def test_a_modulus_with_its_unit_among_names_is_the_layers_own_g():
    # "79 GPa" in a material cell is the layer's own shear modulus (the column then takes the
    # cell-by-cell path); the names beside it are still looked up.
    parts, problems = _parts([_layer("P1", "79 GPa", 40.0, 0.0), _layer("P1", BRONZE, 50.0, 40.0)])
    assert parts.shear_modulus[0, 0] == pytest.approx(79e9)  # GPa -> Pa
    assert parts.shear_modulus[0, 1] == find_material(BRONZE).shear_modulus
    assert parts.materials[0].tolist() == [None, BRONZE]


def test_blank_material_is_found_on_its_cell():
    parts, problems = _parts([_layer("P1", STEEL, 40.0, 0.0), _layer("P1", "   ", 50.0, 40.0),
                              _layer("P2", STEEL, 30.0, 0.0)])
    missing = [p for p in problems if p.code == "missing"]
    assert [(p.part, p.layer, p.cell) for p in missing] == [("P1", 2, "B3")]
    assert parts.materials[:, 0].tolist() == [STEEL, STEEL] and parts.materials[0, 1] is None
    assert parts.input_error.tolist() == [True, False]


def test_ragged_rows_read_as_padded():
    # A grid whose rows differ in length (a saved sheet) is transposed with blanks filled in.
    rows = [_layer("P1", STEEL, 40.0, 0.0), ["P2", STEEL, 30.0]]
    parts, problems = _parts(rows, rectangular=False)
    assert parts.ids == ["P1", "P2"]
    assert parts.inner_diameter[1, 0] == 0.0  # a blank bore on the innermost layer: a solid core
    assert parts.outer_diameter[1, 0] == pytest.approx(0.030)



def test_an_error_value_in_a_material_cell_stops_its_part_only():
    # the error arrives as its text in a host's block (#N/A); the names around it are grouped
    parts, problems = _parts([_layer("P1", STEEL, 40.0, 0.0), _layer("P1", "#N/A", 50.0, 40.0),
                              _layer("P2", BRONZE, 30.0, 0.0)])
    errors = [(p.part, p.layer, p.cell, p.code) for p in problems if p.code == "error-value"]
    assert errors == [("P1", 2, "B3", "error-value")]
    assert [p.code for p in problems if p.cell == "B3"] == ["error-value"]  # told once, not as a name too
    assert parts.materials[0].tolist() == [STEEL, None]
    assert parts.input_error.tolist() == [True, False]


def test_a_rectangular_grid_reads_every_column_and_nothing_past_it():
    rows = [["a", 1.0, 2.0], ["b", 3.0, 4.0]]
    grid = SheetGrid("S", rows, rectangular=True)
    assert grid.cells(0, [0, 1]) == ["a", "b"]          # the first column
    assert grid.cells(2, [0, 1]) == [2.0, 4.0]          # the last
    assert grid.cells(3, [0, 1]) == [None, None]        # past the last: empty cells
    assert grid.cells(1, [1]) == [3.0]
    one = SheetGrid("S", [["x", 5.0]], rectangular=True)
    assert one.cells(1, [0]) == [5.0]                   # a one-row range
    assert SheetGrid("S", [], rectangular=True).cells(0, []) == []
