"""Turn a column of cells into SI floats, with a finding for every cell that cannot be trusted.

Each distinct header unit is parsed once (``si_factor`` caches); plain numbers are scaled by it.
A cell holding its own unit (``52 mm``) is parsed on its own and overrides the header's.
"""

from __future__ import annotations

import datetime as _dt
import math
from collections.abc import Callable, Hashable, Sequence
from dataclasses import dataclass
from itertools import count
from types import MappingProxyType

import numpy as np
from twistshare.engine.core import ADHESIVE_DESIGN_FACTOR, adhesive_library, find_adhesive
from twistshare.engine.units import UnitProblem, describe_kind, parse_value, si_factor, si_offset

from ._grid import SheetGrid, all_of_type, cell_ref, number_count
from ._problems import Problem, Severity
from ._schema import Column, Field
from ._words import QUOTE_MAX, error_value_text, flag_from_value, quoted

__all__ = ["NumericColumn", "drop_key", "first_seen_index", "read_numeric", "row_array", "read_text", "read_flag",
           "describe_kind", "quoted", "error_problem", "example_unit"]

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
        return quoted(raw)
    if isinstance(raw, float) and raw.is_integer():
        raw = int(raw)
    return f"{raw} {header_unit}" if header_unit else f"{raw}"


def header_factor(field: Field, unit: str | None, header: str) -> tuple[float | None, str | None]:
    """The SI factor of a column's header unit, or why the column's bare numbers cannot be read.

    Returns
    -------
    (float or None, str or None)
        The factor (None where bare numbers need a unit the header does not give), and the
        problem with the header, worded.
    """
    if unit is not None:
        try:
            return si_factor(unit, field.kind), None
        except UnitProblem as exc:
            return None, f"header unit: {exc}"
    if field.needs_unit:
        return None, (f"no unit for {field.description}: put it in the header, e.g. "
                      f"'{header.strip()} [{example_unit(field.kind)}]', or in each cell")
    return (1.0 if field.kind == "dimensionless" else None), None


_ADHESIVE_NAMES = ", ".join(repr(name) for name in adhesive_library())


def _named_value(raw: str, field: Field) -> tuple[float, str | None, str] | None:
    """A text naming a built-in library entry of the field's kind: its value, code
    ``"library"`` (the reader notes where it came from); None otherwise."""
    if field.named == "adhesive":
        adhesive = find_adhesive(raw)
        if adhesive is not None:
            return adhesive.allowable, None, "library"
    return None


def library_note(raw: str, field: Field) -> str:
    """What a cell that names a library entry was read as, in words (with its source)."""
    adhesive = find_adhesive(raw)
    if field.named != "adhesive" or adhesive is None:
        return ""
    return (f"{field.description}: {adhesive.name!r} from the built-in adhesives: "
            f"{_fmt(adhesive.allowable / 1e6)} MPa, its typical strength "
            f"{_fmt(adhesive.typical_strength / 1e6)} MPa ({adhesive.test}, typical, from memory) "
            f"over a design factor of {_fmt(ADHESIVE_DESIGN_FACTOR)} (common practice, from memory); "
            "use the maker's data for your product, gap and temperature")


def cell_value(raw: object, field: Field, unit: str | None, factor: float | None,
               header_issue: str | None = None, *, is_error: bool = False
               ) -> tuple[float, str | None, str]:
    """One non-empty cell read as an SI value of `field`: (value, problem, code).

    The one rule for a cell, whether it sits in a table column or is a cell function's
    argument: an error value, a yes/no, a date, a bare number without a unit, a unit of the
    wrong kind, a sign slip and an implausible magnitude are each refused in words.

    Parameters
    ----------
    raw : object
        The cell's value (not None).
    field : Field
    unit : str or None
        The header's unit, which a bare number takes.
    factor : float or None
        The SI factor of `unit` (from `header_factor`); None where bare numbers cannot be read.
    header_issue : str or None
        Why the header gives no unit, for a bare number.
    is_error : bool
        The cell holds a spreadsheet error value (``raw`` is its text).

    Returns
    -------
    value : float, SI
        NaN when there is a problem.
    problem : str or None
        Worded: what was found and what was expected.
    code : str
        ``"error-value"``, ``"not-a-number"``, ``"unit"``, ``"sign"``, ``"plausible"`` or ``""``.
    """
    kind = field.kind
    if is_error:
        return math.nan, f"the cell holds the error value {raw}; expected {describe_kind(kind)}", "error-value"
    if isinstance(raw, bool):
        return math.nan, f"expected {describe_kind(kind)}, got {'TRUE' if raw else 'FALSE'}", "not-a-number"
    if isinstance(raw, (_dt.date, _dt.time, _dt.timedelta)):
        return math.nan, f"expected {describe_kind(kind)}, got a date or time ({raw})", "not-a-number"
    if isinstance(raw, (int, float)):
        if not math.isfinite(raw):
            return math.nan, f"expected a finite number, got {raw}", "not-a-number"
        if factor is None and (raw != 0 or kind == "temperature"):
            return math.nan, header_issue or "no unit", "unit"
        v = float(raw) * factor if factor is not None else 0.0  # zero is zero in every unit
        if kind == "temperature":  # an offset unit: factor is not None here
            v += si_offset(unit, kind)
    elif isinstance(raw, str):
        named = _named_value(raw, field)
        if named is not None:
            return named
        try:
            v = parse_value(raw, kind, unit if factor is not None else None)
        except UnitProblem as exc:
            if field.named is not None and not any(ch.isdigit() for ch in raw):
                return math.nan, (f"{quoted(raw)} is neither {describe_kind(kind)} with its unit "
                                  f"nor a built-in {field.named}: {_ADHESIVE_NAMES}"), "unknown-name"
            return math.nan, f"{quoted(raw)}: {_short(str(exc), raw)}", "unit"
    else:
        return math.nan, f"expected {describe_kind(kind)}, got {raw!r}", "not-a-number"
    rng = field.plausible
    if rng is not None:
        lo, hi, shown_unit, f = rng.low, rng.high, rng.unit, rng.factor
        if rng.positive and (v < 0 or (v == 0 and lo > 0)):
            sign = "negative" if v < 0 else "zero"
            need = "greater than zero" if lo > 0 else "zero or more"
            return math.nan, f"{_display(raw, unit)} is {sign}; expected {describe_kind(kind)} {need}", "sign"
        if not (lo <= v <= hi):
            shown = _display(raw, unit)
            converted = f"{_fmt(v / f)} {shown_unit}".strip()
            if shown.replace(" ", "") != converted.replace(" ", ""):
                shown = f"{shown} = {converted}"
            check = "check the unit" if shown_unit else "check the value"
            return math.nan, (
                f"{shown} is outside the plausible "
                f"range {_fmt(lo / f)} to {_fmt(hi / f)} {shown_unit} (common practice); {check}"
            ).replace("  ", " "), "plausible"
    return v, None, ""


