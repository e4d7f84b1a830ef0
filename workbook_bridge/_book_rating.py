"""Rate every part of a book: locate the tables, read and validate the cells, call the engine.

This module does no physics: it turns cells into the engine's arrays and the engine's per-part
diagnoses into findings on the cells they concern.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from twistshare.engine.core import Duty, LayerStack, Rating, rate

from ._findings import Finding, Severity
from ._flag_wording import findings_from_rating
from ._materials_table import MaterialSet, read_materials
from ._parts_table import PartsInput, read_parts
from ._reading import BookUnusable, OpenBook
from ._schema import LAYER_ROW_FIELDS, MATERIAL_FIELDS, PART_FIELDS
from ._tables import TableSpot, locate_table

__all__ = ["BookRating", "rate_open_book", "validate_open_book", "BookUnusable"]


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

    @property
    def errors(self) -> list[Finding]:
        return [f for f in self.findings if f.severity is Severity.ERROR]


def _spot(book: OpenBook, name: str, fields, key: str, layer_groups: bool = False):
    """Find a table first as a workbook table of that name, then as a sheet of that name."""
    region = book.tables.get(name.lower())
    if region is not None:
        grid = book.grid(region.sheet)
        spot = locate_table(grid, fields, key, layer_groups=layer_groups, header_row=region.header_row,
                            last_row=region.last_row, first_col=region.first_col, last_col=region.last_col)
        if spot is not None:
            return grid, spot
    sheet = book.find_sheet(name)
    if sheet is None:
        return None, None
    grid = book.grid(sheet)
    return grid, locate_table(grid, fields, key, layer_groups=layer_groups)


def _hidden_and_merged(grid, spot: TableSpot, findings: list[Finding], what: str) -> None:
    from ._grid import cell_ref

    if grid.hidden_rows:
        hid = [r for r in spot.data_rows if r in grid.hidden_rows]
        for r in hid:
            findings.append(Finding(Severity.WARNING, grid.name, cell_ref(r, spot.columns[0].index),
                                    f"{what} row {r + 1} is hidden; it is rated like any other row"))
    if grid.merged:
        cover = grid.merged_cover()
        cols = {c.index for c in spot.columns}
        rows = set(spot.data_rows) | {spot.header_row}
        for (r, c), (r0, c0) in cover.items():
            if r in rows and c in cols:
                findings.append(Finding(
                    Severity.WARNING, grid.name, cell_ref(r, c),
                    f"{what}: cell {cell_ref(r, c)} is inside the merged range starting at {cell_ref(r0, c0)}; "
                    "a merged cell holds one value only, so this cell reads as empty"))


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
                           f"left blank; filled from the built-in library ({f.material}): {label} = {shown}; "
                           f"source: {f.source}"))
    return out


def _tables(book: OpenBook, result: BookRating):
    mgrid, mspot = _spot(book, "Materials", MATERIAL_FIELDS, "name")
    pgrid, pspot = _spot(book, "Parts", PART_FIELDS, "part", layer_groups=True)
    if pspot is None:
        where = "a sheet named 'Parts'" if pgrid is None else "its header row"
        raise BookUnusable(
            f"{book.path.name}: no parts table found: expected a sheet or workbook table named 'Parts' "
            f"with a header row naming 'Part' and the inputs (looked for {where})")
    lgrid, lspot = _spot(book, "Layers", LAYER_ROW_FIELDS, "part")
    if lspot is not None and lspot.column("layer") is None:
        raise BookUnusable(f"{book.path.name}: the 'Layers' table has no 'Layer' column (1 = innermost)")
    if lspot is not None and pspot.layer_numbers:
        result.findings.append(Finding(Severity.WARNING, lgrid.name, None,
                                       "the book has both layer columns in 'Parts' and a 'Layers' table; "
                                       "the 'Layers' table is used"))
    return mgrid, mspot, pgrid, pspot, lgrid, lspot


def validate_open_book(book: OpenBook) -> BookRating:
    """Read and check the book's tables without rating (the engine's input checks still run)."""
    return rate_open_book(book)


def rate_open_book(book: OpenBook) -> BookRating:
    """Rate every part of an opened book; bad parts get findings, the others are rated."""
    result = BookRating(book.path)
    findings = result.findings
    mgrid, mspot, pgrid, pspot, lgrid, lspot = _tables(book, result)
    if mspot is not None:
        _hidden_and_merged(mgrid, mspot, findings, "materials")
        materials = read_materials(mgrid, mspot, findings)
        findings.extend(_filled_notes(materials))
    else:
        materials = MaterialSet()
    _hidden_and_merged(pgrid, pspot, findings, "parts")
    if lspot is not None:
        _hidden_and_merged(lgrid, lspot, findings, "layers")
    parts = read_parts(pgrid, pspot, materials, findings, lgrid, lspot)
    result.materials, result.parts = materials, parts
    result.parts_spot, result.layers_spot, result.materials_spot = pspot, lspot, mspot
    result.system = parts.system
    if parts.count == 0:
        findings.append(Finding(Severity.ERROR, pgrid.name, None, "the parts table has no parts"))
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
    return result
