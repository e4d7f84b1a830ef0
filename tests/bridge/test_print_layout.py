"""How the sheets of a rated copy print, read back from the package (openpyxl reads what we wrote).

Every sheet we write has a page setup; the wide results sheet prints in column bands with the
part id and status repeated; header rows are tall enough for their wrapped headers; number
columns show about four significant digits while the cells keep full precision; only the layer
groups the parts use are written. The sample books' own sheets are set up for print too.
"""

from __future__ import annotations

import math
import re
import zipfile
from pathlib import Path

import openpyxl
import pytest
from twistshare.workbook_bridge.commands import main
from twistshare.workbook_bridge.ooxml import write_sheet_selection
from twistshare.workbook_bridge.sheets._layout import (
    column_width,
    header_height,
    number_style,
    wrapped_lines,
)

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"
OUR_SHEETS = ("Twistshare results", "Twistshare summary", "Twistshare warnings", "Twistshare materials")


@pytest.fixture(scope="module")
def rated(tmp_path_factory) -> Path:
    out = tmp_path_factory.mktemp("print") / "rated.xlsx"
    assert main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", str(out), "--lenient", "-q"]) == 0
    return out


@pytest.fixture(scope="module")
def book(rated):
    return openpyxl.load_workbook(rated)


def _fits(ws) -> bool:
    return bool(ws.sheet_properties.pageSetUpPr and ws.sheet_properties.pageSetUpPr.fitToPage)


class TestEverySheetHasAPageSetup:
    def test_each_sheet_we_write(self, book):
        ours = [ws for ws in book.worksheets if ws.title.startswith("Twistshare ")]
        assert {ws.title for ws in ours} >= set(OUR_SHEETS) and any(ws.title.startswith("Twistshare calc") for ws in ours)
        for ws in ours:
            assert ws.page_setup.orientation in ("portrait", "landscape"), ws.title
            assert "&P" in ws.oddFooter.right.text, ws.title  # page numbers
            if ws.title in ("Twistshare results", "Twistshare summary"):  # printed at a scale, with breaks
                assert not _fits(ws) and 40 <= ws.page_setup.scale <= 100, ws.title
                continue
            assert _fits(ws) and ws.page_setup.fitToWidth == 1, ws.title  # one page wide

    def test_results_print_in_bands_with_part_and_status_repeated(self, book):
        ws = book["Twistshare results"]
        assert ws.page_setup.orientation == "landscape" and not _fits(ws)
        assert 40 <= ws.page_setup.scale <= 100
        assert ws.print_title_cols == "$A:$B" and ws.print_title_rows == "$1:$1"
        header = [c.value for c in ws[1]]
        breaks = [b.id for b in ws.col_breaks.brk]
        assert breaks, "a sheet this wide prints in bands"
        # each band ends where a group ends: after the part's own columns or a layer group's last column
        for b in breaks:
            assert header[b - 1] == "Twist-limit capacity [N·m]" or header[b - 1].endswith("utilisation with Kt [%]")

    def test_summary_charts_sit_inside_the_page_and_no_break_cuts_one(self, book, rated):
        ws = book["Twistshare summary"]
        breaks = [b.id for b in ws.row_breaks.brk]
        assert len(breaks) == 1
        with zipfile.ZipFile(rated) as z:
            drawings = [z.read(n).decode() for n in z.namelist() if n.startswith("xl/drawings/drawing")]
        anchors = [(int(a), int(b), int(c), int(d)) for xml in drawings for a, b, c, d in re.findall(
            r"<xdr:from><xdr:col>(\d+)</xdr:col>.*?<xdr:row>(\d+)</xdr:row>.*?<xdr:to><xdr:col>(\d+)</xdr:col>"
            r".*?<xdr:row>(\d+)</xdr:row>", xml)]
        assert len(anchors) == 3
        for c1, r1, c2, r2 in anchors:  # zero-based: columns A..E are 0..4, a chart ends before column F
            assert 0 <= c1 < c2 <= 5
            assert all((r1 + 1 > b) == (r2 > b) for b in breaks), (r1, r2, breaks)

    def test_warnings_header_repeats(self, book):
        ws = book["Twistshare warnings"]
        row = int(ws.print_title_rows.split(":")[0].strip("$"))
        assert [c.value for c in ws[row]][:6] == ["Sheet", "Cell", "Part", "Layer", "Severity", "Message"]
        cells = [ws.cell(row + 1, c) for c in range(1, 7) if ws.cell(row + 1, c).value is not None]
        assert len(cells) >= 4 and all(c.alignment.vertical == "top" for c in cells)  # labels beside the message

    def test_materials_sheet_repeats_header_and_names(self, book):
        ws = book["Twistshare materials"]
        assert ws.print_title_rows == "$1:$1" and ws.print_title_cols == "$A:$A"
        assert ws.page_setup.orientation == "landscape"


