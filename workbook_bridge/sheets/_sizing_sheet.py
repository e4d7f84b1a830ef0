"""The sizing sheet: one row per part that asked to be sized, written only when some part asks.

A sheet of its own, so the results sheet keeps its columns whatever the book asks. Sizes are in
the results' length unit; every word comes from the intake.
"""

from __future__ import annotations

import numpy as np
from twistshare.engine.core import SizedDimension, SizingStatus, StockStatus
from twistshare.engine.intake import Display, governs_text
from twistshare.engine.intake._wording import SIZING_CAUTION, SIZING_STATUS_WORDS, STOCK_STATUS_WORDS
from twistshare.engine.intake._words import OUTER_LAYERS_WORDS, size_text

from ._cells import Styled, caution_rows
from ._cells import finite_or_none as _f

__all__ = ["SIZING_SHEET", "sizing_rows", "sizing_summary_rows"]

SIZING_SHEET = "Twistshare sizing"


def _governs(book, i: int, criterion: int, layer: int) -> str:
    names = book.parts.materials[i]
    return governs_text(criterion, layer, names[layer] if 0 <= layer < len(names) else None)


def sizing_rows(book, display: Display) -> tuple[list[list], list[int], list[str | None]]:
    """Header and one row per part asking; (rows, column widths, column number styles)."""
    s, parts = book.sizing, book.parts
    req = s.request
    lu, lf = display.unit("length")
    header = ["Part", "Sized dimension", "Outer layers", "Target reserve factor", "Sizing status",
              f"Solved size [{lu}]", "Governs at the solved size", "Reserve factor at the solved size",
              f"Stock size chosen [{lu}]", "Stock status", "Reserve factor at the stock size",
              "Governs at the stock size"]
    rows: list[list] = [[Styled(h, "header") for h in header]]
    for i in np.flatnonzero(req.asked).tolist():
        dim, slot = int(req.dimension[i]), int(req.slot[i])
        row: list = [parts.ids[i], size_text(SizedDimension(dim), slot),
                     OUTER_LAYERS_WORDS[req.outer_layers[i]] if dim != SizedDimension.BORE else "",
                     float(req.target[i])]
        if not s.sized[i]:
            rows.append(row + [Styled("not sized: the part is not rated", "warn")])
            continue
        status = SizingStatus(int(s.status[i]))
        good = status in (SizingStatus.SOLVED, SizingStatus.HOLDS_AT_LEAST)
        row += [SIZING_STATUS_WORDS[status] if good else Styled(SIZING_STATUS_WORDS[status], "warn"),
                _f(s.size[i] / lf), _governs(book, i, int(s.governing_criterion[i]), int(s.governing_layer[i])),
                _f(s.reserve_factor[i])]
        if s.has_stock[i]:
            st = StockStatus(int(s.stock_status[i]))
            row += [_f(s.stock_size[i] / lf),
                    STOCK_STATUS_WORDS[st] if st == StockStatus.FOUND else Styled(STOCK_STATUS_WORDS[st], "warn"),
                    _f(s.stock_reserve_factor[i]),
                    _governs(book, i, int(s.stock_criterion[i]), int(s.stock_layer[i]))]
        rows.append(row)
    rows.append([])
    rows.append([SIZING_CAUTION])
    rows.extend(caution_rows()[:-1])  # no blank row after: the block ends the sheet
    widths = [14, 26, 10, 10, 34, 12, 30, 12, 12, 28, 12, 30]
    styles = [None, None, None, "fixed3", None, "fixed3", None, "fixed3", "fixed3", None, "fixed3", None]
    return rows, widths, styles


def sizing_summary_rows(book, display: Display) -> list[list]:
    """The summary's short 'Sizing' section: counts by outcome; empty when no part asks."""
    s = book.sizing
    if s is None:
        return []
    rows: list[list] = [[Styled("Sizing", "header"), Styled("Parts", "header")]]
    rows.append(["asked to be sized", int(s.request.asked.sum())])
    for status in SizingStatus:
        n = int((s.sized & (s.status == int(status))).sum())
        if n:
            rows.append([SIZING_STATUS_WORDS[status], n])
    if s.has_stock.any():
        for status in StockStatus:
            n = int((s.has_stock & (s.stock_status == int(status))).sum())
            if n:
                rows.append([f"stock: {STOCK_STATUS_WORDS[status]}", n])
    rows.append([f"see '{SIZING_SHEET}'"])
    rows.append([])
    return rows
