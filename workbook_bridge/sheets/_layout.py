"""Sizing the sheets we write for print: number formats, column widths, wrapped rows, page bands.

Estimates in characters of the default font (Calibri 11 or a metric twin such as Carlito): a
digit is 7 px, ordinary text about 6 px a character, bold header text about 6.6 px. They err a
little wide, so a text sized here is not clipped in LibreOffice or Excel.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence

import numpy as np

from ..ooxml import Cell, PrintSetup, column_points
from ..ooxml._print_setup import PRINTABLE_HEIGHT_PT, PRINTABLE_WIDTH_PT

__all__ = ["SIGNIFICANT", "number_style", "number_chars", "wrapped_lines", "text_height", "column_width",
           "header_height", "row_heights", "banded_setup", "paged_setup", "one_page_if_readable", "one_page_scale", "text_chars",
           "fit_text_rows"]

SIGNIFICANT = 4  # digits shown of a column's largest value (the cell keeps full precision)
_LINE_PT = 14.5   # one line of 11 pt text
_TEXT_PX, _BOLD_PX = 5.7, 6.6


def number_style(values: Iterable[float] | np.ndarray, significant: int = SIGNIFICANT) -> str:
    """Style name ('fixed0' ... 'fixed6', or 'sci') showing `significant` digits of the column's largest value.

    A column of 1234.5 and 12.3 gets 'fixed0'; of 0.01234 'fixed5'; beyond 10⁷ or below 10⁻³, 'sci'.
    """
    a = np.abs(np.asarray(list(values) if not isinstance(values, np.ndarray) else values, dtype=float))
    a = a[np.isfinite(a) & (a > 0)]
    if not a.size:
        return "fixed1"
    top = float(a.max())
    if top >= 1e7 or top < 1e-3:
        return "sci"
    decimals = significant - 1 - math.floor(math.log10(top))
    return f"fixed{min(max(decimals, 0), 6)}"


def number_chars(values: Iterable[float] | np.ndarray, style: str) -> int:
    """Characters the longest value of a column takes in `style`."""
    a = np.asarray(list(values) if not isinstance(values, np.ndarray) else values, dtype=float)
    a = a[np.isfinite(a)]
    if not a.size:
        return 0
    sign = 1 if (a < 0).any() else 0
    if style == "sci":
        return 9 + sign
    decimals = int(style[5:]) if style.startswith("fixed") and style[5:].isdigit() else 3
    top = float(np.abs(a).max())
    whole = max(1, math.floor(math.log10(top)) + 1) if top >= 1 else 1
    return whole + (decimals + 1 if decimals else 0) + sign


def text_chars(values: Iterable[object]) -> int:
    """Length of the longest text among `values` (``Cell`` values unwrapped; numbers skipped)."""
    longest = 0
    for v in set(values):  # catalogues repeat a few texts thousands of times
        if isinstance(v, Cell):
            v = v.value
        if isinstance(v, str) and len(v) > longest:
            longest = len(v)
    return longest


def _per_line(width: float, bold: bool) -> float:
    """Characters of text on one line of a column `width` characters wide."""
    return max((7.0 * width + 5.0 - 6.0) / (_BOLD_PX if bold else _TEXT_PX), 1.0)


def wrapped_lines(text: str, width: float, *, bold: bool = False, size: float = 11.0) -> int:
    """Lines `text` (of `size` points) takes wrapped at word boundaries in a column `width` characters wide."""
    room = max(_per_line(width, bold) * 11.0 / size, 1.0)
    lines = 0
    for paragraph in str(text).split("\n"):
        used, count = 0.0, 1
        for word in paragraph.split():
            need = len(word) if used == 0 else used + 1 + len(word)
            if need <= room or used == 0:
                used = need
                while used > room:  # a word longer than the line breaks inside it
                    count += 1
                    used -= room
            else:
                count += 1
                used = len(word)
                while used > room:
                    count += 1
                    used -= room
        lines += count
    return max(lines, 1)


def text_height(lines: int) -> float:
    """Row height in points for `lines` lines of 11 pt text."""
    return round(_LINE_PT * lines + 3.0, 1)


def column_width(header: str, content_chars: int, *, lines: int = 3, minimum: float = 6.0,
                 maximum: float = 40.0) -> float:
    """A column's width: its content on one line, its header on at most `lines` lines, within bounds."""
    words = header.split()
    longest_word = max((len(w) for w in words), default=0) * _BOLD_PX / _TEXT_PX
    spread = len(header) * _BOLD_PX / _TEXT_PX / lines
    width = max(content_chars * 1.05 + 1.5, longest_word + 1.5, spread + 2.0, minimum)
    width = min(width, maximum)
    while lines and wrapped_lines(header, width, bold=True) > lines and width < maximum:
        width += 1.0
    return round(width, 1)


