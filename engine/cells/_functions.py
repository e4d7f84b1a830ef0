"""The worksheet functions: read the cells, call the engine core, give back cell values.

Nothing is computed here: units go through `twistshare.engine.units`, physics through
`twistshare.engine.core`; these functions only fit shapes and convert units.

The names are upper case because Excel shows the Python name as the function's name. The
parameters carry no type hints on purpose: xlwings reads a parameter's hint as the
converter to apply to the cell value.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from numpy.typing import NDArray

from twistshare.engine.core import (
    AllowableRule,
    Criterion,
    Duty,
    PartFlag,
    Rating,
    allowable_shear,
    rate,
    shear_stress_at,
    torque_from_power,
)

from ._allowable_checks import allowable_refusal
from ._declare import Argument, cell_function
from ._layer_block import LayerBlock, read_layers
from ._materials_block import read_materials
from ._shapes import per_part, rating_problems, spill_layers, spill_parts, unit_label
from ._values import (
    WARNING_SIGN,
    CellError,
    is_empty,
    read_flag,
    read_layer_number,
    read_number,
    read_quantity,
    read_rule,
    result_factor,
)

__all__ = [
    "TWS_SHARE",
    "TWS_LAYER_CAPACITY",
    "TWS_GOVERNING_LIMIT",
    "TWS_GOVERNS",
    "TWS_STRESS",
    "TWS_STRESS_AT",
    "TWS_TWIST_ANGLE",
    "TWS_TWIST_RATE",
    "TWS_MARGIN",
    "TWS_TORQUE_FROM_POWER",
    "TWS_ALLOWABLE",
]

_LAYERS = Argument(
    "layers",
    "Layer block, innermost first: material or G, outer D, inner D, allowable, Kt; "
    "optional header row with units, e.g. 'Outer diameter [mm]'",
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
_TORQUE_UNITS = "torque: N·m, kN·m, lbf·in, lbf·ft"
_TORQUE_MAGNITUDE = Argument(
    "torque", "Applied torque, e.g. '1200 N·m', or a column beside the block; its magnitude "
    "is rated (a negative torque gives the same margin)", unit=_TORQUE_UNITS)
_TORQUE_SIGNED = Argument(
    "torque", "Applied torque, e.g. '1200 N·m', or a column beside the block; the result "
    "takes its sign (stress and twist are odd in the torque)", unit=_TORQUE_UNITS)
_LENGTH = Argument("length", "Length over which the layers twist together, e.g. '850 mm' "
                   "(optional)", unit="length: mm, m, in, ft")
_TWIST_LIMIT = Argument("twist_limit", "Largest total twist allowed over the length, e.g. "
                        "'0.5°' (optional)", unit="angle: °, deg, rad")
_TWIST_PER_LENGTH = Argument("twist_limit_per_length", "Largest twist per length allowed, "
                             "e.g. '0.25 °/m' (optional)", unit="angle per length: °/m, rad/m, °/ft")


def _result(default: str, kind_words: str, examples: str) -> Argument:
    return Argument("result_unit", f"Unit of the result (default {default})",
                    unit=f"{kind_words}: {examples}")


def _block(layers: Any, materials: Any, need_allowable: bool = True) -> LayerBlock:
    return read_layers(layers, read_materials(materials), need_allowable)


def _merge(*problem_lists: list[str | None]) -> list[str | None]:
    merged = list(problem_lists[0])
    for problems in problem_lists[1:]:
        merged = [a if a is not None else b for a, b in zip(merged, problems)]
    return merged


def _duty_and_rating(block: LayerBlock, torque: Any = None, length: Any = None,
                     twist_limit: Any = None, twist_limit_per_length: Any = None,
                     torque_required: bool = False, length_required: bool = False
                     ) -> tuple[Rating, list[str | None]]:
    """Rate the block's parts with the duty arguments; per-part problems, worded."""
    n = block.n_parts
    nan = np.full(n, math.nan)
    problems: list[list[str | None]] = []
    values = []
    for value, kind, where, required in (
        (torque, "torque", "torque", torque_required),
        (length, "length", "length", length_required),
        (twist_limit, "angle", "twist limit", False),
        (twist_limit_per_length, "angle_per_length", "twist limit per length", False),
    ):
        if value is None and not required:
            values.append(nan)
            continue
        got, found = per_part(value, kind, block, where, required)
        values.append(got)
        problems.append(found)
    rating = rate(block.stack, Duty.from_arrays(*values))
    extra = _merge(*problems) if problems else None
    return rating, rating_problems(block, rating, extra)


