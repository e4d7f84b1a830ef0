"""A layer block or materials block passed to a cell function, read as a small table by the intake.

A block is a grid of cell values, exactly like a sheet: it goes through the same intake readers
as a workbook's tables (`read_parts`, `read_layer_table_parts`, `read_materials`), so a part
typed into a block and into a table gets the same answer. What is particular to a block is only
its shape:

* **one row per layer**: the columns of a ``Layers`` table (material or G, outer diameter, inner
  diameter, optional allowable and Kt; optional ``Part`` and ``Layer``). Without a ``Part``
  column the block is one part;
* **one row per part**: ``Layer n ...`` column groups, as in a ``Parts`` table;
* **no header row**: 3 to 5 columns are one layer a row, in the order material or G, outer
  diameter, inner diameter, allowable, Kt; 10 or more (a multiple of 5) are groups of five per
  layer, one part a row. Each cell then carries its own unit (``52 mm``).

A problem is shown by the part it concerns (a cell shows a number or a message, never both, so a
warning refuses the part as an error does); a problem of the block as a whole refuses the call.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import NDArray
from twistshare.engine.intake import (
    LAYER_ROW_FIELDS,
    MATERIAL_FIELDS,
    PART_FIELDS,
    MaterialSet,
    PartsInput,
    Problem,
    Severity,
    SheetGrid,
    all_of_type,
    locate_table,
    match_header,
    match_layer_group_header,
    material_key,
    read_layer_table_parts,
    read_materials,
    read_parts,
    row_array,
    stops,
    unknown_headers,
)
from twistshare.engine.intake._words import error_value_text
from twistshare.engine.units import split_header

from ._arguments import CellError, looks_numeric

__all__ = ["Block", "read_block", "read_materials_block", "THRESHOLD"]

#: How severe a problem must be to stop a cell's result: a cell cannot show a warning beside its
#: number, so warnings stop it too.
THRESHOLD = Severity.WARNING

_POSITIONAL = ("Material", "Outer diameter", "Inner diameter", "Allowable", "Kt")
_LAYERS_SHEET = "layers"
_MATERIALS_SHEET = "materials"


@dataclass(frozen=True)
class Block:
    """A layer block read for the engine.

    Attributes
    ----------
    parts : PartsInput
        The intake's reading; parts with a problem have no layers present in `stack`.
    problems : tuple of (str or None)
        Per part, the first problem that stops it, worded.
    per_row_layers : bool
        True: one row per layer; False: one row per part.
    multi_part : bool
        The block can hold several parts (a Part column, or one row per part).
    n_rows : int
        Data rows (a header row excluded): the length of a spilled result.
    has_header : bool
    row_part, row_slot : (n_rows,) int arrays
        The part (and, one row per layer, the slot) each data row became; -1 for none.
    """

    parts: PartsInput
    problems: tuple[str | None, ...]
    per_row_layers: bool
    multi_part: bool
    n_rows: int
    has_header: bool
    row_part: NDArray[np.intp]
    row_slot: NDArray[np.intp]
    need_allowable: bool = True

    @property
    def n_parts(self) -> int:
        """Number of parts."""
        return self.parts.count

    @property
    def system(self) -> str:
        """The unit system of the block's diameters, for values shown in messages."""
        return self.parts.system

    def stack(self):
        """The layers for the engine core; parts with a problem carry no layers."""
        stack = self.parts.stack()
        refused = np.array([p is not None for p in self.problems], bool)
        allowable = stack.allowable_shear
        if not self.need_allowable:
            # Not used by the result asked for; a placeholder keeps the core's checks of the
            # geometry and moduli, and nothing derived from it is returned.
            allowable = np.where(np.isnan(allowable), 1.0, allowable)
        elif not refused.any():
            return stack
        present = np.where(refused[:, None], False, stack.present)
        return type(stack)(outer_diameter=stack.outer_diameter, inner_diameter=stack.inner_diameter,
                           shear_modulus=stack.shear_modulus, allowable_shear=allowable,
                           stress_concentration=stack.stress_concentration, present=present,
                           allowable_rule=stack.allowable_rule)

    def part_label(self, part: int) -> str:
        """How a message names a part of this block (empty for a one-part block)."""
        pid = self.parts.ids[part]
        if not self.multi_part or not pid:
            return ""
        return pid if pid.startswith("row ") else f"part {pid}"


