"""Diagnoses: every flag raised by its own cause, only on the part and layer concerned."""

import math

import numpy as np
import pytest
from twistshare.engine.core import (
    LAYER_ERRORS,
    PART_ERRORS,
    AllowableFlag,
    Criterion,
    Duty,
    LayerFlag,
    LayerStack,
    LoadFlag,
    PartFlag,
    PlyFlag,
    describe,
    has_error,
    is_error,
    rate,
    split_flags,
)

GOOD = dict(
    outer_diameter=[0.040, 0.050, 0.056],
    inner_diameter=[0.0, 0.040, 0.050],
    shear_modulus=[79.3e9, 41.4e9, 73.1e9],
    allowable_shear=[120e6, 40e6, 70e6],
    stress_concentration=[1.0, 1.0, 1.3],
)


def _stack(**changes):
    """The good three-layer part with some (field, slot) values changed."""
    values = {k: list(v) for k, v in GOOD.items()}
    for key, (slot, value) in changes.items():
        values[key][slot] = value
    return LayerStack.from_layers(**values)


def _rate(stack, **duty):
    duty = {"torque": 800.0, "length": 1.2, **duty}
    return rate(stack, Duty.from_arrays(**duty))


def _assert_not_rated(rating, row=0):
    assert not rating.valid[row]
    assert rating.part_flags[row] & PartFlag.LAYER_ERROR or rating.part_flags[row] & int(PART_ERRORS)
    for name in ("gj", "share", "layer_torque", "stress_outer", "stress_inner", "capacity", "utilisation"):
        assert np.isnan(getattr(rating, name)[row]).all(), name
    for name in ("sum_gj", "twist_per_length", "twist_angle", "twist_capacity", "governing_capacity",
                 "margin", "reserve_factor"):
        assert np.isnan(getattr(rating, name)[row]), name
    assert rating.governing_criterion[row] == Criterion.NONE
    assert rating.governing_layer[row] == -1


class TestLayerFlags:
    @pytest.mark.parametrize(
        ("field", "slot", "value", "flag"),
        [
            ("outer_diameter", 0, 0.0, LayerFlag.OUTER_NOT_POSITIVE),
            ("outer_diameter", 0, -0.04, LayerFlag.OUTER_NOT_POSITIVE),
            ("inner_diameter", 0, -0.001, LayerFlag.INNER_NEGATIVE),
            ("inner_diameter", 0, 0.040, LayerFlag.INNER_NOT_BELOW_OUTER),
            ("shear_modulus", 1, 0.0, LayerFlag.MODULUS_NOT_POSITIVE),
            ("shear_modulus", 2, -73e9, LayerFlag.MODULUS_NOT_POSITIVE),
            ("allowable_shear", 1, 0.0, LayerFlag.ALLOWABLE_NOT_POSITIVE),
            ("stress_concentration", 2, 0.9, LayerFlag.KT_BELOW_ONE),
            ("shear_modulus", 1, math.nan, LayerFlag.NOT_FINITE),
            ("allowable_shear", 2, math.inf, LayerFlag.NOT_FINITE),
            ("stress_concentration", 0, math.nan, LayerFlag.NOT_FINITE),
            ("inner_diameter", 1, 0.0, LayerFlag.SOLID_NOT_INNERMOST),
        ],
    )
    def test_each_flag_from_its_cause(self, field, slot, value, flag):
        rating = _rate(_stack(**{field: (slot, value)}))
        assert rating.layer_flags[0, slot] & flag
        others = [s for s in range(3) if s != slot]
        # Only a diameter can disturb a neighbour's contact check.
        if field not in ("outer_diameter", "inner_diameter"):
            assert (rating.layer_flags[0, others] == 0).all()
        _assert_not_rated(rating)

    def test_solid_not_innermost_is_also_an_overlap(self):
        rating = _rate(_stack(inner_diameter=(1, 0.0)))
        assert rating.layer_flags[0, 1] == LayerFlag.SOLID_NOT_INNERMOST | LayerFlag.OVERLAP_BELOW
        assert rating.interface_gap[0, 1] == pytest.approx(-0.040)

    def test_gap_and_overlap_signed_sizes(self):
        """A 0.4 mm gap under layer 2 (slot 1), a 0.25 mm overlap under layer 3."""
        rating = _rate(LayerStack.from_layers(
            outer_diameter=[0.040, 0.050, 0.056],
            inner_diameter=[0.0, 0.0404, 0.04975],
            shear_modulus=GOOD["shear_modulus"],
            allowable_shear=GOOD["allowable_shear"],
        ))
        assert rating.layer_flags[0].tolist() == [0, LayerFlag.GAP_BELOW, LayerFlag.OVERLAP_BELOW]
        np.testing.assert_allclose(rating.interface_gap[0, 1:], [0.0004, -0.00025], rtol=1e-9)
        assert np.isnan(rating.interface_gap[0, 0])
        _assert_not_rated(rating)

    def test_within_tolerance_is_rated_with_its_gap(self):
        """5 um at 40 mm is inside the default 10 um: rated, the small gap reported."""
        rating = _rate(_stack(inner_diameter=(1, 0.040005)))
        assert rating.valid[0]
        assert rating.interface_gap[0, 1] == pytest.approx(5e-6, rel=1e-6)

    def test_tolerance_is_a_parameter(self):
        stack = _stack(inner_diameter=(1, 0.040005))
        strict = rate(stack, Duty.from_arrays(torque=1.0), contact_abs_tol=1e-6, contact_rel_tol=0.0)
        assert strict.layer_flags[0, 1] == LayerFlag.GAP_BELOW
        loose = rate(_stack(inner_diameter=(1, 0.0405)), Duty.from_arrays(torque=1.0), contact_abs_tol=1e-3)
        assert loose.valid[0]

    def test_hole_between_layers(self):
        """Present slots must be packed from slot 0: an empty slot with a layer outside it."""
        outer = np.array([[0.040, np.nan, 0.056]])
        inner = np.array([[0.0, np.nan, 0.050]])
        stack = LayerStack.from_arrays(outer, inner, 79.3e9, 100e6)
        rating = rate(stack, Duty.from_arrays(torque=1.0))
        assert rating.layer_flags[0].tolist() == [0, LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS, 0]
        _assert_not_rated(rating)

    def test_trailing_absent_slots_are_fine(self):
        stack = LayerStack.from_arrays([[0.040, 0.050, np.nan]], [[0.0, 0.040, np.nan]], 79.3e9, 1e8)
        rating = rate(stack, Duty.from_arrays(torque=1.0))
        assert rating.valid[0] and (rating.layer_flags == 0).all()
        assert np.isnan(rating.capacity[0, 2]) and np.isnan(rating.share[0, 2])


