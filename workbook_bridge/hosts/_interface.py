"""The interface a live host offers, and the one validation routine that uses it."""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path
from typing import Protocol

from twistshare.engine.intake import BookRating, Problem, SheetGrid, rate_tables

from ..sheets import comment_map

__all__ = ["BookSource", "CommentSink", "validate_and_comment"]


class BookSource(Protocol):
    """What the validation reads: sheet names, workbook tables and a sheet's values from A1."""

    path: Path
    sheet_names: list[str]
    tables: Mapping[str, object]  # lower-case table name -> region with sheet/header_row/... bounds

    def grid(self, name: str) -> SheetGrid: ...

    def find_sheet(self, wanted: str) -> str | None: ...


class CommentSink(Protocol):
    """Where the warnings go: one comment text per cell."""

    def add_comments(self, sheet: str, comments: Mapping[str, str]) -> None: ...


def validate_and_comment(source: BookSource, sink: CommentSink) -> tuple[BookRating, list[Problem]]:
    """Validate (and rate) the book's tables and write every problem as a comment on its cell."""
    result = rate_tables(source)  # type: ignore[arg-type]
    for sheet, cells in comment_map(result, result.problems).items():
        sink.add_comments(sheet, cells)
    return result, result.problems
