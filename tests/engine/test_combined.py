"""Combined bending and torsion per layer: equivalent stresses and the capacity with M held."""

import dataclasses
import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._combined as combined_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    AllowableRule,
    Duty,
    LayerStack,
    LoadFlag,
    allowable_shear,
    combined_capacity,
    combined_stress,
    equivalent_stress,
    layer_capacity,
    layer_stiffness,
    rate,
    section_bending,
)

SETTINGS = settings(max_examples=100, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)
MAX_SHEAR = int(AllowableRule.MAX_SHEAR)
DISTORTION = int(AllowableRule.DISTORTION_ENERGY)


def test_docstring_examples():
    assert doctest.testmod(combined_module).failed == 0


def _principal(sigma, tau):
    """Principal stresses of the plane state (sigma, 0, tau) by numpy's eigvalsh, with the
    zero radial stress: an independent numerical route to Tresca and von Mises."""
    in_plane = np.linalg.eigvalsh(np.array([[sigma, tau], [tau, 0.0]]))
    return np.sort(np.append(in_plane, 0.0))


def _tube(outer, inner, moment, torque, rule, sy=300e6, fs=1.5, g=79.3e9, e=207e9, **kw):
    bending = section_bending([outer], [inner], [e], moment)
    return combined_stress(bending, [outer], [inner], [g], torque, [sy], [fs], [rule], **kw)


class TestSingleMaterialTube:
    @pytest.mark.parametrize("outer", [0.02, 0.06, 0.25])
    @pytest.mark.parametrize("ratio", [0.0, 0.5, 0.85])
    @pytest.mark.parametrize(("moment", "torque"), [(500.0, 800.0), (2e3, 10.0), (0.0, 1.5e3)])
    def test_tresca_and_mises_equivalents(self, outer, ratio, moment, torque):
        """sigma = 32 M D / (pi (D^4 - d^4)), tau = 16 T D / (pi (D^4 - d^4)) (any
        mechanics-of-materials text); Tresca = sigma1 - sigma3 and von Mises =
        sqrt(((s1-s2)^2 + (s2-s3)^2 + (s3-s1)^2) / 2) from the principal stresses; rtol 1e-9."""
        inner = ratio * outer
        denominator = math.pi * (outer**4 - inner**4)
        sigma = 32 * moment * outer / denominator
        tau = 16 * torque * outer / denominator
        s1, s2, s3 = _principal(sigma, tau)
        tresca = s3 - s1
        mises = math.sqrt(((s1 - s2) ** 2 + (s2 - s3) ** 2 + (s3 - s1) ** 2) / 2)
        for rule, expected in ((MAX_SHEAR, tresca), (DISTORTION, mises)):
            result = _tube(outer, inner, moment, torque, rule)
            assert result.shear_outer[0, 0] == pytest.approx(tau, rel=1e-12)
            assert result.equivalent_outer[0, 0] == pytest.approx(expected, rel=1e-9)
            assert equivalent_stress(sigma, tau, rule) == pytest.approx(expected, rel=1e-9)

    def test_capacity_closed_form(self):
        """Solve sqrt(sigma^2 + 4 tau^2) = Sy/FS for tau with M fixed, then T from
        tau = 16 T / (pi D^3) (solid bar; hand algebra); rtol 1e-12."""
        d, moment, sy, fs = 0.05, 1500.0, 400e6, 2.0
        sigma = 32 * moment / (math.pi * d**3)
        tau = math.sqrt((sy / fs) ** 2 - sigma**2) / 2
        expected = tau * math.pi * d**3 / 16
        result = _tube(d, 0.0, moment, 100.0, MAX_SHEAR, sy=sy, fs=fs)
        assert result.capacity[0, 0] == pytest.approx(expected, rel=1e-12)

    @pytest.mark.parametrize("rule", [MAX_SHEAR, DISTORTION])
    def test_capacity_is_where_the_equivalent_reaches_the_allowable(self, rule):
        first = _tube(0.04, 0.02, 900.0, 0.0, rule)
        at_capacity = _tube(0.04, 0.02, 900.0, first.capacity[0, 0], rule)
        assert at_capacity.equivalent_outer[0, 0] == pytest.approx(300e6 / 1.5, rel=1e-12)
        assert at_capacity.utilisation[0, 0] == pytest.approx(1.0, rel=1e-12)

    def test_stress_concentration_factors_act_at_the_outer_radius(self):
        """Kt scales the shear, Kb the normal stress, at the outer surface only."""
        plain = _tube(0.05, 0.03, 700.0, 900.0, DISTORTION)
        peaked = _tube(0.05, 0.03, 700.0, 900.0, DISTORTION, stress_concentration=[1.4],
                       bending_concentration=[1.8])
        sigma = section_bending([0.05], [0.03], [207e9], 700.0).normal_outer[0, 0]
        tau = plain.shear_outer[0, 0]
        assert peaked.equivalent_outer[0, 0] == pytest.approx(
            math.sqrt((1.8 * sigma) ** 2 + 3 * (1.4 * tau) ** 2), rel=1e-12)
        assert peaked.equivalent_inner[0, 0] == plain.equivalent_inner[0, 0]


