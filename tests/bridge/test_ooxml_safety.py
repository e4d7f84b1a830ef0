"""inspect_package: hostile and broken files are refused with one clear line; good books summarised."""

from __future__ import annotations

import os
import re
import tracemalloc
import zipfile

import pytest
from twistshare.workbook_bridge.ooxml import BookWriter, Limits, PackageRefused, inspect_package


def _refused(path, match, **kwargs) -> PackageRefused:
    with pytest.raises(PackageRefused, match=match) as info:
        inspect_package(path, **kwargs)
    message = str(info.value)
    assert "\n" not in message and message.startswith(str(path))
    assert "Traceback" not in message
    return info.value


class TestNotAWorkbook:
    """Files that are not an OOXML workbook at all."""

    def test_missing_file(self, tmp_path):
        _refused(tmp_path / "nope.xlsx", "no such file")

    def test_folder(self, tmp_path):
        _refused(tmp_path, "not a file")

    def test_empty(self, tmp_path):
        path = tmp_path / "empty.xlsx"
        path.write_bytes(b"")
        _refused(path, "empty")

    def test_random_bytes(self, tmp_path):
        path = tmp_path / "noise.xlsx"
        path.write_bytes(os.urandom(4096).replace(b"PK", b"pk"))
        _refused(path, "not a zip package")

    def test_csv_renamed(self, tmp_path):
        path = tmp_path / "parts.xlsx"
        path.write_text("Part,Torque\nMPD-S-014,310\n")
        _refused(path, "not a zip package")

    def test_old_binary_xls(self, tmp_path):
        # OLE2 compound-file signature (MS-CFB) followed by a directory naming a "Workbook" stream.
        path = tmp_path / "old.xls"
        path.write_bytes(b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\0" * 504 + "Workbook".encode("utf-16-le") + b"\0" * 2000)
        reason = _refused(path, r"old binary \.xls").reason
        assert "save it as an .xlsx" in reason

    def test_password_protected(self, tmp_path):
        # An encrypted OOXML book is an OLE2 file with EncryptionInfo/EncryptedPackage streams (MS-OFFCRYPTO).
        path = tmp_path / "locked.xlsx"
        path.write_bytes(b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\0" * 5000 + "EncryptionInfo".encode("utf-16-le")
                         + b"\0" * 64 + "EncryptedPackage".encode("utf-16-le") + b"\0" * 100)
        _refused(path, "password-protected")

    def test_word_document(self, tmp_path):
        path = tmp_path / "letter.xlsx"
        with zipfile.ZipFile(path, "w") as zf:
            zf.writestr("[Content_Types].xml", '<?xml version="1.0"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
                        '<Override PartName="/word/document.xml" ContentType="application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml"/></Types>')
            zf.writestr("_rels/.rels", '<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">'
                        '<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="word/document.xml"/></Relationships>')
            zf.writestr("word/document.xml", "<w:document xmlns:w='urn:x'/>")
        _refused(path, "not a spreadsheet workbook")

    def test_zip_without_workbook(self, tmp_path):
        path = tmp_path / "bare.xlsx"
        with zipfile.ZipFile(path, "w") as zf:
            zf.writestr("hello.txt", "hi")
        _refused(path, r"no \[Content_Types\]\.xml")


class TestBrokenZip:
    """Truncated or corrupt archives."""

    @pytest.mark.parametrize("keep", [0.5, 0.9, 0.999])
    def test_truncated(self, ooxml_plain_book, tmp_path, keep):
        data = ooxml_plain_book.read_bytes()
        path = tmp_path / "cut.xlsx"
        path.write_bytes(data[: int(len(data) * keep)])
        _refused(path, "truncated or corrupt zip")

    def test_corrupt_member_found_when_copying(self, ooxml_rich_book, tmp_path, ooxml_kit):
        # Flip bytes inside the compressed image: the directory is fine, the CRC is not.
        data = bytearray(ooxml_rich_book.read_bytes())
        with zipfile.ZipFile(ooxml_rich_book) as zf:
            info = zf.getinfo("xl/media/image1.png")
        start = info.header_offset + 30 + len(info.filename) + len(info.extra) + 2
        for k in range(start, start + 8):
            data[k] ^= 0xFF
        bad = tmp_path / "bad.xlsx"
        bad.write_bytes(bytes(data))
        with BookWriter(bad) as book:
            book.add_sheet("T", [[1]])
            with pytest.raises(PackageRefused, match=r"member 'xl/media/image1.png' is corrupt"):
                book.write(tmp_path / "out.xlsx")
        assert sorted(os.listdir(tmp_path)) == sorted([ooxml_rich_book.name, "rich-plain.xlsx", "bad.xlsx"])


class TestZipBombs:
    """Declared sizes are checked before anything is inflated."""

    def _bomb(self, path, size):
        # Deflate tops out near 1032:1 on zeros; the member's declared size is checked first.
        with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
            zf.writestr("[Content_Types].xml", "<Types xmlns='http://schemas.openxmlformats.org/package/2006/content-types'/>")
            with zf.open("xl/worksheets/sheet1.xml", "w") as fh:
                block = b"\0" * (1 << 20)
                for _ in range(size >> 20):
                    fh.write(block)
        return path

    def test_ratio(self, tmp_path):
        path = self._bomb(tmp_path / "bomb.xlsx", 64 << 20)
        assert os.path.getsize(path) < 200_000
        tracemalloc.start()
        reason = _refused(path, "zip bomb").reason
        peak = tracemalloc.get_traced_memory()[1]
        tracemalloc.stop()
        assert "ratio" in reason
        assert peak < 8 << 20  # nothing was inflated

    def test_total_size(self, tmp_path):
        path = self._bomb(tmp_path / "big.xlsx", 8 << 20)
        _refused(path, "declares .* bytes uncompressed", limits=Limits(max_total_uncompressed=4 << 20))

    def test_member_count(self, ooxml_plain_book):
        _refused(ooxml_plain_book, "members, more than the 5 allowed", limits=Limits(max_members=5))

    def test_overlapping_members(self, tmp_path):
        # Two directory entries pointing at one local file: a classic overlap bomb.
        path = tmp_path / "overlap.xlsx"
        with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
            zf.writestr("a.xml", "<a/>" * 100)
        data = path.read_bytes()
        eocd = data.rindex(b"PK\x05\x06")
        cd_size = int.from_bytes(data[eocd + 12:eocd + 16], "little")
        cd_start = int.from_bytes(data[eocd + 16:eocd + 20], "little")
        entry = data[cd_start:cd_start + cd_size]
        twin = entry.replace(b"a.xml", b"b.xml")
        end = bytearray(data[eocd:])
        end[8:10] = end[10:12] = (2).to_bytes(2, "little")
        end[12:16] = (2 * cd_size).to_bytes(4, "little")
        path.write_bytes(data[:cd_start] + entry + twin + bytes(end))
        _refused(path, "overlap")

    def test_duplicate_member(self, tmp_path, ooxml_plain_book):
        path = tmp_path / "dup.xlsx"
        with zipfile.ZipFile(ooxml_plain_book) as zin, zipfile.ZipFile(path, "w") as zout:
            for info in zin.infolist():
                zout.writestr(info, zin.read(info))
            with pytest.warns(UserWarning):
                zout.writestr("xl/workbook.xml", zin.read("xl/workbook.xml"))
        _refused(path, "twice")


BILLION_LAUGHS = (b'<?xml version="1.0"?>\n<!DOCTYPE lolz [<!ENTITY lol "lol">'
                  + b"".join(b'<!ENTITY lol%d "%s">' % (i, (b"&lol%d;" % (i - 1) if i > 1 else b"&lol;") * 10)
                             for i in range(1, 10))
                  + b']>\n<workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheets>'
                  b'<sheet name="&lol9;" sheetId="1"/></sheets></workbook>')


class TestEntityExpansion:
    """No XML part may declare a DOCTYPE (entity expansion, external entities)."""

    @pytest.mark.parametrize("member", ["xl/workbook.xml", "xl/styles.xml", "docProps/core.xml", "xl/theme/theme1.xml"])
    def test_billion_laughs(self, ooxml_plain_book, tmp_path, ooxml_kit, member):
        path = ooxml_kit.rezip(ooxml_plain_book, tmp_path / "lol.xlsx", replace={member: BILLION_LAUGHS})
        _refused(path, rf"XML part '{member}' declares a DOCTYPE")

    def test_external_entity(self, ooxml_plain_book, tmp_path, ooxml_kit):
        xxe = (b'<?xml version="1.0"?><!DOCTYPE r [<!ENTITY x SYSTEM "file:///etc/passwd">]>'
               b'<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">&x;</Relationships>')
        path = ooxml_kit.rezip(ooxml_plain_book, tmp_path / "xxe.xlsx", replace={"_rels/.rels": xxe})
        _refused(path, "DOCTYPE")

    def test_doctype_after_comments_and_utf16(self, ooxml_plain_book, tmp_path, ooxml_kit):
        text = ('<?xml version="1.0" encoding="UTF-16"?><!-- a --><!-- b --><!DOCTYPE x [<!ENTITY a "b">]>'
                '<x/>').encode("utf-16")
        path = ooxml_kit.rezip(ooxml_plain_book, tmp_path / "u16.xlsx", replace={"docProps/app.xml": text})
        _refused(path, "DOCTYPE")


class TestGoodBooks:
    """What inspect_package reports for real-world-shaped books."""

    def test_plain_book(self, ooxml_plain_book):
        info = inspect_package(ooxml_plain_book)
        states = {s.name: s.state for s in info.sheets}
        assert states["Old rates"] == "hidden" and states["Lookup"] == "veryHidden" and states["Parts"] == "visible"
        parts = info.sheet("parts")
        assert parts.comments_part and parts.vml_parts
        assert [(t.name, t.ref) for t in parts.tables] == [("PartsTable", "A1:E5")]
        assert not info.macro_enabled and not info.has_vba
        assert info.notes == ()

    def test_macro_book_and_links(self, ooxml_macro_book):
        info = inspect_package(ooxml_macro_book)
        assert info.macro_enabled and info.has_vba
        assert [link.target for link in info.external_links] == ["file:///C:/marrowby/supplier-prices.xlsx"]
        assert info.calc_chain_part == "xl/calcChain.xml"

    def test_unknown_sheet_lists_the_sheets(self, ooxml_plain_book):
        with pytest.raises(KeyError, match=r"no sheet named 'Nope'; the book has \['Parts'"):
            inspect_package(ooxml_plain_book).sheet("Nope")

    def test_huge_declared_sheet_is_flagged_and_read_bounded(self, ooxml_plain_book, tmp_path, ooxml_kit):
        # A sheet declaring the full grid (1,048,576 rows) and holding ~60 MB of rows.
        with zipfile.ZipFile(ooxml_plain_book) as zf:
            sheet = zf.read("xl/worksheets/sheet2.xml").decode()
        head, tail = sheet.split("<sheetData>")[0], sheet.split("</sheetData>")[1]
        head = re.sub(r'<dimension ref="[^"]*"\s*/>', '<dimension ref="A1:XFD1048576"/>', head)
        rows = "".join(f'<row r="{r}"><c r="A{r}"><v>{r}</v></c><c r="B{r}"><v>1.5</v></c></row>' for r in range(1, 600_001))
        big = f"{head}<sheetData>{rows}</sheetData>{tail}"
        assert '<dimension ref="A1:XFD1048576"/>' in big
        path = ooxml_kit.rezip(ooxml_plain_book, tmp_path / "huge.xlsx", replace={"xl/worksheets/sheet2.xml": big})
        tracemalloc.start()
        info = inspect_package(path)
        peak = tracemalloc.get_traced_memory()[1]
        tracemalloc.stop()
        materials = info.sheet("Materials")
        assert materials.huge and materials.declared_rows == 1_048_576 and materials.declared_columns == 16384
        assert any("1,048,576 rows" in note for note in info.notes)
        assert peak < 16 << 20  # the sheet (tens of MB) was not read whole
        # The writer copies it through (streamed) without loading it either.
        with BookWriter(path) as book:
            book.add_sheet("T", [[1]])
            tracemalloc.start()
            report = book.write(tmp_path / "out.xlsx")
            peak = tracemalloc.get_traced_memory()[1]
            tracemalloc.stop()
        assert "xl/worksheets/sheet2.xml" in report.copied and peak < 24 << 20
