"""Benchmark: the plastic torque-twist curve and the interface checks of sleeved parts.

Run as a script (not collected by pytest)::

    python tests/perf/bench_sleeves.py [--curve-parts N] [--parts N] [--repeats N]

Prints the figures, then one JSON line with ``curve_100k_50pts_s`` (best time of the
torque-twist curve at 50 points, scaled to 10^5 three-layer parts; target <= 2 s) and
``interfaces_1m_ratio`` (rate() plus rate_interfaces() over rate() alone on the same 10^6
parts in the same run, best of the repeats; target <= 1.5). The parts are bench_engine's
random three-layer parts, with a shrink fit at the first interface, a bond at the second and,
on half the parts, a second fit there too, half of them at an operating temperature: every
part has a fit, so the work is never skipped for parts without one.

Two more figures, for information beside that ratio (same run, same parts):
``criteria_path_1m_ratio``, ``rate(stack, duty, inputs=...)`` over ``rate()`` alone, the path a
book takes (the criteria list rates the interfaces, and E and nu given switch on the torsional
buckling check too); ``io_floor_1m_ratio``, ``rate()`` followed by a pass that only reads the
interface inputs and writes arrays of the interface results' size, over ``rate()`` alone: what
any implementation that returns those results pays here for memory alone;
``formulas_floor_1m_ratio``, ``rate()`` followed by the same results worked out from the formulas
alone, with none of the checks (``_interfaces_floor.py``; checked to agree with
``rate_interfaces`` on the parts whose interfaces stay closed), over ``rate()`` alone: what a
numpy implementation pays for the arithmetic itself.
"""

from __future__ import annotations

import argparse
import json
import sys
import time

import numpy as np
from _interfaces_floor import agrees, formulas_floor
from bench_engine import random_parts
from twistshare.engine.core import rate, rate_interfaces, torque_twist_curve


def interface_inputs(n_parts: int, outer: np.ndarray, seed: int = 7) -> dict[str, np.ndarray]:
    """Fit and bond data for the parts (invented, plausible): about 1 um of interference per
    mm of diameter, dry steel friction, bonds of 10-25 MPa."""
    rng = np.random.default_rng(seed)
    nan = np.full((n_parts, 3), np.nan)
    interference = nan.copy()
    interference[:, 1] = outer[:, 0] * rng.uniform(0.4e-3, 1.2e-3, n_parts)
    second = rng.random(n_parts) < 0.5
    interference[:, 2] = np.where(second, outer[:, 1] * rng.uniform(0.2e-3, 0.8e-3, n_parts), np.nan)
    bond = nan.copy()
    bond[:, 2] = rng.uniform(10e6, 25e6, n_parts)
    return dict(
        youngs_modulus=rng.uniform(70e9, 210e9, (n_parts, 3)),
        poisson_ratio=rng.uniform(0.28, 0.34, (n_parts, 3)),
        yield_strength=rng.uniform(200e6, 700e6, (n_parts, 3)),
        expansion_coefficient=rng.uniform(10e-6, 24e-6, (n_parts, 3)),
        interference=interference,
        fit_length=rng.uniform(0.01, 0.06, (n_parts, 3)),
        friction=0.12,
        bond_allowable=bond,
        bond_length=rng.uniform(0.01, 0.06, (n_parts, 3)),
        operating_temperature=np.where(rng.random(n_parts) < 0.5, 353.15, np.nan),
        factor_of_safety=1.5,
    )


def _best(call, repeats: int) -> tuple[float, list[float]]:
    runs = []
    for _ in range(repeats):
        start = time.perf_counter()
        result = call()
        runs.append(time.perf_counter() - start)
        del result
    return min(runs), runs


def time_curve(n_parts: int, repeats: int) -> tuple[float, list[float]]:
    """Best and all times of the 50-point torque-twist curve of ``n_parts`` parts."""
    stack, _ = random_parts(n_parts)
    shear_yield = stack.allowable_shear * 2.0  # a yield above the allowable, as in practice
    layers = (stack.outer_diameter, stack.inner_diameter, stack.shear_modulus, shear_yield,
              stack.present)
    return _best(lambda: torque_twist_curve(*layers, n_points=50), repeats)


