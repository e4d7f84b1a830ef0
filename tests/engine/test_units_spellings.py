"""Every alias and accepted spelling of `engine/units`, one by one, for dimension and factor.

Oracle: a fresh pint registry of our own (pint's default definitions, not the project's
registry or alias table), asked for the *canonical* unit written here by hand
(``FT`` -> ``foot``), ``pint_reg("foot").to("meter")``; and for the key factors also the exact
or tabulated value of NIST SP 811 (2008), Appendix B.8/B.9 (foot = 0.3048 m exactly,
inch = 0.0254 m exactly, pound-force = 4.448 222 N, psi = 6.894 757 kPa,
horsepower (550 ft·lbf/s) = 745.699 9 W, metric horsepower = 735.498 8 W,
pound (avoirdupois) = 0.453 592 37 kg exactly).

Each spelling is read both ways the front ends read it: as a cell value
(``parse_value("2 FT", "length")``) and as a column header (``split_header("Length [FT]")``
then ``si_factor``). A wrong canonical unit (``FT`` read as an inch) changes the factor by 12x
and fails both.
"""

from __future__ import annotations

import math

import pint
import pytest
from twistshare.engine.units import UnitProblem, parse_value, si_factor, si_offset, split_header, unit_system

_PINT = pint.UnitRegistry()  # our own: the oracle must not share the project's definitions

# The SI unit of each kind, as pint spells it (BRIEF: the core works in SI).
_SI = {
    "length": "meter", "stress": "pascal", "torque": "newton * meter", "power": "watt",
    "speed": "radian / second", "angle": "radian", "angle_per_length": "radian / meter",
    "density": "kilogram / meter ** 3", "dimensionless": "dimensionless",
}


def pint_factor(canonical: str, kind: str) -> float:
    """pint's own factor from the canonical unit to the kind's SI unit."""
    return float(_PINT.Quantity(1.0, canonical).to(_SI[kind]).magnitude)


# (alias as typed in engine/units/_spellings.py, the text it is tested in, kind, canonical pint unit of that text)
ALIASES = [
    # torque written as one word
    ("Nm", "Nm", "torque", "newton * meter"),
    ("kNm", "kNm", "torque", "kilonewton * meter"),
    ("KNm", "KNm", "torque", "kilonewton * meter"),
    ("MNm", "MNm", "torque", "meganewton * meter"),
    ("daNm", "daNm", "torque", "decanewton * meter"),
    ("Nmm", "Nmm", "torque", "newton * millimeter"),
    ("Ncm", "Ncm", "torque", "newton * centimeter"),
    # capitalisation typed by hand
    ("KN", "KN*m", "torque", "kilonewton * meter"),
    ("KW", "KW", "power", "kilowatt"),
    ("Kw", "Kw", "power", "kilowatt"),
    ("kw", "kw", "power", "kilowatt"),
    ("HP", "HP", "power", "horsepower"),
    ("Hp", "Hp", "power", "horsepower"),
    ("PS", "PS", "power", "metric_horsepower"),
    ("Mpa", "Mpa", "stress", "megapascal"),
    ("MPA", "MPA", "stress", "megapascal"),
    ("mpa", "mpa", "stress", "megapascal"),
    ("Gpa", "Gpa", "stress", "gigapascal"),
    ("GPA", "GPA", "stress", "gigapascal"),
    ("gpa", "gpa", "stress", "gigapascal"),
    ("Kpa", "Kpa", "stress", "kilopascal"),
    ("KPa", "KPa", "stress", "kilopascal"),
    ("KPA", "KPA", "stress", "kilopascal"),
    ("kpa", "kpa", "stress", "kilopascal"),
    ("PSI", "PSI", "stress", "pound_force / inch ** 2"),
    ("Psi", "Psi", "stress", "pound_force / inch ** 2"),
    ("KSI", "KSI", "stress", "kilopound_force / inch ** 2"),
    ("Ksi", "Ksi", "stress", "kilopound_force / inch ** 2"),
    ("MSI", "MSI", "stress", "megapound_force / inch ** 2"),
    ("RPM", "RPM", "speed", "revolution / minute"),
    ("Rpm", "Rpm", "speed", "revolution / minute"),
    ("RPS", "RPS", "speed", "revolution / second"),
    ("rev", "rev", "angle", "revolution"),
    ("revs", "revs", "angle", "revolution"),
    ("Rev", "Rev", "angle", "revolution"),
    ("deg", "deg", "angle", "degree"),
    ("degs", "degs", "angle", "degree"),
    ("Deg", "Deg", "angle", "degree"),
    ("DEG", "DEG", "angle", "degree"),
    ("degrees", "degrees", "angle", "degree"),
    ("Degrees", "Degrees", "angle", "degree"),
    ("in", "in", "length", "inch"),
    ("In", "In", "length", "inch"),
    ("IN", "IN", "length", "inch"),
    ("inches", "inches", "length", "inch"),
    ("Inch", "Inch", "length", "inch"),
    ("LBF", "LBF*in", "torque", "pound_force * inch"),
    ("Lbf", "Lbf*in", "torque", "pound_force * inch"),
    ("kips", "kips*in", "torque", "kilopound_force * inch"),
    ("FT", "FT", "length", "foot"),
    ("Ft", "Ft", "length", "foot"),
    ("MM", "MM", "length", "millimeter"),
    ("Mm", "Mm", "length", "millimeter"),
    ("um", "um", "length", "micrometer"),
]