def _torque_sign(rating: Rating) -> NDArray[np.float64]:
    """-1 for parts whose torque is negative, else +1 (per part).

    The core rates the magnitude and notes the sign (`PartFlag.TORQUE_NEGATIVE`). Stress and
    twist are odd in T, so the signed results carry the torque's sign; capacities and
    margins are the same either way and stay as rated.
    """
    negative = (np.asarray(rating.part_flags) & int(PartFlag.TORQUE_NEGATIVE)) != 0
    return np.where(negative, -1.0, 1.0)


def _title(name: str, result_unit: Any, kind: str) -> str:
    unit = unit_label(result_unit, kind)
    return f"{name} [{unit}]" if unit else name


def _values(array: NDArray[np.float64], factor: float) -> list[object]:
    return [float(v / factor) if not math.isnan(v) else f"{WARNING_SIGN} not computed"
            for v in array]


@cell_function(
    "Share of the torque each layer carries (spills one value per layer)",
    _LAYERS_NO_ALLOWABLE,
    _result("a fraction", "plain number", "'%' for per cent"),
    _MATERIALS,
    returns="one share per layer; fractions of 1 unless result_unit is '%'",
)
def TWS_SHARE(layers, result_unit=None, materials=None):
    """Share of the torque each layer carries, ``G_i J_i / ΣGJ``.

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_layers` for its shapes).
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
    block = _block(layers, materials, need_allowable=False)
    rating, problems = _duty_and_rating(block)
    return spill_layers(block, rating.share, factor, problems,
                        _title("share", result_unit, "dimensionless"))


@cell_function(
    "Section torque at which each layer reaches its allowable shear stress, Kt included "
    "(spills one value per layer)",
    _LAYERS,
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    _MATERIALS,
    returns="one capacity per layer, in result_unit",
)
def TWS_LAYER_CAPACITY(layers, result_unit=None, materials=None):
    """Section torque at which each layer reaches its allowable, ``τa ΣGJ / (G ro Kt)``.

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_layers` for its shapes).
    result_unit : str, optional
        A torque unit; default N·m.
    materials : list of lists, optional
        A materials block with a header row; the built-in library is searched after it.

    Returns
    -------
    list of lists, or str
        One capacity per layer (spills), or a ``⚠`` message.
    """
    factor = result_factor(result_unit, "torque")
    block = _block(layers, materials)
    rating, problems = _duty_and_rating(block)
    return spill_layers(block, rating.capacity, factor, problems,
                        _title("capacity", result_unit, "torque"))


@cell_function(
    "Governing limit: the smallest capacity of every layer's stress and the twist limits",
    _LAYERS,
    _LENGTH,
    _TWIST_LIMIT,
    _TWIST_PER_LENGTH,
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    _MATERIALS,
    returns="the governing torque of the part (one per part for a block of several parts)",
)
def TWS_GOVERNING_LIMIT(layers, length=None, twist_limit=None, twist_limit_per_length=None,
                        result_unit=None, materials=None):
    """The smallest capacity of every criterion (layer stresses, twist limits).

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_layers` for its shapes).
    length : str or number with its unit, optional
    twist_limit : str, angle, optional
    twist_limit_per_length : str, angle per length, optional
    result_unit : str, optional
        A torque unit; default N·m.
    materials : list of lists, optional
        A materials block with a header row; the built-in library is searched after it.

    Returns
    -------
    float, list of lists or str
        One value per part, or a ``⚠`` message.
    """
    factor = result_factor(result_unit, "torque")
    block = _block(layers, materials)
    rating, problems = _duty_and_rating(block, None, length, twist_limit, twist_limit_per_length)
    return spill_parts(block, _values(rating.governing_capacity, factor), problems,
                       _title("governing limit", result_unit, "torque"))


def _governs_text(criterion: int, layer: int) -> str:
    if criterion == Criterion.LAYER_STRESS:
        return f"layer {layer + 1} stress"
    if criterion == Criterion.TWIST_ANGLE:
        return "twist angle"
    if criterion == Criterion.TWIST_PER_LENGTH:
        return "twist per length"
    return f"{WARNING_SIGN} not rated"


@cell_function(
    "What governs: 'layer 2 stress', 'twist angle' or 'twist per length'",
    _LAYERS,
    _LENGTH,
    _TWIST_LIMIT,
    _TWIST_PER_LENGTH,
    _MATERIALS,
    returns="a short text per part",
)
def TWS_GOVERNS(layers, length=None, twist_limit=None, twist_limit_per_length=None,
                materials=None):
    """What governs the part: ``"layer 2 stress"``, ``"twist angle"`` or ``"twist per length"``.

    Parameters are those of `TWS_GOVERNING_LIMIT` without the result unit.

    Returns
    -------
    str or list of lists
        One text per part.
    """
    block = _block(layers, materials)
    rating, problems = _duty_and_rating(block, None, length, twist_limit, twist_limit_per_length)
    texts = [_governs_text(int(c), int(k))
             for c, k in zip(rating.governing_criterion, rating.governing_layer)]
    return spill_parts(block, texts, problems, "governs")


@cell_function(
    "Shear stress in each layer at its outer radius at a torque, nominal (no Kt) "
    "(spills one value per layer)",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_SIGNED,
    _result("MPa", "stress", "MPa, N/mm², psi, ksi"),
    _MATERIALS,
    returns="one stress per layer, in result_unit",
)
def TWS_STRESS(layers, torque, result_unit=None, materials=None):
    """Nominal shear stress at each layer's outer radius, ``G ro θ'`` (no Kt).

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_layers` for its shapes).
    torque : str, torque
        ``"1200 N·m"``; or a column beside a block of many parts. A negative
        torque gives negative stresses (τ is odd in T; the core rates |T|).
    result_unit : str, optional
        A stress unit; default MPa.
    materials : list of lists, optional
        A materials block with a header row; the built-in library is searched after it.

    Returns
    -------
    list of lists, or str
        One stress per layer (spills), or a ``⚠`` message.
    """
    factor = result_factor(result_unit, "stress")
    block = _block(layers, materials, need_allowable=False)
    rating, problems = _duty_and_rating(block, torque, torque_required=True)
    stress = rating.stress_outer * _torque_sign(rating)[:, None]
    return spill_layers(block, stress, factor, problems,
                        _title("stress", result_unit, "stress"))


@cell_function(
    "Shear stress at a radius at a torque, nominal (no Kt); on an interface give the layer",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_SIGNED,
    Argument("radius", "Radius from the axis, e.g. '20 mm'", unit="length: mm, m, in"),
    Argument("layer", "Layer number (1 = innermost) the radius belongs to; needed only on an "
             "interface, where the stress jumps (optional)"),
    _result("MPa", "stress", "MPa, N/mm², psi, ksi"),
    _MATERIALS,
    returns="the stress at that radius, in result_unit",
)
def TWS_STRESS_AT(layers, torque, radius, layer=None, result_unit=None, materials=None):
    """Nominal shear stress at a radius, ``G r θ'``, in the layer the radius lies in.

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_layers` for its shapes).
    torque : str, torque
        Signed: a negative torque gives a negative result (the core rates |T|).
    radius : str, length
    layer : int, optional
        1-based layer number; needed only on an interface, where the stress jumps.
    result_unit : str, optional
        A stress unit; default MPa.
    materials : list of lists, optional
        A materials block with a header row; the built-in library is searched after it.

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "stress")
    block = _block(layers, materials, need_allowable=False)
    rating, problems = _duty_and_rating(block, torque, torque_required=True)
    radii, radius_problems = per_part(radius, "length", block, "radius", required=True)
    problems = _merge(problems, radius_problems)
    chosen = read_layer_number(layer, block.stack.n_layers, "layer")
    stack = block.stack
    slot, slot_problems = _radius_slots(block, radii, chosen)
    problems = _merge(problems, slot_problems)
    parts = np.arange(block.n_parts)
    modulus = stack.shear_modulus[parts, slot]
    stress = shear_stress_at(radii, modulus, rating.twist_rate * _torque_sign(rating))
    return spill_parts(block, _values(np.atleast_1d(stress), factor), problems,
                       _title("stress", result_unit, "stress"))


