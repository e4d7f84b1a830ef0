"""The book's materials table, completed from the built-in library where the book leaves blanks."""

from __future__ import annotations

from types import MappingProxyType

import math
from dataclasses import dataclass, field

import numpy as np

from twistshare.engine.core import (
    AllowableFlag,
    AllowableRule,
    allowable_flags,
    allowable_shear,
    complete_from_library,
    find_material,
    is_steel,
    shear_modulus_from_elastic,
)

from ._column_values import error_problem, read_flag, read_numeric, read_text
from ._findings import Finding, Severity
from ._grid import SheetGrid, cell_ref
from ._schema import MATERIAL_FIELDS
from ._tables import TableSpot

__all__ = ["ResolvedMaterial", "FilledCell", "MaterialSet", "read_materials", "rule_from_text", "RULE_NAMES"]

RULE_NAMES = MappingProxyType({
    AllowableRule.GIVEN: "given",
    AllowableRule.MAX_SHEAR: "max shear (Tresca) 0.5·Sy/FS",
    AllowableRule.DISTORTION_ENERGY: "distortion energy (von Mises) Sy/(√3·FS)",
    AllowableRule.SHAFTING_CODE: "shafting code min(0.30·Sy, 0.18·Su)",
})

_RULE_WORDS = MappingProxyType({
    "given": AllowableRule.GIVEN,
    "direct": AllowableRule.GIVEN,
    "max shear": AllowableRule.MAX_SHEAR,
    "maximum shear": AllowableRule.MAX_SHEAR,
    "maximum shear stress": AllowableRule.MAX_SHEAR,
    "tresca": AllowableRule.MAX_SHEAR,
    "distortion energy": AllowableRule.DISTORTION_ENERGY,
    "von mises": AllowableRule.DISTORTION_ENERGY,
    "shafting code": AllowableRule.SHAFTING_CODE,
    "code": AllowableRule.SHAFTING_CODE,
})


def rule_from_text(text: str | None) -> AllowableRule | None:
    """The allowable rule a cell names, or None if it names none we know."""
    if text is None:
        return None
    return _RULE_WORDS.get(" ".join(text.strip().lower().replace("-", " ").split()))


@dataclass(frozen=True)
class FilledCell:
    """A blank cell of the book's materials table that the library filled in."""

    sheet: str
    cell: str
    material: str
    field: str
    value_si: float
    source: str


@dataclass(frozen=True)
class ResolvedMaterial:
    """A material as used for rating: SI shear modulus and allowable, or the reason it has none."""

    name: str
    shear_modulus: float
    allowable_shear: float
    rule: AllowableRule
    origin: str  # "book" or "library"
    problem: str | None = None
    youngs_modulus: float = math.nan
    poisson_ratio: float = math.nan
    yield_strength: float = math.nan
    ultimate_strength: float = math.nan
    factor_of_safety: float = math.nan
    keyway: bool = False
    density: float = math.nan
    note: str | None = None  # a warning to show once where a part first uses the material


@dataclass
class MaterialSet:
    """Materials by normalised name; names given twice in the book are ambiguous."""

    by_name: dict[str, ResolvedMaterial] = field(default_factory=dict)
    ambiguous: dict[str, list[str]] = field(default_factory=dict)  # name -> cells where it appears
    filled: list[FilledCell] = field(default_factory=list)
    spot: TableSpot | None = None
    cells: dict[str, dict[str, str]] = field(default_factory=dict)  # name -> field -> A1 cell

    def lookup(self, name: str) -> tuple[ResolvedMaterial | None, str | None]:
        """Find a material by name in the book, then the library; (material, problem)."""
        key = normalise_name(name)
        if key in self.ambiguous:
            cells = ", ".join(self.ambiguous[key])
            return None, f"material {name!r} is defined more than once in the materials table ({cells})"
        got = self.by_name.get(key)
        if got is not None:
            return (None, got.problem) if got.problem else (got, None)
        lib = find_material(name)
        if lib is None:
            return None, f"unknown material {name!r}: not in the book's materials table nor the built-in library"
        resolved = _from_library_only(lib)
        self.by_name[key] = resolved
        return (None, resolved.problem) if resolved.problem else (resolved, None)


def normalise_name(name: str) -> str:
    return " ".join(name.strip().lower().split())


def _nan_if_none(x: float | None) -> float:
    return math.nan if x is None else float(x)


_CODE_RULE_FOR_STEEL = (
    "the shafting code rule min(0.30·Sy, 0.18·Su) is a rule for steel shafting; give this material a "
    "row in the materials table with an allowable shear, or a rule (max shear, distortion energy) "
    "and a factor of safety"
)


