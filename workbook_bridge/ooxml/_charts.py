"""Native workbook charts (DrawingML): what the caller describes, and its XML.

Each series refers to cell ranges on one of our added sheets and carries cached values, so
viewers that do not recalculate still draw it.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Sequence

from ._xmltext import NS_REL, XML_DECL, column_letters, escape_text, split_ref

__all__ = ["SeriesData", "ScatterChart", "BarChart", "range_ref", "chart_xml", "drawing_xml", "Anchor",
           "anchor_cell"]

NS_C = "http://schemas.openxmlformats.org/drawingml/2006/chart"
NS_A = "http://schemas.openxmlformats.org/drawingml/2006/main"
NS_XDR = "http://schemas.openxmlformats.org/drawingml/2006/spreadsheetDrawing"
# Our own series palette (deep blue, rust, moss, violet, ochre, teal).
_PALETTE = ("2E5E7E", "C0502E", "5B8C3A", "8A5FA8", "D9A02B", "3A9C9C")
_REF = re.compile(r"^(?:'(?:[^']|'')+'|[^'!:\[\]*?/\\]+)!\$?[A-Z]{1,3}\$?\d+(?::\$?[A-Z]{1,3}\$?\d+)?$")

Anchor = tuple[int, int]


def range_ref(sheet_name: str, column: int, first_row: int, last_row: int | None = None) -> str:
    """Absolute reference to a one-column range, e.g. "'Twistshare summary'!$B$2:$B$20".

    Parameters
    ----------
    column, first_row, last_row : int
        1-based; ``last_row`` defaults to ``first_row``.
    """
    last_row = first_row if last_row is None else last_row
    quoted = "'" + sheet_name.replace("'", "''") + "'"
    letters = column_letters(column)
    if last_row == first_row:
        return f"{quoted}!${letters}${first_row}"
    return f"{quoted}!${letters}${first_row}:${letters}${last_row}"


def _cells_in(ref: str) -> int:
    area = ref.rsplit("!", 1)[1].replace("$", "")
    ends = area.split(":")
    (c1, r1), (c2, r2) = split_ref(ends[0]), split_ref(ends[-1])
    return (abs(c2 - c1) + 1) * (abs(r2 - r1) + 1)


@dataclass(frozen=True)
class SeriesData:
    """One series: cell ranges on our sheet plus the values they hold (for the cache).

    Attributes
    ----------
    x_ref, y_ref : str
        Range references such as ``range_ref(...)`` returns. For a bar chart ``x_ref`` holds
        the category labels.
    x_values : sequence of float (scatter) or of str (bar categories)
    y_values : sequence of float
        NaN values are left out of the cache (a gap).
    """

    name: str
    x_ref: str
    y_ref: str
    x_values: tuple
    y_values: tuple

    def __post_init__(self) -> None:
        object.__setattr__(self, "x_values", tuple(self.x_values))
        object.__setattr__(self, "y_values", tuple(float(v) for v in self.y_values))
        for label, ref in (("x_ref", self.x_ref), ("y_ref", self.y_ref)):
            if not _REF.match(ref):
                raise ValueError(f"series {self.name!r}: {label} must look like \"'Sheet'!$A$2:$A$9\": {ref!r}")
        if len(self.x_values) != len(self.y_values):
            raise ValueError(f"series {self.name!r}: {len(self.x_values)} x values but {len(self.y_values)} y values")
        if _cells_in(self.y_ref) != len(self.y_values):
            raise ValueError(f"series {self.name!r}: y_ref {self.y_ref} spans {_cells_in(self.y_ref)} cells "
                             f"but {len(self.y_values)} values were given")


def _check_chart(kind: str, title: str, series: Sequence[SeriesData]) -> tuple[SeriesData, ...]:
    series = tuple(series)
    if not series:
        raise ValueError(f"{kind} {title!r} needs at least one series")
    return series


@dataclass(frozen=True)
class ScatterChart:
    """Lines through (x, y) points, e.g. shear stress against radius.

    Attributes
    ----------
    markers : bool
        Draw a marker at each point as well as the line.
    """

    title: str
    x_title: str
    y_title: str
    series: tuple[SeriesData, ...]
    markers: bool = False

    def __post_init__(self) -> None:
        object.__setattr__(self, "series", _check_chart("scatter chart", self.title, self.series))


@dataclass(frozen=True)
class BarChart:
    """Clustered bars by category, e.g. capacity and demand by part.

    Attributes
    ----------
    horizontal : bool
        Bars run left to right (long part names read better that way).
    """

    title: str
    x_title: str
    y_title: str
    series: tuple[SeriesData, ...]
    horizontal: bool = False

    def __post_init__(self) -> None:
        object.__setattr__(self, "series", _check_chart("bar chart", self.title, self.series))


def _rich(text: str, size: int) -> str:
    return (f'<c:tx><c:rich><a:bodyPr/><a:lstStyle/><a:p><a:pPr><a:defRPr sz="{size}" b="1"/></a:pPr>'
            f'<a:r><a:rPr lang="en-GB" sz="{size}" b="1"/><a:t>{escape_text(text)}</a:t></a:r></a:p></c:rich></c:tx>')


def _title(text: str, size: int = 1300) -> str:
    return f'<c:title>{_rich(text, size)}<c:overlay val="0"/></c:title>' if text else ""


def _num_ref(ref: str, values: Sequence[float]) -> str:
    points = "".join(f'<c:pt idx="{i}"><c:v>{v!r}</c:v></c:pt>'
                     for i, v in enumerate(values) if math.isfinite(v))
    return (f"<c:numRef><c:f>{escape_text(ref)}</c:f><c:numCache><c:formatCode>General</c:formatCode>"
            f'<c:ptCount val="{len(values)}"/>{points}</c:numCache></c:numRef>')


def _str_ref(ref: str, values: Sequence) -> str:
    points = "".join(f'<c:pt idx="{i}"><c:v>{escape_text(str(v))}</c:v></c:pt>'
                     for i, v in enumerate(values) if v is not None)
    return (f'<c:strRef><c:f>{escape_text(ref)}</c:f><c:strCache><c:ptCount val="{len(values)}"/>'
            f"{points}</c:strCache></c:strRef>")


def _line(color: str, width_emu: int = 28575) -> str:
    return (f'<c:spPr><a:ln w="{width_emu}" cap="rnd"><a:solidFill><a:srgbClr val="{color}"/></a:solidFill>'
            '<a:round/></a:ln></c:spPr>')


def _axis(kind: str, ax_id: int, cross_id: int, pos: str, title: str, extra: str = "") -> str:
    grid = "<c:majorGridlines/>" if pos in ("l", "b") and kind == "valAx" and pos == "l" else ""
    return (f'<c:{kind}><c:axId val="{ax_id}"/><c:scaling><c:orientation val="minMax"/></c:scaling>'
            f'<c:delete val="0"/><c:axPos val="{pos}"/>{grid}{_title(title, 1000)}'
            + ('<c:numFmt formatCode="General" sourceLinked="1"/>' if kind == "valAx" else "")
            + '<c:majorTickMark val="out"/><c:minorTickMark val="none"/><c:tickLblPos val="nextTo"/>'
            f'<c:crossAx val="{cross_id}"/><c:crosses val="autoZero"/>{extra}</c:{kind}>')


def chart_xml(chart: ScatterChart | BarChart) -> str:
    """The chart part (c:chartSpace) for a chart description."""
    series = []
    for i, s in enumerate(chart.series):
        color = _PALETTE[i % len(_PALETTE)]
        head = f'<c:ser><c:idx val="{i}"/><c:order val="{i}"/><c:tx><c:v>{escape_text(s.name)}</c:v></c:tx>'
        if isinstance(chart, ScatterChart):
            marker = ('<c:marker><c:symbol val="circle"/><c:size val="5"/></c:marker>' if chart.markers
                      else '<c:marker><c:symbol val="none"/></c:marker>')
            xs = tuple(float(v) for v in s.x_values)
            series.append(f"{head}{_line(color)}{marker}<c:xVal>{_num_ref(s.x_ref, xs)}</c:xVal>"
                          f'<c:yVal>{_num_ref(s.y_ref, s.y_values)}</c:yVal><c:smooth val="0"/></c:ser>')
        else:
            fill = f'<c:spPr><a:solidFill><a:srgbClr val="{color}"/></a:solidFill></c:spPr>'
            series.append(f'{head}{fill}<c:invertIfNegative val="0"/><c:cat>{_str_ref(s.x_ref, s.x_values)}</c:cat>'
                          f"<c:val>{_num_ref(s.y_ref, s.y_values)}</c:val></c:ser>")
    body = "".join(series)
    if isinstance(chart, ScatterChart):
        plot = (f'<c:scatterChart><c:scatterStyle val="lineMarker"/><c:varyColors val="0"/>{body}'
                '<c:axId val="5001"/><c:axId val="5002"/></c:scatterChart>'
                + _axis("valAx", 5001, 5002, "b", chart.x_title, '<c:crossBetween val="midCat"/>')
                + _axis("valAx", 5002, 5001, "l", chart.y_title, '<c:crossBetween val="midCat"/>'))
    else:
        bar_dir = "bar" if chart.horizontal else "col"
        plot = (f'<c:barChart><c:barDir val="{bar_dir}"/><c:grouping val="clustered"/><c:varyColors val="0"/>'
                f'{body}<c:gapWidth val="80"/><c:axId val="5001"/><c:axId val="5002"/></c:barChart>'
                + _axis("catAx", 5001, 5002, "l" if chart.horizontal else "b", chart.x_title,
                        '<c:auto val="1"/><c:lblAlgn val="ctr"/><c:lblOffset val="100"/><c:noMultiLvlLbl val="0"/>')
                + _axis("valAx", 5002, 5001, "b" if chart.horizontal else "l", chart.y_title,
                        '<c:crossBetween val="between"/>'))
    return (f'{XML_DECL}<c:chartSpace xmlns:c="{NS_C}" xmlns:a="{NS_A}" xmlns:r="{NS_REL}">'
            f'<c:roundedCorners val="0"/><c:chart>{_title(chart.title)}<c:autoTitleDeleted val="0"/>'
            f"<c:plotArea><c:layout/>{plot}</c:plotArea>"
            '<c:legend><c:legendPos val="b"/><c:overlay val="0"/></c:legend>'
            '<c:plotVisOnly val="1"/><c:dispBlanksAs val="gap"/></c:chart></c:chartSpace>')


def anchor_cell(anchor: Anchor | str) -> tuple[int, int]:
    """(column, row), 1-based, from a (column, row) pair or an A1 reference."""
    if isinstance(anchor, str):
        return split_ref(anchor)
    col, row = anchor
    if not (isinstance(col, int) and isinstance(row, int) and col >= 1 and row >= 1):
        raise ValueError(f"chart anchor must be 1-based (column, row) or 'B3': {anchor!r}")
    return col, row


def drawing_xml(frames: Sequence[tuple[tuple[int, int], tuple[int, int], str, str]]) -> str:
    """A drawing part holding one chart frame per (from, to, chart rel id, name)."""
    anchors = []
    for k, ((c1, r1), (c2, r2), rel_id, name) in enumerate(frames, start=2):
        anchors.append(
            '<xdr:twoCellAnchor editAs="oneCell">'
            f"<xdr:from><xdr:col>{c1 - 1}</xdr:col><xdr:colOff>0</xdr:colOff><xdr:row>{r1 - 1}</xdr:row><xdr:rowOff>0</xdr:rowOff></xdr:from>"
            f"<xdr:to><xdr:col>{c2 - 1}</xdr:col><xdr:colOff>0</xdr:colOff><xdr:row>{r2 - 1}</xdr:row><xdr:rowOff>0</xdr:rowOff></xdr:to>"
            f'<xdr:graphicFrame macro=""><xdr:nvGraphicFramePr><xdr:cNvPr id="{k}" name="{escape_text(name)}"/>'
            "<xdr:cNvGraphicFramePr/></xdr:nvGraphicFramePr>"
            '<xdr:xfrm><a:off x="0" y="0"/><a:ext cx="0" cy="0"/></xdr:xfrm>'
            f'<a:graphic><a:graphicData uri="{NS_C}"><c:chart xmlns:c="{NS_C}" xmlns:r="{NS_REL}" r:id="{rel_id}"/>'
            "</a:graphicData></a:graphic></xdr:graphicFrame><xdr:clientData/></xdr:twoCellAnchor>")
    return f'{XML_DECL}<xdr:wsDr xmlns:xdr="{NS_XDR}" xmlns:a="{NS_A}">{"".join(anchors)}</xdr:wsDr>'
