"""Twist compatibility: fully connected layers share one twist per length; torque divides by G*J."""

from __future__ import annotations

from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_bool, as_float, scalar_out
from ._section import polar_moment

__all__ = [
    "layer_stiffness",
    "twist_per_length",
    "torque_share",
    "shear_stress_at",
    "stress_profile",
]


def layer_stiffness(
    outer_diameter: ArrayLike, inner_diameter: ArrayLike, shear_modulus: ArrayLike
) -> Any:
    """Torsional stiffness ``G*J`` of each layer.

    Parameters
    ----------
    outer_diameter : array_like, m
    inner_diameter : array_like, m
    shear_modulus : array_like, Pa

    Returns
    -------
    ndarray or scalar, N*m^2
    """
    return scalar_out(as_float(shear_modulus) * polar_moment(outer_diameter, inner_diameter))


def twist_per_length(torque: ArrayLike, sum_stiffness: ArrayLike) -> Any:
    """Twist per length common to all layers, ``theta' = T / sum(G*J)``.

    Parameters
    ----------
    torque : array_like, N*m
    sum_stiffness : array_like, N*m^2

    Returns
    -------
    ndarray or scalar, rad/m
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        return scalar_out(as_float(torque) / as_float(sum_stiffness))


def torque_share(stiffness: ArrayLike) -> NDArray[np.float64]:
    """Fraction of the section torque each layer carries, ``G_i J_i / sum(G J)``.

    Parameters
    ----------
    stiffness : (..., L) array_like, N*m^2
        Per-layer ``G*J``; absent slots 0.

    Returns
    -------
    (..., L) ndarray, 1
    """
    gj = as_float(stiffness)
    with np.errstate(divide="ignore", invalid="ignore"):
        return gj / gj.sum(axis=-1, keepdims=True)


def shear_stress_at(radius: ArrayLike, shear_modulus: ArrayLike, twist_per_length: ArrayLike) -> Any:
    """Elastic shear stress at a radius, ``tau = G * r * theta'``.

    This is the nominal stress; a stress-concentration factor is applied in the
    capacity and utilisation, not here.

    Parameters
    ----------
    radius : array_like, m
    shear_modulus : array_like, Pa
        Of the layer the radius lies in.
    twist_per_length : array_like, rad/m

    Returns
    -------
    ndarray or scalar, Pa
    """
    return scalar_out(as_float(shear_modulus) * as_float(radius) * as_float(twist_per_length))


def stress_profile(
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    shear_modulus: ArrayLike,
    twist_per_length: float,
    points_per_layer: int = 2,
    present: ArrayLike | None = None,
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Radius and shear stress through one part's layers, for a chart.

    Each layer contributes ``points_per_layer`` points from its inner to its outer
    radius, so an interface radius appears twice: once with the inner layer's stress
    and once with the outer layer's. The stress jumps there; the strain does not.

    Parameters
    ----------
    outer_diameter : (L,) array_like, m
    inner_diameter : (L,) array_like, m
    shear_modulus : (L,) array_like, Pa
    twist_per_length : float, rad/m
    points_per_layer : int
        At least 2 (both faces of the layer).
    present : (L,) array_like of bool, optional
        Absent slots are skipped. Default: all present.

    Returns
    -------
    radius : ndarray, m
    stress : ndarray, Pa

    Raises
    ------
    ValueError
        If ``points_per_layer < 2`` or the layer arrays are not one-dimensional.
    """
    if points_per_layer < 2:
        raise ValueError(f"points_per_layer must be at least 2; got {points_per_layer}")
    outer = as_float(outer_diameter)
    inner = as_float(inner_diameter)
    modulus = as_float(shear_modulus)
    if outer.ndim != 1:
        raise ValueError(
            f"stress_profile takes one part's layers (1-D); got shape {outer.shape}"
        )
    keep = np.ones(outer.shape, bool) if present is None else as_bool(present)
    fraction = np.linspace(0.0, 1.0, points_per_layer)
    r_in = inner[keep, np.newaxis] / 2.0
    r_out = outer[keep, np.newaxis] / 2.0
    radius = r_in + (r_out - r_in) * fraction
    stress = modulus[keep, np.newaxis] * radius * float(twist_per_length)
    return radius.ravel(), stress.ravel()
