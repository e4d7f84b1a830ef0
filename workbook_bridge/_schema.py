"""The workbook convention: which headers mean which input, and the unit kind each needs.

Headers are matched case-insensitively with runs of white space folded; the unit sits in square
brackets after the label (``Outer diameter [mm]``). A cell may carry its own unit instead.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from twistshare.engine.units import split_header

__all__ = [
    "Field",
    "MATERIAL_FIELDS",
    "PART_FIELDS",
    "LAYER_FIELDS",
    "Column",
    "match_header",
    "match_layer_group_header",
]


@dataclass(frozen=True)
class Field:
    """One input the tool reads from a table column."""

    key: str
    kind: str  # a units kind, or "text" / "flag"
    labels: tuple[str, ...]
    description: str
    needs_unit: bool = True


def _f(key: str, kind: str, description: str, *labels: str, needs_unit: bool | None = None) -> Field:
    if needs_unit is None:
        needs_unit = kind not in ("text", "flag", "dimensionless")
    return Field(key, kind, tuple(labels), description, needs_unit)


MATERIAL_FIELDS: tuple[Field, ...] = (
    _f("name", "text", "material name", "material", "name"),
    _f("shear_modulus", "stress", "shear modulus G", "g", "shear modulus", "shear modulus g"),
    _f("youngs_modulus", "stress", "Young's modulus E", "e", "youngs modulus", "young's modulus",
       "elastic modulus", "young's modulus e"),
    _f("poisson_ratio", "dimensionless", "Poisson's ratio", "poisson ratio", "poisson's ratio", "nu", "ν"),
    _f("allowable_shear", "stress", "allowable shear stress", "allowable shear", "allowable shear stress",
       "tau allow", "τ allow", "allowable"),
    _f("yield_strength", "stress", "yield strength", "yield strength", "sy", "yield"),
    _f("ultimate_strength", "stress", "ultimate strength", "ultimate strength", "su", "ultimate",
       "tensile strength"),
    _f("rule", "text", "allowable rule", "allowable rule", "rule"),
    _f("factor_of_safety", "dimensionless", "factor of safety", "factor of safety", "fs", "safety factor"),
    _f("keyway", "flag", "keyway", "keyway"),
    _f("density", "density", "density", "density"),
)

PART_FIELDS: tuple[Field, ...] = (
    _f("part", "text", "part id", "part", "part id", "part number", "part no"),
    _f("length", "length", "length", "length", "shaft length"),
    _f("torque", "torque", "torque", "torque", "design torque"),
    _f("power", "power", "power", "power"),
    _f("speed", "speed", "speed", "speed", "shaft speed"),
    _f("service_factor", "dimensionless", "service factor", "service factor"),
    _f("twist_limit_angle", "angle", "twist limit", "twist limit", "twist limit angle", "max twist"),
    _f("twist_limit_per_length", "angle_per_length", "twist limit per length", "twist limit per length",
       "twist per length limit"),
)

LAYER_FIELDS: tuple[Field, ...] = (
    _f("material", "text", "material", "material"),
    _f("outer_diameter", "length", "outer diameter", "outer diameter", "od", "do"),
    _f("inner_diameter", "length", "inner diameter", "inner diameter", "id", "di"),
    _f("kt", "dimensionless", "stress-concentration factor Kt", "kt", "stress concentration",
       "stress concentration factor"),
)

# The one-row-per-layer layout adds the part key and the layer number to the layer fields.
LAYER_ROW_FIELDS: tuple[Field, ...] = (
    _f("part", "text", "part id", "part", "part id", "part number", "part no"),
    _f("layer", "dimensionless", "layer number (1 = innermost)", "layer", "layer no", "layer number"),
) + LAYER_FIELDS


@dataclass(frozen=True)
class Column:
    """A recognised header: the field it feeds, its unit text and where it sits."""

    field: Field
    index: int  # zero-based column in the sheet grid
    header: str
    unit: str | None
    layer: int = 0  # 1-based layer number for layer-group columns, 0 otherwise


_SPACE = re.compile(r"\s+")
_LAYER_GROUP = re.compile(r"^(?:layer|l)\s*(\d{1,2})\s*[:\-]?\s+(.+)$")


def _norm(label: str) -> str:
    return _SPACE.sub(" ", label.strip().lower().replace("’", "'"))


def match_header(header: object, fields: tuple[Field, ...]) -> tuple[Field, str | None] | None:
    """Return the field a header names and its unit text, or None if it names none."""
    if not isinstance(header, str) or not header.strip():
        return None
    label, unit = split_header(header)
    key = _norm(label)
    for field in fields:
        if key in field.labels:
            return field, unit
    return None


def split_layer_group(label: str) -> tuple[int, str] | None:
    """``layer 2 outer diameter`` (already lower-cased) -> (2, "outer diameter"), else None."""
    m = _LAYER_GROUP.match(_norm(label))
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
