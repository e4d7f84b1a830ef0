"""``twistshare rate`` on a rated copy: our sheets, comments and marks replaced, the rest kept.

The reference for every re-rating is the plain rating of the original book with the same inputs
(the book as the user would have it without twistshare's earlier work).
"""

from __future__ import annotations

import re
import shutil
import subprocess
import zipfile
from pathlib import Path

import openpyxl
import pytest
from openpyxl.comments import Comment
from twistshare.workbook_bridge.commands import main
from twistshare.workbook_bridge.ooxml import read_record

from ._bookmaker import Case, build_book, cell_of, part_id
from .conftest import _sheet_parts, rezip

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"
CATALOGUE = SAMPLES / "marrowby_catalogue.xlsx"
SOFFICE = shutil.which("soffice") or shutil.which("libreoffice")
RESULTS = "Twistshare results"


def _rate(src: Path, out: Path, *extra: str) -> int:
    return main(["rate", str(src), "-o", str(out), "--lenient", *extra])


def _results(path: Path) -> list[tuple]:
    return list(openpyxl.load_workbook(path)[RESULTS].iter_rows(values_only=True))


def _members(path: Path) -> dict[str, bytes]:
    with zipfile.ZipFile(path) as zf:
        return {i.filename: zf.read(i.filename) for i in zf.infolist()}


def _ours(path: Path) -> set[str]:
    record = read_record(path)
    return (set(record.own_parts) | {p for p, _ in record.added} | {s.part for s in record.stored}
            | {w.part for w in record.worksheets})


@pytest.fixture(scope="module")
def rated(tmp_path_factory) -> Path:
    d = tmp_path_factory.mktemp("rerate")
    out = d / "rated.xlsx"
    assert _rate(CATALOGUE, out, "-q") == 0
    return out


def test_rerating_an_unedited_copy_equals_rating_the_original(rated, tmp_path, capsys):
    again = tmp_path / "again.xlsx"
    assert _rate(rated, again) == 0
    err = capsys.readouterr().err
    assert re.search(r"re-rated: replaced 5 sheets of ours, \d+ comments, \d+ marked values; "
                     r"every other member kept byte for byte", err), err
    assert _results(again) == _results(rated)
    first, second = _members(rated), _members(again)
    assert list(first) == list(second)
    # Only the summary (it names the book file and the time of rating) and the record listing its
    # checksum differ; every other member, ours included, is written again identically.
    summary = _sheet_parts(zipfile.ZipFile(rated))["Twistshare summary"]
    assert {n for n in first if first[n] != second[n]} <= {summary, "customXml/item1.xml"}
    wb = openpyxl.load_workbook(again)
    assert sum(n.startswith("Twistshare") for n in wb.sheetnames) == 5  # not doubled


def _edit_sheet(path: Path, dst: Path, sheet: str, old: str, new: str) -> Path:
    with zipfile.ZipFile(path) as zf:
        member = _sheet_parts(zf)[sheet]
        text = zf.read(member).decode()
    assert text.count(old) == 1, old
    return rezip(path, dst, {member: text.replace(old, new).encode()})


def _torque_cell(book: Path) -> tuple[str, str, str]:
    """A rated part's torque cell in the Parts sheet: (part id, its XML as stored, as edited)."""
    ws = openpyxl.load_workbook(book)["Parts"]
    head = [c.value for c in ws[1]]
    col, pc = head.index(next(h for h in head if str(h).startswith("Torque"))), head.index("Part")
    with zipfile.ZipFile(book) as zf:
        text = zf.read(_sheet_parts(zf)["Parts"]).decode()
    for row in ws.iter_rows(min_row=2):
        cell = row[col]
        if isinstance(cell.value, (int, float)) and cell.value > 0:
            m = re.search(rf'<c r="{cell.coordinate}"[^>]*><v>[^<]*</v></c>', text)
            if m:
                edited = re.sub(r"<v>[^<]*</v>", f"<v>{cell.value * 3}</v>", m.group(0))
                return str(row[pc].value), m.group(0), edited
    raise AssertionError("no numeric torque cell")


