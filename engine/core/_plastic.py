"""Plastic reserve: elastic-perfectly-plastic torsion of a stack of fully connected layers.

Every layer twists at the common rate ``theta'`` and carries ``tau = min(G_i r theta',
tau_y,i)``: it yields from its outer radius inward, each at its own twist, keeping an elastic
core of radius ``rho_i = tau_y,i / (G_i theta')`` clipped to the layer. With ``a``, ``b``
the layer's inner and outer radii and ``rho`` clipped to ``[a, b]``, the layer torque is

``T_i = G_i theta' pi/2 (rho^4 - a^4) + 2 pi/3 tau_y,i (b^3 - rho^3)``,

elastic for ``rho = b`` and fully plastic (``2 pi/3 tau_y (b^3 - a^3)``) for ``rho = a``.
Unloading (residual stress, permanent twist) is in :mod:`._plastic_unloading`.

Assumptions: the interfaces hold (no slip), the material is elastic-perfectly-plastic with
no hardening and the same yield in reverse, Kt is not applied (local yielding at a notch
starts earlier; the fully plastic torque of a ductile section is not much affected). A
preliminary design aid: verify against the applicable codes and standards and have a
qualified engineer review.
"""

from __future__ import annotations

from dataclasses import dataclass, fields

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_bool, as_float, frozen_view
from ._sleeve_diagnoses import PlasticFlag

__all__ = [
    "PlasticReserve",
    "plastic_reserve",
    "plastic_torque",
    "fully_plastic_torque",
    "torque_twist_curve",
    "twist_per_length_at_torque",
]

_PLASTIC_TOL = 1e-12
_MAX_ITERATIONS = 200


def _layers(
    outer_diameter: ArrayLike, inner_diameter: ArrayLike, shear_modulus: ArrayLike,
    shear_yield: ArrayLike, present: ArrayLike,
) -> tuple[NDArray[np.float64], ...]:
    """Radii, G, tau_y and present as (P, L) arrays; absent slots made inert (a = b = 0)."""
    do, di = as_float(outer_diameter), as_float(inner_diameter)
    g, ty = as_float(shear_modulus), as_float(shear_yield)
    do, di, g, ty, mask = np.broadcast_arrays(do, di, g, ty, as_bool(present))
    if do.ndim != 2:
        raise ValueError(f"plastic torsion needs (parts, layers) arrays; got shape {do.shape}")
    with np.errstate(invalid="ignore"):
        good = (di >= 0) & (di < do) & np.isfinite(do) & (g > 0) & np.isfinite(g) & (
            ty > 0) & np.isfinite(ty)
    ok = np.all(good | ~mask, axis=1) & mask.any(axis=1)
    use = mask & ok[:, np.newaxis]
    a = np.where(use, di / 2.0, 0.0)
    b = np.where(use, do / 2.0, 0.0)
    return a, b, np.where(use, g, 1.0), np.where(use, ty, 1.0), mask, ok


def _stiffness(a: NDArray[np.float64], b: NDArray[np.float64],
               g: NDArray[np.float64]) -> NDArray[np.float64]:
    return (g * (np.pi / 2.0) * (b**4 - a**4)).sum(axis=1)


