"""The summary's native charts: governing limit against demand, and stress across the radius."""

from __future__ import annotations

from twistshare.engine.intake import Display

from ..ooxml import BarChart, BookWriter, Cell, ScatterChart, SeriesData

__all__ = ["add_charts"]


def _col_values(rows: list[list], first: int, last: int, col: int) -> list:
    out = []
    for r in range(first, last + 1):
        v = rows[r][col] if col < len(rows[r]) else None
        out.append(v.value if isinstance(v, Cell) else v)
    return out


def add_charts(writer: BookWriter, summ, srows: list[list], layout, display: Display) -> None:
    """The charts, where the summary's layout puts them (`SummaryLayout`): below or beside the blocks they draw."""
    tu, _ = display.unit("torque")
    su, _ = display.unit("stress")
    lu, _ = display.unit("length")
    if layout.margins is not None:
        a, b = layout.margins
        names = [str(x) for x in _col_values(srows, a, b, 0)]
        cap = [float("nan") if v is None else v for v in _col_values(srows, a, b, 2)]
        dem = [float("nan") if v is None else v for v in _col_values(srows, a, b, 3)]
        chart = BarChart(
            title="Governing limit against demand: the ten lowest margins",
            x_title="Part", y_title=f"Torque [{tu}]", horizontal=True,
            series=(SeriesData("Governing limit", summ.range_ref(1, a + 1, b + 1), summ.range_ref(3, a + 1, b + 1),
                               names, cap),
                    SeriesData("Demand", summ.range_ref(1, a + 1, b + 1), summ.range_ref(4, a + 1, b + 1), names, dem)),
        )
        writer.add_chart(summ, *layout.margins_chart, chart)
    if layout.profile is not None:
        a, b = layout.profile
        xs = [float("nan") if v is None else v for v in _col_values(srows, a, b, 0)]
        ys = [float("nan") if v is None else v for v in _col_values(srows, a, b, 1)]
        lims = [float("nan") if v is None else v for v in _col_values(srows, a, b, 2)]
        chart = ScatterChart(
            title=f"Shear stress across the radius, part {layout.profile_part}",
            x_title=f"Radius [{lu}]", y_title=f"Shear stress [{su}]",
            series=(SeriesData("Nominal shear stress", summ.range_ref(1, a + 1, b + 1),
                               summ.range_ref(2, a + 1, b + 1), xs, ys),
                    SeriesData("Allowable ÷ Kt", summ.range_ref(1, a + 1, b + 1),
                               summ.range_ref(3, a + 1, b + 1), xs, lims)),
        )
        writer.add_chart(summ, *layout.profile_chart, chart)
    if getattr(layout, "curve", None) is not None:
        a, b = layout.curve
        pu, _ = display.unit("angle_per_length")
        xs = [float("nan") if v is None else v for v in _col_values(srows, a, b, 0)]
        ys = [float("nan") if v is None else v for v in _col_values(srows, a, b, 1)]
        chart = ScatterChart(
            title=f"Torque against twist, part {layout.profile_part} (elastic–perfectly plastic)",
            x_title=f"Twist per length [{pu}]", y_title=f"Torque [{tu}]",
            series=(SeriesData("Torque", summ.range_ref(1, a + 1, b + 1), summ.range_ref(2, a + 1, b + 1),
                               xs, ys),),
        )
        writer.add_chart(summ, *layout.curve_chart, chart)
