"""Bonded interfaces: average bond shear and the section torque it allows."""

import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._bond as bond_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    Duty,
    LayerStack,
    LoadPath,
    bond_capacity,
    bond_inputs_ok,
    bond_shear,
    bond_torque_capacity,
    interface_share,
    rate,
)

SETTINGS = settings(max_examples=60, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)


def test_docstring_examples():
    assert doctest.testmod(bond_module).failed == 0


@pytest.mark.parametrize("torque", [10.0, 850.0, -2.0e4])
@pytest.mark.parametrize("diameter", [0.02, 0.06, 0.2])
@pytest.mark.parametrize("length", [0.01, 0.08])
def test_average_shear_from_equilibrium(torque, diameter, length):
    """Equilibrium of the bond line (common practice): a uniform shear tau over the area
    pi d L at radius d/2 carries T = tau pi d L d/2, so tau = T / (2 pi r^2 L). rtol 1e-12."""
    expected = abs(torque) / (math.pi * diameter * length * diameter / 2)
    assert bond_shear(torque, diameter, length) == pytest.approx(expected, rel=1e-12)


def test_hand_value():
    """500 N m through a 50 mm bond 40 mm long: 500 / (2 pi 0.025^2 0.04) = 3.183 MPa by hand."""
    assert bond_shear(500.0, 0.05, 0.04) == pytest.approx(3.1831e6, rel=1e-4)


def test_capacity_of_a_rated_sleeve_inverts_the_shear():
    """At the bond's section-torque capacity the sleeve's torque (from rate(), twist
    compatibility) puts exactly the allowable average shear on the bond."""
    stack = LayerStack.from_layers([0.05, 0.058], [0.0, 0.05], [79.3e9, 41.4e9], [1e9, 1e9])
    share = interface_share(rate(stack, Duty.from_arrays(torque=1.0)).share, stack.present)
    capacity = bond_capacity(12e6, 0.05, 0.03, share[0, 1])
    at_capacity = rate(stack, Duty.from_arrays(torque=capacity))
    assert bond_shear(at_capacity.layer_torque[0, 1], 0.05, 0.03) == pytest.approx(12e6, rel=1e-12)


def test_every_layer_path_needs_no_bond():
    share = interface_share([[0.7, 0.3]], [[True, True]], LoadPath.THROUGH_EVERY_LAYER)
    assert np.isinf(bond_capacity(12e6, 0.05, 0.03, share[0, 1]))


@pytest.mark.parametrize("args", [(0.0, 0.03), (0.05, 0.0), (np.nan, 0.03), (0.05, -1.0)])
def test_bad_geometry_is_nan(args):
    assert np.isnan(bond_shear(100.0, *args))
    assert np.isnan(bond_torque_capacity(10e6, *args))
    assert np.isnan(bond_capacity(10e6, *args, 0.3))


def test_missing_allowable_is_nan():
    assert np.isnan(bond_capacity(np.nan, 0.05, 0.03, 0.3))
    assert np.isnan(bond_capacity(-5e6, 0.05, 0.03, 0.3))


@pytest.mark.parametrize("allowable", [0.0, -1.0, np.nan, np.inf])
def test_an_allowable_that_is_not_a_positive_number_gives_no_capacity(allowable):
    # The documented contract: NaN where an input is not a positive finite number. A zero
    # allowable is "none given", not a bond that holds nothing (common practice: a blank or
    # zero strength is not data).
    assert np.isnan(bond_torque_capacity(allowable, 0.05, 0.04))
    assert not bond_inputs_ok(0.05, 0.04, allowable)
    assert bond_inputs_ok(0.05, 0.04, 1e6)


def test_docstrings_warn_of_the_end_peaks():
    """The average is not the peak: the module and the shear function say so."""
    assert "peaks" in bond_module.__doc__ and "average" in bond_module.__doc__
    assert "peak" in bond_shear.__doc__


@SETTINGS
@given(st.floats(1e5, 5e7, **finite), st.floats(0.005, 0.3, **finite),
       st.floats(0.002, 0.2, **finite), st.floats(1.1, 3.0, **finite))
def test_capacity_scales_with_length_and_diameter_squared(allowable, diameter, length, factor):
    base = bond_torque_capacity(allowable, diameter, length)
    assert bond_torque_capacity(allowable, diameter, length * factor) == pytest.approx(base * factor, rel=1e-12)
    assert bond_torque_capacity(allowable, diameter * factor, length) == pytest.approx(base * factor**2, rel=1e-12)


def test_bond_capacity_when_the_interface_passes_the_whole_torque():
    """Share 1: T = tau_a 2 pi r^2 L (average bond shear tau = T / (2 pi r^2 L), the thin
    cylinder in torsion, any mechanics-of-materials text); share 0: no limit. rtol 1e-12."""
    assert bond_capacity(10e6, 0.05, 0.04, 1.0) == pytest.approx(10e6 * 2 * math.pi * 0.025**2 * 0.04, rel=1e-12)
    assert bond_capacity(10e6, 0.05, 0.04, 0.0) == math.inf


def test_a_bad_bond_input_is_nan_even_where_no_torque_passes():
    """An unusable allowable (below zero) is reported as NaN, not hidden by a zero share's inf."""
    assert math.isnan(bond_capacity(-1.0, 0.05, 0.04, 0.0))
