"""The worksheet functions beyond torsion: bending and combined stress, first critical speed,
laminate moduli from ply data and a layup, torsional buckling torque.

Thin, as every cell function: arguments read through the intake (the same fields as the
parts table's ``Bending moment``, ``Axial force``, ``Supports`` columns and the ply columns),
physics from the core. Each layer's E, density and Poisson's ratio come from its material
(the materials block, then the built-in library).
"""

from __future__ import annotations

import math
from functools import lru_cache
from typing import Any

import numpy as np
from twistshare.engine.core import (
    AllowableRule,
    EndSupport,
    equivalent_stress,
    laminate_moduli,
    section_bending,
    torsional_buckling,
    whirl_check,
)
from twistshare.engine.intake import LayupNotationError, field_by_key, parse_layup, where_text
from twistshare.engine.intake._words import SUPPORT_CHOICES, support_from_text

from ._arguments import CellError, is_empty, read_field, result_factor
from ._blocks import Block
from ._functions import _LAYERS_NO_ALLOWABLE, _LENGTH_F, _MATERIALS, _TORQUE_ARG, _rated, _result, _title, _values
from ._registry import Argument, cell_function
from ._spill import merge, per_part, spill_layers, spill_parts

__all__ = ["TWS_BENDING_STRESS", "TWS_COMBINED_STRESS", "TWS_CRITICAL_SPEED", "TWS_LAMINATE_G",
           "TWS_LAMINATE_E", "TWS_BUCKLING_TORQUE"]

_MOMENT_F, _FORCE_F = field_by_key("bending_moment"), field_by_key("axial_force")
_MOMENT = Argument("moment", "Resultant bending moment at the section, e.g. '450 N·m', or a column "
                   "beside the block", unit="torque: N·m, kN·m, lbf·in, lbf·ft")
_FORCE = Argument("axial_force", "Axial force, + tension, e.g. '12 kN' (optional)", unit="force: N, kN, lbf")
_SPAN = Argument("length", "Span between the supports (the overhang when overhung), e.g. '2400 mm'",
                 unit="length: mm, m, in, ft")
_SUPPORTS = Argument("supports", f"How the ends are held: {SUPPORT_CHOICES} (optional)")
_FS = Argument("factor_of_safety", "Factor of safety on the buckling torque (optional, default 1; "
               "the knock-down 0.67 applies anyway)")
_PLY = (
    Argument("e1", "Ply modulus along the fibres E1, e.g. '135 GPa'", unit="stress: GPa, Msi"),
    Argument("e2", "Ply modulus across the fibres E2, e.g. '10 GPa'", unit="stress: GPa, Msi"),
    Argument("g12", "Ply in-plane shear modulus G12, e.g. '5 GPa'", unit="stress: GPa, Msi"),
    Argument("nu12", "Ply major Poisson's ratio ν12, e.g. 0.3"),
    Argument("ply_thickness", "Ply thickness, e.g. '0.125 mm'", unit="length: mm, in"),
    Argument("layup", "Layup in laminate notation, e.g. '[±45]s' or '[0/±45/90]2s'"),
)


def _property(block: Block, key: str, words: str) -> tuple[np.ndarray, list[str | None]]:
    """A per-layer material property of the block, and per part the layer that lacks it."""
    parts = block.parts
    values = parts.inputs.get(key, np.full(parts.present.shape, np.nan))
    problems: list[str | None] = [None] * block.n_parts
    lacking = parts.present & np.isnan(values)
    for i in np.flatnonzero(lacking.any(axis=1)).tolist():
        j = int(np.flatnonzero(lacking[i])[0])
        mat = parts.materials[i, j]
        whose = f"material {mat!r} gives no {words}" if mat is not None else f"a layer given by G has no {words}"
        label = where_text(block.part_label(i) or None, j + 1)
        problems[i] = f"{label}: {whose}: add it to the materials block"
    return values, problems


def _bending(block, moment, axial_force):
    moments, moment_problems = per_part(moment, _MOMENT_F, block, "moment", required=True)
    forces, force_problems = per_part(axial_force, _FORCE_F, block, "axial force", required=False)
    modulus, modulus_problems = _property(block, "youngs_modulus", "Young's modulus E")
    stack = block.parts
    used = stack.present & ~np.isnan(modulus)
    bend = section_bending(stack.outer_diameter, stack.inner_diameter, np.where(used, modulus, 1.0),
                           np.nan_to_num(moments), np.nan_to_num(forces), present=used)
    return bend, merge(moment_problems, force_problems, modulus_problems)


