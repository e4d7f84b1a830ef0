"""Diagnosis bits of the interface checks (fits, bonds, load path) and of the plastic reserve.

Like the layer and part flags, these are data: the functions return them per interface or per
part beside their values, and the bridge words them. *Errors* leave the value NaN; *findings*
are results in their own right (a fit that has lost contact has no slip capacity) and leave
the value in place.
"""

from __future__ import annotations

from enum import IntFlag
from typing import TypeVar

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = [
    "InterfaceFlag",
    "PlasticFlag",
    "INTERFACE_ERRORS",
    "PLASTIC_ERRORS",
    "describe_sleeve_flag",
    "has_sleeve_error",
]


class InterfaceFlag(IntFlag):
    """Per-interface diagnosis bits (``int32``), stored at the outer member's slot."""

    LOAD_PATH_UNKNOWN = 1 << 0
    FIT_INPUT_INVALID = 1 << 1
    EXPANSION_NOT_GIVEN = 1 << 2
    CONTACT_LOST = 1 << 3
    FIT_OVERSTRESSED = 1 << 4
    BOND_INPUT_INVALID = 1 << 5


class PlasticFlag(IntFlag):
    """Per-part diagnosis bits (``int32``) of the elastic-perfectly-plastic results."""

    LAYER_INPUT_INVALID = 1 << 0
    TORQUE_ABOVE_PLASTIC = 1 << 1
    REVERSE_YIELD_ON_UNLOADING = 1 << 2
    NOT_CONVERGED = 1 << 3


INTERFACE_ERRORS: InterfaceFlag = (
    InterfaceFlag.LOAD_PATH_UNKNOWN
    | InterfaceFlag.FIT_INPUT_INVALID
    | InterfaceFlag.EXPANSION_NOT_GIVEN
    | InterfaceFlag.BOND_INPUT_INVALID
)
"""Interface flags that leave the value NaN; CONTACT_LOST and FIT_OVERSTRESSED are findings."""

PLASTIC_ERRORS: PlasticFlag = (
    PlasticFlag.LAYER_INPUT_INVALID
    | PlasticFlag.TORQUE_ABOVE_PLASTIC
    | PlasticFlag.NOT_CONVERGED
)
"""Plastic flags that leave the value NaN; REVERSE_YIELD_ON_UNLOADING is a finding."""

_DESCRIPTION_LIST: tuple[tuple[IntFlag, str], ...] = (
    (InterfaceFlag.LOAD_PATH_UNKNOWN, "load path is not one of the known load paths"),
    (InterfaceFlag.FIT_INPUT_INVALID, (
        "a fit input is missing or out of range: the diameters must satisfy bore < fit "
        "diameter < outer diameter, E, fit length and friction coefficient must be positive "
        "and Poisson's ratio in (-1, 0.5]"
    )),
    (InterfaceFlag.EXPANSION_NOT_GIVEN, (
        "an operating temperature is given but an expansion coefficient is not: the "
        "interference at temperature cannot be worked out"
    )),
    (InterfaceFlag.CONTACT_LOST, (
        "the fit has lost contact at the operating temperature (interference <= 0): no "
        "contact pressure, no friction, no slip capacity"
    )),
    (InterfaceFlag.FIT_OVERSTRESSED, (
        "the fit's own stresses already reach the yield strength over the factor of safety "
        "before any torque is applied"
    )),
    (InterfaceFlag.BOND_INPUT_INVALID, (
        "a bond input is missing or not positive (bond diameter, bond length, allowable "
        "bond shear)"
    )),
    (PlasticFlag.LAYER_INPUT_INVALID, (
        "a layer input is missing or out of range: diameters, shear modulus and shear "
        "yield stress must be positive with the inner diameter below the outer"
    )),
    (PlasticFlag.TORQUE_ABOVE_PLASTIC, (
        "the torque is above the fully plastic torque: the section cannot carry it, no "
        "twist or residual stress follows"
    )),
    (PlasticFlag.REVERSE_YIELD_ON_UNLOADING, (
        "on unloading, the residual stress somewhere exceeds the shear yield stress: the "
        "layer yields in reverse and the elastic-unloading residuals are not exact"
    )),
    (PlasticFlag.NOT_CONVERGED, "the twist at this torque did not converge"),
)
_DESCRIPTIONS: dict[tuple[type, int], str] = {
    (type(flag), int(flag)): text for flag, text in _DESCRIPTION_LIST
}
_ERROR_MASKS: dict[type, int] = {
    InterfaceFlag: int(INTERFACE_ERRORS),
    PlasticFlag: int(PLASTIC_ERRORS),
}

F = TypeVar("F", InterfaceFlag, PlasticFlag)


def describe_sleeve_flag(flag: InterfaceFlag | PlasticFlag) -> str:
    """Short plain-English description of one interface or plastic flag.

    Parameters
    ----------
    flag : InterfaceFlag or PlasticFlag
        One member, not a combination.

    Returns
    -------
    str

    Raises
    ------
    ValueError
        If ``flag`` is zero or a combination of several flags.
    """
    try:
        return _DESCRIPTIONS[(type(flag), int(flag))]
    except KeyError:
        raise ValueError(
            f"describe_sleeve_flag() takes one flag; got {flag!r} (split a combination first)"
        ) from None


def has_sleeve_error(flags: ArrayLike, flag_type: type[F]) -> NDArray[np.bool_]:
    """Elementwise: does each flag word contain an error bit of ``flag_type``?

    Parameters
    ----------
    flags : array_like of int
    flag_type : type
        ``InterfaceFlag`` or ``PlasticFlag``.

    Returns
    -------
    ndarray of bool
    """
    return (np.asarray(flags) & _ERROR_MASKS[flag_type]) != 0
