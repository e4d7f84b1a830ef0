"""The results sheet: one row per part, built column by column from the engine's arrays.

Rows are plain lists of values; a value may be a ``Styled(value, style)`` to pick one of the
writer's named styles. Units sit in the headers, in the results' unit system.
"""

from __future__ import annotations

import itertools
from collections.abc import Iterable
from dataclasses import dataclass

import numpy as np
from twistshare.engine.core import Criterion
from twistshare.engine.intake import CRITERION_NOUNS, Display, governs_text
from twistshare.engine.intake._words import LOAD_PATH_WORDS
from twistshare.engine.units import si_factor

from ..ooxml import PrintSetup, column_points
from ..ooxml._print_setup import PRINTABLE_WIDTH_PT
from ._cells import Styled
from ._layout import banded_setup, column_width, header_height, number_chars, number_style, row_heights, text_chars

__all__ = ["READING_THE_RESULTS", "ResultsLayout", "layers_used", "results_rows", "lowest_margins", "criterion_counts", "criteria_checked",
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


@dataclass(frozen=True)
class ResultsLayout:
    """The results sheet as the writer takes it, sized for print.

    Attributes
    ----------
    rows : iterable of rows
        Header first, then one row per part.
    widths, styles : list
        Per column: width in characters, style name (a number format, top-aligned or wrapped text).
    header_height : float
        Points: room for the most wrapped header.
    row_heights : dict of int to float
        Rows (1-based) whose wrapped text needs more than one line.
    print_setup : PrintSetup
        Landscape, in column bands (the part's own columns, then the layers, then the rest), part id
        and status repeated on every page.
    """

    rows: Iterable
    widths: list[float]
    styles: list[str | None]
    header_height: float
    row_heights: dict[int, float]
    print_setup: PrintSetup


# Columns holding text that may be long: wrapped in their width, the row made taller.
_WRAP_AT = {"Governs": 44.0, "First problem": 60.0}


def layers_used(parts) -> int:
    """Layer groups the book's parts use (the outermost layer any part has); at least 1."""
    used = np.flatnonzero(np.asarray(parts.present, bool).any(axis=0))
    return int(used.max()) + 1 if used.size else 1


def results_rows(book, display: Display, first_error: dict[str, str]) -> ResultsLayout:
    """Header and one row per part, sized for print (see `ResultsLayout`).

    Built column by column from the engine's arrays (a 50 000-part book is 2 million cells); the
    number format of each column shows about four significant digits of its largest value.
    """
    parts, r = book.parts, book.rating
    P = parts.outer_diameter.shape[0]
    L = layers_used(parts)
    tu, tf = display.unit("torque")
    su, sf = display.unit("stress")
    lu, lf = display.unit("length")
    au, af = display.unit("angle")
    pu, pf = display.unit("angle_per_length")
    if display.system == "SI":
        gj_unit, gj_f = "N·m²", 1.0
    else:
        gj_unit, gj_f = "lbf·in²", si_factor("lbf·in", "torque") * si_factor("in", "length")
    rated = np.zeros(P, bool) if book.rated is None else np.asarray(book.rated, bool)
    nan = np.full(P, np.nan)
    nanl = np.full((P, L), np.nan)

    def get(name: str, shape=nan) -> np.ndarray:
        if r is None:
            return shape
        value = np.asarray(getattr(r, name), dtype=float)
        return value[:, :L] if value.ndim == 2 else value

    header: list[str] = []
    cols: list[list] = []
    styles: list[str | None] = []
    chars: list[int] = []
    bands: list[int] = []  # a page break after these columns

    def number(head: str, x: np.ndarray, keep: np.ndarray, *, style: str | None = None, flag=None) -> None:
        shown = np.where(keep, x, np.nan)
        st = style or number_style(shown)
        values = shown.tolist()
        if flag is not None:
            values = [Styled(v, f"fail+{st}+top") if f else v for v, f in zip(values, flag.tolist())]
        header.append(head)
        cols.append(values)
        styles.append(st + "+top")  # tall rows (a wrapped problem) read from the top
        chars.append(number_chars(shown, st))

    def text(head: str, values: list) -> None:
        header.append(head)
        cols.append(values)
        style = "wrap" if head in _WRAP_AT else "top"
        after_number = bool(styles) and styles[-1] is not None and styles[-1].startswith(("fixed", "sci"))
        styles.append(style + "+indent" if after_number else style)  # kept off the number on its left
        chars.append(text_chars(values) + (2 if after_number else 0))

    margin = get("margin") * 100
    fails = rated & (margin < 0)
    status = [Styled("FAILS", "fail+top") if f else ("ok" if k else Styled("not rated", "warn+top"))
              for f, k in zip(fails.tolist(), rated.tolist())]
    crit = np.zeros(P, int) if r is None else np.asarray(r.governing_criterion, int)
    glayer = np.full(P, -1) if r is None else np.asarray(r.governing_layer, int)
    governs = [
        governs_text(c, g, parts.materials[i][g] if 0 <= g < len(parts.materials[i]) else None) if k else None
        for i, (c, g, k) in enumerate(zip(crit.tolist(), glayer.tolist(), rated.tolist()))
    ]
    text("Part", list(parts.ids))
    text("Status", status)
    number("Layers", parts.present.sum(axis=1).astype(float), np.ones(P, bool), style="fixed0")
    number(f"Demand torque [{tu}]", parts.torque / tf, rated)
    text("Demand from", list(parts.duty_source))
    number(f"Governing limit [{tu}]", get("governing_capacity") / tf, rated)
    text("Governs", governs)
    number("Margin [%]", margin, rated, style="fixed1", flag=fails)
    number("Reserve factor (limit / demand)", get("reserve_factor"), rated)
    number(f"ΣGJ [{gj_unit}]", get("sum_gj") / gj_f, rated)
    number(f"Twist per length [{pu}]", get("twist_per_length") / pf, rated)
    number(f"Twist angle [{au}]", get("twist_angle") / af, rated)
    number(f"Twist-limit capacity [{tu}]", get("twist_capacity") / tf, rated)
    bands.append(len(header))
    share = get("share", nanl) * 100
    ltq = get("layer_torque", nanl) / tf
    so = get("stress_outer", nanl) / sf
    si = get("stress_inner", nanl) / sf
    lcap = get("capacity", nanl) / tf
    util = get("utilisation", nanl) * 100
    present = np.asarray(parts.present, bool)
    for j in range(L):
        n = j + 1
        keep = rated & present[:, j]
        text(f"L{n} material", [m[j] if k and j < len(m) else None for m, k in zip(parts.materials, present[:, j].tolist())])
        number(f"L{n} outer diameter [{lu}]", parts.outer_diameter[:, j] / lf, keep)
        number(f"L{n} inner diameter [{lu}]", parts.inner_diameter[:, j] / lf, keep)
        number(f"L{n} share [%]", share[:, j], keep, style="fixed1")
        number(f"L{n} torque [{tu}]", ltq[:, j], keep)
        number(f"L{n} nominal stress at outer [{su}]", so[:, j], keep)
        number(f"L{n} nominal stress at inner [{su}]", si[:, j], keep)
        number(f"L{n} capacity (section torque) [{tu}]", lcap[:, j], keep)
        number(f"L{n} utilisation with Kt [%]", util[:, j], keep, style="fixed1", flag=keep & (util[:, j] > 100))
        bands.append(len(header))
    # Every criterion beyond torsion that some part was rated against: one capacity column each
    # (the smallest over the layers for a criterion per layer), in the words of what governs.
    further = [] if r is None else [
        (c, values) for c, values in r.criterion_capacity.items()
        if c not in _NO_CAPACITY_COLUMN and np.isfinite(np.asarray(values, dtype=float)).any()]
    for c, values in further:
        values = np.asarray(values, dtype=float)
        with np.errstate(all="ignore"):
            per_part = np.nanmin(np.where(np.isnan(values), np.inf, values), axis=1) if values.ndim == 2 else values
        number(f"Capacity: {CRITERION_NOUNS[c]} [{tu}]", np.where(np.isinf(per_part), np.nan, per_part) / tf, rated)
    whirl = getattr(book, "whirl", None)
    if whirl is not None and np.isfinite(np.asarray(whirl.speed_ratio, dtype=float)).any():
        checked = rated & np.isfinite(np.asarray(whirl.speed_ratio, dtype=float))
        number("First critical speed [rpm]", np.asarray(whirl.critical_speed, dtype=float) * 30.0 / np.pi, checked)
        number("Whirl ratio (speed / first critical)", np.asarray(whirl.speed_ratio, dtype=float), checked)
    load_path = parts.inputs.get("load_path")
    if load_path is not None:
        text("Load path", [LOAD_PATH_WORDS.get(int(x)) if k and x == x else None
                           for x, k in zip(np.asarray(load_path).tolist(), rated.tolist())])
    plastic = getattr(book, "plastic", None)
    if plastic is not None:
        number(f"First-yield torque [{tu}]", np.asarray(plastic.first_yield_torque, dtype=float) / tf, rated)
        number(f"Fully plastic torque [{tu}]", np.asarray(plastic.fully_plastic_torque, dtype=float) / tf, rated)
        number("Plastic reserve (fully plastic / first yield)", np.asarray(plastic.reserve_ratio, dtype=float), rated)
    text("First problem", [None if k else first_error.get(pid, "see the warnings sheet")
                           for pid, k in zip(parts.ids, rated.tolist())])
    widths = [column_width(h, c, lines=5, maximum=_WRAP_AT.get(h, 40.0)) for h, c in zip(header, chars)]
    wrap = [i for i, h in enumerate(header) if h in _WRAP_AT]
    heights = row_heights(list(zip(*(cols[i] for i in wrap))), [widths[i] for i in wrap], range(len(wrap)),
                          first_row=2) if wrap else {}
    head_pt = header_height(header, widths)
    height = head_pt + sum(heights.values()) + 15.0 * (P - len(heights))
    setup = banded_setup(widths, _merged_bands(widths, bands, 2), title_columns=2, title_rows=(1, 1), height_pt=height)
    rows = itertools.chain([[Styled(h, "header") for h in header]], zip(*cols))
    return ResultsLayout(rows, widths, styles, head_pt, heights, setup)


def _merged_bands(widths: list[float], bands: list[int], titles: int, smallest: int = 60) -> list[int]:
    """The column groups joined while two together still print at `smallest` per cent or more."""
    room = PRINTABLE_WIDTH_PT["landscape"] * 100 / smallest / 1.04 - sum(column_points(w) for w in widths[:titles])
    edges = [titles] + [b for b in bands if titles < b < len(widths)] + [len(widths)]
    kept, start = [], edges[0]
    for k in range(1, len(edges) - 1):
        if sum(column_points(w) for w in widths[start:edges[k + 1]]) > room:
            kept.append(edges[k])
            start = edges[k]
    return kept


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
