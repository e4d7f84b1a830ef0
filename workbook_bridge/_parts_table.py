"""The book's parts: one row per part with layer column groups, or one row per layer.

The result is the engine's input as arrays, plus, for every part and layer, the cells each value
came from so that every message can name its cell.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from twistshare.engine.core import torque_from_power
from twistshare.engine.units import unit_system

from ._column_values import NumericColumn, error_problem, read_numeric, read_text
from ._findings import Finding, Severity
from ._grid import SheetGrid, cell_ref, parse_ref
from ._materials_table import MaterialSet
from ._tables import TableSpot

__all__ = ["PartsInput", "read_parts"]

_LAYER_KEYS = ("outer_diameter", "inner_diameter", "kt")


@dataclass
class PartsInput:
    """Engine-ready arrays for every part, and where each input came from."""

    sheet: str
    ids: list[str]
    rows: list[int]  # zero-based row of each part in the parts sheet
    outer_diameter: np.ndarray  # (P, L) m
    inner_diameter: np.ndarray
    shear_modulus: np.ndarray  # Pa
    allowable_shear: np.ndarray  # Pa
    kt: np.ndarray
    present: np.ndarray  # (P, L) bool
    torque: np.ndarray  # (P,) N·m, service factor applied
    length: np.ndarray
    twist_limit_angle: np.ndarray
    twist_limit_per_length: np.ndarray
    input_error: np.ndarray  # (P,) bool: an input cell made the part unratable
    materials: list[list[str | None]]
    duty_source: list[str]  # "torque" or "power"
    layer_cells: "CellRefs" = None  # (part, layer, field) -> (sheet, A1)
    part_cells: "CellRefs" = None  # (part, field) -> (sheet, A1)
    system: str = "SI"
    allowable_rule: np.ndarray | None = None  # (P, L) AllowableRule codes

    @property
    def count(self) -> int:
        return len(self.ids)


class CellRefs:
    """Where each input came from, (part index, ..., field) -> (sheet, A1), worked out on request.

    A whole column is registered once (``column``); single cells (the one-row-per-layer layout)
    are set like a dict. A 50 000-part book would otherwise build a million references that
    only the few bad parts ever need.
    """

    def __init__(self, sheet: str, rows: list[int]) -> None:
        self._sheet, self._rows = sheet, rows
        self._columns: dict[tuple, int] = {}
        self._cells: dict[tuple, tuple[str, str]] = {}

    def column(self, key: tuple, col: int) -> None:
        self._columns[key] = col

    def __setitem__(self, key: tuple, value: tuple[str, str]) -> None:
        self._cells[key] = value

    def get(self, key: tuple, default=None):
        got = self._cells.get(key)
        if got is not None:
            return got
        col = self._columns.get(key[1:])
        if col is None:
            return default
        return self._sheet, cell_ref(self._rows[key[0]], col)

    def __getitem__(self, key: tuple) -> tuple[str, str]:
        got = self.get(key)
        if got is None:
            raise KeyError(key)
        return got


def _who(ids: list[str | None], rows: list[int], layer: int | None = None):
    index = {r: i for i, r in enumerate(rows)}

    def who(r: int) -> str:
        i = index.get(r)
        pid = ids[i] if i is not None else None
        base = f"part {pid}" if pid else f"row {r + 1}"
        return f"{base}, layer {layer}" if layer else base

    def tag(r: int) -> tuple[str | None, int | None]:
        i = index.get(r)
        return (ids[i] if i is not None else None), layer

    who.tag = tag  # lets the column reader tie each finding to its part and layer
    return who


def _system_of(spot: TableSpot, keys: tuple[str, ...]) -> str:
    for k in keys:
        for c in spot.columns:
            if c.field.key == k and c.unit:
                try:
                    return unit_system(c.unit)
                except Exception:  # an unparseable header is reported elsewhere
                    continue
    return "SI"


def read_parts(
    grid: SheetGrid,
    spot: TableSpot,
    materials: MaterialSet,
    findings: list[Finding],
    layers_grid: SheetGrid | None = None,
    layers_spot: TableSpot | None = None,
) -> PartsInput:
    """Read the parts table (and the per-layer table, if the book uses that layout)."""
    rows = list(spot.data_rows)
    pid_col = spot.column("part")
    assert pid_col is not None
    raw_ids = read_text(grid, pid_col.index, rows)
    n = len(rows)
    error = np.zeros(n, dtype=bool)
    header_seen: set[tuple[str, int]] = set()
    ids: list[str] = []
    where: dict[str, list[int]] = {}
    for i, (r, pid) in enumerate(zip(rows, raw_ids)):
        err = error_problem(grid, r, pid_col.index, "a part id")
        if pid is None or err is not None:
            pid = f"(row {r + 1})"
            error[i] = True
            why = f"the part id: {err}" if err else "the part has no id"
            findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, pid_col.index),
                                    f"row {r + 1}: {why}; it is not rated"))
        else:
            where.setdefault(pid, []).append(i)
        ids.append(pid)
    # An id on two rows names two different shafts: rating either would put a number beside an
    # id that a reader could look up on the other row, so neither is rated.
    for pid, idx in where.items():
        if len(idx) < 2:
            continue
        for i in idx:
            error[i] = True
            others = ", ".join(str(rows[k] + 1) for k in idx if k != i)
            findings.append(Finding(Severity.ERROR, grid.name, cell_ref(rows[i], pid_col.index),
                                    f"part {pid}: the id is also on row {others}; neither row is rated "
                                    "until each part has its own id", part=pid))
    who = _who(ids, rows)

    def num(key: str) -> NumericColumn | None:
        col = spot.column(key)
        if col is None:
            return None
        nc = read_numeric(grid, col, rows, who, findings, spot.header_row, header_seen)
        return nc

    part_cells = CellRefs(grid.name, rows)
    cols = {}
    for key in ("length", "torque", "power", "speed", "service_factor", "twist_limit_angle",
                "twist_limit_per_length"):
        nc = num(key)
        cols[key] = nc
        if nc is not None:
            error |= nc.bad
            part_cells.column((key,), spot.column(key).index)

    def vals(key: str) -> np.ndarray:
        nc = cols.get(key)
        return np.full(n, np.nan) if nc is None else nc.values

    length = vals("length")
    missing_length = np.isnan(length) & ~error
    for i in np.flatnonzero(missing_length):
        c = spot.column("length")
        findings.append(Finding(Severity.ERROR, grid.name, cell_ref(rows[i], c.index) if c else None,
                                f"part {ids[i]}: length is missing; expected a length such as '450 mm'",
                                part=ids[i]))
    error |= missing_length
    sf = vals("service_factor")
    sf = np.where(np.isnan(sf), 1.0, sf)
    torque = vals("torque")
    power, speed = vals("power"), vals("speed")
    from_power = np.asarray(torque_from_power(power, speed, sf), dtype=float)
    has_t = ~np.isnan(torque)
    has_p = ~has_t & ~(np.isnan(power) & np.isnan(speed))
    t_out = np.where(has_t, torque * sf, np.where(has_p, from_power, np.nan))
    duty_source = np.where(has_t, "torque", np.where(has_p, "power", "none")).tolist()
    with np.errstate(invalid="ignore"):
        disagree = has_t & ~np.isnan(power) & np.isfinite(from_power) & (np.abs(from_power - t_out) > 0.01 * np.abs(t_out))
    tcol = spot.column("torque")
    for i in np.flatnonzero(disagree):
        findings.append(Finding(
            Severity.WARNING, grid.name, cell_ref(rows[i], tcol.index), f"part {ids[i]}: torque and "
            f"power at speed are both given and disagree ({t_out[i]:.6g} N·m against "
            f"{from_power[i]:.6g} N·m); the torque is used", part=ids[i]))
    for i in np.flatnonzero(has_p & ~np.isfinite(from_power) & ~error):
        miss = "power" if math.isnan(power[i]) and not math.isnan(speed[i]) else "speed"
        c = spot.column(miss)
        why = "is missing" if math.isnan(vals(miss)[i]) else "must be above zero"
        findings.append(Finding(
            Severity.ERROR, grid.name, cell_ref(rows[i], c.index) if c else None,
            f"part {ids[i]}: the duty is a power at a speed but the {miss} {why}", part=ids[i]))
        error[i] = True
    no_duty = ~has_t & ~has_p & ~error
    c = spot.column("torque") or spot.column("power")
    for i in np.flatnonzero(no_duty):
        findings.append(Finding(
            Severity.ERROR, grid.name, cell_ref(rows[i], c.index) if c else None,
            f"part {ids[i]}: no duty: give a torque, or a power and a speed", part=ids[i]))
    error |= no_duty

    if layers_grid is not None and layers_spot is not None:
        lay = _layers_from_rows(layers_grid, layers_spot, ids, findings)
    else:
        lay = _layers_from_groups(grid, spot, rows, ids, findings, header_seen)
    od, idd, kt, present, mats, layer_cells, layer_bad = lay
    error |= layer_bad
    P, L = od.shape
    g = np.full((P, L), np.nan)
    tau = np.full((P, L), np.nan)
    rule = np.zeros((P, L), dtype=np.int8)  # AllowableRule per layer; travels with the rating
    grids = {grid.name: grid}
    if layers_grid is not None:
        grids[layers_grid.name] = layers_grid
    where_i, where_j = np.nonzero(present)
    named_i, named_j, named = [], [], []
    for i, j in zip(where_i.tolist(), where_j.tolist()):
        name = mats[i][j]
        if name is not None:
            named_i.append(i)
            named_j.append(j)
            named.append(name)
            continue
        sheet, cell = layer_cells.get((i, j, "material"), (grid.name, None))
        src = grids.get(sheet)
        error[i] = True
        if cell is not None and src is not None and src.error_at(*parse_ref(cell)) is not None:
            continue  # the error value is reported on its cell already
        if cell is not None and src is not None and parse_ref(cell) in src.uncached:
            findings.append(Finding(Severity.ERROR, sheet, cell,
                                    f"part {ids[i]}, layer {j + 1}: material: the cell's formula has no "
                                    "saved result (the book was written by a program that does not "
                                    "calculate): open and save it in Excel or LibreOffice, then run again",
                                    part=ids[i], layer=j + 1))
            continue
        findings.append(Finding(Severity.ERROR, sheet, cell,
                                f"part {ids[i]}, layer {j + 1}: no material given", part=ids[i], layer=j + 1))
    if named:
        # Each distinct name is looked up once; the arrays are filled through the inverse index.
        unique, first, inverse = np.unique(np.array(named, dtype=object), return_index=True, return_inverse=True)
        found = [materials.lookup(str(name)) for name in unique]
        ni, nj = np.array(named_i), np.array(named_j)
        ok = np.array([m is not None for m, _ in found])[inverse]

        def pick(attr: str) -> np.ndarray:
            return np.array([getattr(m, attr) if m is not None else np.nan for m, _ in found])

        g[ni[ok], nj[ok]] = pick("shear_modulus")[inverse][ok]
        tau[ni[ok], nj[ok]] = pick("allowable_shear")[inverse][ok]
        rule[ni[ok], nj[ok]] = np.array([int(m.rule) if m is not None else 0 for m, _ in found])[inverse][ok]
        for k in np.flatnonzero(~ok):
            i, j = int(ni[k]), int(nj[k])
            sheet, cell = layer_cells.get((i, j, "material"), (grid.name, None))
            findings.append(Finding(Severity.ERROR, sheet, cell,
                                    f"part {ids[i]}, layer {j + 1}: {found[inverse[k]][1]}", part=ids[i], layer=j + 1))
            error[i] = True
        for u, (m, _) in enumerate(found):
            if m is None:
                continue
            if m.note:  # once per material, where it is first used
                i, j = int(ni[first[u]]), int(nj[first[u]])
                sheet, cell = layer_cells.get((i, j, "material"), (grid.name, None))
                findings.append(Finding(Severity.WARNING, sheet, cell, f"part {ids[i]}, layer {j + 1}: {m.note}",
                                        part=ids[i], layer=j + 1))
            with_kt = np.flatnonzero((inverse == u) & (kt[ni, nj] > 1.0)) if m.keyway else ()
            if len(with_kt):  # once per material: the first part that shows it
                i, j = int(ni[with_kt[0]]), int(nj[with_kt[0]])
                sheet, cell = layer_cells.get((i, j, "kt"), (grid.name, None))
                findings.append(Finding(
                    Severity.WARNING, sheet, cell,
                    f"part {ids[i]}, layer {j + 1}: Kt {kt[i, j]:.3g} and the keyway factor 0.75 of material "
                    f"{unique[u]!r} are both applied (here and on every layer of that material "
                    "with a Kt); the shafting code's keyway factor already allows for a keyway, so if Kt describes "
                    "the same keyway it is counted twice (conservative)", part=ids[i], layer=j + 1))
    system = _system_of(spot, ("outer_diameter", "length", "torque"))
    if layers_spot is not None and system == "SI":
        system = _system_of(layers_spot, ("outer_diameter",))
    return PartsInput(
        grid.name, ids, rows, od, idd, g, tau, kt, present, t_out, length,
        vals("twist_limit_angle"), vals("twist_limit_per_length"), error, mats, duty_source,
        layer_cells, part_cells, system, rule,
    )


def _place_layers(got: dict[str, NumericColumn], src: np.ndarray, p: np.ndarray, j: np.ndarray,
                  ids: list[str], cells: CellRefs, sheet: str, arrays: tuple[np.ndarray, ...],
                  findings: list[Finding]) -> None:
    """Put layers' diameters and Kt into the part arrays: column row ``src[k]`` -> part ``p[k]``, slot ``j[k]``.

    Both layouts end here (a layer group column by column, or the one-row-per-layer table in one
    go), so a missing diameter reads the same whichever way the book is laid out. Later entries
    see the ``bad`` marks of earlier steps, as a reader would: one message per part and cause.
    """
    od, idd, kt, bad = arrays
    if not len(src):
        return
    for col in got.values():
        bad[p[col.bad[src]]] = True

    def report(mask: np.ndarray, what: str, key: str, extra) -> None:
        for k in np.flatnonzero(mask & ~bad[p]):
            i, jj = int(p[k]), int(j[k])
            findings.append(Finding(Severity.ERROR, *cells.get((i, jj, key), (sheet, None)),
                                    f"part {ids[i]}, layer {jj + 1}: {what} is missing{extra(jj)}",
                                    part=ids[i], layer=jj + 1))

    o = got.get("outer_diameter")
    missing = o.empty[src] if o is not None else np.ones(len(src), bool)
    report(missing, "outer diameter", "outer_diameter", lambda jj: "")
    bad[p[missing]] = True
    if o is not None:
        od[p[~missing], j[~missing]] = o.values[src[~missing]]
    inn = got.get("inner_diameter")
    missing = inn.empty[src] if inn is not None else np.ones(len(src), bool)
    solid = missing & (j == 0)  # a blank bore on the innermost layer means a solid core
    idd[p[solid], j[solid]] = 0.0
    missing &= j > 0
    report(missing, "inner diameter", "inner_diameter", lambda jj: f"; expected the outer diameter of layer {jj}")
    bad[p[missing]] = True
    if inn is not None:
        given = ~inn.empty[src]
        idd[p[given], j[given]] = inn.values[src[given]]
    k = got.get("kt")
    if k is not None:
        take = ~k.empty[src] & ~k.bad[src]
        kt[p[take], j[take]] = k.values[src[take]]


def _layers_from_groups(grid, spot, rows, ids, findings, header_seen):
    numbers = spot.layer_numbers
    n = len(rows)
    L = max(numbers) if numbers else 0
    od = np.full((n, max(L, 1)), np.nan)
    idd = np.full_like(od, np.nan)
    kt = np.ones_like(od)
    present = np.zeros(od.shape, dtype=bool)
    bad = np.zeros(n, dtype=bool)
    mats: list[list[str | None]] = [[None] * max(L, 1) for _ in range(n)]
    cells = CellRefs(grid.name, rows)
    if not numbers:
        findings.append(Finding(Severity.ERROR, grid.name, cell_ref(spot.header_row, 0),
                                "the parts table has no layer columns: expected 'Layer 1 material', "
                                "'Layer 1 outer diameter [mm]', 'Layer 1 inner diameter [mm]', ..."))
        bad[:] = True
        return od, idd, kt, present, mats, cells, bad
    for layer in numbers:
        j = layer - 1
        who = _who(ids, rows, layer)
        got: dict[str, NumericColumn] = {}
        for key in _LAYER_KEYS:
            col = spot.column(key, layer)
            if col is None:
                continue
            got[key] = read_numeric(grid, col, rows, who, findings, spot.header_row, header_seen)
            cells.column((j, key), col.index)
        mcol = spot.column("material", layer)
        names = read_text(grid, mcol.index, rows) if mcol else [None] * n
        if mcol:
            cells.column((j, "material"), mcol.index)
        # Whole columns at once; findings only for the rows that need one.
        named = np.fromiter((x is not None for x in names), bool, n)
        used = named.copy()
        for key, col in got.items():
            if key != "kt":
                used |= ~col.empty
        k = got.get("kt")
        if k is not None:
            # templates often pre-fill Kt for every layer slot; a Kt alone is not a layer
            for i in np.flatnonzero(~used & ~k.empty):
                findings.append(Finding(Severity.WARNING, *cells[(i, j, "kt")],
                                        f"part {ids[i]}, layer {layer}: Kt is given but the layer has no "
                                        "material and no diameters; the slot is ignored", part=ids[i], layer=layer))
        present[:, j] = used
        for i in np.flatnonzero(named).tolist():
            mats[i][j] = names[i]
        if mcol is not None and grid.errors:
            for i in np.flatnonzero(used).tolist():
                err = error_problem(grid, rows[i], mcol.index, "a material name")
                if err is not None:
                    mats[i][j] = None
                    findings.append(Finding(Severity.ERROR, *cells[(i, j, "material")],
                                            f"part {ids[i]}, layer {layer}: material: {err}", part=ids[i],
                                            layer=layer))
                    bad[i] = True
        rows_used = np.flatnonzero(used)
        _place_layers(got, rows_used, rows_used, np.full(len(rows_used), j), ids, cells, grid.name,
                      (od, idd, kt, bad), findings)
    return od, idd, kt, present, mats, cells, bad


def _layers_from_rows(grid: SheetGrid, spot: TableSpot, ids: list[str], findings: list[Finding]):
    rows = list(spot.data_rows)
    pcol, lcol = spot.column("part"), spot.column("layer")
    keys = read_text(grid, pcol.index, rows)
    header_seen: set[tuple[str, int]] = set()
    index = {pid: i for i, pid in enumerate(ids)}
    layer_no: list[int | None] = []
    who_basic = _who(keys, rows)
    lay_nc = read_numeric(grid, lcol, rows, who_basic, findings, spot.header_row, header_seen) if lcol else None
    for i, r in enumerate(rows):
        v = lay_nc.values[i] if lay_nc is not None else math.nan
        if math.isfinite(v) and v >= 1 and float(v).is_integer():
            layer_no.append(int(v))
        else:
            layer_no.append(None)
    L = max([x for x in layer_no if x] or [1])
    n = len(ids)
    od = np.full((n, L), np.nan)
    idd = np.full_like(od, np.nan)
    kt = np.ones_like(od)
    present = np.zeros(od.shape, dtype=bool)
    bad = np.zeros(n, dtype=bool)
    mats: list[list[str | None]] = [[None] * L for _ in range(n)]
    cells = CellRefs(grid.name, rows)  # each layer has its own row: references set one by one
    placed: list[tuple[int, int, int]] = []  # (row in this table, part, slot)

    row_index = {r: i for i, r in enumerate(rows)}

    def who(r: int) -> str:
        i = row_index[r]
        return f"part {keys[i]}, layer {layer_no[i]}" if layer_no[i] else f"part {keys[i]}"

    got = {key: read_numeric(grid, c, rows, who, findings, spot.header_row, header_seen)
           for key in _LAYER_KEYS if (c := spot.column(key)) is not None}
    mcol = spot.column("material")
    names = read_text(grid, mcol.index, rows) if mcol else [None] * len(rows)
    for i, r in enumerate(rows):
        pid = keys[i]
        err = error_problem(grid, r, pcol.index, "a part id")
        if err is not None:
            findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, pcol.index),
                                    f"{spot.sheet} row {r + 1}: the part id: {err}; the layer is ignored"))
            continue
        if pid is None:
            findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, pcol.index),
                                    f"{spot.sheet} row {r + 1}: the layer names no part; the row is ignored"))
            continue
        p = index.get(pid)
        if p is None:
            findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, pcol.index),
                                    f"{spot.sheet} row {r + 1}: part {pid} is not in the parts table; "
                                    "the layer is ignored"))
            continue
        j = layer_no[i]
        if j is None:
            if lay_nc is None or not lay_nc.bad[i]:
                findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, lcol.index) if lcol else None,
                                        f"part {pid}: layer number must be a whole number from 1 (innermost)",
                                        part=pid))
            bad[p] = True
            continue
        j -= 1
        if present[p, j]:
            findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, lcol.index),
                                    f"part {pid}, layer {j + 1}: the layer is given twice; the part is not rated",
                                    part=pid, layer=j + 1))
            bad[p] = True
            continue
        present[p, j] = True
        mats[p][j] = names[i]
        if mcol:
            cells[(p, j, "material")] = (grid.name, cell_ref(r, mcol.index))
            err = error_problem(grid, r, mcol.index, "a material name")
            if err is not None:
                mats[p][j] = None
                findings.append(Finding(Severity.ERROR, grid.name, cell_ref(r, mcol.index),
                                        f"part {pid}, layer {j + 1}: material: {err}", part=pid, layer=j + 1))
                bad[p] = True
        for key in got:
            cells[(p, j, key)] = (grid.name, cell_ref(r, spot.column(key).index))
        placed.append((i, p, j))
    if placed:
        src, part, slot = (np.array(x) for x in zip(*placed))
        _place_layers(got, src, part, slot, ids, cells, grid.name, (od, idd, kt, bad), findings)
    for p in range(n):
        if not present[p].any() and not bad[p]:
            findings.append(Finding(Severity.ERROR, None, None,
                                    f"part {ids[p]}: no layers in the {spot.sheet} table", part=ids[p]))
            bad[p] = True
    return od, idd, kt, present, mats, cells, bad
