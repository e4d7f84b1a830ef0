"""Package layer of the workbook bridge: read-safety checks and a writer that adds parts.

The writer never re-saves the user's book: the output is the input zip package with our sheets,
comments, charts and styles added, the few parts that must list them changed minimally, and every
other member copied with identical bytes.
"""

from ._atomic import atomic_file
from ._cells import Cell, Formula
from ._charts import BarChart, ScatterChart, SeriesData, range_ref
from ._errors import OoxmlError, PackageRefused, WriteRefused
from ._naming import backup_path
from ._output_place import check_output_name, check_output_place, keep_previous, write_book
from ._package import Limits
from ._print_setup import FOOTER, PrintSetup, column_points
from ._safety import HUGE_ROWS, DefinedName, ExternalLink, PackageInfo, SheetInfo, TableInfo, inspect_package
from ._sheet_selection import write_sheet_selection
from ._styles import STYLE_NAMES
from ._unrate import RESAVED_ADVICE, StripReport, find_record, read_record, strip_ours
from ._writer import BookWriter, SheetHandle, WriteReport

__all__ = [
    "BarChart", "BookWriter", "Cell", "Formula", "DefinedName", "ExternalLink", "HUGE_ROWS", "Limits",
    "OoxmlError", "PackageInfo", "PackageRefused", "PrintSetup", "FOOTER", "column_points", "STYLE_NAMES", "ScatterChart", "SeriesData",
    "SheetHandle", "SheetInfo", "TableInfo", "WriteRefused", "WriteReport", "inspect_package",
    "atomic_file", "backup_path", "RESAVED_ADVICE", "StripReport", "find_record", "read_record", "strip_ours",
    "range_ref", "check_output_name", "check_output_place", "keep_previous", "write_book", "write_sheet_selection",
]
