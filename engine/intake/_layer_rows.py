"""Layers from a table with one row per layer: which part each row belongs to, its layer number,
and the rows refused (a layer given twice, a row naming no part, an error value in the part cell)."""

from __future__ import annotations

from itertools import compress, count
from operator import ne

import numpy as np

from ._cellrefs import CellRefs
from ._columns import NumericColumn, drop_key, error_problem, first_seen_index, read_numeric, read_text, row_array
from ._grid import SheetGrid, all_of_type, cell_ref
from ._layers import _NUMERIC_KEYS, LayerArrays, _material_column, place_layers, row_labels, row_position
from ._problems import Problem, Severity
from ._tables import TableSpot
from ._words import error_value_text, may_hold_error_values, where_text

__all__ = ["layers_from_rows", "part_keys", "part_positions", "part_rows"]


def _layer_numbers(grid: SheetGrid, spot: TableSpot, rows: list[int], keys: list[str | None],
                   group: np.ndarray, findings: list[Problem], header_seen: set
                   ) -> tuple[np.ndarray, NumericColumn | None]:
    """Each row's layer number (0: none): the Layer column's, or (without one) its order within
    its part (`group`: the rows' part positions)."""
    lcol = spot.column("layer")
    if lcol is None:
        # The rows of a part in their order: 1, 2, ... (a stable sort groups them, numpy counts).
        order = np.argsort(group, kind="stable")
        sorted_group = group[order]
        starts = np.searchsorted(sorted_group, sorted_group, side="left")
        numbers = np.empty(len(keys), np.intp)
        numbers[order] = np.arange(len(keys)) - starts + 1
        return numbers, None
    lay = read_numeric(grid, lcol, rows, row_labels(keys, rows), findings, spot.header_row, header_seen)
    values = lay.values
    with np.errstate(invalid="ignore"):
        whole = np.isfinite(values) & (values >= 1) & (values == np.floor(values))
    return np.where(whole, values, 0).astype(np.intp), lay


def _plain_part_keys(grid: SheetGrid, col: int, rows: list[int]
                     ) -> tuple[list[str], list[int], list[str]] | None:
    """The Part column as it stands when every cell names its part plainly (texts, no blanks,
    no spaces to strip, no error values): the keys, where each run of equal keys starts and
    the run's key. None sends the caller to the cell-by-cell reading.

    A part's rows are usually together, so each run's first key stands for the run: the
    checks read one key per run, not one per row.
    """
    raw = grid.cells(col, rows)
    if not raw or grid.errors or not all_of_type(raw, str):
        return None
    starts = [0, *compress(count(1), map(ne, raw[1:], raw))]
    heads = list(map(raw.__getitem__, starts))
    if not all(heads) or list(map(str.strip, heads)) != heads or may_hold_error_values(heads):
        return None
    return raw, starts, heads


def part_keys(grid: SheetGrid, spot: TableSpot) -> tuple[list[str | None], list[bool]]:
    """The part id of each data row of a row-per-layer table (None where none can be read), and
    which rows hold an error value in their part cell.

    A blank part cell continues the part above (a table grouped by part, as engineers lay one
    out); an error value names no part.
    """
    rows = list(spot.data_rows)
    pcol = spot.column("part")
    if pcol is None:
        return [None] * len(rows), [False] * len(rows)
    plain = _plain_part_keys(grid, pcol.index, rows)
    if plain is not None:
        return plain[0], [False] * len(rows)
    return _part_keys_cell_by_cell(grid, pcol.index, rows)


def _part_keys_cell_by_cell(grid: SheetGrid, col: int, rows: list[int]) -> tuple[list[str | None], list[bool]]:
    """`part_keys` for a Part column that is not plain: blanks continue the part above, error
    values name none."""
    keys = read_text(grid, col, rows)
    if None not in keys and not grid.errors and not may_hold_error_values(keys):
        return keys, [False] * len(rows)  # every row names its part
    out: list[str | None] = []
    errors: list[bool] = []
    above: str | None = None
    for r, key in zip(rows, keys):
        if (key is not None and key[:1] in "#Ee" and error_value_text(key)) or (grid.errors and grid.error_at(
                r, col)):
            above = None
            out.append(None)
            errors.append(True)
            continue
        if key is None:
            key = above
        above = key
        out.append(key)
        errors.append(False)
    return out, errors


