"""A cell value (number, or number and unit) as an SI float, and a column header split into its
name and unit."""

from __future__ import annotations

import datetime as _dt
import math
import numbers
import re

import numpy as np

from ._factors import _factor, si_offset
from ._kinds import _DISPLAY, _KIND_PHRASE, UnitProblem, _check_kind_name

# The error values spreadsheets show in a cell (Excel's and LibreOffice's), in capitals: the one
# list every reader of a cell consults.
ERROR_VALUES: frozenset[str] = frozenset({
    "#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A", "#GETTING_DATA",
    "#SPILL!", "#CALC!", "#FIELD!", "#BLOCKED!", "#CONNECT!", "#BUSY!", "#UNKNOWN!",
    "#EXTERNAL!", "#PYTHON!", "ERR:502", "ERR:504", "ERR:508", "ERR:522", "ERR:523",
})


def error_value_text(value: object) -> str | None:
    """The spreadsheet error a cell's text stands for (``"#N/A"``), or None if it is not one."""
    if isinstance(value, str):
        stripped = value.strip().upper()
        return stripped if stripped in ERROR_VALUES else None
    return None


_NUMBER = re.compile(
    # A unit right after the number must not start with a digit, comma or point ("1.200,5" is a
    # decimal comma, not 1 and a unit ".200,5"); after a space it may ("1450 1/min").
    r"\s*(?P<num>[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)(?P<unit>(?:\s+\S.*|[^\d\s,.].*)?)\s*\Z",
    re.DOTALL,
)
_COMMA_NUMBER = re.compile(r"\s*[+-]?\d*[,.]?\d+,\d")
_THOUSANDS_COMMA = re.compile(r"\s*[+-]?\d{1,3}(?:,\d{3})+(?!\d)")
_SPACED_DIGITS = re.compile(r"\s*[+-]?\d{1,3}(?:[ \u00a0\u202f\u2009]\d{3})+(?!\d)")


def _format_number(value: float) -> str:
    return f"{value:g}"


def parse_value(text_or_number: object, kind: str, default_unit: str | None = None) -> float:
    """Read a cell value as an SI float of `kind`.

    Parameters
    ----------
    text_or_number : str, int or float
        ``52``, ``52.0``, ``"52"``, ``"52 mm"``, ``"52mm"``, ``"1.5e3 N·m"``. A unit in the text
        overrides `default_unit` (a cell's own unit overrides its column header's).
    kind : str
        One of `KINDS`.
    default_unit : str or None
        The unit for a bare number, e.g. from the column header. None: a bare number is
        refused unless `kind` is ``"dimensionless"``.

    Returns
    -------
    float
        The value in the SI unit of `kind` (m, Pa, N·m, W, rad/s, rad, rad/m, kg/m³, 1).
        Signs and sizes are not judged here; the engine core does that.

    Raises
    ------
    UnitProblem
        Empty cell, a spreadsheet error value (``#N/A``), text that is not a number and a unit, a comma in the
        number (``"12,5 mm"``, ``"1,200 N·m"``), NaN or infinity, a yes/no value, a date, a
        bare number with no unit to go by, or a unit problem (see `si_factor`).

    Examples
    --------
    >>> round(parse_value("52 mm", "length"), 9)
    0.052
    >>> round(parse_value(2, "length", "in"), 9)
    0.0508
    """
    _check_kind_name(kind)
    value = text_or_number
    error = error_value_text(value)
    if error is not None:
        raise UnitProblem(error, kind, "a spreadsheet error value", message=f"cell holds the error {error}")
    if value is None:
        raise UnitProblem("", kind, "empty", message=f"cell is empty; expected {_KIND_PHRASE[kind]}")
    if isinstance(value, (bool, np.bool_)):
        raise UnitProblem(str(value).upper(), kind, "a yes/no value")
    if isinstance(value, (_dt.date, _dt.datetime, _dt.time, _dt.timedelta)):
        raise UnitProblem(str(value), kind, "a date or time")
    if isinstance(value, numbers.Real):
        number = float(value)
        unit_text = None
        shown = _format_number(number)
    elif isinstance(value, str):
        shown = value.strip()
        if not shown:
            raise UnitProblem("", kind, "empty",
                              message=f"cell is empty; expected {_KIND_PHRASE[kind]}")
        match = None if _SPACED_DIGITS.match(value) else _NUMBER.match(value)
        if match is None:
            if _THOUSANDS_COMMA.match(value):
                raise UnitProblem(shown, kind, "a comma in the number",
                                  "it could be a thousands separator or a decimal comma; "
                                  "write the number with no separators and a decimal point, "
                                  "e.g. '1200' or '1.2'")
            if _COMMA_NUMBER.match(value):
                raise UnitProblem(shown, kind, "a decimal comma",
                                  "write a decimal point, e.g. '12.5'")
            if _SPACED_DIGITS.match(value):
                raise UnitProblem(shown, kind, "digits separated by spaces",
                                  "write the number with no separators, e.g. '1200'")
            raise UnitProblem(shown, kind, "not a number with a unit")
        number = float(match.group("num"))
        unit_text = match.group("unit").strip() or None
    else:
        raise UnitProblem(repr(value)[:60], kind, f"a {type(value).__name__}, not a number")
    if not math.isfinite(number):
        raise UnitProblem(shown, kind, "not a finite number")
    if unit_text is None:
        unit_text = default_unit
    if unit_text is None:
        if kind == "dimensionless":
            return number
        example = _DISPLAY[(kind, "SI")]
        raise UnitProblem(shown, kind, "no unit",
                          f"write it with its unit, e.g. '{shown} {example}', "
                          "or put the unit in the column header")
    factor, problem = _factor(unit_text, kind) if isinstance(unit_text, str) else (
        None, UnitProblem(repr(unit_text), kind, "not a unit text"))
    if problem is not None:
        raise problem
    if kind == "temperature":
        return number * factor + si_offset(unit_text, kind)
    return number * factor


_HEADER = re.compile(r"\A(?P<name>.*?)\s*\[(?P<unit>[^\[\]]*)\]\s*\Z", re.DOTALL)


def split_header(header: object) -> tuple[str, str | None]:
    """Split a column header into its name and the unit in a trailing ``[...]``.

    Parameters
    ----------
    header : str
        ``"Outer diameter [mm]"``, ``"G [GPa]"``, ``"Kt"``. Non-text headers are read as text.

    Returns
    -------
    (str, str or None)
        The name with surrounding spaces removed, and the unit text (None when there are no
        brackets or they are empty). Only square brackets count: ``"Layer (core)"`` keeps its
        parentheses in the name. The unit is not checked here; pass it to `si_factor`.

    Examples
    --------
    >>> split_header("Outer diameter [mm]")
    ('Outer diameter', 'mm')
    >>> split_header("Material")
    ('Material', None)
    """
    if header is None:
        return "", None
    text = str(header).strip()
    match = _HEADER.match(text)
    if match is None:
        return text, None
    unit = match.group("unit").strip()
    return match.group("name").strip(), unit or None

