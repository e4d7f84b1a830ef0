"""Where each input came from: (part, ..., field) -> (sheet, A1), worked out only on request."""

from __future__ import annotations

from ._grid import cell_ref

__all__ = ["CellRefs"]


class CellRefs:
    """Where each input came from, (part index, ..., field) -> (sheet, A1), worked out on request.

    A whole column is registered once (``column``); single cells (the one-row-per-layer layout)
    are set like a dict. A 50 000-part book would otherwise build a million references that
    only the few bad parts ever need.
    """

    def __init__(self, sheet: str, rows: list[int]) -> None:
        self._sheet, self._rows = sheet, rows
        self._columns: dict[tuple, int] = {}
        self._cells: dict[tuple, tuple[str, str]] = {}
        self._rowmap = None
        self._field_cols: dict[str, int] = {}

    def by_layer(self, rowmap, field_cols: dict[str, int]) -> None:
        """Register a row-per-layer table: ``rowmap[part, slot]`` is the table row of that layer
        (-1: none) and ``field_cols`` the column of each field."""
        self._rowmap, self._field_cols = rowmap, dict(field_cols)

    def column(self, key: tuple, col: int) -> None:
        """Register a whole column: ``key`` without the part index, e.g. ``(slot, "kt")``."""
        self._columns[key] = col

    def __setitem__(self, key: tuple, value: tuple[str, str]) -> None:
        self._cells[key] = value

    def get(self, key: tuple, default=None):
        """(sheet, A1) of ``key`` = (part, ..., field), or `default`."""
        got = self._cells.get(key)
        if got is not None:
            return got
        if self._rowmap is not None and len(key) == 3:
            col = self._field_cols.get(key[2])
            row = int(self._rowmap[key[0], key[1]])
            return default if col is None or row < 0 else (self._sheet, cell_ref(row, col))
        col = self._columns.get(key[1:])
        if col is None:
            return default
        return self._sheet, cell_ref(self._rows[key[0]], col)

    def __getitem__(self, key: tuple) -> tuple[str, str]:
        got = self.get(key)
        if got is None:
            raise KeyError(key)
        return got