# Pounds of mass, fine in a density: lb/in³ (the library's US densities).
MASS_POUNDS = ["lb", "lbs", "Lb", "Lbs", "LB", "LBS", "pound", "pounds"]

# Further accepted spellings (the decisions in the module docstring and its character map).
SPELLINGS = [
    ("N-m", "torque", "newton * meter"),
    ("kN-m", "torque", "kilonewton * meter"),
    ("N.m", "torque", "newton * meter"),
    ("N m", "torque", "newton * meter"),
    ("N·m", "torque", "newton * meter"),
    ("N⋅m", "torque", "newton * meter"),
    ("N×m", "torque", "newton * meter"),
    ("lbf-ft", "torque", "pound_force * foot"),
    ("ft-lbf", "torque", "pound_force * foot"),
    ("lbf·FT", "torque", "pound_force * foot"),
    ("lbf·in", "torque", "pound_force * inch"),
    ("lbf-in.", "torque", "pound_force * inch"),
    ("kip-ft", "torque", "kilopound_force * foot"),
    ("rpm", "speed", "revolution / minute"),
    ("r/min", "speed", "revolution / minute"),
    ("U/min", "speed", "revolution / minute"),
    ("rev/min", "speed", "revolution / minute"),
    ("rev per min", "speed", "revolution / minute"),
    ("rps", "speed", "revolution / second"),
    ("rev/s", "speed", "revolution / second"),
    ("rad/s", "speed", "radian / second"),
    ("deg/s", "speed", "degree / second"),
    ("°", "angle", "degree"),
    ("º", "angle", "degree"),
    ("˚", "angle", "degree"),
    ("rad", "angle", "radian"),
    ("arcmin", "angle", "arcminute"),
    ("°/m", "angle_per_length", "degree / meter"),
    ("°/ft", "angle_per_length", "degree / foot"),
    ("deg/FT", "angle_per_length", "degree / foot"),
    ("rad/m", "angle_per_length", "radian / meter"),
    ("N/mm²", "stress", "newton / millimeter ** 2"),
    ("N/mm^2", "stress", "newton / millimeter ** 2"),
    ("N/mm2", "stress", "newton / millimeter ** 2"),
    ("N/(mm^2)", "stress", "newton / millimeter ** 2"),
    ("MPa", "stress", "megapascal"),
    ("GPa", "stress", "gigapascal"),
    ("psi", "stress", "pound_force / inch ** 2"),
    ("ksi", "stress", "kilopound_force / inch ** 2"),
    ("Msi", "stress", "megapound_force / inch ** 2"),
    ("kg/m³", "density", "kilogram / meter ** 3"),
    ("g/cm³", "density", "gram / centimeter ** 3"),
    ("µm", "length", "micrometer"),
    ("μm", "length", "micrometer"),
    ("mm", "length", "millimeter"),
    ("thou", "length", "thou"),
    ("kW", "power", "kilowatt"),
    ("hp", "power", "horsepower"),
    ("%", "dimensionless", "percent"),
    ("", "dimensionless", "dimensionless"),
    ("-", "dimensionless", "dimensionless"),
    ("1", "dimensionless", "dimensionless"),
]

