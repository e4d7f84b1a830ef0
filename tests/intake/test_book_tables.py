"""A book's tables as `rate_tables` finds and checks them: which table a header, hidden row or
note is told for, word for word, and when the sizing and interface work is done.

The expected cells are those of the sheets each test writes (rows counted from 1, columns A, B,
...; row 1 the header); the messages are the intake's wording, its specification. A materials
table and a row-per-layer table have no ``Layer n`` column groups (DEVELOPERS.md, workbook
convention), so such a header there is an unknown column. Materials and parts are invented.
"""

from __future__ import annotations

from _membook import MemoryBook
from twistshare.engine.intake import SheetGrid, rate_tables
from twistshare.engine.intake._problems import Severity

MATS = [["Material", "G [GPa]", "Allowable shear [MPa]", "E [GPa]", "Poisson ratio"], ["Core steel", 80, 120, 200, 0.3]]
H1 = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]"]
ROW = ["P1", 500, 100, "Core steel", 30]


class Book(MemoryBook):
    """A memory book whose sheets may have hidden rows (zero-based)."""

    def __init__(self, sheets, hidden=None):
        super().__init__(sheets)
        self.hidden = hidden or {}

    def grid(self, sheet):
        return SheetGrid(sheet, self.sheets[sheet], hidden_rows=frozenset(self.hidden.get(sheet, ())))


def _rate(sheets, **kw):
    result = rate_tables(Book(sheets, **kw))
    return result, {(p.sheet, p.cell): p for p in result.problems}


def test_a_near_miss_of_a_layer_group_header_in_parts_stops_the_rating():
    result, found = _rate({"Materials": MATS, "Parts": [[*H1, "Layer 1 outer diamtr [mm]"], [*ROW, 31]]})
    p = found["Parts", "F1"]
    assert p.severity is Severity.ERROR
    assert p.message == ("parts column 'Layer 1 outer diamtr [mm]' looks like 'Layer 1 outer diameter' but is "
                         "not spelled as twistshare reads it; no part is rated until it is renamed or removed")
    assert result.rated.tolist() == [False]


def test_layer_group_headers_in_the_materials_table_are_ignored_columns():
    mats = [[*MATS[0], "Layer 1 G [GPa]", "Layer 1 outer diam [mm]"], [*MATS[1], 70, 1]]
    result, found = _rate({"Materials": mats, "Parts": [H1, ROW]})
    for cell, header in (("F1", "Layer 1 G [GPa]"), ("G1", "Layer 1 outer diam [mm]")):
        p = found["Materials", cell]
        assert p.severity is Severity.WARNING
        assert p.message == f"materials column {header!r} is not an input twistshare reads, so it is ignored"
    # G is the material's own 80 GPa (GPa → Pa, NIST SP 811), not the stray column's
    assert result.parts.shear_modulus[0, 0] == 80e9
    assert result.rated.tolist() == [True]


def test_a_layer_group_header_in_a_layers_table_is_an_ignored_column():
    result, found = _rate({"Materials": MATS, "Parts": [["Part", "Length [mm]", "Torque [N·m]"], ["P1", 500, 100]],
                           "Layers": [["Part", "Material", "Outer diameter [mm]", "Layer 2 outer diam [mm]"],
                                      ["P1", "Core steel", 30, 1]]})
    p = found["Layers", "D1"]
    assert (p.severity, p.message) == (Severity.WARNING, "layers column 'Layer 2 outer diam [mm]' is not an input "
                                                         "twistshare reads, so it is ignored")
    assert result.rated.tolist() == [True]


def test_both_layouts_in_one_book_use_the_layers_table_and_say_so():
    result, found = _rate({"Materials": MATS, "Parts": [H1, ["P1", 500, 100, "Core steel", 99]],
                           "Layers": [["Part", "Material", "Outer diameter [mm]"], ["P1", "Core steel", 30]]})
    p = found["Layers", None]
    assert (p.severity, p.code) == (Severity.WARNING, "two-layouts")
    assert p.message == "the book has both layer columns in 'Parts' and a 'Layers' table; the 'Layers' table is used"
    assert result.parts.outer_diameter[0, 0] == 0.030  # the Layers table's 30 mm


def test_hidden_rows_are_told_with_their_table_s_name():
    sheets = {"Materials": [*MATS, ["Spare steel", 80, 100, 200, 0.3]],
              "Parts": [["Part", "Length [mm]", "Torque [N·m]"], ["P1", 500, 100], ["P2", 500, 100]],
              "Layers": [["Part", "Material", "Outer diameter [mm]"], ["P1", "Core steel", 30], ["P2", "Core steel", 30]]}
    result, found = _rate(sheets, hidden={"Materials": [2], "Parts": [1], "Layers": [2]})
    assert found["Materials", "A3"].message == "materials row 3 is hidden; it is rated like any other row"
    assert found["Parts", "A2"].message == "parts row 2 is hidden; it is rated like any other row"
    assert found["Layers", "A3"].message == "layers row 3 is hidden; it is rated like any other row"
    assert all(found[k].severity is Severity.WARNING for k in (("Materials", "A3"), ("Parts", "A2"), ("Layers", "A3")))
    assert result.rated.tolist() == [True, True]


def test_sizing_is_done_only_when_a_part_asks():
    plain, _ = _rate({"Materials": MATS, "Parts": [H1, ROW]})
    assert plain.sizing is None
    asked, _ = _rate({"Materials": MATS, "Parts": [[*H1, "Size"], [*ROW, "outer diameter"],
                                                   ["P2", 500, 100, "Core steel", 30, None]]})
    assert asked.sizing is not None
    assert asked.sizing.sized.tolist() == [True, False]


BOND = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 2 material",
        "Layer 2 outer diameter [mm]", "Layer 2 inner diameter [mm]", "Layer 2 bond allowable [MPa]",
        "Layer 2 bond length [mm]"]


def test_interfaces_of_parts_refused_for_their_inputs_are_not_worded():
    bonded = [500, 100, "Core steel", 30, "Core steel", 40, 30, 10, 20]
    refused, _ = _rate({"Materials": MATS, "Parts": [BOND, ["P1", *bonded], ["P1", *bonded]]})
    assert [p.code for p in refused.problems] == ["part-id-twice", "part-id-twice"]
    rated, found = _rate({"Materials": MATS, "Parts": [BOND, ["P1", *bonded], ["P2", *bonded]]})
    # the average-shear caution, once, where the first rated bond is
    assert [(p.code, p.cell, p.part, p.layer) for p in rated.problems] == [("bond-average", "I2", "P1", 2)]
