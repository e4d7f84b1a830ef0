"""Unit text to SI: the factor (and, for temperatures, the offset) for a kind, and the unit system
(SI or US) a unit belongs to."""

from __future__ import annotations

from functools import lru_cache

import pint

from ._grammar import _check_kind, _describe, _normalise, _parse
from ._kinds import _SI_TARGET, UnitProblem, _check_kind_name, registry
from ._spellings import _TEMPERATURE_NAMES, _US_NAMES


@lru_cache(maxsize=256)
def _temperature(text: str) -> tuple[tuple[float, float] | None, UnitProblem | None]:
    """(factor, offset) to kelvin of a temperature unit, through pint's offset conversion."""
    name = _TEMPERATURE_NAMES.get(_normalise(text).replace(" ", ""))
    if name is None:
        parsed, problem = _parse(text)
        reason = problem.reason if problem is not None else _describe(parsed)
        return None, UnitProblem(text, "temperature", reason, "write '°C', '°F' or 'K'")
    ureg = registry()
    offset = float(ureg.Quantity(0.0, name).to("kelvin").magnitude)
    factor = float(ureg.Quantity(1.0, name).to("kelvin").magnitude) - offset
    return (factor, offset), None


def si_offset(unit_text: str, kind: str) -> float:
    """What to add after multiplying by `si_factor`: nonzero only for a temperature (to kelvin).

    Examples
    --------
    >>> round(si_offset("°C", "temperature"), 2)
    273.15
    """
    _check_kind_name(kind)
    if kind != "temperature":
        return 0.0
    got, problem = _temperature(unit_text)
    if problem is not None:
        raise problem
    return got[1]


def _per_temperature(text: str) -> str | None:
    """The temperature unit of ``1/°C``, ``1/degF``, ``1/K`` (pint's name), else None.

    An expansion coefficient is per degree of temperature *change*: a change of 1 °C is 1 K and
    a change of 1 °F is 5/9 K, whatever the scale's zero, so ``1/°C`` reads as ``1/K`` and
    ``1/°F`` as 1.8/K (NIST SP 811, from memory: a degree Celsius equals a kelvin in size, a
    degree Fahrenheit or Rankine is 5/9 K)."""
    head, slash, tail = text.partition("/")
    if not slash or head.strip() != "1":
        return None
    return _TEMPERATURE_NAMES.get(_normalise(tail).replace(" ", ""))


@lru_cache(maxsize=4096)
def _factor(text: str, kind: str) -> tuple[float | None, UnitProblem | None]:
    if kind == "temperature":
        got, problem = _temperature(text)
        return (None, problem) if problem is not None else (got[0], None)
    per = _per_temperature(text) if kind == "expansion" else None
    if per is not None:
        # the size of one degree in kelvin: pint's temperature-difference unit of the scale
        step = f"delta_{per}" if per in ("degree_Celsius", "degree_Fahrenheit") else per
        return 1.0 / float(registry().Quantity(1.0, step).to("kelvin").magnitude), None
    parsed, problem = _parse(text)
    if problem is not None:
        return None, UnitProblem(text, kind, problem.reason, problem.advice)
    problem = _check_kind(text, parsed, kind)
    if problem is not None:
        return None, problem
    target = "dimensionless" if kind == "dimensionless" else _SI_TARGET[kind]
    try:
        factor = registry().Quantity(1.0, parsed.unit).to(target).magnitude
    except pint.errors.PintError:
        # Offset and logarithmic units (°C inside a product, neper, decibel) have no factor.
        advice = "write '1/K' or '1/°C'" if kind == "expansion" else None
        return None, UnitProblem(text, kind, "an offset or logarithmic unit inside a product", advice)
    return float(factor), None



def si_factor(unit_text: str, kind: str) -> float:
    """The factor that turns a value in `unit_text` into the SI unit the engine uses for `kind`.

    Parameters
    ----------
    unit_text : str
        A unit as engineers type it: ``"mm"``, ``"N·m"``, ``"lbf-ft"``, ``"N/mm²"``, ``"r/min"``.
        ``""``, ``"-"`` and ``"1"`` are the plain-number unit.
    kind : str
        One of `KINDS`. SI units: m, Pa, N·m, W, rad/s, rad, rad/m, kg/m³, 1.

    Returns
    -------
    float
        Multiply a value in `unit_text` by this to get SI. Cached per (text, kind).

    Raises
    ------
    UnitProblem
        The text is not a unit, is ambiguous, or is not of `kind`; the message says which
        and, where there is one answer, what to write instead.
    ValueError
        `kind` is not one of `KINDS` (a programming error, not a user's).

    Examples
    --------
    >>> si_factor("kN·m", "torque")
    1000.0
    >>> si_factor("in", "length")
    0.0254
    """
    _check_kind_name(kind)
    if not isinstance(unit_text, str):
        raise UnitProblem(repr(unit_text), kind, "not a unit text")
    factor, problem = _factor(unit_text, kind)
    if problem is not None:
        raise problem
    return factor


def unit_system(unit_text: str) -> str:
    """``"US"`` when the unit uses a US customary unit (in, ft, lbf, psi, ksi, hp, lb), else ``"SI"``.

    Units that belong to neither (``°``, ``rpm``, ``rad``, a plain number) count as ``"SI"``.

    Raises
    ------
    UnitProblem
        The text is not a unit.
    """
    if not isinstance(unit_text, str):
        raise UnitProblem(repr(unit_text), None, "not a unit text")
    system, problem = _system(unit_text)
    if problem is not None:
        raise problem
    return system


@lru_cache(maxsize=1024)
def _system(unit_text: str) -> tuple[str, UnitProblem | None]:
    temperature = _TEMPERATURE_NAMES.get(_normalise(unit_text).replace(" ", "")) or _per_temperature(unit_text)
    if temperature is not None:
        return ("US" if temperature in ("degree_Fahrenheit", "degree_Rankine") else "SI"), None
    parsed, problem = _parse(unit_text)
    if problem is not None:
        return "", problem
    ureg = registry()
    for name in parsed.names:
        # pint's canonical name ("in" -> "inch"); a unit's container has one entry here.
        canonical = set(ureg.Unit(name)._units)
        if canonical & _US_NAMES or name in _US_NAMES:
            return "US", None
    return "SI", None

