"""A worked calculation a checking engineer can audit: one part's rating as native formulas.

The part's inputs, then every step of the hand method of twist compatibility (common practice; Roark's
Formulas for Stress and Strain, torsion of circular sections) — J per layer, G·J, ΣGJ, share,
layer torque, stress, each capacity, the twist limits, the governing limit, margin and reserve
factor — each as a plain spreadsheet formula (PI, SUM, MIN, RADIANS, ...) on the input cells of
the same sheet, with its unit and the formula in words beside it. Any spreadsheet recomputes it
without the add-in; a checker can change an input and see the effect. The cached values are the
engine's, so the sheet reads right before any recalculation.

Units on this sheet are fixed (mm, GPa, MPa, N·m, degrees) whatever the book uses, so the
formulas stay short; each header says its unit.
"""

from __future__ import annotations

import math

import numpy as np
from twistshare.engine.core import Criterion
from twistshare.engine.intake import BookRating, cell_ref, governs_text

from ..ooxml import Cell, Formula
from ._cells import Styled, caution_rows
from ._cells import finite_or_none as _f

__all__ = ["worked_rows", "worked_sheet_name", "WORKED_PREFIX", "WORKED_WIDTHS"]

WORKED_PREFIX = "Twistshare calc "
#: Column widths (characters): labels, values, then the layer table's columns.
WORKED_WIDTHS = (30.0, 24.0, 10.0, 10.0, 9.0, 9.0, 6.0, 14.0, 14.0, 11.0, 12.0, 14.0, 18.0)
_SOURCE = "twist compatibility of concentric layers that twist as one (common practice); Roark's Formulas for Stress and Strain, torsion of circular sections"


def worked_sheet_name(part: str) -> str:
    """The sheet's name for a part (a spreadsheet allows 31 characters; forbidden ones dropped)."""
    clean = "".join(ch for ch in part if ch not in "[]:*?/\\'")
    return (WORKED_PREFIX + clean)[:31]


