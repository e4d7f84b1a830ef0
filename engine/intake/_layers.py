"""Layers of every part, in either layout: column groups on the part's row, or a row per layer.

Both layouts end in `place_layers`, so a missing diameter reads the same whichever way the
table is laid out. A layer's material cell holds a material name, or (written with its unit, or
under a ``G [GPa]`` header) the layer's own shear modulus; a layer's own allowable overrides its
material's.
"""

from __future__ import annotations

import re
from collections.abc import Callable, Hashable, Sequence
from dataclasses import dataclass, replace

import numpy as np
from twistshare.engine.units import UnitProblem, parse_value

from ._cellrefs import CellRefs
from ._columns import NumericColumn, error_problem, read_numeric, read_text
from ._grid import SheetGrid, cell_ref
from ._problems import Problem, Severity
from ._schema import LAYER_FIELDS, Column
from ._tables import TableSpot
from ._words import error_value_text, may_hold_error_values, where_text

__all__ = ["LayerArrays", "layers_from_groups", "layers_from_rows", "row_labels"]

_NUMERIC_KEYS = ("outer_diameter", "inner_diameter", "allowable_shear", "kt")
_MATERIAL = next(f for f in LAYER_FIELDS if f.key == "material")
# The material column read as a shear modulus (a G header, or a cell written with its unit).
_MODULUS = replace(_MATERIAL, kind="stress", description="shear modulus G")


@dataclass
class LayerArrays:
    """The layers of P parts in L slots, SI; NaN where not given, ``bad`` parts not to be rated."""

    outer_diameter: np.ndarray
    inner_diameter: np.ndarray
    kt: np.ndarray
    allowable_shear: np.ndarray  # the layer's own allowable (NaN: its material's)
    shear_modulus: np.ndarray    # the layer's own G (NaN: its material's)
    present: np.ndarray
    materials: np.ndarray  # (P, L) object: each layer's material name, None where none
    cells: CellRefs
    bad: np.ndarray
    # For each data row of a row-per-layer table: the part and slot it became (-1: none).
    source_part: np.ndarray | None = None
    source_slot: np.ndarray | None = None

    @classmethod
    def empty(cls, n: int, n_layers: int, cells: CellRefs) -> LayerArrays:
        shape = (n, max(n_layers, 1))
        return cls(np.full(shape, np.nan), np.full(shape, np.nan), np.ones(shape), np.full(shape, np.nan),
                   np.full(shape, np.nan), np.zeros(shape, bool), np.full(shape, None, dtype=object),
                   cells, np.zeros(n, bool))


def row_position(rows: Sequence[int]) -> Callable[[int], int | None]:
    """``position(row)``: where a sheet row sits in `rows` (None if absent). The index is built
    on the first question, so a long table with nothing to report never pays for it."""
    index: dict[int, int] = {}

    def position(r: int) -> int | None:
        if not index and rows:
            index.update(zip(rows, range(len(rows))))
        return index.get(r)

    return position


def row_labels(ids: list[str | None], rows: list[int], layer: int | None = None):
    """``who(row)`` naming the part (and layer) of a table row, with a ``tag`` for problems."""
    index = row_position(rows)

    def who(r: int) -> str:
        i = index(r)
        pid = ids[i] if i is not None else None
        base = where_text(pid) if pid else f"row {r + 1}"
        return f"{base}, layer {layer}" if layer else base

    def tag(r: int) -> tuple[str | None, int | None]:
        i = index(r)
        return (ids[i] if i is not None else None), layer

    who.tag = tag  # lets the column reader tie each problem to its part and layer
    return who


_NUMBER_START = re.compile(r"\n[0-9+\-.]")


