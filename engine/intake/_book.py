"""Rate every part of a book's tables: locate them, read and validate the cells, call the engine.

No file is read here: a `TableSource` (the fast reader of a saved book, or a live host) hands
over the grids; this module turns them into the engine's arrays and the engine's per-part
diagnoses into problems on the cells they concern. No physics either: the core rates.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Protocol

import numpy as np
from twistshare.engine.core import PlasticReserve, Rating, WhirlCheck, rate, whirl_of
from twistshare.engine.errors import BookUnusable
from twistshare.engine.units import si_factor

from ._flag_words import problems_from_rating
from ._grid import SheetGrid
from ._interface_inputs import interface_problems
from ._materials import MaterialSet, read_materials
from ._parts import PartsInput, read_parts
from ._plastic_inputs import plastic_of
from ._problems import Problem, Severity
from ._schema import LAYER_ROW_FIELDS, MATERIAL_FIELDS, PART_FIELDS, SIZING_FIELDS
from ._sizing_input import BookSizing, read_sizing, size_parts, sizing_problems
from ._table_checks import (
    anchor_merged,
    hidden_and_merged,
    refuse_conflicting_materials,
    refuse_conflicting_parts,
    unknown_headers,
)
from ._tables import TableRegion, TableSpot, locate_table

__all__ = ["BookRating", "TableSource", "rate_tables", "TABLE_NAMES"]

SIZING_KEYS = frozenset(f.key for f in SIZING_FIELDS)

#: The tables a book holds, by sheet name or workbook-table name.
TABLE_NAMES = ("Materials", "Parts", "Layers")


class TableSource(Protocol):
    """Where a book's grids come from: a saved file (the fast reader) or a live host."""

    path: Path
    tables: Mapping[str, TableRegion]  # lower-case workbook-table name -> region

    def find_sheet(self, name: str) -> str | None:
        """The sheet of that name (ignoring case), or None."""

    def grid(self, sheet: str) -> SheetGrid:
        """The sheet's values anchored at A1."""


@dataclass
class BookRating:
    """Everything one run learned about a book."""

    path: Path
    problems: list[Problem] = field(default_factory=list)
    materials: MaterialSet | None = None
    parts: PartsInput | None = None
    rating: Rating | None = None
    rated: np.ndarray | None = None  # (P,) bool: the part has results
    system: str = "SI"
    parts_spot: TableSpot | None = None
    layers_spot: TableSpot | None = None
    materials_spot: TableSpot | None = None
    sizing: BookSizing | None = None  # only when some part asks to be sized
    whirl: WhirlCheck | None = None  # first critical speed and speed ratio, where a speed is given
    plastic: PlasticReserve | None = None  # None: no rated part has yield strengths
    shear_yield: np.ndarray | None = None  # (P, L) Pa, each layer's, for the torque–twist curve


def _spot(book: TableSource, name: str, fields, key: str, layer_groups: bool = False, notes=None):
    """Find a table first as a workbook table of that name, then as a sheet of that name."""
    region = book.tables.get(name.lower())
    if region is not None:
        grid = book.grid(region.sheet)
        spot = locate_table(grid, fields, key, layer_groups=layer_groups, header_row=region.header_row,
                            last_row=region.last_row, first_col=region.first_col, last_col=region.last_col)
        if spot is not None:
            other = book.find_sheet(name)
            if notes is not None and other is not None and other != region.sheet:
                notes.append(Problem(Severity.WARNING, other, None,
                                     f"the book has both a workbook table named {region.name!r} (on sheet "
                                     f"{region.sheet!r}) and a sheet named {other!r}: the table is used, the "
                                     "sheet is not read", code="two-tables"))
            return grid, spot
    sheet = book.find_sheet(name)
    if sheet is None:
        return None, None
    grid = book.grid(sheet)
    return grid, locate_table(grid, fields, key, layer_groups=layer_groups)


_FILLED_WORDS = {"shear_modulus": ("G", "stress", "GPa"), "youngs_modulus": ("E", "stress", "GPa"),
                 "poisson_ratio": ("Poisson ratio", "dimensionless", ""),
                 "yield_strength": ("yield strength", "stress", "MPa"),
                 "ultimate_strength": ("ultimate strength", "stress", "MPa"),
                 "density": ("density", "density", "kg/m³")}


def _filled_notes(materials: MaterialSet) -> list[Problem]:
    out = []
    for f in materials.filled:
        label, kind, unit = _FILLED_WORDS.get(f.field, (f.field, "dimensionless", ""))
        shown = f"{f.value_si / si_factor(unit, kind):.4g} {unit}".strip() if unit else f"{f.value_si:.4g}"
        out.append(Problem(Severity.NOTE, f.sheet, f.cell,
                           f"blank in the book: the built-in library's value is used ({f.material}): {label} = {shown}; "
                           f"source: {f.source}", code="library-fill", material=f.material))
    return out


