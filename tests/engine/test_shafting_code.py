"""The transmission-shafting code's combined equation (Machinery's Handbook, shafts; from memory)."""

import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._shafting_code as code_module
from twistshare.engine.core import (
    SHAFTING_CODE_SHOCK_FATIGUE_FACTORS,
    AllowableRule,
    allowable_shear,
    shafting_code_capacity,
    shafting_code_diameter,
    shafting_code_shear_stress,
)


def test_docstring_examples():
    assert doctest.testmod(code_module).failed == 0


def test_solid_steel_shaft_hand_worked():
    """Hand-worked: a solid 60 mm shaft, M = 1500 N m, T = 2000 N m, rotating with the
    load applied gradually (K_m = 1.5, K_t = 1.0, the code's table, from memory).
    K_m M = 2250, K_t T = 2000, sqrt(2250^2 + 2000^2) = 3010.40 N m;
    pi D^3 / 16 = pi * 0.216e-3 / 16 = 4.24115e-5 m^3; tau = 3010.40 / 4.24115e-5 = 70.98 MPa.
    Against AISI 1045 hot rolled (Sy 310, Su 570 MPa): min(0.30 Sy, 0.18 Su) = min(93.0,
    102.6) = 93.0 MPa, so the shaft passes; with a keyway 0.75 * 93.0 = 69.75 MPa, it fails."""
    tau = shafting_code_shear_stress(1500.0, 2000.0, 0.060, 0.0, 1.5, 1.0)
    assert tau == pytest.approx(70.98e6, rel=2e-4)
    plain = allowable_shear(AllowableRule.SHAFTING_CODE, 310e6, 570e6)
    keyed = allowable_shear(AllowableRule.SHAFTING_CODE, 310e6, 570e6, keyway=True)
    assert plain == pytest.approx(93.0e6, rel=1e-12) and tau < plain
    assert keyed == pytest.approx(69.75e6, rel=1e-12) and tau > keyed


def test_solid_diameter_hand_worked():
    """Same shaft sized for tau_a = 93 MPa: D^3 = 16 * 3010.40 / (pi * 93e6) = 1.64862e-4 m^3,
    D = 54.83 mm (hand arithmetic)."""
    diameter = shafting_code_diameter(93e6, 1500.0, 2000.0, 0.0, 1.5, 1.0)
    assert diameter == pytest.approx(0.05483, rel=2e-4)
    assert shafting_code_shear_stress(1500.0, 2000.0, diameter, 0.0, 1.5, 1.0) == pytest.approx(
        93e6, rel=1e-12)


@pytest.mark.parametrize("ratio", [0.0, 0.4, 0.8])
def test_torsion_alone_is_the_torsion_formula(ratio):
    """M = 0, K_t = 1: tau = 16 T D / (pi (D^4 - d^4)), the torsion formula (any
    mechanics-of-materials text); the code's 1 - k^4 form is the same; rtol 1e-12."""
    outer = 0.08
    inner = ratio * outer
    expected = 16 * 5000.0 * outer / (math.pi * (outer**4 - inner**4))
    assert shafting_code_shear_stress(0.0, 5000.0, outer, inner) == pytest.approx(expected,
                                                                                rel=1e-12)
    assert shafting_code_shear_stress(0.0, 5000.0, outer, inner) == pytest.approx(
        16 * 5000.0 / (math.pi * outer**3 * (1 - ratio**4)), rel=1e-12)


def test_bending_alone_is_the_maximum_shear_of_pure_bending():
    """Pure bending: the largest shear stress is half the fibre stress 32 M / (pi D^3)
    (Mohr's circle, any mechanics-of-materials text)."""
    d = 0.045
    assert shafting_code_shear_stress(800.0, 0.0, d) == pytest.approx(
        0.5 * 32 * 800.0 / (math.pi * d**3), rel=1e-12)