def worked_rows(book: BookRating, index: int) -> list[list]:
    """The rows of the worked calculation of part `index` (a rated part)."""
    parts, r = book.parts, book.rating
    present = np.flatnonzero(parts.present[index])
    rows: list[list] = [
        [Styled(f"Worked calculation: part {parts.ids[index]}", "title")],
        ["Every step below is a native formula on this sheet's inputs: change an input and any spreadsheet "
         "recomputes it, with no add-in. Method: " + _SOURCE + "."],
        [],
        *caution_rows(),
        [Styled(h, "header") for h in ("Input", "Value", "Unit", "In words")],
    ]
    t_row = len(rows) + 1
    angle, per_length = parts.twist_limit_angle[index], parts.twist_limit_per_length[index]
    rows += [
        ["Demand torque T", _f(parts.torque[index]), "N·m", "the part's demand, service factor applied"],
        ["Length L", _f(parts.length[index] * 1e3), "mm", "over which the layers twist together"],
        ["Twist limit φlim", _f(math.degrees(angle)) if not math.isnan(angle) else None, "°",
         "largest total twist allowed (blank: none)"],
        ["Twist limit per length θ'lim", _f(math.degrees(per_length)) if not math.isnan(per_length) else None,
         "°/m", "largest twist per length allowed (blank: none)"],
        [],
    ]
    T, L, PHI, THETA = (f"$B${t_row + k}" for k in range(4))
    head = len(rows) + 1
    rows.append([Styled(h, "header") for h in (
        "Layer", "Material", "Do [mm]", "Di [mm]", "G [GPa]", "τa [MPa]", "Kt", "J [mm⁴]", "G·J [N·m²]",
        "Share [%]", "Layer torque [N·m]", "τ at outer radius [MPa]", "Capacity (section torque) [N·m]")])
    first, last = head + 1, head + len(present)
    sum_row = last + 3  # after the words row and the results header
    SUM, TH = f"$B${sum_row}", f"$B${sum_row + 1}"
    for k, j in enumerate(present):
        n = first + k
        c = {x: f"{x}{n}" for x in "CDEFGHIJ"}
        rows.append([
            int(j) + 1, parts.materials[index][j],
            _f(parts.outer_diameter[index, j] * 1e3), _f(parts.inner_diameter[index, j] * 1e3),
            _f(parts.shear_modulus[index, j] / 1e9), _f(parts.allowable_shear[index, j] / 1e6),
            _f(parts.kt[index, j]),
            Cell(Formula(f"PI()/32*({c['C']}^4-{c['D']}^4)", _f(r.gj[index, j] / parts.shear_modulus[index, j] * 1e12)),
                 "sci"),
            Cell(Formula(f"{c['E']}*1E9*{c['H']}*1E-12", _f(r.gj[index, j])), "sci"),
            Cell(Formula(f"{c['I']}/{SUM}*100", _f(r.share[index, j] * 100)), "fixed1"),
            Cell(Formula(f"{c['J']}/100*{T}", _f(r.layer_torque[index, j])), "fixed1"),
            Cell(Formula(f"{c['E']}*1E9*{c['C']}/2000*{TH}/1E6", _f(r.stress_outer[index, j] / 1e6)), "fixed1"),
            Cell(Formula(f"{c['F']}*1E6*{SUM}/({c['E']}*1E9*{c['C']}/2000*{c['G']})", _f(r.capacity[index, j])),
                 "fixed1"),
        ])
    rows.append(["", "", "", "", "", "", "", "J = π/32·(Do⁴ − Di⁴)", "G·J", "G·J / ΣGJ", "share × T",
                 "τ = G·ro·θ'", "τa·ΣGJ / (G·ro·Kt)"])
    caps = f"M{first}:M{last}"
    angle_cap = r.criterion_capacity[Criterion.TWIST_ANGLE][index]
    length_cap = r.criterion_capacity[Criterion.TWIST_PER_LENGTH][index]
    gov_row = sum_row + 5
    layer = int(r.governing_layer[index])
    rows += [
        [Styled("Result", "header"), Styled("Value", "header"), Styled("Unit", "header"), Styled("In words", "header")],
        ["ΣGJ", Cell(Formula(f"SUM(I{first}:I{last})", _f(r.sum_gj[index])), "sci"), "N·m²",
         "sum of the layers' G·J: the layers twist as one"],
        ["Twist per length θ'", Cell(Formula(f"{T}/{SUM}", _f(r.twist_per_length[index])), "sci"), "rad/m",
         "θ' = T / ΣGJ, common to every layer"],
        ["Twist angle φ", Cell(Formula(f"DEGREES({TH}*{L}/1000)", _f(math.degrees(r.twist_angle[index]))), "fixed3"),
         "°", "φ = θ'·L"],
        ["Twist-limit capacity (angle)", Cell(Formula(f'IF({PHI}="","",RADIANS({PHI})*{SUM}/({L}/1000))',
                                                     _f(angle_cap) if math.isfinite(angle_cap) else None), "fixed1"),
         "N·m", "φlim·ΣGJ / L (blank: no limit)"],
        ["Twist-limit capacity (per length)", Cell(Formula(f'IF({THETA}="","",RADIANS({THETA})*{SUM})',
                                                          _f(length_cap) if math.isfinite(length_cap) else None),
                                                  "fixed1"), "N·m", "θ'lim·ΣGJ (blank: no limit)"],
        ["Governing limit", Cell(Formula(f"MIN({caps},B{sum_row + 3},B{sum_row + 4})",
                                         _f(r.governing_capacity[index])), "fixed1"), "N·m",
         "the smallest capacity governs (common practice)"],
        ["Margin", Cell(Formula(f"(B{gov_row}/{T}-1)*100", _f(r.margin[index] * 100)), "fixed1"), "%",
         "governing limit / T − 1"],
        ["Reserve factor", Cell(Formula(f"B{gov_row}/{T}", _f(r.reserve_factor[index])), "fixed3"), "",
         "governing limit / T (on top of each allowable's own factor of safety)"],
        ["What governs (as rated)", governs_text(int(r.governing_criterion[index]), layer,
                                                 parts.materials[index][layer] if layer >= 0 else None), "",
         "the engine's answer; the formulas above recompute the numbers"],
    ]
    assert rows[sum_row - 1][0] == "ΣGJ" and rows[gov_row - 1][0] == "Governing limit", (sum_row, gov_row)
    return rows


def cells_of(rows: list[list]) -> dict[str, float]:
    """Every formula cell's A1 reference and cached value (for tests and checks)."""
    out = {}
    for i, row in enumerate(rows):
        for j, value in enumerate(row):
            inner = value.value if isinstance(value, Cell) else value
            if isinstance(inner, Formula):
                out[cell_ref(i, j)] = inner.cached
    return out
