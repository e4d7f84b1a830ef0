"""Mutation score of the engine core, the intake, the units and the bridge's duty/placement paths.

Run as a script (not collected by pytest, not run in CI; needs the ``mutation`` extra)::

    pip install -e '.[test,mutation]'
    python tests/perf/mutation_score.py                 # every target below, one after another
    python tests/perf/mutation_score.py --only units    # targets whose name contains 'units'
    python tests/perf/mutation_score.py --report        # summarise the saved results only
    python tests/perf/mutation_score.py --only units --lines 191:284   # mutate only those lines
    python tests/perf/mutation_score.py --only units --again   # re-test last run's survivors only

The tool is mutmut 2.5 (``mutmut run --paths-to-mutate ... --runner ...``). mutmut 3 was
tried first: it copies the sources into ``mutants/`` and recognises a mutant by the module name
derived from the file path (``engine.units``), while this repository installs its folders under
another name (``engine/`` is ``twistshare.engine``), so its trampolines never switch a mutant
on. mutmut 2 writes each mutant into the source file in place, runs the given test command and
restores the file, which works with any package layout (run it in a clean worktree: the module
is rewritten while it runs).

Each target is one module and the few fast test files that concern it (the machine is shared:
never the whole suite per mutant). Each mutant's run is stopped after ``3 x baseline + 10 s``.
The per-target results are kept in ``out/mutation/<target>.json`` (git-ignored), so one target
can be rerun and the summary rebuilt with ``--report``.

Prints, per package, killed / total and the score, then every surviving mutant (file, line,
the changed line), and last one JSON line with ``score_core``, ``score_intake``, ``score_units``,
``score_bridge`` (each a fraction in [0, 1], or null when none of its targets was run) and
``survivors`` (a list of {"target", "file", "line", "diff"}). Mutants shown equivalent are listed
with their reason in ``tests/perf/mutation_equivalents.md`` and counted as killed when the file
names them (file, line number, the line's text before and after the change). Targets: >= 0.95 core and
intake, >= 0.90 units and bridge.
"""

from __future__ import annotations

import argparse
import json
import os
import re
import shlex
import shutil
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
RESULTS = ROOT / "out" / "mutation"
EQUIVALENTS = ROOT / "tests" / "perf" / "mutation_equivalents.md"

TE, TI, TB = "tests/engine/", "tests/intake/", "tests/bridge/"

