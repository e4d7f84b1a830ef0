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
from ._fits import REFERENCE_TEMPERATURE
from ._load_path import DEFAULT_LOAD_PATH, LoadPath, interface_share
from ._section import LayerStack
from ._sleeve_diagnoses import InterfaceFlag
from ._stack_fits import _fit_stress, _shape_factors, _solve

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
    columns: list[NDArray[np.float64] | None], failed: NDArray[np.bool_] | None, n_parts: int
) -> tuple[NDArray[np.float64], NDArray[np.int16]]:
    """Smallest capacity per part over the slots (NaN and None skipped); NaN where failed."""
    limit = np.full(n_parts, np.inf)
    slot = np.full(n_parts, -1, dtype=np.int16)
    # Arithmetic rather than masked copies: a random mask costs a masked copy ~20x a plain op.
    with np.errstate(invalid="ignore"):
        for k, column in enumerate(columns):
            if column is None:
                continue
            wins = column < limit
            np.fmin(limit, column, out=limit)
            slot += wins * (np.int16(k) - slot)
    if failed is not None and failed.any():
        limit[failed] = np.nan
        slot[failed] = -1
    return limit, slot


def _flag(words: NDArray[np.int32], where: NDArray[np.bool_], flag: InterfaceFlag) -> None:
    if where.any():
        words |= where * np.int32(flag)


def _one_or_nan(keep: NDArray[np.bool_]) -> NDArray[np.float64]:
    """1.0 where ``keep``, NaN elsewhere: a factor that blanks values without a masked copy."""
    return np.array([np.nan, 1.0])[keep.view(np.uint8)]


