"""What a refused unit text is told: the reason, the advice and the whole message, word for word.

A user reads these words in a cell comment or a cell function's answer, so each is checked
exactly. Where a reason names a dimension ("an area", "a velocity"), the test also asks a fresh
pint registry of our own (pint's default definitions, not the project's registry) for the unit's
dimensionality: the words must name what pint says the unit measures. Unit factors are from
NIST SP 811 (2008), Appendix B.8/B.9 (yard = 0.9144 m, mile = 1609.344 m, foot = 0.3048 m,
inch = 0.0254 m exactly; grain = 64.798 91 mg exactly; kip = 4 448.222 N; slug = 14.593 90 kg).
The US customary units are those NIST SP 811 Appendix B lists as inch-pound units (common
practice: the US customary system).
"""

from __future__ import annotations

import pint
import pytest
from twistshare.engine.units import UnitProblem, describe_kind, display_unit, si_factor, unit_system

_PINT = pint.UnitRegistry()  # our own: the oracle must not share the project's definitions


def _refusal(text: str, kind: str) -> UnitProblem:
    with pytest.raises(UnitProblem) as caught:
        si_factor(text, kind)
    return caught.value


def _dims(text: str) -> dict:
    return dict(_PINT.Unit(text).dimensionality)


# (text, kind, reason, advice) -- the grammar's refusals, one per rule
_GRAMMAR = [
    ('3"', "length", "inch and foot marks are not read", "write 'in' for inches and 'ft' for feet"),
    ("3'", "length", "inch and foot marks are not read", "write 'in' for inches and 'ft' for feet"),
    ("2″", "length", "inch and foot marks are not read", "write 'in' for inches and 'ft' for feet"),
    ("1′", "length", "inch and foot marks are not read", "write 'in' for inches and 'ft' for feet"),
    ("%%", "dimensionless", "not a unit", None),          # a name where an operator belongs
    ("m%", "length", "not a unit", None),
    ("m*1/s", "length", "not a unit", None),              # '1' only opens a unit ('1/s')
    ("*m", "length", "not a unit", None),                 # an operator where a name belongs
    ("/m", "length", "not a unit", None),
    ("m^5", "length", "exponent 5 is not expected in a unit", None),
    ("m^-5", "length", "exponent -5 is not expected in a unit", None),
    ("m^0", "length", "exponent 0 is not expected in a unit", None),
    ("kg/m s", "density", "more than one unit after '/'", "write one unit after the slash, e.g. 'kg/m³'"),
    ("N/mm^2*m", "stress", "more than one unit after '/'", "write one unit after the slash, e.g. 'kg/m³'"),
    ("m//s", "length", "more than one '/'", "write one unit after the slash"),
    ("kg/m^3/s", "density", "more than one '/'", "write one unit after the slash"),
    ("m$", "length", "not a unit (unexpected '$')", None),
    ("1 N", "length", "not a unit (unexpected '1')", None),
    ("m*", "length", "not a unit (incomplete)", None),
    ("m/", "length", "not a unit (incomplete)", None),
    (".", "length", "not a unit", None),                  # a lone full stop is not an abbreviation's
    ("r", "angle", "'r' alone is not a unit", "write 'rev' or 'rad' for an angle, 'rpm' for a speed"),
    ("r^2/s", "speed", "'r' alone is not a unit", "write 'rev' or 'rad' for an angle, 'rpm' for a speed"),
    ("Nm^2", "torque", "'Nm' with an exponent is ambiguous", "write each unit with its own exponent"),
    ("furlongx", "length", "'furlongx' is not a unit I know", None),
    ("mil", "length", "'mil' is read as a thousandth of an inch, a millimetre and an angular mil",
     "write 'thou' or 'in' for inches, 'mm' for millimetres"),
    ("mils", "length", "'mils' is read as thousandths of an inch, millimetres and angular mils",
     "write 'thou' or 'in' for inches, 'mm' for millimetres"),
    ("mPa", "stress", "'mPa' is a millipascal", "for megapascals write 'MPa'"),
    ("lb", "force", "lb is a pound of mass, not of force", "for a force write 'lbf', 'N' or 'kN'"),
    ("lb*in", "torque", "lb is a pound of mass, not of force", "for a torque write 'lbf·in' or 'lbf·ft'"),
    ("lb/in^2", "stress", "lb is a pound of mass, not of force", "for a stress write 'psi', 'ksi' or 'lbf/in²'"),
    ("lb*ft/s", "power", "lb is a pound of mass, not of force", "for a power write 'hp' or 'lbf·ft/s'"),
    ("Hz", "speed", "a frequency",
     "it does not say whether it counts revolutions or radians; write 'rpm', 'rev/s' or 'rad/s'"),
    ("", "angle", "a plain number", "write the angle unit, e.g. '°' or 'rad'"),
    ("1/m", "angle_per_length", "a reciprocal length", "write an angle over a length, e.g. '°/m' or 'rad/m'"),
    ("mm/m", "dimensionless", "not a plain-number unit", "leave the unit out, or write '%' for a percentage"),
    ("J", "torque", "an energy unit", "write a torque as force × length, e.g. 'N·m' or 'lbf·ft'"),
]


