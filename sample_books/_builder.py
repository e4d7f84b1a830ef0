"""Writing the sample books of the invented Marrowby Pump & Drive scenario as new workbooks.

Every number here is invented for the demo (BRIEF §4): none describes a real part or a real
material. The books follow the input convention in DEVELOPERS.md and carry a few deliberately
bad cells, listed by :func:`planted_problems`, so the tool's warnings can be seen and tested.

The files are reproducible byte for byte: fixed document timestamps, fixed zip member times.
"""

from __future__ import annotations

import io
import re
import zipfile
from pathlib import Path

from openpyxl import Workbook
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

from ._scenario import (  # the scenario's data, written here
    _AUTHOR,
    _FIXED_TIME,
    _INVENTED_NOTE,
    _LONG_REVERSED_PART,
    _MATERIAL_ROWS,
    _PARTS,
    CATALOGUE_FILE,
    CATALOGUE_LONG_FILE,
    CAUTIONS,
    EXTRA_PART_HEADERS,
    LAYER_HEADERS,
    MATERIAL_HEADERS,
    PART_HEADERS,
    SLEEVE_PART_HEADERS,
    Cell,
    _extra_part_cells,
    _layer_cells,
    _long_layer_rows,
    _long_parts,
    _Part,
    _part_cells,
    _sleeve_part_cells,
    _wide_part_headers,
    planted_problems,
)

__all__ = ["write_catalogue", "write_catalogue_long"]

_HEADER_FONT = Font(bold=True)
_HEADER_FILL = PatternFill("solid", fgColor="DCE6EE")
_TITLE_FONT = Font(bold=True, size=14)


def _chars(value: Cell) -> int:
    """Characters a value shows with (numbers as Python writes them)."""
    return 0 if value is None else len(value if isinstance(value, str) else f"{value:g}" if isinstance(value, float) else str(value))


def _header_lines(header: str, width: float) -> int:
    """Lines a bold header takes wrapped in a column `width` characters wide (about 1.05 characters a width unit)."""
    room, lines, used = max(width * 1.05 - 1, 1), 1, 0
    for word in header.split():
        need = len(word) if used == 0 else used + 1 + len(word)
        if need > room and used:
            lines, used = lines + 1, len(word)
        else:
            used = need
    return lines


def _print_setup(ws: Worksheet, *, landscape: bool, pages_wide: int, title_rows: str | None = None,
                 title_columns: str | None = None) -> None:
    """Fit to `pages_wide` pages across, as many down as it takes, with the titles repeated on each page."""
    ws.page_setup.orientation = "landscape" if landscape else "portrait"
    ws.page_setup.fitToWidth = pages_wide
    ws.page_setup.fitToHeight = 0
    ws.sheet_properties.pageSetUpPr.fitToPage = True
    ws.page_margins.left = ws.page_margins.right = 0.45
    ws.oddFooter.left.text, ws.oddFooter.right.text = "&A", "page &P of &N"
    if title_rows:
        ws.print_title_rows = title_rows
    if title_columns:
        ws.print_title_cols = title_columns


def _write_table(ws: Worksheet, headers: tuple[str, ...], rows: list[tuple[Cell, ...]], pages_wide: int = 1) -> None:
    ws.append(list(headers))
    wrap = Alignment(wrap_text=True, vertical="center")
    for cell in ws[1]:
        cell.font = _HEADER_FONT
        cell.fill = _HEADER_FILL
        cell.alignment = wrap
    for row in rows:
        ws.append(list(row))
    ws.freeze_panes = "B2"
    lines = 1
    for i, header in enumerate(headers, start=1):
        content = max((_chars(r[i - 1]) for r in rows if i - 1 < len(r)), default=0)
        longest_word = max((len(w) for w in header.split()), default=0)
        width = max(7.0, content * 1.1 + 2, longest_word * 1.1 + 2, len(header) * 1.1 / 4 + 2)
        while _header_lines(header, width) > 4:
            width += 1
        ws.column_dimensions[get_column_letter(i)].width = round(width, 1)
        lines = max(lines, _header_lines(header, width))
    ws.row_dimensions[1].height = 14.5 * lines + 3
    _print_setup(ws, landscape=True, pages_wide=pages_wide, title_rows="1:1", title_columns="A:A")


def _write_materials(wb: Workbook) -> None:
    _write_table(wb.create_sheet("Materials"), MATERIAL_HEADERS, list(_MATERIAL_ROWS))


def _wide_row(part: _Part) -> tuple[Cell, ...]:
    cells: list[Cell] = list(_part_cells(part))
    for layer in part.layers:
        cells.extend(_layer_cells(layer))
    cells.extend([None] * (len(_wide_part_headers()) - len(cells) - len(EXTRA_PART_HEADERS)
                           - len(SLEEVE_PART_HEADERS)))
    cells.extend(_extra_part_cells(part))
    cells.extend(_sleeve_part_cells(part))
    return tuple(cells)