@cell_function(
    "Normal stress in each layer at its outer radius from a bending moment (and an axial force): "
    "sigma = E_i·(M/ΣEI)·r + E_i·N/ΣEA (spills one value per layer)",
    _LAYERS_NO_ALLOWABLE,
    _MOMENT,
    _FORCE,
    _result("MPa", "stress", "MPa, N/mm², psi, ksi"),
    _MATERIALS,
    returns="one stress per layer, in result_unit",
    shape="one per layer",
)
def TWS_BENDING_STRESS(layers, moment, axial_force=None, result_unit=None, materials=None):
    """Bending (plus axial) stress at each layer's outer radius, plane sections, one curvature.

    Returns
    -------
    list of lists, or str
    """
    factor = result_factor(result_unit, "stress")
    block, _, problems = _rated(layers, materials, need_allowable=False)
    bend, more = _bending(block, moment, axial_force)
    return spill_layers(block, np.asarray(bend.normal_outer), factor, merge(problems, more),
                        _title("bending stress", result_unit, "stress"))


@cell_function(
    "Combined stress in each layer at its outer radius, nominal (no Kt), by the layer's rule: "
    "distortion energy sqrt(σ²+3τ²), otherwise maximum shear sqrt(σ²+4τ²) (spills one value per layer)",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_ARG,
    _MOMENT,
    _FORCE,
    _result("MPa", "stress", "MPa, N/mm², psi, ksi"),
    _MATERIALS,
    returns="one equivalent stress per layer, in result_unit",
    shape="one per layer",
)
def TWS_COMBINED_STRESS(layers, torque, moment, axial_force=None, result_unit=None, materials=None):
    """Equivalent stress of the bending (and axial) and torsional stress at each layer's outer radius.

    Returns
    -------
    list of lists, or str
    """
    factor = result_factor(result_unit, "stress")
    block, rating, problems = _rated(layers, materials, need_allowable=False, torque=torque,
                                     torque_required=True)
    bend, more = _bending(block, moment, axial_force)
    rule = np.asarray(block.parts.allowable_rule if block.parts.allowable_rule is not None
                      else np.zeros(block.parts.present.shape, np.int8))
    theory = np.where(rule == int(AllowableRule.DISTORTION_ENERGY), int(AllowableRule.DISTORTION_ENERGY),
                      int(AllowableRule.MAX_SHEAR))
    stress = np.asarray(equivalent_stress(np.asarray(bend.normal_outer), np.asarray(rating.stress_outer),
                                          theory), dtype=float)
    return spill_layers(block, np.atleast_2d(stress), factor, merge(problems, more),
                        _title("combined stress", result_unit, "stress"))


def _supports(value: Any, n_parts: int) -> np.ndarray:
    if is_empty(value):
        return np.full(n_parts, int(EndSupport.PINNED_PINNED))
    code = support_from_text(value)
    if code is None:
        raise CellError("supports", f"{str(value)!r} is not one of: {SUPPORT_CHOICES}")
    return np.full(n_parts, int(code))


@cell_function(
    "First bending critical speed, Euler-Bernoulli: ω1 = (βL)²/L²·sqrt(ΣEI/m), m = Σρ·A "
    "(simply supported: (βL)² = π²)",
    _LAYERS_NO_ALLOWABLE,
    _SPAN,
    _SUPPORTS,
    _result("rpm", "rotational speed", "rpm, rad/s, rev/s"),
    _MATERIALS,
    returns="the first critical speed, in result_unit",
    shape="one per part",
)
def TWS_CRITICAL_SPEED(layers, length, supports=None, result_unit=None, materials=None):
    """First bending critical speed of the compound tube (keep running speeds below about 70 % of it).

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "speed")
    block, _, problems = _rated(layers, materials, need_allowable=False)
    spans, span_problems = per_part(length, _LENGTH_F, block, "length", required=True)
    code = _supports(supports, block.n_parts)
    modulus, e_problems = _property(block, "youngs_modulus", "Young's modulus E")
    density, rho_problems = _property(block, "density", "density")
    stack = block.parts
    used = stack.present & ~np.isnan(modulus) & ~np.isnan(density)
    check = whirl_check(stack.outer_diameter, stack.inner_diameter, np.where(used, modulus, 1.0),
                        np.where(used, density, 1.0), spans, np.nan, code, present=used)
    return spill_parts(block, _values(np.asarray(check.critical_speed), factor),
                       merge(problems, span_problems, e_problems, rho_problems),
                       _title("first critical speed", result_unit, "speed"))


@cell_function(
    "Torsional buckling torque of a thin compound wall over the factor of safety (knock-down 0.67); "
    "'not thin-walled' for walls with mean radius below 10 wall thicknesses",
    _LAYERS_NO_ALLOWABLE,
    _SPAN,
    _FS,
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    _MATERIALS,
    returns="the buckling torque over the factor of safety, in result_unit",
    shape="one per part",
)
def TWS_BUCKLING_TORQUE(layers, length, factor_of_safety=None, result_unit=None, materials=None):
    """Section torque at which the thin wall buckles in torsion, over the factor of safety.

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "torque")
    block, _, problems = _rated(layers, materials, need_allowable=False)
    spans, span_problems = per_part(length, _LENGTH_F, block, "length", required=True)
    safety = 1.0 if is_empty(factor_of_safety) else read_field(
        factor_of_safety, field_by_key("factor_of_safety"), "factor of safety")
    modulus, e_problems = _property(block, "youngs_modulus", "Young's modulus E")
    poisson, nu_problems = _property(block, "poisson_ratio", "Poisson's ratio")
    stack = block.parts
    used = stack.present & ~np.isnan(modulus) & ~np.isnan(poisson)
    result = torsional_buckling(stack.outer_diameter, stack.inner_diameter, np.where(used, modulus, 1.0),
                                np.where(used, poisson, 0.3), spans, safety, present=used)
    capacity = np.asarray(result.capacity, dtype=float)
    values: list[object] = _values(capacity, factor)
    values = ["⚠ not thin-walled: torsional buckling does not apply" if math.isinf(c) else v
              for c, v in zip(capacity.tolist(), values)]
    return spill_parts(block, values, merge(problems, span_problems, e_problems, nu_problems),
                       _title("buckling torque", result_unit, "torque"))


