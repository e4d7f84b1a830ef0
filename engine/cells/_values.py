"""Reading single worksheet arguments and writing results back: the cell functions' edge.

Cell values arrive as xlwings hands them over: floats (whole numbers may be ints), strings,
None for an empty cell, bools, Excel errors as text (``"#N/A"``, with ``err_to_str``) or as
the COM integer codes, a 1-D list for a one-row or one-column range, a list of lists for a
block. Every reader raises `CellError`, whose text is what the cell shows.
"""

from __future__ import annotations

import math
import numbers
import re
from collections.abc import Sequence
from types import MappingProxyType
from typing import Any, Mapping

import numpy as np

from twistshare.engine.core import AllowableRule
from twistshare.engine.units import (
    UnitProblem,
    display_unit,
    excel_error_text,
    parse_value,
    si_factor,
    split_header,
)

__all__ = [
    "WARNING_SIGN",
    "CellError",
    "read_quantity",
    "read_optional_quantity",
    "read_number",
    "read_flag",
    "read_rule",
    "read_layer_number",
    "result_factor",
    "single_value",
    "is_empty",
    "looks_numeric",
]

WARNING_SIGN = "⚠"

# Units the results are given in when no result unit is asked for: SI, stable whatever the
# inputs' units, so a formula's meaning never changes with the units of its inputs.
DEFAULT_RESULT_UNIT: Mapping[str, str] = MappingProxyType(
    {kind: display_unit(kind, "SI") for kind in ("length", "stress", "torque", "power",
                                                 "speed", "angle", "angle_per_length")}
    | {"dimensionless": ""}
)


class CellError(Exception):
    """An argument or result a cell function cannot use; ``str()`` is what the cell shows.

    Parameters
    ----------
    where : str
        The argument, and the row or layer when there is one: ``"outer diameter, row 2"``.
    what : str
        What is wrong, usually a `UnitProblem`'s message.
    """

    def __init__(self, where: str, what: str) -> None:
        self.where = where
        self.what = what
        super().__init__(f"{WARNING_SIGN} {where}: {what}" if where else f"{WARNING_SIGN} {what}")


def _is_number(value: object) -> bool:
    return isinstance(value, numbers.Real) and not isinstance(value, (bool, np.bool_))


_NUMBER_START = re.compile(r"\s*[+-]?(?:\d|\.\d)")


def looks_numeric(value: object) -> bool:
    return _is_number(value) or (isinstance(value, str) and _NUMBER_START.match(value) is not None)


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


def _flatten(value: Sequence[Any]) -> list[Any]:
    flat: list[Any] = []
    for item in value:
        if isinstance(item, (list, tuple)):
            flat.extend(item)
        else:
            flat.append(item)
    return flat


def read_quantity(value: Any, kind: str, where: str, *, zero_needs_no_unit: bool = False) -> float:
    """An SI float of `kind` from one argument.

    Accepted: ``"52 mm"``; a pair of cells, value and unit (``B2:C2`` holding ``52`` and
    ``mm``), or header and value (``"Length [mm]"`` above ``1200``); a bare number only for a
    plain-number kind (or zero, when `zero_needs_no_unit`).

    Raises
    ------
    CellError
        Empty, an Excel error, a wrong dimension, a missing unit, ...
    """
    unit = None
    if isinstance(value, (list, tuple)):
        flat = _flatten(value)
        if len(flat) == 1:
            value = flat[0]
        elif len(flat) == 2:
            first, second = flat
            if isinstance(first, str) and not looks_numeric(first) and "[" in first:
                unit = split_header(first)[1]
                value = second
            elif isinstance(second, str) and not looks_numeric(second):
                value, unit = first, second.strip() or None
            else:
                raise CellError(where, "expected one cell, or a value and its unit in two cells")
        else:
            raise CellError(where, f"expected one cell, got a range of {len(flat)} cells")
    if zero_needs_no_unit and _is_number(value) and value == 0 and unit is None:
        return 0.0
    try:
        return parse_value(value, kind, unit)
    except UnitProblem as problem:
        raise CellError(where, str(problem)) from None


def is_empty(value: Any) -> bool:
    value = value[0] if isinstance(value, (list, tuple)) and len(value) == 1 else value
    return value is None or (isinstance(value, str) and not value.strip()) or (
        isinstance(value, (list, tuple)) and all(is_empty(v) for v in value)
    )


