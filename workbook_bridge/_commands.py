"""What each ``twistshare`` command does, from the input path to the exit code."""

from __future__ import annotations

import errno
import math
import os
import shutil
import sys
from collections import defaultdict
from pathlib import Path

from ._book_rating import BookRating, rate_open_book
from ._findings import Finding, Severity
from ._flag_wording import Display
from ._grid import cell_ref
from ._progress import Progress
from ._reading import BookUnusable, open_book
from ._result_tables import CAUTIONS, Styled, materials_rows, results_rows, warnings_rows
from ._summary_sheet import summary_rows
from .ooxml import BarChart, BookWriter, Cell, OoxmlError, ScatterChart, SeriesData, backup_path, inspect_package

__all__ = ["run_rate", "run_check", "run_share", "run_demo", "run_functions", "prepare", "RESULT_SHEETS"]

RESULT_SHEETS = ("Twistshare results", "Twistshare summary", "Twistshare warnings", "Twistshare materials")
RESULT_SHEET_PREFIX = "Twistshare "
EXIT_OK, EXIT_PART_ERRORS, EXIT_UNUSABLE = 0, 1, 2
# The largest parts table rated in one run; a bigger sheet is almost always a formatting slip
# (a whole column formatted) or a data dump, and would need gigabytes to hold.
MAX_TABLE_ROWS = 1_000_000

def _say(msg: str) -> None:
    print(msg, file=sys.stderr)


def _fail(msg: str) -> int:
    _say(f"twistshare: {msg}")
    return EXIT_UNUSABLE


def prepare(path: Path) -> tuple[object, object]:
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


def refuse_rated_book(info, path: Path) -> None:
    """Rating a book we already rated would double our comments and sheets: refuse it."""
    ours = [s.name for s in info.sheets if s.name.startswith(RESULT_SHEET_PREFIX)]
    if ours:
        raise BookUnusable(
            f"{path.name} already holds twistshare's sheets ({', '.join(ours[:4])}) from an earlier run: "
            "rate the original book instead (after --in-place, its backup BOOK.xlsx.bak-...), or delete "
            "those sheets and our comments first")


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
    """Write the output, keeping any file already there; OS errors become one clear line."""
    try:
        previous = keep_previous(out, in_place)
        writer.write(out, in_place=in_place)
    except OSError as exc:
        reason = {errno.ENOSPC: "the disk is full", errno.EACCES: "permission denied",
                  errno.EROFS: "the folder is read-only", errno.ENOENT: "the folder does not exist"}.get(
                      exc.errno, exc.strerror or str(exc))
        raise BookUnusable(f"cannot write {out}: {reason}; nothing was written") from None
    return previous


def check_output_name(info, out: Path) -> None:
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


def comment_map(result: BookRating, findings: list[Finding]) -> dict[str, dict[str, str]]:
    """Findings grouped into one comment text per input cell."""
    part_cell: dict[str, tuple[str, str]] = {}
    parts, spot = result.parts, result.parts_spot
    if parts is not None and spot is not None:
        pc = spot.column("part")
        for pid, r in zip(parts.ids, parts.rows):
            part_cell.setdefault(pid, (parts.sheet, cell_ref(r, pc.index)))
    by: dict[str, dict[str, list[str]]] = defaultdict(lambda: defaultdict(list))
    for f in findings:
        sheet, cell = f.sheet, f.cell
        if cell is None and f.part in part_cell:
            sheet, cell = part_cell[f.part]
        if sheet is None or cell is None:
            continue
        by[sheet][cell].append(f"twistshare {f.severity.value}: {f.message}")
    return {s: {c: "\n".join(dict.fromkeys(msgs)) for c, msgs in cells.items()} for s, cells in by.items()}


def _first_errors(findings: list[Finding]) -> dict[str, str]:
    out: dict[str, str] = {}
    for f in findings:
        if f.severity is Severity.ERROR and f.part and f.part not in out:
            out[f.part] = f.message
    return out


def _caution_rows() -> list[list]:
    return [[Cell("Caution", "title")]] + [[Cell(c, "caution_line")] for c in CAUTIONS] + [[]]


_MESSAGE_WIDTH = 110  # characters


def _add_warnings_sheet(writer: BookWriter, findings: list[Finding]) -> None:
    """The findings as rows; messages wrap in their column, each row as tall as its message."""
    rows = _caution_rows() + warnings_rows(findings)
    heights = {}
    for n, row in enumerate(rows, start=1):
        msg = row[5] if len(row) > 5 and isinstance(row[5], str) else None
        if msg and len(msg) > _MESSAGE_WIDTH:
            heights[n] = 15.0 * math.ceil(len(msg) / (_MESSAGE_WIDTH * 0.95))
    writer.add_sheet("Twistshare warnings", rows, column_widths=[12, 7, 13, 6, 8, _MESSAGE_WIDTH],
                     freeze_header=False, print_fit_width=True, column_styles=[None] * 5 + ["wrap"],
                     row_heights=heights)


