"""The few cell styles the writer uses, appended to the book's own styles part.

Existing fonts, fills, borders, number formats and cell formats keep their positions (the
user's cells refer to them by index); ours are appended and their new indexes handed out.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace
from types import MappingProxyType

from ._xmltext import NS_MAIN, XML_DECL, escape_attr, find_element_span, root_prefix

__all__ = ["STYLE_NAMES", "StyleSpec", "StyleBook", "MINIMAL_STYLES"]


@dataclass(frozen=True)
class StyleSpec:
    """One cell look; None fields inherit the book's defaults."""

    bold: bool | None = None
    italic: bool | None = None
    size: float | None = None
    color: str | None = None          # ARGB hex, e.g. "FF1F3A4D"
    fill: str | None = None           # solid fill ARGB
    border: str | None = None         # None, "bottom" or "box"
    border_color: str | None = None
    number_format: str | None = None
    wrap: bool | None = None
    vertical: str | None = None       # "top", "center"
    indent: int | None = None         # left indent in steps (keeps a text off the number beside it)

    def merged(self, other: "StyleSpec") -> "StyleSpec":
        """This spec with every field ``other`` sets taken from ``other``."""
        changes = {k: v for k, v in other.__dict__.items() if v is not None}
        return replace(self, **changes)


# Our own palette: a deep blue-green header, brick for failing parts, amber for warnings,
# sand for the caution block, sage for values the library filled in.
_CATALOG = MappingProxyType({
    "header": StyleSpec(bold=True, color="FFFFFFFF", fill="FF1F3A4D", border="bottom",
                        border_color="FF0F1F2A", wrap=True, vertical="center"),
    "title": StyleSpec(bold=True, size=14, color="FF1F3A4D"),
    "fail": StyleSpec(bold=True, color="FF9C1C12", fill="FFF6D3CF"),
    "warn": StyleSpec(color="FF7A4E00", fill="FFFCEBC4"),
    "number": StyleSpec(number_format="0.000"),
    "wrap": StyleSpec(wrap=True, vertical="top"),
    "top": StyleSpec(vertical="top"),
    "indent": StyleSpec(indent=1),
    "fixed0": StyleSpec(number_format="0"),
    "fixed1": StyleSpec(number_format="0.0"),
    "fixed2": StyleSpec(number_format="0.00"),
    "fixed3": StyleSpec(number_format="0.000"),
    "fixed4": StyleSpec(number_format="0.0000"),
    "fixed5": StyleSpec(number_format="0.00000"),
    "fixed6": StyleSpec(number_format="0.000000"),
    "upto4": StyleSpec(number_format="0.0###"),  # an input as typed, to four decimals at most
    "sci": StyleSpec(number_format="0.000E+00"),
    "caution_line": StyleSpec(italic=True, color="FF5A3E00", fill="FFFFF4D6"),
    "percent": StyleSpec(number_format="0.0%"),
    "caution": StyleSpec(italic=True, color="FF5A3E00", fill="FFFFF4D6", border="box",
                         border_color="FFD9B35A", wrap=True, vertical="top"),
    "filled": StyleSpec(italic=True, color="FF1E5E46", fill="FFE2F0EA"),
})
STYLE_NAMES: tuple[str, ...] = tuple(_CATALOG)

MINIMAL_STYLES = (
    f'{XML_DECL}<styleSheet xmlns="{NS_MAIN}">'
    '<fonts count="1"><font><sz val="11"/><name val="Calibri"/><family val="2"/></font></fonts>'
    '<fills count="2"><fill><patternFill patternType="none"/></fill>'
    '<fill><patternFill patternType="gray125"/></fill></fills>'
    '<borders count="1"><border><left/><right/><top/><bottom/><diagonal/></border></borders>'
    '<cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs>'
    '<cellXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/></cellXfs>'
    '<cellStyles count="1"><cellStyle name="Normal" xfId="0" builtinId="0"/></cellStyles>'
    '</styleSheet>'
)

_ORDER = ("numFmts", "fonts", "fills", "borders", "cellStyleXfs", "cellXfs", "cellStyles",
          "dxfs", "tableStyles", "colors", "extLst")
_CHILD = MappingProxyType({"numFmts": "numFmt", "fonts": "font", "fills": "fill", "borders": "border", "cellXfs": "xf"})