class TestPartFlags:
    def test_no_layers(self):
        stack = LayerStack.from_arrays([[np.nan, np.nan]], [[np.nan, np.nan]], np.nan, np.nan)
        rating = rate(stack, Duty.from_arrays(torque=1.0, length=1.0))
        assert rating.part_flags[0] == PartFlag.NO_LAYERS
        assert not rating.valid[0]

    @pytest.mark.parametrize(
        ("duty", "flag"),
        [
            ({"length": 0.0}, PartFlag.LENGTH_NOT_POSITIVE),
            ({"length": -1.0}, PartFlag.LENGTH_NOT_POSITIVE),
            ({"length": math.inf}, PartFlag.LENGTH_NOT_POSITIVE),
            ({"torque": math.inf}, PartFlag.TORQUE_NOT_FINITE),
            ({"twist_limit_angle": 0.0}, PartFlag.TWIST_LIMIT_NOT_POSITIVE),
            ({"twist_limit_angle": -math.inf}, PartFlag.TWIST_LIMIT_NOT_POSITIVE),
            ({"twist_limit_per_length": -0.01}, PartFlag.TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE),
            ({"twist_limit_angle": 0.02, "length": math.nan},
             PartFlag.TWIST_LIMIT_NEEDS_LENGTH | PartFlag.LENGTH_NOT_GIVEN),
        ],
    )
    def test_duty_errors(self, duty, flag):
        rating = _rate(_stack(), **duty)
        assert rating.part_flags[0] == flag
        assert is_error(PartFlag(int(rating.part_flags[0])))
        _assert_not_rated(rating)

    def test_negative_torque_is_a_note_and_magnitude_used(self):
        negative = _rate(_stack(), torque=-800.0)
        positive = _rate(_stack(), torque=800.0)
        assert negative.part_flags[0] == PartFlag.TORQUE_NEGATIVE
        assert negative.valid[0]
        for name in ("layer_torque", "stress_outer", "utilisation", "margin", "twist_angle"):
            np.testing.assert_array_equal(getattr(negative, name), getattr(positive, name))

    def test_no_torque_rates_capacities_only(self):
        rating = _rate(_stack(), torque=math.nan)
        assert rating.part_flags[0] == PartFlag.TORQUE_NOT_GIVEN
        assert rating.valid[0]
        assert np.isfinite(rating.capacity[0]).all() and np.isfinite(rating.governing_capacity[0])
        assert np.isnan(rating.stress_outer[0]).all() and np.isnan(rating.margin[0])

    def test_no_length_still_takes_a_per_length_limit(self):
        rating = _rate(_stack(), length=math.nan, twist_limit_per_length=1e-4)
        assert rating.part_flags[0] == PartFlag.LENGTH_NOT_GIVEN
        assert rating.valid[0] and np.isnan(rating.twist_angle[0])
        assert rating.governing_criterion[0] == Criterion.TWIST_PER_LENGTH

    def test_infinite_limit_means_no_limit(self):
        rating = _rate(_stack(), twist_limit_angle=math.inf)
        assert rating.valid[0] and rating.twist_capacity[0] == math.inf


