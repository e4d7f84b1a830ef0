"""Hostile and broken files through the command line: one clear line, exit 2, nothing left behind.

Each unusable input must give exactly one line on stderr starting ``twistshare:``, exit code 2,
no output file and no temporary file in the output folder or beside the input, and the input's
bytes unchanged. A macro-enabled book and a book with external links are rated, and the parts
we do not own come out byte for byte. A sheet reaching row 1,048,576 is decided by the lead's
rule (``_commands.MAX_TABLE_ROWS``): refused with exit 2, without loading a million rows.
"""

from __future__ import annotations

import contextlib
import hashlib
import io
import os
import re
import struct
import subprocess
import sys
import zipfile
from pathlib import Path

import _bookmaker
import pytest
from twistshare.workbook_bridge.commands import main
from twistshare.workbook_bridge.reading import MAX_TABLE_ROWS

CONSOLE = Path(sys.executable).with_name("twistshare")


bm = _bookmaker  # the book builder shared by the bad-input tests (tests/bridge on pythonpath)

REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
OLE2 = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"  # compound file signature ([MS-CFB] 2.2)


# ---------------------------------------------------------------------------------------------
# Builders
# ---------------------------------------------------------------------------------------------


def valid_book(path: Path, n: int = 4) -> Path:
    return bm.build_book(path, n)


def rezip(src: Path, dst: Path, replace: dict | None = None, add: dict | None = None,
          method: int = zipfile.ZIP_DEFLATED) -> Path:
    """Copy a zip package, replacing members' bytes and adding members."""
    replace, add = replace or {}, add or {}
    with zipfile.ZipFile(src) as zin:
        items = [(i.filename, zin.read(i.filename)) for i in zin.infolist()]
    with zipfile.ZipFile(dst, "w", method) as zout:
        for name, data in items:
            new = replace.get(name)
            zout.writestr(name, new(data) if callable(new) else data if new is None else new)
        for name, data in add.items():
            zout.writestr(name, data)
    return dst


def _member(path: Path, name: str) -> bytes:
    with zipfile.ZipFile(path) as zf:
        return zf.read(name)


def zip_bomb_ratio(tmp: Path) -> Path:
    """A sheet padded with 64 MB of spaces: deflate packs it about 1000:1."""
    src = valid_book(tmp / "src.xlsx")
    pad = b" " * (64 * 1024 * 1024)
    return rezip(src, tmp / "bomb.xlsx",
                 replace={"xl/worksheets/sheet2.xml": lambda d: d.replace(b"<sheetData>", pad + b"<sheetData>", 1)})


def _patch_sizes(path: Path, member: str, *, central: int | None = None, local: int | None = None) -> None:
    """Overwrite the uncompressed size a member declares (central directory and/or local header)."""
    data = bytearray(path.read_bytes())
    name = member.encode()
    if central is not None:
        at = data.find(b"PK\x01\x02")
        while at >= 0:
            n = struct.unpack_from("<H", data, at + 28)[0]
            if data[at + 46:at + 46 + n] == name:
                struct.pack_into("<I", data, at + 24, central)
                break
            at = data.find(b"PK\x01\x02", at + 4)
        else:
            raise AssertionError("member not in the central directory")
    if local is not None:
        at = data.find(b"PK\x03\x04")
        while at >= 0:
            n = struct.unpack_from("<H", data, at + 26)[0]
            if data[at + 30:at + 30 + n] == name:
                struct.pack_into("<I", data, at + 22, local)
                break
            at = data.find(b"PK\x03\x04", at + 4)
    path.write_bytes(bytes(data))


def zip_bomb_declared(tmp: Path) -> Path:
    """A member declaring 4 GB uncompressed from a few kB: refused on the declared sizes alone."""
    path = rezip(valid_book(tmp / "src.xlsx"), tmp / "declared.xlsx")
    _patch_sizes(path, "xl/worksheets/sheet2.xml", central=0xFFFF0000, local=0xFFFF0000)
    return path


def zip_bomb_lying(tmp: Path) -> Path:
    """A member that declares a small size but inflates to 64 MB: reading stops at the declared size."""
    path = zip_bomb_ratio(tmp)
    _patch_sizes(path, "xl/worksheets/sheet2.xml", central=200_000, local=200_000)
    return path


