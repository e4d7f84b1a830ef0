"""Interference fits: Lamé pressure, interference at temperature, hoop stresses, slip, yield."""

import dataclasses
import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._fits as fits_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    FRICTION_GUIDANCE,
    FRICTION_GUIDANCE_SOURCE,
    combined_stress_capacity,
    find_material,
    fit_equivalent_stress,
    fit_hoop_stresses,
    fit_pressure,
    interference_at_temperature,
    lame_stresses,
    slip_capacity,
    slip_torque,
)

SETTINGS = settings(max_examples=60, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)

STEEL = (207e9, 0.292)
BRONZE = (111e9, 0.349)
ALUMINIUM = (68.9e9, 0.33)


def test_docstring_examples():
    assert doctest.testmod(fits_module).failed == 0


class TestPressureShigley:
    """Shigley's Mechanical Engineering Design, interference fits (from memory): contact
    pressure of two cylinders, radii R (interface), r_i, r_o and radial interference
    delta_r = delta / 2."""

    @pytest.mark.parametrize("d", [0.02, 0.05, 0.12])
    @pytest.mark.parametrize("outer_ratio", [1.1, 1.6, 3.0])
    @pytest.mark.parametrize("delta", [5e-6, 40e-6, 120e-6])
    @pytest.mark.parametrize("material", [STEEL, ALUMINIUM])
    def test_same_material_solid_inner(self, d, outer_ratio, delta, material):
        """Same material, solid shaft: p = E delta (d_o^2 - d^2) / (2 d d_o^2). rtol 1e-12."""
        e, nu = material
        do = outer_ratio * d
        expected = e * delta * (do**2 - d**2) / (2 * d * do**2)
        assert fit_pressure(delta, d, 0.0, do, e, nu, e, nu) == pytest.approx(expected, rel=1e-12)

    @pytest.mark.parametrize("bore_ratio", [0.2, 0.5, 0.8])
    @pytest.mark.parametrize("outer_ratio", [1.2, 2.0])
    def test_same_material_hollow_inner(self, bore_ratio, outer_ratio):
        """Same material: p = (E delta_r / (2 R^3)) (r_o^2 - R^2)(R^2 - r_i^2) / (r_o^2 - r_i^2).
        rtol 1e-12."""
        e, nu = STEEL
        d, delta = 0.06, 50e-6
        big_r, ri, ro, dr = d / 2, bore_ratio * d / 2, outer_ratio * d / 2, delta / 2
        expected = e * dr / (2 * big_r**3) * (ro**2 - big_r**2) * (big_r**2 - ri**2) / (ro**2 - ri**2)
        got = fit_pressure(delta, d, 2 * ri, 2 * ro, e, nu, e, nu)
        assert got == pytest.approx(expected, rel=1e-12)

    @pytest.mark.parametrize("inner", [STEEL, BRONZE, ALUMINIUM])
    @pytest.mark.parametrize("outer", [STEEL, BRONZE, ALUMINIUM])
    @pytest.mark.parametrize("bore_ratio", [0.0, 0.4])
    def test_general_lame_form_in_radii(self, inner, outer, bore_ratio):
        """Different materials: p = delta_r / (R [ (1/E_o)((r_o^2 + R^2)/(r_o^2 - R^2) + nu_o)
        + (1/E_i)((R^2 + r_i^2)/(R^2 - r_i^2) - nu_i) ]), written in radii. rtol 1e-12."""
        (ei, nui), (eo, nuo) = inner, outer
        big_r, ro, dr = 0.025, 0.036, 20e-6
        ri = bore_ratio * big_r
        expected = dr / (big_r * (((ro**2 + big_r**2) / (ro**2 - big_r**2) + nuo) / eo
                                  + ((big_r**2 + ri**2) / (big_r**2 - ri**2) - nui) / ei))
        got = fit_pressure(2 * dr, 2 * big_r, 2 * ri, 2 * ro, ei, nui, eo, nuo)
        assert got == pytest.approx(expected, rel=1e-12)

    def test_hoop_stresses(self):
        """sigma_t,o = p (r_o^2 + R^2)/(r_o^2 - R^2) at the outer member's bore and
        sigma_t,i = -p (R^2 + r_i^2)/(R^2 - r_i^2) at the inner member's surface; -p for a
        solid member. rtol 1e-12."""
        p, big_r, ri, ro = 40e6, 0.025, 0.01, 0.04
        outer, inner = fit_hoop_stresses(p, 2 * big_r, 2 * ri, 2 * ro)
        assert outer == pytest.approx(p * (ro**2 + big_r**2) / (ro**2 - big_r**2), rel=1e-12)
        assert inner == pytest.approx(-p * (big_r**2 + ri**2) / (big_r**2 - ri**2), rel=1e-12)
        assert fit_hoop_stresses(p, 0.05, 0.0, 0.08)[1] == pytest.approx(-p, rel=1e-15)

    def test_lame_stresses_agree_with_the_fit_hoop_stresses(self):
        """Lamé in general form gives the same faces as the fit formulas (and sigma_r = -p)."""
        p = 30e6
        radial, hoop = lame_stresses(0.025, 0.05, 0.08, p, 0.0)
        assert radial == pytest.approx(-p, rel=1e-12)
        assert hoop == pytest.approx(fit_hoop_stresses(p, 0.05, 0.0, 0.08)[0], rel=1e-12)
        radial, hoop = lame_stresses(0.025, 0.02, 0.05, 0.0, p)
        assert radial == pytest.approx(-p, rel=1e-12)
        assert hoop == pytest.approx(fit_hoop_stresses(p, 0.05, 0.02, 0.08)[1], rel=1e-12)
        # Outer face of the outer member: 2 p R^2 / (r_o^2 - R^2), radial 0 (Shigley, Lamé).
        radial, hoop = lame_stresses(0.04, 0.05, 0.08, p, 0.0)
        assert radial == pytest.approx(0.0, abs=1e-6)
        assert hoop == pytest.approx(2 * p * 0.025**2 / (0.04**2 - 0.025**2), rel=1e-12)

    @pytest.mark.parametrize(
        "args",
        [
            (40e-6, 0.05, 0.05, 0.08, *STEEL, *STEEL),  # bore not below the fit diameter
            (40e-6, 0.05, 0.0, 0.05, *STEEL, *STEEL),  # outer diameter not above it
            (40e-6, 0.05, 0.0, 0.08, 0.0, 0.3, *STEEL),  # E not positive
            (40e-6, 0.05, 0.0, 0.08, *STEEL, 207e9, 0.6),  # nu out of range
            (np.nan, 0.05, 0.0, 0.08, *STEEL, *STEEL),  # no fit
        ],
    )
    def test_out_of_range_gives_nan(self, args):
        assert np.isnan(fit_pressure(*args))

    def test_clearance_gives_no_pressure(self):
        assert fit_pressure(-5e-6, 0.05, 0.0, 0.08, *STEEL, *STEEL) == 0.0


