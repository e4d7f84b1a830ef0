"""The parts: ids, duty and layers in engine arrays, with the cell of every input.

One reader for both layouts (a row per part with ``Layer n ...`` column groups, or a row per
layer) and for both front ends: a workbook's tables, and a cell function's block read as a
small table. Materials are looked up once per distinct name.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from twistshare.engine.core import Duty, LayerStack
from twistshare.engine.units import unit_system

from ._cellrefs import CellRefs
from ._columns import error_problem, first_seen_index, read_text
from ._duty import DutyColumns, read_duty
from ._grid import SheetGrid, cell_ref, parse_ref
from ._interface_inputs import read_interface_inputs
from ._layer_rows import layers_from_rows, part_keys, part_rows
from ._layers import LayerArrays, layers_from_groups, row_labels
from ._loads import LAYER_PROPERTY_KEYS, LoadColumns, load_problems, read_loads
from ._materials import MaterialSet
from ._problems import Problem, Severity
from ._tables import TableSpot
from ._words import where_text

__all__ = ["PartsInput", "read_parts", "read_layer_table_parts"]


@dataclass
class PartsInput:
    """Engine-ready arrays for every part, and where each input came from."""

    sheet: str
    ids: list[str]
    rows: list[int]  # zero-based row of each part in its table
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
    materials: np.ndarray  # (P, L) object: each layer's material name, None where none
    duty_source: list[str]  # "torque", "power" or "none"
    layer_cells: CellRefs | None = None  # (part, layer, field) -> (sheet, A1)
    part_cells: CellRefs | None = None  # (part, field) -> (sheet, A1)
    system: str = "SI"
    allowable_rule: np.ndarray | None = None  # (P, L) AllowableRule codes
    # A row-per-layer table's data rows: the part and slot each became (-1: none).
    source_part: np.ndarray | None = None
    source_slot: np.ndarray | None = None
    # Further inputs of the criteria beyond torsion, by the keys `rate(..., inputs=)` takes.
    inputs: dict[str, np.ndarray] = field(default_factory=dict)

    @property
    def count(self) -> int:
        """Number of parts."""
        return len(self.ids)

    def stack(self) -> LayerStack:
        """The layers as the engine core takes them (unusable parts keep NaNs; shapes stay whole)."""
        return LayerStack(outer_diameter=self.outer_diameter, inner_diameter=self.inner_diameter,
                          shear_modulus=self.shear_modulus, allowable_shear=self.allowable_shear,
                          stress_concentration=self.kt, present=self.present,
                          allowable_rule=self.allowable_rule)

    def duty(self) -> Duty:
        """The duty as the engine core takes it."""
        return Duty(torque=self.torque, length=self.length, twist_limit_angle=self.twist_limit_angle,
                    twist_limit_per_length=self.twist_limit_per_length)


def _system_of(spot: TableSpot | None, keys: tuple[str, ...]) -> str:
    if spot is None:
        return "SI"
    for k in keys:
        for c in spot.columns:
            if c.field.key == k and c.unit:
                try:
                    return unit_system(c.unit)
                except ValueError:  # an unparseable header is reported elsewhere
                    continue
    return "SI"


def _part_ids(grid: SheetGrid, spot: TableSpot, rows: list[int], findings: list[Problem]
              ) -> tuple[list[str], np.ndarray]:
    """Each row's part id (or ``row N`` without a Part column); duplicates and blanks refused."""
    n = len(rows)
    error = np.zeros(n, dtype=bool)
    pid_col = spot.column("part")
    if pid_col is None:  # a block without a Part column: its rows name the parts
        return [f"row {r + 1}" for r in rows], error
    raw_ids = read_text(grid, pid_col.index, rows)
    ids: list[str] = []
    where: dict[str, list[int]] = {}
    for i, (r, pid) in enumerate(zip(rows, raw_ids)):
        err = error_problem(grid, r, pid_col.index, "a part id")
        if pid is None or err is not None:
            pid = f"(row {r + 1})"
            error[i] = True
            why = f"the part id: {err}" if err else "the part has no id"
            findings.append(Problem(Severity.ERROR, grid.name, cell_ref(r, pid_col.index),
                                    f"row {r + 1}: {why}; it is not rated", code="part-id"))
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
            findings.append(Problem(Severity.ERROR, grid.name, cell_ref(rows[i], pid_col.index),
                                    f"part {pid}: the id is also on row {others}; neither row is rated "
                                    "until each part has its own id", part=pid, code="part-id-twice"))
    return ids, error


