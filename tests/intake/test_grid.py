"""The sheet grid (`_grid`): A1 references, cells read column-wise, error values, merged ranges.

A1 notation is the spreadsheet convention (column letters A..Z, AA.. in bijective base 26, rows
from 1), checked here by a hand calculation written in each test.
"""

from __future__ import annotations

import pytest
from twistshare.engine.intake._grid import SheetGrid, cell_ref, column_letter, parse_ref


@pytest.mark.parametrize("col, letters", [(0, "A"), (1, "B"), (25, "Z"), (26, "AA"), (27, "AB"), (51, "AZ"),
                                          (52, "BA"), (701, "ZZ"), (702, "AAA"), (16383, "XFD")])
def test_column_letters(col, letters):
    # bijective base 26 by hand: XFD = 24*676 + 6*26 + 4 = 16384 (1-based), the last column of a sheet
    assert column_letter(col) == letters


def test_cell_ref():
    assert cell_ref(0, 0) == "A1"
    assert cell_ref(9, 27) == "AB10"


@pytest.mark.parametrize("ref, where", [("A1", (0, 0)), ("b3", (2, 1)), ("$AB$10", (9, 27)), ("Z99", (98, 25)),
                                        ("XFD1048576", (1048575, 16383))])
def test_parse_ref(ref, where):
    assert parse_ref(ref) == where
    assert cell_ref(*where) == ref.replace("$", "").upper()


@pytest.mark.parametrize("bad", ["", "A", "12", "A1B", "1A", "A-1"])
def test_parse_ref_refuses(bad):
    with pytest.raises(ValueError, match="not a cell reference"):
        parse_ref(bad)


def test_cells_column_wise_consecutive_and_not():
    grid = SheetGrid("S", [[1, "a"], [2], [3, "c", "x"]])
    assert grid.height == 3
    assert grid.cells(0, [0, 1, 2]) == [1, 2, 3]
    assert grid.cells(1, [0, 1, 2]) == ["a", None, "c"]
    assert grid.cells(1, [0, 2]) == ["a", "c"]
    assert grid.cells(0, [1, 2]) == [2, 3]
    assert grid.cells(2, range(0, 3)) == [None, None, "x"]
    assert grid.cells(5, [0, 2]) == [None, None]
    assert grid.cells(0, []) == []
    assert isinstance(grid.cells(0, [0, 1]), list)


def test_value_errors_blanks_and_beyond():
    grid = SheetGrid("S", [[1.5, "   ", "t"], [None]], errors={(1, 3): "#N/A"})
    assert grid.value(0, 0) == 1.5
    assert grid.value(0, 1) is None  # only spaces: empty to the reader
    assert grid.value(0, 2) == "t"
    assert grid.value(1, 3) == "#N/A"
    assert grid.value(1, 0) is None
    assert grid.value(0, 9) is None and grid.value(7, 0) is None
    assert grid.error_at(1, 3) == "#N/A" and grid.error_at(0, 0) is None


def test_merged_cover():
    grid = SheetGrid("S", [[None] * 3] * 3, merged=(((0, 0), (1, 2)), ((2, 1), (2, 1))))
    cover = grid.merged_cover()
    assert cover == {(0, 1): (0, 0), (0, 2): (0, 0), (1, 0): (0, 0), (1, 1): (0, 0), (1, 2): (0, 0)}
    assert SheetGrid("S", []).merged_cover() == {}


def test_grids_compare_by_content_not_by_their_column_cache():
    a, b = SheetGrid("S", [[1, 2]]), SheetGrid("S", [[1, 2]])
    a.cells(0, [0])
    assert a == b
    assert a.errors == {} and a.hidden_rows == frozenset() and a.merged == () and a.uncached == frozenset()
    assert SheetGrid("S", []).errors is not SheetGrid("T", []).errors


def test_parse_ref_message_in_full():
    with pytest.raises(ValueError, match=r"^not a cell reference: 'A'$"):
        parse_ref("a")


def test_cells_at_the_edges_and_in_any_order():
    grid = SheetGrid("S", [[1, "a", 7], [2], [3, "c"], [4]])
    assert grid.cells(3, [0, 1]) == [None, None]  # the first column past the widest row
    assert grid.cells(0, [0, 1]) == [1, 2]
    assert grid.cells(0, [1, 0]) == [2, 1]
    assert grid.cells(0, [0, 3]) == [1, 4]
    assert grid.cells(0, [1, 1]) == [2, 2]


def test_value_just_past_the_last_row_and_column():
    grid = SheetGrid("S", [[1, 2, 3], [4]])
    assert grid.value(2, 0) is None
    assert grid.value(0, 3) is None and grid.value(1, 1) is None


def test_repr_leaves_out_the_column_cache():
    grid = SheetGrid("S", [[1]])
    grid.cells(0, [0])
    assert "_columns" not in repr(grid)
