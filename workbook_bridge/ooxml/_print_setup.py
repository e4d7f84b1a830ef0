"""How a sheet we add prints: orientation, fit or scale, repeated titles, breaks, margins, footer.

One frozen `PrintSetup` per sheet; the writer turns it into the worksheet's print elements in
their schema order (CT_Worksheet, ECMA-376 Part 1, 18.3.1.99: ``mergeCells`` … ``printOptions``,
``pageMargins``, ``pageSetup``, ``headerFooter``, ``rowBreaks``, ``colBreaks`` … ``drawing``,
``legacyDrawing``) and into the ``_xlnm.Print_Titles`` name of the workbook (18.2.6).

Fitting to a number of pages and manual page breaks exclude each other in practice: with
``fitToPage`` set, LibreOffice (tried: 7.x) places its own breaks and drops ours. So a sheet is
either fitted (``fit_width`` pages across, as many down as it takes) or printed at a ``scale``
with the column breaks its caller chose (a wide table split into readable column groups).
"""

from __future__ import annotations

from dataclasses import dataclass

from ._xmltext import column_letters, escape_text, split_ref

__all__ = ["PrintSetup", "FOOTER", "page_setup_pr_xml", "print_xml", "print_titles_ref", "merge_cells_xml",
           "PRINTABLE_WIDTH_PT", "PRINTABLE_HEIGHT_PT", "column_points"]

#: Sheet name left, file name centre, page number right (header/footer codes, ECMA-376 Part 1, 18.3.1.46).
FOOTER = "&L&8&A&C&8&F&R&8page &P of &N"

# Printable area in points at the margins below, on the smaller of A4 and US Letter in each
# direction (the writer does not choose the paper: the reader's printer does).
_MARGIN_LR, _MARGIN_TB = 0.45, 0.6  # inches
PRINTABLE_WIDTH_PT = {"portrait": (8.27 - 2 * _MARGIN_LR) * 72, "landscape": (11.0 - 2 * _MARGIN_LR) * 72}
PRINTABLE_HEIGHT_PT = {"portrait": (11.0 - 2 * _MARGIN_TB - 0.4) * 72, "landscape": (8.27 - 2 * _MARGIN_TB - 0.4) * 72}


def column_points(width_chars: float) -> float:
    """Printed width in points of a column ``width_chars`` characters wide, at its widest.

    Calibri 11 gives 7 px a character plus 5 px (about 5.3 pt a character); where Calibri and its
    metric twin Carlito are missing, LibreOffice falls back to a wider font (DejaVu Sans: measured
    7.0 pt a character). The wider figure is used, so a page planned here holds in either.
    """
    return 7.0 * width_chars


@dataclass(frozen=True)
class PrintSetup:
    """How one sheet prints.

    Attributes
    ----------
    orientation : str
        'portrait' or 'landscape'.
    fit_width : int or None
        Pages across to fit every column on (None: print at ``scale`` instead).
    fit_height : int
        Pages down when fitting; 0 = as many as it takes.
    scale : int or None
        Per cent, 10 to 400, when not fitting (None: 100).
    title_rows : (int, int) or None
        First and last row (1-based) repeated at the top of every page.
    title_columns : int
        The first n columns repeated at the left of every page.
    column_breaks : tuple of int
        A page break after each of these columns (1-based); only without fitting.
    row_breaks : tuple of int
        A page break after each of these rows (1-based); only without fitting.
    footer : str
        Footer codes (``FOOTER``: sheet, file, page of pages); '' for none.
    """

    orientation: str = "portrait"
    fit_width: int | None = 1
    fit_height: int = 0
    scale: int | None = None
    title_rows: tuple[int, int] | None = None
    title_columns: int = 0
    column_breaks: tuple[int, ...] = ()
    row_breaks: tuple[int, ...] = ()
    footer: str = FOOTER

    def __post_init__(self) -> None:
        if self.orientation not in ("portrait", "landscape"):
            raise ValueError(f"orientation must be 'portrait' or 'landscape': {self.orientation!r}")
        if self.fit_width is not None and not (isinstance(self.fit_width, int) and self.fit_width >= 1):
            raise ValueError(f"fit_width must be a page count >= 1 or None: {self.fit_width!r}")
        if not (isinstance(self.fit_height, int) and self.fit_height >= 0):
            raise ValueError(f"fit_height must be a page count >= 0 (0: as many as it takes): {self.fit_height!r}")
        if self.scale is not None and not (isinstance(self.scale, int) and 10 <= self.scale <= 400):
            raise ValueError(f"scale must be a whole per cent from 10 to 400: {self.scale!r}")
        if self.fit_width is not None and (self.scale is not None or self.column_breaks or self.row_breaks):
            raise ValueError("a fitted sheet takes no scale and no manual breaks (fitting drops them); "
                             "set fit_width=None to print at a scale with breaks")
        if self.title_rows is not None:
            first, last = self.title_rows
            if not (isinstance(first, int) and isinstance(last, int) and 1 <= first <= last):
                raise ValueError(f"title_rows must be (first, last) rows, 1-based, first <= last: {self.title_rows!r}")
        if not (isinstance(self.title_columns, int) and self.title_columns >= 0):
            raise ValueError(f"title_columns must be a column count >= 0: {self.title_columns!r}")
        for name in ("column_breaks", "row_breaks"):
            value = getattr(self, name)
            if any(not (isinstance(b, int) and b >= 1) for b in value):
                raise ValueError(f"{name} must be 1-based column or row numbers: {value!r}")

    @property
    def fits(self) -> bool:
        """The sheet is scaled to a number of pages (``<pageSetUpPr fitToPage="1"/>``)."""
        return self.fit_width is not None


