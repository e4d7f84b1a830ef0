"""Native charts on added sheets: parts, references, cached values."""

from __future__ import annotations

import xml.etree.ElementTree as ET

import pytest
from twistshare.workbook_bridge.ooxml import BarChart, BookWriter, ScatterChart, SeriesData, WriteRefused, range_ref

C = "{http://schemas.openxmlformats.org/drawingml/2006/chart}"


def _stress_sheet(book):
    # Radius [mm] and shear stress [MPa] for an invented two-layer part; the jump at 20 mm is the interface.
    rows = [["Radius [mm]", "Shear stress [MPa]"], [0.0, 0.0], [20.0, 40.0], [20.0, 13.5], [26.0, 17.6]]
    return book.add_sheet("Twistshare summary", rows), rows


class TestCharts:
    """What a viewer without recalculation needs is in the chart part."""

    def test_scatter_and_bar(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_plain_book) as book:
            summary, rows = _stress_sheet(book)
            xs, ys = [r[0] for r in rows[1:]], [r[1] for r in rows[1:]]
            book.add_chart(summary, "D2", "L18", ScatterChart(
                "Shear stress across the radius, MPD-S-014", "Radius [mm]", "Shear stress [MPa]",
                [SeriesData("MPD-S-014", summary.range_ref(1, 2, 5), summary.range_ref(2, 2, 5), xs, ys)]))
            parts = book.add_sheet("Twistshare results", [["Part", "Capacity [N·m]", "Demand [N·m]"],
                                                          ["MPD-S-014", 520.0, 310.0], ["MPD-T-203", 80.0, 95.0]])
            cats = ["MPD-S-014", "MPD-T-203"]
            book.add_chart(summary, (4, 20), (12, 36), BarChart(
                "Capacity and demand by part", "Part", "Torque [N·m]",
                [SeriesData("Capacity", parts.range_ref(1, 2, 3), parts.range_ref(2, 2, 3), cats, [520.0, 80.0]),
                 SeriesData("Demand", parts.range_ref(1, 2, 3), parts.range_ref(3, 2, 3), cats, [310.0, 95.0])]))
            report = book.write(out)
        after = ooxml_kit.members(out)
        charts = sorted(n for n in report.added if n.startswith("xl/charts/"))
        assert len(charts) == 2
        scatter = ET.fromstring(after[charts[0]])
        refs = [f.text for f in scatter.iter(f"{C}f")]
        assert refs == ["'Twistshare summary'!$A$2:$A$5", "'Twistshare summary'!$B$2:$B$5"]
        cached = [float(v.text) for v in scatter.find(f".//{C}yVal").iter(f"{C}v")]
        assert cached == ys
        assert scatter.find(f".//{C}scatterChart") is not None
        bar = ET.fromstring(after[charts[1]])
        assert [s.find(f"{C}tx/{C}v").text for s in bar.iter(f"{C}ser")] == ["Capacity", "Demand"]
        assert [v.text for v in bar.find(f".//{C}cat").iter(f"{C}v")] == cats
        titles = ["".join(t.itertext()) for t in bar.iter(f"{C}title")]
        assert titles == ["Capacity and demand by part", "Part", "Torque [N·m]"]
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        assert len(book["Twistshare summary"]._charts) == 2  # openpyxl finds both charts on the sheet

    def test_series_checks(self):
        with pytest.raises(ValueError, match="spans 3 cells but 2 values"):
            SeriesData("s", range_ref("S", 1, 2, 4), range_ref("S", 2, 2, 4), [1, 2], [1, 2])
        with pytest.raises(ValueError, match="2 x values but 1 y values"):
            SeriesData("s", range_ref("S", 1, 2, 3), range_ref("S", 2, 2, 2), [1, 2], [1])
        with pytest.raises(ValueError, match="x_ref must look like"):
            SeriesData("s", "A1:A3", range_ref("S", 2, 2, 4), [1, 2, 3], [1, 2, 3])
        with pytest.raises(ValueError, match="needs at least one series"):
            ScatterChart("t", "x", "y", [])

    def test_charts_only_on_added_sheets(self, ooxml_plain_book):
        with BookWriter(ooxml_plain_book) as book:
            summary, _ = _stress_sheet(book)
            series = [SeriesData("s", summary.range_ref(1, 2, 3), summary.range_ref(2, 2, 3), [0, 1], [0, 1])]
            with pytest.raises(WriteRefused, match="not one"):
                book.add_chart("Parts", "A1", "D9", ScatterChart("t", "x", "y", series))
            bad = [SeriesData("s", range_ref("Ghost", 1, 2, 3), summary.range_ref(2, 2, 3), [0, 1], [0, 1])]
            with pytest.raises(WriteRefused, match="no sheet 'Ghost'"):
                book.add_chart(summary, "A1", "D9", ScatterChart("t", "x", "y", bad))
            with pytest.raises(ValueError, match="below and right"):
                book.add_chart(summary, "D9", "A1", ScatterChart("t", "x", "y", series))
