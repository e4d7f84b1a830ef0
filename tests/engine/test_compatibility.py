"""Twist compatibility: stiffness, twist per length, torque shares, stresses and the stress profile."""

import math

import numpy as np
import pytest
from twistshare.engine.core import (
    Duty,
    LayerStack,
    layer_stiffness,
    polar_moment,
    rate,
    shear_stress_at,
    stress_profile,
    torque_share,
    twist_per_length,
)

DIAMETERS = [0.012, 0.06, 0.25]
BORES = [0.0, 0.4, 0.85]
TORQUES = [1.0, 850.0, 4.0e4]
MODULI = [26.9e9, 79.3e9]
LENGTHS = [0.3, 2.5]


def _tube(outer, bore_ratio, modulus, allowable=100e6):
    return LayerStack.from_layers([outer], [bore_ratio * outer], [modulus], [allowable])


class TestSingleCircularSection:
    @pytest.mark.parametrize("outer", DIAMETERS)
    @pytest.mark.parametrize("bore", BORES)
    @pytest.mark.parametrize("torque", TORQUES)
    @pytest.mark.parametrize("modulus", MODULI)
    @pytest.mark.parametrize("length", LENGTHS)
    def test_stress_and_twist_match_roark(self, outer, bore, torque, modulus, length):
        """Roark's Formulas for Stress and Strain, torsion of circular sections:
        tau_max = T r_o / K, tau at r_i = T r_i / K, theta = T L / (K G),
        K = pi (r_o^4 - r_i^4) / 2. rtol 1e-12."""
        ro, ri = outer / 2, bore * outer / 2
        k = math.pi * (ro**4 - ri**4) / 2
        rating = rate(_tube(outer, bore, modulus), Duty.from_arrays(torque=torque, length=length))
        assert rating.stress_outer[0, 0] == pytest.approx(torque * ro / k, rel=1e-12)
        assert rating.stress_inner[0, 0] == pytest.approx(torque * ri / k, rel=1e-12, abs=1e-9)
        assert rating.twist_angle[0] == pytest.approx(torque * length / (k * modulus), rel=1e-12)
        assert rating.share[0, 0] == pytest.approx(1.0, rel=1e-15)
        assert rating.layer_torque[0, 0] == pytest.approx(torque, rel=1e-12)


class TestStackOfOneMaterial:
    @pytest.mark.parametrize("outer", DIAMETERS)
    @pytest.mark.parametrize("bore", [0.0, 0.3])
    @pytest.mark.parametrize("torque", TORQUES)
    def test_equals_single_tube(self, outer, bore, torque):
        """Three touching layers of one material behave as one tube of it: same
        sum(GJ), twist, outer stress and governing limit (Roark's Formulas for Stress
        and Strain, torsion of circular sections, for the tube). rtol 1e-12."""
        modulus, allowable, length = 79.3e9, 90e6, 1.7
        bore_d = bore * outer
        edges = np.linspace(bore_d, outer, 4)
        stack = LayerStack.from_layers(edges[1:], edges[:-1], [modulus] * 3, [allowable] * 3)
        duty = Duty.from_arrays(torque=torque, length=length)
        layered, single = rate(stack, duty), rate(_tube(outer, bore, modulus, allowable), duty)
        ro, ri = outer / 2, bore_d / 2
        k = math.pi * (ro**4 - ri**4) / 2
        assert layered.sum_gj[0] == pytest.approx(single.sum_gj[0], rel=1e-12)
        assert layered.twist_angle[0] == pytest.approx(torque * length / (modulus * k), rel=1e-12)
        assert layered.stress_outer[0, 2] == pytest.approx(single.stress_outer[0, 0], rel=1e-12)
        assert layered.governing_capacity[0] == pytest.approx(allowable * k / ro, rel=1e-12)
        assert layered.governing_layer[0] == 2
        # The strain is continuous, and with one G so is the stress.
        np.testing.assert_allclose(layered.stress_outer[0, :-1], layered.stress_inner[0, 1:], rtol=1e-12)


