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
    duty_source = []
    t_out = np.full(n, np.nan)
    for i in range(n):
        has_t, has_p = not math.isnan(torque[i]), not (math.isnan(power[i]) and math.isnan(speed[i]))
        if has_t:
            t_out[i] = torque[i] * sf[i]
            duty_source.append("torque")
            if has_p and math.isfinite(from_power[i]) and abs(from_power[i] - t_out[i]) > 0.01 * abs(t_out[i]):
                c = spot.column("torque")
                findings.append(Finding(
                    Severity.WARNING, grid.name, cell_ref(rows[i], c.index), f"part {ids[i]}: torque and "
                    f"power at speed are both given and disagree ({t_out[i]:.6g} N·m against "
                    f"{from_power[i]:.6g} N·m); the torque is used", part=ids[i]))
        elif has_p:
            duty_source.append("power")
            if math.isfinite(from_power[i]):
                t_out[i] = from_power[i]
            elif not error[i]:
                miss = "speed" if math.isnan(speed[i]) else "power" if math.isnan(power[i]) else "speed"
                c = spot.column(miss)
                why = "is missing" if math.isnan(vals(miss)[i]) else "must be above zero"
                findings.append(Finding(
                    Severity.ERROR, grid.name, cell_ref(rows[i], c.index) if c else None,
                    f"part {ids[i]}: the duty is a power at a speed but the {miss} {why}", part=ids[i]))
                error[i] = True
        else:
            duty_source.append("none")
            if not error[i]:
                c = spot.column("torque") or spot.column("power")
                findings.append(Finding(
                    Severity.ERROR, grid.name, cell_ref(rows[i], c.index) if c else None,
                    f"part {ids[i]}: no duty: give a torque, or a power and a speed", part=ids[i]))
                error[i] = True

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
    noted: set = set()
    cache: dict[str, tuple] = {}
    grids = {grid.name: grid}
    if layers_grid is not None:
        grids[layers_grid.name] = layers_grid
    for i in range(P):
        for j in range(L):
            if not present[i, j]:
                continue
            name = mats[i][j]
            if name is None:
                sheet, cell = layer_cells.get((i, j, "material"), (grid.name, None))
                src = grids.get(sheet)
                if cell is not None and src is not None and src.error_at(*parse_ref(cell)) is not None:
                    error[i] = True  # the error value is reported on its cell already
                    continue
                if cell is not None and src is not None and parse_ref(cell) in src.uncached:
                    findings.append(Finding(Severity.ERROR, sheet, cell,
                                            f"part {ids[i]}, layer {j + 1}: material: the cell's formula has no "
                                            "saved result (the book was written by a program that does not "
                                            "calculate): open and save it in Excel or LibreOffice, then run again",
                                            part=ids[i], layer=j + 1))
                    error[i] = True
                    continue
                findings.append(Finding(Severity.ERROR, sheet, cell,
                                        f"part {ids[i]}, layer {j + 1}: no material given", part=ids[i], layer=j + 1))
                error[i] = True
                continue
            got = cache.get(name)
            if got is None:
                got = cache[name] = materials.lookup(name)
            m, problem = got
            if m is None:
                sheet, cell = layer_cells.get((i, j, "material"), (grid.name, None))
                findings.append(Finding(Severity.ERROR, sheet, cell, f"part {ids[i]}, layer {j + 1}: {problem}",
                                        part=ids[i], layer=j + 1))
                error[i] = True
                continue
            g[i, j] = m.shear_modulus
            tau[i, j] = m.allowable_shear
            rule[i, j] = int(m.rule)
            if m.note and name not in noted:
                noted.add(name)
                sheet, cell = layer_cells.get((i, j, "material"), (grid.name, None))
                findings.append(Finding(Severity.WARNING, sheet, cell, f"part {ids[i]}, layer {j + 1}: {m.note}",
                                        part=ids[i], layer=j + 1))
            if m.keyway and kt[i, j] > 1.0 and ("kt", name) not in noted:
                noted.add(("kt", name))  # once per material: the first part that shows it
                sheet, cell = layer_cells.get((i, j, "kt"), (grid.name, None))
                findings.append(Finding(
                    Severity.WARNING, sheet, cell,
                    f"part {ids[i]}, layer {j + 1}: Kt {kt[i, j]:.3g} and the keyway factor 0.75 of material "
                    f"{name!r} are both applied (here and on every layer of that material with a Kt); the "
                    "shafting code's keyway factor already allows for a keyway, so if Kt describes the same "
                    "keyway it is counted twice (conservative)", part=ids[i], layer=j + 1))
    system = _system_of(spot, ("outer_diameter", "length", "torque"))
    if layers_spot is not None and system == "SI":
        system = _system_of(layers_spot, ("outer_diameter",))
    return PartsInput(
        grid.name, ids, rows, od, idd, g, tau, kt, present, t_out, length,
        vals("twist_limit_angle"), vals("twist_limit_per_length"), error, mats, duty_source,
        layer_cells, part_cells, system, rule,
    )


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
        for i in range(n):
            used = names[i] is not None or any(not got[k].empty[i] for k in got if k != "kt")
            if not used:
                k = got.get("kt")
                if k is not None and not k.empty[i]:
                    # templates often pre-fill Kt for every layer slot; a Kt alone is not a layer
                    findings.append(Finding(Severity.WARNING, *cells[(i, j, "kt")],
                                            f"part {ids[i]}, layer {layer}: Kt is given but the layer has no "
                                            "material and no diameters; the slot is ignored",
                                            part=ids[i], layer=layer))
                continue
            present[i, j] = True
            mats[i][j] = names[i]
            err = error_problem(grid, rows[i], mcol.index, "a material name") if mcol else None
            if err is not None:
                mats[i][j] = None
                findings.append(Finding(Severity.ERROR, *cells[(i, j, "material")],
                                        f"part {ids[i]}, layer {layer}: material: {err}", part=ids[i], layer=layer))
                bad[i] = True
            for key in _LAYER_KEYS:
                col = got.get(key)
                if col is not None and col.bad[i]:
                    bad[i] = True
            o = got.get("outer_diameter")
            if o is None or o.empty[i]:
                if not bad[i]:
                    findings.append(Finding(Severity.ERROR, *cells.get((i, j, "outer_diameter"), (grid.name, None)),
                                            f"part {ids[i]}, layer {layer}: outer diameter is missing",
                                            part=ids[i], layer=layer))
                bad[i] = True
            else:
                od[i, j] = o.values[i]
            inn = got.get("inner_diameter")
            if inn is None or inn.empty[i]:
                if layer == 1:
                    idd[i, j] = 0.0  # a blank bore on the innermost layer means a solid core
                else:
                    if not bad[i]:
                        findings.append(Finding(Severity.ERROR, *cells.get((i, j, "inner_diameter"), (grid.name, None)),
                                                f"part {ids[i]}, layer {layer}: inner diameter is missing; "
                                                f"expected the outer diameter of layer {layer - 1}",
                                                part=ids[i], layer=layer))
                    bad[i] = True
            else:
                idd[i, j] = inn.values[i]
            k = got.get("kt")
            if k is not None and not k.empty[i] and not k.bad[i]:
                kt[i, j] = k.values[i]
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

    def who(r: int) -> str:
        i = rows.index(r)
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
        for key, nc in got.items():
            cells[(p, j, key)] = (grid.name, cell_ref(r, spot.column(key).index))
            if nc.bad[i]:
                bad[p] = True
        o = got.get("outer_diameter")
        if o is None or o.empty[i]:
            if not bad[p]:
                findings.append(Finding(Severity.ERROR, *cells.get((p, j, "outer_diameter"), (grid.name, None)),
                                        f"part {pid}, layer {j + 1}: outer diameter is missing", part=pid, layer=j + 1))
            bad[p] = True
        else:
            od[p, j] = o.values[i]
        inn = got.get("inner_diameter")
        if inn is None or inn.empty[i]:
            if j == 0:
                idd[p, j] = 0.0
            else:
                if not bad[p]:
                    findings.append(Finding(Severity.ERROR, *cells.get((p, j, "inner_diameter"), (grid.name, None)),
                                            f"part {pid}, layer {j + 1}: inner diameter is missing", part=pid,
                                            layer=j + 1))
                bad[p] = True
        else:
            idd[p, j] = inn.values[i]
        k = got.get("kt")
        if k is not None and not k.empty[i] and not k.bad[i]:
            kt[p, j] = k.values[i]
    for p in range(n):
        if not present[p].any() and not bad[p]:
            findings.append(Finding(Severity.ERROR, None, None,
                                    f"part {ids[p]}: no layers in the {spot.sheet} table", part=ids[p]))
            bad[p] = True
    return od, idd, kt, present, mats, cells, bad
