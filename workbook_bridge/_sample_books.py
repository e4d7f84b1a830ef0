"""Sample books from the invented Marrowby Pump & Drive scenario, written as new workbooks.

Every number here is invented for the demo (BRIEF §4): none describes a real part or a real
material. The books follow the input convention in DEVELOPERS.md and carry a few deliberately
bad cells, listed by :func:`planted_problems`, so the tool's warnings can be seen and tested.

The files are reproducible byte for byte: fixed document timestamps, fixed zip member times.
"""

from __future__ import annotations

import datetime as _dt
import io
import re
import zipfile
from dataclasses import dataclass
from pathlib import Path
from typing import Union

from openpyxl import Workbook
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

__all__ = [
    "CATALOGUE_FILE",
    "CATALOGUE_LONG_FILE",
    "CELL_FUNCTIONS_FILE",
    "CAUTIONS",
    "PlantedProblem",
    "planted_problems",
    "sample_part_ids",
    "write_catalogue",
    "write_catalogue_long",
    "write_cell_functions_book",
    "write_all",
]

CATALOGUE_FILE = "marrowby_catalogue.xlsx"
CATALOGUE_LONG_FILE = "marrowby_catalogue_by_layer.xlsx"
CELL_FUNCTIONS_FILE = "marrowby_cell_functions.xlsx"

# One fixed instant for every document property and zip member, so regenerating reproduces
# the committed files exactly.
_FIXED_TIME = _dt.datetime(2024, 3, 1, 8, 0, 0)
_AUTHOR = "Marrowby Pump & Drive (invented demo data)"

CAUTIONS: tuple[str, ...] = (
    "twistshare is a preliminary design aid; its results are not a certification of any part.",
    "Verify every result against the applicable codes and standards for the application.",
    "Have a qualified engineer review the design, the inputs and the results before use.",
    "Local codes and licensed engineering practice prevail over anything this tool reports.",
)

_INVENTED_NOTE = (
    "Marrowby Pump & Drive is an invented works. Every part number, dimension and duty in this "
    "book, and every property of the works' own 'MPD ...' materials, is invented demo data: "
    "none describes a real part. Materials named from the built-in library get their "
    "properties from that library, whose sources the tool names in its comments."
)

Cell = Union[float, int, str, None]


# --------------------------------------------------------------------------------------------
# Materials
# --------------------------------------------------------------------------------------------

# Library names exactly as twistshare.engine.core.material_library() spells them.
_CS, _SS, _AB = "AISI 1045 hot rolled", "Stainless 316 annealed", "Aluminium bronze C95400 as cast"
_AL, _CF = "Aluminium 6061-T6", "Carbon/epoxy tube 45 wound"
_Q2, _DX, _BZ = "MPD core steel Q2", "MPD duplex sleeve", "MPD bronze sleeve"
_EF, _US, _GL = "MPD end-fitting steel", "MPD US-line shaft steel", "MPD glass/epoxy wrap"
_RS = "MPD repair sleeve (old sheet)"
# Deliberately bad: the stainless name with one letter dropped.
_MISSPELT = "Stainles 316 annealed"

MATERIAL_HEADERS: tuple[str, ...] = (
    "Material",
    "G [GPa]",
    "E [GPa]",
    "Poisson ratio",
    "Allowable shear [MPa]",
    "Yield strength [MPa]",
    "Ultimate strength [MPa]",
    "Allowable rule",
    "Factor of safety",
    "Keyway",
    "Density [kg/m³]",
)

# Library rows name a built-in material and leave its properties blank for the tool to fill;
# the works' own rows give their (invented) properties in full.
_MATERIAL_ROWS: tuple[tuple[Cell, ...], ...] = (
    (_CS, None, None, None, None, None, None, "shafting code", None, "yes", None),
    (_SS, None, None, None, None, None, None, "max shear", 2.0, "no", None),
    (_AB, None, None, None, None, None, None, "distortion energy", 2.5, "no", None),
    (_AL, None, None, None, None, None, None, "distortion energy", 2.0, "no", None),
    (_CF, None, None, None, 70, None, None, "given", None, "no", None),
    (_Q2, 80, 207, 0.29, None, 650, 850, "distortion energy", 2.0, "no", 7850),
    (_DX, 77, 200, 0.30, None, 450, 680, "max shear", 2.0, "no", 7800),
    (_BZ, 41, 110, 0.34, 45, None, None, "given", None, "no", 8800),
    (_EF, 79.5, 205, 0.29, None, 415, 620, "distortion energy", 2.0, "no", 7850),
    # The old US line's steel keeps the units its data sheet used, typed into the cells.
    (_US, "11500 ksi", "29000 ksi", 0.29, None, "60 ksi", "90 ksi",
     "shafting code", None, "yes", 7850),
    (_GL, 6, 18, 0.30, 25, None, None, "given", None, "no", 1900),
    # Deliberately bad: G typed in MPa under a GPa header (implausible magnitude).
    (_RS, 79000, 200, 0.30, 60, None, None, "given", None, "no", 7850),
)


