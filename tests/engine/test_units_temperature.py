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


@pytest.mark.parametrize("text, pint_unit", [("°\nC", "degC"), ("deg \n\n F", "degF"), ("°\r\nF", "degF")])
def test_a_line_break_inside_a_temperature_unit_reads_as_a_space(text, pint_unit):
    # a header typed over two lines in a spreadsheet cell ("Assembly temperature [°" then "C]")
    # reads as the one unit; factor and offset from pint's conversion of 0 and 1 degree
    offset = UREG.Quantity(0.0, pint_unit).to("kelvin").magnitude
    factor = UREG.Quantity(1.0, pint_unit).to("kelvin").magnitude - offset
    assert si_offset(text, "temperature") == pytest.approx(offset, abs=1e-12)
    assert si_factor(text, "temperature") == pytest.approx(factor, rel=1e-12)


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


@pytest.mark.parametrize("text, per_kelvin", [
    # an expansion coefficient is per degree of temperature change: NIST SP 811 (from memory) gives
    # a degree Celsius equal in size to a kelvin and a degree Fahrenheit (and Rankine) as 5/9 K
    ("1/°C", 1.0), ("1/degC", 1.0), ("1 / °C", 1.0), ("1/C", 1.0),
    ("1/°F", 9 / 5), ("1/degF", 9 / 5), ("1/degR", 9 / 5), ("1/K", 1.0),
])
def test_expansion_coefficient_per_degree_is_per_temperature_change(text, per_kelvin):
    assert si_factor(text, "expansion") == pytest.approx(per_kelvin, rel=1e-12)
    # pint's own temperature-difference units agree (the reference library)
    pint_unit = {"1/°F": "1/delta_degF", "1/degF": "1/delta_degF", "1/degR": "1/degR", "1/K": "1/K"}.get(
        text, "1/delta_degC")
    assert si_factor(text, "expansion") == pytest.approx(
        UREG.Quantity(1.0, pint_unit).to("1/K").magnitude, rel=1e-12)
    assert parse_value(f"6.5e-6 {text}", "expansion") == pytest.approx(6.5e-6 * per_kelvin, rel=1e-12)


@pytest.mark.parametrize("text, system", [("1/°C", "SI"), ("1/K", "SI"), ("1/°F", "US")])
def test_expansion_per_degree_unit_system(text, system):
    from twistshare.engine.units import unit_system

    assert unit_system(text) == system


@pytest.mark.parametrize("text, kind", [("1/°C", "length"), ("1/°C", "dimensionless"), ("2/°C", "expansion"),
                                        ("1/°C·s", "expansion")])
def test_per_degree_is_read_only_as_an_expansion_coefficient(text, kind):
    with pytest.raises(UnitProblem):
        si_factor(text, kind)
