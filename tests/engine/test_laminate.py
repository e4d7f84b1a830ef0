"""Classical lamination theory: Q, Qbar(theta), A and the tube's effective moduli."""

import dataclasses
import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._laminate as laminate_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    PlyFlag,
    PlySet,
    laminate_moduli,
    material_library,
    ply_flags,
    ply_library,
    reduced_stiffness,
    transformed_stiffness,
)

SETTINGS = settings(max_examples=100, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)
GPA = 1e9

# A T300/5208-like graphite/epoxy ply (E1 181, E2 10.3, G12 7.17 GPa, nu12 0.28; typical
# textbook values, from memory): the library's entry of that name.
T300 = ply_library()["Carbon/epoxy T300/5208-like"]
PLY = (T300.e1, T300.e2, T300.g12, T300.nu12)


def _hand_q():
    """Q by hand: nu21 = 0.28 * 10.3 / 181 = 0.015934, 1 - nu12 nu21 = 0.995539."""
    d = 1 - 0.28 * (0.28 * 10.3 / 181)
    return 181 * GPA / d, 10.3 * GPA / d, 0.28 * 10.3 * GPA / d, 7.17 * GPA


def _moduli(angles_deg, ply=T300):
    return laminate_moduli(ply.e1, ply.e2, ply.g12, ply.nu12, ply.thickness,
                           np.radians(angles_deg))


def test_docstring_examples():
    assert doctest.testmod(laminate_module).failed == 0


class TestPlyStiffness:
    def test_reduced_stiffness_worked_example(self):
        """Kaw, Mechanics of Composite Materials, worked example of a graphite/epoxy lamina
        (from memory): Q11 181.8, Q12 2.897, Q22 10.35, Q66 7.17 GPa; rtol 5e-4."""
        q = reduced_stiffness(*PLY) / GPA
        assert q[0, 0] == pytest.approx(181.8, rel=5e-4)
        assert q[0, 1] == q[1, 0] == pytest.approx(2.897, rel=5e-4)
        assert q[1, 1] == pytest.approx(10.35, rel=5e-4)
        assert q[2, 2] == pytest.approx(7.17, rel=1e-12)
        assert q[0, 2] == q[1, 2] == 0.0

    def test_transformed_stiffness_worked_example(self):
        """Kaw, worked example of the same lamina at 60 deg (from memory), in GPa:
        [[23.65, 32.46, 20.05], [32.46, 109.4, 54.19], [20.05, 54.19, 36.74]]; rtol 5e-4."""
        expected = np.array([[23.65, 32.46, 20.05], [32.46, 109.4, 54.19],
                             [20.05, 54.19, 36.74]])
        got = transformed_stiffness(*PLY, math.radians(60)) / GPA
        np.testing.assert_allclose(got, expected, rtol=5e-4)

    @SETTINGS
    @given(st.floats(-math.pi, math.pi, **finite))
    def test_rotation_by_reuter_matrices(self, theta):
        """Jones, Mechanics of Composite Materials, ch. 2: Qbar = T^-1 Q R T R^-1 with the
        stress transformation T and Reuter's matrix R = diag(1, 1, 2); matrix products by
        numpy (a second formulation of the same rotation); rtol 1e-10."""
        c, s = math.cos(theta), math.sin(theta)
        t = np.array([[c * c, s * s, 2 * s * c], [s * s, c * c, -2 * s * c],
                      [-s * c, s * c, c * c - s * s]])
        r = np.diag([1.0, 1.0, 2.0])
        q = reduced_stiffness(*PLY)
        expected = np.linalg.inv(t) @ q @ r @ t @ np.linalg.inv(r)
        got = transformed_stiffness(*PLY, theta)
        np.testing.assert_allclose(got, expected, rtol=1e-10, atol=1e-6 * q[0, 0])


