"""The book's materials table, completed from the built-in library where the book leaves blanks."""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np
from twistshare.engine.core import (
    AllowableRule,
    allowable_shear,
    complete_from_library,
    find_material,
    is_steel,
    shear_modulus_from_elastic,
)

from ._allowable_rule import CODE_RULE_FOR_STEEL, allowable_of
from ._columns import error_problem, read_flag, read_numeric, read_text
from ._grid import SheetGrid, cell_ref, parse_ref
from ._problems import Problem, Severity
from ._schema import MATERIAL_FIELDS
from ._tables import TableSpot
from ._words import RULE_CHOICES, material_key, rule_from_text
from ._wound_layers import wound_layer

__all__ = ["ResolvedMaterial", "FilledCell", "MaterialSet", "read_materials"]

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
    note: str | None = None  # a note to show once where a part first uses the material
    allowable_problem: str | None = None  # why there is no allowable (G is still usable)
    warnings: tuple[str, ...] = ()  # the row's warnings: a cell function refuses on them
    expansion_coefficient: float = math.nan  # 1/K, for fits at temperature


@dataclass
class MaterialSet:
    """Materials by normalised name; names given twice in the book are ambiguous."""

    by_name: dict[str, ResolvedMaterial] = field(default_factory=dict)
    ambiguous: dict[str, list[str]] = field(default_factory=dict)  # name -> cells where it appears
    filled: list[FilledCell] = field(default_factory=list)
    spot: TableSpot | None = None
    cells: dict[str, dict[str, str]] = field(default_factory=dict)  # name -> field -> A1 cell

    def lookup(self, name: str, need_allowable: bool = True) -> tuple[ResolvedMaterial | None, str | None]:
        """Find a material by name in the book, then the library; (material, problem).

        With `need_allowable` False a material whose only problem is a missing allowable is
        returned (its shear modulus serves the share, the stress and the twist).
        """
        key = material_key(name)
        if key in self.ambiguous:
            cells = ", ".join(self.ambiguous[key])
            return None, f"material {name!r} is defined more than once in the materials table ({cells})"
        got = self.by_name.get(key)
        if got is None:
            lib = find_material(name)
            if lib is None:
                where = "the materials table" if self.spot is not None else "a materials table"
                return None, f"unknown material {name.strip()!r}: not in {where} nor the built-in library"
            got = self.by_name[key] = _from_library_only(lib)
        if got.problem:
            return None, got.problem
        if need_allowable and got.allowable_problem:
            return None, got.allowable_problem
        return got, None


def _nan_if_none(x: float | None) -> float:
    return math.nan if x is None else float(x)


def _from_library_only(lib) -> ResolvedMaterial:
    sy, su = _nan_if_none(lib.yield_strength), _nan_if_none(lib.ultimate_strength)
    allowable_problem = note = None
    tau = math.nan
    if not is_steel(lib.name):
        allowable_problem = f"material {lib.name!r} has no allowable in the book: {CODE_RULE_FOR_STEEL}"
    else:
        tau = float(allowable_shear(AllowableRule.SHAFTING_CODE, sy, su, 1.0, False))
        if not math.isfinite(tau) or tau <= 0:
            allowable_problem = (
                f"material {lib.name!r} from the built-in library has no typical yield and ultimate "
                "strength to derive an allowable from: add it to the materials table with an allowable shear")
        else:
            note = (f"material {lib.name!r} is not in the materials table: used the built-in "
                    f"library's typical strengths and the shafting code rule min(0.30·Sy, 0.18·Su) = "
                    f"{tau / 1e6:.4g} MPa, no keyway; add a row to the materials table to choose otherwise")
    return ResolvedMaterial(
        lib.name, float(lib.shear_modulus), tau, AllowableRule.SHAFTING_CODE, "library", None,
        _nan_if_none(lib.youngs_modulus), _nan_if_none(lib.poisson_ratio), sy, su, math.nan, False,
        _nan_if_none(lib.density), note, allowable_problem,
        expansion_coefficient=_nan_if_none(lib.expansion_coefficient),
    )


