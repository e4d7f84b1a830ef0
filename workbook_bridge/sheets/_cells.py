"""Cell values for the sheets we write: a value with a style, and the caution block."""

from __future__ import annotations

import math
from types import MappingProxyType

from twistshare.engine.intake import CAUTION_LINES, METHOD_LINE

from ..ooxml import Cell

__all__ = ["Styled", "caution_rows", "finite_or_none", "CAUTIONS"]

#: The caution and the method line, as every sheet we write shows them.
CAUTIONS: tuple[str, ...] = CAUTION_LINES + (METHOD_LINE,)

_STYLE_MAP = MappingProxyType({"ok": None, "note": None})


def Styled(value: object, style: str) -> object:  # noqa: N802 - reads like the value wrapper it makes
    """A value with one of the writer's style names (a few local aliases are mapped here)."""
    style = _STYLE_MAP.get(style, style)
    return Cell(value, style) if style else value


def caution_rows() -> list[list]:
    """The caution block: a title, one line each, then a blank row."""
    return [[Cell("Caution", "title")]] + [[Cell(c, "caution_line")] for c in CAUTIONS] + [[]]


def finite_or_none(x: object) -> float | None:
    """A number as a cell value: the float, or None (a blank cell) for a missing, NaN or infinite one."""
    if x is None:
        return None
    value = float(x)
    return value if math.isfinite(value) else None
