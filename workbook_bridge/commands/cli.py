"""The ``twistshare`` command: rate, check, handout, demo, functions, calc-setup, recalc.

Exit codes: 0 every part rated; 1 some parts had errors (the output is still written);
2 the input is unusable (nothing written), with a one-line reason; 3 (``rate --exit-if-failing``)
every part rated, but some fail their demand; 4 (``rate --pdf``) the rated copy is written but the
PDF report is not (LibreOffice failed or ran out of time). ``recalc``: 1 means some cells show an error or a
``⚠`` message in the copy written.
"""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

from .. import __version__
from ._output import EXIT_OK, EXIT_PART_ERRORS, EXIT_UNUSABLE

__all__ = ["main"]


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="twistshare",
        description="Rate compound shafts in torsion from a workbook of parts and materials. "
        "A preliminary design aid: verify against the applicable codes and standards and have a "
        "qualified engineer review the results.",
    )
    p.add_argument("--version", action="version", version=f"twistshare {__version__}")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")

    def book_command(name: str, help_: str, suffix: str, *, rating: bool = True) -> argparse.ArgumentParser:
        c = sub.add_parser(name, help=help_, description=help_)
        c.add_argument("book", type=Path, help="the workbook (.xlsx or .xlsm); it is never modified")
        c.add_argument("-o", "--output", type=Path, default=None,
                       help=f"where to write the new workbook (default: BOOK{suffix}.xlsx beside the input)")
        if rating:
            c.add_argument("--in-place", action="store_true",
                           help="write into the input file itself, after keeping a timestamped backup copy")
        c.add_argument("-q", "--quiet", action="store_true", help="print only the one-line result")
        if rating:
            c.add_argument("--lenient", action="store_true",
                           help="exit 0 when the output was written even if some parts had errors "
                           "(they are still flagged in the output); 2 still means nothing was written")
        return c

    r = book_command("rate", "rate every part: results, summary and warnings sheets, comments on input cells",
                     "-rated")
    r.add_argument("--units", choices=["book", "SI", "US"], default="book", type=_unit_system,
                   help="unit system of the results (default: that of the book's parts table)")
    r.add_argument("--profile-part", default=None,
                   help="part whose shear stress across the radius is charted (default: the lowest margin)")
    r.add_argument("--worked", action="append", default=None, metavar="PART",
                   help="write a worked calculation sheet (native formulas a checker can audit) for this part; "
                   "repeat for more (default: the part with the lowest margin)")
    r.add_argument("--results", type=Path, default=None, metavar="FILE",
                   help="also write every part's results for scripts: FILE.csv as CSV, any other name as JSON "
                   "(the results sheet's headers, units and words)")
    r.add_argument("--exit-if-failing", action="store_true",
                   help="exit 3 when every input was read but some parts fail their demand (margin below 0)")
    r.add_argument("--pdf", type=Path, default=None, metavar="FILE.pdf",
                   help="also print the report to a PDF: the summary, the worked calculations and the warnings, "
                   "in that order (needs LibreOffice; exit 4 when the rated copy is written but the PDF is not)")
    r.add_argument("--pdf-timeout", type=float, default=180.0, metavar="S",
                   help="seconds LibreOffice may take to print the PDF, its start included (default 180); "
                   "it is stopped when they are up")
    book_command("check", "validate the tables only: warnings as comments in a copy, a report here",
                 "-checked")
    book_command("handout", "a values-only copy for people without the add-in: every formula calling a "
                 "twistshare cell function replaced by its value (the formula kept in the cell's comment)",
                 "-handout", rating=False)
    d = sub.add_parser("demo", help="write the sample books", description="write the sample books")
    d.add_argument("directory", nargs="?", type=Path, default=Path("twistshare-samples"))
    sub.add_parser("functions", help="list every cell function with its arguments, units and description")
    _calc_commands(sub)
    return p


