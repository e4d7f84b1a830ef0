"""A materials table read row by row: wound (layup) rows, rows whose G comes from E and ν, the
cells each problem and note is told on, and what each resolved material carries.

Outside checks: a one-ply laminate at 0° has the ply's own moduli, Gxy = G12, Ex = E1,
νxy = ν12 (classical lamination theory, Jones, Mechanics of Composite Materials, from memory: the
transformed stiffness at 0° is the ply's); a [±45]s laminate has Gxy = (Q11 + Q22 − 2·Q12)/4
with Q11 = E1/(1 − ν12·ν21), Q22 = E2/(1 − ν12·ν21), Q12 = ν12·E2/(1 − ν12·ν21), ν21 = ν12·E2/E1
(same source, from memory; Q̄66 at 45°). G = E/2(1+ν) for an isotropic material (any strength of materials
text). Unit factors from NIST SP 811 (GPa, MPa, g/cm³ → kg/m³). The library's values are its own
cited figures, read through `find_material`. Cells are those of the sheet each test writes.
"""

from __future__ import annotations

import math

import pytest
from twistshare.engine.core import AllowableRule, find_material, ply_library
from twistshare.engine.intake import MATERIAL_FIELDS, SheetGrid, locate_table, read_materials
from twistshare.engine.intake._problems import Severity

PLY = ["Ply E1 [GPa]", "Ply E2 [GPa]", "Ply G12 [GPa]", "Ply nu12", "Ply thickness [mm]"]
E1, E2, G12, NU12 = 140.0, 10.0, 5.0, 0.3  # GPa, an invented ply


def _read(rows, errors=None):
    grid = SheetGrid("Materials", rows, errors=errors or {})
    spot = locate_table(grid, MATERIAL_FIELDS, "name", header_row=0)
    findings: list = []
    return read_materials(grid, spot, findings), findings


def _of(findings, code=None, cell=None):
    return [f for f in findings if (code is None or f.code == code) and (cell is None or f.cell == cell)]


# --- wound rows ------------------------------------------------------------------------------

def test_a_one_ply_layup_gives_the_ply_s_own_moduli():
    mats, findings = _read([["Material", "Layup", *PLY], ["Wrap", "[0]", E1, E2, G12, NU12, 0.125]])
    m = mats.by_name["wrap"]
    assert m.problem is None
    assert m.shear_modulus == pytest.approx(G12 * 1e9, rel=1e-9)
    assert m.youngs_modulus == pytest.approx(E1 * 1e9, rel=1e-9)
    assert m.poisson_ratio == pytest.approx(NU12, rel=1e-9)
    assert math.isnan(m.density)  # no ply set, no density column: none
    (note,) = _of(findings, "laminate")
    assert (note.severity, note.cell) == (Severity.NOTE, "B2")
    assert note.message.startswith("material 'Wrap': G = 5 GPa (A66/t, torsion) and E = 140 GPa")
    assert note.message.endswith("layup [0] (1 plies), the row's ply data")


def test_a_plus_minus_45_layup_gives_the_closed_form_shear_modulus():
    mats, _ = _read([["Material", "Layup", *PLY], ["Wrap", "[±45]s", E1, E2, G12, NU12, 0.125]])
    nu21 = NU12 * E2 / E1
    d = 1 - NU12 * nu21
    q11, q22, q12 = E1 / d, E2 / d, NU12 * E2 / d
    assert mats.by_name["wrap"].shear_modulus == pytest.approx((q11 + q22 - 2 * q12) / 4 * 1e9, rel=1e-9)


@pytest.mark.parametrize("own, words", [(["G [GPa]"], "G"), (["G [GPa]", "E [GPa]"], "G and E"),
                                        (["E [GPa]"], "E")])