def read_parts(grid: SheetGrid, spot: TableSpot, materials: MaterialSet, findings: list[Problem],
               layers_grid: SheetGrid | None = None, layers_spot: TableSpot | None = None, *,
               need_allowable: bool = True, with_duty: bool = True) -> PartsInput:
    """Read the parts table (and the per-layer table, if the input uses that layout).

    Parameters
    ----------
    need_allowable : bool
        False where the result asked for needs no allowable (share, stress, twist): a material
        that gives a shear modulus but no allowable then serves.
    with_duty : bool
        Read the duty columns (a workbook); False where the duty comes from elsewhere (a cell
        function's arguments), leaving NaN.
    """
    rows = list(spot.data_rows)
    ids, error = _part_ids(grid, spot, rows, findings)
    n = len(rows)
    header_seen: set[tuple[str, int]] = set()
    who = row_labels(ids, rows)
    if with_duty:
        duty = read_duty(grid, spot, rows, ids, who, error, findings, header_seen)
    else:
        nan = np.full(n, np.nan)
        duty = DutyColumns(nan, nan, nan, nan, ["none"] * n, np.zeros(n, bool), CellRefs(grid.name, rows))
    error |= duty.bad
    loads = read_loads(grid, spot, rows, ids, who, findings, header_seen, duty.cells)
    error |= loads.bad
    if layers_grid is not None and layers_spot is not None:
        layers = layers_from_rows(layers_grid, layers_spot, ids, findings)
    else:
        layers = layers_from_groups(grid, spot, rows, ids, findings, header_seen)
    grids = {grid.name: grid}
    if layers_grid is not None:
        grids[layers_grid.name] = layers_grid
    parts = _assemble(grid.name, ids, rows, duty, layers, materials, grids, findings, error, need_allowable,
                      _system_of(spot, ("outer_diameter", "length", "torque")), layers_spot, loads)
    read_interface_inputs(parts, grid, spot, materials, findings, header_seen, layers_grid, layers_spot)
    return parts


def read_layer_table_parts(grid: SheetGrid, spot: TableSpot, materials: MaterialSet, findings: list[Problem],
                           *, need_allowable: bool = True) -> PartsInput:
    """Parts from a row-per-layer table alone (a cell function's block): the parts are the ids of
    its Part column in order of appearance, or one part when it has no Part column."""
    if spot.column("part") is not None:
        keys, ids, positions = part_rows(grid, spot)
    else:
        keys, ids, positions = part_keys(grid, spot), [""], None
    n = len(ids)
    nan = np.full(n, np.nan)
    duty = DutyColumns(nan, nan, nan, nan, ["none"] * n, np.zeros(n, bool), CellRefs(grid.name, []))
    layers = layers_from_rows(grid, spot, ids, findings, keys, positions)
    parts = _assemble(grid.name, ids, [], duty, layers, materials, {grid.name: grid}, findings,
                      np.zeros(n, bool), need_allowable, "SI", spot)
    read_interface_inputs(parts, grid, spot, materials, findings, set(), grid, spot)
    return parts


def _assemble(sheet: str, ids: list[str], rows: list[int], duty: DutyColumns, layers: LayerArrays,
              materials: MaterialSet, grids: dict[str, SheetGrid], findings: list[Problem], error: np.ndarray,
              need_allowable: bool, system: str, layers_spot: TableSpot | None,
              loads: LoadColumns | None = None) -> PartsInput:
    error = error | layers.bad
    props: dict[str, np.ndarray] = {}
    g, tau, rule = _materials_of_layers(layers, ids, materials, grids, sheet, findings, error, need_allowable,
                                        props)
    inputs = dict(loads.inputs) if loads is not None else {}
    if duty.speed is not None and not np.isnan(duty.speed).all():
        inputs["speed"] = duty.speed
    inputs.update(props)
    if len(inputs) > len(props):
        load_problems(inputs, layers.present, layers.materials, ids, duty.cells, sheet, findings, error,
                      duty.source)
    if layers_spot is not None and system == "SI":
        system = _system_of(layers_spot, ("outer_diameter",))
    return PartsInput(
        sheet, ids, rows, layers.outer_diameter, layers.inner_diameter, g, tau, layers.kt, layers.present,
        duty.torque, duty.length, duty.twist_limit_angle, duty.twist_limit_per_length, error,
        layers.materials, duty.source, layers.cells, duty.cells, system, rule,
        layers.source_part, layers.source_slot, inputs,
    )


