"""Allowable shear stress from strength: Tresca, von Mises and the shafting code rule."""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    ALLOWABLE_ERRORS,
    AllowableFlag,
    AllowableRule,
    allowable_flags,
    allowable_shear,
)

R = AllowableRule
F = AllowableFlag


class TestTheories:
    @pytest.mark.parametrize("yield_strength", [210e6, 655e6])
    @pytest.mark.parametrize("fos", [1.0, 2.5])
    def test_tresca_factor_half(self, yield_strength, fos):
        """Maximum-shear-stress theory: shear yield = 0.5 Sy (Tresca 0.5, textbook)."""
        value = allowable_shear(R.MAX_SHEAR, yield_strength, factor_of_safety=fos)
        assert value == pytest.approx(0.5 * yield_strength / fos, rel=1e-15)

    @pytest.mark.parametrize("yield_strength", [210e6, 655e6])
    @pytest.mark.parametrize("fos", [1.0, 2.5])
    def test_von_mises_factor(self, yield_strength, fos):
        """Distortion-energy theory: shear yield = 0.577 Sy (von Mises 0.577, textbook;
        the rounded factor agrees with 1/sqrt(3) to 3 figures)."""
        value = allowable_shear(R.DISTORTION_ENERGY, yield_strength, factor_of_safety=fos)
        assert value * fos / yield_strength == pytest.approx(0.577, abs=5e-4)
        assert value == pytest.approx(yield_strength / (math.sqrt(3) * fos), rel=1e-15)


class TestShaftingCode:
    @pytest.mark.parametrize(
        ("sy", "su", "keyway", "expected"),
        [
            (300e6, 500e6, False, 90e6),    # 0.30 Sy = 0.18 Su = 90 MPa
            (400e6, 500e6, False, 90e6),    # ultimate governs: 0.18 x 500
            (200e6, 700e6, False, 60e6),    # yield governs: 0.30 x 200
            (200e6, 700e6, True, 45e6),     # x 0.75 with a keyway
            (400e6, 500e6, True, 67.5e6),
        ],
    )
    def test_rule_values(self, sy, su, keyway, expected):
        """min(0.30 Sy, 0.18 Su), x0.75 with keyway (the classic transmission-shafting
        code rule as stated in the brief; hand arithmetic for each row)."""
        assert allowable_shear(R.SHAFTING_CODE, sy, su, keyway=keyway) == pytest.approx(expected, rel=1e-12)

    def test_keyway_ratio_matches_code_allowables(self):
        """The old code's allowables for commercial steel shafting, 8000 psi plain and
        6000 psi with a keyway (Machinery's Handbook, shafting section, from memory),
        stand in the same 0.75 ratio."""
        plain = allowable_shear(R.SHAFTING_CODE, 300e6, 500e6, keyway=False)
        keyed = allowable_shear(R.SHAFTING_CODE, 300e6, 500e6, keyway=True)
        assert keyed / plain == pytest.approx(6000 / 8000, rel=1e-15)

    def test_factor_of_safety_not_applied_but_noted(self):
        """The rule embeds its own allowance, so FS is ignored, and a note says so."""
        assert allowable_shear(R.SHAFTING_CODE, 300e6, 500e6, factor_of_safety=3.0) == pytest.approx(90e6)
        assert allowable_flags(R.SHAFTING_CODE, 300e6, 500e6, factor_of_safety=3.0) == F.FACTOR_OF_SAFETY_IGNORED


class TestDefaults:
    """What a call without the optional inputs means: FS 1 (no safety factor) and no keyway."""

    def test_default_factor_of_safety_is_one(self):
        # Tresca: 0.5 Sy / 1 = 150 MPa for Sy = 300 MPa (hand arithmetic)
        assert allowable_shear(R.MAX_SHEAR, 300e6) == pytest.approx(150e6, rel=1e-15)
        assert allowable_shear(np.array([R.MAX_SHEAR]), np.array([300e6]))[0] == pytest.approx(150e6, rel=1e-15)

    def test_defaults_raise_no_note(self):
        # the shafting rule ignores an FS other than 1, and a keyway matters only to it
        assert allowable_flags(R.SHAFTING_CODE, 300e6, 500e6) == 0
        assert allowable_flags(R.MAX_SHEAR, 300e6, factor_of_safety=2.0) == 0
        assert allowable_flags(np.array([R.SHAFTING_CODE]), np.array([300e6]), np.array([500e6])).tolist() == [0]
        assert allowable_flags(np.array([R.MAX_SHEAR]), np.array([300e6]), factor_of_safety=2.0).tolist() == [0]

    def test_a_typical_factor_of_safety_is_noted_as_ignored_by_the_shafting_rule(self):
        for fs in (2.0, 1.5):
            assert allowable_flags(R.SHAFTING_CODE, 300e6, 500e6, fs) == F.FACTOR_OF_SAFETY_IGNORED
        assert allowable_flags(R.SHAFTING_CODE, 300e6, 500e6, 1.0) == 0


