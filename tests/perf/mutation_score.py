"""Mutation score of the engine core, the intake, the units and the bridge's duty/placement paths.

Run as a script (not collected by pytest, not run in CI; needs the ``mutation`` extra)::

    pip install -e '.[test,mutation]'
    python tests/perf/mutation_score.py                 # every target below, one after another
    python tests/perf/mutation_score.py --only units    # targets whose name contains 'units'
    python tests/perf/mutation_score.py --report        # summarise the saved results only
    python tests/perf/mutation_score.py --only units --lines 191:284   # mutate only those lines
    python tests/perf/mutation_score.py --only units --again   # re-test last run's survivors only
    python tests/perf/mutation_score.py --only units --fast    # a slow target's fast list first (FAST_TESTS),
    python tests/perf/mutation_score.py --only units --again   # ... then its survivors against the full list

The mutants are mutmut 2.5's (its operators: numbers, strings, comparisons, and/or, argument
and keyword swaps), generated with its ``list_mutations``/``mutate``; this script runs them
itself (``_mutant_runner``): each in a pytest process forked from one that has imported all the
module does not touch, the mutant served from memory by an import hook, so the source tree is
never rewritten and ``--jobs N`` can run N side by side. mutmut 3 was tried first: it copies the
sources into ``mutants/`` and recognises a mutant by the module name derived from the file path
(``engine.units``), while this repository installs its folders under another name (``engine/``
is ``twistshare.engine``), so its trampolines never switch a mutant on. ``mutmut run`` itself
(2.5) was used until its worker process kept dying on the shared machine (the run then waits
for ever), and it counts only pytest's exit status 1 as a kill, so a mutant that breaks an
import passed as a survivor; here any failing status kills.

Each target is one module and the few fast test files that concern it (the machine is shared:
never the whole suite per mutant). Each mutant's run is stopped after ``3 x baseline x jobs + 10 s``.
The per-target results are kept in ``tests/perf/mutation_results/<target>.json`` (committed: a
run of everything takes an hour or more, and a session's machine does not outlast it), so one target
can be rerun and the summary rebuilt with ``--report``; ``--again`` re-tests only the saved
survivors of a target whose module is unchanged (after adding tests).

Prints, per package, killed / total and the score, then every surviving mutant (file, line,
the changed line), and last one JSON line with ``score_core``, ``score_intake``, ``score_units``,
``score_bridge`` (each a fraction in [0, 1], or null when none of its targets was run),
``stale`` (targets whose module changed since their run), ``not_run`` (targets with no saved run) and
``survivors`` (a list of {"target", "file", "line", "diff"}). Mutants shown equivalent are listed
with their reason in ``tests/perf/mutation_equivalents.md`` and counted as killed when the file
names them (file, line number, the line's text before and after the change). Targets: >= 0.95 core and
intake, >= 0.90 units and bridge.
"""

from __future__ import annotations

import argparse
import difflib
import hashlib
import json
import re
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _mutant_runner import MutantRunner  # noqa: E402