def header_height(headers: Sequence[str], widths: Sequence[float]) -> float:
    """Height of a header row in points: room for its most wrapped header."""
    lines = max((wrapped_lines(h, w, bold=True) for h, w in zip(headers, widths) if h), default=1)
    return text_height(lines)


def row_heights(rows: Sequence[Sequence[object]], widths: Sequence[float], wrap_columns: Iterable[int],
                first_row: int = 1) -> dict[int, float]:
    """Heights (points, by 1-based row) of the rows whose text in a wrapped column needs more than one line."""
    wrap = [c for c in wrap_columns if c < len(widths)]
    out: dict[int, float] = {}
    for n, row in enumerate(rows, start=first_row):
        most = 1
        for c in wrap:
            if c < len(row):
                v = row[c].value if isinstance(row[c], Cell) else row[c]
                if isinstance(v, str) and len(v) > widths[c] * 0.9:
                    most = max(most, wrapped_lines(v, widths[c]))
        if most > 1:
            out[n] = text_height(most)
    return out


def banded_setup(widths: Sequence[float], bands: Sequence[int], *, title_columns: int, title_rows: tuple[int, int],
                 height_pt: float | None = None, orientation: str = "landscape", smallest: int = 40) -> PrintSetup:
    """A wide table printed in column bands: a page break after each column in `bands`, at the
    largest scale (per cent, at least `smallest`) at which the widest band with the repeated
    title columns fits the page width, and, where that costs less than a third, all `height_pt`
    points of rows fit one page."""
    edges = [title_columns] + sorted(b for b in set(bands) if title_columns < b < len(widths)) + [len(widths)]
    titles = sum(column_points(w) for w in widths[:title_columns])
    widest = max(sum(column_points(w) for w in widths[a:b]) for a, b in zip(edges, edges[1:]))
    scale = min(100.0, 100.0 * PRINTABLE_WIDTH_PT[orientation] / ((titles + widest) * 1.04))
    if height_pt:
        tall = 100.0 * PRINTABLE_HEIGHT_PT[orientation] / (height_pt * 1.04)
        if tall >= scale * 2 / 3:
            scale = min(scale, tall)
    return PrintSetup(orientation=orientation, fit_width=None, scale=max(int(scale), smallest),
                      title_rows=title_rows, title_columns=title_columns, column_breaks=tuple(edges[1:-1]))


def _with_wrap(cell: object) -> Cell:
    style = cell.style if isinstance(cell, Cell) else None
    value = cell.value if isinstance(cell, Cell) else cell
    return Cell(value, f"{style}+wrap" if style and "wrap" not in style and style != "header" else style or "wrap")


