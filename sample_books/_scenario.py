"""The invented Marrowby Pump & Drive scenario: its materials, parts and planted bad cells.

Every number here is invented for the demo (BRIEF §4): none describes a real part or a real
material. The bad cells listed by :func:`planted_problems` let the tool's warnings be seen.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass

from openpyxl.utils import get_column_letter
from twistshare.engine.intake import CAUTION_LINES

from ._scenario_data import (  # noqa: F401  (the builder reads the data through this module)
    _AB,
    _AL,
    _BZ,
    _CF,
    _CS,
    _DX,
    _EF,
    _GL,
    _MATERIAL_ROWS,
    _MISSPELT,
    _PARTS,
    _Q2,
    _RS,
    _SS,
    _US,
    MATERIAL_HEADERS,
    Cell,
    _Layer,
    _Part,
    _sleeved,
)

CATALOGUE_FILE = "marrowby_catalogue.xlsx"
CATALOGUE_LONG_FILE = "marrowby_catalogue_by_layer.xlsx"
CELL_FUNCTIONS_FILE = "marrowby_cell_functions.xlsx"

# One fixed instant for every document property and zip member, so regenerating reproduces
# the committed files exactly.
_FIXED_TIME = _dt.datetime(2024, 3, 1, 8, 0, 0)
_AUTHOR = "Marrowby Pump & Drive (invented demo data)"

#: The caution every book carries: the one wording of the whole tool.
CAUTIONS: tuple[str, ...] = CAUTION_LINES

_INVENTED_NOTE = (
    "Marrowby Pump & Drive is an invented works. Every part number, dimension and duty in this "
    "book, and every property of the works' own 'MPD ...' materials, is invented demo data: "
    "none describes a real part. Materials named from the built-in library get their "
    "properties from that library, whose sources the tool names in its comments."
)



_MAX_LAYERS = 4

PART_HEADERS: tuple[str, ...] = (
    "Part",
    "Description",
    "Length [mm]",
    "Torque [N·m]",
    "Power [kW]",
    "Speed [rpm]",
    "Service factor",
    "Twist limit [deg]",
    "Twist limit per length [deg/m]",
)
_PART_ATTRS: tuple[str, ...] = (
    "part", "description", "length", "torque", "power", "speed",
    "service_factor", "twist_limit", "twist_per_length",
)
# After the layer groups, so the columns of the first books keep their places.
EXTRA_PART_HEADERS: tuple[str, ...] = ("Bearing span [mm]",)
_EXTRA_PART_ATTRS: tuple[str, ...] = ("bearing_span",)
# The sleeve's fit or bond (the interface under layer 2), in the one-row-per-part catalogue only.
SLEEVE_PART_HEADERS: tuple[str, ...] = (
    "Load path", "Operating temperature [°C]", "Layer 2 interference [mm]",
    "Layer 2 fit length [mm]", "Layer 2 friction", "Layer 2 bond allowable [MPa]",
    "Layer 2 bond length [mm]",
)
_SLEEVE_PART_ATTRS: tuple[str, ...] = (
    "load_path", "operating_temperature", "interference", "fit_length", "friction",
    "bond_allowable", "bond_length",
)
_LAYER_SUFFIXES: tuple[str, ...] = ("material", "outer diameter [mm]", "inner diameter [mm]", "Kt")
_LAYER_ATTRS: tuple[str, ...] = ("material", "outer", "inner", "kt")


def _wide_part_headers() -> tuple[str, ...]:
    groups = tuple(
        f"Layer {n} {suffix}" for n in range(1, _MAX_LAYERS + 1) for suffix in _LAYER_SUFFIXES
    )
    return PART_HEADERS + groups + EXTRA_PART_HEADERS + SLEEVE_PART_HEADERS


# The one-row-per-layer book: a subset of the catalogue, plus two bad layer rows of its own.
_LONG_PART_IDS: tuple[str, ...] = (
    "MPD-S-001", "MPD-S-002", "MPD-S-003", "MPD-S-005", "MPD-S-006", "MPD-S-008",
    "MPD-S-051", "MPD-S-054", "MPD-T-201", "MPD-T-202", "MPD-T-203", "MPD-T-205",
)
LAYER_HEADERS: tuple[str, ...] = (
    "Part", "Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]", "Kt",
)
# Layers listed outermost first for this part: valid, the tool must sort by layer number.
_LONG_REVERSED_PART = "MPD-S-005"
# Deliberately bad: a layer row for a part the Parts sheet does not have.
_LONG_ORPHAN = ("MPD-S-099", 1, _CS, 40, 0, None)
# Deliberately bad: MPD-T-202 lists layer 2 twice.
_LONG_DUPLICATE_PART, _LONG_DUPLICATE_LAYER = "MPD-T-202", 2


# --------------------------------------------------------------------------------------------
# The problems planted in the books, with the cells they sit in
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class PlantedProblem:
    """One deliberately bad cell in a sample book.

    Attributes
    ----------
    book : str
        File name of the sample book.
    sheet : str
        Sheet holding the cell.
    cell : str
        A1 reference of the cell.
    part : str or None
        Part id of the row, or the material name for a Materials row.
    layer : int or None
        Layer number (1 = innermost) where the problem belongs to one layer.
    kind : str
        Short key: ``gap``, ``inner_not_less_than_outer``, ``unknown_material``,
        ``wrong_dimension``, ``implausible_magnitude``, ``missing_value``, ``not_a_number``,
        ``unknown_part``, ``duplicate_layer``.
    found : str
        What the cell holds, as text.
    expected : str
        What a correct cell would hold.
    """

    book: str
    sheet: str
    cell: str
    part: str | None
    layer: int | None
    kind: str
    found: str
    expected: str


def _part_row(part_id: str) -> int:
    """1-based sheet row of a part in the Parts sheet of the one-row-per-part catalogue."""
    for i, part in enumerate(_PARTS):
        if part.part == part_id:
            return i + 2
    raise KeyError(part_id)


def _wide_cell(part_id: str, header: str) -> str:
    col = _wide_part_headers().index(header) + 1
    return f"{get_column_letter(col)}{_part_row(part_id)}"


def planted_problems() -> tuple[PlantedProblem, ...]:
    """The deliberately bad cells of the sample books, with where they are and what is wrong.

    Returns
    -------
    tuple of PlantedProblem
        One entry per bad cell, in the catalogue first, then the one-row-per-layer book.
    """
    cat, long_ = CATALOGUE_FILE, CATALOGUE_LONG_FILE
    mat_row = 2 + [r[0] for r in _MATERIAL_ROWS].index(_RS)
    g_col = get_column_letter(MATERIAL_HEADERS.index("G [GPa]") + 1)
    orphan_row, duplicate_row = _long_special_rows()
    return (
        PlantedProblem(cat, "Parts", _wide_cell("MPD-S-010", "Layer 2 inner diameter [mm]"),
                       "MPD-S-010", 2, "gap", "51 mm over a 50 mm layer 1",
                       "layer 2 inner diameter equal to layer 1 outer diameter (50 mm)"),
        PlantedProblem(cat, "Parts", _wide_cell("MPD-S-012", "Layer 2 inner diameter [mm]"),
                       "MPD-S-012", 2, "inner_not_less_than_outer",
                       "48 mm against an outer diameter of 44 mm",
                       "an inner diameter less than the outer diameter"),
        PlantedProblem(cat, "Parts", _wide_cell("MPD-S-014", "Layer 2 material"),
                       "MPD-S-014", 2, "unknown_material", _MISSPELT,
                       "a material in the Materials sheet or the built-in library"),
        PlantedProblem(cat, "Parts", _wide_cell("MPD-S-016", "Layer 1 outer diameter [mm]"),
                       "MPD-S-016", 1, "wrong_dimension", "52 GPa", "a length (mm, in)"),
        PlantedProblem(cat, "Materials", f"{g_col}{mat_row}", _RS, None,
                       "implausible_magnitude", "79000 GPa",
                       "a shear modulus in GPa (tens of GPa for metals)"),
        PlantedProblem(cat, "Parts", _wide_cell("MPD-S-018", "Layer 1 outer diameter [mm]"),
                       "MPD-S-018", 1, "missing_value", "an empty cell", "a length in mm"),
        PlantedProblem(cat, "Parts", _wide_cell("MPD-S-019", "Torque [N·m]"),
                       "MPD-S-019", None, "not_a_number", "tbc", "a torque in N·m"),
        PlantedProblem(long_, "Layers", f"A{orphan_row}", _LONG_ORPHAN[0], 1, "unknown_part",
                       _LONG_ORPHAN[0], "a part id listed in the Parts sheet"),
        PlantedProblem(long_, "Layers", f"B{duplicate_row}", _LONG_DUPLICATE_PART,
                       _LONG_DUPLICATE_LAYER, "duplicate_layer", f"layer {_LONG_DUPLICATE_LAYER} again",
                       "each layer number once per part"),
    )


def sample_part_ids() -> tuple[str, ...]:
    """Part ids of the one-row-per-part catalogue, in sheet order."""
    return tuple(p.part for p in _PARTS)


# --------------------------------------------------------------------------------------------
# Writing
# --------------------------------------------------------------------------------------------


def _part_cells(part: _Part) -> tuple[Cell, ...]:
    return tuple(getattr(part, a) for a in _PART_ATTRS)


def _extra_part_cells(part: _Part) -> tuple[Cell, ...]:
    return tuple(getattr(part, a) for a in _EXTRA_PART_ATTRS)


def _sleeve_part_cells(part: _Part) -> tuple[Cell, ...]:
    return tuple(getattr(part, a) for a in _SLEEVE_PART_ATTRS)


def _layer_cells(layer: _Layer) -> tuple[Cell, ...]:
    return tuple(getattr(layer, a) for a in _LAYER_ATTRS)


def _long_parts() -> tuple[_Part, ...]:
    by_id = {p.part: p for p in _PARTS}
    return tuple(by_id[pid] for pid in _LONG_PART_IDS)


def _long_layer_rows() -> list[tuple[Cell, ...]]:
    rows: list[tuple[Cell, ...]] = []
    for part in _long_parts():
        numbered = list(enumerate(part.layers, start=1))
        if part.part == _LONG_REVERSED_PART:
            numbered.reverse()
        for n, layer in numbered:
            rows.append((part.part, n, *_layer_cells(layer)))
            if part.part == _LONG_DUPLICATE_PART and n == _LONG_DUPLICATE_LAYER:
                rows.append((part.part, n, *_layer_cells(layer)))
    rows.append(_LONG_ORPHAN)
    return rows


def _long_special_rows() -> tuple[int, int]:
    """1-based Layers-sheet rows of the orphan layer and the repeated layer."""
    rows = _long_layer_rows()
    orphan = rows.index(_LONG_ORPHAN) + 2
    seen: set[tuple[Cell, Cell]] = set()
    duplicate = -1
    for i, row in enumerate(rows):
        key = (row[0], row[1])
        if key in seen:
            duplicate = i + 2
            break
        seen.add(key)
    return orphan, duplicate