ROOT = Path(__file__).resolve().parents[2]
RESULTS = ROOT / "tests" / "perf" / "mutation_results"
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
    ("core_laminate", "core", "engine/core/_laminate.py", [TE + "test_laminate_checks.py", TE + "test_laminate.py",
                                                          TE + "test_materials_laminate.py"]),
    ("core_fits", "core", "engine/core/_fits.py", [TE + "test_fits.py"]),
    ("core_stack_fits", "core", "engine/core/_stack_fits.py", [TE + "test_stack_contact.py", TE + "test_stack_fits.py",
                                                               TE + "test_interface_rows.py"]),
    ("core_layer_fit_stress", "core", "engine/core/_layer_fit_stress.py",
     [TE + "test_layer_fit_stress.py", TE + "test_stack_fits.py"]),
    ("core_interface_rows", "core", "engine/core/_interface_rows.py",
     [TE + "test_stack_fits.py", TE + "test_interfaces.py", TE + "test_stack_contact.py",
      TE + "test_interface_rows.py"]),
    ("core_interfaces", "core", "engine/core/_interfaces.py",
     [TE + "test_interface_rating_record.py", TE + "test_interfaces.py"]),
    ("core_interface_criteria", "core", "engine/core/_interface_criteria.py",
     [TE + "test_interface_criteria.py", TE + "test_interfaces.py"]),
    ("core_load_path", "core", "engine/core/_load_path.py", [TE + "test_load_path.py", TE + "test_bond.py"]),
    ("core_bond", "core", "engine/core/_bond.py", [TE + "test_bond.py"]),
    ("core_adhesives", "core", "engine/core/_adhesives.py", [TE + "test_adhesives.py", TI + "test_adhesive_names.py"]),
    ("core_plastic", "core", "engine/core/_plastic.py", [TE + "test_plastic.py"]),
    ("core_plastic_unloading", "core", "engine/core/_plastic_unloading.py", [TE + "test_plastic.py"]),
    ("core_bending", "core", "engine/core/_bending.py", [TE + "test_bending.py"]),
    ("core_whirl", "core", "engine/core/_whirl.py", [TE + "test_whirl.py"]),
    ("core_buckling", "core", "engine/core/_buckling.py", [TE + "test_buckling.py"]),
    ("core_beyond_torsion_criteria", "core", "engine/core/_beyond_torsion_criteria.py",
     [TE + "test_beyond_torsion_criteria.py", TE + "test_combined.py", TI + "test_beyond_torsion.py"]),
    ("core_sizing", "core", "engine/core/_sizing.py", [TE + "test_sizing.py"]),
    ("core_sizing_geometry", "core", "engine/core/_sizing_geometry.py", [TE + "test_sizing.py"]),
    ("core_stock", "core", "engine/core/_stock.py", [TE + "test_sizing.py"]),
    ("core_restoring", "core", "engine/core/_restoring.py", [TE + "test_sizing.py"]),
    ("core_shafting_code", "core", "engine/core/_shafting_code.py", [TE + "test_shafting_code.py"]),
    ("core_criteria", "core", "engine/core/_criteria.py", [TE + "test_criteria.py", TE + "test_rating.py"]),
    ("core_criteria_list", "core", "engine/core/_criteria_list.py",
     [TE + "test_criteria_list.py", TE + "test_criteria.py", TE + "test_rating.py", TE + "test_capacity.py",
      TE + "test_governing.py",
      TE + "test_core_api.py", TE + "test_beyond_torsion_criteria.py", TE + "test_interface_criteria.py"]),
    ("core_rating", "core", "engine/core/_rating.py", [TE + "test_rating_masks.py", TE + "test_rating.py",
                                                      TE + "test_core_api.py"]),
    ("core_rating_flags", "core", "engine/core/_rating_flags.py", [TE + "test_rating.py", TE + "test_diagnoses.py",
                                                                     TE + "test_rating_flags.py"]),
    ("core_diagnoses", "core", "engine/core/_diagnoses.py", [TE + "test_flag_bits.py", TE + "test_diagnoses.py"]),
    ("core_sleeve_diagnoses", "core", "engine/core/_sleeve_diagnoses.py",
     [TE + "test_sleeve_diagnoses.py", TE + "test_interfaces.py", TE + "test_diagnoses.py"]),
    ("core_duty", "core", "engine/core/_duty.py", [TE + "test_duty.py", TE + "test_core_api.py"]),
    ("core_arrays", "core", "engine/core/_arrays.py", [TE + "test_arrays.py", TE + "test_core_api.py"]),
    ("core_radius", "core", "engine/core/_radius.py", [TE + "test_radius.py", TE + "test_cells.py", "-k", "stress or radius"]),
    ("core_materials", "core", "engine/core/_materials.py",
     [TE + "test_materials.py", TE + "test_materials_laminate.py", TE + "test_material_rules.py"]),
    ("core_material_library", "core", "engine/core/_material_library.py",
     [TE + "test_materials.py", TE + "test_material_library_values.py"]),
    # the intake, below both front ends
    ("intake_words", "intake", "engine/intake/_words.py", [TI + "test_words.py", TI + "test_words_spellings.py",
                                                          TI + "test_sizing_input_book.py", "-k",
                                                          "words or spellings or bad_size_word"]),
    ("intake_schema", "intake", "engine/intake/_schema.py", [TI + "test_schema.py", TI + "test_schema_readme.py",
                                                            TI + "test_schema_keys.py"]),
    ("intake_parts", "intake", "engine/intake/_parts.py", [TI + "test_parts.py", TI + "test_materials_intake.py",
                                                          TI + "test_book.py",
                                                          TI + "test_column_fast_paths.py",
                                                          TI + "test_parts_findings.py"]),
    ("intake_layers", "intake", "engine/intake/_layers.py", [TI + "test_layers.py", TI + "test_layer_rows.py",
                                                            TI + "test_column_fast_paths.py"]),
    ("intake_layer_rows", "intake", "engine/intake/_layer_rows.py", [TI + "test_layer_rows.py",
                                                                    TI + "test_column_fast_paths.py"]),
    ("intake_materials", "intake", "engine/intake/_materials.py",
     [TI + "test_materials_intake.py", TB + "test_materials_rules.py", TI + "test_materials_rows.py"]),
    ("intake_problems", "intake", "engine/intake/_problems.py", [TI + "test_problems.py", TI + "test_beyond_torsion.py"]),
    ("intake_allowable_rule", "intake", "engine/intake/_allowable_rule.py", [TI + "test_allowable_rule.py"]),
    ("intake_columns", "intake", "engine/intake/_columns.py", [TI + "test_columns.py", TI + "test_schema.py",
                                                              TI + "test_column_fast_paths.py"]),
    ("intake_loads", "intake", "engine/intake/_loads.py", [TI + "test_loads.py"]),
    ("intake_interface_inputs", "intake", "engine/intake/_interface_inputs.py",
     [TI + "test_interface_inputs.py", TI + "test_adhesive_names.py", TB + "test_sleeves_book.py",
      TE + "test_cells_sleeves.py", TI + "test_beyond_torsion.py", TI + "test_front_ends_agree.py"]),
    ("intake_plastic_inputs", "intake", "engine/intake/_plastic_inputs.py",
     [TI + "test_plastic_inputs.py", TB + "test_sleeves_book.py", TE + "test_cells_sleeves.py",
      TI + "test_front_ends_agree.py"]),
    ("intake_flag_words", "intake", "engine/intake/_flag_words.py",
     [TI + "test_flag_words.py", TI + "test_beyond_torsion.py", TB + "test_comments.py", TB + "test_backends.py",
      TE + "test_cells.py", "-k", "flag_words or beyond_torsion or test_comments or backends or layer_block_problems"]),
    ("intake_wording", "intake", "engine/intake/_wording.py",
     [TI + "test_wording.py", TI + "test_words.py", TB + "test_cautions.py", TE + "test_cells.py"]),
    ("intake_layup", "intake", "engine/intake/_layup.py", [TI + "test_layup.py"]),
    ("intake_wound_layers", "intake", "engine/intake/_wound_layers.py", [TI + "test_wound_layers.py", TI + "test_layup.py"]),
    ("intake_sizing_input", "intake", "engine/intake/_sizing_input.py",
     [TI + "test_sizing_input_book.py", TI + "test_sizing_input.py", TB + "test_sizing_book.py"]),
    ("intake_book", "intake", "engine/intake/_book.py", [TI + "test_book.py", TI + "test_beyond_torsion.py",
                                                        TB + "test_materials_rules.py", TI + "test_book_tables.py"]),
    ("intake_grid", "intake", "engine/intake/_grid.py", [TI + "test_grid.py", TI + "test_tables.py", TI + "test_columns.py",
                                                        TI + "test_column_fast_paths.py"]),
    ("intake_tables", "intake", "engine/intake/_tables.py", [TI + "test_tables.py"]),
    ("intake_table_checks", "intake", "engine/intake/_table_checks.py", [TI + "test_table_checks.py"]),
    ("intake_cellrefs", "intake", "engine/intake/_cellrefs.py", [TI + "test_cellrefs.py", TI + "test_duty.py"]),
    # units: the shared registry and its engineers' spellings
    ("units_kinds", "units", "engine/units/_kinds.py", [TE + "test_units_refusals.py", TE + "test_units_spellings.py", TE + "test_units.py", TE + "test_units_temperature.py",
                                                  TE + "test_units_values.py"]),
    ("units_spellings", "units", "engine/units/_spellings.py", [TE + "test_units_refusals.py", TE + "test_units_spellings.py", TE + "test_units.py", TE + "test_units_temperature.py",
                                                  TE + "test_units_values.py"]),
    ("units_grammar", "units", "engine/units/_grammar.py", [TE + "test_units_refusals.py", TE + "test_units_spellings.py", TE + "test_units.py", TE + "test_units_temperature.py",
                                                  TE + "test_units_values.py"]),
    ("units_factors", "units", "engine/units/_factors.py", [TE + "test_units_factors.py", TE + "test_units_spellings.py", TE + "test_units.py", TE + "test_units_temperature.py",
                                                  TE + "test_units_values.py"]),
    ("units_values", "units", "engine/units/_values.py", [TE + "test_units_spellings.py", TE + "test_units.py", TE + "test_units_temperature.py",
                                                  TE + "test_units_values.py"]),
    # the bridge paths: a duty read into torques, part-level findings placed on cells, comments
    ("bridge_duty", "bridge", "engine/intake/_duty.py", [TI + "test_duty.py"]),
    ("bridge_comments", "bridge", "workbook_bridge/sheets/_comments.py", [TB + "test_comments.py", TB + "test_comments_fill.py",
                                                                          TB + "test_rate_command.py"]),
]