# (target name, package, module, test files): each module with the tests that concern it.
TARGETS: list[tuple[str, str, str, list[str]]] = [
    # the core, in the order rate() leans on it
    ("core_demand", "core", "engine/core/_demand.py", [TE + "test_demand.py"]),
    ("core_section", "core", "engine/core/_section.py", [TE + "test_section.py"]),
    ("core_compatibility", "core", "engine/core/_compatibility.py", [TE + "test_compatibility.py"]),
    ("core_capacity", "core", "engine/core/_capacity.py", [TE + "test_capacity.py"]),
    ("core_governing", "core", "engine/core/_governing.py", [TE + "test_governing.py"]),
    ("core_allowables", "core", "engine/core/_allowables.py", [TE + "test_allowables.py"]),
    ("core_combined", "core", "engine/core/_combined.py", [TE + "test_combined.py"]),
    ("core_laminate", "core", "engine/core/_laminate.py", [TE + "test_laminate.py", TE + "test_materials_laminate.py"]),
    ("core_fits", "core", "engine/core/_fits.py", [TE + "test_fits.py"]),
    ("core_stack_fits", "core", "engine/core/_stack_fits.py", [TE + "test_stack_fits.py"]),
    ("core_interfaces", "core", "engine/core/_interfaces.py", [TE + "test_interfaces.py"]),
    ("core_interface_criteria", "core", "engine/core/_interface_criteria.py",
     [TE + "test_interface_criteria.py", TE + "test_interfaces.py"]),
    ("core_load_path", "core", "engine/core/_load_path.py", [TE + "test_load_path.py", TE + "test_bond.py"]),
    ("core_bond", "core", "engine/core/_bond.py", [TE + "test_bond.py"]),
    ("core_plastic", "core", "engine/core/_plastic.py", [TE + "test_plastic.py"]),
    ("core_plastic_unloading", "core", "engine/core/_plastic_unloading.py", [TE + "test_plastic.py"]),
    ("core_bending", "core", "engine/core/_bending.py", [TE + "test_bending.py"]),
    ("core_whirl", "core", "engine/core/_whirl.py", [TE + "test_whirl.py"]),
    ("core_buckling", "core", "engine/core/_buckling.py", [TE + "test_buckling.py"]),
    ("core_beyond_torsion_criteria", "core", "engine/core/_beyond_torsion_criteria.py",
     [TE + "test_beyond_torsion_criteria.py", TE + "test_combined.py"]),
    ("core_sizing", "core", "engine/core/_sizing.py", [TE + "test_sizing.py"]),
    ("core_stock", "core", "engine/core/_stock.py", [TE + "test_sizing.py"]),
    ("core_restoring", "core", "engine/core/_restoring.py", [TE + "test_sizing.py"]),
    ("core_shafting_code", "core", "engine/core/_shafting_code.py", [TE + "test_shafting_code.py"]),
    ("core_criteria", "core", "engine/core/_criteria.py", [TE + "test_criteria.py", TE + "test_rating.py"]),
    ("core_criteria_list", "core", "engine/core/_criteria_list.py", [TE + "test_criteria.py", TE + "test_rating.py"]),
    ("core_rating", "core", "engine/core/_rating.py", [TE + "test_rating.py", TE + "test_core_api.py"]),
    ("core_rating_flags", "core", "engine/core/_rating_flags.py", [TE + "test_rating.py", TE + "test_diagnoses.py"]),
    ("core_diagnoses", "core", "engine/core/_diagnoses.py", [TE + "test_diagnoses.py"]),
    ("core_sleeve_diagnoses", "core", "engine/core/_sleeve_diagnoses.py",
     [TE + "test_interfaces.py", TE + "test_diagnoses.py"]),
    ("core_duty", "core", "engine/core/_duty.py", [TE + "test_rating.py", TE + "test_core_api.py"]),
    ("core_arrays", "core", "engine/core/_arrays.py", [TE + "test_core_api.py", TE + "test_rating.py"]),
    ("core_radius", "core", "engine/core/_radius.py", [TE + "test_cells.py", "-k", "stress or radius"]),
    ("core_materials", "core", "engine/core/_materials.py",
     [TE + "test_materials.py", TE + "test_materials_laminate.py"]),
    ("core_material_library", "core", "engine/core/_material_library.py", [TE + "test_materials.py"]),
    # the intake, below both front ends
    ("intake_words", "intake", "engine/intake/_words.py", [TI + "test_words.py"]),
    ("intake_schema", "intake", "engine/intake/_schema.py", [TI + "test_schema.py"]),
    ("intake_parts", "intake", "engine/intake/_parts.py", [TI + "test_front_ends_agree.py", TB + "test_bad_cells.py"]),
    ("intake_layers", "intake", "engine/intake/_layers.py", [TI + "test_front_ends_agree.py", TB + "test_bad_cells.py"]),
    ("intake_materials", "intake", "engine/intake/_materials.py",
     [TI + "test_front_ends_agree.py", TB + "test_materials_rules.py"]),
    ("intake_problems", "intake", "engine/intake/_problems.py", [TI + "test_beyond_torsion.py", TB + "test_comments.py"]),
    ("intake_allowable_rule", "intake", "engine/intake/_allowable_rule.py", [TI + "test_allowable_rule.py"]),
    ("intake_columns", "intake", "engine/intake/_columns.py", [TI + "test_schema.py", TI + "test_front_ends_agree.py"]),
    ("intake_loads", "intake", "engine/intake/_loads.py", [TI + "test_front_ends_agree.py", TI + "test_beyond_torsion.py"]),
    ("intake_interface_inputs", "intake", "engine/intake/_interface_inputs.py",
     [TI + "test_beyond_torsion.py", TI + "test_front_ends_agree.py"]),
    ("intake_plastic_inputs", "intake", "engine/intake/_plastic_inputs.py", [TI + "test_front_ends_agree.py"]),
    ("intake_flag_words", "intake", "engine/intake/_flag_words.py", [TI + "test_beyond_torsion.py", TB + "test_comments.py"]),
    ("intake_wording", "intake", "engine/intake/_wording.py", [TI + "test_words.py", TE + "test_cells.py"]),
    ("intake_layup", "intake", "engine/intake/_layup.py", [TI + "test_layup.py"]),
    ("intake_wound_layers", "intake", "engine/intake/_wound_layers.py", [TI + "test_layup.py", TI + "test_front_ends_agree.py"]),
    ("intake_sizing_input", "intake", "engine/intake/_sizing_input.py", [TI + "test_sizing_input.py"]),
    ("intake_book", "intake", "engine/intake/_book.py", [TI + "test_beyond_torsion.py", TB + "test_materials_rules.py"]),
    ("intake_grid", "intake", "engine/intake/_grid.py", [TI + "test_beyond_torsion.py", TI + "test_front_ends_agree.py"]),
    ("intake_tables", "intake", "engine/intake/_tables.py", [TI + "test_front_ends_agree.py", TB + "test_bad_cells.py"]),
    ("intake_table_checks", "intake", "engine/intake/_table_checks.py", [TB + "test_bad_cells.py"]),
    ("intake_cellrefs", "intake", "engine/intake/_cellrefs.py", [TI + "test_beyond_torsion.py", TB + "test_comments.py"]),
    # units: the shared registry and its engineers' spellings
    ("units", "units", "engine/units.py", [TE + "test_units_spellings.py", TE + "test_units.py"]),
    # the bridge paths: a duty read into torques, part-level findings placed on cells, comments
    ("bridge_duty", "bridge", "engine/intake/_duty.py", [TI + "test_duty.py"]),
    ("bridge_comments", "bridge", "workbook_bridge/sheets/_comments.py", [TB + "test_comments.py", TB + "test_rate_command.py"]),
]