# NIST SP 811 (2008) Appendix B: the factors a mix-up of canonical units would break.
NIST = [
    ("FT", "length", 0.3048),            # foot, exact
    ("IN", "length", 0.0254),            # inch, exact
    ("thou", "length", 2.54e-5),         # mil (thousandth of an inch), exact
    ("lbf·FT", "torque", 1.355818),      # foot pound-force -> N·m
    ("LBF*in", "torque", 0.1129848),     # inch pound-force -> N·m
    ("PSI", "stress", 6894.757),         # pound-force per square inch -> Pa
    ("KSI", "stress", 6.894757e6),
    ("HP", "power", 745.6999),           # horsepower (550 ft·lbf/s) -> W
    ("PS", "power", 735.4988),           # horsepower, metric -> W
    ("LB/IN^3", "density", 2.767990e4),  # pound per cubic inch -> kg/m³
    ("RPM", "speed", 2 * math.pi / 60),  # one turn is 2π rad (definition)
    ("Degrees", "angle", math.pi / 180),
]


def _header_factor(text: str, kind: str) -> float:
    name, unit = split_header(f"Quantity [{text}]")
    assert name == "Quantity"
    return si_factor(unit or "", kind)


@pytest.mark.parametrize("alias, text, kind, canonical", ALIASES, ids=[a[0] for a in ALIASES])
def test_alias_in_a_cell_and_a_header(alias, text, kind, canonical):
    expected = pint_factor(canonical, kind)
    assert parse_value(f"2 {text}", kind) == pytest.approx(2 * expected, rel=1e-12)
    assert _header_factor(text, kind) == pytest.approx(expected, rel=1e-12)


def test_every_alias_of_the_module_is_listed_here():
    from twistshare.engine.units import _spellings

    assert set(_spellings._ALIASES) == {a[0] for a in ALIASES}
    assert set(_spellings._MASS_POUNDS) == set(MASS_POUNDS)


@pytest.mark.parametrize("alias", MASS_POUNDS)
def test_mass_pound_in_a_density(alias):
    expected = pint_factor("pound / inch ** 3", "density")
    text = f"{alias}/in³"
    assert parse_value(f"0.5 {text}", "density") == pytest.approx(0.5 * expected, rel=1e-12)
    assert _header_factor(text, "density") == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("alias", MASS_POUNDS)
def test_mass_pound_refused_in_a_torque(alias):
    # decision in engine/units: a pound of mass is not a force
    with pytest.raises(UnitProblem):
        si_factor(f"{alias}-in", "torque")


@pytest.mark.parametrize("text, kind, canonical", SPELLINGS, ids=[s[0] or "blank" for s in SPELLINGS])
def test_spelling_in_a_cell_and_a_header(text, kind, canonical):
    expected = pint_factor(canonical, kind)
    cell = f"3 {text}" if text else "3"
    assert parse_value(cell, kind) == pytest.approx(3 * expected, rel=1e-12)
    if text:
        assert _header_factor(text, kind) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("text, kind, nist", NIST, ids=[n[0] for n in NIST])
def test_factor_against_nist_sp811(text, kind, nist):
    # NIST SP 811 gives 7 significant figures for the non-exact factors
    assert si_factor(text, kind) == pytest.approx(nist, rel=5e-7)
    assert parse_value(f"1 {text}", kind) == pytest.approx(nist, rel=5e-7)


