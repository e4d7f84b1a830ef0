"""The unit factors' own rules (`engine/units/_factors.py`): what is not a unit text, a
temperature unit that is not one, the unit system of the temperature scales, and the
dimensionless kind. Factors are pint's (the shared registry) and NIST SP 811 (from memory)."""

import pytest
from twistshare.engine.units import UnitProblem, si_factor, si_offset, unit_system


@pytest.mark.parametrize("call, message", [
    (lambda: si_factor(5, "length"), "expected a length, got '5' (not a unit text)"),
    (lambda: unit_system(5), "got '5' (not a unit text)"),
    (lambda: si_offset("kg", "temperature"), "expected a temperature, got 'kg' (a mass); write '°C', '°F' or 'K'"),
    (lambda: si_offset("blorp", "temperature"),
     "expected a temperature, got 'blorp' ('blorp' is not a unit I know); write '°C', '°F' or 'K'"),
])
def test_refusals_word_for_word(call, message):
    with pytest.raises(UnitProblem) as error:
        call()
    assert str(error.value) == message


@pytest.mark.parametrize("text, system", [("°R", "US"), ("degR", "US"), ("°F", "US"), ("°C", "SI"), ("K", "SI")])
def test_temperature_scales_belong_to_their_systems(text, system):
    # Fahrenheit and Rankine are US customary scales; Celsius and kelvin SI (NIST SP 811).
    assert unit_system(text) == system


def test_the_dimensionless_kind():
    # pint: percent = 0.01; a plain ratio is 1
    assert si_factor("%", "dimensionless") == pytest.approx(0.01, rel=1e-15)
    assert si_factor("1", "dimensionless") == pytest.approx(1.0, rel=1e-15)
