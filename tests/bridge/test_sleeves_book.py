"""Fitted and bonded sleeves and the plastic reserve through a whole book (`twistshare rate`).

Outside sources: same-material shrink fit on a solid shaft p = E·δ·(do² − d²)/(2·d·do²)
and slip torque (π/2)·μ·p·d²·L (Shigley's Mechanical Engineering Design, press and shrink
fits); the torque through the core crosses the interface as the sleeve's share GJ/ΣGJ (twist
compatibility, BRIEF §2); a solid round bar's fully plastic torque is 4/3 of its first-yield
torque (Timoshenko, Strength of Materials, elastic–perfectly plastic torsion). Expansion
coefficients of steel 11.7e-6/K and of a bronze 18e-6/K are typical values, from memory.
Parts and materials are invented (Marrowby Pump & Drive, BRIEF §4).
"""

from __future__ import annotations

import math

import openpyxl
import pytest
from twistshare.engine.cells import TWS_FIT_PRESSURE, TWS_SHARE, TWS_SLIP_TORQUE
from twistshare.workbook_bridge.commands import main

HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Load path", "Operating temperature [°C]",
        "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 1 inner diameter [mm]",
        "Layer 2 material", "Layer 2 outer diameter [mm]", "Layer 2 inner diameter [mm]",
        "Layer 2 interference [mm]", "Layer 2 fit length [mm]", "Layer 2 friction",
        "Layer 2 bond allowable [MPa]", "Layer 2 bond length [mm]"]
PARTS = {
    "MPD-S-101": [500, 300, None, None, "MPD steel", 40, None, "MPD steel", 60, 40, 0.02, 50, 0.12, None, None],
    "MPD-S-102": [500, 300, "every layer", None, "MPD steel", 40, None, "MPD steel", 60, 40, 0.02, 50, 0.12,
                  None, None],
    "MPD-S-103": [500, 300, None, 150, "MPD steel", 40, None, "MPD bronze", 60, 40, 0.02, 50, 0.12, None, None],
    "MPD-S-104": [500, 300, "sideways", None, "MPD steel", 40, None, "MPD steel", 60, 40, 0.02, 50, 0.12,
                  None, None],
    "MPD-S-105": [500, 300, None, None, "MPD steel", 40, None, "MPD steel", 60, 40, 0.02, 50, 2.5, None, None],
    "MPD-S-106": [500, 300, None, "hot", "MPD steel", 40, None, "MPD steel", 60, 40, 0.02, 50, 0.12, None, None],
    "MPD-S-107": [500, 300, None, None, "MPD steel", 40, None, None, None, None, None, None, None, None, None],
}
MATERIALS = [["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Yield strength [MPa]",
              "Allowable shear [MPa]", "Expansion coefficient [1/K]"],
             ["MPD steel", 79.6, 207, 0.3, 400, 200, 11.7e-6],
             ["MPD bronze", 40, 110, 0.34, 250, 100, 18e-6]]


@pytest.fixture(scope="module")
def rated(tmp_path_factory):
    folder = tmp_path_factory.mktemp("sleeves")
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Materials"
    for row in MATERIALS:
        ws.append(row)
    parts = wb.create_sheet("Parts")
    parts.append(HEAD)
    for pid, row in PARTS.items():
        parts.append([pid, *row])
    wb.save(folder / "book.xlsx")
    assert main(["rate", str(folder / "book.xlsx"), "-o", str(folder / "out.xlsx"), "-q", "--lenient"]) == 0
    out = openpyxl.load_workbook(folder / "out.xlsx")
    sheet = out["Twistshare results"]
    head = [c.value for c in sheet[1]]
    rows = {r[0]: dict(zip(head, r)) for r in sheet.iter_rows(min_row=2, values_only=True)}
    comments = {c.coordinate: c.comment.text for row in out["Parts"].iter_rows() for c in row if c.comment}
    return rows, comments


def test_book_and_cell_functions_agree_on_a_fitted_part(rated):
    rows, _ = rated
    row = rows["MPD-S-101"]
    e, d, do, delta, length, mu = 207e9, 0.04, 0.06, 0.02e-3, 0.05, 0.12
    p = e * delta * (do**2 - d**2) / (2 * d * do**2)  # Shigley's closed form
    slip = math.pi / 2 * mu * p * d**2 * length
    cell_p = TWS_FIT_PRESSURE("0.02 mm", "40 mm", "60 mm", "207 GPa", 0.3)
    cell_slip = TWS_SLIP_TORQUE(f"{cell_p!r} MPa", 0.12, "40 mm", "50 mm")
    share = TWS_SHARE([["Material", "Outer diameter [mm]", "Inner diameter [mm]"],
                       ["MPD steel", 40, None], ["MPD steel", 60, 40]],
                      None, MATERIALS)[-1][0]  # the sleeve (layer 2)
    assert cell_slip == pytest.approx(slip, rel=1e-9)
    assert row["Capacity: slip of a fit [N·m]"] == pytest.approx(cell_slip / share, rel=1e-9)
    assert row["Governing limit [N·m]"] == pytest.approx(cell_slip / share, rel=1e-9)
    assert row["Governs"].startswith("slip of the fit between layers 1 and 2")
    assert row["Load path"] == "through the core"


def test_every_layer_driven_has_no_interface_limit(rated):
    rows, _ = rated
    row = rows["MPD-S-102"]
    assert row["Capacity: slip of a fit [N·m]"] is None
    assert row["Governs"].startswith("layer")
    assert row["Load path"] == "every layer"


