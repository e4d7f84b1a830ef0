"""Compound section in bending: ΣEI, layer stresses at both radii, axial force shared by EA."""

import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._bending as bending_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import LoadFlag, area_moment, section_area, section_bending

SETTINGS = settings(max_examples=100, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)

OUTER = [0.01, 0.05, 0.4]
BORE_RATIO = [0.0, 0.3, 0.9]


def test_docstring_examples():
    assert doctest.testmod(bending_module).failed == 0


class TestAreaMoment:
    @pytest.mark.parametrize("outer", OUTER)
    @pytest.mark.parametrize("ratio", BORE_RATIO)
    def test_matches_radius_form(self, outer, ratio):
        """Roark's Formulas for Stress and Strain, properties of sections (hollow circle):
        I = pi (ro^4 - ri^4) / 4; rtol 1e-12."""
        ro, ri = outer / 2, ratio * outer / 2
        assert area_moment(outer, ratio * outer) == pytest.approx(
            math.pi * (ro**4 - ri**4) / 4, rel=1e-12)

    def test_area(self):
        """A = pi (ro^2 - ri^2) (any geometry text); scalar in gives scalar out."""
        value = section_area(0.05, 0.03)
        assert np.ndim(value) == 0
        assert value == pytest.approx(math.pi * (0.025**2 - 0.015**2), rel=1e-12)


class TestSingleMaterialTube:
    @pytest.mark.parametrize("outer", OUTER)
    @pytest.mark.parametrize("ratio", BORE_RATIO)
    @pytest.mark.parametrize("moment", [1.0, 850.0, -2.5e4])
    def test_flexure_formula(self, outer, ratio, moment):
        """sigma = 32 M D / (pi (D^4 - d^4)) at the outer fibre and 32 M d / (...) at the bore
        (flexure formula sigma = M c / I, any mechanics-of-materials text); rtol 1e-12."""
        inner = ratio * outer
        result = section_bending([outer], [inner], [207e9], moment)
        denominator = math.pi * (outer**4 - inner**4)
        assert result.bending_outer[0, 0] == pytest.approx(
            32 * abs(moment) * outer / denominator, rel=1e-12)
        assert result.bending_inner[0, 0] == pytest.approx(
            32 * abs(moment) * inner / denominator, rel=1e-12, abs=1e-9)
        assert result.curvature[0] == pytest.approx(
            abs(moment) / (207e9 * math.pi / 64 * (outer**4 - inner**4)), rel=1e-12)

    def test_axial_force(self):
        """sigma = N / A for one material, + tension (any mechanics-of-materials text);
        with bending, the extreme fibre carries N/A + M c / I with the axial stress's sign."""
        outer, inner, force, moment = 0.06, 0.04, -50e3, 400.0
        area = math.pi / 4 * (outer**2 - inner**2)
        inertia = math.pi / 64 * (outer**4 - inner**4)
        result = section_bending([outer], [inner], [200e9], moment, axial_force=force)
        assert result.axial[0, 0] == pytest.approx(force / area, rel=1e-12)
        expected = force / area - moment * (outer / 2) / inertia
        assert result.normal_outer[0, 0] == pytest.approx(expected, rel=1e-12)
        assert result.normal_outer[0, 0] < 0
        tension = section_bending([outer], [inner], [200e9], moment, axial_force=-force)
        assert tension.normal_outer[0, 0] == pytest.approx(-expected, rel=1e-12)

    def test_no_axial_force_gives_the_tension_fibre(self):
        result = section_bending([0.05], [0.0], [200e9], -300.0)
        assert result.normal_outer[0, 0] == result.bending_outer[0, 0] > 0


