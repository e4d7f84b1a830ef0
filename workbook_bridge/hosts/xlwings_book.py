"""The live host for whole books: the workbook open in Excel, through xlwings (Windows only).

Kept deliberately thin: it cannot be tested without Excel. It only reads values and table
bounds and writes notes; everything else is the shared validation code.
Run from Excel: a button or macro calling ``RunPython("from twistshare.workbook_bridge.hosts.xlwings_book
import validate_open_book; validate_open_book()")``, or the ``twistshare_validate`` macro below.
"""

from __future__ import annotations

from pathlib import Path

from twistshare.engine.intake import SheetGrid, TableRegion

__all__ = ["XlwingsBook", "validate_open_book", "twistshare_validate"]

_MARK = "--- twistshare check ---"


class XlwingsBook:
    """BookSource and CommentSink over an ``xlwings.Book``."""

    def __init__(self, book) -> None:  # book: xlwings.Book
        self._book = book
        self.path = Path(book.fullname)
        self.sheet_names = [s.name for s in book.sheets]
        self.tables: dict[str, TableRegion] = {}
        for s in book.sheets:
            for t in s.tables:
                rng = t.range
                self.tables[t.name.lower()] = TableRegion(
                    t.name, s.name, rng.row - 1, rng.column - 1, rng.last_cell.row - 1, rng.last_cell.column - 1)

    def find_sheet(self, wanted: str) -> str | None:
        """The sheet named `wanted`, ignoring case, or None."""
        for n in self.sheet_names:
            if n.strip().lower() == wanted.lower():
                return n
        return None

    def grid(self, name: str) -> SheetGrid:
        """The sheet's values from A1 (empty cells as empty text)."""
        sheet = self._book.sheets[name]
        last = sheet.used_range.last_cell
        values = sheet.range((1, 1), (last.row, last.column)).options(ndim=2, empty=None).value
        rows = [["" if v is None else v for v in row] for row in values]
        return SheetGrid(name, rows)

    def add_comments(self, sheet: str, comments) -> None:
        """Write each text as a note, keeping the user's own note text above ours."""
        ws = self._book.sheets[sheet]
        for ref, text in comments.items():
            cell = ws.range(ref)
            note = cell.note
            if note is None:
                cell.add_note(f"{_MARK}\n{text}")
                continue
            # Keep the user's own note; replace only what an earlier run of ours appended.
            own = note.text.split(_MARK)[0].rstrip()
            note.text = f"{own}\n\n{_MARK}\n{text}" if own else f"{_MARK}\n{text}"


def validate_open_book(book: object = None) -> int:
    """Validate the calling workbook and write the warnings as notes on its cells."""
    import xlwings as xw

    from ._interface import validate_and_comment

    target = XlwingsBook(book or xw.Book.caller())
    result, findings = validate_and_comment(target, target)
    return len(findings)


def _register():
    try:
        import xlwings as xw
    except Exception:  # pragma: no cover - xlwings is a dependency, but stay importable
        return validate_open_book
    return xw.sub(validate_open_book)


twistshare_validate = _register()
