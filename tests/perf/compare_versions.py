"""Same-run comparison of two installed versions of twistshare on the big catalogue.

A noisy machine makes two separate benchmark runs incomparable. This script builds the
50 000-part catalogue of `bench_book.py` once, then runs ``twistshare rate`` of each version in
turn, alternating (A B A B ...), and prints the median of each and their ratio. Not collected
by pytest. Run, with the earlier version installed in its own virtual environment::

    python tests/perf/compare_versions.py --before /path/to/old-venv/bin/twistshare \\
        --after /path/to/new-venv/bin/twistshare [--parts N] [--rounds R]

The last line is one JSON object: ``before_s``, ``after_s`` (medians) and ``after_over_before``.
"""

from __future__ import annotations

import argparse
import json
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _catalogue import write_big_catalogue  # noqa: E402  (the helper sits beside this script)


def _time_rate(executable: str, book: Path, out: Path) -> float:
    start = time.perf_counter()
    done = subprocess.run([executable, "rate", str(book), "-o", str(out), "-q"],
                          capture_output=True, text=True)
    seconds = time.perf_counter() - start
    if done.returncode not in (0, 3):  # 3: some parts fail, which the catalogue has
        raise SystemExit(f"{executable} rate failed ({done.returncode}): {done.stderr[-500:]}")
    out.unlink(missing_ok=True)
    return seconds


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--before", required=True, help="the earlier version's twistshare executable")
    parser.add_argument("--after", required=True, help="the later version's twistshare executable")
    parser.add_argument("--parts", type=int, default=50_000)
    parser.add_argument("--rounds", type=int, default=3)
    args = parser.parse_args(argv)
    with tempfile.TemporaryDirectory() as folder:
        book = Path(folder) / "big.xlsx"
        write_big_catalogue(book, args.parts, 3)
        times: dict[str, list[float]] = {"before": [], "after": []}
        for _ in range(args.rounds):
            for name in ("before", "after"):
                seconds = _time_rate(getattr(args, name), book, Path(folder) / f"{name}.xlsx")
                times[name].append(seconds)
                print(f"{name:<7} twistshare rate {seconds:6.2f} s")
    before, after = (statistics.median(times[k]) for k in ("before", "after"))
    print(f"median: before {before:.2f} s, after {after:.2f} s, after / before = {after / before:.3f}")
    print(json.dumps({"parts": args.parts, "before_s": round(before, 3), "after_s": round(after, 3),
                      "after_over_before": round(after / before, 3),
                      "runs": {k: [round(v, 3) for v in times[k]] for k in times}}))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
