"""Word the engine's per-part and per-layer diagnosis flags as findings on the cells concerned."""

from __future__ import annotations

from types import MappingProxyType

import numpy as np
from twistshare.engine.core import (
    DEFAULT_CONTACT_ABS_TOL,
    DEFAULT_CONTACT_REL_TOL,
    LayerFlag,
    PartFlag,
    Rating,
    describe,
)

from ._parts import PartsInput
from ._problems import Problem, Severity
from ._wording import Display
from ._words import where_text

__all__ = ["problems_from_rating"]


_LAYER_FIELD = MappingProxyType({
    LayerFlag.OUTER_NOT_POSITIVE: "outer_diameter",
    LayerFlag.INNER_NEGATIVE: "inner_diameter",
    LayerFlag.INNER_NOT_BELOW_OUTER: "inner_diameter",
    LayerFlag.MODULUS_NOT_POSITIVE: "material",
    LayerFlag.ALLOWABLE_NOT_POSITIVE: "material",
    LayerFlag.KT_BELOW_ONE: "kt",
    LayerFlag.NOT_FINITE: "outer_diameter",
    LayerFlag.GAP_BELOW: "inner_diameter",
    LayerFlag.OVERLAP_BELOW: "inner_diameter",
    LayerFlag.SOLID_NOT_INNERMOST: "inner_diameter",
    LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS: "material",
})

_PART_FIELD = MappingProxyType({
    PartFlag.LENGTH_NOT_POSITIVE: "length",
    PartFlag.TORQUE_NOT_FINITE: "torque",
    PartFlag.TORQUE_NEGATIVE: "torque",
    PartFlag.TWIST_LIMIT_NOT_POSITIVE: "twist_limit_angle",
    PartFlag.TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE: "twist_limit_per_length",
    PartFlag.TWIST_LIMIT_NEEDS_LENGTH: "twist_limit_angle",
})


def _layer_message(flag: LayerFlag, parts: PartsInput, rating: Rating, i: int, j: int, d: Display) -> str:
    od, idd = parts.outer_diameter[i, j], parts.inner_diameter[i, j]
    if flag == LayerFlag.INNER_NOT_BELOW_OUTER:
        return f"inner diameter {d(idd, 'length')} must be less than outer diameter {d(od, 'length')}"
    if flag == LayerFlag.OUTER_NOT_POSITIVE:
        return f"outer diameter {d(od, 'length')} must be greater than zero"
    if flag == LayerFlag.INNER_NEGATIVE:
        return f"inner diameter {d(idd, 'length')} must not be negative (0 = solid)"
    if flag in (LayerFlag.GAP_BELOW, LayerFlag.OVERLAP_BELOW):
        gap = float(rating.interface_gap[i, j])
        below = parts.outer_diameter[i, j - 1] if j > 0 else np.nan
        kind = "gap" if flag == LayerFlag.GAP_BELOW else "overlap"
        if flag == LayerFlag.OVERLAP_BELOW and od < below:
            return (f"outer diameter {d(od, 'length')} is smaller than layer {j}'s {d(below, 'length')}: "
                    "list the layers innermost first")
        return (f"{kind} of {d(abs(gap), 'length', 3)} on the diameter: inner diameter {d(idd, 'length')} "
                f"against layer {j}'s outer diameter {d(below, 'length')}; the layers must touch "
                f"(within the larger of {DEFAULT_CONTACT_ABS_TOL * 1e3:g} mm and {DEFAULT_CONTACT_REL_TOL * 100:g} % of "
                "the diameter); for a shrink or press fit give both layers the nominal fit diameter")
    if flag == LayerFlag.KT_BELOW_ONE:
        return f"Kt {parts.kt[i, j]:.4g} must be at least 1"
    if flag == LayerFlag.MODULUS_NOT_POSITIVE:
        return f"the material's shear modulus {d(parts.shear_modulus[i, j], 'stress')} must be greater than zero"
    if flag == LayerFlag.ALLOWABLE_NOT_POSITIVE:
        return (f"the material's allowable shear stress {d(parts.allowable_shear[i, j], 'stress')} "
                "must be greater than zero")
    return describe(flag)


def problems_from_rating(rating: Rating, parts: PartsInput, inputs_ok: np.ndarray) -> list[Problem]:
    """Findings for parts whose cells read fine but which the engine could not rate, and notes."""
    d = Display(parts.system)
    out: list[Problem] = []
    lflags = np.asarray(rating.layer_flags)
    pflags = np.asarray(rating.part_flags)
    interesting = np.flatnonzero(inputs_ok & ((pflags != 0) | (lflags != 0).any(axis=1)))
    for i in interesting:
        pid = parts.ids[i]
        for j in np.flatnonzero(lflags[i]):
            bits = LayerFlag(int(lflags[i, j]))
            for flag in LayerFlag:
                if flag in bits:
                    sheet, cell = parts.layer_cells.get((i, j, _LAYER_FIELD.get(flag, "outer_diameter")),
                                                        (parts.sheet, None))
                    out.append(Problem(Severity.ERROR, sheet, cell,
                                       f"{where_text(pid, int(j + 1))}: {_layer_message(flag, parts, rating, i, j, d)}",
                                       part=pid, layer=int(j + 1), code=flag.name.lower().replace("_", "-")))
        bits = PartFlag(int(pflags[i]))
        for flag in PartFlag:
            if flag not in bits or flag == PartFlag.LAYER_ERROR:
                continue
            sev = Severity.ERROR if not rating.valid[i] and flag != PartFlag.TORQUE_NEGATIVE else Severity.WARNING
            sheet, cell = parts.part_cells.get((i, _PART_FIELD.get(flag, "")), (parts.sheet, None))
            out.append(Problem(sev, sheet, cell, f"{where_text(pid)}: {describe(flag)}", part=pid,
                               code=flag.name.lower().replace("_", "-")))
    return out
