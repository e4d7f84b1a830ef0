"""Turn a column of cells into SI floats, with a finding for every cell that cannot be trusted.

Each distinct header unit is parsed once (``si_factor`` caches); plain numbers are scaled by it.
A cell holding its own unit (``52 mm``) is parsed on its own and overrides the header's.
"""

from __future__ import annotations

import datetime as _dt
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from twistshare.engine.units import UnitProblem, parse_value, si_factor

from ._findings import Finding, Severity
from ._grid import SheetGrid, cell_ref
from ._plausible import plausible_range
from ._schema import Column

__all__ = ["NumericColumn", "read_numeric", "read_text", "read_flag", "describe_kind"]

_KIND_WORDS = {
    "length": "a length",
    "stress": "a stress or modulus",
    "torque": "a torque",
    "power": "a power",
    "speed": "a rotational speed",
    "angle": "an angle",
    "angle_per_length": "an angle per length",
    "density": "a density",
    "dimensionless": "a plain number",
}


def describe_kind(kind: str) -> str:
    return _KIND_WORDS.get(kind, kind)


def _fmt(x: float) -> str:
    return f"{x:.6g}"


@dataclass(frozen=True)
class NumericColumn:
    """SI values of one column over the given rows; NaN where empty or bad."""

    values: np.ndarray
    bad: np.ndarray  # the cell held something we could not use
    empty: np.ndarray  # the cell was empty


def _display(raw: object, header_unit: str | None) -> str:
    if isinstance(raw, str):
        return repr(raw.strip())
    if isinstance(raw, float) and raw.is_integer():
        raw = int(raw)
    return f"{raw} {header_unit}" if header_unit else f"{raw}"


def read_numeric(
    grid: SheetGrid,
    column: Column,
    rows: Sequence[int],
    who: Callable[[int], str],
    findings: list[Finding],
    header_row: int,
    header_problem_reported: set[tuple[str, int]],
) -> NumericColumn:
    """Read one numeric column.

    ``who(row)`` names the part (and layer) a row belongs to, for the messages.
    """
    field = column.field
    n = len(rows)
    values = np.full(n, np.nan)
    bad = np.zeros(n, dtype=bool)
    empty = np.zeros(n, dtype=bool)
    factor: float | None = None
    header_issue: str | None = None
    if column.unit is not None:
        try:
            factor = si_factor(column.unit, field.kind)
        except UnitProblem as exc:
            header_issue = f"header unit: {exc}"
    elif field.needs_unit:
        header_issue = (
            f"no unit for {field.description}: put it in the header, e.g. "
            f"'{column.header.strip()} [{_example_unit(field.kind)}]', or in each cell"
        )
    elif field.kind == "dimensionless":
        factor = 1.0
    key = (grid.name, column.index)
    if header_issue and key not in header_problem_reported:
        header_problem_reported.add(key)
        findings.append(Finding(Severity.ERROR, grid.name, cell_ref(header_row, column.index), header_issue))
    rng = plausible_range(field.key)
    col = column.index
    for i, r in enumerate(rows):
        raw = grid.value(r, col)
        if raw is None:
            empty[i] = True
            continue
        problem: str | None = None
        v = math.nan
        if (r, col) in grid.errors:
            problem = f"the cell holds the error value {raw}; expected {describe_kind(field.kind)}"
        elif isinstance(raw, bool):
            problem = f"expected {describe_kind(field.kind)}, got {'TRUE' if raw else 'FALSE'}"
        elif isinstance(raw, (_dt.date, _dt.time, _dt.timedelta)):
            problem = f"expected {describe_kind(field.kind)}, got a date or time ({raw})"
        elif isinstance(raw, (int, float)):
            if not math.isfinite(raw):
                problem = f"expected a finite number, got {raw}"
            elif factor is None:
                problem = header_issue or "no unit"
            else:
                v = float(raw) * factor
        elif isinstance(raw, str):
            try:
                v = parse_value(raw, field.kind, column.unit if factor is not None else None)
            except UnitProblem as exc:
                problem = f"{raw.strip()!r}: {exc}"
        else:
            problem = f"expected {describe_kind(field.kind)}, got {raw!r}"
        if problem is None and rng is not None:
            lo, hi, unit, f = rng
            if not (lo <= v <= hi):
                problem = (
                    f"{_display(raw, column.unit)} = {_fmt(v / f)} {unit} is outside the plausible "
                    f"range {_fmt(lo / f)} to {_fmt(hi / f)} {unit} (common practice); check the unit"
                ).replace("  ", " ")
        if problem is not None:
            bad[i] = True
            findings.append(
                Finding(Severity.ERROR, grid.name, cell_ref(r, col), f"{who(r)}: {field.description}: {problem}")
            )
            continue
        values[i] = v
    return NumericColumn(values, bad, empty)


_EXAMPLES = {
    "length": "mm",
    "stress": "MPa",
    "torque": "N·m",
    "power": "kW",
    "speed": "rpm",
    "angle": "deg",
    "angle_per_length": "deg/m",
    "density": "kg/m³",
}


def _example_unit(kind: str) -> str:
    return _EXAMPLES.get(kind, "")


def read_text(grid: SheetGrid, col: int, rows: Sequence[int]) -> list[str | None]:
    """Text of a column, stripped; whole numbers shown without a decimal point; None when empty."""
    out: list[str | None] = []
    for r in rows:
        raw = grid.value(r, col)
        if raw is None or (r, col) in grid.errors:
            out.append(None if raw is None else str(raw))
        elif isinstance(raw, float) and raw.is_integer():
            out.append(str(int(raw)))
        else:
            s = str(raw).strip()
            out.append(s or None)
    return out


_TRUE = {"yes", "y", "true", "1", "x", "keyway", "with keyway"}
_FALSE = {"no", "n", "false", "0", "none", "-", "without keyway"}


def read_flag(raw: object) -> bool | None:
    """A yes/no cell: True, False, or None when it is neither."""
    if isinstance(raw, bool):
        return raw
    if isinstance(raw, (int, float)):
        return bool(raw) if raw in (0, 1) else None
    if isinstance(raw, str):
        s = raw.strip().lower()
        if s in _TRUE:
            return True
        if s in _FALSE:
            return False
    return None