def _rows(block: Any, what: str) -> list[list[Any]]:
    if not isinstance(block, (list, tuple)):
        raise CellError(what, "expected a block of cells")
    if all_of_type(block, list) and len(set(map(len, block))) == 1:
        return block                         # the usual rectangular list of lists: no copy
    kinds = set(map(type, block))
    if kinds <= {list, tuple}:
        rows = [list(r) for r in block]
    elif kinds.isdisjoint({list, tuple}):
        rows = [list(block)]                 # a 1-D list: one row
    else:
        rows = [list(r) if isinstance(r, (list, tuple)) else [r] for r in block]
    width = max(map(len, rows), default=0)
    return [r + [None] * (width - len(r)) if len(r) < width else r for r in rows]


def _grid(name: str, rows: list[list[Any]]) -> SheetGrid:
    """The block as a sheet grid. Error values arrive as their text (``#N/A``); the intake
    recognises that text in any cell, as it recognises a saved book's error cells. The rows are
    of one length (`_rows` pads them)."""
    return SheetGrid(name, rows, rectangular=True)


def _is_blank(value: Any) -> bool:
    return value is None or (isinstance(value, str) and not value.strip())


def _is_header_row(row: list[Any]) -> bool:
    cells = [c for c in row if not _is_blank(c)]
    if not cells or not all(isinstance(c, str) and not looks_numeric(c) for c in cells):
        return False
    if any(error_value_text(c) for c in cells):
        return False
    return any(split_header(c)[1] is not None or match_header(c, LAYER_ROW_FIELDS) is not None
               or match_header(c, PART_FIELDS) is not None or match_layer_group_header(c) is not None
               for c in cells)


def _positional_header(width: int) -> list[str]:
    if width in (3, 4, 5):
        return list(_POSITIONAL[:width])
    if width >= 10 and width % 5 == 0:
        return [f"Layer {i // 5 + 1} {_POSITIONAL[i % 5]}" for i in range(width)]
    raise CellError(
        "layers",
        f"expected 3 to 5 columns (material or G, outer diameter, inner diameter, allowable, "
        f"Kt), or 5 per layer on one row; got {width} columns. Add a header row to name them",
    )


def _refuse_table_problems(problems: list[Problem]) -> None:
    """A problem of the block as a whole (a header, a table) refuses the call."""
    for p in problems:
        if p.part is None and p.material is None and stops(p.severity, THRESHOLD) and p.code in (
                "header-unit", "no-layers", "no-parts", "two-layouts", "input"):
            raise CellError("", p.message)


def read_materials_block(block: Any) -> tuple[MaterialSet, list[Problem]]:
    """Read a materials block (header row first) as a materials table.

    Raises
    ------
    CellError
        The block has no header row naming a Material column, or a header's unit is unusable.
    """
    if block is None or block == [] or block == [[None]]:
        return MaterialSet(), []
    rows = _rows(block, "materials")
    grid = _grid(_MATERIALS_SHEET, rows)
    spot = locate_table(grid, MATERIAL_FIELDS, "name", header_row=0)
    if spot is None:
        raise CellError("materials", "the first row must be a header with a 'Material' column")
    problems: list[Problem] = []
    for p in unknown_headers(grid, spot, MATERIAL_FIELDS, False, "materials"):
        if p.severity is Severity.ERROR:
            raise CellError("materials", p.message)
    materials = read_materials(grid, spot, problems)
    _refuse_table_problems(problems)
    return materials, problems


