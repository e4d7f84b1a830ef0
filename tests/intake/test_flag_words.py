"""The engine's layer and part diagnoses worded on the cells they concern (`_flag_words`).

A parts table is read by the intake, then one input is set to a value the range checks would
refuse first (so only the engine's own screen can see it) and the part re-rated, as
`rate_tables` does. The messages are the intake's own wording, written out here as its
specification; values in US units through pint's own definitions (1 in = 25.4 mm, psi); the
part-level texts are the core's `describe` (its one table of words). Parts are invented (BRIEF §4).
"""

from __future__ import annotations

import math

import numpy as np
import pint
import pytest
from _membook import MemoryBook
from twistshare.engine.core import LayerFlag, PartFlag, describe, rate
from twistshare.engine.intake import Severity, problems_from_rating, rate_tables

U = pint.UnitRegistry()
MATERIALS = [["Material", "G [GPa]", "Allowable shear [MPa]"], ["MPD steel", 80, 120], ["MPD bronze", 40, 60]]
# A Part, B Length, C Torque, D Twist limit, E Twist limit per length, F-I layer 1, J-M layer 2
HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Twist limit [deg]", "Twist limit per length [deg/m]",
        "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 1 inner diameter [mm]", "Layer 1 Kt",
        "Layer 2 material", "Layer 2 outer diameter [mm]", "Layer 2 inner diameter [mm]", "Layer 2 Kt"]
ROW = [500, 300, 2, 4, "MPD steel", 40, 0, 1.2, "MPD bronze", 60, 40, 1.1]
TOUCH = ("; the layers must touch (within the larger of 0.01 mm and 0.02 % of the diameter); for a shrink or "
         "press fit give both layers the nominal fit diameter")


def _read(*rows, head=HEAD):
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": [head, *rows]}))
    assert not [p for p in result.problems if p.severity is Severity.ERROR], result.problems
    return result.parts


def _book(*rows, head=HEAD):
    """The findings of the book itself: geometry the range checks let through reaches the engine."""
    return rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": [head, *rows]})).problems


def _words(parts, ok=None):
    rating = rate(parts.stack(), parts.duty(), inputs=parts.inputs)
    ok = np.ones(parts.count, bool) if ok is None else ok
    return problems_from_rating(rating, parts, ok), rating


def _one(found, code):
    got = [p for p in found if p.code == code]
    assert len(got) == 1, (code, found)
    return got[0]


def test_a_part_without_findings_gets_none():
    found, _ = _words(_read(["MPD-F-001", *ROW]))
    assert found == []


@pytest.mark.parametrize("edit, code, cell, layer, text", [
    (lambda p: p.outer_diameter.__setitem__((0, 0), 0.0), "outer-not-positive", "G2", 1,
     "outer diameter 0 mm must be greater than zero"),
    (lambda p: p.inner_diameter.__setitem__((0, 1), -0.0012), "inner-negative", "L2", 2,
     "inner diameter -1.2 mm must not be negative (0 = solid)"),
    (lambda p: p.inner_diameter.__setitem__((0, 1), 0.0625), "inner-not-below-outer", "L2", 2,
     "inner diameter 62.5 mm must be less than outer diameter 60 mm"),
    (lambda p: p.kt.__setitem__((0, 0), 0.98765), "kt-below-one", "I2", 1, "Kt 0.9877 must be at least 1"),
    (lambda p: p.shear_modulus.__setitem__((0, 1), -123.4e6), "modulus-not-positive", "J2", 2,
     "the material's shear modulus -123.4 MPa must be greater than zero"),
    (lambda p: p.allowable_shear.__setitem__((0, 0), -5.5e6), "allowable-not-positive", "F2", 1,
     "the material's allowable shear stress -5.5 MPa must be greater than zero"),
    (lambda p: p.outer_diameter.__setitem__((0, 1), math.inf), "not-finite", "K2", 2,
     describe(LayerFlag.NOT_FINITE)),
    (lambda p: p.inner_diameter.__setitem__((0, 1), 0.0), "solid-not-innermost", "L2", 2,
     describe(LayerFlag.SOLID_NOT_INNERMOST)),
])
def test_each_layer_finding_in_full_on_its_cell(edit, code, cell, layer, text):
    parts = _read(["MPD-F-002", *ROW], ["MPD-F-003", *ROW])
    edit(parts)
    found, _ = _words(parts)
    p = _one(found, code)
    assert (p.severity, p.sheet, p.cell, p.part, p.layer) == (Severity.ERROR, "Parts", cell, "MPD-F-002", layer)
    assert p.message == f"part MPD-F-002, layer {layer}: {text}"
    assert not [q for q in found if q.part == "MPD-F-003"]
    assert not [q for q in found if q.code == "layer-error"]  # the part-level echo is not told


