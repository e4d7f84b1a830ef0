"""Read the sheets the tool needs with the fast reader (python-calamine)."""

from __future__ import annotations

import zipfile
import zlib
from dataclasses import dataclass
from pathlib import Path

import python_calamine as pc
from twistshare.engine.errors import BookUnusable
from twistshare.engine.intake import SheetGrid, TableRegion

from ..ooxml import Limits
from ._sheet_extras import SheetExtras, sheet_extras

__all__ = ["BookUnusable", "OpenBook", "open_book", "MAX_TABLE_ROWS"]

# The largest table rated in one run; a bigger sheet is almost always a formatting slip (a whole
# column formatted) or a data dump, and would need gigabytes to hold.
MAX_TABLE_ROWS = 1_000_000


# The fast reader holds a sheet as a dense grid of about 32 bytes a cell, and the bridge then as
# Python lists: 40 million cells stay well inside the 2 GB the biggest catalogue may use.
MAX_SHEET_CELLS = 40_000_000


@dataclass
class OpenBook:
    """A saved book opened with the fast reader: its sheets, their parts and its workbook tables."""

    path: Path
    sheet_names: list[str]
    sheet_parts: dict[str, str]  # sheet name -> zip member of its XML
    tables: dict[str, TableRegion]  # lower-case table name -> region
    _wb: object

    def grid(self, name: str) -> SheetGrid:
        """The sheet's values anchored at A1, with its error cells, hidden rows and merges.

        Raises
        ------
        BookUnusable
            The sheet reaches past the rows the tool rates, spans too many cells to hold, or its
            part cannot be read (corrupt, or larger than it declares).
        """
        errors: dict = {}
        hidden: frozenset = frozenset()
        uncached: frozenset = frozenset()
        member = self.sheet_parts.get(name)
        if member:
            extras = self._scan(name, member)
            errors, hidden, uncached = extras.errors, extras.hidden, extras.uncached
        try:
            sheet = self._wb.get_sheet_by_name(name)
            rows = sheet.to_python(skip_empty_area=False)
            merged = tuple(sheet.merged_cell_ranges or ())
        except Exception as exc:  # calamine's errors are not one family; word them in one line
            raise BookUnusable(f"{self.path.name}: sheet {name!r} could not be read ({_one_line(exc)})") from None
        return SheetGrid(name, rows, errors, hidden, merged, uncached)

    def _scan(self, name: str, member: str) -> SheetExtras:

        try:
            with zipfile.ZipFile(self.path) as zf:
                size, most = zf.getinfo(member).file_size, Limits().max_part_parsed
                if size > most:
                    raise BookUnusable(f"{self.path.name}: sheet {name!r} is {size:,} bytes of XML, more than "
                                       f"the {most:,} this tool reads")
                extras = sheet_extras(zf, member, MAX_SHEET_CELLS)
        except (zipfile.BadZipFile, zlib.error, EOFError, OSError, KeyError) as exc:
            raise BookUnusable(f"{self.path.name}: sheet {name!r} is corrupt ({_one_line(exc)})") from None
        if extras.rows > MAX_TABLE_ROWS:
            raise BookUnusable(
                f"{self.path.name}: sheet {name!r} reaches row {extras.rows:,}; twistshare rates up to "
                f"{MAX_TABLE_ROWS:,} rows per table: clear the unused rows or split the catalogue")
        if extras.rows * extras.columns > MAX_SHEET_CELLS:
            raise BookUnusable(
                f"{self.path.name}: sheet {name!r} spans {extras.rows:,} rows by {extras.columns:,} columns, "
                f"more than the {MAX_SHEET_CELLS:,} cells twistshare reads from one sheet: clear the unused "
                "cells (a stray value far right or far down)")
        return extras

    def find_sheet(self, wanted: str) -> str | None:
        """A sheet whose name is ``wanted``, ignoring case and surrounding spaces."""
        for n in self.sheet_names:
            if n.strip().lower() == wanted.lower():
                return n
        return None


def _one_line(exc: BaseException) -> str:
    return f"{type(exc).__name__}: {' '.join(str(exc).split())[:200]}"


def open_book(path: Path, sheet_parts: dict[str, str]) -> OpenBook:
    """Open a workbook the package layer has already checked."""
    try:
        wb = pc.CalamineWorkbook.from_path(str(path), load_tables=True)
    except Exception as exc:  # calamine's errors are not one family; word them in one line
        raise BookUnusable(f"{path.name}: the workbook could not be read ({_one_line(exc)})") from None
    tables: dict[str, TableRegion] = {}
    try:
        names = list(wb.table_names)
    except Exception:
        names = []
    for t in names:
        try:
            tab = wb.get_table_by_name(t)
        except Exception:
            continue
        (r0, c0), (r1, c1) = tab.start, tab.end
        # calamine's start is the first data row; the header sits just above it
        tables[t.lower()] = TableRegion(t, tab.sheet, r0 - 1, c0, r1, c1)
    return OpenBook(path, list(wb.sheet_names), dict(sheet_parts), tables, wb)
