"""Fits in a stack of layers: every interface's contact pressure at once, and each layer's stress.

One shrink fit squeezes everything inside it, so in a part of three or more layers the
two-cylinder formula (:func:`fit_pressure`) is not enough: a sleeve fitted over a bonded
sleeve also presses on the core, and two fits change each other's pressure. Here each layer
is a Lamé cylinder in plane stress with its own E and nu; the radial displacement of each
face is linear in the pressures on the layer's two faces, and at every interface the outer
member's bore moves out and the inner member's surface moves in by the radial interference
between them:

``u_k(a_k) - u_{k-1}(b_{k-1}) = delta_k / 2``.

That is a tridiagonal system in the interface pressures, solved for all parts at once
(Thomas algorithm, a loop over the few interfaces). Interfaces carry compression only: one
whose pressure would come out negative opens (``p = 0``), and the rest are solved again.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_bool, as_float
from ._fits import combined_stress_capacity, lame_stresses

__all__ = ["stack_fit_pressures", "layer_fit_stress_capacity"]


def _face_compliances(
    inner_diameter: NDArray[np.float64],
    outer_diameter: NDArray[np.float64],
    youngs: NDArray[np.float64],
    poisson: NDArray[np.float64],
) -> tuple[NDArray[np.float64], ...]:
    """``u(a) = ca_in p_in - ca_out p_out``, ``u(b) = cb_in p_in - cb_out p_out`` per layer."""
    a, b = inner_diameter / 2.0, outer_diameter / 2.0
    a2, b2 = a * a, b * b
    wall = b2 - a2
    ca_in = a / youngs * ((1.0 + poisson) * b2 + (1.0 - poisson) * a2) / wall
    ca_out = a / youngs * 2.0 * b2 / wall
    cb_in = b / youngs * 2.0 * a2 / wall
    cb_out = b / youngs * ((1.0 - poisson) * b2 + (1.0 + poisson) * a2) / wall
    return ca_in, ca_out, cb_in, cb_out


def _solve_tridiagonal(
    sub: NDArray[np.float64], diag: NDArray[np.float64], sup: NDArray[np.float64],
    rhs: NDArray[np.float64],
) -> NDArray[np.float64]:
    """Thomas algorithm along the last axis, vectorised over the leading one."""
    m = diag.shape[1]
    c = np.zeros_like(diag)
    d = np.zeros_like(diag)
    c[:, 0] = sup[:, 0] / diag[:, 0]
    d[:, 0] = rhs[:, 0] / diag[:, 0]
    for k in range(1, m):
        pivot = diag[:, k] - sub[:, k] * c[:, k - 1]
        c[:, k] = sup[:, k] / pivot
        d[:, k] = (rhs[:, k] - sub[:, k] * d[:, k - 1]) / pivot
    x = np.empty_like(d)
    x[:, -1] = d[:, -1]
    for k in range(m - 2, -1, -1):
        x[:, k] = d[:, k] - c[:, k] * x[:, k + 1]
    return x


def stack_fit_pressures(
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    present: ArrayLike,
    youngs_modulus: ArrayLike,
    poisson_ratio: ArrayLike,
    interference: ArrayLike,
) -> tuple[NDArray[np.float64], NDArray[np.bool_]]:
    """Contact pressure at every interface of a stack of Lamé cylinders.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
        The layers, innermost first; 0 inner diameter for a solid core.
    present : (P, L) array_like of bool
    youngs_modulus : (P, L) array_like, Pa
    poisson_ratio : (P, L) array_like, 1
    interference : (P, L) array_like, m
        Diametral interference of the interface below each slot, at the outer member's slot
        (at the temperature wanted). NaN: no fit, the layers just touch (0). Slot 0 is
        ignored.

    Returns
    -------
    pressure : (P, L) ndarray, Pa
        At the outer member's slot; NaN at slot 0, absent interfaces and parts whose
        layers are not usable (a diameter, E or nu missing or out of range).
    opened : (P, L) ndarray of bool
        The interface carries no pressure because it would otherwise be in radial tension.

    Notes
    -----
    Layer ``k`` spans radii ``a = D_i/2`` to ``b = D_o/2``; the interface between ``k-1``
    and ``k`` uses the two members' own radii (they differ by the interference, nothing
    more). With one interface this is :func:`fit_pressure` exactly.

    Examples
    --------
    >>> p, _ = stack_fit_pressures([[0.05, 0.08]], [[0.0, 0.05]], [[True, True]],
    ...                            [[207e9, 207e9]], [[0.292, 0.292]], [[np.nan, 40e-6]])
    >>> round(float(p[0, 1]) / 1e6, 2)
    50.46
    """
    do, di = as_float(outer_diameter), as_float(inner_diameter)
    mask = as_bool(present)
    e, nu = as_float(youngs_modulus), as_float(poisson_ratio)
    delta = np.broadcast_to(as_float(interference), do.shape)
    n_parts, n_layers = do.shape
    pressure = np.full(do.shape, np.nan)
    opened = np.zeros(do.shape, dtype=bool)
    if n_layers < 2:
        return pressure, opened
    with np.errstate(all="ignore"):
        usable = (di >= 0) & (di < do) & np.isfinite(do) & (e > 0) & np.isfinite(e) & (
            nu > -1.0) & (nu <= 0.5)
        part_ok = np.all(usable | ~mask, axis=1)
        ca_in, ca_out, cb_in, cb_out = _face_compliances(di, do, e, nu)
        exists = mask[:, 1:] & mask[:, :-1] & part_ok[:, np.newaxis]
        # Unknowns p_1 .. p_{L-1}; row k-1 is the interface at slot k. Scaling each row by
        # its radius makes the matrix symmetric (the compliance matrix of the stack).
        radius = di[:, 1:] / 2.0
        diag = radius * (ca_in[:, 1:] + cb_out[:, :-1])
        sub = -radius * cb_in[:, :-1]
        sup = np.zeros_like(diag)
        sup[:, :-1] = -radius[:, :-1] * ca_out[:, 1:-1]
        rhs = radius * np.nan_to_num(delta[:, 1:], nan=0.0) / 2.0
        # Couplings to a missing interface, and rows of missing ones, drop out.
        sub[:, 0] = 0.0
        sub[:, 1:] = np.where(exists[:, 1:] & exists[:, :-1], sub[:, 1:], 0.0)
        sup[:, :-1] = np.where(exists[:, :-1] & exists[:, 1:], sup[:, :-1], 0.0)
        diag = np.where(exists, diag, 1.0)
        rhs = np.where(exists, rhs, 0.0)
        active = exists.copy()
        p = np.zeros_like(diag)
        for _ in range(2 * n_layers):
            a_sub = np.zeros_like(sub)
            a_sub[:, 1:] = np.where(active[:, 1:] & active[:, :-1], sub[:, 1:], 0.0)
            a_sup = np.zeros_like(sup)
            a_sup[:, :-1] = np.where(active[:, :-1] & active[:, 1:], sup[:, :-1], 0.0)
            p = _solve_tridiagonal(
                a_sub, np.where(active, diag, 1.0), a_sup, np.where(active, rhs, 0.0)
            )
            # Interference an open interface would not take up under these pressures: it
            # would overlap, so it closes again.
            untaken = rhs - diag * p
            untaken[:, 1:] -= sub[:, 1:] * p[:, :-1]
            untaken[:, :-1] -= sup[:, :-1] * p[:, 1:]
            reclose = exists & ~active & (untaken > 0)
            release = active & (p < 0)
            if not (reclose.any() or release.any()):
                break
            active = (active & ~release) | reclose
        p = np.where(active, p, 0.0)
        pressure[:, 1:] = np.where(exists, p, np.nan)
        opened[:, 1:] = exists & ~active
    return pressure, opened


def layer_fit_stress_capacity(
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    present: ArrayLike,
    shear_modulus: ArrayLike,
    sum_stiffness: ArrayLike,
    pressure: ArrayLike,
    yield_strength: ArrayLike,
    factor_of_safety: ArrayLike = 1.0,
) -> tuple[NDArray[np.float64], NDArray[np.int8]]:
    """Section torque at which a layer's fit stresses plus torsion reach ``S_y / FS``.

    Each layer is checked at its inner and outer face, where the fit stresses and the
    torsional shear are largest: Lamé stresses from the pressures on its two faces
    (:func:`lame_stresses`) and ``tau = G r T / sum(G J)``, combined by distortion energy
    (:func:`combined_stress_capacity`). For an interface these faces are the outer member's
    bore and the inner member's surface.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    present : (P, L) array_like of bool
    shear_modulus : (P, L) array_like, Pa
    sum_stiffness : (P,) array_like, N*m^2
        ``sum(G J)`` of the section.
    pressure : (P, L) array_like, Pa
        Interface pressures at the outer member's slot (:func:`stack_fit_pressures`); NaN
        where there is no interface counts as none (0).
    yield_strength : (P, L) array_like, Pa
    factor_of_safety : array_like, 1
        Broadcast against (P, L).

    Returns
    -------
    capacity : (P, L) ndarray, N*m
        0 where the fit alone reaches ``S_y / FS``; NaN for absent slots and missing
        strengths.
    face : (P, L) ndarray of int8
        0 where the inner face governs, 1 the outer face; -1 where there is no capacity.
    """
    do, di = as_float(outer_diameter), as_float(inner_diameter)
    mask = as_bool(present)
    g = as_float(shear_modulus)
    sum_gj = as_float(sum_stiffness)[:, np.newaxis]
    p = np.nan_to_num(as_float(pressure), nan=0.0)
    p_in = np.where(mask, p, 0.0)
    p_in[:, 0] = 0.0
    p_out = np.zeros_like(p_in)
    p_out[:, :-1] = np.where(mask[:, 1:], p[:, 1:], 0.0)
    capacities = []
    for diameter in (di, do):
        radial, hoop = lame_stresses(diameter / 2.0, di, do, p_in, p_out)
        with np.errstate(divide="ignore", invalid="ignore"):
            per_torque = g * diameter / 2.0 / sum_gj
        capacities.append(
            combined_stress_capacity(hoop, radial, per_torque, yield_strength, factor_of_safety)
        )
    inner, outer = capacities
    with np.errstate(invalid="ignore"):
        outer_wins = (outer < inner) | np.isnan(inner)
    capacity = np.where(outer_wins, outer, inner)
    face = np.where(outer_wins, 1, 0).astype(np.int8)
    missing = np.isnan(capacity) | ~mask
    capacity[missing] = np.nan
    face[missing] = -1
    return capacity, face