def page_setup_pr_xml(setup: PrintSetup | None) -> str:
    """The ``<pageSetUpPr>`` child of ``<sheetPr>`` ('' when the sheet is not fitted)."""
    return '<pageSetUpPr fitToPage="1"/>' if setup is not None and setup.fits else ""


def _breaks(tag: str, positions: tuple[int, ...], max_other: int) -> str:
    if not positions:
        return ""
    ids = sorted(set(positions))
    body = "".join(f'<brk id="{i}" max="{max_other}" man="1"/>' for i in ids)
    return f'<{tag} count="{len(ids)}" manualBreakCount="{len(ids)}">{body}</{tag}>'


def print_xml(setup: PrintSetup | None) -> str:
    """``printOptions`` to ``colBreaks`` of a new worksheet, in schema order (only margins without a setup)."""
    margins = (f'<pageMargins left="{_MARGIN_LR}" right="{_MARGIN_LR}" top="{_MARGIN_TB}" bottom="{_MARGIN_TB}" '
               'header="0.3" footer="0.3"/>')
    if setup is None:
        return margins
    page = f'<pageSetup orientation="{setup.orientation}"'
    if setup.fits:
        page += f' fitToWidth="{setup.fit_width}" fitToHeight="{setup.fit_height}"'
    elif setup.scale is not None:
        page += f' scale="{setup.scale}"'
    parts = ['<printOptions horizontalCentered="0"/>', margins, page + "/>"]
    if setup.footer:
        parts.append(f"<headerFooter><oddFooter>{escape_text(setup.footer)}</oddFooter></headerFooter>")
    parts.append(_breaks("rowBreaks", setup.row_breaks, 16383))
    parts.append(_breaks("colBreaks", setup.column_breaks, 1048575))
    return "".join(parts)


def print_titles_ref(sheet_name: str, setup: PrintSetup | None) -> str | None:
    """The value of the sheet's ``_xlnm.Print_Titles`` name, or None when nothing repeats."""
    if setup is None or not (setup.title_rows or setup.title_columns):
        return None
    quoted = "'" + sheet_name.replace("'", "''") + "'"
    parts = []
    if setup.title_columns:
        parts.append(f"{quoted}!$A:${column_letters(setup.title_columns)}")
    if setup.title_rows:
        first, last = setup.title_rows
        parts.append(f"{quoted}!${first}:${last}")
    return ",".join(parts)


def merge_cells_xml(ranges: tuple[str, ...] | list[str]) -> str:
    """``<mergeCells>`` for ranges such as 'A3:E3' ('' for none).

    Raises
    ------
    ValueError
        A range that is not 'A1:B2' with its first cell above and left of its last.
    """
    if not ranges:
        return ""
    out = []
    for ref in ranges:
        ends = ref.replace("$", "").split(":")
        if len(ends) != 2:
            raise ValueError(f"merged range must look like 'A3:E3': {ref!r}")
        (c1, r1), (c2, r2) = split_ref(ends[0]), split_ref(ends[1])
        if c2 < c1 or r2 < r1 or (c1, r1) == (c2, r2):
            raise ValueError(f"merged range {ref!r} must span at least two cells, first cell top left")
        out.append(f'<mergeCell ref="{column_letters(c1)}{r1}:{column_letters(c2)}{r2}"/>')
    return f'<mergeCells count="{len(out)}">{"".join(out)}</mergeCells>'
