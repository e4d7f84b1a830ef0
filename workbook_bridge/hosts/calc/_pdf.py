"""A PDF of a workbook's visible sheets, printed by a headless LibreOffice.

LibreOffice's own converter (``--convert-to pdf``) prints each visible sheet with its page setup;
it runs on a throw-away profile in a temporary folder, in a process group of its own that is
ended on every path (done, failed or out of time), through the same launcher as `recalc`.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import tempfile
import time
from pathlib import Path

from ...ooxml import atomic_file
from ._errors import LibreOfficeFailed, LibreOfficeTimeout
from ._office import _clean_env, _office_args, _spawn, end_process_group, find_soffice

__all__ = ["export_pdf", "PDF_TIMEOUT", "find_soffice"]

PDF_TIMEOUT = 180.0  # seconds for one export, LibreOffice's start on a new profile included


def export_pdf(book: str | os.PathLike, pdf: str | os.PathLike, *, timeout: float = PDF_TIMEOUT) -> float:
    """Print the visible sheets of `book` to `pdf` (replaced atomically); the seconds it took.

    Raises
    ------
    LibreOfficeMissing
        No ``soffice`` (``TWISTSHARE_SOFFICE`` names one that is not there, or none is installed).
    LibreOfficeTimeout
        Not done within `timeout` seconds; LibreOffice was stopped.
    LibreOfficeFailed
        LibreOffice could not be started, or ended without making the PDF.
    """
    soffice = find_soffice()
    book, pdf = Path(book).resolve(), Path(pdf).resolve()
    started = time.monotonic()
    with tempfile.TemporaryDirectory(prefix="twistshare-pdf-") as tmp:
        work = Path(tmp)
        (work / "out").mkdir()
        log = work / "office.log"
        args = _office_args(soffice, work / "profile") + ["--convert-to", "pdf:calc_pdf_Export",
                                                          "--outdir", str(work / "out"), str(book)]
        with open(log, "wb") as sink:
            try:
                process = _spawn(args, _clean_env(for_office=True), stdout=sink, stderr=subprocess.STDOUT, cwd=tmp)
            except OSError as error:
                raise LibreOfficeFailed(f"could not start LibreOffice ({soffice}): {error}") from None
            try:
                process.wait(timeout=timeout)
            except subprocess.TimeoutExpired:
                raise LibreOfficeTimeout(f"LibreOffice did not print the PDF within {timeout:g} s; it was stopped",
                                         timeout) from None
            finally:
                end_process_group(process, 0.0)
        made = work / "out" / (book.stem + ".pdf")
        if not made.is_file() or made.stat().st_size == 0:
            said = log.read_text("utf-8", "replace").strip().splitlines()
            reason = said[-1] if said else f"exit code {process.returncode}"
            raise LibreOfficeFailed(f"LibreOffice ({soffice}) made no PDF of {book.name}: {reason}")
        with atomic_file(pdf, 0o644) as raw, open(made, "rb") as printed:
            shutil.copyfileobj(printed, raw)
    return time.monotonic() - started
