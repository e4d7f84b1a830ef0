"""Every sheet a rating adds to the copy, in one call."""

from __future__ import annotations

from collections.abc import Sequence

from twistshare.engine.intake import BookRating, Display, Problem, Severity

from ..ooxml import BookWriter
from ._charts import add_charts
from ._comments import fill_library_values, first_errors
from ._materials_sheet import MATERIALS_SHEET, materials_rows
from ._results import RESULTS_SHEET, lowest_margins, results_rows
from ._sizing_sheet import SIZING_SHEET, sizing_rows
from ._summary import SUMMARY_SHEET, summary_rows
from ._warnings import WARNINGS_SHEET, add_warnings_sheet
from ._worked import worked_rows, worked_sheet_name

__all__ = ["add_rating_sheets", "RESULT_SHEETS", "RESULT_SHEET_PREFIX"]

#: The sheets `rate` adds; every name starts with `RESULT_SHEET_PREFIX`.
RESULT_SHEETS = (RESULTS_SHEET, SUMMARY_SHEET, WARNINGS_SHEET, MATERIALS_SHEET, SIZING_SHEET)
RESULT_SHEET_PREFIX = "Twistshare "


def add_rating_sheets(writer: BookWriter, result: BookRating, display: Display, profile_part: str | None,
                      worked: Sequence[str] | None = None) -> None:
    """The results, sizing (when a part asks), summary, warnings and materials sheets, the charts,
    the library fill-ins, and a worked calculation for each part in `worked` (default: the lowest
    margin)."""
    chosen = _worked_parts(result, worked)
    parts = result.parts
    if parts is not None and parts.count:
        laid = results_rows(result, display, first_errors(result.problems))
        writer.add_sheet(RESULTS_SHEET, laid.rows, column_widths=laid.widths, column_styles=laid.styles,
                         tab_color="FF1F3A4D", header_height=laid.header_height, row_heights=laid.row_heights,
                         print_setup=laid.print_setup)
    if result.sizing is not None and parts is not None and parts.count:
        zrows, zwidths, zstyles = sizing_rows(result, display)
        writer.add_sheet(SIZING_SHEET, zrows, column_widths=zwidths, column_styles=zstyles,
                         tab_color="FF1F3A4D", header_height=32)
    srows, layout = summary_rows(result, display, profile_part)
    summ = writer.add_sheet(SUMMARY_SHEET, srows, column_widths=[30, 40, 18, 16, 34],
                            freeze_header=False, tab_color="FF1F3A4D", print_fit_one_page=True)
    add_warnings_sheet(writer, result.problems)
    if result.materials is not None and result.materials.by_name:
        writer.add_sheet(MATERIALS_SHEET, materials_rows(result.materials, display),
                         column_widths=[30, 9, 10, 14, 38, 14, 14, 10, 8, 60], header_height=32)
    add_charts(writer, summ, srows, layout, display)
    fill_library_values(writer, result)
    for i in chosen:
        writer.add_sheet(worked_sheet_name(result.parts.ids[i]), worked_rows(result, i),
                         column_widths=[30, 26, 12, 12, 10, 10, 8, 14, 14, 11, 14, 16, 20, 40],
                         freeze_header=False, print_fit_width=True)


def _worked_parts(result: BookRating, wanted: Sequence[str] | None) -> list[int]:
    """The rated parts to work out: those named (ignoring case), else the lowest margin. A name
    that is not a rated part is told in the warnings (added before the warnings sheet is written)."""
    if result.parts is None or result.rated is None or not result.rated.any():
        return []
    if not wanted:
        return lowest_margins(result, 1)
    index = {pid.strip().casefold(): i for i, pid in enumerate(result.parts.ids)}
    out = []
    for name in wanted:
        i = index.get(name.strip().casefold())
        if i is not None and result.rated[i]:
            out.append(i)
        else:
            why = "is not rated" if i is not None else "is not in the parts table"
            result.problems.append(Problem(Severity.WARNING, None, None,
                                           f"--worked {name!r} {why}: no worked calculation is written for it",
                                           code="worked-part"))
    return list(dict.fromkeys(out))
