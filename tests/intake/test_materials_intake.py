"""A material named by a part: found in the book's table, else completed from the built-in library.

Expected strengths are the library's cited handbook values (Shigley, Mechanical Engineering
Design, tables A-20/A-5 for the hot-rolled carbon steels; ASM typical values for 6061-T6) and
the shafting code rule min(0.30·Sy, 0.18·Su) worked by hand in each test (the classic
transmission-shafting code, common practice)."""

import math

import pytest
from twistshare.engine.core import AllowableRule
from twistshare.engine.intake._materials import MaterialSet
from twistshare.engine.intake._words import material_key


def test_a_library_steel_gets_the_shafting_code_allowable():
    # AISI 1045 hot rolled, Shigley A-20: Sy = 310 MPa, Su = 570 MPa
    # 0.30 * 310 = 93 MPa < 0.18 * 570 = 102.6 MPa -> 93 MPa
    got, problem = MaterialSet().lookup("AISI 1045 hot rolled")
    assert problem is None
    assert got.allowable_shear == pytest.approx(93e6, rel=1e-12)
    assert got.shear_modulus == pytest.approx(79.3e9)  # Shigley A-5, carbon steel
    assert got.youngs_modulus == pytest.approx(207e9)
    assert got.poisson_ratio == pytest.approx(0.292)
    assert got.yield_strength == pytest.approx(310e6)
    assert got.ultimate_strength == pytest.approx(570e6)
    assert got.expansion_coefficient == pytest.approx(11.7e-6)  # ASM, plain carbon steel
    assert got.density == pytest.approx(0.282 * 0.45359237 / 0.0254 ** 3)  # 0.282 lb/in^3, NIST SP 811
    assert got.rule is AllowableRule.SHAFTING_CODE
    assert got.keyway is False
    assert math.isnan(got.factor_of_safety)
    assert got.problem is None and got.allowable_problem is None
    assert "93 MPa" in got.note and "not in the materials table" in got.note
    assert "no keyway" in got.note


def test_the_ultimate_term_can_govern():
    # AISI 1020 hot rolled, Shigley A-20: Sy = 210, Su = 380 -> min(63, 68.4) = 63 MPa
    got, _ = MaterialSet().lookup("aisi 1020 HOT rolled")
    assert got.allowable_shear == pytest.approx(63e6, rel=1e-12)
    assert "63 MPa" in got.note


def test_a_library_non_steel_has_no_allowable_but_its_modulus_serves():
    name = "Aluminium 6061-T6"
    got, problem = MaterialSet().lookup(name)
    assert got is None
    assert repr(name) in problem and "no allowable" in problem
    got, problem = MaterialSet().lookup(name, need_allowable=False)
    assert problem is None
    assert got.shear_modulus == pytest.approx(26e9)  # ASM typical
    assert math.isnan(got.allowable_shear)
    assert got.note is None


def test_an_unknown_name_is_refused_with_where_it_was_looked_for():
    got, problem = MaterialSet().lookup("  Unobtainium 9 ")
    assert got is None
    assert "'Unobtainium 9'" in problem
    assert "unknown material" in problem
    assert "not in a materials table nor the built-in library" in problem


def test_an_unknown_name_with_a_table_says_the_table():
    from twistshare.engine.intake._tables import TableSpot
    spot = object.__new__(TableSpot)
    got, problem = MaterialSet(spot=spot).lookup("Unobtainium 9")
    assert got is None
    assert "not in the materials table nor the built-in library" in problem


def test_a_name_defined_twice_names_both_cells():
    mats = MaterialSet(ambiguous={material_key("Steel A"): ["A3", "A7"]})
    got, problem = mats.lookup("Steel A")
    assert got is None
    assert "'Steel A'" in problem and "more than once" in problem
    assert "(A3, A7)" in problem