def _torque_and_tangent(
    theta: NDArray[np.float64], a: NDArray[np.float64], b: NDArray[np.float64],
    g: NDArray[np.float64], ty: NDArray[np.float64], tangent: bool = False,
) -> tuple[NDArray[np.float64], NDArray[np.float64] | None]:
    """Section torque (and d T / d theta') at twist rates ``theta`` of shape (P, N)."""
    total = np.zeros(theta.shape)
    slope = np.zeros(theta.shape) if tangent else None
    rho = np.empty(theta.shape)
    work = np.empty(theta.shape)
    with np.errstate(divide="ignore", invalid="ignore"):
        # The loop runs over the few layer slots, never over parts.
        for slot in range(a.shape[1]):
            ai, bi = a[:, slot, np.newaxis], b[:, slot, np.newaxis]
            gi, ti = g[:, slot, np.newaxis], ty[:, slot, np.newaxis]
            # Powers formed exactly as for rho, so rho = a or b cancels to exactly 0.
            a4, b3 = (ai * ai) * (ai * ai), (bi * bi) * bi
            np.multiply(gi, theta, out=work)
            np.divide(ti, work, out=rho)
            np.clip(rho, ai, bi, out=rho)
            rho2 = rho * rho
            np.multiply(rho2, rho2, out=work)
            work -= a4  # rho^4 - a^4: the elastic core
            if slope is not None:
                slope += (np.pi / 2.0) * gi * work
            work *= theta
            work *= (np.pi / 2.0) * gi
            total += work
            rho2 *= rho  # rho^3
            np.subtract(b3, rho2, out=rho2)
            rho2 *= (2.0 * np.pi / 3.0) * ti
            total += rho2
    return total, slope


def plastic_torque(
    twist_per_length: ArrayLike, outer_diameter: ArrayLike, inner_diameter: ArrayLike,
    shear_modulus: ArrayLike, shear_yield: ArrayLike, present: ArrayLike,
) -> NDArray[np.float64]:
    """Section torque of elastic-perfectly-plastic layers at given twist rates.

    Parameters
    ----------
    twist_per_length : (P,) or (P, N) array_like, rad/m
        Non-negative twist rates, one or N per part.
    outer_diameter, inner_diameter : (P, L) array_like, m
    shear_modulus : (P, L) array_like, Pa
    shear_yield : (P, L) array_like, Pa
        Shear yield stress of each layer (e.g. ``S_y / sqrt(3)`` by distortion energy).
    present : (P, L) array_like of bool

    Returns
    -------
    ndarray, N*m
        The shape of ``twist_per_length``; NaN for parts with an unusable layer.

    Examples
    --------
    >>> t = plastic_torque([1e9], [[0.05]], [[0.0]], [[80e9]], [[100e6]], [[True]])
    >>> round(float(t[0]) / (2 * np.pi / 3 * 100e6 * 0.025**3), 9)  # fully plastic
    1.0
    """
    a, b, g, ty, _, ok = _layers(outer_diameter, inner_diameter, shear_modulus, shear_yield,
                                 present)
    theta = as_float(twist_per_length)
    one = theta.ndim == 1
    grid = theta[:, np.newaxis] if one else theta
    total, _ = _torque_and_tangent(np.broadcast_to(grid, (a.shape[0], grid.shape[1])),
                                   a, b, g, ty)
    total[~ok] = np.nan
    return total[:, 0] if one else total


def fully_plastic_torque(
    outer_diameter: ArrayLike, inner_diameter: ArrayLike, shear_yield: ArrayLike,
    present: ArrayLike,
) -> NDArray[np.float64]:
    """Fully plastic torque ``sum(2 pi/3 tau_y,i (r_o^3 - r_i^3))``.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    shear_yield : (P, L) array_like, Pa
    present : (P, L) array_like of bool

    Returns
    -------
    (P,) ndarray, N*m
        NaN for parts with an unusable layer.
    """
    a, b, _, ty, _, ok = _layers(outer_diameter, inner_diameter, 1.0, shear_yield, present)
    result = (2.0 * np.pi / 3.0 * ty * (b**3 - a**3)).sum(axis=1)
    return np.where(ok, result, np.nan)