class TestCompound:
    def test_shear_follows_twist_compatibility(self):
        """tau = G_i r T / sum(GJ) (BRIEF section 2; twist compatibility), with the same
        torque split rate() uses."""
        outer, inner, g = [0.04, 0.05], [0.0, 0.04], [79.3e9, 41.4e9]
        bending = section_bending(outer, inner, [207e9, 111e9], 300.0)
        result = combined_stress(bending, outer, inner, g, 600.0, [300e6, 250e6], [2.0, 2.0],
                                 [MAX_SHEAR, DISTORTION])
        sum_gj = float(np.sum(layer_stiffness(outer, inner, g)))
        assert result.sum_gj[0] == pytest.approx(sum_gj, rel=1e-12)
        assert result.shear_outer[0] == pytest.approx(
            [gi * di / 2 * 600.0 / sum_gj for gi, di in zip(g, outer)], rel=1e-12)
        assert result.shear_inner[0, 1] == pytest.approx(g[1] * 0.02 * 600.0 / sum_gj, rel=1e-12)

    def test_given_sum_stiffness_is_used(self):
        outer, inner, g = [0.04, 0.05], [0.0, 0.04], [79.3e9, 41.4e9]
        bending = section_bending(outer, inner, [207e9, 111e9], 300.0)
        args = (bending, outer, inner, g, 600.0, [300e6, 250e6], [2.0, 2.0], [1, 2])
        computed = combined_stress(*args)
        given_ = combined_stress(*args, sum_stiffness=computed.sum_gj)
        np.testing.assert_allclose(given_.capacity, computed.capacity, rtol=1e-14)


    def test_shear_from_the_rating_gives_the_same_result(self):
        """rate() computes the same shear stresses: passing them changes nothing, and the
        caller's arrays are never written (the invalid part's NaN goes into copies)."""
        stack = LayerStack.from_arrays(
            outer_diameter=[[0.04, 0.05], [0.03, 0.036]], inner_diameter=[[0.0, 0.04], [0.0, 0.03]],
            shear_modulus=[[79.3e9, 41.4e9]], allowable_shear=[[100e6, 60e6]],
            stress_concentration=[[1.2, 1.0]])
        rating = rate(stack, Duty.from_arrays(torque=[600.0, 200.0]))
        bending = section_bending(stack.outer_diameter, stack.inner_diameter, [[207e9, 111e9]],
                                  [300.0, 50.0])
        args = (bending, stack.outer_diameter, stack.inner_diameter, stack.shear_modulus,
                [600.0, 200.0], [[300e6, 250e6], [300e6, -1.0]], [[2.0, 2.0]], [[1, 2]])
        kwargs = dict(stress_concentration=stack.stress_concentration)
        computed = combined_stress(*args, **kwargs)
        reused = combined_stress(*args, **kwargs, sum_stiffness=rating.sum_gj,
                                 shear_outer=rating.stress_outer, shear_inner=rating.stress_inner)
        for name in ("shear_outer", "equivalent_outer", "equivalent_inner", "capacity"):
            np.testing.assert_allclose(getattr(reused, name), getattr(computed, name),
                                       rtol=1e-12)
        assert list(reused.valid) == [True, False]
        assert np.isfinite(rating.stress_outer[1]).all()
        with pytest.raises(ValueError, match="give both shear_outer and shear_inner"):
            combined_stress(*args, shear_outer=rating.stress_outer)


