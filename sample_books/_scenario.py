"""The invented Marrowby Pump & Drive scenario: its materials, parts and planted bad cells.

Every number here is invented for the demo (BRIEF §4): none describes a real part or a real
material. The bad cells listed by :func:`planted_problems` let the tool's warnings be seen.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass
from typing import Union

from openpyxl.utils import get_column_letter
from twistshare.engine.intake import CAUTION_LINES

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
    bearing_span: Cell = None  # line-shaft tubes: the span between their bearings (whirl)
    # Rebuilt shafts whose sleeve (layer 2) is shrink-fitted or bonded over the core.
    load_path: Cell = None
    operating_temperature: Cell = None
    interference: Cell = None
    fit_length: Cell = None
    friction: Cell = None
    bond_allowable: Cell = None
    bond_length: Cell = None


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
    # Rebuilt pump shafts whose sleeve is shrink-fitted or bonded on: the slip and bond checks.
    # Friction 0.14, the low end of dry, degreased steel on steel (common-practice guidance).
    _Part("MPD-S-030", "Rebuilt pump shaft, duplex sleeve shrink-fitted", 700,
          _sleeved((_Q2, 50, 0, 1.6), (_DX, 62, 50)), torque=900,
          interference=0.03, fit_length=50, friction=0.14),
    # Running hot, a stainless sleeve grows more than its steel core and loses its grip.
    _Part("MPD-S-031", "Rebuilt pump shaft, stainless sleeve shrink-fitted, runs at 90 °C", 700,
          _sleeved((_CS, 50, 0, 1.6), (_SS, 56, 50)), torque=900, operating_temperature=90,
          interference=0.03, fit_length=35, friction=0.14),
    _Part("MPD-S-032", "Rebuilt pump shaft, aluminium-bronze sleeve bonded (toughened epoxy)", 760,
          _sleeved((_CS, 55, 0, 1.6), (_AB, 62, 55)), torque=1400,
          bond_allowable="toughened epoxy", bond_length=45),
    # Gripped at both ends through its end fittings: the bond passes no torque.
    _Part("MPD-S-033", "Rebuilt pump shaft, bronze sleeve on retaining compound, clamped ends",
          600, _sleeved((_CS, 45, 0, 1.6), (_BZ, 50, 45)), torque=700, load_path="every layer",
          bond_allowable="high-strength anaerobic retaining compound", bond_length=30),
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
          power=90, speed=1460, twist_per_length=0.5, bearing_span=1200),
    _Part("MPD-T-202", "Line-shaft tube, drive-end fitting section", 150,
          _sleeved((_EF, 90.0, 76.0, 1.8), (_AL, 101.6, 90.0), (_CF, 107.6, 101.6)),
          power=90, speed=1460, bearing_span=1200),
    _Part("MPD-T-203", "Heavy line-shaft tube, fitting section with glass wrap", 150,
          _sleeved((_EF, 114.0, 96.0, 1.8), (_AL, 127.0, 114.0), (_CF, 133.0, 127.0),
                   (_GL, 135.0, 133.0)),
          power=160, speed=1460, bearing_span=1400),
    _Part("MPD-T-204", "Heavy line-shaft tube, mid-span with glass wrap", 4500,
          _sleeved((_AL, 127.0, 114.0), (_CF, 133.0, 127.0), (_GL, 135.0, 133.0)),
          power=160, speed=1460, twist_limit=2.0, bearing_span=1400),
    _Part("MPD-T-205", "Light line-shaft tube, mid-span section", 2400,
          _sleeved((_AL, 76.2, 66.0), (_CF, 80.2, 76.2)),
          power=37, speed=1760, twist_per_length=0.5, bearing_span=1000),
    _Part("MPD-T-206", "Large line-shaft tube, mid-span section", 6000,
          _sleeved((_AL, 152.4, 138.0), (_CF, 160.0, 152.4)),
          power=250, speed=1480, service_factor=1.2, twist_per_length=0.4, bearing_span=1600),
    _Part("MPD-T-207", "Large line-shaft tube, fitting section with glass wrap", 180,
          _sleeved((_EF, 138.0, 118.0, 2.0), (_AL, 152.4, 138.0), (_CF, 160.0, 152.4),
                   (_GL, 162.0, 160.0)),
          power=250, speed=1480, service_factor=1.2, bearing_span=1600),
    _Part("MPD-T-208", "Line-shaft tube, torque-rated drive", 3600,
          _sleeved((_AL, 101.6, 90.0), (_CF, 107.6, 101.6)), torque=950, twist_limit=1.5),
    _Part("MPD-T-209", "Bare aluminium tube before over-wrap (comparison)", 3000,
          _sleeved((_AL, 101.6, 90.0)), power=90, speed=1460, twist_per_length=0.5, bearing_span=1200),
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