def test_a_wound_row_s_own_moduli_are_replaced_with_a_warning(own, words):
    head = ["Material", *own, "Layup", *PLY]
    mats, findings = _read([head, ["Wrap", *[70] * len(own), "[0]", E1, E2, G12, NU12, 0.125]])
    (w,) = _of(findings, "laminate")
    assert w.severity is Severity.WARNING
    assert w.cell == f"{'BCD'[len(own)]}2"  # the layup cell
    assert w.message.endswith(f"(1 plies), the row's ply data; the row's own {words} are not used")
    m = mats.by_name["wrap"]
    assert m.shear_modulus == pytest.approx(G12 * 1e9) and m.youngs_modulus == pytest.approx(E1 * 1e9)


def test_a_ply_set_gives_its_density_unless_the_row_gives_one():
    ply = ply_library()["Glass/epoxy E-glass"]  # the library's cited ply values
    mats, _ = _read([["Material", "Layup", "Ply set", "Density [kg/m³]"],
                     ["Wrap A", "[0]", "Glass/epoxy E-glass", None], ["Wrap B", "[0]", "Glass/epoxy E-glass", 1900]])
    assert mats.by_name["wrap a"].density == pytest.approx(ply.density)
    assert mats.by_name["wrap b"].density == 1900
    assert mats.by_name["wrap a"].shear_modulus == pytest.approx(ply.g12, rel=1e-9)


def test_a_layup_without_ply_data_refuses_the_row_at_its_layup_cell():
    mats, findings = _read([["Material", "G [GPa]", "Allowable shear [MPa]", "Layup", "Ply E1 [GPa]"],
                            ["Wrap", 20, 50, "[±45]s", None], ["Steel", 80, 100, None, None]])
    text = "material 'Wrap': a layup is given but not the ply data Ply E1, Ply E2, Ply G12, Ply nu12, Ply thickness"
    (lam,) = _of(findings, "laminate")
    assert (lam.severity, lam.cell) == (Severity.ERROR, "E2")  # the first missing ply datum's cell
    assert lam.message.startswith(text)
    (mat,) = _of(findings, "material")
    assert (mat.cell, mat.message) == ("A2", lam.message)
    assert mats.lookup("Wrap")[0] is None
    assert mats.lookup("Steel")[0] is not None


def test_a_row_with_an_unusable_cell_is_not_laminated():
    mats, findings = _read([["Material", "Layup", *PLY], ["Wrap", "[0]", "lots", E2, G12, NU12, 0.125]])
    assert not _of(findings, "laminate")
    assert mats.by_name["wrap"].problem.startswith("material 'Wrap' has an unusable property: ply modulus along the fibres E1")


def test_a_wound_library_material_keeps_the_row_s_one_strength_unpaired():
    name = "Carbon/epoxy tube 45 wound"  # in the library, not isotropic, not a steel
    mats, findings = _read([["Material", "Yield strength [MPa]", "Layup", *PLY],
                            [name, 400, "[0]", E1, E2, G12, NU12, 0.125]])
    (p,) = _of(findings, "no-allowable")
    assert p.message.endswith("(the row gives only the yield strength; the library's typical ultimate strength "
                              "is not paired with it)")
    assert mats.by_name[name.lower()].shear_modulus == pytest.approx(G12 * 1e9)


# --- G from E and ν, and rows without G ----------------------------------------------------

def test_g_from_e_and_poisson_ratio_only_where_g_is_blank():
    mats, findings = _read([["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Allowable shear [MPa]"],
                            ["Derived", None, 200, 0.25, 100], ["Own", 80, 200, 0.3, 100],
                            ["Bad G", "soft", 200, 0.3, 100], ["E only", None, 200, None, 100]])
    assert mats.by_name["derived"].shear_modulus == pytest.approx(200e9 / (2 * 1.25))
    (note,) = [f for f in findings if "E/2(1+ν)" in f.message]
    assert (note.severity, note.cell) == (Severity.NOTE, "B2")
    assert mats.by_name["own"].shear_modulus == 80e9  # given G kept, not 200/2.6 GPa
    assert mats.by_name["bad g"].problem.startswith("material 'Bad G' has an unusable property")
    assert mats.by_name["e only"].problem == ("material 'E only': no shear modulus: give G, or E and Poisson ratio, "
                                              "or name a built-in library material")