def _from_library_only(lib) -> ResolvedMaterial:
    sy, su = _nan_if_none(lib.yield_strength), _nan_if_none(lib.ultimate_strength)
    problem = note = None
    tau = math.nan
    if not is_steel(lib.name):
        problem = f"material {lib.name!r} has no allowable in the book: {_CODE_RULE_FOR_STEEL}"
    else:
        tau = float(allowable_shear(AllowableRule.SHAFTING_CODE, sy, su, 1.0, False))
        if not math.isfinite(tau) or tau <= 0:
            problem = (
                f"material {lib.name!r} from the built-in library has no typical yield and ultimate "
                "strength to derive an allowable from: add it to the materials table with an allowable shear")
        else:
            note = (f"material {lib.name!r} is not in the book's materials table: used the built-in "
                    f"library's typical strengths and the shafting code rule min(0.30·Sy, 0.18·Su) = "
                    f"{tau / 1e6:.4g} MPa, no keyway; add a row to the materials table to choose otherwise")
    return ResolvedMaterial(
        lib.name, float(lib.shear_modulus), tau, AllowableRule.SHAFTING_CODE, "library", problem,
        _nan_if_none(lib.youngs_modulus), _nan_if_none(lib.poisson_ratio), sy, su, math.nan, False,
        _nan_if_none(lib.density), note,
    )


_FLAG_WORDS = {
    AllowableFlag.FACTOR_OF_SAFETY_IGNORED: ("factor_of_safety", "the factor of safety is not used: the shafting "
                                             "code rule carries its own allowance (FS is not applied on top)"),
    AllowableFlag.KEYWAY_IGNORED: ("keyway", "the keyway is not used by this rule: the 0.75 keyway factor "
                                   "belongs to the shafting code rule; use Kt for a keyway's stress concentration"),
    AllowableFlag.ULTIMATE_BELOW_YIELD: ("ultimate_strength", "the ultimate strength is below the yield "
                                         "strength: check both values"),
    AllowableFlag.FACTOR_OF_SAFETY_BELOW_ONE: ("factor_of_safety", "the factor of safety is below 1"),
}


def _rule_notes(name, rule, sy, su, fs_used, fs_given, keyway, cells, here, sheet) -> list[Finding]:
    """The engine's notes on an allowable (inputs it ignores, inconsistent strengths) as warnings."""
    flags = AllowableFlag(int(allowable_flags(rule, sy, su, fs_used, keyway)))
    out = []
    for flag, (field, words) in _FLAG_WORDS.items():
        if flag in flags:
            if flag == AllowableFlag.FACTOR_OF_SAFETY_IGNORED and math.isnan(fs_given):
                continue  # no FS was typed; the default 1 is ours, nothing to tell
            out.append(Finding(Severity.WARNING, sheet, cells.get(field, here), f"material {name!r}: {words}"))
    return out


