"""Benchmark of the cell functions (a script, not collected by pytest).

Figures, one run:

* ``max_scalar_call_us``: the slowest median over every cell function that returns one value
  (``one value`` in the registry) and whose arguments are single cells, each called with ``value unit`` strings, e.g.
  ``TWS_ALLOWABLE("distortion energy", "310 MPa", None, 2, None, "ksi")`` (target <= 50 us);
* ``block_vs_floor``: one ``TWS_LAYER_CAPACITY`` call over a 10,000-row layer block (Part,
  Material, Outer diameter [mm], Inner diameter [mm], Allowable [MPa], Kt; one row per layer,
  about 4,000 parts of 1 to 4 layers; demo-style invented data) over the floor measured in the
  same run: a plain Python pass converting the same block's cells to floats (target <= 2.5);
* ``block_10k_ms``, ``floor_10k_ms``: those two times.

Every call is timed in the steady state a recalculating sheet sees: the same arguments again
(unit texts are read once per distinct text, and the laminate functions solve each distinct
laminate once). ``laminate_new_inputs_us`` is the laminate call with inputs never seen before.

Also printed, for information: other scalar calls, a one-part layer block call, and the
10,000-row block with every cell a ``value unit`` string. The last line is one JSON object.

Run: ``python tests/perf/bench_cells.py`` (after installing the project)
"""

from __future__ import annotations

import json
import random
import statistics
import time
from collections.abc import Callable
from typing import Any

from twistshare.engine.cells import (
    TWS_ALLOWABLE,
    TWS_BOND_STRESS,
    TWS_FIT_PRESSURE,
    TWS_GOVERNING_LIMIT,
    TWS_LAMINATE_E,
    TWS_LAMINATE_G,
    TWS_LAYER_CAPACITY,
    TWS_MARGIN,
    TWS_PLASTIC_TORQUE,
    TWS_SLIP_TORQUE,
    TWS_TORQUE_FROM_POWER,
    registry,
)

# Returns one value but takes a layer block: read like a table, so not held to the 50 us bar.
BLOCK_ARGUMENT = {"TWS_PLASTIC_TORQUE"}
MATERIALS = ("AISI 1045 hot rolled", "Stainless 316 annealed", "Aluminium bronze C95400 as cast")


def layer_block(rows: int, as_text: bool = False, seed: int = 14) -> list[list[Any]]:
    """A Layers-sheet style block of `rows` layer rows, innermost layer of each part first."""
    rng = random.Random(seed)
    block: list[list[Any]] = [["Part", "Material", "Outer diameter [mm]",
                               "Inner diameter [mm]", "Allowable [MPa]", "Kt"]]
    part = 0
    while len(block) <= rows:
        part += 1
        outer = 0.0
        for slot in range(rng.randint(1, 4)):
            if len(block) > rows:
                break
            inner = outer
            outer = inner + (rng.choice((30.0, 40.0, 52.0)) if slot == 0 else rng.choice((3.0, 5.0)))
            allowable = 60.0 + 10 * slot
            kt = rng.choice((1.0, 1.0, 1.3))
            if as_text:
                block.append([f"MPD-S-{part:04d}", MATERIALS[slot % 3], f"{outer:g} mm",
                              f"{inner:g} mm", f"{allowable:g} MPa", kt])
            else:
                block.append([f"MPD-S-{part:04d}", MATERIALS[slot % 3], outer, inner,
                              allowable, kt])
    return block


def to_floats(block: list[list[Any]]) -> list[list[Any]]:
    """The floor: one plain Python pass turning every numeric cell of the block into a float."""
    return [[float(cell) if isinstance(cell, (int, float)) else cell for cell in row] for row in block]


def median_time(call: Callable[[], Any], repeats: int) -> tuple[float, Any]:
    times = []
    result = None
    for _ in range(repeats):
        start = time.perf_counter()
        result = call()
        times.append(time.perf_counter() - start)
    return statistics.median(times), result


