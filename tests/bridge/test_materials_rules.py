"""How the bridge completes and judges materials: the engineering rules behind each allowable.

Checks: G = E/2(1+ν) only for isotropic materials (classical lamination theory gives the wound
tube its own G); a library group is filled only when the book gives none of it; inputs a rule
does not use are reported (the shafting code rule carries its own allowance; its 0.75 keyway
factor belongs to it alone — the classic transmission-shafting code, common practice); the
shafting code rule is applied only to steels.
"""

from __future__ import annotations

from pathlib import Path

import openpyxl
import pytest
from twistshare.engine.core import AllowableRule, find_material
from twistshare.engine.intake import rate_tables as rate_open_book
from twistshare.workbook_bridge.commands._output import prepare

MAT_HEAD = ["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Allowable shear [MPa]", "Yield strength [MPa]",
            "Ultimate strength [MPa]", "Allowable rule", "Factor of safety", "Keyway"]
PART_HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
             "Layer 1 inner diameter [mm]"]


def _rate(tmp_path: Path, materials: list[list], parts: list[list]):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Materials"
    ws.append(MAT_HEAD)
    for row in materials:
        ws.append(row)
    ps = wb.create_sheet("Parts")
    ps.append(PART_HEAD)
    for row in parts:
        ps.append(row)
    path = tmp_path / "book.xlsx"
    wb.save(path)
    _info, book = prepare(path)
    return rate_open_book(book)


def _messages(result, severity=None) -> str:
    return "\n".join(f.message for f in result.problems if severity is None or f.severity.value == severity)


def test_wound_tube_keeps_its_laminate_g_when_only_e_is_given(tmp_path):
    r = _rate(tmp_path, [["Carbon/epoxy tube 45 wound", None, 17.7, None, 70, None, None, "given", None, None]],
              [["T1", 1000, 100, "Carbon/epoxy tube 45 wound", 60, 50]])
    m = r.materials.by_name["carbon/epoxy tube 45 wound"]
    assert m.shear_modulus == pytest.approx(find_material("Carbon/epoxy tube 45 wound").shear_modulus)
    assert bool(r.rated[0])


def test_own_e_and_nu_give_g_with_a_note(tmp_path):
    r = _rate(tmp_path, [["MPD steel", None, 200, 0.3, 80, None, None, "given", None, None]],
              [["P1", 1000, 100, "MPD steel", 40, 0]])
    m = r.materials.by_name["mpd steel"]
    assert m.shear_modulus == pytest.approx(200e9 / 2.6)  # G = E/2(1+ν)
    assert "isotropic material only" in _messages(r, "note")


def test_poisson_above_a_half_cannot_give_g(tmp_path):
    r = _rate(tmp_path, [["MPD odd", None, 200, 0.7, 80, None, None, "given", None, None]],
              [["P1", 1000, 100, "MPD odd", 40, 0]])
    assert not bool(r.rated[0])
    assert "above 0.5" in _messages(r, "error")


@pytest.mark.parametrize("row, words", [
    (["AISI 1045 hot rolled", None, None, None, None, None, None, "shafting code", 2, "no"], "factor of safety is not used"),
    (["AISI 1045 hot rolled", None, None, None, None, None, None, "max shear", 2, "yes"], "keyway is not used"),
    (["MPD bronze", 41, None, None, 40, None, None, "given", 3, None], "factor of safety is not used"),
    (["MPD steel", 80, None, None, None, 600, 500, "shafting code", None, "no"], "ultimate strength is below"),
])
def test_inputs_a_rule_ignores_are_reported(tmp_path, row, words):
    r = _rate(tmp_path, [row], [["P1", 1000, 100, row[0], 40, 0]])
    assert words in _messages(r, "warning")


def test_a_users_strength_is_never_paired_with_the_librarys(tmp_path):
    # Sy given, Su blank: the library's Su is not borrowed, so the shafting code rule cannot run
    r = _rate(tmp_path, [["AISI 4140 quenched and tempered", None, None, None, None, 1000, None, "shafting code",
                          None, "no"]], [["P1", 1000, 100, "AISI 4140 quenched and tempered", 40, 0]])
    assert not bool(r.rated[0])
    assert "ultimate strength" in _messages(r, "error")


def test_library_steel_named_directly_gets_the_code_rule_with_a_warning(tmp_path):
    r = _rate(tmp_path, [["MPD spare", 80, None, None, 50, None, None, "given", None, None]],
              [["P1", 1000, 100, "AISI 4140 quenched and tempered", 40, 0],
               ["P2", 1000, 100, "AISI 4140 quenched and tempered", 42, 0]])
    assert bool(r.rated[0]) and bool(r.rated[1])
    lib = find_material("AISI 4140 quenched and tempered")
    expected = min(0.30 * lib.yield_strength, 0.18 * lib.ultimate_strength)  # the code rule
    assert r.materials.by_name["aisi 4140 quenched and tempered"].allowable_shear == pytest.approx(expected)
    warnings = [f for f in r.problems if "is not in the materials table" in f.message]
    assert len(warnings) == 1  # once, where the material is first used


@pytest.mark.parametrize("name", ["Aluminium 6061-T6", "Ti-6Al-4V annealed"])
def test_non_steels_do_not_get_the_steel_shafting_rule(tmp_path, name):
    r = _rate(tmp_path, [["MPD spare", 80, None, None, 50, None, None, "given", None, None]],
              [["P1", 1000, 100, name, 40, 0]])
    assert not bool(r.rated[0])
    assert "rule for steel shafting" in _messages(r, "error")


def test_non_steel_row_without_rule_or_allowable_is_refused(tmp_path):
    r = _rate(tmp_path, [["Aluminium 6061-T6", None, None, None, None, None, None, None, None, None]],
              [["P1", 1000, 100, "Aluminium 6061-T6", 40, 0]])
    assert not bool(r.rated[0])
    assert "rule for steel shafting" in _messages(r, "error")


def test_the_rule_travels_with_the_rating(tmp_path):
    r = _rate(tmp_path, [["AISI 1045 hot rolled", None, None, None, None, None, None, "distortion energy", 2, "no"]],
              [["P1", 1000, 100, "AISI 1045 hot rolled", 40, 0]])
    assert int(r.rating.allowable_rule[0, 0]) == int(AllowableRule.DISTORTION_ENERGY)