def test_a_gap_is_told_to_three_digits_with_the_contact_tolerance():
    found = _book(["MPD-F-004", *ROW[:10], 41.2345, 1.1])
    p = _one(found, "gap-below")
    assert (p.cell, p.layer) == ("L2", 2)
    assert p.message == ("part MPD-F-004, layer 2: gap of 1.23 mm on the diameter: inner diameter 41.23 mm against "
                         "layer 1's outer diameter 40 mm" + TOUCH)


def test_an_overlap_is_told_like_a_gap():
    found = _book(["MPD-F-005", *ROW[:10], 38.5, 1.1])
    p = _one(found, "overlap-below")
    assert p.message == ("part MPD-F-005, layer 2: overlap of 1.5 mm on the diameter: inner diameter 38.5 mm against "
                         "layer 1's outer diameter 40 mm" + TOUCH)


def test_an_outer_layer_smaller_than_the_one_below_asks_for_the_order():
    found = _book(["MPD-F-006", *ROW[:9], 30, 20, 1.1])
    p = _one(found, "overlap-below")
    assert p.cell == "L2"
    assert p.message == ("part MPD-F-006, layer 2: outer diameter 30 mm is smaller than layer 1's 40 mm: list the "
                         "layers innermost first")


def test_an_outer_layer_as_large_as_the_one_below_is_an_overlap():
    found = _book(["MPD-F-007", *ROW[:9], 40, 20, 1.1])
    p = _one(found, "overlap-below")
    assert p.message.startswith("part MPD-F-007, layer 2: overlap of 20 mm on the diameter: inner diameter 20 mm")


def test_a_three_layer_gap_names_the_layer_just_below():
    head = HEAD + ["Layer 3 material", "Layer 3 outer diameter [mm]", "Layer 3 inner diameter [mm]"]
    found = _book(["MPD-F-008", *ROW, "MPD steel", 80, 61], head=head)
    p = _one(found, "gap-below")
    assert (p.cell, p.layer) == ("P2", 3)
    assert p.message.startswith("part MPD-F-008, layer 3: gap of 1 mm on the diameter: inner diameter 61 mm "
                                "against layer 2's outer diameter 60 mm")


def test_messages_in_us_units():
    head = [h.replace("[mm]", "[in]") for h in HEAD]
    row = [20, 300, 2, 4, "MPD steel", 1.5, 0, 1.2, "MPD bronze", 2.5, 1.5, 1.1]
    parts = _read(["MPD-F-009", *row], head=head)
    assert parts.system == "US"
    parts.inner_diameter[0, 1] = U.Quantity(2.75, "inch").to("m").magnitude
    parts.shear_modulus[0, 0] = U.Quantity(-1500, "psi").to("Pa").magnitude
    found, _ = _words(parts)
    assert _one(found, "inner-not-below-outer").message == (
        "part MPD-F-009, layer 2: inner diameter 2.75 in must be less than outer diameter 2.5 in")
    assert _one(found, "modulus-not-positive").message == (
        "part MPD-F-009, layer 1: the material's shear modulus -1500 psi must be greater than zero")


