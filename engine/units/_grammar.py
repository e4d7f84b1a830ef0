"""The grammar of unit text: normalise, tokenise (names, integer exponents, ``*``, ``/``), build
the pint unit from the spelling tables, and judge whether it is the kind asked for."""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from types import MappingProxyType
from typing import Mapping

import pint

from ._kinds import UnitProblem, registry
from ._spellings import (
    _ALIASES,
    _CHAR_MAP,
    _MASS_POUNDS,
    _REFUSED,
    _SUPERSCRIPT_RUN,
    _SUPERSCRIPTS,
    _TURN_LETTERS,
)

_TOKEN = re.compile(
    r"""
    (?P<name>[A-Za-z_]+)(?:(?:\^|\*\*)(?P<exp>[+-]?\d+)|(?P<bare>\d+))?
    |(?P<pct>%)
    |(?P<one>1)(?=\s*/)
    |(?P<mul>[*.\-])
    |(?P<div>/)
    |(?P<space>\s+)
    """,
    re.VERBOSE,
)
_TOKEN_KINDS = ("name", "pct", "one", "mul", "div", "space")


@dataclass(frozen=True)
class _Parsed:
    """A unit text read into pint names: what the kind checks work on."""

    unit: pint.Unit
    names: tuple[str, ...]       # pint names as typed/aliased (before pint's canonicalisation)
    mass_pound: bool             # an 'lb' appeared


def _normalise(text: str) -> str:
    text = _SUPERSCRIPT_RUN.sub(lambda m: "^" + m.group().translate(_SUPERSCRIPTS), text)
    text = text.translate(_CHAR_MAP).strip()
    if len(text) >= 2 and (text[0], text[-1]) in {("[", "]"), ("(", ")")}:
        text = text[1:-1].strip()
    # "N/(mm^2)": parentheses carry nothing once only one unit may follow a slash.
    text = text.replace("(", " ").replace(")", " ")
    text = re.sub(r"\s+per\s+", "/", text)
    text = re.sub(r"\s*([*/^.\-])\s*", r"\1", text)
    text = re.sub(r"\s+", " ", text).strip()
    # An abbreviation's full stop at the very end ("in.", "lbf·ft.") carries no meaning.
    if len(text) > 1 and text.endswith(".") and text[-2].isalpha():
        text = text[:-1]
    return text


def _refuse(text: str, reason: str, advice: str | None = None) -> tuple[None, UnitProblem]:
    return None, UnitProblem(text, None, reason, advice)


@lru_cache(maxsize=4096)
def _parse(text: str) -> tuple[_Parsed | None, UnitProblem | None]:
    """Read unit text into a pint unit, kind-free. Returns (parsed, None) or (None, problem)."""
    if '"' in text or "'" in text or "″" in text or "′" in text:
        return _refuse(text, "inch and foot marks are not read",
                       "write 'in' for inches and 'ft' for feet")
    norm = _normalise(text)
    if norm in ("", "-", "1"):
        return _Parsed(registry().dimensionless, (), False), None
    pos = 0
    numerator: list[tuple[str, int]] = []
    denominator: list[tuple[str, int]] = []
    side = numerator
    expect_name = True
    for match in _TOKEN.finditer(norm):
        if match.start() != pos:
            break
        pos = match.end()
        # lastgroup would name an exponent sub-group; ask for the top-level one.
        kind = next(g for g in _TOKEN_KINDS if match.group(g) is not None)
        if kind in ("name", "pct", "one"):
            if not expect_name:
                return _refuse(text, "not a unit")
            if kind == "one":
                if numerator or denominator:
                    return _refuse(text, "not a unit")
            else:
                name = "percent" if kind == "pct" else match.group("name")
                exp_text = (match.group("exp") or match.group("bare")) if kind == "name" else None
                exp = int(exp_text) if exp_text else 1
                if exp == 0 or abs(exp) > 4:
                    return _refuse(text, f"exponent {exp} is not expected in a unit")
                side.append((name, exp))  # at most one after '/': a second is refused below
            expect_name = False
        elif kind in ("mul", "space"):
            if expect_name:
                return _refuse(text, "not a unit")
            if side is denominator:
                return _refuse(text, "more than one unit after '/'",
                               "write one unit after the slash, e.g. 'kg/m³'")
            expect_name = True
        elif kind == "div":
            if expect_name or side is denominator:
                return _refuse(text, "not a unit" if side is numerator else "more than one '/'",
                               None if side is numerator else "write one unit after the slash")
            side = denominator
            expect_name = True
    if pos != len(norm):
        bad = norm[pos]
        return _refuse(text, f"not a unit (unexpected {bad!r})")
    if expect_name:
        return _refuse(text, "not a unit (incomplete)")

    # "r/min", "U/min": a turn letter only before a slash.
    if numerator and numerator[0][0] in _TURN_LETTERS:
        if len(numerator) == 1 and numerator[0][1] == 1 and denominator:
            numerator = [("revolution", 1)]
        else:
            return _refuse(text, f"{numerator[0][0]!r} alone is not a unit",
                           "write 'rev' or 'rad' for an angle, 'rpm' for a speed")

    ureg = registry()
    unit = ureg.dimensionless
    names: list[str] = []
    mass_pound = False
    for sign, group in ((1, numerator), (-1, denominator)):
        for name, exp in group:
            if name in _REFUSED:
                reason, advice = _REFUSED[name]
                return _refuse(text, reason, advice)
            if name in _MASS_POUNDS:
                mass_pound = True
                parts: tuple[tuple[str, int], ...] = (("pound", 1),)
            elif name in _ALIASES:
                parts = _ALIASES[name]
                if exp != 1 and len(parts) > 1:
                    return _refuse(text, f"{name!r} with an exponent is ambiguous",
                                   "write each unit with its own exponent")
            else:
                parts = ((name, 1),)
            for pint_name, part_exp in parts:
                one = None
                try:
                    if pint_name in ureg:
                        one = ureg.Unit(pint_name)
                except Exception:  # pint raises a zoo of errors on odd names
                    one = None
                if one is None:
                    return _refuse(text, f"{pint_name!r} is not a unit I know")
                unit = unit * one ** (sign * exp * part_exp)
                names.append(pint_name)
    return _Parsed(unit, tuple(names), mass_pound), None


