"""``python -m twistshare.workbook_bridge.hosts.calc setup|undo|recalc ...``.

Exit codes as the ``twistshare`` command's: 0 done; 1 the copy is written but some cells show an
error or a ``⚠`` message; 2 nothing was done, with one line on stderr saying why.
"""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

from ._errors import CalcHostError
from ._recalc import DEFAULT_TIMEOUT, recalculate
from ._setup import setup_profile

__all__ = ["main"]

EXIT_OK, EXIT_CELL_PROBLEMS, EXIT_UNUSABLE = 0, 1, 2


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="python -m twistshare.workbook_bridge.hosts.calc",
                                description="twistshare's cell functions in LibreOffice Calc.")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")
    for name, text in (("setup", "install the TWS_... functions into a LibreOffice user profile"),
                       ("undo", "remove exactly what setup added to a LibreOffice user profile")):
        c = sub.add_parser(name, help=text, description=text)
        c.add_argument("--profile", type=Path, default=None, metavar="DIR",
                       help="the profile folder (-env:UserInstallation); default: your own LibreOffice profile")
    r = sub.add_parser("recalc", help="recompute every formula in headless LibreOffice; write a copy",
                       description="recompute every formula (ours included) in headless LibreOffice and write "
                       "a copy whose formula cells hold the new values; the book itself is never changed")
    r.add_argument("book", type=Path)
    r.add_argument("-o", "--output", type=Path, default=None,
                   help="the copy to write (default: BOOK-recalculated.xlsx beside the book)")
    r.add_argument("--timeout", type=float, default=DEFAULT_TIMEOUT,
                   help=f"seconds the whole run may take, LibreOffice's start included (default {DEFAULT_TIMEOUT:g})")
    r.add_argument("--lenient", action="store_true", help="exit 0 even if some cells show an error")
    return p


def _default_output(book: Path) -> Path:
    ext = book.suffix if book.suffix.lower() in (".xlsx", ".xlsm") else ".xlsx"
    return book.with_name(f"{book.stem}-recalculated{ext}")


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    try:
        if args.command in ("setup", "undo"):
            print(setup_profile(args.profile, undo=args.command == "undo"))
            return EXIT_OK
        report = recalculate(args.book, args.output or _default_output(args.book), timeout=args.timeout)
        print(report)
        return EXIT_CELL_PROBLEMS if report.problems and not args.lenient else EXIT_OK
    except CalcHostError as error:
        print(f"twistshare: {error}", file=sys.stderr)
        return EXIT_UNUSABLE
    except KeyboardInterrupt:
        print("twistshare: interrupted; nothing was written under the output name", file=sys.stderr)
        return EXIT_UNUSABLE
    except Exception as error:  # a bug of ours: one line, never a traceback
        if os.environ.get("TWISTSHARE_DEBUG"):
            raise
        print(f"twistshare: internal error ({type(error).__name__}: {' '.join(str(error).split())[:300]}); "
              "TWISTSHARE_DEBUG=1 shows the details", file=sys.stderr)
        return EXIT_UNUSABLE
