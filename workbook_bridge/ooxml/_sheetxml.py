"""Worksheet XML: the frame around our streamed rows, and minimal edits of the user's sheets."""

from __future__ import annotations

import html
import re
from typing import Any, Mapping, Sequence

from ._cells import cell_xml
from ._errors import WriteRefused
from ._opc import tag_attributes
from ._xmltext import NS_MAIN, NS_REL, XML_DECL, column_letters, iter_top_level, root_prefix, split_ref

__all__ = ["sheet_head", "sheet_tail", "insert_link_element", "replace_cells", "relationship_prefix"]

# CT_Worksheet children that come after <legacyDrawing> / after <drawing> (ECMA-376 Part 1, 18.3.1.99).
_AFTER_LEGACY = ("legacyDrawingHF", "drawingHF", "picture", "oleObjects", "controls",
                 "webPublishItems", "tableParts", "extLst")
_AFTER_DRAWING = ("legacyDrawing",) + _AFTER_LEGACY


def sheet_head(*, tab_color: str | None, page_setup_pr: str, freeze_header: bool | int,
               column_widths: Sequence[float | None] | None, dimension: str | None) -> str:
    """Everything of a new worksheet before its rows (ends with '<sheetData>').

    ``page_setup_pr`` is the ``<pageSetUpPr>`` element or ''; ``freeze_header`` True keeps row 1
    in view, a number n keeps rows 1 to n.
    """
    parts = [XML_DECL, f'<worksheet xmlns="{NS_MAIN}" xmlns:r="{NS_REL}">']
    if tab_color or page_setup_pr:
        parts.append("<sheetPr>")
        if tab_color:
            parts.append(f'<tabColor rgb="{tab_color}"/>')
        parts.append(page_setup_pr)
        parts.append("</sheetPr>")
    if dimension:
        parts.append(f'<dimension ref="{dimension}"/>')
    frozen = int(freeze_header)
    if frozen:
        parts.append('<sheetViews><sheetView workbookViewId="0">'
                     f'<pane ySplit="{frozen}" topLeftCell="A{frozen + 1}" activePane="bottomLeft" state="frozen"/>'
                     f'<selection pane="bottomLeft" activeCell="A{frozen + 1}" sqref="A{frozen + 1}"/></sheetView></sheetViews>')
    else:
        parts.append('<sheetViews><sheetView workbookViewId="0"/></sheetViews>')
    parts.append('<sheetFormatPr defaultRowHeight="15"/>')
    if column_widths:
        cols = [f'<col min="{i}" max="{i}" width="{float(w):.2f}" customWidth="1"/>'
                for i, w in enumerate(column_widths, start=1) if w]
        if cols:
            parts.append("<cols>" + "".join(cols) + "</cols>")
    parts.append("<sheetData>")
    return "".join(parts)


def sheet_tail(*, print_setup_xml: str, drawing_rel: str | None, legacy_rel: str | None,
               merged_cells_xml: str = "") -> str:
    """Everything of a new worksheet after its rows (starts with '</sheetData>').

    ``merged_cells_xml`` and ``print_setup_xml`` come from `_print_setup`, already in schema order.
    """
    parts = ["</sheetData>", merged_cells_xml, print_setup_xml]
    if drawing_rel:
        parts.append(f'<drawing r:id="{drawing_rel}"/>')
    if legacy_rel:
        parts.append(f'<legacyDrawing r:id="{legacy_rel}"/>')
    parts.append("</worksheet>")
    return "".join(parts)


def relationship_prefix(text: str) -> str | None:
    """Prefix bound to the relationships namespace on the root element, if any."""
    match = re.search(r"<[^?!][^>]*>", text)
    if match is None:
        return None
    for name, value in tag_attributes(match.group(0)).items():
        if name.startswith("xmlns:") and value == NS_REL:
            return name[6:]
    return None


