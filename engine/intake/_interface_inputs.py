"""The inputs of fitted and bonded interfaces, read into ``PartsInput.inputs`` for the criteria.

Per layer, on the outer member of each interface (``Layer 2 interference [mm]`` is the fit
between layers 1 and 2): interference, fit length, friction, bond length, bond allowable.
Per part: the load path (words of `load_path_from_text`; blank: through the core), the
operating and the assembly temperature. Each layer's E, ν, Sy, α and factor of safety come
from its material. Nothing is added when the table has no interference or bond column, so
parts without interfaces cost nothing more. After rating, `interface_problems` words the
interface diagnoses on the cells they concern.
"""

from __future__ import annotations

import math

import numpy as np
from twistshare.engine.core import (
    DEFAULT_LOAD_PATH,
    Adhesive,
    InterfaceFlag,
    Rating,
    describe_sleeve_flag,
    find_adhesive,
    has_sleeve_error,
)
from twistshare.engine.core._interface_criteria import has_interfaces, interface_rating
from twistshare.engine.units import si_offset

from ._columns import read_numeric, read_text
from ._grid import SheetGrid, cell_ref
from ._layers import row_labels
from ._materials import MaterialSet
from ._problems import Problem, Severity
from ._schema import INTERFACE_FIELDS
from ._tables import TableSpot
from ._wording import BOND_CAUTION
from ._words import LOAD_PATH_CHOICES, load_path_from_text, quoted, where_text

__all__ = ["read_interface_inputs", "interface_problems"]

_LAYER_KEYS = tuple(f.key for f in INTERFACE_FIELDS)
_ZERO_CELSIUS = si_offset("°C", "temperature")  # K, from the one registry
_MATERIAL_KEYS = ("youngs_modulus", "poisson_ratio", "yield_strength", "expansion_coefficient",
                  "factor_of_safety")


def read_interface_inputs(parts, grid: SheetGrid, spot: TableSpot, materials: MaterialSet,
                          findings: list[Problem], header_seen: set,
                          layers_grid: SheetGrid | None = None,
                          layers_spot: TableSpot | None = None) -> None:
    """Read the interface columns of the parts (or layers) table into ``parts.inputs``."""
    P, L = parts.present.shape
    rows = list(parts.rows)
    error = parts.input_error
    layer_values = {k: np.full((P, L), np.nan) for k in _LAYER_KEYS}
    found = False
    named: list[tuple[int, int, Adhesive, str, str]] = []  # bond cells naming an adhesive class
    if layers_spot is not None and layers_grid is not None and parts.source_part is not None:
        lrows = list(layers_spot.data_rows)
        src_p, src_j = np.asarray(parts.source_part), np.asarray(parts.source_slot)
        keep = src_p >= 0
        who = row_labels([None] * len(lrows), lrows)
        for key in _LAYER_KEYS:
            col = layers_spot.column(key)
            if col is None:
                continue
            found = True
            got = read_numeric(layers_grid, col, lrows, who, findings, layers_spot.header_row,
                               header_seen)
            layer_values[key][src_p[keep], src_j[keep]] = got.values[keep]
            error[src_p[keep & got.bad]] = True
            if key == "bond_allowable":
                for k, text in enumerate(read_text(layers_grid, col.index, lrows)):
                    adhesive = find_adhesive(text) if text and keep[k] else None
                    if adhesive is not None:
                        named.append((int(src_p[k]), int(src_j[k]), adhesive, layers_grid.name,
                                      cell_ref(lrows[k], col.index)))
            for k in np.flatnonzero(keep).tolist():
                parts.layer_cells[(int(src_p[k]), int(src_j[k]), key)] = (
                    layers_grid.name, cell_ref(lrows[k], col.index))
    else:
        for layer in spot.layer_numbers:
            j = layer - 1
            who = row_labels(parts.ids, rows, layer)
            for key in _LAYER_KEYS:
                col = spot.column(key, layer)
                if col is None:
                    continue
                found = True
                got = read_numeric(grid, col, rows, who, findings, spot.header_row, header_seen)
                error |= got.bad
                parts.layer_cells.column((j, key), col.index)
                if j < L:
                    layer_values[key][:, j] = got.values
                if key == "bond_allowable" and j < L:
                    for i, text in enumerate(read_text(grid, col.index, rows)):
                        adhesive = find_adhesive(text) if text else None
                        if adhesive is not None:
                            named.append((i, j, adhesive, grid.name, cell_ref(rows[i], col.index)))
                stray = ~got.empty & ~got.bad
                if j == 0 or j >= L:
                    stray &= True
                else:
                    stray &= ~parts.present[:, j] | ~parts.present[:, j - 1]
                for i in np.flatnonzero(stray).tolist():
                    findings.append(Problem(
                        Severity.WARNING, grid.name, cell_ref(rows[i], col.index),
                        f"{where_text(parts.ids[i], layer)}: {col.field.description} is given but "
                        f"there is no interface under layer {layer} (an interface is between a "
                        "layer and the one inside it); the value is ignored",
                        part=parts.ids[i], layer=layer, code="stray-interface"))
                    layer_values[key][i, j] = np.nan
    if not found:
        return
    parts.inputs.update(layer_values)
    _part_inputs(parts, grid, spot, rows, findings, header_seen)
    _material_inputs(parts, materials)
    _adhesives_too_hot(parts, named, findings)