@pytest.mark.parametrize(("text", "kind", "reason", "advice"), _GRAMMAR)
def test_a_refused_unit_is_told_its_reason_and_advice_word_for_word(text, kind, reason, advice):
    problem = _refusal(text, kind)
    assert (problem.text, problem.kind, problem.reason, problem.advice) == (text, kind, reason, advice)
    expected = f"expected {describe_kind(kind)}, got {text!r} ({reason})" + (f"; {advice}" if advice else "")
    assert problem.message == expected == str(problem)


# (text, words): a unit of another kind, named by what it measures; pint's dimensionality beside it
_MEASURES = [
    ("mm^2", "an area", {"[length]": 2}),
    ("mm^3", "a volume", {"[length]": 3}),
    ("mm^4", "a length to the fourth (a second moment of area)", {"[length]": 4}),
    ("kg", "a mass", {"[mass]": 1}),
    ("s", "a time", {"[time]": 1}),
    ("m/s", "a velocity", {"[length]": 1, "[time]": -1}),
    ("K", "a temperature", {"[temperature]": 1}),
    ("kW", "a power", {"[mass]": 1, "[length]": 2, "[time]": -3}),
    ("lbf", "a force", {"[mass]": 1, "[length]": 1, "[time]": -2}),
    ("kg/m^3", "a density", {"[mass]": 1, "[length]": -3}),
    ("1/m", "a reciprocal length", {"[length]": -1}),
    ("Hz", "a frequency", {"[time]": -1}),
]


@pytest.mark.parametrize(("text", "words", "dims"), _MEASURES)
def test_a_unit_of_another_kind_is_named_by_what_pint_says_it_measures(text, words, dims):
    assert _dims(text) == dims
    problem = _refusal(text, "length" if text not in ("1/m",) else "stress")
    assert problem.reason == words
    assert problem.advice is None  # advice belongs to the kinds that have one clear answer


def test_a_dimension_without_words_is_shown_as_pint_writes_it_and_an_angle_is_said():
    assert _dims("kg*m") == {"[mass]": 1, "[length]": 1}
    assert _refusal("kg*m", "length").reason == "a quantity of dimension [mass] * [length]"
    # pint calls the radian dimensionless; the words must still say an angle is in it
    assert _refusal("rad*m", "length").reason == "a quantity of dimension [length] with an angle"
    assert _refusal("m^2*rad", "length").reason == "a quantity of dimension [length] ** 2 with an angle"
    assert _refusal("rad^2", "length").reason == "not a measure I know"


