"""Printing through LibreOffice: the rated sample's page count, and ``rate --pdf``.

Skipped (with the reason) where LibreOffice or poppler's pdfinfo / pdftotext are missing. The
missing-LibreOffice and out-of-time paths need neither: the launcher is pointed at a program that
does not exist, or at one that never finishes (``TWISTSHARE_SOFFICE``).
"""

from __future__ import annotations

import os
import shutil
import subprocess
from pathlib import Path

import pytest
from twistshare.workbook_bridge.commands import main

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"
SOFFICE = shutil.which("soffice") or shutil.which("libreoffice")
POPPLER = shutil.which("pdfinfo") and shutil.which("pdftotext")
needs_office = pytest.mark.skipif(not (SOFFICE and POPPLER),
                                  reason="LibreOffice (soffice) or poppler (pdfinfo, pdftotext) is not installed")
PAGE_BAR = 15  # the rated sample catalogue, every sheet, printed


def _pages(pdf: Path) -> int:
    info = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True, check=True).stdout
    return int(next(line.split()[-1] for line in info.splitlines() if line.startswith("Pages:")))


def _text(pdf: Path, page: int | None = None) -> str:
    where = [] if page is None else ["-f", str(page), "-l", str(page)]
    return subprocess.run(["pdftotext", *where, str(pdf), "-"], capture_output=True, text=True, check=True).stdout


def _first_page_with(pdf: Path, words: str) -> int:
    return next(p for p in range(1, _pages(pdf) + 1) if words in _text(pdf, p))


@pytest.fixture(scope="module")
def rated(tmp_path_factory) -> Path:
    out = tmp_path_factory.mktemp("pdf") / "rated.xlsx"
    assert main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", str(out), "--lenient", "-q"]) == 0
    return out


@needs_office
def test_rated_sample_prints_within_the_page_bar(rated, tmp_path):
    """The whole rated copy, every sheet (the book's own and ours), through LibreOffice's converter."""
    from twistshare.workbook_bridge.hosts.calc import export_pdf

    pdf = tmp_path / "all.pdf"
    export_pdf(rated, pdf, timeout=240)
    pages = _pages(pdf)
    assert 8 <= pages <= PAGE_BAR, pages  # 45 before the print setup
    text = _text(pdf)
    # every header word of the results sheet is printed (a clipped header would lose some)
    import openpyxl

    header = [c.value for c in openpyxl.load_workbook(rated, read_only=True)["Twistshare results"][1]]
    printed = set(text.replace("\n", " ").split())
    missing = {w for h in header for w in h.split() if w not in printed}
    assert not missing, missing


@needs_office
def test_pdf_report_holds_summary_worked_and_warnings_in_order(tmp_path):
    out, pdf = tmp_path / "rated.xlsx", tmp_path / "report.pdf"
    code = main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", str(out), "--lenient", "-q",
                 "--pdf", str(pdf)])
    assert code == 0 and out.is_file()
    assert 3 <= _pages(pdf) <= 6
    summary = _first_page_with(pdf, "twistshare rating summary")
    worked = _first_page_with(pdf, "Worked calculation: part MPD-S-")  # the lowest-margin part by default
    warnings = _first_page_with(pdf, "Severity")  # the warnings table's header
    assert summary == 1 and summary < worked < warnings
    assert "Message" in _text(pdf, warnings) and "Twistshare warnings" in _text(pdf, warnings)  # its footer
    text = _text(pdf)
    assert "Twistshare results" not in text and "Twistshare materials" not in text  # only the report's sheets


def test_pdf_without_libreoffice_says_so_and_writes_nothing(tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("TWISTSHARE_SOFFICE", str(tmp_path / "no-such" / "soffice"))
    out, pdf = tmp_path / "rated.xlsx", tmp_path / "report.pdf"
    code = main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", str(out), "--lenient", "-q",
                 "--pdf", str(pdf)])
    err = capsys.readouterr().err
    assert code == 2
    assert "--pdf needs LibreOffice" in err and "no such program" in err and "nothing was written" in err
    assert "Traceback" not in err and len(err.strip().splitlines()) == 1
    assert not out.exists() and not pdf.exists()


@pytest.mark.skipif(os.name == "nt", reason="a shell script stands in for soffice")
def test_pdf_run_time_is_bounded(tmp_path, monkeypatch, capsys):
    never_done = tmp_path / "soffice"
    never_done.write_text("#!/bin/sh\nsleep 120\n")
    never_done.chmod(0o755)
    monkeypatch.setenv("TWISTSHARE_SOFFICE", str(never_done))
    out, pdf = tmp_path / "rated.xlsx", tmp_path / "report.pdf"
    code = main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", str(out), "--lenient", "-q",
                 "--pdf", str(pdf), "--pdf-timeout", "1.5"])
    err = capsys.readouterr().err
    assert code == 4
    assert "the PDF report is not" in err and "within 1.5 s" in err and "Traceback" not in err
    assert out.is_file() and not pdf.exists()  # the rated copy is kept


@pytest.mark.parametrize("args, words", [
    (["--pdf", "report.txt"], "must end in .pdf"),
    (["--pdf", "report.pdf", "--pdf-timeout", "0"], "--pdf-timeout 0"),
])
def test_pdf_request_checked_before_rating(tmp_path, monkeypatch, capsys, args, words):
    monkeypatch.chdir(tmp_path)
    code = main(["rate", str(SAMPLES / "marrowby_catalogue.xlsx"), "-o", "rated.xlsx", "-q", *args])
    assert code == 2 and words in capsys.readouterr().err and not (tmp_path / "rated.xlsx").exists()