class TestShares:
    @pytest.mark.parametrize("core", [0.02, 0.05])
    @pytest.mark.parametrize("sleeve", [0.055, 0.09])
    def test_equal_modulus_shares_follow_polar_moment(self, core, sleeve):
        """Two layers of equal G share the torque in proportion to J (twist
        compatibility; Roark's Formulas for Stress and Strain, torsion of circular
        sections, for J). rtol 1e-12."""
        stack = LayerStack.from_layers([core, sleeve], [0.0, core], [79.3e9] * 2, [1e8] * 2)
        rating = rate(stack, Duty.from_arrays(torque=500.0))
        j_core = math.pi * core**4 / 32
        j_sleeve = math.pi * (sleeve**4 - core**4) / 32
        assert rating.share[0, 0] / rating.share[0, 1] == pytest.approx(j_core / j_sleeve, rel=1e-12)

    def test_stiffer_layer_carries_more(self):
        """Shares follow G*J (twist compatibility). J written here, not taken from the engine:
        J = pi (D^4 - d^4) / 32 (Roark's Formulas for Stress and Strain, table 10.1, hollow
        circle), so a wrong polar moment cannot cancel out. rtol 1e-12."""
        gj = layer_stiffness([0.04, 0.05], [0.0, 0.04], [80e9, 40e9])
        j_core = math.pi * 0.04**4 / 32
        j_sleeve = math.pi * (0.05**4 - 0.04**4) / 32
        np.testing.assert_allclose(polar_moment([0.04, 0.05], [0.0, 0.04]), [j_core, j_sleeve], rtol=1e-12)
        np.testing.assert_allclose(gj, [80e9 * j_core, 40e9 * j_sleeve], rtol=1e-12)
        share = torque_share(gj)
        total = 80e9 * j_core + 40e9 * j_sleeve
        np.testing.assert_allclose(share, [80e9 * j_core / total, 40e9 * j_sleeve / total], rtol=1e-12)
        assert share.sum() == pytest.approx(1.0, rel=1e-15)


    def test_shares_of_several_parts_are_per_part(self):
        """Each part's shares are its own G_i J_i / sum(G J) (twist compatibility), for parts
        on the leading axis; J = pi (D^4 - d^4) / 32 written here (Roark, table 10.1)."""
        outer = np.array([[0.04, 0.05, 0.06], [0.03, 0.045, 0.05]])
        inner = np.array([[0.0, 0.04, 0.05], [0.01, 0.03, 0.045]])
        g = np.array([[80e9, 40e9, 26e9], [79e9, 41e9, 70e9]])
        gj = g * math.pi * (outer**4 - inner**4) / 32
        expected = gj / gj.sum(axis=1)[:, None]
        np.testing.assert_allclose(torque_share(layer_stiffness(outer, inner, g)), expected, rtol=1e-12)


class TestPointFunctions:
    def test_shear_stress_at_is_g_r_theta(self):
        """tau = G r theta' (elastic torsion, any strength-of-materials text): 79.3 GPa
        x 20 mm x 0.01 rad/m = 15.86 MPa by hand."""
        assert shear_stress_at(0.02, 79.3e9, 0.01) == pytest.approx(15.86e6, rel=1e-12)

    def test_twist_rate_and_zero_stiffness(self):
        assert twist_per_length(100.0, 50.0) == pytest.approx(2.0)
        assert np.isinf(twist_per_length(100.0, 0.0))


class TestStressProfile:
    def test_interface_appears_twice_with_the_jump(self):
        """At an interface the strain is shared, so the stresses stand in the ratio of
        the moduli (twist compatibility)."""
        radius, stress = stress_profile([0.04, 0.05], [0.0, 0.04], [80e9, 40e9], 0.02, 3)
        np.testing.assert_allclose(radius, [0.0, 0.01, 0.02, 0.02, 0.0225, 0.025], rtol=1e-15)
        assert stress[2] / stress[3] == pytest.approx(2.0, rel=1e-12)
        np.testing.assert_allclose(stress, np.repeat([80e9, 40e9], 3) * radius * 0.02, rtol=1e-15)

    def test_absent_slots_skipped(self):
        radius, _ = stress_profile([0.04, np.nan], [0.0, np.nan], [80e9, np.nan], 0.02,
                                   present=[True, False])
        assert radius.shape == (2,)

    def test_needs_two_points(self):
        with pytest.raises(ValueError) as info:
            stress_profile([0.04], [0.0], [80e9], 0.02, 1)
        assert str(info.value) == "points_per_layer must be at least 2; got 1"

    def test_one_part_only(self):
        with pytest.raises(ValueError) as info:
            stress_profile([[0.04]], [[0.0]], [[80e9]], 0.02)
        assert str(info.value) == "stress_profile takes one part's layers (1-D); got shape (1, 1)"


class TestNumericalIntegration:
    @pytest.mark.parametrize("torque", [10.0, 3.2e3])
    def test_layer_torque_equals_integrated_stress(self, torque):
        """Independent numerical method: T_i = integral of tau(r) 2 pi r^2 dr over the
        layer, by the trapezoid rule on 20 001 points per layer (numpy.trapezoid), agrees
        with the closed-form layer torque to rtol 1e-7."""
        outer = [0.030, 0.042, 0.050]
        inner = [0.008, 0.030, 0.042]
        moduli = [79.3e9, 41.4e9, 26.9e9]
        stack = LayerStack.from_layers(outer, inner, moduli, [1e8] * 3)
        rating = rate(stack, Duty.from_arrays(torque=torque))
        radius, stress = stress_profile(outer, inner, moduli, rating.twist_per_length[0], 20_001)
        for slot in range(3):
            r = radius[slot * 20_001:(slot + 1) * 20_001]
            tau = stress[slot * 20_001:(slot + 1) * 20_001]
            integrated = np.trapezoid(tau * 2 * np.pi * r**2, r)
            assert integrated == pytest.approx(rating.layer_torque[0, slot], rel=1e-7)
        assert rating.layer_torque[0].sum() == pytest.approx(torque, rel=1e-12)