def read_optional_quantity(value: Any, kind: str, where: str) -> float:
    """Like `read_quantity`, but an empty argument gives NaN ("not given")."""
    if is_empty(value):
        return math.nan
    return read_quantity(value, kind, where)


def read_number(value: Any, where: str, default: float | None = None) -> float:
    """A plain number (a factor of safety, Kt, a service factor); empty gives `default`."""
    if is_empty(value) and default is not None:
        return default
    return read_quantity(value, "dimensionless", where)


_YES = frozenset({"yes", "y", "true", "1", "x", "keyway"})
_NO = frozenset({"no", "n", "false", "0", "none", "-"})


def read_flag(value: Any, where: str, default: bool = False) -> bool:
    """A yes/no argument: TRUE/FALSE, yes/no, y/n, 1/0; empty gives `default`."""
    value = single_value(value, where)
    error = excel_error_text(value)
    if error is not None:
        raise CellError(where, f"cell holds the error {error}")
    if value is None:
        return default
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    if _is_number(value) and value in (0, 1):
        return bool(value)
    if isinstance(value, str):
        word = value.strip().casefold()
        if not word:
            return default
        if word in _YES:
            return True
        if word in _NO:
            return False
    raise CellError(where, f"expected yes or no, got {value!r}")


def _rule_key(text: str) -> str:
    return re.sub(r"[\s_\-]+", " ", text).strip().casefold()


# Rule names as the materials table writes them, plus the published methods' own names.
RULE_NAMES: Mapping[str, AllowableRule] = MappingProxyType(
    {
        "given": AllowableRule.GIVEN,
        "max shear": AllowableRule.MAX_SHEAR,
        "maximum shear": AllowableRule.MAX_SHEAR,
        "max shear stress": AllowableRule.MAX_SHEAR,
        "maximum shear stress": AllowableRule.MAX_SHEAR,
        "tresca": AllowableRule.MAX_SHEAR,
        "distortion energy": AllowableRule.DISTORTION_ENERGY,
        "von mises": AllowableRule.DISTORTION_ENERGY,
        "mises": AllowableRule.DISTORTION_ENERGY,
        "shafting code": AllowableRule.SHAFTING_CODE,
        "transmission shafting code": AllowableRule.SHAFTING_CODE,
        "code": AllowableRule.SHAFTING_CODE,
    }
)


def read_rule(value: Any, where: str) -> AllowableRule:
    """An allowable rule by name: ``max shear`` (Tresca), ``distortion energy`` (von Mises),
    ``shafting code``, ``given``; case, spaces, hyphens and underscores do not matter."""
    value = single_value(value, where)
    error = excel_error_text(value)
    if error is not None:
        raise CellError(where, f"cell holds the error {error}")
    if isinstance(value, str) and _rule_key(value) in RULE_NAMES:
        return RULE_NAMES[_rule_key(value)]
    raise CellError(
        where,
        f"expected 'max shear', 'distortion energy' or 'shafting code', got {value!r}",
    )


def read_layer_number(value: Any, n_layers: int, where: str) -> int | None:
    """A 1-based layer number (1 = innermost) as a 0-based slot; empty gives None."""
    value = single_value(value, where)
    if is_empty(value):
        return None
    number = read_quantity(value, "dimensionless", where)
    if not (number == int(number) and 1 <= number <= n_layers):
        raise CellError(where, f"expected a layer number from 1 to {n_layers}, got {value!r}")
    return int(number) - 1


def result_factor(result_unit: Any, kind: str) -> float:
    """The SI factor of the unit a result is asked for in (empty: the SI default of `kind`).

    Divide an SI result by it.
    """
    unit = single_value(result_unit, "result unit")
    if unit is None or (isinstance(unit, str) and not unit.strip()):
        unit = DEFAULT_RESULT_UNIT[kind]
    error = excel_error_text(unit)
    if error is not None:
        raise CellError("result unit", f"cell holds the error {error}")
    if not isinstance(unit, str):
        raise CellError("result unit", f"expected a unit such as "
                        f"'{DEFAULT_RESULT_UNIT[kind] or '%'}', got {unit!r}")
    try:
        return si_factor(unit, kind)
    except UnitProblem as problem:
        raise CellError("result unit", str(problem)) from None
