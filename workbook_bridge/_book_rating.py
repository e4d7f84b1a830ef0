"""Rate every part of a book: locate the tables, read and validate the cells, call the engine.

This module does no physics: it turns cells into the engine's arrays and the engine's per-part
diagnoses into findings on the cells they concern.
"""

from __future__ import annotations

from bisect import bisect_left, bisect_right
from dataclasses import dataclass, field, replace
from pathlib import Path

import numpy as np

from twistshare.engine.core import Duty, LayerStack, Rating, rate

from ._column_values import quoted, read_text
from ._findings import Finding, Severity
from ._flag_wording import findings_from_rating
from ._materials_table import MaterialSet, normalise_name, read_materials
from ._parts_table import PartsInput, read_parts
from ._grid import SheetGrid, cell_ref, parse_ref
from ._reading import BookUnusable, OpenBook
from ._schema import LAYER_ROW_FIELDS, MATERIAL_FIELDS, PART_FIELDS
from ._tables import TableSpot, locate_table

__all__ = ["BookRating", "rate_open_book", "BookUnusable"]


@dataclass
class BookRating:
    """Everything one run learned about a book."""

    path: Path
    findings: list[Finding] = field(default_factory=list)
    materials: MaterialSet | None = None
    parts: PartsInput | None = None
    rating: Rating | None = None
    rated: np.ndarray | None = None  # (P,) bool: the part has results
    system: str = "SI"
    parts_spot: TableSpot | None = None
    layers_spot: TableSpot | None = None
    materials_spot: TableSpot | None = None


def _spot(book: OpenBook, name: str, fields, key: str, layer_groups: bool = False, notes=None):
    """Find a table first as a workbook table of that name, then as a sheet of that name."""
    region = book.tables.get(name.lower())
    if region is not None:
        grid = book.grid(region.sheet)
        spot = locate_table(grid, fields, key, layer_groups=layer_groups, header_row=region.header_row,
                            last_row=region.last_row, first_col=region.first_col, last_col=region.last_col)
        if spot is not None:
            other = book.find_sheet(name)
            if notes is not None and other is not None and other != region.sheet:
                notes.append(Finding(Severity.WARNING, other, None,
                                     f"the book has both a workbook table named {region.name!r} (on sheet "
                                     f"{region.sheet!r}) and a sheet named {other!r}: the table is used, the "
                                     "sheet is not read"))
            return grid, spot
    sheet = book.find_sheet(name)
    if sheet is None:
        return None, None
    grid = book.grid(sheet)
    return grid, locate_table(grid, fields, key, layer_groups=layer_groups)


def _key_column(spot: TableSpot) -> int:
    for key in ("part", "name"):
        c = spot.column(key)
        if c is not None:
            return c.index
    return spot.columns[0].index


