"""The copy of a book that LibreOffice opens for a recalculation, with two of Excel's habits undone.

- Excel writes ``_xludf.`` before a function it does not know (``_xludf.TWS_SHARE(...)``); Calc
  then finds no such function. The mark is taken off our functions' names.
- An argument left out in the middle of a call (``TWS_SHARE(B5:F8,,B11:H12)``) reaches a Calc
  Basic function as 0, which cannot be told from a typed 0. In our functions' calls it becomes
  ``""``, which the cell functions read as "not given", as Excel hands them an empty argument.

Only the formulas' text in the copy changes; the user's book is never opened.
"""

from __future__ import annotations

import html
import re
import shutil
import zipfile
from collections.abc import Iterable
from pathlib import Path

from twistshare.workbook_bridge.ooxml import PackageInfo
from twistshare.workbook_bridge.ooxml._xmltext import escape_text

from ._package_values import copy_package

__all__ = ["fill_left_out_arguments", "feed_copy"]

_F_ELEMENT = re.compile(r"(<(?P<p>(?:[\w.-]+:)?)f\b[^>]*?>)(?P<text>.*?)(</(?P=p)f>)", re.S)


_CALL = re.compile(r"(_xludf\.)?([A-Za-z_][A-Za-z0-9_.]*)\s*\(", re.I)


def _quoted_end(formula: str, i: int) -> int:
    """End (exclusive) of the string literal or quoted sheet name starting at `i`."""
    quote, j, n = formula[i], i + 1, len(formula)
    while j < n:
        if formula[j] == quote:
            if j + 1 < n and formula[j + 1] == quote:
                j += 2
                continue
            return j + 1
        j += 1
    return n


def fill_left_out_arguments(formula: str, names: Iterable[str]) -> str:
    """`formula` with ``_xludf.`` taken off calls of `names`, and their empty arguments as ``""``.

    Text inside string literals and quoted sheet names is left alone; nested calls are handled.
    """
    wanted = {n.upper() for n in names}
    out: list[str] = []
    # Per open bracket: [a call of ours, its current argument has text, it has had a separator].
    stack: list[list[bool]] = []
    i, n = 0, len(formula)
    while i < n:
        ch = formula[i]
        if ch in "\"'":
            end = _quoted_end(formula, i)
            out.append(formula[i:end])
            if stack:
                stack[-1][1] = True
            i = end
            continue
        m = _CALL.match(formula, i) if (ch.isalpha() or ch == "_") else None
        if m and (i == 0 or not (formula[i - 1].isalnum() or formula[i - 1] in "._$")):
            ours = m.group(2).upper() in wanted
            if stack:
                stack[-1][1] = True
            out.append(m.group(0)[len(m.group(1)):] if (ours and m.group(1)) else m.group(0))
            stack.append([ours, False, False])
            i = m.end()
            continue
        if ch == "(":
            if stack:
                stack[-1][1] = True
            stack.append([False, False, False])
        elif ch in ",;" and stack:
            if stack[-1][0] and not stack[-1][1]:
                out.append('""')
            stack[-1][1], stack[-1][2] = False, True
        elif ch == ")" and stack:
            ours, filled, separated = stack.pop()
            if ours and separated and not filled:
                out.append('""')
        elif not ch.isspace() and stack:
            stack[-1][1] = True
        out.append(ch)
        i += 1
    return "".join(out)


def _sheet_edit(names: tuple[str, ...]):
    pattern = re.compile(r"(?:_xludf\.)?(?:" + "|".join(re.escape(x) for x in names) + r")\s*\(", re.I)

    def edit(text: str) -> str:
        def one(m: re.Match) -> str:
            formula = html.unescape(m.group("text"))
            if not pattern.search(formula):
                return m.group(0)
            return m.group(1) + escape_text(fill_left_out_arguments(formula, names)) + m.group(4)

        return _F_ELEMENT.sub(one, text)

    return edit


def feed_copy(book: Path, info: PackageInfo, folder: Path, names: Iterable[str]) -> Path:
    """Write the copy LibreOffice opens into `folder`; returns its path."""
    chosen = tuple(names)
    feed = Path(folder) / ("book" + (book.suffix.lower() if book.suffix.lower() in (".xlsx", ".xlsm") else ".xlsx"))
    edit = _sheet_edit(chosen)
    probe = re.compile("|".join(re.escape(x) for x in chosen).encode(), re.I)
    edits = {}
    with zipfile.ZipFile(book) as zf:
        for sheet in info.sheets:
            if sheet.part and sheet.kind == "worksheet" and probe.search(zf.read(sheet.part)):
                edits[sheet.part] = edit
    if edits:
        copy_package(book, feed, edits)
    else:
        shutil.copyfile(book, feed)
    return feed
