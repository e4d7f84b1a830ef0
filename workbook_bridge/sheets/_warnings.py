"""The warnings sheet: every problem as a row, because comments neither print nor show everywhere."""

from __future__ import annotations

from twistshare.engine.intake import Problem, Severity

from ..ooxml import BookWriter
from ._cells import Styled, caution_rows
from ._layout import (
    column_width,
    one_page_if_readable,
    one_page_scale,
    row_heights,
    text_chars,
    text_height,
    wrapped_lines,
)

__all__ = ["warnings_rows", "add_warnings_sheet", "WARNINGS_SHEET"]

WARNINGS_SHEET = "Twistshare warnings"
_HEADERS = ("Sheet", "Cell", "Part", "Layer", "Severity", "Message")
_MESSAGE_WIDTH = 100.0  # characters, where the sheet takes more than one page
_MESSAGE_WIDTHS = (80.0, 90.0, 100.0, 110.0, 120.0, 130.0, 140.0)  # tried for one page
_ONE_PAGE_SMALLEST = 42  # per cent: smaller print is hard to read
_SEVERITY_STYLE = {Severity.ERROR: "fail+top", Severity.WARNING: "warn+top", Severity.NOTE: "top"}


def warnings_rows(findings: list[Problem]) -> list[list]:
    """Header and one row per problem, errors first."""
    rows: list[list] = [[Styled(h, "header") for h in _HEADERS]]
    order = {Severity.ERROR: 0, Severity.WARNING: 1, Severity.NOTE: 2}
    for f in sorted(findings, key=lambda f: order[f.severity]):
        rows.append([f.sheet, f.cell, f.part, f.layer, Styled(f.severity.value, _SEVERITY_STYLE[f.severity]), f.message])
    return rows


def add_warnings_sheet(writer: BookWriter, findings: list[Problem]) -> str:
    """The caution, then the problems as rows: every cell read from the top, messages wrapped in
    their column and each row as tall as its message; the header row repeats on every printed page.
    The message column is as wide as lets the sheet print on one page at the largest scale.
    Returns the sheet's name."""
    cautions = caution_rows()
    table = warnings_rows(findings)
    narrow = [column_width(h, text_chars(r[c] for r in table[1:]) if c != 3 else 2, lines=1)
              for c, h in enumerate(_HEADERS[:-1])]
    n_rows = len(cautions) + len(table)
    # Wider messages wrap onto fewer lines but shrink the page: take the best one-page scale. Every
    # row is at least one line tall, so a long list cannot fit one page at any width: not tried.
    widths, heights, merged = None, {}, []
    if one_page_scale(narrow, {}, n_rows) >= _ONE_PAGE_SMALLEST:  # an upper bound of any layout's
        layouts = [_layout(narrow + [width], cautions, table) for width in _MESSAGE_WIDTHS]
        widths, heights, merged = max(layouts, key=lambda lay: one_page_scale(lay[0], lay[1], n_rows))
    if widths is None or one_page_scale(widths, heights, n_rows) < _ONE_PAGE_SMALLEST:
        widths, heights, merged = _layout(narrow + [_MESSAGE_WIDTH], cautions, table)
    span = len(_HEADERS)
    rows = [[Styled(r[0].value, r[0].style if n == 1 else "caution_line+wrap")] + [None] * (span - 1) if r else r
            for n, r in enumerate(cautions, start=1)] + table
    return writer.add_sheet(WARNINGS_SHEET, rows, column_widths=widths, freeze_header=False,
                            column_styles=["top"] * 5 + ["wrap"], row_heights=heights, merged_cells=merged,
                            print_setup=one_page_if_readable(widths, heights, len(rows),
                                                             smallest=_ONE_PAGE_SMALLEST,
                                                             title_rows=(len(cautions) + 1, len(cautions) + 1))).name


def _layout(widths: list[float], cautions: list, table: list[list]) -> tuple[list[float], dict[int, float], list[str]]:
    """Row heights and merged caution lines of the sheet for these column widths."""
    header_row = len(cautions) + 1
    heights = row_heights(table[1:], widths, [5], first_row=header_row + 1)
    # the caution lines run across the table's width: merged, wrapped, as tall as they need
    merged = []
    for n, row in enumerate(cautions, start=1):
        if row and isinstance(row[0].value, str) and n > 1:
            merged.append(f"A{n}:F{n}")
            lines = wrapped_lines(row[0].value, sum(widths))
            if lines > 1:
                heights[n] = text_height(lines)
    return widths, heights, merged