def _radius_slots(block: LayerBlock, radii: NDArray[np.float64], chosen: int | None
                  ) -> tuple[NDArray[np.intp], list[str | None]]:
    """The layer each radius lies in, or why there is none (outside, or on an interface)."""
    stack = block.stack
    r_in = stack.inner_diameter / 2.0
    r_out = stack.outer_diameter / 2.0
    tol = 1e-9 * np.nanmax(np.abs(r_out), axis=1, initial=0.0)[:, None]
    with np.errstate(invalid="ignore"):
        inside = stack.present & (r_in - tol <= radii[:, None]) & (radii[:, None] <= r_out + tol)
    problems: list[str | None] = [None] * block.n_parts
    slots = np.zeros(block.n_parts, dtype=np.intp)
    for part in range(block.n_parts):
        if block.part_problem[part] is not None or math.isnan(radii[part]):
            continue
        found = np.flatnonzero(inside[part])
        shown = _length_text(radii[part], block.system)
        prefix = f"radius, {block.part_labels[part]}" if block.multi_part else "radius"
        if chosen is not None:
            if chosen not in found:
                problems[part] = (f"{prefix}: {shown} is not in layer {chosen + 1}")
            slots[part] = chosen
        elif found.size == 0:
            problems[part] = f"{prefix}: {shown} is outside the section"
        elif found.size > 1:
            problems[part] = (
                f"{prefix}: {shown} is on the interface of layers {found[0] + 1} and "
                f"{found[-1] + 1}, where the stress jumps; give the layer"
            )
        else:
            slots[part] = found[0]
    return slots, problems


