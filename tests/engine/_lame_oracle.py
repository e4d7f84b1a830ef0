"""The contact oracle for stacks of Lamé cylinders, shared by the stack-fit and interface tests.

Written here, not the module's tridiagonal form: the radial displacement of a thick-walled
cylinder in plane stress under internal pressure p_i and external pressure p_o (Shigley's Mechanical
Engineering Design, §3-16, pressurized cylinders, from memory):

    u(r) = [(1 - nu) (p_i a^2 - p_o b^2) r / (b^2 - a^2) + (1 + nu) a^2 b^2 (p_i - p_o) / ((b^2 - a^2) r)] / E

(a solid cylinder: u(r) = -(1 - nu) p_o r / E). At each interface k the outer member's bore and the
inner member's surface close the radial interference delta_k / 2: gap_k = u_k(a_k) - u_{k-1}(b_{k-1})
- delta_k / 2 is 0 where the interface is closed (p_k >= 0) and >= 0 where it is open (p_k = 0), the
contact conditions of interfaces that carry compression only (a linear complementarity problem; its
compliance matrix is positive definite, so the solution is unique). The oracle builds the matrix from
unit pressures and tries every set of closed interfaces with numpy.linalg.solve (an independent
numerical method).
"""

from __future__ import annotations

import itertools

import numpy as np


def _u(r, a, b, e, nu, p_in, p_out):
    if a == 0.0:
        return -(1 - nu) * p_out * r / e
    w = b * b - a * a
    return ((1 - nu) * (p_in * a * a - p_out * b * b) * r / w + (1 + nu) * a * a * b * b * (p_in - p_out) / (w * r)) / e

def _gaps(do, di, e, nu, delta, p):
    """gap_k for k = 1..L-1 under interface pressures p (p[k-1] at interface k)."""
    n = len(do)
    full = [0.0, *p, 0.0]  # full[k] is the pressure on layer k's bore, full[k+1] on its surface

    def u(k, r):
        return _u(r, di[k] / 2, do[k] / 2, e[k], nu[k], full[k] if k > 0 else 0.0, full[k + 1] if k + 1 < n else 0.0)
    return np.array([u(k, di[k] / 2) - u(k - 1, do[k - 1] / 2) - delta[k] / 2 for k in range(1, n)])

def oracle(do, di, e, nu, delta):
    """(pressures, opened) at interfaces 1..L-1 by enumeration of the closed sets."""
    matrix, rhs = closed_system(do, di, e, nu, delta)
    base, m = -rhs, len(rhs)
    found = []
    for closed in itertools.product((True, False), repeat=m):
        idx = [k for k in range(m) if closed[k]]
        p = np.zeros(m)
        if idx:
            p[idx] = np.linalg.solve(matrix[np.ix_(idx, idx)], -base[idx])
        gap = base + matrix @ p
        scale = max(abs(base).max(), 1e-300)
        if all(p[k] >= -1e-6 for k in idx) and all(gap[k] >= -1e-9 * scale for k in range(m) if not closed[k]):
            found.append((p, np.array([not c for c in closed])))
    assert len(found) == 1, found  # uniqueness of the contact solution (a P-matrix)
    return found[0]

def closed_system(do, di, e, nu, delta):
    """The compliance matrix (gaps per unit pressure, from the displacements with no interference, so
    nothing cancels) and the right-hand side delta / 2 of the all-closed system."""
    m = len(do) - 1
    zero = np.zeros(len(do))
    matrix = np.column_stack([_gaps(do, di, e, nu, zero, np.eye(m)[j]) for j in range(m)])
    return matrix, np.nan_to_num(np.asarray(delta, float))[1:] / 2