def _write_comments(writer: BookWriter, result: BookRating, findings: list[Finding]) -> None:
    for sheet, cells in comment_map(result, findings).items():
        writer.add_comments(sheet, cells)


def _report(result: BookRating, out: Path | None, quiet: bool, verb: str) -> None:
    errors = [f for f in result.findings if f.severity is Severity.ERROR]
    warns = [f for f in result.findings if f.severity is Severity.WARNING]
    if not quiet:
        for f in result.findings:
            if f.severity is not Severity.NOTE:
                _say("  " + f.line())
    n = result.parts.count if result.parts else 0
    rated = int(result.rated.sum()) if result.rated is not None else 0
    failing = 0
    if result.rating is not None and result.rated is not None:
        failing = int((result.rating.margin[result.rated] < 0).sum())
    where = f"; wrote {out}" if out else ""
    if verb == "rate":
        print(f"twistshare: rated {rated} of {n} parts, {failing} failing, {len(errors)} errors, "
              f"{len(warns)} warnings{where}")
    else:
        print(f"twistshare: checked {n} parts: {len(errors)} errors, {len(warns)} warnings{where}")


def _exit_code(result: BookRating) -> int:
    return EXIT_PART_ERRORS if any(f.severity is Severity.ERROR for f in result.findings) else EXIT_OK


def _open_for_rating(book_path: Path, out: Path):
    """The checks both `rate` and `check` make before reading a table; raises with the reason."""
    info, book = prepare(book_path)
    refuse_rated_book(info, book_path)
    check_output_name(info, out)
    check_output_place(out)
    return book


def run_rate(book_path: Path, out: Path, *, in_place: bool = False, units: str = "book", quiet: bool = False,
             profile_part: str | None = None) -> int:
    progress = Progress(["check package", "read tables", "rate", "write"], enabled=None if not quiet else False)
    try:
        progress.step("check package")
        book = _open_for_rating(book_path, out)
        progress.step("read tables")
        result = rate_open_book(book)
    except (OoxmlError, BookUnusable) as exc:
        progress.finish()
        return _fail(str(exc))
    progress.step("write")
    display = Display(result.system if units == "book" else units)
    try:
        with BookWriter(book_path) as writer:
            _add_rating_sheets(writer, result, display, profile_part)
            _write_comments(writer, result, result.findings)
            previous = write_book(writer, out, in_place)
    except (OoxmlError, BookUnusable) as exc:
        progress.finish()
        return _fail(str(exc))
    if previous:
        _say(f"twistshare: kept the file that was at {out} as {previous}")
    progress.finish()
    _report(result, out, quiet, "rate")
    return _exit_code(result)


def _add_rating_sheets(writer: BookWriter, result: BookRating, display: Display, profile_part: str | None) -> None:
    parts = result.parts
    if parts is not None and parts.count:
        rows, widths, col_styles = results_rows(result, display, _first_errors(result.findings))
        res = writer.add_sheet("Twistshare results", rows, column_widths=widths, column_styles=col_styles,
                               tab_color="FF1F3A4D", header_height=32)
        writer.set_print_titles(res, columns=2, rows=1)  # part id and status on every printed page
    srows, layout = summary_rows(result, display, profile_part)
    summ = writer.add_sheet("Twistshare summary", srows, column_widths=[30, 40, 18, 16, 34],
                            freeze_header=False, tab_color="FF1F3A4D", print_fit_one_page=True)
    _add_warnings_sheet(writer, result.findings)
    if result.materials is not None and result.materials.by_name:
        writer.add_sheet("Twistshare materials", materials_rows(result.materials, display),
                         column_widths=[30, 9, 10, 14, 38, 14, 14, 10, 8, 60], header_height=32)
    _add_charts(writer, summ, srows, layout, display)
    _fill_library_values(writer, result)


def _fill_library_values(writer: BookWriter, result: BookRating) -> None:
    """In the copy, write the library's values into the blank materials cells they filled.

    Each such cell gets the 'filled' look and (elsewhere) a comment naming the source; the
    value is written in the column's own unit. Cells whose column has no unit are left blank
    (the comment still says what was used).
    """
    from twistshare.engine.units import UnitProblem, si_factor

    from ._schema import MATERIAL_FIELDS

    mats = result.materials
    if mats is None or not mats.filled or mats.spot is None:
        return
    kinds = {f.key: f.kind for f in MATERIAL_FIELDS}
    for f in mats.filled:
        col = mats.spot.column(f.field)
        if col is None:
            continue
        try:
            factor = si_factor(col.unit, kinds[f.field]) if col.unit else (1.0 if kinds[f.field] == "dimensionless" else None)
        except UnitProblem:
            factor = None
        if factor is None:
            continue
        try:
            writer.fill_cells(f.sheet, {f.cell: Cell(float(f"{f.value_si / factor:.6g}"), "filled")})
        except OoxmlError:
            continue  # the cell is not empty in the file (e.g. spaces): the comment alone says it