_STATUS_KILLED = {"ok_killed", "bad_timeout", "ok_suspicious"}  # a timeout is a detected change


def _equivalents() -> set[tuple[str, int, str]]:
    """(file, line, diff) listed as equivalent: table rows ``| `file` | line | `old` → `new` | reason |``."""
    if not EQUIVALENTS.exists():
        return set()
    found = set()
    for m in re.finditer(r"^\|\s*`([^`]+)`\s*\|\s*(\d+)\s*\|\s*`(.+?)`\s*→\s*`(.+?)`\s*\|", EQUIVALENTS.read_text(),
                         re.MULTILINE):
        old, new = (g.replace("\\|", "|").strip() for g in (m.group(3), m.group(4)))  # markdown escapes | in tables
        found.add((m.group(1), int(m.group(2)), old + " -> " + new))
    return found


def _diff(mutant_id: int) -> str:
    out = subprocess.run(["mutmut", "show", str(mutant_id)], cwd=ROOT, capture_output=True, text=True).stdout
    old = [ln[1:].strip() for ln in out.splitlines() if ln.startswith("-") and not ln.startswith("---")]
    new = [ln[1:].strip() for ln in out.splitlines() if ln.startswith("+") and not ln.startswith("+++")]
    return " / ".join(old) + " -> " + " / ".join(new)


def _line_patch(module: str, lines: tuple[int, int]) -> Path:
    """A unified diff that shows lines[0]..lines[1] (1-based, inclusive) of `module` as added,
    so that mutmut's ``--use-patch-file`` mutates only those lines."""
    text = (ROOT / module).read_text().splitlines()
    first, last = lines
    body = "".join(f"+{line}\n" for line in text[first - 1:last])
    patch = RESULTS / "lines.patch"
    RESULTS.mkdir(parents=True, exist_ok=True)
    patch.write_text(f"--- a/{module}\n+++ b/{module}\n@@ -{first - 1},0 +{first},{last - first + 1} @@\n{body}")
    return patch


_STALL_SECONDS = 240  # no mutant finished for this long: mutmut's worker process is gone
_RESTARTS = 3


def _tested(cache: Path) -> int:
    try:
        con = sqlite3.connect(f"file:{cache}?mode=ro", uri=True, timeout=1)
        try:
            return con.execute("SELECT count(*) FROM Mutant WHERE status != 'untested'").fetchone()[0]
        finally:
            con.close()
    except sqlite3.Error:
        return -1


def _run_watched(cmd: list[str], cache: Path) -> bool:
    """Run mutmut; True when it ended by itself. mutmut 2 waits for ever when its worker process
    dies, so a run that finishes no mutant for `_STALL_SECONDS` is stopped (the statuses so far
    are in its cache, and the next run resumes from them)."""
    proc = subprocess.Popen(cmd, cwd=ROOT, env=dict(os.environ, PYTHONDONTWRITEBYTECODE="1"),
                            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, start_new_session=True)
    done, since = _tested(cache), time.monotonic()
    while proc.poll() is None:
        time.sleep(5)
        now = _tested(cache)
        if now != done:
            done, since = now, time.monotonic()
        elif time.monotonic() - since > _STALL_SECONDS:
            os.killpg(proc.pid, signal.SIGTERM)
            proc.wait()
            return False
    return True