def first_seen_index(keys: Sequence[Hashable]) -> tuple[list, np.ndarray]:
    """The distinct keys in order of first appearance, and each key's position among them."""
    position = dict(zip(dict.fromkeys(keys), count()))  # both passes at C speed
    return list(position), np.fromiter(map(position.__getitem__, keys), np.intp, len(keys))


def row_array(rows: Sequence[int]) -> np.ndarray:
    """Row numbers as an index array; a run of consecutive rows (the usual table) without
    converting each number."""
    if rows and rows[-1] - rows[0] + 1 == len(rows):
        return np.arange(rows[0], rows[-1] + 1, dtype=np.intp)
    return np.asarray(rows, dtype=np.intp)


def drop_key(distinct: list, index: np.ndarray, key: Hashable, code: int) -> tuple[list, np.ndarray]:
    """`first_seen_index`'s result without `key` (a blank): its positions become `code`."""
    if key not in distinct:
        return distinct, index
    k = distinct.index(key)
    del distinct[k]
    return distinct, np.where(index == k, code, index - (index > k))


def read_numeric(
    grid: SheetGrid,
    column: Column,
    rows: Sequence[int],
    who: Callable[[int], str],
    findings: list[Problem],
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
    factor, header_issue = header_factor(field, column.unit, column.header)
    key = (grid.name, column.index)
    # A header unit that cannot be read is told on the header; a header without a unit only
    # on the cells that need one (a bare number), since cells may carry their own.
    if header_issue and column.unit is not None and key not in header_problem_reported:
        header_problem_reported.add(key)
        findings.append(Problem(Severity.ERROR, grid.name, cell_ref(header_row, column.index), header_issue,
                                code="header-unit", values=(column.header,)))
    rng = field.plausible
    col = column.index
    tag = getattr(who, "tag", None) or (lambda r: (None, None))
    # Fast path, whole column at once: plain finite numbers inside the plausible range. Every
    # other cell (text, errors, empties, numbers out of range) takes the cell-by-cell path below,
    # which words the findings.
    slow = range(n)
    if factor is not None and n:
        raw_col = grid.cells(col, rows)
        numbers = number_count(raw_col)
        if numbers == n:  # the common case: one conversion at C speed
            is_num = np.ones(n, bool)
            nums = np.array(raw_col, dtype=float) * factor
        elif not numbers:  # no plain number at all: every cell is read below
            is_num = np.zeros(n, bool)
            nums = np.full(n, np.nan)
        else:
            is_num = np.fromiter((type(x) is float or type(x) is int for x in raw_col), bool, n)
            nums = np.array([x if k else np.nan for x, k in zip(raw_col, is_num.tolist())], dtype=float) * factor
        if field.kind == "temperature":
            nums += si_offset(column.unit, field.kind)
        if grid.errors:
            for i, r in enumerate(rows):
                if (r, col) in grid.errors:
                    is_num[i] = False
        with np.errstate(invalid="ignore"):
            ok = is_num & np.isfinite(nums)
            if rng is not None:
                ok &= (nums >= rng.low) & (nums <= rng.high)
        if ok.all():  # every cell a plausible number: the column is read
            values, slow = nums, []
        else:
            values[ok] = nums[ok]
            slow = np.flatnonzero(~ok).tolist()
    memo: dict[str, tuple[float, str | None, str]] = {}  # a column repeats its texts ("52 mm")
    errors = grid.errors
    if n and not errors and not grid.uncached and (factor is None or len(slow) == n):
        # A column of texts: each distinct text read once, the column filled by lookup; only the
        # cells that need a message are visited one by one below.
        raw_col = grid.cells(col, rows)
        if all_of_type(raw_col, str):
            distinct, index = first_seen_index(raw_col)
            for text in distinct:
                memo[text] = cell_value(text, field, column.unit, factor, header_issue,
                                        is_error=error_value_text(text) is not None) if text.strip() else (
                    math.nan, None, "empty")
            # Per distinct text its value and whether its cell needs a visit; spread by index.
            texts = memo.values()  # in the order of `distinct`
            visit = np.array([g[1] is not None or g[2] in ("empty", "library") for g in texts], bool)[index]
            values[:] = np.array([g[0] for g in texts], float)[index]
            values[visit] = math.nan
            slow = np.flatnonzero(visit).tolist()
    for i in slow:
        r = rows[i]
        raw = grid.value(r, col)
        if raw is None and (r, col) in grid.uncached:
            bad[i] = True
            findings.append(Problem(
                Severity.ERROR, grid.name, cell_ref(r, col),
                f"{who(r)}: {field.description}: the cell's formula has no saved result (the book was "
                "written by a program that does not calculate): open and save it in Excel or LibreOffice, "
                "then run again", *tag(r), code="uncached"))
            continue
        if raw is None:
            empty[i] = True
            continue
        if raw.__class__ is str and not (errors and (r, col) in errors):
            got = memo.get(raw)
            if got is None:
                got = memo[raw] = cell_value(raw, field, column.unit, factor, header_issue,
                                             is_error=error_value_text(raw) is not None)
            v, problem, code = got
        else:
            v, problem, code = cell_value(raw, field, column.unit, factor, header_issue,
                                          is_error=(r, col) in errors or error_value_text(raw) is not None)
        if problem is not None:
            bad[i] = True
            if code == "unit" and header_issue and column.unit is None and key not in header_problem_reported \
                    and header_row >= 0 and not isinstance(raw, str):
                # a bare number needs the header's unit: say so on the header too, once
                header_problem_reported.add(key)
                findings.append(Problem(Severity.ERROR, grid.name, cell_ref(header_row, column.index), header_issue,
                                        code="header-no-unit", values=(column.header,)))
            findings.append(
                Problem(Severity.ERROR, grid.name, cell_ref(r, col), f"{who(r)}: {field.description}: {problem}",
                        *tag(r), code=code, values=(raw,))
            )
            continue
        if code == "library":
            findings.append(Problem(Severity.NOTE, grid.name, cell_ref(r, col),
                                    f"{who(r)}: {library_note(raw, field)}", *tag(r),
                                    code="library-value", values=(raw,)))
        values[i] = v
    return NumericColumn(values, bad, empty)


def _short(message: str, raw: str) -> str:
    """A unit problem's message with a long cell text quoted again only by its start."""
    text = raw.strip()
    if len(text) > QUOTE_MAX and len(message) > 4 * QUOTE_MAX:
        message = message.replace(repr(text), quoted(text))
        if len(message) > 4 * QUOTE_MAX:
            message = message[: 4 * QUOTE_MAX] + " …"
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
    "temperature": "°C",
    "expansion": "1/K",
})