def part_positions(keys: list[str | None]) -> tuple[list[str], np.ndarray]:
    """The parts a row-per-layer table names, in order of appearance, and each row's position
    among them (-2 where the row names none)."""
    return drop_key(*first_seen_index(keys), None, -2)


def part_rows(grid: SheetGrid, spot: TableSpot
              ) -> tuple[tuple[list[str | None], list[bool]], list[str], np.ndarray]:
    """`part_keys` and `part_positions` of a table with a Part column, in one reading.

    Where every part's rows stand together (the usual table) the positions follow from the
    runs of equal keys, without a lookup per row.
    """
    rows = list(spot.data_rows)
    plain = _plain_part_keys(grid, spot.column("part").index, rows)
    if plain is not None:
        keys, starts, heads = plain
        if len(set(heads)) == len(heads):  # each part in one run
            counts = np.diff(np.array([*starts, len(keys)], np.intp))
            return (keys, [False] * len(keys)), heads, np.repeat(np.arange(len(heads), dtype=np.intp), counts)
        return (keys, [False] * len(keys)), *part_positions(keys)
    keys = _part_keys_cell_by_cell(grid, spot.column("part").index, rows)
    return keys, *part_positions(keys[0])


def layers_from_rows(grid: SheetGrid, spot: TableSpot, ids: list[str], findings: list[Problem],
                     keys: tuple[list[str | None], list[bool]] | None = None,
                     positions: np.ndarray | None = None) -> LayerArrays:
    """Layers from a table with one row per layer: a Part column, an optional Layer column
    (without it, the rows of a part are its layers innermost first), and the layer fields.

    Whole columns at once; only the rows that need a message are visited one by one.
    `positions` (from `part_positions`) saves looking the ids up again where `ids` came from
    this table itself.
    """
    rows = list(spot.data_rows)
    n_rows = len(rows)
    pcol = spot.column("part")
    keys, key_errors = keys or part_keys(grid, spot)
    if pcol is None:
        keys = [""] * n_rows
    header_seen: set[tuple[str, int]] = set()
    if positions is None:
        index = {pid: i for i, pid in enumerate(ids)}
        part = np.fromiter((index.get(k, -1) if k is not None else -2 for k in keys), np.intp, n_rows)
    else:
        part = positions if pcol is not None else np.zeros(n_rows, np.intp)
    numbers, lay_nc = _layer_numbers(grid, spot, rows, keys, part, findings, header_seen)
    n_layers = max(int(numbers.max()) if n_rows else 1, 1)
    n = len(ids)
    out = LayerArrays.empty(n, n_layers, CellRefs(grid.name, rows))
    row_index = row_position(rows)

    def who(r: int) -> str:
        i = row_index(r)
        k, number = keys[i], int(numbers[i])
        if not k:  # the one part of a block without a Part column: its row says where
            return f"row {r + 1}, layer {number}" if number else f"row {r + 1}"
        return f"part {k}, layer {number}" if number else f"part {k}"

    who.tag = lambda r: (keys[row_index(r)], int(numbers[row_index(r)]) or None)
    got = {key: read_numeric(grid, c, rows, who, findings, spot.header_row, header_seen)
           for key in _NUMERIC_KEYS if (c := spot.column(key)) is not None}
    mcol = spot.column("material")
    if mcol is not None:
        names, modulus, mbad, grouped = _material_column(grid, mcol, rows, who, findings, spot.header_row,
                                                         header_seen)
    else:
        names, modulus, mbad, grouped = [None] * n_rows, np.full(n_rows, np.nan), np.zeros(n_rows, bool), None

    slot = numbers - 1
    error_row = np.fromiter(key_errors, bool, n_rows) if True in key_errors else np.zeros(n_rows, bool)
    ok = (part >= 0) & (slot >= 0) & ~error_row
    # A layer given twice in a part: the later rows are refused.
    flat = part * n_layers + slot
    take = np.flatnonzero(ok)
    order = take[np.argsort(flat[take], kind="stable")]
    twice = order[1:][np.diff(flat[order]) == 0]
    ok[twice] = False
    twice_set = set(twice.tolist())
    for i in np.flatnonzero(~ok).tolist():
        _refuse_layer_row(grid, spot, rows[i], keys[i], part[i], slot[i], error_row[i], i in twice_set,
                          lay_nc is not None and bool(lay_nc.bad[i]), out, findings)
    src = np.flatnonzero(ok)
    p, j = part[src], slot[src]
    out.present[p, j] = True
    out.shear_modulus[p, j] = modulus[src]
    out.bad[p[mbad[src]]] = True
    codes = None
    if grouped is None:
        out.materials[p, j] = np.array(names, dtype=object)[src]
    else:
        out.materials[p, j] = np.array([*grouped[0], None], dtype=object)[grouped[1][src]]  # -1: None
        codes = np.full(out.present.shape, -1, np.intp)
        codes[p, j] = grouped[1][src]
        out.material_codes = (grouped[0], codes)
    rowmap = np.full(out.present.shape, -1, dtype=np.intp)
    rowmap[p, j] = row_array(rows)[src]
    out.cells.by_layer(rowmap, {key: c.index for key in (*_NUMERIC_KEYS, "material")
                                if (c := spot.column(key)) is not None})
    if mcol is not None and (grid.errors or may_hold_error_values(grouped[0] if grouped else dict.fromkeys(names))):
        for i, pi, ji in zip(src.tolist(), p.tolist(), j.tolist()):
            err = error_problem(grid, rows[i], mcol.index, "a material name")
            if err is not None:
                out.materials[pi, ji] = None
                if codes is not None:
                    codes[pi, ji] = -1
                findings.append(Problem(Severity.ERROR, grid.name, cell_ref(rows[i], mcol.index),
                                        f"{where_text(ids[pi], ji + 1)}: material: {err}", part=ids[pi], layer=ji + 1,
                                        code="error-value"))
                out.bad[pi] = True
    out.source_part = np.where(ok, part, -1)
    out.source_slot = np.where(ok, slot, -1)
    place_layers(got, src, p, j, ids, out, grid.name, findings)
    for k in np.flatnonzero(~out.present.any(axis=1) & ~out.bad).tolist():
        findings.append(Problem(Severity.ERROR, None, None,
                                f"{where_text(ids[k])}: no layers in the {spot.sheet} table", part=ids[k],
                                code="no-layers"))
        out.bad[k] = True
    return out