def insert_link_element(text: str, local: str, rel_id: str) -> str:
    """Insert <drawing>/<legacyDrawing r:id=..> into a user's worksheet at its schema position."""
    p, root = root_prefix(text)
    if root != "worksheet":
        raise WriteRefused(f"part is a <{root}>, not a worksheet; cannot link comments to it")
    rp = relationship_prefix(text)
    if rp is None:
        attr = f'xmlns:tsr="{NS_REL}" tsr:id="{rel_id}"'  # declared on the element: root left alone
    else:
        attr = f'{rp}:id="{rel_id}"'
    element = f"<{p}{local} {attr}/>"
    after = _AFTER_LEGACY if local == "legacyDrawing" else _AFTER_DRAWING
    end_data = text.rfind(f"</{p}sheetData>")
    if end_data < 0:
        match = re.search(r"<" + re.escape(p) + r"sheetData\s*/>", text)
        if match is None:
            raise WriteRefused("worksheet has no <sheetData>")
        start = match.end()
    else:
        start = end_data + len(f"</{p}sheetData>")
    close = text.rfind(f"</{p}worksheet>")
    for name, at, _ in iter_top_level(text, start, close):
        if name[len(p):] in after:
            return text[:at] + element + text[at:]
    return text[:close] + element + text[close:]


CELL_TAG = re.compile(r"<(?P<p>(?:[\w.-]+:)?)c\s(?P<attrs>[^>]*?\br=\"(?P<r>[^\"]*)\"[^>]*?)(?P<empty>/?)>")
_SHARED_F = re.compile(r"<(?:[\w.-]+:)?f\b([^>]*?)/?>")


class StyledValue:
    """A value for ``replace_cells`` that also sets the cell's format (an xf index)."""

    __slots__ = ("value", "xf")

    def __init__(self, value: Any, xf: int) -> None:
        self.value, self.xf = value, xf


def replace_cells(text: str, values: Mapping[str, Any]) -> tuple[str, dict[str, str], int]:
    """Replace the given cells of a user's worksheet by plain values, formulas dropped.

    Only those <c> elements are rewritten (their style kept); every other byte stays.

    Returns
    -------
    (str, dict, int)
        The new text; per replaced cell the formula text it held ('' if none, and for the
        follower cells of a shared formula, whose text lives in the anchor cell); the number of
        replaced cells that held a formula.

    Raises
    ------
    WriteRefused
        A cell is not in the sheet, or it anchors a shared formula that other cells not
        being replaced still use (replacing it would break their formulas).
    """
    wanted = {}
    for ref, value in values.items():
        col, row = split_ref(ref)
        wanted[f"{column_letters(col)}{row}"] = value
    out: list[str] = []
    formulas: dict[str, str] = {}
    masters: dict[str, str] = {}
    had_formula = 0
    last = 0
    for match in CELL_TAG.finditer(text):
        ref = match.group("r").replace("$", "").upper()
        if ref not in wanted:
            continue
        p = match.group("p")
        attrs = tag_attributes(match.group("attrs"))
        if match.group("empty"):
            end, inner = match.end(), ""
        else:
            close = text.find(f"</{p}c>", match.end())
            if close < 0:
                raise WriteRefused(f"cell {ref} is not closed in the sheet XML")
            end = close + len(f"</{p}c>")
            inner = text[match.end():close]
        formula = re.search(r"<(?:[\w.-]+:)?f\b([^>]*?)(?:/>|>(.*?)</(?:[\w.-]+:)?f>)", inner, re.S)
        formulas[ref] = html.unescape(formula.group(2) or "") if formula else ""
        if formula:
            had_formula += 1
            f_attrs = tag_attributes(formula.group(1))
            if f_attrs.get("t") == "shared" and "ref" in f_attrs and "si" in f_attrs:
                masters[f_attrs["si"]] = ref
        keep = f' r="{attrs["r"]}"'
        style = f' s="{attrs["s"]}"' if "s" in attrs else ""
        value = wanted.pop(ref)
        if isinstance(value, StyledValue):  # a new look chosen by the caller (an xf index)
            style, value = f' s="{value.xf}"', value.value
        xml = cell_xml(f"<{p}c{keep}", style, value, lambda: ref)
        if p:
            xml = xml.replace("<is><t", f"<{p}is><{p}t").replace("</t></is></c>", f"</{p}t></{p}is></{p}c>")
            xml = xml.replace("><v>", f"><{p}v>").replace("</v></c>", f"</{p}v></{p}c>")
        out.append(text[last:match.start()])
        out.append(xml or f"<{p}c{keep}{style}/>")
        last = end
        if not wanted:
            break
    if wanted:
        missing = ", ".join(sorted(wanted)[:5])
        raise WriteRefused(f"cell(s) {missing} not found in the sheet (nothing to replace there)")
    out.append(text[last:])
    new_text = "".join(out)
    if masters:
        for f_match in _SHARED_F.finditer(new_text):
            f_attrs = tag_attributes(f_match.group(1))
            si = f_attrs.get("si")
            if f_attrs.get("t") == "shared" and si in masters:
                owner = re.search(r'\br="([^"]*)"', new_text[new_text.rfind("<c", 0, f_match.start()):f_match.start()])
                raise WriteRefused(f"cell {masters[si]} holds the shared formula also used by cell "
                                   f"{owner.group(1) if owner else '?'}, which is not being replaced; "
                                   "replace every cell of that formula together")
    return new_text, formulas, had_formula


