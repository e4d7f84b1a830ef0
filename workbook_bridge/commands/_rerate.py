"""Rating a rated copy again: our earlier work taken out first, then the book rated as any other.

A rated copy carries twistshare's ownership record (``ooxml._record``). The copy with our sheets,
comments and marks taken out is written to a private temporary folder under the book's own
name and rated from there; the user's book is only read.
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path

from twistshare.engine.errors import BookUnusable

from ..ooxml import StripReport, read_record, strip_ours

__all__ = ["RatingSource", "rating_source"]


@dataclass(frozen=True)
class RatingSource:
    """The file to read and to add our parts to, and what was taken out to get it.

    Attributes
    ----------
    path : Path
        The book itself, or the stripped copy of a rated book.
    original : Path
        The book named on the command line.
    stripped : StripReport or None
        None for a book that held nothing of ours.
    """

    path: Path
    original: Path
    stripped: StripReport | None
    stat: tuple[int, int] | None = None

    def check_unchanged(self) -> None:
        """Refuse to write when the user's book changed while it was being re-rated."""
        if self.stat is not None:
            now = os.stat(self.original)
            if (now.st_size, now.st_mtime_ns) != self.stat:
                raise BookUnusable(f"{self.original} changed while it was being re-rated; nothing was written: run again")

    def lines(self, verb: str) -> list[str]:
        """What re-rating took out and kept, in words ([] for a book that held nothing of ours)."""
        s = self.stripped
        if s is None:
            return []
        sheets = f"{len(s.sheets)} sheet{'s' if len(s.sheets) != 1 else ''} of ours"
        comments = f"{s.comments} comment{'s' if s.comments != 1 else ''}"
        if s.resaved:
            out = [f"twistshare: re-{verb} a copy that a spreadsheet program saved again: its parts no longer "
                   f"match twistshare's record byte for byte, so twistshare's work was found by the names, cells "
                   f"and texts the record gives: replaced {sheets}, {comments}"
                   + (f", emptied {s.marks} cell{'s' if s.marks != 1 else ''} it had filled from its library "
                      "(they keep the look it gave them)" if s.marks else "")
                   + "; every other member of the saved copy kept byte for byte"]
        else:
            marks = f", {s.marks} marked value{'s' if s.marks != 1 else ''}" if s.marks else ""
            out = [f"twistshare: re-{verb}: replaced {sheets}, {comments}{marks}; every other member kept byte for byte"]
        if s.edited:
            out.append(f"  your edits since the last run are kept (sheets {', '.join(s.edited)})")
        if s.kept_cells:
            shown = ", ".join(s.kept_cells[:6]) + (" ..." if len(s.kept_cells) > 6 else "")
            out.append(f"  cells twistshare had filled from its library that you changed since keep your "
                       f"content: {shown}")
        return out


@contextmanager
def rating_source(book: Path) -> Iterator[RatingSource]:
    """The source to rate ``book`` from; a rated copy is stripped of our work into a temporary file.

    Raises
    ------
    OoxmlError
        A rated copy that no longer matches its record (saved again by a spreadsheet program).
    """
    if not book.is_file() or read_record(book) is None:
        yield RatingSource(book, book, None)
        return
    before = os.stat(book)
    with tempfile.TemporaryDirectory(prefix="twistshare-rerate-") as folder:
        stripped = Path(folder) / book.name
        report = strip_ours(book, stripped)
        yield RatingSource(stripped, book, report, (before.st_size, before.st_mtime_ns))
