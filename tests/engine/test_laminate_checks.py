"""Classical lamination theory beyond the balanced cases: unbalanced walls, plies left out, the ply rules
at their edges, the ply library's data.

Oracles:
- the transformed reduced stiffness written out from A. K. Kaw, Mechanics of Composite Materials
  (2nd ed.), eqs. (2.104) (Qbar in terms of Q and the ply angle), from memory, and the laminate's
  compliance a = A^-1 by numpy.linalg.inv (an independent numerical method in place of the module's
  closed-form 3 x 3 inverse); effective moduli E_x = 1/(t a11), E_y = 1/(t a22), G_xy = 1/(t a66),
  nu_xy = -a12/a11 (Kaw §4.6, from memory);
- ply data: Kaw's table of typical lamina properties (graphite/epoxy T300/5208: E1 181 GPa,
  E2 10.3 GPa, G12 7.17 GPa, nu12 0.28, specific gravity 1.59; glass/epoxy: E1 38.6 GPa, E2 8.27 GPa,
  G12 4.14 GPa, nu12 0.26, specific gravity 1.8), from memory; a cured prepreg ply of 0.125 mm
  (0.005 in) is common practice; the standard-modulus set is the ply data the materials library's
  wound tube states in its source text (parsed from it here);
- the ply rules as the module states them: moduli and thickness positive and finite,
  nu12^2 E2 / E1 below 1 (positive-definite Q).
"""

from __future__ import annotations

import dataclasses
import math
import re

import numpy as np
import pytest
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

GPA = 1e9
E1, E2, G12, NU12 = 181 * GPA, 10.3 * GPA, 7.17 * GPA, 0.28  # Kaw, graphite/epoxy, from memory


def _qbar(e1, e2, g12, nu12, theta):
    """Kaw eqs. (2.104), written out."""
    nu21 = nu12 * e2 / e1
    q11, q22 = e1 / (1 - nu12 * nu21), e2 / (1 - nu12 * nu21)
    q12, q66 = nu12 * q22, g12
    c, s = math.cos(theta), math.sin(theta)
    return np.array([
        [q11 * c**4 + q22 * s**4 + 2 * (q12 + 2 * q66) * s**2 * c**2,
         (q11 + q22 - 4 * q66) * s**2 * c**2 + q12 * (c**4 + s**4),
         (q11 - q12 - 2 * q66) * c**3 * s - (q22 - q12 - 2 * q66) * s**3 * c],
        [0.0, q11 * s**4 + q22 * c**4 + 2 * (q12 + 2 * q66) * s**2 * c**2,
         (q11 - q12 - 2 * q66) * c * s**3 - (q22 - q12 - 2 * q66) * c**3 * s],
        [0.0, 0.0, (q11 + q22 - 2 * q12 - 2 * q66) * s**2 * c**2 + q66 * (s**4 + c**4)],
    ])


def _by_hand(angles_deg, thicknesses, plies=None):
    plies = plies or [(E1, E2, G12, NU12)] * len(angles_deg)
    a = np.zeros((3, 3))
    for deg, t, ply in zip(angles_deg, thicknesses, plies):
        q = _qbar(*ply, math.radians(deg))
        a += (np.triu(q) + np.triu(q, 1).T) * t
    t = sum(thicknesses)
    inv = np.linalg.inv(a)
    return a, dict(axial=1 / (t * inv[0, 0]), hoop=1 / (t * inv[1, 1]), shear_free=1 / (t * inv[2, 2]),
                   nu=-inv[0, 1] / inv[0, 0], shear=a[2, 2] / t, thickness=t)


def _check(got, a, hand, rel=1e-10):
    np.testing.assert_allclose(got.extensional[0], a, rtol=rel, atol=rel * np.abs(a).max())
    assert got.axial_modulus[0] == pytest.approx(hand["axial"], rel=rel)
    assert got.hoop_modulus[0] == pytest.approx(hand["hoop"], rel=rel)
    assert got.shear_modulus_unrestrained[0] == pytest.approx(hand["shear_free"], rel=rel)
    assert got.shear_modulus[0] == pytest.approx(hand["shear"], rel=rel)
    assert got.poisson_ratio[0] == pytest.approx(hand["nu"], rel=rel)
    assert got.thickness[0] == pytest.approx(hand["thickness"], rel=1e-15)


def test_an_unbalanced_wall_by_numerical_inversion():
    angles, t = [30.0, 0.0, -60.0], [0.125e-3, 0.25e-3, 0.125e-3]
    got = laminate_moduli(E1, E2, G12, NU12, t, np.radians([angles]))
    a, hand = _by_hand(angles, t)
    assert abs(a[0, 2]) > 1e-3 * a[0, 0] and abs(a[1, 2]) > 1e-3 * a[0, 0]  # both couplings present
    _check(got, a, hand)
    assert got.flags[0] == int(PlyFlag.UNBALANCED) and got.valid[0]
    # unbalanced: the free shear modulus is below A66/t (the couplings relax it)
    assert got.shear_modulus_unrestrained[0] < got.shear_modulus[0]


