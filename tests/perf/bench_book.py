"""Benchmark: rate a big catalogue end to end against the native-formula sheet it replaces.

Builds, in a temporary folder, a 50 000-part three-layer catalogue in our input convention and
the same parts as a hand-built sheet of native formulas, then times in one run:

* the peer: headless LibreOffice recalculating the formula sheet (``--convert-to xlsx``) with a
  fresh profile told to recalculate OOXML files on load, and the output checked for the numbers;
* openpyxl alone loading and saving our input catalogue (what a re-saving writer would pay);
* ours: ``twistshare rate BIG.xlsx -o OUT.xlsx`` as a subprocess, with its peak memory.

Not collected by pytest. Prints the figures, then one JSON line. Run:
``/tmp/venv/bin/python tests/perf/bench_book.py [--parts N] [--layers L] [--keep DIR]``
"""

from __future__ import annotations

import argparse
import json
import math
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _catalogue import (  # noqa: E402  (the helper sits beside this script, not in a package)
    make_big_catalogue,
    peer_reference,
    write_big_catalogue,
    write_native_formula_peer,
)

LO_PROFILE = Path("/tmp/lo_bench_profile")
# 0 = always recalculate OOXML files on load (1 = never, 2 = ask): LibreOffice's Calc setting
# "Formula > Recalculation on file load > Excel 2007 and newer".
_RECALC_ITEM = (
    '<item oor:path="/org.openoffice.Office.Calc/Formula/Load">'
    '<prop oor:name="OOXMLRecalcMode" oor:op="fuse"><value>0</value></prop></item>'
)
_XCU_HEAD = (
    '<?xml version="1.0" encoding="UTF-8"?>\n'
    '<oor:items xmlns:oor="http://openoffice.org/2001/registry" '
    'xmlns:xs="http://www.w3.org/2001/XMLSchema" '
    'xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">\n'
)

# Peak-memory wrapper: a child Python that runs the command and reports only its own
# children's peak RSS, so nothing else this script ran is counted.
_MEASURE = (
    "import json, resource, subprocess, sys, time\n"
    "t = time.perf_counter()\n"
    "p = subprocess.run(sys.argv[1:], capture_output=True, text=True)\n"
    "dt = time.perf_counter() - t\n"
    "kb = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss\n"
    "print(json.dumps({'rc': p.returncode, 'seconds': dt, 'peak_kb': kb,"
    " 'stdout': p.stdout[-2000:], 'stderr': p.stderr[-2000:]}))\n"
)


def _soffice() -> str | None:
    return shutil.which("soffice") or shutil.which("libreoffice")


def _lo_convert(soffice: str, book: Path, outdir: Path) -> tuple[float, subprocess.CompletedProcess]:
    cmd = [soffice, "--headless", f"-env:UserInstallation=file://{LO_PROFILE}",
           "--convert-to", "xlsx", "--outdir", str(outdir), str(book)]
    t = time.perf_counter()
    proc = subprocess.run(cmd, capture_output=True, text=True, timeout=1800)
    return time.perf_counter() - t, proc


def _prepare_profile(soffice: str, work: Path) -> bool:
    """Fresh LibreOffice profile, warmed up, set to recalculate OOXML on load; True if set."""
    if LO_PROFILE.exists():
        shutil.rmtree(LO_PROFILE)
    (LO_PROFILE / "user").mkdir(parents=True)
    xcu = LO_PROFILE / "user" / "registrymodifications.xcu"
    xcu.write_text(_XCU_HEAD + _RECALC_ITEM + "\n</oor:items>\n", encoding="utf-8")
    # The first start builds the rest of the profile; keep it out of the timed run.
    warm = work / "warmup"
    warm.mkdir()
    write_native_formula_peer(warm / "warm.xlsx", parts=10)
    _lo_convert(soffice, warm / "warm.xlsx", warm / "out")
    text = xcu.read_text(encoding="utf-8")
    if "OOXMLRecalcMode" not in text:  # the first start rewrote the file without our item
        text = text.replace("</oor:items>", _RECALC_ITEM + "\n</oor:items>")
        xcu.write_text(text, encoding="utf-8")
    return "OOXMLRecalcMode" in xcu.read_text(encoding="utf-8")


def _check_peer_output(out: Path, parts: int, layers: int, seed_parts) -> tuple[bool, str]:
    """Did LibreOffice write computed numbers? Compare the margin column with numpy."""
    try:
        from python_calamine import CalamineWorkbook
    except ImportError:
        return False, "python-calamine missing: cannot check the peer's output"
    wb = CalamineWorkbook.from_path(str(out))
    rows = wb.get_sheet_by_name("Parts").to_python()
    header = [str(h) for h in rows[0]]
    col = header.index("Margin")
    got = np.array([r[col] if isinstance(r[col], (int, float)) else np.nan for r in rows[1:]], float)
    want = peer_reference(seed_parts)["margin"]
    if got.shape != want.shape:
        return False, f"peer output has {got.size} rows, expected {want.size}"
    bad = ~np.isclose(got, want, rtol=1e-9, atol=1e-9)
    if bad.any():
        return False, f"{int(bad.sum())} of {parts} margins not computed as expected"
    return True, f"all {parts} margins computed by LibreOffice match numpy"


