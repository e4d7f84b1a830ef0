"""A materials block passed to a cell function: a header row with units, one material per row."""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from functools import lru_cache
from types import MappingProxyType
from typing import Any

import numpy as np

from twistshare.engine.core import (
    ALLOWABLE_ERRORS,
    AllowableFlag,
    AllowableRule,
    Material,
    allowable_flags,
    allowable_shear,
    describe,
    find_material,
    normalise_name,
    split_flags,
)
from twistshare.engine.units import UnitProblem, excel_error_text, parse_value, split_header

from ._values import CellError, read_flag, read_rule

__all__ = ["MaterialsBlock", "read_materials", "header_key"]


def header_key(name: str) -> str:
    """A header name made comparable: case-folded, ``_``/``-``/``'``/spaces unified."""
    return re.sub(r"[\s_\-']+", " ", str(name)).strip().casefold()


# header name -> (field, kind); kind None: text, "rule", "flag".
_COLUMNS: Mapping[str, tuple[str, str | None]] = MappingProxyType(
    {
        "material": ("name", None),
        "name": ("name", None),
        "g": ("shear_modulus", "stress"),
        "shear modulus": ("shear_modulus", "stress"),
        "e": ("youngs_modulus", "stress"),
        "young s modulus": ("youngs_modulus", "stress"),
        "youngs modulus": ("youngs_modulus", "stress"),
        "elastic modulus": ("youngs_modulus", "stress"),
        "modulus of elasticity": ("youngs_modulus", "stress"),
        "poisson ratio": ("poisson_ratio", "dimensionless"),
        "poisson s ratio": ("poisson_ratio", "dimensionless"),
        "poissons ratio": ("poisson_ratio", "dimensionless"),
        "nu": ("poisson_ratio", "dimensionless"),
        "ν": ("poisson_ratio", "dimensionless"),
        "density": ("density", "density"),
        "yield strength": ("yield_strength", "stress"),
        "yield": ("yield_strength", "stress"),
        "sy": ("yield_strength", "stress"),
        "ultimate strength": ("ultimate_strength", "stress"),
        "tensile strength": ("ultimate_strength", "stress"),
        "ultimate": ("ultimate_strength", "stress"),
        "su": ("ultimate_strength", "stress"),
        "allowable shear": ("allowable", "stress"),
        "allowable shear stress": ("allowable", "stress"),
        "allowable": ("allowable", "stress"),
        "allowable rule": ("rule", "rule"),
        "rule": ("rule", "rule"),
        "factor of safety": ("factor_of_safety", "dimensionless"),
        "safety factor": ("factor_of_safety", "dimensionless"),
        "fs": ("factor_of_safety", "dimensionless"),
        "keyway": ("keyway", "flag"),
    }
)

_LABELS = MappingProxyType(
    {
        "shear_modulus": "G",
        "youngs_modulus": "E",
        "poisson_ratio": "Poisson ratio",
        "density": "density",
        "yield_strength": "yield strength",
        "ultimate_strength": "ultimate strength",
        "allowable": "allowable shear",
        "rule": "allowable rule",
        "factor_of_safety": "factor of safety",
        "keyway": "keyway",
    }
)


@dataclass(frozen=True)
class MaterialsBlock:
    """The user's materials, by normalised name, with the allowable each implies.

    Attributes
    ----------
    materials : mapping of normalised name to Material
    allowables : mapping of normalised name to float, Pa
        Given directly, or from the row's rule, strengths and factor of safety.
    problems : mapping of normalised name to str
        Rows that could not be read; a layer naming one shows the message.
    """

    materials: Mapping[str, Material] = field(default_factory=dict)
    allowables: Mapping[str, float] = field(default_factory=dict)
    problems: Mapping[str, str] = field(default_factory=dict)

    def lookup(self, name: str, cache: dict[str, Any]) -> tuple[Material | None, float, str | None]:
        """(material, allowable or NaN, problem) for a name: this block first, then the library.

        `cache` is a per-call memo (library look-ups build the library each time).
        """
        key = normalise_name(name)
        if key in cache:
            return cache[key]
        if key in self.problems:
            found: tuple[Material | None, float, str | None] = (None, math.nan, self.problems[key])
        elif key in self.materials:
            found = (self.materials[key], self.allowables.get(key, math.nan), None)
        else:
            material = _library_material(key)
            if material is None:
                where = "the materials block or " if self.materials or self.problems else ""
                found = (None, math.nan,
                         f"no material named {name.strip()!r} in {where}the built-in library")
            else:
                found = (material, math.nan, None)
        cache[key] = found
        return found


@lru_cache(maxsize=256)
def _library_material(key: str) -> Material | None:
    """A built-in material by normalised name; the library is read-only, so this may cache."""
    return find_material(key)


