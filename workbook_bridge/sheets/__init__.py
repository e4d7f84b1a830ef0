"""The sheets the bridge writes: results, summary, warnings, materials, charts and comments.

Rows are plain lists of values (a value may be `Styled`); the package writer adds them to the
copy. No physics here: every number comes from the engine's rating, every word from the intake.
"""

from ._book_sheets import RESULT_SHEET_PREFIX, RESULT_SHEETS, add_rating_sheets
from ._cells import CAUTIONS, Styled, caution_rows, finite_or_none
from ._comments import comment_map, fill_library_values, first_errors, write_comments
from ._layout import fit_text_rows
from ._materials_sheet import MATERIALS_SHEET, materials_rows
from ._results import (
    READING_THE_RESULTS,
    RESULTS_SHEET,
    criteria_checked,
    criterion_counts,
    lowest_margins,
    results_rows,
)
from ._sizing_sheet import SIZING_SHEET, sizing_rows, sizing_summary_rows
from ._summary import SUMMARY_SHEET, SummaryLayout, summary_rows
from ._warnings import WARNINGS_SHEET, add_warnings_sheet, warnings_rows

__all__ = [
    "RESULT_SHEETS", "RESULT_SHEET_PREFIX", "RESULTS_SHEET", "SUMMARY_SHEET", "WARNINGS_SHEET",
    "MATERIALS_SHEET", "add_rating_sheets", "add_warnings_sheet", "write_comments", "comment_map",
    "first_errors", "fill_library_values", "results_rows", "summary_rows", "SummaryLayout",
    "warnings_rows", "materials_rows", "lowest_margins", "criterion_counts", "criteria_checked", "READING_THE_RESULTS", "finite_or_none",
    "CAUTIONS", "Styled", "caution_rows", "fit_text_rows", "SIZING_SHEET", "sizing_rows", "sizing_summary_rows",
]