class TestTemperature:
    """Free thermal growth of each member, alpha dT d (any heat-transfer or machine-design
    text, common practice). Handbook coefficients, from memory: steel 11-12e-6/K, bronze
    about 18e-6/K, aluminium about 23e-6/K."""

    def test_bronze_sleeve_on_steel_loosens_when_hot(self):
        """Hand calculation: 60 um at 20 C, d = 50 mm, running at 100 C, steel 11.5e-6/K
        inside bronze 18e-6/K: 60 um - 6.5e-6/K x 80 K x 50 mm = 60 - 26 = 34 um."""
        got = interference_at_temperature(60e-6, 0.05, 11.5e-6, 18e-6, 373.15, 293.15)
        assert got == pytest.approx(34e-6, rel=1e-12)

    def test_steel_sleeve_on_aluminium_tightens_when_hot(self):
        """Hand calculation: 30 um, d = 80 mm, +50 K, aluminium 23e-6 inside steel 12e-6:
        30 + 11e-6 x 50 x 0.08 m = 30 + 44 = 74 um."""
        got = interference_at_temperature(30e-6, 0.08, 23e-6, 12e-6, 343.15, 293.15)
        assert got == pytest.approx(74e-6, rel=1e-12)

    def test_no_operating_temperature_needs_no_coefficients(self):
        assert interference_at_temperature(40e-6, 0.05, np.nan, np.nan) == 40e-6

    def test_missing_coefficient_with_a_temperature_is_nan(self):
        assert np.isnan(interference_at_temperature(40e-6, 0.05, np.nan, 17e-6, 350.0))

    def test_library_coefficients_lie_in_the_handbook_ranges(self):
        """Steel 11-12.5e-6/K, bronze 16-19e-6/K, aluminium alloys 22-24.5e-6/K (handbook
        ranges, from memory); each library value names its source."""
        for name, low, high in (("AISI 1045 hot rolled", 11e-6, 12.5e-6),
                                ("AISI 4140 quenched and tempered", 11e-6, 12.5e-6),
                                ("Phosphor bronze", 16e-6, 19e-6),
                                ("Aluminium bronze C95400 as cast", 16e-6, 19e-6),
                                ("Aluminium 6061-T6", 22e-6, 24.5e-6)):
            material = find_material(name)
            assert low <= material.expansion_coefficient <= high, name
            assert "from memory" in material.sources["expansion_coefficient"]

    def test_library_bronze_sleeve_loses_contact_when_hot(self):
        """A light fit of a phosphor-bronze sleeve on a 1045 core, 20 um on 50 mm, opens by
        80 C above assembly: 20 um < (17.8 - 11.7) x 80 x 50 mm = 24.4 um (library values)."""
        steel, bronze = find_material("AISI 1045 hot rolled"), find_material("Phosphor bronze")
        delta = interference_at_temperature(20e-6, 0.05, steel.expansion_coefficient,
                                            bronze.expansion_coefficient, 293.15 + 80, 293.15)
        assert delta < 0
        assert fit_pressure(delta, 0.05, 0.0, 0.06, steel.youngs_modulus, steel.poisson_ratio,
                            bronze.youngs_modulus, bronze.poisson_ratio) == 0.0