def zip_bomb_overlap(tmp: Path) -> Path:
    """Two directory entries sharing one compressed stream (the overlapping-files bomb)."""
    path = rezip(valid_book(tmp / "src.xlsx"), tmp / "overlap.xlsx")
    data = bytearray(path.read_bytes())
    eocd = data.rfind(b"PK\x05\x06")
    _this, count, cd_size, cd_start = struct.unpack_from("<HHII", data, eocd + 8)
    cd = bytes(data[cd_start:cd_start + cd_size])
    at = cd.find(b"xl/worksheets/sheet2.xml") - 46
    n, m, k = struct.unpack_from("<HHH", cd, at + 28)
    entry = bytearray(cd[at:at + 46 + n + m + k])
    entry[46:46 + n] = b"xl/worksheets/sheet9.xml"
    new_cd = cd + bytes(entry)
    out = bytes(data[:cd_start]) + new_cd
    tail = bytearray(data[eocd:])
    struct.pack_into("<HHII", tail, 8, count + 1, count + 1, len(new_cd), cd_start)
    path.write_bytes(out + bytes(tail))
    return path


_LAUGHS = (b'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<!DOCTYPE lolz [<!ENTITY lol "lol">'
           + b"".join(b'<!ENTITY lol%d "%s">' % (i, (b"&lol%d;" % (i - 1) if i > 1 else b"&lol;") * 10)
                      for i in range(1, 10)) + b"]>\n")
_XXE = b'<?xml version="1.0"?>\n<!DOCTYPE x [<!ENTITY e SYSTEM "file:///etc/passwd">]>\n'


def _with_prolog(prolog: bytes, pad: bytes = b""):
    def edit(data: bytes) -> bytes:
        body = re.sub(rb"^<\?xml[^>]*\?>\s*", b"", data, count=1)
        return prolog + pad + body
    return edit


def entity_bomb(member: str, prolog: bytes = _LAUGHS, pad: bytes = b""):
    def build(tmp: Path) -> Path:
        return rezip(valid_book(tmp / "src.xlsx"), tmp / "laughs.xlsx", replace={member: _with_prolog(prolog, pad)})
    return build


