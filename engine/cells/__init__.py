"""The engine's worksheet-function surface: ``TWS_...`` functions for spreadsheet cells.

Each function is declared with xlwings' decorators (one-line descriptions for the function
help), reads its cells through the one unit registry (`twistshare.engine.units`), calls the
engine core and converts the result. A cell that cannot be computed shows a short message
starting with ``⚠`` instead of a number.

Examples
--------
>>> from twistshare.engine.cells import TWS_TORQUE_FROM_POWER
>>> round(TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm"), 1)
98.8
"""

from typing import Any

from . import _functions
from ._declare import describe_function
from ._functions import (
    TWS_ALLOWABLE,
    TWS_GOVERNING_LIMIT,
    TWS_GOVERNS,
    TWS_LAYER_CAPACITY,
    TWS_MARGIN,
    TWS_SHARE,
    TWS_STRESS,
    TWS_STRESS_AT,
    TWS_TORQUE_FROM_POWER,
    TWS_TWIST_ANGLE,
    TWS_TWIST_RATE,
)

__all__ = [*_functions.__all__, "list_functions"]


def list_functions() -> list[dict[str, Any]]:
    """Every cell function with its arguments (and their units) and a one-line description.

    Returns
    -------
    list of dict
        Fresh on every call. Keys: ``name``, ``description``, ``returns``, ``arguments``
        (a list of dicts with ``name``, ``description``, ``unit``, ``optional``).
    """
    functions = globals()
    return [describe_function(functions[name]) for name in __all__ if name.startswith("TWS_")]
