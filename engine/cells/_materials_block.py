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
    AllowableRule,
    Material,
    allowable_shear,
    complete_from_library,
    find_material,
    normalise_name,
)
from twistshare.engine.units import UnitProblem, excel_error_text, parse_value, split_header

from ._allowable_checks import RULE_WORDS, allowable_refusal, is_steel
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


# A name looked up: (material, allowable or NaN, problem, why the material gives no allowable).
Found = tuple[Material | None, float, str | None, str | None]


@dataclass(frozen=True)
class MaterialsBlock:
    """The user's materials, by normalised name, with the allowable each implies.

    Attributes
    ----------
    materials : mapping of normalised name to Material
    allowables : mapping of normalised name to float, Pa
        Given directly, or from the row's rule, strengths and factor of safety.
    problems : mapping of normalised name to str
        Rows that cannot be used; a layer naming one shows the message.
    allowable_problems : mapping of normalised name to str
        Usable rows that give no allowable: why, for a layer that needs one and gives none.
    """

    materials: Mapping[str, Material] = field(default_factory=dict)
    allowables: Mapping[str, float] = field(default_factory=dict)
    problems: Mapping[str, str] = field(default_factory=dict)
    allowable_problems: Mapping[str, str] = field(default_factory=dict)

    def lookup(self, name: str, cache: dict[str, Any]) -> Found:
        """(material, allowable or NaN, problem, why no allowable) for a name.

        This block first, then the library. `cache` is a per-call memo.
        """
        key = normalise_name(name)
        if key in cache:
            return cache[key]
        if key in self.problems:
            found: Found = (None, math.nan, self.problems[key], None)
        elif key in self.materials:
            found = (self.materials[key], self.allowables.get(key, math.nan), None,
                     self.allowable_problems.get(key))
        else:
            material = _library_material(key)
            if material is None:
                where = "the materials block or " if self.materials or self.problems else ""
                found = (None, math.nan,
                         f"no material named {name.strip()!r} in {where}the built-in library", None)
            else:
                found = (material, math.nan, None, None)
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

    A row naming a built-in material takes the library's values for the groups it leaves
    wholly blank (E and ν; Sy and Su; density; G unless the row's own E and ν give it), never
    one value of a group beside the row's other. A row with no allowable and no rule gets
    the shafting code rule if it is a steel; otherwise it has no allowable.

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
    allowable_problems: dict[str, str] = {}
    first_row: dict[str, int] = {}
    for row_number, row in enumerate(block[1:], start=2):  # the header is row 1
        row = list(row)
        name_cell = row[columns["name"][0]] if columns["name"][0] < len(row) else None
        name = _cell_text(name_cell)
        if not name:
            continue
        key = normalise_name(name)
        if key in first_row:
            problems[key] = (f"material {name!r} appears twice in the materials block (rows "
                             f"{first_row[key]} and {row_number})")
            materials.pop(key, None)
            allowables.pop(key, None)
            allowable_problems.pop(key, None)
            continue
        first_row[key] = row_number
        try:
            values = _read_row(row, columns)
            rule = values.pop("rule", None)
            factor = values.pop("factor_of_safety", math.nan)
            keyway = values.pop("keyway", False)
            allowable = values.pop("allowable", math.nan)
            material, own_strengths = _row_material(name, key, values)
            allowable, why = _row_allowable(material, rule, allowable, factor, keyway,
                                            own_strengths)
        except CellError as error:
            what = f"{error.where}: {error.what}" if error.where else error.what
            problems[key] = f"material {name!r} (materials block, row {row_number}): {what}"
            continue
        materials[key] = material
        if not math.isnan(allowable):
            allowables[key] = allowable
        elif why is not None:
            allowable_problems[key] = f"material {name!r} (materials block, row {row_number}): {why}"
    return MaterialsBlock(MappingProxyType(materials), MappingProxyType(allowables),
                          MappingProxyType(problems), MappingProxyType(allowable_problems))


def _read_row(row: list[Any], columns: dict[str, tuple[int, str | None, str | None]]
              ) -> dict[str, Any]:
    """The row's values, SI; NaN for a blank cell. Raises CellError for an unusable cell."""
    values: dict[str, Any] = {}
    for field_name, (index, kind, unit) in columns.items():
        if field_name == "name":
            continue
        cell = row[index] if index < len(row) else None
        label = _LABELS[field_name]
        if kind == "rule":
            if cell is not None and _cell_text(cell) != "" or excel_error_text(cell):
                values["rule"] = read_rule(cell, label)
            continue
        if kind == "flag":
            values["keyway"] = read_flag(cell, label)
            continue
        if cell is None or (isinstance(cell, str) and not cell.strip()):
            values[field_name] = math.nan
            continue
        try:
            value = parse_value(cell, kind, unit)
        except UnitProblem as problem:
            raise CellError("", f"{label}: {problem}") from None
        if field_name != "poisson_ratio" and not (math.isfinite(value) and value > 0):
            raise CellError("", f"{label} must be greater than zero; got {cell!r}")
        values[field_name] = value
    return values


def _row_material(name: str, key: str, values: dict[str, float]
                  ) -> tuple[Material, frozenset[str]]:
    """The row's Material, completed from the library where it names a built-in one.

    Returns the material and which of Sy, Su the row itself gives (for messages).
    """
    given = frozenset(k for k, v in values.items() if not math.isnan(v))
    library = _library_material(key)
    values = dict(values)
    if library is not None:
        # by whole groups, and never an isotropic G for a wound tube (the bridge's rule too)
        values, _filled = complete_from_library(values, library, given)
        isotropic = library.isotropic
    else:
        # Only the derivation G = E/2(1+ν) needs isotropy; a row giving its own G may be of
        # a wound composite, whose Poisson ratio can exceed 0.5.
        isotropic = "shear_modulus" not in given
    nu = values.get("poisson_ratio", math.nan)
    if not math.isnan(nu) and not nu > -1.0:
        raise CellError("", f"Poisson ratio must be greater than -1; got {nu:g}")
    needs_derivation = math.isnan(values.get("shear_modulus", math.nan))
    if isotropic and nu > 0.5:
        if needs_derivation and not math.isnan(values.get("youngs_modulus", math.nan)):
            raise CellError("", f"Poisson ratio {nu:g} is above 0.5: G = E/2(1+ν) holds for "
                                "an isotropic material only; give G")
        raise CellError("", f"Poisson ratio {nu:g} is above 0.5, the bound for an isotropic "
                            "material; check it")
    try:
        material = Material(name, isotropic=isotropic, **values)
    except ValueError as error:
        raise CellError("", str(error).removeprefix(f"material {name!r}: ")) from None
    if not material.shear_modulus > 0:
        raise CellError("", "no shear modulus: give G, or E and Poisson ratio"
                            + ("" if library is not None else
                               ", or name a built-in library material"))
    return material, given & {"yield_strength", "ultimate_strength"}


_STRENGTH_WORDS = MappingProxyType(
    {"yield_strength": "yield strength", "ultimate_strength": "ultimate strength"})


def _pairing_note(material: Material, own_strengths: frozenset[str], missing: list[str]) -> str:
    """Why the library's strength was not used beside the row's other one, if that is so."""
    if len(own_strengths) != 1 or not missing or own_strengths & set(missing):
        return ""
    if _library_material(normalise_name(material.name)) is None:
        return ""
    (own,) = own_strengths
    return (f" (the row gives only the {_STRENGTH_WORDS[own]}; the library's typical "
            f"{_STRENGTH_WORDS[missing[0]]} is not paired with it)")


def _row_allowable(material: Material, rule: AllowableRule | None, allowable: float,
                   factor: float, keyway: bool, own_strengths: frozenset[str]
                   ) -> tuple[float, str | None]:
    """(allowable or NaN, why there is none): the row's allowable by the rule it names.

    Raises
    ------
    CellError
        Where the row's inputs contradict each other or the rule (an FS or keyway the rule
        does not use, FS below 1, Su below Sy, a rule that cannot be evaluated): a cell
        cannot show a number and a warning together.
    """
    factor_typed = not math.isnan(factor)
    if not math.isnan(allowable):
        if rule is not None and rule != AllowableRule.GIVEN:
            raise CellError("", f"an allowable shear and the {RULE_WORDS[rule]} rule are both "
                                "given; keep one")
        if factor_typed:
            raise CellError("", "factor of safety is not used when the allowable shear is given "
                                "directly (it should already include it); leave it blank")
        if keyway:
            raise CellError("", "keyway is not used when the allowable shear is given directly "
                                "(it should already allow for the keyway); leave it blank")
        return allowable, None
    if rule == AllowableRule.GIVEN:
        return math.nan, "the allowable rule is 'given' but no allowable shear is given"
    default_rule = rule is None
    if default_rule:
        if factor_typed:
            raise CellError("", "a factor of safety is given but no allowable rule: name the "
                                "rule it applies to (max shear or distortion energy)")
        if not is_steel(material.name):
            return math.nan, ("no allowable given; the shafting code rule is for steel shafting "
                              "— give an allowable or a rule with a factor of safety")
        rule = AllowableRule.SHAFTING_CODE
    sy, su = material.yield_strength, material.ultimate_strength
    refusal = allowable_refusal(rule, sy, su, factor, keyway, factor_typed=factor_typed)
    if refusal is not None:
        needed = ("yield_strength", "ultimate_strength") \
            if rule == AllowableRule.SHAFTING_CODE else ("yield_strength",)
        missing = [k for k in needed if math.isnan(getattr(material, k))]
        note = _pairing_note(material, own_strengths, missing)
        if missing and default_rule:
            # Missing data, not a contradiction: the row still serves results that need no
            # allowable (share, stress, twist).
            return math.nan, (
                "no allowable given; the shafting code rule (used for steel when no rule is "
                f"given) needs the {' and '.join(_STRENGTH_WORDS[k] for k in missing)}{note}")
        raise CellError("", refusal + note)
    return float(np.asarray(allowable_shear(int(rule), sy, su,
                                            math.nan if rule == AllowableRule.SHAFTING_CODE
                                            else factor, keyway))), None