def read_materials(grid: SheetGrid, spot: TableSpot, findings: list[Finding]) -> MaterialSet:
    """Resolve every row of the book's materials table."""
    out = MaterialSet(spot=spot)
    rows = list(spot.data_rows)
    name_col = spot.column("name")
    assert name_col is not None
    names = read_text(grid, name_col.index, rows)
    header_seen: set[tuple[str, int]] = set()

    def who(r: int) -> str:
        n = names[rows.index(r)] if r in rows else None
        return f"material {n!r}" if n else f"materials row {r + 1}"

    num: dict[str, tuple[np.ndarray, np.ndarray, np.ndarray]] = {}
    for f in MATERIAL_FIELDS:
        col = spot.column(f.key)
        if col is None or f.kind in ("text", "flag"):
            continue
        nc = read_numeric(grid, col, rows, who, findings, spot.header_row, header_seen)
        num[f.key] = (nc.values, nc.bad, nc.empty)
    rule_col = spot.column("rule")
    rules = read_text(grid, rule_col.index, rows) if rule_col else [None] * len(rows)
    key_col = spot.column("keyway")

    first_seen: dict[str, str] = {}
    for i, r in enumerate(rows):
        name = names[i]
        err = error_problem(grid, r, name_col.index, "a material name")
        if err is not None:
            findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, name_col.index),
                                    f"materials row {r + 1}: the name: {err}; the row is ignored"))
            continue
        if name is None:
            findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, name_col.index),
                                    f"materials row {r + 1}: the material has no name; the row is ignored"))
            continue
        key = normalise_name(name)
        here = cell_ref(r, name_col.index)
        if key in first_seen:
            out.ambiguous.setdefault(key, [first_seen[key]]).append(here)
            findings.append(Finding(Severity.ERROR, grid.name, here,
                                    f"material {name!r} is defined again (first at {first_seen[key]}); "
                                    "parts using it are not rated until one definition is removed"))
            continue
        first_seen[key] = here
        cells = {f.key: cell_ref(r, c.index) for f in MATERIAL_FIELDS if (c := spot.column(f.key))}
        out.cells[key] = cells

        def val(k: str) -> float:
            v = num.get(k)
            return math.nan if v is None else float(v[0][i])

        def is_bad(k: str) -> bool:
            v = num.get(k)
            return bool(v is not None and v[1][i])

        vals = {k: val(k) for k in num}
        lib = find_material(name)
        problem: str | None = None
        if any(is_bad(k) for k in num):
            problem = f"material {name!r} has unusable properties (see the comments on its row)"
        given = frozenset(k for k in num if not math.isnan(vals[k]) or is_bad(k))
        if lib is not None:
            vals, filled = complete_from_library(vals, lib, given)
            for k in filled:
                if k in cells:
                    out.filled.append(FilledCell(grid.name, cells[k], lib.name, k, vals[k],
                                                 lib.sources.get(k, "built-in library")))
        g = vals.get("shear_modulus", math.nan)
        e, nu = vals.get("youngs_modulus", math.nan), vals.get("poisson_ratio", math.nan)
        derive = math.isnan(g) and "shear_modulus" not in given and not (math.isnan(e) or math.isnan(nu))
        if derive and nu > 0.5 and problem is None:
            problem = (f"material {name!r}: Poisson ratio {nu:.3g} is above 0.5, impossible for an isotropic "
                       "material, so G cannot be derived from E and the ratio: give G")
        elif derive:
            g = float(shear_modulus_from_elastic(e, nu))
            findings.append(Finding(
                Severity.NOTE, grid.name, cells.get("shear_modulus", here),
                f"material {name!r}: G = E/2(1+ν) = {g / 1e9:.4g} GPa from the row's E and Poisson ratio "
                "(this holds for an isotropic material only; give G for a fibre-wound or other orthotropic one)"))
        if problem is None and math.isnan(g):
            problem = (f"material {name!r}: no shear modulus: give G, or E and Poisson ratio"
                       + ("" if lib else ", or name a built-in library material"))
        keyway = False
        if key_col is not None:
            raw = grid.value(r, key_col.index)
            if raw is not None:
                kv = read_flag(raw)
                if kv is None:
                    findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, key_col.index),
                                            f"material {name!r}: keyway: expected yes or no, got {raw!r}"))
                    problem = problem or f"material {name!r}: keyway cell unreadable"
                else:
                    keyway = kv
        rule_text = rules[i]
        rule = rule_from_text(rule_text)
        tau_given = vals.get("allowable_shear", math.nan)
        fs = vals.get("factor_of_safety", math.nan)
        sy, su = vals.get("yield_strength", math.nan), vals.get("ultimate_strength", math.nan)
        rule_cell = cell_ref(r, rule_col.index) if rule_col else None
        if rule_text is not None and rule is None:
            findings.append(Finding(Severity.ERROR, grid.name, rule_cell,
                                    f"material {name!r}: allowable rule {rule_text!r} is not one of: "
                                    "given, max shear, distortion energy, shafting code"))
            problem = problem or f"material {name!r}: unknown allowable rule {rule_text!r}"
            rule = AllowableRule.GIVEN
        if rule is None:
            if not math.isnan(tau_given):
                rule = AllowableRule.GIVEN
            else:
                rule = AllowableRule.SHAFTING_CODE
                if problem is None and not is_steel(name):
                    problem = f"material {name!r}: no allowable shear and no rule given: {_CODE_RULE_FOR_STEEL}"
                elif problem is None and not (math.isnan(sy) or math.isnan(su)):
                    findings.append(Finding(
                        Severity.WARNING, grid.name, rule_cell or here,
                        f"material {name!r}: no allowable shear and no rule given; used the shafting "
                        "code rule min(0.30·Sy, 0.18·Su) for steel shafting"))
        tau = math.nan
        if rule == AllowableRule.GIVEN:
            tau = tau_given
            if problem is None and math.isnan(tau):
                problem = f"material {name!r}: rule 'given' but no allowable shear stress"
            for k, what in (("factor_of_safety", "factor of safety"), ("keyway", "keyway")):
                unused = (not math.isnan(fs)) if k == "factor_of_safety" else keyway
                if unused and problem is None:
                    findings.append(Finding(
                        Severity.WARNING, grid.name, cells.get(k, here),
                        f"material {name!r}: the {what} is not used: the allowable shear is given directly "
                        "(it should already include any factor of safety and keyway allowance)"))
        else:
            if rule in (AllowableRule.MAX_SHEAR, AllowableRule.DISTORTION_ENERGY) and math.isnan(fs):
                problem = problem or (f"material {name!r}: rule {RULE_NAMES[rule]} needs a factor of safety")
            need_su = rule == AllowableRule.SHAFTING_CODE
            if math.isnan(sy) or (need_su and math.isnan(su)):
                problem = problem or (
                    f"material {name!r}: rule {RULE_NAMES[rule]} needs the yield strength"
                    + (" and the ultimate strength" if need_su else ""))
            if problem is None:
                fs_used = fs if not math.isnan(fs) else 1.0
                tau = float(allowable_shear(rule, sy, su, fs_used, keyway))
                findings.extend(_rule_notes(name, rule, sy, su, fs_used, fs, keyway, cells, here, grid.name))
            if not math.isnan(tau_given) and problem is None:
                findings.append(Finding(
                    Severity.WARNING, grid.name, cells.get("allowable_shear", here),
                    f"material {name!r}: allowable shear given but rule {RULE_NAMES[rule]} chosen; "
                    "the rule's value is used"))
        out.by_name[key] = ResolvedMaterial(
            name, g, tau, rule, "book", problem, e, nu, sy, su, fs, keyway, vals.get("density", math.nan))
        if problem:
            findings.append(Finding(Severity.ERROR, grid.name, here, problem))
    return out