def main() -> None:
    calls = {
        "TWS_TORQUE_FROM_POWER": lambda: TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm", 1.25, "lbf·in"),
        "TWS_ALLOWABLE": lambda: TWS_ALLOWABLE("distortion energy", "310 MPa", None, 2, None, "ksi"),
        "TWS_FIT_PRESSURE": lambda: TWS_FIT_PRESSURE("0.04 mm", "50 mm", "80 mm", "110 GPa", 0.34,
                                                     "20 mm", "207 GPa", 0.30),
        "TWS_SLIP_TORQUE": lambda: TWS_SLIP_TORQUE("28.75 MPa", 0.12, "40 mm", "50 mm"),
        "TWS_BOND_STRESS": lambda: TWS_BOND_STRESS("400 N·m", "40 mm", "30 mm"),
        "TWS_PLASTIC_TORQUE": lambda: TWS_PLASTIC_TORQUE(
            [["Material", "Outer diameter [mm]", "Inner diameter [mm]"], [MATERIALS[0], 40, None],
             [MATERIALS[1], 50, 40]]),
        "TWS_LAMINATE_G": lambda: TWS_LAMINATE_G("135 GPa", "10 GPa", "5 GPa", 0.3, "0.125 mm", "[±45]s"),
        "TWS_LAMINATE_E": lambda: TWS_LAMINATE_E("135 GPa", "10 GPa", "5 GPa", 0.3, "0.125 mm", "[±45]s"),
    }
    scalar_functions = {spec.name for spec in registry() if spec.shape == "one value"}
    assert scalar_functions == set(calls), f"add a scalar call for {scalar_functions ^ set(calls)}"
    for call in calls.values():
        call()  # first call builds the unit registry; steady state is what a sheet sees
    scalar: dict[str, float] = {}
    for name, call in calls.items():
        seconds, result = median_time(call, 2000)
        assert isinstance(result, float), result
        scalar[name] = seconds * 1e6
        bar = "(a layer block: for information)" if name in BLOCK_ARGUMENT else "(target <= 50 us)"
        print(f"{name:<28} median {scalar[name]:8.1f} us   {bar}")

    # The laminate functions solve each distinct laminate once (a sheet repeats them); this is
    # the cost of a laminate not seen before, every call a new ply thickness.
    thicknesses = iter(f"{0.1 + i * 1e-6:.6f} mm" for i in range(10_000))
    seconds, result = median_time(
        lambda: TWS_LAMINATE_G("135 GPa", "10 GPa", "5 GPa", 0.3, next(thicknesses), "[±45]s"), 2000)
    assert isinstance(result, float), result
    new_laminate_us = seconds * 1e6
    print(f"{'TWS_LAMINATE_G, new laminate':<28} median {new_laminate_us:8.1f} us   (for information)")

    one_part = [["Material", "Outer diameter [mm]", "Inner diameter [mm]", "Allowable [MPa]", "Kt"],
                [MATERIALS[0], 40, 0, 100, None], [MATERIALS[1], 50, 40, 80, 1.2]]
    seconds, result = median_time(lambda: TWS_MARGIN(one_part, "1200 N·m", "850 mm", "0.5°"), 500)
    assert isinstance(result, float), result
    print(f"{'TWS_MARGIN, one 2-layer part':<28} median {seconds * 1e6:8.1f} us   (for information)")

    block = layer_block(10_000)
    floor_seconds, _ = median_time(lambda: to_floats(block), 25)
    seconds, result = median_time(lambda: TWS_LAYER_CAPACITY(block), 25)
    assert len(result) == 10_001 and all(not isinstance(r[0], str) for r in result[1:]), result[:3]
    block_ms = seconds * 1e3
    ratio = seconds / floor_seconds
    print(f"{'plain float pass 10k rows':<28} median {floor_seconds * 1e3:8.2f} ms   (the floor)")
    print(f"{'TWS_LAYER_CAPACITY 10k rows':<28} median {block_ms:8.2f} ms   {ratio:.2f}x the floor "
          "(target <= 2.5)")
    seconds, _ = median_time(lambda: TWS_GOVERNING_LIMIT(block), 25)
    print(f"{'TWS_GOVERNING_LIMIT 10k rows':<28} median {seconds * 1e3:8.2f} ms   (for information)")
    text_block = layer_block(10_000, as_text=True)
    seconds, result = median_time(lambda: TWS_LAYER_CAPACITY(text_block), 10)
    assert all(not isinstance(r[0], str) for r in result[1:]), result[:3]
    print(f"{'same, value-unit strings':<28} median {seconds * 1e3:8.2f} ms   (for information)")

    slowest = max((n for n in scalar if n not in BLOCK_ARGUMENT), key=scalar.__getitem__)
    max_scalar = scalar[slowest]
    print(f"slowest single-cell function: {slowest}")
    print(f"ratios to target: scalar {max_scalar / 50:.2f}, block {ratio / 2.5:.2f} (<= 1 meets)")
    print(json.dumps({"max_scalar_call_us": round(max_scalar, 2), "slowest_scalar": slowest,
                      "scalar_us": {n: round(v, 1) for n, v in scalar.items()}, "block_vs_floor": round(ratio, 3),
                      "scalar_call_us": round(scalar["TWS_TORQUE_FROM_POWER"], 2),
                      "allowable_call_us": round(scalar["TWS_ALLOWABLE"], 2),
                      "block_10k_ms": round(block_ms, 3), "floor_10k_ms": round(floor_seconds * 1e3, 3),
                      "text_block_10k_ms": round(seconds * 1e3, 3),
                      "laminate_new_inputs_us": round(new_laminate_us, 1)}))


if __name__ == "__main__":
    main()
