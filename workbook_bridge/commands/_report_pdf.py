"""``rate --pdf``: the report as a PDF (summary, worked calculations, warnings), printed by LibreOffice.

The rated copy is written first, as always; a temporary copy of it showing only the report's
sheets, in the report's order, is printed by a headless LibreOffice (`..hosts.calc.export_pdf`)
with each sheet's own page setup. The user's book and the rated copy are never changed.
"""

from __future__ import annotations

import tempfile
from collections.abc import Sequence
from pathlib import Path

__all__ = ["EXIT_NO_PDF", "check_pdf_request", "write_report_pdf"]

EXIT_NO_PDF = 4  # the rated copy is written, the PDF report is not (LibreOffice failed or ran out of time)


def check_pdf_request(pdf: Path, book: Path, out: Path, timeout: float) -> str | None:
    """Why the PDF cannot be made, before anything is rated (None when it can be tried)."""
    from ..hosts.calc import LibreOfficeMissing, find_soffice

    if timeout <= 0:
        return f"--pdf-timeout {timeout:g}: give the seconds LibreOffice may take (more than 0); nothing was written"
    if pdf.suffix.lower() != ".pdf":
        return f"--pdf {pdf}: the report's name must end in .pdf; nothing was written"
    if not pdf.parent.resolve().is_dir():
        return f"--pdf {pdf}: no folder {pdf.parent}; nothing was written"
    if pdf.resolve() in (book.resolve(), out.resolve()):
        return f"--pdf {pdf} names the workbook itself; choose another name; nothing was written"
    try:
        find_soffice()
    except LibreOfficeMissing as error:
        return f"--pdf needs LibreOffice to print the report: {error}; nothing was written"
    return None


def write_report_pdf(rated: Path, pdf: Path, sheets: Sequence[str], *, timeout: float) -> str:
    """Print `sheets` of the rated copy, in that order, to `pdf`; a line saying so.

    Raises
    ------
    CalcHostError
        LibreOffice failed or ran out of time (one-line message); the PDF is not written.
    OoxmlError
        The rated copy cannot be read back.
    """
    from ..hosts.calc import export_pdf
    from ..ooxml import write_sheet_selection

    with tempfile.TemporaryDirectory(prefix="twistshare-report-") as tmp:
        # named after the PDF: LibreOffice prints the file's name in each page's footer
        selection = Path(tmp) / (pdf.stem + rated.suffix)
        write_sheet_selection(rated, selection, sheets)
        seconds = export_pdf(selection, pdf, timeout=timeout)
    return f"twistshare: wrote the report {pdf} ({', '.join(sheets)}) in {seconds:.1f} s"