class TestFlags:
    def test_bending_alone_exceeding_gives_zero_and_a_note(self):
        d = 0.03
        moment = 1.1 * (300e6 / 1.5) * math.pi * d**3 / 32
        result = _tube(d, 0.0, moment, 50.0, MAX_SHEAR)
        assert result.capacity[0, 0] == 0.0
        assert result.layer_flags[0, 0] == LoadFlag.BENDING_ALONE_EXCEEDS
        assert result.part_flags[0] & LoadFlag.BENDING_ALONE_EXCEEDS
        assert result.valid[0]  # a note: the zero capacity is the rating

    @pytest.mark.parametrize(("rule", "sy", "fs", "flag"), [
        (int(AllowableRule.GIVEN), 300e6, 1.5, LoadFlag.RULE_NOT_COMBINABLE),
        (int(AllowableRule.SHAFTING_CODE), 300e6, 1.5, LoadFlag.RULE_NOT_COMBINABLE),
        (MAX_SHEAR, np.nan, 1.5, LoadFlag.STRENGTH_NOT_POSITIVE),
        (MAX_SHEAR, 300e6, 0.0, LoadFlag.STRENGTH_NOT_POSITIVE),
        (MAX_SHEAR, 0.0, 1.5, LoadFlag.STRENGTH_NOT_POSITIVE),      # Sy/FS = 0: not positive
        (MAX_SHEAR, np.inf, 1.5, LoadFlag.STRENGTH_NOT_POSITIVE),   # Sy/FS infinite: not a strength
    ])
    def test_errors_leave_the_part_unrated(self, rule, sy, fs, flag):
        result = _tube(0.05, 0.0, 100.0, 100.0, rule, sy=sy, fs=fs)
        assert result.layer_flags[0, 0] == flag
        assert not result.valid[0]
        assert np.isnan(result.capacity[0, 0])

    def test_rule_codes_read_as_floats(self):
        """A rule column read from a sheet arrives as floats, NaN where blank."""
        as_int = _tube(0.05, 0.0, 100.0, 100.0, DISTORTION)
        as_float_ = _tube(0.05, 0.0, 100.0, 100.0, float(DISTORTION))
        assert as_float_.capacity[0, 0] == as_int.capacity[0, 0]
        blank = _tube(0.05, 0.0, 100.0, 100.0, np.nan)
        assert blank.layer_flags[0, 0] == LoadFlag.RULE_NOT_COMBINABLE

    def test_no_torque_rates_the_capacity_only(self):
        result = _tube(0.05, 0.0, 100.0, np.nan, MAX_SHEAR)
        assert result.valid[0]
        assert np.isnan(result.equivalent_outer[0, 0])
        assert result.capacity[0, 0] > 0

    def test_bending_errors_carry_over(self):
        result = _tube(0.05, 0.0, np.inf, 100.0, MAX_SHEAR)
        assert result.part_flags[0] & LoadFlag.MOMENT_NOT_FINITE
        assert not result.valid[0]


@st.composite
def tubes(draw):
    outer = draw(st.floats(0.005, 0.3, **finite))
    ratio = draw(st.one_of(st.just(0.0), st.floats(0.05, 0.95, **finite)))
    return dict(
        outer=outer, inner=ratio * outer,
        g=draw(st.floats(5e9, 120e9, **finite)), sy=draw(st.floats(50e6, 1500e6, **finite)),
        fs=draw(st.floats(1.0, 4.0, **finite)), kt=draw(st.floats(1.0, 3.0, **finite)),
        rule=draw(st.sampled_from([MAX_SHEAR, DISTORTION])),
    )


@SETTINGS
@given(tubes())
def test_without_bending_the_capacity_is_the_torsion_only_capacity(t):
    """M = 0: the combined capacity equals layer_capacity with tau_allow = k Sy / FS,
    k = 0.5 (maximum shear) or 1/sqrt(3) (distortion energy) (BRIEF section 2; textbook)."""
    result = _tube(t["outer"], t["inner"], 0.0, 10.0, t["rule"], sy=t["sy"], fs=t["fs"],
                   g=t["g"], stress_concentration=[t["kt"]])
    tau_allow = allowable_shear(t["rule"], t["sy"], factor_of_safety=t["fs"])
    expected = layer_capacity(tau_allow, result.sum_gj[0], t["g"], t["outer"], t["kt"])
    assert result.capacity[0, 0] == pytest.approx(expected, rel=1e-12)


@SETTINGS
@given(st.floats(-1e9, 1e9, **finite), st.floats(-1e9, 1e9, **finite),
       st.sampled_from([MAX_SHEAR, DISTORTION]))
def test_equivalent_is_at_least_each_component(sigma, tau, rule):
    value = equivalent_stress(sigma, tau, rule)
    assert value >= abs(sigma) * (1 - 1e-15)
    assert value >= abs(tau) * (1 - 1e-15)


