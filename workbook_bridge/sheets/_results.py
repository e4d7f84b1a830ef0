"""The results sheet: one row per part, built column by column from the engine's arrays.

Rows are plain lists of values; a value may be a ``Styled(value, style)`` to pick one of the
writer's named styles. Units sit in the headers, in the results' unit system.
"""

from __future__ import annotations

import itertools

import numpy as np
from twistshare.engine.core import Criterion
from twistshare.engine.intake import CRITERION_NOUNS, Display, governs_text
from twistshare.engine.intake._words import LOAD_PATH_WORDS
from twistshare.engine.units import si_factor

from ._cells import Styled

__all__ = ["READING_THE_RESULTS", "results_rows", "lowest_margins", "criterion_counts", "criteria_checked",
           "RESULTS_SHEET"]

RESULTS_SHEET = "Twistshare results"

# The three torsion criteria have columns of their own above; any other gets a capacity column.
_TORSION = frozenset({Criterion.LAYER_STRESS, Criterion.TWIST_ANGLE, Criterion.TWIST_PER_LENGTH})
# Whirl is a gate (0 or +inf), shown by its first critical speed and speed ratio instead.
_NO_CAPACITY_COLUMN = _TORSION | {Criterion.WHIRL}

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
        "Governs", "Margin [%]", "Reserve factor (limit / demand)", f"ΣGJ [{gj_unit}]", f"Twist per length [{pu}]",
        f"Twist angle [{au}]", f"Twist-limit capacity [{tu}]",
    ]
    for n in range(1, L + 1):
        header += [
            f"L{n} material", f"L{n} outer diameter [{lu}]", f"L{n} inner diameter [{lu}]", f"L{n} share [%]",
            f"L{n} torque [{tu}]", f"L{n} nominal stress at outer [{su}]", f"L{n} nominal stress at inner [{su}]",
            f"L{n} capacity (section torque) [{tu}]", f"L{n} utilisation with Kt [%]",
        ]
    # Every criterion beyond torsion that some part was rated against: one capacity column each
    # (the smallest over the layers for a criterion per layer), in the words of what governs.
    further = [] if r is None else [
        (c, values) for c, values in r.criterion_capacity.items()
        if c not in _NO_CAPACITY_COLUMN and np.isfinite(np.asarray(values, dtype=float)).any()]
    header += [f"Capacity: {CRITERION_NOUNS[c]} [{tu}]" for c, _ in further]
    whirl = getattr(book, "whirl", None)
    if whirl is not None and not np.isfinite(np.asarray(whirl.speed_ratio, dtype=float)).any():
        whirl = None
    if whirl is not None:
        header += ["First critical speed [rpm]", "Whirl ratio (speed / first critical)"]
    load_path = parts.inputs.get("load_path")
    if load_path is not None:
        header.append("Load path")
    plastic = getattr(book, "plastic", None)
    if plastic is not None:
        header += [f"First-yield torque [{tu}]", f"Fully plastic torque [{tu}]",
                   "Plastic reserve (fully plastic / first yield)"]
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
        _column(get("reserve_factor"), rated), _column(get("sum_gj") / gj_f, rated),
        _column(get("twist_per_length") / pf, rated), _column(get("twist_angle") / af, rated),
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
    for _, values in further:
        values = np.asarray(values, dtype=float)
        with np.errstate(all="ignore"):
            per_part = np.nanmin(np.where(np.isnan(values), np.inf, values), axis=1) if values.ndim == 2 else values
        cols.append(_column(np.where(np.isinf(per_part), np.nan, per_part) / tf, rated))
    if whirl is not None:
        checked = rated & np.isfinite(np.asarray(whirl.speed_ratio, dtype=float))
        cols.append(_column(np.asarray(whirl.critical_speed, dtype=float) * 30.0 / np.pi, checked))
        cols.append(_column(np.asarray(whirl.speed_ratio, dtype=float), checked))
    n_whirl = 0 if whirl is None else 2
    if load_path is not None:
        cols.append([LOAD_PATH_WORDS.get(int(x)) if k and x == x else None
                     for x, k in zip(np.asarray(load_path).tolist(), rated.tolist())])
    if plastic is not None:
        cols += [_column(np.asarray(plastic.first_yield_torque) / tf, rated),
                 _column(np.asarray(plastic.fully_plastic_torque) / tf, rated),
                 _column(np.asarray(plastic.reserve_ratio), rated)]
    cols.append(errors)
    rows = itertools.chain([[Styled(h, "header") for h in header]], zip(*cols))
    widths = [14, 10, 7, 14, 11, 14, 28, 10, 10, 14, 12, 12, 14] + [13] * (9 * L) + [14] * (len(further) + n_whirl) \
        + ([22] if load_path is not None else []) + ([14] * 3 if plastic is not None else []) + [60]
    styles = [None, None, None, "fixed1", None, "fixed1", None, "fixed1", "fixed3", "sci", "fixed3", "fixed3",
              "fixed1"] + [None, "fixed3", "fixed3", "fixed1", "fixed1", "fixed1", "fixed1", "fixed1", "fixed1"] * L \
        + ["fixed1"] * len(further) + ["fixed1", "fixed3"][:n_whirl] + ([None] if load_path is not None else []) \
        + (["fixed1", "fixed1", "fixed3"] if plastic is not None else [])
    return rows, widths, styles


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
    """(what governs, number of rated parts) for every criterion that governs some part."""
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
            out.append((CRITERION_NOUNS[c], n))
    return out


def criteria_checked(book) -> list[tuple[str, int]]:
    """(criterion, number of rated parts checked against it) for each criterion beyond torsion.

    A part is checked where the criterion gave it a finite capacity; for the whirl gate, where
    a speed and every layer's E and density were known.
    """
    r = book.rating
    if r is None or book.rated is None:
        return []
    rated = np.asarray(book.rated, bool)
    out = []
    for c, values in r.criterion_capacity.items():
        if c in _TORSION:
            continue
        if c == Criterion.WHIRL:
            whirl = getattr(book, "whirl", None)
            if whirl is None:
                continue
            checked = np.isfinite(np.asarray(whirl.speed_ratio, dtype=float)) & np.asarray(whirl.valid, bool)
        else:
            values = np.asarray(values, dtype=float)
            finite = np.isfinite(values)
            checked = finite.any(axis=1) if values.ndim == 2 else finite
        n = int((checked & rated).sum())
        if n:
            out.append((CRITERION_NOUNS[c], n))
    return out
