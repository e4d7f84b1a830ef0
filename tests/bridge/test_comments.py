"""Comments on the input cells (`workbook_bridge/sheets/_comments.py`): a problem with a cell goes
on that cell; a part-level problem (no cell) goes on the part's id cell, in the spreadsheet's A1
notation (row 1 is the header, the first part is row 2: common practice of A1 references)."""

from __future__ import annotations

from _membook import rate_parts
from twistshare.engine.intake import Problem, Severity
from twistshare.workbook_bridge.sheets._comments import comment_map, first_errors

HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]"]


def _result():
    return rate_parts(HEAD, ["P1", 500, 300, "Core steel", 40], ["P2", 500, 300, "Core steel", 40],
                      ["P3", 500, 300, "Core steel", 40])


def test_part_level_problem_goes_on_the_part_id_cell():
    result = _result()
    found = [Problem(Severity.ERROR, None, None, "part P2: something", part="P2"),
             Problem(Severity.WARNING, None, None, "part P3: else", part="P3")]
    assert comment_map(result, found) == {
        "Parts": {"A3": "twistshare error: part P2: something", "A4": "twistshare warning: part P3: else"}}


def test_part_id_column_not_first():
    head = ["Length [mm]", "Part", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]"]
    result = rate_parts(head, [500, "Q1", 300, "Core steel", 40], [500, "Q2", 300, "Core steel", 40])
    found = [Problem(Severity.ERROR, None, None, "x", part="Q2")]
    assert comment_map(result, found) == {"Parts": {"B3": "twistshare error: x"}}


def test_cell_problems_stay_on_their_cell_and_repeats_are_merged():
    result = _result()
    found = [Problem(Severity.ERROR, None, None, "nowhere", part="P9"),
             Problem(Severity.ERROR, "Parts", None, "a sheet but no cell", part="P9"),
             Problem(Severity.ERROR, "Parts", "C2", "a", part="P1"),
             Problem(Severity.ERROR, "Parts", "C2", "a", part="P1"),
             Problem(Severity.WARNING, "Parts", "C2", "b", part="P1")]
    assert comment_map(result, found) == {"Parts": {"C2": "twistshare error: a\ntwistshare warning: b"}}


def test_first_errors_per_part():
    found = [Problem(Severity.WARNING, None, None, "w", part="P1"),
             Problem(Severity.ERROR, None, None, "e1", part="P1"),
             Problem(Severity.ERROR, None, None, "e2", part="P1"),
             Problem(Severity.ERROR, None, None, "e3", part="P2"),
             Problem(Severity.ERROR, None, None, "no part")]
    assert first_errors(found) == {"P1": "e1", "P2": "e3"}


def test_without_a_parts_table_spot_cell_problems_still_map():
    import dataclasses

    result = dataclasses.replace(_result(), parts_spot=None)
    found = [Problem(Severity.ERROR, None, None, "part-level", part="P1"),
             Problem(Severity.ERROR, "Materials", "B2", "m")]
    assert comment_map(result, found) == {"Materials": {"B2": "twistshare error: m"}}
