"""A layer's own stresses in a fitted stack: Lamé hoop and radial stress with torsion.

Each layer is a Lamé cylinder squeezed by the interface pressures on its two faces
(:func:`stack_fit_pressures`); at both faces the fit's hoop and radial stresses and the
torsional shear ``tau = G r T / sum(G J)`` are combined by distortion energy against
``S_y / FS``, and the section torque at which that is reached is the layer's fit-stress
capacity. A sleeve can yield from the fit alone: its capacity is then 0.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_bool, as_float, nan_to_zero

__all__ = ["layer_fit_stress_capacity", "shape_factors"]


def shape_factors(
    do: NDArray[np.float64], di: NDArray[np.float64]
) -> list[tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]]:
    """Per layer slot: ``s = (D_o^2 + D_i^2) / (D_o^2 - D_i^2)``, ``D_o^2`` and ``D_i^2``."""
    out = []
    wall = np.empty(do.shape[0])
    for slot in range(do.shape[1]):
        do2 = np.multiply(do[:, slot], do[:, slot])
        di2 = np.multiply(di[:, slot], di[:, slot])
        s = np.add(do2, di2)
        np.subtract(do2, di2, out=wall)
        s /= wall
        out.append((s, do2, di2))
    return out


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
    shape = do.shape
    mask = np.broadcast_to(as_bool(present), shape)
    g, sy, fs = (np.broadcast_to(as_float(v), shape) for v in (shear_modulus, yield_strength,
                                                               factor_of_safety))
    pressure = np.broadcast_to(as_float(pressure), shape)
    return _fit_stress(shape_factors(do, di), pressure, mask, g,
                       np.broadcast_to(as_float(sum_stiffness), shape[:1]), sy, fs)


_TWO_OVER_ROOT3 = 2.0 / np.sqrt(3.0)


def _room_left(
    hoop: NDArray[np.float64], p_face: NDArray[np.float64], p_face_sq: NDArray[np.float64],
    limit: NDArray[np.float64], diameter2: NDArray[np.float64], room: NDArray[np.float64],
    work: NDArray[np.float64],
) -> None:
    """``room = max(S^2 - A, 0) / D^2`` with ``A = st (st - sr) + sr^2``, ``sr = -p_face``
    and ``p_face_sq = p_face * p_face`` (``work`` is scratch afterwards)."""
    np.add(hoop, p_face, out=work)
    work *= hoop
    work += p_face_sq
    np.subtract(limit, work, out=room)
    np.maximum(room, 0.0, out=room)
    room /= diameter2


def _fit_stress(
    factors: list[tuple[NDArray[np.float64], ...]],
    pressure: NDArray[np.float64],
    mask: NDArray[np.bool_],
    g: NDArray[np.float64],
    sum_gj: NDArray[np.float64],
    sy: NDArray[np.float64],
    fs: NDArray[np.float64],
    capacity: NDArray[np.float64] | None = None,
    face: NDArray[np.int8] | None = None,
) -> tuple[NDArray[np.float64], NDArray[np.int8]]:
    """Column by column: with ``s`` the layer's shape factor the Lamé faces are
    ``sigma_t(a) = p_in s - p_out (s + 1)``, ``sigma_t(b) = p_in (s - 1) - p_out s``,
    ``sigma_r = -p`` of that face; distortion energy with ``tau = G (D/2) T / sum(G J)``
    gives ``T = sqrt((S^2 - A) / D^2) 2 sum(G J) / (sqrt(3) G)``, ``A = st^2 + sr^2 - st sr``.
    ``capacity`` and ``face``, when given, are (P, L) arrays to write the results into.
    """
    n_parts, n_layers = pressure.shape
    # Every column of both is written below: no fill needed.
    capacity = np.empty((n_parts, n_layers), order="F") if capacity is None else capacity
    face = np.empty((n_parts, n_layers), dtype=np.int8, order="F") if face is None else face
    full = bool(mask.all())
    zero = np.zeros(n_parts)

    def squeeze(slot: int) -> NDArray[np.float64]:
        if slot <= 0 or slot >= n_layers:
            return zero
        column = pressure[:, slot]
        return nan_to_zero(column) if np.isnan(column).any() else column

    with np.errstate(all="ignore"):
        # Few buffers, reused: fresh memory for every temporary costs more than the sums.
        hoop, work, limit = np.empty(n_parts), np.empty(n_parts), np.empty(n_parts)
        inner, outer = np.empty(n_parts), np.empty(n_parts)
        outer_wins = np.empty(n_parts, dtype=bool)
        # Usually every strength and factor is positive: two reductions tell (NaN fails).
        all_strong = bool(n_parts and sy.min() > 0.0 and fs.min() > 0.0)
        if not all_strong:
            strong = np.greater(sy, 0.0)
            strong &= np.greater(fs, 0.0)
            all_strong = bool(strong.all())
        # An interface's p^2 serves the faces either side of it: squared once, in two
        # buffers taken in turn (0 * 0 is the zero array itself).
        squares = (np.empty(n_parts), np.empty(n_parts))
        p_in = sq_in = zero
        for slot in range(n_layers):
            s, do2, di2 = factors[slot]
            p_out = squeeze(slot + 1)
            sq_out = zero
            if p_out is not zero:
                sq_out = np.multiply(p_out, p_out, out=squares[slot % 2])
            np.divide(sy[:, slot], fs[:, slot], out=limit)
            if not all_strong:
                limit[~strong[:, slot]] = np.nan
            limit *= limit
            # Inner face: sigma_t(a) = p_in s - p_out (s + 1).
            np.multiply(p_in, s, out=hoop)
            np.add(s, 1.0, out=work)
            work *= p_out
            hoop -= work
            _room_left(hoop, p_in, sq_in, limit, di2, inner, work)
            # Outer face: sigma_t(b) = p_in (s - 1) - p_out s.
            np.subtract(s, 1.0, out=hoop)
            hoop *= p_in
            np.multiply(s, p_out, out=work)
            hoop -= work
            _room_left(hoop, p_out, sq_out, limit, do2, outer, work)
            # A solid core has no inner face: dividing by its D_i^2 = 0 gives inf, or NaN
            # where the fit alone yields, and there its outer face, in the same uniform
            # state, gives 0 anyway; fmin skips that NaN, and a NaN strength is NaN on both.
            np.less(outer, inner, out=outer_wins)
            outer_wins |= np.isnan(inner)
            best = capacity[:, slot]
            np.fmin(inner, outer, out=best)
            np.sqrt(best, out=best)
            best *= sum_gj
            best /= g[:, slot]
            best *= _TWO_OVER_ROOT3
            face[:, slot] = outer_wins
            p_in, sq_in = p_out, sq_out
        # NaN propagates through min: one reduction tells whether a capacity is missing.
        if not full or (n_parts and np.isnan(capacity.min())):
            missing = np.isnan(capacity)
            if not full:
                missing |= ~mask
            if missing.any():
                capacity[missing] = np.nan
                face[missing] = -1
    return capacity, face