def test_an_edited_input_cell_gives_the_new_result(rated, tmp_path):
    pid, old, new = _torque_cell(CATALOGUE)
    edited_copy = _edit_sheet(rated, tmp_path / "edited-copy.xlsx", "Parts", old, new)
    edited_original = _edit_sheet(CATALOGUE, tmp_path / "edited-original.xlsx", "Parts", old, new)
    assert _rate(edited_copy, tmp_path / "rerated.xlsx", "-q") == 0
    assert _rate(edited_original, tmp_path / "reference.xlsx", "-q") == 0
    rerated, reference, before = (_results(p) for p in (tmp_path / "rerated.xlsx", tmp_path / "reference.xlsx", rated))
    row = next(i for i, r in enumerate(reference) if r[0] == pid)
    assert rerated[row] == reference[row] and rerated[row] != before[row]  # the demand tripled
    assert rerated == reference
    # Every member the earlier rating did not own is kept byte for byte; the user's edit with it.
    inp, out = _members(edited_copy), _members(tmp_path / "rerated.xlsx")
    for name in set(inp) - _ours(edited_copy):
        assert out[name] == inp[name], name
    parts = _sheet_parts(zipfile.ZipFile(edited_copy))["Parts"]
    assert new in out[parts].decode()


def test_user_comments_are_kept_and_ours_replaced(tmp_path, capsys):
    bad = Case("bad torque", "bad", cells={"torque": "lots"}, flag="torque")
    book = build_book(tmp_path / "book.xlsx", 3, {1: bad})
    wb = openpyxl.load_workbook(book)
    ref = cell_of(1, "torque")
    wb["Parts"][ref].comment = Comment("duty from the pump curve, rev B", "M. Okafor")
    wb["Parts"][cell_of(2, "length")].comment = Comment("measured on the worn shaft", "M. Okafor")
    wb.save(book)
    rated, again = tmp_path / "rated.xlsx", tmp_path / "again.xlsx"
    assert _rate(book, rated, "-q") == 0
    assert _rate(rated, again, "-q") == 0
    for path in (rated, again):
        ws = openpyxl.load_workbook(path)["Parts"]
        text = ws[ref].comment.text
        assert text.count("duty from the pump curve, rev B") == 1
        assert text.count("twistshare error") == 1, text  # ours once, not twice
        assert ws[cell_of(2, "length")].comment.text == "measured on the worn shaft"
    assert part_id(1) in {r[0] for r in _results(again)}


def test_in_place_on_a_rated_copy_keeps_a_backup(rated, tmp_path, capsys):
    book = tmp_path / "book.xlsx"
    shutil.copy(rated, book)
    before = book.read_bytes()
    assert main(["rate", str(book), "--in-place", "--lenient"]) == 0
    err = capsys.readouterr().err
    backups = list(tmp_path.glob("book.xlsx.bak-*"))
    assert len(backups) == 1 and backups[0].read_bytes() == before
    assert f"kept the book as it was as {backups[0]}" in err and "re-rated" in err
    assert _results(book) == _results(rated)
    assert read_record(book) is not None


def test_a_rated_copy_is_never_written_over_without_in_place(rated, tmp_path, capsys):
    book = tmp_path / "book.xlsx"
    shutil.copy(rated, book)
    before = book.read_bytes()
    assert main(["rate", str(book), "-o", str(book), "-q", "--lenient"]) == 2
    assert "is the input workbook" in capsys.readouterr().err
    assert book.read_bytes() == before and not list(tmp_path.glob("book.xlsx.bak-*"))


def test_check_on_a_checked_copy_is_rechecked(tmp_path, capsys):
    checked, again = tmp_path / "checked.xlsx", tmp_path / "again.xlsx"
    assert main(["check", str(CATALOGUE), "-o", str(checked), "-q", "--lenient"]) == 0
    assert main(["check", str(checked), "-o", str(again), "--lenient"]) == 0
    assert "re-checked: replaced 1 sheet of ours" in capsys.readouterr().err
    assert openpyxl.load_workbook(again).sheetnames == openpyxl.load_workbook(checked).sheetnames


def test_a_copy_without_its_record_is_refused(rated, tmp_path, capsys):
    """Our sheets without the record: a program dropped it; taking our work out would be guessing."""
    with zipfile.ZipFile(rated) as zf:
        record = next(n for n in zf.namelist() if n.startswith("customXml/item") and "Props" not in n)
    stripped = rezip(rated, tmp_path / "norecord.xlsx", {record: None})
    assert _rate(stripped, tmp_path / "out.xlsx", "-q") == 2
    err = capsys.readouterr().err
    assert "already holds twistshare's sheets" in err and "saves it again" in err
    assert not (tmp_path / "out.xlsx").exists()


