"""Demand: the torque a drive puts through the shaft."""

from __future__ import annotations

from typing import Any

import numpy as np
from numpy.typing import ArrayLike

from ._arrays import as_float, scalar_out

__all__ = ["torque_from_power"]


def torque_from_power(power: ArrayLike, speed: ArrayLike, service_factor: ArrayLike = 1.0) -> Any:
    """Torque transmitted at a power and speed, ``T = SF * P / omega``.

    Parameters
    ----------
    power : array_like, W
    speed : array_like, rad/s
    service_factor : array_like, 1
        Multiplies the demand (shock, duty cycle).

    Returns
    -------
    ndarray or scalar, N*m
        NaN where ``speed <= 0`` or ``service_factor <= 0`` (or either is NaN): no
        torque follows from a standstill.

    Examples
    --------
    >>> round(float(torque_from_power(10e3, 1450 * 2 * 3.141592653589793 / 60)), 2)
    65.86
    """
    p = as_float(power)
    omega = as_float(speed)
    sf = as_float(service_factor)
    with np.errstate(divide="ignore", invalid="ignore"):
        result = np.where((omega > 0) & (sf > 0), sf * p / omega, np.nan)
    return scalar_out(result)