class TestCompoundSection:
    # A 40 mm steel core (E 207 GPa) in a 50 mm bronze sleeve (E 111 GPa), M = 1.2 kN m.
    OUTER = [0.040, 0.050]
    INNER = [0.0, 0.040]
    E = [207e9, 111e9]
    M = 1200.0

    def test_transformed_section(self):
        """Transformed-section method for composite beams (Gere, Mechanics of Materials,
        composite beams): the sleeve transformed to steel by n = E2/E1,
        I_t = I1 + n I2, sigma1 = M y / I_t, sigma2 = n M y / I_t; rtol 1e-12."""
        i1 = math.pi / 64 * 0.040**4
        i2 = math.pi / 64 * (0.050**4 - 0.040**4)
        n = self.E[1] / self.E[0]
        i_t = i1 + n * i2
        result = section_bending(self.OUTER, self.INNER, self.E, self.M)
        assert result.sum_ei[0] == pytest.approx(self.E[0] * i_t, rel=1e-12)
        assert result.bending_outer[0, 0] == pytest.approx(self.M * 0.020 / i_t, rel=1e-12)
        assert result.bending_inner[0, 1] == pytest.approx(n * self.M * 0.020 / i_t, rel=1e-12)
        assert result.bending_outer[0, 1] == pytest.approx(n * self.M * 0.025 / i_t, rel=1e-12)

    def test_stress_jumps_strain_does_not(self):
        """Plane sections: the strain sigma/E is continuous at the interface, the stress
        jumps in the ratio of the moduli."""
        result = section_bending(self.OUTER, self.INNER, self.E, self.M)
        below = result.bending_outer[0, 0] / self.E[0]
        above = result.bending_inner[0, 1] / self.E[1]
        assert above == pytest.approx(below, rel=1e-12)
        assert result.bending_inner[0, 1] / result.bending_outer[0, 0] == pytest.approx(
            self.E[1] / self.E[0], rel=1e-12)

    def test_axial_force_shared_by_ea(self):
        """Equal strain in every layer: sigma_i = E_i N / sum(E A); the layer forces add
        up to N (equilibrium)."""
        force = 80e3
        result = section_bending(self.OUTER, self.INNER, self.E, 0.0, axial_force=force)
        areas = [math.pi / 4 * 0.040**2, math.pi / 4 * (0.050**2 - 0.040**2)]
        ea = sum(e * a for e, a in zip(self.E, areas))
        assert result.axial[0] == pytest.approx([e * force / ea for e in self.E], rel=1e-12)
        assert sum(result.axial[0] * areas) == pytest.approx(force, rel=1e-12)

    def test_absent_slots_are_nan_and_ignored(self):
        result = section_bending([[0.04, np.nan]], [[0.0, np.nan]], [[207e9, np.nan]], self.M)
        alone = section_bending([0.04], [0.0], [207e9], self.M)
        assert np.isnan(result.bending_outer[0, 1])
        assert result.sum_ei[0] == alone.sum_ei[0]


class TestFlags:
    def test_modulus_not_positive_flags_only_its_part(self):
        result = section_bending([[0.05], [0.05]], [[0.0], [0.0]], [[0.0], [200e9]], 100.0)
        assert result.layer_flags[0, 0] == LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE
        assert result.part_flags[0] & LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE
        assert list(result.valid) == [False, True]
        assert np.isnan(result.bending_outer[0, 0]) and np.isfinite(result.bending_outer[1, 0])

    @pytest.mark.parametrize(("moment", "force", "flag"), [
        (np.inf, 0.0, LoadFlag.MOMENT_NOT_FINITE),
        (np.nan, 0.0, LoadFlag.MOMENT_NOT_FINITE),
        (10.0, -np.inf, LoadFlag.AXIAL_FORCE_NOT_FINITE),
    ])
    def test_load_not_finite(self, moment, force, flag):
        result = section_bending([0.05], [0.0], [200e9], moment, axial_force=force)
        assert result.part_flags[0] == flag
        assert not result.valid[0]
        assert np.isnan(result.sum_ei[0])

    def test_shape_errors_name_the_input(self):
        with pytest.raises(ValueError, match="moment must hold one value or one per part"):
            section_bending([[0.05], [0.06]], [[0.0], [0.0]], [[2e11], [2e11]], [1.0, 2.0, 3.0])


@st.composite
def parts(draw):
    n = draw(st.integers(1, 4))
    core = draw(st.floats(0.005, 0.3, **finite))
    bore = draw(st.one_of(st.just(0.0), st.floats(0.05, 0.9, **finite))) * core
    outer = [core]
    for wall in draw(st.lists(st.floats(0.0005, 0.05, **finite), min_size=n - 1,
                              max_size=n - 1)):
        outer.append(outer[-1] + 2 * wall)
    inner = [bore] + outer[:-1]
    modulus = draw(st.lists(st.floats(5e9, 400e9, **finite), min_size=n, max_size=n))
    return outer, inner, modulus


@SETTINGS
@given(st.lists(parts(), min_size=2, max_size=5), st.data())
def test_one_part_alone_equals_the_same_part_in_a_batch(batch, data):
    """A part's result does not depend on the other parts of its batch."""
    width = max(len(p[0]) for p in batch)

    def padded(values):
        return list(values) + [np.nan] * (width - len(values))

    outer = [padded(p[0]) for p in batch]
    inner = [padded(p[1]) for p in batch]
    modulus = [padded(p[2]) for p in batch]
    moments = data.draw(st.lists(st.floats(-1e5, 1e5, **finite), min_size=len(batch),
                                 max_size=len(batch)))
    together = section_bending(outer, inner, modulus, moments)
    pick = data.draw(st.integers(0, len(batch) - 1))
    alone = section_bending(*batch[pick], moments[pick])
    n = len(batch[pick][0])
    np.testing.assert_array_equal(alone.bending_outer[0], together.bending_outer[pick, :n])
    np.testing.assert_array_equal(alone.sum_ei, together.sum_ei[pick:pick + 1])


