"""rate(): a worked compound shaft by hand, Duty and Rating objects, batch shapes."""

import dataclasses
import math

import numpy as np
import pytest
from twistshare.engine.core import AllowableRule, Criterion, Duty, LayerStack, Rating, rate


class TestWorkedSleevedShaft:
    """Steel core 40 mm in a bronze sleeve 40/50 mm, 1 kN*m, 1.2 m, by hand:
    twist compatibility (issue 2 formulas), J by Roark's Formulas for Stress and Strain,
    torsion of circular sections."""

    G_STEEL, G_BRONZE = 79.3e9, 41.4e9
    TAU_STEEL, TAU_BRONZE = 100e6, 45e6

    @pytest.fixture
    def rating(self):
        stack = LayerStack.from_layers(
            [0.040, 0.050], [0.0, 0.040], [self.G_STEEL, self.G_BRONZE],
            [self.TAU_STEEL, self.TAU_BRONZE], stress_concentration=[1.0, 1.5],
        )
        return rate(stack, Duty.from_arrays(torque=1000.0, length=1.2,
                                            twist_limit_angle=math.radians(2.0)))

    def test_hand_values(self, rating):
        j_core = math.pi * 0.040**4 / 32
        j_sleeve = math.pi * (0.050**4 - 0.040**4) / 32
        gj = self.G_STEEL * j_core + self.G_BRONZE * j_sleeve
        theta = 1000.0 / gj
        assert rating.sum_gj[0] == pytest.approx(gj, rel=1e-12)
        assert rating.twist_per_length[0] == pytest.approx(theta, rel=1e-12)
        assert rating.twist_angle[0] == pytest.approx(theta * 1.2, rel=1e-12)
        assert rating.layer_torque[0, 0] == pytest.approx(self.G_STEEL * j_core * theta, rel=1e-12)
        # The stress jumps at the interface in the ratio of the moduli.
        assert rating.stress_outer[0, 0] / rating.stress_inner[0, 1] == pytest.approx(
            self.G_STEEL / self.G_BRONZE, rel=1e-12)
        cap_core = self.TAU_STEEL * gj / (self.G_STEEL * 0.020 * 1.0)
        cap_sleeve = self.TAU_BRONZE * gj / (self.G_BRONZE * 0.025 * 1.5)
        np.testing.assert_allclose(rating.capacity[0], [cap_core, cap_sleeve], rtol=1e-12)
        cap_twist = math.radians(2.0) * gj / 1.2
        assert rating.twist_capacity[0] == pytest.approx(cap_twist, rel=1e-12)
        governing = min(cap_core, cap_sleeve, cap_twist)
        assert rating.governing_capacity[0] == pytest.approx(governing, rel=1e-12)
        assert rating.governing_criterion[0] == Criterion.LAYER_STRESS
        assert rating.governing_layer[0] == 1
        assert rating.reserve_factor[0] == pytest.approx(governing / 1000.0, rel=1e-12)
        assert rating.margin[0] == pytest.approx(governing / 1000.0 - 1.0, rel=1e-12)
        np.testing.assert_allclose(rating.utilisation[0], 1000.0 / np.array([cap_core, cap_sleeve]), rtol=1e-12)

    def test_utilisation_uses_kt_on_nominal_stress(self, rating):
        """utilisation = Kt tau_outer / tau_allow: Kt enters the check, not the stress."""
        kt_tau = 1.5 * rating.stress_outer[0, 1]
        assert rating.utilisation[0, 1] == pytest.approx(kt_tau / self.TAU_BRONZE, rel=1e-12)

    def test_dtypes(self, rating):
        assert rating.governing_criterion.dtype == np.int8
        assert rating.governing_layer.dtype == np.int16
        assert rating.layer_flags.dtype == np.int32 and rating.part_flags.dtype == np.int32
        assert rating.valid.dtype == np.bool_


class TestDuty:
    def test_scalars_make_one_part(self):
        duty = Duty.from_arrays(torque=10.0)
        assert duty.n_parts == 1 and np.isnan(duty.length[0])

    def test_broadcasts(self):
        duty = Duty.from_arrays(torque=[1.0, 2.0, 3.0], length=2.0)
        assert duty.length.tolist() == [2.0, 2.0, 2.0]

    def test_shape_mismatch_names_field(self):
        with pytest.raises(ValueError, match=r"Duty\.length has shape \(2,\); expected \(3,\)"):
            Duty(np.ones(3), np.ones(2), np.ones(3), np.ones(3))

    def test_two_dimensional_refused(self):
        with pytest.raises(ValueError, match="one value per part"):
            Duty.from_arrays(torque=np.ones((2, 2)))

    def test_frozen(self):
        duty = Duty.from_arrays(torque=[1.0, 2.0])
        with pytest.raises(dataclasses.FrozenInstanceError):
            duty.torque = np.zeros(2)  # type: ignore[misc]
        with pytest.raises(ValueError):
            duty.torque[0] = 5.0


class TestBatchShapes:
    def _stack(self, n):
        return LayerStack.from_arrays(np.full((n, 1), 0.05), np.zeros((n, 1)), 79.3e9, 1e8)

    def test_one_duty_for_many_parts(self):
        rating = rate(self._stack(4), Duty.from_arrays(torque=100.0))
        assert rating.n_parts == 4 and rating.margin.shape == (4,)
        assert np.all(rating.margin == rating.margin[0])

    def test_duty_count_must_match(self):
        with pytest.raises(ValueError, match="duty has 2 parts; expected 1 or 3"):
            rate(self._stack(3), Duty.from_arrays(torque=[1.0, 2.0]))

    def test_zero_torque_has_infinite_margin(self):
        rating = rate(self._stack(1), Duty.from_arrays(torque=0.0))
        assert rating.reserve_factor[0] == math.inf and rating.margin[0] == math.inf

    def test_rule_travels_with_result(self):
        stack = LayerStack.from_layers([0.04, 0.05], [0.0, 0.04], [79e9, 40e9], [1e8, 5e7],
                                       allowable_rule=[AllowableRule.SHAFTING_CODE, AllowableRule.GIVEN])
        rating = rate(stack, Duty.from_arrays(torque=1.0))
        assert rating.allowable_rule[0].tolist() == [AllowableRule.SHAFTING_CODE, AllowableRule.GIVEN]

    def test_results_read_only_and_take(self):
        rating = rate(self._stack(3), Duty.from_arrays(torque=[1.0, 2.0, 3.0]))
        with pytest.raises(ValueError):
            rating.margin[0] = 0.0
        one = rating.take(1)
        assert isinstance(one, Rating) and one.n_parts == 1
        assert one.governing_capacity[0] == rating.governing_capacity[1]

    def test_no_runtime_warnings(self):
        """Invalid rows must not leak numpy warnings (np.errstate inside)."""
        stack = LayerStack.from_arrays([[0.0, np.nan], [0.05, 0.06]], [[0.0, np.nan], [0.0, 0.05]], 0.0, 0.0)
        with np.errstate(all="raise"):
            rating = rate(stack, Duty.from_arrays(torque=[np.inf, 0.0], length=[0.0, np.nan]))
        assert not rating.valid.any()
