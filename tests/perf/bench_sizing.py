"""Benchmark: solve one diameter of 100 000 three-layer parts with solve_dimension.

Run as a script (not collected by pytest)::

    python tests/perf/bench_sizing.py [--parts N]

Solves each part's outermost outer diameter (default range, 0.001 mm) for a reserve factor
of 1.5, then rounds the answers up to a 0.5 mm stock list and restores the first cores with
three candidate sleeve materials. Prints the figures, then one JSON line with
``size_100k_s`` (the solve, scaled to 10^5 parts). Target: <= 1 s.
"""

from __future__ import annotations

import argparse
import json
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from bench_engine import random_parts  # noqa: E402  (the helper sits beside this script)
from twistshare.engine.core import (  # noqa: E402
    SizingStatus,
    rate,
    resized,
    restore_sleeve,
    round_up_to_stock,
    solve_dimension,
)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--parts", type=int, default=100_000)
    args = parser.parse_args(argv)
    stack, duty = random_parts(args.parts)
    scale = 1e5 / args.parts

    start = time.perf_counter()
    rate(stack, duty)
    one_rate = time.perf_counter() - start

    start = time.perf_counter()
    result = solve_dimension(stack, duty, target_reserve=1.5)
    solve = time.perf_counter() - start
    calls = 2 + int(result.iterations.max())

    counts = {SizingStatus(code).name: int(n) for code, n in
              zip(*np.unique(result.status, return_counts=True))}
    solved = result.status == SizingStatus.SOLVED
    check = rate(resized(stack, result.size), duty)
    factor = check.governing_capacity / np.abs(duty.torque)
    assert bool((factor[solved] >= 1.5).all()), "a solved size re-rated below the target"

    stock = np.round(np.arange(10.0, 1000.0, 0.5), 1) / 1000
    start = time.perf_counter()
    rounded = round_up_to_stock(stack, duty, result.size, stock, target_reserve=1.5)
    stock_s = time.perf_counter() - start

    cores = stack.outer_diameter[:, 0]
    start = time.perf_counter()
    restore_sleeve(cores, stack.inner_diameter[:, 0], stack.shear_modulus[:, 0],
                   stack.allowable_shear[:, 0], cores - 0.003,
                   [41.4e9, 26e9, 73e9], [45e6, 60e6, 140e6])
    restore_s = time.perf_counter() - start

    print(f"parts: {args.parts:,} of 3 layers, outermost outer diameter, tol 0.001 mm")
    print(f"one rate() call:           {one_rate:.3f} s")
    print(f"solve_dimension:           {solve:.3f} s  ({solve * scale:.3f} s per 10^5 parts)")
    print(f"rate() calls in the solve: {calls}  (solve / one rate: {solve / one_rate:.1f}x)")
    print(f"statuses:                  {counts}")
    print(f"round_up_to_stock:         {stock_s:.3f} s  "
          f"({int((rounded.status == 0).sum()):,} found)")
    print(f"restore_sleeve, 3 sleeves: {restore_s:.3f} s  ({3 * args.parts:,} cases)")
    print(json.dumps({
        "parts": args.parts,
        "size_100k_s": round(solve * scale, 4),
        "rate_once_s": round(one_rate, 4),
        "rate_calls": calls,
        "statuses": counts,
        "stock_s": round(stock_s, 4),
        "restore_3_materials_s": round(restore_s, 4),
    }))
    return 0


if __name__ == "__main__":
    sys.exit(main())
