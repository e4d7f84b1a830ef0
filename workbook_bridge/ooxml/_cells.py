"""Cell values as the writer takes them, and their streamed OOXML."""

from __future__ import annotations

import math
import numbers
from dataclasses import dataclass
from typing import Any, Callable, Iterable, Mapping, Sequence

from ._xmltext import MAX_COLUMN, MAX_ROW, column_letters, escape_text

__all__ = ["Cell", "Formula", "CellValue", "stream_rows", "cell_xml", "MAX_TEXT"]

MAX_TEXT = 32767  # characters a spreadsheet cell holds; longer text is cut and marked


@dataclass(frozen=True)
class Cell:
    """A value with one of the writer's style names (``STYLE_NAMES``, or names joined by '+').

    Attributes
    ----------
    value : None, bool, int, float or str
        Text is always written as text, never as a formula; NaN and infinities as empty cells.
    style : str or None
        A style name such as 'header', 'fail', 'percent' or 'fail+percent'.
    """

    value: Any
    style: str | None = None


@dataclass(frozen=True)
class Formula:
    """A native spreadsheet formula written by twistshare itself, with its value as computed here.

    Only our own code makes one (a worked calculation's steps); text read from a user's book is
    never turned into a formula.

    Attributes
    ----------
    text : str
        The formula without its leading ``=``, in the file format's own syntax (``SUM(B5:B7)``).
    cached : float or None
        The value shown until a spreadsheet recalculates (our engine's value).
    """

    text: str
    cached: float | None = None


CellValue = Any  # None | bool | int | float | str | Cell | Formula


def _text_body(text: str) -> str:
    """The ``<t>`` element of an inline string (escaped, cut to the cell limit)."""
    if len(text) > MAX_TEXT:
        text = text[: MAX_TEXT - 1] + "\u2026"
    body = escape_text(text)
    space = ' xml:space="preserve"' if body[:1].isspace() or body[-1:].isspace() or "\n" in body else ""
    return f"<t{space}>{body}</t>"


def _text_xml(pre: str, style_attr: str, text: str) -> str:
    return f'{pre}{style_attr} t="inlineStr"><is>{_text_body(text)}</is></c>'


def cell_xml(pre: str, style_attr: str, value: Any, where: Callable[[], str]) -> str:
    """One <c> element; ``pre`` is '<c r="B7"' and ``style_attr`` ' s="3"' or ''.

    Raises
    ------
    TypeError
        For a value of a type a cell cannot hold (the message names the cell via ``where``).
    """
    if value is None:
        return ""
    if isinstance(value, Formula):
        cached = "" if value.cached is None or not math.isfinite(float(value.cached)) else \
            f"<v>{float(value.cached)!r}</v>"
        return f"{pre}{style_attr}><f>{escape_text(value.text)}</f>{cached}</c>"
    if hasattr(value, "dtype") and hasattr(value, "item") and getattr(value, "ndim", 1) == 0:
        value = value.item()  # a numpy scalar: its Python equivalent
    if isinstance(value, bool):
        return f'{pre}{style_attr} t="b"><v>{int(value)}</v></c>'
    if isinstance(value, str):
        return _text_xml(pre, style_attr, value) if value else ""
    if isinstance(value, numbers.Integral):
        return f"{pre}{style_attr}><v>{int(value)}</v></c>"
    if isinstance(value, numbers.Real):
        number = float(value)
        if not math.isfinite(number):
            return ""
        return f"{pre}{style_attr}><v>{number!r}</v></c>"
    raise TypeError(f"cell {where()}: a {type(value).__name__} cannot be written to a cell; "
                    "pass None, a bool, a number or text")


def stream_rows(rows: Iterable[Sequence[Any]], write: Callable[[bytes], Any],
                style_attr_of: Callable[[str], str], column_style_attrs: Sequence[str],
                first_row: int = 1, flush_every: int = 2000,
                first_row_height: float | None = None,
                row_heights: Mapping[int, float] | None = None) -> tuple[int, int]:
    """Write <row> elements for ``rows`` through ``write``; return (last row, widest column).

    ``style_attr_of`` turns a style name into ' s="N"'; ``column_style_attrs[i]`` is the attribute
    used for plain values in column i+1. Empty rows are skipped (their numbers still count).
    """
    pres: list[str] = []
    col_attrs = list(column_style_attrs)
    cache: dict[str | None, str] = {None: ""}
    texts: dict[str, str] = {}
    buf: list[str] = []
    append = buf.append
    row_number = first_row - 1
    widest = 0
    for row_number, row in enumerate(rows, start=first_row):
        if row_number > MAX_ROW:
            raise ValueError(f"more than {MAX_ROW:,} rows: a sheet cannot hold them")
        n = len(row)
        if n > len(pres):
            if n > MAX_COLUMN:
                raise ValueError(f"row {row_number} has {n:,} cells; a sheet holds {MAX_COLUMN:,} columns")
            pres.extend(f'<c r="{column_letters(i + 1)}' for i in range(len(pres), n))
            col_attrs.extend("" for _ in range(len(col_attrs), n))
        rs = str(row_number)
        cells: list[str] = []
        add = cells.append
        for i, value in enumerate(row):
            kind = type(value)
            if kind is float:
                if value - value == 0.0:  # finite: NaN and +-inf give NaN here
                    add(f'{pres[i]}{rs}"{col_attrs[i]}><v>{value!r}</v></c>')
            elif value is None:
                continue
            elif kind is str:
                if value:
                    # Catalogues repeat the same few texts (materials, statuses) thousands of
                    # times: escape each once.
                    body = texts.get(value)
                    if body is None:
                        body = texts[value] = _text_body(value)
                    add(f'{pres[i]}{rs}"{col_attrs[i]} t="inlineStr"><is>{body}</is></c>')
            elif kind is int:
                add(f'{pres[i]}{rs}"{col_attrs[i]}><v>{value}</v></c>')
            else:
                style_attr = col_attrs[i]
                if kind is Cell:
                    style = value.style
                    if style not in cache:
                        cache[style] = style_attr_of(style)
                    style_attr = cache[style] or style_attr
                    value = value.value
                col, r = i + 1, row_number
                xml = cell_xml(f'{pres[i]}{rs}"', style_attr, value, lambda: f"{column_letters(col)}{r}")
                if xml:
                    add(xml)
        if cells:
            widest = max(widest, n)
            height = first_row_height if row_number == first_row else None
            if row_heights:
                height = row_heights.get(row_number, height)
            if height is not None:
                append(f'<row r="{rs}" ht="{float(height):g}" customHeight="1">')
            else:
                append(f'<row r="{rs}">')
            append("".join(cells))
            append("</row>")
        if row_number % flush_every == 0:
            write("".join(buf).encode("utf-8"))
            buf.clear()
    if buf:
        write("".join(buf).encode("utf-8"))
    return row_number, widest
