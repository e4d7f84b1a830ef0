"""A book's tables found and read together: which table is used, what is said about the book as
a whole, and the notes where a blank was completed from the built-in library.

Library values are the library's cited handbook values (Shigley, Mechanical Engineering Design,
tables A-5 and A-20, for AISI 1045 hot rolled); the density's 0.282 lb/in³ is converted here with
NIST SP 811's pound (0.45359237 kg) and inch (0.0254 m)."""

import pytest
from _membook import MATERIALS, MemoryBook
from twistshare.engine.intake import rate_tables
from twistshare.engine.intake._problems import Severity
from twistshare.engine.intake._tables import TableRegion

PARTS = [["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
          "Layer 1 inner diameter [mm]"],
         ["P1", 500, 100, "Core steel", 30, 0]]
LAYERS = [["Part", "Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]"],
          ["P1", 1, "Core steel", 30, 0]]


def _codes(result, code):
    return [p for p in result.problems if p.code == code]


def test_no_parts_sheet_is_an_unusable_book_saying_where_it_looked():
    with pytest.raises(Exception) as got:
        rate_tables(MemoryBook({"Materials": MATERIALS}))
    assert type(got.value).__name__ == "BookUnusable"
    text = str(got.value)
    assert text.startswith("memory.xlsx: no parts table found: expected a sheet or workbook table named 'Parts'")
    assert "header row naming 'Part'" in text
    assert text.endswith("(looked for a sheet named 'Parts')")


def test_a_parts_sheet_without_a_header_row_says_so():
    with pytest.raises(Exception) as got:
        rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": [["hello"], [1, 2]]}))
    assert str(got.value).endswith("(looked for its header row)")


def test_an_empty_parts_table_is_an_error_on_the_parts_sheet():
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": PARTS[:1]}))
    (p,) = _codes(result, "no-parts")
    assert (p.severity, p.sheet, p.cell, p.message) == (Severity.ERROR, "Parts", None, "the parts table has no parts")


def test_a_workbook_table_wins_over_a_sheet_of_the_same_name_and_says_so():
    book = MemoryBook({"Materials": MATERIALS, "Data": [["x"], *PARTS], "Parts": [["not", "read"]]})
    book.tables = {"parts": TableRegion("PartsTable", "Data", 1, 0, 2, 5)}
    result = rate_tables(book)
    assert result.rated.tolist() == [True]
    (p,) = _codes(result, "two-tables")
    assert (p.severity, p.sheet, p.cell) == (Severity.WARNING, "Parts", None)
    assert p.message.startswith("the book has both a workbook table named 'PartsTable' (on sheet 'Data')")
    assert "a sheet named 'Parts': the table is used, the sheet is not read" in p.message


def test_a_workbook_table_alone_says_nothing_of_a_sheet():
    book = MemoryBook({"Materials": MATERIALS, "Data": [["x"], *PARTS]})
    book.tables = {"parts": TableRegion("Parts", "Data", 1, 0, 2, 5)}
    result = rate_tables(book)
    assert result.rated.tolist() == [True] and _codes(result, "two-tables") == []


def test_layer_columns_and_a_layers_table_warn_that_the_table_is_used():
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": PARTS, "Layers": LAYERS}))
    (p,) = _codes(result, "two-layouts")
    assert (p.severity, p.sheet) == (Severity.WARNING, "Layers")
    assert "both layer columns in 'Parts' and a 'Layers' table" in p.message
    assert p.message.endswith("the 'Layers' table is used")


def test_a_layers_table_alone_rates_the_parts():
    parts = [["Part", "Length [mm]", "Torque [N·m]"], ["P1", 500, 100]]
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": parts, "Layers": LAYERS}))
    assert result.rated.tolist() == [True] and _codes(result, "two-layouts") == []
    assert result.layers_spot is not None and result.layers_spot.sheet == "Layers"
    assert result.parts_spot.sheet == "Parts" and result.materials_spot.sheet == "Materials"
    assert result.system == "SI"


