"""The plastic reserve of every part from its layers' yield strengths (elastic–perfectly plastic).

Each layer's shear yield stress is its material's yield strength times its rule's factor:
0.5 for the maximum-shear-stress (Tresca) rule, 1/√3 for distortion energy (von Mises) — the
latter also where the layer's allowable is given or set by the shafting code, which name no
yield theory (textbook factors). A part with a layer of no yield strength gets no reserve,
and a note.
"""

from __future__ import annotations

import math

import numpy as np
from twistshare.engine.core import AllowableRule, PlasticReserve, plastic_reserve

from ._materials import MaterialSet
from ._problems import Problem, Severity
from ._words import where_text

__all__ = ["SHEAR_YIELD_FACTOR", "plastic_of"]

SHEAR_YIELD_FACTOR = {int(AllowableRule.MAX_SHEAR): 0.5}
"""Shear yield over yield strength by rule; any other rule: 1/√3 (distortion energy)."""
_DISTORTION = 1.0 / math.sqrt(3.0)


def plastic_of(parts, materials: MaterialSet, rated: np.ndarray
               ) -> tuple[PlasticReserve | None, np.ndarray | None, list[Problem]]:
    """First-yield torque, fully plastic torque and their ratio for the rated parts.

    Returns
    -------
    reserve : PlasticReserve or None
        None (with no notes) when no rated part has yield strengths for all its layers: the
        book then gives no plastic columns.
    shear_yield : (P, L) ndarray, Pa, or None
        Each layer's shear yield stress (NaN where not known), for the torque–twist curve.
    notes : list of Problem
    """
    P, L = parts.present.shape
    sy = np.full((P, L), np.nan)
    cache: dict[object, float] = {None: math.nan}
    names = parts.materials[parts.present].tolist()
    for name in set(names) - set(cache):
        m = materials.lookup(str(name), need_allowable=False)[0]
        cache[name] = m.yield_strength if m is not None else math.nan
    sy[parts.present] = np.fromiter((cache[n] for n in names), float, len(names))
    with_sy = rated & (~np.isnan(sy) | ~parts.present).all(axis=1)
    if not with_sy.any():
        return None, None, []
    rule = parts.allowable_rule if parts.allowable_rule is not None else np.zeros((P, L), np.int8)
    factor = np.where(rule == int(AllowableRule.MAX_SHEAR), 0.5, _DISTORTION)
    shear_yield = factor * sy
    got = plastic_reserve(parts.outer_diameter, parts.inner_diameter, parts.shear_modulus,
                          shear_yield, parts.present & with_sy[:, np.newaxis])
    notes: list[Problem] = []
    told: set[str] = set()
    for i in np.flatnonzero(rated & ~with_sy).tolist():
        j = int(np.flatnonzero(parts.present[i] & np.isnan(sy[i]))[0])
        name = str(parts.materials[i, j])
        if name in told:
            continue
        told.add(name)
        where = parts.layer_cells.get((i, j, "material"), (parts.sheet, None)) \
            if parts.layer_cells is not None else (parts.sheet, None)
        notes.append(Problem(Severity.NOTE, *where,
                             f"{where_text(parts.ids[i], j + 1)}: material {name!r} has no yield "
                             "strength, so the plastic reserve of this part (and of every part "
                             "using the material) is left blank", part=parts.ids[i], layer=j + 1,
                             code="no-yield"))
    return got, shear_yield, notes
