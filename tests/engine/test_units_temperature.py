"""Temperature and expansion-coefficient units (engine/units), checked against pint's own
offset-aware conversions (pint, the reference library)."""

from __future__ import annotations

import pint
import pytest
from twistshare.engine.units import UnitProblem, parse_value, si_factor, si_offset

UREG = pint.UnitRegistry()


@pytest.mark.parametrize("text, pint_unit", [
    ("°C", "degC"), ("degC", "degC"), ("deg C", "degC"), ("C", "degC"),
    ("°F", "degF"), ("degF", "degF"), ("K", "kelvin"), ("kelvin", "kelvin"),
])
@pytest.mark.parametrize("value", [-40.0, 0.0, 20.0, 150.0])
def test_temperature_to_kelvin_agrees_with_pint(text, pint_unit, value):
    expected = UREG.Quantity(value, pint_unit).to("kelvin").magnitude
    assert parse_value(f"{value} {text}", "temperature") == pytest.approx(expected, abs=1e-9)
    assert value * si_factor(text, "temperature") + si_offset(text, "temperature") == pytest.approx(
        expected, abs=1e-9)


def test_other_kinds_have_no_offset():
    assert si_offset("mm", "length") == 0.0


@pytest.mark.parametrize("text", ["mm", "MPa", "deg"])
def test_a_temperature_of_the_wrong_kind_is_refused(text):
    with pytest.raises(UnitProblem, match="expected a temperature"):
        parse_value(f"20 {text}", "temperature")


def test_expansion_coefficient_per_kelvin():
    # 1/K is the SI unit; pint: 1 / kelvin
    assert parse_value("11.7e-6 1/K", "expansion") == pytest.approx(
        UREG.Quantity(11.7e-6, "1/kelvin").to("1/kelvin").magnitude)
    with pytest.raises(UnitProblem):
        parse_value("11.7e-6 1/m", "expansion")
