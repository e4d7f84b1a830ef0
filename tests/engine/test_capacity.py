"""Capacities: layer stress capacity and the two twist-limit capacities."""

import math

import numpy as np
import pytest
from twistshare.engine.core import (
    Criterion,
    Duty,
    LayerStack,
    layer_capacity,
    polar_moment,
    rate,
    twist_angle_capacity,
    twist_per_length_capacity,
)


@pytest.mark.parametrize("diameter", [0.01, 0.05, 0.2])
@pytest.mark.parametrize("allowable", [40e6, 150e6])
@pytest.mark.parametrize("kt", [1.0, 1.6])
def test_solid_shaft_capacity_matches_roark(diameter, allowable, kt):
    """Roark's Formulas for Stress and Strain, torsion of circular sections:
    tau_max = 16 T / (pi D^3), so T = tau_a pi D^3 / (16 Kt) (Kt on the peak stress,
    common practice). rtol 1e-12."""
    modulus = 79.3e9
    gj = modulus * polar_moment(diameter)
    expected = allowable * math.pi * diameter**3 / (16 * kt)
    assert layer_capacity(allowable, gj, modulus, diameter, kt) == pytest.approx(expected, rel=1e-12)


def test_capacity_is_where_utilisation_reaches_one():
    """At the torque equal to a layer's capacity, Kt * tau_outer = tau_allow exactly."""
    stack = LayerStack.from_layers([0.04, 0.05], [0.0, 0.04], [79.3e9, 40e9], [100e6, 60e6],
                                   stress_concentration=[1.0, 1.8])
    first = rate(stack, Duty.from_arrays(torque=1.0))
    for slot, kt, allowable in ((0, 1.0, 100e6), (1, 1.8, 60e6)):
        at_capacity = rate(stack, Duty.from_arrays(torque=first.capacity[0, slot]))
        assert at_capacity.utilisation[0, slot] == pytest.approx(1.0, rel=1e-12)
        assert kt * at_capacity.stress_outer[0, slot] == pytest.approx(allowable, rel=1e-12)


@pytest.mark.parametrize("limit_deg", [0.25, 1.0, 3.0])
@pytest.mark.parametrize("length", [0.5, 4.0])
def test_twist_angle_capacity_inverts_twist(limit_deg, length):
    """phi = T L / (G J) (Roark's, torsion of circular sections) inverted: at the
    capacity the twist equals the limit. rtol 1e-12."""
    stack = LayerStack.from_layers([0.06], [0.0], [79.3e9], [1e9])
    limit = math.radians(limit_deg)
    gj = 79.3e9 * polar_moment(0.06)
    capacity = twist_angle_capacity(limit, gj, length)
    assert capacity == pytest.approx(limit * gj / length, rel=1e-15)
    twist = rate(stack, Duty.from_arrays(torque=capacity, length=length)).twist_angle[0]
    assert twist == pytest.approx(limit, rel=1e-12)


def test_twist_per_length_capacity_and_rule_of_thumb():
    """Line-shaft stiffness rule of thumb, about 1 deg of twist in 20 diameters
    (common practice, from memory): for a 50 mm steel shaft the per-length limit is
    1 deg per 1.0 m. By hand: GJ = 79.3e9 * pi/32 * 0.05**4 = 48 664 N*m^2, so the
    capacity is 0.0174533 rad/m * 48 664 = 849.3 N*m; rated at that torque the shaft
    twists exactly at the limit and the margin is zero."""
    diameter = 0.05
    gj = 79.3e9 * polar_moment(diameter)
    limit = math.radians(1.0) / (20 * diameter)
    cap = twist_per_length_capacity(limit, gj)
    assert cap == pytest.approx(849.3, abs=0.1)
    stack = LayerStack.from_layers([diameter], [0.0], [79.3e9], [1e12])  # stress never governs
    r = rate(stack, Duty.from_arrays(torque=cap, length=3.0, twist_limit_per_length=limit))
    assert float(r.twist_per_length[0]) == pytest.approx(limit, rel=1e-12)
    assert float(r.margin[0]) == pytest.approx(0.0, abs=1e-12)
    assert int(r.governing_criterion[0]) == int(Criterion.TWIST_PER_LENGTH)


def test_no_limit_means_infinite_capacity():
    assert twist_angle_capacity(np.nan, 1e4, 1.0) == np.inf
    assert twist_per_length_capacity(np.nan, 1e4) == np.inf
    both = twist_angle_capacity([np.nan, 0.01], [1e4, 1e4], [1.0, 2.0])
    np.testing.assert_array_equal(both, [np.inf, 50.0])


def test_layer_capacity_without_kt_is_the_plain_section():
    """No stress concentration given means Kt = 1: T = tau J / r = pi d^3 tau / 16 for one solid
    layer (Roark's Formulas for Stress and Strain, table 10.1, solid circle): 40 mm at 100 MPa
    is 1256.637 N·m by hand."""
    d, g, tau = 0.04, 79.3e9, 100e6
    sum_gj = g * math.pi * d**4 / 32
    assert layer_capacity(tau, sum_gj, g, d) == pytest.approx(math.pi * d**3 * tau / 16, rel=1e-12)
    assert layer_capacity(tau, sum_gj, g, d) == pytest.approx(1256.637, rel=1e-6)