def _tables(book: TableSource, result: BookRating):
    notes = result.problems
    mgrid, mspot = _spot(book, "Materials", MATERIAL_FIELDS, "name", notes=notes)
    pgrid, pspot = _spot(book, "Parts", PART_FIELDS, "part", layer_groups=True, notes=notes)
    if pspot is None:
        where = "a sheet named 'Parts'" if pgrid is None else "its header row"
        raise BookUnusable(
            f"{book.path.name}: no parts table found: expected a sheet or workbook table named 'Parts' "
            f"with a header row naming 'Part' and the inputs (looked for {where})")
    lgrid, lspot = _spot(book, "Layers", LAYER_ROW_FIELDS, "part", notes=notes)
    if lspot is not None and pspot.layer_numbers:
        result.problems.append(Problem(Severity.WARNING, lgrid.name, None,
                                       "the book has both layer columns in 'Parts' and a 'Layers' table; "
                                       "the 'Layers' table is used", code="two-layouts"))
    return mgrid, mspot, pgrid, pspot, lgrid, lspot


def rate_tables(book: TableSource) -> BookRating:
    """Rate every part of a book's tables; bad parts get problems, the others are rated.

    Raises
    ------
    BookUnusable
        No parts table is found.
    """
    result = BookRating(book.path)
    findings = result.problems
    mgrid, mspot, pgrid, pspot, lgrid, lspot = _tables(book, result)
    header_findings = unknown_headers(pgrid, pspot, PART_FIELDS, True, "parts")
    if mspot is not None:
        header_findings += unknown_headers(mgrid, mspot, MATERIAL_FIELDS, False, "materials")
    if lspot is not None:
        header_findings += unknown_headers(lgrid, lspot, LAYER_ROW_FIELDS, False, "layers")
    findings.extend(header_findings)
    header_blocks = any(f.severity is Severity.ERROR for f in header_findings)
    if mspot is not None:
        hidden_and_merged(mgrid, mspot, findings, "materials")
        materials = read_materials(mgrid, mspot, findings)
        refuse_conflicting_materials(mgrid, mspot, materials, findings)
        findings.extend(_filled_notes(materials))
    else:
        materials = MaterialSet()
    hidden_and_merged(pgrid, pspot, findings, "parts")
    if lspot is not None:
        hidden_and_merged(lgrid, lspot, findings, "layers")
    parts = read_parts(pgrid, pspot, materials, findings, lgrid, lspot)
    if header_blocks:
        parts.input_error[:] = True
    refuse_conflicting_parts(pgrid, pspot, lgrid, lspot, parts, findings)
    request = None
    if any(c.field.key in SIZING_KEYS for c in pspot.columns):  # else no sizing work at all
        request = read_sizing(pgrid, pspot, parts.ids, parts.rows, parts.stack(), parts.input_error, findings,
                              set())
    result.materials, result.parts = materials, parts
    result.parts_spot, result.layers_spot, result.materials_spot = pspot, lspot, mspot
    result.system = parts.system
    if parts.count == 0:
        findings.append(Problem(Severity.ERROR, pgrid.name, None, "the parts table has no parts", code="no-parts"))
        anchor_merged(findings, [mgrid, pgrid, lgrid])
        return result
    ok = ~parts.input_error
    # Parts whose inputs are unusable still go to the engine with NaNs so shapes stay whole;
    # their results are discarded below and their problems come from the cells.
    rating = rate(parts.stack(), parts.duty(), inputs=parts.inputs)
    result.rating = rating
    findings.extend(problems_from_rating(rating, parts, ok))
    interface_findings, refused = interface_problems(rating, parts, ok & np.asarray(rating.valid, dtype=bool))
    findings.extend(interface_findings)
    result.rated = ok & np.asarray(rating.valid, dtype=bool) & ~refused
    result.plastic, result.shear_yield, plastic_notes = plastic_of(parts, materials, result.rated)
    findings.extend(plastic_notes)
    if request is not None:  # sizing work only when a part asks
        result.sizing = size_parts(parts.stack(), parts.duty(), request, result.rated, parts.inputs)
        findings.extend(sizing_problems(result.sizing, parts.ids))
    result.whirl = whirl_of(parts.stack(), parts.length, parts.inputs)
    anchor_merged(findings, [mgrid, pgrid, lgrid])
    return result
