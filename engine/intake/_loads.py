"""A part's loads beyond torsion from its table columns, and the layer properties they need.

Per part: ``Bending moment``, ``Axial force``, ``Bearing span`` and ``Supports`` (the span and
end conditions of the whirl check, the span being the length where blank; the duty's speed
column serves the whirl check too). Per layer, from the layer's
material: E, density, Poisson's ratio and factor of safety. All go to the core by the keys of
`rate(..., inputs=)`; NaN where not given, where a criterion then sets no limit.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ._cellrefs import CellRefs
from ._columns import read_numeric, read_text
from ._grid import SheetGrid, cell_ref
from ._problems import Problem, Severity
from ._tables import TableSpot
from ._words import SUPPORT_CHOICES, quoted, support_from_text, where_text

__all__ = ["LoadColumns", "read_loads", "LAYER_PROPERTY_KEYS", "load_problems"]

#: The material properties each layer passes to the criteria beyond torsion.
LAYER_PROPERTY_KEYS = ("youngs_modulus", "density", "poisson_ratio", "factor_of_safety")


@dataclass
class LoadColumns:
    """Loads of P parts, SI; NaN where not given. ``bad``: a cell made the part unratable."""

    inputs: dict[str, np.ndarray] = field(default_factory=dict)
    bad: np.ndarray | None = None


def read_loads(grid: SheetGrid, spot: TableSpot, rows: list[int], ids: list[str], who,
               findings: list[Problem], header_seen: set, cells: CellRefs) -> LoadColumns:
    """Read the bending moment, axial force and supports columns of the parts table."""
    n = len(rows)
    out = LoadColumns(bad=np.zeros(n, bool))
    for key in ("bending_moment", "axial_force", "bearing_span"):
        col = spot.column(key)
        if col is None:
            continue
        nc = read_numeric(grid, col, rows, who, findings, spot.header_row, header_seen)
        out.bad |= nc.bad
        out.inputs[key] = nc.values
        cells.column((key,), col.index)
    col = spot.column("end_support")
    if col is not None:
        cells.column(("end_support",), col.index)
        codes = np.full(n, np.nan)
        for i, text in enumerate(read_text(grid, col.index, rows)):
            if text is None:
                continue  # blank: simply supported
            code = support_from_text(text)
            if code is None:
                findings.append(Problem(
                    Severity.ERROR, grid.name, cell_ref(rows[i], col.index),
                    f"part {ids[i]}: supports {quoted(text)} is not one of: {SUPPORT_CHOICES}; "
                    "the part is not rated", part=ids[i], code="support-word", values=(text,)))
                out.bad[i] = True
            else:
                codes[i] = float(code)
        out.inputs["end_support"] = codes
    return out


def load_problems(inputs: dict[str, np.ndarray], present: np.ndarray, materials: np.ndarray,
                  ids: list[str], part_cells: CellRefs | None, sheet: str, findings: list[Problem],
                  error: np.ndarray, duty_source: list[str] | None = None) -> None:
    """A part with a bending moment or axial force needs E for every layer: refuse it otherwise;
    note where the whirl or buckling check cannot be made for want of a property."""
    n = len(ids)
    nan = np.full(n, np.nan)
    moment, force = inputs.get("bending_moment", nan), inputs.get("axial_force", nan)
    loaded = ~(np.isnan(moment) & np.isnan(force))
    e = inputs.get("youngs_modulus", np.full(present.shape, np.nan))
    rho = inputs.get("density", np.full(present.shape, np.nan))

    def at(key: str, i: int) -> tuple[str, str | None]:
        got = part_cells.get((i, key)) if part_cells is not None else None
        return got if got is not None else (sheet, None)

    no_e = present & np.isnan(e)
    for i in np.flatnonzero(loaded & no_e.any(axis=1) & ~error).tolist():
        j = int(np.flatnonzero(no_e[i])[0])
        key = "bending_moment" if not np.isnan(moment[i]) else "axial_force"
        what = "a bending moment" if key == "bending_moment" else "an axial force"
        mat = materials[i, j]
        whose = f"its material {mat!r} gives" if mat is not None else "it is given by its G alone and has"
        findings.append(Problem(
            Severity.ERROR, *at(key, i),
            f"{where_text(ids[i], j + 1)}: {what} is given, so the combined stress needs every layer's "
            f"Young's modulus E, but {whose} none: add E to the materials table; the part is not rated",
            part=ids[i], layer=j + 1, code="missing"))
        error[i] = True
    speed = inputs.get("speed", nan)
    # Told where the whirl check was asked for (a Supports word, or a speed beside a torque); a
    # speed that only turns a power into a torque leaves whirl unchecked silently (the summary
    # counts the parts checked).
    asked = ~np.isnan(inputs.get("end_support", nan))
    if duty_source is not None:
        asked |= np.array([s == "torque" for s in duty_source], bool)
    no_whirl = asked & ~np.isnan(speed) & (present & (np.isnan(e) | np.isnan(rho))).any(axis=1) & ~error
    for i in np.flatnonzero(no_whirl).tolist():
        findings.append(Problem(
            Severity.NOTE, *at("speed", i),
            f"part {ids[i]}: whirl is not checked: a layer's material gives no Young's modulus E or no "
            "density (both are needed for the first critical speed)", part=ids[i], code="whirl-not-checked"))