@SETTINGS
@given(parts(), st.floats(1.0, 1e5, **finite), st.floats(0.1, 10.0, **finite))
def test_stress_is_linear_in_the_moment(part, moment, scale):
    """Linear elasticity: scaling M scales every bending stress alike."""
    once = section_bending(*part, moment)
    scaled = section_bending(*part, moment * scale)
    np.testing.assert_allclose(scaled.bending_outer, once.bending_outer * scale, rtol=1e-12)


class TestSectionBendingEdges:
    """section_bending's per-layer and summed stiffness by the textbook forms
    (I = pi/64 (Do^4 - Di^4), A = pi/4 (Do^2 - Di^2)), and its rules at their edges."""

    DO, DI, E = [[0.040, 0.050]], [[0.0, 0.040]], [[207e9, 110e9]]

    def test_each_layers_ei_and_the_sums(self):
        got = section_bending(self.DO, self.DI, self.E, 500.0, 2000.0)
        ei = [self.E[0][i] * math.pi / 64 * (self.DO[0][i] ** 4 - self.DI[0][i] ** 4) for i in range(2)]
        ea = [self.E[0][i] * math.pi / 4 * (self.DO[0][i] ** 2 - self.DI[0][i] ** 2) for i in range(2)]
        np.testing.assert_allclose(got.ei[0], ei, rtol=1e-12)
        assert got.sum_ei[0] == pytest.approx(sum(ei), rel=1e-12)
        assert got.sum_ea[0] == pytest.approx(sum(ea), rel=1e-12)
        assert got.n_parts == 1

    def test_an_absent_slot_and_an_unusable_part_beside_a_good_one(self):
        got = section_bending([[0.040, 0.050], [0.040, 0.050]], [[0.0, 0.040], [0.0, 0.040]],
                              [[207e9, 110e9], [-1.0, 110e9]], 500.0, 2000.0,
                              present=[[True, False], [True, True]])
        assert got.sum_ei[0] == pytest.approx(207e9 * math.pi / 64 * 0.040**4, rel=1e-12)
        assert got.sum_ea[0] == pytest.approx(207e9 * math.pi / 4 * 0.040**2, rel=1e-12)
        assert np.isnan(got.sum_ei[1]) and np.isnan(got.sum_ea[1])
        assert bool(got.valid[0]) and not bool(got.valid[1]) and got.n_parts == 2

    def test_any_positive_modulus_is_one_and_infinity_is_not(self):
        assert bool(section_bending([[0.04]], [[0.0]], [[0.5]], 1.0).valid[0])
        got = section_bending([[0.04]], [[0.0]], [[np.inf]], 1.0)
        assert int(got.part_flags[0]) & int(LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE) and not bool(got.valid[0])

    def test_a_part_without_axial_force_beside_one_with_it(self):
        # The normal stress is the bending stress with the axial stress's sign; no force: +.
        got = section_bending([[0.04], [0.04]], [[0.0], [0.0]], [[207e9], [207e9]], 500.0, [-5000.0, 0.0])
        bending = 32 * 500.0 / (math.pi * 0.04**3)  # M c / I of a solid bar
        assert got.axial[1, 0] == 0.0
        assert got.normal_outer[1, 0] == pytest.approx(bending, rel=1e-12)
        assert got.normal_outer[0, 0] == pytest.approx(-(bending + 5000.0 / (math.pi / 4 * 0.04**2)), rel=1e-12)

    def test_no_axial_force_anywhere(self):
        got = section_bending([[0.04]], [[0.0]], [[207e9]], 500.0)
        assert got.axial.tolist() == [[0.0]]
        assert got.normal_outer[0, 0] == got.bending_outer[0, 0]

    def test_axial_force_of_the_wrong_length_is_named(self):
        with pytest.raises(ValueError) as error:
            section_bending([[0.04], [0.04]], [[0.0], [0.0]], [[207e9], [207e9]], 500.0, [1.0, 2.0, 3.0])
        assert str(error.value) == "axial_force must hold one value or one per part (2); got shape (3,)"

    def test_the_result_is_frozen_and_the_area_of_a_solid_is_the_default(self):
        got = section_bending([[0.04]], [[0.0]], [[207e9]], 500.0)
        with pytest.raises(AttributeError):
            got.sum_ei = None  # type: ignore[misc]
        assert section_area(0.05) == pytest.approx(math.pi / 4 * 0.05**2, rel=1e-15)