def fit_text_rows(rows: Sequence[Sequence[object]], widths: Sequence[float]) -> tuple[list[list], list[str], dict[int, float]]:
    """A sheet of blocks sized for print: a line of text alone on its row is merged across every
    column and wrapped (so it never runs past the page or under a chart), a text too long for
    its column is wrapped in it, and each such row and every header row is as tall as its
    wrapped text; returns (rows, merged ranges, row heights by 1-based row)."""
    span, last = sum(widths), len(widths)
    from ..ooxml._xmltext import column_letters

    out: list[list] = []
    merged: list[str] = []
    heights: dict[int, float] = {}
    for n, row in enumerate(rows, start=1):
        row = list(row)
        filled = [c for c in row if c is not None and c != ""]
        first = row[0] if row else None
        value = first.value if isinstance(first, Cell) else first
        if len(filled) == 1 and isinstance(value, str) and len(value) > widths[0] * 0.9 and last > 1:
            style = first.style if isinstance(first, Cell) else None
            out.append([_with_wrap(first)])
            merged.append(f"A{n}:{column_letters(last)}{n}")
            title = style == "title"
            lines = wrapped_lines(value, span, bold=style in ("title", "header"), size=14.0 if title else 11.0)
            if lines > 1 or title:
                heights[n] = round(text_height(lines) * (14.0 / 11.0 if title else 1.0), 1)
            continue
        most = 1
        for c, cell in enumerate(row[:last]):
            v = cell.value if isinstance(cell, Cell) else cell
            if not isinstance(v, str):
                continue
            bold = isinstance(cell, Cell) and cell.style == "header"
            lines = wrapped_lines(v, widths[c], bold=bold)
            free = all(x is None or x == "" for x in row[c + 1:last])
            if free and not bold and wrapped_lines(v, sum(widths[c:]) - 1) == 1:
                continue  # runs on over the empty cells to its right, within the page
            if free and not bold and c < last - 1:  # wrapped across the empty cells to its right
                row[c] = _with_wrap(cell)
                merged.append(f"{column_letters(c + 1)}{n}:{column_letters(last)}{n}")
                most = max(most, wrapped_lines(v, sum(widths[c:])))
                break
            if lines > 1 or len(v) > widths[c]:
                row[c] = _with_wrap(cell)
                most = max(most, lines)
        if most > 1:
            heights[n] = text_height(most)
            # the row's other texts read from the top, beside the wrapped one
            row = [Cell(c, "top") if isinstance(c, str) and c else c for c in row]
        out.append(row)
    return out, merged, heights


def paged_setup(widths: Sequence[float], heights: dict[int, float], rows: int, breaks: Sequence[int], *,
                orientation: str = "portrait", default_pt: float = 15.0, smallest: int = 40) -> PrintSetup:
    """A sheet of blocks printed one page wide with a page break after each row in `breaks`: at
    the largest scale (per cent, at least `smallest`) at which every column fits the page width
    and each page's rows fit its height (so no chart is cut by a break of the printer's own)."""
    wide = 100.0 * PRINTABLE_WIDTH_PT[orientation] / (sum(column_points(w) for w in widths) * 1.04)
    edges = [0] + sorted(b for b in set(breaks) if 0 < b < rows) + [rows]
    tallest = max(sum(heights.get(r, default_pt) for r in range(a + 1, b + 1)) for a, b in zip(edges, edges[1:]))
    tall = 100.0 * PRINTABLE_HEIGHT_PT[orientation] / (tallest * 1.04)
    return PrintSetup(orientation=orientation, fit_width=None, scale=max(int(min(wide, tall, 100.0)), smallest),
                      row_breaks=tuple(edges[1:-1]))


def one_page_if_readable(widths: Sequence[float], heights: dict[int, float], rows: int, *, title_rows=None,
                         orientation: str = "portrait", default_pt: float = 15.0, smallest: int = 42) -> PrintSetup:
    """Fitted one page wide, and one page tall as well where that still prints at `smallest` per cent or more."""
    fits = one_page_scale(widths, heights, rows, orientation=orientation, default_pt=default_pt) >= smallest
    return PrintSetup(orientation=orientation, fit_height=1 if fits else 0, title_rows=title_rows)


def one_page_scale(widths: Sequence[float], heights: dict[int, float], rows: int, *,
                   orientation: str = "portrait", default_pt: float = 15.0) -> float:
    """The scale, per cent, at which the sheet prints on one page (its width and its height both fit)."""
    wide = 100.0 * PRINTABLE_WIDTH_PT[orientation] / (sum(column_points(w) for w in widths) * 1.04)
    total = sum(heights.get(r, default_pt) for r in range(1, rows + 1))
    tall = 100.0 * PRINTABLE_HEIGHT_PT[orientation] / (total * 1.04)
    return min(wide, tall)