def truncated(tmp: Path) -> Path:
    data = valid_book(tmp / "src.xlsx").read_bytes()
    path = tmp / "truncated.xlsx"
    path.write_bytes(data[: len(data) // 2])
    return path


def truncated_tail(tmp: Path) -> Path:
    """Only the last 22 bytes (the end-of-directory record) cut: the directory cannot be found."""
    data = valid_book(tmp / "src.xlsx").read_bytes()
    path = tmp / "tail.xlsx"
    path.write_bytes(data[:-22])
    return path


def random_bytes(tmp: Path) -> Path:
    path = tmp / "random.xlsx"
    path.write_bytes(hashlib.sha512(b"marrowby").digest() * 64)
    return path


def text_file(tmp: Path) -> Path:
    path = tmp / "notes.xlsx"
    path.write_text("Part,Length [mm],Torque [N·m]\nMPD-S-001,300,400\n", encoding="utf-8")
    return path


def pk_not_zip(tmp: Path) -> Path:
    path = tmp / "pk.xlsx"
    path.write_bytes(b"PK\x03\x04" + b"\x00" * 200)
    return path


def empty_file(tmp: Path) -> Path:
    path = tmp / "empty.xlsx"
    path.write_bytes(b"")
    return path


def old_xls(tmp: Path) -> Path:
    path = tmp / "old.xls"
    path.write_bytes(OLE2 + b"\x00" * 504 + "Workbook".encode("utf-16-le") + b"\x00" * 1024)
    return path


def old_xls_named_xlsx(tmp: Path) -> Path:
    path = tmp / "renamed.xlsx"
    path.write_bytes(old_xls(tmp).read_bytes())
    return path


def encrypted(tmp: Path) -> Path:
    # An encrypted OOXML book is an OLE2 file holding 'EncryptionInfo' and 'EncryptedPackage'
    # streams ([MS-OFFCRYPTO] 2.3.4); their directory names are UTF-16LE ([MS-CFB] 2.6.1).
    path = tmp / "locked.xlsx"
    path.write_bytes(OLE2 + b"\x00" * 504 + "EncryptionInfo".encode("utf-16-le") + b"\x00" * 50
                     + "EncryptedPackage".encode("utf-16-le") + b"\x00" * 1024)
    return path


def no_parts_table(tmp: Path) -> Path:
    """Only a Materials sheet: nothing to rate."""
    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Materials"
    ws.append(list(bm.MATERIAL_HEADERS))
    ws.append([bm.CORE, 80, 120, "given"])
    path = tmp / "noparts.xlsx"
    wb.save(path)
    return path


def parts_without_header(tmp: Path) -> Path:
    """A Parts sheet whose first 30 rows name no 'Part' column."""
    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Parts"
    ws.append(["Number", "Size", "Load"])
    ws.append(["MPD-S-001", 40, 400])
    path = tmp / "noheader.xlsx"
    wb.save(path)
    return path


def missing_file(tmp: Path) -> Path:
    return tmp / "nowhere.xlsx"


def folder(tmp: Path) -> Path:
    path = tmp / "a-folder.xlsx"
    path.mkdir()
    return path


def huge_declared(tmp: Path) -> Path:
    """A Parts sheet declaring A1:Z1048576, its cells those of a small book."""
    src = valid_book(tmp / "src.xlsx")
    return rezip(src, tmp / "declared-rows.xlsx", replace={
        "xl/worksheets/sheet2.xml": lambda d: re.sub(rb'<dimension ref="[^"]*"', b'<dimension ref="A1:Z1048576"', d)})


def huge_last_row(tmp: Path) -> Path:
    """A Parts sheet with one value at A1048576, as openpyxl writes it (dimension A1:N1048576)."""
    import openpyxl

    path = valid_book(tmp / "lastrow.xlsx")
    wb = openpyxl.load_workbook(path)
    wb["Parts"]["A1048576"] = "end"
    wb.save(path)
    return path


def huge_last_row_no_dimension(tmp: Path) -> Path:
    """As above, but the sheet declares no dimension: the size is only known from the rows."""
    path = huge_last_row(tmp)
    return rezip(path, tmp / "lastrow-nodim.xlsx", replace={
        "xl/worksheets/sheet2.xml": lambda d: re.sub(rb"<dimension [^>]*/>", b"", d)})


def huge_last_row_small_dimension(tmp: Path) -> Path:
    """As above, the sheet's dimension lying: A1:N5 declared, a value at A1048576."""
    path = huge_last_row(tmp)
    return rezip(path, tmp / "lastrow-lie.xlsx", replace={
        "xl/worksheets/sheet2.xml": lambda d: re.sub(rb'<dimension ref="[^"]*"', b'<dimension ref="A1:N5"', d)})


def far_corner(row: int):
    """A stray value in column XFD (the last) at ``row`` of the Parts sheet, the dimension lying."""
    def build(tmp: Path) -> Path:
        import openpyxl

        path = valid_book(tmp / "corner.xlsx")
        wb = openpyxl.load_workbook(path)
        wb["Parts"][f"XFD{row}"] = "stray"
        wb.save(path)
        return rezip(path, tmp / f"corner-{row}.xlsx", replace={
            "xl/worksheets/sheet2.xml": lambda d: re.sub(rb'<dimension ref="[^"]*"', b'<dimension ref="A1:N5"', d)})
    return build


UNUSABLE = {
    "zip bomb (ratio)": (zip_bomb_ratio, ("zip bomb",)),
    "zip bomb (declared 4 GB)": (zip_bomb_declared, ("zip bomb",)),
    "zip bomb (size that lies)": (zip_bomb_lying, ("corrupt",)),
    "zip bomb (overlapping members)": (zip_bomb_overlap, ("overlap",)),
    "billion laughs in workbook.xml": (entity_bomb("xl/workbook.xml"), ("DOCTYPE",)),
    "billion laughs in a sheet": (entity_bomb("xl/worksheets/sheet2.xml"), ("DOCTYPE",)),
    "billion laughs in content types": (entity_bomb("[Content_Types].xml"), ("DOCTYPE",)),
    "billion laughs in a rels part": (entity_bomb("xl/_rels/workbook.xml.rels"), ("DOCTYPE",)),
    "billion laughs after a long comment": (
        entity_bomb("xl/worksheets/sheet1.xml", b'<?xml version="1.0"?>\n<!--' + b"x" * 300_000 + b"-->\n"
                    + _LAUGHS.split(b"\n", 1)[1]), ("DOCTYPE",)),
    "external entity (XXE)": (entity_bomb("xl/workbook.xml", _XXE), ("DOCTYPE",)),
    "truncated zip": (truncated, ("zip",)),
    "truncated end record": (truncated_tail, ("zip",)),
    "random bytes named .xlsx": (random_bytes, ("not",)),
    "text file named .xlsx": (text_file, ("not",)),
    "PK header, no zip": (pk_not_zip, ("zip",)),
    "empty file": (empty_file, ("empty",)),
    "old binary .xls": (old_xls, (".xls",)),
    "old binary .xls named .xlsx": (old_xls_named_xlsx, (".xls",)),
    "password-protected workbook": (encrypted, ("password",)),
    "no Parts table": (no_parts_table, ("Parts",)),
    "Parts sheet without a header row": (parts_without_header, ("Part",)),
    "missing file": (missing_file, ("no such file",)),
    "a folder": (folder, ("folder",)),
    "Parts declares A1:Z1048576": (huge_declared, (f"{MAX_TABLE_ROWS:,}",)),
    "Parts value at A1048576": (huge_last_row, (f"{MAX_TABLE_ROWS:,}",)),
    "Parts value at A1048576, no dimension": (huge_last_row_no_dimension, (f"{MAX_TABLE_ROWS:,}",)),
    "Parts value at A1048576, dimension lies": (huge_last_row_small_dimension, (f"{MAX_TABLE_ROWS:,}",)),
    "Parts value at XFD100000, dimension lies": (far_corner(100_000), ("16,384 columns", "cells")),
}


# ---------------------------------------------------------------------------------------------
# Running
# ---------------------------------------------------------------------------------------------


def _listing(*folders: Path) -> dict[Path, set[str]]:
    return {f: set(os.listdir(f)) if f.is_dir() else set() for f in folders}


def _digest(path: Path) -> str | None:
    return hashlib.sha256(path.read_bytes()).hexdigest() if path.is_file() else None


def run_in_process(*argv: str) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(list(argv))
    return code, out.getvalue(), err.getvalue()


def run_console(*argv: str) -> tuple[int, str, str]:
    done = subprocess.run([str(CONSOLE), *argv], capture_output=True, text=True, timeout=120,
                          env={**os.environ, "PYTHONWARNINGS": "ignore"})
    return done.returncode, done.stdout, done.stderr


def _assert_unusable(book: Path, runner, command: str, words: tuple[str, ...], tmp: Path) -> str:
    outdir = tmp / "out"
    outdir.mkdir(exist_ok=True)
    out = outdir / "result.xlsx"
    before, digest = _listing(outdir, book.parent), _digest(book)
    code, stdout, stderr = runner(command, str(book), "-o", str(out))
    lines = [ln for ln in stderr.splitlines() if ln.strip()]
    assert code == 2, (code, stdout, stderr)
    assert len(lines) == 1 and lines[0].startswith("twistshare: "), stderr
    assert "Traceback" not in stderr + stdout
    assert all(w.lower() in lines[0].lower() for w in words), lines[0]
    assert len(lines[0]) < 400, lines[0]
    assert _listing(outdir, book.parent) == before, "a file was left behind"
    assert _digest(book) == digest, "the input changed"
    return lines[0]


@pytest.mark.parametrize("name", list(UNUSABLE))
def test_unusable_input_rate(name, tmp_path):
    """``twistshare rate``: exit 2, one line naming the problem, nothing written, input untouched."""
    build, words = UNUSABLE[name]
    book = build(tmp_path)
    _assert_unusable(book, run_in_process, "rate", words, tmp_path)


@pytest.mark.parametrize("command", ["check", "handout"])
@pytest.mark.parametrize("name", ["zip bomb (ratio)", "billion laughs in a sheet", "truncated zip",
                                  "password-protected workbook", "no Parts table", "missing file"])
def test_unusable_input_other_commands(name, command, tmp_path):
    """``check`` and ``share`` refuse the same files the same way."""
    build, words = UNUSABLE[name]
    if command == "handout" and name == "no Parts table":
        pytest.skip("share copies any book's formulas; a book without parts is not unusable to it")
    _assert_unusable(build(tmp_path), run_in_process, command, words, tmp_path)


@pytest.mark.parametrize("name", ["zip bomb (ratio)", "billion laughs in workbook.xml", "old binary .xls",
                                  "password-protected workbook", "a folder", "Parts value at A1048576"])
def test_unusable_input_console_script(name, tmp_path):
    """The installed console script behaves the same (a fresh process: no state shared with the tests)."""
    build, words = UNUSABLE[name]
    _assert_unusable(build(tmp_path), run_console, "rate", words, tmp_path)


def test_huge_sheet_is_refused_before_it_is_loaded(tmp_path):
    """A value at A1048576 with a lying dimension: refused without building a million-row grid.

    Checked by the peak memory of a fresh process (ru_maxrss), not by time: a million rows of
    14 cells held as Python lists take hundreds of MB; the refusal must stay near the baseline.
    """
    book = huge_last_row_small_dimension(tmp_path)
    small = valid_book(tmp_path / "small.xlsx")
    code = ("import resource, sys; from twistshare.workbook_bridge.commands import main; "
            "rc = main(['rate', sys.argv[1], '-o', sys.argv[2], '-q']); "
            "print(resource.getrusage(resource.RUSAGE_SELF).ru_maxrss)")
    peaks = {}
    for label, path in (("huge", book), ("small", small)):
        done = subprocess.run([sys.executable, "-c", code, str(path), str(tmp_path / f"{label}-out.xlsx")],
                              capture_output=True, text=True, timeout=300)
        peaks[label] = int(done.stdout.strip().splitlines()[-1])  # kB on Linux
    assert peaks["huge"] < peaks["small"] + 100_000, peaks  # within 100 MB of a 4-part book


# ---------------------------------------------------------------------------------------------
# Books that must be rated, keeping what we do not own
# ---------------------------------------------------------------------------------------------

_VBA = OLE2 + bytes(range(256)) * 16


def xlsm(tmp: Path) -> Path:
    src = bm.build_book(tmp / "src.xlsx", 6, {2: bm.Case("bad", "text", {"od1": "abc"})})

    def ct(d: bytes) -> bytes:
        d = d.replace(b"application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml",
                      b"application/vnd.ms-excel.sheet.macroEnabled.main+xml")
        return d.replace(b"<Default ", b'<Default Extension="bin" ContentType="application/vnd.ms-office.vbaProject"/>'
                         b"<Default ", 1)

    def rels(d: bytes) -> bytes:
        return d.replace(b"</Relationships>", b'<Relationship Id="rId900" Type="http://schemas.microsoft.com/'
                         b'office/2006/relationships/vbaProject" Target="vbaProject.bin"/></Relationships>')

    return rezip(src, tmp / "macros.xlsm", replace={"[Content_Types].xml": ct, "xl/_rels/workbook.xml.rels": rels},
                 add={"xl/vbaProject.bin": _VBA})


_EXT_LINK = (f'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<externalLink xmlns="http://schemas.'
             f'openxmlformats.org/spreadsheetml/2006/main" xmlns:r="{REL}"><externalBook r:id="rId1"><sheetNames>'
             '<sheetName val="Prices"/></sheetNames><sheetDataSet><sheetData sheetId="0"><row r="1"><cell r="A1">'
             '<v>42</v></cell></row></sheetData></sheetDataSet></externalBook></externalLink>').encode()
_EXT_RELS = (b'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="http://schemas.'
             b'openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="' + REL.encode()
             + b'/externalLinkPath" Target="file:///C:/marrowby/supplier-prices.xlsx" TargetMode="External"/>'
             b"</Relationships>")


def external_links(tmp: Path) -> Path:
    src = bm.build_book(tmp / "src.xlsx", 6)

    def ct(d: bytes) -> bytes:
        return d.replace(b"</Types>", b'<Override PartName="/xl/externalLinks/externalLink1.xml" ContentType='
                         b'"application/vnd.openxmlformats-officedocument.spreadsheetml.externalLink+xml"/></Types>')

    def rels(d: bytes) -> bytes:
        return d.replace(b"</Relationships>", b'<Relationship Id="rId901" Type="' + REL.encode()
                         + b'/externalLink" Target="externalLinks/externalLink1.xml"/></Relationships>')

    def wb(d: bytes) -> bytes:
        return d.replace(b"</sheets>", b'</sheets><externalReferences><externalReference r:id="rId901"/>'
                         b"</externalReferences>", 1)

    return rezip(src, tmp / "links.xlsx", replace={"[Content_Types].xml": ct, "xl/_rels/workbook.xml.rels": rels,
                                                     "xl/workbook.xml": wb},
                 add={"xl/externalLinks/externalLink1.xml": _EXT_LINK,
                      "xl/externalLinks/_rels/externalLink1.xml.rels": _EXT_RELS})


def test_macro_enabled_book_keeps_its_macros(tmp_path):
    """A .xlsm is rated (exit 1: one bad part); vbaProject.bin is byte-identical; still macro-enabled."""
    book = xlsm(tmp_path)
    digest = _digest(book)
    out = tmp_path / "macros-rated.xlsm"
    code, _o, err = run_in_process("rate", str(book), "-o", str(out))
    assert code == 1, err
    assert _member(out, "xl/vbaProject.bin") == _member(book, "xl/vbaProject.bin") == _VBA
    assert b"macroEnabled.main+xml" in _member(out, "[Content_Types].xml")
    assert b"vbaProject" in _member(out, "xl/_rels/workbook.xml.rels")
    assert _digest(book) == digest
    res = bm.read_output(out)
    assert res.results[2]["Status"] == "not rated" and res.results[1]["Status"] == "ok"


def test_macro_enabled_book_console_script(tmp_path):
    """The same through the console script, default output name beside the input."""
    book = xlsm(tmp_path)
    code, _o, err = run_console("rate", str(book), "-q")
    assert code == 1, err
    out = book.with_name("macros-rated.xlsm")
    assert _member(out, "xl/vbaProject.bin") == _VBA


def test_external_links_kept_byte_for_byte(tmp_path):
    """External link parts come out byte-identical and the workbook still lists its link."""
    book = external_links(tmp_path)
    out = tmp_path / "links-rated.xlsx"
    code, _o, err = run_in_process("rate", str(book), "-o", str(out))
    assert code == 0, err
    for name in ("xl/externalLinks/externalLink1.xml", "xl/externalLinks/_rels/externalLink1.xml.rels"):
        assert _member(out, name) == _member(book, name)
    assert b"<externalReference " in _member(out, "xl/workbook.xml")
    assert b"externalLinks/externalLink1.xml" in _member(out, "xl/_rels/workbook.xml.rels")
    assert all(r["Status"] == "ok" for r in bm.read_output(out).results)


def test_stray_value_far_right_is_fine_in_a_short_sheet(tmp_path):
    """A stray value at XFD3 (a wide but short grid) does not stop the rating; the parts rate as usual."""
    book = far_corner(3)(tmp_path)
    code, _o, err = run_in_process("rate", str(book), "-o", str(tmp_path / "corner-out.xlsx"))
    assert code == 0, err
    assert all(r["Status"] == "ok" for r in bm.read_output(tmp_path / "corner-out.xlsx").results)


def test_large_but_allowed_sheet_is_rated(tmp_path):
    """A Parts sheet whose dimension reaches row 20,000 (below the limit) is rated normally."""
    book = huge_declared(tmp_path)
    small = rezip(book, tmp_path / "allowed.xlsx", replace={
        "xl/worksheets/sheet2.xml": lambda d: d.replace(b"A1:Z1048576", b"A1:Z20000")})
    code, _o, err = run_in_process("rate", str(small), "-o", str(tmp_path / "allowed-out.xlsx"))
    assert code == 0, err
