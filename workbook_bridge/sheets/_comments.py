"""Comments on the input cells the problems concern, and library values in the blanks they filled."""

from __future__ import annotations

from collections import defaultdict

from twistshare.engine.intake import MATERIAL_FIELDS, BookRating, Problem, Severity, cell_ref
from twistshare.engine.units import UnitProblem, si_factor

from ..ooxml import BookWriter, Cell, OoxmlError

__all__ = ["comment_map", "first_errors", "write_comments", "fill_library_values"]


def comment_map(result: BookRating, findings: list[Problem]) -> dict[str, dict[str, str]]:
    """Problems grouped into one comment text per input cell."""
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



def first_errors(findings: list[Problem]) -> dict[str, str]:
    """The first error message of every part, by part id."""
    out: dict[str, str] = {}
    for f in findings:
        if f.severity is Severity.ERROR and f.part and f.part not in out:
            out[f.part] = f.message
    return out



def write_comments(writer: BookWriter, result: BookRating, findings: list[Problem]) -> None:
    """Every problem as a comment on the input cell it concerns."""
    for sheet, cells in comment_map(result, findings).items():
        writer.add_comments(sheet, cells)


def fill_library_values(writer: BookWriter, result: BookRating) -> None:
    """In the copy, write the library's values into the blank materials cells they filled.

    Each such cell gets the 'filled' look and (elsewhere) a comment naming the source; the
    value is written in the column's own unit. Cells whose column has no unit are left blank
    (the comment still says what was used).
    """
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
