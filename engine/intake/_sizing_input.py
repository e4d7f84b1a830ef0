"""Sizing columns of a parts table: which dimension to solve, the target, the stock list, and the solve.

A part asks to be sized by a filled ``Size`` cell (``layer 2 outer diameter``, ``core bore``,
``layer 2 wall``; the words of `_words.size_request_from_text`). Its other sizing cells are
``Target reserve factor`` (blank: 1), ``Stock sizes [mm]`` (optional) and ``Outer layers``
(``move``, the default, or ``fixed``). A problem in any of them is an error on its cell: the
part is not rated, the others are. No part asks: nothing is read or solved.

A stock list is one cell: sizes separated by ``;`` or ``,`` (``60; 63; 65`` or ``60, 63, 65``),
each a number in the header's unit or with its own (``2.5 in; 2.75 in``), ascending; without a
unit in the header, a unit after the last size serves the bare ones (``60; 63; 65 mm``). The decimal
separator is the point, as everywhere else in a book; since a comma separates sizes, ``60,5``
reads as the two sizes 60 and 5 and is refused for not ascending.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

import numpy as np
from twistshare.engine.core import (
    Duty,
    LayerStack,
    OuterLayers,
    SizedDimension,
    StockStatus,
    round_up_to_stock,
    solve_dimension,
)
from twistshare.engine.core._criteria_list import take_inputs
from twistshare.engine.units import UnitProblem, si_factor

from ._columns import cell_value, error_problem, header_factor, read_numeric, read_text
from ._grid import SheetGrid, cell_ref
from ._problems import Problem, Severity
from ._schema import Field, field_by_key
from ._tables import TableSpot
from ._words import (
    OUTER_LAYERS_CHOICES,
    SIZE_CHOICES,
    error_value_text,
    outer_layers_from_text,
    quoted,
    size_request_from_text,
    where_text,
)

__all__ = ["SizingRequest", "BookSizing", "read_sizing", "size_parts", "parse_stock_list", "sizing_problems",
           "slot_refusal"]


def slot_refusal(dimension: int, slot: int, n_layers: int, outer: int) -> str | None:
    """Why a part cannot size that layer slot, the one rule of tables and cells: ``"size-layer"``
    (the part has no such layer), ``"size-fixed"`` (with the outer layers fixed only the
    outermost layer's face is free), or None."""
    if n_layers == 0 or slot >= n_layers:
        return "size-layer"
    if outer == OuterLayers.FIXED and dimension != SizedDimension.BORE and slot != n_layers - 1:
        return "size-fixed"
    return None

_SEPARATORS = re.compile(r"[;,]")
_TAIL_UNIT = re.compile(r"^[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*([^\d\s.+-].*)$")


@dataclass(frozen=True)
class SizingRequest:
    """What each part asks (arrays over all P parts; ``asked`` False where a part asks nothing)."""

    asked: np.ndarray  # (P,) bool: a Size cell read well
    dimension: np.ndarray  # (P,) int8 SizedDimension, -1 where not asked
    slot: np.ndarray  # (P,) intp layer slot (0-based), resolved to the part's outermost for -1
    outer_layers: np.ndarray  # (P,) int8 OuterLayers
    target: np.ndarray  # (P,) reserve factor, 1 where blank
    stock: np.ndarray  # (P, S) m, ascending, NaN-padded; S = 0 without stock lists
    sheet: str
    rows: list[int]  # zero-based sheet row of each part
    size_col: int  # zero-based column of the Size cells
    stock_col: int | None

    def size_cell(self, i: int) -> str:
        """A1 reference of part ``i``'s Size cell."""
        return cell_ref(self.rows[i], self.size_col)

    def stock_cell(self, i: int) -> str | None:
        """A1 reference of part ``i``'s stock cell, or None without a stock column."""
        return None if self.stock_col is None else cell_ref(self.rows[i], self.stock_col)


@dataclass(frozen=True)
class BookSizing:
    """What sizing found, over all P parts (NaN / -1 where a part was not sized)."""

    request: SizingRequest
    sized: np.ndarray  # (P,) bool: solved (asked, and the part rated)
    size: np.ndarray  # (P,) m
    status: np.ndarray  # (P,) int8 SizingStatus, -1 not sized
    reserve_factor: np.ndarray
    governing_criterion: np.ndarray  # (P,) int8
    governing_layer: np.ndarray  # (P,) int16
    has_stock: np.ndarray  # (P,) bool
    stock_size: np.ndarray
    stock_status: np.ndarray  # (P,) int8 StockStatus, -1 none
    stock_reserve_factor: np.ndarray
    stock_criterion: np.ndarray
    stock_layer: np.ndarray

    @property
    def count(self) -> int:
        """Parts sized."""
        return int(self.sized.sum())


def parse_stock_list(raw: object, field: Field, unit: str | None, factor: float | None,
                     header_issue: str | None = None) -> tuple[list[float], str | None]:
    """One stock-list cell as ascending SI sizes, or the problem, worded.

    A number is a list of one; text is split on ``;`` and ``,``; each item is read by the
    field's one rule (unit, sign, plausible range). A bare size takes ``unit`` (the header's);
    without one, the unit written after the last size (``60; 63; 65 mm``).
    """
    if isinstance(raw, str):
        items = [t.strip() for t in _SEPARATORS.split(raw)]
        if any(not t for t in items):
            return [], (f"{quoted(raw)}: an empty entry in the list; write the sizes ascending, separated "
                        "by ';' or ',' (the decimal separator is the point)")
        tail = _TAIL_UNIT.match(items[-1])
        if unit is None and tail is not None and len(items) > 1:
            # '60; 63; 65 mm': without a header unit, the unit after the last size serves them all
            try:
                factor, unit = si_factor(tail.group(1), field.kind), tail.group(1)
            except UnitProblem:
                pass  # the last size's own reading words the problem
    else:
        items = [raw]
    sizes: list[float] = []
    for item in items:
        value, problem, _code = cell_value(item, field, unit, factor, header_issue)
        if problem is not None:
            shown = quoted(item) if isinstance(item, str) else str(item)
            return [], f"stock size {shown}: {problem}" if len(items) > 1 else problem
        sizes.append(value)
    if any(b <= a for a, b in zip(sizes, sizes[1:])):
        hint = (" (a comma separates sizes: write decimals with a point, e.g. 60.5)"
                if isinstance(raw, str) and "," in raw else "")
        return [], f"{quoted(str(raw))}: stock sizes must be listed ascending, each once{hint}"
    return sizes, None


def read_sizing(grid: SheetGrid, spot: TableSpot, ids: list[str], rows: list[int], stack: LayerStack,
                error: np.ndarray, findings: list[Problem], header_seen: set) -> SizingRequest | None:
    """Read the sizing columns; None when no part asks (no Size column or every Size cell blank).

    ``error`` (P,) is set for every part whose sizing cells are refused.
    """
    size_col = spot.column("size")
    if size_col is None:
        others = [c for c in spot.columns if c.field.key in ("target_reserve", "stock", "outer_layers")]
        for c in others:
            findings.append(Problem(Severity.WARNING, grid.name, cell_ref(spot.header_row, c.index),
                                    f"parts column {c.header.strip()!r} is read only with a 'Size' column "
                                    "naming the dimension to size; nothing is sized", code="sizing-no-size"))
        return None
    texts = read_text(grid, size_col.index, rows)
    if not any(texts):
        return None
    n = len(rows)
    present = stack.present
    outermost = np.count_nonzero(present, axis=1) - 1
    n_layers = np.count_nonzero(present, axis=1)
    asked = np.zeros(n, bool)
    dimension = np.full(n, -1, np.int8)
    slot = np.zeros(n, np.intp)
    outer = np.zeros(n, np.int8)

    def refuse(i: int, col: int, what: str, message: str, code: str) -> None:
        error[i] = True
        asked[i] = False
        findings.append(Problem(Severity.ERROR, grid.name, cell_ref(rows[i], col),
                                f"{where_text(ids[i])}: {what}: {message}; the part is not rated",
                                part=ids[i], code=code))

    memo: dict[str, tuple[SizedDimension, int] | None] = {}
    for i, text in enumerate(texts):
        if text is None:
            continue
        bad = error_problem(grid, rows[i], size_col.index, "a dimension to size")
        if bad is not None:
            refuse(i, size_col.index, "dimension to size", bad, "error-value")
            continue
        if text not in memo:
            memo[text] = size_request_from_text(text)
        got = memo[text]
        if got is None:
            refuse(i, size_col.index, "dimension to size",
                   f"{quoted(text)} is not a dimension twistshare sizes; expected {SIZE_CHOICES}", "size-word")
            continue
        dim, k = got
        asked[i], dimension[i], slot[i] = True, int(dim), outermost[i] if k < 0 else k
    # outer layers: move (default) or fixed
    ol_col = spot.column("outer_layers")
    if ol_col is not None:
        for i, text in enumerate(read_text(grid, ol_col.index, rows)):
            if text is None:
                continue
            got = outer_layers_from_text(text) if error_value_text(text) is None else None
            if got is None:
                if asked[i]:
                    refuse(i, ol_col.index, "outer layers", f"{quoted(text)}: expected {OUTER_LAYERS_CHOICES}",
                           "outer-layers")
                continue
            outer[i] = int(got)
    # the layer must exist; fixed outer layers leave only the outermost layer's face free
    for i in np.flatnonzero(asked).tolist():
        if error[i]:
            continue  # another cell already refused the part; its own message says why
        why = slot_refusal(dimension[i], slot[i], n_layers[i], outer[i])
        if why == "size-layer":
            refuse(i, size_col.index, "dimension to size",
                   f"{quoted(texts[i])}: the part has {n_layers[i]} layer(s)", "size-layer")
        elif why == "size-fixed":
            refuse(i, size_col.index, "dimension to size",
                   f"{quoted(texts[i])} with the outer layers fixed: only the outermost layer (layer "
                   f"{outermost[i] + 1}) can change its outer face without breaking a contact; "
                   "say 'move' under Outer layers or size that layer", "size-fixed")
    who = _who(ids, rows)
    target = np.ones(n)
    t_col = spot.column("target_reserve")
    if t_col is not None:
        got = read_numeric(grid, t_col, rows, who, findings, spot.header_row, header_seen)
        error |= got.bad & asked
        asked &= ~got.bad
        target = np.where(np.isnan(got.values), 1.0, got.values)
    stock = np.full((n, 0), np.nan)
    s_col = spot.column("stock")
    if s_col is not None:
        stock = _read_stock(grid, s_col, rows, ids, asked, error, findings, header_seen, spot.header_row)
        asked &= ~(error & asked)
    return SizingRequest(asked, np.where(asked, dimension, -1).astype(np.int8), slot, outer, target, stock,
                         grid.name, list(rows), size_col.index, None if s_col is None else s_col.index)


def _who(ids: list[str], rows: list[int]):
    from ._layers import row_labels

    return row_labels(ids, rows)


def _read_stock(grid: SheetGrid, column, rows: list[int], ids: list[str], asked: np.ndarray,
                error: np.ndarray, findings: list[Problem], header_seen: set, header_row: int) -> np.ndarray:
    field = field_by_key("stock")
    factor, header_issue = header_factor(field, column.unit, column.header)
    lists: list[list[float]] = [[] for _ in rows]
    for i, r in enumerate(rows):
        raw = grid.value(r, column.index)
        if raw is None or (isinstance(raw, str) and not raw.strip()):
            continue
        where = cell_ref(r, column.index)
        bad = error_problem(grid, r, column.index, "a list of stock sizes")
        if bad is None and not asked[i]:
            continue  # a stock list on a part that sizes nothing is not read
        if bad is None:
            sizes, bad = parse_stock_list(raw, field, column.unit, factor, header_issue)
        if bad is not None:
            if asked[i]:
                error[i] = True
                findings.append(Problem(Severity.ERROR, grid.name, where,
                                        f"{where_text(ids[i])}: stock sizes: {bad}; the part is not rated",
                                        part=ids[i], code="stock", values=(raw,)))
            continue
        lists[i] = sizes
    width = max((len(s) for s in lists), default=0)
    stock = np.full((len(rows), width), np.nan)
    for i, sizes in enumerate(lists):
        stock[i, :len(sizes)] = sizes
    return stock


def size_parts(stack: LayerStack, duty: Duty, request: SizingRequest, ok: np.ndarray,
               inputs: dict[str, np.ndarray] | None = None) -> BookSizing:
    """Solve every part that asks and was rated (``ok``), grouped by dimension and outer layers.

    One core call per group (at most six), never a loop over parts.
    """
    n = stack.n_parts
    sized = request.asked & ok
    size = np.full(n, np.nan)
    status = np.full(n, -1, np.int8)
    reserve = np.full(n, np.nan)
    crit = np.zeros(n, np.int8)
    glayer = np.full(n, -1, np.int16)
    has_stock = sized & (np.isfinite(request.stock).any(axis=1) if request.stock.shape[1] else False)
    s_size, s_res = np.full(n, np.nan), np.full(n, np.nan)
    s_status = np.full(n, -1, np.int8)
    s_crit, s_layer = np.zeros(n, np.int8), np.full(n, -1, np.int16)
    for dim in SizedDimension:
        for outer in OuterLayers:
            idx = np.flatnonzero(sized & (request.dimension == int(dim)) & (request.outer_layers == int(outer)))
            if idx.size == 0:
                continue
            sub, sub_duty = stack.take(idx), duty.take(idx)
            sub_inputs = take_inputs(inputs, idx, n)
            found = solve_dimension(sub, sub_duty, dimension=dim, layer=request.slot[idx], outer_layers=outer,
                                    target_reserve=request.target[idx], inputs=sub_inputs)
            size[idx], status[idx], reserve[idx] = found.size, found.status, found.reserve_factor
            crit[idx], glayer[idx] = found.governing_criterion, found.governing_layer
            with_stock = np.flatnonzero(has_stock[idx])
            if with_stock.size == 0:
                continue
            pick = idx[with_stock]
            got = round_up_to_stock(sub.take(with_stock), sub_duty.take(with_stock), found.size[with_stock],
                                    request.stock[pick], dimension=dim, layer=request.slot[pick],
                                    outer_layers=outer, target_reserve=request.target[pick],
                                    inputs=take_inputs(sub_inputs, with_stock, idx.size))
            s_size[pick], s_status[pick], s_res[pick] = got.size, got.status, got.reserve_factor
            s_crit[pick], s_layer[pick] = got.governing_criterion, got.governing_layer
    return BookSizing(request, sized, size, status, reserve, crit, glayer, has_stock, s_size, s_status, s_res,
                      s_crit, s_layer)


def sizing_problems(book_sizing: BookSizing, ids: list[str]) -> list[Problem]:
    """A warning on the Size cell of every part whose sizing found no size, and on the stock cell of
    every part whose stock list has none that holds (the part itself is rated)."""
    from twistshare.engine.core import SizingStatus

    from ._wording import SIZING_STATUS_WORDS, STOCK_STATUS_WORDS

    out = []
    req = book_sizing.request
    st = book_sizing.status
    for i in np.flatnonzero(book_sizing.sized & (st != SizingStatus.SOLVED) & (st != SizingStatus.HOLDS_AT_LEAST)):
        out.append(Problem(Severity.WARNING, req.sheet, req.size_cell(i),
                           f"{where_text(ids[i])}: sizing: {SIZING_STATUS_WORDS[SizingStatus(int(st[i]))]}",
                           part=ids[i], code="sizing"))
    sst = book_sizing.stock_status
    for i in np.flatnonzero(book_sizing.has_stock & (sst != StockStatus.FOUND)):
        out.append(Problem(Severity.WARNING, req.sheet, req.stock_cell(i),
                           f"{where_text(ids[i])}: stock: {STOCK_STATUS_WORDS[StockStatus(int(sst[i]))]}",
                           part=ids[i], code="stock"))
    return out