def _describe(parsed: _Parsed) -> str:
    """A few words for what a unit measures: "a pressure", "a torque or energy", ..."""
    ureg = registry()
    dims = dict(parsed.unit.dimensionality)
    root = dict(ureg.get_root_units(parsed.unit)[1]._units)
    radian = root.get("radian", 0)
    if not dims:
        if radian == 1:
            return "an angle"
        return "a plain number" if radian == 0 else "not a measure I know"
    table = _dimension_words()
    key = tuple(sorted(dims.items()))
    if key == (("[time]", -1),):
        return "a rotational speed" if radian == 1 else "a frequency"
    if key == (("[length]", -1),) and radian == 1:
        return "a twist per length"
    words = table.get(key)
    if words is not None and radian == 0:
        return words
    shown = str(parsed.unit.dimensionality)
    return f"a quantity of dimension {shown}" + (" with an angle" if radian else "")


@lru_cache(maxsize=1)
def _dimension_words() -> Mapping[tuple, str]:
    def key(**dims: int) -> tuple:
        return tuple(sorted((f"[{k}]", v) for k, v in dims.items()))

    return MappingProxyType(
        {
            key(length=1): "a length",
            key(length=2): "an area",
            key(length=3): "a volume",
            key(length=4): "a length to the fourth (a second moment of area)",
            key(mass=1, length=-1, time=-2): "a pressure or stress",
            key(mass=1, length=2, time=-2): "a torque or energy",
            key(mass=1, length=2, time=-3): "a power",
            key(mass=1, length=1, time=-2): "a force",
            key(mass=1): "a mass",
            key(mass=1, length=-3): "a density",
            key(time=1): "a time",
            key(length=1, time=-1): "a velocity",
            key(temperature=1): "a temperature",
            key(temperature=-1): "a reciprocal temperature",
            key(length=-1): "a reciprocal length",
        }
    )


def _check_kind(text: str, parsed: _Parsed, kind: str) -> UnitProblem | None:
    """None when the parsed unit is a `kind`, else the problem to raise."""
    ureg = registry()
    described = _describe(parsed)
    wanted = {
        "length": "a length",
        "stress": "a pressure or stress",
        "torque": "a torque or energy",
        "power": "a power",
        "speed": "a rotational speed",
        "angle": "an angle",
        "angle_per_length": "a twist per length",
        "density": "a density",
        "dimensionless": "a plain number",
        "force": "a force",
        "temperature": "a temperature",
        "expansion": "a reciprocal temperature",
    }[kind]
    if parsed.mass_pound and kind in ("torque", "stress", "power", "force"):
        advice = {
            "force": "for a force write 'lbf', 'N' or 'kN'",
            "torque": "for a torque write 'lbf·in' or 'lbf·ft'",
            "stress": "for a stress write 'psi', 'ksi' or 'lbf/in²'",
            "power": "for a power write 'hp' or 'lbf·ft/s'",
        }[kind]
        return UnitProblem(text, kind, "lb is a pound of mass, not of force", advice)
    if described != wanted:
        advice = None
        if kind == "speed" and described == "a frequency":
            advice = ("it does not say whether it counts revolutions or radians; "
                      "write 'rpm', 'rev/s' or 'rad/s'")
        elif kind == "angle" and described == "a plain number":
            advice = "write the angle unit, e.g. '°' or 'rad'"
        elif kind == "angle_per_length" and described == "a reciprocal length":
            advice = "write an angle over a length, e.g. '°/m' or 'rad/m'"
        return UnitProblem(text, kind, described, advice)
    if kind == "dimensionless" and set(parsed.names) - {"percent"}:
        return UnitProblem(text, kind, "not a plain-number unit",
                           "leave the unit out, or write '%' for a percentage")
    if kind == "torque":
        for name in parsed.names:
            dims = dict(ureg.Unit(name).dimensionality)
            if dims not in ({"[length]": 1}, {"[mass]": 1, "[length]": 1, "[time]": -2}):
                return UnitProblem(text, kind, "an energy unit",
                                   "write a torque as force × length, e.g. 'N·m' or 'lbf·ft'")
    return None

