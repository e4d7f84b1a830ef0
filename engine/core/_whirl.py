"""First bending critical speed (whirl) of a uniform compound tube, Euler-Bernoulli beam theory.

``omega_1 = (beta L)^2 / L^2 * sqrt(sum(E I) / m)`` with ``m = sum(rho_i A_i)`` the mass per
length and ``(beta L)^2`` the first eigenvalue of the end condition (Blevins, Formulas for
Natural Frequency and Mode Shape, table of uniform single-span beams; from memory).

Margin rule (common practice): run a shaft below its first critical at no more than 0.70 of
it (figures of 0.70 to 0.75 are common; the lower is taken). The check does not scale with
torque, so it is a gate rather than a torque capacity: see :func:`whirl_gate_capacity`.
A shaft designed to run above its first critical (supercritical) fails this check by design
and needs its own analysis.

Euler-Bernoulli theory leaves out shear deformation and rotary inertia (they lower the
critical of short, thick tubes), bearing and housing flexibility (it lowers the critical:
rigid supports are not conservative), gyroscopic effects and masses carried on the shaft
(couplings, impellers, pulleys): a preliminary check only.

Preliminary design aid: verify against the applicable codes and standards and have a qualified
engineer review the design; local codes and licensed practice prevail.
"""

from __future__ import annotations

from dataclasses import dataclass, fields
from enum import IntEnum
from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import (
    as_float,
    flag_where,
    frozen_view,
    gather_layer_flags,
    layer_arrays,
    part_array,
    scalar_out,
)
from ._bending import section_bending
from ._diagnoses import LOAD_ERRORS, LoadFlag

__all__ = [
    "EndSupport",
    "WHIRL_SPEED_RATIO_LIMIT",
    "frequency_parameter",
    "mass_per_length",
    "critical_speed",
    "whirl_reserve",
    "whirl_gate_capacity",
    "WhirlCheck",
    "whirl_check",
]

WHIRL_SPEED_RATIO_LIMIT = 0.70
"""Largest operating speed as a fraction of the first critical (common practice)."""


class EndSupport(IntEnum):
    """How the tube's two ends are held in bending (stored as ``int8``)."""

    PINNED_PINNED = 1
    """Both ends simply supported (free to rotate): ``(beta L)^2 = pi^2``."""
    FIXED_FIXED = 2
    """Both ends clamped: ``(beta L)^2 = 22.373``."""
    FIXED_FREE = 3
    """One end clamped, the other free (overhung): ``(beta L)^2 = 3.516``."""
    FIXED_PINNED = 4
    """One end clamped, the other simply supported: ``(beta L)^2 = 15.418``."""


# First eigenvalue (beta L)^2 indexed by EndSupport code; Blevins, from memory. Slot 0 unused.
_FIRST_EIGENVALUE = (np.nan, np.pi**2, 22.373, 3.516, 15.418)


def frequency_parameter(support: ArrayLike) -> Any:
    """First-mode eigenvalue ``(beta L)^2`` of a uniform beam for each end condition.

    Parameters
    ----------
    support : array_like of EndSupport (int codes)

    Returns
    -------
    ndarray or scalar, 1
        NaN for an unknown code.

    Examples
    --------
    >>> round(float(frequency_parameter(EndSupport.FIXED_FREE)), 3)
    3.516
    """
    code = np.asarray(support)
    table = np.array(_FIRST_EIGENVALUE)
    known = (code >= 1) & (code < len(_FIRST_EIGENVALUE))
    result = np.where(known, table[np.where(known, code, 0).astype(np.intp)], np.nan)
    return scalar_out(result)


def mass_per_length(
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    density: ArrayLike,
    present: ArrayLike | None = None,
) -> NDArray[np.float64]:
    """Mass per unit length of compound tubes, ``m = sum(rho_i pi/4 (Do^2 - Di^2))``.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    density : (P, L) array_like, kg/m^3
    present : (P, L) array_like of bool, optional
        Default: a slot is present where its outer diameter is not NaN.

    Returns
    -------
    (P,) ndarray, kg/m
    """
    (do, di, rho), mask = layer_arrays(outer_diameter, inner_diameter, density, present=present)
    mass = np.multiply(do, do)
    mass -= di * di
    mass *= rho
    if not mask.all():
        np.copyto(mass, 0.0, where=~mask)
    # A loop over the few slots: numpy sums a short last axis slowly.
    total = mass[:, 0].copy()
    for slot in range(1, mass.shape[1]):
        total += mass[:, slot]
    total *= np.pi / 4.0
    return total


