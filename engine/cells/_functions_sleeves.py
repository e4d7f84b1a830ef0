"""Cell functions for fitted and bonded sleeves and the plastic reserve.

Thin, like the others: each argument is read by the intake's rule for its field, the physics
is the engine core's (`fit_pressure`, `slip_torque`, `bond_shear`, `fully_plastic_torque`,
`torque_twist_curve`). A preliminary design aid: verify against the applicable codes and
standards and have a qualified engineer review.
"""

from __future__ import annotations

import math

import numpy as np
from twistshare.engine.core import (
    bond_shear,
    fit_pressure,
    fully_plastic_torque,
    slip_torque,
    torque_twist_curve,
)
from twistshare.engine.intake import field_by_key

from ._arguments import WARNING_SIGN, CellError, is_empty, read_field, read_rule, result_factor
from ._blocks import read_block, read_materials_block
from ._functions import _result
from ._registry import Argument, cell_function

__all__ = [
    "TWS_FIT_PRESSURE",
    "TWS_SLIP_TORQUE",
    "TWS_BOND_STRESS",
    "TWS_PLASTIC_TORQUE",
    "TWS_TORQUE_TWIST",
]

_LEN = "length: mm, m, in"
_STRESS = "stress: MPa, GPa, psi, ksi"


def _f(key: str):
    return field_by_key(key)


@cell_function(
    "Contact pressure of an interference fit of two cylinders (Lamé thick-cylinder)",
    Argument("interference", "Diametral interference, e.g. '0.03 mm'", unit=_LEN),
    Argument("fit_diameter", "Diameter at the fit, e.g. '40 mm'", unit=_LEN),
    Argument("outer_diameter", "Outer diameter of the outer member (the sleeve)", unit=_LEN),
    Argument("youngs_outer", "Young's modulus of the outer member, e.g. '207 GPa'", unit=_STRESS),
    Argument("poisson_outer", "Poisson's ratio of the outer member, e.g. 0.3"),
    Argument("inner_bore", "Bore of the inner member (optional, default solid)", unit=_LEN),
    Argument("youngs_inner", "Young's modulus of the inner member (optional, default the outer's)",
             unit=_STRESS),
    Argument("poisson_inner", "Poisson's ratio of the inner member (optional, default the outer's)"),
    _result("MPa", "stress", "MPa, psi, ksi"),
    returns="the contact pressure, in result_unit",
    shape="one value",
)
def TWS_FIT_PRESSURE(interference, fit_diameter, outer_diameter, youngs_outer, poisson_outer,
                     inner_bore=None, youngs_inner=None, poisson_inner=None, result_unit=None):
    """Contact pressure ``p = δ / (d [ (1/Eo)((do²+d²)/(do²−d²) + νo) + (1/Ei)((d²+di²)/(d²−di²) − νi) ])``.

    Returns
    -------
    float or str
        A ``⚠`` message where the geometry or the materials cannot make a fit.
    """
    factor = result_factor(result_unit or "MPa", "stress")
    delta = read_field(interference, _f("interference"), "interference")
    d = read_field(fit_diameter, _f("fit_diameter"), "fit diameter")
    do = read_field(outer_diameter, _f("outer_diameter"), "outer diameter")
    eo = read_field(youngs_outer, _f("youngs_modulus"), "Young's modulus of the outer member")
    nuo = read_field(poisson_outer, _f("poisson_ratio"), "Poisson's ratio of the outer member")
    di = 0.0 if is_empty(inner_bore) else read_field(inner_bore, _f("inner_diameter"), "inner bore")
    ei = eo if is_empty(youngs_inner) else read_field(youngs_inner, _f("youngs_modulus"),
                                                      "Young's modulus of the inner member")
    nui = nuo if is_empty(poisson_inner) else read_field(poisson_inner, _f("poisson_ratio"),
                                                         "Poisson's ratio of the inner member")
    p = float(fit_pressure(delta, d, di, do, ei, nui, eo, nuo))
    if math.isnan(p):
        raise CellError("fit_diameter", "no fit: the diameters must satisfy inner bore < fit "
                        "diameter < outer diameter, with E above zero and Poisson's ratio in (-1, 0.5]")
    return p / factor


@cell_function(
    "Torque a fitted interface passes before it slips, (π/2)·μ·p·d²·L",
    Argument("pressure", "Contact pressure, e.g. from TWS_FIT_PRESSURE with its unit ('28 MPa')",
             unit=_STRESS),
    Argument("friction", "Friction coefficient (see the README's guidance; common practice)"),
    Argument("fit_diameter", "Diameter at the fit", unit=_LEN),
    Argument("fit_length", "Length of the fit passing the torque one way", unit=_LEN),
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    returns="the slip torque of the interface, in result_unit",
    shape="one value",
)
def TWS_SLIP_TORQUE(pressure, friction, fit_diameter, fit_length, result_unit=None):
    """Slip torque of a fit, ``(π/2) μ p d² L``."""
    factor = result_factor(result_unit, "torque")
    p = read_field(pressure, _f("fit_pressure"), "pressure")
    mu = read_field(friction, _f("friction"), "friction")
    d = read_field(fit_diameter, _f("fit_diameter"), "fit diameter")
    length = read_field(fit_length, _f("fit_length"), "fit length")
    return float(slip_torque(p, mu, d, length)) / factor


