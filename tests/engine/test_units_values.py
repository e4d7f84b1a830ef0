"""`engine/units/_values.py`: every refusal of a cell value, word for word, and every spreadsheet
error value a cell can show.

The wording is the project's own (each message says what was found and what was expected, the
rule of `../shared/STYLE.md`); the error values are the ones the spreadsheet programs show in a
cell: Excel's (#NULL! ... #PYTHON!, from memory of Microsoft's list of error values) and
LibreOffice Calc's ``Err:nnn`` codes (from memory of its error-code table).
"""

from __future__ import annotations

import datetime

import pytest
from twistshare.engine.units import ERROR_VALUES, UnitProblem, error_value_text, parse_value

EXCEL_ERRORS = ("#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A", "#GETTING_DATA",
                "#SPILL!", "#CALC!", "#FIELD!", "#BLOCKED!", "#CONNECT!", "#BUSY!", "#UNKNOWN!",
                "#EXTERNAL!", "#PYTHON!")
CALC_ERRORS = ("ERR:502", "ERR:504", "ERR:508", "ERR:522", "ERR:523")


@pytest.mark.parametrize("error", EXCEL_ERRORS + CALC_ERRORS)
def test_every_error_value_is_refused_as_one(error):
    for written in (error, error.lower(), f"  {error} "):
        assert error_value_text(written) == error
        with pytest.raises(UnitProblem) as caught:
            parse_value(written, "length", "mm")
        assert caught.value.reason == "a spreadsheet error value"
        assert str(caught.value) == f"cell holds the error {error}"


def test_the_list_is_exactly_the_programs_error_values():
    assert ERROR_VALUES == frozenset(EXCEL_ERRORS + CALC_ERRORS)


class _LongRepr:
    def __repr__(self) -> str:
        return "x" * 80


@pytest.mark.parametrize(
    ("value", "kind", "unit", "text", "reason", "message"),
    [
        ("", "length", "mm", "", "empty", "cell is empty; expected a length"),
        ("   ", "length", "mm", "", "empty", "cell is empty; expected a length"),
        (None, "torque", "N·m", "", "empty", "cell is empty; expected a torque"),
        ("1,200 N·m", "torque", None, "1,200 N·m", "a comma in the number",
         "expected a torque, got '1,200 N·m' (a comma in the number); it could be a thousands "
         "separator or a decimal comma; write the number with no separators and a decimal point, "
         "e.g. '1200' or '1.2'"),
        ("12,5 mm", "length", None, "12,5 mm", "a decimal comma",
         "expected a length, got '12,5 mm' (a decimal comma); write a decimal point, e.g. '12.5'"),
        ("1 200 mm", "length", None, "1 200 mm", "digits separated by spaces",
         "expected a length, got '1 200 mm' (digits separated by spaces); write the number with "
         "no separators, e.g. '1200'"),
        ("abc", "length", None, "abc", "not a number with a unit",
         "expected a length, got 'abc' (not a number with a unit)"),
        (float("inf"), "length", "mm", "inf", "not a finite number",
         "expected a length, got 'inf' (not a finite number)"),
        ("52", "length", None, "52", "no unit",
         "expected a length, got '52' (no unit); write it with its unit, e.g. '52 mm', or put "
         "the unit in the column header"),
        ("52", "length", 5, "5", "not a unit text", "expected a length, got '5' (not a unit text)"),
        (datetime.date(2024, 5, 1), "length", "mm", "2024-05-01", "a date or time",
         "expected a length, got '2024-05-01' (a date or time)"),
        (_LongRepr(), "length", "mm", "x" * 60, "a _LongRepr, not a number",
         f"expected a length, got '{'x' * 60}' (a _LongRepr, not a number)"),
    ],
)
def test_each_refusal_word_for_word(value, kind, unit, text, reason, message):
    with pytest.raises(UnitProblem) as caught:
        parse_value(value, kind, unit)
    problem = caught.value
    assert (problem.text, problem.kind, problem.reason, str(problem)) == (text, kind, reason, message)


@pytest.mark.parametrize(
    ("unit", "kind", "message"),
    [
        # found by the property test of test_units.py: pint refuses to multiply a logarithmic
        # unit (neper) or an offset one (degree Celsius) and raised its own error past us
        ("Np°", "angle", "expected an angle, got 'Np°' (an offset or logarithmic unit inside a product)"),
        ("Np/K", "expansion", "expected an expansion coefficient (1/K), got 'Np/K' (an offset or "
         "logarithmic unit inside a product); write '1/K' or '1/°C'"),
    ],
)
def test_offset_and_logarithmic_units_in_a_product_are_refused_in_words(unit, kind, message):
    from twistshare.engine.units import si_factor

    with pytest.raises(UnitProblem) as caught:
        si_factor(unit, kind)
    assert str(caught.value) == message
