"""Demand from power and speed: T = SF * P / omega, checked against handbook constants."""

import math

import numpy as np
import pint
import pytest
from twistshare.engine.core import torque_from_power

# NIST SP 811 (Guide for the Use of the SI), conversion factors: both follow from the
# exact definitions of the foot, pound and standard gravity.
WATT_PER_HP = 745.699872  # mechanical horsepower, 550 ft*lbf/s
NM_PER_LBF_IN = 0.112984829
RAD_S_PER_RPM = 2 * math.pi / 60


@pytest.mark.parametrize("power", [1.0, 7.5e3, 2.0e6])
@pytest.mark.parametrize("speed", [0.5, 151.8, 3000.0])
def test_si_relation(power, speed):
    """T = P / omega (definition of rotational power). rtol 1e-15."""
    assert torque_from_power(power, speed) == pytest.approx(power / speed, rel=1e-15)


@pytest.mark.parametrize("hp", [0.5, 10.0, 250.0])
@pytest.mark.parametrize("rpm", [100.0, 1750.0, 3600.0])
def test_handbook_constant_63025(hp, rpm):
    """Machinery's Handbook: T[lbf*in] = 63 025 P[hp] / n[rpm]. The SI path with the
    NIST SP 811 factors agrees within the constant's rounding (63 025.35...), 1e-5."""
    torque_nm = torque_from_power(hp * WATT_PER_HP, rpm * RAD_S_PER_RPM)
    torque_lbf_in = torque_nm / NM_PER_LBF_IN
    assert torque_lbf_in == pytest.approx(63025 * hp / rpm, rel=1e-5)


@pytest.mark.parametrize("kw", [0.75, 55.0])
@pytest.mark.parametrize("rpm", [960.0, 2900.0])
def test_metric_constant_9549(kw, rpm):
    """T[N*m] = 9549 P[kW] / n[rpm] (common practice; 60 000 / 2 pi = 9549.3), 1e-4."""
    assert torque_from_power(kw * 1e3, rpm * RAD_S_PER_RPM) == pytest.approx(9549 * kw / rpm, rel=1e-4)


def test_conversion_factors_agree_with_pint():
    """pint's unit definitions (a general-purpose reference library) give the same
    factors as NIST SP 811 to 1e-9."""
    ureg = pint.UnitRegistry()
    assert ureg.Quantity(1, "hp").m_as("W") == pytest.approx(WATT_PER_HP, rel=1e-9)
    assert ureg.Quantity(1, "lbf * inch").m_as("N * m") == pytest.approx(NM_PER_LBF_IN, rel=1e-9)


def test_service_factor_multiplies():
    assert torque_from_power(1e3, 10.0, service_factor=1.5) == pytest.approx(150.0)


def test_standstill_and_bad_factor_give_nan():
    result = torque_from_power(1e3, [0.0, -5.0, np.nan, 10.0], [1.0, 1.0, 1.0, 0.0])
    assert np.isnan(result).all()


def test_scalar_in_scalar_out_and_broadcast():
    assert np.ndim(torque_from_power(1e3, 10.0)) == 0
    assert torque_from_power([1e3, 2e3], 10.0).tolist() == [100.0, 200.0]