def _refuse_layer_row(grid: SheetGrid, spot: TableSpot, r: int, pid: str | None, p: int, j: int, error: bool,
                      twice: bool, layer_cell_bad: bool, out: LayerArrays, findings: list[Problem]) -> None:
    """Word why a row of a row-per-layer table is not a layer of any part."""
    pcol, lcol = spot.column("part"), spot.column("layer")
    here = cell_ref(r, pcol.index) if pcol is not None else None
    if error:
        findings.append(Problem(Severity.ERROR, grid.name, here,
                                f"{spot.sheet} row {r + 1}: the part id: {error_problem(grid, r, pcol.index, 'a part id')}"
                                "; the layer is ignored", code="error-value"))
    elif p == -2:
        findings.append(Problem(Severity.ERROR, grid.name, here,
                                f"{spot.sheet} row {r + 1}: the layer names no part (a blank part cell "
                                "continues the part above, and there is none); the row is ignored",
                                code="missing", values=(r + 1,)))
    elif p == -1:
        findings.append(Problem(Severity.ERROR, grid.name, here,
                                f"{spot.sheet} row {r + 1}: part {pid} is not in the parts table; "
                                "the layer is ignored", code="unknown-part"))
    elif j < 0:
        if not layer_cell_bad:
            findings.append(Problem(Severity.ERROR, grid.name, cell_ref(r, lcol.index) if lcol else None,
                                    f"{where_text(pid)}: layer number must be a whole number from 1 (innermost)",
                                    part=pid, code="layer-number"))
        out.bad[p] = True
    elif twice:
        findings.append(Problem(Severity.ERROR, grid.name, cell_ref(r, lcol.index) if lcol else None,
                                f"{where_text(pid, j + 1)}: the layer is given twice; the part is not rated",
                                part=pid, layer=j + 1, code="layer-twice"))
        out.bad[p] = True