def io_floor(stack, inputs: dict, block: int = 1 << 16) -> list[np.ndarray]:
    """Read every (P, L) input of the interface check once and write arrays of the size of its
    results once, block by block, with no arithmetic beyond a sum: a floor for the check."""
    n_parts, n_layers = stack.outer_diameter.shape
    grids = [stack.outer_diameter, stack.inner_diameter, stack.shear_modulus, stack.present] + [
        v for v in inputs.values() if np.ndim(v) == 2]
    shape = (n_parts, n_layers)
    out = ([np.empty(shape, order="F") for _ in range(7)] + [np.empty(shape, np.int8, order="F")]
           + [np.empty(shape, np.int32, order="F") for _ in range(2)]
           + [np.empty(n_parts) for _ in range(3)] + [np.empty(n_parts, np.int16) for _ in range(3)])
    for first in range(0, n_parts, block):
        rows = slice(first, first + block)
        acc = np.zeros(min(block, n_parts - first))
        for grid in grids:
            for k in range(n_layers):
                acc += grid[rows, k]
        for array in out:
            if array.ndim == 2:
                for k in range(n_layers):
                    array[rows, k] = acc
            else:
                array[rows] = acc
    return out


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--curve-parts", type=int, default=100_000)
    parser.add_argument("--parts", type=int, default=1_000_000)
    parser.add_argument("--repeats", type=int, default=3)
    args = parser.parse_args(argv)

    curve_best, curve_runs = time_curve(args.curve_parts, args.repeats)
    curve_100k = curve_best * 1e5 / args.curve_parts

    stack, duty = random_parts(args.parts)
    inputs = interface_inputs(args.parts, stack.outer_diameter)
    rate(stack, duty)  # touch the memory once
    rate_best, rate_runs = _best(lambda: rate(stack, duty), args.repeats)
    rating = rate(stack, duty)
    share, sum_gj = rating.share, rating.sum_gj

    def both():
        rated = rate(stack, duty)
        return rate_interfaces(stack, share=rated.share, sum_stiffness=rated.sum_gj, **inputs)

    check = rate_interfaces(stack, share=share, sum_stiffness=sum_gj, **inputs)
    assert np.isfinite(check.slip_limit).all() and np.isfinite(check.bond_limit).all()
    if not agrees(formulas_floor(stack, share, sum_gj, inputs), check):
        raise SystemExit("the formulas floor does not agree with rate_interfaces: fix the floor")
    del rating, check
    alone_best, alone_runs = _best(
        lambda: rate_interfaces(stack, share=share, sum_stiffness=sum_gj, **inputs), args.repeats)
    both_best, both_runs = _best(both, args.repeats)
    ratio = both_best / rate_best

    def floor():
        rated = rate(stack, duty)
        return rated, io_floor(stack, inputs)

    with np.errstate(invalid="ignore"):  # the floor writes sums into integer arrays
        floor_best, floor_runs = _best(floor, args.repeats)
    criteria_best, criteria_runs = _best(lambda: rate(stack, duty, inputs=inputs), args.repeats)

    def formulas():
        rated = rate(stack, duty)
        return rated, formulas_floor(stack, rated.share, rated.sum_gj, inputs)

    formulas_best, formulas_runs = _best(formulas, args.repeats)

    print(f"torque-twist curve, {args.curve_parts:,} parts x 50 points: "
          f"{', '.join(f'{r:.3f}' for r in curve_runs)} s (best scaled to 10^5: {curve_100k:.3f} s)")
    print(f"rate(), {args.parts:,} parts:               {', '.join(f'{r:.3f}' for r in rate_runs)} s")
    print(f"rate_interfaces() alone:              {', '.join(f'{r:.3f}' for r in alone_runs)} s")
    print(f"rate() + rate_interfaces():           {', '.join(f'{r:.3f}' for r in both_runs)} s")
    print(f"(rate + interfaces) / rate:           {ratio:.2f} (target <= 1.5)")
    print(f"rate() + memory floor of interfaces:  {', '.join(f'{r:.3f}' for r in floor_runs)} s "
          f"(ratio {floor_best / rate_best:.2f})")
    print(f"rate() + the formulas alone (no check): {', '.join(f'{r:.3f}' for r in formulas_runs)} s "
          f"(ratio {formulas_best / rate_best:.2f})")
    print(f"rate(inputs=...), the book's path:    {', '.join(f'{r:.3f}' for r in criteria_runs)} s "
          f"(ratio {criteria_best / rate_best:.2f})")
    print(json.dumps({
        "curve_parts": args.curve_parts,
        "curve_100k_50pts_s": round(curve_100k, 4),
        "parts": args.parts,
        "rate_s": round(rate_best, 4),
        "interfaces_alone_s": round(alone_best, 4),
        "rate_plus_interfaces_s": round(both_best, 4),
        "interfaces_1m_ratio": round(ratio, 3),
        "io_floor_1m_ratio": round(floor_best / rate_best, 3),
        "formulas_floor_1m_ratio": round(formulas_best / rate_best, 3),
        "criteria_path_1m_ratio": round(criteria_best / rate_best, 3),
    }))
    return 0


if __name__ == "__main__":
    sys.exit(main())
