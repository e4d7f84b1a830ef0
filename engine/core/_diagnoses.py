"""Diagnosis bit flags: what is wrong (an error) or worth saying (a note) about an input.

The core never raises for one bad part in a batch. It returns these flags per layer and per
part, together with the values that caused them; the bridge words the full message with the
part, layer, value and unit. A part with any *error* flag is not rated (its results are NaN);
*notes* leave the rating in place.
"""

from __future__ import annotations

from enum import IntFlag
from typing import TypeVar

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = [
    "LayerFlag",
    "PartFlag",
    "AllowableFlag",
    "LAYER_ERRORS",
    "PART_ERRORS",
    "ALLOWABLE_ERRORS",
    "is_error",
    "describe",
    "split_flags",
    "has_error",
]


class LayerFlag(IntFlag):
    """Per-layer diagnosis bits (``Rating.layer_flags``, ``int32``). All are errors."""

    OUTER_NOT_POSITIVE = 1 << 0
    INNER_NEGATIVE = 1 << 1
    INNER_NOT_BELOW_OUTER = 1 << 2
    MODULUS_NOT_POSITIVE = 1 << 3
    ALLOWABLE_NOT_POSITIVE = 1 << 4
    KT_BELOW_ONE = 1 << 5
    NOT_FINITE = 1 << 6
    GAP_BELOW = 1 << 7
    OVERLAP_BELOW = 1 << 8
    SOLID_NOT_INNERMOST = 1 << 9
    EMPTY_SLOT_BETWEEN_LAYERS = 1 << 10


class PartFlag(IntFlag):
    """Per-part diagnosis bits (``Rating.part_flags``, ``int32``)."""

    NO_LAYERS = 1 << 0
    LENGTH_NOT_POSITIVE = 1 << 1
    TORQUE_NOT_FINITE = 1 << 2
    TORQUE_NEGATIVE = 1 << 3
    TWIST_LIMIT_NOT_POSITIVE = 1 << 4
    TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE = 1 << 5
    TWIST_LIMIT_NEEDS_LENGTH = 1 << 6
    LAYER_ERROR = 1 << 7
    TORQUE_NOT_GIVEN = 1 << 8
    LENGTH_NOT_GIVEN = 1 << 9


class AllowableFlag(IntFlag):
    """Diagnosis bits of :func:`~twistshare.engine.core.allowable_flags`."""

    RULE_UNKNOWN = 1 << 0
    YIELD_NOT_POSITIVE = 1 << 1
    ULTIMATE_NOT_POSITIVE = 1 << 2
    FACTOR_OF_SAFETY_NOT_POSITIVE = 1 << 3
    FACTOR_OF_SAFETY_BELOW_ONE = 1 << 4
    ULTIMATE_BELOW_YIELD = 1 << 5
    FACTOR_OF_SAFETY_IGNORED = 1 << 6
    KEYWAY_IGNORED = 1 << 7


# Combinations of flags are immutable IntFlag values, not mutable state.
LAYER_ERRORS: LayerFlag = LayerFlag(sum(LayerFlag))
"""Every layer flag is an error: the part is not rated."""

PART_ERRORS: PartFlag = (
    PartFlag.NO_LAYERS
    | PartFlag.LENGTH_NOT_POSITIVE
    | PartFlag.TORQUE_NOT_FINITE
    | PartFlag.TWIST_LIMIT_NOT_POSITIVE
    | PartFlag.TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE
    | PartFlag.TWIST_LIMIT_NEEDS_LENGTH
    | PartFlag.LAYER_ERROR
)
"""Part flags that stop a part being rated; the rest are notes."""

ALLOWABLE_ERRORS: AllowableFlag = (
    AllowableFlag.RULE_UNKNOWN
    | AllowableFlag.YIELD_NOT_POSITIVE
    | AllowableFlag.ULTIMATE_NOT_POSITIVE
    | AllowableFlag.FACTOR_OF_SAFETY_NOT_POSITIVE
)
"""Allowable flags that leave the allowable NaN; the rest are notes."""