def _expansion(vals: dict[str, float], lib) -> float:
    """The row's expansion coefficient, else its library material's (1/K)."""
    alpha = vals.get("expansion_coefficient", math.nan)
    if math.isnan(alpha) and lib is not None:
        alpha = _nan_if_none(lib.expansion_coefficient)
    return alpha


def _library_shear_modulus_beside_own(name: str, lib, given: frozenset[str],
                                      vals: dict[str, float]) -> tuple[Severity, str] | None:
    """What to say of a row whose own E or Poisson ratio stands beside the library's G, or None."""
    own = [w for k, w in (("youngs_modulus", "E"), ("poisson_ratio", "Poisson ratio")) if k in given]
    if not own:
        return None
    g = f"G is the library's {float(lib.shear_modulus) / 1e9:.4g} GPa for {lib.name}"
    if len(own) == 2:  # both given: the library material is orthotropic, E/2(1+ν) does not hold,
        # so the library's G is the right one: a note (it does not stop a cell function)
        return Severity.NOTE, (f"material {name!r}: {g}, not E/2(1+ν) from the row's E and Poisson ratio, "
                               "which holds for an isotropic material only; give G to use your own")
    missing = "Poisson ratio" if own[0] == "E" else "E"
    shown = f" ({vals['youngs_modulus'] / 1e9:.4g} GPa)" if own[0] == "E" else f" ({vals['poisson_ratio']:.3g})"
    return Severity.WARNING, (f"material {name!r}: the row gives {own[0]}{shown} but no {missing}, so {g}, "
                              f"not one derived from the row's {own[0]}; give the {missing} too, or G, to use your own")