@pytest.mark.parametrize("alias, text, kind, canonical", ALIASES, ids=[a[0] for a in ALIASES])
def test_alias_refused_as_another_kind(alias, text, kind, canonical):
    # the dimension is checked: a length is not a stress, anything else is not a length
    other = "stress" if kind != "stress" else "length"
    with pytest.raises(UnitProblem):
        si_factor(text, other)


US_ALIASES = {"HP", "Hp", "PSI", "Psi", "KSI", "Ksi", "MSI", "in", "In", "IN", "inches", "Inch", "LBF", "Lbf",
              "kips", "FT", "Ft"}


@pytest.mark.parametrize("alias, text, kind, canonical", ALIASES, ids=[a[0] for a in ALIASES])
def test_alias_unit_system(alias, text, kind, canonical):
    # US customary: inch, foot, pound-force, psi family, horsepower (NIST SP 811 App. B lists
    # them apart from SI); metric horsepower, rpm and degrees are not US customary (common practice)
    assert unit_system(text) == ("US" if alias in US_ALIASES else "SI")


# Every character the reader maps before parsing (`engine/units/_spellings.py` `_CHAR_MAP`), each written in a
# unit once: (the character, the text it is tested in, kind, the canonical pint unit of that text).
CHARACTERS = [
    ("·", "N·m", "torque", "newton * meter"),
    ("⋅", "N⋅m", "torque", "newton * meter"),
    ("×", "N×m", "torque", "newton * meter"),
    ("•", "N•m", "torque", "newton * meter"),
    ("∙", "N∙m", "torque", "newton * meter"),
    ("・", "kN・m", "torque", "kilonewton * meter"),
    ("✕", "lbf✕ft", "torque", "pound_force * foot"),
    ("µ", "µm", "length", "micrometer"),
    ("μ", "μm", "length", "micrometer"),
    ("°", "°/ft", "angle_per_length", "degree / foot"),
    ("º", "º", "angle", "degree"),
    ("˚", "˚", "angle", "degree"),
    ("−", "kN−m", "torque", "kilonewton * meter"),
    ("–", "lbf–in", "torque", "pound_force * inch"),
    ("‐", "N‐m", "torque", "newton * meter"),
    ("‑", "N‑mm", "torque", "newton * millimeter"),
    ("—", "ft—lbf", "torque", "foot * pound_force"),
    ("\u00a0", "N\u00a0m", "torque", "newton * meter"),
    ("\u2009", "kN\u2009m", "torque", "kilonewton * meter"),
    ("\u202f", "N\u202fmm", "torque", "newton * millimeter"),
    ("\u2007", "lbf\u2007in", "torque", "pound_force * inch"),
    ("\t", "N\tm", "torque", "newton * meter"),
    ("⁄", "rev⁄min", "speed", "revolution / minute"),
    ("∕", "N∕mm²", "stress", "newton / millimeter ** 2"),
]

# Superscript exponents (`_SUPERSCRIPTS`): each digit and sign in an exponent at least once.
SUPERSCRIPTS = [
    ("kg/m³", "density", "kilogram / meter ** 3"),
    ("kg·m⁻³", "density", "kilogram / meter ** 3"),
    ("N·mm⁻²", "stress", "newton / millimeter ** 2"),
    ("N/mm²", "stress", "newton / millimeter ** 2"),
    ("°·m⁻¹", "angle_per_length", "degree / meter"),
    ("kg·m⁻⁰³", "density", "kilogram / meter ** 3"),
    ("N·m¹", "torque", "newton * meter"),
    ("N·m⁺¹", "torque", "newton * meter"),
    ("kN·mm⁴·mm⁻⁴·m", "torque", "kilonewton * meter"),
]


@pytest.mark.parametrize("char, text, kind, canonical", CHARACTERS, ids=[repr(c[0]) for c in CHARACTERS])
def test_mapped_character_in_a_cell_and_a_header(char, text, kind, canonical):
    assert char in text
    expected = pint_factor(canonical, kind)
    assert parse_value(f"2 {text}", kind) == pytest.approx(2 * expected, rel=1e-12)
    assert _header_factor(text, kind) == pytest.approx(expected, rel=1e-12)