def _material_column(grid: SheetGrid, column: Column, rows: list[int], who, findings: list[Problem],
                     header_row: int, seen: set) -> tuple[list[str | None], np.ndarray, np.ndarray]:
    """Names, the layer's own G (NaN where a name is given) and bad marks of a material column."""
    n = len(rows)
    if column.unit is not None:
        moduli = read_numeric(grid, replace(column, field=_MODULUS), rows, who, findings, header_row, seen)
        return [None] * n, moduli.values, moduli.bad
    names = read_text(grid, column.index, rows)
    modulus = np.full(n, np.nan)
    bad = np.zeros(n, bool)
    tag = who.tag
    if not _NUMBER_START.search("\n" + "\n".join(filter(None, names))):
        return names, modulus, bad  # names only (no text starts like a number): the common case
    for i, text in enumerate(names):
        if text is None or not (text[:1].isdigit() or text[:1] in "+-." and text[1:2].isdigit()):
            continue
        # Text that reads as a stress with its unit ("79 GPa") is the layer's modulus; anything
        # else ("1045", "42") is a material name.
        try:
            value = parse_value(text, "stress")
        except UnitProblem:
            continue
        r = rows[i]
        names[i] = None
        low, high = _MODULUS.plausible.low, _MODULUS.plausible.high
        if not low <= value <= high:
            bad[i] = True
            findings.append(Problem(Severity.ERROR, grid.name, cell_ref(r, column.index),
                                    f"{who(r)}: shear modulus G: {text!r} is outside the plausible range "
                                    f"{low / 1e9:g} to {high / 1e9:g} GPa (common practice); check the unit",
                                    *tag(r), code="plausible", values=(text,)))
            continue
        modulus[i] = value
    return names, modulus, bad


def place_layers(got: dict[str, NumericColumn], src: np.ndarray, p: np.ndarray, j: np.ndarray,
                 ids: list[str], arrays: LayerArrays, sheet: str, findings: list[Problem]) -> None:
    """Put layers' values into the part arrays: column row ``src[k]`` -> part ``p[k]``, slot ``j[k]``.

    Later entries see the ``bad`` marks of earlier steps, as a reader would: one message per part
    and cause.
    """
    a = arrays
    if not len(src):
        return
    for col in got.values():
        a.bad[p[col.bad[src]]] = True

    def report(mask: np.ndarray, what: str, key: str, extra) -> None:
        for k in np.flatnonzero(mask & ~a.bad[p]):
            i, jj = int(p[k]), int(j[k])
            findings.append(Problem(Severity.ERROR, *a.cells.get((i, jj, key), (sheet, None)),
                                    f"{where_text(ids[i], jj + 1)}: {what} is missing{extra(jj)}",
                                    part=ids[i], layer=jj + 1, code="missing"))

    o = got.get("outer_diameter")
    missing = o.empty[src] if o is not None else np.ones(len(src), bool)
    report(missing, "outer diameter", "outer_diameter", lambda jj: "")
    a.bad[p[missing]] = True
    if o is not None:
        a.outer_diameter[p[~missing], j[~missing]] = o.values[src[~missing]]
    inn = got.get("inner_diameter")
    missing = inn.empty[src] if inn is not None else np.ones(len(src), bool)
    solid = missing & (j == 0)  # a blank bore on the innermost layer means a solid core
    a.inner_diameter[p[solid], j[solid]] = 0.0
    missing &= j > 0
    report(missing, "inner diameter", "inner_diameter", lambda jj: f"; expected the outer diameter of layer {jj}")
    a.bad[p[missing]] = True
    if inn is not None:
        given = ~inn.empty[src]
        a.inner_diameter[p[given], j[given]] = inn.values[src[given]]
    for key, target in (("kt", a.kt), ("allowable_shear", a.allowable_shear)):
        col = got.get(key)
        if col is not None:
            take = ~col.empty[src] & ~col.bad[src]
            target[p[take], j[take]] = col.values[src[take]]


