"""Unloading an elastic-perfectly-plastic stack: residual stresses and the permanent twist.

After loading to ``T`` (below the fully plastic torque) and unloading, the layers spring back
elastically, as one section of stiffness ``sum(G J)``: the residual stress is the loaded
stress less ``G_i r T / sum(G J)`` and the permanent twist rate ``theta'_T - T / sum(G J)``.
The spring-back is exact only while no layer yields in reverse; where a residual exceeds a
layer's shear yield that is flagged. Assumptions as in :mod:`._plastic`. A preliminary design
aid: verify against the applicable codes and standards and have a qualified engineer review.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float
from ._plastic import _layers, _stiffness, twist_per_length_at_torque
from ._sleeve_diagnoses import PlasticFlag

__all__ = ["residual_stress_profile", "permanent_twist"]


def residual_stress_profile(
    torque: ArrayLike, outer_diameter: ArrayLike, inner_diameter: ArrayLike,
    shear_modulus: ArrayLike, shear_yield: ArrayLike, present: ArrayLike,
    points_per_layer: int = 2,
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.int32]]:
    """Residual shear stress across every layer after loading to a torque and unloading.

    ``tau_res(r) = tau_loaded(r) - G_i r T / sum(G J)``, the elastic spring-back taken off
    the elastic-plastic stress at ``T``. At the fully plastic torque every layer is at its
    yield (a solid bar's surface is left at ``-tau_y/3``, against the torque's sense).

    Parameters
    ----------
    torque : (P,) array_like, N*m
        Signed; the stresses follow its sign.
    outer_diameter, inner_diameter : (P, L) array_like, m
    shear_modulus : (P, L) array_like, Pa
    shear_yield : (P, L) array_like, Pa
    present : (P, L) array_like of bool
    points_per_layer : int
        At least 2: each layer from its inner to its outer radius.

    Returns
    -------
    radius : (P, L, M) ndarray, m
    stress : (P, L, M) ndarray, Pa
        NaN for absent slots and parts not rated.
    flags : (P,) ndarray of int32
        :class:`PlasticFlag`; ``REVERSE_YIELD_ON_UNLOADING`` where a residual exceeds the
        layer's yield (the elastic spring-back is then not exact).

    Raises
    ------
    ValueError
        If ``points_per_layer < 2``.
    """
    if points_per_layer < 2:
        raise ValueError(f"points_per_layer must be at least 2; got {points_per_layer}")
    a, b, g, ty, mask, ok = _layers(outer_diameter, inner_diameter, shear_modulus,
                                    shear_yield, present)
    theta, flags = twist_per_length_at_torque(torque, outer_diameter, inner_diameter, shear_modulus,
                                        shear_yield, present)
    t = np.broadcast_to(as_float(torque), ok.shape)
    sign = np.where(t < 0, -1.0, 1.0)[:, np.newaxis, np.newaxis]
    fraction = np.linspace(0.0, 1.0, points_per_layer)
    radius = a[..., np.newaxis] + (b - a)[..., np.newaxis] * fraction
    gr = g[..., np.newaxis] * radius
    with np.errstate(invalid="ignore"):
        loaded = np.minimum(gr * np.abs(theta)[:, np.newaxis, np.newaxis], ty[..., np.newaxis])
        loaded = np.where(radius == 0, 0.0, loaded)
        spring = gr * (np.abs(t) / _stiffness(a, b, g))[:, np.newaxis, np.newaxis]
        stress = sign * (loaded - spring)
        reverse = np.abs(stress) > ty[..., np.newaxis] * (1.0 + 1e-12)
    bad = ~(mask & ok[:, np.newaxis])[..., np.newaxis] | np.isnan(theta)[:, np.newaxis, np.newaxis]
    stress = np.where(bad, np.nan, stress)
    radius = np.where(~mask[..., np.newaxis], np.nan, radius)
    flags[np.any(reverse & ~bad, axis=(1, 2))] |= int(PlasticFlag.REVERSE_YIELD_ON_UNLOADING)
    return radius, stress, flags


def permanent_twist(
    torque: ArrayLike, length: ArrayLike, outer_diameter: ArrayLike, inner_diameter: ArrayLike,
    shear_modulus: ArrayLike, shear_yield: ArrayLike, present: ArrayLike,
) -> tuple[NDArray[np.float64], NDArray[np.int32]]:
    """Twist left after loading to a torque and unloading, ``(theta'_T - T / sum(G J)) L``.

    Parameters
    ----------
    torque : (P,) array_like, N*m
    length : (P,) array_like, m
    outer_diameter, inner_diameter : (P, L) array_like, m
    shear_modulus : (P, L) array_like, Pa
    shear_yield : (P, L) array_like, Pa
    present : (P, L) array_like of bool

    Returns
    -------
    angle : (P,) ndarray, rad
        0 below first yield; signed like the torque; infinite at the fully plastic torque.
    flags : (P,) ndarray of int32
        :class:`PlasticFlag` bits.
    """
    a, b, g, _, _, _ = _layers(outer_diameter, inner_diameter, shear_modulus, shear_yield,
                               present)
    theta, flags = twist_per_length_at_torque(torque, outer_diameter, inner_diameter, shear_modulus,
                                        shear_yield, present)
    t = np.broadcast_to(as_float(torque), theta.shape)
    with np.errstate(invalid="ignore"):
        elastic = t / _stiffness(a, b, g)
        angle = np.where(np.isinf(theta), theta, theta - elastic) * as_float(length)
    return angle, flags