def run_target(name: str, package: str, module: str, tests: list[str], lines: tuple[int, int] | None = None,
               again: bool = False) -> dict:
    """Run mutmut on one module with its tests; the module's text is restored afterwards.

    `lines` (first, last), 1-based: mutate only those lines (the result records the range).
    `again`: start from the target's saved cache, so that mutmut re-tests only the mutants not
    killed last time (it re-tests them when a test file has changed; killed ones stay killed)."""
    # a file, a node id (file::test) or pytest options such as "-k", "expr" (quoted for mutmut's shlex)
    tests = [t for t in tests if not t.endswith(".py") or (ROOT / t).exists()]
    cache = ROOT / ".mutmut-cache"
    if cache.exists():
        cache.unlink()
    saved = RESULTS / f"{name}.mutmut-cache"
    if again and saved.exists() and lines is None:
        shutil.copy(saved, cache)
        con = sqlite3.connect(cache)
        with con:
            con.execute("UPDATE Mutant SET status = 'untested' WHERE status NOT IN (%s)"
                        % ", ".join("?" * len(_STATUS_KILLED)), sorted(_STATUS_KILLED))
        con.close()
    source = (ROOT / module).read_text()
    pytest = f"{sys.executable} -m pytest -x -q -p no:cacheprovider --no-header -W ignore " + " ".join(map(shlex.quote, tests))
    # mutmut 2 counts only exit status 1 as "killed": a mutant that breaks an import (pytest's
    # status 2, a collection error) would pass as a survivor, so every failure is made status 1.
    runner = "sh -c " + shlex.quote(pytest + " || exit 1")
    cmd = ["mutmut", "run", "--paths-to-mutate", module, "--tests-dir", "tests", "--runner", runner,
           "--test-time-multiplier", "3", "--test-time-base", "10", "--no-progress", "--simple-output"]
    if lines is not None:
        cmd += ["--use-patch-file", str(_line_patch(module, lines))]
    print(f"== {name}: {module} against {' '.join(tests)}", flush=True)
    try:
        for _attempt in range(_RESTARTS + 1):
            if _run_watched(cmd, cache):
                break
            (ROOT / module).write_text(source)  # it may have stopped with a mutant written in
            Path(str(ROOT / module) + ".bak").unlink(missing_ok=True)
            print("   mutmut made no progress (its worker died): restarted from its cache", flush=True)
    finally:
        if (ROOT / module).read_text() != source:
            (ROOT / module).write_text(source)
    con = sqlite3.connect(cache)
    rows = con.execute("SELECT m.id, m.status, l.line_number, l.line FROM Mutant m JOIN Line l ON m.line = l.id").fetchall()
    con.close()
    survivors = []
    for mid, status, line_number, _line in rows:
        if status not in _STATUS_KILLED:
            survivors.append({"target": name, "file": module, "line": line_number + 1, "status": status,
                              "diff": _diff(mid)})
    result = {"target": name, "package": package, "module": module, "tests": tests, "total": len(rows),
              "lines": list(lines) if lines else None, "survivors": survivors}
    RESULTS.mkdir(parents=True, exist_ok=True)
    (RESULTS / f"{name}.json").write_text(json.dumps(result, indent=1))
    shutil.move(str(cache), str(RESULTS / f"{name}.mutmut-cache"))
    print(f"   {len(rows) - len(survivors)}/{len(rows)} killed", flush=True)
    if not rows:
        print("   no mutants: mutmut failed (for --lines, is whatthepatch installed?)", flush=True)
    return result


def report() -> dict:
    equivalent = _equivalents()
    per_package: dict[str, list[int]] = {}
    left = []
    for path in sorted(RESULTS.glob("*.json")):
        r = json.loads(path.read_text())
        alive = [s for s in r["survivors"] if (s["file"], s["line"], s["diff"]) not in equivalent]
        killed_or_equivalent = r["total"] - len(alive)
        tally = per_package.setdefault(r["package"], [0, 0])
        tally[0] += killed_or_equivalent
        tally[1] += r["total"]
        scope = f" lines {r['lines'][0]}-{r['lines'][1]}" if r.get("lines") else ""
        print(f"{r['target']:<24} {killed_or_equivalent:>4}/{r['total']:<4} "
              f"{killed_or_equivalent / max(r['total'], 1):6.1%}  ({r['module']}{scope})")
        left.extend(alive)
    print()
    scores = {}
    for package in ("core", "intake", "units", "bridge"):
        k, n = per_package.get(package, (0, 0))
        scores[f"score_{package}"] = round(k / n, 4) if n else None
        print(f"{package:<8} {k}/{n} " + (f"{k / n:.1%}" if n else "not run"))
    print("\nsurviving mutants:" if left else "\nno surviving mutants")
    for s in left:
        print(f"  {s['file']}:{s['line']} [{s['status']}] {s['diff']}")
    scores["survivors"] = [{k: s[k] for k in ("target", "file", "line", "diff")} for s in left]
    return scores


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--only", action="append", default=[], help="run only targets whose name contains this")
    parser.add_argument("--report", action="store_true", help="only summarise the saved results")
    parser.add_argument("--lines", help="FIRST:LAST, mutate only these lines of each target run")
    parser.add_argument("--again", action="store_true",
                        help="re-test only the mutants that survived the target's last run (after new tests)")
    args = parser.parse_args()
    if shutil.which("mutmut") is None:
        sys.exit("mutmut is not installed: pip install -e '.[mutation]'")
    if not args.report:
        for name, package, module, tests in TARGETS:
            if args.only and not any(o in name for o in args.only):
                continue
            lines = tuple(int(x) for x in args.lines.split(":")) if args.lines else None
            run_target(name, package, module, tests, lines, again=args.again)
    print(json.dumps(report()))


if __name__ == "__main__":
    main()
