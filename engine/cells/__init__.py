"""The engine's worksheet-function surface: ``TWS_...`` functions for spreadsheet cells.

Each function reads its arguments through the intake (the same rule per field as a workbook
table's column), calls the engine core and converts the result. A cell that cannot be computed
shows a short message starting with ``⚠`` instead of a number. `registry()` describes every
function for the spreadsheet hosts (`hosts.xlwings_udfs` for Excel; LibreOffice Calc), which
are generated from it.

Examples
--------
>>> from twistshare.engine.cells import TWS_TORQUE_FROM_POWER
>>> round(TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm"), 1)
98.8
"""

from typing import Any

from . import (
    _functions,
    _functions_bending,
    _functions_scalar,
    _functions_sizing,
    _functions_sleeves,
    _functions_stress,
)
from ._functions import TWS_GOVERNING_LIMIT, TWS_GOVERNS, TWS_LAYER_CAPACITY, TWS_MARGIN, TWS_SHARE
from ._functions_bending import (
    TWS_BENDING_STRESS,
    TWS_BUCKLING_TORQUE,
    TWS_COMBINED_STRESS,
    TWS_CRITICAL_SPEED,
    TWS_LAMINATE_E,
    TWS_LAMINATE_G,
)
from ._functions_scalar import TWS_ALLOWABLE, TWS_TORQUE_FROM_POWER
from ._functions_sizing import TWS_RESTORE_SLEEVE, TWS_SIZE_FOR, TWS_STOCK_SIZE
from ._functions_sleeves import (
    TWS_BOND_STRESS,
    TWS_FIT_PRESSURE,
    TWS_PLASTIC_TORQUE,
    TWS_SLIP_TORQUE,
    TWS_TORQUE_TWIST,
)
from ._functions_stress import TWS_STRESS, TWS_STRESS_AT, TWS_TWIST_ANGLE, TWS_TWIST_PER_LENGTH
from ._registry import CATEGORY, Argument, CellFunction, function_spec

__all__ = [
    # in the registry's order
    "TWS_SHARE", "TWS_LAYER_CAPACITY", "TWS_GOVERNING_LIMIT", "TWS_GOVERNS", "TWS_MARGIN", "TWS_STRESS",
    "TWS_STRESS_AT", "TWS_TWIST_ANGLE", "TWS_TWIST_PER_LENGTH", "TWS_TORQUE_FROM_POWER", "TWS_ALLOWABLE",
    "TWS_SIZE_FOR", "TWS_STOCK_SIZE", "TWS_RESTORE_SLEEVE",
    "TWS_BENDING_STRESS", "TWS_COMBINED_STRESS", "TWS_CRITICAL_SPEED", "TWS_LAMINATE_G", "TWS_LAMINATE_E",
    "TWS_BUCKLING_TORQUE",
    "TWS_FIT_PRESSURE", "TWS_SLIP_TORQUE", "TWS_BOND_STRESS", "TWS_PLASTIC_TORQUE", "TWS_TORQUE_TWIST",
    "registry", "list_functions", "CellFunction", "Argument", "CATEGORY",
]


#: The modules of cell functions, in the order the hosts list them; a new module adds one entry.
_MODULES = (_functions, _functions_stress, _functions_scalar, _functions_sizing, _functions_bending,
            _functions_sleeves)


def registry() -> tuple[CellFunction, ...]:
    """Every cell function as the hosts offer it, in a stable order (fresh on every call)."""
    return tuple(function_spec(getattr(module, name)) for module in _MODULES for name in module.__all__)


def list_functions() -> list[dict[str, Any]]:
    """Every cell function with its arguments (and their units) and a one-line description.

    Returns
    -------
    list of dict
        Fresh on every call. Keys: ``name``, ``description``, ``returns``, ``shape``,
        ``arguments`` (a list of dicts with ``name``, ``description``, ``unit``, ``block``,
        ``optional``).
    """
    return [spec.as_dict() for spec in registry()]
