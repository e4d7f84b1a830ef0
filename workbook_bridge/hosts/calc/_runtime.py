"""Calling a cell function with the values LibreOffice hands over, next to the engine.

This runs where the engine is importable: inside LibreOffice's own Python (when its build
matches the engine's) or in the helper process (`_helper`). It fits LibreOffice's values to the
shapes the cell functions take from xlwings, and the results back to what Basic can hand to
Calc. It computes nothing itself.

LibreOffice hands a Basic function a cell range as a 2-D array; the bridge sees it as a tuple of
row tuples. Empty cells are None, whole numbers come as int (Basic's choice), a left-out argument
in the middle of a formula (``f(a;;c)``) arrives as 0 (Calc's choice: it cannot be told from a
typed 0): see `_left_out`.
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Iterable, Sequence
from typing import Any

from ._names import SETUP_COMMAND
from ._specs import HostArgument, HostFunction, _function_specs

__all__ = ["Runtime", "from_calc", "to_calc", "WARNING_SIGN"]

WARNING_SIGN = "\u26a0"
NOT_COMPUTED = f"{WARNING_SIGN} not computed"


def _plain(value: Any) -> Any:
    """One cell value as xlwings would give it: float, str, bool or None."""
    if value is None or isinstance(value, (str, float, bool)):
        return value
    if isinstance(value, numbers.Integral):
        return float(value)
    if isinstance(value, numbers.Real):
        return float(value)
    return str(value)


def _rows(value: Sequence[Any]) -> list[list[Any]]:
    return [[_plain(v) for v in row] if isinstance(row, (tuple, list)) else [_plain(row)] for row in value]


def from_calc(value: Any, *, block: bool) -> Any:
    """An argument as LibreOffice gives it, in the shape the cell functions take from xlwings.

    Parameters
    ----------
    value : Any
        A scalar, or a tuple of row tuples for a range.
    block : bool
        The argument is a block (xlwings' ``ndim=2``): always a list of lists, even for one cell.

    Returns
    -------
    Any
        Blocks: a list of lists (None stays None). Other arguments follow xlwings' default:
        one cell gives its value, one row or one column a flat list, a 2-D range a list of lists.
    """
    if value is None:
        return None
    if not isinstance(value, (tuple, list)):
        return [[_plain(value)]] if block else _plain(value)
    rows = _rows(value)
    if block:
        return rows
    if len(rows) == 1 and len(rows[0]) == 1:
        return rows[0][0]
    if len(rows) == 1:
        return rows[0]
    if all(len(r) == 1 for r in rows):
        return [r[0] for r in rows]
    return rows


def _cell_out(value: Any) -> Any:
    if hasattr(value, "item") and getattr(value, "ndim", 1) == 0:
        value = value.item()  # a numpy scalar
    if value is None:
        return ""
    if isinstance(value, str):
        return value
    if isinstance(value, bool):
        return 1.0 if value else 0.0
    if isinstance(value, numbers.Real):
        number = float(value)
        return number if math.isfinite(number) else NOT_COMPUTED
    return str(value)


def to_calc(result: Any) -> Any:
    """A cell function's result as Basic hands it to Calc: one value, or a rectangle of rows.

    Returns
    -------
    float, str or tuple of tuples
        None becomes '' (an empty-looking cell), NaN and infinities a ``⚠`` text; rows are padded
        with '' to the longest; a flat list becomes one row (as xlwings spills it).
    """
    if hasattr(result, "tolist") and getattr(result, "ndim", 0) >= 1:
        result = result.tolist()
    if not isinstance(result, (list, tuple)):
        return _cell_out(result)
    if not result:
        return ""
    if not any(isinstance(row, (list, tuple)) for row in result):
        result = [result]
    rows = [[_cell_out(v) for v in row] if isinstance(row, (list, tuple)) else [_cell_out(row)]
            for row in result]
    width = max(len(r) for r in rows) or 1
    return tuple(tuple(r + [""] * (width - len(r))) for r in rows)


def _left_out(value: Any, argument: HostArgument) -> bool:
    """An optional argument Calc handed over as "not given".

    ``""`` always. A bare 0 too where 0 cannot be a valid value: for a block, and for an argument
    that takes a unit (a unit text, a length, an angle, ...; the engine refuses a number without
    its unit). That 0 is how Calc passes a left-out argument (``f(a;;c)``); a plain-number
    argument (a factor of safety, a layer number) keeps its 0 and gets the engine's message.
    """
    if not argument.optional:
        return False
    if isinstance(value, str):
        return value == ""
    is_zero = isinstance(value, numbers.Real) and not isinstance(value, bool) and value == 0
    return is_zero and (argument.block or bool(argument.unit))


class Runtime:
    """The cell functions by name, called with LibreOffice's values.

    Parameters
    ----------
    specs : iterable of HostFunction, optional
        Default: `_function_specs()`.
    """

    def __init__(self, specs: Iterable[HostFunction] | None = None) -> None:
        chosen = tuple(_function_specs() if specs is None else specs)
        self._by_name: dict[str, HostFunction] = {f.name.upper(): f for f in chosen}

    @property
    def names(self) -> tuple[str, ...]:
        """The functions this runtime serves."""
        return tuple(f.name for f in self._by_name.values())

    def call(self, name: str, args: Sequence[Any]) -> Any:
        """Call function `name` with LibreOffice's argument values; never raises.

        Returns
        -------
        float, str or tuple of tuples
            The cell value (see `to_calc`), or a ``⚠`` message saying why there is none.
        """
        spec = self._by_name.get(str(name).upper())
        if spec is None:
            return (f"{WARNING_SIGN} {name} is not a twistshare cell function here; run "
                    f"`{SETUP_COMMAND}` again after updating twistshare")
        args = list(args or ())
        if len(args) > len(spec.arguments):
            return f"{WARNING_SIGN} {spec.name} takes at most {len(spec.arguments)} arguments, got {len(args)}"
        args += [None] * (len(spec.arguments) - len(args))
        try:
            values = [None if _left_out(v, a) else from_calc(v, block=a.block) for v, a in zip(args, spec.arguments)]
            return to_calc(spec.function(*values))
        except Exception as error:  # the cell shows why; nothing may escape into Calc
            return f"{WARNING_SIGN} {spec.name} could not compute: {type(error).__name__}: {error}"

