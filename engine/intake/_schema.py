"""The one schema of every input: key, unit kind, header labels, plausible range, blank meaning.

Both front ends read through these definitions: the workbook's tables match their headers
against `Field.labels`, the cell functions' blocks do the same, and each value is checked
against `Field.plausible` in one place (`_columns.read_numeric`). Labels are written as
`header_key` makes them (case-folded, apostrophes dropped, ``-``/``_``/spaces folded).

Plausible ranges are common practice for shafts and sleeves in machinery and drive lines (not
taken from a standard). They are wide on purpose: they catch a unit slip (G typed in MPa where
GPa is declared, a diameter in micrometres) rather than judge a design. A value outside its
range stops that part from being rated, in a table and in a cell alike.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from enum import Enum

from twistshare.engine.units import split_header

from ._words import header_key

__all__ = [
    "Blank",
    "Plausible",
    "Field",
    "Column",
    "MATERIAL_FIELDS",
    "PART_FIELDS",
    "LAYER_FIELDS",
    "LAYER_ROW_FIELDS",
    "DUTY_FIELDS",
    "SIZING_FIELDS",
    "LOAD_FIELDS",
    "PLY_FIELDS",
    "INTERFACE_FIELDS",
    "INTERFACE_PART_FIELDS",
    "field_by_key",
    "match_header",
    "match_layer_group_header",
    "split_layer_group",
]


class Blank(str, Enum):
    """What an empty cell means for a field."""

    REQUIRED = "required"          # the part cannot be rated without it
    NOT_GIVEN = "not given"        # the input is optional (a limit, a property)
    ONE = "one"                    # a factor that defaults to 1 (Kt, service factor)
    SOLID = "solid"                # a bore left blank on the innermost layer: a solid core
    FROM_MATERIAL = "from material"  # a layer's allowable left blank: its material's


@dataclass(frozen=True)
class Plausible:
    """The plausible range of a field, SI, and how messages show it.

    ``positive``: only values above zero make sense (zero too where ``low`` is zero), so a sign
    slip is worded as such rather than as an implausible magnitude.
    """

    low: float
    high: float
    unit: str          # unit shown in the message
    factor: float      # SI factor of that unit
    positive: bool = True


@dataclass(frozen=True)
class Field:
    """One input the tool reads, from a table column or a cell-function argument."""

    key: str
    kind: str  # a units kind, or "text" / "flag"
    labels: tuple[str, ...]
    description: str
    blank: Blank = Blank.NOT_GIVEN
    plausible: Plausible | None = None
    # "adhesive": the cell may name a built-in adhesive class instead (its allowable is used)
    named: str | None = None

    @property
    def needs_unit(self) -> bool:
        """A bare number needs a unit from the header or the cell."""
        return self.kind not in ("text", "flag", "dimensionless")

    def __hash__(self) -> int:
        # The key names the field (no two schema fields share one), so equal fields hash alike;
        # the cell functions' caches hash a field on every call, and the key's hash is cached.
        return hash(self.key)


def _f(key: str, kind: str, description: str, *labels: str, blank: Blank = Blank.NOT_GIVEN,
       plausible: Plausible | None = None, named: str | None = None) -> Field:
    return Field(key, kind, tuple(header_key(label) for label in labels), description, blank,
                 plausible, named)


_GPA, _MPA, _MM = 1e9, 1e6, 1e-3
_RPM = 2 * math.pi / 60
_DEG = math.pi / 180

_SHEAR_MODULUS = Plausible(0.1e9, 200e9, "GPa", _GPA)
_ALLOWABLE = Plausible(0.5e6, 2000e6, "MPa", _MPA)
_DIAMETER = Plausible(0.1e-3, 5.0, "mm", _MM)
_BORE = Plausible(0.0, 5.0, "mm", _MM)
_KT = Plausible(1.0, 10.0, "", 1.0, positive=False)

MATERIAL_FIELDS: tuple[Field, ...] = (
    _f("name", "text", "material name", "material", "name", blank=Blank.REQUIRED),
    _f("shear_modulus", "stress", "shear modulus G", "g", "shear modulus", "shear modulus g",
       plausible=_SHEAR_MODULUS),
    _f("youngs_modulus", "stress", "Young's modulus E", "e", "youngs modulus", "young's modulus",
       "elastic modulus", "young's modulus e", "modulus of elasticity",
       plausible=Plausible(0.3e9, 500e9, "GPa", _GPA)),
    # up to 1: the in-plane ratio of a ±45° laminate is about 0.77; for an isotropic material a
    # G derived from a ratio above 0.5 is refused
    _f("poisson_ratio", "dimensionless", "Poisson's ratio", "poisson ratio", "poisson's ratio",
       "nu", "ν", plausible=Plausible(0.0, 1.0, "", 1.0, positive=False)),
    _f("allowable_shear", "stress", "allowable shear stress", "allowable shear",
       "allowable shear stress", "tau allow", "τ allow", "allowable", plausible=_ALLOWABLE),
    _f("yield_strength", "stress", "yield strength", "yield strength", "sy", "yield",
       plausible=Plausible(1e6, 3000e6, "MPa", _MPA)),
    _f("ultimate_strength", "stress", "ultimate strength", "ultimate strength", "su", "ultimate",
       "tensile strength", plausible=Plausible(1e6, 4000e6, "MPa", _MPA)),
    _f("rule", "text", "allowable rule", "allowable rule", "rule"),
    _f("factor_of_safety", "dimensionless", "factor of safety", "factor of safety", "fs",
       "safety factor", plausible=Plausible(1.0, 20.0, "", 1.0, positive=False)),
    _f("keyway", "flag", "keyway", "keyway"),
    _f("density", "density", "density", "density",
       plausible=Plausible(500.0, 25000.0, "kg/m³", 1.0)),
    _f("expansion_coefficient", "expansion", "thermal expansion coefficient",
       "expansion coefficient", "thermal expansion", "thermal expansion coefficient", "alpha", "α",
       plausible=Plausible(0.1e-6, 300e-6, "1/K", 1.0)),
)

# Ply data of a fibre-wound layer and its layup (classical lamination theory). Ranges are common
# practice for glass, carbon and aramid plies in epoxy.
PLY_FIELDS: tuple[Field, ...] = (
    _f("ply_e1", "stress", "ply modulus along the fibres E1", "ply e1", "e1",
       plausible=Plausible(1e9, 600e9, "GPa", _GPA)),
    _f("ply_e2", "stress", "ply modulus across the fibres E2", "ply e2", "e2",
       plausible=Plausible(0.5e9, 100e9, "GPa", _GPA)),
    _f("ply_g12", "stress", "ply in-plane shear modulus G12", "ply g12", "g12",
       plausible=Plausible(0.3e9, 50e9, "GPa", _GPA)),
    _f("ply_nu12", "dimensionless", "ply major Poisson's ratio nu12", "ply nu12", "nu12", "ply ν12",
       plausible=Plausible(0.0, 0.6, "", 1.0, positive=False)),
    _f("ply_thickness", "length", "ply thickness", "ply thickness", "ply t",
       plausible=Plausible(0.01e-3, 5e-3, "mm", _MM)),
    _f("layup", "text", "layup in laminate notation, e.g. [±45]s", "layup", "lay up", "stacking"),
    _f("ply_set", "text", "a ply set of the built-in ply library", "ply set", "ply material"),
)
# A materials row may describe a fibre-wound layer by its plies: G and E then come from CLT.
MATERIAL_FIELDS = MATERIAL_FIELDS + PLY_FIELDS

_PART_ID = _f("part", "text", "part id", "part", "part id", "part number", "part no", "part no.",
              blank=Blank.REQUIRED)

# The duty of a part: table columns and the cell functions' per-part arguments alike.
DUTY_FIELDS: tuple[Field, ...] = (
    _f("length", "length", "length", "length", "shaft length", blank=Blank.REQUIRED,
       plausible=Plausible(1e-3, 200.0, "mm", _MM)),
    _f("torque", "torque", "torque", "torque", "design torque",
       plausible=Plausible(0.0, 50e6, "N·m", 1.0)),
    _f("power", "power", "power", "power", plausible=Plausible(0.0, 200e6, "kW", 1e3)),
    _f("speed", "speed", "speed", "speed", "shaft speed",
       plausible=Plausible(0.1 * _RPM, 200_000 * _RPM, "rpm", _RPM)),
    _f("service_factor", "dimensionless", "service factor", "service factor", blank=Blank.ONE,
       plausible=Plausible(1.0, 5.0, "", 1.0, positive=False)),
    _f("twist_limit_angle", "angle", "twist limit", "twist limit", "twist limit angle",
       "max twist", plausible=Plausible(1e-5, math.pi, "deg", _DEG)),
    _f("twist_limit_per_length", "angle_per_length", "twist limit per length",
       "twist limit per length", "twist per length limit",
       plausible=Plausible(1e-6, math.pi, "deg/m", _DEG)),
)

# Sizing a part (optional; a blank Size cell asks for none). The Size cell names the dimension in
# the words of `_words.size_request_from_text`; the stock list is read by `_sizing_input`.
SIZING_FIELDS: tuple[Field, ...] = (
    _f("size", "text", "dimension to size", "size", "size for", "solve for", "sizing"),
    # at least 1: the allowables already hold the materials' factors of safety, so a target
    # below 1 would size a part to overstress them (common practice)
    _f("target_reserve", "dimensionless", "target reserve factor", "target reserve factor",
       "target reserve", "target rf", "reserve factor target", blank=Blank.ONE,
       plausible=Plausible(1.0, 20.0, "", 1.0)),
    # diameters, walls or bores, as the Size cell says; one cell holds the whole list
    _f("stock", "length", "stock sizes", "stock sizes", "stock size", "stock", "stock list",
       plausible=_DIAMETER),
    _f("outer_layers", "text", "outer layers (move or fixed)", "outer layers", "layers outside"),
)

# Loads beyond torsion, per part: bending and axial force at the section checked, how the
# ends are held for the whirl check (the speed column above serves the whirl check too).
LOAD_FIELDS: tuple[Field, ...] = (
    _f("bending_moment", "torque", "bending moment (resultant, at the section checked)",
       "bending moment", "moment", "bending", plausible=Plausible(0.0, 50e6, "N·m", 1.0)),
    _f("axial_force", "force", "axial force (+ tension)", "axial force", "axial load",
       "thrust", plausible=Plausible(-100e6, 100e6, "kN", 1e3, positive=False)),
    _f("bearing_span", "length", "span between the bearings for the whirl check (blank: the length)",
       "bearing span", "span", "whirl span", plausible=Plausible(1e-3, 200.0, "mm", _MM)),
    _f("end_support", "text", "end supports for the whirl check (blank: simply supported)",
       "supports", "end supports", "end support", "ends"),
)

_K0 = 273.15  # 0 °C in kelvin
_TEMPERATURE = Plausible(_K0 - 100.0, _K0 + 600.0, "K", 1.0, positive=False)

# Per part, for the fitted and bonded interfaces (blank: the stated default).
INTERFACE_PART_FIELDS: tuple[Field, ...] = (
    _f("load_path", "text", "load path (where the torque enters and leaves)", "load path",
       "torque path"),
    # blank: the assembly temperature (no change of interference)
    _f("operating_temperature", "temperature", "operating temperature", "operating temperature",
       "service temperature", plausible=_TEMPERATURE),
    # the temperature the interference is stated at; blank: 20 °C
    _f("assembly_temperature", "temperature", "assembly temperature (of the stated interference)",
       "assembly temperature", "interference temperature", plausible=_TEMPERATURE),
)

PART_FIELDS: tuple[Field, ...] = (_PART_ID,) + DUTY_FIELDS + LOAD_FIELDS + SIZING_FIELDS + INTERFACE_PART_FIELDS

# Per layer, on the outer member of each interface (layer n: the interface between n-1 and n).
INTERFACE_FIELDS: tuple[Field, ...] = (
    # diametral interference at the assembly temperature; 0 for line to line; blank: not a fit
    _f("interference", "length", "diametral interference of the fit under the layer",
       "interference", "fit interference", "diametral interference",
       plausible=Plausible(0.0, 2e-3, "mm", _MM)),
    _f("fit_length", "length", "fit length", "fit length", "fit engagement",
       plausible=Plausible(1e-3, 5.0, "mm", _MM)),
    _f("friction", "dimensionless", "friction coefficient of the fit", "friction",
       "friction coefficient", "coefficient of friction", "mu", "μ",
       plausible=Plausible(0.01, 0.8, "", 1.0)),
    _f("bond_length", "length", "bond length", "bond length", "bonded length",
       plausible=Plausible(1e-3, 5.0, "mm", _MM)),
    # blank: not bonded; a cell may name a built-in adhesive class (`adhesive_library`)
    _f("bond_allowable", "stress", "allowable average bond shear", "bond allowable",
       "bond allowable shear", "allowable bond shear", "adhesive",
       plausible=Plausible(0.1e6, 100e6, "MPa", _MPA), named="adhesive"),
)

LAYER_FIELDS: tuple[Field, ...] = (
    # A material name, or (in a cell block) the layer's shear modulus G written with its unit.
    _f("material", "text", "material", "material", "material or g", "g or material",
       "material/g", "g", "shear modulus", "modulus", blank=Blank.REQUIRED,
       plausible=_SHEAR_MODULUS),
    _f("outer_diameter", "length", "outer diameter", "outer diameter", "outer dia",
       "outer dia.", "outer d", "od", "do", "d outer", "outside diameter", blank=Blank.REQUIRED,
       plausible=_DIAMETER),
    _f("inner_diameter", "length", "inner diameter", "inner diameter", "inner dia",
       "inner dia.", "inner d", "id", "di", "d inner", "inside diameter", "bore",
       blank=Blank.SOLID, plausible=_BORE),
    # A layer's own allowable overrides its material's (e.g. from TWS_ALLOWABLE).
    _f("allowable_shear", "stress", "allowable shear stress", "allowable", "allowable shear",
       "allowable shear stress", "allowable stress", "tau allow", "τ allow",
       blank=Blank.FROM_MATERIAL, plausible=_ALLOWABLE),
    _f("kt", "dimensionless", "stress-concentration factor Kt", "kt", "stress concentration",
       "stress concentration factor", blank=Blank.ONE, plausible=_KT),
) + INTERFACE_FIELDS

# The one-row-per-layer layout adds the part key and the layer number to the layer fields.
LAYER_ROW_FIELDS: tuple[Field, ...] = (
    _PART_ID,
    _f("layer", "dimensionless", "layer number (1 = innermost)", "layer", "layer no",
       "layer no.", "layer number", blank=Blank.REQUIRED,
       plausible=Plausible(1.0, 10_000.0, "", 1.0, positive=False)),
) + LAYER_FIELDS

# Read by the cell functions only (results of one function passed to another).
CELL_FIELDS: tuple[Field, ...] = (
    _f("fit_pressure", "stress", "contact pressure of the fit", "fit pressure", "contact pressure",
       plausible=Plausible(0.0, 2000e6, "MPa", _MPA)),
    _f("fit_diameter", "length", "fit diameter", "fit diameter", plausible=_DIAMETER),
    _f("points", "dimensionless", "number of points", "points",
       plausible=Plausible(2.0, 500.0, "", 1.0)),
    _f("interface_torque", "torque", "torque the interface passes", "interface torque",
       plausible=Plausible(0.0, 50e6, "N·m", 1.0)),
)

_BY_KEY = {f.key: f for f in CELL_FIELDS + LAYER_FIELDS + MATERIAL_FIELDS + DUTY_FIELDS + SIZING_FIELDS
           + LOAD_FIELDS + PLY_FIELDS + INTERFACE_PART_FIELDS + INTERFACE_FIELDS}


def field_by_key(key: str) -> Field:
    """A materials, duty or sizing field by its key (``"torque"``, ``"yield_strength"``)."""
    return _BY_KEY[key]


@dataclass(frozen=True)
class Column:
    """A recognised header: the field it feeds, its unit text and where it sits."""

    field: Field
    index: int  # zero-based column in the sheet grid
    header: str
    unit: str | None
    layer: int = 0  # 1-based layer number for layer-group columns, 0 otherwise


_LAYER_GROUP = re.compile(r"^(?:layer|l)\s*(\d{1,2})\s*[:.]?\s+(.+)$")


def match_header(header: object, fields: tuple[Field, ...]) -> tuple[Field, str | None] | None:
    """Return the field a header names and its unit text, or None if it names none."""
    if not isinstance(header, str) or not header.strip():
        return None
    label, unit = split_header(header)
    key = header_key(label)
    for field in fields:
        if key in field.labels:
            return field, unit
    return None


def split_layer_group(label: str) -> tuple[int, str] | None:
    """``Layer 2 outer diameter`` -> (2, "outer diameter"), else None."""
    m = _LAYER_GROUP.match(header_key(label))
    return (int(m.group(1)), m.group(2)) if m else None


def match_layer_group_header(header: object) -> tuple[int, Field, str | None] | None:
    """Match ``Layer 2 outer diameter [mm]`` -> (2, outer-diameter field, "mm")."""
    if not isinstance(header, str):
        return None
    label, unit = split_header(header)
    got = split_layer_group(label)
    if got is None:
        return None
    layer, rest = got
    for field in LAYER_FIELDS:
        if rest in field.labels:
            return layer, field, unit
    return None
