"""Governing limit: the smallest capacity of all criteria, what it is, and the margin left."""

from __future__ import annotations

from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, scalar_out
from ._criteria import Criterion

__all__ = ["governing_limit", "margin", "factor_of_safety"]


def governing_limit(
    layer_capacities: ArrayLike,
    twist_angle_capacity: ArrayLike,
    twist_per_length_capacity: ArrayLike,
) -> tuple[NDArray[np.float64], NDArray[np.int8], NDArray[np.int16]]:
    """Smallest capacity of every criterion, with the criterion and layer that give it.

    Ties go to the lowest criterion value, then to the innermost layer, so the answer
    never depends on floating-point luck in the order of evaluation.

    Parameters
    ----------
    layer_capacities : (P, L) array_like, N*m
        NaN (or +inf) in absent slots.
    twist_angle_capacity : (P,) array_like, N*m
        +inf where there is no limit.
    twist_per_length_capacity : (P,) array_like, N*m
        +inf where there is no limit.

    Returns
    -------
    capacity : (P,) ndarray, N*m
        NaN where no criterion gives a number.
    criterion : (P,) ndarray of int8
        A :class:`Criterion`; ``NONE`` where ``capacity`` is NaN.
    layer : (P,) ndarray of int16
        Governing layer slot, -1 where a twist limit (or nothing) governs.
    """
    layers = as_float(layer_capacities)
    angle = as_float(twist_angle_capacity)
    per_length = as_float(twist_per_length_capacity)
    n_parts, n_layers = layers.shape
    # Few layer slots, many parts: a loop over slots beats argmin along a short axis.
    capacity = np.full(n_parts, np.nan)
    layer = np.full(n_parts, -1, dtype=np.int16)
    with np.errstate(invalid="ignore"):
        for slot in range(n_layers):
            column = layers[:, slot]
            # Strict '<' keeps the innermost slot on a tie; NaN (absent) never wins.
            wins = column < capacity
            wins |= np.isnan(capacity) & ~np.isnan(column)
            np.copyto(capacity, column, where=wins)
            np.copyto(layer, slot, where=wins)
        criterion = np.where(
            layer >= 0, np.int8(Criterion.LAYER_STRESS), np.int8(Criterion.NONE)
        ).astype(np.int8)
        for limit, code in (
            (angle, Criterion.TWIST_ANGLE),
            (per_length, Criterion.TWIST_PER_LENGTH),
        ):
            # A twist limit must be strictly smaller to take over (ties: lowest criterion).
            wins = limit < capacity
            wins |= np.isnan(capacity) & (limit < np.inf)
            np.copyto(capacity, limit, where=wins)
            np.copyto(criterion, int(code), where=wins)
            np.copyto(layer, -1, where=wins)
        none = ~(capacity < np.inf)
        if none.any():
            capacity[none] = np.nan
            criterion[none] = int(Criterion.NONE)
            layer[none] = -1
    return capacity, criterion, layer


def factor_of_safety(capacity: ArrayLike, torque: ArrayLike) -> Any:
    """Capacity over demand, ``cap / |T|``; infinite at zero torque.

    Parameters
    ----------
    capacity : array_like, N*m
    torque : array_like, N*m

    Returns
    -------
    ndarray or scalar, 1
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        return scalar_out(as_float(capacity) / np.abs(as_float(torque)))


def margin(capacity: ArrayLike, torque: ArrayLike) -> Any:
    """Margin at the applied torque, ``cap / |T| - 1``; infinite at zero torque.

    Parameters
    ----------
    capacity : array_like, N*m
    torque : array_like, N*m

    Returns
    -------
    ndarray or scalar, 1
    """
    return scalar_out(np.asarray(factor_of_safety(capacity, torque)) - 1.0)