def test_capacity_round_trip_and_zero_when_bending_alone_exceeds():
    allowable, moment, outer, inner = 80e6, 900.0, 0.05, 0.02
    capacity = shafting_code_capacity(allowable, moment, outer, inner, 2.0, 1.5)
    stress = shafting_code_shear_stress(moment, capacity, outer, inner, 2.0, 1.5)
    assert stress == pytest.approx(allowable, rel=1e-12)
    huge = shafting_code_capacity(allowable, 1e5, outer, inner, 2.0, 1.5)
    assert huge == 0.0


def test_hollow_diameter_keeps_the_bore_ratio():
    diameter = shafting_code_diameter(60e6, 400.0, 700.0, bore_ratio=0.6)
    assert shafting_code_shear_stress(400.0, 700.0, diameter, 0.6 * diameter) == pytest.approx(
        60e6, rel=1e-12)
    assert np.isnan(shafting_code_diameter(60e6, 400.0, 700.0, bore_ratio=1.0))


def test_factor_table():
    """The code's table as recalled (from memory): ranges are ordered and at least 1;
    a rotating shaft with a steady load takes K_m = 1.5, K_t = 1.0."""
    for row in SHAFTING_CODE_SHOCK_FATIGUE_FACTORS:
        assert 1.0 <= row.bending_low <= row.bending_high
        assert 1.0 <= row.torsion_low <= row.torsion_high
    steady = next(r for r in SHAFTING_CODE_SHOCK_FATIGUE_FACTORS
                  if r.duty.startswith("rotating") and "gradually" in r.duty)
    assert (steady.bending_low, steady.torsion_low) == (1.5, 1.0)


# The code's table of combined shock and fatigue factors, row by row (ASME code for design of
# transmission shafting, as printed in Machinery's Handbook's shafts section; from memory):
# (duty, K_m low, K_m high, K_t low, K_t high).
PUBLISHED_FACTORS = [
    ("stationary shaft, load gradually applied", 1.0, 1.0, 1.0, 1.0),
    ("stationary shaft, load suddenly applied", 1.5, 2.0, 1.5, 2.0),
    ("rotating shaft, load gradually applied or steady", 1.5, 1.5, 1.0, 1.0),
    ("rotating shaft, load suddenly applied, minor shock", 1.5, 2.0, 1.0, 1.5),
    ("rotating shaft, load suddenly applied, heavy shock", 2.0, 3.0, 1.5, 3.0),
]


def test_factor_table_is_the_published_one_row_by_row():
    got = [(r.duty, r.bending_low, r.bending_high, r.torsion_low, r.torsion_high)
           for r in SHAFTING_CODE_SHOCK_FATIGUE_FACTORS]
    assert got == PUBLISHED_FACTORS
    with pytest.raises(AttributeError):  # frozen: a rating cannot change the table
        SHAFTING_CODE_SHOCK_FATIGUE_FACTORS[0].bending_low = 2.0  # type: ignore[misc]


def test_capacity_defaults_are_a_solid_shaft_without_shock():
    # T = sqrt((tau_a Z_p)^2 - (K_m M)^2) / K_t, Z_p = pi D^3 / 16 for a solid shaft.
    tau, moment, d = 60e6, 400.0, 0.05
    zp = math.pi * d**3 / 16
    expected = math.sqrt((tau * zp) ** 2 - moment**2)
    assert shafting_code_capacity(tau, moment, d) == pytest.approx(expected, rel=1e-12)
    assert shafting_code_capacity(tau, moment, d, 0.0, 1.0, 1.0) == pytest.approx(expected, rel=1e-12)


def test_diameter_default_is_a_solid_shaft_without_shock():
    # D = (16 sqrt(M^2 + T^2) / (pi tau_a))^(1/3) for a solid shaft with K_m = K_t = 1.
    expected = (16 * math.hypot(400.0, 700.0) / (math.pi * 60e6)) ** (1 / 3)
    assert shafting_code_diameter(60e6, 400.0, 700.0) == pytest.approx(expected, rel=1e-12)
