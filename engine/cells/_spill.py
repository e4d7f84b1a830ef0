"""Per-part arguments fitted to a layer block, the rating's problems per part, and results back
to the cells they spill into."""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from numpy.typing import NDArray
from twistshare.engine.core import Duty, Rating, rate
from twistshare.engine.intake import Field, cell_value, describe_kind, header_factor, problems_from_rating, stops
from twistshare.engine.intake._interface_inputs import interface_problems
from twistshare.engine.intake._words import error_value_text
from twistshare.engine.units import display_unit, split_header

from ._arguments import WARNING_SIGN, CellError, flatten, is_empty, looks_numeric, pair_kind, read_field
from ._blocks import THRESHOLD, Block

__all__ = ["per_part", "rate_block", "spill_layers", "spill_parts", "unit_label", "merge"]


def _is_pair(cells: list[Any]) -> bool:
    """Two cells that are one value: (value, unit) or (header with unit, value)."""
    return len(cells) == 2 and pair_kind(*cells) is not None


def per_part(value: Any, field: Field, block: Block, where: str, required: bool
             ) -> tuple[NDArray[np.float64], list[str | None]]:
    """One SI value per part of `block`, from one cell or from a column beside the block.

    A column has one cell per data row of the block (plus the header cell when the block
    has a header, whose unit then applies). With one row per layer, each part takes the
    value of its rows; they must agree. Each value is read by the field's one rule.

    Returns
    -------
    values : (P,) ndarray, SI
        NaN where not given.
    problems : list of (str or None)
        Per part.
    """
    n_parts = block.n_parts
    problems: list[str | None] = [None] * n_parts
    cells = flatten(value) if isinstance(value, (list, tuple)) else None
    if cells is None or len(cells) == 1 or _is_pair(cells):
        if is_empty(value):
            if required:
                raise CellError(where, f"cell is empty; expected {describe_kind(field.kind)}")
            return np.full(n_parts, math.nan), problems
        return np.full(n_parts, read_field(value, field, where)), problems
    unit = None
    head = cells[0]
    if (block.has_header and len(cells) == block.n_rows + 1 and isinstance(head, str)
            and not looks_numeric(head)):
        unit = split_header(head)[1]
        cells = cells[1:]
    if len(cells) != block.n_rows:
        raise CellError(where, f"expected one cell, or a column of {block.n_rows} cells beside "
                               f"the layer block; got {len(cells)} cells")
    factor, header_issue = header_factor(field, unit, field.description)
    values = np.full(n_parts, math.nan)
    memo: dict[Any, tuple[float, str | None]] = {}
    first_row = 2 if block.has_header else 1
    for row, cell in enumerate(cells):
        part = int(block.row_part[row])
        if part < 0 or is_empty(cell):
            continue
        key = (type(cell), cell) if isinstance(cell, (str, int, float)) else None
        if key is not None and key in memo:
            number, problem = memo[key]
        else:
            number, problem, _ = cell_value(cell, field, unit, factor, header_issue or "no unit",
                                            is_error=error_value_text(cell) is not None)
            if key is not None:
                memo[key] = (number, problem)
        label = f"{where}, row {row + first_row}"
        if problem is not None:
            problems[part] = problems[part] or f"{label}: {problem}"
        elif math.isnan(values[part]):
            values[part] = number
        elif values[part] != number:
            problems[part] = problems[part] or f"{label}: differs from the value on an earlier row of the same part"
    if required:
        for part in range(n_parts):
            if problems[part] is None and math.isnan(values[part]):
                who = block.part_label(part) or "part"
                problems[part] = f"{where}, {who}: cell is empty; expected {describe_kind(field.kind)}"
    return values, problems


def merge(*problem_lists: list[str | None]) -> list[str | None]:
    """Per part, the first problem of the lists given (in their order)."""
    merged = list(problem_lists[0])
    for problems in problem_lists[1:]:
        if problems.count(None) == len(problems):
            continue  # nothing to add: the common case of a long block
        merged = [a if a is not None else b for a, b in zip(merged, problems)]
    return merged


def _unstopped(problems: list[str | None]) -> NDArray[np.bool_]:
    """Per part, True where no message stops it."""
    if problems.count(None) == len(problems):  # the usual block: nothing stops any part
        return np.ones(len(problems), bool)
    return np.array([p is None for p in problems], bool)


def rate_block(block: Block, duty: Duty, extra: list[str | None] | None = None,
               inputs: dict[str, NDArray[np.float64]] | None = None) -> tuple[Rating, list[str | None]]:
    """Rate the block's parts; per part the message that stops it, or None.

    Order: problems reading the block, then the arguments' (`extra`), then the core's
    diagnoses, worded by the intake.
    """
    rating = rate(block.stack(), duty, inputs={**block.parts.inputs, **(inputs or {})})
    problems = merge(list(block.problems), extra) if extra is not None else list(block.problems)
    valid = np.asarray(rating.valid, bool)
    unrated = np.flatnonzero(_unstopped(problems) & ~valid).tolist()
    if unrated:
        ok = np.zeros(block.n_parts, bool)
        ok[unrated] = True
        for p in problems_from_rating(rating, _with_duty(block, duty), ok):
            if stops(p.severity, THRESHOLD):
                i = block.parts.ids.index(p.part)
                problems[i] = problems[i] or p.message
        for i in unrated:
            problems[i] = problems[i] or "could not be rated"
    # A fit or bond the core could not check, or a finding on one, stops the cell: the number
    # alone would not show it.
    checked = _unstopped(problems) & valid
    found, _ = interface_problems(rating, block.parts, checked)
    for p in found:
        if stops(p.severity, THRESHOLD):
            i = block.parts.ids.index(p.part)
            problems[i] = problems[i] or p.message
    return rating, problems


def _with_duty(block: Block, duty: Duty):
    """The block's parts with the duty of the call, so the core's findings name the right values."""
    from dataclasses import replace

    return replace(block.parts, torque=np.asarray(duty.torque), length=np.asarray(duty.length))


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


def spill_layers(block: Block, values: NDArray[np.float64], factor: float,
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
    present = block.parts.present
    if block.per_row_layers:
        if block.has_header:
            out.append([title])
        # Gather every row's value at once; long blocks are the common case here.
        rows_part, rows_slot = block.row_part, block.row_slot
        used = rows_part >= 0
        gathered = np.full(block.n_rows, np.nan)
        gathered[used] = values[rows_part[used], rows_slot[used]] / factor
        cells: list[list[Any]] = gathered[:, np.newaxis].tolist()  # one-cell rows, built by numpy
        for row in np.flatnonzero(~used | np.isnan(gathered)).tolist():
            part = int(rows_part[row])
            if part < 0:
                cells[row] = [""]
            elif problems[part] is not None:
                cells[row] = [_warn(problems[part])]
            else:
                cells[row] = [f"{WARNING_SIGN} not computed"]
        out.extend(cells)
        return out
    n_layers = present.shape[1]
    if block.has_header:
        out.append([f"Layer {k + 1} {title}" for k in range(n_layers)])
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


def spill_parts(block: Block, values: list[Any], problems: list[str | None], title: str) -> Any:
    """A per-part result: one cell for a single part, else one value per data row."""
    def show(part: int) -> Any:
        return _warn(problems[part]) if problems[part] is not None else values[part]

    if not block.multi_part:
        return show(0)
    out: list[list[Any]] = [[title]] if block.has_header else []
    shown = [show(part) for part in range(block.n_parts)]
    out.extend([[""] if part < 0 else [shown[part]] for part in block.row_part.tolist()])
    return out
