"""A material named by a part: found in the book's table, else completed from the built-in library.

Expected strengths are the library's cited handbook values (Shigley, Mechanical Engineering
Design, tables A-20/A-5 for the hot-rolled carbon steels; ASM typical values for 6061-T6) and
the shafting code rule min(0.30·Sy, 0.18·Su) worked by hand in each test (the classic
transmission-shafting code, common practice)."""

import math

import pytest
from twistshare.engine.core import AllowableRule
from twistshare.engine.intake._allowable_rule import CODE_RULE_FOR_STEEL
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
    assert got.keyway is False and got.origin == "library"
    assert math.isnan(got.factor_of_safety)
    assert got.problem is None and got.allowable_problem is None
    assert got.note == ("material 'AISI 1045 hot rolled' is not in the materials table: used the built-in "
                        "library's typical strengths and the shafting code rule min(0.30·Sy, 0.18·Su) = 93 MPa, "
                        "no keyway; add a row to the materials table to choose otherwise")


def test_the_ultimate_term_can_govern():
    # AISI 1020 hot rolled, Shigley A-20: Sy = 210, Su = 380 -> min(63, 68.4) = 63 MPa
    got, _ = MaterialSet().lookup("aisi 1020 HOT rolled")
    assert got.allowable_shear == pytest.approx(63e6, rel=1e-12)
    assert "63 MPa" in got.note


def test_a_library_non_steel_has_no_allowable_but_its_modulus_serves():
    name = "Aluminium 6061-T6"
    got, problem = MaterialSet().lookup(name)
    assert got is None
    assert problem.startswith(f"material {name!r} has no allowable in the book: ")
    assert problem.endswith(CODE_RULE_FOR_STEEL)
    got, problem = MaterialSet().lookup(name, need_allowable=False)
    assert problem is None
    assert got.shear_modulus == pytest.approx(26e9)  # ASM typical
    assert math.isnan(got.allowable_shear)
    assert got.note is None


def test_an_unknown_name_is_refused_with_where_it_was_looked_for():
    got, problem = MaterialSet().lookup("  Unobtainium 9 ")
    assert got is None
    assert problem == "unknown material 'Unobtainium 9': not in a materials table nor the built-in library"


def test_an_unknown_name_with_a_table_says_the_table():
    from twistshare.engine.intake._tables import TableSpot
    spot = object.__new__(TableSpot)
    got, problem = MaterialSet(spot=spot).lookup("Unobtainium 9")
    assert got is None
    assert problem == "unknown material 'Unobtainium 9': not in the materials table nor the built-in library"


def test_a_name_defined_twice_names_both_cells():
    mats = MaterialSet(ambiguous={material_key("Steel A"): ["A3", "A7"]})
    got, problem = mats.lookup("Steel A")
    assert got is None
    assert problem == "material 'Steel A' is defined more than once in the materials table (A3, A7)"


# The book's materials table read row by row: what each refusal or note names, and where.

import sys  # noqa: E402
from pathlib import Path  # noqa: E402

sys.path.insert(0, str(Path(__file__).parent))
from _membook import MemoryBook  # noqa: E402
from twistshare.engine.intake import rate_tables  # noqa: E402
from twistshare.engine.intake._problems import Severity  # noqa: E402

MAT_HEAD = ["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Allowable shear [MPa]", "Yield strength [MPa]",
            "Ultimate strength [MPa]", "Allowable rule", "Factor of safety", "Keyway"]
PART_HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
             "Layer 1 inner diameter [mm]"]


def _book(*rows):
    """A materials table (rows after the header, from sheet row 2) and one part per named row."""
    names = [r[0] for r in rows if r[0]]
    parts = [PART_HEAD] + [[f"P{i + 1}", 500, 100, n, 30, 0] for i, n in enumerate(dict.fromkeys(names))]
    result = rate_tables(MemoryBook({"Materials": [MAT_HEAD, *rows], "Parts": parts}))
    on_materials = {(p.cell, p.code): p for p in result.problems if p.sheet == "Materials"}
    return result, on_materials


def _row(name, g=None, e=None, nu=None, tau=100, sy=None, su=None, rule=None, fs=None, key=None):
    return [name, g, e, nu, tau, sy, su, rule, fs, key]


def test_g_is_derived_from_e_and_poisson_ratio_and_said_at_the_g_cell():
    result, found = _book(_row("Alpha", e=200, nu=0.3))
    p = found["B2", "input"]
    assert p.severity is Severity.NOTE and p.material == "Alpha"
    assert p.message.startswith(f"material 'Alpha': G = E/2(1+ν) = {200 / (2 * 1.3):.4g} GPa")
    assert p.message.endswith("(this holds for an isotropic material only; give G for a fibre-wound or other "
                              "orthotropic one)")
    assert result.materials.by_name[next(iter(result.materials.by_name))].shear_modulus == pytest.approx(
        200e9 / 2.6, rel=1e-12)
    assert result.rated.tolist() == [True]


def test_poisson_ratio_one_half_is_the_isotropic_limit_and_above_it_is_refused():
    result, found = _book(_row("Half", e=200, nu=0.5), _row("Over", e=200, nu=0.6))
    assert f"= {200 / 3:.4g} GPa" in found["B2", "input"].message  # G = E/2(1 + 0.5) = E/3
    p = found["A3", "material"]
    assert p.severity is Severity.ERROR
    assert p.message.startswith("material 'Over': Poisson ratio 0.6 is above 0.5")
    assert p.message.endswith("give G")
    assert result.rated.tolist() == [True, False]


