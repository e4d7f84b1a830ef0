"""The host-neutral registry of cell functions: name, arguments, units, description, result shape.

Each cell function is declared once with `cell_function`; the declaration records what every
spreadsheet host needs to offer it (Excel through xlwings, LibreOffice Calc), and puts the one
error boundary around it: whatever goes wrong, the cell shows a short ``⚠`` message, never a
traceback. The hosts' adapters (`twistshare.engine.cells.hosts`) are generated from `registry()`;
nothing here knows a host.
"""

from __future__ import annotations

import functools
import inspect
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any, TypeVar

from ._arguments import WARNING_SIGN, CellError

__all__ = ["Argument", "CellFunction", "cell_function", "function_spec", "CATEGORY", "SHAPES"]

CATEGORY = "twistshare"
#: What a result looks like in the sheet.
SHAPES = ("one value", "one per layer", "one per part")

F = TypeVar("F", bound=Callable[..., Any])


@dataclass(frozen=True)
class Argument:
    """One argument of a cell function.

    Parameters
    ----------
    name : str
        The Python parameter name, which the spreadsheet shows.
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
class CellFunction:
    """A cell function as every host offers it.

    Attributes
    ----------
    name : str
    description : str
        One line for the function help.
    arguments : tuple of Argument
        In the order of the function's parameters.
    optional : tuple of bool
        Per argument: it may be left out.
    returns : str
        What the cell (or the spilled range) shows.
    shape : str
        One of `SHAPES`.
    function : callable
        The function with its error boundary: plain Python values in, a value, a list of
        lists or a ``⚠`` message out.
    """

    name: str
    description: str
    arguments: tuple[Argument, ...]
    optional: tuple[bool, ...]
    returns: str
    shape: str
    function: Callable[..., Any]

    def as_dict(self) -> dict[str, Any]:
        """Plain data (for ``twistshare functions`` and the host generators)."""
        return {
            "name": self.name,
            "description": self.description,
            "returns": self.returns,
            "shape": self.shape,
            "arguments": [
                {"name": a.name, "description": a.description, "unit": a.unit, "block": a.block,
                 "optional": optional}
                for a, optional in zip(self.arguments, self.optional)
            ],
        }


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


def cell_function(description: str, *arguments: Argument, returns: str, shape: str) -> Callable[[F], F]:
    """Declare a cell function: its registry entry and its error boundary.

    Parameters
    ----------
    description : str
        One line for the function help.
    *arguments : Argument
        In the order of the function's parameters; every parameter must be described.
    returns : str
        What the cell (or the spilled range) shows.
    shape : str
        One of `SHAPES`.

    Raises
    ------
    ValueError
        If the arguments do not match the function's parameters (a declaration error).
    """
    if shape not in SHAPES:
        raise ValueError(f"shape must be one of {SHAPES}, got {shape!r}")

    def declare(function: F) -> F:
        parameters = inspect.signature(function).parameters
        names = list(parameters)
        if names != [a.name for a in arguments]:
            raise ValueError(
                f"{function.__name__}: arguments described {[a.name for a in arguments]} "
                f"do not match its parameters {names}"
            )
        guarded: Any = _boundary(function)
        optional = tuple(parameters[a.name].default is not inspect.Parameter.empty for a in arguments)
        guarded.__tws_spec__ = CellFunction(function.__name__, description, tuple(arguments), optional,
                                            returns, shape, guarded)
        return guarded

    return declare


def function_spec(function: Callable[..., Any]) -> CellFunction:
    """The registry entry of a declared cell function."""
    return function.__tws_spec__  # type: ignore[attr-defined]
