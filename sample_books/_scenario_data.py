"""The invented Marrowby Pump & Drive scenario's data: its materials and its parts.

Every number here is invented for the demo (BRIEF §4): none describes a real part or a real
material.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Union

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
