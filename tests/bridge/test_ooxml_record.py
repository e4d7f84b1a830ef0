"""The ownership record (``ooxml._record``) and taking our work back out (``ooxml._unrate``).

The check is the package itself: a copy written by ``BookWriter`` and stripped by
``strip_ours`` must give back the input book member for member, bytes and zip metadata, even
for a book holding the user's own comments, a table, a chart, a pivot table and a VBA project.
"""

from __future__ import annotations

import re
import zipfile

import pytest
from twistshare.workbook_bridge.ooxml import BookWriter, Cell, PackageRefused, read_record, strip_ours
from twistshare.workbook_bridge.ooxml._record import (
    MarkChange,
    OwnershipRecord,
    SheetChange,
    StoredPart,
    parse_record,
    record_xml,
)


def _rate_like(src, out):
    """What a rating does to a package: sheets, a chart, print titles, comments (on a cell the
    user commented, on new cells, on a sheet without comments) and marked fill-ins."""
    from twistshare.workbook_bridge.ooxml import BarChart, SeriesData

    with BookWriter(src) as w:
        res = w.add_sheet("Twistshare results", [["Part", "Margin"], ["MPD-S-014", 0.42], ["MPD-T-203", -0.1]],
                          column_widths=[14, 10])
        w.set_print_titles(res, columns=1, rows=1)
        series = SeriesData("margin", res.range_ref(1, 2, 3), res.range_ref(2, 2, 3), ("MPD-S-014", "MPD-T-203"),
                            (0.42, -0.1))
        w.add_chart(res, "D2", "J14", BarChart("Margins", "part", "margin", (series,)))
        w.add_comments(res, {"B3": "fails"})
        w.add_comments("Parts", {"B2": "twistshare warning: length checked", "C3": "twistshare error: torque"})
        w.add_comments("Materials", {"A2": "twistshare note: from the library"})
        w.fill_cells("Materials", {"D2": Cell(1.5, "filled"), "B5": Cell(79.3, "filled"), "D3": Cell(2.0, "filled")})
        return w.write(out)


def _infos(path):
    with zipfile.ZipFile(path) as zf:
        return {i.filename: (zf.read(i.filename), i.date_time, i.external_attr) for i in zf.infolist()}


def _order(path):
    with zipfile.ZipFile(path) as zf:
        return zf.namelist()


@pytest.mark.parametrize("kind", ["plain", "rich", "macro"])
def test_stripping_a_written_copy_gives_the_input_back_member_for_member(ooxml_kit, tmp_path, kind):
    src = {"plain": lambda: ooxml_kit.build_plain(tmp_path / "in.xlsx"),
           "rich": lambda: ooxml_kit.build_rich(tmp_path / "in.xlsx"),
           "macro": lambda: ooxml_kit.build_rich(tmp_path / "in.xlsm", macro=True)}[kind]()
    out = tmp_path / ("out" + src.suffix)
    report = _rate_like(src, out)
    assert report.changed and report.added  # the copy really differs from the input
    back = tmp_path / ("back" + src.suffix)
    stripped = strip_ours(out, back)
    assert _infos(back) == _infos(src)  # bytes, times and attributes of every member
    assert _order(back) == _order(src)
    assert stripped.sheets == ("Twistshare results",)
    assert stripped.comments == 4 and stripped.marks == 3
    assert stripped.kept_cells == () and stripped.edited == ()


def test_the_record_lists_what_the_writer_added_and_changed(ooxml_kit, tmp_path):
    src = ooxml_kit.build_plain(tmp_path / "in.xlsx")
    report = _rate_like(src, tmp_path / "out.xlsx")
    record = read_record(tmp_path / "out.xlsx")
    own = set(record.own_parts)
    assert {p for p, _ in record.added} | own == set(report.added)
    assert {s.part for s in record.stored} | {w.part for w in record.worksheets} == set(report.changed)
    parts = ooxml_kit.sheet_parts(zipfile.ZipFile(src))
    assert {w.name for w in record.worksheets} == {"Materials"}  # Parts had comments: no new link
    (materials,) = record.worksheets
    assert materials.part == parts["Materials"] and materials.link.startswith("<legacyDrawing")
    assert {m.ref for m in materials.marks} == {"D2", "B5", "D3"}


