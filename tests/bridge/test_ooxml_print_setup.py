"""The print elements of the sheets we add: validation, schema order, print titles, merged cells.

Element order inside <worksheet> is the CT_Worksheet sequence of ECMA-376 Part 1, 18.3.1.99;
print titles are the defined name _xlnm.Print_Titles (18.2.6); header/footer codes 18.3.1.46.
"""

from __future__ import annotations

import re
import zipfile

import openpyxl
import pytest
from twistshare.workbook_bridge.ooxml import BookWriter, Cell, PrintSetup
from twistshare.workbook_bridge.ooxml._print_setup import merge_cells_xml, print_titles_ref, print_xml

# CT_Worksheet children in schema order (ECMA-376 Part 1, 18.3.1.99), the ones that matter here.
_CT_WORKSHEET = ("sheetPr", "dimension", "sheetViews", "sheetFormatPr", "cols", "sheetData", "mergeCells",
                 "printOptions", "pageMargins", "pageSetup", "headerFooter", "rowBreaks", "colBreaks",
                 "drawing", "legacyDrawing")


def _children(xml: str) -> list[str]:
    body = xml[xml.index("<worksheet"):]
    depth, names = 0, []
    for m in re.finditer(r"<(/?)([\w:]+)[^>]*?(/?)>", body):
        closing, name, empty = m.group(1), m.group(2), m.group(3)
        if closing:
            depth -= 1
            continue
        if depth == 1:
            names.append(name)
        if not empty:
            depth += 1
    return names


class TestPrintSetup:
    """PrintSetup refuses what a spreadsheet would misread, naming the field and the value."""

    @pytest.mark.parametrize("kwargs, words", [
        ({"orientation": "sideways"}, "orientation must be 'portrait' or 'landscape': 'sideways'"),
        ({"fit_width": 0}, "fit_width must be a page count >= 1 or None: 0"),
        ({"fit_height": -1}, "fit_height must be a page count >= 0"),
        ({"fit_width": None, "scale": 5}, "scale must be a whole per cent from 10 to 400: 5"),
        ({"scale": 60}, "a fitted sheet takes no scale and no manual breaks"),
        ({"column_breaks": (3,)}, "a fitted sheet takes no scale and no manual breaks"),
        ({"title_rows": (3, 2)}, "title_rows must be (first, last) rows"),
        ({"fit_width": None, "column_breaks": (0,)}, "column_breaks must be 1-based"),
    ])
    def test_refuses_with_the_value(self, kwargs, words):
        with pytest.raises(ValueError) as err:
            PrintSetup(**kwargs)
        assert words in str(err.value)

    def test_fitted_sheet_xml_in_schema_order(self):
        xml = print_xml(PrintSetup(orientation="landscape", fit_width=2))
        assert xml.index("<printOptions") < xml.index("<pageMargins") < xml.index("<pageSetup") < xml.index("<headerFooter")
        assert '<pageSetup orientation="landscape" fitToWidth="2" fitToHeight="0"/>' in xml
        assert "colBreaks" not in xml and "scale=" not in xml

    def test_scaled_sheet_has_its_breaks(self):
        xml = print_xml(PrintSetup(orientation="landscape", fit_width=None, scale=62, column_breaks=(13, 22)))
        assert 'scale="62"' in xml and "fitToWidth" not in xml
        assert '<colBreaks count="2" manualBreakCount="2"><brk id="13" max="1048575" man="1"/>' in xml
        assert xml.index("</headerFooter>") < xml.index("<colBreaks")

    def test_print_titles_reference(self):
        ref = print_titles_ref("Bob's sheet", PrintSetup(title_rows=(8, 8), title_columns=2))
        assert ref == "'Bob''s sheet'!$A:$B,'Bob''s sheet'!$8:$8"
        assert print_titles_ref("S", PrintSetup()) is None

    @pytest.mark.parametrize("bad", ["A1", "B3:A3", "A1:A1"])
    def test_merged_range_must_span(self, bad):
        with pytest.raises(ValueError, match=re.escape(repr(bad))):
            merge_cells_xml([bad])


class TestWrittenSheet:
    """A sheet added with every print element reads back in openpyxl as written."""

    def test_elements_in_schema_order_and_read_back(self, ooxml_plain_book, tmp_path):
        out = tmp_path / "out.xlsx"
        setup = PrintSetup(orientation="landscape", fit_width=None, scale=70, title_rows=(2, 2), title_columns=1,
                           column_breaks=(2,))
        with BookWriter(ooxml_plain_book) as book:
            h = book.add_sheet("T", [["a long title across the sheet"], [Cell("Part", "header"), "x", "y"],
                                     ["MPD-S-001", 1.5, 2]], print_setup=setup, merged_cells=["A1:C1"],
                               tab_color="FF1F3A4D", freeze_header=2)
            book.write(out)
        with zipfile.ZipFile(out) as z:
            xml = z.read(h.part).decode("utf-8")
        names = [n for n in _children(xml) if n in _CT_WORKSHEET]
        assert names == sorted(names, key=_CT_WORKSHEET.index)
        assert {"mergeCells", "printOptions", "pageSetup", "headerFooter", "colBreaks"} <= set(names)
        ws = openpyxl.load_workbook(out)["T"]
        assert ws.page_setup.orientation == "landscape" and ws.page_setup.scale == 70
        assert not ws.sheet_properties.pageSetUpPr or not ws.sheet_properties.pageSetUpPr.fitToPage
        assert ws.print_title_rows == "$2:$2" and ws.print_title_cols == "$A:$A"
        assert [b.id for b in ws.col_breaks.brk] == [2]
        assert "A1:C1" in {str(r) for r in ws.merged_cells.ranges}
        assert "&P" in ws.oddFooter.right.text and ws.freeze_panes == "A3"

    def test_default_prints_one_page_wide(self, ooxml_plain_book, tmp_path):
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_plain_book) as book:
            book.add_sheet("T", [["x"]])
            book.write(out)
        ws = openpyxl.load_workbook(out)["T"]
        assert ws.sheet_properties.pageSetUpPr.fitToPage is True
        assert ws.page_setup.fitToWidth == 1 and ws.page_setup.fitToHeight == 0
        assert ws.page_setup.orientation == "portrait"
