"""The rows of the sheets the tool adds: results, warnings and the materials as used.

Rows are plain lists of values; a value may be a ``Styled(value, style)`` to pick one of the
writer's named styles. Units sit in the headers, in the results' unit system.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from twistshare.engine.core import Criterion

from ._findings import Finding, Severity
from ._flag_wording import Display
from ._materials_table import RULE_NAMES, MaterialSet

__all__ = ["Styled", "results_rows", "warnings_rows", "materials_rows", "governs_text", "CAUTIONS",
           "lowest_margins", "criterion_counts"]

CAUTIONS = (
    "twistshare is a preliminary design aid. Its results are not a design approval.",
    "Verify every result against the applicable codes and standards for the machine and its duty.",
    "Have a qualified engineer review the inputs, the method and the results before use.",
    "Local codes and licensed engineering practice prevail over anything this workbook shows.",
    "Method: layers twist as one (full connection along the length), elastic stress only, "
    "static torque; fatigue, bending, fits and bonds are not checked here.",
)


@dataclass(frozen=True)
class Styled:
    value: object
    style: str


def _num(x: float) -> float | None:
    return None if x is None or not math.isfinite(float(x)) else float(x)


_CRIT_TEXT = {
    Criterion.TWIST_ANGLE: "twist angle limit",
    Criterion.TWIST_PER_LENGTH: "twist per length limit",
}


def governs_text(criterion: int, layer: int, material: str | None) -> str:
    """Short words for what governs: ``layer 2 stress (stainless steel)``."""
    c = Criterion(int(criterion))
    if c == Criterion.LAYER_STRESS:
        return f"layer {layer + 1} stress" + (f" ({material})" if material else "")
    if c == Criterion.NONE:
        return ""
    return _CRIT_TEXT.get(c, c.name.lower().replace("_", " "))


def results_rows(book, display: Display, first_error: dict[str, str]) -> tuple[list[list], list[float], list]:
    """Header and one row per part; returns (rows, column widths, column number styles)."""
    parts, r = book.parts, book.rating
    L = parts.outer_diameter.shape[1]
    tu, tf = display.unit("torque")
    su, sf = display.unit("stress")
    lu, lf = display.unit("length")
    au, af = display.unit("angle")
    pu, pf = display.unit("angle_per_length")
    gj_unit = f"{tu}·{lu}"  # N·m·mm is odd: show stiffness per radian in torque × length
    gj_f = tf * lf
    if display.system == "SI":
        gj_unit, gj_f = "N·m²", 1.0
    header = [
        "Part", "Status", "Layers", f"Demand torque [{tu}]", "Demand from", f"Governing limit [{tu}]",
        "Governs", "Margin [%]", "Factor of safety", f"ΣGJ [{gj_unit}]", f"Twist rate [{pu}]",
        f"Twist angle [{au}]", f"Twist-limit capacity [{tu}]",
    ]
    for n in range(1, L + 1):
        header += [
            f"L{n} material", f"L{n} outer diameter [{lu}]", f"L{n} inner diameter [{lu}]", f"L{n} share [%]",
            f"L{n} torque [{tu}]", f"L{n} stress at outer [{su}]", f"L{n} stress at inner [{su}]",
            f"L{n} capacity [{tu}]", f"L{n} utilisation [%]",
        ]
    header.append("First problem")
    rows: list[list] = [[Styled(h, "header") for h in header]]
    rated = book.rated
    layer_count = parts.present.sum(axis=1)
    # Whole columns are converted at once; the loop below only picks values.
    demand = parts.torque / tf
    if r is not None:
        cap = np.asarray(r.governing_capacity) / tf
        margin = np.asarray(r.margin) * 100
        fos = np.asarray(r.factor_of_safety)
        sgj = np.asarray(r.sum_gj) / gj_f
        trate = np.asarray(r.twist_rate) / pf
        tang = np.asarray(r.twist_angle) / af
        tcap = np.asarray(r.twist_capacity) / tf
        share = np.asarray(r.share) * 100
        ltq = np.asarray(r.layer_torque) / tf
        so = np.asarray(r.stress_outer) / sf
        si = np.asarray(r.stress_inner) / sf
        lcap = np.asarray(r.capacity) / tf
        util = np.asarray(r.utilisation) * 100
        crit = np.asarray(r.governing_criterion)
        glayer = np.asarray(r.governing_layer)
    od = parts.outer_diameter / lf
    idd = parts.inner_diameter / lf
    for i, pid in enumerate(parts.ids):
        ok = bool(rated[i]) if rated is not None else False
        if ok:
            m = margin[i]
            fails = math.isfinite(m) and m < 0
            status = Styled("FAILS", "fail") if fails else Styled("ok", "ok")
            gl = int(glayer[i])
            mat = parts.materials[i][gl] if 0 <= gl < L else None
            row = [pid, status, int(layer_count[i]), _num(demand[i]), parts.duty_source[i], _num(cap[i]),
                   governs_text(crit[i], gl, mat), Styled(_num(m), "fail+fixed1" if fails else "fixed1"),
                   _num(fos[i]), _num(sgj[i]), _num(trate[i]), _num(tang[i]), _num(tcap[i])]
            for j in range(L):
                if parts.present[i, j]:
                    row += [parts.materials[i][j], _num(od[i, j]), _num(idd[i, j]), _num(share[i, j]),
                            _num(ltq[i, j]), _num(so[i, j]), _num(si[i, j]), _num(lcap[i, j]),
                            Styled(_num(util[i, j]), "fail+fixed1") if util[i, j] > 100 else _num(util[i, j])]
                else:
                    row += [None] * 9
            row.append(first_error.get(pid))
        else:
            row = [pid, Styled("not rated", "warn"), int(layer_count[i]), None, parts.duty_source[i]]
            row += [None] * (8 + 9 * L)
            row.append(first_error.get(pid, "see the warnings sheet"))
        rows.append(row)
    widths = [14, 10, 7, 14, 11, 14, 28, 10, 10, 14, 12, 12, 14] + [13] * (9 * L) + [60]
    styles = [None, None, None, "fixed1", None, "fixed1", None, "fixed1", "fixed3", "sci", "fixed3", "fixed3",
              "fixed1"] + [None, "fixed3", "fixed3", "fixed1", "fixed1", "fixed1", "fixed1", "fixed1", "fixed1"] * L
    return rows, widths, styles


def warnings_rows(findings: list[Finding]) -> list[list]:
    rows: list[list] = [[Styled(h, "header") for h in ("Cell", "Sheet", "Part", "Layer", "Severity", "Message")]]
    order = {Severity.ERROR: 0, Severity.WARNING: 1, Severity.NOTE: 2}
    for f in sorted(findings, key=lambda f: order[f.severity]):
        style = "fail" if f.severity is Severity.ERROR else "warn" if f.severity is Severity.WARNING else "note"
        rows.append([f.cell, f.sheet, f.part, f.layer, Styled(f.severity.value, style), f.message])
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
    m = np.where(book.rated, np.asarray(r.margin, dtype=float), np.inf)
    m = np.where(np.isnan(m), np.inf, m)
    k = min(count, int(book.rated.sum()))
    idx = np.argpartition(m, k - 1)[:k] if k < m.size else np.arange(m.size)
    idx = idx[np.argsort(m[idx], kind="stable")]
    return [int(i) for i in idx if math.isfinite(m[i]) or book.rated[i]][:k]


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