class TestSizedForTheirText:
    def test_header_rows_tall_enough(self, book):
        for name in ("Twistshare results", "Twistshare materials"):
            ws = book[name]
            heights = []
            for cell in ws[1]:
                width = ws.column_dimensions[cell.column_letter].width
                heights.append(wrapped_lines(cell.value, width, bold=True))
            assert ws.row_dimensions[1].height >= 14 * max(heights), name
            assert max(heights) >= 2  # the test means something: some headers do wrap

    def test_no_header_word_is_cut(self, book):
        ws = book["Twistshare results"]
        for cell in ws[1]:
            width = ws.column_dimensions[cell.column_letter].width
            longest = max(len(w) for w in cell.value.split())
            assert width >= longest * 1.1, (cell.value, width)

    def test_long_problem_text_wrapped_and_row_taller(self, book):
        ws = book["Twistshare results"]
        header = [c.value for c in ws[1]]
        col = header.index("First problem") + 1
        tall = [r for r in range(2, ws.max_row + 1)
                if isinstance(ws.cell(r, col).value, str) and len(ws.cell(r, col).value) > 150]
        assert tall
        for r in tall:
            cell = ws.cell(r, col)
            assert cell.alignment.wrap_text
            lines = wrapped_lines(cell.value, ws.column_dimensions[cell.column_letter].width)
            assert ws.row_dimensions[r].height >= 14 * lines >= 28

    def test_long_summary_lines_merged_across_the_blocks(self, book):
        ws = book["Twistshare summary"]
        merged = {str(r) for r in ws.merged_cells.ranges}
        reading = next(r for r in range(1, 40) if ws.cell(r, 1).value == "Reading the results")
        assert f"A{reading + 1}:E{reading + 1}" in merged
        assert ws.cell(reading + 1, 1).alignment.wrap_text


class TestNumbers:
    def test_formats_show_four_significant_digits(self, book):
        ws = book["Twistshare results"]
        header = [c.value for c in ws[1]]
        col = header.index("Governing limit [N·m]") + 1
        values = [ws.cell(r, col).value for r in range(2, ws.max_row + 1) if ws.cell(r, col).value is not None]
        top = max(abs(v) for v in values)
        fmt = ws.cell(2, col).number_format
        decimals = len(fmt.split(".")[1]) if "." in fmt else 0
        whole = math.floor(math.log10(top)) + 1
        assert whole + decimals == max(4, whole)  # four digits of the largest value (no decimals past 9999)
        assert any(v != round(v, decimals) for v in values)  # the cell keeps full precision

    @pytest.mark.parametrize("values, style", [
        ([1234.5, 12.3], "fixed0"), ([0.01234], "fixed5"), ([45.0, 50.0], "fixed2"), ([2.5e7], "sci"),
        ([0.0001], "sci"), ([float("nan")], "fixed1"), ([-12.3, 5.0], "fixed2"),
    ])
    def test_number_style(self, values, style):
        assert number_style(values) == style

    def test_materials_numbers_formatted(self, book):
        ws = book["Twistshare materials"]
        header = [c.value for c in ws[1]]
        g = header.index("G [GPa]") + 1
        assert all(ws.cell(r, g).number_format != "General" for r in range(2, ws.max_row + 1)
                   if isinstance(ws.cell(r, g).value, float))

    def test_materials_say_when_blanks_came_from_the_library(self, book):
        ws = book["Twistshare materials"]
        froms = {ws.cell(r, 1).value: ws.cell(r, 2).value for r in range(2, ws.max_row + 1)}
        assert froms["AISI 1045 hot rolled"] == "book, blanks from the library"
        assert froms["MPD core steel Q2"] == "book"


