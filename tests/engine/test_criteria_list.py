"""The criteria list (`engine/core/_criteria_list.py`): the section every criterion reads, the
shape each declares, the layer-stress capacity in its own right, the governing minimum's rules
and the slicing of further inputs.

The layer-stress capacity is checked against the hand method written here: one twist for all
layers, so tau_i = T G_i r_o,i / sum(G J) and T_i = tau_a,i sum(G J) / (G_i r_o,i Kt_i), with
J = pi (D_o^4 - D_i^4) / 32 (any mechanics-of-materials text).
"""

import dataclasses
import math

import numpy as np
import pytest
from twistshare.engine.core import Criterion, Duty, LayerStack
from twistshare.engine.core._criteria_list import (
    CRITERIA,
    LAYER_STRESS_DENOMINATOR,
    CriterionCheck,
    Section,
    _layer_stress,
    governing_of,
    take_inputs,
)

# A steel core of 40 mm in a bronze sleeve 40/50 mm; Kt 1.0 and 1.3 (invented demo values).
OUTER = np.array([[0.040, 0.050]])
INNER = np.array([[0.0, 0.040]])
G = np.array([[79.3e9, 41.0e9]])
TAU = np.array([[120e6, 60e6]])
KT = np.array([[1.0, 1.3]])


def _section(stack=None, inputs=None, unused=None):
    stack = stack or LayerStack.from_arrays(OUTER, INNER, G, TAU, KT)
    j = math.pi * (OUTER**4 - INNER**4) / 32
    gj = G * j
    return Section(stack, Duty.from_arrays(1000.0), gj, gj.sum(axis=1),
                   np.zeros_like(gj, bool) if unused is None else unused, inputs=inputs or {})


def test_layer_stress_capacity_without_rates_denominator_is_the_hand_method():
    section = _section()
    assert LAYER_STRESS_DENOMINATOR not in section.shared
    sum_gj = float(section.sum_gj[0])
    expected = [TAU[0, i] * sum_gj / (G[0, i] * OUTER[0, i] / 2 * KT[0, i]) for i in range(2)]
    np.testing.assert_allclose(_layer_stress(section)[0], expected, rtol=1e-12)


def test_layer_stress_capacity_blanks_unused_slots():
    unused = np.array([[False, True]])
    got = _layer_stress(_section(unused=unused))
    assert np.isfinite(got[0, 0]) and np.isnan(got[0, 1])


def test_every_criterion_declares_the_shape_it_gives():
    # Layer stresses and interfaces are per layer slot; twist, whirl and buckling per part.
    per_layer = {Criterion.LAYER_STRESS, Criterion.COMBINED_STRESS, Criterion.INTERFACE_SLIP,
                 Criterion.BOND_SHEAR, Criterion.FIT_STRESS}
    per_part = {Criterion.TWIST_ANGLE, Criterion.TWIST_PER_LENGTH, Criterion.WHIRL,
                Criterion.TORSIONAL_BUCKLING}
    assert {c.criterion for c in CRITERIA} == per_layer | per_part
    for check in CRITERIA:
        assert check.per_layer == (check.criterion in per_layer)
        section = _section()
        values = check.rate(section)
        # With no inputs for it, a criterion may say "no limit" in the cheaper per-part shape.
        assert values.shape == ((1, 2) if check.per_layer else (1,)) or section.sets_no_limit(values)


def test_no_limit_in_the_per_part_shape_is_accepted_from_a_per_layer_criterion():
    check = CriterionCheck(Criterion.BOND_SHEAR, True, lambda section: section.no_limit())
    section = _section()
    assert check.rate(section) is section.no_limit()


def test_a_capacity_of_the_wrong_shape_is_refused_by_name():
    wrong = CriterionCheck(Criterion.WHIRL, False, lambda section: section.gj)
    with pytest.raises(ValueError) as error:
        wrong.rate(_section())
    assert str(error.value) == ("criterion WHIRL is per part, so its capacity must have shape (1,); "
                                "got (1, 2)")
    wrong = CriterionCheck(Criterion.LAYER_STRESS, True, lambda section: section.sum_gj)
    with pytest.raises(ValueError, match=r"is per layer slot, so its capacity must have shape \(1, 2\); got \(1,\)"):
        wrong.rate(_section())


def test_no_limit_is_one_read_only_array_per_section_and_recognised():
    section = _section()
    parts, layers = section.no_limit(), section.no_limit(per_layer=True)
    assert parts.shape == (1,) and layers.shape == (1, 2)
    assert np.isposinf(parts).all() and np.isposinf(layers).all()
    assert section.no_limit() is parts and section.no_limit(per_layer=True) is layers
    assert section.sets_no_limit(parts) and section.sets_no_limit(layers)
    assert not section.sets_no_limit(np.full(1, np.inf))
    with pytest.raises(ValueError):
        parts[0] = 1.0


