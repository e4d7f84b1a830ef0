"""Turn a column of cells into SI floats, with a finding for every cell that cannot be trusted.

Each distinct header unit is parsed once (``si_factor`` caches); plain numbers are scaled by it.
A cell holding its own unit (``52 mm``) is parsed on its own and overrides the header's.
"""

from __future__ import annotations

from types import MappingProxyType

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

__all__ = ["NumericColumn", "read_numeric", "read_text", "read_flag", "describe_kind", "quoted", "error_problem"]

_KIND_WORDS = MappingProxyType({
    "length": "a length",
    "stress": "a stress or modulus",
    "torque": "a torque",
    "power": "a power",
    "speed": "a rotational speed",
    "angle": "an angle",
    "angle_per_length": "an angle per length",
    "density": "a density",
    "dimensionless": "a plain number",
})


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


# Inputs that only make sense above zero (or at zero, where the range starts there): a sign slip
# is worded as such rather than as an implausible magnitude.
_SIGNED = frozenset({
    "length", "outer_diameter", "inner_diameter", "torque", "power", "speed", "twist_limit_angle",
    "twist_limit_per_length", "shear_modulus", "youngs_modulus", "allowable_shear", "yield_strength",
    "ultimate_strength", "density",
})
_QUOTE_MAX = 60  # characters of a cell's text quoted in a message


def quoted(text: str) -> str:
    """A cell's text for a message: stripped, quoted, cut short when it is a pasted paragraph."""
    text = text.strip()
    if len(text) > _QUOTE_MAX:
        return repr(text[:_QUOTE_MAX]) + f" (… {len(text)} characters)"
    return repr(text)


def _display(raw: object, header_unit: str | None) -> str:
    if isinstance(raw, str):
        return quoted(raw)
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
    tag = getattr(who, "tag", None) or (lambda r: (None, None))
    # Fast path, whole column at once: plain finite numbers inside the plausible range. Every
    # other cell (text, errors, empties, numbers out of range) takes the cell-by-cell path below,
    # which words the findings.
    slow = range(n)
    if factor is not None and n:
        grid_rows = grid.rows
        raw_col = [row[col] if col < len(row) else None for row in (grid_rows[r] for r in rows)]
        is_num = np.fromiter((type(x) is float for x in raw_col), bool, n)
        if grid.errors:
            for i, r in enumerate(rows):
                if (r, col) in grid.errors:
                    is_num[i] = False
        nums = np.array([x if k else np.nan for x, k in zip(raw_col, is_num.tolist())], dtype=float) * factor
        with np.errstate(invalid="ignore"):
            ok = is_num & np.isfinite(nums)
            if rng is not None:
                ok &= (nums >= rng[0]) & (nums <= rng[1])
        values[ok] = nums[ok]
        slow = np.flatnonzero(~ok).tolist()
    for i in slow:
        r = rows[i]
        raw = grid.value(r, col)
        if raw is None and (r, col) in grid.uncached:
            bad[i] = True
            findings.append(Finding(
                Severity.ERROR, grid.name, cell_ref(r, col),
                f"{who(r)}: {field.description}: the cell's formula has no saved result (the book was "
                "written by a program that does not calculate): open and save it in Excel or LibreOffice, "
                "then run again", *tag(r)))
            continue
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
                problem = f"{quoted(raw)}: {_short(str(exc), raw)}"
        else:
            problem = f"expected {describe_kind(field.kind)}, got {raw!r}"
        if problem is None and rng is not None:
            lo, hi, unit, f = rng
            if field.key in _SIGNED and (v < 0 or (v == 0 and lo > 0)):
                sign = "negative" if v < 0 else "zero"
                need = "greater than zero" if lo > 0 else "zero or more"
                problem = f"{_display(raw, column.unit)} is {sign}; expected {describe_kind(field.kind)} {need}"
            elif not (lo <= v <= hi):
                shown = _display(raw, column.unit)
                converted = f"{_fmt(v / f)} {unit}".strip()
                if shown.replace(" ", "") != converted.replace(" ", ""):
                    shown = f"{shown} = {converted}"
                problem = (
                    f"{shown} is outside the plausible "
                    f"range {_fmt(lo / f)} to {_fmt(hi / f)} {unit} (common practice); check the unit"
                ).replace("  ", " ")
        if problem is not None:
            bad[i] = True
            findings.append(
                Finding(Severity.ERROR, grid.name, cell_ref(r, col), f"{who(r)}: {field.description}: {problem}",
                        *tag(r))
            )
            continue
        values[i] = v
    return NumericColumn(values, bad, empty)


def _short(message: str, raw: str) -> str:
    """A unit problem's message with a long cell text quoted again only by its start."""
    text = raw.strip()
    if len(text) > _QUOTE_MAX and len(message) > 4 * _QUOTE_MAX:
        message = message.replace(repr(text), quoted(text))
        if len(message) > 4 * _QUOTE_MAX:
            message = message[: 4 * _QUOTE_MAX] + " …"
    return message


_EXAMPLES = MappingProxyType({
    "length": "mm",
    "stress": "MPa",
    "torque": "N·m",
    "power": "kW",
    "speed": "rpm",
    "angle": "deg",
    "angle_per_length": "deg/m",
    "density": "kg/m³",
})


def _example_unit(kind: str) -> str:
    return _EXAMPLES.get(kind, "")


def error_problem(grid: SheetGrid, row: int, col: int, expected: str) -> str | None:
    """The message for a text cell holding an Excel error value (``#N/A``), or None."""
    err = grid.error_at(row, col)
    if err is None:
        return None
    return f"the cell holds the error value {err}; expected {expected}"


def read_text(grid: SheetGrid, col: int, rows: Sequence[int]) -> list[str | None]:
    """Text of a column, stripped; whole numbers shown without a decimal point; None when empty."""
    out: list[str | None] = []
    grid_rows, errors = grid.rows, grid.errors
    for r in rows:
        row = grid_rows[r]
        raw = row[col] if col < len(row) else None
        if type(raw) is str and not errors:  # the common case, read straight from the grid
            out.append(raw.strip() or None)
            continue
        raw = grid.value(r, col)
        if raw is None or (r, col) in errors:
            out.append(None if raw is None else str(raw))
        elif isinstance(raw, float) and raw.is_integer():
            out.append(str(int(raw)))
        else:
            s = str(raw).strip()
            out.append(s or None)
    return out


_TRUE = frozenset({"yes", "y", "true", "1", "x", "keyway", "with keyway"})
_FALSE = frozenset({"no", "n", "false", "0", "none", "-", "without keyway"})


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