class TestBatchIsolation:
    def test_bad_layer_flags_only_its_part(self):
        """One bad part in a batch: one bad row with its reason, the rest rated as alone."""
        good = _stack()
        bad = _stack(shear_modulus=(1, -1.0))
        rows = [good, good, bad, good, bad.take(0)]
        stack = LayerStack.from_arrays(
            *(np.vstack([getattr(s, f) for s in rows]) for f in
              ("outer_diameter", "inner_diameter", "shear_modulus", "allowable_shear", "stress_concentration")),
        )
        torques = np.array([100.0, 200.0, 300.0, 400.0, 500.0])
        rating = rate(stack, Duty.from_arrays(torque=torques, length=1.0))
        assert rating.valid.tolist() == [True, True, False, True, False]
        assert rating.part_flags.tolist() == [0, 0, PartFlag.LAYER_ERROR, 0, PartFlag.LAYER_ERROR]
        assert rating.layer_flags[2].tolist() == [0, LayerFlag.MODULUS_NOT_POSITIVE, 0]
        for row in (0, 1, 3):
            alone = rate(good, Duty.from_arrays(torque=torques[row], length=1.0))
            np.testing.assert_array_equal(rating.capacity[row], alone.capacity[0])
            assert rating.governing_capacity[row] == alone.governing_capacity[0]
            assert rating.margin[row] == alone.margin[0]

    def test_many_bad_rows_in_a_large_batch(self):
        """The screen passes clean rows; every rejected row gets its exact flags."""
        n = 5000
        rng = np.random.default_rng(7)
        outer = np.tile(GOOD["outer_diameter"], (n, 1))
        inner = np.tile(GOOD["inner_diameter"], (n, 1))
        modulus = np.tile(GOOD["shear_modulus"], (n, 1))
        bad_rows = rng.choice(n, 50, replace=False)
        modulus[bad_rows, 2] = np.nan
        inner[bad_rows[:10], 1] += 0.001
        stack = LayerStack.from_arrays(outer, inner, modulus, 1e8)
        rating = rate(stack, Duty.from_arrays(torque=10.0))
        assert set(np.flatnonzero(~rating.valid)) == set(bad_rows)
        assert (rating.layer_flags[bad_rows, 2] == LayerFlag.NOT_FINITE).all()
        assert (rating.layer_flags[bad_rows[:10], 1] == LayerFlag.GAP_BELOW).all()
        assert (rating.layer_flags[bad_rows[10:], 1] == 0).all()


class TestFlagHelpers:
    @pytest.mark.parametrize("flag", [*LayerFlag, *PartFlag, *AllowableFlag, *LoadFlag, *PlyFlag])
    def test_every_flag_described(self, flag):
        text = describe(flag)
        assert text and text[0].islower() and not text.endswith(".")

    def test_descriptions_are_distinct_across_types(self):
        """IntFlag members of different types compare equal by value; each must still
        get its own text."""
        assert describe(LayerFlag.GAP_BELOW) != describe(AllowableFlag.KEYWAY_IGNORED)
        assert int(LayerFlag.GAP_BELOW) == int(AllowableFlag.KEYWAY_IGNORED)
        texts = [describe(f) for f in [*LayerFlag, *PartFlag, *AllowableFlag, *LoadFlag, *PlyFlag]]
        assert len(set(texts)) == len(texts)

    def test_describe_refuses_combinations(self):
        with pytest.raises(ValueError, match="describe\\(\\) takes one flag"):
            describe(LayerFlag.GAP_BELOW | LayerFlag.NOT_FINITE)

    def test_split_flags(self):
        word = int(LayerFlag.NOT_FINITE | LayerFlag.OUTER_NOT_POSITIVE)
        assert split_flags(word, LayerFlag) == (LayerFlag.OUTER_NOT_POSITIVE, LayerFlag.NOT_FINITE)
        assert split_flags(0, PartFlag) == ()

    def test_errors_and_notes(self):
        assert LAYER_ERRORS == sum(LayerFlag)
        notes = {PartFlag.TORQUE_NEGATIVE, PartFlag.TORQUE_NOT_GIVEN, PartFlag.LENGTH_NOT_GIVEN}
        for flag in PartFlag:
            assert is_error(flag) is (flag not in notes)
        assert not is_error(AllowableFlag.FACTOR_OF_SAFETY_BELOW_ONE)
        assert is_error(AllowableFlag.RULE_UNKNOWN)
        np.testing.assert_array_equal(
            has_error([0, int(PartFlag.TORQUE_NEGATIVE), int(PartFlag.NO_LAYERS)], PartFlag),
            [False, False, True],
        )

    def test_load_and_ply_notes(self):
        """Findings the result already holds are notes; missing or bad inputs are errors."""
        notes = {LoadFlag.BENDING_ALONE_EXCEEDS, LoadFlag.SPEED_NOT_GIVEN,
                 LoadFlag.SPEED_ABOVE_WHIRL_LIMIT, LoadFlag.NOT_THIN_WALLED, LoadFlag.SHORT_TUBE}
        for flag in LoadFlag:
            assert is_error(flag) is (flag not in notes)
        for flag in PlyFlag:
            assert is_error(flag) is (flag is not PlyFlag.UNBALANCED)
        word = int(LoadFlag.SHORT_TUBE | LoadFlag.LENGTH_NOT_POSITIVE)
        assert split_flags(word, LoadFlag) == (LoadFlag.LENGTH_NOT_POSITIVE, LoadFlag.SHORT_TUBE)
