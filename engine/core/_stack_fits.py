"""Fits in a stack of layers: the contact pressure of every interface at once.

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

from ._arrays import as_bool, as_float, nan_to_zero
from ._layer_fit_stress import shape_factors

__all__ = ["stack_fit_pressures"]


def _face_compliances(
    inner_diameter: NDArray[np.float64],
    outer_diameter: NDArray[np.float64],
    youngs: NDArray[np.float64],
    poisson: NDArray[np.float64],
    face: str,
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Lamé radial displacement of a layer's face under the pressures on its two faces:
    ``face="bore"`` gives ``(ca_in, ca_out)`` of ``u(a) = ca_in p_in - ca_out p_out``,
    ``face="surface"`` gives ``(cb_in, cb_out)`` of ``u(b) = cb_in p_in - cb_out p_out``."""
    a, b = inner_diameter / 2.0, outer_diameter / 2.0
    a2, b2 = a * a, b * b
    wall = b2 - a2
    if face == "bore":
        return (a / youngs * ((1.0 + poisson) * b2 + (1.0 - poisson) * a2) / wall,
                a / youngs * 2.0 * b2 / wall)
    return (b / youngs * 2.0 * a2 / wall,
            b / youngs * ((1.0 - poisson) * b2 + (1.0 + poisson) * a2) / wall)


def _solve_tridiagonal(
    sub: NDArray[np.float64], diag: NDArray[np.float64], sup: NDArray[np.float64],
    rhs: NDArray[np.float64],
) -> NDArray[np.float64]:
    """Thomas algorithm along the first axis (the unknowns), vectorised over the second (the
    parts): each unknown's row is contiguous, so every step runs over all parts at once."""
    m = diag.shape[0]
    c = np.empty_like(diag)
    d = np.empty_like(diag)
    np.divide(sup[0], diag[0], out=c[0])
    np.divide(rhs[0], diag[0], out=d[0])
    for k in range(1, m):
        pivot = diag[k] - sub[k] * c[k - 1]
        np.divide(sup[k], pivot, out=c[k])
        np.divide(rhs[k] - sub[k] * d[k - 1], pivot, out=d[k])
    x = np.empty_like(d)
    x[-1] = d[-1]
    for k in range(m - 2, -1, -1):
        np.subtract(d[k], c[k] * x[k + 1], out=x[k])
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
    e, nu = (np.broadcast_to(as_float(v), do.shape) for v in (youngs_modulus, poisson_ratio))
    delta = np.broadcast_to(as_float(interference), do.shape)
    pressure, opened, _ = _solve(do, di, mask, e, nu, delta)
    return pressure, opened


def _usable_parts(
    do: NDArray[np.float64], di: NDArray[np.float64], e: NDArray[np.float64],
    nu: NDArray[np.float64], mask: NDArray[np.bool_], full: bool,
) -> NDArray[np.bool_]:
    """Parts whose present layers all have ``0 < E < inf``, ``-1 < nu <= 0.5`` and
    ``0 <= D_i < D_o``. NaN fails every comparison, so a missing value is caught too."""
    n_parts, n_layers = do.shape
    # The usual batch is all good: reductions (NaN propagates through min and max) settle
    # that without writing a mask.
    if full and n_parts and (e.min() > 0.0 and e.max() < np.inf and nu.min() > -1.0
                             and nu.max() <= 0.5 and di.min() >= 0.0
                             and bool(np.less(di, do).all())):
        return np.ones(n_parts, dtype=bool)
    # Whole blocks at once: the (P, L) rows are contiguous where a column is not.
    good = np.greater(e, 0.0)
    for value, bound, compare in ((nu, -1.0, np.greater), (nu, 0.5, np.less_equal),
                                  (e, np.inf, np.less), (di, 0.0, np.greater_equal),
                                  (di, do, np.less)):
        good &= compare(value, bound)
    if not full:
        good |= ~mask
    usable = good[:, 0].copy()
    for slot in range(1, n_layers):
        usable &= good[:, slot]
    return usable


