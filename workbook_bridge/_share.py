"""``twistshare share``: a copy for people without Python or the add-in.

Every formula calling one of our cell functions becomes its value (the book's cached value, or
computed by the engine where the cache is empty); the formula is kept in that cell's comment.
"""

from __future__ import annotations

import sys
import zipfile
from pathlib import Path

from ._formulas import NotEvaluable, evaluate_formula, find_our_formulas
from ._reading import BookUnusable
from ._result_tables import CAUTIONS
from .ooxml import BookWriter, Cell, OoxmlError

__all__ = ["share_book", "cell_functions"]

_SHEET = "Twistshare shared copy"


def cell_functions() -> dict[str, object]:
    """Our cell functions by upper-case name, as plain Python callables."""
    from twistshare.engine import cells

    out = {}
    for fn in cells.list_functions():
        name = fn["name"]
        out[name.upper()] = fn.get("function") or getattr(cells, name)
    return out


def _first(value: object) -> tuple[object, str | None]:
    """A spilled (list) result's first value, and the whole list as text for the comment."""
    if isinstance(value, (list, tuple)):
        flat = [v for row in value for v in (row if isinstance(row, (list, tuple)) else [row])]
        shown = ", ".join(f"{v:.6g}" if isinstance(v, float) else str(v) for v in flat)
        return (flat[0] if flat else None), shown
    return value, None


def share_book(book_path: Path, out: Path, *, in_place: bool = False, quiet: bool = False) -> int:
    from ._commands import EXIT_OK, EXIT_PART_ERRORS, _fail, prepare

    try:
        info, book = prepare(book_path)
    except (OoxmlError, BookUnusable) as exc:
        return _fail(str(exc))
    functions = cell_functions()
    names = frozenset(functions)
    grids: dict[str, object] = {}

    def grid_of(name: str):
        sheet = book.find_sheet(name)
        if sheet is None:
            return None
        if sheet not in grids:
            grids[sheet] = book.grid(sheet)
        return grids[sheet]

    log: list[list] = []
    problems = 0
    try:
        with BookWriter(book_path) as writer, zipfile.ZipFile(book_path) as zf:
            for sheet in info.sheets:
                if sheet.kind != "worksheet" or not sheet.part:
                    continue
                found = find_our_formulas(zf.read(sheet.part), names)
                if not found:
                    continue
                values: dict[str, object] = {}
                notes: dict[str, str] = {}
                for fc in found:
                    spilled = None
                    if fc.cached is not None and fc.cached != "":
                        value, source = fc.cached, "the book's cached value"
                    else:
                        try:
                            value, spilled = _first(evaluate_formula(fc.formula, sheet.name, grid_of, functions))
                            source = "computed by twistshare (the book had no cached value)"
                        except NotEvaluable as exc:
                            value, source = f"⚠ no value: {exc}", "not evaluated"
                            problems += 1
                    values[fc.ref] = value
                    note = f"twistshare: this cell held the formula ={fc.formula}\nvalue: {source}"
                    if spilled:
                        note += f"\nthe formula returns several values: {spilled}"
                    notes[fc.ref] = note
                    log.append([sheet.name, fc.ref, "=" + fc.formula, value, source])
                writer.replace_formulas(sheet.name, values)
                writer.add_comments(sheet.name, notes)
            rows = [[Cell("twistshare shared copy", "title")], [],
                    [Cell("Caution", "title")]] + [[Cell(c, "caution_line")] for c in CAUTIONS] + [[],
                    ["Formulas calling twistshare's cell functions were replaced by their values; each "
                     "cell's comment keeps its formula."], [],
                    [Cell(h, "header") for h in ("Sheet", "Cell", "Formula (as text)", "Value", "Value from")]]
            writer.add_sheet(_SHEET, rows + log, column_widths=[18, 8, 60, 16, 48], freeze_header=False)
            writer.write(out, in_place=in_place)
    except OoxmlError as exc:
        return _fail(str(exc))
    msg = f"twistshare: replaced {len(log)} formulas with values; wrote {out}"
    if problems:
        msg += f" ({problems} could not be evaluated: see their comments)"
    print(msg, file=sys.stdout)
    del quiet
    return EXIT_PART_ERRORS if problems else EXIT_OK