def test_record_round_trip():
    record = OwnershipRecord(
        own_parts=("customXml/item1.xml",), sheets=("Twistshare results", "Twistshare a&b <c>"),
        added=(("xl/worksheets/sheet9.xml", "ab" * 32),),
        stored=(StoredPart("xl/styles.xml", "<styleSheet>é</styleSheet>".encode(), "cd" * 32),),
        worksheets=(SheetChange("xl/worksheets/sheet2.xml", "Materials", "ef" * 32, "01" * 32,
                                '<legacyDrawing r:id="rId3"/>',
                                (MarkChange("D2", "", '<c r="D2" s="9"><v>1.5</v></c>', "", '<row r="2">'),
                                 MarkChange("C3", '<c r="C3" s="1"/>', '<c r="C3" s="9"><v>2</v></c>'))),),
        comments=(("Parts", 2),), unrecoverable=("Layers",),
        notes=(("Parts", "B2", "twistshare warning: a & b\n\nline two"),))
    assert parse_record(record_xml(record)) == record


def _edit(ooxml_kit, path, dst, member, old, new):
    with zipfile.ZipFile(path) as zf:
        text = zf.read(member).decode()
    assert text.count(old) == 1, old
    return ooxml_kit.rezip(path, dst, {member: text.replace(old, new).encode()})


def test_user_edits_since_the_rating_are_kept(ooxml_kit, tmp_path):
    src = ooxml_kit.build_plain(tmp_path / "in.xlsx")
    _rate_like(src, tmp_path / "out.xlsx")
    member = ooxml_kit.sheet_parts(zipfile.ZipFile(src))["Materials"]
    # The user changes G of steel 1045 (80 -> 81) and types over one value we filled (D2).
    with zipfile.ZipFile(tmp_path / "out.xlsx") as zf:
        rated = zf.read(member).decode()
    filled = re.search(r'<c r="D2"[^>]*><v>1.5</v></c>', rated).group(0)
    edited = rated.replace('<c r="B2" t="n"><v>80</v></c>', '<c r="B2" t="n"><v>81</v></c>')
    edited = edited.replace(filled, filled.replace("<v>1.5</v>", "<v>1.75</v>"))
    assert edited.count("<v>81</v>") == 1 and "<v>1.75</v>" in edited
    ooxml_kit.rezip(tmp_path / "out.xlsx", tmp_path / "edited.xlsx", {member: edited.encode()})
    report = strip_ours(tmp_path / "edited.xlsx", tmp_path / "back.xlsx")
    assert report.edited == ("Materials",) and report.kept_cells == ("Materials!D2",)
    back, original = _infos(tmp_path / "back.xlsx"), _infos(src)
    assert set(back) == set(original)
    assert all(back[n] == original[n] for n in original if n != member)
    text = back[member][0].decode()
    # The original with the user's two edits: G changed, D2 holds their value in the cell's own format.
    expected = original[member][0].decode().replace('<c r="B2" t="n"><v>80</v></c>', '<c r="B2" t="n"><v>81</v></c>')
    assert text.replace('<c r="D2"><v>1.75</v></c>', "") == expected


def _changed_copy(ooxml_kit, tmp_path, what):
    """A rated copy changed where it is ours, as a program saving it again would change it."""
    src = ooxml_kit.build_plain(tmp_path / "in.xlsx")
    _rate_like(src, tmp_path / "out.xlsx")
    record = read_record(tmp_path / "out.xlsx")
    if what == "our sheet":
        member = record.added[0][0]
        with zipfile.ZipFile(tmp_path / "out.xlsx") as zf:
            data = zf.read(member).replace(b"MPD-T-203", b"MPD-T-204")
    elif what == "stored part":
        member = "xl/workbook.xml"
        with zipfile.ZipFile(tmp_path / "out.xlsx") as zf:
            data = zf.read(member).replace(b"<sheets>", b"<sheets> ")
    else:
        member = record.worksheets[0].part
        with zipfile.ZipFile(tmp_path / "out.xlsx") as zf:
            data = zf.read(member).replace(record.worksheets[0].link.encode(), b"")
    return src, ooxml_kit.rezip(tmp_path / "out.xlsx", tmp_path / "changed.xlsx", {member: data}), member