def _solve(
    do: NDArray[np.float64], di: NDArray[np.float64], mask: NDArray[np.bool_],
    e: NDArray[np.float64], nu: NDArray[np.float64], delta: NDArray[np.float64],
    factors: list[tuple[NDArray[np.float64], ...]] | None = None,
    pressure: NDArray[np.float64] | None = None,
) -> tuple[NDArray[np.float64], NDArray[np.bool_], NDArray[np.bool_]]:
    """Interface pressures of every part, column by column, and which parts are usable.

    First pass: every interface closed, a tridiagonal solve in diametral terms (row ``k``:
    ``(c_a,in,k + c_b,out,k-1) p_k - c_b,in,k-1 p_{k-1} - c_a,out,k p_{k+1} = delta_k`` with
    ``c_a,in = D_i (s + nu) / E``, ``c_a,out = D_i (s + 1) / E``, ``c_b,in = D_o (s - 1) / E``,
    ``c_b,out = D_o (s - nu) / E``, the diametral growth of a layer's faces per unit
    pressure). Rows where an interface would pull go to :func:`_solve_with_contact`.
    ``factors`` are :func:`shape_factors` of ``do, di`` when the caller has them; ``pressure``
    an (P, L) array to write the pressures into (every element is written).
    """
    n_parts, n_layers = do.shape
    if pressure is None:
        pressure = np.full((n_parts, n_layers), np.nan, order="F")
    else:
        pressure[:, 0] = np.nan  # the other columns are all written below
    opened = np.zeros((n_parts, n_layers), dtype=bool, order="F")
    if n_layers < 2:
        return pressure, opened, np.ones(n_parts, dtype=bool)
    factors = shape_factors(do, di) if factors is None else factors
    full = bool(mask.all())
    with np.errstate(all="ignore"):
        usable = _usable_parts(do, di, e, nu, mask, full)
        diag, lower, upper, rhs = [], [], [], []
        ki, ko = np.empty(n_parts), np.empty(n_parts)
        for k in range(1, n_layers):
            s_in, s_out = factors[k - 1][0], factors[k][0]
            np.divide(di[:, k], e[:, k], out=ki)
            np.divide(do[:, k - 1], e[:, k - 1], out=ko)
            d = np.add(s_out, nu[:, k])
            d *= ki
            below = np.subtract(s_in, nu[:, k - 1])
            below *= ko
            d += below
            diag.append(d)
            np.subtract(s_in, 1.0, out=below)
            below *= ko
            lower.append(below)
            up = np.add(s_out, 1.0)
            up *= ki
            upper.append(up)
            column = delta[:, k]
            # A copy where rows will be blanked below or NaN cleared, else the caller's column.
            own = not full or bool(np.isnan(column).any())
            rhs.append(nan_to_zero(column) if own else column)
        if not full:
            for k in range(1, n_layers):
                gone = ~(mask[:, k] & mask[:, k - 1])
                np.copyto(diag[k - 1], 1.0, where=gone)
                np.copyto(rhs[k - 1], 0.0, where=gone)
                np.copyto(lower[k - 1], 0.0, where=gone)
                np.copyto(upper[k - 1], 0.0, where=gone)
                if k >= 2:
                    np.copyto(upper[k - 2], 0.0, where=gone)
        # Thomas algorithm over the few interfaces, vectorised over the parts, in place:
        # upper[r] becomes the elimination factor, the pressure columns hold the values.
        for row in range(n_layers - 1):
            value = pressure[:, row + 1]
            if row == 0:
                np.copyto(value, rhs[0])
            else:
                np.multiply(lower[row], pressure[:, row], out=value)
                value += rhs[row]
                lower[row] *= upper[row - 1]
                diag[row] -= lower[row]
            value /= diag[row]
            upper[row] /= diag[row]
        for row in range(n_layers - 3, -1, -1):
            upper[row] *= pressure[:, row + 2]
            pressure[:, row + 1] += upper[row]
        pulling = np.zeros(n_parts, dtype=bool)
        for k in range(1, n_layers):
            pulling |= pressure[:, k] < 0
        if not full:
            pressure[:, 1:][~(mask[:, 1:] & mask[:, :-1])] = np.nan
    rows = np.flatnonzero(pulling & usable)
    if rows.size:
        fixed, fixed_open = _solve_with_contact_by_layer(
            *(_layer_rows(value, rows) for value in (do, di, mask, e, nu, delta)))
        for k in range(n_layers):
            pressure[:, k][rows] = fixed[k]
            opened[:, k][rows] = fixed_open[k]
    if not usable.all():
        pressure[~usable] = np.nan
    return pressure, opened, usable


def _layer_rows(value: NDArray, rows: NDArray[np.intp]) -> NDArray:
    """``value[rows].T`` as a contiguous (L, n) array, gathered column by column."""
    out = np.empty((value.shape[1], rows.size), dtype=value.dtype)
    for k in range(value.shape[1]):
        out[k] = value[:, k][rows]
    return out