def _hidden_and_merged(grid, spot: TableSpot, findings: list[Finding], what: str) -> None:
    if grid.hidden_rows:
        hid = [r for r in spot.data_rows if r in grid.hidden_rows]
        for r in hid:
            findings.append(Finding(Severity.WARNING, grid.name, cell_ref(r, _key_column(spot)),
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
                    findings.append(Finding(
                        Severity.WARNING, grid.name, cell_ref(r, c),
                        f"{what}: cell {cell_ref(r, c)} is inside the merged range "
                        f"{cell_ref(r0, c0)}:{cell_ref(r1, c1)}; a merged cell holds one value only, "
                        "so this cell reads as empty"))


def _anchor_merged(findings: list[Finding], grids: list[SheetGrid]) -> None:
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


def _duplicate_columns(grid: SheetGrid, spot: TableSpot, findings: list[Finding], what: str,
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
        findings.append(Finding(
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
            findings.append(Finding(
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


def _unknown_headers(grid, spot: TableSpot, fields, layer_groups: bool, what: str) -> list[Finding]:
    """A header that names no input is ignored; say so where it looks like one (a unit, a near-miss).

    Descriptive columns ('Description', 'Notes') pass silently; 'Twist limt [deg]' does not,
    because ignoring it would drop a criterion without a word.
    """
    import difflib

    from twistshare.engine.units import split_header

    from ._schema import LAYER_FIELDS, split_layer_group

    labels = sorted({lab for f in fields for lab in f.labels if len(lab) > 2})
    layer_labels = sorted({lab for f in LAYER_FIELDS for lab in f.labels if len(lab) > 2})
    out = []
    for col, header in spot.unknown_headers:
        label, unit = split_header(header)
        key = " ".join(label.strip().lower().split())
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
            out.append(Finding(Severity.ERROR, grid.name, cell_ref(spot.header_row, col),
                               f"{what} column {header.strip()!r} looks like '{suggestion}' but is not spelled "
                               "as twistshare reads it; no part is rated until it is renamed or removed"))
        else:
            out.append(Finding(Severity.WARNING, grid.name, cell_ref(spot.header_row, col),
                               f"{what} column {header.strip()!r} is not an input twistshare reads, so it is "
                               "ignored"))
    return out


def _filled_notes(materials: MaterialSet) -> list[Finding]:
    from twistshare.engine.units import si_factor

    kinds = {"shear_modulus": ("G", "stress", "GPa"), "youngs_modulus": ("E", "stress", "GPa"),
             "poisson_ratio": ("Poisson ratio", "dimensionless", ""),
             "yield_strength": ("yield strength", "stress", "MPa"),
             "ultimate_strength": ("ultimate strength", "stress", "MPa"),
             "density": ("density", "density", "kg/m³")}
    out = []
    for f in materials.filled:
        label, kind, unit = kinds.get(f.field, (f.field, "dimensionless", ""))
        shown = f"{f.value_si / si_factor(unit, kind):.4g} {unit}".strip() if unit else f"{f.value_si:.4g}"
        out.append(Finding(Severity.NOTE, f.sheet, f.cell,
                           f"blank in the book: the built-in library's value is used ({f.material}): {label} = {shown}; "
                           f"source: {f.source}"))
    return out


def _tables(book: OpenBook, result: BookRating):
    notes = result.findings
    mgrid, mspot = _spot(book, "Materials", MATERIAL_FIELDS, "name", notes=notes)
    pgrid, pspot = _spot(book, "Parts", PART_FIELDS, "part", layer_groups=True, notes=notes)
    if pspot is None:
        where = "a sheet named 'Parts'" if pgrid is None else "its header row"
        raise BookUnusable(
            f"{book.path.name}: no parts table found: expected a sheet or workbook table named 'Parts' "
            f"with a header row naming 'Part' and the inputs (looked for {where})")
    lgrid, lspot = _spot(book, "Layers", LAYER_ROW_FIELDS, "part", notes=notes)
    if lspot is not None and lspot.column("layer") is None:
        raise BookUnusable(f"{book.path.name}: the 'Layers' table has no 'Layer' column (1 = innermost)")
    if lspot is not None and pspot.layer_numbers:
        result.findings.append(Finding(Severity.WARNING, lgrid.name, None,
                                       "the book has both layer columns in 'Parts' and a 'Layers' table; "
                                       "the 'Layers' table is used"))
    return mgrid, mspot, pgrid, pspot, lgrid, lspot


def _refuse_conflicting_materials(grid: SheetGrid, spot: TableSpot, materials: MaterialSet,
                                  findings: list[Finding]) -> None:
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
        key = normalise_name(name)
        m = materials.by_name.get(key)
        if m is not None and m.problem is None:
            materials.by_name[key] = replace(
                m, problem=f"material {name!r} has a property given twice with different values "
                "(see the comments on its row)")


def _refuse_conflicting_parts(pgrid: SheetGrid, pspot: TableSpot, lgrid, lspot, parts: PartsInput,
                              findings: list[Finding]) -> None:
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


def rate_open_book(book: OpenBook) -> BookRating:
    """Rate every part of an opened book; bad parts get findings, the others are rated."""
    result = BookRating(book.path)
    findings = result.findings
    mgrid, mspot, pgrid, pspot, lgrid, lspot = _tables(book, result)
    header_findings = _unknown_headers(pgrid, pspot, PART_FIELDS, True, "parts")
    if mspot is not None:
        header_findings += _unknown_headers(mgrid, mspot, MATERIAL_FIELDS, False, "materials")
    if lspot is not None:
        header_findings += _unknown_headers(lgrid, lspot, LAYER_ROW_FIELDS, False, "layers")
    findings.extend(header_findings)
    header_blocks = any(f.severity is Severity.ERROR for f in header_findings)
    if mspot is not None:
        _hidden_and_merged(mgrid, mspot, findings, "materials")
        materials = read_materials(mgrid, mspot, findings)
        _refuse_conflicting_materials(mgrid, mspot, materials, findings)
        findings.extend(_filled_notes(materials))
    else:
        materials = MaterialSet()
    _hidden_and_merged(pgrid, pspot, findings, "parts")
    if lspot is not None:
        _hidden_and_merged(lgrid, lspot, findings, "layers")
    parts = read_parts(pgrid, pspot, materials, findings, lgrid, lspot)
    if header_blocks:
        parts.input_error[:] = True
    _refuse_conflicting_parts(pgrid, pspot, lgrid, lspot, parts, findings)
    result.materials, result.parts = materials, parts
    result.parts_spot, result.layers_spot, result.materials_spot = pspot, lspot, mspot
    result.system = parts.system
    if parts.count == 0:
        findings.append(Finding(Severity.ERROR, pgrid.name, None, "the parts table has no parts"))
        _anchor_merged(findings, [mgrid, pgrid, lgrid])
        return result
    ok = ~parts.input_error
    # Parts whose inputs are unusable still go to the engine with NaNs so shapes stay whole;
    # their results are discarded below and their findings come from the cells.
    stack = LayerStack(
        outer_diameter=parts.outer_diameter,
        inner_diameter=parts.inner_diameter,
        shear_modulus=parts.shear_modulus,
        allowable_shear=parts.allowable_shear,
        stress_concentration=parts.kt,
        present=parts.present,
        allowable_rule=parts.allowable_rule,
    )
    duty = Duty(
        torque=parts.torque,
        length=parts.length,
        twist_limit_angle=parts.twist_limit_angle,
        twist_limit_per_length=parts.twist_limit_per_length,
    )
    rating = rate(stack, duty)
    result.rating = rating
    findings.extend(findings_from_rating(rating, parts, ok))
    result.rated = ok & np.asarray(rating.valid, dtype=bool)
    _anchor_merged(findings, [mgrid, pgrid, lgrid])
    return result
