"""The one shared unit registry and the unit spellings engineers type.

Everything that turns a cell or a header into an SI float goes through here, so a spelling is
taught once and read the same way by the cell functions and the workbook bridge.

pint reads several everyday spellings wrongly or fails oddly (``Nm`` is number·metre, ``kNm``
kilonumber·metre, ``lb`` a pound of *mass*, ``mil`` an angular mil, ``N-m`` raises a bare
``TypeError``, ``r/min`` and ``N/mm2`` are undefined). So unit text never reaches pint's
expression parser: it is normalised and tokenised here (names, integer exponents, ``*``, ``/``),
each name is mapped through the tables below or looked up in pint by name, and the unit is
built by multiplying those names. The dimension is then checked for the kind asked for.

Decisions (every one has a test in ``tests/engine/test_units.py``):

* ``Nm``, ``kNm``, ``MNm``, ``daNm``, ``Nmm``, ``Ncm`` are read as newton × metre (etc.): in
  engineering usage these are always torque. In a column of another kind they are refused as
  "a torque".
* A hyphen, a space, ``*``, ``.``, ``·``, ``⋅`` or ``×`` between unit names is a product:
  ``N-m``, ``kN-m``, ``lbf-ft``, ``ft-lbf``, ``N.m``, ``N m``.
* ``lb`` (``lbs``, ``pound``) is a pound of mass. It is fine in a density (``lb/in³``); in a
  torque, stress or power it is refused with advice (``lb-in`` → write ``lbf·in``;
  ``lb/in²`` → write ``psi``). ``in-lb`` and ``ft-lb`` likewise.
* ``mil`` is refused (a thousandth of an inch, slang for a millimetre, and pint's angular mil);
  ``mPa`` is refused (a millipascal; almost always a mistyped ``MPa``). ``Mpa``, ``MPA``,
  ``mpa`` are read as megapascal, ``KN`` as kilonewton, ``KW`` as kilowatt, ``HP`` as hp.
* A rotational speed must count turns or radians: ``rpm``, ``r/min``, ``rev/min``,
  ``U/min``, ``rps``, ``rev/s``, ``rad/s``, ``deg/s``. ``Hz``, ``1/s``, ``1/min`` are refused
  (they do not say whether they count revolutions or radians: a 2π trap).
* A torque must be written as force × length: ``J`` and other energy units are refused.
* An angle must be an angle unit (``°``, ``deg``, ``rad``, ``arcmin``, ``rev``): pint calls angles
  dimensionless, so a plain number or ``%`` is not accepted as an angle, and an angle is not
  accepted as a plain number.
* At most one ``/`` with one unit after it (``kg/m³``, ``N/mm²``, ``°/m``); ``W/m*K`` is refused
  rather than guessed.
* In a cell value, a comma is refused: ``12,5 mm`` (decimal comma) and ``1,200 N·m`` (a
  thousands separator, or a decimal comma in many locales) could each mean two numbers.
"""

from __future__ import annotations

import datetime as _dt
import math
import numbers
import re
from dataclasses import dataclass
from functools import lru_cache
from types import MappingProxyType
from typing import Mapping

import numpy as np
import pint

from .errors import InputRefused

__all__ = [
    "KINDS",
    "UnitProblem",
    "registry",
    "si_factor",
    "parse_value",
    "si_offset",
    "split_header",
    "unit_system",
    "display_unit",
    "describe_kind",
]

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


# --- spellings -----------------------------------------------------------------------------