class TestSlip:
    def test_slip_torque_from_friction_force_and_radius(self):
        """Friction force mu p (pi d L) at radius d/2 (Shigley, interference fits, torque
        capacity): 0.15 x 35 MPa x pi x 60 mm x 45 mm x 30 mm by hand = 1335.9 N m."""
        expected = 0.15 * 35e6 * math.pi * 0.06 * 0.045 * 0.03
        assert slip_torque(35e6, 0.15, 0.06, 0.045) == pytest.approx(expected, rel=1e-12)
        assert expected == pytest.approx(1335.95, rel=1e-5)

    def test_capacity_is_slip_torque_over_share(self):
        assert slip_capacity(1000.0, 0.25) == pytest.approx(4000.0, rel=1e-15)
        assert slip_capacity(1000.0, -0.25) == pytest.approx(4000.0, rel=1e-15)
        assert np.isinf(slip_capacity(0.0, 0.0))
        assert np.isnan(slip_capacity(np.nan, 0.3))

    @SETTINGS
    @given(st.floats(1e-6, 150e-6, **finite), st.floats(1.05, 1.9, **finite),
           st.floats(0.005, 0.1, **finite), st.floats(1.05, 3.0, **finite))
    def test_slip_capacity_grows_with_interference_and_length(self, delta, grow, length, stretch):
        def capacity(interference, fit_length):
            p = fit_pressure(interference, 0.05, 0.0, 0.07, *STEEL, *BRONZE)
            return slip_capacity(slip_torque(p, 0.12, 0.05, fit_length), 0.3)

        base = capacity(delta, length)
        assert capacity(delta * grow, length) > base
        assert capacity(delta, length * stretch) > base


class TestFriction:
    def test_table_is_read_only_and_sensible(self):
        """Common practice, from memory: fit friction coefficients lie between about 0.05 and
        0.25; the slip check uses the low end."""
        assert isinstance(FRICTION_GUIDANCE, tuple) and len(FRICTION_GUIDANCE) >= 5
        for guide in FRICTION_GUIDANCE:
            assert 0.03 <= guide.low <= guide.high <= 0.3
            assert guide.for_slip == guide.low
        with pytest.raises(dataclasses.FrozenInstanceError):
            FRICTION_GUIDANCE[0].low = 0.5  # type: ignore[misc]
        assert "from memory" in FRICTION_GUIDANCE_SOURCE

    def test_oiled_fits_grip_less_than_dry_shrink_fits(self):
        """Common practice: lubrication lowers the friction of a fit."""
        by_name = {g.surfaces: g for g in FRICTION_GUIDANCE}
        oiled = by_name["steel on steel, press fit, oiled"]
        shrink = by_name["steel on steel, shrink fit, dry and degreased"]
        assert oiled.high <= shrink.low


