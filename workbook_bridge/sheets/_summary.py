"""The summary sheet: counts, the ten lowest margins, rules used, cautions and chart data."""

from __future__ import annotations

import datetime as _dt
import math
from dataclasses import dataclass

import numpy as np
from twistshare.engine.core import stress_profile, torque_twist_curve
from twistshare.engine.intake import RULE_FORMULAS, Display, Problem, Severity, governs_text

from .. import __version__
from ._cells import Styled, caution_rows
from ._cells import finite_or_none as _f
from ._results import READING_THE_RESULTS, criteria_checked, criterion_counts, lowest_margins
from ._sizing_sheet import sizing_summary_rows

__all__ = ["SummaryLayout", "summary_rows", "SUMMARY_SHEET", "SUMMARY_WIDTHS"]

SUMMARY_SHEET = "Twistshare summary"


@dataclass(frozen=True)
class SummaryLayout:
    """Zero-based rows of the blocks the charts refer to (first data row, last data row)."""

    margins: tuple[int, int] | None
    profile: tuple[int, int] | None
    profile_part: str | None
    curve: tuple[int, int] | None = None  # the chosen part's torque–twist curve
    # where each chart sits: (column, row) of its top left and of the cell it ends before, 1-based
    margins_chart: tuple[tuple[int, int], tuple[int, int]] | None = None
    profile_chart: tuple[tuple[int, int], tuple[int, int]] | None = None
    curve_chart: tuple[tuple[int, int], tuple[int, int]] | None = None
    page_break: int | None = None  # a printed page ends after this row (1-based)


def summary_rows(book, display: Display, profile_part: str | None = None) -> tuple[list[list], SummaryLayout]:
    """The summary's rows and where its chart blocks sit."""
    parts, r = book.parts, book.rating
    rows: list[list] = []
    tu, tf = display.unit("torque")
    su, sf = display.unit("stress")
    lu, lf = display.unit("length")
    rows.append([Styled("twistshare rating summary", "title")])
    rows.append(["Book", book.path.name])
    rows.append(["Rated on", _dt.date.today().isoformat()])
    rows.append(["Results in", f"{display.system}: {lu}, {su}, {tu}"])
    rows.append(["Rated by", f"twistshare {__version__}"])
    for label, spot in (("Parts table", book.parts_spot), ("Layers table", book.layers_spot),
                        ("Materials table", book.materials_spot)):
        if spot is not None and spot.data_rows:
            rows.append([label, f"sheet {spot.sheet!r}, header on row {spot.header_row + 1}, "
                                f"{len(spot.data_rows)} rows ({spot.data_rows[0] + 1} to {spot.data_rows[-1] + 1})"])
    rows.append([])
    rows.extend(caution_rows())
    rows.append([Styled("Reading the results", "title")])
    for line in READING_THE_RESULTS:
        rows.append([line])
    rows.append([])
    n = parts.count if parts else 0
    rated = int(book.rated.sum()) if book.rated is not None else 0
    failing = 0
    if r is not None and book.rated is not None:
        m = np.asarray(r.margin)[book.rated]
        failing = int((m < 0).sum())
    errors = sum(f.severity is Severity.ERROR for f in book.problems)
    warns = sum(f.severity is Severity.WARNING for f in book.problems)
    rows.append([Styled("Parts", "header"), Styled("Count", "header")])
    rows.append(["in the book", n])
    rows.append(["rated", rated])
    rows.append([Styled("failing (margin below 0)", "fail" if failing else "ok"), failing])
    rows.append(["not rated (input errors)", n - rated])
    rows.append(["errors / warnings found", f"{errors} / {warns} (see 'Twistshare warnings')"])
    rows.append([])
    rows.append([Styled("What governs", "header"), Styled("Parts", "header")])
    for text, count in criterion_counts(book):
        rows.append([text, count])
    rows.append([])
    rows.extend(sizing_summary_rows(book, display))
    checked = criteria_checked(book)
    if checked:
        rows.append([Styled("Checked beyond torsion", "header"), Styled("Parts", "header")])
        for text, count in checked:
            rows.append([Styled(text, "wrap"), Styled(count, "top")])  # a long text wraps
        rows.append([])
    margins_block = margins_chart = profile_chart = None
    page_break = None
    low = lowest_margins(book, 10)
    if low:
        rows.append([Styled("Ten lowest margins", "header"), Styled("Margin [%]", "header"),
                     Styled(f"Governing limit [{tu}]", "header"), Styled(f"Demand [{tu}]", "header"),
                     Styled("Governs", "header")])
        start = len(rows)
        for i in low:
            gl = int(r.governing_layer[i])
            mat = parts.materials[i][gl] if gl >= 0 else None
            mg = _f(r.margin[i] * 100)
            # Top-aligned: a long "governs" text wraps, and the row's numbers stay on its first line.
            rows.append([Styled(parts.ids[i], "top"),
                         Styled(mg, "fail+fixed1+top" if mg is not None and mg < 0 else "fixed1+top"),
                         Styled(_f(r.governing_capacity[i] / tf), "fixed1+top"),
                         Styled(_f(parts.torque[i] / tf), "fixed1+top"),
                         Styled(governs_text(r.governing_criterion[i], gl, mat), "wrap")])
        margins_block = (start, len(rows) - 1)
        rows.append([])
        # the chart of these margins below them, across the five columns
        margins_chart = ((1, len(rows) + 1), (6, len(rows) + 1 + _CHART_ROWS))
        rows.extend([] for _ in range(_CHART_ROWS + 1))
        page_break = len(rows)
    if book.materials is not None and book.materials.by_name:
        rows.append([Styled("Material", "header"), Styled("Allowable rule used", "header"),
                     Styled(f"Allowable shear [{su}]", "header")])
        for m in book.materials.by_name.values():
            rows.append([m.name, RULE_FORMULAS.get(m.rule, str(m.rule)),
                         Styled(_f(m.allowable_shear / sf), "fixed1") if m.problem is None else m.problem])
        rows.append([])
    profile_block = None
    chosen = None
    if r is not None and book.rated is not None and book.rated.any():
        ids = parts.ids
        wanted = [i for i, p in enumerate(ids) if profile_part and p.strip().lower() == profile_part.strip().lower()]
        if wanted and book.rated[wanted[0]]:
            chosen = wanted[0]
        elif low:
            chosen = low[0]
            if profile_part:
                why = "is not rated" if wanted else "is not in the parts table"
                book.problems.append(Problem(Severity.WARNING, None, None,
                                             f"--profile-part {profile_part!r} {why}: the stress across the "
                                             f"radius is charted for {ids[chosen]}, the lowest margin"))
    if chosen is not None:
        i = chosen
        radius, stress = stress_profile(
            parts.outer_diameter[i], parts.inner_diameter[i], parts.shear_modulus[i],
            float(r.twist_per_length[i]), points_per_layer=2, present=parts.present[i])
        rows.append([Styled(f"Shear stress across the radius of part {parts.ids[i]} at its demand torque "
                            "(the stress jumps at each interface; the strain does not)", "title")])
        rows.append([Styled(f"Radius [{lu}]", "header"), Styled(f"Shear stress [{su}]", "header"),
                     Styled(f"Allowable ÷ Kt [{su}]", "header")])
        start = len(rows)
        # the allowable each layer's nominal stress is held to (τa/Kt), two points per layer
        # like the profile itself, so the chart shows which layer comes closest
        present = np.flatnonzero(parts.present[i])
        limit = np.repeat(parts.allowable_shear[i, present] / parts.kt[i, present], 2)
        for rad, st, lim in zip(np.asarray(radius), np.asarray(stress), limit):
            rows.append([Styled(_f(rad / lf), "fixed3"), Styled(_f(st / sf), "fixed1"),
                         Styled(_f(lim / sf), "fixed1")])
        profile_block = (start, len(rows) - 1)
        # the chart beside its few rows of data, in the fourth and fifth columns
        profile_chart = ((4, start), (6, start + _CHART_ROWS))
        rows.extend([] for _ in range(start + _CHART_ROWS - len(rows)))
    curve_block = _curve_rows(book, chosen, rows, display) if chosen is not None else None
    curve_chart = None
    if curve_block is not None:
        first = curve_block[0]  # beside its data, in the third to fifth columns
        curve_chart = ((3, first), (6, max(first + _CHART_ROWS, curve_block[1] + 2)))
    return rows, SummaryLayout(margins_block, profile_block, parts.ids[chosen] if chosen is not None else None,
                               curve_block, margins_chart, profile_chart, curve_chart, page_break)


