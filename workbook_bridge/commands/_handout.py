"""``twistshare handout``: a values-only copy for people without Python or the add-in.

Every formula calling one of our cell functions becomes its value (the book's cached value, or
computed by the engine where the cache is empty); the formula is kept in that cell's comment.
"""

from __future__ import annotations

import sys
import zipfile
from pathlib import Path

from twistshare.engine.errors import BookUnusable
from twistshare.engine.intake import cell_ref, parse_ref

from ..ooxml import BookWriter, Cell, OoxmlError
from ..sheets import caution_rows
from ._formula_eval import NotEvaluable, evaluate_formula, find_our_formulas
from ._output import EXIT_OK, EXIT_PART_ERRORS, check_output_name, check_output_place, fail, prepare, say, write_book

__all__ = ["run_handout", "cell_functions", "HANDOUT_SHEET"]

HANDOUT_SHEET = "Twistshare handout"


def cell_functions() -> dict[str, object]:
    """Our cell functions by upper-case name, as plain Python callables."""
    from twistshare.engine import cells

    out = {}
    for fn in cells.list_functions():
        name = fn["name"]
        out[name.upper()] = fn.get("function") or getattr(cells, name)
    return out


class _Waiting(Exception):
    """The formula reads a cell whose own twistshare formula is not computed yet."""


class _OverlayGrid:
    """A sheet's values with the results computed so far laid over them."""

    def __init__(self, grid, overlay, pending) -> None:
        self._grid, self._overlay, self._pending = grid, overlay, pending
        self.name = grid.name

    def value(self, row: int, col: int) -> object:
        key = (self.name, row, col)
        if key in self._pending:
            raise _Waiting(key)
        if key in self._overlay:
            v = self._overlay[key]
            return None if v == "" else v
        return self._grid.value(row, col)


def _place(fc, result: object) -> tuple[dict[str, object], str | None]:
    """The cells a result goes into: an array formula's whole range, else the formula's cell."""
    if fc.spill_ref and isinstance(result, (list, tuple)):
        a, _, b = fc.spill_ref.partition(":")
        (r0, c0), (r1, c1) = parse_ref(a), parse_ref(b or a)
        grid = [list(row) if isinstance(row, (list, tuple)) else [row] for row in result]
        cells: dict[str, object] = {}
        for r in range(r0, r1 + 1):
            for c in range(c0, c1 + 1):
                i, j = r - r0, c - c0
                cells[cell_ref(r, c)] = grid[i][j] if i < len(grid) and j < len(grid[i]) else None
        return cells, None
    value, spilled = _first(result)
    return {fc.ref: value}, spilled


def _first(value: object) -> tuple[object, str | None]:
    """A spilled (list) result's first value, and the whole list as text for the comment."""
    if isinstance(value, (list, tuple)):
        flat = [v for row in value for v in (row if isinstance(row, (list, tuple)) else [row])]
        shown = ", ".join(f"{v:.6g}" if isinstance(v, float) else str(v) for v in flat)
        return (flat[0] if flat else None), shown
    return value, None


