"""The formula cells of a workbook package, and a copy of it with their cached values renewed.

A recalculated copy is the user's own package with only the cached values (``<v>``) of formula
cells changed, and the cells of an array formula's range that the package left out added: the
formulas, styles and every other part come out as they went in (the same rule as the project's
package writer: add to the user's package, never re-save it). Written atomically: a temporary
file in the output's folder, then renamed.
"""

from __future__ import annotations

import os
import re
import shutil
import zipfile
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from pathlib import Path

from twistshare.engine.intake import cell_ref, parse_ref
from twistshare.workbook_bridge.ooxml import PackageInfo, atomic_file
from twistshare.workbook_bridge.ooxml._sheetxml import (  # the writer's own cell pattern and row editing
    CELL_TAG,
    insert_missing_cells,
)
from twistshare.workbook_bridge.ooxml._xmltext import escape_text

__all__ = ["OfficeError", "CellValue", "formula_cells", "sheet_formula_cells", "set_cached_values",
           "copy_package", "write_with_values"]

# LibreOffice's error codes and the error values a workbook stores (others show as #VALUE!).
_ERROR_VALUES = {503: "#NUM!", 519: "#VALUE!", 521: "#NULL!", 524: "#REF!", 525: "#NAME?", 532: "#DIV/0!",
                 32767: "#N/A"}
_CHUNK = 1 << 20


@dataclass(frozen=True)
class OfficeError:
    """An error result in LibreOffice: its code (``Err:502``) and the value a workbook stores."""

    code: int

    @property
    def value(self) -> str:
        """The spreadsheet error text of this error code."""
        return _ERROR_VALUES.get(self.code, "#VALUE!")

    def __str__(self) -> str:
        shown = _ERROR_VALUES.get(self.code)
        return f"{shown} (Err:{self.code})" if shown else f"Err:{self.code}"


CellValue = float | str | OfficeError

_F = re.compile(r"<(?P<p>(?:[\w.-]+:)?)f\b(?P<attrs>[^>]*?)(?:/>|>.*?</(?P=p)f>)", re.S)
_V_OR_IS = re.compile(r"<(?P<p>(?:[\w.-]+:)?)(?P<tag>v|is)\b[^>]*?(?:/>|>.*?</(?P=p)(?P=tag)>)", re.S)
_ATTR = re.compile(r'\b([\w:]+)="([^"]*)"')
_T_ATTR = re.compile(r'\s+t="[^"]*"')


def _cell_spans(text: str):
    """Each <c> element: (match, end of the element, its inner text)."""
    for m in CELL_TAG.finditer(text):
        if m.group("empty"):
            yield m, m.end(), ""
            continue
        close = text.find(f"</{m.group('p')}c>", m.end())
        if close < 0:
            return
        yield m, close + len(m.group("p")) + 4, text[m.end():close]


def _range_cells(ref: str) -> list[tuple[int, int]]:
    a, _, b = ref.partition(":")
    (r0, c0), (r1, c1) = parse_ref(a), parse_ref(b or a)
    return [(r, c) for r in range(min(r0, r1), max(r0, r1) + 1) for c in range(min(c0, c1), max(c0, c1) + 1)]


def sheet_formula_cells(text: str) -> list[tuple[int, int]]:
    """Zero-based (row, column) of every formula cell of a sheet, and of every array formula's range."""
    found: dict[tuple[int, int], None] = {}
    for m, _end, inner in _cell_spans(text):
        if "f" not in inner:
            continue
        f = _F.search(inner)
        if f is None:
            continue
        found[parse_ref(m.group("r"))] = None
        attrs = dict(_ATTR.findall(f.group("attrs")))
        if attrs.get("t") == "array" and attrs.get("ref"):
            for rc in _range_cells(attrs["ref"]):
                found[rc] = None
    return list(found)


