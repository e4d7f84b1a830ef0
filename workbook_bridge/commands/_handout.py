"""``twistshare handout``: a values-only copy for people without Python or the add-in.

Every formula calling one of our cell functions becomes its value: the book's cached value, or
computed by the engine where the cache is empty (or holds an error, such as ``#NAME?`` from a
computer without the add-in). What the small evaluator cannot compute (``INDEX(TWS_SHARE(…);2)``,
``B5*2`` as an argument, ...) is computed by a headless LibreOffice when it is installed, in one
run; every cell still without a value is named, in its comment and in the handout sheet. The
formula is kept in each cell's comment.
"""

from __future__ import annotations

import sys
import zipfile
from pathlib import Path

from twistshare.engine.errors import BookUnusable
from twistshare.engine.intake import cell_ref, parse_ref

from ..ooxml import BookWriter, Cell, OoxmlError, PrintSetup
from ..sheets import caution_rows, fit_text_rows
from ._formula_eval import FormulaCell, NotEvaluable, evaluate_formula, find_our_formulas
from ._office_values import OfficeAnswer, ask_libreoffice
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


class _NeedsOffice(Exception):
    """The formula reads a cell only LibreOffice can compute."""


NO_VALUE = "⚠ no value"


class _OverlayGrid:
    """A sheet's values with the results computed so far laid over them."""

    def __init__(self, grid, overlay, pending, office) -> None:
        self._grid, self._overlay, self._pending, self._office = grid, overlay, pending, office
        self.name = grid.name

    def value(self, row: int, col: int) -> object:
        key = (self.name, row, col)
        if key in self._pending:
            raise _Waiting(key)
        if key in self._office:
            raise _NeedsOffice(key)
        if key in self._overlay:
            v = self._overlay[key]
            return None if v == "" else v
        return self._grid.value(row, col)


def _cells_of(fc: FormulaCell) -> list[tuple[int, int]]:
    """The cells a formula's value goes into: an array formula's whole range, else its own cell."""
    a, _, b = (fc.spill_ref or fc.ref).partition(":")
    (r0, c0), (r1, c1) = parse_ref(a), parse_ref(b or a)
    cells = [(r, c) for r in range(r0, r1 + 1) for c in range(c0, c1 + 1)]
    anchor = parse_ref(fc.ref)
    return cells if anchor in cells else [anchor]


def _has_value(fc: FormulaCell) -> bool:
    return fc.cached is not None and fc.cached != "" and not fc.cached_error


def _label_alone(result: object, cells: dict[str, object], fc: FormulaCell) -> str | None:
    """Why a one-cell formula's value is no value: it returns several and the cell shows its header label."""
    if fc.spill_ref or not isinstance(result, (list, tuple)):
        return None
    value = cells.get(fc.ref)
    if isinstance(value, str) and not value.startswith("⚠"):
        return (f"the formula returns several values and this one cell shows only the header label {value!r} "
                "(no room to spill): make it an array formula over as many cells, or pick one value with INDEX")
    return None


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
    """Write a copy of `book_path` whose twistshare formulas are replaced by their values.

    Exit code 0; 1 when some cells show a ``⚠`` message or could not be computed (each named in
    its comment and in the handout sheet); 2 nothing written.
    """
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
    office_cells: set[tuple[str, int, int]] = set()
    grids: dict[str, object] = {}

    def grid_of(name: str):
        sheet = book.find_sheet(name)
        if sheet is None:
            return None
        if sheet not in grids:
            grids[sheet] = _OverlayGrid(book.grid(sheet), overlay, pending, office_cells)
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
    # Formulas without a (usable) cached value are computed; one that reads another such cell
    # waits for it, and one that reads a cell only LibreOffice can compute goes to LibreOffice too.
    todo = []
    for sheet_name, found in found_by_sheet.items():
        for fc in found:
            if not _has_value(fc):
                pending.update((sheet_name, r, c) for r, c in _cells_of(fc))
                todo.append((sheet_name, fc))
    outcome: dict[tuple[str, str], tuple[dict[str, object], str, str | None]] = {}
    for_office: dict[tuple[str, str], tuple[FormulaCell, str]] = {}
    not_computed: dict[tuple[str, str], str] = {}
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
            except (NotEvaluable, _NeedsOffice) as exc:
                why = str(exc) if isinstance(exc, NotEvaluable) else "it reads a cell only LibreOffice can compute"
                for_office[(sheet_name, fc.ref)] = (fc, why)
                for r, c in _cells_of(fc):
                    pending.discard((sheet_name, r, c))
                    office_cells.add((sheet_name, r, c))
                progress = True
                continue
            cells, spilled = _place(fc, result)
            for ref, v in cells.items():
                rr, cc = parse_ref(ref)
                overlay[(sheet_name, rr, cc)] = v
            for r, c in _cells_of(fc):
                pending.discard((sheet_name, r, c))
            source = ("computed by twistshare (the book's cached value was an error)" if fc.cached_error
                      else "computed by twistshare (the book had no cached value)")
            label = _label_alone(result, cells, fc)
            if label:
                not_computed[(sheet_name, fc.ref)] = label
                cells, source = {fc.ref: f"{NO_VALUE}: several values, no room to spill (see the comment)"}, \
                    f"not computed: {label}"
            outcome[(sheet_name, fc.ref)] = (cells, source, spilled)
            progress = True
        todo = waiting
    for sheet_name, fc in todo:  # a cycle among our own formulas
        not_computed[(sheet_name, fc.ref)] = "the formula depends on itself"
        outcome[(sheet_name, fc.ref)] = ({fc.ref: f"{NO_VALUE}: the formula depends on itself"},
                                         "not computed: the formula depends on itself", None)
    answer = _through_libreoffice(book_path, for_office, outcome, not_computed)

    log: list[list] = []
    problems = 0
    try:
        with BookWriter(book_path, record=False) as writer:  # a values-only copy is not re-rated
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
                     "cell's comment keeps its formula."],
                    [_summary_line(not_computed, for_office, answer)], [],
                    [Cell(h, "header") for h in ("Sheet", "Cell", "Formula (as text)", "Value", "Value from")]]
            widths = (18.0, 8.0, 60.0, 16.0, 48.0)
            printed, merged, heights = fit_text_rows(rows + log, widths)
            writer.add_sheet(HANDOUT_SHEET, printed, column_widths=list(widths), freeze_header=False,
                             merged_cells=merged, row_heights=heights,
                             print_setup=PrintSetup(orientation="landscape", title_rows=(len(rows), len(rows))))
            previous = write_book(writer, out, False)
    except (OoxmlError, BookUnusable) as exc:
        return fail(str(exc))
    if previous:
        say(f"twistshare: kept the file that was at {out} as {previous}")
    if for_office and not answer.answered:
        say(_office_line(for_office, answer))
    msg = f"twistshare: replaced {len(log)} formulas with values; wrote {out}"
    if problems:
        msg += f" ({problems} show a ⚠ message"
        msg += f", {len(not_computed)} of them not computed: {_names(not_computed)}" if not_computed else ""
        msg += "; see their comments)"
    print(msg, file=sys.stdout)
    return EXIT_PART_ERRORS if problems else EXIT_OK