@SETTINGS
@given(tubes(), st.floats(0.0, 1e4, **finite), st.floats(0.0, 1e4, **finite))
def test_outer_radius_governs_the_layer(t, moment, torque):
    result = _tube(t["outer"], t["inner"], moment, torque, t["rule"], g=t["g"])
    assert result.equivalent_inner[0, 0] <= result.equivalent_outer[0, 0] * (1 + 1e-12)


@SETTINGS
@given(tubes(), st.floats(0.0, 1e4, **finite), st.floats(1.01, 3.0, **finite))
def test_more_bending_never_raises_the_capacity(t, moment, factor):
    low = _tube(t["outer"], t["inner"], moment, 1.0, t["rule"], sy=t["sy"], g=t["g"])
    high = _tube(t["outer"], t["inner"], moment * factor, 1.0, t["rule"], sy=t["sy"], g=t["g"])
    assert high.capacity[0, 0] <= low.capacity[0, 0]


@SETTINGS
@given(st.lists(tubes(), min_size=2, max_size=5), st.data())
def test_one_part_alone_equals_the_same_part_in_a_batch(batch, data):
    moments = [data.draw(st.floats(0.0, 1e4, **finite)) for _ in batch]
    column = {key: [[t[key]] for t in batch] for key in batch[0]}
    bending = section_bending(column["outer"], column["inner"], [[207e9]] * len(batch), moments)
    together = combined_stress(bending, column["outer"], column["inner"], column["g"], 500.0,
                               column["sy"], column["fs"], column["rule"],
                               stress_concentration=column["kt"])
    pick = data.draw(st.integers(0, len(batch) - 1))
    t = batch[pick]
    alone = _tube(t["outer"], t["inner"], moments[pick], 500.0, t["rule"], sy=t["sy"],
                  fs=t["fs"], g=t["g"], stress_concentration=[t["kt"]])
    np.testing.assert_array_equal(alone.capacity[0], together.capacity[pick])
    np.testing.assert_array_equal(alone.equivalent_outer[0], together.equivalent_outer[pick])


def test_capacity_function_broadcasts_like_a_ufunc():
    result = combined_capacity(np.array([0.0, 100e6, 300e6]), 200e6, 1e4, 80e9, 0.05, 1)
    assert result.shape == (3,)
    assert result[2] == 0.0 and result[0] > result[1] > 0


def test_capacity_divides_by_the_stress_concentration():
    """Torsion alone on a solid 25 mm bar: tau = 16 T / (pi D^3) (Roark's Formulas for Stress and
    Strain, solid circular section), so with Kt at the surface T = pi D^3 (0.5 S) / (16 Kt)
    for Tresca (0.5 S); Kt 2 halves it. rtol 1e-12."""
    g, d = 79.3e9, 0.025
    gj = g * math.pi / 32 * d**4
    got = combined_capacity(0.0, 200e6, gj, g, d, 1, stress_concentration=2.0)
    assert got == pytest.approx(math.pi * d**3 * 0.5 * 200e6 / (16 * 2.0), rel=1e-12)


def test_a_small_positive_strength_is_still_a_strength():
    """Sy/FS = 0.8 Pa is positive and finite: no strength error (the rule is "> 0")."""
    result = _tube(0.05, 0.0, 0.0, 100.0, MAX_SHEAR, sy=1.2, fs=1.5)
    assert result.layer_flags[0, 0] == 0  # no bending: nothing exceeded either
    assert result.valid[0]


@pytest.mark.parametrize("kb", [0.5, np.inf])
def test_bending_concentration_below_one_or_infinite_is_refused(kb):
    result = _tube(0.05, 0.0, 100.0, 100.0, MAX_SHEAR, bending_concentration=kb)
    assert result.layer_flags[0, 0] & LoadFlag.CONCENTRATION_BELOW_ONE
    assert not result.valid[0]


def test_bending_concentration_two_and_the_inner_radius():
    """Hollow tube D 50, d 30 mm, M 400 N*m, T 600 N*m, bending Kt 2 at the outer surface:
    sigma = 32 M r/(pi (D^4 - d^4)) * 2, tau = 16 T D/(pi (D^4 - d^4)) (any mechanics-of-
    materials text), Tresca sqrt(sigma^2 + 4 tau^2); at the inner radius nominal stresses
    with d in place of D. rtol 1e-9."""
    D, d, m, t = 0.05, 0.03, 400.0, 600.0
    den = math.pi * (D**4 - d**4)
    result = _tube(D, d, m, t, MAX_SHEAR, bending_concentration=2.0)
    s_o, t_o = 2 * 32 * m * D / den, 16 * t * D / den
    s_i, t_i = 32 * m * d / den, 16 * t * d / den
    assert result.equivalent_outer[0, 0] == pytest.approx(math.sqrt(s_o**2 + 4 * t_o**2), rel=1e-9)
    assert result.equivalent_inner[0, 0] == pytest.approx(math.sqrt(s_i**2 + 4 * t_i**2), rel=1e-9)