def layers_from_groups(grid: SheetGrid, spot: TableSpot, rows: list[int], ids: list[str],
                       findings: list[Problem], header_seen: set) -> LayerArrays:
    """Layers from ``Layer n ...`` column groups on each part's row."""
    numbers = spot.layer_numbers
    n = len(rows)
    cells = CellRefs(grid.name, rows)
    out = LayerArrays.empty(n, max(numbers) if numbers else 0, cells)
    if not numbers:
        findings.append(Problem(Severity.ERROR, grid.name, cell_ref(spot.header_row, 0),
                                "the parts table has no layer columns: expected 'Layer 1 material', "
                                "'Layer 1 outer diameter [mm]', 'Layer 1 inner diameter [mm]', ...",
                                code="no-layers"))
        out.bad[:] = True
        return out
    for layer in numbers:
        j = layer - 1
        who = row_labels(ids, rows, layer)
        got: dict[str, NumericColumn] = {}
        for key in _NUMERIC_KEYS:
            col = spot.column(key, layer)
            if col is None:
                continue
            got[key] = read_numeric(grid, col, rows, who, findings, spot.header_row, header_seen)
            cells.column((j, key), col.index)
        mcol = spot.column("material", layer)
        if mcol is not None:
            names, modulus, mbad = _material_column(grid, mcol, rows, who, findings, spot.header_row, header_seen)
            cells.column((j, "material"), mcol.index)
        else:
            names, modulus, mbad = [None] * n, np.full(n, np.nan), np.zeros(n, bool)
        # Whole columns at once; problems only for the rows that need one.
        used = np.fromiter((x is not None for x in names), bool, n) | ~np.isnan(modulus) | mbad
        for key, col in got.items():
            if key != "kt":
                used |= ~col.empty
        k = got.get("kt")
        if k is not None:
            # templates often pre-fill Kt for every layer slot; a Kt alone is not a layer
            for i in np.flatnonzero(~used & ~k.empty):
                findings.append(Problem(Severity.WARNING, *cells[(i, j, "kt")],
                                        f"part {ids[i]}, layer {layer}: Kt is given but the layer has no "
                                        "material and no diameters; the slot is ignored", part=ids[i], layer=layer,
                                        code="stray-kt"))
        out.present[:, j] = used
        out.bad |= mbad
        out.shear_modulus[:, j] = modulus
        out.materials[used, j] = np.array(names, dtype=object)[used]
        if mcol is not None:
            for i in np.flatnonzero(used).tolist():
                if not (grid.errors or (names[i] is not None and names[i][:1] in "#Ee")):
                    continue
                err = error_problem(grid, rows[i], mcol.index, "a material name")
                if err is not None:
                    out.materials[i, j] = None
                    findings.append(Problem(Severity.ERROR, *cells[(i, j, "material")],
                                            f"part {ids[i]}, layer {layer}: material: {err}", part=ids[i],
                                            layer=layer, code="error-value"))
                    out.bad[i] = True
        rows_used = np.flatnonzero(used)
        place_layers(got, rows_used, rows_used, np.full(len(rows_used), j), ids, out, grid.name, findings)
    return out


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
    keys = read_text(grid, pcol.index, rows)
    if None not in keys and not grid.errors and not may_hold_error_values(keys):
        return keys, [False] * len(rows)  # every row names its part
    out: list[str | None] = []
    errors: list[bool] = []
    above: str | None = None
    for r, key in zip(rows, keys):
        if (key is not None and key[:1] in "#Ee" and error_value_text(key)) or (grid.errors and grid.error_at(
                r, pcol.index)):
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


def first_seen_index(keys: Sequence[Hashable]) -> tuple[list, np.ndarray]:
    """The distinct keys in order of first appearance, and each key's position among them."""
    position = {key: i for i, key in enumerate(dict.fromkeys(keys))}
    return list(position), np.fromiter(map(position.__getitem__, keys), np.intp, len(keys))


def part_positions(keys: list[str | None]) -> tuple[list[str], np.ndarray]:
    """The parts a row-per-layer table names, in order of appearance, and each row's position
    among them (-2 where the row names none)."""
    ids, group = first_seen_index(keys)
    if None in ids:
        missing = ids.index(None)
        del ids[missing]
        group = np.where(group == missing, -2, group - (group > missing))
    return ids, group


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
        names, modulus, mbad = _material_column(grid, mcol, rows, who, findings, spot.header_row, header_seen)
    else:
        names, modulus, mbad = [None] * n_rows, np.full(n_rows, np.nan), np.zeros(n_rows, bool)

    slot = numbers - 1
    error_row = np.fromiter(key_errors, bool, n_rows)
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
    name_array = np.array(names, dtype=object)
    out.materials[p, j] = name_array[src]
    rowmap = np.full(out.present.shape, -1, dtype=np.intp)
    rowmap[p, j] = np.asarray(rows, dtype=np.intp)[src]
    out.cells.by_layer(rowmap, {key: c.index for key in (*_NUMERIC_KEYS, "material")
                                if (c := spot.column(key)) is not None})
    if mcol is not None and (grid.errors or may_hold_error_values(names)):
        for i, pi, ji in zip(src.tolist(), p.tolist(), j.tolist()):
            err = error_problem(grid, rows[i], mcol.index, "a material name")
            if err is not None:
                out.materials[pi, ji] = None
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
