"""The worksheet functions: read the arguments through the intake, call the core, give back cells.

Nothing is computed here: every argument is read by the intake's rule for its field (the same
rule a workbook table's column follows), physics is the engine core's, words are the intake's.
These functions only fit shapes and convert units.

The names are upper case because the spreadsheet shows the Python name as the function's name.
The parameters carry no type hints on purpose: xlwings reads a parameter's hint as the
converter to apply to the cell value.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from numpy.typing import NDArray
from twistshare.engine.core import (
    AllowableRule,
    Duty,
    RadiusPlace,
    layer_at_radius,
    shear_stress_at,
    torque_from_power,
)
from twistshare.engine.intake import field_by_key, governs_text
from twistshare.engine.intake._allowable_rule import allowable_of

from ._arguments import (
    WARNING_SIGN,
    CellError,
    is_empty,
    read_field,
    read_flag,
    read_layer_number,
    read_rule,
    result_factor,
)
from ._blocks import Block, read_block
from ._registry import Argument, cell_function
from ._spill import merge, per_part, rate_block, spill_layers, spill_parts, unit_label

__all__ = [
    "TWS_SHARE",
    "TWS_LAYER_CAPACITY",
    "TWS_GOVERNING_LIMIT",
    "TWS_GOVERNS",
    "TWS_STRESS",
    "TWS_STRESS_AT",
    "TWS_TWIST_ANGLE",
    "TWS_TWIST_PER_LENGTH",
    "TWS_MARGIN",
    "TWS_TORQUE_FROM_POWER",
    "TWS_ALLOWABLE",
]

_TORQUE, _LENGTH_F = field_by_key("torque"), field_by_key("length")
_ANGLE_F, _PER_LENGTH_F = field_by_key("twist_limit_angle"), field_by_key("twist_limit_per_length")

_LAYERS = Argument(
    "layers",
    "Layer block, innermost first: material or G, outer D, inner D, allowable (optional where the "
    "material gives one), Kt; optional header row with units, e.g. 'Outer diameter [mm]'",
    block=True,
)
_LAYERS_NO_ALLOWABLE = Argument(
    "layers",
    "Layer block, innermost first: material or G, outer D, inner D (allowable and Kt are "
    "not used); optional header row with units",
    block=True,
)
_MATERIALS = Argument(
    "materials",
    "Optional materials block (header row: Material, G [GPa], Yield strength [MPa], ...); "
    "names not found there come from the built-in library",
    block=True,
)
_TORQUE_ARG = Argument(
    "torque", "Applied torque, e.g. '1200 N·m', or a column beside the block (zero or more)",
    unit="torque: N·m, kN·m, lbf·in, lbf·ft")
_LENGTH = Argument("length", "Length over which the layers twist together, e.g. '850 mm' "
                   "(optional)", unit="length: mm, m, in, ft")
_TWIST_LIMIT = Argument("twist_limit", "Largest total twist allowed over the length, e.g. "
                        "'0.5°' (optional)", unit="angle: °, deg, rad")
_TWIST_PER_LENGTH = Argument("twist_limit_per_length", "Largest twist per length allowed, "
                             "e.g. '0.25 °/m' (optional)", unit="angle per length: °/m, rad/m, °/ft")


def _result(default: str, kind_words: str, examples: str) -> Argument:
    return Argument("result_unit", f"Unit of the result (default {default})",
                    unit=f"{kind_words}: {examples}")


def _duty(block: Block, torque: Any = None, length: Any = None, twist_limit: Any = None,
          twist_limit_per_length: Any = None, *, torque_required: bool = False,
          length_required: bool = False) -> tuple[Duty, list[str | None]]:
    """The duty of every part of the block from the arguments; per-part problems, worded."""
    values, problems = [], []
    for value, field, where, required in (
        (torque, _TORQUE, "torque", torque_required),
        (length, _LENGTH_F, "length", length_required),
        (twist_limit, _ANGLE_F, "twist limit", False),
        (twist_limit_per_length, _PER_LENGTH_F, "twist limit per length", False),
    ):
        got, found = per_part(None if value is None and not required else value, field, block, where, required)
        values.append(got)
        problems.append(found)
    return Duty.from_arrays(*values), merge(*problems)


def _rated(layers, materials, need_allowable=True, **duty):
    block = read_block(layers, materials, need_allowable)
    duty_arrays, extra = _duty(block, **duty)
    rating, problems = rate_block(block, duty_arrays, extra)
    return block, rating, problems


def _title(name: str, result_unit: Any, kind: str) -> str:
    unit = unit_label(result_unit, kind)
    return f"{name} [{unit}]" if unit else name


def _values(array: NDArray[np.float64], factor: float) -> list[object]:
    return [float(v / factor) if not math.isnan(v) else f"{WARNING_SIGN} not computed" for v in array]


@cell_function(
    "Share of the torque each layer carries (spills one value per layer)",
    _LAYERS_NO_ALLOWABLE,
    _result("a fraction", "plain number", "'%' for per cent"),
    _MATERIALS,
    returns="one share per layer; fractions of 1 unless result_unit is '%'",
    shape="one per layer",
)
def TWS_SHARE(layers, result_unit=None, materials=None):
    """Share of the torque each layer carries, ``G_i J_i / ΣGJ``.

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_block` for its shapes).
    result_unit : str, optional
        ``"%"`` for per cent; default a fraction of 1.
    materials : list of lists, optional
        A materials block with a header row; the built-in library is searched after it.

    Returns
    -------
    list of lists, or str
        One share per layer (spills); a ``⚠`` message if it cannot be computed.
    """
    factor = result_factor(result_unit, "dimensionless")
    block, rating, problems = _rated(layers, materials, need_allowable=False)
    return spill_layers(block, rating.share, factor, problems, _title("share", result_unit, "dimensionless"))


@cell_function(
    "Section torque at which each layer reaches its allowable shear stress, Kt included "
    "(spills one value per layer)",
    _LAYERS,
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    _MATERIALS,
    returns="one capacity per layer, in result_unit",
    shape="one per layer",
)
def TWS_LAYER_CAPACITY(layers, result_unit=None, materials=None):
    """Section torque at which each layer reaches its allowable, ``τa ΣGJ / (G ro Kt)``.

    Parameters are those of `TWS_SHARE`; `result_unit` is a torque unit (default N·m).

    Returns
    -------
    list of lists, or str
        One capacity per layer (spills), or a ``⚠`` message.
    """
    factor = result_factor(result_unit, "torque")
    block, rating, problems = _rated(layers, materials)
    return spill_layers(block, rating.capacity, factor, problems, _title("capacity", result_unit, "torque"))


@cell_function(
    "Governing limit: the smallest capacity of every criterion (each layer's stress, the twist limits)",
    _LAYERS,
    _LENGTH,
    _TWIST_LIMIT,
    _TWIST_PER_LENGTH,
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    _MATERIALS,
    returns="the governing torque of the part (one per part for a block of several parts)",
    shape="one per part",
)
def TWS_GOVERNING_LIMIT(layers, length=None, twist_limit=None, twist_limit_per_length=None,
                        result_unit=None, materials=None):
    """The smallest capacity of every criterion (layer stresses, twist limits).

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_block` for its shapes).
    length : str or number with its unit, optional
    twist_limit : str, angle, optional
    twist_limit_per_length : str, angle per length, optional
    result_unit : str, optional
        A torque unit; default N·m.
    materials : list of lists, optional

    Returns
    -------
    float, list of lists or str
        One value per part, or a ``⚠`` message.
    """
    factor = result_factor(result_unit, "torque")
    block, rating, problems = _rated(layers, materials, length=length, twist_limit=twist_limit,
                                     twist_limit_per_length=twist_limit_per_length)
    return spill_parts(block, _values(rating.governing_capacity, factor), problems,
                       _title("governing limit", result_unit, "torque"))


@cell_function(
    "What governs: 'layer 2 stress (material)', 'twist angle limit' or 'twist per length limit'",
    _LAYERS,
    _LENGTH,
    _TWIST_LIMIT,
    _TWIST_PER_LENGTH,
    _MATERIALS,
    returns="a short text per part, worded as the rated workbook's 'Governs' column",
    shape="one per part",
)
def TWS_GOVERNS(layers, length=None, twist_limit=None, twist_limit_per_length=None, materials=None):
    """What governs the part, in the words of the results sheet's ``Governs`` column.

    Parameters are those of `TWS_GOVERNING_LIMIT` without the result unit.

    Returns
    -------
    str or list of lists
        One text per part.
    """
    block, rating, problems = _rated(layers, materials, length=length, twist_limit=twist_limit,
                                     twist_limit_per_length=twist_limit_per_length)
    names = block.parts.materials
    texts = [governs_text(int(c), int(k), names[i][int(k)] if int(k) >= 0 else None)
             or f"{WARNING_SIGN} not rated"
             for i, (c, k) in enumerate(zip(rating.governing_criterion, rating.governing_layer))]
    return spill_parts(block, texts, problems, "governs")


@cell_function(
    "Shear stress in each layer at its outer radius at a torque, nominal (no Kt) "
    "(spills one value per layer)",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_ARG,
    _result("MPa", "stress", "MPa, N/mm², psi, ksi"),
    _MATERIALS,
    returns="one stress per layer, in result_unit",
    shape="one per layer",
)
def TWS_STRESS(layers, torque, result_unit=None, materials=None):
    """Nominal shear stress at each layer's outer radius, ``G ro θ'`` (no Kt).

    Parameters
    ----------
    layers : list of lists
    torque : str, torque
        ``"1200 N·m"``; or a column beside a block of many parts.
    result_unit : str, optional
        A stress unit; default MPa.
    materials : list of lists, optional

    Returns
    -------
    list of lists, or str
    """
    factor = result_factor(result_unit, "stress")
    block, rating, problems = _rated(layers, materials, need_allowable=False, torque=torque, torque_required=True)
    return spill_layers(block, rating.stress_outer, factor, problems, _title("stress", result_unit, "stress"))


@cell_function(
    "Shear stress at a radius at a torque, nominal (no Kt); on an interface give the layer",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_ARG,
    Argument("radius", "Radius from the axis, e.g. '20 mm'", unit="length: mm, m, in"),
    Argument("layer", "Layer number (1 = innermost) the radius belongs to; needed only on an "
             "interface, where the stress jumps (optional)"),
    _result("MPa", "stress", "MPa, N/mm², psi, ksi"),
    _MATERIALS,
    returns="the stress at that radius, in result_unit",
    shape="one per part",
)
def TWS_STRESS_AT(layers, torque, radius, layer=None, result_unit=None, materials=None):
    """Nominal shear stress at a radius, ``G r θ'``, in the layer the radius lies in.

    Parameters
    ----------
    layers : list of lists
    torque : str, torque
    radius : str, length
    layer : int, optional
        1-based layer number; needed only on an interface, where the stress jumps.
    result_unit : str, optional
        A stress unit; default MPa.
    materials : list of lists, optional

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "stress")
    block, rating, problems = _rated(layers, materials, need_allowable=False, torque=torque, torque_required=True)
    radii, radius_problems = per_part(radius, _LENGTH_F, block, "radius", required=True)
    stack = block.parts
    chosen = read_layer_number(layer, stack.present.shape[1], "layer")
    slot, place = layer_at_radius(stack.outer_diameter, stack.inner_diameter, stack.present, radii, chosen)
    problems = merge(problems, radius_problems, _radius_problems(block, radii, slot, place, chosen))
    modulus = stack.shear_modulus[np.arange(block.n_parts), slot]
    stress = shear_stress_at(radii, modulus, rating.twist_per_length)
    return spill_parts(block, _values(np.atleast_1d(stress), factor), problems,
                       _title("stress", result_unit, "stress"))