# Names pint lacks or reads wrongly, mapped to pint names with their exponents.
_ALIASES: Mapping[str, tuple[tuple[str, int], ...]] = MappingProxyType(
    {
        # torque written as one word: universal engineering usage
        "Nm": (("newton", 1), ("meter", 1)),
        "kNm": (("kilonewton", 1), ("meter", 1)),
        "KNm": (("kilonewton", 1), ("meter", 1)),
        "MNm": (("meganewton", 1), ("meter", 1)),
        "daNm": (("decanewton", 1), ("meter", 1)),
        "Nmm": (("newton", 1), ("millimeter", 1)),
        "Ncm": (("newton", 1), ("centimeter", 1)),
        # capitalisation typed by hand; none of these means anything else in this trade
        "KN": (("kilonewton", 1),),
        "KW": (("kilowatt", 1),),
        "Kw": (("kilowatt", 1),),
        "kw": (("kilowatt", 1),),
        "HP": (("horsepower", 1),),
        "Hp": (("horsepower", 1),),
        "PS": (("metric_horsepower", 1),),
        "Mpa": (("megapascal", 1),),
        "MPA": (("megapascal", 1),),
        "mpa": (("megapascal", 1),),
        "Gpa": (("gigapascal", 1),),
        "GPA": (("gigapascal", 1),),
        "gpa": (("gigapascal", 1),),
        "Kpa": (("kilopascal", 1),),
        "KPa": (("kilopascal", 1),),
        "KPA": (("kilopascal", 1),),
        "kpa": (("kilopascal", 1),),
        "PSI": (("psi", 1),),
        "Psi": (("psi", 1),),
        "KSI": (("ksi", 1),),
        "Ksi": (("ksi", 1),),
        "MSI": (("Msi", 1),),
        "RPM": (("revolutions_per_minute", 1),),
        "Rpm": (("revolutions_per_minute", 1),),
        "RPS": (("revolutions_per_second", 1),),
        "rev": (("revolution", 1),),
        "revs": (("revolution", 1),),
        "Rev": (("revolution", 1),),
        "deg": (("degree", 1),),
        "degs": (("degree", 1),),
        "Deg": (("degree", 1),),
        "DEG": (("degree", 1),),
        "degrees": (("degree", 1),),
        "Degrees": (("degree", 1),),
        "in": (("inch", 1),),
        "In": (("inch", 1),),
        "IN": (("inch", 1),),
        "inches": (("inch", 1),),
        "Inch": (("inch", 1),),
        "LBF": (("force_pound", 1),),
        "Lbf": (("force_pound", 1),),
        "kips": (("kip", 1),),
        "FT": (("foot", 1),),
        "Ft": (("foot", 1),),
        "MM": (("millimeter", 1),),
        "Mm": (("millimeter", 1),),  # a megametre is never a shaft size
        "um": (("micrometer", 1),),
    }
)

# Pounds of mass: right in a density, wrong in a torque, stress or power.
_MASS_POUNDS: frozenset[str] = frozenset({"lb", "lbs", "Lb", "Lbs", "LB", "LBS", "pound", "pounds"})

_REFUSED: Mapping[str, tuple[str, str]] = MappingProxyType(
    {
        "mil": ("'mil' is read as a thousandth of an inch, a millimetre and an angular mil",
                "write 'thou' or 'in' for inches, 'mm' for millimetres"),
        "mils": ("'mils' is read as thousandths of an inch, millimetres and angular mils",
                 "write 'thou' or 'in' for inches, 'mm' for millimetres"),
        "mPa": ("'mPa' is a millipascal", "for megapascals write 'MPa'"),
    }
)

# Turns counted as "r" (or German "U") only make sense before "/time": "r/min", "U/min".
_TURN_LETTERS: frozenset[str] = frozenset({"r", "U"})

# pint's canonical names of US customary units (everything else is SI or neutral).
_US_NAMES: frozenset[str] = frozenset(
    {
        "inch", "foot", "yard", "mile", "thou", "force_pound", "pound", "kip", "force_ounce",
        "ounce", "pound_force_per_square_inch", "kip_per_square_inch", "Msi", "horsepower",
        "foot_pound", "slug", "grain", "international_foot", "survey_foot", "hand",
    }
)

