"""The warnings sheet: every problem as a row, because comments neither print nor show everywhere."""

from __future__ import annotations

import math

from twistshare.engine.intake import Problem, Severity

from ..ooxml import BookWriter
from ._cells import Styled, caution_rows

__all__ = ["warnings_rows", "add_warnings_sheet", "WARNINGS_SHEET"]

WARNINGS_SHEET = "Twistshare warnings"
_MESSAGE_WIDTH = 110  # characters


def warnings_rows(findings: list[Problem]) -> list[list]:
    """Header and one row per problem, errors first."""
    rows: list[list] = [[Styled(h, "header") for h in ("Sheet", "Cell", "Part", "Layer", "Severity", "Message")]]
    order = {Severity.ERROR: 0, Severity.WARNING: 1, Severity.NOTE: 2}
    for f in sorted(findings, key=lambda f: order[f.severity]):
        style = "fail" if f.severity is Severity.ERROR else "warn" if f.severity is Severity.WARNING else "note"
        rows.append([f.sheet, f.cell, f.part, f.layer, Styled(f.severity.value, style), f.message])
    return rows




def add_warnings_sheet(writer: BookWriter, findings: list[Problem]) -> None:
    """The problems as rows; messages wrap in their column, each row as tall as its message."""
    rows = caution_rows() + warnings_rows(findings)
    heights = {}
    for n, row in enumerate(rows, start=1):
        msg = row[5] if len(row) > 5 and isinstance(row[5], str) else None
        if msg and len(msg) > _MESSAGE_WIDTH:
            heights[n] = 15.0 * math.ceil(len(msg) / (_MESSAGE_WIDTH * 0.95))
    writer.add_sheet(WARNINGS_SHEET, rows, column_widths=[12, 7, 13, 6, 8, _MESSAGE_WIDTH],
                     freeze_header=False, print_fit_width=True, column_styles=[None] * 5 + ["wrap"],
                     row_heights=heights)