@pytest.mark.parametrize("zeroed", [1, 2])  # A26 cancelled (A16 left), then A16 cancelled (A26 left)
def test_one_coupling_alone_makes_a_wall_unbalanced(zeroed):
    # +th1 and -th2 plies, the second thickness chosen so that one coupling term cancels exactly
    th1, th2, t1 = 20.0, 55.0, 0.125e-3
    row = 0 if zeroed == 2 else 1  # the coupling cancelled: A16 (row x) or A26 (row y)
    t2 = t1 * _qbar(E1, E2, G12, NU12, math.radians(th1))[row, 2] / _qbar(E1, E2, G12, NU12, math.radians(th2))[row, 2]
    assert t2 > 0
    a, hand = _by_hand([th1, -th2], [t1, t2])
    assert abs(a[row, 2]) < 1e-12 * a[0, 0] and abs(a[1 - row, 2]) > 1e-3 * a[0, 0]
    got = laminate_moduli(E1, E2, G12, NU12, [t1, t2], np.radians([[th1, -th2]]))
    assert got.flags[0] == int(PlyFlag.UNBALANCED)
    _check(got, a, hand, rel=1e-9)


def test_a_ply_left_out_is_not_counted_whatever_its_slot_holds():
    t = 0.125e-3
    full = laminate_moduli(E1, E2, G12, NU12, t, np.radians([[45.0, -45.0, 0.0]]),
                           present=[[True, True, False]])
    two = laminate_moduli(E1, E2, G12, NU12, t, np.radians([[45.0, -45.0]]))
    for item in dataclasses.fields(two):
        np.testing.assert_allclose(getattr(full, item.name), getattr(two, item.name), rtol=1e-15, err_msg=item.name)
    assert full.thickness[0] == pytest.approx(2 * t, rel=1e-15)


@pytest.mark.parametrize(("e1", "e2", "g12", "nu12", "t", "flag"), [
    (0.5, 0.5, 0.5, 0.3, 1e-4, 0),  # tiny but positive moduli: valid
    (math.inf, E2, G12, NU12, 1e-4, PlyFlag.MODULUS_NOT_POSITIVE),
    (E1, E2, math.inf, NU12, 1e-4, PlyFlag.MODULUS_NOT_POSITIVE),
    (E1, E2, G12, NU12, math.inf, PlyFlag.THICKNESS_NOT_POSITIVE),
    (10 * GPA, 40 * GPA, G12, 0.3, 1e-4, 0),  # E2 > E1 is allowed: 0.09 * 4 = 0.36 < 1
    (10 * GPA, 40 * GPA, G12, 0.5, 1e-4, PlyFlag.POISSON_OUT_OF_RANGE),  # 0.25 * 4 = 1: not below 1
])
def test_ply_rules_at_their_edges(e1, e2, g12, nu12, t, flag):
    assert int(ply_flags(e1, e2, g12, nu12, t)) == int(flag)
    q = reduced_stiffness(e1, e2, g12, nu12)
    assert bool(np.isnan(q).all()) == (flag not in (0, PlyFlag.THICKNESS_NOT_POSITIVE))


def test_bad_plies_give_nan_stiffness_elementwise():
    e1 = np.array([E1, -1.0, E1])
    q = reduced_stiffness(e1, E2, G12, NU12)
    qbar = transformed_stiffness(e1, E2, G12, NU12, np.radians([0.0, 30.0, 30.0]))
    for m in (q, qbar):
        assert m.shape == (3, 3, 3)
        assert np.isnan(m[1]).all() and np.isfinite(m[[0, 2]]).all()
    np.testing.assert_allclose(qbar[2], np.triu(_qbar(E1, E2, G12, NU12, math.radians(30))) +
                               np.triu(_qbar(E1, E2, G12, NU12, math.radians(30)), 1).T, rtol=1e-12)


@pytest.mark.parametrize(("field", "value"), [("e1", 0.0), ("g12", 0.0), ("thickness", 0.0), ("density", -1.0)])
def test_a_ply_set_with_a_value_not_positive_is_refused_in_words(field, value):
    kw = dict(e1=E1, e2=E2, g12=G12, nu12=NU12, thickness=0.125e-3, density=1600.0)
    kw[field] = value
    with pytest.raises(ValueError) as caught:
        PlySet("Trial ply", **kw)
    assert str(caught.value) == f"ply set 'Trial ply': {field} must be a positive finite number; got {value!r}"