def _write_read_me(wb: Workbook, title: str, about: tuple[str, ...], book: str) -> None:
    ws = wb.create_sheet("Read me", 0)
    # 80 characters: one portrait page wide at about full size (LibreOffice does not shrink this
    # one-column sheet to fit a page, so it must fit as it is)
    ws.column_dimensions["A"].width = 80
    lines: list[tuple[str, Font | None]] = [(title, _TITLE_FONT), ("", None),
                                            (_INVENTED_NOTE, None), ("", None)]
    lines += [(text, None) for text in about]
    problems = [p for p in planted_problems() if p.book == book]
    if problems:
        lines += [("", None), ("Deliberately bad cells (to show the tool's warnings):", _HEADER_FONT)]
        lines += [(f"{p.sheet}!{p.cell} ({p.part}{'' if p.layer is None else f', layer {p.layer}'}):"
                   f" found {p.found}; expected {p.expected}.", None) for p in problems]
    lines += [("", None), ("Cautions", _HEADER_FONT)]
    lines += [(text, None) for text in CAUTIONS]
    for text, font in lines:
        ws.append([text])
        if font is not None:
            ws.cell(row=ws.max_row, column=1).font = font
        ws.cell(row=ws.max_row, column=1).alignment = Alignment(wrap_text=True, vertical="top")
        if len(text) > 80:  # wrapped: as many lines as it takes at about 1.1 characters a width unit
            ws.row_dimensions[ws.max_row].height = 14.5 * -(-len(text) // 86) + 3
    _print_setup(ws, landscape=False, pages_wide=1)


def _new_workbook() -> Workbook:
    wb = Workbook()
    wb.remove(wb.active)
    wb.properties.creator = _AUTHOR
    wb.properties.lastModifiedBy = _AUTHOR
    wb.properties.created = _FIXED_TIME
    wb.properties.modified = _FIXED_TIME
    wb.properties.title = "twistshare sample book (invented demo data)"
    return wb


_MODIFIED = re.compile(rb"(<dcterms:modified[^>]*>)[^<]*(</dcterms:modified>)")


def _save_reproducibly(wb: Workbook, path: Path) -> Path:
    """Save so that the same content gives the same bytes.

    openpyxl stamps the save time into docProps/core.xml and each zip member; both are
    replaced by the fixed time.
    """
    buffer = io.BytesIO()
    wb.save(buffer)
    stamp = _FIXED_TIME.strftime("%Y-%m-%dT%H:%M:%SZ").encode()
    zip_time = _FIXED_TIME.timetuple()[:6]
    out = io.BytesIO()
    with zipfile.ZipFile(buffer) as src, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as dst:
        for info in src.infolist():
            data = src.read(info.filename)
            if info.filename == "docProps/core.xml":
                data = _MODIFIED.sub(rb"\g<1>" + stamp + rb"\g<2>", data)
            member = zipfile.ZipInfo(info.filename, date_time=zip_time)
            member.compress_type = zipfile.ZIP_DEFLATED
            member.external_attr = info.external_attr
            dst.writestr(member, data)
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_bytes(out.getvalue())
    return path


def write_catalogue(path: str | Path) -> Path:
    """Write the Marrowby catalogue, one row per part with repeated layer column groups.

    Parameters
    ----------
    path : str or Path
        Where to write the new workbook (overwritten if it exists).

    Returns
    -------
    Path
        The path written.
    """
    wb = _new_workbook()
    _write_materials(wb)
    _write_table(wb.create_sheet("Parts"), _wide_part_headers(), [_wide_row(p) for p in _PARTS], pages_wide=2)
    _write_read_me(wb, "Marrowby Pump & Drive: parts catalogue (sample book)", (
        "Sheets: 'Materials' (one row per material; library materials named with their "
        "properties left blank for the tool to fill in) and 'Parts' (one row per part; "
        "layer 1 is the innermost layer, then outward).",
        "Units sit in the column headers; a cell may carry its own unit, which overrides the "
        "header's: the MPD-S-05x parts from the old US-built pump line are typed in inches, "
        "lbf·in, lbf·ft and hp.",
        "Duties are a torque, or a power at a speed (with a service factor where given). "
        "MPD-S-0xx are sleeved pump shafts; MPD-T-2xx are hybrid line-shaft tubes "
        "(aluminium tube, carbon-fibre over-wrap, steel end fitting inside at the ends).",
        "MPD-S-030 to MPD-S-033 are rebuilt shafts whose sleeve is shrink-fitted (interference, "
        "fit length, friction) or bonded (a bond allowable, here named by a built-in adhesive "
        "class, and a bond length) over the core: the results show the slip and bond checks, "
        "and what the load path and a hot running temperature do to them.",
        f"Rate it with:  twistshare rate {CATALOGUE_FILE} -o rated.xlsx",
    ), CATALOGUE_FILE)
    return _save_reproducibly(wb, Path(path))


def write_catalogue_long(path: str | Path) -> Path:
    """Write a smaller Marrowby catalogue with one row per layer keyed by part id.

    Parameters
    ----------
    path : str or Path
        Where to write the new workbook (overwritten if it exists).

    Returns
    -------
    Path
        The path written.
    """
    wb = _new_workbook()
    _write_materials(wb)
    _write_table(wb.create_sheet("Parts"), PART_HEADERS + EXTRA_PART_HEADERS,
                 [_part_cells(p) + _extra_part_cells(p) for p in _long_parts()])
    _write_table(wb.create_sheet("Layers"), LAYER_HEADERS, _long_layer_rows())
    _write_read_me(wb, "Marrowby Pump & Drive: parts catalogue, one row per layer (sample book)", (
        "Sheets: 'Materials', 'Parts' (length and duty per part, no layer columns) and "
        "'Layers' (one row per layer, keyed by part id; layer 1 is the innermost).",
        f"The layers of {_LONG_REVERSED_PART} are listed outermost first on purpose: the layer "
        "number, not the row order, says where a layer sits.",
        f"Rate it with:  twistshare rate {CATALOGUE_LONG_FILE} -o rated.xlsx",
    ), CATALOGUE_LONG_FILE)
    return _save_reproducibly(wb, Path(path))
