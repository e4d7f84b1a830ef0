"""Cell comments: new ones, merged into the user's, on input and on added sheets."""

from __future__ import annotations

import re
import xml.etree.ElementTree as ET

import pytest
from twistshare.workbook_bridge.ooxml import BookWriter, WriteRefused

MAIN = "{http://schemas.openxmlformats.org/spreadsheetml/2006/main}"


def _comment_texts(data: bytes) -> dict[str, str]:
    root = ET.fromstring(data)
    return {c.get("ref"): "".join(t.text or "" for t in c.iter(f"{MAIN}t")) for c in root.iter(f"{MAIN}comment")}


class TestMergeIntoExisting:
    """A sheet that already has comments keeps every one of them."""

    def test_existing_comments_kept_and_ours_appended(self, ooxml_plain_book, tmp_path, ooxml_kit):
        before = ooxml_kit.members(ooxml_plain_book)
        old = _comment_texts(before["xl/comments/comment1.xml"])
        assert old == {"B2": "length from drawing rev C", "D4": "tube alloy per supplier cert"}
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_plain_book) as book:
            book.add_comments("Parts", {"B2": "length 420 mm: below the 500 mm minimum for this series",
                                        "C3": "torque <450> N·m & rising", "$E$4": "date checked?"})
            report = book.write(out)
        after = ooxml_kit.members(out)
        new = _comment_texts(after["xl/comments/comment1.xml"])
        assert new["D4"] == old["D4"]  # untouched
        assert new["B2"] == old["B2"] + "\n\nlength 420 mm: below the 500 mm minimum for this series"
        assert new["C3"] == "torque <450> N·m & rising" and new["E4"] == "date checked?"
        # The user's authors stay, ours is added once.
        authors = [a.text for a in ET.fromstring(after["xl/comments/comment1.xml"]).iter(f"{MAIN}author")]
        assert authors[:-1] == [a.text for a in ET.fromstring(before["xl/comments/comment1.xml"]).iter(f"{MAIN}author")]
        assert authors[-1] == "twistshare"
        # The sheet already linked its VML: no new link, the sheet XML is untouched.
        assert "xl/worksheets/sheet1.xml" in report.copied
        vml = after["xl/drawings/commentsDrawing1.vml"].decode()
        notes = ET.fromstring(vml).iter("{urn:schemas-microsoft-com:office:excel}ClientData")  # well-formed, bound prefixes
        cells = sorted((int(n.find("{urn:schemas-microsoft-com:office:excel}Row").text),
                        int(n.find("{urn:schemas-microsoft-com:office:excel}Column").text)) for n in notes)
        assert cells == [(1, 1), (2, 2), (3, 3), (3, 4)]  # (row, column) 0-based: B2, C3, D4, E4
        ids = re.findall(r'id="(_x0000_s\d+)"', vml)
        assert len(ids) == len(set(ids))
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        ws = book["Parts"]
        assert ws["B2"].comment.text.startswith("length from drawing rev C")
        assert ws["D4"].comment.text == "tube alloy per supplier cert"
        assert ws["C3"].comment.text == "torque <450> N·m & rising" and ws["C3"].comment.author == "twistshare"

    def test_repeated_calls_append(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_plain_book) as book:
            book.add_comments("Materials", {"B2": "G 80 GPa: plausible"})
            book.add_comments("Materials", {"B2": "filled from library"})
            book.write(out)
        book, _ = ooxml_kit.load_clean(out)
        assert book["Materials"]["B2"].comment.text == "G 80 GPa: plausible\n\nfilled from library"


class TestNewComments:
    """Sheets without comments get a comments part, a VML drawing and the link."""

    def test_input_sheet_without_comments(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_plain_book) as book:
            book.add_comments("Materials", {"C3": "allowable 60 MPa: check temper", "A2": "=SUM(1)"})
            report = book.write(out)
        before, after = ooxml_kit.members(ooxml_plain_book), ooxml_kit.members(out)
        sheet = "xl/worksheets/sheet2.xml"
        assert sheet in report.changed
        old, new = before[sheet].decode(), after[sheet].decode()
        # The only change to the sheet: one <legacyDrawing> element (plus a namespace if it had none).
        added = re.sub(r"<legacyDrawing [^>]*/>", "", new, count=1)
        assert added == old
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        assert book["Materials"]["C3"].comment.text == "allowable 60 MPa: check temper"
        assert book["Materials"]["A2"].comment.text == "=SUM(1)"
        assert book["Materials"]["A2"].value == "steel 1045"

    def test_added_sheet(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        with BookWriter(ooxml_plain_book) as book:
            handle = book.add_sheet("Twistshare warnings", [["Cell", "Message"], ["Parts!C3", "torque high"]])
            book.add_comments(handle, {"B2": "see the Parts sheet"})
            book.write(out)
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        assert book["Twistshare warnings"]["B2"].comment.text == "see the Parts sheet"

    def test_many_comments_get_unique_shape_ids(self, ooxml_plain_book, tmp_path, ooxml_kit):
        out = tmp_path / "out.xlsx"
        many = {f"A{r}": f"note {r}" for r in range(1, 2501)}
        with BookWriter(ooxml_plain_book) as book:
            book.add_comments("Locked", many)
            book.add_comments("Parts", {"A5": "one more"})
            book.write(out)
        after = ooxml_kit.members(out)
        ids = []
        for name, data in after.items():
            if name.endswith(".vml"):
                ids += re.findall(rb'<(?:\w+:)?shape\b[^>]*\sid="(_x0000_s\d+)"', data)
        assert len(ids) == len(set(ids)) == 2500 + 2 + 1
        book, caught = ooxml_kit.load_clean(out)
        assert caught == []
        assert book["Locked"]["A2500"].comment.text == "note 2500"
        assert book["Locked"].protection.sheet  # protection left as it was

    def test_bad_targets(self, ooxml_plain_book):
        with BookWriter(ooxml_plain_book) as book:
            with pytest.raises(WriteRefused, match="no sheet named 'Nope'"):
                book.add_comments("Nope", {"A1": "x"})
            with pytest.raises(ValueError, match="cell reference must look like 'B7'"):
                book.add_comments("Parts", {"7B": "x"})
