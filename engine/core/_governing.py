"""Governing limit of the three torsion criteria, the margin left and the reserve factor."""

from __future__ import annotations

from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, scalar_out
from ._criteria import Criterion
from ._criteria_list import governing_of

__all__ = ["governing_limit", "margin", "reserve_factor"]


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
    return governing_of(
        ((Criterion.LAYER_STRESS, layers),
         (Criterion.TWIST_ANGLE, as_float(twist_angle_capacity)),
         (Criterion.TWIST_PER_LENGTH, as_float(twist_per_length_capacity))),
        layers.shape[0],
    )


def reserve_factor(capacity: ArrayLike, torque: ArrayLike) -> Any:
    """The reserve factor: capacity over demand, ``cap / |T|``; infinite at zero torque.

    Not a factor of safety: that name is kept for the material input inside an allowable.

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
    return scalar_out(np.asarray(reserve_factor(capacity, torque)) - 1.0)
