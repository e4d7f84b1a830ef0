"""The two backends behind one interface: the same validation writes the same comments.

The live backend needs Excel, which tests never assume; here it runs against a small stand-in
with the few members of xlwings' Book/Sheet/Range it touches, so what is tested is our glue,
not xlwings. The headless side is `twistshare check`.
"""

from __future__ import annotations

import io
from pathlib import Path

import openpyxl
from twistshare.workbook_bridge.commands import main
from twistshare.workbook_bridge.commands._progress import Progress
from twistshare.workbook_bridge.hosts import validate_and_comment
from twistshare.workbook_bridge.hosts.xlwings_book import _MARK, XlwingsBook

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"


class _Note:
    def __init__(self, text):
        self.text = text


class _Range:
    def __init__(self, sheet, ref=None, corners=None):
        self.sheet, self.ref, self.corners = sheet, ref, corners

    def options(self, **_):
        return self

    @property
    def value(self):
        (r0, c0), (r1, c1) = self.corners
        return [[self.sheet.cells.get((r, c)) for c in range(c0, c1 + 1)] for r in range(r0, r1 + 1)]

    @property
    def note(self):
        return self.sheet.notes.get(self.ref)

    def add_note(self, text):
        self.sheet.notes[self.ref] = _Note(text)


class _Sheet:
    def __init__(self, ws):
        self.name = ws.title
        self.cells = {(c.row, c.column): c.value for row in ws.iter_rows() for c in row if c.value is not None}
        self.notes: dict[str, _Note] = {}
        self.tables = []
        last = type("Last", (), {"row": ws.max_row, "column": ws.max_column})
        self.used_range = type("Used", (), {"last_cell": last})

    def range(self, a, b=None):
        if b is None:
            return _Range(self, ref=a)
        return _Range(self, corners=(a, b))


class _Book:
    def __init__(self, path):
        wb = openpyxl.load_workbook(path)
        self.fullname = str(path)
        self.sheets = _Sheets([_Sheet(ws) for ws in wb.worksheets])


class _Sheets(list):
    def __getitem__(self, key):
        if isinstance(key, str):
            return next(s for s in self if s.name == key)
        return super().__getitem__(key)


def test_live_backend_writes_the_same_comments_as_check(tmp_path):
    src = SAMPLES / "marrowby_catalogue.xlsx"
    book = _Book(src)
    target = XlwingsBook(book)
    _, findings = validate_and_comment(target, target)
    assert findings
    out = tmp_path / "checked.xlsx"
    main(["check", str(src), "-o", str(out), "-q"])
    wb = openpyxl.load_workbook(out)
    for sheet in ("Parts", "Materials"):
        live = {ref: n.text for ref, n in book.sheets[sheet].notes.items()}
        headless = {c.coordinate: c.comment.text for row in wb[sheet].iter_rows() for c in row if c.comment}
        assert set(live) == set(headless), sheet
        for ref, text in live.items():
            assert text == f"{_MARK}\n{headless[ref]}", ref


def test_live_backend_keeps_the_users_own_note():
    book = _Book(SAMPLES / "marrowby_catalogue.xlsx")
    book.sheets["Parts"].notes["P11"] = _Note("checked by J. on site")
    target = XlwingsBook(book)
    validate_and_comment(target, target)
    first = book.sheets["Parts"].notes["P11"].text
    assert first.startswith("checked by J. on site")
    assert "gap of 1 mm" in first
    validate_and_comment(target, target)  # a second run replaces our part, keeps the user's
    assert book.sheets["Parts"].notes["P11"].text == first


class _Tty(io.StringIO):
    def isatty(self):
        return True


def test_progress_bar_only_on_a_terminal():
    quiet = io.StringIO()
    p = Progress(["a", "b"], stream=quiet)
    p.step("a")
    p.finish()
    assert quiet.getvalue() == ""
    tty = _Tty()
    p = Progress(["a", "b"], stream=tty)
    p.step("reading")
    p.finish()
    assert "reading" in tty.getvalue() and "done" in tty.getvalue()