def _twistshare_script() -> Path | None:
    candidate = Path(sys.executable).parent / "twistshare"
    return candidate if candidate.exists() else None


def _run_ours(big: Path, out: Path) -> dict:
    script = _twistshare_script()
    if script is None:
        return {"ok": False, "why": f"no twistshare console script next to {sys.executable}"}
    proc = subprocess.run([sys.executable, "-c", _MEASURE, str(script), "rate", str(big), "-o", str(out)],
                          capture_output=True, text=True)
    try:
        res = json.loads(proc.stdout.strip().splitlines()[-1])
    except (ValueError, IndexError):
        return {"ok": False, "why": f"measuring wrapper failed: {proc.stderr[-500:]}"}
    ok = res["rc"] in (0, 1) and out.exists() and out.stat().st_size > 0
    res["ok"] = ok
    if not ok:
        res["why"] = (f"twistshare rate exited {res['rc']} and "
                      f"{'wrote' if out.exists() else 'did not write'} {out.name}: "
                      f"{(res['stderr'] or res['stdout']).strip()[-300:]}")
    return res


def _openpyxl_roundtrip(big: Path, out: Path) -> float:
    import openpyxl

    t = time.perf_counter()
    wb = openpyxl.load_workbook(big)
    wb.save(out)
    return time.perf_counter() - t


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--parts", type=int, default=50_000)
    ap.add_argument("--layers", type=int, default=3)
    ap.add_argument("--keep", type=Path, default=None, help="keep the books in this folder")
    ap.add_argument("--skip-roundtrip", action="store_true", help="skip the openpyxl load+save")
    args = ap.parse_args(argv)

    work = Path(tempfile.mkdtemp(prefix="twistshare_bench_"))
    try:
        big, peer = work / "big_catalogue.xlsx", work / "peer_formulas.xlsx"
        t = time.perf_counter()
        write_big_catalogue(big, args.parts, args.layers)
        t_big = time.perf_counter() - t
        t = time.perf_counter()
        write_native_formula_peer(peer, args.parts, args.layers)
        t_peer_build = time.perf_counter() - t
        print(f"built {args.parts} parts x {args.layers} layers: ours {t_big:.1f} s "
              f"({big.stat().st_size / 1e6:.1f} MB), peer {t_peer_build:.1f} s "
              f"({peer.stat().st_size / 1e6:.1f} MB)")

        # Ours first: its peak memory is measured in a wrapper child either way.
        ours = _run_ours(big, work / "rated.xlsx")
        if ours["ok"]:
            print(f"ours: twistshare rate {ours['seconds']:.2f} s, exit {ours['rc']}, "
                  f"peak {ours['peak_kb'] / 1024:.0f} MB")
        else:
            print(f"ours: not measured: {ours['why']}")

        peer_seconds = None
        peer_ok = False
        soffice = _soffice()
        if soffice is None:
            print("peer: LibreOffice (soffice) not found")
        else:
            recalc_set = _prepare_profile(soffice, work)
            print(f"peer: fresh profile {LO_PROFILE}, recalculate-on-load set: {recalc_set}")
            outdir = work / "lo_out"
            peer_seconds, proc = _lo_convert(soffice, peer, outdir)
            out = outdir / peer.name
            if proc.returncode != 0 or not out.exists():
                print(f"peer: LibreOffice failed ({proc.returncode}): {proc.stderr.strip()[-300:]}")
                peer_seconds = None
            else:
                peer_ok, why = _check_peer_output(out, args.parts, args.layers,
                                                  make_big_catalogue(args.parts, args.layers))
                print(f"peer: LibreOffice recalculated in {peer_seconds:.2f} s; {why}")
                if not peer_ok:
                    peer_seconds = None

        roundtrip = None
        if not args.skip_roundtrip:
            roundtrip = _openpyxl_roundtrip(big, work / "roundtrip.xlsx")
            print(f"openpyxl load+save of our input: {roundtrip:.2f} s"
                  + (f" ({roundtrip / peer_seconds:.2f}x the peer)" if peer_seconds else ""))

        seconds = ours["seconds"] if ours["ok"] else None
        ratio = seconds / peer_seconds if seconds is not None and peer_seconds else None
        if ratio is not None:
            print(f"ours / peer = {ratio:.3f} (bar: <= 0.5); "
                  f"peak {ours['peak_kb'] / 1024:.0f} MB (bar: <= 2048)")
        if args.keep:
            args.keep.mkdir(parents=True, exist_ok=True)
            for f in (big, peer):
                shutil.copy2(f, args.keep / f.name)

        def r(x):
            return None if x is None or (isinstance(x, float) and math.isnan(x)) else round(x, 3)

        print(json.dumps({
            "parts": args.parts,
            "layers": args.layers,
            "seconds": r(seconds),
            "peer_seconds": r(peer_seconds),
            "ratio_vs_peer": r(ratio),
            "openpyxl_roundtrip_seconds": r(roundtrip),
            "openpyxl_ratio_vs_peer": r(roundtrip / peer_seconds) if roundtrip and peer_seconds else None,
            "peak_mb": r(ours["peak_kb"] / 1024) if ours["ok"] else None,
            "peer_verified": peer_ok,
            "ours_exit_code": ours.get("rc"),
        }))
        return 0
    finally:
        shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    raise SystemExit(main())