# A first pass for targets whose full list is slow: one fast file that kills most mutants; then
# ``--again`` (without --fast) re-tests only the survivors against the full list, which gives the
# same result as the full list alone at a fraction of the time.
FAST_TESTS: dict[str, list[str]] = {
    "units_kinds": [TE + "test_units_refusals.py", TE + "test_units_spellings.py"],
    "units_spellings": [TE + "test_units_refusals.py", TE + "test_units_spellings.py"],
    "units_grammar": [TE + "test_units_refusals.py", TE + "test_units_spellings.py"],
    "units_values": [TE + "test_units_values.py"],
    "core_sizing": [TE + "test_sizing.py", "-k", "not (alone_equals or never_needs or never_gives)"],
    "core_sizing_geometry": [TE + "test_sizing.py", "-k", "not (alone_equals or never_needs or never_gives)"],
    "core_stock": [TE + "test_sizing.py", "-k", "not (alone_equals or never_needs or never_gives)"],
    "core_restoring": [TE + "test_sizing.py", "-k", "not (alone_equals or never_needs or never_gives)"],
}


def _equivalents() -> set[tuple[str, int, str]]:
    """(file, line, diff) listed as equivalent: table rows ``| `file` | line | `old` → `new` | reason |``."""
    if not EQUIVALENTS.exists():
        return set()
    found = set()
    # `new` may be empty (a line removed): ``| `f` | 15 | `/ @lru_cache(...)` → `` | reason |``.
    for m in re.finditer(r"^\|\s*`([^`]+)`\s*\|\s*(\d+)\s*\|\s*`(.+?)`\s*→\s*`(.*?)`\s*\|", EQUIVALENTS.read_text(),
                         re.MULTILINE):
        old, new = (g.replace("\\|", "|").strip() for g in (m.group(3), m.group(4)))  # markdown escapes | in tables
        found.add((m.group(1), int(m.group(2)), (old + " -> " + new).strip()))
    return found


