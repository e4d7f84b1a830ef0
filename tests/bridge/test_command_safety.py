"""What the commands do around the rating: outputs kept, refusals in words, headers checked."""

from __future__ import annotations

import hashlib
import shutil
from pathlib import Path

import openpyxl
import pytest
from twistshare.workbook_bridge.commands import main

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"
CATALOGUE = SAMPLES / "marrowby_catalogue.xlsx"


def _sha(p: Path) -> str:
    return hashlib.sha256(p.read_bytes()).hexdigest()


def test_rating_our_own_output_rerates_it_and_leaves_it_alone(tmp_path, capsys):
    out = tmp_path / "rated.xlsx"
    main(["rate", str(CATALOGUE), "-o", str(out), "-q"])
    before = _sha(out)
    assert main(["rate", str(out), "-o", str(tmp_path / "again.xlsx"), "--lenient"]) == 0
    assert "re-rated: replaced 5 sheets of ours" in capsys.readouterr().err
    assert _sha(out) == before and (tmp_path / "again.xlsx").exists()


def test_missing_output_folder_is_said_in_words(tmp_path, capsys):
    assert main(["rate", str(CATALOGUE), "-o", str(tmp_path / "nope" / "x.xlsx"), "-q"]) == 2
    err = capsys.readouterr().err
    assert "does not exist" in err and "internal error" not in err


def test_an_existing_output_is_kept_as_a_backup(tmp_path, capsys):
    out = tmp_path / "rated.xlsx"
    out.write_bytes(b"an earlier file the user cares about")
    main(["rate", str(CATALOGUE), "-o", str(out), "-q", "--lenient"])
    backups = list(tmp_path.glob("rated.xlsx.bak-*"))
    assert len(backups) == 1 and backups[0].read_bytes() == b"an earlier file the user cares about"
    assert "kept the file" in capsys.readouterr().err


def test_handout_never_replaces_the_book(tmp_path, capsys):
    src = tmp_path / "cells.xlsx"
    shutil.copy(SAMPLES / "marrowby_cell_functions.xlsx", src)
    before = _sha(src)
    with pytest.raises(SystemExit):  # the handout offers no --in-place at all
        main(["handout", str(src), "--in-place", "-q"])
    assert main(["handout", str(src), "-o", str(src), "-q"]) == 2
    assert "never replaces your book" in capsys.readouterr().err
    assert _sha(src) == before


def test_in_place_with_an_output_name_is_refused(tmp_path, capsys):
    src = tmp_path / "book.xlsx"
    shutil.copy(CATALOGUE, src)
    before = _sha(src)
    assert main(["rate", str(src), "--in-place", "-o", str(tmp_path / "other.xlsx"), "-q"]) == 2
    assert "give one of the two" in capsys.readouterr().err
    assert _sha(src) == before and not (tmp_path / "other.xlsx").exists()


def _book(tmp_path: Path, headers: list[str], row: list) -> Path:
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Parts"
    ws.append(headers)
    ws.append(row)
    path = tmp_path / "book.xlsx"
    wb.save(path)
    return path


BASE = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
        "Layer 1 inner diameter [mm]"]
ROW = ["P1", 1000, 750, "AISI 1045 hot rolled", 30, 0]


@pytest.mark.parametrize("header, value", [("Twist limt [deg]", 0.1), ("Service factr", 1.5),
                                           ("Layer 1 outer diamter [mm]", 30)])
def test_a_near_miss_header_stops_the_rating(tmp_path, header, value):
    path = _book(tmp_path, BASE + [header], ROW + [value])
    out = tmp_path / "out.xlsx"
    assert main(["rate", str(path), "-o", str(out), "-q"]) == 1
    wb = openpyxl.load_workbook(out)
    assert wb["Twistshare results"]["B2"].value == "not rated"
    comment = wb["Parts"].cell(1, len(BASE) + 1).comment
    assert comment is not None and "looks like" in comment.text


def test_an_unknown_header_with_a_unit_is_warned_but_rated(tmp_path):
    path = _book(tmp_path, BASE + ["Weight [kg]", "Description"], ROW + [2.0, "spare"])
    out = tmp_path / "out.xlsx"
    assert main(["rate", str(path), "-o", str(out), "-q"]) == 0
    wb = openpyxl.load_workbook(out)
    assert wb["Twistshare results"]["B2"].value in ("ok", "FAILS")
    assert "is ignored" in wb["Parts"]["G1"].comment.text
    assert wb["Parts"]["H1"].comment is None  # a descriptive column passes silently


def test_profile_part_fallback_is_said(tmp_path, capsys):
    main(["rate", str(CATALOGUE), "-o", str(tmp_path / "o.xlsx"), "--profile-part", "NOPE"])
    assert "--profile-part 'NOPE' is not in the parts table" in capsys.readouterr().err


def test_profile_part_is_matched_ignoring_case(tmp_path):
    out = tmp_path / "o.xlsx"
    main(["rate", str(CATALOGUE), "-o", str(out), "-q", "--profile-part", "mpd-s-001"])
    ws = openpyxl.load_workbook(out)["Twistshare summary"]
    assert any("MPD-S-001" in str(c.value) for row in ws.iter_rows() for c in row if c.value)


def test_demo_keeps_an_edited_sample(tmp_path):
    assert main(["demo", str(tmp_path)]) == 0
    target = tmp_path / "marrowby_catalogue.xlsx"
    wb = openpyxl.load_workbook(target)
    wb["Parts"]["C2"] = 1
    wb.save(target)
    edited = _sha(target)
    assert main(["demo", str(tmp_path)]) == 0
    backups = list(tmp_path.glob("marrowby_catalogue.xlsx.bak-*"))
    assert len(backups) == 1 and _sha(backups[0]) == edited


def test_in_place_says_where_the_book_was_kept(tmp_path, capsys):
    src = tmp_path / "book.xlsx"
    shutil.copy(CATALOGUE, src)
    before = _sha(src)
    main(["rate", str(src), "--in-place", "-q", "--lenient"])
    err = capsys.readouterr().err
    backups = list(tmp_path.glob("book.xlsx.bak-*"))
    assert len(backups) == 1 and _sha(backups[0]) == before
    assert f"kept the book as it was as {backups[0]}" in err


def test_demo_into_a_file_is_refused_in_words(tmp_path, capsys):
    target = tmp_path / "not-a-folder"
    target.write_text("mine")
    assert main(["demo", str(target)]) == 2
    err = capsys.readouterr().err
    assert "it is a file, not a folder" in err and "Errno" not in err
    assert target.read_text() == "mine"
