"""A part's duty from its table columns (`engine/intake/_duty.py`): torque or power at a speed,
the service factor on either, and the problems of a missing or conflicting duty.

Oracles: T = P / ω with ω = 2π n / 60 (any machine-design text; common practice); the service
factor multiplies the duty whichever way it is given (common practice); foot pound-force =
1.355818 N·m and inch pound-force = 0.1129848 N·m (NIST SP 811 (2008) App. B.9).
"""

from __future__ import annotations

import math

import pytest
from _membook import rate_parts

HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Power [kW]", "Speed [rpm]", "Service factor",
        "Layer 1 material", "Layer 1 outer diameter [mm]"]


def _part(torque=None, power=None, speed=None, sf=None, length=500, pid="P1"):
    return [pid, length, torque, power, speed, sf, "Core steel", 40]


def _demand(result) -> float:
    return float(result.parts.duty().torque[0])


@pytest.mark.parametrize("sf", [1.0, 1.25, 1.5, 2.0])
def test_service_factor_applies_to_a_torque(sf):
    result = rate_parts(HEAD, _part(torque=300, sf=sf))
    assert _demand(result) == pytest.approx(300 * sf, rel=1e-12)


@pytest.mark.parametrize("sf", [1.0, 1.4])
def test_service_factor_applies_to_a_power(sf):
    # 15 kW at 1450 rpm: T = 15e3 / (1450 * 2π/60) = 98.786 N·m by hand
    result = rate_parts(HEAD, _part(power=15, speed=1450, sf=sf))
    assert _demand(result) == pytest.approx(sf * 15e3 / (1450 * 2 * math.pi / 60), rel=1e-12)
    assert _demand(result) / sf == pytest.approx(98.786, rel=1e-5)


def test_no_service_factor_means_one():
    assert _demand(rate_parts(HEAD, _part(torque=300))) == pytest.approx(300, rel=1e-12)


def test_torque_in_us_units_with_a_service_factor():
    head = ["Part", "Length [in]", "Torque [lbf·FT]", "Service factor", "Layer 1 material",
            "Layer 1 outer diameter [in]"]
    result = rate_parts(head, ["P1", 20, 100, 1.5, "Core steel", 1.5])
    assert _demand(result) == pytest.approx(100 * 1.355818 * 1.5, rel=5e-7)
    assert float(result.parts.duty().length[0]) == pytest.approx(20 * 0.0254, rel=1e-12)


def test_torque_and_power_that_agree_give_no_warning_and_the_torque_is_used():
    t = 15e3 / (1450 * 2 * math.pi / 60)
    result = rate_parts(HEAD, _part(torque=round(t * 1.004, 3), power=15, speed=1450))  # 0.4 % apart
    assert not [p for p in result.problems if p.code == "duty-disagrees"]
    assert _demand(result) == pytest.approx(round(t * 1.004, 3), rel=1e-12)


def test_torque_and_power_that_disagree_warn_on_the_torque_cell():
    t = 15e3 / (1450 * 2 * math.pi / 60)
    result = rate_parts(HEAD, _part(torque=round(t * 1.02, 3), power=15, speed=1450))  # 2 % apart
    (warning,) = [p for p in result.problems if p.code == "duty-disagrees"]
    assert warning.severity.value == "warning"
    assert warning.cell == "C2" and warning.part == "P1"
    assert warning.message == (f"part P1: torque and power at speed are both given and disagree "
                               f"({round(t * 1.02, 3):.6g} N·m against {t:.6g} N·m); the torque is used")
    assert _demand(result) == pytest.approx(round(t * 1.02, 3), rel=1e-12)


def test_missing_length_is_an_error_on_its_cell():
    result = rate_parts(HEAD, _part(torque=300, length=None))
    (p,) = [p for p in result.problems if p.code == "missing"]
    assert p.severity.value == "error" and p.cell == "B2"
    assert p.message == "part P1: length is missing; expected a length such as '450 mm'"
    assert not result.rated[0]