@pytest.mark.parametrize("what", ["our sheet", "stored part", "our link"])
def test_a_copy_changed_where_it_is_ours_is_not_undone_byte_for_byte(ooxml_kit, tmp_path, what):
    _, changed, _ = _changed_copy(ooxml_kit, tmp_path, what)
    with pytest.raises(PackageRefused, match="saved again by a spreadsheet program") as caught:
        strip_ours(changed, tmp_path / "back.xlsx", fallback=False)
    assert "rate the book you rated first" in str(caught.value)
    assert not (tmp_path / "back.xlsx").exists()


@pytest.mark.parametrize("what", ["our sheet", "stored part", "our link"])
def test_the_fallback_finds_our_work_by_name_cell_and_text(ooxml_kit, tmp_path, what):
    src, changed, member = _changed_copy(ooxml_kit, tmp_path, what)
    record = read_record(changed)
    report = strip_ours(changed, tmp_path / "back.xlsx")
    assert report.resaved and report.sheets == ("Twistshare results",)
    assert report.comments == 3 and report.marks == 3  # Parts B2 (cut), Parts C3, Materials A2; D2, B5, D3
    back = _infos(tmp_path / "back.xlsx")
    assert not {p for p, _ in record.added if p.startswith(("xl/worksheets/sheet", "xl/charts/"))} & set(back)
    assert not any(n.startswith("customXml/") for n in back)
    # Members the rating did not touch are the changed copy's, byte for byte.
    ours = {p for p, _ in record.added} | {s.part for s in record.stored} | {w.part for w in record.worksheets}
    copy = _infos(changed)
    for name in set(copy) - ours - set(record.own_parts) - {member}:
        assert back[name] == copy[name], name
    wb, problems = ooxml_kit.load_clean(tmp_path / "back.xlsx")
    assert wb.sheetnames == ooxml_kit.load_clean(src)[0].sheetnames and not problems
    assert wb["Parts"]["B2"].comment.text == "length from drawing rev C"  # the user's, ours cut off
    assert wb["Parts"]["C3"].comment is None and wb["Materials"]["A2"].comment is None
    assert wb["Parts"]["D4"].comment.text == "tube alloy per supplier cert"
    assert wb["Materials"]["D2"].value is None and wb["Materials"]["B5"].value is None


def test_the_fallback_refuses_an_edited_comment_of_ours(ooxml_kit, tmp_path):
    src = ooxml_kit.build_plain(tmp_path / "in.xlsx")
    _rate_like(src, tmp_path / "out.xlsx")
    with zipfile.ZipFile(tmp_path / "out.xlsx") as zf:
        name = next(n for n in zf.namelist() if n.startswith("xl/comments")
                    and b"torque" in zf.read(n))
        data = zf.read(name).replace(b"twistshare error: torque", b"twistshare error: torque (seen, fine)")
    ooxml_kit.rezip(tmp_path / "out.xlsx", tmp_path / "changed.xlsx", {name: data})
    with pytest.raises(PackageRefused, match="the comment twistshare wrote on Parts!C3 was changed"):
        strip_ours(tmp_path / "changed.xlsx", tmp_path / "back.xlsx")
    assert not (tmp_path / "back.xlsx").exists()


def test_the_fallback_refuses_our_sheets_moved_before_the_users(ooxml_kit, tmp_path):
    src = ooxml_kit.build_plain(tmp_path / "in.xlsx")
    _rate_like(src, tmp_path / "out.xlsx")
    with zipfile.ZipFile(tmp_path / "out.xlsx") as zf:
        wb = zf.read("xl/workbook.xml").decode()
    ours = re.search(r'<sheet name="Twistshare results"[^>]*/>', wb).group(0)
    moved = wb.replace(ours, "").replace("<sheets>", "<sheets>" + ours)
    ooxml_kit.rezip(tmp_path / "out.xlsx", tmp_path / "moved.xlsx", {"xl/workbook.xml": moved.encode()})
    with pytest.raises(PackageRefused, match="no longer the last sheets"):
        strip_ours(tmp_path / "moved.xlsx", tmp_path / "back.xlsx")