@pytest.mark.parametrize("edit, flag, cell", [
    (lambda p: p.length.__setitem__(0, 0.0), PartFlag.LENGTH_NOT_POSITIVE, "B2"),
    (lambda p: p.torque.__setitem__(0, math.inf), PartFlag.TORQUE_NOT_FINITE, "C2"),
    (lambda p: p.twist_limit_angle.__setitem__(0, -0.01), PartFlag.TWIST_LIMIT_NOT_POSITIVE, "D2"),
    (lambda p: p.twist_limit_per_length.__setitem__(0, -0.01), PartFlag.TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE, "E2"),
    (lambda p: p.length.__setitem__(0, math.nan), PartFlag.TWIST_LIMIT_NEEDS_LENGTH, "D2"),
])
def test_each_part_finding_is_an_error_on_its_cell(edit, flag, cell):
    parts = _read(["MPD-F-010", *ROW], ["MPD-F-011", *ROW])
    edit(parts)
    found, rating = _words(parts)
    assert not rating.valid[0] and rating.valid[1]
    p = _one(found, flag.name.lower().replace("_", "-"))
    assert (p.severity, p.sheet, p.cell, p.part, p.layer) == (Severity.ERROR, "Parts", cell, "MPD-F-010", None)
    assert p.message == f"part MPD-F-010: {describe(flag)}"
    assert not [q for q in found if q.part == "MPD-F-011"]


def test_a_negative_torque_is_a_warning_and_an_error_beside_it_stays_an_error():
    parts = _read(["MPD-F-012", *ROW], ["MPD-F-013", *ROW])
    parts.torque[:] = -300.0
    parts.length[1] = 0.0
    found, rating = _words(parts)
    assert rating.valid[0] and not rating.valid[1]
    neg = [p for p in found if p.code == "torque-negative"]
    assert [(p.part, p.severity, p.cell) for p in neg] == [("MPD-F-012", Severity.WARNING, "C2"),
                                                          ("MPD-F-013", Severity.WARNING, "C3")]
    assert neg[0].message == f"part MPD-F-012: {describe(PartFlag.TORQUE_NEGATIVE)}"
    assert _one(found, "length-not-positive").severity is Severity.ERROR


def test_a_part_with_no_layers_is_told_on_the_part():
    parts = _read(["MPD-F-014", *ROW])
    parts.present[0] = False
    found, _ = _words(parts)
    p = _one(found, "no-layers")
    assert (p.severity, p.sheet, p.cell) == (Severity.ERROR, "Parts", None)


def test_parts_whose_cells_were_refused_are_not_told_again():
    parts = _read(["MPD-F-015", *ROW], ["MPD-F-016", *ROW])
    parts.length[:] = 0.0
    parts.outer_diameter[:, 0] = 0.0
    found, _ = _words(parts, ok=np.array([False, True]))
    assert {p.part for p in found} == {"MPD-F-016"}
    assert {p.code for p in found} >= {"length-not-positive", "outer-not-positive"}


def test_several_flags_of_one_layer_are_each_told():
    parts = _read(["MPD-F-017", *ROW])
    parts.kt[0, 1] = 0.5
    parts.allowable_shear[0, 1] = -1e6
    found, _ = _words(parts)
    assert [(p.code, p.cell) for p in found if p.layer == 2] == [("allowable-not-positive", "J2"),
                                                                  ("kt-below-one", "M2")]


@pytest.mark.parametrize("edit, flag", [
    (lambda p: p.length.__setitem__(0, math.nan), PartFlag.LENGTH_NOT_GIVEN),
    (lambda p: p.torque.__setitem__(0, math.nan), PartFlag.TORQUE_NOT_GIVEN),
])
def test_a_missing_length_or_torque_on_a_rated_part_is_a_warning_on_the_part(edit, flag):
    parts = _read(["MPD-F-020", *ROW])
    parts.twist_limit_angle[0] = parts.twist_limit_per_length[0] = math.nan
    edit(parts)
    found, rating = _words(parts)
    assert rating.valid[0]
    p = _one(found, flag.name.lower().replace("_", "-"))
    assert (p.severity, p.sheet, p.cell) == (Severity.WARNING, "Parts", None)
    assert p.message == f"part MPD-F-020: {describe(flag)}"


def test_an_empty_slot_between_layers_is_told_on_its_material_cell():
    head = HEAD + ["Layer 3 material", "Layer 3 outer diameter [mm]", "Layer 3 inner diameter [mm]"]
    parts = _read(["MPD-F-021", *ROW, "MPD steel", 80, 60], head=head)
    parts.present[0, 1] = False
    found, _ = _words(parts)
    p = _one(found, "empty-slot-between-layers")
    assert (p.cell, p.layer, p.severity) == ("J2", 2, Severity.ERROR)
    assert p.message == f"part MPD-F-021, layer 2: {describe(LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS)}"
