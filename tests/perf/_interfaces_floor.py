"""A floor for the interface check: its results from the formulas alone, in few numpy passes.

Used by ``bench_sleeves.py`` (not collected by pytest). :func:`formulas_floor` works out every
array `rate_interfaces` returns for the benchmark's kind of batch (every layer present, the
torque through the core, one friction coefficient and one factor of safety for all) from the
same formulas -- Lamé pressures by the same tridiagonal pass, the fit stresses at both faces of
every layer by distortion energy, slip and bond torques, the smallest capacity of each part --
block by block into reused buffers, with none of the checks: no input is screened, no flag
raised, no interface allowed to open. No implementation that returns these results with numpy
alone can spend much less; what `rate_interfaces` costs above it is its checks.

:func:`agrees` compares the floor with `rate_interfaces` on the parts whose interfaces all stay
closed, so the floor is known to compute the real thing.
"""

from __future__ import annotations

from types import SimpleNamespace

import numpy as np
from twistshare.engine.core import REFERENCE_TEMPERATURE

_TWO_OVER_ROOT3 = 2.0 / np.sqrt(3.0)


def _buffers(n: int, count: int) -> list[np.ndarray]:
    return [np.empty(n) for _ in range(count)]


def formulas_floor(stack, share: np.ndarray, sum_gj: np.ndarray, inputs: dict,
                   block: int = 1 << 16) -> SimpleNamespace:
    """The interface results of ``stack`` (all layers present, torque through the core,
    scalar ``friction`` and ``factor_of_safety``, assembled at the reference temperature) by
    the formulas alone."""
    do_all, di_all, g_all = stack.outer_diameter, stack.inner_diameter, stack.shear_modulus
    n_parts, n_layers = do_all.shape
    e_all, nu_all = inputs["youngs_modulus"], inputs["poisson_ratio"]
    sy_all, alpha_all = inputs["yield_strength"], inputs["expansion_coefficient"]
    delta0_all, fit_len_all = inputs["interference"], inputs["fit_length"]
    tau_all, bond_len_all = inputs["bond_allowable"], inputs["bond_length"]
    heat_all = inputs["operating_temperature"] - REFERENCE_TEMPERATURE
    grip_factor = float(inputs["friction"]) * np.pi / 2.0
    limit_factor = 1.0 / float(inputs["factor_of_safety"]) ** 2

    shape = (n_parts, n_layers)
    out = SimpleNamespace(
        **{name: np.empty(shape, order="F") for name in (
            "interface_share", "interference", "pressure", "slip_torque", "slip_capacity",
            "bond_capacity", "fit_stress_capacity")},
        fit_stress_face=np.empty(shape, np.int8, order="F"),
        interface_flags=np.empty(shape, np.int32, order="F"),
        layer_fit_flags=np.empty(shape, np.int32, order="F"),
        **{f"{kind}_limit": np.empty(n_parts) for kind in ("slip", "bond", "fit_stress")},
        **{f"{kind}_slot": np.empty(n_parts, np.int16) for kind in ("slip", "bond", "fit_stress")},
    )
    rows_max = min(block, n_parts)
    s_, do2_, di2_ = (_buffers(rows_max, n_layers) for _ in range(3))
    diag, lower, upper = (_buffers(rows_max, n_layers) for _ in range(3))
    heat, ki, ko, work, hoop, inner, outer, limit, passing = _buffers(rows_max, 9)
    zero = np.zeros(rows_max)
    wins = np.empty(rows_max, dtype=bool)

    with np.errstate(all="ignore"):
        for first in range(0, n_parts, block):
            rows = slice(first, first + block)
            m = min(block, n_parts - first)
            do, di, g, sh = do_all[rows], di_all[rows], g_all[rows], share[rows]
            cut = slice(0, m)
            h = heat[cut]
            np.copyto(h, heat_all[rows])
            np.nan_to_num(h, copy=False)
            o = SimpleNamespace(**{k: v[rows] for k, v in vars(out).items()})
            ish, delta, p = o.interface_share, o.interference, o.pressure
            # Interface shares, torque through the core: each passes every layer outside it.
            ish[:, 0] = np.nan
            ish[:, n_layers - 1] = sh[:, n_layers - 1]
            for k in range(n_layers - 2, 0, -1):
                np.add(ish[:, k + 1], sh[:, k], out=ish[:, k])
            # Shape factors.
            for k in range(n_layers):
                s, do2, di2 = s_[k][cut], do2_[k][cut], di2_[k][cut]
                np.multiply(do[:, k], do[:, k], out=do2)
                np.multiply(di[:, k], di[:, k], out=di2)
                np.add(do2, di2, out=s)
                np.subtract(do2, di2, out=work[cut])
                s /= work[cut]
            # Interference at temperature and the tridiagonal rows.
            delta[:, 0] = np.nan
            for k in range(1, n_layers):
                d = delta[:, k]
                np.subtract(alpha_all[rows, k - 1], alpha_all[rows, k], out=d)
                d *= h
                d *= di[:, k]
                np.copyto(work[cut], delta0_all[rows, k])
                np.nan_to_num(work[cut], copy=False)
                d += work[cut]
                np.divide(di[:, k], e_all[rows, k], out=ki[cut])
                np.divide(do[:, k - 1], e_all[rows, k - 1], out=ko[cut])
                dk, lk, uk = diag[k][cut], lower[k][cut], upper[k][cut]
                np.add(s_[k][cut], nu_all[rows, k], out=dk)
                dk *= ki[cut]
                np.subtract(s_[k - 1][cut], nu_all[rows, k - 1], out=work[cut])
                work[cut] *= ko[cut]
                dk += work[cut]
                np.subtract(s_[k - 1][cut], 1.0, out=lk)
                lk *= ko[cut]
                np.add(s_[k][cut], 1.0, out=uk)
                uk *= ki[cut]
            # Thomas algorithm, in place (as rate_interfaces' first pass).
            p[:, 0] = np.nan
            for k in range(1, n_layers):
                value = p[:, k]
                if k == 1:
                    np.copyto(value, delta[:, 1])
                else:
                    np.multiply(lower[k][cut], p[:, k - 1], out=value)
                    value += delta[:, k]
                    lower[k][cut] *= upper[k - 1][cut]
                    diag[k][cut] -= lower[k][cut]
                value /= diag[k][cut]
                upper[k][cut] /= diag[k][cut]
            for k in range(n_layers - 2, 0, -1):
                np.multiply(upper[k][cut], p[:, k + 1], out=work[cut])
                p[:, k] += work[cut]
            # Fit stresses at both faces of every layer, distortion energy with torsion.
            cap, face = o.fit_stress_capacity, o.fit_stress_face
            p_in = zero[cut]
            for k in range(n_layers):
                s, do2, di2 = s_[k][cut], do2_[k][cut], di2_[k][cut]
                p_out = p[:, k + 1] if k + 1 < n_layers else zero[cut]
                np.multiply(sy_all[rows, k], sy_all[rows, k], out=limit[cut])
                limit[cut] *= limit_factor
                for pressure_face, room, diameter2, inner_face in (
                        (p_in, inner, di2, True), (p_out, outer, do2, False)):
                    if inner_face:  # sigma_t(a) = p_in s - p_out (s + 1)
                        np.multiply(p_in, s, out=hoop[cut])
                        np.add(s, 1.0, out=work[cut])
                        work[cut] *= p_out
                    else:  # sigma_t(b) = p_in (s - 1) - p_out s
                        np.subtract(s, 1.0, out=hoop[cut])
                        hoop[cut] *= p_in
                        np.multiply(s, p_out, out=work[cut])
                    hoop[cut] -= work[cut]
                    np.add(hoop[cut], pressure_face, out=work[cut])
                    work[cut] *= hoop[cut]
                    np.multiply(pressure_face, pressure_face, out=hoop[cut])
                    work[cut] += hoop[cut]
                    np.subtract(limit[cut], work[cut], out=room[cut])
                    np.maximum(room[cut], 0.0, out=room[cut])
                    room[cut] /= diameter2
                best = cap[:, k]
                np.less(outer[cut], inner[cut], out=wins[cut])
                face[:, k] = wins[cut]
                np.fmin(inner[cut], outer[cut], out=best)
                np.sqrt(best, out=best)
                best *= sum_gj[rows]
                best /= g[:, k]
                best *= _TWO_OVER_ROOT3
                p_in = p_out
            # Slip and bond.
            grip, slip, bond = o.slip_torque, o.slip_capacity, o.bond_capacity
            for array in (grip, slip, bond):
                array[:, 0] = np.nan
            for k in range(1, n_layers):
                np.abs(ish[:, k], out=passing[cut])
                # NaN where no interference is given (not a fit): 0 * NaN is NaN, 0 * x is 0.
                np.multiply(delta0_all[rows, k], 0.0, out=work[cut])
                delta[:, k] += work[cut]
                t = grip[:, k]
                np.multiply(p[:, k], fit_len_all[rows, k], out=t)
                t += work[cut]
                t *= di2_[k][cut]
                t *= grip_factor
                np.divide(t, passing[cut], out=slip[:, k])
                b = bond[:, k]
                np.multiply(tau_all[rows, k], bond_len_all[rows, k], out=b)
                b *= di2_[k][cut]
                b *= np.pi / 2.0
                b /= passing[cut]
            o.interface_flags.fill(0)
            o.layer_fit_flags.fill(0)
            # The smallest capacity of each part and its slot.
            for kind, array, start in (("slip", slip, 1), ("bond", bond, 1),
                                       ("fit_stress", cap, 0)):
                smallest, slot = getattr(o, f"{kind}_limit"), getattr(o, f"{kind}_slot")
                smallest.fill(np.inf)
                slot.fill(-1)
                for k in range(start, n_layers):
                    np.less(array[:, k], smallest, out=wins[cut])
                    np.fmin(smallest, array[:, k], out=smallest)
                    slot += wins[cut] * (np.int16(k) - slot)
    return out


def agrees(floor: SimpleNamespace, rating, rtol: float = 1e-9) -> bool:
    """The floor's pressures and capacities against `rate_interfaces` on the parts whose
    interfaces all stay closed (the floor never opens one), within ``rtol``."""
    closed = np.all(np.nan_to_num(rating.pressure[:, 1:], nan=1.0) > 0.0, axis=1)
    if closed.sum() < 0.5 * closed.size:
        return False
    for name in ("pressure", "fit_stress_capacity", "slip_torque", "slip_capacity",
                 "interference", "interface_share"):
        mine, theirs = getattr(floor, name)[closed], getattr(rating, name)[closed]
        if not np.allclose(mine, theirs, rtol=rtol, atol=0.0, equal_nan=True):
            return False
    # A bond is rated where its allowable is given; the floor's NaN elsewhere is the same.
    return bool(np.allclose(floor.bond_capacity[closed], rating.bond_capacity[closed],
                            rtol=rtol, atol=0.0, equal_nan=True)
                and np.array_equal(floor.fit_stress_slot[closed], rating.fit_stress_slot[closed]))
