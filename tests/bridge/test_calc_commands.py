"""The ``twistshare`` commands for LibreOffice Calc (calc-setup, recalc) and the values-only copy
(``twistshare handout``) computing through LibreOffice what its own evaluator cannot.

The LibreOffice tests skip, with the reason, where ``soffice`` or its Python bridge is missing;
they share a few LibreOffice runs among their assertions. References: the engine core called
directly on the same parts, the workbook path (``twistshare rate``) on the same parts, the cell
functions called in Python on the same arguments (rel 1e-9), and the published closed forms
(BRIEF §2: T = P/ω; share = GᵢJᵢ/ΣGJ with J = π/32·(Dₒ⁴ − Dᵢ⁴), Roark's Formulas for Stress and
Strain, torsion of circular sections; φ = T·L/ΣGJ).
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import numpy as np
import openpyxl
import pytest
import test_calc_host
from _bookmaker import read_output
from openpyxl.worksheet.formula import ArrayFormula
from test_calc_host import (
    BLOCK_A,
    _close,
    _fake_profile,
    _sha,
    _standard,
    _tagged_processes,
    make_book,
    needs_office,
)
from twistshare.engine import cells
from twistshare.engine.core import Duty, LayerStack, rate
from twistshare.workbook_bridge.commands import main as twistshare
from twistshare.workbook_bridge.hosts.calc import _office

# The Calc host tests' fixture: a private cache folder (profile templates) and a tag on every process started.
office_env = test_calc_host.office_env

# Two invented Marrowby Pump & Drive parts, a steel core in a bronze sleeve: one rated at a
# torque, one at a power and speed. The same parts as a workbook (Materials, Parts) and as
# layer blocks on the sheet "Cells" that call every cell function.
STEEL, BRONZE = "MPD core steel C", "MPD bronze sleeve C"
G = {STEEL: 80e9, BRONZE: 41e9}
STEEL_TAU = 520e6 / (math.sqrt(3) * 2)  # distortion energy (von Mises): Sy/(√3·FS), FS 2, no keyway
TAU = {STEEL: STEEL_TAU, BRONZE: 45e6}
PARTS = [  # id, length mm, torque N·m or None, (power kW, speed rpm) or None, twist limit °, layers (od, id, Kt)
    ("MPD-C-201", 850.0, 900.0, None, 0.5, [(STEEL, 45.0, 0.0, 1.6), (BRONZE, 52.0, 45.0, 1.0)]),
    ("MPD-C-202", 720.0, None, (30.0, 1450.0), 0.4, [(STEEL, 50.0, 0.0, 1.8), (BRONZE, 56.0, 50.0, 1.0)]),
]
ALLOWABLE_CALL = '=TWS_ALLOWABLE("distortion energy","520 MPa",,2,"no","MPa")'
BAD_UNIT = '=TWS_TORQUE_FROM_POWER("30 GPa","1450 rpm")'
SLEEVE_CALLS = {
    "T1": '=TWS_FIT_PRESSURE("0.02 mm","40 mm","60 mm","207 GPa",0.3)',
    "T2": '=TWS_SLIP_TORQUE("28.75 MPa",0.12,"40 mm","50 mm")',
    "T3": '=TWS_BOND_STRESS("400 N·m","40 mm","30 mm")',
}


def _torque(part) -> float:
    _pid, _length, torque, power, _twist, _layers = part
    if torque is not None:
        return torque
    kw, rpm = power
    return kw * 1e3 / (rpm * 2 * math.pi / 60)  # T = P/ω (BRIEF §2)


def make_every_function_book(path: Path) -> Path:
    """The parts as tables (for ``twistshare rate``) and as cell-function calls (for LibreOffice)."""
    wb = openpyxl.Workbook()
    mats = wb.active
    mats.title = "Materials"
    mats.append(["Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule", "Yield strength [MPa]",
                 "Factor of safety", "Keyway"])
    mats.append([STEEL, 80, None, "distortion energy", 520, 2, "no"])
    mats.append([BRONZE, 41, 45, "given", None, None, None])
    parts = wb.create_sheet("Parts")
    head = ["Part", "Length [mm]", "Torque [N·m]", "Power [kW]", "Speed [rpm]", "Twist limit [deg]"]
    for n in (1, 2):
        head += [f"Layer {n} material", f"Layer {n} outer diameter [mm]", f"Layer {n} inner diameter [mm]",
                 f"Layer {n} Kt"]
    parts.append(head)
    for pid, length, torque, power, twist, layers in PARTS:
        row = [pid, length, torque, *(power or (None, None)), twist]
        for m, od, idd, kt in layers:
            row += [m, od, idd, kt]
        parts.append(row)
    ws = wb.create_sheet("Cells")
    for k, (pid, length, torque, power, twist, layers) in enumerate(PARTS):
        top = 1 + 8 * k  # the block's header row (1-based); its layers below it
        ws.cell(top, 1, pid)
        for c, h in enumerate(["G [GPa]", "Outer diameter [mm]", "Inner diameter [mm]", "Allowable shear [MPa]",
                               "Kt"], 1):
            ws.cell(top + 1, c, h)
        for j, (m, od, idd, kt) in enumerate(layers):
            r = top + 2 + j
            ws.cell(r, 1, G[m] / 1e9)
            ws.cell(r, 2, od)
            ws.cell(r, 3, idd)
            ws.cell(r, 4, ALLOWABLE_CALL if m == STEEL else TAU[m] / 1e6)  # one of our calls feeds another
            ws.cell(r, 5, kt)
        block = f"A{top + 1}:E{top + 3}"
        if torque is not None:
            t = f'"{torque:g} N·m"'
        else:  # the torque from the power, as a value and its unit in two cells
            ws.cell(top + 5, 1, f'=TWS_TORQUE_FROM_POWER("{power[0]:g} kW","{power[1]:g} rpm")')
            ws.cell(top + 5, 2, "N·m")
            t = f"A{top + 5}:B{top + 5}"
        span = f"{top + 1}:{{c}}{top + 3}"
        ws[f"G{top + 1}"] = ArrayFormula("G" + span.format(c="G"), f"=TWS_SHARE({block})")
        ws[f"H{top + 1}"] = ArrayFormula("H" + span.format(c="H"), f"=TWS_LAYER_CAPACITY({block})")
        ws[f"I{top + 1}"] = ArrayFormula("I" + span.format(c="I"), f"=TWS_STRESS({block},{t})")
        lim = f'"{length:g} mm","{twist:g}°"'
        ws[f"K{top + 1}"] = f"=TWS_GOVERNING_LIMIT({block},{lim})"
        ws[f"K{top + 2}"] = f"=TWS_GOVERNS({block},{lim})"
        ws[f"K{top + 3}"] = f'=TWS_MARGIN({block},{t},{lim},,"%")'
        ws[f"K{top + 4}"] = f'=TWS_TWIST_ANGLE({block},{t},"{length:g} mm")'
        ws[f"K{top + 5}"] = f'=TWS_TWIST_PER_LENGTH({block},{t},"°/m")'
        inner = layers[1][2] / 2
        ws[f"K{top + 6}"] = f'=TWS_STRESS_AT({block},{t},"{inner:g} mm",2)'  # layer 2 at its inner radius
        # sizing: the sleeve's outer diameter for a reserve factor of 1.2, its stock size, and the
        # bronze sleeve that restores the steel core turned down from the sleeve's diameter
        for col, formula in zip("MNO", _sizing_formulas(PARTS[k], block, t, lim)):
            if col == "O":
                ws[f"O{top + 2}"] = ArrayFormula(f"O{top + 2}:P{top + 2}", formula)
            else:
                ws[f"{col}{top + 2}"] = formula
    ws["M1"] = BAD_UNIT
    beyond = wb.create_sheet("Beyond")
    for row in BEYOND_BLOCK:
        beyond.append(row)
    for ref, formula in BEYOND_FORMULAS.items():
        beyond[ref] = ArrayFormula(f"{ref}:{ref[0]}2", formula) if ref.endswith("1") else formula
    # fits, bonds and the plastic reserve: single values, and a curve spilled as a table
    for cell, formula in SLEEVE_CALLS.items():
        ws[cell] = formula
    ws["P1"], ws["Q1"], ws["P2"], ws["Q2"] = "Material", "Outer diameter [mm]", STEEL, 40
    ws["T4"] = '=TWS_PLASTIC_TORQUE(P1:Q2,,,Materials!A1:G3)'
    ws["R1"] = ArrayFormula("R1:S4", '=TWS_TORQUE_TWIST(P1:Q2,,3,"rad/m",,Materials!A1:G3)')
    wb.save(path)
    return path


# Beyond torsion: a thin invented Marrowby line-shaft tube of a library steel (its E from the library).
BEYOND_BLOCK = [["Material", "Outer diameter [mm]", "Inner diameter [mm]"], ["AISI 1045 hot rolled", 100, 96]]
_PLY = ('"135 GPa"', '"10 GPa"', '"5 GPa"', "0.3", '"0.125 mm"', '"[±45]s"')
BEYOND_FORMULAS = {
    "E1": '=TWS_BENDING_STRESS(A1:C2,"500 N·m")',
    "F1": '=TWS_COMBINED_STRESS(A1:C2,"800 N·m","500 N·m")',
    "G2": '=TWS_CRITICAL_SPEED(A1:C2,"2000 mm")',
    "H2": '=TWS_BUCKLING_TORQUE(A1:C2,"2000 mm")',
    "I2": f"=TWS_LAMINATE_G({','.join(_PLY)})",
    "J2": f"=TWS_LAMINATE_E({','.join(_PLY)})",
}


def _beyond_in_python():
    """The same calls in Python, on the same arguments: cell -> value."""
    ply = ("135 GPa", "10 GPa", "5 GPa", 0.3, "0.125 mm", "[±45]s")
    return {"E2": cells.TWS_BENDING_STRESS(BEYOND_BLOCK, "500 N·m")[1][0],
            "F2": cells.TWS_COMBINED_STRESS(BEYOND_BLOCK, "800 N·m", "500 N·m")[1][0],
            "G2": cells.TWS_CRITICAL_SPEED(BEYOND_BLOCK, "2000 mm"),
            "H2": cells.TWS_BUCKLING_TORQUE(BEYOND_BLOCK, "2000 mm"),
            "I2": cells.TWS_LAMINATE_G(*ply), "J2": cells.TWS_LAMINATE_E(*ply)}


STOCK = "55; 60; 65; 70; 75; 80; 90; 100 mm"


def _sizing_formulas(part, block, t, lim):
    """TWS_SIZE_FOR, TWS_STOCK_SIZE and TWS_RESTORE_SLEEVE on the part, as the sheet calls them."""
    (_m1, _od1, _i1, _k1), (_m2, od2, id2, _k2) = part[5]
    return (f'=TWS_SIZE_FOR({block},{t},"layer 2 outer diameter",1.2,{lim})',
            f'=TWS_STOCK_SIZE({block},{t},"layer 2 outer diameter","{STOCK}",1.2,{lim})',
            f'=TWS_RESTORE_SLEEVE("{od2:g} mm",,"{STEEL}","{id2:g} mm","{BRONZE}",,,Materials!A1:G3)')


def _sizing_in_python(part):
    """The same three calls in Python, on the same arguments."""
    pid, length, torque, power, twist, layers = part
    block = [["G [GPa]", "Outer diameter [mm]", "Inner diameter [mm]", "Allowable shear [MPa]", "Kt"]]
    block += [[G[m] / 1e9, od, idd, TAU[m] / 1e6, kt] for m, od, idd, kt in layers]
    t = f"{torque:g} N·m" if torque is not None else [[_torque(part), "N·m"]]
    lim = (f"{length:g} mm", f"{twist:g}°")
    materials = [["Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule", "Yield strength [MPa]",
                  "Factor of safety", "Keyway"], [STEEL, 80, None, "distortion energy", 520, 2, "no"],
                 [BRONZE, 41, 45, "given", None, None, None]]
    od2, id2 = layers[1][1], layers[1][2]
    return (cells.TWS_SIZE_FOR(block, t, "layer 2 outer diameter", 1.2, *lim),
            cells.TWS_STOCK_SIZE(block, t, "layer 2 outer diameter", STOCK, 1.2, *lim),
            cells.TWS_RESTORE_SLEEVE(f"{od2:g} mm", None, STEEL, f"{id2:g} mm", BRONZE, materials=materials))


def _engine(part):
    """The engine core on the same part: (rating, torque N·m)."""
    _pid, length, _torque_given, _power, twist, layers = part
    torque = _torque(part)
    stack = LayerStack.from_layers(np.array([od for _m, od, _i, _k in layers]) * 1e-3,
                                   np.array([i for _m, _o, i, _k in layers]) * 1e-3,
                                   [G[m] for m, *_ in layers], [TAU[m] for m, *_ in layers],
                                   [k for *_x, k in layers])
    return rate(stack, Duty.from_arrays(torque=torque, length=length * 1e-3,
                                        twist_limit_angle=math.radians(twist))), torque


@pytest.fixture(scope="module")
def every_function(office_env, tmp_path_factory):
    """One LibreOffice run (``twistshare recalc``, default output name) and one ``twistshare rate``."""
    folder = tmp_path_factory.mktemp("every")
    book = make_every_function_book(folder / "marrowby-every-function.xlsx")
    before = _sha(book)
    code = twistshare(["recalc", str(book), "--timeout", "240"])
    out = folder / "marrowby-every-function-recalculated.xlsx"
    rated = folder / "rated.xlsx"
    rate_code = twistshare(["rate", str(book), "-o", str(rated), "-q"])
    return {"book": book, "before": before, "code": code, "out": out, "rate_code": rate_code,
            "values": openpyxl.load_workbook(out, data_only=True)["Cells"] if out.exists() else None,
            "results": {r["Part"]: r for r in read_output(rated).results}}


def test_the_book_calls_every_cell_function(tmp_path):
    """Adding a cell function without adding it here fails: the book must call every one."""
    wb = openpyxl.load_workbook(make_every_function_book(tmp_path / "b.xlsx"))
    formulas = " ".join(str(c.value.text if isinstance(c.value, ArrayFormula) else c.value)
                        for name in ("Cells", "Beyond") for row in wb[name].iter_rows() for c in row)
    assert set(re.findall(r"\b(TWS_[A-Z_]+)\(", formulas)) == {f.name for f in cells.registry()}


@needs_office
def test_recalculated_sleeve_functions_equal_the_closed_forms(every_function):
    # Shigley's same-material shrink fit p = E·δ·(do² − d²)/(2·d·do²); slip (π/2)·μ·p·d²·L; average
    # bond shear T/(2π·r²·L); a solid bar's fully plastic torque 2π/3·τy·r³ with τy = Sy/√3
    # (distortion energy, the default theory; Timoshenko, Strength of Materials)
    ws = every_function["values"]
    _close(ws["T1"].value, 207e9 * 0.02e-3 * (0.06**2 - 0.04**2) / (2 * 0.04 * 0.06**2) / 1e6)
    _close(ws["T2"].value, math.pi / 2 * 0.12 * 28.75e6 * 0.04**2 * 0.05)
    _close(ws["T3"].value, 400 / (2 * math.pi * 0.02**2 * 0.03) / 1e6)
    _close(ws["T4"].value, 2 * math.pi / 3 * 520e6 / math.sqrt(3) * 0.02**3)
    assert ws["R1"].value == "twist per length [rad/m]" and ws["R2"].value == 0
    assert 0 < ws["S3"].value < ws["S4"].value < ws["T4"].value


@needs_office
def test_recalculated_every_function_equals_the_engine_and_the_workbook_path(every_function):
    ws, results = every_function["values"], every_function["results"]
    assert every_function["rate_code"] == 0
    for k, part in enumerate(PARTS):
        top = 1 + 8 * k
        r, torque = _engine(part)
        got = results[part[0]]
        assert got["Status"] in ("ok", "FAILS")
        # Torque: LibreOffice's TWS_TORQUE_FROM_POWER, the engine's T = P/ω, the workbook's demand.
        _close(got["Demand torque [N·m]"], torque)
        if part[3] is not None:
            _close(ws[f"A{top + 5}"].value, torque)
        _close(ws[f"D{top + 2}"].value, STEEL_TAU / 1e6)  # TWS_ALLOWABLE, as the materials' rule gives it
        od = np.array([od for _m, od, _i, _k in part[5]]) * 1e-3
        idd = np.array([i for _m, _o, i, _k in part[5]]) * 1e-3
        gj = np.array([G[m] for m, *_ in part[5]]) * math.pi / 32 * (od**4 - idd**4)
        for j in range(2):
            n, row = j + 1, top + 2 + j
            share = gj[j] / gj.sum()  # GᵢJᵢ/ΣGJ (BRIEF §2)
            for want in (share, float(r.share[0, j]), got[f"L{n} share [%]"] / 100):
                _close(ws[f"G{row}"].value, want)
            for want in (float(r.capacity[0, j]), got[f"L{n} capacity (section torque) [N·m]"]):
                _close(ws[f"H{row}"].value, want)
            for want in (float(r.stress_outer[0, j]) / 1e6, got[f"L{n} nominal stress at outer [MPa]"]):
                _close(ws[f"I{row}"].value, want)
        _close(ws[f"K{top + 6}"].value, got["L2 nominal stress at inner [MPa]"])
        _close(ws[f"K{top + 6}"].value, float(r.stress_inner[0, 1]) / 1e6)
        for want in (float(r.governing_capacity[0]), got["Governing limit [N·m]"]):
            _close(ws[f"K{top + 1}"].value, want)
        assert got["Governs"].startswith(ws[f"K{top + 2}"].value.removesuffix(" limit"))
        for want in (100 * float(r.margin[0]), got["Margin [%]"]):
            _close(ws[f"K{top + 3}"].value, want)
        phi = torque * part[1] * 1e-3 / gj.sum()  # φ = T·L/ΣGJ (BRIEF §2)
        for want in (math.degrees(phi), math.degrees(float(r.twist_angle[0])), got["Twist angle [°]"]):
            _close(ws[f"K{top + 4}"].value, want)
        _close(ws[f"K{top + 5}"].value, got["Twist per length [°/m]"])
        # sizing: LibreOffice's calls equal the same calls in Python
        size, stock, restore = _sizing_in_python(part)
        assert isinstance(size, float) and isinstance(stock, float), (size, stock)
        _close(ws[f"M{top + 2}"].value, size)
        _close(ws[f"N{top + 2}"].value, stock)
        _close(ws[f"O{top + 2}"].value, restore[0][0])
        _close(ws[f"P{top + 2}"].value, restore[0][1])


@needs_office
def test_recalc_command_exit_code_message_and_the_book_untouched(every_function, office_env, capsys):
    assert every_function["code"] == 1  # written, with one cell showing our message
    assert _sha(every_function["book"]) == every_function["before"]
    shown = every_function["values"]["M1"].value
    assert shown == cells.TWS_TORQUE_FROM_POWER("30 GPa", "1450 rpm") and shown.startswith("⚠ power:")
    formulas = openpyxl.load_workbook(every_function["out"])["Cells"]
    assert formulas["M1"].value == BAD_UNIT  # formulas kept, values renewed
    assert not [p for p in every_function["out"].parent.iterdir() if p.name.endswith(".partial")]
    assert _tagged_processes(office_env) == []


@needs_office
def test_the_handout_of_a_recalculated_book_keeps_libreoffices_values(every_function, tmp_path):
    handout = tmp_path / "handout.xlsx"
    assert twistshare(["handout", str(every_function["out"]), "-o", str(handout), "-q"]) == 1  # the ⚠ cell
    got = openpyxl.load_workbook(handout, data_only=True)["Cells"]
    want = every_function["values"]
    checked = 0
    for row in want.iter_rows():
        for c in row:
            if isinstance(c.value, float):
                _close(got[c.coordinate].value, c.value)
                checked += 1
    assert checked >= 20
    assert got["K2"].value == want["K2"].value and isinstance(got["K2"].value, float)
    log = [r for r in openpyxl.load_workbook(handout)["Twistshare handout"].iter_rows(values_only=True)]
    assert any(r[1] == "K2" and r[4] == "the book's cached value" for r in log)


@needs_office
def test_recalc_lenient_and_timeout_exit_codes(office_env, tmp_path, capsys):
    wb = openpyxl.Workbook()
    wb.active["A1"] = BAD_UNIT
    wb.active["A2"] = '=TWS_TORQUE_FROM_POWER("15 kW","1450 rpm")'
    wb.save(tmp_path / "small.xlsx")
    out = tmp_path / "small-out.xlsx"
    assert twistshare(["recalc", str(tmp_path / "small.xlsx"), "-o", str(out), "--lenient", "-q"]) == 0
    printed = capsys.readouterr().out
    assert printed.count("\n") == 1 and "1 show a problem" in printed and str(out) in printed
    got = openpyxl.load_workbook(out, data_only=True).active
    _close(got["A2"].value, cells.TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm"))
    slow = tmp_path / "slow-out.xlsx"
    assert twistshare(["recalc", str(tmp_path / "small.xlsx"), "-o", str(slow), "--timeout", "0.5"]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "did not finish within 0.5 s" in err
    assert not slow.exists()
    assert _tagged_processes(office_env) == []


def test_calc_setup_command_into_a_profile_dir_is_idempotent_and_undone(tmp_path, capsys):
    profile = _fake_profile(tmp_path / "profile")
    before = _standard(profile)
    assert twistshare(["calc-setup", "--profile", str(profile)]) == 0
    said = capsys.readouterr().out
    assert said.startswith("twistshare: installed the cell functions")
    assert f"twistshare calc-setup --undo --profile {profile}" in said  # how to undo it
    assert "TwistshareCells" in said and "twistshare_calc.py" in said
    assert (profile / "user" / "basic" / "Standard" / "TwistshareCells.xba").is_file()
    written = {p: p.read_bytes() for p in (profile / "user").rglob("*") if p.is_file()}
    assert twistshare(["calc-setup", "--profile", str(profile)]) == 0
    assert "nothing changed" in capsys.readouterr().out
    assert {p: p.read_bytes() for p in (profile / "user").rglob("*") if p.is_file()} == written
    basic = (profile / "user" / "basic" / "Standard" / "TwistshareCells.xba").read_text()
    assert "twistshare calc-setup" in basic and "python -m" not in basic  # users are told the commands
    assert twistshare(["calc-setup", "--profile", str(profile), "--undo"]) == 0
    said = capsys.readouterr().out
    assert said.startswith("twistshare: removed") and f"twistshare calc-setup --profile {profile}" in said
    assert _standard(profile) == before
    assert twistshare(["calc-setup", "--profile", str(profile), "--undo"]) == 0
    assert "nothing to remove" in capsys.readouterr().out


def test_calc_setup_uses_your_own_profile_by_default(tmp_path, monkeypatch, capsys):
    monkeypatch.setattr("sys.platform", "linux")
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "config"))
    own = _fake_profile(tmp_path / "config" / "libreoffice" / "4")  # where LibreOffice keeps it on Linux
    assert twistshare(["calc-setup"]) == 0
    assert str(own) in capsys.readouterr().out
    assert (own / "user" / "basic" / "Standard" / "TwistshareCells.xba").is_file()
    assert twistshare(["calc-setup", "--undo"]) == 0
    assert not (own / "user" / "basic" / "Standard" / "TwistshareCells.xba").exists()


def _no_libreoffice(monkeypatch, tmp_path):
    """As on a computer without LibreOffice: the lookup finds no soffice anywhere."""
    monkeypatch.setenv("PATH", str(tmp_path / "empty-bin"))
    monkeypatch.delenv(_office.SOFFICE_ENV, raising=False)
    monkeypatch.setattr(_office, "_default_places", lambda: [])


def test_without_libreoffice_recalc_and_calc_setup_say_so_in_one_line(tmp_path, monkeypatch, capsys):
    _no_libreoffice(monkeypatch, tmp_path)
    book = make_book(tmp_path / "b.xlsx")
    before = _sha(book)
    assert twistshare(["recalc", str(book)]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.startswith("twistshare: LibreOffice is not installed")
    assert not (tmp_path / "b-recalculated.xlsx").exists() and _sha(book) == before
    # A profile LibreOffice has never used needs LibreOffice to create it.
    assert twistshare(["calc-setup", "--profile", str(tmp_path / "new-profile")]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.startswith("twistshare: LibreOffice is not installed")


def test_handout_without_libreoffice_names_what_it_could_not_compute(tmp_path, monkeypatch, capsys):
    _no_libreoffice(monkeypatch, tmp_path)
    book = make_book(tmp_path / "b.xlsx")
    out = tmp_path / "handout.xlsx"
    assert twistshare(["handout", str(book), "-o", str(out)]) == 1
    captured = capsys.readouterr()
    lines = captured.err.splitlines()
    assert len(lines) == 1 and "installing it" in lines[0] and "Cells!J12, Cells!J13" in lines[0]
    wb = openpyxl.load_workbook(out)
    ws = wb["Cells"]
    for ref in ("J12", "J13", "J14"):
        assert ws[ref].value.startswith("⚠ no value"), ref
        assert ref in captured.out
    assert "LibreOffice is not installed here" in ws["J12"].comment.text
    assert "header label 'share'" in ws["J14"].comment.text
    _close(ws["J1"].value, cells.TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm"))  # the evaluator's own work
    sheet = list(wb["Twistshare handout"].iter_rows(values_only=True))
    summary = next(r[0] for r in sheet if r[0] and str(r[0]).startswith("Not computed"))
    assert all(f"Cells!{ref}" in summary for ref in ("J12", "J13", "J14")) and "installing it" in summary
    log = {r[1]: r for r in sheet if r[0] == "Cells"}
    assert log["J12"][4].startswith("not computed") and log["J14"][4].startswith("not computed")


@needs_office
def test_handout_computes_through_libreoffice_what_its_evaluator_cannot(office_env, tmp_path, capsys):
    book = make_book(tmp_path / "b.xlsx")
    wb = openpyxl.load_workbook(book)
    wb["Cells"]["J18"] = "=J12*100"  # not ours: stays a formula
    wb["Cells"]["J19"] = '=TWS_STRESS_AT(A1:C3,"1200 N·m",J20,2)'  # reads a cell only LibreOffice computes
    wb["Cells"]["J20"] = '=TWS_STRESS_AT(A1:C3,"1200 N·m","24 mm",2)&""'
    wb.save(book)
    before = _sha(book)
    out = tmp_path / "handout.xlsx"
    assert twistshare(["handout", str(book), "-o", str(out)]) == 1  # J11's ⚠ message and J14's label
    captured = capsys.readouterr()
    assert captured.err == ""  # LibreOffice answered: nothing to install
    assert _sha(book) == before
    ws = openpyxl.load_workbook(out)["Cells"]
    share = cells.TWS_SHARE(BLOCK_A)
    _close(ws["J12"].value, share[1][0])  # INDEX(TWS_SHARE(...),2,1)
    _close(ws["J13"].value, cells.TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm", 1.5))  # H5*2 as an argument
    assert "computed by LibreOffice" in ws["J12"].comment.text
    assert ws["J11"].value == cells.TWS_TORQUE_FROM_POWER("15 GPa", "1450 rpm")
    # J20 is text (a number joined to ""), so J19's radius has no unit: our message, by LibreOffice.
    assert ws["J19"].value == cells.TWS_STRESS_AT(BLOCK_A, "1200 N·m", str(ws["J20"].value), 2)
    assert "computed by LibreOffice" in ws["J19"].comment.text
    assert ws["J14"].value.startswith("⚠ no value") and "no room to spill" in ws["J14"].comment.text
    assert "Cells!J14" in captured.out and "J12" not in captured.out.split("not computed:")[-1]
    sheet = list(openpyxl.load_workbook(out)["Twistshare handout"].iter_rows(values_only=True))
    summary = next(r[0] for r in sheet if r[0] and str(r[0]).startswith("Not computed"))
    assert summary.startswith("Not computed (1): Cells!J14")
    assert _tagged_processes(office_env) == []


@needs_office
def test_recalculated_functions_beyond_torsion_equal_the_python_calls(every_function):
    values = openpyxl.load_workbook(every_function["out"], data_only=True)["Beyond"]
    for ref, expected in _beyond_in_python().items():
        assert isinstance(expected, float), (ref, expected)
        assert values[ref].value == pytest.approx(expected, rel=1e-9), ref
