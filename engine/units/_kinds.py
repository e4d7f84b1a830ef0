"""The kinds of quantity a cell may hold, their SI and display units, the one registry and the
problem raised when a unit or value cannot be read."""

from __future__ import annotations

from functools import lru_cache
from types import MappingProxyType
from typing import Mapping

import pint

from ..errors import InputRefused

KINDS: tuple[str, ...] = (
    "length",
    "stress",
    "torque",
    "power",
    "speed",
    "angle",
    "angle_per_length",
    "density",
    "dimensionless",
    "force",
    "temperature",
    "expansion",
)

_KIND_PHRASE: Mapping[str, str] = MappingProxyType(
    {
        "length": "a length",
        "stress": "a stress or modulus",
        "torque": "a torque",
        "power": "a power",
        "speed": "a rotational speed",
        "angle": "an angle",
        "angle_per_length": "an angle per length",
        "density": "a density",
        "dimensionless": "a plain number",
        "force": "a force",
        "temperature": "a temperature",
        "expansion": "an expansion coefficient (1/K)",
    }
)

# The SI unit the engine core works in, per kind.
_SI_TARGET: Mapping[str, str] = MappingProxyType(
    {
        "length": "meter",
        "stress": "pascal",
        "torque": "newton * meter",
        "power": "watt",
        "speed": "radian / second",
        "angle": "radian",
        "angle_per_length": "radian / meter",
        "density": "kilogram / meter ** 3",
        "dimensionless": "dimensionless",
        "force": "newton",
        "temperature": "kelvin",
        "expansion": "1 / kelvin",
    }
)

_DISPLAY: Mapping[tuple[str, str], str] = MappingProxyType(
    {
        ("length", "SI"): "mm",
        ("length", "US"): "in",
        ("stress", "SI"): "MPa",
        ("stress", "US"): "psi",
        ("torque", "SI"): "N·m",
        ("torque", "US"): "lbf·in",
        ("power", "SI"): "kW",
        ("power", "US"): "hp",
        ("speed", "SI"): "rpm",
        ("speed", "US"): "rpm",
        ("angle", "SI"): "°",
        ("angle", "US"): "°",
        ("angle_per_length", "SI"): "°/m",
        ("angle_per_length", "US"): "°/ft",
        ("density", "SI"): "kg/m³",
        ("density", "US"): "lb/in³",
        ("dimensionless", "SI"): "",
        ("dimensionless", "US"): "",
        ("force", "SI"): "kN",
        ("force", "US"): "lbf",
        ("temperature", "SI"): "°C",
        ("temperature", "US"): "°F",
        ("expansion", "SI"): "1/K",
        ("expansion", "US"): "1/K",
    }
)

class UnitProblem(InputRefused):
    """A unit or a value that cannot be read as the kind asked for.

    Attributes
    ----------
    text : str
        What was found (the unit text, or the whole cell text).
    kind : str or None
        The kind that was expected (one of `KINDS`), None when no kind was asked for.
    reason : str
        Why it was refused, in a few words ("a pressure", "not a unit", "decimal comma").
    advice : str or None
        What to write instead, when there is one clear answer.
    """

    def __init__(
        self, text: str, kind: str | None, reason: str, advice: str | None = None,
        *, message: str | None = None,
    ) -> None:
        self.text = text
        self.kind = kind
        self.reason = reason
        self.advice = advice
        if message is None:
            expected = f"expected {_KIND_PHRASE[kind]}, " if kind in _KIND_PHRASE else ""
            message = f"{expected}got {text!r} ({reason})"
        if advice:
            message = f"{message}; {advice}"
        self.message = message
        super().__init__(message)

    def __str__(self) -> str:
        return self.message

    def __reduce__(self):  # keep the attributes across pickling (process pools)
        return (_rebuild_problem, (self.text, self.kind, self.reason, self.advice, self.message))


def _rebuild_problem(text, kind, reason, advice, message):
    problem = UnitProblem(text, kind, reason, None, message=message)
    problem.advice = advice
    return problem


@lru_cache(maxsize=1)
def registry() -> pint.UnitRegistry:
    """The one shared pint registry of the project (built on first use, then reused).

    Returns
    -------
    pint.UnitRegistry
        pint's default definitions plus ``Msi`` (10⁶ psi, used for moduli in US tables) and
        ``PS`` (metric horsepower; pint would read it as petasiemens).
    """
    ureg = pint.UnitRegistry()
    ureg.define("Msi = 1e6 * psi")
    return ureg


def _check_kind_name(kind: str) -> None:
    if kind not in _SI_TARGET:
        raise ValueError(f"kind must be one of {KINDS}, got {kind!r}")



def describe_kind(kind: str) -> str:
    """A few words for a unit kind, as messages say what was expected: ``"a length"``."""
    return _KIND_PHRASE.get(kind, kind)


def display_unit(kind: str, system: str) -> str:
    """The unit results of `kind` are shown in for a unit `system` (``"SI"`` or ``"US"``).

    SI: mm, MPa, N·m, kW, rpm, °, °/m, kg/m³. US: in, psi, lbf·in, hp, rpm, °, °/ft, lb/in³.
    Every display unit is accepted by `si_factor` for its kind.
    """
    _check_kind_name(kind)
    try:
        return _DISPLAY[(kind, system)]
    except KeyError:
        raise ValueError(f"system must be 'SI' or 'US', got {system!r}") from None
