"""Every sheet a rating adds to the copy, in one call."""

from __future__ import annotations

from collections.abc import Sequence

from twistshare.engine.intake import BookRating, Display, Problem, Severity

from ..ooxml import BookWriter, PrintSetup
from ._charts import add_charts
from ._comments import fill_library_values, first_errors
from ._layout import fit_text_rows, paged_setup
from ._materials_sheet import MATERIALS_SHEET, add_materials_sheet
from ._results import RESULTS_SHEET, lowest_margins, results_rows
from ._sizing_sheet import SIZING_SHEET, sizing_rows
from ._summary import SUMMARY_SHEET, SUMMARY_WIDTHS, summary_rows
from ._warnings import WARNINGS_SHEET, add_warnings_sheet
from ._worked import WORKED_WIDTHS, worked_rows, worked_sheet_name

__all__ = ["add_rating_sheets", "RESULT_SHEETS", "RESULT_SHEET_PREFIX"]

#: The sheets `rate` adds; every name starts with `RESULT_SHEET_PREFIX`.
RESULT_SHEETS = (RESULTS_SHEET, SUMMARY_SHEET, WARNINGS_SHEET, MATERIALS_SHEET, SIZING_SHEET)
RESULT_SHEET_PREFIX = "Twistshare "


def add_rating_sheets(writer: BookWriter, result: BookRating, display: Display, profile_part: str | None,
                      worked: Sequence[str] | None = None) -> tuple[str, ...]:
    """The results, sizing (when a part asks), summary, warnings and materials sheets, the charts,
    the library fill-ins, and a worked calculation for each part in `worked` (default: the lowest
    margin). Returns the names of the sheets a printed report holds, in its order: the summary,
    the worked calculations, the warnings."""
    chosen = _worked_parts(result, worked)
    parts = result.parts
    if parts is not None and parts.count:
        laid = results_rows(result, display, first_errors(result.problems))
        writer.add_sheet(RESULTS_SHEET, laid.rows, column_widths=laid.widths, column_styles=laid.styles,
                         tab_color="FF1F3A4D", header_height=laid.header_height, row_heights=laid.row_heights,
                         print_setup=laid.print_setup)
    if result.sizing is not None and parts is not None and parts.count:
        zrows, zwidths, zstyles = sizing_rows(result, display)
        zrows, zmerged, zheights = fit_text_rows(zrows, zwidths)
        writer.add_sheet(SIZING_SHEET, zrows, column_widths=zwidths, column_styles=zstyles,
                         tab_color="FF1F3A4D", row_heights=zheights, merged_cells=zmerged,
                         print_setup=PrintSetup(orientation="landscape", title_rows=(1, 1), title_columns=1))
    srows, layout = summary_rows(result, display, profile_part)
    printed, merged, heights = fit_text_rows(srows, SUMMARY_WIDTHS)
    summ = writer.add_sheet(SUMMARY_SHEET, printed, column_widths=list(SUMMARY_WIDTHS), freeze_header=False,
                            tab_color="FF1F3A4D", row_heights=heights, merged_cells=merged,
                            print_setup=paged_setup(SUMMARY_WIDTHS, heights, len(printed),
                                                    [layout.page_break] if layout.page_break else []))
    warnings_sheet = add_warnings_sheet(writer, result.problems)
    if result.materials is not None and result.materials.by_name:
        add_materials_sheet(writer, result.materials, display)
    add_charts(writer, summ, srows, layout, display)
    fill_library_values(writer, result)
    report = [summ.name]
    for i in chosen:
        wrows, wmerged, wheights = fit_text_rows(worked_rows(result, i), WORKED_WIDTHS)
        worked_sheet = writer.add_sheet(worked_sheet_name(result.parts.ids[i]), wrows, column_widths=list(WORKED_WIDTHS),
                         freeze_header=False, row_heights=wheights, merged_cells=wmerged,
                         column_styles=[None] + ["upto4"] * 6,
                         print_setup=PrintSetup(orientation="landscape"))
        report.append(worked_sheet.name)
    return tuple(report) + (warnings_sheet,)


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
