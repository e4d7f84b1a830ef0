"""Each layer's shear yield stress from its material and rule, and the plastic reserve (`_plastic_inputs`).

Outside sources: the shear yield stress is 0.5·Sy by the maximum-shear-stress (Tresca) rule and
Sy/√3 by distortion energy (von Mises) (Shigley's Mechanical Engineering Design, failure
theories); an elastic–perfectly plastic solid round bar first yields at T_y = τy·π·d³/16 and is
fully plastic at T_p = τy·π·d³/12, 4/3 of it, and a tube layer's fully plastic torque is
(2π/3)·τy·(ro³ − ri³) (Timoshenko, Strength of Materials, plastic torsion); MPa through pint's
own definition. The note is the intake's own wording, written out here as its specification.
Materials and parts are invented (BRIEF §4).
"""

from __future__ import annotations

import math

import numpy as np
import pint
import pytest
from _membook import MemoryBook
from twistshare.engine.core import AllowableRule
from twistshare.engine.intake import Severity, rate_tables
from twistshare.engine.intake._plastic_inputs import SHEAR_YIELD_FACTOR

U = pint.UnitRegistry()
MPA = U.Quantity(1, "MPa").to("Pa").magnitude
MATERIALS = [["Material", "G [GPa]", "Yield strength [MPa]", "Allowable shear [MPa]", "Allowable rule",
              "Factor of safety"],
             ["MPD tresca steel", 80, 400, None, "max shear", 2],
             ["MPD mises steel", 80, 400, None, "distortion energy", 2],
             ["MPD given steel", 80, 300, 100, "given", None],
             ["MPD plain bronze", 40, None, 60, "given", None],
             ["MPD plain brass", 40, None, 50, "given", None]]
HEAD = ["Part", "Length [mm]", "Torque [N·m]",
        "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 1 inner diameter [mm]",
        "Layer 2 material", "Layer 2 outer diameter [mm]", "Layer 2 inner diameter [mm]"]


def _solid(pid, material, d=40, torque=300):
    return [pid, 500, torque, material, d, None, None, None, None]


def _sleeved(pid, core, sleeve, torque=300):
    return [pid, 500, torque, core, 40, None, sleeve, 60, 40]


def _rated(*rows):
    return rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": [HEAD, *rows]}))


def _notes(result):
    return [p for p in result.problems if p.code == "no-yield"]


@pytest.mark.parametrize("material, tau_y", [("MPD tresca steel", 0.5 * 400 * MPA),
                                             ("MPD mises steel", 400 * MPA / math.sqrt(3)),
                                             ("MPD given steel", 300 * MPA / math.sqrt(3))])
def test_a_solid_bar_yields_by_its_rule_and_holds_four_thirds(material, tau_y):
    result = _rated(_solid("MPD-P-001", material), _solid("MPD-P-002", material, d=30))
    assert result.shear_yield[0, 0] == pytest.approx(tau_y, rel=1e-12)
    assert np.isnan(result.shear_yield[0, 1])  # no second layer
    got = result.plastic
    for i, d in enumerate((0.040, 0.030)):
        assert got.first_yield_torque[i] == pytest.approx(tau_y * math.pi * d**3 / 16, rel=1e-9)
        assert got.fully_plastic_torque[i] == pytest.approx(tau_y * math.pi * d**3 / 12, rel=1e-9)
        assert got.reserve_ratio[i] == pytest.approx(4 / 3, rel=1e-9)
    assert not _notes(result)


def test_a_sleeved_part_sums_each_layers_own_shear_yield():
    result = _rated(_sleeved("MPD-P-003", "MPD tresca steel", "MPD mises steel"))
    ty_core, ty_sleeve = 200 * MPA, 400 * MPA / math.sqrt(3)
    assert result.shear_yield[0] == pytest.approx([ty_core, ty_sleeve], rel=1e-12)
    plastic = 2 * math.pi / 3 * (ty_core * 0.020**3 + ty_sleeve * (0.030**3 - 0.020**3))
    assert result.plastic.fully_plastic_torque[0] == pytest.approx(plastic, rel=1e-9)


def test_a_layer_without_yield_strength_leaves_the_part_blank_with_one_note_per_material():
    result = _rated(_sleeved("MPD-P-004", "MPD tresca steel", "MPD plain bronze"),
                    _sleeved("MPD-P-005", "MPD mises steel", "MPD plain bronze"),
                    _solid("MPD-P-006", "MPD tresca steel"),
                    _sleeved("MPD-P-007", "MPD plain brass", "MPD plain bronze"))
    notes = _notes(result)
    assert [(n.part, n.layer, n.cell, n.sheet) for n in notes] == [("MPD-P-004", 2, "G2", "Parts"),
                                                                   ("MPD-P-007", 1, "D5", "Parts")]
    assert all(n.severity is Severity.NOTE for n in notes)
    assert notes[0].message == ("part MPD-P-004, layer 2: material 'MPD plain bronze' has no yield strength, so the "
                                "plastic reserve of this part (and of every part using the material) is left blank")
    assert notes[1].message.startswith("part MPD-P-007, layer 1: material 'MPD plain brass' has no yield")
    fp = result.plastic.fully_plastic_torque
    assert np.isnan(fp[[0, 1, 3]]).all()
    assert fp[2] == pytest.approx(200 * MPA * math.pi * 0.040**3 / 12, rel=1e-9)
    assert result.shear_yield[0, 0] == pytest.approx(200 * MPA, rel=1e-12) and np.isnan(result.shear_yield[0, 1])
    assert list(result.rated) == [True, True, True, True]


def test_no_part_with_yield_strengths_gives_no_plastic_results_and_no_notes():
    # the notes come only with plastic results: a book without any says nothing of them
    result = _rated(_solid("MPD-P-008", "MPD plain bronze"), _sleeved("MPD-P-014", "MPD tresca steel", "MPD plain brass"))
    assert result.plastic is None and result.shear_yield is None
    assert not _notes(result)
    assert list(result.rated) == [True, True]


def test_a_part_not_rated_gets_no_reserve_and_no_note():
    result = _rated(_sleeved("MPD-P-009", "MPD tresca steel", "MPD plain bronze")[:2] + ["abc"]
                    + _sleeved("", "MPD tresca steel", "MPD plain bronze")[3:],
                    _solid("MPD-P-010", "MPD tresca steel"),
                    _solid("MPD-P-011", "MPD given steel")[:2] + ["abc"] + _solid("", "MPD given steel")[3:])
    assert list(result.rated) == [False, True, False]
    assert not _notes(result)
    fp = result.plastic.fully_plastic_torque
    assert np.isnan(fp[0]) and np.isnan(fp[2]) and not np.isnan(fp[1])


def test_the_row_per_layer_table_notes_on_the_layer_row():
    parts = [["Part", "Length [mm]", "Torque [N·m]"], ["MPD-P-012", 500, 300], ["MPD-P-013", 500, 300]]
    layers = [["Part", "Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]"],
              ["MPD-P-012", 1, "MPD tresca steel", 40, None],
              ["MPD-P-012", 2, "MPD plain bronze", 60, 40],
              ["MPD-P-013", 1, "MPD tresca steel", 40, None]]
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": parts, "Layers": layers}))
    (note,) = _notes(result)
    assert (note.sheet, note.cell, note.layer) == ("Layers", "C3", 2)


def test_the_exported_factor_table_is_tresca():
    # shear yield over yield strength by the maximum-shear-stress rule: 1/2 (Shigley's)
    assert SHEAR_YIELD_FACTOR == {int(AllowableRule.MAX_SHEAR): 0.5}