def critical_speed(
    sum_bending_stiffness: ArrayLike,
    mass_per_length: ArrayLike,
    length: ArrayLike,
    support: ArrayLike = EndSupport.PINNED_PINNED,
) -> Any:
    """First bending critical speed, ``omega_1 = (beta L)^2 / L^2 * sqrt(sum(E I) / m)``.

    Parameters
    ----------
    sum_bending_stiffness : array_like, N*m^2
        ``sum(E I)`` (``SectionBending.sum_ei``).
    mass_per_length : array_like, kg/m
    length : array_like, m
        Span between the supports (the overhang for ``FIXED_FREE``).
    support : array_like of EndSupport (int codes)

    Returns
    -------
    ndarray or scalar, rad/s
        NaN for an unknown support.

    Examples
    --------
    >>> # 1 m steel bar of 20 mm, pinned ends: EI = 1626 N m^2, m = 2.466 kg/m
    >>> round(float(critical_speed(207e9 * np.pi / 64 * 0.02**4, 7850 * np.pi / 4 * 0.02**2,
    ...                            1.0)), 1)
    253.4
    """
    span = as_float(length)
    with np.errstate(divide="ignore", invalid="ignore"):
        result = (
            frequency_parameter(support)
            / (span * span)
            * np.sqrt(as_float(sum_bending_stiffness) / as_float(mass_per_length))
        )
    return scalar_out(result)


