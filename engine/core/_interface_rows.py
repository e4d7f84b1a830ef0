"""The work of :func:`rate_interfaces` on one block of rows, written into the batch's results.

A block is a few tens of thousands of parts: its temporaries stay in the processor's cache
and are reused from block to block, where whole-batch temporaries would each be fresh memory
(for 10^6 parts, touching fresh memory cost about as much as the arithmetic). Every step is
per part, so a block gives what the whole batch would, row for row.
"""

from __future__ import annotations

from dataclasses import dataclass
from types import SimpleNamespace

import numpy as np
from numpy.typing import NDArray

from ._arrays import nan_to_zero, one_or_nan
from ._layer_fit_stress import _fit_stress, shape_factors
from ._load_path import LoadPath, interface_share
from ._sleeve_diagnoses import InterfaceFlag
from ._stack_fits import _solve

__all__ = ["RowInputs", "rate_rows"]

_KNOWN_PATHS = tuple(int(p) for p in LoadPath)


@dataclass(frozen=True)
class RowInputs:
    """The inputs of a block of P rows and L slots, SI: (P, L) grids and (P,) parts."""

    do: NDArray[np.float64]
    di: NDArray[np.float64]
    g: NDArray[np.float64]
    mask: NDArray[np.bool_]
    share: NDArray[np.float64] | None
    sum_gj: NDArray[np.float64] | None
    path: NDArray[np.float64]
    e: NDArray[np.float64]
    nu: NDArray[np.float64]
    sy: NDArray[np.float64]
    alpha: NDArray[np.float64]
    fs: NDArray[np.float64]
    delta0: NDArray[np.float64]
    length: NDArray[np.float64]
    mu: NDArray[np.float64]
    tau_bond: NDArray[np.float64]
    bond_len: NDArray[np.float64]
    heat: NDArray[np.float64]

    def rows(self, rows: slice) -> RowInputs:
        """The same inputs for a slice of the rows (views)."""
        return RowInputs(**{name: None if value is None else value[rows]
                            for name, value in vars(self).items()})


def _smallest(
    columns: list[NDArray[np.float64] | None], failed: NDArray[np.bool_] | None,
    limit: NDArray[np.float64], slot: NDArray[np.int16],
) -> None:
    """Smallest capacity per part over the slots (NaN and None skipped); NaN where failed."""
    limit.fill(np.inf)
    slot.fill(-1)
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


def _flag(words: NDArray[np.int32], where: NDArray[np.bool_], flag: InterfaceFlag) -> None:
    if where.any():
        words |= where * np.int32(flag)


def _positive(value: NDArray[np.float64]) -> NDArray[np.bool_]:
    """Positive and finite (NaN fails both comparisons); read-only where all agree.

    One value broadcast to every part (a scalar input) is checked once; otherwise two
    reductions (NaN propagates through them) settle the usual all-good case without
    writing a mask, cheaper than two element-wise comparisons of a strided column.
    """
    if value.size == 0:
        return np.zeros(value.shape, dtype=bool)
    if value.strides[0] == 0:
        one = value[:1]
        return np.broadcast_to((one > 0) & (one < np.inf), value.shape)
    if value.min() > 0 and value.max() < np.inf:
        return np.broadcast_to(np.True_, value.shape)
    ok = value > 0
    ok &= value < np.inf
    return ok