def test_only_layer_groups_the_parts_use(tmp_path):
    """A book with empty layer 3 columns gets no L3 columns in its results."""
    src = tmp_path / "two.xlsx"
    wb = openpyxl.Workbook()
    m = wb.active
    m.title = "Materials"
    m.append(["Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule"])
    m.append(["MPD core steel Q2", 80, 120, "given"])
    m.append(["MPD duplex sleeve", 77, 100, "given"])
    p = wb.create_sheet("Parts")
    p.append(["Part", "Length [mm]", "Torque [N·m]"] + [f"Layer {n} {f}" for n in (1, 2, 3) for f in
                                                       ("material", "outer diameter [mm]", "inner diameter [mm]")])
    p.append(["MPD-S-001", 600, 900, "MPD core steel Q2", 40, 0, "MPD duplex sleeve", 46, 40, None, None, None])
    wb.save(src)
    out = tmp_path / "two-rated.xlsx"
    assert main(["rate", str(src), "-o", str(out), "-q"]) == 0
    header = [c.value for c in openpyxl.load_workbook(out)["Twistshare results"][1]]
    assert "L2 material" in header and not any(h.startswith("L3") for h in header)


def test_layout_helpers_agree():
    """A width chosen for a header holds it on the lines asked, and the height holds those lines."""
    head = "L1 capacity (section torque) [N·m]"
    width = column_width(head, 6, lines=3)
    assert wrapped_lines(head, width, bold=True) <= 3
    assert header_height([head], [width]) >= 14 * wrapped_lines(head, width, bold=True)


class TestSampleBooks:
    @pytest.mark.parametrize("name", ["marrowby_catalogue.xlsx", "marrowby_catalogue_by_layer.xlsx",
                                      "marrowby_cell_functions.xlsx"])
    def test_every_sheet_fits_its_page_width(self, name):
        wb = openpyxl.load_workbook(SAMPLES / name)
        for ws in wb.worksheets:
            assert _fits(ws) and ws.page_setup.fitToWidth in (1, 2) and ws.page_setup.fitToHeight == 0, ws.title
            if ws.title in ("Materials", "Parts", "Layers"):
                assert ws.print_title_rows == "$1:$1" and ws.page_setup.orientation == "landscape"
                lines = max(wrapped_lines(c.value, ws.column_dimensions[c.column_letter].width, bold=True)
                            for c in ws[1])
                assert ws.row_dimensions[1].height >= 14 * lines

    def test_read_me_rows_tall_enough(self):
        ws = openpyxl.load_workbook(SAMPLES / "marrowby_catalogue.xlsx")["Read me"]
        width = ws.column_dimensions["A"].width
        for r in range(1, ws.max_row + 1):
            text = ws.cell(r, 1).value
            if isinstance(text, str) and wrapped_lines(text, width) > 1:
                assert (ws.row_dimensions[r].height or 15) >= 14 * wrapped_lines(text, width), text[:40]


def test_sheet_selection_shows_only_the_report(rated, tmp_path):
    out = tmp_path / "report.xlsx"
    chosen = ["Twistshare summary", "Twistshare warnings"]
    write_sheet_selection(rated, out, chosen)
    wb = openpyxl.load_workbook(out)
    assert wb.sheetnames[:2] == chosen
    assert [ws.sheet_state for ws in wb.worksheets[:2]] == ["visible", "visible"]
    assert all(ws.sheet_state == "hidden" for ws in wb.worksheets[2:])
    # the results' print titles moved with their sheet (localSheetId follows the new position)
    assert wb["Twistshare results"].print_title_cols == "$A:$B"
    with zipfile.ZipFile(rated) as a, zipfile.ZipFile(out) as b:
        for name in a.namelist():
            if name != "xl/workbook.xml":
                assert a.read(name) == b.read(name), name