@pytest.mark.parametrize(("text", "kind", "reason"), [
    ("Hz", "length", "a frequency"),          # the 2π advice is for a speed only
    ("m", "angle", "a length"),               # the angle-unit advice is for a plain number only
    ("", "length", "a plain number"),
    ("1/m", "length", "a reciprocal length"),  # the angle-over-length advice is for a twist rate only
    ("m", "angle_per_length", "a length"),
    ("", "torque", "a plain number"),         # no unit is no pound of mass
])
def test_advice_is_given_only_where_it_is_the_one_clear_answer(text, kind, reason):
    problem = _refusal(text, kind)
    assert (problem.reason, problem.advice) == (reason, None)
    assert ";" not in problem.message


@pytest.mark.parametrize(("kind", "phrase"), [
    ("power", "a power"), ("speed", "a rotational speed"), ("angle_per_length", "an angle per length"),
    ("dimensionless", "a plain number"), ("length", "a length"), ("torque", "a torque"),
])
def test_each_kind_is_named_in_what_was_expected(kind, phrase):
    assert describe_kind(kind) == phrase
    assert _refusal("kg", kind).message == f"expected {phrase}, got 'kg' (a mass)"


def test_a_problem_with_no_kind_asked_says_only_what_was_found():
    with pytest.raises(UnitProblem) as caught:
        unit_system("m$")
    assert caught.value.kind is None
    assert caught.value.message == "got 'm$' (not a unit (unexpected '$'))"


def test_a_wrong_kind_or_system_name_is_a_programming_error_with_the_choices():
    with pytest.raises(ValueError) as caught:
        display_unit("lenght", "SI")
    assert str(caught.value).startswith("kind must be one of ('length', 'stress', ")
    assert str(caught.value).endswith("got 'lenght'")
    with pytest.raises(ValueError) as caught:
        display_unit("length", "metric")
    assert str(caught.value) == "system must be 'SI' or 'US', got 'metric'"


@pytest.mark.parametrize(("text", "kind", "factor"), [
    ("[]", "dimensionless", 1.0),        # an empty bracket in a header: a plain number
    ("[mm]", "length", 0.001),
    ("m.", "length", 1.0),               # an abbreviation's full stop, even after one letter
    ("in.", "length", 0.0254),           # NIST SP 811 B.8: the inch is 0.0254 m exactly
    ("ppm/K", "expansion", 1e-6),        # a part per million per kelvin (common practice)
])
def test_wrappings_and_full_stops_are_read_through(text, kind, factor):
    assert si_factor(text, kind) == pytest.approx(factor, rel=1e-12)


def test_whitespace_of_any_kind_inside_a_temperature_unit_is_one_space():
    # 'deg F' with a tab between the words is still the Fahrenheit scale, a US unit
    assert unit_system("deg\tF") == unit_system("deg F") == "US"


# (text, kind, NIST SP 811 factor to SI) -- every US customary unit named in the system table
_US = [
    ("yd", "length", 0.9144), ("mi", "length", 1609.344), ("thou", "length", 2.54e-5),
    ("survey_foot", "length", 1200 / 3937), ("international_foot", "length", 0.3048),
    ("hand", "length", 0.1016),                                   # 4 in
    ("kip", "force", 4448.2216152605), ("ozf", "force", 0.27801385095378125),
    ("lb/in^3", "density", 0.45359237 / 0.0254 ** 3),
    ("oz/in^3", "density", 0.45359237 / 16 / 0.0254 ** 3),
    ("slug/ft^3", "density", 14.593902937206364 / 0.3048 ** 3),
    ("grain/in^3", "density", 64.79891e-6 / 0.0254 ** 3),
]


@pytest.mark.parametrize(("text", "kind", "factor"), _US)
def test_every_us_customary_unit_marks_its_text_as_us_with_nist_s_factor(text, kind, factor):
    assert unit_system(text) == "US"
    assert si_factor(text, kind) == pytest.approx(factor, rel=1e-6)


def test_pint_s_foot_pound_is_a_us_energy_unit_and_so_not_a_torque():
    # pint defines foot_pound as work (ft·lbf); a torque must be written force × length
    assert unit_system("ft_lb") == "US"
    assert _refusal("ft_lb", "torque").reason == "an energy unit"
