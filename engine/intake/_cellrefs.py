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
        col = self._columns.get(key[1:])
        if col is None:
            return default
        return self._sheet, cell_ref(self._rows[key[0]], col)

    def __getitem__(self, key: tuple) -> tuple[str, str]:
        got = self.get(key)
        if got is None:
            raise KeyError(key)
        return got