class TestEquivalentStress:
    """Distortion energy (von Mises), any strength-of-materials text."""

    def test_pure_shear_uniaxial_and_in_plane_hydrostatic(self):
        assert fit_equivalent_stress(0.0, 0.0, 50e6) == pytest.approx(math.sqrt(3) * 50e6, rel=1e-15)
        assert fit_equivalent_stress(120e6, 0.0, 0.0) == pytest.approx(120e6, rel=1e-15)
        assert fit_equivalent_stress(-40e6, -40e6, 0.0) == pytest.approx(40e6, rel=1e-15)

    def test_capacity_on_a_solid_shaft_surface_by_hand(self):
        """Solid shaft under p: sigma_t = sigma_r = -p, so sigma_vm^2 = p^2 + 3 tau^2 and
        T = sqrt(S^2 - p^2) / (sqrt(3) c), c = tau per unit torque. rtol 1e-12."""
        p, sy, fs, c = 60e6, 300e6, 1.5, 2.0e4
        expected = math.sqrt((sy / fs) ** 2 - p**2) / (math.sqrt(3) * c)
        got = combined_stress_capacity(-p, -p, c, sy, fs)
        assert got == pytest.approx(expected, rel=1e-12)

    @SETTINGS
    @given(st.floats(-300e6, 300e6, **finite), st.floats(-150e6, 0.0, **finite),
           st.floats(1e2, 1e6, **finite), st.floats(200e6, 900e6, **finite),
           st.floats(1.0, 3.0, **finite))
    def test_capacity_reaches_the_yield_over_fs(self, hoop, radial, c, sy, fs):
        """At the capacity the equivalent stress is S_y / FS; where the fit alone exceeds it
        the capacity is 0."""
        capacity = combined_stress_capacity(hoop, radial, c, sy, fs)
        if fit_equivalent_stress(hoop, radial, 0.0) >= sy / fs:
            assert capacity == 0.0
        else:
            assert fit_equivalent_stress(hoop, radial, c * capacity) == pytest.approx(sy / fs, rel=1e-9)

    def test_missing_strength_is_nan(self):
        assert np.isnan(combined_stress_capacity(0.0, 0.0, 1.0, np.nan))
        assert np.isnan(combined_stress_capacity(0.0, 0.0, 1.0, 300e6, 0.0))