@cell_function(
    "Average shear stress in a bond passing a torque, T/(2π·r²·L); the shear peaks at the bond "
    "ends above this average",
    Argument("torque", "Torque the bond passes, e.g. '400 N·m'", unit="torque: N·m, lbf·in"),
    Argument("bond_diameter", "Diameter of the bond line", unit=_LEN),
    Argument("bond_length", "Bonded length passing the torque one way", unit=_LEN),
    _result("MPa", "stress", "MPa, psi"),
    returns="the average bond shear, in result_unit",
    shape="one value",
)
def TWS_BOND_STRESS(torque, bond_diameter, bond_length, result_unit=None):
    """Average bond shear ``|T| / (2π r² L)`` (the peaks at the ends are higher)."""
    factor = result_factor(result_unit or "MPa", "stress")
    t = read_field(torque, _f("interface_torque"), "torque")
    d = read_field(bond_diameter, _f("fit_diameter"), "bond diameter")
    length = read_field(bond_length, _f("bond_length"), "bond length")
    value = float(bond_shear(t, d, length))
    if math.isnan(value):
        raise CellError("bond_diameter", "bond diameter and bond length must be above zero")
    return value / factor


_LAYERS = Argument(
    "layers", "Layer block, innermost first: material, outer D, inner D; optional header row "
    "with units; each material needs a yield strength (materials block or library)", block=True)
_THEORY = Argument("theory", "Shear yield from the yield strength: 'max shear' (0.5·Sy) or "
                   "'distortion energy' (Sy/√3, the default)")
_MATERIALS = Argument("materials", "Optional materials block (header row: Material, G [GPa], "
                      "Yield strength [MPa], ...); names not found there come from the library",
                      block=True)


def _plastic_layers(layers, materials, theory):
    """(Do, Di, G, tau_y, present) of a one-part layer block, SI."""
    block = read_block(layers, materials, need_allowable=False)
    if block.multi_part:
        raise CellError("layers", "give the layers of one part")
    problem = block.problems[0]
    if problem is not None:
        raise CellError("layers", problem)
    rule = read_rule("distortion energy" if is_empty(theory) else theory, "theory")
    k = {1: 0.5, 2: 1.0 / math.sqrt(3.0)}.get(int(rule))
    if k is None:
        raise CellError("theory", "expected 'max shear' or 'distortion energy'")
    parts = block.parts
    material_set, _ = read_materials_block(materials)
    present = parts.present[:1]
    sy = np.full(present.shape, np.nan)
    for j in np.flatnonzero(present[0]).tolist():
        name = parts.materials[0, j]
        m = material_set.lookup(str(name), need_allowable=False)[0] if name is not None else None
        if m is None or not m.yield_strength > 0:
            raise CellError("layers", f"layer {j + 1}: no yield strength for material {name!r}: "
                            "give it in the materials block")
        sy[0, j] = m.yield_strength
    return (parts.outer_diameter[:1], parts.inner_diameter[:1], parts.shear_modulus[:1], k * sy,
            present)


@cell_function(
    "Fully plastic torque of a compound section, Σ 2π/3·τy·(ro³ − ri³) (elastic–perfectly plastic)",
    _LAYERS, _THEORY, _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"), _MATERIALS,
    returns="the fully plastic torque, in result_unit",
    shape="one value",
)
def TWS_PLASTIC_TORQUE(layers, theory=None, result_unit=None, materials=None):
    """Fully plastic torque of one part's layers."""
    factor = result_factor(result_unit, "torque")
    do, di, _, tau_y, present = _plastic_layers(layers, materials, theory)
    return float(fully_plastic_torque(do, di, tau_y, present)[0]) / factor


@cell_function(
    "Torque–twist curve of a compound section, elastic–perfectly plastic, from zero to four "
    "times the first-yield twist (spills a two-column table with a header row)",
    _LAYERS, _THEORY,
    Argument("points", "Number of points (optional, default 25, 2 to 500)"),
    Argument("twist_unit", "Unit of the twist per length (default °/m)",
             unit="angle per length: °/m, rad/m, °/ft"),
    Argument("torque_unit", "Unit of the torque (default N·m)", unit="torque: N·m, lbf·in"),
    _MATERIALS,
    returns="rows of (twist per length, torque) under a header row",
    shape="one per part",
)
def TWS_TORQUE_TWIST(layers, theory=None, points=None, twist_unit=None, torque_unit=None,
                     materials=None):
    """Torque–twist curve: twist per length against torque, a row per point."""
    tf = result_factor(torque_unit, "torque")
    pf = result_factor(twist_unit or "°/m", "angle_per_length")
    n = 25 if is_empty(points) else read_field(points, _f("points"), "points")
    if not (2 <= n <= 500 and float(n).is_integer()):
        raise CellError("points", f"expected a whole number from 2 to 500, got {n:g}")
    do, di, g, tau_y, present = _plastic_layers(layers, materials, theory)
    twist, torque = torque_twist_curve(do, di, g, tau_y, present, n_points=int(n))
    if not np.isfinite(torque).all():
        return f"{WARNING_SIGN} not computed"
    head = [f"twist per length [{twist_unit or '°/m'}]", f"torque [{torque_unit or 'N·m'}]"]
    return [head] + [[float(a / pf), float(b / tf)] for a, b in zip(twist[0], torque[0])]
