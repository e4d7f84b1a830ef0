"""Every kind of workbook the tool writes opens in LibreOffice Calc headless and re-reads cleanly.

LibreOffice is an independent OOXML consumer: a package it cannot open would be a package Excel
users could lose work in. Skipped (with the reason) where `soffice` is not installed; CI installs it.
"""

from __future__ import annotations

import shutil
import subprocess
import warnings
from pathlib import Path

import openpyxl
import pytest
from twistshare.workbook_bridge.commands import main

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"
SOFFICE = shutil.which("soffice") or shutil.which("libreoffice")


@pytest.fixture(scope="module")
def outputs(tmp_path_factory) -> list[Path]:
    d = tmp_path_factory.mktemp("lo")
    made = []
    for args, name in (
        (["rate", str(SAMPLES / "marrowby_catalogue.xlsx")], "rated.xlsx"),
        (["rate", str(SAMPLES / "marrowby_catalogue_by_layer.xlsx"), "--units", "US"], "rated_us.xlsx"),
        (["check", str(SAMPLES / "marrowby_catalogue.xlsx")], "checked.xlsx"),
        (["handout", str(SAMPLES / "marrowby_cell_functions.xlsx")], "shared.xlsx"),
    ):
        out = d / name
        assert main(args + ["-o", str(out), "-q"]) in (0, 1)
        made.append(out)
    return made


def test_openpyxl_reads_every_output_without_warnings(outputs):
    for out in outputs:
        with warnings.catch_warnings():
            warnings.simplefilter("error")
            wb = openpyxl.load_workbook(out)
        assert any(n.startswith("Twistshare") for n in wb.sheetnames), out.name


@pytest.mark.skipif(SOFFICE is None, reason="LibreOffice (soffice) is not installed")
def test_libreoffice_converts_every_output(outputs, tmp_path):
    profile = tmp_path / "profile"
    pdf_dir = tmp_path / "pdf"
    cmd = [SOFFICE, f"-env:UserInstallation=file://{profile}", "--headless", "--convert-to", "pdf",
           "--outdir", str(pdf_dir)] + [str(p) for p in outputs]
    proc = subprocess.run(cmd, capture_output=True, text=True, timeout=300)
    assert proc.returncode == 0, proc.stderr
    for out in outputs:
        pdf = pdf_dir / (out.stem + ".pdf")
        assert pdf.exists() and pdf.stat().st_size > 1000, f"{out.name}: {proc.stdout} {proc.stderr}"
