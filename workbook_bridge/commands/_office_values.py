"""Values of formulas twistshare's own evaluator cannot compute, asked of LibreOffice.

For the values-only copy: ``INDEX(TWS_SHARE(…);2)``, ``B5*2`` as an argument and any other
spreadsheet arithmetic around our calls. One headless LibreOffice run answers every such cell
(`..hosts.calc.computed_values`); where LibreOffice is not installed, or fails, the answer says
so in one line and the copy keeps its ``⚠ no value`` cells.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from pathlib import Path

__all__ = ["OfficeAnswer", "ask_libreoffice"]


@dataclass(frozen=True)
class OfficeAnswer:
    """What LibreOffice computed for the cells asked.

    Attributes
    ----------
    values : mapping of (sheet, cell) to float or str
        Every cell LibreOffice gave a value (our ``⚠`` messages included, as text).
    not_computed : mapping of (sheet, cell) to str
        Cells without a usable value, and why.
    missing : bool
        LibreOffice is not installed here (nothing was computed).
    failure : str or None
        Why nothing was computed (one line), when LibreOffice was asked and could not answer.
    """

    values: Mapping[tuple[str, str], float | str] = field(default_factory=dict)
    not_computed: Mapping[tuple[str, str], str] = field(default_factory=dict)
    missing: bool = False
    failure: str | None = None

    @property
    def answered(self) -> bool:
        """LibreOffice was there and recalculated the book."""
        return not self.missing and self.failure is None


def ask_libreoffice(book: Path, cells: Iterable[tuple[str, str]]) -> OfficeAnswer:
    """The values of `cells` of `book` after a headless LibreOffice has recomputed it; never raises
    for LibreOffice's sake (a missing or failing LibreOffice is part of the answer)."""
    from ..hosts.calc import CalcHostError, LibreOfficeMissing, computed_values

    wanted = list(dict.fromkeys(cells))
    if not wanted:
        return OfficeAnswer()
    try:
        got = computed_values(book, wanted)
    except LibreOfficeMissing as error:
        return OfficeAnswer(missing=True, failure=str(error))
    except CalcHostError as error:
        return OfficeAnswer(failure=str(error))
    return OfficeAnswer(got.values, got.not_computed)
