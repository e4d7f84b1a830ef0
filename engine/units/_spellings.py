"""The spellings engineers type that pint lacks, reads wrongly or must refuse, and the character
and temperature-name tables the grammar reads them through."""

from __future__ import annotations

import re
from types import MappingProxyType
from typing import Mapping

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

