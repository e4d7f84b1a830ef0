"""One intake, two front ends: the same part typed into a workbook table and into a cell function
gets the same answer — the same number, or a refusal by both.

Each case below is one part (with its own materials), good or bad, written in a unit system and
a layout. Every case is put into ONE book (a part and its materials each), rated once with
``twistshare rate``; the same part is then passed to ``TWS_GOVERNING_LIMIT`` and ``TWS_MARGIN`` as
a layer block (and a materials block) in the matching layout. The expected numbers of the good
cases come from the hand method written here (J = π/32·(Do⁴ − Di⁴), layer capacity
τa·ΣGJ/(G·ro·Kt), twist capacity φ·ΣGJ/L, the smallest governs — BRIEF §2, common practice);
1 in = 25.4 mm and 1 lbf·in = 0.112984829 N·m (NIST SP 811, exact from the inch and the
pound-force).

A case whose problem is a warning (the book rates it and says why beside the number) is refused
by a cell, which cannot show both — the caller's setting, not a second rule: there the test
checks that the book carries the same words on the part's cells.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import openpyxl
import pytest
from twistshare.engine.cells import TWS_GOVERNING_LIMIT, TWS_MARGIN
from twistshare.workbook_bridge.commands import main

IN = 0.0254          # m per inch (NIST SP 811)
LBF_IN = 0.112984829027616  # N·m per lbf·in (NIST SP 811: 4.4482216152605 N × 0.0254 m)
G_CORE, TAU_CORE = 80e9, 120e6      # invented demo materials (BRIEF §4)
G_SLEEVE, TAU_SLEEVE = 77e9, 100e6


@dataclass
class Case:
    """One part: layers as (material, outer, inner, Kt) in `unit`, its duty, its materials rows."""

    name: str
    layers: list[tuple]
    torque: object = "1200 N·m"
    length: object = "850 mm"
    twist: object = None
    unit: str = "mm"
    materials: list[tuple] = field(default_factory=list)  # (name, G [GPa], allowable [MPa], rule, FS, Sy, Su, keyway)
    expected: float | None = None        # governing limit, N·m; None: both refuse
    warning_words: str | None = None     # the book rates it with this warning; the cell refuses
    torque_refused: bool = False         # only the torque is refused: functions without it still answer


def _capacity(layers_si, length=None, twist=None):
    """Hand method (BRIEF §2): layers_si = [(G, tau, Do, Di, Kt)] in SI."""
    gj = [g * math.pi / 32 * (do**4 - di**4) for g, _, do, di, _ in layers_si]
    total = sum(gj)
    caps = [tau * total / (g * do / 2 * kt) for g, tau, do, _, kt in layers_si]
    if twist is not None:
        caps.append(twist * total / length)
    return min(caps)


def _mats(tag):
    return [(f"Core {tag}", 80, 120, "given", None, None, None, None),
            (f"Sleeve {tag}", 77, 100, "given", None, None, None, None)]


def _cases() -> list[Case]:
    two = [(G_CORE, TAU_CORE, 0.040, 0.0, 1.0), (G_SLEEVE, TAU_SLEEVE, 0.050, 0.040, 1.2)]
    cases = [
        Case("two layers in mm", [("Core {t}", 40, 0, None), ("Sleeve {t}", 50, 40, 1.2)], materials=_mats("{t}"),
             expected=_capacity(two)),
        Case("a twist limit governs", [("Core {t}", 40, 0, None), ("Sleeve {t}", 50, 40, 1.2)], twist="0.05 deg",
             materials=_mats("{t}"), expected=_capacity(two, 0.85, math.radians(0.05))),
        Case("inches and lbf·in", [("Core {t}", 1.5, 0, None), ("Sleeve {t}", 2.0, 1.5, None)], unit="in",
             torque="9000 lbf·in", length="30 in", materials=_mats("{t}"),
             expected=_capacity([(G_CORE, TAU_CORE, 1.5 * IN, 0.0, 1.0), (G_SLEEVE, TAU_SLEEVE, 2.0 * IN, 1.5 * IN, 1.0)])),
        # One rule, both sides (the disagreements the two readers used to have):
        Case("a G of 300 GPa is implausible", [("Core {t}", 40, 0, None)],
             materials=[("Core {t}", 300, 120, "given", None, None, None, None)]),
        Case("'mises' names distortion energy", [("Core {t}", 40, 0, None)],
             materials=[("Core {t}", 80, None, "mises", 2, 400, None, None)],
             expected=_capacity([(G_CORE, 400e6 / (math.sqrt(3) * 2), 0.040, 0.0, 1.0)])),
        Case("'with keyway' is a yes", [("Core {t}", 40, 0, None)],
             materials=[("Core {t}", 80, None, "shafting code", None, 300, 500, "with keyway")],
             expected=_capacity([(G_CORE, 0.75 * min(0.30 * 300e6, 0.18 * 500e6), 0.040, 0.0, 1.0)])),
        Case("a negative torque is refused", [("Core {t}", 40, 0, None)], torque="-1200 N·m",
             materials=_mats("{t}"), torque_refused=True),
        Case("material names match whatever the case", [("CORE {t}", 40, 0, None)], materials=_mats("{t}"),
             expected=_capacity([(G_CORE, TAU_CORE, 0.040, 0.0, 1.0)])),
        # A library steel named without a materials row: the shafting code rule with the library's
        # typical strengths (AISI 1045 hot rolled: Sy 310, Su 570 MPa, G 79.3 GPa — Shigley's,
        # from memory; min(0.30·Sy, 0.18·Su) = 93 MPa).
        Case("a library steel with no row", [("AISI 1045 hot rolled", 40, 0, None)],
             expected=_capacity([(79.3e9, 93e6, 0.040, 0.0, 1.0)])),
        Case("an unknown material", [("Unobtainium {t}", 40, 0, None)]),
        Case("layers that do not touch", [("Core {t}", 40, 0, None), ("Sleeve {t}", 50, 41, None)],
             materials=_mats("{t}")),
        Case("a diameter in the wrong dimension", [("Core {t}", "40 GPa", 0, None)], materials=_mats("{t}")),
        Case("a Kt below 1", [("Core {t}", 40, 0, 0.5)], materials=_mats("{t}")),
        # A warning: the shafting code rule ignores a factor of safety.
        Case("a factor of safety the rule ignores", [("Core {t}", 40, 0, None)],
             materials=[("Core {t}", 80, None, "shafting code", 2, 300, 500, None)],
             warning_words="the factor of safety is not used"),
    ]
    for i, case in enumerate(cases):
        tag = f"c{i}"
        case.layers = [(m.format(t=tag), *rest) for m, *rest in case.layers]
        case.materials = [(m.format(t=tag), *rest) for m, *rest in case.materials]
    return cases


CASES = _cases()
MATERIAL_HEADERS = ["Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule", "Factor of safety",
                    "Yield strength [MPa]", "Ultimate strength [MPa]", "Keyway"]


def _length_header(unit):
    return f"[{unit}]"


def _write_book(path: Path, layout: str) -> Path:
    """All cases as the parts of one book: a row per part (layer groups) or a Layers sheet."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Materials"
    ws.append(MATERIAL_HEADERS)
    for case in CASES:
        for row in case.materials:
            ws.append(list(row))
    parts = wb.create_sheet("Parts")
    max_layers = max(len(c.layers) for c in CASES)
    head = ["Part", "Length", "Torque", "Twist limit"]
    if layout == "per part":
        for n in range(1, max_layers + 1):
            head += [f"Layer {n} material", f"Layer {n} outer diameter", f"Layer {n} inner diameter", f"Layer {n} Kt"]
    parts.append(head)
    layers = wb.create_sheet("Layers") if layout == "per layer" else None
    if layers is not None:
        # "Bore" for the inner diameter: a spelling both front ends read
        layers.append(["Part", "Layer", "Material", "Outer diameter", "Bore", "Kt"])
    for i, case in enumerate(CASES):
        row = [f"P{i:02d}", case.length, case.torque, case.twist]
        for n, (material, outer, inner, kt) in enumerate(case.layers, start=1):
            cells = [material, _with_unit(outer, case.unit), _with_unit(inner, case.unit), kt]
            if layers is not None:
                layers.append([f"P{i:02d}", n, *cells])
            else:
                row += cells
        parts.append(row)
    wb.save(path)
    return path