@dataclass(frozen=True)
class PlasticReserve:
    """First yield and full plasticity of P parts (results of :func:`plastic_reserve`).

    Attributes
    ----------
    first_yield_torque : (P,) ndarray, N*m
        Section torque at which the first layer reaches its shear yield at its outer radius.
    first_yield_twist_per_length : (P,) ndarray, rad/m
    first_yield_layer : (P,) ndarray of int16
        The layer that yields first (the innermost on a tie); -1 if not rated.
    fully_plastic_torque : (P,) ndarray, N*m
    reserve_ratio : (P,) ndarray, 1
        Fully plastic over first-yield torque (4/3 for a solid round bar).
    sum_gj : (P,) ndarray, N*m^2
    flags : (P,) ndarray of int32
        :class:`PlasticFlag` bits.
    """

    first_yield_torque: NDArray[np.float64]
    first_yield_twist_per_length: NDArray[np.float64]
    first_yield_layer: NDArray[np.int16]
    fully_plastic_torque: NDArray[np.float64]
    reserve_ratio: NDArray[np.float64]
    sum_gj: NDArray[np.float64]
    flags: NDArray[np.int32]

    def __post_init__(self) -> None:
        for item in fields(self):
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))


def plastic_reserve(
    outer_diameter: ArrayLike, inner_diameter: ArrayLike, shear_modulus: ArrayLike,
    shear_yield: ArrayLike, present: ArrayLike,
) -> PlasticReserve:
    """First-yield torque (and the layer), fully plastic torque and the reserve between them.

    Layer ``i`` first yields at ``theta'_i = tau_y,i / (G_i r_o,i)``; the section first
    yields at the smallest of them, at ``T_Y = sum(G J) theta'_Y``.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    shear_modulus : (P, L) array_like, Pa
    shear_yield : (P, L) array_like, Pa
    present : (P, L) array_like of bool

    Returns
    -------
    PlasticReserve

    Examples
    --------
    >>> r = plastic_reserve([[0.05]], [[0.0]], [[80e9]], [[100e6]], [[True]])
    >>> round(float(r.reserve_ratio[0]), 12)
    1.333333333333
    """
    a, b, g, ty, mask, ok = _layers(outer_diameter, inner_diameter, shear_modulus,
                                    shear_yield, present)
    sum_gj = _stiffness(a, b, g)
    with np.errstate(divide="ignore", invalid="ignore"):
        layer_rate = np.where(mask & ok[:, np.newaxis], ty / (g * b), np.inf)
    layer = np.argmin(layer_rate, axis=1).astype(np.int16)
    theta_y = np.take_along_axis(layer_rate, layer[:, np.newaxis].astype(np.intp), axis=1)[:, 0]
    plastic = (2.0 * np.pi / 3.0 * ty * (b**3 - a**3)).sum(axis=1)
    with np.errstate(invalid="ignore"):
        first = sum_gj * theta_y
    flags = np.where(ok, 0, int(PlasticFlag.LAYER_INPUT_INVALID)).astype(np.int32)
    nan = np.full(ok.shape, np.nan)
    return PlasticReserve(
        first_yield_torque=np.where(ok, first, nan),
        first_yield_twist_per_length=np.where(ok, theta_y, nan),
        first_yield_layer=np.where(ok, layer, -1).astype(np.int16),
        fully_plastic_torque=np.where(ok, plastic, nan),
        reserve_ratio=np.where(ok, plastic / np.where(ok, first, 1.0), nan),
        sum_gj=np.where(ok, sum_gj, nan),
        flags=flags,
    )


