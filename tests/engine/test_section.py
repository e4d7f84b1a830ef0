"""Section model: polar moment, G from E and nu, LayerStack construction and the contact check."""

import dataclasses
import math

import numpy as np
import pytest
from twistshare.engine.core import (
    AllowableRule,
    LayerFlag,
    LayerStack,
    interface_gaps,
    polar_moment,
    shear_modulus_from_elastic,
)

OUTER = [0.004, 0.05, 0.3]
BORE_RATIO = [0.0, 0.25, 0.9]


class TestPolarMoment:
    @pytest.mark.parametrize("outer", OUTER)
    @pytest.mark.parametrize("ratio", BORE_RATIO)
    def test_matches_roark_radius_form(self, outer, ratio):
        """Roark's Formulas for Stress and Strain, torsion of circular sections:
        K = pi r^4 / 2 (solid), K = pi (ro^4 - ri^4) / 2 (hollow); rtol 1e-12."""
        ro, ri = outer / 2, ratio * outer / 2
        expected = math.pi * (ro**4 - ri**4) / 2
        assert polar_moment(outer, ratio * outer) == pytest.approx(expected, rel=1e-12)

    def test_solid_default_and_scalar_out(self):
        """Scalar in gives a scalar out, ufunc-style; 50 mm bar J = 6.136e-7 m^4
        (pi/32 * 0.05^4, hand arithmetic)."""
        value = polar_moment(0.05)
        assert np.ndim(value) == 0
        assert float(value) == pytest.approx(6.1359e-7, rel=1e-4)

    def test_broadcasts(self):
        """Array inputs broadcast like a ufunc."""
        result = polar_moment(np.array([[0.02], [0.04]]), np.array([0.0, 0.01]))
        assert result.shape == (2, 2)
        assert result[1, 1] == pytest.approx(math.pi / 32 * (0.04**4 - 0.01**4), rel=1e-12)


class TestShearModulusFromElastic:
    @pytest.mark.parametrize(
        ("youngs", "nu", "expected"),
        [
            (200e9, 0.3, 76.923e9),  # hand arithmetic: 200 / 2.6
            (70e9, 1 / 3, 26.25e9),  # hand arithmetic: 70 / (8/3)
            (100e9, 0.0, 50e9),
        ],
    )
    def test_isotropic_relation(self, youngs, nu, expected):
        """G = E / (2 (1 + nu)) for an isotropic solid (any strength-of-materials text)."""
        assert shear_modulus_from_elastic(youngs, nu) == pytest.approx(expected, rel=1e-4)

    def test_impossible_ratio_gives_nan(self):
        """nu <= -1 has no isotropic material: NaN, not a negative or infinite G."""
        result = shear_modulus_from_elastic([200e9, 200e9], [-1.0, -2.0])
        assert np.isnan(result).all()


def _two_layer(**overrides):
    values = dict(
        outer_diameter=[[0.04, 0.05]],
        inner_diameter=[[0.0, 0.04]],
        shear_modulus=[[79e9, 40e9]],
        allowable_shear=[[100e6, 50e6]],
        stress_concentration=[[1.0, 1.0]],
        present=[[True, True]],
    )
    values.update(overrides)
    return values


