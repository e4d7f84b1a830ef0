"""Load path: the torque each interface passes, for each way the torque enters a part."""

import doctest

import numpy as np
import pytest
import twistshare.engine.core._load_path as load_path_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    DEFAULT_LOAD_PATH,
    Duty,
    LayerStack,
    LoadPath,
    bond_capacity,
    interface_share,
    interface_torque,
    rate,
    slip_capacity,
)

SETTINGS = settings(max_examples=60, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)
ALL = [[True, True, True, True]]


def test_docstring_examples():
    assert doctest.testmod(load_path_module).failed == 0


def test_default_is_through_the_core():
    assert DEFAULT_LOAD_PATH is LoadPath.THROUGH_CORE


class TestFreeBodySums:
    """Statics: a free body of the layers on one side of an interface (common practice). The
    layers outside a core-driven interface receive their torque only through it; the layers
    inside an outer-driven one likewise. Hand sums, exact."""

    TORQUES = [[500.0, 250.0, 150.0, 100.0]]

    def test_through_core(self):
        got = interface_torque(self.TORQUES, ALL, LoadPath.THROUGH_CORE)
        np.testing.assert_array_equal(got[0, 1:], [500.0, 250.0, 100.0])
        assert np.isnan(got[0, 0])

    def test_through_outer_layer(self):
        got = interface_torque(self.TORQUES, ALL, LoadPath.THROUGH_OUTER_LAYER)
        np.testing.assert_array_equal(got[0, 1:], [500.0, 750.0, 900.0])

    def test_through_every_layer(self):
        got = interface_torque(self.TORQUES, ALL, LoadPath.THROUGH_EVERY_LAYER)
        np.testing.assert_array_equal(got[0, 1:], [0.0, 0.0, 0.0])

    def test_per_part_load_paths_and_absent_slots(self):
        torques = [[500.0, 250.0, 150.0, 100.0], [600.0, 400.0, np.nan, np.nan]]
        present = [[True] * 4, [True, True, False, False]]
        got = interface_torque(torques, present, [LoadPath.THROUGH_CORE, LoadPath.THROUGH_OUTER_LAYER])
        np.testing.assert_array_equal(got[0, 1:], [500.0, 250.0, 100.0])
        assert got[1, 1] == 600.0
        assert np.isnan(got[1, 2:]).all()

    def test_unknown_load_path_gives_nan(self):
        assert np.isnan(interface_torque(self.TORQUES, ALL, 7)).all()

    def test_needs_two_dimensions(self):
        with pytest.raises(ValueError) as error:
            interface_torque([1.0, 2.0, 3.0, 4.0], [True] * 4)
        assert str(error.value) == "interface torque needs (parts, layers) arrays; got shape (4,)"

    def test_no_parts_gives_an_empty_result(self):
        got = interface_torque(np.zeros((0, 3)), np.zeros((0, 3), bool))
        assert got.shape == (0, 3)

    @pytest.mark.parametrize("filler", [np.nan, 999.0])
    def test_absent_outer_slots_carry_nothing_on_a_core_driven_part(self, filler):
        # Equilibrium of the layers outside the interface (the interface passes their torque,
        # common practice): slots the part does not have add nothing, whatever they hold.
        torques = [[600.0, 400.0, filler, filler], [500.0, 250.0, 150.0, 100.0]]
        present = [[True, True, False, False], [True] * 4]
        got = interface_torque(torques, present, LoadPath.THROUGH_CORE)
        assert got[0, 1] == 400.0 and np.isnan(got[0, 2:]).all()
        np.testing.assert_array_equal(got[1, 1:], [500.0, 250.0, 100.0])


def test_sleeve_of_a_rated_part_passes_its_own_torque():
    """A two-layer journal driven by its core: the interface passes the sleeve's torque,
    G_s J_s / sum(G J) of the section torque (twist compatibility; J from Roark's Formulas
    for Stress and Strain, torsion of circular sections). rtol 1e-12."""
    stack = LayerStack.from_layers([0.05, 0.06], [0.0, 0.05], [79.3e9, 41.4e9], [1e8, 1e8])
    rating = rate(stack, Duty.from_arrays(torque=1200.0))
    gj_core = 79.3e9 * np.pi * 0.05**4 / 32
    gj_sleeve = 41.4e9 * np.pi * (0.06**4 - 0.05**4) / 32
    expected = 1200.0 * gj_sleeve / (gj_core + gj_sleeve)
    assert interface_torque(rating.layer_torque, stack.present)[0, 1] == pytest.approx(expected, rel=1e-12)
    assert interface_share(rating.share, stack.present)[0, 1] * 1200.0 == pytest.approx(expected, rel=1e-12)


@st.composite
def shares(draw):
    n = draw(st.integers(2, 4))
    raw = draw(st.lists(st.floats(0.01, 10.0, **finite), min_size=n, max_size=n))
    return np.array([raw]) / sum(raw)


@SETTINGS
@given(shares())
def test_core_and_outer_paths_pass_the_whole_torque_between_them(share):
    """Inside plus outside is the whole section (equilibrium): the two one-layer load paths
    put shares at every interface that add up to 1."""
    present = np.ones(share.shape, bool)
    core = interface_share(share, present, LoadPath.THROUGH_CORE)
    outer = interface_share(share, present, LoadPath.THROUGH_OUTER_LAYER)
    np.testing.assert_allclose(core[0, 1:] + outer[0, 1:], 1.0, rtol=1e-12)


@SETTINGS
@given(shares(), st.floats(0.0, 1e5, **finite), st.floats(1e-6, 1e-2, **finite))
def test_every_layer_path_has_no_interface_demand(share, grip, length):
    """Each layer takes its share from the end fittings: nothing passes an interface, so no
    slip or bond limit applies (infinite capacity), even for an interface with no grip."""
    present = np.ones(share.shape, bool)
    passing = interface_share(share, present, LoadPath.THROUGH_EVERY_LAYER)
    assert (passing[0, 1:] == 0).all()
    assert np.isinf(slip_capacity(grip, passing[0, 1:])).all()
    assert np.isinf(bond_capacity(5e6, 0.05, length, passing[0, 1:])).all()


@SETTINGS
@given(st.lists(shares(), min_size=2, max_size=5), st.data())
def test_one_part_alone_equals_the_same_part_in_a_batch(parts, data):
    width = 4
    batch = np.full((len(parts), width), np.nan)
    present = np.zeros((len(parts), width), bool)
    for row, part in enumerate(parts):
        batch[row, :part.shape[1]] = part[0]
        present[row, :part.shape[1]] = True
    paths = data.draw(st.lists(st.sampled_from(list(LoadPath)), min_size=len(parts),
                               max_size=len(parts)))
    together = interface_share(batch, present, paths)
    for row in range(len(parts)):
        alone = interface_share(batch[row:row + 1], present[row:row + 1], paths[row])
        np.testing.assert_array_equal(alone[0], together[row])
