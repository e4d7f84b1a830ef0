"""A materials row that describes a fibre-wound layer by its plies and layup.

The row gives ply data (``Ply E1``, ``Ply E2``, ``Ply G12``, ``Ply nu12``, ``Ply thickness``) or
names a ply set of the built-in library (``Ply set``), and a ``Layup`` in laminate notation
(``[±45]s``). The core's classical lamination theory (`laminate_moduli`) gives the wall's shear
modulus for torsion, ``Gxy = A66/t``, and its axial modulus for bending, ``Ex = 1/(t a11)``;
the material's G and E are then those, and a note on the row says so.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from twistshare.engine.core import laminate_moduli, ply_library

from ._layup import LayupNotationError, parse_layup
from ._words import material_key

__all__ = ["WoundLayer", "wound_layer"]

_PLY_KEYS = ("ply_e1", "ply_e2", "ply_g12", "ply_nu12", "ply_thickness")
_PLY_WORDS = {"ply_e1": "Ply E1", "ply_e2": "Ply E2", "ply_g12": "Ply G12", "ply_nu12": "Ply nu12",
              "ply_thickness": "Ply thickness"}


@dataclass(frozen=True)
class WoundLayer:
    """What CLT gave a row: moduli (SI) and the note, or the problem and the field it concerns."""

    shear_modulus: float = math.nan
    youngs_modulus: float = math.nan
    poisson_ratio: float = math.nan
    density: float = math.nan
    note: str | None = None
    problem: str | None = None
    field: str | None = None  # the input the problem concerns


def _library_ply(name: str):
    key = material_key(name)
    return next((p for n, p in ply_library().items() if material_key(n) == key), None)


def wound_layer(name: str, values: dict[str, float], layup: str | None, ply_set: str | None) -> WoundLayer | None:
    """CLT moduli of a materials row, or None where the row gives no ply data nor layup."""
    given = {k: values.get(k, math.nan) for k in _PLY_KEYS}
    any_ply = any(not math.isnan(v) for v in given.values()) or ply_set is not None
    if layup is None and not any_ply:
        return None
    if layup is None:
        return WoundLayer(problem=f"material {name!r}: ply data are given but no layup: give the layup, "
                                  "e.g. '[±45]s'", field="layup")
    try:
        angles = parse_layup(layup)
    except LayupNotationError as error:
        return WoundLayer(problem=f"material {name!r}: {error}", field="layup")
    source = "the row's ply data"
    density = math.nan
    if ply_set is not None:
        ply = _library_ply(ply_set)
        if ply is None:
            choices = ", ".join(repr(n) for n in ply_library())
            return WoundLayer(problem=f"material {name!r}: ply set {ply_set!r} is not in the ply library "
                                      f"({choices})", field="ply_set")
        library = {"ply_e1": ply.e1, "ply_e2": ply.e2, "ply_g12": ply.g12, "ply_nu12": ply.nu12,
                   "ply_thickness": ply.thickness}
        given = {k: (library[k] if math.isnan(v) else v) for k, v in given.items()}
        density = float(ply.density)
        source = f"ply set {ply.name!r} ({ply.source})"
    missing = [_PLY_WORDS[k] for k, v in given.items() if math.isnan(v)]
    if missing:
        return WoundLayer(problem=f"material {name!r}: a layup is given but not the ply data "
                                  f"{', '.join(missing)}: give them or name a ply set",
                          field=next(k for k, v in given.items() if math.isnan(v)))
    moduli = laminate_moduli(given["ply_e1"], given["ply_e2"], given["ply_g12"], given["ply_nu12"],
                             given["ply_thickness"], np.radians(np.asarray(angles, dtype=float)))
    if not bool(np.asarray(moduli.valid)[0]):
        return WoundLayer(problem=f"material {name!r}: the ply data cannot make a laminate "
                                  "(check E1, E2, G12 and nu12)", field="ply_e1")
    g = float(np.asarray(moduli.shear_modulus)[0])
    e = float(np.asarray(moduli.axial_modulus)[0])
    nu = float(np.asarray(moduli.poisson_ratio)[0])
    note = (f"material {name!r}: G = {g / 1e9:.4g} GPa (A66/t, torsion) and E = {e / 1e9:.4g} GPa "
            f"(1/(t·a11), bending) from classical lamination theory: layup {layup} "
            f"({len(angles)} plies), {source}")
    return WoundLayer(g, e, nu, density, note)
