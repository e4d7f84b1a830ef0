"""Single arguments of the cell functions, read through the intake's one rule per field.

A host hands a cell over as a float (whole numbers may be ints), a string, None for an empty
cell, a bool, a spreadsheet error as text (``"#N/A"``), a 1-D list for a one-row or one-column
range, or a list of lists. Every reader raises `CellError`, whose text is what the cell shows.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from functools import lru_cache
from types import MappingProxyType
from typing import Any

from twistshare.engine.core import AllowableRule
from twistshare.engine.errors import InputRefused
from twistshare.engine.intake import (
    RULE_CHOICES,
    Field,
    cell_value,
    describe_kind,
    flag_from_value,
    header_factor,
    rule_from_text,
)
from twistshare.engine.intake._words import error_value_text
from twistshare.engine.units import UnitProblem, display_unit, si_factor, split_header

__all__ = [
    "WARNING_SIGN",
    "CellError",
    "read_field",
    "read_flag",
    "read_rule",
    "read_layer_number",
    "result_factor",
    "single_value",
    "is_empty",
    "looks_numeric",
    "flatten",
]

WARNING_SIGN = "⚠"

# Units the results are given in when no result unit is asked for: SI, stable whatever the
# inputs' units, so a formula's meaning never changes with the units of its inputs.
DEFAULT_RESULT_UNIT: Mapping[str, str] = MappingProxyType(
    {kind: display_unit(kind, "SI") for kind in ("length", "stress", "torque", "power",
                                                 "speed", "angle", "angle_per_length")}
    | {"dimensionless": ""}
)


class CellError(InputRefused):
    """An argument or result a cell function cannot use; ``str()`` is what the cell shows.

    Parameters
    ----------
    where : str
        The argument, and the row or layer when there is one: ``"outer diameter, row 2"``.
    what : str
        What is wrong, worded by the intake.
    """

    def __init__(self, where: str, what: str) -> None:
        self.where = where
        self.what = what
        super().__init__(f"{WARNING_SIGN} {where}: {what}" if where else f"{WARNING_SIGN} {what}")


def is_number(value: object) -> bool:
    """A real number that is not a yes/no."""
    return isinstance(value, (int, float)) and not isinstance(value, bool)


def looks_numeric(value: object) -> bool:
    """A number, or text that starts like one (``"52 mm"``)."""
    if is_number(value):
        return True
    if not isinstance(value, str):
        return False
    text = value.lstrip()
    if text[:1] in "+-":
        text = text[1:]
    return text[:1].isdigit() or (text[:1] == "." and text[1:2].isdigit())


def flatten(value: Any) -> list[Any]:
    """A range's cells in reading order (one level of nesting)."""
    flat: list[Any] = []
    for item in value:
        if isinstance(item, (list, tuple)):
            flat.extend(item)
        else:
            flat.append(item)
    return flat


def single_value(value: Any, where: str) -> Any:
    """The one cell value in `value` (a scalar, or a range holding one cell).

    Raises
    ------
    CellError
        If a range of several cells is given where one cell is expected.
    """
    while isinstance(value, (list, tuple)):
        if len(value) != 1:
            raise CellError(where, f"expected one cell, got a range of {len(value)} cells")
        value = value[0]
    return value


def is_empty(value: Any) -> bool:
    """An empty cell, blank text, or a range of nothing but those."""
    if isinstance(value, (list, tuple)):
        return all(is_empty(v) for v in value)
    return value is None or (isinstance(value, str) and not value.strip())


def _no_unit_advice(raw: object, field: Field) -> str:
    example = display_unit(field.kind, "SI") if field.kind in DEFAULT_RESULT_UNIT else ""
    return (f"no unit: write it with its unit, e.g. '{raw} {example}', or give the value and its unit "
            "in two cells")


def value_and_unit(value: Any, where: str) -> tuple[Any, str | None]:
    """One argument as (cell value, unit text from a neighbouring cell or header, or None).

    Accepted: ``"52 mm"``; a pair of cells, value and unit (``B2:C2`` holding ``52`` and ``mm``),
    or header and value (``"Length [mm]"`` above ``1200``).
    """
    if not isinstance(value, (list, tuple)):
        return value, None
    flat = flatten(value)
    if len(flat) == 1:
        return flat[0], None
    if len(flat) == 2:
        first, second = flat
        pair = pair_kind(first, second)
        if pair == "header":
            return second, split_header(first)[1]
        if pair == "unit":
            return first, second.strip()
        raise CellError(where, "expected one cell, or a value and its unit in two cells")
    raise CellError(where, f"expected one cell, got a range of {len(flat)} cells")