def test_contact_lost_at_temperature_is_warned(rated):
    # (αi − αo)·ΔT·d = (11.7 − 18)e-6 · 130 K · 40 mm = −0.033 mm: more than the 0.02 mm fit
    rows, comments = rated
    assert rows["MPD-S-103"]["Capacity: slip of a fit [N·m]"] == 0.0
    assert any("MPD-S-103" in text and "loses contact at the operating temperature" in text
               for text in comments.values())


@pytest.mark.parametrize("pid, cell, words", [
    ("MPD-S-104", "D5", "load path 'sideways' is not one of"),
    ("MPD-S-105", "N6", "friction coefficient of the fit: 2.5 is outside the plausible range"),
    ("MPD-S-106", "E7", "operating temperature"),
])
def test_bad_inputs_are_told_on_their_cells_and_the_part_is_not_rated(rated, pid, cell, words):
    rows, comments = rated
    assert rows[pid]["Status"] == "not rated"
    assert words in comments.get(cell, "")
    assert rows["MPD-S-107"]["Status"] == "ok"  # the others are rated


def test_plastic_reserve_of_a_solid_single_material_part_is_four_thirds(rated):
    rows, _ = rated
    row = rows["MPD-S-107"]
    assert row["Plastic reserve (fully plastic / first yield)"] == pytest.approx(4 / 3, rel=1e-12)
    # first yield of a solid bar π/2·τy·r³ with τy = Sy/√3 (distortion energy, textbook)
    assert row["First-yield torque [N·m]"] == pytest.approx(math.pi / 2 * 400e6 / math.sqrt(3) * 0.02**3,
                                                             rel=1e-12)


def test_readme_friction_guidance_is_the_engines():
    # one table of guidance (common practice): the README shows the engine's
    from pathlib import Path

    from twistshare.engine.core import FRICTION_GUIDANCE
    readme = (Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8")
    for guide in FRICTION_GUIDANCE:
        assert f"| {guide.surfaces} | {guide.low:.2f} to {guide.high:.2f} |" in readme
    start = readme.index("## Fitted and bonded sleeves, and the plastic reserve")
    assert readme.index("## Workbook format") < start < readme.index("## Commands")


def test_row_per_layer_table_and_the_outer_layer_path(tmp_path):
    # driven through the outer layer, the interface passes the core's share GJ_core/ΣGJ
    # (twist compatibility, BRIEF §2), so the slip capacity is the slip torque over that share
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Materials"
    for row in MATERIALS:
        ws.append(row)
    parts = wb.create_sheet("Parts")
    parts.append(["Part", "Length [mm]", "Torque [N·m]", "Load path"])
    parts.append(["MPD-S-201", 500, 300, "through the outer layer"])
    layers = wb.create_sheet("Layers")
    layers.append(["Part", "Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]",
                   "Interference [mm]", "Fit length [mm]", "Friction"])
    layers.append(["MPD-S-201", 1, "MPD steel", 40, None, None, None, None])
    layers.append(["MPD-S-201", 2, "MPD steel", 60, 40, 0.02, 50, 0.12])
    wb.save(tmp_path / "rows.xlsx")
    assert main(["rate", str(tmp_path / "rows.xlsx"), "-o", str(tmp_path / "out.xlsx"), "-q"]) == 0
    sheet = openpyxl.load_workbook(tmp_path / "out.xlsx")["Twistshare results"]
    head = [c.value for c in sheet[1]]
    row = dict(zip(head, next(sheet.iter_rows(min_row=2, values_only=True))))
    e, d, do = 207e9, 0.04, 0.06
    p = e * 0.02e-3 * (do**2 - d**2) / (2 * d * do**2)  # Shigley's closed form
    slip = math.pi / 2 * 0.12 * p * d**2 * 0.05
    core_share = d**4 / do**4  # same G
    assert row["Capacity: slip of a fit [N·m]"] == pytest.approx(slip / core_share, rel=1e-9)
    assert row["Load path"] == "through the outer layer"


def test_summary_draws_the_torque_twist_curve_of_the_charted_part(tmp_path):
    # elastic–perfectly plastic: the curve rises from the origin past first yield towards the
    # fully plastic torque, which it never exceeds (Timoshenko, Strength of Materials)
    import zipfile
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Materials"
    for row in MATERIALS:
        ws.append(row)
    parts = wb.create_sheet("Parts")
    parts.append(["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]"])
    parts.append(["MPD-S-301", 500, 300, "MPD steel", 40])
    wb.save(tmp_path / "one.xlsx")
    assert main(["rate", str(tmp_path / "one.xlsx"), "-o", str(tmp_path / "out.xlsx"), "-q"]) == 0
    rows = list(openpyxl.load_workbook(tmp_path / "out.xlsx")["Twistshare summary"].iter_rows(values_only=True))
    start = next(k for k, r in enumerate(rows) if isinstance(r[0], str) and r[0].startswith("Torque against twist"))
    torques = [r[1] for r in rows[start + 2:start + 27]]
    tau_y = 400e6 / math.sqrt(3)
    first, plastic = math.pi / 2 * tau_y * 0.02**3, 2 * math.pi / 3 * tau_y * 0.02**3
    assert torques[0] == 0.0 and torques == sorted(torques)
    assert first < torques[-1] < plastic
    with zipfile.ZipFile(tmp_path / "out.xlsx") as z:
        charts = [z.read(n).decode() for n in z.namelist() if n.startswith("xl/charts/chart")]
    assert any("Torque against twist" in c for c in charts)


def test_readme_adhesives_are_the_engines():
    # the README's table shows the library's figures (typical, from memory)
    from pathlib import Path

    from twistshare.engine.core import adhesive_library
    readme = (Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8")
    for a in adhesive_library().values():
        assert (f"| {a.name} | {a.typical_strength / 1e6:g} | {a.test} | {a.allowable / 1e6:.1f} | "
                f"{a.max_temperature - 273.15:g} | {a.notes} |") in readme
