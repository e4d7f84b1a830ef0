"""What the fast reader does not report: error values held by cells, hidden rows, and the extent.

All three come from one pass of regular expressions over the sheet's XML (after the package layer
has refused DOCTYPEs and checked declared sizes), which is far faster than a parse for big sheets.
The extent (the last row and column any cell reaches) is known before the fast reader builds its
grid, which is dense: one value at XFD1048576 would make it allocate 17 billion cells.
"""

from __future__ import annotations

import re
import zipfile
from dataclasses import dataclass

from twistshare.engine.intake import parse_ref

__all__ = ["SheetExtras", "sheet_extras", "scan_sheet_xml"]

_ERROR_CELL = re.compile(
    rb'<c\b(?=[^>]*\bt="e")[^>]*\br="([A-Z]{1,3}[0-9]{1,7})"[^>]*>(?:<f\b[^>]*/>|<f\b[^>]*>.*?</f>)?<v>([^<]{1,16})</v>',
    re.S,
)
# A formula cell with no saved result: the book was written by a program that does not calculate.
_UNCACHED_FORMULA = re.compile(
    rb'<c\b[^>]*?\br="([A-Z]{1,3}[0-9]{1,7})"[^>]*>\s*<f\b[^>]*(?:/>|>[^<]*</f>)\s*(?:<v\s*/>|<v>\s*</v>)?\s*</c>'
)
_HIDDEN_ROW = re.compile(rb'<row\b(?=[^>]*\bhidden="(?:1|true)")[^>]*\br="([0-9]{1,7})"')
_ROW_NUMBER = re.compile(rb'<row\b[^>]*?\br="([0-9]{1,9})"')
# Cell references by the length of their column letters: a bare 'r="' search runs at memchr speed,
# and only the rare wide references need their letters read. (Other attributes ending in 'r'
# carry lower-case values; a false match could only overstate the extent.)
_REF3 = re.compile(rb'r="([A-Z]{3,4})[0-9]')
_REF2 = re.compile(rb'r="([A-Z]{2})[0-9]')


@dataclass(frozen=True)
class SheetExtras:
    """Error values by zero-based (row, col), zero-based hidden rows, and the cells' extent.

    ``rows`` and ``columns`` are the last row and column (one-based counts) any row or cell
    reference reaches; a row without a number counts as the next one.
    """

    errors: dict[tuple[int, int], str]
    hidden: frozenset[int]
    rows: int
    columns: int
    uncached: frozenset[tuple[int, int]] = frozenset()


def _column_number(letters: bytes) -> int:
    n = 0
    for ch in letters:
        n = n * 26 + (ch - 64)
    return n


def scan_sheet_xml(data: bytes, max_cells: int | None = None) -> SheetExtras:
    """Scan one sheet part's XML.

    With ``max_cells`` given, the column extent is only worked out as far as needed to tell
    whether rows × columns exceeds it (an upper bound such as 702 may be returned).
    """
    errors: dict[tuple[int, int], str] = {}
    if b't="e"' in data:
        for m in _ERROR_CELL.finditer(data):
            errors[parse_ref(m.group(1).decode())] = m.group(2).decode("ascii", "replace")
    hidden = frozenset(int(m.group(1)) - 1 for m in _HIDDEN_ROW.finditer(data)) if b"hidden=" in data else frozenset()
    numbered = [int(m.group(1)) for m in _ROW_NUMBER.finditer(data)]
    # rows without a number (allowed, rare) follow on; only then are the elements counted
    rows = max(numbered) if numbered else data.count(b"<row ") + data.count(b"<row>")
    if _REF3.search(data):
        columns = max(_column_number(m.group(1)) for m in _REF3.finditer(data))
    elif _REF2.search(data):
        columns = 702  # ZZ
        if max_cells is None or rows * columns > max_cells:
            columns = max(_column_number(m.group(1)) for m in _REF2.finditer(data))
    else:
        columns = 26
    uncached = frozenset(parse_ref(m.group(1).decode()) for m in _UNCACHED_FORMULA.finditer(data)) \
        if b"<f" in data else frozenset()
    return SheetExtras(errors, hidden, rows, columns, uncached)


def sheet_extras(zf: zipfile.ZipFile, member: str, max_cells: int | None = None) -> SheetExtras:
    """:func:`scan_sheet_xml` of a member of an open package."""
    return scan_sheet_xml(zf.read(member), max_cells)