def _adhesives_too_hot(parts, named: list[tuple[int, int, Adhesive, str, str]],
                       findings: list[Problem]) -> None:
    """Warn on a bond cell naming an adhesive class whose typical upper service temperature is
    below the part's operating temperature: its room-temperature allowable does not hold there."""
    hot = parts.inputs.get("operating_temperature")
    if hot is None:
        return
    for i, j, adhesive, sheet, cell in named:
        if not hot[i] > adhesive.max_temperature:  # NaN (not given) is not hot
            continue
        findings.append(Problem(
            Severity.WARNING, sheet, cell,
            f"{where_text(parts.ids[i], j + 1)}: the operating temperature "
            f"{hot[i] - _ZERO_CELSIUS:g} °C is above the typical upper service temperature of "
            f"{adhesive.name} (about {adhesive.max_temperature - _ZERO_CELSIUS:g} °C; typical, from "
            "memory): its room-temperature allowable does not hold there; give the maker's "
            "strength at that temperature instead", part=parts.ids[i], layer=j + 1,
            code="adhesive-too-hot"))


def _part_inputs(parts, grid: SheetGrid, spot: TableSpot, rows: list[int], findings: list[Problem],
                 header_seen: set) -> None:
    P = parts.count
    who = row_labels(parts.ids, rows)
    for key in ("operating_temperature", "assembly_temperature"):
        col = spot.column(key)
        if col is None:
            continue
        got = read_numeric(grid, col, rows, who, findings, spot.header_row, header_seen)
        parts.input_error |= got.bad
        parts.part_cells.column((key,), col.index)
        parts.inputs[key] = got.values
    path = np.full(P, float(DEFAULT_LOAD_PATH))
    col = spot.column("load_path")
    if col is not None:
        parts.part_cells.column(("load_path",), col.index)
        for i, text in enumerate(read_text(grid, col.index, rows)):
            if text is None:
                continue
            got = load_path_from_text(text)
            if got is None:
                parts.input_error[i] = True
                findings.append(Problem(
                    Severity.ERROR, grid.name, cell_ref(rows[i], col.index),
                    f"{where_text(parts.ids[i])}: load path {quoted(text)} is not one of: "
                    f"{LOAD_PATH_CHOICES}", part=parts.ids[i], code="load-path-word",
                    values=(text,)))
            else:
                path[i] = float(got)
    parts.inputs["load_path"] = path


def _material_inputs(parts, materials: MaterialSet) -> None:
    """Each layer's E, ν, Sy, α and factor of safety from its material (NaN where none)."""
    P, L = parts.present.shape
    values = {k: np.full((P, L), np.nan) for k in _MATERIAL_KEYS}
    names = parts.materials[parts.present].tolist()
    found: dict[object, object] = {None: None}
    for name in set(names) - set(found):
        found[name] = materials.lookup(str(name), need_allowable=False)[0]
    for k in _MATERIAL_KEYS:
        by_name = {n: (math.nan if m is None else getattr(m, k)) for n, m in found.items()}
        values[k][parts.present] = np.fromiter((by_name[n] for n in names), float, len(names))
    parts.inputs.update(values)


def interface_problems(rating: Rating, parts, ok: np.ndarray) -> tuple[list[Problem], np.ndarray]:
    """The interface diagnoses as problems, and the parts an interface error leaves unrated.

    Contact lost at temperature and a fit that overstresses a layer by itself are warnings on
    the part (the rating stands: the slip or fit-stress capacity is then zero); an input in
    error refuses the part. A bonded part gets the average-shear caution once, as a note.
    """
    refused = np.zeros(parts.count, dtype=bool)
    if not has_interfaces(parts.inputs):
        return [], refused
    got = interface_rating(parts.stack(), parts.inputs, rating.share, rating.sum_gj)
    out: list[Problem] = []
    cells = parts.layer_cells

    def where(i: int, j: int, key: str):
        return cells.get((i, j, key), (parts.sheet, None)) if cells is not None else (parts.sheet, None)

    flags = np.asarray(got.interface_flags)
    layer_flags = np.asarray(got.layer_fit_flags)
    bad = has_sleeve_error(flags, InterfaceFlag).any(axis=1) | has_sleeve_error(
        layer_flags, InterfaceFlag).any(axis=1)
    bonded_note = False
    for i in np.flatnonzero(ok).tolist():
        pid = parts.ids[i]
        said: set[tuple[int, int]] = set()
        for j in range(flags.shape[1]):
            for word, key in ((flags[i, j], "interference"), (layer_flags[i, j], "interference")):
                for flag in InterfaceFlag:
                    if not int(word) & int(flag) or (int(flag), j) in said:
                        continue
                    said.add((int(flag), j))
                    error = bool(has_sleeve_error(int(flag), InterfaceFlag))
                    if flag is InterfaceFlag.BOND_INPUT_INVALID:
                        key = "bond_allowable"
                    text = describe_sleeve_flag(flag)
                    if flag is InterfaceFlag.CONTACT_LOST:
                        text = (f"the fit between layers {j} and {j + 1} loses contact at the operating "
                                "temperature (the interference at temperature is zero or less): it grips "
                                "nothing and its slip capacity is zero")
                    elif flag is InterfaceFlag.FIT_OVERSTRESSED:
                        text = f"layer {j + 1}: {text}"
                    suffix = "; the part is not rated" if error else ""
                    out.append(Problem(Severity.ERROR if error else Severity.WARNING, *where(i, j, key),
                                       f"{where_text(pid)}: {text}{suffix}", part=pid, layer=j + 1,
                                       code="interface"))
            if not bonded_note and not np.isnan(got.bond_capacity[i, j]):
                bonded_note = True
                out.append(Problem(Severity.NOTE, *where(i, j, "bond_allowable"),
                                   f"{where_text(pid, j + 1)}: {BOND_CAUTION}", part=pid, layer=j + 1,
                                   code="bond-average"))
        refused[i] = bool(bad[i])
    return out, refused
