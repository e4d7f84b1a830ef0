"""Our edits of a user's worksheet, found at writing time and taken out again at re-rating time.

The writer changes a user's worksheet in two ways only when rating: it inserts one
``<legacyDrawing>`` link (when the sheet had no comment drawing) and it fills blank cells with
marked values (library properties). Both are found by comparing the sheet before and after,
recorded exactly (``SheetChange``), and undone on the sheet as it is at re-rating time, which may
hold the user's later edits of other cells: those are kept.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from ._opc import tag_attributes
from ._record import MarkChange, SheetChange, sha256
from ._sheetxml import CELL_TAG
from ._xmltext import column_letters, root_prefix, split_ref

__all__ = ["sheet_change", "undo_sheet_change", "SheetUndo"]

_ROW = re.compile(r"<(?P<p>(?:[\w.-]+:)?)row\b(?P<attrs>[^>]*?)(?P<empty>/?)>")
_LEGACY = re.compile(r"<(?:[\w.-]+:)?legacyDrawing\s[^>]*?/>")
_STYLE = re.compile(r'\ss="(\d+)"')


def _norm(ref: str) -> str:
    col, row = split_ref(ref.replace("$", ""))
    return f"{column_letters(col)}{row}"


def _cells(text: str, refs: set[str]) -> dict[str, tuple[int, int]]:
    """Span of the ``<c>`` element of each wanted cell present in the sheet text."""
    out: dict[str, tuple[int, int]] = {}
    for match in CELL_TAG.finditer(text):
        ref = match.group("r").replace("$", "").upper()
        if ref not in refs or ref in out:
            continue
        if match.group("empty"):
            out[ref] = (match.start(), match.end())
        else:
            close = text.find(f"</{match.group('p')}c>", match.end())
            out[ref] = (match.start(), close + len(f"</{match.group('p')}c>"))
    return out


def _rows(text: str, rows: set[int]) -> dict[int, tuple[int, int, int, bool]]:
    """(start, end of start tag, end of element, self-closing) of each wanted row."""
    out: dict[int, tuple[int, int, int, bool]] = {}
    for match in _ROW.finditer(text):
        try:
            number = int(tag_attributes(match.group("attrs")).get("r", "0"))
        except ValueError:
            continue
        if number not in rows or number in out:
            continue
        if match.group("empty"):
            out[number] = (match.start(), match.end(), match.end(), True)
        else:
            close = text.find(f"</{match.group('p')}row>", match.end())
            out[number] = (match.start(), match.end(), close + len(f"</{match.group('p')}row>"), False)
    return out


def _tail_link(text: str) -> str | None:
    p, _ = root_prefix(text)
    tail = text[max(text.rfind(f"</{p}sheetData>"), 0):]
    found = _LEGACY.findall(tail)
    return found[0] if len(found) == 1 else None


def sheet_change(part: str, name: str, before: str, after: str, marks: list[str]) -> SheetChange:
    """What the writer changed in a worksheet: the link it inserted and the cells it filled."""
    link = _tail_link(after) if _tail_link(before) is None else None
    refs = {_norm(r) for r in marks}
    if not refs:  # only the link: no need to scan the cells of a big parts sheet
        return SheetChange(part, name, sha256(before.encode("utf-8")), sha256(after.encode("utf-8")), link)
    row_of = {r: split_ref(r)[1] for r in refs}
    cells_b, cells_a = _cells(before, refs), _cells(after, refs)
    rows_b, rows_a = _rows(before, set(row_of.values())), _rows(after, set(row_of.values()))
    changes, row_done = [], set()
    for ref in sorted(refs, key=lambda r: split_ref(r)[::-1]):
        b = before[slice(*cells_b[ref])] if ref in cells_b else ""
        a = after[slice(*cells_a[ref])] if ref in cells_a else ""
        row = row_of[ref]
        row_before = row_after = None
        if row not in row_done:
            row_done.add(row)
            rb = rows_b.get(row)
            ra = rows_a.get(row)
            b_tag = "" if rb is None else before[rb[0]:rb[2]] if rb[3] else before[rb[0]:rb[1]]
            a_tag = after[ra[0]:ra[1]] if ra is not None else ""
            if b_tag != a_tag:
                row_before, row_after = b_tag, a_tag
        changes.append(MarkChange(ref, b, a, row_before, row_after))
    return SheetChange(part, name, sha256(before.encode("utf-8")), sha256(after.encode("utf-8")), link,
                       tuple(changes))


@dataclass(frozen=True)
class SheetUndo:
    """A worksheet with our edits taken out.

    Attributes
    ----------
    text : str
        The sheet XML.
    kept : tuple of str
        Cells we had filled that the user has since changed: their content is kept (with the
        cell's own format back, as ours is taken out of the styles).
    missing : str or None
        Why our edits could not be found (then nothing may be written).
    """

    text: str
    kept: tuple[str, ...] = ()
    missing: str | None = None


def _restyled(cell: str, before: str, after: str) -> str:
    """The user's version of a cell we filled, with the cell's own format instead of ours."""
    ours = _STYLE.search(after)
    theirs = _STYLE.search(before)
    current = _STYLE.search(cell)
    if ours is None or current is None or current.group(1) != ours.group(1):
        return cell
    start, end = current.span()
    return cell[:start] + (theirs.group(0) if theirs else "") + cell[end:]


def undo_sheet_change(text: str, change: SheetChange) -> SheetUndo:
    """Take the recorded link and marks out of ``text`` (the sheet as it is now)."""
    if change.link is not None:
        p, _ = root_prefix(text)
        tail_from = max(text.rfind(f"</{p}sheetData>"), 0)
        at = text.find(change.link, tail_from)
        if at < 0 or text.find(change.link, at + 1) >= 0:
            return SheetUndo(text, missing=f"the comment link twistshare added to sheet {change.name!r} is not there")
        text = text[:at] + text[at + len(change.link):]
    if not change.marks:
        return SheetUndo(text)
    marks = {m.ref: m for m in change.marks}
    spans = _cells(text, set(marks))
    kept, edits = [], []
    for ref, mark in marks.items():
        if ref not in spans:
            return SheetUndo(text, missing=f"cell {change.name}!{ref}, which twistshare filled, is not there")
        start, end = spans[ref]
        cell = text[start:end]
        if cell == mark.after:
            edits.append((start, end, mark.before))
        else:
            kept.append(f"{change.name}!{ref}")
            edits.append((start, end, _restyled(cell, mark.before, mark.after)))
    for start, end, piece in sorted(edits, reverse=True):
        text = text[:start] + piece + text[end:]
    rows = {split_ref(m.ref)[1]: m for m in change.marks if m.row_before is not None}
    spans_r = _rows(text, set(rows))
    edits = []
    for number, mark in rows.items():
        if number not in spans_r:
            continue
        start, tag_end, end, _ = spans_r[number]
        p = _ROW.match(text, start).group("p")
        if text[start:end] == f"{mark.row_after}</{p}row>":       # the row is as we left it, empty
            edits.append((start, end, mark.row_before))
        elif text[start:tag_end] == mark.row_after and not mark.row_before.endswith("/>") and mark.row_before:
            edits.append((start, tag_end, mark.row_before))       # its start tag as it was
    for start, end, piece in sorted(edits, reverse=True):
        text = text[:start] + piece + text[end:]
    return SheetUndo(text, tuple(kept))
