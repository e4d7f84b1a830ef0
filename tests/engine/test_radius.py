"""Which layer a radius lies in (`layer_at_radius`), on a two-layer section drawn here by hand:
a hollow core of 10 mm bore and 40 mm outer diameter, a sleeve from 40 to 50 mm."""

import numpy as np
import pytest
from twistshare.engine.core._radius import RadiusPlace, layer_at_radius

OUTER = [[0.040, 0.050]]
INNER = [[0.010, 0.040]]
PRESENT = [[True, True]]


def place_of(radius, layer=None, outer=OUTER, inner=INNER, present=PRESENT):
    slot, place = layer_at_radius(outer, inner, present, [radius], layer)
    return int(slot[0]), RadiusPlace(int(place[0]))


@pytest.mark.parametrize("radius, expected", [
    (0.010, (0, RadiusPlace.IN_LAYER)),     # mid-wall of the core
    (0.0225, (1, RadiusPlace.IN_LAYER)),    # mid-wall of the sleeve
    (0.005, (0, RadiusPlace.IN_LAYER)),     # on the core's bore: still the core
    (0.025, (1, RadiusPlace.IN_LAYER)),     # on the outer surface: still the sleeve
    (0.004, (0, RadiusPlace.OUTSIDE)),      # inside the bore (radius 5 mm)
    (0.026, (0, RadiusPlace.OUTSIDE)),      # beyond the surface
    (0.020, (0, RadiusPlace.ON_INTERFACE)),  # the interface: the stress jumps there
])
def test_the_place_of_a_radius(radius, expected):
    assert place_of(radius) == expected


def test_not_asked_is_outside():
    assert place_of(np.nan) == (0, RadiusPlace.OUTSIDE)


def test_the_layer_named_decides_on_the_interface():
    assert place_of(0.020, layer=0) == (0, RadiusPlace.IN_LAYER)
    assert place_of(0.020, layer=1) == (1, RadiusPlace.IN_LAYER)
    assert place_of(0.010, layer=1) == (1, RadiusPlace.NOT_IN_LAYER)


@pytest.mark.parametrize("layer", [2, 5, -1])
def test_a_layer_the_part_does_not_have_is_not_where_the_radius_is(layer):
    assert place_of(0.010, layer=layer)[1] == RadiusPlace.NOT_IN_LAYER


def test_the_tolerance_is_relative_so_a_fine_wire_is_judged_at_its_own_scale():
    # A 0.2 mm wire: 5 % beyond its surface is outside, whatever the unit scale.
    assert place_of(0.105e-3, outer=[[0.2e-3]], inner=[[0.0]], present=[[True]])[1] == RadiusPlace.OUTSIDE
    assert place_of(0.1e-3, outer=[[0.2e-3]], inner=[[0.0]], present=[[True]])[1] == RadiusPlace.IN_LAYER
