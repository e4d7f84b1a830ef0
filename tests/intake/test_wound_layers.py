"""A materials row describing a fibre-wound layer (`_wound_layers.wound_layer`): which inputs it
needs, the refusals' key facts, and the moduli against classical lamination theory written out
by hand (the reduced stiffnesses Q11 = E1/(1 - ν12 ν21), Q22 = E2/(1 - ν12 ν21),
Q12 = ν12 E2/(1 - ν12 ν21), Q66 = G12 and their rotation to ±45°, as in any composites text,
e.g. Jones, Mechanics of Composite Materials, ch. 2 and 4)."""

from __future__ import annotations

import math

import pytest
from twistshare.engine.core import ply_library
from twistshare.engine.intake._wound_layers import wound_layer

E1, E2, G12, NU12, T = 140e9, 10e9, 5e9, 0.3, 0.125e-3
PLY = {"ply_e1": E1, "ply_e2": E2, "ply_g12": G12, "ply_nu12": NU12, "ply_thickness": T}


def q(e1=E1, e2=E2, g12=G12, nu12=NU12):
    d = 1 - nu12 * nu12 * e2 / e1
    return e1 / d, e2 / d, nu12 * e2 / d, g12


def pm45(e1=E1, e2=E2, g12=G12, nu12=NU12):
    """G and E of a balanced symmetric [±45] laminate (per unit thickness, every ply alike)."""
    q11, q22, q12, q66 = q(e1, e2, g12, nu12)
    a11 = (q11 + q22 + 2 * q12 + 4 * q66) / 4  # = A22 at 45°
    a12 = (q11 + q22 + 2 * q12 - 4 * q66) / 4
    g = (q11 + q22 - 2 * q12) / 4
    e = (a11 * a11 - a12 * a12) / a11
    return g, e, a12 / a11


def test_no_ply_data_and_no_layup_is_not_a_wound_layer():
    assert wound_layer("steel", {}, None, None) is None
    assert wound_layer("steel", {"ply_e1": math.nan}, None, None) is None


def test_ply_data_without_layup():
    got = wound_layer("tube", {"ply_e1": E1}, None, None)
    assert got.field == "layup"
    assert got.problem == "material 'tube': ply data are given but no layup: give the layup, e.g. '[±45]s'"
    got = wound_layer("tube", {}, None, "Glass/epoxy E-glass")
    assert got.field == "layup" and "no layup" in got.problem


def test_bad_layup_notation_names_the_material():
    got = wound_layer("tube", PLY, "[45/", None)
    assert got.field == "layup" and got.problem.startswith("material 'tube': ")
    assert math.isnan(got.shear_modulus)


def test_zero_degree_plies_give_the_ply_moduli():
    got = wound_layer("tube", PLY, "[0]", None)
    assert got.problem is None and got.field is None
    assert got.shear_modulus == pytest.approx(G12, rel=1e-9)
    assert got.youngs_modulus == pytest.approx(E1, rel=1e-9)
    assert got.poisson_ratio == pytest.approx(NU12, rel=1e-9)
    assert math.isnan(got.density)


def test_plus_minus_45_against_the_hand_formula():
    got = wound_layer("tube", PLY, "[±45]s", None)
    g, e, nu = pm45()
    assert got.shear_modulus == pytest.approx(g, rel=1e-9)
    assert got.youngs_modulus == pytest.approx(e, rel=1e-9)
    assert got.poisson_ratio == pytest.approx(nu, rel=1e-9)
    assert got.note == (f"material 'tube': G = {g / 1e9:.4g} GPa (A66/t, torsion) and E = {e / 1e9:.4g} GPa "
                        "(1/(t·a11), bending) from classical lamination theory: layup [±45]s (4 plies), "
                        "the row's ply data")


def test_a_ply_set_of_the_library_by_its_name_in_any_case():
    name = "Glass/epoxy E-glass"
    ply = ply_library()[name]
    got = wound_layer("tube", {}, "[±45]s", "  glass/EPOXY   e-glass ")
    g, e, _ = pm45(ply.e1, ply.e2, ply.g12, ply.nu12)
    assert got.shear_modulus == pytest.approx(g, rel=1e-9)
    assert got.youngs_modulus == pytest.approx(e, rel=1e-9)
    assert got.density == ply.density
    assert got.note.endswith(f"ply set {name!r} ({ply.source})")


def test_row_values_override_the_ply_set():
    name = "Glass/epoxy E-glass"
    ply = ply_library()[name]
    got = wound_layer("tube", {"ply_g12": 6e9, "ply_e1": math.nan}, "[±45]s", name)
    g, _, _ = pm45(ply.e1, ply.e2, 6e9, ply.nu12)
    assert got.shear_modulus == pytest.approx(g, rel=1e-9)
    got0 = wound_layer("tube", {"ply_g12": 6e9}, "[0]", name)
    assert got0.shear_modulus == pytest.approx(6e9, rel=1e-9)
    assert got0.youngs_modulus == pytest.approx(ply.e1, rel=1e-9)


def test_unknown_ply_set_lists_the_library():
    got = wound_layer("tube", {}, "[0]", "kevlar")
    assert got.field == "ply_set"
    assert got.problem.startswith("material 'tube': ply set 'kevlar' is not in the ply library (")
    for name in ply_library():
        assert repr(name) in got.problem


def test_missing_ply_data_named_in_order_and_the_first_one_is_the_field():
    got = wound_layer("tube", {"ply_e1": E1, "ply_nu12": NU12}, "[0]", None)
    assert got.field == "ply_e2"
    assert got.problem == ("material 'tube': a layup is given but not the ply data Ply E2, Ply G12, "
                           "Ply thickness: give them or name a ply set")
    got = wound_layer("tube", {k: v for k, v in PLY.items() if k != "ply_thickness"}, "[0]", None)
    assert got.field == "ply_thickness" and "ply data Ply thickness:" in got.problem
    got = wound_layer("tube", {}, "[0]", None)
    assert got.field == "ply_e1" and "Ply E1, Ply E2, Ply G12, Ply nu12, Ply thickness" in got.problem


def test_ply_data_that_make_no_laminate():
    # ν12 ν21 = ν12² E2/E1 > 1: the reduced stiffness has no positive denominator
    got = wound_layer("tube", dict(PLY, ply_nu12=5.0, ply_e2=E1), "[0]", None)
    assert got.field == "ply_e1"
    assert got.problem == "material 'tube': the ply data cannot make a laminate (check E1, E2, G12 and nu12)"


def test_a_refused_row_has_no_moduli_and_no_note():
    for got in (wound_layer("tube", {"ply_e1": E1}, None, None), wound_layer("tube", {}, "[0]", "kevlar"),
                wound_layer("tube", {}, "[0]", None)):
        assert math.isnan(got.shear_modulus) and math.isnan(got.youngs_modulus)
        assert math.isnan(got.poisson_ratio) and math.isnan(got.density)
        assert got.note is None and got.problem


def test_unknown_ply_set_message_in_full():
    got = wound_layer("tube", {}, "[0]", "kevlar")
    choices = ", ".join(repr(n) for n in ply_library())
    assert got.problem == f"material 'tube': ply set 'kevlar' is not in the ply library ({choices})"