def formula_cells(book: Path, info: PackageInfo) -> dict[str, list[tuple[int, int]]]:
    """Per worksheet name, the cells whose values a recalculation renews."""
    out: dict[str, list[tuple[int, int]]] = {}
    with zipfile.ZipFile(book) as zf:
        for sheet in info.sheets:
            if sheet.kind != "worksheet" or not sheet.part:
                continue
            text = zf.read(sheet.part).decode("utf-8", "replace")
            if "<f" in text or ":f" in text:
                cells = sheet_formula_cells(text)
                if cells:
                    out[sheet.name] = cells
    return out


def _value_xml(p: str, value: CellValue, was_boolean: bool) -> tuple[str, str]:
    """(the cell's t attribute, its <v> element) for a value."""
    if isinstance(value, OfficeError):
        return ' t="e"', f"<{p}v>{value.value}</{p}v>"
    if isinstance(value, str):
        return ' t="str"', f"<{p}v>{escape_text(value)}</{p}v>"
    number = float(value)
    if was_boolean and number in (0.0, 1.0):
        return ' t="b"', f"<{p}v>{int(number)}</{p}v>"
    return "", f"<{p}v>{number!r}</{p}v>"


def set_cached_values(text: str, values: Mapping[tuple[int, int], CellValue]) -> str:
    """A sheet's XML with the cached values of the given cells replaced; formulas and styles kept."""
    wanted = {cell_ref(r, c): v for (r, c), v in values.items()}
    text = insert_missing_cells(text, list(wanted))
    out: list[str] = []
    last = 0
    for m, end, inner in _cell_spans(text):
        ref = m.group("r").replace("$", "").upper()
        if ref not in wanted:
            continue
        p = m.group("p")
        attrs = " " + m.group("attrs")
        was_boolean = dict(_ATTR.findall(attrs)).get("t") == "b"
        t_attr, v_xml = _value_xml(p, wanted.pop(ref), was_boolean)
        f = _F.search(inner)
        formula = f.group(0) if f else ""
        rest = _V_OR_IS.sub("", inner.replace(formula, "", 1) if formula else inner)
        out.append(text[last:m.start()])
        out.append(f"<{p}c{_T_ATTR.sub('', attrs).rstrip()}{t_attr}>{formula}{v_xml}{rest}</{p}c>")
        last = end
        if not wanted:
            break
    out.append(text[last:])
    return "".join(out)


def _info_like(src: zipfile.ZipInfo) -> zipfile.ZipInfo:
    info = zipfile.ZipInfo(src.filename, date_time=src.date_time)
    info.compress_type = src.compress_type
    info.external_attr = src.external_attr
    info.create_system = src.create_system
    info.comment = src.comment
    return info


def copy_package(book: Path, out: Path, edits: Mapping[str, Callable[[str], str]]) -> None:
    """Copy the package `book` to `out`, the parts named in `edits` passed through their edit.

    Every other member is copied with identical bytes. Atomic: a temporary file in the output's
    folder, renamed into place; nothing is left behind on failure.
    """
    out = Path(out)
    mode = os.stat(out).st_mode if out.exists() else (os.stat(book).st_mode | 0o200)
    with atomic_file(out, mode) as raw:
        with zipfile.ZipFile(book) as zin, zipfile.ZipFile(raw, "w", allowZip64=True) as zout:
            zout.comment = zin.comment
            for src in zin.infolist():
                target = _info_like(src)
                if src.filename in edits:
                    text = zin.read(src.filename).decode("utf-8")
                    zout.writestr(target, edits[src.filename](text).encode("utf-8"))
                    continue
                with zin.open(src) as fin, zout.open(target, "w", force_zip64=src.file_size > (1 << 30)) as fout:
                    shutil.copyfileobj(fin, fout, _CHUNK)


def write_with_values(book: Path, out: Path, info: PackageInfo,
                      values: Mapping[str, Mapping[tuple[int, int], CellValue]]) -> None:
    """Write a copy of `book` to `out` whose formula cells hold `values` (per sheet name)."""
    edits: dict[str, Callable[[str], str]] = {}
    for sheet in info.sheets:
        chosen = values.get(sheet.name)
        if sheet.part and chosen:
            edits[sheet.part] = lambda text, chosen=chosen: set_cached_values(text, chosen)
    copy_package(book, out, edits)
