"""Fitting per-part arguments to a layer block, and results back to the cells they spill into."""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from numpy.typing import NDArray

from twistshare.engine.core import (
    LAYER_ERRORS,
    LayerStack,
    PART_ERRORS,
    LayerFlag,
    PartFlag,
    Rating,
    describe,
    split_flags,
)
from twistshare.engine.units import UnitProblem, display_unit, parse_value, split_header

from ._layer_block import LayerBlock
from ._values import WARNING_SIGN, CellError, is_empty, looks_numeric, read_quantity

__all__ = ["per_part", "rating_problems", "spill_layers", "spill_parts", "unit_label"]


def _flat(value: Any) -> list[Any]:
    out: list[Any] = []
    for item in value:
        if isinstance(item, (list, tuple)):
            out.extend(item)
        else:
            out.append(item)
    return out


def per_part(value: Any, kind: str, block: LayerBlock, where: str, required: bool
             ) -> tuple[NDArray[np.float64], list[str | None]]:
    """One SI value per part of `block`, from one cell or from a column beside the block.

    A column has one cell per data row of the block (plus the header cell when the block
    has a header, whose unit then applies). With one row per layer, each part takes the
    value of its rows; they must agree.

    Returns
    -------
    values : (P,) ndarray, SI
        NaN where not given.
    problems : list of (str or None)
        Per part.
    """
    n_parts = block.n_parts
    problems: list[str | None] = [None] * n_parts
    cells = _flat(value) if isinstance(value, (list, tuple)) else None
    if cells is None or len(cells) == 1 or _is_pair(cells):
        if is_empty(value):
            if required:
                raise CellError(where, f"cell is empty; expected {_expected(kind)}")
            return np.full(n_parts, math.nan), problems
        number = read_quantity(value, kind, where)
        return np.full(n_parts, number), problems

    unit = None
    head = cells[0]
    if (block.has_header and len(cells) == block.n_rows + 1 and isinstance(head, str)
            and not looks_numeric(head)):
        unit = split_header(head)[1]
        cells = cells[1:]
    if len(cells) != block.n_rows:
        raise CellError(where, f"expected one cell, or a column of {block.n_rows} cells beside "
                               f"the layer block; got {len(cells)} cells")
    values = np.full(n_parts, math.nan)
    memo: dict[Any, tuple[float, str | None]] = {}
    for row, cell in enumerate(cells):
        part = int(block.row_part[row])
        if part < 0 or is_empty(cell):
            continue
        key = (type(cell), cell) if isinstance(cell, (str, int, float)) else None
        if key is not None and key in memo:
            number, problem = memo[key]
        else:
            try:
                number, problem = parse_value(cell, kind, unit), None
            except UnitProblem as error:
                number, problem = math.nan, str(error)
            if key is not None:
                memo[key] = (number, problem)
        label = f"{where}, {_row_label(block, row)}"
        if problem is not None:
            problems[part] = problems[part] or f"{label}: {problem}"
        elif math.isnan(values[part]):
            values[part] = number
        elif values[part] != number:
            problems[part] = problems[part] or (
                f"{label}: differs from the value on an earlier row of the same part")
    if required:
        for part in range(n_parts):
            if problems[part] is None and math.isnan(values[part]):
                problems[part] = f"{where}, {block.part_labels[part] or 'part'}: cell is empty; " \
                                 f"expected {_expected(kind)}"
    return values, problems


def _is_pair(cells: list[Any]) -> bool:
    """Two cells that are one value: (value, unit) or (header with unit, value)."""
    if len(cells) != 2:
        return False
    first, second = cells
    if isinstance(second, str) and second.strip() and not looks_numeric(second) \
            and not second.strip().startswith("#"):
        return True
    return isinstance(first, str) and "[" in first and not looks_numeric(first)


def _expected(kind: str) -> str:
    return {
        "torque": "a torque", "length": "a length", "angle": "an angle",
        "angle_per_length": "a twist per length", "stress": "a stress",
    }.get(kind, "a value")


def _row_label(block: LayerBlock, row: int) -> str:
    return f"row {row + (2 if block.has_header else 1)}"


def _format_length(value: float, system: str) -> str:
    unit = display_unit("length", system)
    factor = 0.0254 if system == "US" else 1e-3
    return f"{value / factor:g} {unit}"


def rating_problems(block: LayerBlock, rating: Rating, extra: list[str | None] | None = None
                    ) -> list[str | None]:
    """Per part: the message that stops it being rated, or None.

    Order: problems reading the block, then the extra (argument) problems, then the core's
    error flags, worded with the layer and the values that caused them.
    """
    problems: list[str | None] = list(block.part_problem)
    stack = block.stack
    for part in range(block.n_parts):
        if problems[part] is None and extra is not None and extra[part] is not None:
            problems[part] = extra[part]
        if problems[part] is not None or bool(rating.valid[part]):
            continue
        problems[part] = _core_problem(block, rating, stack, part)
    return problems