# A sheet asks for the same laminate again and again: its G and its E, every row of a catalogue
# wound to one specification, every recalculation. The notation is read and the laminate solved
# once per distinct input (the results are frozen, so sharing them is safe).
@lru_cache(maxsize=256)
def _layup_angles(text: str) -> tuple[float, ...]:
    return tuple(parse_layup(text))


@lru_cache(maxsize=256)
def _laminate_solved(e1: float, e2: float, g12: float, nu12: float, ply_thickness: float,
                     angles: tuple[float, ...]):
    return laminate_moduli(e1, e2, g12, nu12, ply_thickness, np.radians(np.asarray(angles, dtype=float)))


def _laminate(e1, e2, g12, nu12, ply_thickness, layup):
    ply = [read_field(value, field_by_key(key), where) for value, key, where in (
        (e1, "ply_e1", "E1"), (e2, "ply_e2", "E2"), (g12, "ply_g12", "G12"), (nu12, "ply_nu12", "ν12"),
        (ply_thickness, "ply_thickness", "ply thickness"))]
    if is_empty(layup) or not isinstance(layup, str):
        raise CellError("layup", "expected a layup in laminate notation, e.g. '[±45]s'")
    try:
        angles = _layup_angles(layup.strip())
    except LayupNotationError as error:
        raise CellError("layup", str(error)) from None
    moduli = _laminate_solved(*ply, angles)
    if not bool(np.asarray(moduli.valid)[0]):
        raise CellError("ply data", "the plies are not usable (check E1, E2, G12 and ν12)")
    return moduli


@cell_function(
    "Laminate shear modulus for torsion from ply data and a layup, classical lamination theory: "
    "Gxy = A66/t",
    *_PLY,
    _result("GPa", "stress", "GPa, MPa, Msi"),
    returns="the laminate's shear modulus, in result_unit",
    shape="one value",
)
def TWS_LAMINATE_G(e1, e2, g12, nu12, ply_thickness, layup, result_unit=None):
    """Shear modulus of a wound laminate in torsion, ``A66 / t``.

    Returns
    -------
    float or str
    """
    factor = result_factor(result_unit or "GPa", "stress")
    return float(np.asarray(_laminate(e1, e2, g12, nu12, ply_thickness, layup).shear_modulus)[0] / factor)


@cell_function(
    "Laminate axial (bending) modulus from ply data and a layup, classical lamination theory: "
    "Ex = 1/(t·a11), a = A⁻¹",
    *_PLY,
    _result("GPa", "stress", "GPa, MPa, Msi"),
    returns="the laminate's axial modulus, in result_unit",
    shape="one value",
)
def TWS_LAMINATE_E(e1, e2, g12, nu12, ply_thickness, layup, result_unit=None):
    """Axial modulus of a wound laminate, used in bending, ``1 / (t a11)``.

    Returns
    -------
    float or str
    """
    factor = result_factor(result_unit or "GPa", "stress")
    return float(np.asarray(_laminate(e1, e2, g12, nu12, ply_thickness, layup).axial_modulus)[0] / factor)
