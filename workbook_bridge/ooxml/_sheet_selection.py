"""A copy of a workbook package showing only chosen sheets, in a chosen order (for printing them).

Only the workbook part changes: its ``<sheet>`` entries are reordered so the chosen sheets come
first, every other sheet is hidden (``state="hidden"``: spreadsheet programs neither show nor
print nor export it), the sheet-scoped defined names (``localSheetId``, a position in that list,
ECMA-376 Part 1, 18.2.5) follow their sheets, and the book opens on the first chosen sheet.
Every other member is copied as it is. Used on our own rated copy, in a temporary folder: the
user's files are never touched.
"""

from __future__ import annotations

import re
import shutil
import zipfile
from collections.abc import Sequence
from pathlib import Path

from ._errors import WriteRefused
from ._opc import tag_attributes
from ._safety import inspect_package
from ._xmltext import decode_xml, find_element_span, root_prefix

__all__ = ["write_sheet_selection"]

_SHEET = re.compile(r"<(?P<p>(?:[\w.-]+:)?)sheet\b(?P<attrs>[^>]*?)/?>(?:</(?P=p)sheet>)?")
_LOCAL_ID = re.compile(r'(<(?:[\w.-]+:)?definedName\b[^>]*?\blocalSheetId=")(\d+)(")')


def _with_state(tag: str, hidden: bool) -> str:
    tag = re.sub(r'\sstate="[^"]*"', "", tag)
    if not hidden:
        return tag
    end = tag.rfind("/>") if tag.rstrip().endswith("/>") else tag.find(">")
    return tag[:end].rstrip() + ' state="hidden"' + tag[end:]


def selection_workbook_xml(text: str, chosen: Sequence[str]) -> str:
    """The workbook part with the `chosen` sheets first, in that order, and every other sheet hidden.

    Raises
    ------
    WriteRefused
        A chosen sheet is not in the book, or the part has no sheet list.
    """
    p, _ = root_prefix(text)
    span = find_element_span(text, p + "sheets")
    if span is None or span[1] == span[2]:
        raise WriteRefused("workbook part has no <sheets> list")
    inner = text[span[1]:span[2]]
    entries = [(m.group(0), tag_attributes(m.group("attrs")).get("name", "")) for m in _SHEET.finditer(inner)]
    position = {name.casefold(): k for k, (_, name) in enumerate(entries)}
    order = []
    for name in chosen:
        k = position.get(name.casefold())
        if k is None:
            raise WriteRefused(f"the book has no sheet {name!r} to show")
        if k not in order:
            order.append(k)
    order += [k for k in range(len(entries)) if k not in order]
    shown = set(order[:len(chosen)])
    new_inner = "".join(_with_state(entries[k][0], k not in shown) for k in order)
    text = text[:span[1]] + new_inner + text[span[2]:]
    new_position = {old: new for new, old in enumerate(order)}
    text = _LOCAL_ID.sub(lambda m: m.group(1) + str(new_position.get(int(m.group(2)), int(m.group(2)))) + m.group(3),
                         text)
    # the book opens on the first chosen sheet (the default of both attributes is 0)
    return re.sub(r"<(?:[\w.-]+:)?workbookView\b[^>]*>",
                  lambda m: re.sub(r'\s(?:activeTab|firstSheet)="\d+"', "", m.group(0)), text)


def write_sheet_selection(source: str | Path, out: str | Path, sheets: Sequence[str]) -> None:
    """Copy the package `source` to `out` showing only `sheets`, in that order (see the module).

    Raises
    ------
    OoxmlError
        The source cannot be read safely, or a sheet is missing.
    """
    info = inspect_package(source)
    with zipfile.ZipFile(source) as zin, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout:
        for item in zin.infolist():
            if item.filename == info.workbook_part:
                text = decode_xml(zin.read(item), item.filename)
                zout.writestr(item, selection_workbook_xml(text, sheets).encode("utf-8"))
            else:
                with zin.open(item) as src, zout.open(item, "w") as dst:
                    shutil.copyfileobj(src, dst, 1 << 20)