def test_a_share_copy_gets_no_record(tmp_path):
    """Formulas replaced by values cannot be taken back, so such a copy is not re-rated."""
    import openpyxl

    wb = openpyxl.Workbook()
    wb.active["A1"] = 2
    wb.active["A2"] = "=A1*2"
    wb.save(tmp_path / "f.xlsx")
    with BookWriter(tmp_path / "f.xlsx") as w:
        w.replace_formulas("Sheet", {"A2": 4})
        w.add_sheet("Twistshare handout", [["Cell", "Value"]])
        w.write(tmp_path / "out.xlsx")
    assert read_record(tmp_path / "out.xlsx") is None


def test_the_users_own_custom_xml_parts_are_kept_beside_the_record(ooxml_kit, tmp_path):
    """Books from document-management systems carry custom XML items of their own."""
    plain = ooxml_kit.build_plain(tmp_path / "plain.xlsx")
    with zipfile.ZipFile(plain) as zf:
        wb_rels = zf.read("xl/_rels/workbook.xml.rels").decode()
    rel = ('<Relationship Id="rId990" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/'
           'customXml" Target="../customXml/item1.xml"/>')
    add = {
        "customXml/item1.xml": '<?xml version="1.0"?><b:Sources xmlns:b="http://schemas.openxmlformats.org/'
                               'officeDocument/2006/bibliography" SelectedStyle="x"/>',
        "customXml/itemProps1.xml": '<?xml version="1.0"?><ds:datastoreItem ds:itemID="{00000000-1111-2222-3333-'
                                    '444444444444}" xmlns:ds="http://schemas.openxmlformats.org/officeDocument/'
                                    '2006/customXml"><ds:schemaRefs/></ds:datastoreItem>',
        "customXml/_rels/item1.xml.rels": '<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.'
                                          'org/package/2006/relationships"><Relationship Id="rId1" Type="http://'
                                          'schemas.openxmlformats.org/officeDocument/2006/relationships/'
                                          'customXmlProps" Target="itemProps1.xml"/></Relationships>',
    }
    src = ooxml_kit.rezip(plain, tmp_path / "in.xlsx",
                          {"xl/_rels/workbook.xml.rels": wb_rels.replace("</Relationships>", rel + "</Relationships>")},
                          add)
    _rate_like(src, tmp_path / "out.xlsx")
    record = read_record(tmp_path / "out.xlsx")
    assert record.own_parts[0] == "customXml/item2.xml"
    strip_ours(tmp_path / "out.xlsx", tmp_path / "back.xlsx")
    assert _infos(tmp_path / "back.xlsx") == _infos(src)


def test_a_worksheet_edit_the_record_cannot_undo_is_named_and_refused(ooxml_kit, tmp_path, monkeypatch):
    """A kind of edit the writer learns later without teaching ``_ownership`` must not be half undone."""
    from twistshare.workbook_bridge.ooxml import _writer

    real = _writer.replace_cells

    def also_widen(text, values):  # an extra edit of the user's sheet the record knows nothing of
        text, formulas, had = real(text, values)
        return text.replace("<sheetData>", '<cols><col min="1" max="1" width="30"/></cols><sheetData>', 1), formulas, had

    src = ooxml_kit.build_plain(tmp_path / "in.xlsx")
    monkeypatch.setattr(_writer, "replace_cells", also_widen)
    _rate_like(src, tmp_path / "out.xlsx")
    assert read_record(tmp_path / "out.xlsx").unrecoverable == ("Materials",)
    with pytest.raises(PackageRefused, match="could not note exactly how it changed sheet 'Materials'"):
        strip_ours(tmp_path / "out.xlsx", tmp_path / "back.xlsx")
    assert not (tmp_path / "back.xlsx").exists()


def test_the_fallback_refuses_a_renamed_input_sheet(ooxml_kit, tmp_path):
    src = ooxml_kit.build_plain(tmp_path / "in.xlsx")
    _rate_like(src, tmp_path / "out.xlsx")
    with zipfile.ZipFile(tmp_path / "out.xlsx") as zf:
        wb = zf.read("xl/workbook.xml").decode()
    renamed = wb.replace('<sheet name="Materials"', '<sheet name="Stock materials"', 1)
    assert renamed != wb
    ooxml_kit.rezip(tmp_path / "out.xlsx", tmp_path / "renamed.xlsx", {"xl/workbook.xml": renamed.encode()})
    with pytest.raises(PackageRefused, match="is not in the book under that name"):
        strip_ours(tmp_path / "renamed.xlsx", tmp_path / "back.xlsx")
