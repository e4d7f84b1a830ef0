"""``twistshare rate`` and ``twistshare check``: rate (or check) every part, write a copy."""

from __future__ import annotations

import os
from pathlib import Path

from twistshare.engine.errors import BookUnusable
from twistshare.engine.intake import BookRating, Display, Severity, rate_tables

from ..ooxml import BookWriter, OoxmlError, WriteRefused
from ..sheets import add_rating_sheets, add_warnings_sheet, write_comments
from ._output import EXIT_OK, EXIT_PART_ERRORS, EXIT_PARTS_FAIL, fail, open_for_rating, say, write_book
from ._progress import Progress
from ._report_pdf import EXIT_NO_PDF, check_pdf_request, write_report_pdf
from ._rerate import RatingSource, rating_source
from ._terminal import part_records, terminal_table, write_records

__all__ = ["run_rate", "run_check"]


def _report(result: BookRating, out: Path | None, quiet: bool, verb: str) -> None:
    errors = [f for f in result.problems if f.severity is Severity.ERROR]
    warns = [f for f in result.problems if f.severity is Severity.WARNING]
    if not quiet:
        for f in result.problems:
            if f.severity is not Severity.NOTE:
                say("  " + f.line())
    n = result.parts.count if result.parts else 0
    rated = int(result.rated.sum()) if result.rated is not None else 0
    failing = 0
    if result.rating is not None and result.rated is not None:
        failing = int((result.rating.margin[result.rated] < 0).sum())
    where = f"; wrote {out}" if out else ""
    if verb == "rate":
        print(f"twistshare: rated {rated} of {n} parts, {failing} failing, {len(errors)} errors, "
              f"{len(warns)} warnings{where}")
    else:
        print(f"twistshare: checked {n} parts: {len(errors)} errors, {len(warns)} warnings{where}")


def _exit_code(result: BookRating) -> int:
    return EXIT_PART_ERRORS if any(f.severity is Severity.ERROR for f in result.problems) else EXIT_OK


def run_rate(book_path: Path, out: Path, *, in_place: bool = False, units: str = "book", quiet: bool = False,
             profile_part: str | None = None, results_file: Path | None = None, exit_if_failing: bool = False,
             lenient: bool = False, worked: list[str] | None = None, pdf: Path | None = None,
             pdf_timeout: float = 180.0) -> int:
    """Rate every part of `book_path` and write the rated copy to `out` (and the report to `pdf`); the exit code.

    A rated copy (it holds twistshare's ownership record) is re-rated: our earlier sheets,
    comments and marks are taken out first, every other member is kept byte for byte."""
    if pdf is not None:
        why = check_pdf_request(pdf, book_path, out, pdf_timeout)
        if why:
            return fail(why)
    progress = Progress(["check package", "read tables", "rate", "write"], enabled=None if not quiet else False)
    try:
        with rating_source(book_path) as source:
            progress.step("check package")
            book = open_for_rating(source.path, out)
            progress.step("read tables")
            result = rate_tables(book)
            progress.step("write")
            display = Display(result.system if units == "book" else units)
            with BookWriter(source.path) as writer:
                report_sheets = add_rating_sheets(writer, result, display, profile_part, worked)
                write_comments(writer, result, result.problems)
                previous = _write(writer, source, out, in_place)
    except (OoxmlError, BookUnusable) as exc:
        progress.finish()
        return fail(str(exc))
    progress.finish()
    _tell(source, previous, out, in_place, quiet, "rated")
    if results_file is not None:
        try:
            write_records(part_records(result, display), results_file)
        except OSError as exc:
            return fail(f"cannot write {results_file}: {exc.strerror or exc}; the rated copy is written")
    if not quiet:
        table = terminal_table(result, display)
        if table:
            say(table)
    _report(result, out, quiet, "rate")
    if pdf is not None:
        from ..hosts.calc import CalcHostError

        try:
            line = write_report_pdf(out, pdf, report_sheets, timeout=pdf_timeout)
            if not quiet:
                say(line)
        except (CalcHostError, OoxmlError) as exc:
            say(f"twistshare: the rated copy {out} is written, the PDF report is not: {exc}")
            return EXIT_NO_PDF
    code = _exit_code(result)
    if lenient and code == EXIT_PART_ERRORS:
        code = EXIT_OK
    if code == EXIT_OK and exit_if_failing and _failing(result):
        return EXIT_PARTS_FAIL
    return code


def _write(writer: BookWriter, source: RatingSource, out: Path, in_place: bool) -> str | None:
    """Write the copy; a re-rated book written in place is kept first, like any in-place book."""
    if source.stripped is None:
        return write_book(writer, out, in_place)
    if not in_place and out.exists() and os.path.samefile(out, source.original):
        raise WriteRefused(f"output {out} is the input workbook; choose another name "
                           "(or ask for in-place writing, which keeps a backup)")
    source.check_unchanged()
    return write_book(writer, out, False)  # the source is the stripped copy: the book itself is kept as a backup


def _tell(source: RatingSource, previous: str | None, out: Path, in_place: bool, quiet: bool, verb: str) -> None:
    if previous:
        say(f"twistshare: kept the {'book as it was' if in_place else 'file that was at ' + str(out)} as {previous}")
    if not quiet:
        for line in source.lines(verb):
            say(line)


def _failing(result: BookRating) -> int:
    if result.rating is None or result.rated is None:
        return 0
    return int((result.rating.margin[result.rated] < 0).sum())


def run_check(book_path: Path, out: Path, *, in_place: bool = False, quiet: bool = False) -> int:
    """Check the tables of `book_path` only: a copy with the warnings sheet and comments."""
    try:
        with rating_source(book_path) as source:
            result = rate_tables(open_for_rating(source.path, out))
            with BookWriter(source.path) as writer:
                add_warnings_sheet(writer, result.problems)
                write_comments(writer, result, result.problems)
                previous = _write(writer, source, out, in_place)
    except (OoxmlError, BookUnusable) as exc:
        return fail(str(exc))
    _tell(source, previous, out, in_place, quiet, "checked")
    _report(result, out, quiet, "check")
    return _exit_code(result)