def _col_values(rows: list[list], first: int, last: int, col: int) -> list:
    out = []
    for r in range(first, last + 1):
        v = rows[r][col] if col < len(rows[r]) else None
        out.append(v.value if isinstance(v, Cell) else v)
    return out


def _add_charts(writer: BookWriter, summ, srows: list[list], layout, display: Display) -> None:
    tu, _ = display.unit("torque")
    su, _ = display.unit("stress")
    lu, _ = display.unit("length")
    if layout.margins is not None:
        a, b = layout.margins
        names = [str(x) for x in _col_values(srows, a, b, 0)]
        cap = [float("nan") if v is None else v for v in _col_values(srows, a, b, 2)]
        dem = [float("nan") if v is None else v for v in _col_values(srows, a, b, 3)]
        chart = BarChart(
            title="Governing limit against demand: the ten lowest margins",
            x_title="Part", y_title=f"Torque [{tu}]", horizontal=True,
            series=(SeriesData("Governing limit", summ.range_ref(1, a + 1, b + 1), summ.range_ref(3, a + 1, b + 1),
                               names, cap),
                    SeriesData("Demand", summ.range_ref(1, a + 1, b + 1), summ.range_ref(4, a + 1, b + 1), names, dem)),
        )
        writer.add_chart(summ, (6, 1), (15, 22), chart)
    if layout.profile is not None:
        a, b = layout.profile
        xs = [float("nan") if v is None else v for v in _col_values(srows, a, b, 0)]
        ys = [float("nan") if v is None else v for v in _col_values(srows, a, b, 1)]
        lims = [float("nan") if v is None else v for v in _col_values(srows, a, b, 2)]
        chart = ScatterChart(
            title=f"Shear stress across the radius, part {layout.profile_part}",
            x_title=f"Radius [{lu}]", y_title=f"Shear stress [{su}]",
            series=(SeriesData("Nominal shear stress", summ.range_ref(1, a + 1, b + 1),
                               summ.range_ref(2, a + 1, b + 1), xs, ys),
                    SeriesData("Allowable ÷ Kt", summ.range_ref(1, a + 1, b + 1),
                               summ.range_ref(3, a + 1, b + 1), xs, lims)),
        )
        writer.add_chart(summ, (6, 23), (15, 44), chart)


def run_check(book_path: Path, out: Path, *, in_place: bool = False, quiet: bool = False) -> int:
    try:
        result = rate_open_book(_open_for_rating(book_path, out))
    except (OoxmlError, BookUnusable) as exc:
        return _fail(str(exc))
    try:
        with BookWriter(book_path) as writer:
            _add_warnings_sheet(writer, result.findings)
            _write_comments(writer, result, result.findings)
            previous = write_book(writer, out, in_place)
    except (OoxmlError, BookUnusable) as exc:
        return _fail(str(exc))
    if previous:
        _say(f"twistshare: kept the file that was at {out} as {previous}")
    _report(result, out, quiet, "check")
    return _exit_code(result)


def run_share(book_path: Path, out: Path, *, in_place: bool = False, quiet: bool = False) -> int:
    from ._share import share_book

    return share_book(book_path, out, in_place=in_place, quiet=quiet)


def run_demo(directory: Path) -> int:
    import filecmp
    import tempfile

    from ._sample_books import write_all

    try:
        directory.mkdir(parents=True, exist_ok=True)
        check_output_place(directory / "x.xlsx")
        with tempfile.TemporaryDirectory(dir=directory, prefix=".twistshare-demo-") as tmp:
            for made in write_all(Path(tmp)):
                dest = directory / made.name
                if dest.exists() and not filecmp.cmp(made, dest, shallow=False):
                    _say(f"twistshare: kept the file that was at {dest} as {keep_previous(dest, False)}")
                os.replace(made, dest)
                print(dest)
    except (OSError, BookUnusable) as exc:
        return _fail(str(exc))
    return EXIT_OK


def run_functions() -> int:
    from twistshare.engine.cells import list_functions

    for fn in list_functions():
        print(f"{fn['name']}({', '.join(a['name'] for a in fn['arguments'])})")
        print(f"    {fn['description']}")
        for a in fn["arguments"]:
            unit = f" [{a['unit']}]" if a.get("unit") else ""
            print(f"      {a['name']}{unit}: {a['description']}")
    return EXIT_OK