def run_handout(book_path: Path, out: Path, *, quiet: bool = False) -> int:
    """Write a copy of `book_path` whose twistshare formulas are replaced by their values."""
    try:
        info, book = prepare(book_path)
        check_output_name(info, out)
        check_output_place(out)
        if out.resolve() == book_path.resolve():
            raise BookUnusable("the handout is a copy for others and never replaces your book: give -o "
                               "with another name")
    except (OoxmlError, BookUnusable) as exc:
        return fail(str(exc))
    functions = cell_functions()
    names = frozenset(functions)
    overlay: dict[tuple[str, int, int], object] = {}
    pending: set[tuple[str, int, int]] = set()
    grids: dict[str, object] = {}

    def grid_of(name: str):
        sheet = book.find_sheet(name)
        if sheet is None:
            return None
        if sheet not in grids:
            grids[sheet] = _OverlayGrid(book.grid(sheet), overlay, pending)
        return grids[sheet]

    found_by_sheet: dict[str, list] = {}
    try:
        with zipfile.ZipFile(book_path) as zf:
            for sheet in info.sheets:
                if sheet.kind == "worksheet" and sheet.part:
                    found = find_our_formulas(zf.read(sheet.part), names)
                    if found:
                        found_by_sheet[sheet.name] = found
    except (OSError, zipfile.BadZipFile) as exc:
        return fail(f"{book_path.name}: {exc}")
    # Formulas without a cached value are computed; one that reads another such cell waits for it.
    todo = []
    for sheet_name, found in found_by_sheet.items():
        for fc in found:
            if fc.cached is None or fc.cached == "":
                r, c = parse_ref(fc.ref)
                pending.add((sheet_name, r, c))
                todo.append((sheet_name, fc))
    outcome: dict[tuple[str, str], tuple[dict[str, object], str, str | None]] = {}
    progress = True
    while todo and progress:
        progress = False
        waiting = []
        for sheet_name, fc in todo:
            try:
                result = evaluate_formula(fc.formula, sheet_name, grid_of, functions)
            except _Waiting:
                waiting.append((sheet_name, fc))
                continue
            except NotEvaluable as exc:
                result = f"⚠ no value: {exc}"
            cells, spilled = _place(fc, result)
            for ref, v in cells.items():
                rr, cc = parse_ref(ref)
                overlay[(sheet_name, rr, cc)] = v
            r, c = parse_ref(fc.ref)
            pending.discard((sheet_name, r, c))
            outcome[(sheet_name, fc.ref)] = (cells, "computed by twistshare (the book had no cached value)", spilled)
            progress = True
        todo = waiting
    for sheet_name, fc in todo:  # a cycle among our own formulas
        outcome[(sheet_name, fc.ref)] = ({fc.ref: "⚠ no value: the formula depends on itself"}, "not evaluated", None)

    log: list[list] = []
    problems = 0
    try:
        with BookWriter(book_path) as writer:
            for sheet_name, found in found_by_sheet.items():
                values: dict[str, object] = {}
                notes: dict[str, str] = {}
                for fc in found:
                    if (sheet_name, fc.ref) in outcome:
                        cells, source, spilled = outcome[(sheet_name, fc.ref)]
                    else:
                        cells, source, spilled = {fc.ref: fc.cached}, "the book's cached value", None
                    value = cells.get(fc.ref)
                    if isinstance(value, str) and value.startswith("⚠"):
                        problems += 1
                    values.update(cells)
                    note = f"twistshare: this cell held the formula ={fc.formula}\nvalue: {source}"
                    if fc.spill_ref:
                        note += f"\nthe formula fills {fc.spill_ref}; those cells now hold its values"
                    if spilled:
                        note += f"\nthe formula returns several values: {spilled}"
                    notes[fc.ref] = note
                    log.append([sheet_name, fc.ref, "=" + fc.formula, value, source])
                writer.replace_formulas(sheet_name, values, create_missing=True)
                writer.add_comments(sheet_name, notes)
            rows = [[Cell("twistshare handout", "title")], []] + caution_rows() + [

                    ["Formulas calling twistshare's cell functions were replaced by their values; each "
                     "cell's comment keeps its formula."], [],
                    [Cell(h, "header") for h in ("Sheet", "Cell", "Formula (as text)", "Value", "Value from")]]
            writer.add_sheet(HANDOUT_SHEET, rows + log, column_widths=[18, 8, 60, 16, 48], freeze_header=False)
            previous = write_book(writer, out, False)
    except (OoxmlError, BookUnusable) as exc:
        return fail(str(exc))
    if previous:
        say(f"twistshare: kept the file that was at {out} as {previous}")
    msg = f"twistshare: replaced {len(log)} formulas with values; wrote {out}"
    if problems:
        msg += f" ({problems} could not be evaluated: see their comments)"
    print(msg, file=sys.stdout)
    return EXIT_PART_ERRORS if problems else EXIT_OK