def torque_twist_curve(
    outer_diameter: ArrayLike, inner_diameter: ArrayLike, shear_modulus: ArrayLike,
    shear_yield: ArrayLike, present: ArrayLike, n_points: int = 50,
    max_twist_ratio: float = 4.0,
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Torque-twist curve of every part at ``n_points`` twist rates from 0.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    shear_modulus : (P, L) array_like, Pa
    shear_yield : (P, L) array_like, Pa
    present : (P, L) array_like of bool
    n_points : int
        At least 2.
    max_twist_ratio : float
        The last point's twist rate over the part's first-yield twist rate (> 0).

    Returns
    -------
    twist_per_length : (P, n_points) ndarray, rad/m
        Evenly spaced from 0.
    torque : (P, n_points) ndarray, N*m
        NaN rows for parts with an unusable layer.

    Raises
    ------
    ValueError
        If ``n_points < 2`` or ``max_twist_ratio`` is not positive.
    """
    if n_points < 2:
        raise ValueError(f"n_points must be at least 2; got {n_points}")
    if not max_twist_ratio > 0:
        raise ValueError(f"max_twist_ratio must be positive; got {max_twist_ratio!r}")
    reserve = plastic_reserve(outer_diameter, inner_diameter, shear_modulus, shear_yield,
                              present)
    a, b, g, ty, _, ok = _layers(outer_diameter, inner_diameter, shear_modulus, shear_yield,
                                 present)
    steps = np.linspace(0.0, max_twist_ratio, n_points)
    theta = reserve.first_yield_twist_per_length[:, np.newaxis] * steps
    torque, _ = _torque_and_tangent(np.nan_to_num(theta), a, b, g, ty)
    torque[~ok] = np.nan
    return theta, torque


def twist_per_length_at_torque(
    torque: ArrayLike, outer_diameter: ArrayLike, inner_diameter: ArrayLike,
    shear_modulus: ArrayLike, shear_yield: ArrayLike, present: ArrayLike,
) -> tuple[NDArray[np.float64], NDArray[np.int32]]:
    """Twist rate at which the elastic-plastic section carries a torque (the curve inverted).

    Newton's method from the elastic twist: the curve is concave (its slope, the stiffness
    of the elastic cores ``sum(G_i pi/2 (rho_i^4 - a_i^4))``, never rises), so the iterates
    rise to the root without overshooting.

    Parameters
    ----------
    torque : (P,) array_like, N*m
        Signed; the twist rate has its sign.
    outer_diameter, inner_diameter : (P, L) array_like, m
    shear_modulus : (P, L) array_like, Pa
    shear_yield : (P, L) array_like, Pa
    present : (P, L) array_like of bool

    Returns
    -------
    twist_per_length : (P,) ndarray, rad/m
        ``+-inf`` at the fully plastic torque (the twist is unbounded there), NaN above it
        or for unusable layers.
    flags : (P,) ndarray of int32
        :class:`PlasticFlag` bits.
    """
    a, b, g, ty, _, ok = _layers(outer_diameter, inner_diameter, shear_modulus, shear_yield,
                                 present)
    t = np.broadcast_to(as_float(torque), ok.shape)
    size = np.abs(t)
    reserve = plastic_reserve(outer_diameter, inner_diameter, shear_modulus, shear_yield,
                              present)
    plastic = reserve.fully_plastic_torque
    flags = reserve.flags.copy()
    with np.errstate(invalid="ignore"):
        above = ok & (size > plastic * (1.0 + _PLASTIC_TOL))
        at_plastic = ok & ~above & (size >= plastic * (1.0 - _PLASTIC_TOL))
        theta = size / reserve.sum_gj
        todo = np.flatnonzero(ok & ~above & ~at_plastic & (size > reserve.first_yield_torque))
    flags[above] |= int(PlasticFlag.TORQUE_ABOVE_PLASTIC)
    if todo.size:
        x = theta[todo, np.newaxis]
        target = size[todo, np.newaxis]
        sub = tuple(v[todo] for v in (a, b, g, ty))
        for _ in range(_MAX_ITERATIONS):
            value, slope = _torque_and_tangent(x, *sub, tangent=True)
            short = target - value
            if np.all(short <= 1e-13 * target):
                break
            x = x + short / slope
        converged = (target - value <= 1e-12 * target)[:, 0]
        theta[todo] = x[:, 0]
        flags[todo[~converged]] |= int(PlasticFlag.NOT_CONVERGED)
        theta[todo[~converged]] = np.nan
    theta[at_plastic] = np.inf
    theta[above | ~ok] = np.nan
    return np.sign(t) * theta, flags
