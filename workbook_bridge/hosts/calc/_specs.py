"""The cell functions as the Calc host sees them: the ONE place that reads the function list.

Everything the Calc host generates (the Basic wrappers, the Python bridge module) and calls
(the runtime that runs next to the engine) comes from `_function_specs`. Today it reads
`twistshare.engine.cells.list_functions()` and the function objects of that module; pointing it
at a host-neutral registry with the same information changes this module only.
"""

from __future__ import annotations

import keyword
import re
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

__all__ = ["HostArgument", "HostFunction"]  # and `_function_specs`, the adapter

_NAME = re.compile(r"[A-Za-z][A-Za-z0-9_]*\Z")


@dataclass(frozen=True)
class HostArgument:
    """One argument of a cell function.

    Parameters
    ----------
    name : str
        The parameter name (a Basic and Python identifier).
    description : str
        One line of help.
    unit : str
        The units it takes (``"length: mm, m, in, ft"``); empty for text and blocks.
    optional : bool
        May be left out.
    block : bool
        A range of several rows and columns (the engine wants a list of lists even for one cell).
    """

    name: str
    description: str
    unit: str = ""
    optional: bool = False
    block: bool = False

    def __post_init__(self) -> None:
        if not _NAME.match(self.name) or keyword.iskeyword(self.name):
            raise ValueError(f"argument name {self.name!r} is not an identifier Basic and Python both accept")


@dataclass(frozen=True)
class HostFunction:
    """A cell function: name, one-line description, arguments, result and the callable itself.

    Parameters
    ----------
    name : str
        The name cells use (``TWS_SHARE``).
    description : str
        One line of help.
    arguments : tuple of HostArgument
        In call order.
    returns : str
        What the cell (or the range it fills) shows.
    may_spill : bool
        The result can be a block of cells (one value per layer or per part) rather than one value.
    function : callable
        Called with one value per argument (None for a left-out argument); returns a cell value
        or a list of lists, never raises.
    """

    name: str
    description: str
    arguments: tuple[HostArgument, ...]
    returns: str
    may_spill: bool
    function: Callable[..., Any]

    def __post_init__(self) -> None:
        if not _NAME.match(self.name):
            raise ValueError(f"function name {self.name!r} is not an identifier")
        seen = [a.name.casefold() for a in self.arguments]
        if len(set(seen)) != len(seen):  # Basic does not tell case apart
            raise ValueError(f"{self.name}: two arguments differ only in case: {[a.name for a in self.arguments]}")


def _function_specs() -> tuple[HostFunction, ...]:
    """Every cell function, read from the engine's host-neutral registry (the one adapter).

    Returns
    -------
    tuple of HostFunction
        In the order the registry lists them; fresh on every call.
    """
    from twistshare.engine.cells import registry

    out = []
    for spec in registry():
        arguments = tuple(
            HostArgument(a.name, a.description, a.unit or "", optional, a.block)
            for a, optional in zip(spec.arguments, spec.optional)
        )
        # A function given a block of several parts fills one cell per part, so it may spill.
        out.append(HostFunction(spec.name, spec.description, arguments, spec.returns,
                                any(a.block for a in spec.arguments) or spec.shape != "one value", spec.function))
    return tuple(out)