class TestLaminates:
    def test_plus_minus_45_symmetric(self):
        """[+-45]s by hand: Qbar at 45 deg has Qbar11 = Qbar22 = (Q11 + Q22 + 2 Q12 + 4 Q66)/4,
        Qbar12 = (Q11 + Q22 + 2 Q12 - 4 Q66)/4, Qbar66 = (Q11 + Q22 - 2 Q12)/4 and
        Qbar16 = +-(Q11 - Q22)/4, which cancel between +45 and -45 (hand derivation from
        c = s = 1/sqrt 2). Numbers: Q11 181.81, Q22 10.346, Q12 2.897, Q66 7.17 GPa give
        A/t = 56.66, 42.32, 46.59 GPa; Gxy = Qbar66 = 46.59 GPa."""
        q11, q22, q12, q66 = _hand_q()
        plus = transformed_stiffness(*PLY, math.radians(45))
        assert plus[0, 0] == pytest.approx((q11 + q22 + 2 * q12 + 4 * q66) / 4, rel=1e-12)
        assert plus[0, 1] == pytest.approx((q11 + q22 + 2 * q12 - 4 * q66) / 4, rel=1e-12)
        assert plus[2, 2] == pytest.approx((q11 + q22 - 2 * q12) / 4, rel=1e-12)
        assert plus[0, 2] == pytest.approx((q11 - q22) / 4, rel=1e-12)
        result = _moduli([45, -45, -45, 45])
        a_t = result.extensional[0] / result.thickness[0] / GPA
        assert a_t[0, 0] == pytest.approx(56.66, rel=2e-4)
        assert a_t[1, 1] == pytest.approx(56.66, rel=2e-4)
        assert a_t[0, 1] == pytest.approx(42.32, rel=2e-4)
        assert abs(a_t[0, 2]) < 1e-9 and abs(a_t[1, 2]) < 1e-9
        assert result.shear_modulus[0] == pytest.approx((q11 + q22 - 2 * q12) / 4, rel=1e-12)
        assert result.shear_modulus[0] / GPA == pytest.approx(46.59, rel=2e-4)
        assert result.flags[0] == 0

    def test_cross_ply_symmetric(self):
        """[0/90]s by hand: A/t = [[(Q11+Q22)/2, Q12, 0], [Q12, (Q11+Q22)/2, 0], [0, 0, Q66]]
        = [[96.08, 2.897, 0], [2.897, 96.08, 0], [0, 0, 7.17]] GPa; Gxy = G12 and
        Ex = (Q11+Q22)/2 - Q12^2 / ((Q11+Q22)/2) = 95.99 GPa."""
        q11, q22, q12, q66 = _hand_q()
        result = _moduli([0, 90, 90, 0])
        a_t = result.extensional[0] / result.thickness[0]
        mean = (q11 + q22) / 2
        np.testing.assert_allclose(a_t, [[mean, q12, 0], [q12, mean, 0], [0, 0, q66]],
                                   rtol=1e-12, atol=1e-6 * q11)
        assert mean / GPA == pytest.approx(96.08, rel=2e-4)
        assert result.shear_modulus[0] == pytest.approx(T300.g12, rel=1e-12)
        assert result.axial_modulus[0] == pytest.approx(mean - q12**2 / mean, rel=1e-12)
        assert result.axial_modulus[0] / GPA == pytest.approx(95.99, rel=2e-4)

    @pytest.mark.parametrize("ply", list(ply_library().values()), ids=lambda p: p.name)
    def test_all_zero_plies_give_the_ply_moduli(self, ply):
        """A unidirectional laminate is the ply: Ex = E1, Ey = E2, Gxy = G12, nu_xy = nu12
        (definition of the engineering constants, Jones ch. 2); rtol 1e-12."""
        result = _moduli([0, 0, 0], ply)
        assert result.axial_modulus[0] == pytest.approx(ply.e1, rel=1e-12)
        assert result.hoop_modulus[0] == pytest.approx(ply.e2, rel=1e-12)
        assert result.shear_modulus[0] == pytest.approx(ply.g12, rel=1e-12)
        assert result.poisson_ratio[0] == pytest.approx(ply.nu12, rel=1e-12)
        assert result.thickness[0] == pytest.approx(3 * ply.thickness, rel=1e-12)
        hoop = _moduli([90, 90], ply)
        assert hoop.axial_modulus[0] == pytest.approx(ply.e2, rel=1e-12)

    def test_quasi_isotropic_layup_is_isotropic_in_plane(self):
        """[0/+-45/90]s is quasi-isotropic (Tsai and Pagano's invariants; Jones ch. 4):
        A11 = A22, A16 = A26 = 0, A66 = (A11 - A12)/2, so Gxy = Ex / (2 (1 + nu_xy))."""
        result = _moduli([0, 45, -45, 90, 90, -45, 45, 0])
        a = result.extensional[0]
        assert a[0, 0] == pytest.approx(a[1, 1], rel=1e-12)
        assert a[2, 2] == pytest.approx((a[0, 0] - a[0, 1]) / 2, rel=1e-12)
        assert result.shear_modulus[0] == pytest.approx(
            result.axial_modulus[0] / (2 * (1 + result.poisson_ratio[0])), rel=1e-12)

    def test_library_tube_matches_its_stated_ply_data(self):
        """The materials library's wound carbon tube says it is a +-45 laminate of the
        standard-modulus ply set (E1 135, E2 10, G12 5 GPa, nu12 0.3). At 45 degrees
        m^4 = n^4 = m^2 n^2 = 1/4 in the transformed stiffnesses (Jones, Mechanics of Composite
        Materials, eq. 2.85), so for the balanced +-45 wall
        Q66' = (Q11 + Q22 - 2 Q12)/4, Q11' = (Q11 + Q22 + 2 Q12 + 4 Q66)/4,
        Q12' = (Q11 + Q22 - 4 Q66)/4 + Q12/2, Ex = Q11' - Q12'^2/Q11', nu_xy = Q12'/Q11'.
        The library states 35.0 GPa, 17.7 GPa and 0.77: tolerance half a unit of the last
        digit (0.05 GPa, 0.05 GPa, 0.005); CLT itself to rtol 1e-12."""
        e1, e2, g12, nu12 = 135e9, 10e9, 5e9, 0.3
        d = 1 - nu12 * nu12 * e2 / e1
        q11, q22, q12, q66 = e1 / d, e2 / d, nu12 * e2 / d, g12
        gxy = (q11 + q22 - 2 * q12) / 4
        qb11 = (q11 + q22 + 2 * q12 + 4 * q66) / 4
        qb12 = (q11 + q22 - 4 * q66) / 4 + q12 / 2
        ex, nuxy = qb11 - qb12**2 / qb11, qb12 / qb11
        result = _moduli([45, -45, -45, 45], ply_library()["Carbon/epoxy standard modulus"])
        assert result.shear_modulus[0] == pytest.approx(gxy, rel=1e-12)
        assert result.axial_modulus[0] == pytest.approx(ex, rel=1e-12)
        assert result.poisson_ratio[0] == pytest.approx(nuxy, rel=1e-12)
        tube = next(m for m in material_library().values() if "carbon" in m.name.lower())
        assert tube.shear_modulus == pytest.approx(gxy, abs=0.05e9)
        assert tube.youngs_modulus == pytest.approx(ex, abs=0.05e9)
        assert tube.poisson_ratio == pytest.approx(nuxy, abs=0.005)

    def test_unbalanced_layup_is_noted(self):
        result = _moduli([30, 30])
        assert result.flags[0] == PlyFlag.UNBALANCED
        assert result.valid[0]
        assert result.shear_modulus_unrestrained[0] < result.shear_modulus[0]

    def test_hybrid_wall_takes_per_ply_data(self):
        """Plies of two materials: A is the thickness-weighted sum of each ply's Qbar."""
        glass = ply_library()["Glass/epoxy E-glass"]
        e1 = [[T300.e1, glass.e1]]
        result = laminate_moduli(e1, [[T300.e2, glass.e2]], [[T300.g12, glass.g12]],
                                 [[T300.nu12, glass.nu12]], [[T300.thickness, 2 * glass.thickness]],
                                 np.radians([[0.0, 90.0]]))
        expected = (reduced_stiffness(*PLY) * T300.thickness
                    + transformed_stiffness(glass.e1, glass.e2, glass.g12, glass.nu12,
                                            math.pi / 2) * 2 * glass.thickness)
        np.testing.assert_allclose(result.extensional[0], expected, rtol=1e-12,
                                   atol=1e-9 * expected[0, 0])


