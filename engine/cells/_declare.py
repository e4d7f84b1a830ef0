"""Declaring a cell function once: xlwings' decorators, the error boundary and the catalogue.

Each cell function is declared with `cell_function`, which applies xlwings' ``func``, ``arg``
(with the argument's one-line doc) and ``ret`` decorators, and records the same
descriptions for `list_functions` (``twistshare functions``). On Linux and macOS xlwings'
decorators do nothing, so the record is kept here rather than read back from xlwings.

The decorators are looked up on the ``xlwings`` module when a function is declared, so a
test can put xlwings' Windows decorators in their place and load the module again.
"""

from __future__ import annotations

import functools
import inspect
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any, TypeVar

import xlwings as xw

from ._values import WARNING_SIGN, CellError

__all__ = ["Argument", "FunctionSpec", "cell_function", "describe_function", "CATEGORY"]

CATEGORY = "twistshare"

F = TypeVar("F", bound=Callable[..., Any])


@dataclass(frozen=True)
class Argument:
    """One argument of a cell function.

    Parameters
    ----------
    name : str
        The Python parameter name, which Excel shows.
    description : str
        One line for the spreadsheet's function help.
    unit : str
        The units it takes, e.g. ``"length: mm, in, ..."``; empty for text and blocks.
    block : bool
        A range of several rows and columns (read as a list of lists).
    """

    name: str
    description: str
    unit: str = ""
    block: bool = False


@dataclass(frozen=True)
class FunctionSpec:
    """A cell function's name, one-line description, arguments and what it returns."""

    name: str
    description: str
    arguments: tuple[Argument, ...]
    returns: str


def _boundary(function: Callable[..., Any]) -> Callable[..., Any]:
    """Whatever goes wrong, the cell shows a short message, never a traceback."""

    @functools.wraps(function)
    def guarded(*args: Any, **kwargs: Any) -> Any:
        try:
            return function(*args, **kwargs)
        except CellError as error:
            return str(error)
        except Exception as error:  # the last line of defence for a cell: report, don't raise
            return f"{WARNING_SIGN} {function.__name__} could not compute: {type(error).__name__}: {error}"

    return guarded


def cell_function(description: str, *arguments: Argument, returns: str) -> Callable[[F], F]:
    """Declare a worksheet function: xlwings decorators, error boundary, catalogue entry.

    Parameters
    ----------
    description : str
        One line for the function help.
    *arguments : Argument
        In the order of the function's parameters; every parameter must be described.
    returns : str
        What the cell (or the spilled range) shows.

    Raises
    ------
    ValueError
        If the arguments do not match the function's parameters (a declaration error).
    """

    def declare(function: F) -> F:
        names = list(inspect.signature(function).parameters)
        if names != [a.name for a in arguments]:
            raise ValueError(
                f"{function.__name__}: arguments described {[a.name for a in arguments]} "
                f"do not match its parameters {names}"
            )
        guarded: Any = _boundary(function)
        # Results are plain values or lists of lists: Excel's dynamic arrays spill them.
        guarded = xw.ret()(guarded)
        for argument in reversed(arguments):
            options: dict[str, Any] = {"doc": argument.description, "err_to_str": True}
            if argument.block:
                options["ndim"] = 2
            guarded = xw.arg(argument.name, **options)(guarded)
        # xw.func last: xlwings' arg/ret decorators reset the category otherwise.
        guarded = xw.func(category=CATEGORY)(guarded)
        info = getattr(guarded, "__xlfunc__", None)
        if info is not None:
            # Excel's function wizard shows this text; xlwings would take the whole docstring.
            info["ret"]["doc"] = description
        guarded.__tws_spec__ = FunctionSpec(function.__name__, description, tuple(arguments),
                                            returns)
        return guarded

    return declare


def describe_function(function: Callable[..., Any]) -> dict[str, Any]:
    """A cell function's catalogue entry as plain data (for ``twistshare functions``)."""
    spec: FunctionSpec = function.__tws_spec__  # type: ignore[attr-defined]
    parameters = inspect.signature(function).parameters
    return {
        "name": spec.name,
        "description": spec.description,
        "returns": spec.returns,
        "arguments": [
            {
                "name": a.name,
                "description": a.description,
                "unit": a.unit,
                "optional": parameters[a.name].default is not inspect.Parameter.empty,
            }
            for a in spec.arguments
        ],
    }
