"""Benchmark: rate 1,000,000 three-layer parts with one vectorised call.

Run as a script (not collected by pytest)::

    python tests/perf/bench_engine.py [--parts N] [--loop-parts N] [--repeats N]

Prints the figures, then one JSON line with ``seconds_1m`` (best of the repeats, scaled to
10^6 parts), ``seconds_1m_first_run`` (the first call, which also pays for touching fresh
memory), ``speedup_vs_loop`` (per-part time of the one-part call in a Python loop over the
per-part time of the batch call) and ``peak_mb`` (the process's peak resident memory).
Targets: <= 1 s for 10^6 parts, >= 100x speedup, <= 1500 MB peak.
"""

from __future__ import annotations

import argparse
import gc
import json
import resource
import sys
import time
import tracemalloc

import numpy as np
from twistshare.engine.core import Duty, LayerStack, rate


def random_parts(n_parts: int, seed: int = 2024) -> tuple[LayerStack, Duty]:
    """Valid, touching three-layer parts: a solid or bored core and two tubes."""
    rng = np.random.default_rng(seed)
    core = rng.uniform(0.015, 0.120, n_parts)
    bore = np.where(rng.random(n_parts) < 0.5, 0.0, core * rng.uniform(0.2, 0.6, n_parts))
    wall_1 = rng.uniform(0.002, 0.015, n_parts)
    wall_2 = rng.uniform(0.002, 0.015, n_parts)
    outer = np.empty((n_parts, 3))
    outer[:, 0] = core
    outer[:, 1] = core + 2 * wall_1
    outer[:, 2] = outer[:, 1] + 2 * wall_2
    inner = np.empty((n_parts, 3))
    inner[:, 0] = bore
    inner[:, 1:] = outer[:, :2]
    stack = LayerStack.from_arrays(
        outer_diameter=outer,
        inner_diameter=inner,
        shear_modulus=rng.uniform(25e9, 82e9, (n_parts, 3)),
        allowable_shear=rng.uniform(30e6, 250e6, (n_parts, 3)),
        stress_concentration=rng.uniform(1.0, 2.5, (n_parts, 3)),
        present=np.ones((n_parts, 3), dtype=bool),
    )
    duty = Duty.from_arrays(
        torque=rng.uniform(10.0, 20e3, n_parts),
        length=rng.uniform(0.2, 4.0, n_parts),
        twist_limit_angle=np.where(rng.random(n_parts) < 0.5, np.radians(1.0), np.nan),
        twist_limit_per_length=np.where(rng.random(n_parts) < 0.5, np.radians(0.25), np.nan),
    )
    return stack, duty


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--parts", type=int, default=1_000_000)
    parser.add_argument("--loop-parts", type=int, default=10_000)
    parser.add_argument("--repeats", type=int, default=5)
    args = parser.parse_args(argv)

    stack, duty = random_parts(args.parts)
    scale = 1e6 / args.parts

    # First call: what a fresh process pays, fresh memory included.
    start = time.perf_counter()
    rating = rate(stack, duty)
    first = time.perf_counter() - start
    assert bool(rating.valid.all()), "benchmark parts must all be valid"
    del rating
    gc.collect()

    runs = []
    for _ in range(args.repeats):
        start = time.perf_counter()
        rating = rate(stack, duty)
        runs.append(time.perf_counter() - start)
        del rating  # free before the next call, as a caller rating book after book would
    best = min(runs)

    # The same parts one at a time through the same function, one row per call.
    n_loop = min(args.loop_parts, args.parts)
    stacks = [stack.take(i) for i in range(n_loop)]
    duties = [duty.take(i) for i in range(n_loop)]
    start = time.perf_counter()
    for one_stack, one_duty in zip(stacks, duties):
        rate(one_stack, one_duty)
    loop = time.perf_counter() - start
    per_part_loop = loop / n_loop
    per_part_batch = best / args.parts
    speedup = per_part_loop / per_part_batch
    speedup_first = per_part_loop / (first / args.parts)

    # Loop and batch must agree, or the speedup means nothing.
    batch = rate(stack.take(slice(0, n_loop)), duty.take(slice(0, n_loop)))
    alone = rate(stacks[-1], duties[-1])
    assert np.allclose(alone.governing_capacity, batch.governing_capacity[-1:], rtol=1e-12)
    del batch

    peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0  # kB on Linux

    tracemalloc.start()
    rating = rate(stack, duty)
    _, traced_peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    del rating

    print(f"parts: {args.parts:,} of 3 layers")
    print(f"rate(), first call:        {first:.3f} s  ({first * scale:.3f} s per 10^6 parts)")
    print(f"rate(), runs:              {', '.join(f'{r:.3f}' for r in runs)} s")
    print(
        f"rate(), best of {args.repeats}:         {best:.3f} s  "
        f"({best * scale:.3f} s per 10^6 parts)"
    )
    print(f"one-part loop, {n_loop:,} parts: {loop:.3f} s  ({per_part_loop * 1e6:.1f} us per part)")
    print(f"batch per part:            {per_part_batch * 1e9:.1f} ns")
    print(f"speedup vs loop:           {speedup:.0f}x (first call: {speedup_first:.0f}x)")
    print(f"peak resident memory:      {peak_mb:.0f} MB (process, inputs included)")
    print(f"traced peak inside rate(): {traced_peak / 2**20:.0f} MB (tracemalloc)")
    print(
        json.dumps(
            {
                "parts": args.parts,
                "seconds_1m": round(best * scale, 4),
                "seconds_1m_first_run": round(first * scale, 4),
                "runs_s": [round(r, 4) for r in runs],
                "loop_parts": n_loop,
                "loop_us_per_part": round(per_part_loop * 1e6, 2),
                "speedup_vs_loop": round(speedup, 1),
                "speedup_vs_loop_first_run": round(speedup_first, 1),
                "peak_mb": round(peak_mb, 1),
                "rate_traced_peak_mb": round(traced_peak / 2**20, 1),
            }
        )
    )
    return 0


if __name__ == "__main__":
    sys.exit(main())
