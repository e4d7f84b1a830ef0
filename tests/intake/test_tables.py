"""Finding a table in a sheet (`_tables.locate_table`): its header row, the columns recognised,
duplicates and unknown headers, and which rows hold data (the cell addresses the test wrote)."""

from __future__ import annotations

from twistshare.engine.intake._grid import SheetGrid
from twistshare.engine.intake._schema import LAYER_FIELDS, PART_FIELDS
from twistshare.engine.intake._tables import TableSpot, locate_table

FIELDS = PART_FIELDS + LAYER_FIELDS[:3]
HEAD = ["Part", "Torque [N·m]", "Outer diameter [mm]"]


def spot_of(rows, **kw) -> TableSpot | None:
    return locate_table(SheetGrid("Parts", rows), FIELDS, "part", **kw)


def test_header_found_below_a_title_and_its_columns():
    spot = spot_of([["Shafts of line 3"], [], HEAD, ["P1", 100, 40], ["P2", 200, 50]])
    assert spot.sheet == "Parts" and spot.header_row == 2
    assert [(c.field.key, c.index, c.unit) for c in spot.columns] == [
        ("part", 0, None), ("torque", 1, "N·m"), ("outer_diameter", 2, "mm")]
    assert spot.data_rows == (3, 4)
    assert spot.column("torque").header == "Torque [N·m]"
    assert spot.column("length") is None
    assert spot.column("torque", layer=1) is None
    assert spot.duplicates == () and spot.duplicate_headers == () and spot.unknown_headers == ()


def test_a_row_with_only_one_recognised_column_is_not_the_header():
    spot = spot_of([["Part", "nothing"], HEAD, ["P1", 1, 2]])
    assert spot.header_row == 1


def test_the_key_field_must_be_named():
    assert spot_of([["Torque [N·m]", "Outer diameter [mm]"], [1, 2]]) is None
    spot = locate_table(SheetGrid("S", [["Torque [N·m]", "Outer diameter [mm]"], [1, 2]]), FIELDS, None)
    assert spot.header_row == 0 and spot.data_rows == (1,)


def test_header_search_stops_after_thirty_rows():
    assert spot_of([[]] * 29 + [HEAD, ["P1", 1, 2]]).header_row == 29
    assert spot_of([[]] * 30 + [HEAD, ["P1", 1, 2]]) is None


def test_given_header_row_only_that_row():
    rows = [HEAD, ["P1", 1, 2], HEAD, ["P9", 3, 4]]
    assert spot_of(rows, header_row=2).data_rows == (3,)
    assert spot_of(rows, header_row=1) is None
    assert spot_of(rows, header_row=9) is None


def test_last_row_bounds_the_data():
    rows = [HEAD, ["P1", 1, 2], ["P2", 1, 2], ["P3", 1, 2]]
    assert spot_of(rows, last_row=2).data_rows == (1, 2)
    assert spot_of(rows, last_row=3).data_rows == (1, 2, 3)
    assert spot_of(rows, last_row=0).data_rows == ()


def test_columns_outside_the_bounds_are_not_read():
    rows = [["Note", *HEAD, "Length [m]"], ["x", "P1", 1, 2, 3]]
    spot = spot_of(rows, first_col=1, last_col=3)
    assert [c.index for c in spot.columns] == [1, 2, 3]
    assert (spot.first_col, spot.last_col) == (1, 3)
    assert spot_of(rows, first_col=1, last_col=4).column("length").index == 4


def test_duplicate_and_unknown_headers():
    spot = spot_of([["Part", "Torque [N·m]", "Colour", "Design torque [kN·m]", "", 7], ["P1", 1, "red", 2]])
    assert [c.index for c in spot.columns] == [0, 1]
    assert spot.duplicate_headers == ((3, "Design torque [kN·m]"),)
    assert [(d.field.key, d.index, d.unit) for d in spot.duplicates] == [("torque", 3, "kN·m")]
    assert spot.unknown_headers == ((2, "Colour"),)


def test_layer_group_headers():
    rows = [["Part", "Layer 1 outer diameter [mm]", "Layer 2 outer diameter [mm]", "L2 material",
             "Layer 2 outer diameter [in]"], ["P1", 1, 2, "x", 3]]
    spot = spot_of(rows, layer_groups=True)
    assert [(c.field.key, c.layer, c.index) for c in spot.columns] == [
        ("part", 0, 0), ("outer_diameter", 1, 1), ("outer_diameter", 2, 2), ("material", 2, 3)]
    assert spot.column("outer_diameter", 2).index == 2
    assert spot.layer_numbers == (1, 2)
    assert [(d.layer, d.index) for d in spot.duplicates] == [(2, 4)]
    assert spot_of(rows) is None  # without layer groups only the part column is recognised
    spot = spot_of([["Part", "Torque [N·m]", "Layer 1 outer diameter [mm]"], ["P1", 1, 2]])
    assert spot.layer_numbers == () and spot.unknown_headers == ((2, "Layer 1 outer diameter [mm]"),)