def read_block(layers: Any, materials: Any, need_allowable: bool = True) -> Block:
    """Read a layer block argument (and the materials block beside it).

    Parameters
    ----------
    layers : list of lists
        As a host passes a range; a 1-D list is one row.
    materials : list of lists or None
        A materials block with a header row; the built-in library is searched after it.
    need_allowable : bool
        False for results that do not depend on the allowable (share, stress, twist).

    Raises
    ------
    CellError
        When the block as a whole cannot be read (no rows, a header that names no input, a wrong
        column count, a header unit of the wrong kind). Problems of single cells stop their part.
    """
    material_set, problems = read_materials_block(materials)
    rows = _rows(layers, "layers")
    if not rows:
        raise CellError("layers", "the block has no layer rows")
    has_header = _is_header_row(rows[0])
    header_cells = None
    if not has_header:
        width = len(rows[0])
        while width > 5 and all(_is_blank(r[width - 1]) for r in rows):
            width -= 1  # a selection wider than the block: empty columns on the right say nothing
        rows = [r[:width] for r in rows]
        header_cells = _positional_header(width)
    grid = _grid(_LAYERS_SHEET, rows)
    spot_args = {"header_row": 0} if has_header else {"header_cells": header_cells}
    # Which layout the header names decides the table read; only that one's rows are scanned.
    by_part = locate_table(grid, PART_FIELDS, None, layer_groups=True, with_data=False, **spot_args)
    per_row_layers = by_part is None or not by_part.layer_numbers
    fields = LAYER_ROW_FIELDS
    spot = locate_table(grid, fields if per_row_layers else PART_FIELDS, None,
                        layer_groups=not per_row_layers, **spot_args)
    if spot is None:
        raise CellError("layers", "the header row names no layer column: expected Material (or G), Outer "
                        "diameter, Inner diameter, Allowable, Kt (and Part, Layer)")
    for p in unknown_headers(grid, spot, PART_FIELDS if not per_row_layers else fields, not per_row_layers, "layers"):
        raise CellError("layers", p.message)
    keys = {c.field.key for c in spot.columns}
    for needed, words in (("material", "material or G"), ("outer_diameter", "outer diameter")):
        if needed not in keys:
            raise CellError("layers", f"no {words} column")
    if not spot.data_rows:
        raise CellError("layers", "the block has no layer rows")
    if per_row_layers:
        parts = read_layer_table_parts(grid, spot, material_set, problems, need_allowable=need_allowable)
    else:
        parts = read_parts(grid, spot, material_set, problems, need_allowable=need_allowable, with_duty=False)
    _refuse_table_problems(problems)
    n_rows = len(rows) - (1 if has_header else 0)
    first = 1 if has_header else 0
    row_part = np.full(n_rows, -1, dtype=np.intp)
    row_slot = np.full(n_rows, -1, dtype=np.intp)
    if per_row_layers:
        data = row_array(spot.data_rows) - first
        row_part[data], row_slot[data] = parts.source_part, parts.source_slot
    else:
        row_part[np.asarray(parts.rows, dtype=np.intp) - first] = np.arange(parts.count)
    multi = (spot.column("part") is not None) or (not per_row_layers and n_rows > 1)
    return Block(parts, _part_problems(parts, problems, need_allowable), per_row_layers, multi, n_rows, has_header,
                 row_part, row_slot, need_allowable)


def _part_problems(parts: PartsInput, problems: list[Problem], need_allowable: bool) -> tuple[str | None, ...]:
    """Per part, the first problem that stops it: its own, or one of a material it uses (a
    material without an allowable stops only the results that need one)."""
    out: list[str | None] = [None] * parts.count
    stopping = [p for p in problems if stops(p.severity, THRESHOLD)]
    if not stopping and not parts.input_error.any():
        return tuple(out)
    index = {pid: i for i, pid in enumerate(parts.ids)} if any(p.part is not None for p in stopping) else {}
    by_material: dict[str, str] = {}
    for p in stopping:
        if p.part is not None and p.part in index:
            i = index[p.part]
            if out[i] is None:
                out[i] = p.message
        elif p.material is not None and (need_allowable or p.code != "no-allowable"):
            by_material.setdefault(material_key(p.material), (p.message, p.code == "no-allowable"))
    if by_material:
        for i, names in enumerate(parts.materials):
            if out[i] is None:
                for j, name in enumerate(names):
                    found = by_material.get(material_key(name)) if name is not None and parts.present[i, j] else None
                    # A material without an allowable does not stop a layer that gives its own.
                    if found is not None and not (found[1] and np.isfinite(parts.allowable_shear[i, j])):
                        out[i] = found[0]
                        break
    for i in np.flatnonzero(parts.input_error).tolist():
        if out[i] is None:
            out[i] = "could not be read (see the block's cells)"
    return tuple(out)