def _cell_text(value: Any) -> str:
    return value.strip() if isinstance(value, str) else ""


def read_materials(block: Any) -> MaterialsBlock:
    """Read a materials block (header row first) into a `MaterialsBlock`.

    Columns are found by header name, any order, units in the headers (``G [GPa]``):
    Material, G, E, Poisson ratio, Density, Yield strength, Ultimate strength,
    Allowable shear, Allowable rule, Factor of safety, Keyway. Other columns are ignored.

    Raises
    ------
    CellError
        If the block has no header row naming a Material column, or a header's unit is
        not a unit of that column's kind.
    """
    if block is None or block == [] or block == [[None]]:
        return MaterialsBlock()
    if not isinstance(block, (list, tuple)) or not block or not isinstance(block[0], (list, tuple)):
        raise CellError("materials", "expected a block with a header row and one material per row")
    header = list(block[0])
    columns: dict[str, tuple[int, str | None, str | None]] = {}
    for index, cell in enumerate(header):
        if not isinstance(cell, str):
            continue
        name, unit = split_header(cell)
        entry = _COLUMNS.get(header_key(name))
        if entry is None or entry[0] in columns:
            continue
        columns[entry[0]] = (index, entry[1], unit)
    if "name" not in columns:
        raise CellError("materials", "the first row must be a header with a 'Material' column")
    for field_name, (_, kind, unit) in columns.items():
        if unit is not None and kind not in (None, "rule", "flag"):
            try:
                parse_value(1.0, kind, unit)
            except UnitProblem as problem:
                raise CellError(f"materials, header of {_LABELS[field_name]}", str(problem)) from None

    materials: dict[str, Material] = {}
    allowables: dict[str, float] = {}
    problems: dict[str, str] = {}
    for row_number, row in enumerate(block[1:], start=2):  # the header is row 1
        row = list(row)
        name_cell = row[columns["name"][0]] if columns["name"][0] < len(row) else None
        name = _cell_text(name_cell)
        if not name:
            continue
        key = normalise_name(name)
        if key in materials or key in problems:
            problems[key] = f"material {name!r} appears twice in the materials block"
            materials.pop(key, None)
            continue
        try:
            values = _read_row(row, columns, row_number)
            rule = values.pop("rule", None)
            factor = values.pop("factor_of_safety", math.nan)
            keyway = values.pop("keyway", False)
            allowable = values.pop("allowable", math.nan)
            try:
                material = Material(name, **values)
            except ValueError as error:
                detail = str(error).removeprefix(f"material {name!r}: ")
                raise CellError(f"materials, row {row_number}", detail) from None
            if math.isnan(allowable) and rule is not None and rule != AllowableRule.GIVEN:
                allowable = _allowable_by_rule(material, rule, factor, keyway, row_number)
        except CellError as error:
            problems[key] = f"{name!r} in the materials block cannot be used ({error.where}: " \
                            f"{error.what})"
            continue
        materials[key] = material
        if not math.isnan(allowable):
            allowables[key] = allowable
    return MaterialsBlock(MappingProxyType(materials), MappingProxyType(allowables),
                          MappingProxyType(problems))


def _read_row(row: list[Any], columns: dict[str, tuple[int, str | None, str | None]],
              row_number: int) -> dict[str, Any]:
    values: dict[str, Any] = {}
    for field_name, (index, kind, unit) in columns.items():
        if field_name == "name":
            continue
        cell = row[index] if index < len(row) else None
        where = f"materials, {_LABELS[field_name]}, row {row_number}"
        if kind == "rule":
            if cell is not None and _cell_text(cell) != "" or excel_error_text(cell):
                values["rule"] = read_rule(cell, where)
            continue
        if kind == "flag":
            values["keyway"] = read_flag(cell, where)
            continue
        if cell is None or (isinstance(cell, str) and not cell.strip()):
            values[field_name] = math.nan
            continue
        try:
            values[field_name] = parse_value(cell, kind, unit)
        except UnitProblem as problem:
            raise CellError(where, str(problem)) from None
    return values


def _allowable_by_rule(material: Material, rule: AllowableRule, factor: float, keyway: bool,
                       row_number: int) -> float:
    factor = 1.0 if math.isnan(factor) and rule == AllowableRule.SHAFTING_CODE else factor
    flags = int(allowable_flags(int(rule), material.yield_strength, material.ultimate_strength,
                                factor, keyway))
    if flags & int(ALLOWABLE_ERRORS):
        first = next(f for f in split_flags(flags, AllowableFlag) if f & ALLOWABLE_ERRORS)
        raise CellError(f"materials, row {row_number}", describe(first))
    return float(np.asarray(allowable_shear(int(rule), material.yield_strength,
                                            material.ultimate_strength, factor, keyway)))