_SUPERSCRIPTS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺", "0123456789-+")
_SUPERSCRIPT_RUN = re.compile(r"[⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺]+")
_CHAR_MAP = str.maketrans(
    {
        "·": "*", "⋅": "*", "×": "*", "•": "*", "∙": "*", "・": "*", "✕": "*",
        "µ": "u", "μ": "u",
        "°": " deg ", "º": " deg ", "˚": " deg ",
        "−": "-", "–": "-", "‐": "-", "‑": "-", "—": "-",
        "\u00a0": " ", "\u2009": " ", "\u202f": " ", "\u2007": " ", "\t": " ",
        "⁄": "/", "∕": "/",
    }
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
                side.append((name, exp))
                if side is denominator and len(denominator) > 1:
                    return _refuse(text, "more than one unit after '/'",
                                   "write one unit after the slash, e.g. 'kg/m³'")
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


# Temperatures: offset units, read apart from the product-of-units parser. Keys are the text
# after `_normalise` with spaces removed ("°C" -> "degC").
_TEMPERATURE_NAMES: Mapping[str, str] = MappingProxyType({
    "degC": "degree_Celsius", "C": "degree_Celsius", "celsius": "degree_Celsius",
    "Celsius": "degree_Celsius", "degc": "degree_Celsius",
    "degF": "degree_Fahrenheit", "F": "degree_Fahrenheit", "fahrenheit": "degree_Fahrenheit",
    "Fahrenheit": "degree_Fahrenheit", "degf": "degree_Fahrenheit",
    "K": "kelvin", "kelvin": "kelvin", "Kelvin": "kelvin",
    "degR": "degree_Rankine", "R": "degree_Rankine",
})


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


@lru_cache(maxsize=4096)
def _factor(text: str, kind: str) -> tuple[float | None, UnitProblem | None]:
    if kind == "temperature":
        got, problem = _temperature(text)
        return (None, problem) if problem is not None else (got[0], None)
    parsed, problem = _parse(text)
    if problem is not None:
        return None, UnitProblem(text, kind, problem.reason, problem.advice)
    problem = _check_kind(text, parsed, kind)
    if problem is not None:
        return None, problem
    if kind == "dimensionless":
        return float(registry().Quantity(1.0, parsed.unit).to("dimensionless").magnitude), None
    factor = registry().Quantity(1.0, parsed.unit).to(_SI_TARGET[kind]).magnitude
    return float(factor), None


def _check_kind_name(kind: str) -> None:
    if kind not in _SI_TARGET:
        raise ValueError(f"kind must be one of {KINDS}, got {kind!r}")


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


_NUMBER = re.compile(
    # A unit right after the number must not start with a digit, comma or point ("1.200,5" is a
    # decimal comma, not 1 and a unit ".200,5"); after a space it may ("1450 1/min").
    r"\s*(?P<num>[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)(?P<unit>(?:\s+\S.*|[^\d\s,.].*)?)\s*\Z",
    re.DOTALL,
)
_COMMA_NUMBER = re.compile(r"\s*[+-]?\d*[,.]?\d+,\d")
_THOUSANDS_COMMA = re.compile(r"\s*[+-]?\d{1,3}(?:,\d{3})+(?!\d)")
_SPACED_DIGITS = re.compile(r"\s*[+-]?\d{1,3}(?:[ \u00a0\u202f\u2009]\d{3})+(?!\d)")


def _format_number(value: float) -> str:
    return f"{value:g}"


def parse_value(text_or_number: object, kind: str, default_unit: str | None = None) -> float:
    """Read a cell value as an SI float of `kind`.

    Parameters
    ----------
    text_or_number : str, int or float
        ``52``, ``52.0``, ``"52"``, ``"52 mm"``, ``"52mm"``, ``"1.5e3 N·m"``. A unit in the text
        overrides `default_unit` (a cell's own unit overrides its column header's).
    kind : str
        One of `KINDS`.
    default_unit : str or None
        The unit for a bare number, e.g. from the column header. None: a bare number is
        refused unless `kind` is ``"dimensionless"``.

    Returns
    -------
    float
        The value in the SI unit of `kind` (m, Pa, N·m, W, rad/s, rad, rad/m, kg/m³, 1).
        Signs and sizes are not judged here; the engine core does that.

    Raises
    ------
    UnitProblem
        Empty cell, a spreadsheet error value (``#N/A``), text that is not a number and a unit, a comma in the
        number (``"12,5 mm"``, ``"1,200 N·m"``), NaN or infinity, a yes/no value, a date, a
        bare number with no unit to go by, or a unit problem (see `si_factor`).

    Examples
    --------
    >>> round(parse_value("52 mm", "length"), 9)
    0.052
    >>> round(parse_value(2, "length", "in"), 9)
    0.0508
    """
    _check_kind_name(kind)
    value = text_or_number
    if isinstance(value, str) and value.strip().startswith("#") and value.strip()[1:2].isalpha():
        raise UnitProblem(value.strip().upper(), kind, "a spreadsheet error value",
                          message=f"cell holds the error {value.strip().upper()}")
    if value is None:
        raise UnitProblem("", kind, "empty", message=f"cell is empty; expected {_KIND_PHRASE[kind]}")
    if isinstance(value, (bool, np.bool_)):
        raise UnitProblem(str(value).upper(), kind, "a yes/no value")
    if isinstance(value, (_dt.date, _dt.datetime, _dt.time, _dt.timedelta)):
        raise UnitProblem(str(value), kind, "a date or time")
    if isinstance(value, numbers.Real):
        number = float(value)
        unit_text = None
        shown = _format_number(number)
    elif isinstance(value, str):
        shown = value.strip()
        if not shown:
            raise UnitProblem("", kind, "empty",
                              message=f"cell is empty; expected {_KIND_PHRASE[kind]}")
        match = None if _SPACED_DIGITS.match(value) else _NUMBER.match(value)
        if match is None:
            if _THOUSANDS_COMMA.match(value):
                raise UnitProblem(shown, kind, "a comma in the number",
                                  "it could be a thousands separator or a decimal comma; "
                                  "write the number with no separators and a decimal point, "
                                  "e.g. '1200' or '1.2'")
            if _COMMA_NUMBER.match(value):
                raise UnitProblem(shown, kind, "a decimal comma",
                                  "write a decimal point, e.g. '12.5'")
            if _SPACED_DIGITS.match(value):
                raise UnitProblem(shown, kind, "digits separated by spaces",
                                  "write the number with no separators, e.g. '1200'")
            raise UnitProblem(shown, kind, "not a number with a unit")
        number = float(match.group("num"))
        unit_text = match.group("unit").strip() or None
    else:
        raise UnitProblem(repr(value)[:60], kind, f"a {type(value).__name__}, not a number")
    if not math.isfinite(number):
        raise UnitProblem(shown, kind, "not a finite number")
    if unit_text is None:
        unit_text = default_unit
    if unit_text is None:
        if kind == "dimensionless":
            return number
        example = _DISPLAY[(kind, "SI")]
        raise UnitProblem(shown, kind, "no unit",
                          f"write it with its unit, e.g. '{shown} {example}', "
                          "or put the unit in the column header")
    factor, problem = _factor(unit_text, kind) if isinstance(unit_text, str) else (
        None, UnitProblem(repr(unit_text), kind, "not a unit text"))
    if problem is not None:
        raise problem
    if kind == "temperature":
        return number * factor + si_offset(unit_text, kind)
    return number * factor


_HEADER = re.compile(r"\A(?P<name>.*?)\s*\[(?P<unit>[^\[\]]*)\]\s*\Z", re.DOTALL)


def split_header(header: object) -> tuple[str, str | None]:
    """Split a column header into its name and the unit in a trailing ``[...]``.

    Parameters
    ----------
    header : str
        ``"Outer diameter [mm]"``, ``"G [GPa]"``, ``"Kt"``. Non-text headers are read as text.

    Returns
    -------
    (str, str or None)
        The name with surrounding spaces removed, and the unit text (None when there are no
        brackets or they are empty). Only square brackets count: ``"Layer (core)"`` keeps its
        parentheses in the name. The unit is not checked here; pass it to `si_factor`.

    Examples
    --------
    >>> split_header("Outer diameter [mm]")
    ('Outer diameter', 'mm')
    >>> split_header("Material")
    ('Material', None)
    """
    if header is None:
        return "", None
    text = str(header).strip()
    match = _HEADER.match(text)
    if match is None:
        return text, None
    unit = match.group("unit").strip()
    return match.group("name").strip(), unit or None


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
    temperature = _TEMPERATURE_NAMES.get(_normalise(unit_text).replace(" ", ""))
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