# IntFlag members of different types compare equal by value, so the table is keyed by
# (type, value) rather than by the member itself.
_DESCRIPTION_LIST: tuple[tuple[IntFlag, str], ...] = (
    (LayerFlag.OUTER_NOT_POSITIVE, "outer diameter must be greater than zero"),
    (LayerFlag.INNER_NEGATIVE, "inner diameter must not be negative (0 = solid)"),
    (LayerFlag.INNER_NOT_BELOW_OUTER, "inner diameter must be less than the outer diameter"),
    (LayerFlag.MODULUS_NOT_POSITIVE, "shear modulus must be greater than zero"),
    (LayerFlag.ALLOWABLE_NOT_POSITIVE, "allowable shear stress must be greater than zero"),
    (LayerFlag.KT_BELOW_ONE, "stress-concentration factor Kt must be at least 1"),
    (LayerFlag.NOT_FINITE, (
        "a layer input (diameter, shear modulus, allowable shear stress or Kt) "
        "is missing or not a finite number"
    )),
    (LayerFlag.GAP_BELOW, (
        "gap between this layer's inner diameter and the outer diameter of the layer "
        "inside it: the layers must touch"
    )),
    (LayerFlag.OVERLAP_BELOW, (
        "this layer's inner diameter overlaps the outer diameter of the layer inside "
        "it: the layers must touch"
    )),
    (LayerFlag.SOLID_NOT_INNERMOST, "only the innermost layer may be solid (inner diameter 0)"),
    (LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS, (
        "empty layer slot with a layer outside it: layers must be numbered from the "
        "innermost without holes"
    )),
    (PartFlag.NO_LAYERS, "the part has no layers"),
    (PartFlag.LENGTH_NOT_POSITIVE, "length must be a positive finite number"),
    (PartFlag.TORQUE_NOT_FINITE, "torque must be a finite number"),
    (PartFlag.TORQUE_NEGATIVE, "torque is negative: its magnitude is used"),
    (PartFlag.TWIST_LIMIT_NOT_POSITIVE, "twist limit (total angle) must be greater than zero"),
    (PartFlag.TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE, (
        "twist limit per length must be greater than zero"
    )),
    (PartFlag.TWIST_LIMIT_NEEDS_LENGTH, (
        "a total twist-angle limit is given but no length: the limit needs the length"
    )),
    (PartFlag.LAYER_ERROR, "one or more layers have errors"),
    (PartFlag.TORQUE_NOT_GIVEN, (
        "no torque given: capacities are rated, stresses, twist and margin are not"
    )),
    (PartFlag.LENGTH_NOT_GIVEN, "no length given: the twist angle is not computed"),
    (AllowableFlag.RULE_UNKNOWN, "allowable rule is not one of the known rules"),
    (AllowableFlag.YIELD_NOT_POSITIVE, (
        "yield strength must be a positive finite number for this rule"
    )),
    (AllowableFlag.ULTIMATE_NOT_POSITIVE, (
        "ultimate strength must be a positive finite number for this rule"
    )),
    (AllowableFlag.FACTOR_OF_SAFETY_NOT_POSITIVE, (
        "factor of safety must be a positive finite number for this rule"
    )),
    (AllowableFlag.FACTOR_OF_SAFETY_BELOW_ONE, "factor of safety is below 1"),
    (AllowableFlag.ULTIMATE_BELOW_YIELD, "ultimate strength is below the yield strength"),
    (AllowableFlag.FACTOR_OF_SAFETY_IGNORED, (
        "factor of safety is not applied: the shafting code rule embeds its own allowance"
    )),
    (AllowableFlag.KEYWAY_IGNORED, (
        "keyway reduction applies to the shafting code rule only: use Kt for other rules"
    )),
)
_DESCRIPTIONS: dict[tuple[type, int], str] = {
    (type(flag), int(flag)): text for flag, text in _DESCRIPTION_LIST
}

_ERROR_MASKS: dict[type, int] = {
    LayerFlag: int(LAYER_ERRORS),
    PartFlag: int(PART_ERRORS),
    AllowableFlag: int(ALLOWABLE_ERRORS),
}

F = TypeVar("F", LayerFlag, PartFlag, AllowableFlag)


def is_error(flag: LayerFlag | PartFlag | AllowableFlag) -> bool:
    """Return True if ``flag`` (one flag or a combination) contains an error bit.

    Parameters
    ----------
    flag : LayerFlag, PartFlag or AllowableFlag

    Returns
    -------
    bool
    """
    return bool(int(flag) & _ERROR_MASKS[type(flag)])


def has_error(flags: ArrayLike, flag_type: type[F]) -> NDArray[np.bool_]:
    """Elementwise: does each flag word in ``flags`` contain an error bit of ``flag_type``?

    Parameters
    ----------
    flags : array_like of int
        Flag words such as ``Rating.layer_flags``.
    flag_type : type
        ``LayerFlag``, ``PartFlag`` or ``AllowableFlag``.

    Returns
    -------
    ndarray of bool
    """
    return (np.asarray(flags) & _ERROR_MASKS[flag_type]) != 0


def describe(flag: LayerFlag | PartFlag | AllowableFlag) -> str:
    """Return a short plain-English description of a single flag.

    Parameters
    ----------
    flag : LayerFlag, PartFlag or AllowableFlag
        One member (not a combination; use :func:`split_flags` first).

    Returns
    -------
    str

    Raises
    ------
    ValueError
        If ``flag`` is a combination of several flags or zero.
    """
    try:
        return _DESCRIPTIONS[(type(flag), int(flag))]
    except KeyError:
        raise ValueError(
            f"describe() takes one flag; got {flag!r} (split it with split_flags first)"
        ) from None


def split_flags(value: int, flag_type: type[F]) -> tuple[F, ...]:
    """Split a flag word into its single flags, lowest bit first.

    Parameters
    ----------
    value : int
        A flag word such as ``int(rating.part_flags[i])``.
    flag_type : type
        ``LayerFlag``, ``PartFlag`` or ``AllowableFlag``.

    Returns
    -------
    tuple of flags
    """
    value = int(value)
    return tuple(member for member in flag_type if value & int(member))
