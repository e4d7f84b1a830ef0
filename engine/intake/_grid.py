"""Cell grids read from a workbook: values by zero-based row and column, with A1 references."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from itertools import zip_longest

__all__ = ["SheetGrid", "all_of_type", "cell_ref", "column_letter", "number_count", "parse_ref"]


# Tests of a whole column's types at C speed: counting the types in a list is about twice as
# fast as collecting them in a set, and a column is usually of one type.

def all_of_type(cells: Sequence[object], kind: type) -> bool:
    """Whether every cell is exactly of type `kind` (a subclass does not count; True for none)."""
    return list(map(type, cells)).count(kind) == len(cells)


def number_count(cells: Sequence[object]) -> int:
    """How many cells hold a plain number: exactly ``float`` or ``int`` (not ``bool``)."""
    types = list(map(type, cells))
    return types.count(float) + types.count(int)


def column_letter(col: int) -> str:
    """Zero-based column index to its letters (0 -> A, 26 -> AA)."""
    letters = ""
    col += 1
    while col:
        col, rem = divmod(col - 1, 26)
        letters = chr(65 + rem) + letters
    return letters


def cell_ref(row: int, col: int) -> str:
    """Zero-based row and column to an A1 reference."""
    return f"{column_letter(col)}{row + 1}"


def parse_ref(ref: str) -> tuple[int, int]:
    """An A1 reference (``$`` allowed) to zero-based (row, column)."""
    ref = ref.replace("$", "").upper()
    i = 0
    while i < len(ref) and ref[i].isalpha():
        i += 1
    letters, digits = ref[:i], ref[i:]
    if not letters or not digits.isdigit():
        raise ValueError(f"not a cell reference: {ref!r}")
    col = 0
    for ch in letters:
        col = col * 26 + (ord(ch) - 64)
    return int(digits) - 1, col - 1


@dataclass(frozen=True)
class SheetGrid:
    """The values of one sheet, anchored at A1.

    ``errors`` maps (row, col) to an error value the cell holds (``#N/A``), which the fast reader
    reports as an empty cell; ``hidden_rows`` are zero-based rows hidden in the sheet;
    ``merged`` holds merged ranges as ((row0, col0), (row1, col1)).
    """

    name: str
    rows: list[list[object]]
    errors: dict[tuple[int, int], str] = field(default_factory=dict)
    hidden_rows: frozenset[int] = frozenset()
    merged: tuple[tuple[tuple[int, int], tuple[int, int]], ...] = ()
    uncached: frozenset[tuple[int, int]] = frozenset()  # formula cells with no saved result
    rectangular: bool = False  # every row as long as the first (a host's range): a plain transpose
    _columns: dict = field(default_factory=dict, compare=False, repr=False)

    @property
    def height(self) -> int:
        """Number of rows."""
        return len(self.rows)

    def _column(self, col: int) -> Sequence[object] | None:
        """Every row's value in column `col` (None beyond a row's end), or None past the grid.

        A host's rectangular range is read a column at a time, only the columns asked for; a
        sheet's rows of different lengths are transposed whole, at C speed, on first use. Each
        column is kept for the next question.
        """
        columns = self._columns
        column = columns.get(col)
        if column is not None:
            return column
        if self.rectangular:
            if not self.rows or not 0 <= col < len(self.rows[0]):
                return None
            # A comprehension makes no object per row, so it sets off no garbage collection
            # as a transpose by zip (one iterator per row) does.
            column = columns[col] = [row[col] for row in self.rows]
            return column
        if not columns:
            columns.update(enumerate(zip_longest(*self.rows, fillvalue=None)))
            return columns.get(col)
        return None

    def cells(self, col: int, rows) -> list[object]:
        """The raw values of column `col` on `rows` (None beyond a row's end), read column-wise;
        a run of consecutive rows is one slice. Error cells read as the grid holds them (see
        `value` for their text).
        """
        column = self._column(col)
        if column is None:
            return [None] * len(rows)
        if not rows:
            return []
        first, last = rows[0], rows[-1]
        if last - first + 1 == len(rows):
            return list(column[first:last + 1])
        return [column[r] for r in rows]

    def value(self, row: int, col: int) -> object:
        """The value at (row, col), an error text such as ``#N/A``, or None when empty."""
        err = self.errors.get((row, col))
        if err is not None:
            return err
        if row < len(self.rows):
            r = self.rows[row]
            if col < len(r):
                v = r[col]
                # a cell holding only spaces is empty to the reader, as it looks to the user
                return None if isinstance(v, str) and not v.strip() else v
        return None

    def error_at(self, row: int, col: int) -> str | None:
        """The error value (``#N/A``) the cell holds, or None."""
        return self.errors.get((row, col))

    def merged_cover(self) -> dict[tuple[int, int], tuple[int, int]]:
        """Every cell inside a merged range (except its top-left) mapped to the top-left cell."""
        cover: dict[tuple[int, int], tuple[int, int]] = {}
        for (r0, c0), (r1, c1) in self.merged:
            for r in range(r0, r1 + 1):
                for c in range(c0, c1 + 1):
                    if (r, c) != (r0, c0):
                        cover[(r, c)] = (r0, c0)
        return cover
