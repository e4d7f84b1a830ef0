"""Interfaces of a batch rated in one pass: fit pressures, slip, bond shear and fit stresses.

Each capacity is a section torque, like a layer's, so it can stand beside the layer and twist
capacities in the governing limit: :attr:`InterfaceRating.slip_limit`,
:attr:`~InterfaceRating.bond_limit` and :attr:`~InterfaceRating.fit_stress_limit` are one
value per part (the smallest over its interfaces or layers), with the slot that gives it.

A fitted interface is one with an interference given (0 for a line-to-line sleeve gripped
only by a fit outside it), a bonded one one with an allowable bond shear given; an interface
with both (a fit with a retaining compound) gets both checks, each on its own, though such a
joint carries more than either. An interface with neither is not checked here: how it passes
its torque is for the user to state. A preliminary design aid: verify against the applicable
codes and standards and have a qualified engineer review.
"""

from __future__ import annotations

from dataclasses import dataclass, fields

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, frozen_view
from ._bond import bond_capacity
from ._fits import REFERENCE_TEMPERATURE, slip_capacity, slip_torque
from ._load_path import DEFAULT_LOAD_PATH, LoadPath, interface_share
from ._section import LayerStack
from ._sleeve_diagnoses import INTERFACE_ERRORS, InterfaceFlag
from ._stack_fits import layer_fit_stress_capacity, stack_fit_pressures

__all__ = ["InterfaceRating", "rate_interfaces"]


@dataclass(frozen=True)
class InterfaceRating:
    """Interface results of P parts of L slots (:func:`rate_interfaces`), SI.

    Interface arrays are ``(P, L)`` at the outer member's slot (NaN at slot 0, at absent
    interfaces and where a check does not apply); layer arrays are ``(P, L)`` at the layer.

    Attributes
    ----------
    interface_share : (P, L) ndarray, 1
        Torque each interface passes per unit section torque.
    interference : (P, L) ndarray, m
        Diametral interference at the operating temperature (fitted interfaces).
    pressure : (P, L) ndarray, Pa
        Contact pressure of every interface of a part with a fit (:func:`stack_fit_pressures`).
    slip_torque : (P, L) ndarray, N*m
        Torque a fitted interface passes before it slips.
    slip_capacity : (P, L) ndarray, N*m
        Section torque at which it slips; inf where it passes no torque.
    bond_capacity : (P, L) ndarray, N*m
        Section torque at which a bond's average shear reaches its allowable.
    fit_stress_capacity : (P, L) ndarray, N*m
        Per layer of a part with a fit: section torque at which fit stresses and torsion
        reach ``S_y / FS`` (0 where the fit alone does).
    fit_stress_face : (P, L) ndarray of int8
        0 inner face, 1 outer face, -1 none.
    interface_flags : (P, L) ndarray of int32
        :class:`InterfaceFlag` bits at the interface.
    layer_fit_flags : (P, L) ndarray of int32
        ``FIT_OVERSTRESSED`` / ``FIT_INPUT_INVALID`` at the layer.
    slip_limit, bond_limit, fit_stress_limit : (P,) ndarray, N*m
        Smallest capacity of the part; inf where the check does not apply; NaN where an
        input of the check is in error.
    slip_slot, bond_slot, fit_stress_slot : (P,) ndarray of int16
        The slot that gives the limit; -1 where none does.
    """

    interface_share: NDArray[np.float64]
    interference: NDArray[np.float64]
    pressure: NDArray[np.float64]
    slip_torque: NDArray[np.float64]
    slip_capacity: NDArray[np.float64]
    bond_capacity: NDArray[np.float64]
    fit_stress_capacity: NDArray[np.float64]
    fit_stress_face: NDArray[np.int8]
    interface_flags: NDArray[np.int32]
    layer_fit_flags: NDArray[np.int32]
    slip_limit: NDArray[np.float64]
    slip_slot: NDArray[np.int16]
    bond_limit: NDArray[np.float64]
    bond_slot: NDArray[np.int16]
    fit_stress_limit: NDArray[np.float64]
    fit_stress_slot: NDArray[np.int16]

    def __post_init__(self) -> None:
        for item in fields(self):
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))


def _grid(value: ArrayLike, shape: tuple[int, int]) -> NDArray[np.float64]:
    return np.broadcast_to(as_float(value), shape)


def _part(value: ArrayLike, n_parts: int) -> NDArray[np.float64]:
    return np.broadcast_to(as_float(value), (n_parts,))