def _radius_problems(block: Block, radii: NDArray[np.float64], slot: NDArray[np.intp],
                     place: NDArray[np.int8], chosen: int | None) -> list[str | None]:
    out: list[str | None] = [None] * block.n_parts
    for part in np.flatnonzero(place != RadiusPlace.IN_LAYER).tolist():
        if math.isnan(radii[part]):
            continue
        shown = f"{radii[part] / 0.0254:g} in" if block.system == "US" else f"{radii[part] / 1e-3:g} mm"
        label = block.part_label(part)
        prefix = f"radius, {label}" if label else "radius"
        if place[part] == RadiusPlace.NOT_IN_LAYER:
            out[part] = f"{prefix}: {shown} is not in layer {chosen + 1}"
        elif place[part] == RadiusPlace.OUTSIDE:
            out[part] = f"{prefix}: {shown} is outside the section"
        else:
            out[part] = (f"{prefix}: {shown} is on the interface of layers {slot[part] + 1} and "
                         f"{slot[part] + 2}, where the stress jumps; give the layer")
    return out


@cell_function(
    "Twist angle over the length at a torque, phi = T·L / ΣGJ",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_ARG,
    Argument("length", "Length over which the layers twist together, e.g. '850 mm'",
             unit="length: mm, m, in, ft"),
    _result("°", "angle", "°, deg, rad"),
    _MATERIALS,
    returns="the twist angle, in result_unit",
    shape="one per part",
)
def TWS_TWIST_ANGLE(layers, torque, length, result_unit=None, materials=None):
    """Twist angle over the length, ``φ = T L / ΣGJ``.

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "angle")
    block, rating, problems = _rated(layers, materials, need_allowable=False, torque=torque, length=length,
                                     torque_required=True, length_required=True)
    return spill_parts(block, _values(rating.twist_angle, factor), problems,
                       _title("twist angle", result_unit, "angle"))


@cell_function(
    "Twist per length at a torque, common to every layer: theta' = T / ΣGJ",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_ARG,
    _result("°/m", "angle per length", "°/m, rad/m, °/ft"),
    _MATERIALS,
    returns="the twist per length, in result_unit",
    shape="one per part",
)
def TWS_TWIST_PER_LENGTH(layers, torque, result_unit=None, materials=None):
    """Twist per length common to every layer, ``θ' = T / ΣGJ``.

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "angle_per_length")
    block, rating, problems = _rated(layers, materials, need_allowable=False, torque=torque, torque_required=True)
    return spill_parts(block, _values(rating.twist_per_length, factor), problems,
                       _title("twist per length", result_unit, "angle_per_length"))