class TestLayerStack:
    def test_fields_are_float64_and_read_only(self):
        """Frozen value object: fields cannot be rebound nor arrays written."""
        stack = LayerStack(**_two_layer())
        assert stack.outer_diameter.dtype == np.float64
        assert stack.present.dtype == np.bool_
        with pytest.raises(dataclasses.FrozenInstanceError):
            stack.outer_diameter = np.zeros((1, 2))  # type: ignore[misc]
        with pytest.raises(ValueError):
            stack.outer_diameter[0, 0] = 1.0

    def test_callers_array_stays_writeable(self):
        """The stack takes a read-only view; the caller's own array is not frozen."""
        outer = np.array([[0.04, 0.05]])
        LayerStack(**_two_layer(outer_diameter=outer))
        outer[0, 0] = 0.041
        assert outer[0, 0] == 0.041

    def test_shape_mismatch_names_field(self):
        """The message names the field, its shape and the shape expected."""
        with pytest.raises(ValueError, match=r"LayerStack\.shear_modulus has shape \(1, 3\); expected \(1, 2\)"):
            LayerStack(**_two_layer(shear_modulus=[[79e9, 40e9, 1e9]]))

    def test_one_dimensional_refused(self):
        with pytest.raises(ValueError) as info:
            LayerStack(**_two_layer(outer_diameter=[0.04, 0.05]))
        assert str(info.value) == "LayerStack.outer_diameter must be a (parts, layers) array; got shape (2,)"

    def test_default_rule_is_given(self):
        stack = LayerStack(**_two_layer())
        assert stack.allowable_rule.dtype == np.int8
        assert (stack.allowable_rule == 0).all()

    def test_from_layers_one_part(self):
        stack = LayerStack.from_layers([0.04, 0.05], [0.0, 0.04], [79e9, 40e9], [100e6, 50e6])
        assert (stack.n_parts, stack.n_layers) == (1, 2)
        assert stack.present.all()
        assert (stack.stress_concentration == 1.0).all()

    def test_from_layers_refuses_many_parts(self):
        with pytest.raises(ValueError, match="takes one part"):
            LayerStack.from_layers([[0.04]], [[0.0]], [[79e9]], [[1e8]])

    def test_from_arrays_broadcasts_and_reads_nan_as_absent(self):
        """A NaN outer diameter (an empty cell) is an absent slot by default."""
        outer = np.array([[0.04, 0.05], [0.03, np.nan]])
        inner = np.array([[0.0, 0.04], [0.0, np.nan]])
        stack = LayerStack.from_arrays(outer, inner, 79e9, 100e6)
        assert stack.shear_modulus.shape == (2, 2)
        assert stack.present.tolist() == [[True, True], [True, False]]

    def test_from_arrays_one_dimensional_is_one_part(self):
        stack = LayerStack.from_arrays([0.04, 0.05], [0.0, 0.04], 79e9, 100e6)
        assert (stack.n_parts, stack.n_layers) == (1, 2)

    def test_from_arrays_refuses_non_broadcasting(self):
        with pytest.raises(ValueError, match="do not broadcast"):
            LayerStack.from_arrays(np.ones((3, 2)), np.ones((2, 2)), 79e9, 1e8)

    def test_take_keeps_two_dimensions(self):
        stack = LayerStack.from_arrays(np.full((4, 2), 0.05), np.zeros((4, 2)), 79e9, 1e8)
        assert stack.take(2).outer_diameter.shape == (1, 2)
        assert stack.take(-1).outer_diameter.shape == (1, 2)
        assert stack.take([0, 3]).n_parts == 2


    def test_from_layers_puts_each_sequence_in_its_field(self):
        """Each input lands in its own field, unchanged (values written here, all different)."""
        stack = LayerStack.from_layers([0.04, 0.05], [0.01, 0.04], [79e9, 40e9], [100e6, 50e6], [1.5, 1.2],
                                       [AllowableRule.DISTORTION_ENERGY, AllowableRule.GIVEN])
        assert stack.outer_diameter.tolist() == [[0.04, 0.05]]
        assert stack.inner_diameter.tolist() == [[0.01, 0.04]]
        assert stack.shear_modulus.tolist() == [[79e9, 40e9]]
        assert stack.allowable_shear.tolist() == [[100e6, 50e6]]
        assert stack.stress_concentration.tolist() == [[1.5, 1.2]]
        assert stack.allowable_rule.tolist() == [[int(AllowableRule.DISTORTION_ENERGY), int(AllowableRule.GIVEN)]]
        assert stack.present.tolist() == [[True, True]]

    def test_from_layers_message_names_the_shape(self):
        with pytest.raises(ValueError) as info:
            LayerStack.from_layers([[0.04, 0.05]], [0.0, 0.04], [79e9, 40e9], [1e8, 1e8])
        assert str(info.value) == ("LayerStack.from_layers takes one part: sequences of one value per "
                                   "layer; got shape (1, 2)")

    def test_shape_mismatch_message_word_for_word(self):
        with pytest.raises(ValueError) as info:
            LayerStack(**_two_layer(inner_diameter=[[0.0, 0.04, 0.05]]))
        assert str(info.value) == "LayerStack.inner_diameter has shape (1, 3); expected (1, 2) like outer_diameter"

    def test_int8_rule_is_taken_as_a_view(self):
        """The constructor takes views, not copies (the class's Notes): an int8 rule array too."""
        rule = np.zeros((1, 2), dtype=np.int8)
        stack = LayerStack(**_two_layer(allowable_rule=rule))
        assert np.shares_memory(stack.allowable_rule, rule)

    def test_from_arrays_defaults_and_given_presence(self):
        """No stress concentration unless given (Kt = 1 means none, common practice); a given
        `present` mask is used as given, even over a number."""
        stack = LayerStack.from_arrays([0.04, 0.05], [0.0, 0.04], 79e9, 100e6, present=[True, False])
        assert stack.stress_concentration.tolist() == [[1.0, 1.0]]
        assert stack.present.tolist() == [[True, False]]
        assert stack.allowable_rule.tolist() == [[int(AllowableRule.GIVEN)] * 2]

    def test_from_arrays_broadcast_message_lists_every_shape(self):
        with pytest.raises(ValueError) as info:
            LayerStack.from_arrays(np.ones((3, 2)), np.ones((2, 2)), 79e9, 1e8, present=np.ones((3, 2), bool))
        assert str(info.value) == ("LayerStack inputs do not broadcast together: "
                                   "(3, 2), (2, 2), (), (), (), (3, 2)")


    def test_from_arrays_puts_each_array_in_its_field(self):
        """Each input lands in its own field (values written here, all different)."""
        stack = LayerStack.from_arrays([[0.04, 0.05]], [[0.01, 0.04]], [[79e9, 40e9]], [[100e6, 50e6]],
                                       [[1.5, 1.2]], allowable_rule=[[2, 1]])
        assert stack.outer_diameter.tolist() == [[0.04, 0.05]]
        assert stack.inner_diameter.tolist() == [[0.01, 0.04]]
        assert stack.shear_modulus.tolist() == [[79e9, 40e9]]
        assert stack.allowable_shear.tolist() == [[100e6, 50e6]]
        assert stack.stress_concentration.tolist() == [[1.5, 1.2]]
        assert stack.allowable_rule.tolist() == [[2, 1]]

    def test_from_arrays_presence_follows_the_outer_diameter(self):
        """Absent where the outer diameter is NaN, whatever the bore: a solid core's bore of 0
        does not make an empty slot present, and a blank bore does not make a slot absent."""
        stack = LayerStack.from_arrays([[np.nan, 0.05]], [[0.0, np.nan]], 79e9, 100e6)
        assert stack.present.tolist() == [[False, True]]

    def test_from_arrays_refuses_three_dimensions(self):
        with pytest.raises(ValueError) as info:
            LayerStack.from_arrays(np.ones((2, 2, 2)), 0.0, 79e9, 1e8)
        assert str(info.value) == "LayerStack inputs must be at most (parts, layers); got shape (2, 2, 2)"