def _curve_rows(book, i: int, rows: list[list], display: Display) -> tuple[int, int] | None:
    """The torque–twist curve of part ``i`` (elastic–perfectly plastic), where it has one."""
    plastic, ty = getattr(book, "plastic", None), getattr(book, "shear_yield", None)
    if plastic is None or ty is None or not math.isfinite(float(plastic.fully_plastic_torque[i])):
        return None
    parts = book.parts
    tu, tf = display.unit("torque")
    pu, pf = display.unit("angle_per_length")
    twist, torque = torque_twist_curve(parts.outer_diameter[i:i + 1], parts.inner_diameter[i:i + 1],
                                       parts.shear_modulus[i:i + 1], ty[i:i + 1], parts.present[i:i + 1],
                                       n_points=25)
    rows.append([])
    rows.append([Styled(f"Torque against twist of part {parts.ids[i]}, elastic–perfectly plastic, to four times "
                        "the first-yield twist (the torque tends to the fully plastic torque)", "title")])
    rows.append([Styled(f"Twist per length [{pu}]", "header"), Styled(f"Torque [{tu}]", "header")])
    start = len(rows)
    for a, b in zip(np.asarray(twist[0]), np.asarray(torque[0])):
        rows.append([Styled(_f(a / pf), "fixed3"), Styled(_f(b / tf), "fixed1")])
    return start, len(rows) - 1



#: Widths of the summary's five columns (characters); the charts sit among them.
SUMMARY_WIDTHS = (30.0, 36.0, 15.0, 15.0, 34.0)
_CHART_ROWS = 18  # rows a chart takes