# --------------------------------------------------------------------------------------------
# Parts
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Layer:
    material: Cell
    outer: Cell
    inner: Cell
    kt: Cell = None


@dataclass(frozen=True)
class _Part:
    part: str
    description: str
    length: Cell
    layers: tuple[_Layer, ...]
    torque: Cell = None
    power: Cell = None
    speed: Cell = None
    service_factor: Cell = None
    twist_limit: Cell = None
    twist_per_length: Cell = None


def _sleeved(*layers: tuple[Cell, ...]) -> tuple[_Layer, ...]:
    return tuple(_Layer(*layer) for layer in layers)



_PARTS: tuple[_Part, ...] = (
    # Sleeved pump shafts, metric: steel core first, sleeves outward.
    _Part("MPD-S-001", "Pump shaft, stainless sleeve at gland", 650,
          _sleeved((_CS, 45, 0, 1.6), (_SS, 52, 45)), torque=850),
    _Part("MPD-S-002", "Pump shaft, bronze sleeve", 720,
          _sleeved((_CS, 50, 0, 1.8), (_BZ, 56, 50)), power=30, speed=1450),
    _Part("MPD-S-003", "Pump shaft, duplex sleeve, twist-limited", 900,
          _sleeved((_Q2, 60, 0, 1.4), (_DX, 68, 60)), power=55, speed=1470, twist_limit=0.5),
    _Part("MPD-S-004", "Pump shaft, aluminium-bronze sleeve", 540,
          _sleeved((_CS, 55, 0), (_AB, 62, 55)), torque=1800),
    _Part("MPD-S-005", "Pump shaft, bronze underlay + stainless sleeve", 800,
          _sleeved((_CS, 48, 0, 1.5), (_AB, 52, 48), (_SS, 58, 52)), power=45, speed=2950),
    _Part("MPD-S-006", "Hollow pump shaft, stainless sleeve", 1200,
          _sleeved((_CS, 70, 30), (_SS, 78, 70)), torque=3200, twist_per_length=0.75),
    _Part("MPD-S-007", "Plain replacement shaft, no sleeve", 480,
          _sleeved((_CS, 40, 0, 1.6)), torque=620),
    _Part("MPD-S-008", "Pump shaft, bronze underlay + duplex sleeve", 950,
          _sleeved((_Q2, 65, 0, 1.7), (_BZ, 70, 65), (_DX, 76, 70)),
          power=90, speed=1480, service_factor=1.25),
    _Part("MPD-S-009", "Pump shaft, stainless sleeve, keyed coupling end", 610,
          _sleeved((_CS, 50, 0, 2.0), (_SS, 56, 50)), torque=950),
    # Deliberately bad: the sleeve's bore (51 mm) leaves a 1 mm gap over the 50 mm core.
    _Part("MPD-S-010", "Pump shaft, stainless sleeve (bore machined oversize)", 640,
          _sleeved((_CS, 50, 0, 1.6), (_SS, 57, 51)), torque=900),
    _Part("MPD-S-011", "Pump shaft, repair sleeve from the old data sheet", 700,
          _sleeved((_Q2, 58, 0, 1.6), (_RS, 64, 58)), power=75, speed=1475),
    # Deliberately bad: sleeve bore 48 mm is not less than its 44 mm outer diameter.
    _Part("MPD-S-012", "Pump shaft, stainless sleeve (diameters swapped)", 600,
          _sleeved((_CS, 48, 0, 1.6), (_SS, 44, 48)), torque=700),
    _Part("MPD-S-013", "Pump shaft, aluminium-bronze sleeve, slow duty", 820,
          _sleeved((_CS, 60, 0, 1.6), (_AB, 66, 60)), power=37, speed=980, twist_limit=0.35),
    # Deliberately bad: a misspelt sleeve material that is neither in the book nor the library.
    _Part("MPD-S-014", "Pump shaft, stainless sleeve (material misspelt)", 750,
          _sleeved((_CS, 55, 0, 1.5), (_MISSPELT, 62, 55)), torque=1500),
    _Part("MPD-S-015", "Large hollow pump shaft, bronze + stainless sleeves", 1400,
          _sleeved((_CS, 80, 40), (_BZ, 86, 80), (_SS, 92, 86)),
          power=160, speed=1490, twist_per_length=0.3),
    # Deliberately bad: a modulus pasted into a diameter cell (wrong dimension).
    _Part("MPD-S-016", "Pump shaft, stainless sleeve (pasted value)", 700,
          _sleeved((_CS, "52 GPa", 0, 1.6), (_SS, 58, 52)), torque=1100),
    _Part("MPD-S-017", "Short pump shaft, stainless sleeve, high torque", 560,
          _sleeved((_Q2, 55, 0, 1.5), (_SS, 60, 55)), torque=2600),
    # Deliberately bad: the core's outer diameter was never filled in.
    _Part("MPD-S-018", "Pump shaft, bronze sleeve (core size missing)", 660,
          _sleeved((_CS, None, 0, 1.6), (_BZ, 62, 56)), torque=950),
    # Deliberately bad: text where the torque belongs.
    _Part("MPD-S-019", "Pump shaft, stainless sleeve (duty not yet known)", 620,
          _sleeved((_CS, 45, 0, 1.6), (_SS, 50, 45)), torque="tbc"),
    _Part("MPD-S-020", "High-speed pump shaft, duplex sleeve", 880,
          _sleeved((_Q2, 56, 0, 1.4), (_DX, 62, 56)), power=110, speed=2960, service_factor=1.5),
    _Part("MPD-S-021", "All-stainless hollow pump shaft", 1000,
          _sleeved((_SS, 60, 40)), torque=600, twist_limit=0.5),
    _Part("MPD-S-022", "Pump shaft, aluminium-bronze sleeve, torque in kN·m", 760,
          _sleeved((_CS, 58, 0, 1.6), (_AB, 64, 58)), torque="2.4 kN·m"),
    # The old US-built pump line: every cell carries its own US unit.
    _Part("MPD-S-051", "US line pump shaft, stainless sleeve", "36 in",
          _sleeved((_US, "1.875 in", 0, 1.6), (_SS, "2.125 in", "1.875 in")),
          torque="5200 lbf·in"),
    _Part("MPD-S-052", "US line pump shaft, aluminium-bronze sleeve", "42 in",
          _sleeved((_CS, "2.000 in", 0, 1.7), (_AB, "2.250 in", "2.000 in")),
          power="40 hp", speed=1750, twist_limit="0.5 deg"),
    _Part("MPD-S-053", "US line pump shaft, bronze sleeve", "30 in",
          _sleeved((_US, "1.625 in", 0), (_BZ, "1.875 in", "1.625 in")),
          power="25 hp", speed=1750),
    _Part("MPD-S-054", "US line pump shaft, bronze underlay + stainless sleeve", "48 in",
          _sleeved((_US, "2.500 in", 0, 1.5), (_AB, "2.625 in", "2.500 in"),
                   (_SS, "2.875 in", "2.625 in")),
          power="75 hp", speed=1180, twist_per_length="0.08 deg/ft"),
    _Part("MPD-S-055", "US line pump shaft, stainless sleeve, torque in lbf·ft", "40 in",
          _sleeved((_CS, "2.25 in", 0, 2.0), (_SS, "2.5 in", "2.25 in")), torque="650 lbf·ft"),
    _Part("MPD-S-056", "US line small pump shaft, stainless sleeve", "34 in",
          _sleeved((_US, "1.375 in", 0), (_SS, "1.5 in", "1.375 in")),
          power="15 hp", speed=3500),
    # Hybrid line-shaft tubes: steel end fitting (where present) inside, aluminium tube,
    # carbon-fibre over-wrap, optional glass abrasion wrap outside.
    _Part("MPD-T-201", "Line-shaft tube, mid-span section", 3000,
          _sleeved((_AL, 101.6, 90.0), (_CF, 107.6, 101.6)),
          power=90, speed=1460, twist_per_length=0.5),
    _Part("MPD-T-202", "Line-shaft tube, drive-end fitting section", 150,
          _sleeved((_EF, 90.0, 76.0, 1.8), (_AL, 101.6, 90.0), (_CF, 107.6, 101.6)),
          power=90, speed=1460),
    _Part("MPD-T-203", "Heavy line-shaft tube, fitting section with glass wrap", 150,
          _sleeved((_EF, 114.0, 96.0, 1.8), (_AL, 127.0, 114.0), (_CF, 133.0, 127.0),
                   (_GL, 135.0, 133.0)),
          power=160, speed=1460),
    _Part("MPD-T-204", "Heavy line-shaft tube, mid-span with glass wrap", 4500,
          _sleeved((_AL, 127.0, 114.0), (_CF, 133.0, 127.0), (_GL, 135.0, 133.0)),
          power=160, speed=1460, twist_limit=2.0),
    _Part("MPD-T-205", "Light line-shaft tube, mid-span section", 2400,
          _sleeved((_AL, 76.2, 66.0), (_CF, 80.2, 76.2)),
          power=37, speed=1760, twist_per_length=0.5),
    _Part("MPD-T-206", "Large line-shaft tube, mid-span section", 6000,
          _sleeved((_AL, 152.4, 138.0), (_CF, 160.0, 152.4)),
          power=250, speed=1480, service_factor=1.2, twist_per_length=0.4),
    _Part("MPD-T-207", "Large line-shaft tube, fitting section with glass wrap", 180,
          _sleeved((_EF, 138.0, 118.0, 2.0), (_AL, 152.4, 138.0), (_CF, 160.0, 152.4),
                   (_GL, 162.0, 160.0)),
          power=250, speed=1480, service_factor=1.2),
    _Part("MPD-T-208", "Line-shaft tube, torque-rated drive", 3600,
          _sleeved((_AL, 101.6, 90.0), (_CF, 107.6, 101.6)), torque=950, twist_limit=1.5),
    _Part("MPD-T-209", "Bare aluminium tube before over-wrap (comparison)", 3000,
          _sleeved((_AL, 101.6, 90.0)), power=90, speed=1460, twist_per_length=0.5),
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
_LAYER_SUFFIXES: tuple[str, ...] = ("material", "outer diameter [mm]", "inner diameter [mm]", "Kt")
_LAYER_ATTRS: tuple[str, ...] = ("material", "outer", "inner", "kt")


def _wide_part_headers() -> tuple[str, ...]:
    groups = tuple(
        f"Layer {n} {suffix}" for n in range(1, _MAX_LAYERS + 1) for suffix in _LAYER_SUFFIXES
    )
    return PART_HEADERS + groups


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

_HEADER_FONT = Font(bold=True)
_HEADER_FILL = PatternFill("solid", fgColor="DCE6EE")
_TITLE_FONT = Font(bold=True, size=14)


def _write_table(ws: Worksheet, headers: tuple[str, ...], rows: list[tuple[Cell, ...]]) -> None:
    ws.append(list(headers))
    for cell in ws[1]:
        cell.font = _HEADER_FONT
        cell.fill = _HEADER_FILL
    for row in rows:
        ws.append(list(row))
    ws.freeze_panes = "B2"
    for i, header in enumerate(headers, start=1):
        ws.column_dimensions[get_column_letter(i)].width = max(10, min(34, len(header) + 2))


def _write_materials(wb: Workbook) -> None:
    _write_table(wb.create_sheet("Materials"), MATERIAL_HEADERS, list(_MATERIAL_ROWS))


def _part_cells(part: _Part) -> tuple[Cell, ...]:
    return tuple(getattr(part, a) for a in _PART_ATTRS)


def _layer_cells(layer: _Layer) -> tuple[Cell, ...]:
    return tuple(getattr(layer, a) for a in _LAYER_ATTRS)


def _wide_row(part: _Part) -> tuple[Cell, ...]:
    cells: list[Cell] = list(_part_cells(part))
    for layer in part.layers:
        cells.extend(_layer_cells(layer))
    cells.extend([None] * (len(_wide_part_headers()) - len(cells)))
    return tuple(cells)


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


def _write_read_me(wb: Workbook, title: str, about: tuple[str, ...], book: str) -> None:
    ws = wb.create_sheet("Read me", 0)
    ws.column_dimensions["A"].width = 110
    lines: list[tuple[str, Font | None]] = [(title, _TITLE_FONT), ("", None),
                                            (_INVENTED_NOTE, None), ("", None)]
    lines += [(text, None) for text in about]
    problems = [p for p in planted_problems() if p.book == book]
    if problems:
        lines += [("", None), ("Deliberately bad cells (to show the tool's warnings):", _HEADER_FONT)]
        lines += [(f"{p.sheet}!{p.cell} ({p.part}{'' if p.layer is None else f', layer {p.layer}'}):"
                   f" found {p.found}; expected {p.expected}.", None) for p in problems]
    lines += [("", None), ("Cautions", _HEADER_FONT)]
    lines += [(text, None) for text in CAUTIONS]
    for text, font in lines:
        ws.append([text])
        if font is not None:
            ws.cell(row=ws.max_row, column=1).font = font
        ws.cell(row=ws.max_row, column=1).alignment = Alignment(wrap_text=True, vertical="top")


def _new_workbook() -> Workbook:
    wb = Workbook()
    wb.remove(wb.active)
    wb.properties.creator = _AUTHOR
    wb.properties.lastModifiedBy = _AUTHOR
    wb.properties.created = _FIXED_TIME
    wb.properties.modified = _FIXED_TIME
    wb.properties.title = "twistshare sample book (invented demo data)"
    return wb


_MODIFIED = re.compile(rb"(<dcterms:modified[^>]*>)[^<]*(</dcterms:modified>)")


def _save_reproducibly(wb: Workbook, path: Path) -> Path:
    """Save so that the same content gives the same bytes.

    openpyxl stamps the save time into docProps/core.xml and each zip member; both are
    replaced by the fixed time.
    """
    buffer = io.BytesIO()
    wb.save(buffer)
    stamp = _FIXED_TIME.strftime("%Y-%m-%dT%H:%M:%SZ").encode()
    zip_time = _FIXED_TIME.timetuple()[:6]
    out = io.BytesIO()
    with zipfile.ZipFile(buffer) as src, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as dst:
        for info in src.infolist():
            data = src.read(info.filename)
            if info.filename == "docProps/core.xml":
                data = _MODIFIED.sub(rb"\g<1>" + stamp + rb"\g<2>", data)
            member = zipfile.ZipInfo(info.filename, date_time=zip_time)
            member.compress_type = zipfile.ZIP_DEFLATED
            member.external_attr = info.external_attr
            dst.writestr(member, data)
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_bytes(out.getvalue())
    return path


def write_catalogue(path: str | Path) -> Path:
    """Write the Marrowby catalogue, one row per part with repeated layer column groups.

    Parameters
    ----------
    path : str or Path
        Where to write the new workbook (overwritten if it exists).

    Returns
    -------
    Path
        The path written.
    """
    wb = _new_workbook()
    _write_materials(wb)
    _write_table(wb.create_sheet("Parts"), _wide_part_headers(), [_wide_row(p) for p in _PARTS])
    _write_read_me(wb, "Marrowby Pump & Drive: parts catalogue (sample book)", (
        "Sheets: 'Materials' (one row per material; library materials named with their "
        "properties left blank for the tool to fill in) and 'Parts' (one row per part; "
        "layer 1 is the innermost layer, then outward).",
        "Units sit in the column headers; a cell may carry its own unit, which overrides the "
        "header's: the MPD-S-05x parts from the old US-built pump line are typed in inches, "
        "lbf·in, lbf·ft and hp.",
        "Duties are a torque, or a power at a speed (with a service factor where given). "
        "MPD-S-0xx are sleeved pump shafts; MPD-T-2xx are hybrid line-shaft tubes "
        "(aluminium tube, carbon-fibre over-wrap, steel end fitting inside at the ends).",
        f"Rate it with:  twistshare rate {CATALOGUE_FILE} -o rated.xlsx",
    ), CATALOGUE_FILE)
    return _save_reproducibly(wb, Path(path))


def write_catalogue_long(path: str | Path) -> Path:
    """Write a smaller Marrowby catalogue with one row per layer keyed by part id.

    Parameters
    ----------
    path : str or Path
        Where to write the new workbook (overwritten if it exists).

    Returns
    -------
    Path
        The path written.
    """
    wb = _new_workbook()
    _write_materials(wb)
    _write_table(wb.create_sheet("Parts"), PART_HEADERS, [_part_cells(p) for p in _long_parts()])
    _write_table(wb.create_sheet("Layers"), LAYER_HEADERS, _long_layer_rows())
    _write_read_me(wb, "Marrowby Pump & Drive: parts catalogue, one row per layer (sample book)", (
        "Sheets: 'Materials', 'Parts' (length and duty per part, no layer columns) and "
        "'Layers' (one row per layer, keyed by part id; layer 1 is the innermost).",
        f"The layers of {_LONG_REVERSED_PART} are listed outermost first on purpose: the layer "
        "number, not the row order, says where a layer sits.",
        f"Rate it with:  twistshare rate {CATALOGUE_LONG_FILE} -o rated.xlsx",
    ), CATALOGUE_LONG_FILE)
    return _save_reproducibly(wb, Path(path))


_CELL_SHEET = "Shaft MPD-S-005"

# Where the blocks sit on the cell-functions sheet; the formulas refer to these ranges.
_LAYER_BLOCK = "B5:F8"
_MATERIAL_BLOCK = "B11:H12"
_TORQUE_PAIR = "B20:C20"  # value from TWS_TORQUE_FROM_POWER beside its unit


def _fill_cell_functions_sheet(ws: Worksheet) -> None:
    """One shaft's inputs, and formulas calling the cell functions (no cached values).

    Functions that return one value per layer are written as array formulas over the
    title cell and one row per layer, so every spreadsheet shows all the values.
    """
    from openpyxl.worksheet.formula import ArrayFormula

    lay, mat, torque = _LAYER_BLOCK, _MATERIAL_BLOCK, _TORQUE_PAIR

    def heading(cell: str, text: str) -> None:
        ws[cell] = text
        ws[cell].font = _HEADER_FONT

    ws["A1"] = "MPD-S-005: pump shaft, bronze underlay + stainless sleeve (invented demo data)"
    ws["A1"].font = _TITLE_FONT
    ws["A2"] = ("Inputs carry their units, in a header or in the cell; the formulas call "
                "twistshare's cell functions.")
    heading("A4", "Layers, innermost first")
    rows: list[tuple[Cell, ...]] = [
        ("Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]",
         "Allowable shear [MPa]", "Kt"),
        # The core's allowable comes from its rule in the materials block; the sleeves' are
        # typed, worked out with TWS_ALLOWABLE at the foot of the sheet.
        (1, _Q2, 48, 0, None, 1.5),
        (2, _AB, 52, 48, 55.6, None),
        (3, _SS, 58, 52, 51.2, None),
    ]
    for r, row in enumerate(rows, start=5):
        for c, value in enumerate(row, start=1):
            ws.cell(row=r, column=c, value=value)
        ws.cell(row=r, column=1).alignment = Alignment(horizontal="left")
    for cell in ws[5]:
        cell.font, cell.fill = _HEADER_FONT, _HEADER_FILL

    heading("A10", "The works' own materials")
    mat_rows: list[tuple[Cell, ...]] = [
        ("Material", "G [GPa]", "Yield strength [MPa]", "Ultimate strength [MPa]",
         "Allowable rule", "Factor of safety", "Keyway"),
        (_Q2, 80, 650, 850, "distortion energy", 2.0, "no"),
    ]
    for r, row in enumerate(mat_rows, start=11):
        for c, value in enumerate(row, start=2):
            ws.cell(row=r, column=c, value=value)
    for c in range(2, 9):
        ws.cell(row=11, column=c).font = _HEADER_FONT
        ws.cell(row=11, column=c).fill = _HEADER_FILL

    heading("A14", "Duty and limits")
    duty: list[tuple[Cell, Cell, Cell]] = [
        ("Length", "800 mm", None),
        ("Power", "45 kW", None),
        ("Speed", "2950 rpm", None),
        ("Service factor", 1.25, None),
        ("Twist limit", "0.25°", None),
        ("Torque", "=TWS_TORQUE_FROM_POWER(B16,B17,B18)", "N·m"),
    ]
    for r, row in enumerate(duty, start=15):
        for c, value in enumerate(row, start=1):
            ws.cell(row=r, column=c, value=value)

    heading("A22", "Per layer")
    ws["A23"] = "Layer"
    for r, n in zip(range(24, 27), (1, 2, 3)):
        ws.cell(row=r, column=1, value=n).alignment = Alignment(horizontal="left")
    per_layer = {
        "B": f"TWS_SHARE({lay},,{mat})",
        "C": f"TWS_LAYER_CAPACITY({lay},,{mat})",
        "D": f"TWS_STRESS({lay},{torque},,{mat})",
    }
    for col, formula in per_layer.items():
        ref = f"{col}23:{col}26"
        ws[f"{col}23"] = ArrayFormula(ref, f"={formula}")

    heading("A28", "Whole shaft")
    whole: list[tuple[str, str]] = [
        ("Governing limit [N·m]", f"=TWS_GOVERNING_LIMIT({lay},B15,B19,,,{mat})"),
        ("What governs", f"=TWS_GOVERNS({lay},B15,B19,,{mat})"),
        ("Margin", f"=TWS_MARGIN({lay},{torque},B15,B19,,,{mat})"),
        ("Twist angle [°]", f"=TWS_TWIST_ANGLE({lay},{torque},B15,,{mat})"),
        ("Twist rate [°/m]", f"=TWS_TWIST_RATE({lay},{torque},,{mat})"),
        ("Stress at r = 24 mm, core side [MPa]", f'=TWS_STRESS_AT({lay},{torque},"24 mm",1,,{mat})'),
        ("Stress at r = 24 mm, underlay side [MPa]",
         f'=TWS_STRESS_AT({lay},{torque},"24 mm",2,,{mat})'),
    ]
    for r, (label, formula) in enumerate(whole, start=29):
        ws.cell(row=r, column=1, value=label)
        ws.cell(row=r, column=2, value=formula)

    heading("A37", "Where the sleeves' allowables come from (library yield strengths)")
    allowables: list[tuple[str, str]] = [
        ("Aluminium bronze sleeve: distortion energy, FS 2.5 [MPa]",
         '=TWS_ALLOWABLE("distortion energy","241 MPa",,2.5,"no")'),
        ("Stainless sleeve: max shear, FS 2 [MPa]", '=TWS_ALLOWABLE("max shear","205 MPa",,2,"no")'),
    ]
    for r, (label, formula) in enumerate(allowables, start=38):
        ws.cell(row=r, column=1, value=label)
        ws.cell(row=r, column=2, value=formula)

    ws.column_dimensions["A"].width = 44
    for col in "BCDEFGH":
        ws.column_dimensions[col].width = 24


def write_cell_functions_book(path: str | Path) -> Path:
    """Write a small book whose cells call the twistshare worksheet functions.

    openpyxl cannot store cached values for formulas, so the formula cells hold none;
    ``twistshare share`` computes them where the cache is empty, and Excel with the add-in
    computes them on opening.

    Parameters
    ----------
    path : str or Path
        Where to write the new workbook (overwritten if it exists).

    Returns
    -------
    Path
        The path written.
    """
    wb = _new_workbook()
    _fill_cell_functions_sheet(wb.create_sheet(_CELL_SHEET))
    _write_read_me(wb, "Marrowby Pump & Drive: rating one shaft with cell functions (sample book)", (
        f"The sheet '{_CELL_SHEET}' rates one sleeved pump shaft with twistshare's worksheet "
        "functions: the layer table holds the inputs with their units, the formulas below it "
        "call the functions.",
        "The formula cells were written without cached values: open the book in Excel with the "
        "twistshare add-in to compute them, or run  twistshare share "
        f"{CELL_FUNCTIONS_FILE} -o shared.xlsx  to get a copy holding the values.",
    ), CELL_FUNCTIONS_FILE)
    return _save_reproducibly(wb, Path(path))


def write_all(directory: str | Path) -> list[Path]:
    """Write every sample book into a directory.

    Parameters
    ----------
    directory : str or Path
        Folder to write into (created if missing).

    Returns
    -------
    list of Path
        The books written, catalogue first.
    """
    directory = Path(directory)
    directory.mkdir(parents=True, exist_ok=True)
    return [
        write_catalogue(directory / CATALOGUE_FILE),
        write_catalogue_long(directory / CATALOGUE_LONG_FILE),
        write_cell_functions_book(directory / CELL_FUNCTIONS_FILE),
    ]