def whirl_reserve(
    critical_speed: ArrayLike,
    operating_speed: ArrayLike,
    ratio_limit: ArrayLike = WHIRL_SPEED_RATIO_LIMIT,
) -> Any:
    """Reserve against whirl, ``ratio_limit * omega_1 / |omega|``: 1 or more passes.

    Parameters
    ----------
    critical_speed : array_like, rad/s
    operating_speed : array_like, rad/s
        Its magnitude is used.
    ratio_limit : array_like, 1
        Largest allowed ``omega / omega_1`` (default 0.70, common practice).

    Returns
    -------
    ndarray or scalar, 1
        inf at zero speed; NaN where the speed is NaN (not given).
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        result = as_float(ratio_limit) * as_float(critical_speed) / np.abs(as_float(operating_speed))
    return scalar_out(result)


def whirl_gate_capacity(reserve: ArrayLike) -> Any:
    """The whirl check as a criterion: +inf where it passes, 0 where it fails.

    The critical speed does not depend on the torque, so whirl has no torque capacity. A
    criterion list takes it as a gate: +inf never governs a torque rating; 0 governs at any
    torque (margin -1), with whirl named as the governing criterion. The reserve itself
    (:func:`whirl_reserve`) is reported beside it, never mixed into torque margins.

    Parameters
    ----------
    reserve : array_like, 1
        From :func:`whirl_reserve`.

    Returns
    -------
    ndarray or scalar, N*m
        +inf where ``reserve >= 1`` or the reserve is NaN (no speed given: nothing to check,
        like an absent twist limit; the part carries ``SPEED_NOT_GIVEN``), 0 where below 1.
    """
    value = as_float(reserve)
    return scalar_out(np.where(value < 1.0, 0.0, np.inf))


@dataclass(frozen=True)
class WhirlCheck:
    """Result of :func:`whirl_check` for P parts.

    Attributes
    ----------
    sum_ei : (P,) ndarray, N*m^2
    mass_per_length : (P,) ndarray, kg/m
    critical_speed : (P,) ndarray, rad/s
        First bending critical, Euler-Bernoulli.
    speed_ratio : (P,) ndarray, 1
        ``|omega| / omega_1``; NaN where no speed is given.
    reserve : (P,) ndarray, 1
        ``ratio_limit / speed_ratio``; 1 or more passes.
    passes : (P,) ndarray of bool
        ``reserve >= 1``; True where no speed is given, False where not evaluated.
    gate_capacity : (P,) ndarray, N*m
        :func:`whirl_gate_capacity`; NaN where not evaluated.
    layer_flags : (P, L) ndarray of int32
        :class:`LoadFlag`: ``YOUNGS_MODULUS_NOT_POSITIVE``, ``DENSITY_NOT_POSITIVE``.
    part_flags : (P,) ndarray of int32
        ``LENGTH_NOT_POSITIVE``, ``SUPPORT_UNKNOWN``, ``SPEED_NOT_FINITE`` (errors),
        ``SPEED_NOT_GIVEN``, ``SPEED_ABOVE_WHIRL_LIMIT`` (notes) and the layers' bits.
    valid : (P,) ndarray of bool
    """

    sum_ei: NDArray[np.float64]
    mass_per_length: NDArray[np.float64]
    critical_speed: NDArray[np.float64]
    speed_ratio: NDArray[np.float64]
    reserve: NDArray[np.float64]
    passes: NDArray[np.bool_]
    gate_capacity: NDArray[np.float64]
    layer_flags: NDArray[np.int32]
    part_flags: NDArray[np.int32]
    valid: NDArray[np.bool_]

    def __post_init__(self) -> None:
        for item in fields(self):
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))

    @property
    def n_parts(self) -> int:
        """Number of parts."""
        return int(self.critical_speed.shape[0])


def whirl_check(
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    youngs_modulus: ArrayLike,
    density: ArrayLike,
    length: ArrayLike,
    speed: ArrayLike,
    support: ArrayLike = EndSupport.PINNED_PINNED,
    *,
    present: ArrayLike | None = None,
    ratio_limit: float = WHIRL_SPEED_RATIO_LIMIT,
    sum_bending_stiffness: ArrayLike | None = None,
) -> WhirlCheck:
    """First critical speed of each part and its reserve against the operating speed.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    youngs_modulus : (P, L) array_like, Pa
    density : (P, L) array_like, kg/m^3
    length : (P,) array_like, m
        Span between the supports (the overhang for ``FIXED_FREE``).
    speed : (P,) array_like, rad/s
        Operating speed; NaN where none is given (the critical is still computed).
    support : (P,) array_like of EndSupport (int codes)
    present : (P, L) array_like of bool, optional
        Default: a slot is present where its outer diameter is not NaN.
    ratio_limit : float, 1
        Largest allowed ``omega / omega_1`` (default 0.70, common practice).
    sum_bending_stiffness : (P,) array_like, N*m^2, optional
        ``sum(E I)`` when the caller has it (``SectionBending.sum_ei``); computed otherwise.

    Returns
    -------
    WhirlCheck
        Parts with an error bit get NaN results and ``valid`` False.
    """
    (do, di, modulus, rho), mask = layer_arrays(
        outer_diameter, inner_diameter, youngs_modulus, density, present=present
    )
    n_parts = do.shape[0]
    span = part_array(length, n_parts, "length")
    omega = part_array(speed, n_parts, "speed")
    code = np.atleast_1d(np.asarray(support))
    if code.ndim != 1 or code.shape[0] not in (1, n_parts):
        raise ValueError(
            f"support must hold one value or one per part ({n_parts}); got shape {code.shape}"
        )
    code = np.broadcast_to(code, (n_parts,))

    with np.errstate(all="ignore"):
        layer_flags = np.zeros(do.shape, dtype=np.int32)
        for value, flag in ((modulus, LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE),
                            (rho, LoadFlag.DENSITY_NOT_POSITIVE)):
            bad = value > 0
            bad &= value < np.inf
            np.logical_not(bad, out=bad)
            bad &= mask
            if bad.any():
                flag_where(layer_flags, bad, flag)
        part_flags = np.zeros(n_parts, dtype=np.int32)
        flag_where(part_flags, ~((span > 0) & (span < np.inf)), LoadFlag.LENGTH_NOT_POSITIVE)
        eigenvalue = np.atleast_1d(frequency_parameter(code))
        flag_where(part_flags, np.isnan(eigenvalue), LoadFlag.SUPPORT_UNKNOWN)
        flag_where(part_flags, np.isnan(omega), LoadFlag.SPEED_NOT_GIVEN)
        flag_where(part_flags, np.isinf(omega), LoadFlag.SPEED_NOT_FINITE)
        part_flags = gather_layer_flags(part_flags, layer_flags)
        valid = (part_flags & int(LOAD_ERRORS)) == 0

        if sum_bending_stiffness is None:
            sum_ei = section_bending(do, di, modulus, 0.0, present=mask).sum_ei.copy()
        else:
            sum_ei = part_array(sum_bending_stiffness, n_parts, "sum_bending_stiffness").copy()
        mass = mass_per_length(do, di, rho, present=mask)
        omega_1 = np.sqrt(sum_ei / mass)
        omega_1 *= eigenvalue
        omega_1 /= span * span
        ratio = np.abs(omega) / omega_1
        reserve = ratio_limit / ratio
        gate = np.atleast_1d(whirl_gate_capacity(reserve))
        if not valid.all():
            for array in (sum_ei, mass, omega_1, ratio, reserve, gate):
                array[~valid] = np.nan
        passes = valid & ~(reserve < 1.0)
        flag_where(part_flags, valid & (reserve < 1.0), LoadFlag.SPEED_ABOVE_WHIRL_LIMIT)

    return WhirlCheck(
        sum_ei=sum_ei,
        mass_per_length=mass,
        critical_speed=omega_1,
        speed_ratio=ratio,
        reserve=reserve,
        passes=passes,
        gate_capacity=gate,
        layer_flags=layer_flags,
        part_flags=part_flags,
        valid=valid,
    )
