"""Print the hard-input corpus by class: how many cases, and what each class gets.

Run: ``python tests/bridge/_count_corpus.py``. Counts come from the test modules' own case lists
(the handwritten corpus, the generated classes' examples × parts per book, the book-level tests,
the unit spellings and the hostile files), so the table cannot drift from what the tests run.
"""

from __future__ import annotations

import importlib.util
import sys
from collections import Counter, defaultdict
from pathlib import Path

HERE = Path(__file__).resolve().parent


def _load(name: str):
    spec = importlib.util.spec_from_file_location(f"corpus_{name}", HERE / f"{name}.py")
    mod = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = mod
    spec.loader.exec_module(mod)
    return mod


_GETS = {
    "refused": "comment on the cell, part not rated, exit 1",
    "warned": "rated as the clean part, warning comment",
    "same": "read right: rated as the clean part",
    "rated": "rated (within tolerance), no error",
}


def main() -> None:
    bad = _load("test_bad_cells")
    spell = _load("test_unit_spellings_in_books")
    hostile = _load("test_cli_hostile")
    counts: Counter = Counter()
    gets: dict[str, Counter] = defaultdict(Counter)
    for case in bad.HANDWRITTEN:
        counts[case.cls] += 1
        gets[case.cls][_GETS[case.outcome] + (" [xfail: units.py wording]" if case.name in bad.XFAIL else "")] += 1
    for cls in bad.GENERATED_CLASSES:
        n = bad.EXAMPLES * bad.PER_BOOK
        counts[cls] += n
        gets[cls][_GETS["refused"] + " (hypothesis)"] += n
    book_level = {
        "duplicate id": (4, "every row with the id: comment naming the other row, not rated"),
        "merged": (1, "merge over two parts: comment on the visible cell, the covered part not rated"),
        "header unit": (6 + 1, "comment on the header; every part using the column not rated"),
        "text in number": (1, "pasted paragraph: refused, comment quotes its start only"),
        "empty": (1, "Kt alone in a layer slot: slot ignored, warning, part rated"),
    }
    for cls, (n, what) in book_level.items():
        counts[cls] += n
        gets[cls][what] += n
    counts["unit spelling (cell)"] += len(spell.READ_RIGHT) + len(spell.REFUSED) + len(spell.MATERIAL_SPELLINGS)
    gets["unit spelling (cell)"]["read right, equal to the canonical twin"] += len(spell.READ_RIGHT) + len(
        spell.MATERIAL_SPELLINGS)
    gets["unit spelling (cell)"]["refused with what to write instead"] += len(spell._CELL_REFUSED)
    gets["unit spelling (cell)"]["refused, advice missing [xfail: units.py]"] += len(spell.REFUSED) - len(
        spell._CELL_REFUSED)
    counts["unit spelling (header)"] += len(spell._HEADER_SPELLINGS) + len(spell.REFUSED)
    gets["unit spelling (header)"]["read right, equal to the canonical book"] += len(spell._HEADER_SPELLINGS)
    gets["unit spelling (header)"]["refused on the header with what to write"] += len(spell.REFUSED)
    counts["hostile file"] += len(hostile.UNUSABLE)
    gets["hostile file"]["one line on stderr, exit 2, nothing written"] += len(hostile.UNUSABLE)
    counts["kept package parts"] += 3
    gets["kept package parts"][".xlsm / external links / wide stray cell: rated, parts byte-identical"] += 3

    width = max(len(c) for c in counts) + 2
    print(f"{'class':<{width}}{'cases':>6}  what it gets")
    total = 0
    for cls in sorted(counts, key=lambda c: (-counts[c], c)):
        total += counts[cls]
        first = True
        for what, n in gets[cls].most_common():
            label = cls if first else ""
            shown = f"{counts[cls]:>6}" if first else " " * 6
            print(f"{label:<{width}}{shown}  {n} × {what}")
            first = False
    print(f"{'total':<{width}}{total:>6}")


if __name__ == "__main__":
    main()