class TestVectorised:
    def test_array_of_rule_codes(self):
        rules = np.array([R.GIVEN, R.MAX_SHEAR, R.DISTORTION_ENERGY, R.SHAFTING_CODE, 9])
        values = allowable_shear(rules, 300e6, 500e6, 2.0, False)
        assert np.isnan(values[0]) and np.isnan(values[4])
        np.testing.assert_allclose(values[1:4], [75e6, 300e6 / (2 * math.sqrt(3)), 90e6], rtol=1e-12)
        flags = allowable_flags(rules, 300e6, 500e6, 2.0, False)
        assert flags.tolist() == [0, 0, 0, F.FACTOR_OF_SAFETY_IGNORED, F.RULE_UNKNOWN]

    def test_scalar_in_scalar_out(self):
        assert np.ndim(allowable_shear(R.MAX_SHEAR, 300e6)) == 0

    def test_nan_keyway_is_no_keyway(self):
        """An empty keyway cell read as NaN must not count as a keyway."""
        assert allowable_shear(R.SHAFTING_CODE, 300e6, 500e6, keyway=np.nan) == pytest.approx(90e6)


class TestInvalidInputs:
    @pytest.mark.parametrize(
        ("rule", "sy", "su", "fos", "flag"),
        [
            (7, 300e6, 500e6, 2.0, F.RULE_UNKNOWN),
            (np.nan, 300e6, 500e6, 2.0, F.RULE_UNKNOWN),
            (R.MAX_SHEAR, np.nan, 500e6, 2.0, F.YIELD_NOT_POSITIVE),
            (R.DISTORTION_ENERGY, -5.0, 500e6, 2.0, F.YIELD_NOT_POSITIVE),
            (R.MAX_SHEAR, 300e6, np.nan, 0.0, F.FACTOR_OF_SAFETY_NOT_POSITIVE),
            (R.DISTORTION_ENERGY, 300e6, np.nan, np.inf, F.FACTOR_OF_SAFETY_NOT_POSITIVE),
            (R.SHAFTING_CODE, 300e6, np.nan, np.nan, F.ULTIMATE_NOT_POSITIVE),
            (R.SHAFTING_CODE, np.inf, 500e6, np.nan, F.YIELD_NOT_POSITIVE),
        ],
    )
    def test_error_gives_nan_and_its_flag(self, rule, sy, su, fos, flag):
        assert np.isnan(allowable_shear(rule, sy, su, fos))
        flags = int(allowable_flags(rule, sy, su, fos))
        assert flags & flag
        assert flags & int(ALLOWABLE_ERRORS)

    @pytest.mark.parametrize(
        ("rule", "sy", "su", "fos", "keyway", "flag"),
        [
            (R.MAX_SHEAR, 300e6, np.nan, 0.8, False, F.FACTOR_OF_SAFETY_BELOW_ONE),
            (R.MAX_SHEAR, 300e6, 250e6, 2.0, False, F.ULTIMATE_BELOW_YIELD),
            (R.DISTORTION_ENERGY, 300e6, np.nan, 2.0, True, F.KEYWAY_IGNORED),
        ],
    )
    def test_notes_keep_the_value(self, rule, sy, su, fos, keyway, flag):
        assert np.isfinite(allowable_shear(rule, sy, su, fos, keyway))
        flags = int(allowable_flags(rule, sy, su, fos, keyway))
        assert flags == flag
        assert not flags & int(ALLOWABLE_ERRORS)

    def test_given_checks_nothing(self):
        """GIVEN: the allowable comes from the caller; strengths are not needed."""
        assert np.isnan(allowable_shear(R.GIVEN, np.nan))
        assert allowable_flags(R.GIVEN, np.nan, np.nan, np.nan) == 0


class TestScalarPathEqualsArrayPath:
    """One cell's call takes a plain-number path (numpy's per-call cost would dominate); it must
    give exactly what the array path gives for the same inputs in a one-element array."""

    @settings(max_examples=400, deadline=None)
    @given(st.sampled_from([0, 1, 2, 3, 7]),
           st.one_of(st.just(float("nan")), st.floats(-1e9, 4e9)),
           st.one_of(st.just(float("nan")), st.floats(-1e9, 4e9)),
           # factors of safety as typed (0 and negatives included); no subnormal overflow
           st.one_of(st.sampled_from([float("nan"), 0.0, -1.0, 1.0, 2.0]), st.floats(0.01, 20.0)),
           st.sampled_from([True, False, 0.0, 1.0, float("nan")]))
    def test_same_allowable_and_flags(self, rule, sy, su, fs, keyway):
        scalar = allowable_shear(rule, sy, su, fs, keyway)
        array = allowable_shear(np.array([rule]), np.array([sy]), np.array([su]), np.array([fs]),
                                np.array([keyway], dtype=float))
        assert np.isnan(scalar) == np.isnan(array[0])
        if not np.isnan(scalar):
            assert float(scalar) == float(array[0])
        assert int(allowable_flags(rule, sy, su, fs, keyway)) == int(allowable_flags(
            np.array([rule]), np.array([sy]), np.array([su]), np.array([fs]), np.array([keyway], dtype=float))[0])