def _materials_of_layers(layers: LayerArrays, ids: list[str], materials: MaterialSet,
                         grids: dict[str, SheetGrid], sheet: str, findings: list[Problem], error: np.ndarray,
                         need_allowable: bool, props: dict[str, np.ndarray] | None = None
                         ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Each layer's G, allowable and rule: its own values, else its material's (looked up once)."""
    present, mats, cells = layers.present, layers.materials, layers.cells
    P, L = present.shape
    own_g = ~np.isnan(layers.shear_modulus)
    g = np.where(own_g, layers.shear_modulus, np.nan)
    tau = np.full((P, L), np.nan)
    rule = np.zeros((P, L), dtype=np.int8)  # AllowableRule per layer; travels with the rating
    if layers.material_codes is not None:  # the names grouped as the column was read
        distinct, codes = layers.material_codes
        unnamed = present & (codes < 0)
        named_i, named_j = np.nonzero(present & ~unnamed)
        named = _in_order_of_use(distinct, codes[named_i, named_j])
    else:
        unnamed = present & np.equal(mats, None)
        named_i, named_j = np.nonzero(present & ~unnamed)
        named = first_seen_index(mats[named_i, named_j].tolist())
    for i, j in zip(*(a.tolist() for a in np.nonzero(unnamed))):
        if own_g[i, j] or layers.bad[i]:
            continue  # a layer's own G, or a cell already reported
        where, cell = cells.get((i, j, "material"), (sheet, None))
        src = grids.get(where)
        error[i] = True
        if cell is not None and src is not None and src.error_at(*parse_ref(cell)) is not None:
            continue  # the error value is reported on its cell already
        if cell is not None and src is not None and parse_ref(cell) in src.uncached:
            findings.append(Problem(Severity.ERROR, where, cell,
                                    f"{where_text(ids[i], j + 1)}: material: the cell's formula has no "
                                    "saved result (the book was written by a program that does not "
                                    "calculate): open and save it in Excel or LibreOffice, then run again",
                                    part=ids[i], layer=j + 1, code="uncached"))
            continue
        findings.append(Problem(Severity.ERROR, where, cell, f"{where_text(ids[i], j + 1)}: no material given",
                                part=ids[i], layer=j + 1, code="missing"))
    if len(named_i):
        _named_materials(named, named_i, named_j, layers, ids, materials, sheet, findings,
                         error, need_allowable, g, tau, rule, props)
    own_tau = ~np.isnan(layers.allowable_shear)
    tau[own_tau] = layers.allowable_shear[own_tau]
    rule[own_tau] = 0  # AllowableRule.GIVEN: the layer's own allowable
    if need_allowable:
        _own_modulus_needs_allowable(layers, ids, own_g & ~own_tau & present, sheet, findings, error)
    return g, tau, rule


def _in_order_of_use(distinct: list[str], inverse: np.ndarray) -> tuple[list[str], np.ndarray]:
    """The names `inverse` uses, in order of first use, and each position among them: what
    `first_seen_index` gives for the names themselves."""
    size = len(inverse)
    first = np.full(len(distinct), size, np.intp)
    first[inverse[::-1]] = np.arange(size)[::-1]
    used = np.flatnonzero(first < size)
    order = used[np.argsort(first[used], kind="stable")]
    position = np.empty(len(distinct), np.intp)
    position[order] = np.arange(len(order))
    return [distinct[u] for u in order.tolist()], position[inverse]


def _named_materials(named: tuple[list[str], np.ndarray], ni: np.ndarray, nj: np.ndarray, layers: LayerArrays,
                     ids: list[str], materials: MaterialSet, sheet: str, findings: list[Problem], error: np.ndarray,
                     need_allowable: bool, g: np.ndarray, tau: np.ndarray, rule: np.ndarray,
                     props: dict[str, np.ndarray] | None = None) -> None:
    # Each distinct name is looked up once; the arrays are filled through the inverse index.
    cells, kt = layers.cells, layers.kt
    unique, inverse = named
    first = np.zeros(len(unique), np.intp)
    first[inverse[::-1]] = np.arange(len(inverse))[::-1]
    # A layer's own allowable means its material need give none.
    own_tau = ~np.isnan(layers.allowable_shear[ni, nj])
    found_any = [materials.lookup(str(name), need_allowable=False) for name in unique]
    found_need = [materials.lookup(str(name), need_allowable=True) for name in unique] if need_allowable \
        else found_any
    ok_any = np.array([m is not None for m, _ in found_any])[inverse]
    ok_need = np.array([m is not None for m, _ in found_need])[inverse]
    ok = ok_any & (ok_need | own_tau)

    # The layers that take their material's values: one flat index, one inverse, for every property.
    at = ni * g.shape[1] + nj
    which = inverse
    if not ok.all():
        at, which = at[ok], inverse[ok]

    def pick(attr: str) -> np.ndarray:
        return np.array([getattr(m, attr) if m is not None else np.nan for m, _ in found_any])[which]

    g.flat[at] = pick("shear_modulus")
    tau.flat[at] = pick("allowable_shear")
    rule.flat[at] = np.array([int(m.rule) if m is not None else 0 for m, _ in found_any])[which]
    if props is not None:  # the properties the criteria beyond torsion read, NaN where none
        for key in LAYER_PROPERTY_KEYS:
            values = props[key] = np.full(g.shape, np.nan)
            values.flat[at] = pick(key)
    for k in np.flatnonzero(~ok):
        i, j = int(ni[k]), int(nj[k])
        why = found_any[inverse[k]][1] or found_need[inverse[k]][1]
        findings.append(Problem(Severity.ERROR, *cells.get((i, j, "material"), (sheet, None)),
                                f"{where_text(ids[i], j + 1)}: {why}", part=ids[i], layer=j + 1, code="material"))
        error[i] = True
    for u, (m, _) in enumerate(found_any):
        if m is None:
            continue
        used = inverse == u
        if m.note:  # once per material, where it is first used
            i, j = int(ni[first[u]]), int(nj[first[u]])
            findings.append(Problem(Severity.NOTE, *cells.get((i, j, "material"), (sheet, None)),
                                    f"{where_text(ids[i], j + 1)}: {m.note}", part=ids[i], layer=j + 1,
                                    code="library-default"))
        with_kt = np.flatnonzero(used & (kt[ni, nj] > 1.0)) if m.keyway else ()
        if len(with_kt):  # once per material: the first part that shows it
            i, j = int(ni[with_kt[0]]), int(nj[with_kt[0]])
            findings.append(Problem(
                Severity.NOTE, *cells.get((i, j, "kt"), (sheet, None)),
                f"{where_text(ids[i], j + 1)}: Kt {kt[i, j]:.3g} and the keyway factor 0.75 of material "
                f"{unique[u]!r} are both applied (here and on every layer of that material "
                "with a Kt); the shafting code's keyway factor already allows for a keyway, so if Kt describes "
                "the same keyway it is counted twice (conservative)", part=ids[i], layer=j + 1,
                code="keyway-and-kt"))


def _own_modulus_needs_allowable(layers: LayerArrays, ids: list[str], missing: np.ndarray, sheet: str,
                                 findings: list[Problem], error: np.ndarray) -> None:
    """A layer given by its G alone has no material to take an allowable from."""
    for i, j in zip(*(a.tolist() for a in np.nonzero(missing))):
        if error[i]:
            continue
        error[i] = True
        findings.append(Problem(Severity.ERROR, *layers.cells.get((i, j, "allowable_shear"),
                                                                  layers.cells.get((i, j, "material"), (sheet, None))),
                                f"{where_text(ids[i], j + 1)}: allowable: the layer is given by its shear modulus, "
                                "so no material gives an allowable; give the allowable shear stress "
                                "(e.g. from TWS_ALLOWABLE)", part=ids[i], layer=j + 1, code="no-allowable"))