class TestInterfaceGaps:
    def test_signed_sizes_and_flags(self):
        """gap = inner_d[i] - outer_d[i-1]: +0.5 mm gap, -0.3 mm overlap, exact fit."""
        outer = np.array([[0.040, 0.050], [0.040, 0.050], [0.040, 0.050]])
        inner = np.array([[0.0, 0.0405], [0.0, 0.0397], [0.0, 0.040]])
        gap, flags = interface_gaps(outer, inner, np.ones((3, 2), bool))
        np.testing.assert_allclose(gap[:, 1], [0.0005, -0.0003, 0.0], atol=1e-15)
        assert np.isnan(gap[:, 0]).all()
        assert flags[:, 1].tolist() == [LayerFlag.GAP_BELOW, LayerFlag.OVERLAP_BELOW, 0]
        assert (flags[:, 0] == 0).all()

    @pytest.mark.parametrize(
        ("diameter", "size", "flagged"),
        [
            # 40 mm: 0.02 % is 8 um, so the 10 um absolute floor applies.
            (0.040, 9e-6, False),
            (0.040, 11e-6, True),
            (0.040, -11e-6, True),
            # 200 mm: 0.02 % is 40 um, larger than the floor.
            (0.200, 39e-6, False),
            (0.200, -39e-6, False),
            (0.200, 41e-6, True),
        ],
    )
    def test_default_tolerance(self, diameter, size, flagged):
        """Default tolerance = max(0.01 mm, 0.02 % of the diameter) (issue 2 definition)."""
        outer = np.array([[diameter, diameter + 0.01]])
        inner = np.array([[0.0, diameter + size]])
        _, flags = interface_gaps(outer, inner, np.ones((1, 2), bool))
        assert bool(flags[0, 1]) is flagged

    def test_custom_tolerance(self):
        outer = np.array([[0.040, 0.050]])
        inner = np.array([[0.0, 0.0401]])
        _, loose = interface_gaps(outer, inner, np.ones((1, 2), bool), abs_tol=2e-4)
        _, tight = interface_gaps(outer, inner, np.ones((1, 2), bool), abs_tol=0.0, rel_tol=0.0)
        assert loose[0, 1] == 0
        assert tight[0, 1] == LayerFlag.GAP_BELOW

    def test_absent_slot_has_no_gap(self):
        outer = np.array([[0.040, np.nan]])
        inner = np.array([[0.0, np.nan]])
        gap, flags = interface_gaps(outer, inner, np.array([[True, False]]))
        assert np.isnan(gap).all()
        assert (flags == 0).all()

    def test_a_slot_marked_absent_has_no_gap_even_with_numbers(self):
        """Presence decides, not the numbers: slot 1 is absent though its diameters are written;
        slots 0 and 2 are then not neighbours checked here (slot 2 is checked against slot 1)."""
        outer = np.array([[0.040, 0.050, 0.060]])
        inner = np.array([[0.0, 0.041, 0.051]])
        gap, flags = interface_gaps(outer, inner, np.array([[True, False, True]]))
        assert np.isnan(gap).all()
        assert (flags == 0).all()

    def test_neighbours_are_the_slot_just_inside(self):
        """Three slots, the outermost absent: the gap at slot 1 is slot 1's bore less slot 0's
        outer diameter, 1 mm (values written here)."""
        outer = np.array([[0.040, 0.050, 0.060]])
        inner = np.array([[0.0, 0.041, 0.050]])
        gap, flags = interface_gaps(outer, inner, np.array([[True, True, False]]))
        assert gap[0, 1] == pytest.approx(0.001, abs=1e-15)
        assert np.isnan(gap[0, 2])
        assert flags[0].tolist() == [0, LayerFlag.GAP_BELOW, 0]

    def test_exactly_at_the_tolerance_is_not_flagged(self):
        """Flags are for sizes *beyond* the tolerance. Binary-exact values: 0.5625 - 0.5 and
        0.4375 - 0.5 are exactly +-0.0625, the tolerance given."""
        outer = np.array([[0.5, 1.0], [0.5, 1.0]])
        inner = np.array([[0.0, 0.5625], [0.0, 0.4375]])
        _, flags = interface_gaps(outer, inner, np.ones((2, 2), bool), abs_tol=0.0625, rel_tol=0.0)
        assert flags[:, 1].tolist() == [0, 0]
        _, flags = interface_gaps(outer, inner, np.ones((2, 2), bool), abs_tol=0.0624, rel_tol=0.0)
        assert flags[:, 1].tolist() == [LayerFlag.GAP_BELOW, LayerFlag.OVERLAP_BELOW]