def _calc_commands(sub) -> None:
    """``calc-setup`` and ``recalc``: the cell functions in LibreOffice Calc (`._calc`)."""
    from ..hosts.calc import DEFAULT_TIMEOUT

    text = ("install the TWS_... cell functions into a LibreOffice user profile (yours by default), "
            "or take them out again with --undo; says what it changed and how to undo it")
    s = sub.add_parser("calc-setup", help=text, description=text + ". Close LibreOffice first.")
    s.add_argument("--profile", type=Path, default=None, metavar="DIR",
                   help="another profile folder (what soffice -env:UserInstallation names); "
                   "default: your own LibreOffice profile")
    s.add_argument("--undo", action="store_true", help="remove exactly what calc-setup added")
    text = ("recompute every formula (twistshare's and LibreOffice's own) in a headless LibreOffice on a "
            "private profile and write a copy whose formula cells hold the new values; the book is never changed")
    r = sub.add_parser("recalc", help=text, description=text)
    r.add_argument("book", type=Path, help="the workbook (.xlsx or .xlsm); it is never modified")
    r.add_argument("-o", "--output", type=Path, default=None,
                   help="where to write the copy (default: BOOK-recalculated.xlsx beside the input)")
    r.add_argument("--timeout", type=float, default=DEFAULT_TIMEOUT, metavar="S",
                   help=f"seconds the whole run may take, LibreOffice's start included (default {DEFAULT_TIMEOUT:g}); "
                   "LibreOffice is stopped when they are up")
    r.add_argument("-q", "--quiet", action="store_true", help="print only the one-line result")
    r.add_argument("--lenient", action="store_true",
                   help="exit 0 when the copy was written even if some cells show an error or a ⚠ message")


def _unit_system(text: str) -> str:
    """'si', 'Si', 'us' ... as the choices are spelled."""
    return {"book": "book", "si": "SI", "us": "US"}.get(text.strip().lower(), text)


def _default_output(book: Path, suffix: str) -> Path:
    ext = book.suffix if book.suffix.lower() in (".xlsx", ".xlsm") else ".xlsx"
    return book.with_name(f"{book.stem}{suffix}{ext}")


def main(argv: list[str] | None = None) -> int:
    """Run the command line; returns the exit code (0, 1 or 2)."""
    args = _parser().parse_args(argv)
    try:
        return _run(args)
    except KeyboardInterrupt:
        print("twistshare: interrupted; nothing was written under the output name", file=sys.stderr)
        return EXIT_UNUSABLE
    except Exception as exc:  # a bug of ours: one clear line, never a traceback, nothing written
        if os.environ.get("TWISTSHARE_DEBUG"):
            raise
        print(f"twistshare: internal error ({type(exc).__name__}: {' '.join(str(exc).split())[:300]}); "
              "nothing was written. Please report it with the book if you can; "
              "TWISTSHARE_DEBUG=1 shows the details", file=sys.stderr)
        return EXIT_UNUSABLE


def _run(args: argparse.Namespace) -> int:
    from ._demo import run_demo
    from ._functions_list import run_functions
    from ._handout import run_handout
    from ._rate import run_check, run_rate

    if args.command == "functions":
        return run_functions()
    if args.command == "demo":
        return run_demo(args.directory)
    if args.command in ("calc-setup", "recalc"):
        from ._calc import run_calc_setup, run_recalc

        if args.command == "calc-setup":
            return run_calc_setup(args.profile, undo=args.undo)
        return run_recalc(args.book, args.output, timeout=args.timeout, lenient=args.lenient, quiet=args.quiet)
    suffix = {"rate": "-rated", "check": "-checked", "handout": "-handout"}[args.command]
    if args.command == "handout":
        return run_handout(args.book, args.output or _default_output(args.book, suffix), quiet=args.quiet)
    if args.in_place and args.output is not None:
        print("twistshare: --in-place writes into the book itself and -o names another file: give one "
              "of the two; nothing was written", file=sys.stderr)
        return EXIT_UNUSABLE
    out = args.book if args.in_place else (args.output or _default_output(args.book, suffix))
    if args.command == "rate":
        code = run_rate(args.book, out, in_place=args.in_place, units=args.units, quiet=args.quiet,
                        profile_part=args.profile_part, results_file=args.results,
                        exit_if_failing=args.exit_if_failing, lenient=args.lenient, worked=args.worked,
                        pdf=args.pdf, pdf_timeout=args.pdf_timeout)
    else:
        code = run_check(args.book, out, in_place=args.in_place, quiet=args.quiet)
    return EXIT_OK if (args.lenient and code == EXIT_PART_ERRORS) else code


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
