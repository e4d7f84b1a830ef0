"""Capacities: the section torque at which each limit is reached."""

from __future__ import annotations

from typing import Any

import numpy as np
from numpy.typing import ArrayLike

from ._arrays import as_float, scalar_out

__all__ = ["layer_capacity", "twist_angle_capacity", "twist_per_length_capacity"]


def layer_capacity(
    allowable_shear: ArrayLike,
    sum_stiffness: ArrayLike,
    shear_modulus: ArrayLike,
    outer_diameter: ArrayLike,
    stress_concentration: ArrayLike = 1.0,
) -> Any:
    """Section torque at which a layer reaches its allowable at its outer radius.

    ``T_cap,i = tau_a,i * sum(G J) / (G_i * r_o,i * Kt_i)`` with ``r_o = D_o / 2``.

    Parameters
    ----------
    allowable_shear : array_like, Pa
    sum_stiffness : array_like, N*m^2
        ``sum(G*J)`` of the whole section (broadcast against the layers).
    shear_modulus : array_like, Pa
    outer_diameter : array_like, m
    stress_concentration : array_like, 1

    Returns
    -------
    ndarray or scalar, N*m
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        result = (
            2.0
            * as_float(allowable_shear)
            * as_float(sum_stiffness)
            / (as_float(shear_modulus) * as_float(outer_diameter) * as_float(stress_concentration))
        )
    return scalar_out(result)


def twist_angle_capacity(
    limit_angle: ArrayLike, sum_stiffness: ArrayLike, length: ArrayLike
) -> Any:
    """Section torque at which the total twist over the length reaches its limit.

    ``T = phi_lim * sum(G J) / L``. A NaN limit means none: the capacity is infinite.

    Parameters
    ----------
    limit_angle : array_like, rad
    sum_stiffness : array_like, N*m^2
    length : array_like, m

    Returns
    -------
    ndarray or scalar, N*m
    """
    limit = as_float(limit_angle)
    with np.errstate(divide="ignore", invalid="ignore"):
        result = limit * as_float(sum_stiffness) / as_float(length)
    return scalar_out(np.where(np.isnan(limit), np.inf, result))


def twist_per_length_capacity(limit_per_length: ArrayLike, sum_stiffness: ArrayLike) -> Any:
    """Section torque at which the twist per length reaches its limit.

    ``T = theta'_lim * sum(G J)``.

    A NaN limit means none: the capacity is infinite.

    Parameters
    ----------
    limit_per_length : array_like, rad/m
    sum_stiffness : array_like, N*m^2

    Returns
    -------
    ndarray or scalar, N*m
    """
    limit = as_float(limit_per_length)
    with np.errstate(invalid="ignore"):
        result = limit * as_float(sum_stiffness)
    return scalar_out(np.where(np.isnan(limit), np.inf, result))