def rate_rows(src: RowInputs, out: SimpleNamespace) -> None:
    """Rate the interfaces of one block of rows into ``out``, views of the batch's arrays
    named as the fields of `InterfaceRating` (every element is written)."""
    do, di, g, mask = src.do, src.di, src.g, src.mask
    n_parts, n_layers = do.shape
    full = bool(mask.all())
    if src.share is None or src.sum_gj is None:
        with np.errstate(invalid="ignore"):
            gj = np.where(mask, g * np.pi / 32.0 * (do**4 - di**4), 0.0)
            sum_gj = gj.sum(axis=1)
            share = gj / sum_gj[:, np.newaxis]
    else:
        share, sum_gj = src.share, src.sum_gj
    ishare = out.interface_share
    path = src.path
    interface_share(share, mask, path, out=ishare)
    if path.size and path.min() == path.max() and path[0] in _KNOWN_PATHS:
        known = np.ones(n_parts, dtype=bool)  # one known path for the block (the usual case)
    else:
        known = np.isin(path, _KNOWN_PATHS)
    e, nu, sy, alpha, fs = src.e, src.nu, src.sy, src.alpha, src.fs
    delta0, length, mu = src.delta0, src.length, src.mu
    tau_bond, bond_len, heat = src.tau_bond, src.bond_len, src.heat

    grip, slip, bond = out.slip_torque, out.slip_capacity, out.bond_capacity
    flags, layer_flags = out.interface_flags, out.layer_fit_flags
    # Columns not worked out below stay NaN; the rest are written whole.
    for array in (grip, slip, bond):
        array[:, 0] = np.nan
    flags.fill(0)
    layer_flags.fill(0)
    delta, pressure, fit_cap, face = (out.interference, out.pressure, out.fit_stress_capacity,
                                      out.fit_stress_face)
    # Column by column: a handful of slots, many parts.
    exists: list[NDArray[np.bool_] | None] = [None]
    fitted: list[NDArray[np.bool_] | None] = [None]
    bonded: list[NDArray[np.bool_] | None] = [None]
    all_known = bool(known.all())
    for k in range(1, n_layers):
        both = np.ones(n_parts, dtype=bool) if full else mask[:, k] & mask[:, k - 1]
        exists.append(both)
        for given, value in ((fitted, delta0[:, k]), (bonded, tau_bond[:, k])):
            known_value = np.isnan(value)
            np.logical_not(known_value, out=known_value)
            if not full:
                known_value &= both
            given.append(known_value)
        if not all_known:
            _flag(flags[:, k], both & ~known, InterfaceFlag.LOAD_PATH_UNKNOWN)
    has_fit = np.zeros(n_parts, dtype=bool)
    for k in range(1, n_layers):
        has_fit |= fitted[k]
    all_fit = bool(has_fit.all())
    rows = slice(None) if all_fit else np.flatnonzero(has_fit)
    if not all_fit:
        for array in (delta, pressure, fit_cap):
            array.fill(np.nan)
        face.fill(-1)
    cold_part = np.zeros(n_parts, dtype=bool)
    factors = None

    if all_fit or rows.size:
        pick = (lambda a: a) if all_fit else (lambda a: a[rows])  # noqa: E731
        r_do, r_di, r_mask = pick(do), pick(di), pick(mask)
        n_rows = r_do.shape[0]
        factors = shape_factors(r_do, r_di)
        # Every interface of the part moves with temperature, fitted or just touching.
        r_heat = pick(heat)
        heated = ~np.isnan(r_heat)
        any_heat = bool(heated.any())
        r_heat = nan_to_zero(r_heat) if any_heat else r_heat
        r_delta = delta if all_fit else np.empty((n_rows, n_layers), order="F")
        r_delta[:, 0] = np.nan
        missing_part = cold_part if all_fit else np.zeros(n_rows, dtype=bool)
        change = np.empty(n_rows)
        for k in range(1, n_layers):
            column = r_delta[:, k]
            np.copyto(column, pick(delta0[:, k]))
            nan_to_zero(column, out=column)
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
                    if not all_fit:
                        flags[rows, k] = words
                column += change
        r_pressure = pressure if all_fit else None
        r_pressure, _, usable = _solve(r_do, r_di, r_mask, pick(e), pick(nu), r_delta, factors,
                                       r_pressure)
        # A part whose pressures cannot all be worked out has none of them.
        r_unknown = ~usable | missing_part
        any_unknown = bool(r_unknown.any())
        if any_unknown:
            r_pressure[r_unknown] = np.nan
        cap, r_face = (fit_cap, face) if all_fit else (None, None)
        cap, r_face = _fit_stress(factors, r_pressure, r_mask, pick(g), pick(sum_gj), pick(sy),
                                  pick(fs), cap, r_face)
        if any_unknown:
            cap[r_unknown] = np.nan
            r_face[r_unknown] = -1
        if not all_fit:
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
            any_idle = bool(idle.any())
            if all_fit:
                d2 = factors[k][2]  # D_i^2 of slot k, worked out for the shape factors
            else:
                np.multiply(di[:, k], di[:, k], out=d2)
            fit_k, bond_k = fitted[k], bonded[k]
            slip_k = bond_k_cap = None
            if not fit_k.any():
                grip[:, k] = slip[:, k] = np.nan
            else:
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
                    torque *= one_or_nan(keep)
                slip_k = slip[:, k]
                np.divide(torque, passing, out=slip_k)
                if any_idle:
                    np.copyto(slip_k, np.inf, where=idle & ~np.isnan(torque))
                slip_failed |= fit_k & ~(good_grip & ~np.isnan(p) & known)
            if not bond_k.any():
                bond[:, k] = np.nan
            else:
                np.multiply(tau_bond[:, k], bond_len[:, k], out=own)
                own *= d2
                own *= np.pi / 2.0
                good = _positive(tau_bond[:, k]) & _positive(bond_len[:, k]) & _positive(di[:, k])
                keep = bond_k & good
                if not keep.all():
                    own *= one_or_nan(keep)
                bond_k_cap = bond[:, k]
                np.divide(own, passing, out=bond_k_cap)
                if any_idle:
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
    _smallest(slip_columns, slip_failed, out.slip_limit, out.slip_slot)
    _smallest(bond_columns, bond_failed, out.bond_limit, out.bond_slot)
    _smallest(fit_columns, fit_failed, out.fit_stress_limit, out.fit_stress_slot)
    for k in range(1, n_layers):
        if not fitted[k].all():
            delta[:, k] *= one_or_nan(fitted[k])
