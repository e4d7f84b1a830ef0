"""BookWriter.fill_cells: fills only empty cells of an input sheet, in the copy, with our style."""

from __future__ import annotations

import hashlib

import openpyxl
import pytest
from twistshare.workbook_bridge.ooxml import BookWriter, Cell, WriteRefused


@pytest.fixture()
def book(tmp_path):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Materials"
    ws.append(["Material", "G [GPa]", "E [GPa]"])
    ws.append(["AISI 1045 hot rolled", None, 207])
    ws["D5"] = "kept"
    path = tmp_path / "in.xlsx"
    wb.save(path)
    return path


def test_fills_absent_cells_with_the_style(book, tmp_path):
    before = hashlib.sha256(book.read_bytes()).hexdigest()
    out = tmp_path / "out.xlsx"
    with BookWriter(book) as w:
        w.fill_cells("Materials", {"B2": Cell(79.3, "filled"), "A4": "new row", "F5": 1.5})
        w.write(out)
    assert hashlib.sha256(book.read_bytes()).hexdigest() == before
    ws = openpyxl.load_workbook(out)["Materials"]
    assert ws["B2"].value == 79.3 and ws["B2"].font.i
    assert ws["A4"].value == "new row"
    assert ws["F5"].value == 1.5 and ws["D5"].value == "kept"
    assert ws["C2"].value == 207


@pytest.mark.parametrize("ref", ["C2", "A1", "D5"])
def test_refuses_cells_that_hold_something(book, ref):
    with BookWriter(book) as w, pytest.raises(WriteRefused, match="already holds"):
        w.fill_cells("Materials", {ref: 1.0})


def test_text_stays_text(book, tmp_path):
    out = tmp_path / "out.xlsx"
    with BookWriter(book) as w:
        w.fill_cells("Materials", {"B2": "=1+1"})
        w.write(out)
    c = openpyxl.load_workbook(out)["Materials"]["B2"]
    assert c.value == "=1+1" and c.data_type == "s"


def test_print_titles_repeat_the_part_columns(book, tmp_path):
    """Print titles are the workbook defined name _xlnm.Print_Titles (ECMA-376 Part 1, 18.2.6)."""
    out = tmp_path / "out.xlsx"
    with BookWriter(book) as w:
        h = w.add_sheet("Twistshare results", [["Part", "Status", "x"], ["P1", "ok", 1.0]])
        w.set_print_titles(h, columns=2, rows=1)
        w.write(out)
    ws = openpyxl.load_workbook(out)["Twistshare results"]
    assert ws.print_title_cols.replace("$", "") == "A:B" and ws.print_title_rows.replace("$", "") == "1:1"


def test_print_titles_need_something_to_repeat(book):
    with BookWriter(book) as w:
        h = w.add_sheet("S", [["a"]])
        with pytest.raises(ValueError):
            w.set_print_titles(h)