_ROW = re.compile(r"<(?P<p>(?:[\w.-]+:)?)row\b(?P<attrs>[^>]*?)(?P<empty>/?)>")
_SHEETDATA = re.compile(r"<(?P<p>(?:[\w.-]+:)?)sheetData\b[^>]*?(?P<empty>/?)>")
_SPANS = re.compile(r'\sspans="[^"]*"')


def insert_missing_cells(text: str, refs: Sequence[str]) -> str:
    """Add an empty ``<c r=".."/>`` for each reference the sheet does not hold yet.

    Cells go into their row in column order; a missing row is created in row order. A row that
    gains a cell loses its optional ``spans`` hint (a hint only; Excel recomputes it). Nothing
    else changes, so ``replace_cells`` can then fill them like any other cell.
    """
    present = {m.group("r").replace("$", "").upper() for m in CELL_TAG.finditer(text)}
    todo: dict[int, list[int]] = {}
    for ref in refs:
        col, row = split_ref(ref)
        if f"{column_letters(col)}{row}" not in present:
            todo.setdefault(row, []).append(col)
    if not todo:
        return text
    sd = _SHEETDATA.search(text)
    if sd is None:
        raise WriteRefused("the sheet has no <sheetData> element")
    p = sd.group("p")
    if sd.group("empty"):
        text = text[:sd.start()] + text[sd.start():sd.end()].replace("/>", ">") + f"</{p}sheetData>" + text[sd.end():]
        sd = _SHEETDATA.search(text)
    end_sd = text.find(f"</{p}sheetData>", sd.end())
    rows = [(int(tag_attributes(m.group("attrs")).get("r", "0")), m) for m in _ROW.finditer(text, sd.end(), end_sd)]
    edits: list[tuple[int, int, str]] = []  # (start, end, replacement), applied back to front

    def cells_xml(cols: list[int], row: int) -> list[tuple[int, str]]:
        return [(c, f'<{p}c r="{column_letters(c)}{row}"/>') for c in sorted(set(cols))]

    by_row = {r: m for r, m in rows}
    for row, cols in todo.items():
        new = cells_xml(cols, row)
        m = by_row.get(row)
        if m is None:
            after = next((mm for r, mm in rows if r > row), None)
            at = after.start() if after else end_sd
            edits.append((at, at, f'<{p}row r="{row}">' + "".join(x for _, x in new) + f"</{p}row>"))
            continue
        start_tag = _SPANS.sub("", m.group(0))
        if m.group("empty"):
            start_tag = start_tag[:-2].rstrip() + ">"
            edits.append((m.start(), m.end(), start_tag + "".join(x for _, x in new) + f"</{p}row>"))
            continue
        close = text.find(f"</{p}row>", m.end())
        body = text[m.end():close]
        pieces: list[str] = []
        pos = 0
        pending = list(new)
        for cm in CELL_TAG.finditer(body):
            c_col, _ = split_ref(cm.group("r").replace("$", ""))
            while pending and pending[0][0] < c_col:
                pieces.append(body[pos:cm.start()])
                pieces.append(pending.pop(0)[1])
                pos = cm.start()
        pieces.append(body[pos:])
        pieces.extend(x for _, x in pending)
        edits.append((m.start(), close, start_tag + "".join(pieces)))
    for start, end, rep in sorted(edits, key=lambda e: (e[0], e[1]), reverse=True):
        text = text[:start] + rep + text[end:]
    return text
