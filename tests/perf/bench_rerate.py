"""Re-rating a rated 50 000-part catalogue against rating the original, in one run.

Prints the two times, their ratio and the size of the ownership record, then one JSON line.
Run from the repo root after installing: ``python tests/perf/bench_rerate.py [--parts N]``.
"""

from __future__ import annotations

import argparse
import json
import subprocess
import sys
import tempfile
import time
import zipfile
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _catalogue import write_big_catalogue  # noqa: E402  (the helper sits beside this script)


def _rate(src: Path, out: Path) -> float:
    t = time.perf_counter()
    proc = subprocess.run([sys.executable, "-m", "twistshare.workbook_bridge.commands.cli", "rate", str(src),
                           "-o", str(out), "-q", "--lenient"], capture_output=True, text=True)
    seconds = time.perf_counter() - t
    if proc.returncode != 0:
        raise SystemExit(f"rate {src.name} failed ({proc.returncode}): {proc.stderr.strip()[-400:]}")
    return seconds


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--parts", type=int, default=50_000)
    ap.add_argument("--layers", type=int, default=3)
    args = ap.parse_args(argv)
    with tempfile.TemporaryDirectory(prefix="twistshare_bench_rerate_") as folder:
        work = Path(folder)
        big = work / "big.xlsx"
        write_big_catalogue(big, args.parts, args.layers)
        first = _rate(big, work / "rated.xlsx")
        again = _rate(work / "rated.xlsx", work / "rerated.xlsx")
        with zipfile.ZipFile(work / "rerated.xlsx") as zf:
            record = next(i for i in zf.infolist() if i.filename.startswith("customXml/item")
                          and "Props" not in i.filename)
            size = (work / "rerated.xlsx").stat().st_size
    print(f"{args.parts} parts x {args.layers} layers: rate {first:.2f} s, re-rate of the rated copy {again:.2f} s "
          f"(ratio {again / first:.2f}); ownership record {record.file_size / 1e3:.1f} kB "
          f"({record.compress_size / 1e3:.1f} kB stored) in a {size / 1e6:.1f} MB book")
    print(json.dumps({"parts": args.parts, "rate_s": round(first, 3), "rerate_s": round(again, 3),
                      "ratio": round(again / first, 3), "record_bytes": record.file_size}))
    return 0


if __name__ == "__main__":
    sys.exit(main())