def test_given_shear_stresses_are_used_as_given():
    """No bending, shear given as 50 and 30 MPa: Tresca's sqrt(0 + 4 tau^2) is 100 and 60 MPa."""
    result = _tube(0.05, 0.03, 0.0, 100.0, MAX_SHEAR, shear_outer=[[50e6]], shear_inner=[[30e6]])
    assert result.equivalent_outer[0, 0] == pytest.approx(100e6, rel=1e-12)
    assert result.equivalent_inner[0, 0] == pytest.approx(60e6, rel=1e-12)


def test_messages_word_for_word():
    bending = section_bending([0.05], [0.0], [207e9], 100.0)
    with pytest.raises(ValueError) as info:
        combined_stress(bending, [[0.05, 0.06]], [[0.0, 0.05]], 79e9, 100.0, 300e6, 1.5, MAX_SHEAR)
    assert str(info.value) == "layer inputs have shape (1, 2); expected (1, 1) like the bending result"
    with pytest.raises(ValueError) as info:
        _tube(0.05, 0.0, 100.0, 100.0, MAX_SHEAR, shear_outer=[[1e6]])
    assert str(info.value) == "give both shear_outer and shear_inner, or neither"
    with pytest.raises(ValueError) as info:
        _tube(0.05, 0.0, 100.0, 100.0, [[1, 1, 1]])
    assert str(info.value) == ("rule, stress-concentration factors and shear stresses must broadcast "
                               "to (1, 1)")
    with pytest.raises(ValueError, match=r"^torque must hold one value or one per part \(1\)"):
        _tube(0.05, 0.0, 100.0, [1.0, 2.0], MAX_SHEAR)
    with pytest.raises(ValueError, match=r"^sum_stiffness must hold one value or one per part \(1\)"):
        _tube(0.05, 0.0, 100.0, 100.0, MAX_SHEAR, sum_stiffness=[1.0, 2.0])


def test_an_absent_slot_adds_no_stiffness():
    """Slot 2 written but absent: sum(GJ) = G pi D^4 / 32 of the core alone (Roark, solid circle)."""
    bending = section_bending([[0.05, 0.06]], [[0.0, 0.05]], [[207e9, 207e9]], 100.0,
                              present=[[True, False]])
    result = combined_stress(bending, [[0.05, 0.06]], [[0.0, 0.05]], [[79.3e9, 79.3e9]], 100.0,
                             [[300e6, 300e6]], [[1.5, 1.5]], [[MAX_SHEAR, MAX_SHEAR]], present=[[True, False]])
    assert result.sum_gj[0] == pytest.approx(79.3e9 * math.pi * 0.05**4 / 32, rel=1e-12)


def test_an_unrated_part_has_no_stiffness_shown_and_the_result_is_frozen():
    result = _tube(0.05, 0.0, 100.0, 100.0, int(AllowableRule.GIVEN))
    assert np.isnan(result.sum_gj[0])
    with pytest.raises(dataclasses.FrozenInstanceError):
        result.valid = None  # type: ignore[misc]


def test_n_parts():
    bending = section_bending([[0.05], [0.04]], [[0.0], [0.0]], [[207e9], [207e9]], [100.0, 50.0])
    result = combined_stress(bending, [[0.05], [0.04]], [[0.0], [0.0]], 79e9, [100.0, 50.0], 300e6, 1.5, MAX_SHEAR)
    assert result.n_parts == 2


def test_bending_exactly_at_the_allowable_is_exceeded():
    """"0 where the normal stress alone *reaches* the allowable" (the capacity's definition): a
    yield strength equal to the bending stress, FS 1, leaves no room for torque."""
    bending = section_bending([0.05], [0.0], [207e9], 400.0)
    sigma = float(bending.normal_outer[0, 0])
    result = combined_stress(bending, [0.05], [0.0], [79.3e9], 100.0, [sigma], [1.0], [MAX_SHEAR])
    assert result.capacity[0, 0] == 0.0
    assert result.layer_flags[0, 0] == LoadFlag.BENDING_ALONE_EXCEEDS
