"""The intake: one schema of inputs, read the same way by every front end.

Below the cell functions and the workbook bridge, above the engine core. It turns raw cell
values — a workbook's sheets, or the blocks a spreadsheet hands a cell function — into the
core's SI arrays plus `Problem`s worded once: the fields and their labels, units, plausible
ranges and blank meanings (`_schema`); rule, yes/no and material words (`_words`); materials
completed from the library (`_materials`); parts in both layouts (`_parts`, `_layers`,
`_duty`); the core's diagnoses worded (`_flag_words`); the words every output shares
(`_wording`). No file, workbook or host I/O: grids come in as values.
"""

from ._book import TABLE_NAMES, BookRating, TableSource, rate_tables
from ._columns import cell_value, describe_kind, header_factor, row_array
from ._flag_words import problems_from_rating
from ._grid import SheetGrid, all_of_type, cell_ref, column_letter, number_count, parse_ref
from ._layup import LayupNotationError, parse_layup
from ._materials import FilledCell, MaterialSet, ResolvedMaterial, read_materials
from ._parts import PartsInput, read_layer_table_parts, read_parts
from ._problems import Problem, Severity, stops
from ._schema import (
    DUTY_FIELDS,
    LAYER_FIELDS,
    LAYER_ROW_FIELDS,
    MATERIAL_FIELDS,
    PART_FIELDS,
    Blank,
    Column,
    Field,
    Plausible,
    field_by_key,
    match_header,
    match_layer_group_header,
    split_layer_group,
)
from ._table_checks import unknown_headers
from ._tables import TableRegion, TableSpot, locate_table
from ._wording import CAUTION_LINES, CRITERION_NOUNS, CRITERION_WORDS, METHOD_LINE, Display, governs_text
from ._words import (
    RULE_CHOICES,
    RULE_FORMULAS,
    RULE_WORDS,
    flag_from_value,
    header_key,
    material_key,
    quoted,
    rule_from_text,
    where_text,
)

__all__ = [
    "parse_layup", "LayupNotationError",
    # problems
    "Problem", "Severity", "stops",
    # the schema
    "Field", "Blank", "Plausible", "Column", "MATERIAL_FIELDS", "PART_FIELDS", "DUTY_FIELDS",
    "LAYER_FIELDS", "LAYER_ROW_FIELDS", "field_by_key", "match_header", "match_layer_group_header",
    "split_layer_group",
    # words
    "header_key", "material_key", "rule_from_text", "RULE_WORDS", "RULE_FORMULAS", "RULE_CHOICES",
    "flag_from_value", "quoted", "where_text",
    # grids and tables
    "SheetGrid", "all_of_type", "number_count", "cell_ref", "column_letter", "parse_ref", "TableRegion", "TableSpot", "locate_table",
    "unknown_headers",
    # values
    "cell_value", "header_factor", "describe_kind", "row_array",
    # materials and parts
    "MaterialSet", "ResolvedMaterial", "FilledCell", "read_materials", "PartsInput", "read_parts",
    "read_layer_table_parts", "problems_from_rating",
    # a whole book's tables
    "BookRating", "TableSource", "rate_tables", "TABLE_NAMES",
    # shared output words
    "CAUTION_LINES", "METHOD_LINE", "CRITERION_WORDS", "CRITERION_NOUNS", "governs_text", "Display",
]