def _resave_in_libreoffice(book: Path, tmp_path: Path) -> Path:
    profile, outdir = tmp_path / "profile", tmp_path / "lo"
    proc = subprocess.run([SOFFICE, f"-env:UserInstallation=file://{profile}", "--headless", "--convert-to", "xlsx",
                           "--outdir", str(outdir), str(book)], capture_output=True, text=True, timeout=240)
    resaved = outdir / book.name
    assert proc.returncode == 0 and resaved.exists(), proc.stderr
    return resaved


def _comments(path: Path) -> dict[str, dict[str, str]]:
    wb = openpyxl.load_workbook(path)
    return {ws.title: {c.coordinate: c.comment.text for row in ws.iter_rows() for c in row if c.comment}
            for ws in wb.worksheets if not ws.title.startswith("Twistshare")}


@pytest.mark.skipif(SOFFICE is None, reason="LibreOffice (soffice) is not installed")
def test_a_copy_saved_again_by_libreoffice_is_rerated_by_the_fallback(rated, tmp_path, capsys):
    resaved = _resave_in_libreoffice(rated, tmp_path)
    before = resaved.read_bytes()
    again = tmp_path / "again.xlsx"
    assert _rate(resaved, again) == 0
    err = capsys.readouterr().err
    assert "re-rated a copy that a spreadsheet program saved again" in err, err
    assert re.search(r"replaced 5 sheets of ours, \d+ comments, emptied \d+ cells", err), err
    assert resaved.read_bytes() == before
    assert _results(again) == _results(rated)
    assert _comments(again) == _comments(rated)  # ours once each, not doubled
    # Rated by the fallback, the copy carries a fresh record: rating it again is exact.
    assert _rate(again, tmp_path / "third.xlsx") == 0
    assert "re-rated: replaced 5 sheets of ours" in capsys.readouterr().err
    assert _results(tmp_path / "third.xlsx") == _results(rated)


@pytest.mark.skipif(SOFFICE is None, reason="LibreOffice (soffice) is not installed")
def test_an_input_corrected_in_a_libreoffice_copy_gives_the_new_result(tmp_path, capsys):
    bad = Case("bad torque", "bad", cells={"torque": "lots"}, flag="torque")
    book = build_book(tmp_path / "book.xlsx", 3, {1: bad})
    wb = openpyxl.load_workbook(book)
    ref = cell_of(1, "torque")
    wb["Parts"][ref].comment = Comment("duty from the pump curve, rev B", "M. Okafor")
    wb.save(book)
    rated = tmp_path / "rated.xlsx"
    assert main(["rate", str(book), "-o", str(rated), "-q"]) == 1
    resaved = _resave_in_libreoffice(rated, tmp_path)
    # The correction as LibreOffice would store it: the text cell becomes a number.
    with zipfile.ZipFile(resaved) as zf:
        text = zf.read(_sheet_parts(zf)["Parts"]).decode()
    old = re.search(rf'<c r="{ref}"[^>]*>.*?</c>', text).group(0)
    fixed = _edit_sheet(resaved, tmp_path / "fixed.xlsx", "Parts", old, f'<c r="{ref}" t="n"><v>520</v></c>')
    again = tmp_path / "again.xlsx"
    assert main(["rate", str(fixed), "-o", str(again), "-q"]) == 0
    ws = openpyxl.load_workbook(again)["Parts"]
    assert ws[ref].value == 520 and ws[ref].comment.text == "duty from the pump curve, rev B"
    book_fixed = tmp_path / "book-fixed.xlsx"
    wb = openpyxl.load_workbook(book)
    wb["Parts"][ref] = 520
    wb.save(book_fixed)
    assert main(["rate", str(book_fixed), "-o", str(tmp_path / "reference.xlsx"), "-q"]) == 0
    assert _results(again) == _results(tmp_path / "reference.xlsx")


def test_a_rerated_copy_opens_in_gnumeric_and_libreoffice(rated, tmp_path):
    again = tmp_path / "again.xlsx"
    assert _rate(rated, again, "-q") == 0
    ssconvert = shutil.which("ssconvert")
    if ssconvert:
        csv = tmp_path / "again.csv"
        proc = subprocess.run([ssconvert, "-S", str(again), str(tmp_path / "again-%s.csv")],
                              capture_output=True, text=True, timeout=120)
        assert proc.returncode == 0, proc.stderr
        sheets = sorted(tmp_path.glob("again-*.csv"))
        assert len(sheets) == len(openpyxl.load_workbook(again).sheetnames)
        assert any("MPD-" in p.read_text(errors="replace") for p in sheets) and not csv.exists()
    if SOFFICE:
        profile = tmp_path / "profile"
        proc = subprocess.run([SOFFICE, f"-env:UserInstallation=file://{profile}", "--headless", "--convert-to",
                               "pdf", "--outdir", str(tmp_path), str(again)], capture_output=True, text=True, timeout=240)
        assert proc.returncode == 0 and (tmp_path / "again.pdf").stat().st_size > 1000, proc.stderr
    if not (ssconvert or SOFFICE):
        pytest.skip("neither gnumeric's ssconvert nor LibreOffice is installed")


