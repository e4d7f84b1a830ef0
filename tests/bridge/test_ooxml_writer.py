"""BookWriter: added sheets, styles, text safety, atomic writing, untouched members."""

from __future__ import annotations

import os
import re
import zipfile

import pytest
from twistshare.workbook_bridge.ooxml import STYLE_NAMES, BookWriter, Cell, WriteRefused


def _write(src, out, build):
    with BookWriter(src) as book:
        build(book)
        return book.write(out)


class TestAddSheet:
    """Values, types and text come back exactly as written."""

    def test_values_round_trip(self, ooxml_plain_book, tmp_path, ooxml_kit):
        rows = [["Part", "Margin", "Rated", "Count"],
                ["MPD-S-014", 0.4213, True, 3],
                ["MPD-T-203", -1.5e-7, False, 12345678901],
                ["MPD-T-207", float("nan"), None, float("inf")]]
        out = tmp_path / "out.xlsx"
        _write(ooxml_plain_book, out, lambda b: b.add_sheet("Twistshare results", rows))
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        got = [list(r) for r in book["Twistshare results"].iter_rows(values_only=True)]
        assert got[:3] == [r for r in rows[:3]]
        assert got[3] == ["MPD-T-207", None, None, None]  # NaN and inf are written as empty cells

    def test_formula_looking_text_stays_text(self, ooxml_plain_book, tmp_path, ooxml_kit):
        texts = ["=1+1", '=HYPERLINK("http://example.invalid","x")', "+A1", "-2+3", "@SUM(A1)", "=cmd|' /C calc'!A0"]
        out = tmp_path / "out.xlsx"
        report = _write(ooxml_plain_book, out, lambda b: b.add_sheet("T", [[t] for t in texts]))
        sheet_xml = ooxml_kit.members(out)[report.added[0]].decode()
        assert "<f>" not in sheet_xml and "<f " not in sheet_xml
        book, _ = ooxml_kit.load_clean(out)
        cells = [row[0] for row in book["T"].iter_rows()]
        assert [c.value for c in cells] == texts
        assert {c.data_type for c in cells} == {"s"}

    def test_text_is_escaped_and_cleaned(self, ooxml_plain_book, tmp_path, ooxml_kit):
        nasty = ["a<b>&c\"d'", "bell\x07 and nul\x00 gone", "  leading space", "line1\nline2", "x" * 40000]
        out = tmp_path / "out.xlsx"
        _write(ooxml_plain_book, out, lambda b: b.add_sheet("T", [[t] for t in nasty]))
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        got = [r[0] for r in book["T"].iter_rows(values_only=True)]
        assert got[0] == nasty[0]
        assert got[1] == "bell and nul gone"
        assert got[2] == "  leading space"
        assert got[3] == "line1\nline2"
        assert len(got[4]) == 32767 and got[4].endswith("\u2026")  # a cell holds 32,767 characters

    def test_numpy_scalars(self, ooxml_plain_book, tmp_path, ooxml_kit):
        np = pytest.importorskip("numpy")
        out = tmp_path / "out.xlsx"
        _write(ooxml_plain_book, out, lambda b: b.add_sheet("T", [[np.float64(1.25), np.int32(7), np.bool_(True), np.float32("nan")]]))
        book, _ = ooxml_kit.load_clean(out)
        ws = book["T"]
        assert [ws["A1"].value, ws["B1"].value, ws["C1"].value, ws["D1"].value] == [1.25, 7, True, None]

    def test_unsupported_value_names_the_cell(self, ooxml_plain_book):
        with BookWriter(ooxml_plain_book) as book:
            with pytest.raises(TypeError, match=r"cell C2: a dict cannot be written"):
                book.add_sheet("T", [["a"], [1, 2, {"x": 1}]])

    def test_sheet_layout_options(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"

        def build(b):
            handle = b.add_sheet("Twistshare summary", [["Parts rated", 31]], column_widths=[28, None, 12],
                                 tab_color="FF1F3A4D", print_fit_one_page=True, freeze_header=True)
            b.set_print_area(handle, "A1:H40")

        _write(ooxml_plain_book, out, build)
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        ws = book["Twistshare summary"]
        assert ws.freeze_panes == "A2"
        assert ws.column_dimensions["A"].width == pytest.approx(28)
        assert ws.column_dimensions["C"].width == pytest.approx(12)
        assert ws.sheet_properties.tabColor.rgb == "FF1F3A4D"
        assert ws.sheet_properties.pageSetUpPr.fitToPage is True
        assert ws.page_setup.fitToWidth == 1 and ws.page_setup.fitToHeight == 1
        assert ws.print_area == "'Twistshare summary'!$A$1:$H$40"


class TestSheetNames:
    """Names follow the spreadsheet rules; a taken name gets a number."""

    @pytest.mark.parametrize("bad", ["", "a" * 32, "x[1]", "a:b", "a*b", "a?b", "a/b", "a\\b", "'q", "History"])
    def test_invalid_names_refused(self, ooxml_plain_book, bad):
        with BookWriter(ooxml_plain_book) as book:
            with pytest.raises(WriteRefused, match="sheet name"):
                book.add_sheet(bad, [[1]])

    def test_taken_names_get_a_number(self, ooxml_plain_book):
        with BookWriter(ooxml_plain_book) as book:
            assert book.add_sheet("parts", [[1]]).name == "parts (2)"  # "Parts" exists (case-insensitive)
            assert book.add_sheet("Parts", [[1]]).name == "Parts (3)"
            long = book.add_sheet("M" * 31, [[1]]).name
            assert book.add_sheet("M" * 31, [[1]]).name == "M" * 27 + " (2)" and long == "M" * 31


class TestStyles:
    """Our styles are appended; the user's formats keep their indexes."""

    def test_style_names_and_look(self, ooxml_plain_book, tmp_path, ooxml_kit):
        rows = [[Cell(name, "header") for name in STYLE_NAMES],
                [Cell(0.5, name) for name in STYLE_NAMES],
                [Cell(0.25, "fail+percent")]]
        out = tmp_path / "out.xlsx"
        _write(ooxml_plain_book, out, lambda b: b.add_sheet("T", rows))
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        ws = book["T"]
        header = ws["A1"]
        assert header.font.b and header.font.color.rgb == "FFFFFFFF" and header.fill.fgColor.rgb == "FF1F3A4D"
        by_name = {name: ws.cell(row=2, column=i + 1) for i, name in enumerate(STYLE_NAMES)}
        assert by_name["percent"].number_format == "0.0%"
        assert by_name["number"].number_format == "0.000"
        assert by_name["fail"].fill.fgColor.rgb == "FFF6D3CF" and by_name["fail"].font.b
        assert by_name["caution"].alignment.wrap_text
        assert len({by_name[n].fill.fgColor.rgb for n in ("fail", "warn", "caution", "filled")}) == 4
        combo = ws["A3"]
        assert combo.number_format == "0.0%" and combo.fill.fgColor.rgb == "FFF6D3CF"

    def test_unknown_style_refused(self, ooxml_plain_book):
        with BookWriter(ooxml_plain_book) as book:
            with pytest.raises(ValueError, match="unknown cell style 'loud'"):
                book.add_sheet("T", [[Cell(1, "loud")]])

    def test_existing_formats_keep_their_indexes(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        _write(ooxml_plain_book, out, lambda b: b.add_sheet("T", [[Cell(1, "header"), Cell(2, "percent")]]))
        before = ooxml_kit.members(ooxml_plain_book)["xl/styles.xml"].decode()
        after = ooxml_kit.members(out)["xl/styles.xml"].decode()
        for block in ("numFmts", "fonts", "fills", "borders", "cellXfs"):
            old = re.search(rf"<{block}[^>]*>(.*?)</{block}>", before, re.S)
            new = re.search(rf"<{block}[^>]*>(.*?)</{block}>", after, re.S)
            if old:
                assert new.group(1).startswith(old.group(1)), block  # appended, never reordered
            count = re.search(rf'<{block} count="(\d+)"', after)
            child = {"numFmts": "numFmt", "fonts": "font", "fills": "fill", "borders": "border", "cellXfs": "xf"}[block]
            assert int(count.group(1)) == len(re.findall(rf"<{child}[\s>/]", new.group(1))), block
        assert set(ooxml_kit.element_multiset(before.encode())) <= set(ooxml_kit.element_multiset(after.encode()))
        book, _ = ooxml_kit.load_clean(out)
        assert book["Parts"]["E2"].is_date  # the user's date format still applies to their cells


class TestNothingLost:
    """The input is untouched; members we do not own come out byte for byte."""

    def test_input_unchanged_and_members_identical(self, ooxml_rich_book, tmp_path, ooxml_kit):
        before_hash = ooxml_kit.sha256(ooxml_rich_book)
        before = ooxml_kit.members(ooxml_rich_book)
        out = tmp_path / "out.xlsx"

        def build(b):
            h = b.add_sheet("Twistshare results", [["Part", "Margin"], ["MPD-S-014", 0.3]])
            b.add_comments("Parts", {"C3": "torque looks high for this length"})
            b.add_comments(h, {"B2": "governing: layer 2 stress"})

        report = _write(ooxml_rich_book, out, build)
        assert ooxml_kit.sha256(ooxml_rich_book) == before_hash
        after = ooxml_kit.members(out)
        assert set(report.copied) | set(report.changed) == set(before)
        for name in report.copied:
            assert after[name] == before[name], name
        assert set(report.added) == set(after) - set(before)
        # Changed members still hold every element they held.
        for name in report.changed:
            if name.endswith(".vml"):  # legacy VML: shapes appended before </xml>, our id block listed in idmap
                old_vml, new_vml = (re.sub(rb'(idmap[^>]*data=")[^"]*"', rb'\1"', x) for x in (before[name], after[name]))
                assert new_vml.startswith(old_vml[: old_vml.rfind(b"</xml>")])
                assert re.search(rb'idmap[^>]*data="1,\d+"', after[name])
                continue
            old, new = ooxml_kit.element_multiset(before[name]), ooxml_kit.element_multiset(after[name])
            missing = [e for e in set(old) if old.count(e) > new.count(e)]
            assert not missing, (name, missing[:3])
        assert set(report.changed) <= {"[Content_Types].xml", "xl/workbook.xml", "xl/_rels/workbook.xml.rels",
                                       "xl/styles.xml", "xl/worksheets/sheet1.xml", "xl/comments/comment1.xml",
                                       "xl/drawings/commentsDrawing1.vml"}

    def test_member_order_and_metadata_kept(self, ooxml_rich_book, tmp_path):
        out = tmp_path / "out.xlsx"
        _write(ooxml_rich_book, out, lambda b: b.add_sheet("T", [[1]]))
        with zipfile.ZipFile(ooxml_rich_book) as zin, zipfile.ZipFile(out) as zout:
            old = zin.infolist()
            new = {i.filename: i for i in zout.infolist()}
            assert [i.filename for i in zout.infolist()][: len(old)] == [i.filename for i in old]
            for info in old:
                assert new[info.filename].date_time == info.date_time
                assert new[info.filename].compress_type == info.compress_type
                assert new[info.filename].CRC == info.CRC or info.filename in {
                    "[Content_Types].xml", "xl/workbook.xml", "xl/_rels/workbook.xml.rels"}

    def test_workbook_part_is_inserted_into_not_rewritten(self, ooxml_rich_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        _write(ooxml_rich_book, out, lambda b: b.add_sheet("Twistshare results", [[1]]))
        before = ooxml_kit.members(ooxml_rich_book)["xl/workbook.xml"].decode()
        after = ooxml_kit.members(out)["xl/workbook.xml"].decode()
        cut = before.index("</sheets>")
        assert after.startswith(before[:cut])
        assert after.endswith(before[cut:])
        assert re.fullmatch(r'<sheet name="Twistshare results" sheetId="\d+" r:id="rId\d+"/>', after[cut:len(after) - len(before) + cut])

    def test_app_properties_left_alone(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        report = _write(ooxml_plain_book, out, lambda b: b.add_sheet("T", [[1]]))
        assert "docProps/app.xml" in report.copied


class TestAtomicWrite:
    """The output appears whole or not at all; the input is never the output."""

    def test_same_path_refused(self, ooxml_plain_book):
        with BookWriter(ooxml_plain_book) as book:
            book.add_sheet("T", [[1]])
            with pytest.raises(WriteRefused, match="is the input workbook"):
                book.write(ooxml_plain_book)

    def test_in_place_keeps_a_backup(self, ooxml_plain_book, ooxml_kit):
        original = ooxml_plain_book.read_bytes()
        with BookWriter(ooxml_plain_book) as book:
            book.add_sheet("T", [[1]])
            report = book.write(ooxml_plain_book, in_place=True)
        assert re.search(r"\.bak-\d{8}-\d{6}$", report.backup)
        assert open(report.backup, "rb").read() == original
        book, _ = ooxml_kit.load_clean(ooxml_plain_book)
        assert "T" in book.sheetnames

    def test_interrupted_write_leaves_nothing(self, ooxml_plain_book, tmp_path, monkeypatch):
        out = tmp_path / "out.xlsx"
        calls = {"n": 0}
        real = zipfile.ZipFile.writestr

        def failing(self, *args, **kwargs):
            calls["n"] += 1
            if calls["n"] == 3:
                raise OSError("disk full (simulated)")
            return real(self, *args, **kwargs)

        monkeypatch.setattr(zipfile.ZipFile, "writestr", failing)
        with BookWriter(ooxml_plain_book) as book:
            book.add_sheet("T", [[1]])
            with pytest.raises(OSError, match="simulated"):
                book.write(out)
        assert calls["n"] == 3
        assert os.listdir(tmp_path) == [ooxml_plain_book.name]  # no output, no temporary file

    def test_interrupted_write_keeps_previous_output(self, ooxml_plain_book, tmp_path, monkeypatch):
        out = tmp_path / "out.xlsx"
        out.write_bytes(b"previous result")
        monkeypatch.setattr(os, "replace", lambda *a: (_ for _ in ()).throw(OSError("rename failed (simulated)")))
        with BookWriter(ooxml_plain_book) as book:
            book.add_sheet("T", [[1]])
            with pytest.raises(OSError, match="simulated"):
                book.write(out)
        assert out.read_bytes() == b"previous result"
        assert sorted(os.listdir(tmp_path)) == sorted([ooxml_plain_book.name, "out.xlsx"])

    def test_writer_is_single_use(self, ooxml_plain_book, tmp_path):
        book = BookWriter(ooxml_plain_book)
        book.add_sheet("T", [[1]])
        book.write(tmp_path / "a.xlsx")
        with pytest.raises(WriteRefused, match="closed"):
            book.write(tmp_path / "b.xlsx")


class TestMacroBooks:
    """An .xlsm keeps its VBA project and content type; a wrong output name is reported."""

    def test_vba_kept(self, ooxml_macro_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsm"
        report = _write(ooxml_macro_book, out, lambda b: b.add_sheet("T", [[1]]))
        assert report.warnings == ()
        after = ooxml_kit.members(out)
        assert after["xl/vbaProject.bin"] == ooxml_kit.members(ooxml_macro_book)["xl/vbaProject.bin"]
        assert b"macroEnabled.main+xml" in after["[Content_Types].xml"]
        book, caught = ooxml_kit.load_clean(out, keep_vba=True)
        assert caught == [] and "T" in book.sheetnames

    def test_xlsx_name_for_macro_book_reported(self, ooxml_macro_book, tmp_path):
        report = _write(ooxml_macro_book, tmp_path / "out.xlsx", lambda b: b.add_sheet("T", [[1]]))
        assert len(report.warnings) == 1 and ".xlsm" in report.warnings[0]