def _positive(value: NDArray[np.float64]) -> NDArray[np.bool_]:
    """Positive and finite (NaN fails both comparisons)."""
    ok = value > 0
    ok &= value < np.inf
    return ok


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
    do, di, g = (_grid(v, shape) for v in (stack.outer_diameter, stack.inner_diameter,
                                           stack.shear_modulus))
    mask = stack.present
    full = bool(mask.all())
    if share is None or sum_stiffness is None:
        with np.errstate(invalid="ignore"):
            gj = np.where(mask, g * np.pi / 32.0 * (do**4 - di**4), 0.0)
            sum_gj = gj.sum(axis=1)
            share_array = gj / sum_gj[:, np.newaxis]
    else:
        share_array, sum_gj = _grid(share, shape), _part(sum_stiffness, n_parts)
    path = _part(load_path, n_parts)
    ishare = interface_share(share_array, mask, path)
    known = np.isin(path, [int(p) for p in LoadPath])

    e, nu, sy, alpha, fs = (_grid(v, shape) for v in (
        youngs_modulus, poisson_ratio, yield_strength, expansion_coefficient, factor_of_safety))
    delta0, length, mu = (_grid(v, shape) for v in (interference, fit_length, friction))
    tau_bond, bond_len = _grid(bond_allowable, shape), _grid(bond_length, shape)
    heat = _part(operating_temperature, n_parts) - _part(reference_temperature, n_parts)

    def grid(fill: float, dtype: type = np.float64) -> NDArray:
        return np.full(shape, fill, dtype=dtype, order="F")

    grip, slip, bond = (grid(np.nan) for _ in range(3))
    flags, layer_flags = grid(0, np.int32), grid(0, np.int32)
    # Column by column: a handful of slots, many parts.
    exists: list[NDArray[np.bool_] | None] = [None]
    fitted: list[NDArray[np.bool_] | None] = [None]
    bonded: list[NDArray[np.bool_] | None] = [None]
    for k in range(1, n_layers):
        both = np.ones(n_parts, dtype=bool) if full else mask[:, k] & mask[:, k - 1]
        exists.append(both)
        fitted.append(both & ~np.isnan(delta0[:, k]))
        bonded.append(both & ~np.isnan(tau_bond[:, k]))
        _flag(flags[:, k], both & ~known, InterfaceFlag.LOAD_PATH_UNKNOWN)
    has_fit = np.zeros(n_parts, dtype=bool)
    for k in range(1, n_layers):
        has_fit |= fitted[k]
    all_fit = bool(has_fit.all())
    rows = slice(None) if all_fit else np.flatnonzero(has_fit)
    if not all_fit:
        delta, pressure, fit_cap = (grid(np.nan) for _ in range(3))
        face = grid(-1, np.int8)
    cold_part = np.zeros(n_parts, dtype=bool)

    if all_fit or rows.size:
        pick = (lambda a: a) if all_fit else (lambda a: a[rows])  # noqa: E731
        r_do, r_di, r_mask = pick(do), pick(di), pick(mask)
        n_rows = r_do.shape[0]
        factors = _shape_factors(r_do, r_di)
        # Every interface of the part moves with temperature, fitted or just touching.
        r_heat = pick(heat)
        heated = ~np.isnan(r_heat)
        any_heat = bool(heated.any())
        r_heat = np.nan_to_num(r_heat, nan=0.0) if any_heat else r_heat
        r_delta = np.empty((n_rows, n_layers), order="F")
        r_delta[:, 0] = np.nan
        missing_part = np.zeros(n_rows, dtype=bool)
        change = np.empty(n_rows)
        for k in range(1, n_layers):
            column = r_delta[:, k]
            np.copyto(column, pick(delta0[:, k]))
            np.nan_to_num(column, copy=False, nan=0.0)
            if any_heat:
                with np.errstate(invalid="ignore"):
                    np.subtract(pick(alpha[:, k - 1]), pick(alpha[:, k]), out=change)
                    change *= r_heat
                    change *= pick(di[:, k])
                lost = np.isnan(change)
                if lost.any():
                    # A missing coefficient matters only where there is a temperature.
                    change[lost & ~heated] = 0.0
                    missing = lost & heated & pick(exists[k])
                    missing_part |= missing
                    words = pick(flags[:, k])
                    _flag(words, missing, InterfaceFlag.EXPANSION_NOT_GIVEN)
                    if all_fit:
                        flags[:, k] = words
                    else:
                        flags[rows, k] = words
                column += change
        r_pressure, _, usable = _solve(r_do, r_di, r_mask, pick(e), pick(nu), r_delta, factors)
        # A part whose pressures cannot all be worked out has none of them.
        r_unknown = ~usable | missing_part
        if r_unknown.any():
            r_pressure[r_unknown] = np.nan
        cap, r_face = _fit_stress(factors, r_pressure, r_mask, pick(g), pick(sum_gj), pick(sy),
                                  pick(fs))
        if r_unknown.any():
            cap[r_unknown] = np.nan
            r_face[r_unknown] = -1
        if all_fit:
            delta, pressure, fit_cap, face, cold_part = r_delta, r_pressure, cap, r_face, missing_part
        else:
            delta[rows], pressure[rows], fit_cap[rows], face[rows] = r_delta, r_pressure, cap, r_face
            cold_part[rows] = missing_part

    slip_columns: list[NDArray[np.float64] | None] = [None]
    bond_columns: list[NDArray[np.float64] | None] = [None]
    slip_failed = np.zeros(n_parts, dtype=bool)
    bond_failed = np.zeros(n_parts, dtype=bool)
    passing, d2, own = np.empty(n_parts), np.empty(n_parts), np.empty(n_parts)
    with np.errstate(divide="ignore", invalid="ignore"):
        for k in range(1, n_layers):
            np.abs(ishare[:, k], out=passing)
            idle = passing == 0
            np.multiply(di[:, k], di[:, k], out=d2)
            fit_k, bond_k = fitted[k], bonded[k]
            slip_k = bond_k_cap = None
            if fit_k.any():
                p = pressure[:, k]
                good_grip = _positive(length[:, k]) & _positive(mu[:, k])
                no_pressure = fit_k & np.isnan(p)
                # Pressures fail together in a part: each fit says why, by the cause.
                _flag(flags[:, k], no_pressure & cold_part, InterfaceFlag.EXPANSION_NOT_GIVEN)
                _flag(flags[:, k], (fit_k & ~good_grip) | (no_pressure & ~cold_part),
                      InterfaceFlag.FIT_INPUT_INVALID)
                _flag(flags[:, k], fit_k & (p == 0), InterfaceFlag.CONTACT_LOST)
                torque = grip[:, k]
                np.multiply(p, length[:, k], out=torque)
                torque *= d2
                torque *= mu[:, k]
                torque *= np.pi / 2.0
                keep = fit_k & good_grip
                if not keep.all():
                    torque *= _one_or_nan(keep)
                slip_k = slip[:, k]
                np.divide(torque, passing, out=slip_k)
                if idle.any():
                    np.copyto(slip_k, np.inf, where=idle & ~np.isnan(torque))
                slip_failed |= fit_k & ~(good_grip & ~np.isnan(p) & known)
            if bond_k.any():
                np.multiply(tau_bond[:, k], bond_len[:, k], out=own)
                own *= d2
                own *= np.pi / 2.0
                good = _positive(tau_bond[:, k]) & _positive(bond_len[:, k]) & _positive(di[:, k])
                keep = bond_k & good
                if not keep.all():
                    own *= _one_or_nan(keep)
                bond_k_cap = bond[:, k]
                np.divide(own, passing, out=bond_k_cap)
                if idle.any():
                    np.copyto(bond_k_cap, np.inf, where=idle & ~np.isnan(own))
                _flag(flags[:, k], bond_k & ~good & known, InterfaceFlag.BOND_INPUT_INVALID)
                bond_failed |= bond_k & ~(good & known)
            slip_columns.append(slip_k)
            bond_columns.append(bond_k_cap)

    fit_columns: list[NDArray[np.float64] | None] = []
    fit_failed = np.zeros(n_parts, dtype=bool)
    with np.errstate(invalid="ignore"):
        for k in range(n_layers):
            column = fit_cap[:, k]
            in_fit = has_fit if full else has_fit & mask[:, k]
            _flag(layer_flags[:, k], in_fit & (column == 0), InterfaceFlag.FIT_OVERSTRESSED)
            bad = in_fit & np.isnan(column)
            _flag(layer_flags[:, k], bad, InterfaceFlag.FIT_INPUT_INVALID)
            fit_failed |= bad
            fit_columns.append(column)
    slip_limit, slip_slot = _smallest(slip_columns, slip_failed, n_parts)
    bond_limit, bond_slot = _smallest(bond_columns, bond_failed, n_parts)
    fit_limit, fit_slot = _smallest(fit_columns, fit_failed, n_parts)
    for k in range(1, n_layers):
        if not fitted[k].all():
            delta[:, k] *= _one_or_nan(fitted[k])
    return InterfaceRating(
        interface_share=ishare,
        interference=delta,
        pressure=pressure,
        slip_torque=grip,
        slip_capacity=slip,
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