def test_data_rows_skip_blank_rows_and_count_error_values():
    rows = [HEAD, ["P1", None, None], [None, None, None], ["  ", "", None], [None, None, None], [],
            ["P2", 5, None], [None, "x", None]]
    grid = SheetGrid("Parts", rows, errors={(4, 1): "#N/A", (2, 5): "#REF!"})
    spot = locate_table(grid, FIELDS, "part")
    # row 3 (index 2) has an error only in an unread column; row 5 (index 4) in a read one
    assert spot.data_rows == (1, 4, 6, 7)


def test_a_column_of_numbers_makes_every_row_data():
    rows = [HEAD, ["P1", 1, 2], [None, 3, None], [None, 4.5, None]]
    assert spot_of(rows).data_rows == (1, 2, 3)


def test_numbers_in_another_column_than_the_first():
    rows = [["Part", "Outer diameter [mm]"], [None, 2], ["P2", 3]]
    assert spot_of(rows).data_rows == (1, 2)


def test_a_number_column_with_a_blank_is_read_cell_by_cell():
    rows = [HEAD, ["P1", 1, 2], [None, None, None], ["P3", 0, 0.0]]
    assert spot_of(rows).data_rows == (1, 3)


def test_mixed_texts_and_numbers_in_every_column():
    rows = [HEAD, ["P1", "x", 1], [3, None, " "], [None, None, None], [None, "", "y"]]
    assert spot_of(rows).data_rows == (1, 2, 4)


def test_without_data():
    spot = spot_of([HEAD, ["P1", 1, 2]], with_data=False)
    assert spot.data_rows == () and spot.header_row == 0


def test_header_cells_of_a_block():
    grid = SheetGrid("B", [["P1", 1, 2], [None, None, None], ["P2", 3, 4]])
    spot = locate_table(grid, FIELDS, "part", header_cells=HEAD + ["Colour", "Torque [kN·m]"])
    assert spot.header_row == -1 and spot.sheet == "B"
    assert [c.field.key for c in spot.columns] == ["part", "torque", "outer_diameter"]
    assert spot.data_rows == (0, 2)  # the blank row between is no data
    assert spot.unknown_headers == ((3, "Colour"),)
    assert [d.index for d in spot.duplicates] == [4] and spot.duplicate_headers == ()
    grid = SheetGrid("B", [["P1", "a"], [None, None], ["P2", "b"]])
    spot = locate_table(grid, FIELDS, "part", header_cells=["Part", "Material"])
    assert spot.data_rows == (0, 2)
    assert locate_table(grid, FIELDS, "part", header_cells=["Part", "Material"], with_data=False).data_rows == ()


def test_blank_and_number_headers_between_columns_are_skipped():
    spot = spot_of([["Part", None, 5, "Torque [N·m]", "Torque [kN·m]", "Length [m]"], ["P1", 1, 1, 1, 1, 1]])
    assert [c.field.key for c in spot.columns] == ["part", "torque", "length"]


def test_a_header_on_the_last_row_has_no_data():
    assert spot_of([["x"], HEAD]).data_rows == ()
    assert spot_of([HEAD], header_row=1) is None


def test_a_first_data_row_shorter_than_the_header():
    assert spot_of([HEAD, ["P1", 1], [None, None, 2]]).data_rows == (1, 2)


def test_two_text_columns_both_count():
    head = ["Part", "Material", "Torque [N·m]"]
    assert spot_of([head, ["P1", ""], ["", "a"], ["", ""], ["P4", " "]]).data_rows == (1, 2, 4)


def test_error_values_at_the_first_data_row_and_after_the_last():
    rows = [HEAD, [None, None, None], ["P2", None, None], [None, None, None]]
    grid = SheetGrid("Parts", rows, errors={(1, 2): "#N/A", (3, 2): "#REF!"})
    assert locate_table(grid, FIELDS, "part", last_row=2).data_rows == (1, 2)


def test_table_region_fields():
    from twistshare.engine.intake._tables import TableRegion

    region = TableRegion("Parts", "Sheet1", 2, 1, 10, 6)
    assert (region.name, region.sheet, region.header_row, region.first_col, region.last_row, region.last_col) == (
        "Parts", "Sheet1", 2, 1, 10, 6)
