"""What the fast reader does not report: error values held by cells, and hidden rows.

Both come from one pass of regular expressions over the sheet's XML (after the package layer has
refused DOCTYPEs and checked declared sizes), which is far faster than a parse for big sheets.
"""

from __future__ import annotations

import re
import zipfile

from ._grid import parse_ref

__all__ = ["sheet_extras"]

_ERROR_CELL = re.compile(
    rb'<c\b(?=[^>]*\bt="e")[^>]*\br="([A-Z]{1,3}[0-9]{1,7})"[^>]*>(?:<f\b[^>]*/>|<f\b[^>]*>.*?</f>)?<v>([^<]{1,16})</v>',
    re.S,
)
_HIDDEN_ROW = re.compile(rb'<row\b(?=[^>]*\bhidden="(?:1|true)")[^>]*\br="([0-9]{1,7})"')


def sheet_extras(zf: zipfile.ZipFile, member: str) -> tuple[dict[tuple[int, int], str], frozenset[int]]:
    """Error values by zero-based (row, col) and the zero-based hidden rows of one sheet part."""
    data = zf.read(member)
    errors: dict[tuple[int, int], str] = {}
    if b't="e"' in data:
        for m in _ERROR_CELL.finditer(data):
            errors[parse_ref(m.group(1).decode())] = m.group(2).decode("ascii", "replace")
    hidden = frozenset(int(m.group(1)) - 1 for m in _HIDDEN_ROW.finditer(data)) if b"hidden=" in data else frozenset()
    return errors, hidden
