"""A book's parts table read into parts: which row, part and layer each refusal or note names.

Each expected cell, row and layer is worked out from the sheet the test writes (rows counted
from 1, columns A, B, ...); the shafting code allowable min(0.30·Sy, 0.18·Su) by hand from the
library's AISI 1045 values (Shigley, Mechanical Engineering Design, table A-20: 310 and 570 MPa)."""

import pytest
from _membook import MemoryBook
from twistshare.engine.intake import rate_tables
from twistshare.engine.intake._problems import Severity

MATS = [["Material", "G [GPa]", "Allowable shear [MPa]", "Keyway", "Allowable rule", "Yield strength [MPa]",
         "Ultimate strength [MPa]"],
        ["Core steel", 80, 120, None, None, None, None],
        ["Key steel", 80, None, "yes", "shafting code", 300, 500]]
HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
        "Layer 1 inner diameter [mm]", "Layer 1 Kt", "Layer 2 material", "Layer 2 outer diameter [mm]",
        "Layer 2 inner diameter [mm]"]


def _rate(*rows, head=HEAD):
    result = rate_tables(MemoryBook({"Materials": MATS, "Parts": [head, *rows]}))
    return result, {(p.code, p.cell): p for p in result.problems}


def test_a_part_without_an_id_is_refused_on_its_row():
    result, found = _rate(["P1", 500, 100, "Core steel", 30, 0], [None, 500, 100, "Core steel", 30, 0])
    p = found["part-id", "A3"]
    assert p.severity is Severity.ERROR and p.sheet == "Parts"
    assert p.message == "row 3: the part has no id; it is not rated"
    assert result.rated.tolist() == [True, False]


def test_an_id_given_twice_refuses_both_rows_naming_the_other():
    result, found = _rate(["P1", 500, 100, "Core steel", 30, 0], ["P2", 500, 100, "Core steel", 30, 0],
                          ["P1", 500, 100, "Core steel", 30, 0], ["P1", 500, 100, "Core steel", 30, 0])
    first = found["part-id-twice", "A2"]
    assert first.part == "P1"
    assert first.message == ("part P1: the id is also on row 4, 5; neither row is rated until each part has "
                             "its own id")
    assert "also on row 2, 5;" in found["part-id-twice", "A4"].message
    assert result.rated.tolist() == [False, True, False, False]


def test_a_layer_without_material_names_its_cell_and_layer():
    result, found = _rate(["P1", 500, 100, "Core steel", 30, 20, None, None, 40, 30])
    p = found["missing", "H2"]
    assert (p.severity, p.part, p.layer) == (Severity.ERROR, "P1", 2)
    assert p.message == "part P1, layer 2: no material given"
    assert result.rated.tolist() == [False]


def test_an_unknown_material_is_refused_at_its_layer():
    result, found = _rate(["P1", 500, 100, "Core steel", 30, 20, None, "Unobtainium", 40, 30],
                          ["P2", 500, 100, "Core steel", 30, 0])
    p = found["material", "H2"]
    assert (p.severity, p.part, p.layer) == (Severity.ERROR, "P1", 2)
    assert p.message.startswith("part P1, layer 2: unknown material 'Unobtainium'")
    assert result.rated.tolist() == [False, True]


def test_a_library_material_is_noted_once_at_the_first_layer_using_it():
    result, found = _rate(["P1", 500, 100, "Core steel", 30, 0],
                          ["P2", 500, 100, "AISI 1045 hot rolled", 30, 0],
                          ["P3", 500, 100, "AISI 1045 hot rolled", 30, 0])
    notes = [p for p in result.problems if p.code == "library-default"]
    assert len(notes) == 1
    (p,) = notes
    assert (p.severity, p.sheet, p.cell, p.part, p.layer) == (Severity.NOTE, "Parts", "D3", "P2", 1)
    assert p.message.startswith("part P2, layer 1: material 'AISI 1045 hot rolled' is not in the materials table")
    assert "93 MPa" in p.message  # min(0.30 · 310, 0.18 · 570) MPa
    assert result.rated.tolist() == [True, True, True]


@pytest.mark.parametrize("kt, noted", [(2.0, True), (1.0, False), (1.5, True)])
def test_kt_beside_a_keyway_material_is_noted_at_the_first_kt_cell(kt, noted):
    result, found = _rate(["P1", 500, 100, "Core steel", 30, 0],
                          ["P2", 500, 100, "Key steel", 30, 20, None, "Key steel", 40, 30],
                          ["P3", 500, 100, "Key steel", 30, 20, kt, "Key steel", 40, 30])
    notes = [p for p in result.problems if p.code == "keyway-and-kt"]
    assert len(notes) == (1 if noted else 0)
    if noted:
        (p,) = notes
        assert (p.severity, p.cell, p.part, p.layer) == (Severity.NOTE, "G4", "P3", 1)
        assert p.message.startswith(f"part P3, layer 1: Kt {kt:.3g} and the keyway factor 0.75 of material "
                                    "'Key steel' are both applied")
        assert p.message.endswith("counted twice (conservative)")
    assert result.rated.tolist() == [True, True, True]


@pytest.mark.parametrize("unit, system", [("in", "US"), ("mm", "SI")])
def test_the_book_s_unit_system_follows_the_diameter_unit(unit, system):
    head = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", f"Layer 1 outer diameter [{unit}]",
            f"Layer 1 inner diameter [{unit}]"]
    result, _ = _rate(["P1", 500, 100, "Core steel", 1.2, 0], head=head)
    assert result.system == system
    assert result.parts.system == system
