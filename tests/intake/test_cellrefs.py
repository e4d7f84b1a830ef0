"""Where an input came from: (part, ..., field) -> (sheet, A1). Expected addresses are written
by hand from the A1 convention (column letters A..Z, AA..; rows counted from 1, the sheet's
zero-based row r is row r + 1), from the rows and columns each test registers itself."""

import numpy as np
import pytest
from twistshare.engine.intake._cellrefs import CellRefs


def test_a_registered_column_names_the_cell_of_each_part_row():
    refs = CellRefs("Parts", [4, 9, 27])  # parts 0, 1, 2 sit on sheet rows 5, 10, 28
    refs.column((0, "kt"), 2)  # column C
    refs.column(("od",), 27)  # column AB
    assert refs.get((0, 0, "kt")) == ("Parts", "C5")
    assert refs.get((2, 0, "kt")) == ("Parts", "C28")
    assert refs[(1, "od")] == ("Parts", "AB10")


def test_an_unknown_field_gives_the_default_or_key_error():
    refs = CellRefs("Parts", [0, 1])
    refs.column(("od",), 1)
    assert refs.get((0, "id")) is None
    assert refs.get((0, "id"), ("x", "y")) == ("x", "y")
    with pytest.raises(KeyError):
        refs[(0, "id")]


def test_a_single_cell_set_like_a_dict_wins_over_the_column():
    refs = CellRefs("Parts", [0, 1])
    refs.column(("od",), 1)
    refs[(1, "od")] = ("Other", "Z99")
    assert refs[(1, "od")] == ("Other", "Z99")
    assert refs[(0, "od")] == ("Parts", "B1")


def test_row_per_layer_table_names_the_layer_row():
    refs = CellRefs("Layers", [0, 1])
    rowmap = np.array([[3, 7], [11, -1]])  # part 1 has no second layer
    refs.by_layer(rowmap, {"t": 4, "angle": 0})
    assert refs[(0, 1, "t")] == ("Layers", "E8")
    assert refs[(1, 0, "angle")] == ("Layers", "A12")
    assert refs.get((1, 1, "t")) is None  # no such layer row
    assert refs.get((0, 0, "nu")) is None  # no such column
    assert refs.get((0, 0, "nu"), "dflt") == "dflt"
    with pytest.raises(KeyError):
        refs[(1, 1, "t")]


def test_row_per_layer_row_zero_is_a_real_row():
    refs = CellRefs("Layers", [])
    refs.by_layer(np.array([[0]]), {"t": 1})
    assert refs[(0, 0, "t")] == ("Layers", "B1")


def test_a_two_part_key_reads_the_columns_even_with_a_layer_table():
    refs = CellRefs("Parts", [5, 6])
    refs.by_layer(np.array([[0], [1]]), {"t": 1})
    refs.column(("od",), 3)
    assert refs[(1, "od")] == ("Parts", "D7")