class TestFlags:
    @pytest.mark.parametrize(("values", "flag"), [
        ((0.0, 10e9, 5e9, 0.3, 1e-4), PlyFlag.MODULUS_NOT_POSITIVE),
        ((135e9, 10e9, np.nan, 0.3, 1e-4), PlyFlag.MODULUS_NOT_POSITIVE),
        ((10e9, 135e9, 5e9, 0.3, 1e-4), PlyFlag.POISSON_OUT_OF_RANGE),
        ((135e9, 10e9, 5e9, 0.3, 0.0), PlyFlag.THICKNESS_NOT_POSITIVE),
    ])
    def test_bad_ply_data(self, values, flag):
        assert ply_flags(*values) == flag
        result = laminate_moduli(*values, np.radians([[0.0, 90.0], [0.0, 0.0]])[:1])
        assert result.flags[0] == flag and not result.valid[0]
        assert np.isnan(result.shear_modulus[0])

    def test_no_plies_and_infinite_angle(self):
        result = laminate_moduli(*PLY, T300.thickness, [[np.nan, np.nan], [0.0, np.inf]],
                                 present=[[False, False], [True, True]])
        assert result.flags[0] == PlyFlag.NO_PLIES
        assert result.flags[1] & PlyFlag.ANGLE_NOT_FINITE
        assert not result.valid.any()

    def test_ply_set_validation_names_the_field(self):
        with pytest.raises(ValueError, match="ply set 'X': g12 must be a positive finite"):
            PlySet("X", e1=135e9, e2=10e9, g12=-5e9, nu12=0.3, thickness=1e-4, density=1500)
        with pytest.raises(ValueError, match="nu12 must be finite"):
            PlySet("X", e1=10e9, e2=135e9, g12=5e9, nu12=0.3, thickness=1e-4, density=1500)

    def test_library_is_read_only_and_sourced(self):
        library = ply_library()
        with pytest.raises(TypeError):
            library["new"] = T300  # type: ignore[index]
        with pytest.raises(dataclasses.FrozenInstanceError):
            T300.e1 = 1.0  # type: ignore[misc]
        for ply in library.values():
            assert "from memory" in ply.source and "ypical" in (ply.source + ply.note)