def _diff(original: str, mutated: str) -> str:
    """The changed lines, stripped: "old -> new" (several lines joined by " / ")."""
    old, new = [], []
    for line in difflib.unified_diff(original.splitlines(), mutated.splitlines(), lineterm="", n=0):
        if line.startswith("-") and not line.startswith("---"):
            old.append(line[1:].strip())
        elif line.startswith("+") and not line.startswith("+++"):
            new.append(line[1:].strip())
    return " / ".join(old) + " -> " + " / ".join(new)


def _mutants(module: str, source: str, lines: tuple[int, int] | None) -> list:
    """mutmut's mutation ids for the module (its operators, our runner), optionally within lines."""
    from mutmut import Context, list_mutations

    ids = list_mutations(Context(source=source, filename=module))
    if lines is not None:
        ids = [m for m in ids if lines[0] <= m.line_number + 1 <= lines[1]]
    return ids


def _mutated(module: str, source: str, mutation_id) -> str:
    from mutmut import Context, mutate

    return mutate(Context(source=source, filename=module, mutation_id=mutation_id))[0]


def run_target(name: str, package: str, module: str, tests: list[str], lines: tuple[int, int] | None = None,
               again: bool = False, jobs: int = 1) -> dict:
    """Run every mutant of one module against its tests (see ``_mutant_runner``: forked children,
    the mutant in memory, the source tree untouched), `jobs` at a time.

    `lines` (first, last), 1-based: mutate only those lines (the result records the range).
    `again`: re-test only the mutants that survived the target's saved run (after new tests);
    the others keep their status. Needs the module's text unchanged since that run."""
    # a file, a node id (file::test) or pytest options such as "-k", "expr"
    tests = [t for t in tests if not t.endswith(".py") or (ROOT / t).exists()]
    source = (ROOT / module).read_text()
    saved = RESULTS / f"{name}.json"
    previous = json.loads(saved.read_text()) if again and saved.exists() else None
    if previous is not None and previous.get("source_sha") != _sha(source):
        print(f"== {name}: the module changed since its saved run; running every mutant", flush=True)
        previous = None
    print(f"== {name}: {module} against {' '.join(tests)}", flush=True)
    start = time.monotonic()
    runner = MutantRunner(ROOT, module, ["-x", "-q", "-p", "no:cacheprovider", "--no-header", "-W", "ignore",
                                         *tests])
    prepared = time.monotonic()
    if runner.run([None], 600)[0] != "survived":
        print("   the tests fail on the unmutated module: target skipped", flush=True)
        return {}
    baseline = time.monotonic() - prepared
    timeout = 3 * baseline * max(jobs, 1) + 10  # children side by side share the cores
    ids = _mutants(module, source, lines if previous is None else None)
    if previous is not None:
        wanted = {(s["line"], s["index"]) for s in previous["survivors"]}
        ids = [m for m in ids if (m.line_number + 1, m.index) in wanted]
    mutated = [_mutated(module, source, m) for m in ids]
    statuses = runner.run(mutated, timeout, jobs)
    survivors = [{"target": name, "file": module, "line": m.line_number + 1, "index": m.index,
                  "status": status, "diff": _diff(source, text)}
                 for m, text, status in zip(ids, mutated, statuses) if status == "survived"]
    total = previous["total"] if previous is not None else len(ids)
    scope = previous.get("lines") if previous is not None else (list(lines) if lines else None)
    result = {"target": name, "package": package, "module": module, "tests": tests, "total": total,
              "lines": scope, "source_sha": _sha(source), "date": time.strftime("%Y-%m-%d"),
              "survivors": survivors}
    RESULTS.mkdir(parents=True, exist_ok=True)
    saved.write_text(json.dumps(result, indent=1))
    print(f"   {total - len(survivors)}/{total} killed ({time.monotonic() - start:.0f} s, "
          f"baseline {baseline:.1f} s, {len(ids)} run)", flush=True)
    return result


