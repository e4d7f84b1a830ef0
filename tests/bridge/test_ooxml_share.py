"""replace_formulas (for `share`): only the named cells change; the calculation chain goes."""

from __future__ import annotations

import re
import zipfile

import pytest
from twistshare.workbook_bridge.ooxml import BookWriter, WriteRefused


class TestReplaceFormulas:
    """Formula cells become values; nothing else in the sheet moves."""

    def test_values_replace_formulas(self, ooxml_rich_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_rich_book) as book:
            old = book.replace_formulas("Parts", {"C6": 975.0})
            report = book.write(out)
        assert old == {"C6": "SUM(C2:C5)"}
        before, after = ooxml_kit.members(ooxml_rich_book), ooxml_kit.members(out)
        sheet = "xl/worksheets/sheet1.xml"
        new_cell = re.search(r'<c r="C6"[^>]*>.*?</c>', after[sheet].decode()).group(0)
        assert "<f>" not in new_cell and "<v>975.0</v>" in new_cell
        old_text = re.sub(r'<c r="C6"[^>]*>.*?</c>', "", before[sheet].decode())
        assert re.sub(r'<c r="C6"[^>]*>.*?</c>', "", after[sheet].decode()) == old_text
        # calcChain lists formula cells: removed with its relationship and content type.
        assert report.removed == ("xl/calcChain.xml",)
        assert "xl/calcChain.xml" not in after
        assert b"calcChain" not in after["xl/_rels/workbook.xml.rels"]
        assert b"calcChain" not in after["[Content_Types].xml"]
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        assert book["Parts"]["C6"].value == 975.0 and book["Parts"]["C6"].data_type == "n"

    def test_text_value_stays_text(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_plain_book) as book:
            book.replace_formulas("Parts", {"C6": "=not a formula"})
            book.write(out)
        book, _ = ooxml_kit.load_clean(out)
        assert book["Parts"]["C6"].value == "=not a formula" and book["Parts"]["C6"].data_type == "s"

    def test_style_kept(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_plain_book) as book:
            book.replace_formulas("Parts", {"E2": 45356.0})  # a date cell (no formula): value and style kept
            book.write(out)
        book, _ = ooxml_kit.load_clean(out)
        assert book["Parts"]["E2"].is_date

    def test_missing_cell_refused(self, ooxml_plain_book):
        with BookWriter(ooxml_plain_book) as book:
            with pytest.raises(WriteRefused, match=r"cell\(s\) Z99 not found"):
                book.replace_formulas("Parts", {"Z99": 1.0})

    def test_shared_formula_master_needs_its_followers(self, ooxml_plain_book, tmp_path, ooxml_kit):
        with zipfile.ZipFile(ooxml_plain_book) as zf:
            sheet = zf.read("xl/worksheets/sheet2.xml").decode()
        # Materials!D2:D3 as one shared formula: D2 holds its text, D3 only refers to it (si="0").
        sheet = re.sub(r'(<row r="2"[^>]*>.*?)(</row>)', r'\1<c r="D2"><f t="shared" ref="D2:D3" si="0">B2*2</f><v>160</v></c>\2',
                       sheet, count=1, flags=re.S)
        sheet = re.sub(r'(<row r="3"[^>]*>.*?)(</row>)', r'\1<c r="D3"><f t="shared" si="0"/><v>52</v></c>\2',
                       sheet, count=1, flags=re.S)
        assert sheet.count('si="0"') == 2
        path = ooxml_kit.rezip(ooxml_plain_book, tmp_path / "shared.xlsx", replace={"xl/worksheets/sheet2.xml": sheet})
        with BookWriter(path) as book:
            with pytest.raises(WriteRefused, match="cell D2 holds the shared formula also used by cell D3"):
                book.replace_formulas("Materials", {"D2": 160.0})
        with BookWriter(path) as book:
            formulas = book.replace_formulas("Materials", {"D2": 160.0, "D3": 52.0})
            book.write(tmp_path / "out.xlsx")
        assert formulas == {"D2": "B2*2", "D3": ""}
        book, caught = ooxml_kit.load_clean(tmp_path / "out.xlsx")
        assert caught == [] and book["Materials"]["D2"].value == 160.0 and book["Materials"]["D3"].value == 52.0