def pair_kind(first: Any, second: Any) -> str | None:
    """Whether two cells are one value: ``"header"`` (a header with its unit, then the value),
    ``"unit"`` (the value, then its unit) or None."""
    if isinstance(first, str) and not looks_numeric(first) and "[" in first:
        return "header"
    if isinstance(second, str) and second.strip() and not looks_numeric(second) \
            and error_value_text(second) is None:
        return "unit"
    return None


def read_field(value: Any, field: Field, where: str, *, unit: str | None = None) -> float:
    """An SI float of `field` from one argument, by the intake's rule for that field.

    The plausible range, the sign rule, the units accepted and the wording are the field's,
    exactly as a table column of that field is read.

    Raises
    ------
    CellError
        Empty, a spreadsheet error, a wrong dimension, a missing unit, an implausible value...
    """
    raw, pair_unit = value_and_unit(value, where)
    unit = pair_unit or unit
    read = _read_plain if type(raw) in (str, float, int) else _read
    got, problem = read(raw, field, unit)
    if problem is not None:
        raise CellError(where, problem)
    return got


def _read(raw: Any, field: Field, unit: str | None) -> tuple[float, str | None]:
    if raw is None or (isinstance(raw, str) and not raw.strip()):
        return math.nan, f"cell is empty; expected {describe_kind(field.kind)}"
    error = error_value_text(raw)
    factor, header_issue = header_factor(field, unit, field.description)
    if unit is None and field.needs_unit:
        header_issue = _no_unit_advice(raw, field)
    got, problem, _code = cell_value(raw, field, unit, factor, header_issue, is_error=error is not None)
    return got, problem


# A recalculating sheet passes the same texts and numbers again and again: each distinct
# (value, field, unit) is read once. Typed, so that TRUE is never taken for 1.
_read_plain = lru_cache(maxsize=4096, typed=True)(_read)


def read_flag(value: Any, where: str, default: bool = False) -> bool:
    """A yes/no argument (the intake's words: TRUE/FALSE, yes/no, y/n, 1/0, with/without keyway)."""
    value = single_value(value, where)
    error = error_value_text(value)
    if error is not None:
        raise CellError(where, f"cell holds the error {error}")
    if is_empty(value):
        return default
    got = flag_from_value(value)
    if got is None:
        raise CellError(where, f"expected yes or no, got {value!r}")
    return got


def read_rule(value: Any, where: str) -> AllowableRule:
    """An allowable rule by name (the intake's words); case, spaces, ``-`` and ``_`` do not matter."""
    value = single_value(value, where)
    error = error_value_text(value)
    if error is not None:
        raise CellError(where, f"cell holds the error {error}")
    rule = rule_from_text(value)
    if rule is None:
        raise CellError(where, f"expected one of: {RULE_CHOICES}; got {value!r}")
    return rule


def read_layer_number(value: Any, n_layers: int, where: str) -> int | None:
    """A 1-based layer number (1 = innermost) as a 0-based slot; empty gives None."""
    value = single_value(value, where)
    if is_empty(value):
        return None
    number = value if is_number(value) else math.nan
    if isinstance(value, str):
        try:
            number = float(value)
        except ValueError:
            number = math.nan
    if not (math.isfinite(number) and number == int(number) and 1 <= number <= n_layers):
        raise CellError(where, f"expected a layer number from 1 to {n_layers}, got {value!r}")
    return int(number) - 1


def result_factor(result_unit: Any, kind: str) -> float:
    """The SI factor of the unit a result is asked for in (empty: the SI default of `kind`).

    Divide an SI result by it.
    """
    if result_unit is None or type(result_unit) is str:
        return _text_result_factor(result_unit, kind)
    return _result_factor(result_unit, kind)


def _result_factor(result_unit: Any, kind: str) -> float:
    unit = single_value(result_unit, "result unit")
    if is_empty(unit):
        unit = DEFAULT_RESULT_UNIT[kind]
    error = error_value_text(unit)
    if error is not None:
        raise CellError("result unit", f"cell holds the error {error}")
    if not isinstance(unit, str):
        raise CellError("result unit", f"expected a unit such as "
                        f"'{DEFAULT_RESULT_UNIT[kind] or '%'}', got {unit!r}")
    try:
        return si_factor(unit, kind)
    except UnitProblem as problem:
        raise CellError("result unit", str(problem)) from None


# A recalculating sheet asks for the same few result units again and again (refusals are not
# cached: lru_cache keeps only returned values).
_text_result_factor = lru_cache(maxsize=256)(_result_factor)
