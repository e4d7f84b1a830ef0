"""Findings: what the bridge has to tell the user about a cell, a part or the book."""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum

__all__ = ["Severity", "Finding"]


class Severity(str, Enum):
    """How a finding affects the rating."""

    ERROR = "error"  # the part (or the book) could not be rated from this input
    WARNING = "warning"  # rated, but the input looks doubtful
    NOTE = "note"  # information, e.g. a property filled in from the built-in library


@dataclass(frozen=True)
class Finding:
    """One message about one place in the book.

    ``cell`` is an A1 reference on ``sheet`` or None for a finding about a whole part or book.
    """

    severity: Severity
    sheet: str | None
    cell: str | None
    message: str
    part: str | None = None
    layer: int | None = None

    @property
    def place(self) -> str:
        if self.sheet and self.cell:
            return f"{self.sheet}!{self.cell}"
        return self.sheet or ""

    def line(self) -> str:
        """One line for the terminal."""
        where = self.place
        return f"{self.severity.value}: {where + ': ' if where else ''}{self.message}"