def test_no_materials_sheet_uses_the_library():
    parts = [PARTS[0], ["P1", 500, 100, "AISI 1045 hot rolled", 30, 0]]
    result = rate_tables(MemoryBook({"Parts": parts}))
    assert result.rated.tolist() == [True]
    assert result.materials_spot is None


@pytest.mark.parametrize("sheet, header, what", [
    ("Parts", "Twist limt [deg]", "parts"),
    ("Materials", "Allowable shaer [MPa]", "materials"),
    ("Layers", "Outer diametr [mm]", "layers"),
])
def test_a_misspelt_header_in_any_table_refuses_every_part(sheet, header, what):
    parts = [["Part", "Length [mm]", "Torque [N·m]"], ["P1", 500, 100], ["P2", 500, 100]]
    layers = [LAYERS[0], ["P1", 1, "Core steel", 30, 0], ["P2", 1, "Core steel", 30, 0]]
    sheets = {"Materials": [list(r) for r in MATERIALS], "Parts": parts, "Layers": layers}
    sheets[sheet][0] = sheets[sheet][0] + [header]
    for row in sheets[sheet][1:]:
        row.append(1)
    result = rate_tables(MemoryBook(sheets))
    bad = [p for p in result.problems if p.severity is Severity.ERROR and header in p.message]
    assert len(bad) == 1 and bad[0].sheet == sheet
    assert bad[0].message.startswith(f"{what} column {header!r} looks like")
    assert result.rated.tolist() == [False, False]


def test_library_fills_are_noted_at_the_blank_cell_in_the_handbook_units():
    mats = [["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Allowable shear [MPa]", "Density [kg/m3]",
             "Yield strength [MPa]", "Ultimate strength [MPa]", "Allowable rule"],
            ["AISI 1045 hot rolled", None, None, None, None, None, None, None, "shafting code"]]
    parts = [PARTS[0], ["P1", 500, 100, "AISI 1045 hot rolled", 30, 0]]
    result = rate_tables(MemoryBook({"Materials": mats, "Parts": parts}))
    notes = {p.cell: p for p in _codes(result, "library-fill")}
    expected = {"B2": "G = 79.3 GPa", "C2": "E = 207 GPa", "D2": "Poisson ratio = 0.292",
                "F2": f"density = {0.282 * 0.45359237 / 0.0254 ** 3:.4g} kg/m³",
                "G2": "yield strength = 310 MPa", "H2": "ultimate strength = 570 MPa"}
    assert set(notes) == set(expected)
    for cell, words in expected.items():
        p = notes[cell]
        assert p.severity is Severity.NOTE and p.sheet == "Materials"
        assert p.material == "AISI 1045 hot rolled"
        assert p.message.startswith("blank in the book: the built-in library's value is used "
                                    "(AISI 1045 hot rolled): " + words + "; source: ")
        assert "Shigley" in p.message
    # min(0.30 · 310, 0.18 · 570) = 93 MPa from the filled strengths (hand calculation)
    assert result.materials.by_name[next(iter(result.materials.by_name))].allowable_shear == pytest.approx(93e6)


def test_the_published_table_names_are_the_ones_read():
    from twistshare.engine.intake import TABLE_NAMES
    materials_name, parts_name, layers_name = TABLE_NAMES
    parts = [["Part", "Length [mm]", "Torque [N·m]"], ["P1", 500, 100]]
    result = rate_tables(MemoryBook({materials_name: MATERIALS, parts_name: parts, layers_name: LAYERS}))
    assert result.rated.tolist() == [True]
    assert {result.materials_spot.sheet, result.parts_spot.sheet, result.layers_spot.sheet} == set(TABLE_NAMES)


def test_a_book_without_parts_has_no_results_and_a_book_without_sizing_no_sizing():
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": PARTS[:1]}))
    assert result.rating is None and result.rated is None
    assert result.sizing is None and result.whirl is None
    assert result.plastic is None and result.shear_yield is None
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": PARTS}))
    assert result.sizing is None and result.rating is not None