@pytest.mark.parametrize("power, speed, cell, words", [
    (15, None, "E2", "the speed is missing"),
    (None, 1450, "D2", "the power is missing"),
])
def test_power_without_a_usable_speed(power, speed, cell, words):
    result = rate_parts(HEAD, _part(power=power, speed=speed))
    problems = [p for p in result.problems if p.code == "missing"]
    assert [p.cell for p in problems] == [cell]
    assert problems[0].message == f"part P1: the duty is a power at a speed but {words}"
    assert problems[0].severity.value == "error"
    assert not result.rated[0]


def test_no_duty_at_all():
    result = rate_parts(HEAD, _part())
    (p,) = [p for p in result.problems if p.code == "missing"]
    assert p.cell == "C2" and p.message == "part P1: no duty: give a torque, or a power and a speed"
    assert not result.rated[0]


def test_a_good_part_next_to_a_bad_one_is_rated():
    result = rate_parts(HEAD, _part(torque=300), ["P2", 500, None, None, None, None, "Core steel", 40])
    assert list(result.rated) == [True, False]


def test_twist_limits_are_read_in_si():
    # 1° = π/180 rad (definition)
    head = HEAD + ["Twist limit [deg]", "Twist limit per length [deg/m]"]
    result = rate_parts(head, _part(torque=300) + [0.5, 0.25])
    duty = result.parts.duty()
    assert float(duty.twist_limit_angle[0]) == pytest.approx(0.5 * math.pi / 180, rel=1e-12)
    assert float(duty.twist_limit_per_length[0]) == pytest.approx(0.25 * math.pi / 180, rel=1e-12)


def test_an_unreadable_duty_cell_refuses_the_part_once():
    # the unreadable torque is the one problem: no second "no duty" for the same part
    result = rate_parts(HEAD, _part(torque="abc"), _part(torque=300, pid="P2"))
    ours = [p for p in result.problems if p.part == "P1"]
    assert [p.cell for p in ours] == ["C2"]
    assert list(result.parts.input_error) == [True, False]
    assert list(result.rated) == [False, True]


def test_an_unreadable_cell_before_a_good_column_still_refuses():
    # bad in the length column (read first), the other duty columns good
    result = rate_parts(HEAD, _part(torque=300, length="long"), _part(torque=300, pid="P2"))
    assert [p.cell for p in result.problems if p.part == "P1"] == ["B2"]
    assert list(result.parts.input_error) == [True, False]


def test_missing_length_and_a_bad_torque_are_both_refused():
    result = rate_parts(HEAD, _part(torque=300, length=None), _part(torque="abc", pid="P2"),
                        _part(torque=300, pid="P3"))
    assert list(result.parts.input_error) == [True, True, False]
    assert [p.cell for p in result.problems if p.part == "P1"] == ["B2"]


def test_duty_source_words_shown_in_the_results():
    # the results sheet's duty column shows where the torque came from
    result = rate_parts(HEAD, _part(torque=300), _part(power=15, speed=1450, pid="P2"), _part(pid="P3"))
    assert list(result.parts.duty_source) == ["torque", "power", "none"]


def test_no_duty_without_a_torque_column_points_at_the_power_cell():
    head = ["Part", "Length [mm]", "Power [kW]", "Speed [rpm]", "Layer 1 material", "Layer 1 outer diameter [mm]"]
    result = rate_parts(head, ["P1", 500, None, None, "Core steel", 40])
    (p,) = [p for p in result.problems if p.code == "missing"]
    assert p.cell == "C2"


def test_duty_columns_without_a_speed_say_none_was_given():
    # A duty built without speeds (a cell function's layer block has no duty columns) must say
    # "not given" as None, which the parts assembly reads as no whirl input at all.
    import numpy as np
    from twistshare.engine.intake._cellrefs import CellRefs
    from twistshare.engine.intake._duty import DutyColumns

    nan = np.full(2, np.nan)
    duty = DutyColumns(nan, nan, nan, nan, ["none", "none"], np.zeros(2, bool), CellRefs("Layers", []))
    assert duty.speed is None
