"""Layers of every part, in either layout: column groups on the part's row, or a row per layer.

The row-per-layer layout is read in `_layer_rows`. Both layouts end in `place_layers`, so a missing diameter reads the same whichever way the
table is laid out. A layer's material cell holds a material name, or (written with its unit, or
under a ``G [GPa]`` header) the layer's own shear modulus; a layer's own allowable overrides its
material's.
"""

from __future__ import annotations

import re
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, replace

import numpy as np
from twistshare.engine.units import UnitProblem, parse_value

from ._cellrefs import CellRefs
from ._columns import NumericColumn, drop_key, error_problem, first_seen_index, read_numeric, read_text
from ._grid import SheetGrid, all_of_type, cell_ref
from ._problems import Problem, Severity
from ._schema import LAYER_FIELDS, Column
from ._tables import TableSpot
from ._words import where_text

__all__ = ["LayerArrays", "layers_from_groups", "row_labels"]

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
    # Where a column of names gave them: the distinct names, and (P, L) each layer's position
    # among them (-1 where `materials` is None), so each name is looked up once.
    material_codes: tuple[list[str], np.ndarray] | None = None

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


def _starts_like_number(names: Iterable[str | None]) -> bool:
    return _NUMBER_START.search("\n" + "\n".join(filter(None, names))) is not None


def _grouped_names(grid: SheetGrid, col: int, rows: list[int]) -> tuple[list[str], np.ndarray] | None:
    """A column of texts naming materials, each distinct name once: the names (stripped) and
    each row's position among them (-1 where blank). None where a cell needs a closer look
    (a number, an error value, a text that may be a modulus with its unit)."""
    raw = grid.cells(col, rows)
    if grid.errors or not all_of_type(raw, str):
        return None
    distinct, index = first_seen_index(raw)
    stripped = [text.strip() or None for text in distinct]
    if _starts_like_number(stripped):
        return None
    names, remap = first_seen_index(stripped)  # "Steel " and "Steel" are one name
    return drop_key(names, remap[index], None, -1)


def _material_column(grid: SheetGrid, column: Column, rows: list[int], who, findings: list[Problem],
                     header_row: int, seen: set
                     ) -> tuple[list[str | None], np.ndarray, np.ndarray, tuple[list[str], np.ndarray] | None]:
    """Names, the layer's own G (NaN where a name is given) and bad marks of a material column;
    and, for a column of names alone, the distinct names with each row's position among them
    (-1: blank), so the names are looked up once each."""
    n = len(rows)
    if column.unit is not None:
        moduli = read_numeric(grid, replace(column, field=_MODULUS), rows, who, findings, header_row, seen)
        return [None] * n, moduli.values, moduli.bad, None
    modulus = np.full(n, np.nan)
    bad = np.zeros(n, bool)
    grouped = _grouped_names(grid, column.index, rows)
    if grouped is not None:  # the common case: a few names, repeated
        distinct, index = grouped
        names = np.array([*distinct, None], dtype=object)[index].tolist()  # -1 picks the None
        return names, modulus, bad, grouped
    names = read_text(grid, column.index, rows)
    tag = who.tag
    # A column repeats a few names: each distinct one is screened once.
    if not _starts_like_number(dict.fromkeys(names)):
        return names, modulus, bad, None  # names only (no text starts like a number)
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
    return names, modulus, bad, None


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
            names, modulus, mbad, _ = _material_column(grid, mcol, rows, who, findings, spot.header_row,
                                                       header_seen)
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