def read_materials(grid: SheetGrid, spot: TableSpot, findings: list[Problem]) -> MaterialSet:
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
    layup_col, ply_set_col = spot.column("layup"), spot.column("ply_set")
    layups = read_text(grid, layup_col.index, rows) if layup_col else [None] * len(rows)
    ply_sets = read_text(grid, ply_set_col.index, rows) if ply_set_col else [None] * len(rows)

    first_seen: dict[str, str] = {}
    # The first unusable cell of each row, worded: the row's problem says what it is.
    bad_cells: dict[int, str] = {}
    for f in findings:
        if f.sheet == grid.name and f.cell and f.severity is Severity.ERROR:
            bad_cells.setdefault(parse_ref(f.cell)[0], f.message)

    def _read_row(i: int, r: int) -> None:
        name = names[i]
        err = error_problem(grid, r, name_col.index, "a material name")
        if err is not None:
            findings.append(Problem(Severity.ERROR, grid.name, cell_ref(r, name_col.index),
                                    f"materials row {r + 1}: the name: {err}; the row is ignored"))
            return
        if name is None:
            findings.append(Problem(Severity.ERROR, grid.name, cell_ref(r, name_col.index),
                                    f"materials row {r + 1}: the material has no name; the row is ignored"))
            return
        key = material_key(name)
        here = cell_ref(r, name_col.index)
        if key in first_seen:
            out.ambiguous.setdefault(key, [first_seen[key]]).append(here)
            findings.append(Problem(Severity.ERROR, grid.name, here,
                                    f"material {name!r} is defined again (first at {first_seen[key]}); "
                                    "parts using it are not rated until one definition is removed"))
            return
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
            first = bad_cells.get(r, "").removeprefix(f"material {name!r}: ")
            problem = f"material {name!r} has an unusable property" + (f": {first}" if first else
                                                                        " (see the comments on its row)")
        given = frozenset(k for k in num if not math.isnan(vals[k]) or is_bad(k))
        filled: tuple[str, ...] = ()
        if lib is not None:
            vals, filled = complete_from_library(vals, lib, given)
            for k in filled:
                if k in cells:
                    out.filled.append(FilledCell(grid.name, cells[k], lib.name, k, vals[k],
                                                 lib.sources.get(k, "built-in library")))
        wound = wound_layer(name, vals, layups[i], ply_sets[i]) if problem is None else None
        if wound is not None and wound.problem is not None:
            problem = wound.problem
            findings.append(Problem(Severity.ERROR, grid.name, cells.get(wound.field, here), wound.problem,
                                    code="laminate"))
        elif wound is not None:
            replaced = [w for k, w in (("shear_modulus", "G"), ("youngs_modulus", "E")) if k in given]
            findings.append(Problem(
                Severity.WARNING if replaced else Severity.NOTE, grid.name, cells.get("layup", here),
                wound.note + (f"; the row's own {' and '.join(replaced)} are not used" if replaced else ""),
                code="laminate"))
            vals["shear_modulus"], vals["youngs_modulus"] = wound.shear_modulus, wound.youngs_modulus
            vals["poisson_ratio"] = wound.poisson_ratio
            if math.isnan(vals.get("density", math.nan)):
                vals["density"] = wound.density
            given = given | {"shear_modulus"}
        elif "shear_modulus" in filled and problem is None:
            said = _library_shear_modulus_beside_own(name, lib, given, vals)
            if said is not None:
                findings.append(Problem(said[0], grid.name, cells.get("shear_modulus", here), said[1],
                                        code="library-g"))
        g = vals.get("shear_modulus", math.nan)
        e, nu = vals.get("youngs_modulus", math.nan), vals.get("poisson_ratio", math.nan)
        derive = math.isnan(g) and "shear_modulus" not in given and not (math.isnan(e) or math.isnan(nu))
        if derive and nu > 0.5 and problem is None:
            problem = (f"material {name!r}: Poisson ratio {nu:.3g} is above 0.5, impossible for an isotropic "
                       "material, so G cannot be derived from E and the ratio: give G")
        elif derive:
            g = float(shear_modulus_from_elastic(e, nu))
            findings.append(Problem(
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
                    findings.append(Problem(Severity.ERROR, grid.name, cell_ref(r, key_col.index),
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
            findings.append(Problem(Severity.ERROR, grid.name, rule_cell,
                                    f"material {name!r}: allowable rule {rule_text!r} is not one of: "
                                    f"{RULE_CHOICES}", code="rule-word", values=(rule_text,)))
            problem = problem or f"material {name!r}: unknown allowable rule {rule_text!r}"
            rule = AllowableRule.GIVEN
        decision = allowable_of(name, rule, tau_given, sy, su, fs, keyway)
        rule, tau, no_allowable = decision.rule, decision.allowable, decision.missing
        own = [k for k in ("yield_strength", "ultimate_strength") if k in given]
        if no_allowable and lib is not None and len(own) == 1:
            other = "ultimate strength" if own[0] == "yield_strength" else "yield strength"
            no_allowable += (f" (the row gives only the {own[0].replace('_', ' ')}; the library's typical "
                             f"{other} is not paired with it)")
        row_warnings = [Problem(Severity.NOTE if note.assumed else Severity.WARNING, grid.name,
                                rule_cell or here if note.field == "rule" else cells.get(note.field, here),
                                note.message, code=note.code) for note in decision.notes]
        if problem is None:
            findings.extend(row_warnings)
        out.by_name[key] = ResolvedMaterial(
            name, g, tau, rule, "book", problem, e, nu, sy, su, fs, keyway, vals.get("density", math.nan),
            None, no_allowable, tuple(w.message for w in row_warnings if w.severity is Severity.WARNING),
            _expansion(vals, lib))
        if problem:
            findings.append(Problem(Severity.ERROR, grid.name, here, problem, code="material"))
        elif no_allowable:
            findings.append(Problem(Severity.ERROR, grid.name, here, no_allowable, code="no-allowable"))

    for i, r in enumerate(rows):
        start = len(findings)
        _read_row(i, r)
        for k in range(start, len(findings)):  # the row's problems concern every part using it
            if findings[k].material is None and names[i]:
                findings[k] = replace(findings[k], material=names[i])
    return out