angle_lists = st.lists(st.floats(-90.0, 90.0, **finite), min_size=1, max_size=8)


@SETTINGS
@given(st.floats(-180.0, 180.0, **finite))
def test_rotating_a_quasi_isotropic_layup_changes_nothing(shift):
    """In-plane isotropy of [0/+-45/90]s (Tsai and Pagano's invariants): A does not depend
    on the reference direction."""
    base = [0, 45, -45, 90, 90, -45, 45, 0]
    a0 = _moduli(base).extensional[0]
    a1 = _moduli([a + shift for a in base]).extensional[0]
    np.testing.assert_allclose(a1, a0, rtol=1e-9, atol=1e-9 * a0[0, 0])


@SETTINGS
@given(st.lists(angle_lists, min_size=2, max_size=5), st.data())
def test_one_laminate_alone_equals_the_same_laminate_in_a_batch(batch, data):
    width = max(len(angles) for angles in batch)
    padded = [angles + [np.nan] * (width - len(angles)) for angles in batch]
    together = _moduli(padded)
    pick = data.draw(st.integers(0, len(batch) - 1))
    alone = _moduli(batch[pick])
    np.testing.assert_allclose(alone.extensional[0], together.extensional[pick], rtol=1e-13,
                               atol=1e-12 * abs(together.extensional[pick][0, 0]))
    assert alone.flags[0] == together.flags[pick]


@SETTINGS
@given(angle_lists)
def test_mirror_balanced_layups_are_balanced(angles):
    """A layup with each +theta matched by -theta has A16 = A26 = 0 (Jones ch. 4)."""
    result = _moduli(angles + [-a for a in angles])
    assert result.flags[0] == 0
    assert result.shear_modulus_unrestrained[0] == pytest.approx(result.shear_modulus[0],
                                                                 rel=1e-6)