def test_no_shear_modulus_at_all_is_refused_at_the_name():
    result, found = _book(_row("Gamma"))
    p = found["A2", "material"]
    assert p.message == ("material 'Gamma': no shear modulus: give G, or E and Poisson ratio, "
                         "or name a built-in library material")
    assert result.rated.tolist() == [False]


def test_a_row_without_a_name_is_ignored_naming_its_row():
    _, found = _book(_row("Alpha", g=80), _row(None, g=80))
    p = found["A3", "input"]
    assert p.severity is Severity.ERROR
    assert p.message == "materials row 3: the material has no name; the row is ignored"


def test_a_name_given_twice_names_the_first_cell_and_refuses_its_parts():
    result, found = _book(_row("Alpha", g=80), _row("Beta", g=80), _row("alpha", g=70))
    p = found["A4", "input"]
    assert p.message == ("material 'alpha' is defined again (first at A2); parts using it are not rated "
                         "until one definition is removed")
    part = next(q for q in result.problems if q.sheet == "Parts" and q.part == "P1")
    assert "defined more than once in the materials table (A2, A4)" in part.message
    assert result.rated.tolist() == [False, True, False]  # P3 names 'alpha': the same material


def test_a_keyway_word_that_is_not_yes_or_no_refuses_the_material():
    result, found = _book(_row("Delta", g=80, key="maybe"))
    assert found["J2", "input"].message == "material 'Delta': keyway: expected yes or no, got 'maybe'"
    assert found["A2", "material"].message == "material 'Delta': keyway cell unreadable"
    assert result.rated.tolist() == [False]


def test_an_unknown_rule_word_is_refused_at_the_rule_cell():
    result, found = _book(_row("Eps", g=80, tau=None, sy=300, rule="sometimes", fs=2))
    p = found["H2", "rule-word"]
    assert p.message.startswith("material 'Eps': allowable rule 'sometimes' is not one of: ")
    assert p.message.endswith("given, max shear, distortion energy, shafting code")
    assert p.values == ("sometimes",)
    assert found["A2", "material"].message == "material 'Eps': unknown allowable rule 'sometimes'"
    assert result.rated.tolist() == [False]


def test_an_unusable_cell_is_quoted_in_the_material_s_problem():
    result, found = _book(_row("Zeta", g="abc"))
    assert ("B2", "unit") in found
    p = found["A2", "material"]
    assert p.message.startswith("material 'Zeta' has an unusable property: shear modulus G: 'abc'")
    assert "material 'Zeta': shear" not in p.message  # the cell's own prefix is not repeated
    assert result.rated.tolist() == [False]


def test_one_strength_beside_a_library_name_is_not_paired_with_the_library_s_other():
    result, found = _book(_row("AISI 1045 hot rolled", tau=None, sy=300))
    p = found["A2", "no-allowable"]
    assert "needs the ultimate strength" in p.message
    assert p.message.endswith("(the row gives only the yield strength; the library's typical ultimate "
                              "strength is not paired with it)")
    result, found = _book(_row("AISI 1045 hot rolled", tau=None, su=600))
    assert found["A2", "no-allowable"].message.endswith(
        "(the row gives only the ultimate strength; the library's typical yield strength is not paired with it)")


def test_a_rule_note_sits_on_the_rule_cell_and_an_input_note_on_its_own_cell():
    # Tresca 0.5·Sy/FS = 0.5·300/2 = 75 MPa; the allowable typed (100 MPa) is not used
    result, found = _book(_row("Theta", g=80, tau=100, sy=300, rule="max shear", fs=2))
    p = found["E2", "input-ignored"]
    assert "allowable shear given but rule" in p.message
    (m,) = result.materials.by_name.values()
    assert m.allowable_shear == pytest.approx(75e6, rel=1e-12)
    assert m.origin == "book" and m.problem is None
    # a steel without a rule: the code rule, stated on the (empty) rule cell
    result, found = _book(_row("Shaft steel", g=80, tau=None, sy=300, su=500))
    assert found["H2", "default-rule"].severity is Severity.NOTE
    (m,) = result.materials.by_name.values()
    assert m.allowable_shear == pytest.approx(min(0.30 * 300, 0.18 * 500) * 1e6, rel=1e-12)


def test_a_bad_cell_on_an_unnamed_row_names_the_row():
    _, found = _book(_row("Alpha", g=80), _row(None, g="abc"))
    p = found["B3", "unit"]
    assert p.message.startswith("materials row 3: ")


class _ErrorBook(MemoryBook):
    """A book whose Materials sheet holds an error value (#N/A) in one cell."""

    def __init__(self, sheets, errors):
        super().__init__(sheets)
        self.errors = errors

    def grid(self, sheet):
        from twistshare.engine.intake._grid import SheetGrid
        return SheetGrid(sheet, self.sheets[sheet], errors=self.errors if sheet == "Materials" else {})


def test_an_error_value_in_a_name_cell_ignores_the_row_naming_it():
    rows = [MAT_HEAD, _row("Alpha", g=80), _row(None, g=80)]
    parts = [PART_HEAD, ["P1", 500, 100, "Alpha", 30, 0]]
    result = rate_tables(_ErrorBook({"Materials": rows, "Parts": parts}, {(2, 0): "#N/A"}))
    (p,) = [q for q in result.problems if q.cell == "A3"]
    assert p.severity is Severity.ERROR
    assert p.message.startswith("materials row 3: the name: ") and p.message.endswith("; the row is ignored")
    assert "#N/A" in p.message
    assert result.rated.tolist() == [True]