class StyleBook:
    """Hands out cell-format (xf) indexes for our style names and renders the changed part.

    Parameters
    ----------
    text : str
        The book's styles part (decoded); ``MINIMAL_STYLES`` if the book has none.
    """

    def __init__(self, text: str) -> None:
        self._text = text
        self._p, root = root_prefix(text)
        if root != "styleSheet":
            raise ValueError(f"styles part has root <{root}>, not <styleSheet>")
        self._counts = {block: self._count(block) for block in _CHILD}
        self._fmt_ids = [int(x) for x in re.findall(r'numFmtId="(\d+)"', self._inner("numFmts"))]
        first_font = re.search(r"<" + self._p + r"font[\s>/].*?</" + self._p + r"font>", self._inner("fonts"), re.S)
        self._font_name, self._font_size = "Calibri", "11"
        if first_font:
            name = re.search(r'<(?:\w+:)?name\s+val="([^"]*)"', first_font.group(0))
            size = re.search(r'<(?:\w+:)?sz\s+val="([^"]*)"', first_font.group(0))
            self._font_name = name.group(1) if name else self._font_name
            self._font_size = size.group(1) if size else self._font_size
        self._has_style_xfs = find_element_span(text, self._p + "cellStyleXfs") is not None
        self._added: dict[str, list[str]] = {block: [] for block in _CHILD}
        self._index_of: dict[tuple[str, str], int] = {}
        self._xf_of: dict[str, int] = {}

    def _inner(self, block: str) -> str:
        span = find_element_span(self._text, self._p + block)
        return "" if span is None else self._text[span[1]:span[2]]

    def _count(self, block: str) -> int:
        child = re.escape(self._p + _CHILD[block])
        return len(re.findall(r"<" + child + r"[\s>/]", self._inner(block)))

    @property
    def changed(self) -> bool:
        """True once any style was handed out."""
        return bool(self._xf_of)

    def _entry(self, block: str, xml: str) -> int:
        key = (block, xml)
        if key not in self._index_of:
            self._index_of[key] = self._counts[block] + len(self._added[block])
            self._added[block].append(xml)
        return self._index_of[key]

    def xf(self, style: str) -> int:
        """Cell-format index for a style name, or names joined with '+' ('fail+percent').

        Raises
        ------
        ValueError
            For a name not in ``STYLE_NAMES``.
        """
        if style in self._xf_of:
            return self._xf_of[style]
        spec = StyleSpec()
        for name in style.split("+"):
            if name not in _CATALOG:
                raise ValueError(f"unknown cell style {name!r}; use one of {', '.join(STYLE_NAMES)}")
            spec = spec.merged(_CATALOG[name])
        p = self._p
        fmt_id = 0
        if spec.number_format is not None:
            code = escape_attr(spec.number_format)
            key = ("numFmts", code)
            if key not in self._index_of:
                new_id = max([163, *self._fmt_ids]) + 1
                self._fmt_ids.append(new_id)
                self._index_of[key] = new_id
                self._added["numFmts"].append(f'<{p}numFmt numFmtId="{new_id}" formatCode="{code}"/>')
            fmt_id = self._index_of[key]
        font = (f"<{p}font>" + (f"<{p}b/>" if spec.bold else "") + (f"<{p}i/>" if spec.italic else "")
                + f'<{p}sz val="{spec.size or self._font_size}"/>'
                + (f'<{p}color rgb="{spec.color}"/>' if spec.color else "")
                + f'<{p}name val="{escape_attr(self._font_name)}"/></{p}font>')
        font_id = self._entry("fonts", font)
        fill_id = 0
        if spec.fill:
            fill_id = self._entry("fills", f'<{p}fill><{p}patternFill patternType="solid"><{p}fgColor rgb="{spec.fill}"/>'
                                           f'<{p}bgColor indexed="64"/></{p}patternFill></{p}fill>')
        border_id = 0
        if spec.border:
            line = f'style="thin"><{p}color rgb="{spec.border_color or "FF000000"}"/>'
            sides = []
            for side in ("left", "right", "top", "bottom"):
                if spec.border == "box" or side == spec.border:
                    sides.append(f"<{p}{side} {line}</{p}{side}>")
                else:
                    sides.append(f"<{p}{side}/>")
            border_id = self._entry("borders", f"<{p}border>{''.join(sides)}<{p}diagonal/></{p}border>")
        align = ""
        if spec.wrap or spec.vertical or spec.indent:
            align = (f"<{p}alignment" + (f' horizontal="left" indent="{spec.indent}"' if spec.indent else "")
                     + (f' vertical="{spec.vertical}"' if spec.vertical else "")
                     + (' wrapText="1"' if spec.wrap else "") + "/>")
        xf = (f'<{p}xf numFmtId="{fmt_id}" fontId="{font_id}" fillId="{fill_id}" borderId="{border_id}"'
              + (' xfId="0"' if self._has_style_xfs else "")
              + (' applyNumberFormat="1"' if fmt_id else "") + ' applyFont="1"'
              + (' applyFill="1"' if fill_id else "") + (' applyBorder="1"' if border_id else "")
              + (f' applyAlignment="1">{align}</{p}xf>' if align else "/>"))
        # Two names with the same look share one xf; the cache key is the name as asked.
        index = self._entry("cellXfs", xf)
        self._xf_of[style] = index
        return index

    def render(self) -> str:
        """The styles part with our entries appended and the count attributes updated."""
        text = self._text
        for block in ("numFmts", "fonts", "fills", "borders", "cellXfs"):
            added = self._added[block]
            if not added:
                continue
            qname = self._p + block
            total = (self._counts[block] if block != "numFmts" else self._counts[block]) + len(added)
            span = find_element_span(text, qname)
            if span is None:
                text = self._insert_block(text, block, f'<{qname} count="{total}">{"".join(added)}</{qname}>')
                continue
            start, start_end, inner_end, end = span
            start_tag = text[start:start_end]
            if start_tag.endswith("/>"):
                start_tag = start_tag[:-2].rstrip() + ">"
                inner = f"{''.join(added)}</{qname}>"
                start_tag = _with_count(start_tag, total)
                text = text[:start] + start_tag + inner + text[end:]
            else:
                text = (text[:start] + _with_count(start_tag, total) + text[start_end:inner_end]
                        + "".join(added) + text[inner_end:])
        return text

    def _insert_block(self, text: str, block: str, xml: str) -> str:
        later = _ORDER[_ORDER.index(block) + 1:]
        positions = [span[0] for name in later
                     if (span := find_element_span(text, self._p + name)) is not None]
        at = min(positions) if positions else text.rfind(f"</{self._p}styleSheet>")
        return text[:at] + xml + text[at:]


def _with_count(start_tag: str, total: int) -> str:
    if re.search(r'\scount="\d*"', start_tag):
        return re.sub(r'(\s)count="\d*"', rf'\g<1>count="{total}"', start_tag, count=1)
    return start_tag