def _core_problem(block: LayerBlock, rating: Rating, stack: LayerStack, part: int) -> str:
    layer_flags = rating.layer_flags[part]
    for slot in range(stack.n_layers):
        word = int(layer_flags[slot]) & int(LAYER_ERRORS)
        if not word:
            continue
        flag = split_flags(word, LayerFlag)[0]
        detail = ""
        outer = stack.outer_diameter[part, slot]
        inner = stack.inner_diameter[part, slot]
        system = block.system
        if flag in (LayerFlag.INNER_NOT_BELOW_OUTER,):
            detail = (f" (inner {_format_length(inner, system)}, "
                      f"outer {_format_length(outer, system)})")
        elif flag in (LayerFlag.OUTER_NOT_POSITIVE,):
            detail = f" (got {_format_length(outer, system)})"
        elif flag in (LayerFlag.INNER_NEGATIVE,):
            detail = f" (got {_format_length(inner, system)})"
        elif flag in (LayerFlag.GAP_BELOW, LayerFlag.OVERLAP_BELOW):
            gap = rating.interface_gap[part, slot]
            detail = f" ({'gap' if gap > 0 else 'overlap'} {_format_length(abs(gap), system)})"
        elif flag == LayerFlag.KT_BELOW_ONE:
            detail = f" (got {stack.stress_concentration[part, slot]:g})"
        return f"{block.layer_label(part, slot)}: {describe(flag)}{detail}"
    word = int(rating.part_flags[part]) & int(PART_ERRORS)
    if word:
        flag = split_flags(word, PartFlag)[0]
        prefix = f"{block.part_labels[part]}: " if block.multi_part else ""
        return prefix + describe(flag)
    return "could not be rated"


def unit_label(result_unit: Any, kind: str) -> str:
    """The unit text a header cell of a result shows."""
    if isinstance(result_unit, str) and result_unit.strip():
        return result_unit.strip()
    return display_unit(kind, "SI") if kind != "dimensionless" else ""


def _cell(value: float, factor: float) -> Any:
    if math.isnan(value):
        return f"{WARNING_SIGN} not computed"
    return float(value / factor)


def _warn(problem: str) -> str:
    return f"{WARNING_SIGN} {problem}"


def spill_layers(block: LayerBlock, values: NDArray[np.float64], factor: float,
                 problems: list[str | None], title: str) -> Any:
    """A per-layer result as the cells show it.

    One row per layer: a column, one value per data row (blank rows stay blank). One row per
    part: one row per part, one column per layer. A header row in the block gives a header
    row in the result (`title`), so the result lines up with the block. A single part with a
    problem shows the message in one cell.
    """
    if not block.multi_part and problems and problems[0] is not None:
        return _warn(problems[0])
    out: list[list[Any]] = []
    if block.per_row_layers:
        if block.has_header:
            out.append([title])
        # Gather every row's value at once; long blocks are the common case here.
        rows_part, rows_slot = block.row_part, block.row_slot
        used = rows_part >= 0
        gathered = np.full(block.n_rows, np.nan)
        gathered[used] = values[rows_part[used], rows_slot[used]] / factor
        cells: list[Any] = gathered.tolist()
        for row in np.flatnonzero(~used | np.isnan(gathered)):
            part = int(rows_part[row])
            if part < 0:
                cells[row] = ""
            elif problems[part] is not None:
                cells[row] = _warn(problems[part])
            else:
                cells[row] = f"{WARNING_SIGN} not computed"
        out.extend(map(list, zip(cells)))
        return out
    n_layers = block.stack.n_layers
    if block.has_header:
        out.append([f"Layer {k + 1} {title}" for k in range(n_layers)])
    present = block.stack.present
    for row in range(block.n_rows):
        part = int(block.row_part[row])
        if part < 0:
            out.append([""] * n_layers)
        elif problems[part] is not None:
            out.append([_warn(problems[part])] + [""] * (n_layers - 1))
        else:
            out.append([_cell(values[part, k], factor) if present[part, k] else ""
                        for k in range(n_layers)])
    return out


def spill_parts(block: LayerBlock, values: list[Any], problems: list[str | None],
                title: str) -> Any:
    """A per-part result: one cell for a single part, else one value per data row."""
    def show(part: int) -> Any:
        return _warn(problems[part]) if problems[part] is not None else values[part]

    if not block.multi_part:
        return show(0)
    out: list[list[Any]] = [[title]] if block.has_header else []
    shown = [show(part) for part in range(block.n_parts)]
    out.extend([[""] if part < 0 else [shown[part]] for part in block.row_part.tolist()])
    return out