def example_unit(kind: str) -> str:
    """A unit to suggest in a message for a value of `kind` (``"mm"`` for a length)."""
    return _EXAMPLES.get(kind, "")


def error_problem(grid: SheetGrid, row: int, col: int, expected: str) -> str | None:
    """The message for a cell holding a spreadsheet error value (``#N/A``), or None.

    A saved book's error cells are in ``grid.errors``; a block handed to a cell function holds
    the error's text itself.
    """
    err = grid.error_at(row, col) or error_value_text(grid.value(row, col))
    if err is None:
        return None
    return f"the cell holds the error value {err}; expected {expected}"


def read_text(grid: SheetGrid, col: int, rows: Sequence[int]) -> list[str | None]:
    """Text of a column, stripped; whole numbers shown without a decimal point; None when empty."""
    raw = grid.cells(col, rows)
    if not grid.errors and all_of_type(raw, str):  # the common case, read straight from the grid
        stripped: list[str | None] = list(map(str.strip, raw))
        return [x or None for x in stripped] if "" in stripped else stripped
    out: list[str | None] = []
    errors = grid.errors
    for r, value in zip(rows, raw):
        if type(value) is str and not errors:
            out.append(value.strip() or None)
            continue
        value = grid.value(r, col)
        if value is None or (r, col) in errors:
            out.append(None if value is None else str(value))
        elif isinstance(value, float) and value.is_integer():
            out.append(str(int(value)))
        else:
            text = str(value).strip()
            out.append(text or None)
    return out


def read_flag(raw: object) -> bool | None:
    """A yes/no cell: True, False, or None when it is neither (the words of `flag_from_value`)."""
    return flag_from_value(raw)