@cell_function(
    "Margin left at a torque, in per cent as the rated workbook shows it: governing limit / torque - 1",
    _LAYERS,
    _TORQUE_ARG,
    _LENGTH,
    _TWIST_LIMIT,
    _TWIST_PER_LENGTH,
    _result("%", "plain number", "'%', or '1' for a fraction"),
    _MATERIALS,
    returns="the margin per part, in per cent; negative when the torque exceeds the governing limit",
    shape="one per part",
)
def TWS_MARGIN(layers, torque, length=None, twist_limit=None, twist_limit_per_length=None,
               result_unit=None, materials=None):
    """Margin at a torque, ``governing limit / T - 1``, in per cent unless asked otherwise.

    Parameters
    ----------
    layers : list of lists
    torque : str, torque
    length, twist_limit, twist_limit_per_length : str, optional
        As for `TWS_GOVERNING_LIMIT`.
    result_unit : str, optional
        ``"%"`` (the default, as the results sheet's ``Margin [%]``) or ``"1"`` for a fraction.
    materials : list of lists, optional

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor("%" if is_empty(result_unit) else result_unit, "dimensionless")
    block, rating, problems = _rated(layers, materials, torque=torque, length=length, twist_limit=twist_limit,
                                     twist_limit_per_length=twist_limit_per_length, torque_required=True)
    values = [f"{WARNING_SIGN} torque is zero: no margin to state"
              if isinstance(m, float) and math.isinf(m) else m
              for m in _values(rating.margin, factor)]
    return spill_parts(block, values, problems, _title("margin", result_unit or "%", "dimensionless"))


@cell_function(
    "Torque a drive puts through the shaft: T = SF·P/ω",
    Argument("power", "Power transmitted, e.g. '15 kW' or '20 hp'", unit="power: kW, W, hp"),
    Argument("speed", "Shaft speed, e.g. '1450 rpm'", unit="rotational speed: rpm, r/min, rad/s"),
    Argument("service_factor", "Service factor on the demand (optional, default 1)"),
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    returns="the torque, in result_unit",
    shape="one value",
)
def TWS_TORQUE_FROM_POWER(power, speed, service_factor=None, result_unit=None):
    """Torque from power and speed, ``T = SF P / ω``.

    Parameters
    ----------
    power : str, power
        ``"15 kW"``, ``"20 hp"``.
    speed : str, rotational speed
        ``"1450 rpm"``; ``Hz`` is refused (revolutions or radians?).
    service_factor : number, 1, optional
        Default 1.
    result_unit : str, optional
        A torque unit; default N·m.

    Returns
    -------
    float or str
    """
    factor = result_factor(result_unit, "torque")
    watts = read_field(power, field_by_key("power"), "power")
    omega = read_field(speed, field_by_key("speed"), "speed")
    service = 1.0 if is_empty(service_factor) else read_field(service_factor, field_by_key("service_factor"),
                                                                "service factor")
    return float(torque_from_power(watts, omega, service)) / factor


@cell_function(
    "Allowable shear stress from strength: max shear (Tresca), distortion energy (von Mises) "
    "or shafting code",
    Argument("rule", "'max shear' (0.5·Sy/FS), 'distortion energy' (Sy/(√3·FS)) or "
             "'shafting code' (min(0.30·Sy, 0.18·Su), ×0.75 with a keyway)"),
    Argument("yield_strength", "Tensile yield strength Sy, e.g. '310 MPa'",
             unit="stress: MPa, N/mm², psi, ksi"),
    Argument("ultimate_strength", "Ultimate tensile strength Su (shafting code only)",
             unit="stress: MPa, N/mm², psi, ksi"),
    Argument("factor_of_safety", "Factor of safety FS, at least 1 (max shear and distortion "
             "energy only)"),
    Argument("keyway", "TRUE or yes where a keyway is cut (shafting code only)"),
    _result("MPa", "stress", "MPa, N/mm², psi, ksi"),
    returns="the allowable shear stress, in result_unit",
    shape="one value",
)
def TWS_ALLOWABLE(rule, yield_strength, ultimate_strength=None, factor_of_safety=None,
                  keyway=None, result_unit=None):
    """Allowable shear stress from strength by rule, decided as a materials table's row is.

    Parameters
    ----------
    rule : str
        ``"max shear"`` (Tresca, 0.5 Sy/FS), ``"distortion energy"`` (von Mises,
        Sy/(√3 FS)) or ``"shafting code"`` (min(0.30 Sy, 0.18 Su), ×0.75 with a keyway).
    yield_strength : str, stress
    ultimate_strength : str, stress, optional
        Needed by the shafting code rule; refused below the yield strength (check both).
    factor_of_safety : number, 1, optional
        Needed by the two theories, at least 1; refused with the shafting code rule, which
        embeds its own allowance (it would be ignored).
    keyway : bool or yes/no, optional
        Shafting code rule only; refused with the theories (use Kt there).
    result_unit : str, optional
        A stress unit; default MPa.

    Returns
    -------
    float or str
    """
    factor = result_factor(result_unit, "stress")
    chosen = read_rule(rule, "rule")
    if chosen == AllowableRule.GIVEN:
        raise CellError("rule", "'given' means the allowable is typed directly; nothing to compute")
    sy = read_field(yield_strength, field_by_key("yield_strength"), "yield strength")
    su = math.nan if is_empty(ultimate_strength) else read_field(
        ultimate_strength, field_by_key("ultimate_strength"), "ultimate strength")
    fs = math.nan if is_empty(factor_of_safety) else read_field(
        factor_of_safety, field_by_key("factor_of_safety"), "factor of safety")
    decision = allowable_of(None, chosen, math.nan, sy, su, fs, read_flag(keyway, "keyway"))
    # Notes as well as a missing input refuse: a cell cannot show a number and a warning together.
    if decision.missing is not None:
        raise CellError("", decision.missing)
    doubts = [note for note in decision.notes if not note.assumed]
    if doubts:
        raise CellError("", doubts[0].message)
    return decision.allowable / factor
