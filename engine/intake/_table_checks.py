"""Checks of a table as a whole: hidden rows, merged cells, a column given twice, headers that
name no input (a near-miss stops the rating), and the rows where two copies of a column disagree."""

from __future__ import annotations

import difflib
from bisect import bisect_left, bisect_right
from dataclasses import replace

from twistshare.engine.units import split_header

from ._columns import read_text
from ._grid import SheetGrid, cell_ref, parse_ref
from ._materials import MaterialSet
from ._parts import PartsInput
from ._problems import Problem, Severity
from ._schema import LAYER_FIELDS, split_layer_group
from ._tables import TableSpot
from ._words import header_key, material_key, quoted

__all__ = ["hidden_and_merged", "anchor_merged", "unknown_headers", "refuse_conflicting_materials",
           "refuse_conflicting_parts"]


def _key_column(spot: TableSpot) -> int:
    for key in ("part", "name"):
        c = spot.column(key)
        if c is not None:
            return c.index
    return spot.columns[0].index


def hidden_and_merged(grid, spot: TableSpot, findings: list[Problem], what: str) -> None:
    if grid.hidden_rows:
        hid = [r for r in spot.data_rows if r in grid.hidden_rows]
        for r in hid:
            findings.append(Problem(Severity.WARNING, grid.name, cell_ref(r, _key_column(spot)),
                                    f"{what} row {r + 1} is hidden; it is rated like any other row"))
    if grid.merged:
        # Only the table's own cells are visited: a merged range may cover a whole sheet.
        cols = sorted({c.index for c in spot.columns})
        rows = sorted(set(spot.data_rows) | {spot.header_row})
        for (r0, c0), (r1, c1) in grid.merged:
            for r in rows[bisect_left(rows, r0):bisect_right(rows, r1)]:
                for c in cols[bisect_left(cols, c0):bisect_right(cols, c1)]:
                    if (r, c) == (r0, c0):
                        continue
                    findings.append(Problem(
                        Severity.WARNING, grid.name, cell_ref(r, c),
                        f"{what}: cell {cell_ref(r, c)} is inside the merged range "
                        f"{cell_ref(r0, c0)}:{cell_ref(r1, c1)}; a merged cell holds one value only, "
                        "so this cell reads as empty"))


def anchor_merged(findings: list[Problem], grids: list[SheetGrid]) -> None:
    """Move findings on cells a merge covers to the merged range's top-left cell.

    A covered cell cannot be selected and its comment is not shown (openpyxl drops it on
    reading), so the message goes where the user sees the merged cell.
    """
    by_sheet = {g.name: g.merged for g in grids if g is not None and g.merged}
    if not by_sheet:
        return
    for k, f in enumerate(findings):
        ranges = by_sheet.get(f.sheet)
        if not ranges or f.cell is None:
            continue
        r, c = parse_ref(f.cell)
        for (r0, c0), (r1, c1) in ranges:
            if r0 <= r <= r1 and c0 <= c <= c1 and (r, c) != (r0, c0):
                findings[k] = replace(f, cell=cell_ref(r0, c0))
                break


def _duplicate_columns(grid: SheetGrid, spot: TableSpot, findings: list[Problem], what: str,
                       who) -> set[int]:
    """Report columns that name an input twice; the rows where the two disagree (not to be rated).

    The first column is read; a later one is only compared with it, so that a number typed into
    the "wrong" copy never passes silently.
    """
    conflicts: set[int] = set()
    for dup in spot.duplicates:
        first = spot.column(dup.field.key, dup.layer)
        if first is None:
            continue
        findings.append(Problem(
            Severity.WARNING, grid.name, cell_ref(spot.header_row, dup.index),
            f"{what}: the column {dup.header.strip()!r} names the same input as {first.header.strip()!r} "
            f"({cell_ref(spot.header_row, first.index)}); that one is read and this one only checked "
            "against it: remove one of the two"))
        same_unit = (dup.unit or "").strip() == (first.unit or "").strip()
        for r in spot.data_rows:
            b = grid.value(r, dup.index)
            if b is None:
                continue
            a = grid.value(r, first.index)
            if same_unit and a == b:
                continue
            conflicts.add(r)
            findings.append(Problem(
                Severity.ERROR, grid.name, cell_ref(r, dup.index),
                f"{who(r)}: {dup.field.description} is given twice: {cell_ref(r, first.index)} holds "
                f"{_shown(a)} under {first.header.strip()!r} and {cell_ref(r, dup.index)} holds {_shown(b)} "
                f"under {dup.header.strip()!r}; not rated until one column is removed"))
    return conflicts