def _with_unit(value, unit):
    """Every length written with its unit in the cell, so mm and in parts share one book."""
    return f"{value} {unit}" if isinstance(value, (int, float)) else value


def _block(case: Case, layout: str) -> list[list]:
    cells = [[m, _with_unit(o, case.unit), _with_unit(i, case.unit), kt] for m, o, i, kt in case.layers]
    if layout == "per layer":
        return [["Material", "Outer diameter", "Bore", "Kt"], *cells]
    header = []
    for n in range(1, len(case.layers) + 1):
        header += [f"Layer {n} material", f"Layer {n} outer diameter", f"Layer {n} inner diameter", f"Layer {n} Kt"]
    return [header, [c for layer in cells for c in layer]]


def _materials_block(case: Case):
    return [MATERIAL_HEADERS, *[list(r) for r in case.materials]] if case.materials else None


def _single(result):
    """A per-part block of one row spills one cell; a one-part per-layer block gives a value."""
    while isinstance(result, list):
        result = result[-1] if len(result) > 1 else result[0]
    return result


@pytest.fixture(scope="module", params=["per part", "per layer"])
def rated(request, tmp_path_factory):
    layout = request.param
    folder = tmp_path_factory.mktemp(layout.replace(" ", "_"))
    book = _write_book(folder / "corpus.xlsx", layout)
    out = folder / "rated.xlsx"
    assert main(["rate", str(book), "-o", str(out), "-q", "--lenient", "--units", "SI"]) == 0
    wb = openpyxl.load_workbook(out)
    results = wb["Twistshare results"]
    head = [c.value for c in results[1]]
    col = {h: k for k, h in enumerate(head)}
    by_part = {row[0]: row for row in results.iter_rows(min_row=2, values_only=True)}
    comments = {}
    for sheet in ("Parts", "Materials") + (("Layers",) if layout == "per layer" else ()):
        for row in wb[sheet].iter_rows():
            for cell in row:
                if cell.comment is not None:
                    comments.setdefault(sheet, []).append(cell.comment.text)
    return layout, by_part, col, comments


