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
    "LoadFlag",
    "LOAD_ERRORS",
    "PlyFlag",
    "PLY_ERRORS",
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


class LoadFlag(IntFlag):
    """Diagnosis bits of the checks beyond torsion: bending, combined stress, whirl, buckling.

    Each result holds them per layer (``layer_flags``, ``(P, L)``) and per part
    (``part_flags``, ``(P,)``, which also gathers its layers' bits); its docstring says
    which bits it sets.
    """

    MOMENT_NOT_FINITE = 1 << 0
    AXIAL_FORCE_NOT_FINITE = 1 << 1
    YOUNGS_MODULUS_NOT_POSITIVE = 1 << 2
    DENSITY_NOT_POSITIVE = 1 << 3
    STRENGTH_NOT_POSITIVE = 1 << 4
    RULE_NOT_COMBINABLE = 1 << 5
    BENDING_ALONE_EXCEEDS = 1 << 6
    TORQUE_NOT_FINITE = 1 << 7
    LENGTH_NOT_POSITIVE = 1 << 8
    SUPPORT_UNKNOWN = 1 << 9
    SPEED_NOT_GIVEN = 1 << 10
    SPEED_NOT_FINITE = 1 << 11
    SPEED_ABOVE_WHIRL_LIMIT = 1 << 12
    POISSON_OUT_OF_RANGE = 1 << 13
    NOT_THIN_WALLED = 1 << 14
    SHORT_TUBE = 1 << 15
    CONCENTRATION_BELOW_ONE = 1 << 16


class PlyFlag(IntFlag):
    """Diagnosis bits of ply data and laminates (``LaminateModuli.flags``, ``int32``)."""

    MODULUS_NOT_POSITIVE = 1 << 0
    POISSON_OUT_OF_RANGE = 1 << 1
    THICKNESS_NOT_POSITIVE = 1 << 2
    ANGLE_NOT_FINITE = 1 << 3
    NO_PLIES = 1 << 4
    UNBALANCED = 1 << 5


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

LOAD_ERRORS: LoadFlag = LoadFlag(
    sum(LoadFlag)
    & ~(
        LoadFlag.BENDING_ALONE_EXCEEDS
        | LoadFlag.SPEED_NOT_GIVEN
        | LoadFlag.SPEED_ABOVE_WHIRL_LIMIT
        | LoadFlag.NOT_THIN_WALLED
        | LoadFlag.SHORT_TUBE
    )
)
"""Load flags that leave a result NaN; the rest are notes (findings the result already holds)."""

PLY_ERRORS: PlyFlag = PlyFlag(sum(PlyFlag) & ~PlyFlag.UNBALANCED)
"""Ply flags that leave a laminate's moduli NaN; ``UNBALANCED`` is a note."""

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
    (LoadFlag.MOMENT_NOT_FINITE, "bending moment must be a finite number (0 for none)"),
    (LoadFlag.AXIAL_FORCE_NOT_FINITE, "axial force must be a finite number (0 for none)"),
    (LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE, (
        "the Young's modulus must be a positive finite number"
    )),
    (LoadFlag.DENSITY_NOT_POSITIVE, "density must be a positive finite number"),
    (LoadFlag.STRENGTH_NOT_POSITIVE, (
        "yield strength and factor of safety must be positive finite numbers"
    )),
    (LoadFlag.RULE_NOT_COMBINABLE, (
        "combined bending and torsion needs the maximum-shear-stress or distortion-energy "
        "rule and a yield strength"
    )),
    (LoadFlag.BENDING_ALONE_EXCEEDS, (
        "the bending (and axial) stress alone reaches the allowable: no torque can be carried"
    )),
    (LoadFlag.TORQUE_NOT_FINITE, "torque must be finite to combine it with the bending stress"),
    (LoadFlag.LENGTH_NOT_POSITIVE, (
        "length between the supports must be a positive finite number"
    )),
    (LoadFlag.SUPPORT_UNKNOWN, "end support is not one of the known end conditions"),
    (LoadFlag.SPEED_NOT_GIVEN, "no operating speed given: the whirl check is not made"),
    (LoadFlag.SPEED_NOT_FINITE, "operating speed must be a finite number"),
    (LoadFlag.SPEED_ABOVE_WHIRL_LIMIT, (
        "operating speed is above the allowed fraction of the first bending critical speed"
    )),
    (LoadFlag.POISSON_OUT_OF_RANGE, "the Poisson's ratio must be between -1 and 0.5"),
    (LoadFlag.NOT_THIN_WALLED, (
        "solid or thick-walled section: torsional buckling of a thin tube does not apply"
    )),
    (LoadFlag.SHORT_TUBE, (
        "short tube: the moderate-length buckling formula is used below its range "
        "(it underestimates the buckling torque there)"
    )),
    (LoadFlag.CONCENTRATION_BELOW_ONE, (
        "stress-concentration factor must be a finite number of at least 1"
    )),
    (PlyFlag.MODULUS_NOT_POSITIVE, "ply moduli E1, E2 and G12 must be positive finite numbers"),
    (PlyFlag.POISSON_OUT_OF_RANGE, (
        "ply Poisson's ratio nu12 must be finite with nu12^2 * E2 / E1 below 1"
    )),
    (PlyFlag.THICKNESS_NOT_POSITIVE, "ply thickness must be a positive finite number"),
    (PlyFlag.ANGLE_NOT_FINITE, "ply angle must be a finite number"),
    (PlyFlag.NO_PLIES, "the laminate has no plies"),
    (PlyFlag.UNBALANCED, (
        "laminate is not balanced (A16 or A26 not zero): torsion couples with axial and hoop "
        "strain, and A66/t is the shear modulus with those strains restrained"
    )),
)
_DESCRIPTIONS: dict[tuple[type, int], str] = {
    (type(flag), int(flag)): text for flag, text in _DESCRIPTION_LIST
}

_ERROR_MASKS: dict[type, int] = {
    LayerFlag: int(LAYER_ERRORS),
    PartFlag: int(PART_ERRORS),
    AllowableFlag: int(ALLOWABLE_ERRORS),
    LoadFlag: int(LOAD_ERRORS),
    PlyFlag: int(PLY_ERRORS),
}

F = TypeVar("F", LayerFlag, PartFlag, AllowableFlag, LoadFlag, PlyFlag)


def is_error(flag: LayerFlag | PartFlag | AllowableFlag | LoadFlag | PlyFlag) -> bool:
    """Return True if ``flag`` (one flag or a combination) contains an error bit.

    Parameters
    ----------
    flag : LayerFlag, PartFlag, AllowableFlag, LoadFlag or PlyFlag

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
        ``LayerFlag``, ``PartFlag``, ``AllowableFlag``, ``LoadFlag`` or ``PlyFlag``.

    Returns
    -------
    ndarray of bool
    """
    return (np.asarray(flags) & _ERROR_MASKS[flag_type]) != 0


def describe(flag: LayerFlag | PartFlag | AllowableFlag | LoadFlag | PlyFlag) -> str:
    """Return a short plain-English description of a single flag.

    Parameters
    ----------
    flag : LayerFlag, PartFlag, AllowableFlag, LoadFlag or PlyFlag
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
        ``LayerFlag``, ``PartFlag``, ``AllowableFlag``, ``LoadFlag`` or ``PlyFlag``.

    Returns
    -------
    tuple of flags
    """
    value = int(value)
    return tuple(member for member in flag_type if value & int(member))