def _length_text(value: float, system: str) -> str:
    return f"{value / 0.0254:g} in" if system == "US" else f"{value / 1e-3:g} mm"


@cell_function(
    "Twist angle over the length at a torque, phi = T·L / ΣGJ",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_SIGNED,
    Argument("length", "Length over which the layers twist together, e.g. '850 mm'",
             unit="length: mm, m, in, ft"),
    _result("°", "angle", "°, deg, rad"),
    _MATERIALS,
    returns="the twist angle, in result_unit",
)
def TWS_TWIST_ANGLE(layers, torque, length, result_unit=None, materials=None):
    """Twist angle over the length, ``φ = T L / ΣGJ``.

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_layers` for its shapes).
    torque : str, torque
        Signed: a negative torque gives a negative result (the core rates |T|).
    length : str, length
    result_unit : str, optional
        An angle unit; default °.
    materials : list of lists, optional
        A materials block with a header row; the built-in library is searched after it.

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "angle")
    block = _block(layers, materials, need_allowable=False)
    rating, problems = _duty_and_rating(block, torque, length, torque_required=True,
                                        length_required=True)
    return spill_parts(block, _values(rating.twist_angle * _torque_sign(rating), factor),
                       problems,
                       _title("twist angle", result_unit, "angle"))


@cell_function(
    "Twist per length at a torque, common to every layer: theta' = T / ΣGJ",
    _LAYERS_NO_ALLOWABLE,
    _TORQUE_SIGNED,
    _result("°/m", "angle per length", "°/m, rad/m, °/ft"),
    _MATERIALS,
    returns="the twist rate, in result_unit",
)
def TWS_TWIST_RATE(layers, torque, result_unit=None, materials=None):
    """Twist per length common to every layer, ``θ' = T / ΣGJ``.

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_layers` for its shapes).
    torque : str, torque
        Signed: a negative torque gives a negative result (the core rates |T|).
    result_unit : str, optional
        An angle-per-length unit; default °/m.
    materials : list of lists, optional
        A materials block with a header row; the built-in library is searched after it.

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "angle_per_length")
    block = _block(layers, materials, need_allowable=False)
    rating, problems = _duty_and_rating(block, torque, torque_required=True)
    return spill_parts(block, _values(rating.twist_rate * _torque_sign(rating), factor),
                       problems,
                       _title("twist rate", result_unit, "angle_per_length"))


@cell_function(
    "Margin left at a torque: governing limit / |torque| - 1",
    _LAYERS,
    _TORQUE_MAGNITUDE,
    _LENGTH,
    _TWIST_LIMIT,
    _TWIST_PER_LENGTH,
    _result("a fraction", "plain number", "'%' for per cent"),
    _MATERIALS,
    returns="the margin per part; negative when the torque exceeds the governing limit",
)
def TWS_MARGIN(layers, torque, length=None, twist_limit=None, twist_limit_per_length=None,
               result_unit=None, materials=None):
    """Margin at a torque, ``governing limit / |T| - 1``.

    Parameters
    ----------
    layers : list of lists
        The layer block (see `read_layers` for its shapes).
    torque : str, torque
        Its magnitude is rated: a negative torque gives the same margin.
    length, twist_limit, twist_limit_per_length : str, optional
        As for `TWS_GOVERNING_LIMIT`.
    result_unit : str, optional
        ``"%"`` for per cent; default a fraction.
    materials : list of lists, optional
        A materials block with a header row; the built-in library is searched after it.

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor(result_unit, "dimensionless")
    block = _block(layers, materials)
    rating, problems = _duty_and_rating(block, torque, length, twist_limit,
                                        twist_limit_per_length, torque_required=True)
    values = [f"{WARNING_SIGN} torque is zero: no margin to state"
              if isinstance(m, float) and math.isinf(m) else m
              for m in _values(rating.margin, factor)]
    return spill_parts(block, values, problems, _title("margin", result_unit, "dimensionless"))


@cell_function(
    "Torque a drive puts through the shaft: T = SF·P/ω",
    Argument("power", "Power transmitted, e.g. '15 kW' or '20 hp'", unit="power: kW, W, hp"),
    Argument("speed", "Shaft speed, e.g. '1450 rpm'", unit="rotational speed: rpm, r/min, rad/s"),
    Argument("service_factor", "Service factor on the demand (optional, default 1)"),
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    returns="the torque, in result_unit",
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
    watts = read_quantity(power, "power", "power")
    omega = read_quantity(speed, "speed", "speed")
    service = read_number(service_factor, "service factor", default=1.0)
    if not omega > 0:
        raise CellError("speed", "must be greater than zero")
    if not service > 0:
        raise CellError("service factor", "must be greater than zero")
    torque = float(torque_from_power(watts, omega, service))
    return torque / factor


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
)
def TWS_ALLOWABLE(rule, yield_strength, ultimate_strength=None, factor_of_safety=None,
                  keyway=None, result_unit=None):
    """Allowable shear stress from strength by rule.

    Parameters
    ----------
    rule : str
        ``"max shear"`` (Tresca, 0.5 Sy/FS), ``"distortion energy"`` (von Mises,
        Sy/(√3 FS)) or ``"shafting code"`` (min(0.30 Sy, 0.18 Su), ×0.75 with a keyway).
    yield_strength : str, stress
    ultimate_strength : str, stress, optional
        Needed by the shafting code rule; refused below the yield strength (check both).
    factor_of_safety : number, 1, optional
        Needed by the two theories, at least 1 (below 1 the allowable would exceed the
        shear yield strength); refused with the shafting code rule, which embeds its own
        allowance (it would be ignored).
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
    sy = read_quantity(yield_strength, "stress", "yield strength")
    su = math.nan if is_empty(ultimate_strength) else read_quantity(
        ultimate_strength, "stress", "ultimate strength")
    has_keyway = read_flag(keyway, "keyway")
    fs_typed = not is_empty(factor_of_safety)
    if chosen != AllowableRule.SHAFTING_CODE and not has_keyway and not fs_typed:
        raise CellError("factor of safety", "cell is empty; expected a plain number "
                        "(give 1 for the shear yield strength itself)")
    fs = read_number(factor_of_safety, "factor of safety") if fs_typed else math.nan
    # Notes as well as errors refuse: a cell cannot show a number and a warning together.
    refusal = allowable_refusal(chosen, sy, su, fs, has_keyway, factor_typed=fs_typed)
    if refusal is not None:
        raise CellError("", refusal)
    allowable = float(allowable_shear(int(chosen), sy, su, fs, has_keyway))
    if not math.isfinite(allowable):
        raise CellError("", "could not be computed")
    return allowable / factor
