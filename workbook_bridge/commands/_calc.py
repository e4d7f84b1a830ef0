"""``twistshare calc-setup`` and ``twistshare recalc``: the cell functions in LibreOffice Calc.

Both are thin: the work is done by the Calc host (`..hosts.calc`), which says everything it
did in its reports and words every failure in one line (`CalcHostError`).
"""

from __future__ import annotations

from pathlib import Path

from ._output import EXIT_OK, EXIT_PART_ERRORS, fail

__all__ = ["run_calc_setup", "run_recalc", "recalculated_name"]

_LISTED = 20  # problem cells listed beyond the first (which the report line names)


def recalculated_name(book: Path) -> Path:
    """The default copy ``recalc`` writes: ``BOOK-recalculated.xlsx`` (or ``.xlsm``) beside the book."""
    ext = book.suffix if book.suffix.lower() in (".xlsx", ".xlsm") else ".xlsx"
    return book.with_name(f"{book.stem}-recalculated{ext}")


def run_calc_setup(profile: Path | None, *, undo: bool = False) -> int:
    """Install the cell functions into a LibreOffice user profile (the user's own by default), or undo it.

    Prints what was done and the command that undoes it; a second run changes nothing.
    Exit code 0, or 2 with one line on stderr saying why nothing was done.
    """
    from ..hosts.calc import CalcHostError, setup_profile

    try:
        report = setup_profile(profile, undo=undo)
    except CalcHostError as error:
        return fail(str(error))
    print(report)
    return EXIT_OK


def run_recalc(book: Path, out: Path | None, *, timeout: float, lenient: bool = False,
               quiet: bool = False) -> int:
    """Recompute every formula of `book` in headless LibreOffice and write a copy.

    Exit codes: 0 written; 1 written, but some cells show an error or a ``⚠`` message (0 with
    `lenient`); 2 nothing written (LibreOffice missing, too slow, the book unusable), one line why.
    """
    from ..hosts.calc import CalcHostError, recalculate

    if timeout <= 0:
        return fail(f"--timeout {timeout:g}: give the seconds the run may take (more than 0); nothing was written")
    try:
        report = recalculate(book, out or recalculated_name(book), timeout=timeout)
    except CalcHostError as error:
        return fail(str(error))
    print(str(report).splitlines()[-1] if quiet else report)
    if not quiet:
        listed = report.problems[1:1 + _LISTED]
        for sheet, ref, shown in listed:
            print(f"  {sheet}!{ref}: {' '.join(shown.split())[:160]}")
        if len(report.problems) > 1 + _LISTED:
            print(f"  ... and {len(report.problems) - 1 - _LISTED} more")
    return EXIT_PART_ERRORS if report.problems and not lenient else EXIT_OK
