"""Benchmark of the Calc host: 2,000 cell-function calls recalculated by headless LibreOffice.

A script, not collected by pytest. The book (built with openpyxl, no cached values, demo-style
invented data) has 400 rows of a design card, each with five calls on that row's own values, so no
two calls are alike: ``TWS_TORQUE_FROM_POWER`` twice (the row's power and speed; once more with a
service factor and a result unit), ``TWS_ALLOWABLE`` (max shear, the row's yield strength), and
``TWS_TWIST_ANGLE`` and ``TWS_MARGIN`` over a two-layer block (a steel core in a bronze sleeve)
at the row's torque and length. It is recalculated with `recalculate` (the public path: private
profile, LibreOffice's start, load with every formula computed, values read back, copy written).

Figures (target: ``seconds`` <= 6 with LibreOffice's start included):

* ``seconds``: the whole `recalculate` call;
* ``start_seconds``: the private profile made ready plus LibreOffice's start until it accepts a
  connection (``prepare`` + ``connect``);
* ``compute_seconds``: loading the book with every formula computed, and reading the values back
  (``load`` + ``read``); ``ms_per_call`` is that over the number of calls (the engine's import
  into LibreOffice's Python on the first call included);
* ``engine_ms_per_call``: the same 2,000 calls made directly in Python, for comparison: what the
  engine itself takes; the rest of ``ms_per_call`` is LibreOffice's (Calc calling Basic, Basic
  calling Python through the scripting framework);
* ``engine``: how LibreOffice reached the engine (``in-process`` or ``helper``).

Checked, not timed: three cells against the same function called in Python (rel 1e-9) and no
cell showing a problem. The last line is one JSON object.

Run: ``/work/venv-calc/bin/python tests/perf/bench_calc.py [--engine helper]``
"""

from __future__ import annotations

import argparse
import json
import os
import tempfile
import time
from pathlib import Path

import openpyxl
from twistshare.engine import cells
from twistshare.workbook_bridge.hosts.calc import recalculate

ROWS = 400
BLOCK = [["G [GPa]", "Outer diameter [mm]", "Inner diameter [mm]", "Allowable shear [MPa]", "Kt"],
         [80, 45, 0, 140, 1.6], [41, 52, 45, 45, 1.0]]


def row_calls(i: int) -> dict[str, tuple[str, tuple]]:
    """The five formulas of row i and the Python call each stands for (the row's values inlined)."""
    r = i + 2
    power, speed = f"{10 + i % 97} kW", f"{960 + i} rpm"
    strength, torque, length = f"{250 + i} MPa", f"{200 + 3 * i} N·m", f"{500 + i} mm"
    block = [row[:] for row in BLOCK]
    return {
        f"C{r}": (f"=TWS_TORQUE_FROM_POWER(A{r},B{r})", ("TWS_TORQUE_FROM_POWER", (power, speed))),
        f"D{r}": (f'=TWS_ALLOWABLE("max shear",H{r},,2,"no")',
                  ("TWS_ALLOWABLE", ("max shear", strength, None, 2.0, "no"))),
        f"E{r}": (f"=TWS_TWIST_ANGLE($L$1:$P$3,I{r},J{r})", ("TWS_TWIST_ANGLE", (block, torque, length))),
        f"F{r}": (f"=TWS_MARGIN($L$1:$P$3,I{r},J{r})", ("TWS_MARGIN", (block, torque, length))),
        f"G{r}": (f'=TWS_TORQUE_FROM_POWER(A{r},B{r},1.25,"lbf·in")',
                  ("TWS_TORQUE_FROM_POWER", (power, speed, 1.25, "lbf·in"))),
    }, (power, speed, strength, torque, length)


def make_book(path: Path) -> dict[str, tuple]:
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Cards"
    for r, row in enumerate(BLOCK, 1):
        for c, v in enumerate(row, 12):  # L1:P3
            ws.cell(r, c, v)
    calls: dict[str, tuple] = {}
    for i in range(ROWS):
        r = i + 2
        formulas, (power, speed, strength, torque, length) = row_calls(i)
        ws[f"A{r}"], ws[f"B{r}"], ws[f"H{r}"], ws[f"I{r}"], ws[f"J{r}"] = power, speed, strength, torque, length
        for ref, (formula, call) in formulas.items():
            ws[ref] = formula
            calls[ref] = call
    wb.save(path)
    return calls


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--engine", choices=["auto", "in-process", "helper"], default="auto")
    args = parser.parse_args()
    os.environ["TWISTSHARE_CALC_ENGINE"] = args.engine
    with tempfile.TemporaryDirectory(prefix="bench-calc-") as tmp:
        folder = Path(tmp)
        book = folder / "cards.xlsx"
        calls = make_book(book)
        trace = folder / "engine.txt"
        os.environ["TWISTSHARE_CALC_REPORT"] = str(trace)
        started = time.perf_counter()
        report = recalculate(book, folder / "out.xlsx", timeout=120)
        seconds = time.perf_counter() - started
        ws = openpyxl.load_workbook(folder / "out.xlsx", data_only=True)["Cards"]
        cells.TWS_TORQUE_FROM_POWER("1 kW", "1 rpm")  # the unit registry is made on first use
        engine_started = time.perf_counter()
        expected = {ref: getattr(cells, name)(*args) for ref, (name, args) in calls.items()}
        engine_seconds = time.perf_counter() - engine_started
        for ref in ("C2", "F2", f"E{ROWS + 1}", f"G{ROWS // 2}"):
            got, want = ws[ref].value, expected[ref]
            assert abs(got - want) <= 1e-9 * abs(want), (ref, got, want)
        assert not report.problems, report.problems[:3]
        engine = trace.read_text().split()[0]
    n = len(calls)
    s = report.seconds
    start = s.get("prepare", 0.0) + s.get("connect", 0.0)
    compute = s.get("load", 0.0) + s.get("read", 0.0)
    print(f"{n} calls recalculated by LibreOffice in {seconds:.2f} s (target <= 6 s): start {start:.2f} s "
          f"(profile {s.get('prepare', 0):.2f} s, LibreOffice {s.get('connect', 0):.2f} s), "
          f"load+compute+read {compute:.2f} s = {1000 * compute / n:.2f} ms per call "
          f"(the engine alone, in Python: {1000 * engine_seconds / n:.2f} ms per call); engine reached {engine}")
    print(json.dumps({"calls": n, "seconds": round(seconds, 3), "start_seconds": round(start, 3),
                      "compute_seconds": round(compute, 3), "ms_per_call": round(1000 * compute / n, 3),
                      "engine_ms_per_call": round(1000 * engine_seconds / n, 3), "engine": engine,
                      "target_seconds": 6.0, "within_target": seconds <= 6.0}))


if __name__ == "__main__":
    main()
