"""The worksheet functions of stress and twist at a torque: per layer, at a radius, angle, per length.

Thin, as every cell function: arguments read through the intake, physics from the core.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import NDArray
from twistshare.engine.core import RadiusPlace, layer_at_radius, shear_stress_at

from ._arguments import read_layer_number, result_factor
from ._blocks import Block
from ._functions import _LAYERS_NO_ALLOWABLE, _LENGTH_F, _MATERIALS, _TORQUE_ARG, _rated, _result, _title, _values
from ._registry import Argument, cell_function
from ._spill import merge, per_part, spill_layers, spill_parts

__all__ = ["TWS_STRESS", "TWS_STRESS_AT", "TWS_TWIST_ANGLE", "TWS_TWIST_PER_LENGTH"]


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


