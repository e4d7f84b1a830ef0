"""One caution, defined once (`intake.CAUTION_LINES`), written by every output we make."""

from __future__ import annotations

from pathlib import Path

import openpyxl
import pytest
from twistshare.engine.intake import CAUTION_LINES
from twistshare.workbook_bridge.commands import main

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"


def _texts(path: Path, sheet: str) -> str:
    ws = openpyxl.load_workbook(path)[sheet]
    return "\n".join(str(c.value) for row in ws.iter_rows() for c in row if c.value is not None)


def test_the_caution_names_the_four_points():
    # preliminary design aid; codes and standards; qualified engineer's review; local codes prevail
    text = " ".join(CAUTION_LINES).lower()
    for words in ("preliminary design aid", "codes and standards", "qualified engineer", "local codes"):
        assert words in text


@pytest.mark.parametrize("command, sheets", [
    (["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "--lenient"], ["Twistshare summary", "Twistshare warnings"]),
    (["check", str(SAMPLES / "marrowby_catalogue.xlsx"), "--lenient"], ["Twistshare warnings"]),
    (["handout", str(SAMPLES / "marrowby_cell_functions.xlsx")], ["Twistshare handout"]),
])
def test_every_output_carries_the_caution(tmp_path, command, sheets):
    out = tmp_path / "out.xlsx"
    assert main([*command, "-o", str(out), "-q"]) == 0
    for sheet in sheets:
        text = _texts(out, sheet)
        for line in CAUTION_LINES:
            assert line in text, (sheet, line)


@pytest.mark.parametrize("book", ["marrowby_catalogue.xlsx", "marrowby_catalogue_by_layer.xlsx",
                                  "marrowby_cell_functions.xlsx"])
def test_every_sample_book_carries_the_caution(book):
    text = _texts(SAMPLES / book, "Read me")
    for line in CAUTION_LINES:
        assert line in text


def test_readme_carries_the_caution_points():
    readme = (Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8").lower()
    for words in ("preliminary design aid", "codes and standards", "qualified engineer", "local codes"):
        assert words in readme