@pytest.mark.parametrize("own, shown, missing", [(("E", 195), "E (195 GPa)", "Poisson ratio"),
                                                 (("Poisson ratio", 0.28), "Poisson ratio (0.28)", "E")])
def test_a_library_row_giving_half_the_elastic_pair_is_warned_that_g_is_the_library_s(own, shown, missing):
    # the library's G stands beside the row's own E (or ν): the torque share then does not follow
    # the row's modulus, so the row is told so on its G cell
    header, value = own
    mats, findings = _read([["Material", "G [GPa]", f"{header}" + (" [GPa]" if header == "E" else "")],
                            ["AISI 1045 hot rolled", None, value]])
    lib = find_material("AISI 1045 hot rolled")
    m = mats.by_name["aisi 1045 hot rolled"]
    assert m.problem is None and m.shear_modulus == lib.shear_modulus
    (w,) = _of(findings, "library-g")
    assert (w.severity, w.cell) == (Severity.WARNING, "B2")
    assert w.message == (f"material 'AISI 1045 hot rolled': the row gives {shown} but no {missing}, so G is the "
                         f"library's {lib.shear_modulus / 1e9:.4g} GPa for AISI 1045 hot rolled, not one derived "
                         f"from the row's {header}; give the {missing} too, or G, to use your own")


def test_a_library_row_with_its_own_e_and_poisson_ratio_or_g_is_not_warned():
    mats, findings = _read([["Material", "G [GPa]", "E [GPa]", "Poisson ratio"],
                            ["AISI 1045 hot rolled", None, 200, 0.25], ["AISI 1020 hot rolled", 78, 200, None],
                            ["AISI 4140 quenched and tempered", None, None, None]])
    assert not _of(findings, "library-g")
    # G = E/2(1+ν) from the row's own pair (isotropic): 200/2.5 = 80 GPa
    assert mats.by_name["aisi 1045 hot rolled"].shear_modulus == pytest.approx(80e9, rel=1e-12)


def test_an_orthotropic_library_row_with_its_own_e_and_poisson_ratio_is_told_g_is_not_derived():
    # the library's G is the right one here (E/2(1+ν) holds for isotropic materials only), so the
    # row is told so in a note, which does not stop a cell function (tests/engine/test_cells.py)
    name = "Carbon/epoxy tube 45 wound"
    mats, findings = _read([["Material", "E [GPa]", "Poisson ratio"], [name, 20, 0.7]])
    lib = find_material(name)
    assert mats.by_name[name.lower()].shear_modulus == lib.shear_modulus  # not 20/(2·1.7) GPa
    (w,) = _of(findings, "library-g")
    assert (w.severity, w.cell) == (Severity.NOTE, "A2")  # no G column: the name cell
    assert w.message == (f"material {name!r}: G is the library's {lib.shear_modulus / 1e9:.4g} GPa for {name}, not "
                         "E/2(1+ν) from the row's E and Poisson ratio, which holds for an isotropic material only; "
                         "give G to use your own")


def test_two_rows_with_bad_cells_each_quote_their_own_cell():
    mats, _ = _read([["Material", "G [GPa]", "Allowable shear [MPa]"], ["First", 80, "much"], ["Second", "soft", 100]])
    assert mats.by_name["first"].problem.startswith("material 'First' has an unusable property: allowable")
    assert mats.by_name["second"].problem.startswith("material 'Second' has an unusable property: shear modulus G")


def test_a_bad_cell_of_another_table_on_the_same_row_is_not_quoted():
    from _membook import MemoryBook
    from twistshare.engine.intake import rate_tables

    # the Parts header sits on row 2 (a title above it); its near-miss header is an error on row 2
    parts = [["Shafts"], ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
                          "Twist limt [deg]"], ["P1", 500, 100, "First", 30, 1]]
    result = rate_tables(MemoryBook({"Materials": [["Material", "G [GPa]", "Allowable shear [MPa]"],
                                                   ["First", 80, "much"]], "Parts": parts}))
    assert any(p.sheet == "Parts" and p.cell == "F2" and p.severity is Severity.ERROR for p in result.problems)
    assert result.materials.by_name["first"].problem.startswith(
        "material 'First' has an unusable property: allowable")