class TestStatedInputRanges:
    """The documented ranges of the fit functions, at their edges: the diameters must satisfy
    0 <= d_i < d < d_o, E > 0 and finite, nu in (-1, 0.5] (the range of an isotropic elastic
    solid, common practice); yield strength and factor of safety positive and finite."""

    def _general(self, delta, d, di, do, ei, nui, eo, nuo):
        # Shigley's general Lamé form (as TestPressureShigley), in diameters.
        return delta / (d * (((do**2 + d**2) / (do**2 - d**2) + nuo) / eo
                             + ((d**2 + di**2) / (d**2 - di**2) - nui) / ei))

    @pytest.mark.parametrize("e", [0.5, 1.0, 3.0])
    def test_any_positive_modulus_gives_the_closed_form(self, e):
        # p = E delta (d_o^2 - d^2) / (2 d d_o^2) is linear in E: a tiny E is still a material.
        d, do, delta = 0.05, 0.08, 40e-6
        expected = e * delta * (do**2 - d**2) / (2 * d * do**2)
        assert fit_pressure(delta, d, 0.0, do, e, 0.3, e, 0.3) == pytest.approx(expected, rel=1e-12)

    @pytest.mark.parametrize("member", ["inner", "outer"])
    @pytest.mark.parametrize("e", [np.inf, 0.0, -1e9, np.nan])
    def test_a_modulus_that_is_not_a_positive_finite_number_gives_nan(self, member, e):
        ei, eo = (e, 207e9) if member == "inner" else (207e9, e)
        assert np.isnan(fit_pressure(40e-6, 0.05, 0.0, 0.08, ei, 0.3, eo, 0.3))

    @pytest.mark.parametrize("member", ["inner", "outer"])
    @pytest.mark.parametrize("nu", [-1.0, -1.5, 0.5000001])
    def test_poisson_outside_its_range_gives_nan(self, member, nu):
        nui, nuo = (nu, 0.3) if member == "inner" else (0.3, nu)
        assert np.isnan(fit_pressure(40e-6, 0.05, 0.0, 0.08, 207e9, nui, 111e9, nuo))

    @pytest.mark.parametrize("nu", [0.5, -0.9])
    def test_poisson_at_its_edges_is_rated(self, nu):
        got = fit_pressure(40e-6, 0.05, 0.02, 0.08, 207e9, nu, 111e9, nu)
        assert got == pytest.approx(self._general(40e-6, 0.05, 0.02, 0.08, 207e9, nu, 111e9, nu),
                                    rel=1e-12)

    def test_lame_solid_cylinder_is_uniform_even_on_its_axis(self):
        # Lamé, a = 0: sigma_r = sigma_t = -p_o everywhere, the axis (r = 0) included.
        for r in (0.0, 0.01, 0.02):
            radial, hoop = lame_stresses(r, 0.0, 0.04, 0.0, 30e6)
            assert radial == pytest.approx(-30e6, rel=1e-12) and hoop == pytest.approx(-30e6, rel=1e-12)

    def test_slip_capacity_of_an_unknown_grip_is_unknown_even_where_no_torque_passes(self):
        # Stated: infinite where the interface passes no torque, NaN where an input is NaN.
        assert np.isnan(slip_capacity(np.nan, 0.0))
        assert slip_capacity(0.0, 0.0) == np.inf
        assert np.isnan(slip_capacity(100.0, np.nan))

    def test_combined_capacity_default_factor_of_safety_is_one(self):
        t, r, c, sy = 120e6, -40e6, 2.0e3, 350e6
        # sigma_t^2 + sigma_r^2 - sigma_t sigma_r + 3 (c T)^2 = Sy^2 solved for T (von Mises)
        expected = np.sqrt((sy**2 - (t * t + r * r - t * r)) / 3.0) / c
        assert combined_stress_capacity(t, r, c, sy) == pytest.approx(expected, rel=1e-12)
        assert combined_stress_capacity(t, r, c, sy, 1.0) == pytest.approx(expected, rel=1e-12)
        assert combined_stress_capacity(t, r, c, sy, 2.0) < expected

    def test_combined_capacity_for_any_positive_strength(self):
        # The formula holds for Sy = 1 Pa as for 350 MPa: T = sqrt(Sy^2 / 3) / c with no fit.
        assert combined_stress_capacity(0.0, 0.0, 2.0, 1.0) == pytest.approx(np.sqrt(1 / 3) / 2.0, rel=1e-12)

    def test_a_fit_exactly_at_the_limit_leaves_nothing_even_on_the_axis(self):
        # Stated: 0 where the fit alone already reaches Sy/FS (hoop = Sy, no radial stress).
        assert combined_stress_capacity(350e6, 0.0, 0.0, 350e6) == 0.0
        assert combined_stress_capacity(350e6, 0.0, 1e3, 350e6) == 0.0

    @pytest.mark.parametrize("sy, fs", [(0.0, 1.0), (-5e6, 1.0), (np.inf, 1.0), (350e6, 0.0),
                                        (350e6, np.inf)])
    def test_combined_capacity_needs_a_positive_strength_and_factor(self, sy, fs):
        assert np.isnan(combined_stress_capacity(10e6, -5e6, 1e3, sy, fs))


def test_readme_friction_table_is_the_library_guidance():
    """README prints the guidance users rate slip with: every row there is a guide here, in
    order, with the same range, under the same source words."""
    from pathlib import Path

    text = (Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8")
    head = next(line for line in text.splitlines() if line.startswith("**Friction guidance**"))
    assert f"({FRICTION_GUIDANCE_SOURCE})" in head
    block = text[text.index(head):].split("\n\n")[1]
    rows = [line.strip("|").split("|") for line in block.splitlines()[2:]]
    printed = [(s.strip(), r.strip()) for s, r in rows]
    assert printed == [(g.surfaces, f"{g.low:.2f} to {g.high:.2f}") for g in FRICTION_GUIDANCE]