def _names(cells, limit: int = 8) -> str:
    keys = [f"{s}!{r}" for s, r in cells]
    return ", ".join(keys[:limit]) + (f" and {len(keys) - limit} more" if len(keys) > limit else "")


def _office_line(for_office, answer: OfficeAnswer) -> str:
    n = len(for_office)
    what = f"{n} formula{'s' if n != 1 else ''} beyond twistshare's own evaluator ({_names(for_office)})"
    if answer.missing:
        return (f"twistshare: LibreOffice is not installed here; installing it (with its Python scripting) "
                f"would compute the {what}")
    return f"twistshare: LibreOffice could not compute the {what}: {answer.failure}"


def _summary_line(not_computed, for_office, answer: OfficeAnswer) -> str:
    if not not_computed:
        if for_office:
            return (f"LibreOffice computed the {len(for_office)} formulas twistshare's own evaluator cannot "
                    f"({_names(for_office)}). Every formula has a value.")
        return "Every formula has a value."
    line = f"Not computed ({len(not_computed)}): {_names(not_computed, 40)}; each cell's comment says why."
    if for_office and not answer.answered:
        line += " " + _office_line(for_office, answer).removeprefix("twistshare: ")
    return line


def _through_libreoffice(book_path: Path, for_office, outcome, not_computed) -> OfficeAnswer:
    """Ask LibreOffice, in one run, for every formula the evaluator could not do; record each outcome."""
    wanted = [(sheet, cell_ref(r, c)) for (sheet, _ref), (fc, _why) in for_office.items() for r, c in _cells_of(fc)]
    answer = ask_libreoffice(book_path, wanted) if wanted else OfficeAnswer()
    for (sheet, ref), (fc, why) in for_office.items():
        if not answer.answered:
            reason = ("LibreOffice is not installed here" if answer.missing
                      else f"LibreOffice could not compute it: {answer.failure}")
            not_computed[(sheet, ref)] = f"twistshare's evaluator cannot ({why}); {reason}"
            outcome[(sheet, ref)] = ({ref: f"{NO_VALUE}: {why}"}, f"not computed: {not_computed[(sheet, ref)]}", None)
            continue
        cells: dict[str, object] = {}
        for r, c in _cells_of(fc):
            key = (sheet, cell_ref(r, c))
            got = answer.values.get(key)
            cells[key[1]] = got if got is not None else f"{NO_VALUE}: {answer.not_computed.get(key, 'no value')}"
        shown = cells.get(ref)
        if (sheet, ref) in answer.not_computed and not (isinstance(shown, str) and shown.startswith("⚠ ")
                                                        and not shown.startswith(NO_VALUE)):
            not_computed[(sheet, ref)] = f"LibreOffice could not compute it: {answer.not_computed[(sheet, ref)]}"
            source = f"not computed: {not_computed[(sheet, ref)]}"
        else:
            source = f"computed by LibreOffice (twistshare's own evaluator cannot: {why})"
        outcome[(sheet, ref)] = (cells, source, None)
    return answer