def _smallest(
    capacity: NDArray[np.float64], error: NDArray[np.bool_]
) -> tuple[NDArray[np.float64], NDArray[np.int16]]:
    """Smallest capacity per part (NaN entries skipped), NaN where any entry is in error."""
    n_parts, n_slots = capacity.shape
    limit = np.full(n_parts, np.inf)
    slot = np.full(n_parts, -1, dtype=np.int16)
    with np.errstate(invalid="ignore"):
        for k in range(n_slots):
            wins = capacity[:, k] < limit
            np.copyto(limit, capacity[:, k], where=wins)
            np.copyto(slot, k, where=wins)
    failed = error.any(axis=1)
    limit[failed] = np.nan
    slot[failed] = -1
    return limit, slot


def _flag(words: NDArray[np.int32], where: NDArray[np.bool_], flag: InterfaceFlag) -> None:
    np.bitwise_or(words, np.int32(flag), out=words, where=where)


def rate_interfaces(
    stack: LayerStack,
    *,
    youngs_modulus: ArrayLike = np.nan,
    poisson_ratio: ArrayLike = np.nan,
    yield_strength: ArrayLike = np.nan,
    expansion_coefficient: ArrayLike = np.nan,
    interference: ArrayLike = np.nan,
    fit_length: ArrayLike = np.nan,
    friction: ArrayLike = np.nan,
    bond_allowable: ArrayLike = np.nan,
    bond_length: ArrayLike = np.nan,
    load_path: ArrayLike = DEFAULT_LOAD_PATH,
    operating_temperature: ArrayLike = np.nan,
    reference_temperature: ArrayLike = REFERENCE_TEMPERATURE,
    factor_of_safety: ArrayLike = 1.0,
    share: ArrayLike | None = None,
    sum_stiffness: ArrayLike | None = None,
) -> InterfaceRating:
    """Rate the fitted and bonded interfaces of every part.

    Parameters
    ----------
    stack : LayerStack
        P parts of L slots (diameters, G, present).
    youngs_modulus, poisson_ratio : (P, L) array_like, Pa and 1
        Per layer; needed by parts with a fit.
    yield_strength : (P, L) array_like, Pa
        Per layer, for the fit-stress check.
    expansion_coefficient : (P, L) array_like, 1/K
        Per layer; needed by parts with a fit where an operating temperature is given.
    interference : (P, L) array_like, m
        Diametral interference at ``reference_temperature``, at the outer member's slot;
        NaN: not a fit (the layers just touch).
    fit_length : (P, L) array_like, m
        Length passing the torque one way (half the fit where the torque goes in and out
        through the same layer, see :func:`slip_torque`).
    friction : (P, L) array_like, 1
        See :data:`FRICTION_GUIDANCE`.
    bond_allowable : (P, L) array_like, Pa
        Allowable average bond shear; NaN: not bonded.
    bond_length : (P, L) array_like, m
        As ``fit_length``.
    load_path : (P,) array_like of LoadPath
    operating_temperature : (P,) array_like, K
        NaN: the reference temperature.
    reference_temperature : (P,) array_like, K
    factor_of_safety : array_like, 1
        On the yield strength in the fit-stress check; broadcast against (P, L).
    share, sum_stiffness : optional
        ``Rating.share`` (P, L) and ``Rating.sum_gj`` (P,), to save working them out again.

    Returns
    -------
    InterfaceRating
    """
    shape = stack.outer_diameter.shape
    n_parts, n_layers = shape
    do, di, g, mask = (stack.outer_diameter, stack.inner_diameter, stack.shear_modulus,
                       stack.present)
    if share is None or sum_stiffness is None:
        with np.errstate(invalid="ignore"):
            gj = np.where(mask, g * np.pi / 32.0 * (do**4 - di**4), 0.0)
            sum_gj = gj.sum(axis=1)
            share_array = gj / sum_gj[:, np.newaxis]
    else:
        share_array, sum_gj = as_float(share), _part(sum_stiffness, n_parts)
    path = _part(load_path, n_parts)
    ishare = interface_share(share_array, mask, path)

    e, nu, sy, alpha = (_grid(v, shape) for v in (youngs_modulus, poisson_ratio, yield_strength,
                                                  expansion_coefficient))
    delta0, length, mu = (_grid(v, shape) for v in (interference, fit_length, friction))
    tau_bond, bond_len = _grid(bond_allowable, shape), _grid(bond_length, shape)
    exists = np.zeros(shape, dtype=bool)
    exists[:, 1:] = mask[:, 1:] & mask[:, :-1]
    fitted = exists & ~np.isnan(delta0)
    bonded = exists & ~np.isnan(tau_bond)
    flags = np.zeros(shape, dtype=np.int32)
    known = np.isin(path, [int(p) for p in LoadPath])
    _flag(flags, exists & ~known[:, np.newaxis], InterfaceFlag.LOAD_PATH_UNKNOWN)

    nan_grid = np.full(shape, np.nan)
    delta = nan_grid.copy()
    pressure = nan_grid.copy()
    fit_cap = nan_grid.copy()
    face = np.full(shape, -1, dtype=np.int8)
    layer_flags = np.zeros(shape, dtype=np.int32)
    rows = np.flatnonzero(fitted.any(axis=1))
    if rows.size:
        sub = (slice(None),) if rows.size == n_parts else (rows,)
        r_do, r_di, r_mask = do[sub], di[sub], mask[sub]
        r_exists = exists[sub]
        # Every interface of the part moves with temperature, fitted or just touching.
        heat = (_part(operating_temperature, n_parts) - _part(reference_temperature, n_parts))[sub]
        r_delta = np.nan_to_num(delta0[sub], nan=0.0)
        heated = ~np.isnan(heat)
        if heated.any():
            r_alpha = alpha[sub]
            with np.errstate(invalid="ignore"):
                change = (r_alpha[:, :-1] - r_alpha[:, 1:]) * heat[:, np.newaxis] * r_di[:, 1:]
            r_delta = r_delta.copy()
            r_delta[:, 1:] += np.where(heated[:, np.newaxis], change, 0.0)
            missing = np.zeros(r_exists.shape, dtype=bool)
            missing[:, 1:] = r_exists[:, 1:] & heated[:, np.newaxis] & np.isnan(change)
            r_flags = flags[sub]
            _flag(r_flags, missing, InterfaceFlag.EXPANSION_NOT_GIVEN)
            flags[sub] = r_flags
        r_pressure, _ = stack_fit_pressures(r_do, r_di, r_mask, e[sub], nu[sub], r_delta)
        # A part whose pressures cannot all be worked out has none of them.
        unknown = np.any(r_exists & np.isnan(r_pressure + r_delta), axis=1)
        r_pressure[unknown] = np.nan
        delta[sub] = np.where(fitted[sub], r_delta, np.nan)
        pressure[sub] = r_pressure
        cap, r_face = layer_fit_stress_capacity(
            r_do, r_di, r_mask, g[sub], sum_gj[sub], r_pressure, sy[sub],
            np.broadcast_to(as_float(factor_of_safety), shape)[sub],
        )
        cap[unknown] = np.nan
        r_face[unknown] = -1
        fit_cap[sub], face[sub] = cap, r_face
    with np.errstate(invalid="ignore"):
        bad_grip = fitted & (~(length > 0) | ~(mu > 0) | ~np.isfinite(length) | ~np.isfinite(mu))
    no_pressure = fitted & np.isnan(pressure)
    # Pressures fail together in a part: say why once per fit, by the cause.
    cold = ((flags & int(InterfaceFlag.EXPANSION_NOT_GIVEN)) != 0).any(axis=1)[:, np.newaxis]
    _flag(flags, no_pressure & cold, InterfaceFlag.EXPANSION_NOT_GIVEN)
    _flag(flags, bad_grip | (no_pressure & ~cold), InterfaceFlag.FIT_INPUT_INVALID)
    bad_fit = bad_grip | no_pressure
    _flag(flags, fitted & (pressure == 0), InterfaceFlag.CONTACT_LOST)
    grip = np.where(fitted & ~bad_fit, slip_torque(pressure, mu, di, length), np.nan)
    slip = slip_capacity(grip, ishare)
    bond = np.where(bonded, bond_capacity(tau_bond, di, bond_len, ishare), np.nan)
    _flag(flags, bonded & np.isnan(bond) & known[:, np.newaxis], InterfaceFlag.BOND_INPUT_INVALID)

    part_has_fit = fitted.any(axis=1)[:, np.newaxis]
    in_fit_part = mask & part_has_fit
    _flag(layer_flags, in_fit_part & (fit_cap == 0), InterfaceFlag.FIT_OVERSTRESSED)
    _flag(layer_flags, in_fit_part & np.isnan(fit_cap), InterfaceFlag.FIT_INPUT_INVALID)

    error = (flags & int(INTERFACE_ERRORS)) != 0
    slip_limit, slip_slot = _smallest(np.where(fitted, slip, np.nan), error & fitted)
    bond_limit, bond_slot = _smallest(np.where(bonded, bond, np.nan), error & bonded)
    fit_limit, fit_slot = _smallest(fit_cap, in_fit_part & np.isnan(fit_cap))
    return InterfaceRating(
        interface_share=ishare,
        interference=delta,
        pressure=pressure,
        slip_torque=grip,
        slip_capacity=np.where(fitted, slip, np.nan),
        bond_capacity=bond,
        fit_stress_capacity=fit_cap,
        fit_stress_face=face,
        interface_flags=flags,
        layer_fit_flags=layer_flags,
        slip_limit=slip_limit,
        slip_slot=slip_slot,
        bond_limit=bond_limit,
        bond_slot=bond_slot,
        fit_stress_limit=fit_limit,
        fit_stress_slot=fit_slot,
    )