@pytest.mark.parametrize("index", range(len(CASES)), ids=[c.name for c in CASES])
def test_table_and_cell_give_the_same_answer(rated, index):
    layout, by_part, col, comments = rated
    case = CASES[index]
    row = by_part[f"P{index:02d}"]
    status = row[col["Status"]]
    book_limit = row[col["Governing limit [N·m]"]]
    block, materials = _block(case, layout), _materials_block(case)
    cell_limit = _single(TWS_GOVERNING_LIMIT(block, case.length, case.twist, None, "N·m", materials))
    cell_margin = _single(TWS_MARGIN(block, case.torque, case.length, case.twist, None, "%", materials))
    if case.warning_words is not None:
        # Rated in the book with the warning beside it; refused by the cell with the same words.
        assert status in ("ok", "FAILS") and isinstance(book_limit, float)
        assert any(case.warning_words in text for texts in comments.values() for text in texts)
        assert isinstance(cell_limit, str) and case.warning_words in cell_limit, cell_limit
        return
    if case.expected is None:
        assert status == "not rated", (case.name, status)
        if not case.torque_refused:
            assert isinstance(cell_limit, str) and cell_limit.startswith("⚠"), (case.name, cell_limit)
        assert isinstance(cell_margin, str) and cell_margin.startswith("⚠"), (case.name, cell_margin)
        return
    assert status in ("ok", "FAILS"), (case.name, status, row[col["First problem"]])
    assert book_limit == pytest.approx(case.expected, rel=1e-9)
    assert cell_limit == pytest.approx(case.expected, rel=1e-9)
    book_margin = row[col["Margin [%]"]]
    assert cell_margin == pytest.approx(book_margin, rel=1e-9)