def test_a_corrected_cell_loses_our_comment_and_keeps_the_users(tmp_path, capsys):
    bad = Case("bad torque", "bad", cells={"torque": "lots"}, flag="torque")
    book = build_book(tmp_path / "book.xlsx", 3, {1: bad})
    wb = openpyxl.load_workbook(book)
    ref = cell_of(1, "torque")
    wb["Parts"][ref].comment = Comment("duty from the pump curve, rev B", "M. Okafor")
    wb.save(book)
    rated = tmp_path / "rated.xlsx"
    assert main(["rate", str(book), "-o", str(rated), "-q"]) == 1  # the bad cell is an error
    # The user corrects the cell in the rated copy (a number where the text was).
    with zipfile.ZipFile(rated) as zf:
        text = zf.read(_sheet_parts(zf)["Parts"]).decode()
    old = re.search(rf'<c r="{ref}"[^>]*>.*?</c>', text).group(0)
    assert "lots" in old
    fixed = _edit_sheet(rated, tmp_path / "fixed.xlsx", "Parts", old, f'<c r="{ref}"><v>520</v></c>')
    again = tmp_path / "again.xlsx"
    assert main(["rate", str(fixed), "-o", str(again), "-q"]) == 0  # every part rated now
    ws = openpyxl.load_workbook(again)["Parts"]
    assert ws[ref].value == 520 and ws[ref].comment.text == "duty from the pump curve, rev B"
    row = next(r for r in _results(again) if r[0] == part_id(1))
    assert row[1] != "not rated"
    # The same correction made in the original book gives the same results.
    with zipfile.ZipFile(book) as zf:
        original = zf.read(_sheet_parts(zf)["Parts"]).decode()
    assert old in original
    reference = tmp_path / "reference.xlsx"
    _edit_sheet(book, tmp_path / "book-fixed.xlsx", "Parts", old, f'<c r="{ref}"><v>520</v></c>')
    assert main(["rate", str(tmp_path / "book-fixed.xlsx"), "-o", str(reference), "-q"]) == 0
    assert _results(again) == _results(reference)


def test_rerating_again_and_again_changes_nothing(rated, tmp_path):
    first, second = tmp_path / "1.xlsx", tmp_path / "2.xlsx"
    assert _rate(rated, first, "-q") == 0 and _rate(first, second, "-q") == 0
    a, b = _members(first), _members(second)
    summary = _sheet_parts(zipfile.ZipFile(first))["Twistshare summary"]
    assert list(a) == list(b) and {n for n in a if a[n] != b[n]} <= {summary, "customXml/item1.xml"}


def test_the_by_layer_sample_rerates_to_the_same_results(tmp_path):
    rated, again = tmp_path / "rated.xlsx", tmp_path / "again.xlsx"
    assert _rate(SAMPLES / "marrowby_catalogue_by_layer.xlsx", rated, "-q", "--units", "US") == 0
    assert _rate(rated, again, "-q", "--units", "US") == 0
    assert _results(again) == _results(rated)


@pytest.mark.parametrize("damage", ["format", "checksum"])
def test_an_unreadable_record_is_refused_in_words(rated, tmp_path, capsys, damage):
    with zipfile.ZipFile(rated) as zf:
        name = next(n for n in zf.namelist() if n.startswith("customXml/item") and "Props" not in n)
        data = zf.read(name)
    if damage == "format":
        data = data.replace(b'format="1"', b'format="7"')
    else:
        data = re.sub(rb'(<stored [^>]*before=")[0-9a-f]{8}', rb"\g<1>00000000", data, count=1)
    broken = rezip(rated, tmp_path / "broken.xlsx", {name: data})
    assert _rate(broken, tmp_path / "out.xlsx", "-q") == 2
    err = capsys.readouterr().err
    assert "ownership record" in err and ("format" in err or "checksum" in err) and "Traceback" not in err
    assert not (tmp_path / "out.xlsx").exists()
