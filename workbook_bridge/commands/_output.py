"""What every command that writes a book shares: opening it safely, checking the output name
and place, keeping what was there, writing atomically, and the exit codes."""

from __future__ import annotations

import sys
from pathlib import Path

from twistshare.engine.errors import BookUnusable

from ..ooxml import RESAVED_ADVICE, check_output_name, check_output_place, inspect_package, keep_previous, write_book
from ..reading import MAX_TABLE_ROWS, OpenBook, open_book
from ..sheets import RESULT_SHEET_PREFIX

__all__ = ["EXIT_OK", "EXIT_PART_ERRORS", "EXIT_UNUSABLE", "EXIT_PARTS_FAIL", "say", "fail", "prepare", "refuse_rated_book",
           "check_output_place", "keep_previous", "write_book", "check_output_name", "open_for_rating"]


EXIT_OK, EXIT_PART_ERRORS, EXIT_UNUSABLE = 0, 1, 2
EXIT_PARTS_FAIL = 3  # with --exit-if-failing: every input read, but some parts fail their demand


def say(msg: str) -> None:
    """A line for the user, on standard error (standard output carries the result)."""
    print(msg, file=sys.stderr)


def fail(msg: str) -> int:
    """Say why nothing was written; the exit code for an unusable input."""
    say(f"twistshare: {msg}")
    return EXIT_UNUSABLE


def prepare(path: Path) -> tuple[object, OpenBook]:
    """Check the package and open it with the fast reader; raises OoxmlError or BookUnusable."""
    if not path.exists():
        raise BookUnusable(f"{path}: no such file")
    if path.is_dir():
        raise BookUnusable(f"{path}: is a folder, not a workbook")
    info = inspect_package(path)
    for s in info.sheets:
        if s.name.strip().lower() in ("parts", "layers", "materials") and (s.declared_rows or 0) > MAX_TABLE_ROWS:
            raise BookUnusable(
                f"{path.name}: sheet {s.name!r} declares {s.declared_rows:,} rows; twistshare rates up to "
                f"{MAX_TABLE_ROWS:,} rows per table: clear the unused rows or split the catalogue")
    book = open_book(path, {s.name: s.part for s in info.sheets if s.part})
    return info, book


def refuse_rated_book(info: object, path: Path) -> None:
    """A book holding our sheets without the record of what is ours (a rated copy saved again by
    a spreadsheet program, which drops or outdates the record): rating it would double our
    comments and sheets, and taking them out would be guesswork. Refuse it."""
    ours = [s.name for s in info.sheets if s.name.startswith(RESULT_SHEET_PREFIX)]
    if ours:
        raise BookUnusable(
            f"{path.name} already holds twistshare's sheets ({', '.join(ours[:4])}) but not twistshare's record "
            "of which sheets, comments and marks are its own (a rated copy loses it when a spreadsheet program "
            f"saves it again), so it cannot be re-rated exactly: {RESAVED_ADVICE}")


def open_for_rating(book_path: Path, out: Path) -> OpenBook:
    """The checks both `rate` and `check` make before reading a table; raises with the reason."""
    info, book = prepare(book_path)
    refuse_rated_book(info, book_path)
    check_output_name(info, out)
    check_output_place(out)
    return book