def _sha(text: str) -> str:
    return hashlib.sha256(text.encode()).hexdigest()


def report() -> dict:
    equivalent = _equivalents()
    per_package: dict[str, list[int]] = {}
    left, stale, seen = [], [], set()
    for path in sorted(RESULTS.glob("*.json")):
        r = json.loads(path.read_text())
        alive = [s for s in r["survivors"] if (s["file"], s["line"], s["diff"].strip()) not in equivalent]
        killed_or_equivalent = r["total"] - len(alive)
        tally = per_package.setdefault(r["package"], [0, 0])
        tally[0] += killed_or_equivalent
        tally[1] += r["total"]
        scope = f" lines {r['lines'][0]}-{r['lines'][1]}" if r.get("lines") else ""
        module = ROOT / r["module"]
        if not module.exists() or r.get("source_sha") != _sha(module.read_text()):
            stale.append(r["target"])
            scope += "  STALE: the module changed since this run"
        print(f"{r['target']:<30} {killed_or_equivalent:>4}/{r['total']:<4} "
              f"{killed_or_equivalent / max(r['total'], 1):6.1%}  {r.get('date', '')}  ({r['module']}{scope})")
        left.extend(alive)
        seen.add(r["target"])
    not_run = [name for name, *_ in TARGETS if name not in seen]
    print()
    if stale:
        print(f"stale (re-run in full: their line numbers and mutants may have moved): {', '.join(stale)}")
    if not_run:
        print(f"not run yet: {', '.join(not_run)}")
    scores = {}
    for package in ("core", "intake", "units", "bridge"):
        k, n = per_package.get(package, (0, 0))
        scores[f"score_{package}"] = round(k / n, 4) if n else None
        print(f"{package:<8} {k}/{n} " + (f"{k / n:.1%}" if n else "not run"))
    print("\nsurviving mutants:" if left else "\nno surviving mutants")
    for s in left:
        print(f"  {s['file']}:{s['line']} [{s['status']}] {s['diff']}")
    scores["stale"], scores["not_run"] = stale, not_run
    scores["survivors"] = [{k: s[k] for k in ("target", "file", "line", "diff")} for s in left]
    return scores


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--only", action="append", default=[], help="run only targets whose name contains this")
    parser.add_argument("--report", action="store_true", help="only summarise the saved results")
    parser.add_argument("--lines", help="FIRST:LAST, mutate only these lines of each target run")
    parser.add_argument("--jobs", type=int, default=1, help="mutants run side by side (default 1)")
    parser.add_argument("--fast", action="store_true",
                        help="first pass with the target's fast list (FAST_TESTS); follow with --again")
    parser.add_argument("--again", action="store_true",
                        help="re-test only the mutants that survived the target's last run (after new tests)")
    args = parser.parse_args()
    try:
        import mutmut  # noqa: F401
    except ImportError:
        sys.exit("mutmut is not installed: pip install -e '.[mutation]'")
    if not args.report:
        names = {name for name, *_ in TARGETS}
        for name, package, module, tests in TARGETS:
            # a value that is a target's whole name picks that target alone ("core_rating", not "core_rating_flags")
            if args.only and not any(o == name or (o not in names and o in name) for o in args.only):
                continue
            lines = tuple(int(x) for x in args.lines.split(":")) if args.lines else None
            if args.fast:
                tests = FAST_TESTS.get(name, tests)
            run_target(name, package, module, tests, lines, again=args.again, jobs=args.jobs)
    print(json.dumps(report()))


if __name__ == "__main__":
    main()
