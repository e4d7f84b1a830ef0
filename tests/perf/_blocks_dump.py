"""Equivalence harness for work on the layer-block path.

The outputs of four cell functions over 15 kinds of block: bench_cells' generated blocks
(numbers, and ``value unit`` texts); parts split, shuffled or continued by blank cells; ids and
names with spaces; error values; a modulus among the names; bad cells; a Layer column; one
part; no Part column; positional columns; tuples; ragged rows; blank rows::

    python tests/perf/_blocks_dump.py save OUT.pkl      # before a change
    python tests/perf/_blocks_dump.py compare OUT.pkl   # after: "all equal", or the first differences

Not collected by pytest: it compares one version with another, not with the outside.
"""

from __future__ import annotations

import math
import pickle
import random
import sys
from collections.abc import Iterator
from pathlib import Path
from typing import Any

sys.path.insert(0, str(Path(__file__).resolve().parent))
from bench_cells import layer_block  # noqa: E402
from twistshare.engine.cells import TWS_GOVERNING_LIMIT, TWS_GOVERNS, TWS_LAYER_CAPACITY, TWS_SHARE  # noqa: E402

FUNCTIONS = (TWS_LAYER_CAPACITY, TWS_GOVERNING_LIMIT, TWS_SHARE, TWS_GOVERNS)


def _copy(rows: list[list[Any]]) -> list[list[Any]]:
    return [list(r) for r in rows]


def _with_layer_numbers(rows: list[list[Any]]) -> list[list[Any]]:
    out, number = [], 0
    for i, r in enumerate(rows):
        number = number + 1 if i and rows[i - 1][0] == r[0] else 1
        out.append([r[0], float(number), *r[1:]])
    return out


def variants() -> Iterator[tuple[str, Any]]:
    bench = layer_block(3000)
    header, rows = bench[0], bench[1:400]
    yield "bench", bench
    yield "text", layer_block(500, as_text=True)
    blank = _copy(rows)
    for i in range(1, len(blank)):
        if blank[i][0] == blank[i - 1][0] and i % 2:
            blank[i][0] = None
    yield "blank-continue", [header, *blank]
    shuffled = _copy(rows)
    random.Random(3).shuffle(shuffled)
    yield "interleaved", [header, *shuffled]
    spaced = _copy(rows)
    for i in range(0, len(spaced), 7):
        spaced[i][0] = f" {spaced[i][0]}  "
    yield "spaces-keys", [header, *spaced]
    errors = _copy(rows)
    for i in range(0, len(errors), 11):
        errors[i][0] = "#N/A"
    errors[5][0], errors[9][0] = "Err:502", ""
    yield "error-keys", [header, *errors]
    odd = _copy(rows)
    for i in range(0, len(odd), 5):
        odd[i][1] = f"  {odd[i][1].upper()} "
    for i, text in ((3, "79 GPa"), (8, "790 GPa"), (12, "1045"), (14, None), (20, "#N/A"), (21, "  "),
                    (22, "unobtainium"), (23, 42.0)):
        odd[i][1] = text
    yield "materials-odd", [header, *odd]
    cells = _copy(rows)
    cells[4] = list(cells[3])
    for i, j, value in ((10, 2, "abc"), (11, 3, None), (12, 4, -5), (13, 5, True), (15, 2, 1e9)):
        cells[i][j] = value
    yield "cells-odd", [header, *cells]
    numbered = _with_layer_numbers(rows[:60])
    numbered[7][1], numbered[9][1], numbered[13][1] = 0.0, "two", numbered[12][1]
    yield "layer-col", [[header[0], "Layer", *header[1:]], *numbered]
    yield "one-part", [header, rows[0]]
    yield "no-part-col", [header[1:], *[r[1:] for r in rows[:3]]]
    yield "positional", [r[1:] for r in rows[:2]]
    yield "tuple-rows", tuple(tuple(r) for r in [header, *rows[:50]])
    yield "ragged", [header, *[r[:4] if i % 3 == 0 else r for i, r in enumerate(rows[:50])]]
    yield "blank-rows", [header, *[r if i % 9 else [None] * 6 for i, r in enumerate(rows[:90])]]


def _plain(x: Any) -> Any:
    if isinstance(x, float) and math.isnan(x):
        return "nan"
    if isinstance(x, (list, tuple)):
        return [_plain(v) for v in x]
    return x


def outputs() -> dict[tuple[str, str], Any]:
    out: dict[tuple[str, str], Any] = {}
    for name, block in variants():
        for function in FUNCTIONS:
            try:
                out[(name, function.__name__)] = _plain(function(block))
            except Exception as exc:  # a refusal is an output too
                out[(name, function.__name__)] = ("raised", type(exc).__name__, str(exc))
    return out


def _first_difference(key: tuple[str, str], old: Any, new: Any) -> str:
    if isinstance(old, list) and isinstance(new, list):
        for i, (a, b) in enumerate(zip(old, new)):
            if a != b:
                return f"{key} row {i}: {a} | {b}"
        return f"{key}: {len(old)} rows | {len(new)} rows"
    return f"{key}: {str(old)[:300]} | {str(new)[:300]}"


def main(argv: list[str]) -> int:
    mode, path = argv
    now = outputs()
    if mode == "save":
        Path(path).write_bytes(pickle.dumps(now))
        print("saved", len(now))
        return 0
    before = pickle.loads(Path(path).read_bytes())
    differ = [k for k in before if before[k] != now.get(k)]
    print("all equal" if not differ else f"differ: {len(differ)} of {len(now)}")
    for key in differ[:5]:
        print(_first_difference(key, before[key], now.get(key)))
    return 1 if differ else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