def _shown(v: object) -> str:
    if v is None:
        return "nothing"
    if isinstance(v, float) and v.is_integer():
        v = int(v)
    return quoted(v) if isinstance(v, str) else str(v)


def unknown_headers(grid, spot: TableSpot, fields, layer_groups: bool, what: str) -> list[Problem]:
    """A header that names no input is ignored; say so where it looks like one (a unit, a near-miss).

    Descriptive columns ('Description', 'Notes') pass silently; 'Twist limt [deg]' does not,
    because ignoring it would drop a criterion without a word.
    """
    labels = sorted({lab for f in fields for lab in f.labels if len(lab) > 2})
    layer_labels = sorted({lab for f in LAYER_FIELDS for lab in f.labels if len(lab) > 2})
    out = []
    for col, header in spot.unknown_headers:
        label, unit = split_header(header)
        key = header_key(label)
        suggestion = None
        m = split_layer_group(key) if layer_groups else None
        if m:
            near = difflib.get_close_matches(m[1], layer_labels, n=1, cutoff=0.75)
            suggestion = f"Layer {m[0]} {near[0]}" if near else None
        else:
            near = difflib.get_close_matches(key, labels, n=1, cutoff=0.75)
            suggestion = near[0][:1].upper() + near[0][1:] if near else None
        if suggestion is None and unit is None and not m:
            continue
        if suggestion:
            # A near-miss may hide a limit or a factor: rating without it could pass a failing part.
            out.append(Problem(Severity.ERROR, grid.name, cell_ref(spot.header_row, col),
                               f"{what} column {header.strip()!r} looks like '{suggestion}' but is not spelled "
                               "as twistshare reads it; no part is rated until it is renamed or removed"))
        else:
            out.append(Problem(Severity.WARNING, grid.name, cell_ref(spot.header_row, col),
                               f"{what} column {header.strip()!r} is not an input twistshare reads, so it is "
                               "ignored"))
    return out


def refuse_conflicting_materials(grid: SheetGrid, spot: TableSpot, materials: MaterialSet,
                                  findings: list[Problem]) -> None:
    if not spot.duplicates:
        return
    name_col = spot.column("name")
    names = dict(zip(spot.data_rows, read_text(grid, name_col.index, spot.data_rows)))

    def who(r: int) -> str:
        return f"material {names[r]!r}" if names.get(r) else f"materials row {r + 1}"

    for r in _duplicate_columns(grid, spot, findings, "materials", who):
        name = names.get(r)
        if not name:
            continue
        key = material_key(name)
        m = materials.by_name.get(key)
        if m is not None and m.problem is None:
            materials.by_name[key] = replace(
                m, problem=f"material {name!r} has a property given twice with different values "
                "(see the comments on its row)")


def refuse_conflicting_parts(pgrid: SheetGrid, pspot: TableSpot, lgrid, lspot, parts: PartsInput,
                              findings: list[Problem]) -> None:
    index = {r: i for i, r in enumerate(parts.rows)}

    def who(r: int) -> str:
        i = index.get(r)
        return f"part {parts.ids[i]}" if i is not None else f"row {r + 1}"

    for r in _duplicate_columns(pgrid, pspot, findings, "parts", who):
        if r in index:
            parts.input_error[index[r]] = True
    if lspot is not None and lspot.duplicates:
        pcol = lspot.column("part")
        keys = dict(zip(lspot.data_rows, read_text(lgrid, pcol.index, lspot.data_rows)))
        by_id = {pid: i for i, pid in enumerate(parts.ids)}

        def who_layer(r: int) -> str:
            return f"part {keys.get(r)}, {lspot.sheet} row {r + 1}"

        for r in _duplicate_columns(lgrid, lspot, findings, "layers", who_layer):
            i = by_id.get(keys.get(r))
            if i is not None:
                parts.input_error[i] = True


