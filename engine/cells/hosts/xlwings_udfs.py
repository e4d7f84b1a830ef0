"""The Excel host: every registered cell function declared to xlwings as a worksheet function.

Set xlwings' **UDF Modules** to ``twistshare.engine.cells.hosts.xlwings_udfs``. On import, each
function of `twistshare.engine.cells.registry()` is wrapped with xlwings' ``func``, ``arg`` (the
argument's one-line description; blocks as 2-D ranges) and ``ret`` decorators and bound here
under its own name. Excel's error values arrive either as text (``err_to_str``) or, from the
COM interface, as integer codes: both become the error's text before a function sees them.
On Linux and macOS xlwings' decorators do nothing, so the module imports everywhere.
"""

from __future__ import annotations

import functools
from collections.abc import Callable, Mapping
from types import MappingProxyType
from typing import Any

import xlwings as xw
from twistshare.engine.cells import CATEGORY, CellFunction, registry

__all__ = [spec.name for spec in registry()] + ["com_error_text"]

# The integer codes the Excel COM interface uses for error cells (when errors are not
# converted to text), as xlwings documents them.
_COM_ERRORS: Mapping[int, str] = MappingProxyType(
    {
        -2146826281: "#DIV/0!",
        -2146826246: "#N/A",
        -2146826259: "#NAME?",
        -2146826288: "#NULL!",
        -2146826252: "#NUM!",
        -2146826265: "#REF!",
        -2146826273: "#VALUE!",
    }
)


def com_error_text(value: object) -> object:
    """An Excel COM error code as its error text (``-2146826246`` -> ``"#N/A"``); else the value."""
    if isinstance(value, int) and not isinstance(value, bool):
        return _COM_ERRORS.get(value, value)
    if isinstance(value, (list, tuple)):
        return [com_error_text(v) for v in value]
    return value


def _declare(spec: CellFunction) -> Callable[..., Any]:
    @functools.wraps(spec.function)
    def call(*args: Any, **kwargs: Any) -> Any:
        return spec.function(*(com_error_text(a) for a in args),
                             **{k: com_error_text(v) for k, v in kwargs.items()})

    declared: Any = xw.ret()(call)  # plain values or lists of lists: dynamic arrays spill them
    for argument in reversed(spec.arguments):
        options: dict[str, Any] = {"doc": argument.description, "err_to_str": True}
        if argument.block:
            options["ndim"] = 2
        declared = xw.arg(argument.name, **options)(declared)
    # xw.func last: xlwings' arg/ret decorators reset the category otherwise.
    declared = xw.func(category=CATEGORY)(declared)
    info = getattr(declared, "__xlfunc__", None)
    if info is not None:
        # Excel's function wizard shows this text; xlwings would take the whole docstring.
        info["ret"]["doc"] = spec.description
    return declared


for _spec in registry():
    globals()[_spec.name] = _declare(_spec)
del _spec
