"""Benchmark: bending, combined stress and critical speed beside rate() on 10^6 three-layer parts.

Run as a script (not collected by pytest)::

    python tests/perf/bench_bending.py [--parts N] [--repeats N]

Times, on the same parts in the same run, ``rate()`` and the checks beyond torsion as the
criteria list would call them after it: ``section_bending``, ``combined_stress`` (given
``rate()``'s sum(GJ) and shear stresses) and ``whirl_check`` (given the bending result's
sum(EI)). Prints the figures, then one JSON line; ``combined_1m_ratio`` = (rate + these) /
rate, best runs, target <= 2. ``combined_1m_ratio_standalone`` is the same with
``combined_stress`` computing sum(GJ) and the shear stresses itself.
"""

from __future__ import annotations

import argparse
import gc
import json
import resource
import sys
import time

import numpy as np
from bench_engine import random_parts  # same folder: the parts bench_engine.py rates
from twistshare.engine.core import (
    AllowableRule,
    EndSupport,
    combined_stress,
    rate,
    section_bending,
    whirl_check,
)


def loads(n_parts: int, seed: int = 2025) -> dict[str, np.ndarray]:
    """Bending inputs for the benchmark parts: steel-to-bronze-like moduli and strengths."""
    rng = np.random.default_rng(seed)
    return dict(
        youngs_modulus=rng.uniform(70e9, 210e9, (n_parts, 3)),
        density=rng.uniform(2700.0, 8900.0, (n_parts, 3)),
        yield_strength=rng.uniform(200e6, 900e6, (n_parts, 3)),
        factor_of_safety=rng.uniform(1.5, 3.0, (n_parts, 3)),
        rule=rng.choice([int(AllowableRule.MAX_SHEAR), int(AllowableRule.DISTORTION_ENERGY)],
                        (n_parts, 3)).astype(np.int8),
        moment=rng.uniform(0.0, 5e3, n_parts),
        speed=rng.uniform(50.0, 400.0, n_parts),
        support=rng.choice([int(s) for s in EndSupport], n_parts).astype(np.int8),
    )


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--parts", type=int, default=1_000_000)
    parser.add_argument("--repeats", type=int, default=3)
    args = parser.parse_args(argv)

    stack, duty = random_parts(args.parts)
    extra = loads(args.parts)
    do, di = stack.outer_diameter, stack.inner_diameter
    scale = 1e6 / args.parts

    def beyond_torsion(torsion: dict[str, np.ndarray]) -> float:
        start = time.perf_counter()
        bending = section_bending(do, di, extra["youngs_modulus"], extra["moment"],
                                  present=stack.present)
        combined = combined_stress(
            bending, do, di, stack.shear_modulus, duty.torque, extra["yield_strength"],
            extra["factor_of_safety"], extra["rule"], present=stack.present,
            stress_concentration=stack.stress_concentration, **torsion,
        )
        whirl = whirl_check(do, di, extra["youngs_modulus"], extra["density"], duty.length,
                            extra["speed"], extra["support"], present=stack.present,
                            sum_bending_stiffness=bending.sum_ei)
        elapsed = time.perf_counter() - start
        assert bool(bending.valid.all() and combined.valid.all() and whirl.valid.all())
        del bending, combined, whirl
        return elapsed

    def timed_rate() -> tuple[float, dict[str, np.ndarray]]:
        start = time.perf_counter()
        rating = rate(stack, duty)
        elapsed = time.perf_counter() - start
        torsion = dict(sum_stiffness=rating.sum_gj, shear_outer=rating.stress_outer,
                       shear_inner=rating.stress_inner)
        return elapsed, torsion

    first_rate, torsion = timed_rate()
    first_extra = beyond_torsion(torsion)
    del torsion
    gc.collect()
    rate_runs, extra_runs, own_runs = [], [], []
    for _ in range(args.repeats):
        elapsed, torsion = timed_rate()
        rate_runs.append(elapsed)
        extra_runs.append(beyond_torsion(torsion))
        del torsion
        own_runs.append(beyond_torsion({}))
    best_rate, best_extra, best_own = min(rate_runs), min(extra_runs), min(own_runs)
    ratio = (best_rate + best_extra) / best_rate
    ratio_own = (best_rate + best_own) / best_rate
    peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0

    print(f"parts: {args.parts:,} of 3 layers")
    print(f"rate(), first call:            {first_rate:.3f} s")
    print(f"beyond torsion, first call:    {first_extra:.3f} s")
    print(f"rate(), runs:                  {', '.join(f'{r:.3f}' for r in rate_runs)} s")
    print(f"bending+combined+whirl, runs:  {', '.join(f'{r:.3f}' for r in extra_runs)} s")
    print(f"  same, standalone:            {', '.join(f'{r:.3f}' for r in own_runs)} s")
    print(f"(rate + these) / rate:         {ratio:.2f} (standalone: {ratio_own:.2f}; target <= 2)")
    print(f"peak resident memory:          {peak_mb:.0f} MB")
    print(json.dumps({
        "parts": args.parts,
        "rate_seconds_1m": round(best_rate * scale, 4),
        "beyond_torsion_seconds_1m": round(best_extra * scale, 4),
        "beyond_torsion_standalone_seconds_1m": round(best_own * scale, 4),
        "rate_runs_s": [round(r, 4) for r in rate_runs],
        "beyond_torsion_runs_s": [round(r, 4) for r in extra_runs],
        "combined_1m_ratio": round(ratio, 3),
        "combined_1m_ratio_standalone": round(ratio_own, 3),
        "first_call_ratio": round((first_rate + first_extra) / first_rate, 3),
        "peak_mb": round(peak_mb, 1),
    }))
    return 0


if __name__ == "__main__":
    sys.exit(main())
