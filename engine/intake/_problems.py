"""Problems: what the intake has to tell about an input — a cell, a part, a layer or a table.

One type for both front ends. The intake words every message once; a front end only decides
where it shows it (a comment on ``Parts!C5``, or the ``⚠`` text of a cell function) and how
severe a problem must be to stop a result (`Severity.ERROR` in a book, where warnings are
written beside the numbers; `Severity.WARNING` in a cell, which cannot show both).
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum
from typing import Any

__all__ = ["Severity", "Problem", "stops"]


class Severity(str, Enum):
    """How a problem affects the result."""

    ERROR = "error"  # the part (or the book) could not be rated from this input
    WARNING = "warning"  # rated, but the input looks doubtful
    NOTE = "note"  # information, e.g. a property filled in from the built-in library


_RANK = {Severity.ERROR: 0, Severity.WARNING: 1, Severity.NOTE: 2}


def stops(severity: Severity, threshold: Severity) -> bool:
    """True when a problem of `severity` is at least as severe as `threshold`."""
    return _RANK[severity] <= _RANK[threshold]


@dataclass(frozen=True)
class Problem:
    """One message about one place in the input.

    Parameters
    ----------
    severity : Severity
    sheet : str or None
        The table's sheet (a book) or block name (a cell function); None for the whole input.
    cell : str or None
        An A1 reference on ``sheet``, None for a finding about a whole part or table.
    message : str
        The full sentence, naming the part, the layer, the input, the value and the rule.
    part : str or None
        The part id it concerns.
    layer : int or None
        1-based layer number (1 = innermost).
    code : str
        A short stable name of the rule that found it (``"plausible"``, ``"unit"``, ...), for
        tests and scripts.
    values : tuple
        The values that caused it, as found.
    material : str or None
        The material (a row of the materials table) it concerns: every part using that
        material is concerned too.
    """

    severity: Severity
    sheet: str | None
    cell: str | None
    message: str
    part: str | None = None
    layer: int | None = None
    code: str = "input"
    values: tuple[Any, ...] = ()
    material: str | None = None

    @property
    def place(self) -> str:
        """``Sheet!A1``, the sheet alone, or empty."""
        if self.sheet and self.cell:
            return f"{self.sheet}!{self.cell}"
        return self.sheet or ""

    def line(self) -> str:
        """One line for the terminal."""
        where = self.place
        return f"{self.severity.value}: {where + ': ' if where else ''}{self.message}"