def test_every_mapped_character_is_listed_here():
    from twistshare.engine.units import _spellings

    assert {chr(c) for c in _spellings._CHAR_MAP} == {c[0] for c in CHARACTERS}


@pytest.mark.parametrize("text, kind, canonical", SUPERSCRIPTS, ids=[s[0] for s in SUPERSCRIPTS])
def test_superscript_exponent_in_a_cell_and_a_header(text, kind, canonical):
    expected = pint_factor(canonical, kind)
    assert parse_value(f"2 {text}", kind) == pytest.approx(2 * expected, rel=1e-12)
    assert _header_factor(text, kind) == pytest.approx(expected, rel=1e-12)


# Exponents above 4 are refused (no quantity here needs them); the message names the exponent as
# read, so each of these superscript digits is checked to be read as its own digit.
HIGH_SUPERSCRIPTS = [("⁵", 5), ("⁶", 6), ("⁷", 7), ("⁸", 8), ("⁹", 9)]


@pytest.mark.parametrize("sup, digit", HIGH_SUPERSCRIPTS)
def test_high_superscript_read_as_its_digit(sup, digit):
    with pytest.raises(UnitProblem, match=f"exponent {digit} is not expected"):
        parse_value(f"2 N·mm{sup}", "torque")
    with pytest.raises(UnitProblem, match=f"exponent {digit} is not expected"):
        si_factor(split_header(f"Torque [N·mm{sup}]")[1], "torque")


def test_every_superscript_character_is_used_here():
    used = set("".join(s[0] for s in SUPERSCRIPTS) + "".join(h[0] for h in HIGH_SUPERSCRIPTS))
    assert set("⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺") <= used


# Temperatures (`_TEMPERATURE_NAMES`): each key once, against pint's offset conversion to kelvin
# (pint's degree_Celsius, degree_Fahrenheit, kelvin and degree_Rankine definitions).
TEMPERATURES = [
    ("degC", "degree_Celsius"), ("C", "degree_Celsius"), ("celsius", "degree_Celsius"),
    ("Celsius", "degree_Celsius"), ("degc", "degree_Celsius"),
    ("degF", "degree_Fahrenheit"), ("F", "degree_Fahrenheit"), ("fahrenheit", "degree_Fahrenheit"),
    ("Fahrenheit", "degree_Fahrenheit"), ("degf", "degree_Fahrenheit"),
    ("K", "kelvin"), ("kelvin", "kelvin"), ("Kelvin", "kelvin"),
    ("degR", "degree_Rankine"), ("R", "degree_Rankine"),
]


@pytest.mark.parametrize("text, canonical", TEMPERATURES, ids=[t[0] for t in TEMPERATURES])
def test_temperature_name_in_a_cell_and_a_header(text, canonical):
    # 100 of the unit, converted by pint with its offset; and the header's factor and offset
    # applied to the same number (tolerance 1e-9 K: pint's offset arithmetic, not exact decimals)
    expected = _PINT.Quantity(100.0, canonical).to("kelvin").magnitude
    assert parse_value(f"100 {text}", "temperature") == pytest.approx(expected, abs=1e-9)
    name, unit = split_header(f"Temperature [{text}]")
    assert name == "Temperature"
    got = 100.0 * si_factor(unit, "temperature") + si_offset(unit, "temperature")
    assert got == pytest.approx(expected, abs=1e-9)


def test_every_temperature_name_is_listed_here():
    from twistshare.engine.units import _spellings

    assert set(_spellings._TEMPERATURE_NAMES) == {t[0] for t in TEMPERATURES}


def test_nist_temperature_points():
    # NIST SP 811 (2008) B.9 / 4.2.1.1: T/K = t/°C + 273.15; T/K = (t/°F + 459.67)/1.8; T/K = (T/°R)/1.8
    assert parse_value("20 degC", "temperature") == pytest.approx(293.15, abs=1e-9)
    assert parse_value("68 degF", "temperature") == pytest.approx((68 + 459.67) / 1.8, abs=1e-9)
    assert parse_value("527.67 degR", "temperature") == pytest.approx(527.67 / 1.8, abs=1e-9)