def test_no_limit_is_nan_where_a_part_is_not_rated_or_a_slot_unused():
    stack = LayerStack.from_arrays(np.vstack([OUTER, OUTER]), np.vstack([INNER, INNER]),
                                   np.vstack([G, G]), np.vstack([TAU, TAU]))
    j = math.pi * (OUTER**4 - INNER**4) / 32
    gj = np.vstack([G * j, G * j])
    sum_gj = np.array([gj[0].sum(), np.nan])
    unused = np.array([[False, False], [True, True]])
    section = Section(stack, Duty.from_arrays([1.0, 1.0]), gj, sum_gj, unused)
    parts, layers = section.no_limit(), section.no_limit(per_layer=True)
    assert np.isposinf(parts[0]) and np.isnan(parts[1])
    assert np.isposinf(layers[0]).all() and np.isnan(layers[1]).all()
    with pytest.raises(ValueError):
        layers[0, 0] = 1.0
    assert section.sets_no_limit(layers) and section.no_limit(per_layer=True) is layers


def test_further_inputs_by_name():
    section = _section(inputs={"speed": np.array([150.0]), "youngs_modulus": 200e9})
    assert section.input("speed").tolist() == [150.0]
    assert section.input("youngs_modulus", per_layer=True).tolist() == [[200e9, 200e9]]
    assert section.input("bending_moment") is None
    bare = Section(section.stack, section.duty, section.gj, section.sum_gj, section.unused)
    assert bare.input("speed") is None and dict(bare.inputs) == {}
    assert bare.layer_torque is None and bare.stress_outer is None and bare.stress_inner is None


def test_section_and_checks_are_frozen():
    section = _section()
    with pytest.raises(dataclasses.FrozenInstanceError):
        section.gj = None  # type: ignore[misc]
    with pytest.raises(dataclasses.FrozenInstanceError):
        CRITERIA[0].per_layer = False  # type: ignore[misc]


class TestGoverningOf:
    def test_a_later_criterion_smaller_where_an_earlier_one_has_a_hole(self):
        # Part 0: the first criterion has no number, the second fills it. Part 1: both have
        # numbers and the second is smaller: it governs there too.
        first = np.array([np.nan, 500.0])
        second = np.array([800.0, 300.0])
        capacity, criterion, layer = governing_of(
            [(Criterion.TWIST_ANGLE, first), (Criterion.WHIRL, second)], 2)
        assert capacity.tolist() == [800.0, 300.0]
        assert criterion.tolist() == [int(Criterion.WHIRL)] * 2
        assert layer.tolist() == [-1, -1]

    def test_the_governing_layer_and_first_listed_on_a_tie(self):
        per_layer = np.array([[400.0, 250.0], [300.0, 300.0]])
        per_part = np.array([250.0, 500.0])
        capacity, criterion, layer = governing_of(
            [(Criterion.LAYER_STRESS, per_layer), (Criterion.TWIST_ANGLE, per_part)], 2)
        assert capacity.tolist() == [250.0, 300.0]
        assert criterion.tolist() == [int(Criterion.LAYER_STRESS)] * 2
        assert layer.tolist() == [1, 0]  # ties: the innermost layer

    def test_a_zero_tie_keeps_the_first_zero(self):
        capacity, criterion, _ = governing_of(
            [(Criterion.TWIST_ANGLE, np.array([0.0])), (Criterion.WHIRL, np.array([-0.0]))], 1)
        assert capacity[0] == 0.0 and not np.signbit(capacity[0])
        assert criterion.tolist() == [int(Criterion.TWIST_ANGLE)]
        capacity, _, _ = governing_of(
            [(Criterion.TWIST_ANGLE, np.array([-0.0])), (Criterion.WHIRL, np.array([0.0]))], 1)
        assert np.signbit(capacity[0])

    def test_nothing_finite_is_nan_and_none(self):
        capacity, criterion, layer = governing_of(
            [(Criterion.TWIST_ANGLE, np.array([np.inf, np.nan])),
             (Criterion.LAYER_STRESS, np.array([[np.nan], [np.inf]]))], 2)
        assert np.isnan(capacity).all()
        assert criterion.tolist() == [int(Criterion.NONE)] * 2 and layer.tolist() == [-1, -1]


class TestTakeInputs:
    def test_per_part_arrays_are_sliced_and_the_rest_kept(self):
        inputs = {"speed": np.array([1.0, 2.0, 3.0]), "moment": np.array([[1.0, 2.0], [3.0, 4.0], [5.0, 6.0]]),
                  "youngs_modulus": 200e9, "table": np.array([7.0, 8.0])}
        got = take_inputs(inputs, np.array([2, 0]), 3)
        assert got["speed"].tolist() == [3.0, 1.0]
        assert got["moment"].tolist() == [[5.0, 6.0], [1.0, 2.0]]
        assert float(got["youngs_modulus"]) == 200e9
        assert got["table"].tolist() == [7.0, 8.0]  # not one per part: kept whole

    def test_no_inputs(self):
        assert take_inputs(None, slice(0, 1), 3) == {}
        assert take_inputs({}, slice(0, 1), 3) == {}