def _solve_with_contact(
    do: NDArray[np.float64], di: NDArray[np.float64], mask: NDArray[np.bool_],
    e: NDArray[np.float64], nu: NDArray[np.float64], delta: NDArray[np.float64],
) -> tuple[NDArray[np.float64], NDArray[np.bool_]]:
    """The whole solution, opening and re-closing interfaces until none pulls or overlaps.

    Works on (n, L) arrays; run on the rows the first pass cannot settle. See
    :func:`_solve_with_contact_by_layer`, which does the work on (L, n) arrays.
    """
    pressure, opened = _solve_with_contact_by_layer(
        *(np.ascontiguousarray(np.asarray(v).T) for v in (do, di, mask, e, nu, delta)))
    return pressure.T, opened.T


def _solve_with_contact_by_layer(
    do: NDArray[np.float64], di: NDArray[np.float64], mask: NDArray[np.bool_],
    e: NDArray[np.float64], nu: NDArray[np.float64], delta: NDArray[np.float64],
) -> tuple[NDArray[np.float64], NDArray[np.bool_]]:
    """:func:`_solve_with_contact` on (L, n) arrays, layer slots first: a slot's values of
    all parts are contiguous, so each step runs over the parts in one plain loop (an (n, L)
    array would loop L values at a time). Returns (L, n) pressures and opened flags.
    """
    n_layers = do.shape[0]
    pressure = np.full(do.shape, np.nan)
    opened = np.zeros(do.shape, dtype=bool)
    if n_layers < 2:
        return pressure, opened
    with np.errstate(all="ignore"):
        usable = (di >= 0) & (di < do) & np.isfinite(do) & (e > 0) & np.isfinite(e) & (
            nu > -1.0) & (nu <= 0.5)
        part_ok = np.all(usable | ~mask, axis=0)
        # Each compliance only for the slots it is used at (outer members' bores, inner
        # members' surfaces): the same values, element by element.
        outer_member = (di[1:], do[1:], e[1:], nu[1:])
        inner_member = (di[:-1], do[:-1], e[:-1], nu[:-1])
        ca_in, ca_out = _face_compliances(*outer_member, "bore")
        cb_in, cb_out = _face_compliances(*inner_member, "surface")
        exists = mask[1:] & mask[:-1] & part_ok[np.newaxis, :]
        # Unknowns p_1 .. p_{L-1}; row k-1 is the interface at slot k. Scaling each row by
        # its radius makes the matrix symmetric (the compliance matrix of the stack).
        radius = di[1:] / 2.0
        diag = radius * (ca_in + cb_out)
        sub = -radius * cb_in
        sup = np.zeros_like(diag)
        sup[:-1] = -radius[:-1] * ca_out[:-1]
        rhs = radius * nan_to_zero(delta[1:]) / 2.0
        # Couplings to a missing interface, and rows of missing ones, drop out.
        sub[0] = 0.0
        sub[1:] = np.where(exists[1:] & exists[:-1], sub[1:], 0.0)
        sup[:-1] = np.where(exists[:-1] & exists[1:], sup[:-1], 0.0)
        diag = np.where(exists, diag, 1.0)
        rhs = np.where(exists, rhs, 0.0)
        active = exists.copy()
        p = np.zeros_like(diag)
        a_sub = np.zeros_like(sub)
        a_sup = np.zeros_like(sup)
        for _ in range(2 * n_layers):
            a_sub[1:] = np.where(active[1:] & active[:-1], sub[1:], 0.0)
            a_sup[:-1] = np.where(active[:-1] & active[1:], sup[:-1], 0.0)
            p = _solve_tridiagonal(
                a_sub, np.where(active, diag, 1.0), a_sup, np.where(active, rhs, 0.0)
            )
            # Interference an open interface would not take up under these pressures: it
            # would overlap, so it closes again.
            untaken = rhs - diag * p
            untaken[1:] -= sub[1:] * p[:-1]
            untaken[:-1] -= sup[:-1] * p[1:]
            reclose = exists & ~active & (untaken > 0)
            release = active & (p < 0)
            if not (reclose.any() or release.any()):
                break
            active = (active & ~release) | reclose
        p = np.where(active, p, 0.0)
        pressure[1:] = np.where(exists, p, np.nan)
        # Open means a gap: an interface left with no interference to take up just touches,
        # at zero pressure either way (nothing would pull it apart).
        opened[1:] = exists & ~active & (untaken < 0)
    return pressure, opened
