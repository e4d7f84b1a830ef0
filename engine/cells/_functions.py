"""The worksheet functions of a layer block: share, capacities, the governing limit, what governs, margin.

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
    Duty,
)
from twistshare.engine.intake import field_by_key, governs_text

from ._arguments import (
    WARNING_SIGN,
    is_empty,
    result_factor,
)
from ._blocks import Block, read_block
from ._registry import Argument, cell_function
from ._spill import merge, per_part, rate_block, spill_layers, spill_parts, unit_label

__all__ = ["TWS_SHARE", "TWS_LAYER_CAPACITY", "TWS_GOVERNING_LIMIT", "TWS_GOVERNS", "TWS_MARGIN"]

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


