"""Where an output may be written: the folder, the name a spreadsheet program accepts, an earlier
file kept as a backup, and the write itself, with OS errors worded in one line."""

from __future__ import annotations

import errno
import os
import shutil
from pathlib import Path

from twistshare.engine.errors import BookUnusable

from ._naming import backup_path
from ._writer import BookWriter

__all__ = ["check_output_place", "check_output_name", "keep_previous", "write_book"]


def check_output_place(out: Path) -> None:
    """Fail early, in words, where the output cannot be written."""
    folder = out.parent if str(out.parent) else Path(".")
    if not folder.exists():
        raise BookUnusable(f"cannot write {out}: the folder {folder} does not exist")
    if not folder.is_dir():
        raise BookUnusable(f"cannot write {out}: {folder} is not a folder")
    if not os.access(folder, os.W_OK):
        raise BookUnusable(f"cannot write {out}: the folder {folder} is not writable")
    if out.is_dir():
        raise BookUnusable(f"cannot write {out}: it is a folder")


def keep_previous(out: Path, in_place: bool) -> str | None:
    """An existing file under the output name is kept as a timestamped backup, never lost."""
    if in_place or not out.exists():
        return None
    backup = backup_path(str(out))
    shutil.copy2(out, backup)
    return backup


def write_book(writer: BookWriter, out: Path, in_place: bool) -> str | None:
    """Write the output, keeping any file already there; OS errors become one clear line.

    Returns where the file that was there is kept (`in_place`: the book's own backup), or None.
    """
    try:
        previous = keep_previous(out, in_place)
        report = writer.write(out, in_place=in_place)
        if in_place:
            previous = str(report.backup) if report.backup else None
    except OSError as exc:
        reason = {errno.ENOSPC: "the disk is full", errno.EACCES: "permission denied",
                  errno.EROFS: "the folder is read-only", errno.ENOENT: "the folder does not exist"}.get(
                      exc.errno, exc.strerror or str(exc))
        raise BookUnusable(f"cannot write {out}: {reason}; nothing was written") from None
    return previous


def check_output_name(info: object, out: Path) -> None:
    """Refuse an output name whose extension would make a spreadsheet program refuse the file."""
    macro = bool(getattr(info, "macro_enabled", False))
    ext = out.suffix.lower()
    if macro and ext != ".xlsm":
        raise BookUnusable(f"{out.name}: the book holds macros, so the copy must keep them under an .xlsm "
                           f"name (Excel refuses a macro book named {ext or 'without an extension'}): "
                           f"use -o {out.with_suffix('.xlsm').name}")
    if not macro and ext not in (".xlsx", ".xlsm"):
        raise BookUnusable(f"{out.name}: the output must be named .xlsx")
    if not macro and ext == ".xlsm":
        raise BookUnusable(f"{out.name}: the book holds no macros: name the output .xlsx")
