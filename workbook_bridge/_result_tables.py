"""The rows of the sheets the tool adds: results, warnings and the materials as used.

Rows are plain lists of values; a value may be a ``Styled(value, style)`` to pick one of the
writer's named styles. Units sit in the headers, in the results' unit system.
"""

from __future__ import annotations

from types import MappingProxyType

import math
import itertools

import numpy as np

from twistshare.engine.core import Criterion
from twistshare.engine.units import si_factor

from ._findings import Finding, Severity
from ._flag_wording import Display
from ._materials_table import RULE_NAMES, MaterialSet
from .ooxml import Cell

__all__ = ["READING_THE_RESULTS", "Styled", "results_rows", "warnings_rows", "materials_rows", "governs_text", "CAUTIONS",
           "lowest_margins", "criterion_counts"]

READING_THE_RESULTS = (
    "Governing limit: the section torque at which the first criterion is reached (a layer's allowable "
    "shear stress with its Kt, or a twist limit); margin = limit / demand − 1.",
    "Reserve factor = governing limit / demand. The allowables already hold each material's factor of "
    "safety (or the shafting code's own allowance), so this is a reserve on top of them, not a factor "
    "against yield.",
    "Layer capacity (section torque): the torque on the whole shaft at which that layer reaches its "
    "allowable, τa·ΣGJ / (G·ro·Kt) — not the torque the layer itself carries (see layer torque).",
    "Nominal stress: G·r·θ' at the layer's outer and inner radius, without Kt; utilisation = Kt × "
    "nominal stress at the outer radius / allowable.",
)

CAUTIONS = (
    "twistshare is a preliminary design aid. Its results are not a design approval.",
    "Verify every result against the applicable codes and standards for the machine and its duty.",
    "Have a qualified engineer review the inputs, the method and the results before use.",
    "Local codes and licensed engineering practice prevail over anything this workbook shows.",
    "Method: layers twist as one (full connection along the length), elastic stress only, "
    "static torque; fatigue, bending, fits and bonds are not checked here.",
)


_STYLE_MAP = MappingProxyType({"ok": None, "note": None, "caution_title": "title"})


def Styled(value: object, style: str) -> object:  # noqa: N802 - reads like the value wrapper it makes
    """A value with one of the writer's style names (a few local aliases are mapped here)."""
    style = _STYLE_MAP.get(style, style)
    return Cell(value, style) if style else value


def _num(x: float) -> float | None:
    return None if x is None or not math.isfinite(float(x)) else float(x)


_CRIT_TEXT = MappingProxyType({
    Criterion.TWIST_ANGLE: "twist angle limit",
    Criterion.TWIST_PER_LENGTH: "twist per length limit",
})


def governs_text(criterion: int, layer: int, material: str | None) -> str:
    """Short words for what governs: ``layer 2 stress (stainless steel)``."""
    c = Criterion(int(criterion))
    if c == Criterion.LAYER_STRESS:
        return f"layer {layer + 1} stress" + (f" ({material})" if material else "")
    if c == Criterion.NONE:
        return ""
    return _CRIT_TEXT.get(c, c.name.lower().replace("_", " "))


def _column(x: np.ndarray, keep: np.ndarray) -> list:
    """One results column as Python floats; NaN (blank in the sheet) where the part is not rated."""
    return np.where(keep, x, np.nan).tolist()


