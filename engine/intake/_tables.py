"""Find a table in a sheet: its header row, the columns we recognise and its data rows."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ._grid import SheetGrid, all_of_type, number_count
from ._schema import Column, Field, match_header, match_layer_group_header

__all__ = ["TableRegion", "TableSpot", "locate_table"]

_HEADER_SEARCH_ROWS = 30


@dataclass(frozen=True)
class TableRegion:
    """A workbook table (list object): its sheet, header row and zero-based bounds of its data."""

    name: str
    sheet: str
    header_row: int
    first_col: int
    last_row: int
    last_col: int


@dataclass(frozen=True)
class TableSpot:
    """Where a table sits in a sheet (zero-based rows; ``data_rows`` skip blank rows)."""

    sheet: str
    header_row: int
    data_rows: tuple[int, ...]
    columns: tuple[Column, ...]
    duplicate_headers: tuple[tuple[int, str], ...]
    first_col: int = 0
    last_col: int | None = None
    duplicates: tuple[Column, ...] = ()  # later columns naming an input an earlier column names
    unknown_headers: tuple[tuple[int, str], ...] = ()  # header cells that name no input we read

    def column(self, key: str, layer: int = 0) -> Column | None:
        for c in self.columns:
            if c.field.key == key and c.layer == layer:
                return c
        return None

    @property
    def layer_numbers(self) -> tuple[int, ...]:
        return tuple(sorted({c.layer for c in self.columns if c.layer}))


def _match_row(
    row: list[object], fields: tuple[Field, ...], layer_groups: bool, first_col: int, last_col: int | None
) -> tuple[list[Column], list[Column], list[tuple[int, str]]]:
    cols: list[Column] = []
    seen: set[tuple[str, int]] = set()
    dups: list[Column] = []
    unknown: list[tuple[int, str]] = []
    stop = len(row) if last_col is None else min(len(row), last_col + 1)
    for c in range(first_col, stop):
        h = row[c]
        if not isinstance(h, str) or not h.strip():
            continue
        layer = 0
        m = match_header(h, fields)
        if m is None and layer_groups:
            g = match_layer_group_header(h)
            if g is not None:
                layer, field, unit = g
                m = (field, unit)
        if m is None:
            unknown.append((c, h))
            continue
        field, unit = m
        key = (field.key, layer)
        if key in seen:
            dups.append(Column(field, c, h, unit, layer))
            continue
        seen.add(key)
        cols.append(Column(field, c, h, unit, layer))
    return cols, dups, unknown


def _data_rows(grid: SheetGrid, start: int, end: int, idx: list[int]) -> tuple[int, ...]:
    """The rows from `start` to `end` (exclusive) where any of the table's columns holds
    something (an error value counts), read column-wise."""
    if end <= start:
        return ()
    span = range(start, end)
    filled = np.zeros(end - start, bool)
    columns = []
    # A column that starts with a number is likely all numbers, which settles every row at once.
    first_row = grid.rows[start]
    idx = sorted(idx, key=lambda c: not (c < len(first_row) and type(first_row[c]) in (float, int)))
    for c in idx:
        cells = grid.cells(c, span)
        if number_count(cells) == len(cells):
            return tuple(span)  # a column of numbers: every row holds something
        columns.append(cells)
    for cells in columns:
        if all_of_type(cells, str):
            filled |= np.fromiter(map(bool, map(str.strip, cells)), bool, len(cells))
        else:
            filled |= np.fromiter((v is not None and v != "" and not (type(v) is str and not v.strip())
                                   for v in cells), bool, len(cells))
    if grid.errors:
        for (r, c) in grid.errors:
            if start <= r < end and c in idx:
                filled[r - start] = True
    return tuple((np.flatnonzero(filled) + start).tolist())


def locate_table(
    grid: SheetGrid,
    fields: tuple[Field, ...],
    key_field: str | None,
    *,
    layer_groups: bool = False,
    header_row: int | None = None,
    last_row: int | None = None,
    first_col: int = 0,
    last_col: int | None = None,
    header_cells: list[object] | None = None,
    with_data: bool = True,
) -> TableSpot | None:
    """Find the header row (the first row naming ``key_field`` and one more input) and the data.

    With ``header_row`` given (a workbook table, a cell function's block), only that row is
    tried; with ``key_field`` None any two recognised columns make a header. With
    ``header_cells`` (the headers a cell function's block implies by its shape), those name the
    columns and every row of the grid is data (``header_row`` is then -1). ``with_data`` False
    leaves the data rows out (empty), for a caller that only asks what the header names.
    """
    if header_cells is not None:
        cols, dups, unknown = _match_row(header_cells, fields, layer_groups, first_col, last_col)
        idx = [c.index for c in cols]
        data = _data_rows(grid, 0, grid.height, idx) if with_data else ()
        return TableSpot(grid.name, -1, data, tuple(cols), (), first_col, last_col, tuple(dups), tuple(unknown))
    candidates = [header_row] if header_row is not None else range(min(grid.height, _HEADER_SEARCH_ROWS))
    for r in candidates:
        if r >= grid.height:
            continue
        cols, dups, unknown = _match_row(grid.rows[r], fields, layer_groups, first_col, last_col)
        if len(cols) < 2 or (key_field is not None and not any(c.field.key == key_field for c in cols)):
            continue
        end = grid.height if last_row is None else min(grid.height, last_row + 1)
        idx = [c.index for c in cols]
        data = _data_rows(grid, r + 1, end, idx) if with_data else ()
        return TableSpot(grid.name, r, data, tuple(cols), tuple((d.index, d.header) for d in dups),
                         first_col, last_col, tuple(dups), tuple(unknown))
    return None