def test_ply_set_rules():
    kw = dict(e1=10 * GPA, e2=40 * GPA, g12=G12, thickness=0.125e-3, density=1600.0)
    assert PlySet("Hoop-stiff", nu12=0.3, **kw).nu12 == 0.3  # E2 > E1 allowed while nu^2 E2/E1 < 1
    assert type(PlySet("Integer nu", nu12=0, **kw).nu12) is float
    with pytest.raises(ValueError) as caught:
        PlySet("Edge", nu12=0.5, **kw)  # 0.25 * 4 = 1: not below 1
    assert str(caught.value) == "ply set 'Edge': nu12 must be finite with nu12^2 * E2 / E1 below 1; got nu12 = 0.5"
    for name in ("   ", 7):
        with pytest.raises(ValueError) as caught:
            PlySet(name, nu12=0.3, **kw)
        assert str(caught.value) == f"PlySet.name must be a non-blank string; got {name!r}"


def _stated_ply_data():
    """E1, E2, G12 (Pa), nu12 as the materials library's wound tube states them in its source text."""
    text = material_library()["Carbon/epoxy tube 45 wound"].sources["shear_modulus"]
    found = dict(re.findall(r"(E1|E2|G12|nu12) ([0-9.]+)", text))
    return (float(found["E1"]) * GPA, float(found["E2"]) * GPA, float(found["G12"]) * GPA, float(found["nu12"]))


TEXTBOOK = ("typical unidirectional lamina values as tabulated in composites textbooks (e.g. A. K. Kaw, Mechanics "
            "of Composite Materials, table of typical lamina properties), from memory")
NOTE = "Typical values, not a specification: use the supplier's cured-ply data."


def test_the_ply_library_against_its_sources():
    lib = ply_library()
    assert list(lib) == ["Carbon/epoxy T300/5208-like", "Carbon/epoxy standard modulus", "Glass/epoxy E-glass"]
    expected = {
        # name: (E1, E2, G12, nu12, density from the specific gravity rounded to 50 kg/m^3, source)
        "Carbon/epoxy T300/5208-like": (181 * GPA, 10.3 * GPA, 7.17 * GPA, 0.28, round(1.59e3 / 50) * 50.0,
                                        TEXTBOOK + " (graphite/epoxy, fibre volume about 70 %)"),
        "Carbon/epoxy standard modulus": (*_stated_ply_data(), material_library()["Carbon/epoxy tube 45 wound"].density,
                                          "typical standard-modulus carbon/epoxy ply at about 60 % fibre volume (the "
                                          "ply data of the materials library's wound carbon tube), from memory"),
        "Glass/epoxy E-glass": (38.6 * GPA, 8.27 * GPA, 4.14 * GPA, 0.26, round(1.8e3 / 50) * 50.0,
                                TEXTBOOK + " (E-glass/epoxy, fibre volume about 45 %)"),
    }
    for name, (e1, e2, g12, nu12, rho, source) in expected.items():
        ply = lib[name]
        assert (ply.e1, ply.e2, ply.g12, ply.nu12) == pytest.approx((e1, e2, g12, nu12), rel=1e-12), name
        assert ply.density == rho, name
        assert ply.thickness == pytest.approx(0.125e-3, rel=1e-12), name  # common practice: a 0.005 in ply
        # the provenance is shown to users in a wound layer's library finding: the wording is the spec
        assert ply.source == source, name
        assert ply.note == NOTE, name


def test_the_moduli_record_cannot_be_changed():
    got = laminate_moduli(E1, E2, G12, NU12, 0.125e-3, np.radians([[45.0, -45.0]]))
    with pytest.raises(dataclasses.FrozenInstanceError):
        got.shear_modulus = np.zeros(1)


def test_a_ply_set_of_the_user_s_own_carries_no_provenance_until_given():
    # a finding quotes a ply set's source and note: one the user defines has none to quote
    ply = PlySet("Own ply", e1=E1, e2=E2, g12=G12, nu12=NU12, thickness=0.125e-3, density=1600.0)
    assert (ply.source, ply.note) == ("", "")


def test_angles_and_ply_data_of_the_wrong_shape_are_refused_in_words():
    with pytest.raises(ValueError) as caught:
        laminate_moduli(E1, E2, G12, NU12, 0.125e-3, np.zeros((1, 2, 2)))
    assert str(caught.value) == "angles must be (laminates, plies); got shape (1, 2, 2)"
    with pytest.raises(ValueError) as caught:
        laminate_moduli([E1, E1, E1], E2, G12, NU12, 0.125e-3, np.zeros((2, 2)))
    assert str(caught.value) == "ply data do not broadcast against the angles of shape (2, 2)"