def results_rows(book, display: Display, first_error: dict[str, str]):
    """Header and one row per part; returns (rows, column widths, column number styles).

    Built column by column from the engine's arrays (a 50 000-part book is 2 million cells).
    """
    parts, r = book.parts, book.rating
    P, L = parts.outer_diameter.shape
    tu, tf = display.unit("torque")
    su, sf = display.unit("stress")
    lu, lf = display.unit("length")
    au, af = display.unit("angle")
    pu, pf = display.unit("angle_per_length")
    if display.system == "SI":
        gj_unit, gj_f = "N·m²", 1.0
    else:
        gj_unit, gj_f = "lbf·in²", si_factor("lbf·in", "torque") * si_factor("in", "length")
    header = [
        "Part", "Status", "Layers", f"Demand torque [{tu}]", "Demand from", f"Governing limit [{tu}]",
        "Governs", "Margin [%]", "Reserve factor (limit / demand)", f"ΣGJ [{gj_unit}]", f"Twist rate [{pu}]",
        f"Twist angle [{au}]", f"Twist-limit capacity [{tu}]",
    ]
    for n in range(1, L + 1):
        header += [
            f"L{n} material", f"L{n} outer diameter [{lu}]", f"L{n} inner diameter [{lu}]", f"L{n} share [%]",
            f"L{n} torque [{tu}]", f"L{n} nominal stress at outer [{su}]", f"L{n} nominal stress at inner [{su}]",
            f"L{n} capacity (section torque) [{tu}]", f"L{n} utilisation with Kt [%]",
        ]
    header.append("First problem")
    rated = np.zeros(P, bool) if book.rated is None else np.asarray(book.rated, bool)
    nan = np.full(P, np.nan)
    nanl = np.full((P, L), np.nan)

    def get(name: str, shape=nan) -> np.ndarray:
        return shape if r is None else np.asarray(getattr(r, name), dtype=float)

    margin = get("margin") * 100
    fails = rated & (margin < 0)
    status = [Styled("FAILS", "fail") if f else ("ok" if k else Styled("not rated", "warn"))
              for f, k in zip(fails.tolist(), rated.tolist())]
    crit = np.zeros(P, int) if r is None else np.asarray(r.governing_criterion, int)
    glayer = np.full(P, -1) if r is None else np.asarray(r.governing_layer, int)
    governs = [
        governs_text(c, g, parts.materials[i][g] if 0 <= g < L else None) if k else None
        for i, (c, g, k) in enumerate(zip(crit.tolist(), glayer.tolist(), rated.tolist()))
    ]
    margin_col = [Styled(m, "fail+fixed1") if f else m for m, f in zip(_column(margin, rated), fails.tolist())]
    errors = [None if k else first_error.get(pid, "see the warnings sheet") for pid, k in zip(parts.ids, rated)]
    cols: list[list] = [
        list(parts.ids), status, parts.present.sum(axis=1).tolist(), _column(parts.torque / tf, rated),
        list(parts.duty_source), _column(get("governing_capacity") / tf, rated), governs, margin_col,
        _column(get("factor_of_safety"), rated), _column(get("sum_gj") / gj_f, rated),
        _column(get("twist_rate") / pf, rated), _column(get("twist_angle") / af, rated),
        _column(get("twist_capacity") / tf, rated),
    ]
    share = get("share", nanl) * 100
    ltq = get("layer_torque", nanl) / tf
    so = get("stress_outer", nanl) / sf
    si = get("stress_inner", nanl) / sf
    lcap = get("capacity", nanl) / tf
    util = get("utilisation", nanl) * 100
    for j in range(L):
        keep = rated & parts.present[:, j]
        over = keep & (util[:, j] > 100)
        cols += [
            [m[j] if k else None for m, k in zip(parts.materials, parts.present[:, j].tolist())],
            _column(parts.outer_diameter[:, j] / lf, keep), _column(parts.inner_diameter[:, j] / lf, keep),
            _column(share[:, j], keep), _column(ltq[:, j], keep), _column(so[:, j], keep),
            _column(si[:, j], keep), _column(lcap[:, j], keep),
            [Styled(u, "fail+fixed1") if o else u for u, o in zip(_column(util[:, j], keep), over.tolist())],
        ]
    cols.append(errors)
    rows = itertools.chain([[Styled(h, "header") for h in header]], zip(*cols))
    widths = [14, 10, 7, 14, 11, 14, 28, 10, 10, 14, 12, 12, 14] + [13] * (9 * L) + [60]
    styles = [None, None, None, "fixed1", None, "fixed1", None, "fixed1", "fixed3", "sci", "fixed3", "fixed3",
              "fixed1"] + [None, "fixed3", "fixed3", "fixed1", "fixed1", "fixed1", "fixed1", "fixed1", "fixed1"] * L
    return rows, widths, styles


def warnings_rows(findings: list[Finding]) -> list[list]:
    rows: list[list] = [[Styled(h, "header") for h in ("Sheet", "Cell", "Part", "Layer", "Severity", "Message")]]
    order = {Severity.ERROR: 0, Severity.WARNING: 1, Severity.NOTE: 2}
    for f in sorted(findings, key=lambda f: order[f.severity]):
        style = "fail" if f.severity is Severity.ERROR else "warn" if f.severity is Severity.WARNING else "note"
        rows.append([f.sheet, f.cell, f.part, f.layer, Styled(f.severity.value, style), f.message])
    return rows


def materials_rows(materials: MaterialSet, display: Display) -> list[list]:
    """The materials as used: book rows completed from the library, filled values marked."""
    su, sf = display.unit("stress")
    header = ["Material", "From", "G [GPa]", f"Allowable shear [{su}]", "Allowable rule", f"Yield strength [{su}]",
              f"Ultimate strength [{su}]", "Factor of safety", "Keyway", "Problem"]
    rows: list[list] = [[Styled(h, "header") for h in header]]
    filled = {(f.material.lower(), f.field) for f in materials.filled}
    for m in materials.by_name.values():
        def v(x: float, field: str, scale: float) -> object:
            val = _num(x / scale) if x is not None and math.isfinite(x) else None
            if (m.name.lower(), field) in filled and val is not None:
                return Styled(val, "filled")
            return val
        if m.problem:  # nothing derived from unusable inputs is shown as if it were used
            rows.append([m.name, m.origin, None, None, RULE_NAMES.get(m.rule, str(m.rule)), None, None, None,
                         "yes" if m.keyway else "no", m.problem])
            continue
        rows.append([m.name, m.origin, v(m.shear_modulus, "shear_modulus", 1e9), _num(m.allowable_shear / sf),
                     RULE_NAMES.get(m.rule, str(m.rule)), v(m.yield_strength, "yield_strength", sf),
                     v(m.ultimate_strength, "ultimate_strength", sf), _num(m.factor_of_safety),
                     "yes" if m.keyway else "no", m.problem])
    return rows


def lowest_margins(book, count: int = 10) -> list[int]:
    """Indices of the rated parts with the smallest margins, smallest first."""
    r = book.rating
    if r is None or book.rated is None or not book.rated.any():
        return []
    rated = np.flatnonzero(book.rated)
    m = np.asarray(r.margin, dtype=float)[rated]
    m = np.where(np.isnan(m), np.inf, m)
    return rated[np.argsort(m, kind="stable")[:count]].tolist()


def criterion_counts(book) -> list[tuple[str, int]]:
    r = book.rating
    if r is None or book.rated is None:
        return []
    crit = np.asarray(r.governing_criterion)[book.rated]
    out = []
    for c in Criterion:
        if c == Criterion.NONE:
            continue
        n = int((crit == int(c)).sum())
        if n:
            out.append((_CRIT_TEXT.get(c, "a layer's shear stress" if c == Criterion.LAYER_STRESS else c.name), n))
    return out