def test_a_name_cell_holding_an_error_value_is_ignored_with_its_row():
    mats, findings = _read([["Material", "G [GPa]", "Allowable shear [MPa]"], ["#N/A", 80, 100], ["Steel", 80, 100]],
                           errors={(1, 0): "#N/A"})
    (p,) = [f for f in findings if f.cell == "A2"]
    assert p.message == ("materials row 2: the name: the cell holds the error value #N/A; expected a material name; "
                         "the row is ignored")
    assert list(mats.by_name) == ["steel"]


def test_a_header_unit_problem_is_told_once_on_the_header():
    _, findings = _read([["Material", "G [furlongz]", "Allowable shear [MPa]"], ["A", 80, 100], ["B", 80, 100]])
    assert [f.cell for f in findings if f.code == "header-unit"] == ["B1"]


# --- what a resolved material carries --------------------------------------------------------

def test_without_a_rule_column_a_row_with_an_allowable_is_given():
    mats, _ = _read([["Material", "G [GPa]", "Allowable shear [MPa]"], ["A", 80, 100], ["B", 70, 90]])
    a = mats.by_name["a"]
    assert (a.rule, a.allowable_shear, a.keyway) == (AllowableRule.GIVEN, 100e6, False)
    assert a.keyway is False
    assert mats.cells["a"] == {"name": "A2", "shear_modulus": "B2", "allowable_shear": "C2"}
    assert mats.cells["b"]["shear_modulus"] == "B3"


def test_the_row_s_density_and_expansion_coefficient_else_the_library_s():
    lib = find_material("AISI 1045 hot rolled")
    mats, _ = _read([["Material", "G [GPa]", "Allowable shear [MPa]", "Density [kg/m³]", "Expansion coefficient [1/K]"],
                     ["Own", 80, 100, 7800, 1.2e-5], ["AISI 1045 hot rolled", 80, 100, None, None]])
    own = mats.by_name["own"]
    assert (own.density, own.expansion_coefficient) == (7800, pytest.approx(1.2e-5))
    steel = mats.by_name["aisi 1045 hot rolled"]
    assert steel.expansion_coefficient == pytest.approx(lib.expansion_coefficient)
    assert steel.density == pytest.approx(lib.density)


def test_the_default_rule_note_is_on_the_rule_cell_and_not_among_the_warnings():
    mats, findings = _read([["Material", "G [GPa]", "Yield strength [MPa]", "Ultimate strength [MPa]", "Allowable rule",
                             "Factor of safety"], ["Shaft steel", 80, 300, 500, None, 2]])
    (note,) = [f for f in findings if f.code == "default-rule"]
    assert (note.severity, note.cell) == (Severity.NOTE, "E2")
    m = mats.by_name["shaft steel"]
    assert note.message not in m.warnings
    # a factor of safety under the shafting code rule is not used: that is a warning, carried
    assert all(w.startswith("material 'Shaft steel': ") for w in m.warnings)
    assert m.allowable_shear == pytest.approx(min(0.30 * 300e6, 0.18 * 500e6))  # the rule, by hand


def test_an_unknown_rule_word_refuses_the_row_which_stands_as_given():
    mats, findings = _read([["Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule"],
                            ["Shaft steel", 80, None, "guessed"]])
    assert [f.code for f in findings if f.cell == "D2"] == ["rule-word"]
    m = mats.by_name["shaft steel"]
    assert m.rule is AllowableRule.GIVEN
    assert m.problem == "material 'Shaft steel': unknown allowable rule 'guessed'"


def test_ply_data_without_a_layup_is_refused_at_the_layup_cell():
    mats, findings = _read([["Material", "Layup", *PLY], ["Wrap", None, E1, E2, G12, NU12, 0.125]])
    (lam,) = _of(findings, "laminate")
    assert (lam.severity, lam.cell) == (Severity.ERROR, "B2")
    assert lam.message == "material 'Wrap': ply data are given but no layup: give the layup, e.g. '[±45]s'"
    assert mats.lookup("Wrap")[0] is None
