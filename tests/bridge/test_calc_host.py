"""The cell functions in LibreOffice Calc, and headless recalculation through it.

The LibreOffice tests skip, with the reason, where ``soffice`` or its Python bridge (``uno``) is
missing; CI installs libreoffice-calc, libreoffice-script-provider-python and python3-uno. They
share a few LibreOffice runs (about 2 s each here) among many assertions. The reference for a
value LibreOffice computes is the same cell function called in Python on the same arguments
(rel 1e-9), and for three of them the published closed form as well (BRIEF §2: T = P/ω,
share = GᵢJᵢ/ΣGJ with J = π/32·(Dₒ⁴ − Dᵢ⁴), φ = T·L/ΣGJ).
"""

from __future__ import annotations

import hashlib
import json
import math
import os
import re
import subprocess
import sys
import uuid
import zipfile
from pathlib import Path

import numpy as np
import openpyxl
import pytest
from openpyxl.worksheet.formula import ArrayFormula
from twistshare.engine import cells
from twistshare.workbook_bridge.hosts import calc as calc_host
from twistshare.workbook_bridge.hosts.calc import _office, _profile, _recalc
from twistshare.workbook_bridge.hosts.calc._basic import basic_source
from twistshare.workbook_bridge.hosts.calc._bridge import EngineLocation, bridge_source, engine_location
from twistshare.workbook_bridge.hosts.calc._feed import fill_left_out_arguments
from twistshare.workbook_bridge.hosts.calc._package_values import OfficeError, set_cached_values
from twistshare.workbook_bridge.hosts.calc._runtime import Runtime, from_calc, to_calc
from twistshare.workbook_bridge.hosts.calc._specs import _function_specs


def _office_or_reason():
    try:
        return _office.find_office(), ""
    except calc_host.LibreOfficeMissing as error:
        return None, str(error)


OFFICE, WHY_NOT = _office_or_reason()
needs_office = pytest.mark.skipif(OFFICE is None, reason=f"LibreOffice is not usable here: {WHY_NOT}")
TAG = "TWISTSHARE_TEST_TAG"

# Invented Marrowby Pump & Drive sleeve: a steel core (G 80 GPa) in a bronze sleeve (G 41 GPa).
BLOCK_A = [["G [GPa]", "Outer diameter [mm]", "Inner diameter [mm]"], [80.0, 45.0, 0.0], [41.0, 52.0, 45.0]]
BLOCK_B = [["G [GPa]", "Outer diameter [mm]", "Inner diameter [mm]", "Allowable shear [MPa]", "Kt"],
           [80.0, 45.0, 0.0, 140.0, 1.6], [41.0, 52.0, 45.0, 45.0, 1.0]]
FORMULAS = {
    "J1": '=TWS_TORQUE_FROM_POWER("15 kW","1450 rpm")',
    "J5": '=TWS_TWIST_ANGLE(A1:C3,"1200 N·m","850 mm")',
    "J6": '=TWS_GOVERNING_LIMIT(A6:E8,"850 mm","0.5°")',
    "J7": '=TWS_GOVERNS(A6:E8,"850 mm","0.5°")',
    "J8": '=TWS_ALLOWABLE("distortion energy","241 MPa",,2.5,"no")',
    "J9": '=TWS_STRESS_AT(A1:C3,"1200 N·m","24 mm",2)',
    "J10": '=TWS_MARGIN(A6:E8,"900 N·m","850 mm",,,"%")',
    "J11": '=TWS_TORQUE_FROM_POWER("15 GPa","1450 rpm")',
    "J12": "=INDEX(TWS_SHARE(A1:C3),2,1)",
    "J13": '=TWS_TORQUE_FROM_POWER(H1,"1450 rpm",H5*2)',
    "J14": "=TWS_SHARE(A1:C3)",
    "J15": '=TWS_TORQUE_FROM_POWER("30 kW","1450 rpm")',
    "J16": "=SUM(B2:B3)",
    "J17": '=_xludf.TWS_TWIST_PER_LENGTH(A1:C3,"1200 N·m")',
}
STALE = {"J15": "1", "J16": "0"}  # cached values that are wrong on purpose


def make_book(path: Path) -> Path:
    """Our test book: formulas without cached values, two with stale ones."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Cells"
    for r, row in enumerate(BLOCK_A, 1):
        for c, v in enumerate(row, 1):
            ws.cell(r, c, v)
    for r, row in enumerate(BLOCK_B, 6):
        for c, v in enumerate(row, 1):
            ws.cell(r, c, v)
    ws["H1"], ws["H5"] = "15 kW", 0.75
    for ref, formula in FORMULAS.items():
        ws[ref] = formula
    ws["K2"] = ArrayFormula("K2:K4", "=TWS_SHARE(A1:C3)")
    ws["L2"] = ArrayFormula("L2:L4", "=TWS_LAYER_CAPACITY(A6:E8)")
    ws["M2"] = ArrayFormula("M2:M4", '=TWS_STRESS(A1:C3,"1200 N·m")')
    other = wb.create_sheet("Other")
    other["A1"] = ArrayFormula("A1:A3", '=TWS_SHARE(Cells!A1:C3,"%")')
    wb.save(path)
    with zipfile.ZipFile(path) as zf:
        parts = {n: zf.read(n) for n in zf.namelist()}
    sheet = parts["xl/worksheets/sheet1.xml"].decode()
    for ref, cached in STALE.items():
        sheet, n = re.subn(rf'(<c r="{ref}"[^>]*><f>[^<]*</f>)<v\s*/>', rf"\g<1><v>{cached}</v>", sheet)
        assert n == 1, ref
    parts["xl/worksheets/sheet1.xml"] = sheet.encode()
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
        for name, data in parts.items():
            zf.writestr(name, data)
    return path


def _sha(path: Path) -> str:
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


def _tagged_processes(tag: str) -> list[int]:
    """Running (not zombie) processes whose environment carries the test's tag (Linux)."""
    found = []
    marker = f"{TAG}={tag}".encode()
    for entry in Path("/proc").iterdir():
        if not entry.name.isdigit() or int(entry.name) == os.getpid():
            continue
        try:
            stat = (entry / "stat").read_text()
            if stat[stat.rfind(")") + 2:].split()[0] == "Z":
                continue
            if marker in (entry / "environ").read_bytes().split(b"\0"):
                found.append(int(entry.name))
        except OSError:
            continue
    return found


@pytest.fixture(scope="module")
def office_env(tmp_path_factory):
    """A private cache folder (profile templates) and a tag that marks every process we start."""
    tag = uuid.uuid4().hex
    with pytest.MonkeyPatch.context() as mp:
        mp.setenv("XDG_CACHE_HOME", str(tmp_path_factory.mktemp("cache")))
        mp.setenv(TAG, tag)
        if sys.prefix != sys.base_prefix:  # as in a shell where this virtual environment is activated
            mp.setenv("PATH", str(Path(sys.executable).parent) + os.pathsep + os.environ.get("PATH", ""))
            mp.setenv("VIRTUAL_ENV", sys.prefix)
        yield tag


@pytest.fixture(scope="module")
def recalculated(office_env, tmp_path_factory):
    folder = tmp_path_factory.mktemp("recalc")
    book = make_book(folder / "marrowby-cells.xlsx")
    before = _sha(book)
    out = folder / "marrowby-cells-recalculated.xlsx"
    report = calc_host.recalculate(book, out, timeout=240)
    values = openpyxl.load_workbook(out, data_only=True)
    return book, before, out, report, values


def _close(got, want, rel=1e-9):
    assert isinstance(got, float), got
    assert got == pytest.approx(want, rel=rel), (got, want)


@needs_office
def test_recalculated_values_equal_the_python_calls(recalculated):
    _book, _before, _out, _report, wb = recalculated
    ws = wb["Cells"]
    # Reference: the same cell function called in Python on the same arguments (as xlwings passes them).
    _close(ws["J1"].value, cells.TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm"))
    for col, expected in (("K", cells.TWS_SHARE(BLOCK_A)), ("L", cells.TWS_LAYER_CAPACITY(BLOCK_B)),
                          ("M", cells.TWS_STRESS(BLOCK_A, "1200 N·m"))):
        assert ws[f"{col}2"].value == expected[0][0]  # the header the block's header row asks for
        for k in (1, 2):
            _close(ws[f"{col}{2 + k}"].value, expected[k][0])
    _close(ws["J5"].value, cells.TWS_TWIST_ANGLE(BLOCK_A, "1200 N·m", "850 mm"))
    _close(ws["J6"].value, cells.TWS_GOVERNING_LIMIT(BLOCK_B, "850 mm", "0.5°"))
    assert ws["J7"].value == cells.TWS_GOVERNS(BLOCK_B, "850 mm", "0.5°")
    _close(ws["J8"].value, cells.TWS_ALLOWABLE("distortion energy", "241 MPa", None, 2.5, "no"))
    _close(ws["J9"].value, cells.TWS_STRESS_AT(BLOCK_A, "1200 N·m", "24 mm", 2))
    _close(ws["J10"].value, cells.TWS_MARGIN(BLOCK_B, "900 N·m", "850 mm", None, None, "%"))
    _close(ws["J13"].value, cells.TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm", 1.5))
    _close(ws["J17"].value, cells.TWS_TWIST_PER_LENGTH(BLOCK_A, "1200 N·m"))  # Excel's _xludf. mark undone
    other = cells.TWS_SHARE(BLOCK_A, "%")
    assert wb["Other"]["A1"].value == other[0][0]
    _close(wb["Other"]["A2"].value, other[1][0])


@needs_office
def test_values_match_the_published_closed_forms(recalculated):
    ws = recalculated[4]["Cells"]
    omega = 1450 * 2 * math.pi / 60  # T = P/ω (BRIEF §2; T[N·m] ≈ 9549·P[kW]/n[rpm])
    _close(ws["J1"].value, 15e3 / omega)
    g = np.array([80e9, 41e9])
    j = math.pi / 32 * (np.array([45e-3, 52e-3]) ** 4 - np.array([0.0, 45e-3]) ** 4)
    share = g * j / np.sum(g * j)  # share = GᵢJᵢ/ΣGJ, J = π/32·(Dₒ⁴ − Dᵢ⁴) (BRIEF §2)
    _close(ws["K3"].value, share[0])
    _close(ws["K4"].value, share[1])
    _close(ws["J5"].value, math.degrees(1200 * 0.85 / np.sum(g * j)))  # φ = T·L/ΣGJ


@needs_office
def test_a_bad_unit_shows_our_message_and_libreoffice_ends(recalculated, office_env):
    _book, _before, out, report, wb = recalculated
    shown = wb["Cells"]["J11"].value
    assert shown == cells.TWS_TORQUE_FROM_POWER("15 GPa", "1450 rpm")
    assert shown.startswith("⚠ power:") and "GPa" in shown
    assert ("Cells", "J11", shown) in report.problems and len(report.problems) == 1
    assert _tagged_processes(office_env) == []  # soffice (and anything it started) is gone


@needs_office
def test_stale_cached_values_are_recomputed(recalculated):
    ws = recalculated[4]["Cells"]
    _close(ws["J15"].value, cells.TWS_TORQUE_FROM_POWER("30 kW", "1450 rpm"))  # was 1
    assert ws["J16"].value == 97  # =SUM(B2:B3) of 45 and 52; was 0


@needs_office
def test_the_copy_keeps_formulas_and_every_other_part_and_the_input_is_untouched(recalculated):
    book, before, out, report, _wb = recalculated
    assert _sha(book) == before
    formulas = openpyxl.load_workbook(out)["Cells"]
    assert formulas["J1"].value == FORMULAS["J1"]
    assert formulas["K2"].value.text == "=TWS_SHARE(A1:C3)"
    with zipfile.ZipFile(book) as a, zipfile.ZipFile(out) as b:
        assert a.namelist() == b.namelist()
        for name in a.namelist():
            if not name.startswith("xl/worksheets/"):
                assert a.read(name) == b.read(name), name
    # Every formula cell and every cell of the four array formulas: 14 + 4 x 3.
    assert report.formulas == len(FORMULAS) + 4 * 3
    assert not [p for p in out.parent.iterdir() if p.name.endswith(".partial")]


@needs_office
def test_computed_values_for_what_the_small_evaluator_cannot_do(recalculated):
    book = recalculated[0]
    got = calc_host.computed_values(book, {"Cells": ["J12", "J13", "J14", "J11", "$K$3"], "Nowhere": ["A1"]},
                                    timeout=240)
    share = cells.TWS_SHARE(BLOCK_A)
    _close(got.values[("Cells", "J12")], share[1][0])  # INDEX(TWS_SHARE(...),2,1)
    _close(got.values[("Cells", "J13")], cells.TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm", 1.5))  # H5*2
    assert got.values[("Cells", "J14")] == share[0][0]  # no room to spill: the first value
    _close(got.values[("Cells", "K3")], share[1][0])
    assert got.not_computed[("Cells", "J11")].startswith("⚠ power:")
    assert "no worksheet" in got.not_computed[("Nowhere", "A1")]
    assert set(got.not_computed) == {("Cells", "J11"), ("Nowhere", "A1")}


@needs_office
def test_the_sample_book_agrees_with_the_values_only_copy(office_env, tmp_path):
    """LibreOffice's values of the bundled sample equal those `twistshare share` computes itself."""
    from twistshare.workbook_bridge.commands import main as twistshare

    sample = Path(__file__).resolve().parents[2] / "sample_books" / "marrowby_cell_functions.xlsx"
    assert twistshare(["handout", str(sample), "-o", str(tmp_path / "shared.xlsx"), "-q"]) == 0
    shared = openpyxl.load_workbook(tmp_path / "shared.xlsx", data_only=True)
    got = calc_host.computed_values(sample, timeout=240)
    assert len(got.values) >= 20 and not got.not_computed
    for (sheet, ref), value in got.values.items():
        want = shared[sheet][ref].value
        if isinstance(want, float):
            _close(value, want)
        else:
            assert value == want, (sheet, ref)


@needs_office
def test_the_helper_process_gives_the_same_values_and_ends(office_env, tmp_path, monkeypatch):
    book = make_book(tmp_path / "helper.xlsx")
    trace = tmp_path / "engine.txt"
    monkeypatch.setenv("TWISTSHARE_CALC_ENGINE", "helper")  # as when LibreOffice's Python differs
    monkeypatch.setenv("TWISTSHARE_CALC_REPORT", str(trace))
    got = calc_host.computed_values(book, {"Cells": ["J1", "K3", "J11"]}, timeout=240)
    assert trace.read_text().split() == ["helper"]
    _close(got.values[("Cells", "J1")], cells.TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm"))
    _close(got.values[("Cells", "K3")], cells.TWS_SHARE(BLOCK_A)[1][0])
    assert got.values[("Cells", "J11")] == cells.TWS_TORQUE_FROM_POWER("15 GPa", "1450 rpm")
    assert _tagged_processes(office_env) == []  # the helper went with LibreOffice


@needs_office
def test_a_timeout_ends_libreoffice_and_writes_nothing(office_env, tmp_path):
    book = make_book(tmp_path / "slow.xlsx")
    out = tmp_path / "slow-out.xlsx"
    with pytest.raises(calc_host.LibreOfficeTimeout, match="did not finish within 0.5 s") as caught:
        calc_host.recalculate(book, out, timeout=0.5)
    assert isinstance(caught.value, TimeoutError)
    assert not out.exists()
    assert _tagged_processes(office_env) == []


def _add_user_module(profile: Path) -> None:
    """A user's own Basic function in Standard, as LibreOffice's Basic IDE stores it."""
    std = profile / "user" / "basic" / "Standard"
    (std / "MyShop.xba").write_text(
        '<?xml version="1.0" encoding="UTF-8"?>\n<!DOCTYPE script:module PUBLIC "-//OpenOffice.org//DTD '
        'OfficeDocument 1.0//EN" "module.dtd">\n<script:module xmlns:script="http://openoffice.org/2000/script" '
        'script:name="MyShop" script:language="StarBasic" script:moduleType="normal">Function MYSHOP_DOUBLE(x)\n'
        "    MYSHOP_DOUBLE = x * 2\nEnd Function\n</script:module>", encoding="utf-8")
    xlb = std / "script.xlb"
    text = xlb.read_text(encoding="utf-8")
    xlb.write_text(text.replace("</library:library>", ' <library:element library:name="MyShop"/>\n</library:library>'),
                   encoding="utf-8")


def _standard(profile: Path) -> dict[str, bytes]:
    std = profile / "user" / "basic" / "Standard"
    return {p.name: p.read_bytes() for p in sorted(std.iterdir())}


@needs_office
def test_setup_twice_then_undo_and_the_functions_work_in_a_book_opened_after_setup(office_env, tmp_path):
    profile = tmp_path / "my-profile"
    calc_host.setup_profile(profile, undo=True)  # nothing there yet: nothing to undo
    first = calc_host.setup_profile(profile)  # a new profile is started once, then set up
    assert first.changed and "undo --profile" in str(first)
    calc_host.setup_profile(profile, undo=True)
    _add_user_module(profile)
    original = _standard(profile)
    report = calc_host.setup_profile(profile)
    assert report.changed and any("TwistshareCells" in a for a in report.actions)
    installed = {p: p.read_bytes() for p in (profile / "user").rglob("*") if p.is_file()}
    again = calc_host.setup_profile(profile)
    assert not again.changed and "nothing changed" in str(again)
    assert {p: p.read_bytes() for p in (profile / "user").rglob("*") if p.is_file()} == installed

    # Interactive style: a book opened (headless) with this profile computes our functions and the user's.
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Sheet1"
    ws["A1"] = '=TWS_TORQUE_FROM_POWER("15 kW","1450 rpm")'
    ws["A2"] = "=MYSHOP_DOUBLE(21)"
    ws["A3"] = '=TWS_TORQUE_FROM_POWER("15 GPa","1450 rpm")'
    wb.save(tmp_path / "opened.xlsx")
    answer = _office.run_office(OFFICE, profile, tmp_path / "opened.xlsx", {"Sheet1": [(0, 0), (1, 0), (2, 0)]},
                                timeout=240, grace=30)
    got = {(r, c): v for r, c, v in answer["sheets"]["Sheet1"]["values"]}
    _close(got[(0, 0)], cells.TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm"))
    assert got[(1, 0)] == 42
    assert got[(2, 0)].startswith("⚠ power:")
    assert _tagged_processes(office_env) == []

    # The Python bridge gone: the Basic wrappers trap the error, say what to do, and LibreOffice still ends.
    (profile / "user" / "Scripts" / "python" / "twistshare_calc.py").unlink()
    answer = _office.run_office(OFFICE, profile, tmp_path / "opened.xlsx", {"Sheet1": [(0, 0)]}, timeout=240,
                                grace=30)
    shown = answer["sheets"]["Sheet1"]["values"][0][2]
    assert shown.startswith("⚠ TWS_TORQUE_FROM_POWER could not run in LibreOffice") and "setup again" in shown
    assert _tagged_processes(office_env) == []

    undone = calc_host.setup_profile(profile, undo=True)
    assert undone.changed
    assert _standard(profile) == original  # byte for byte, the user's module included
    assert not (profile / "user" / "Scripts").exists()  # setup made it, undo took it away
    assert not (profile / "user" / "twistshare-calc-host.json").exists()
    assert not calc_host.setup_profile(profile, undo=True).changed


def _fake_profile(root: Path) -> Path:
    """A started profile's Basic library, as LibreOffice 7.4 writes it (no LibreOffice needed)."""
    std = root / "user" / "basic" / "Standard"
    std.mkdir(parents=True)
    (std / "script.xlb").write_bytes(
        b'<?xml version="1.0" encoding="UTF-8"?>\n<!DOCTYPE library:library PUBLIC "-//OpenOffice.org//DTD '
        b'OfficeDocument 1.0//EN" "library.dtd">\n<library:library xmlns:library="http://openoffice.org/2000/library" '
        b'library:name="Standard" library:readonly="false" library:passwordprotected="false">\n'
        b' <library:element library:name="Module1"/>\n</library:library>')
    (std / "Module1.xba").write_bytes(b"<script:module>Sub Main\nEnd Sub</script:module>")
    (root / "user" / "Scripts").mkdir()  # the user's own folder: undo must leave it
    return root


def test_install_and_uninstall_touch_only_what_is_ours(tmp_path):
    profile = _fake_profile(tmp_path / "p")
    xlb = profile / "user" / "basic" / "Standard" / "script.xlb"
    xlb.chmod(0o640)
    before = _standard(profile)
    files = _profile.Installed.build()
    report = _profile.install(profile, files)
    assert (profile / "user" / "Scripts" / "python" / "twistshare_calc.py").read_text() == files.bridge_py
    assert not any("folder" in a and a.endswith("Scripts") for a in report.actions)
    assert not _profile.install(profile, files).changed
    _profile.uninstall(profile)
    assert _standard(profile) == before
    assert xlb.stat().st_mode & 0o777 == 0o640
    assert (profile / "user" / "Scripts").is_dir() and not (profile / "user" / "Scripts" / "python").exists()


def test_a_basic_module_of_our_name_that_is_not_ours_is_refused(tmp_path):
    profile = _fake_profile(tmp_path / "p")
    mine = profile / "user" / "basic" / "Standard" / "TwistshareCells.xba"
    mine.write_text("<script:module>REM my own notes</script:module>")
    with pytest.raises(calc_host.ProfileRefused, match="not written by twistshare"):
        _profile.install(profile, _profile.Installed.build())
    with pytest.raises(calc_host.ProfileRefused):
        _profile.uninstall(profile)
    assert mine.read_text() == "<script:module>REM my own notes</script:module>"


@pytest.mark.parametrize("platform, env, expected", [
    # Where LibreOffice keeps the user profile (its documented locations, from memory).
    ("linux", {"XDG_CONFIG_HOME": "/cfg"}, Path("/cfg/libreoffice/4")),
    ("linux", {}, Path("/home/ann/.config/libreoffice/4")),
    ("darwin", {}, Path("/home/ann/Library/Application Support/LibreOffice/4")),
    ("win32", {"APPDATA": "/appdata"}, Path("/appdata/LibreOffice/4")),
    ("win32", {}, Path("/home/ann/AppData/Roaming/LibreOffice/4")),
])
def test_default_profile_is_where_libreoffice_keeps_it(platform, env, expected):
    assert _profile.profile_folder_for(platform, env, Path("/home/ann")) == expected


def test_libreoffice_never_sees_a_virtual_environment_on_its_path(tmp_path, monkeypatch):
    venv = tmp_path / "venv"
    (venv / "bin").mkdir(parents=True)
    (venv / "pyvenv.cfg").write_text("home = /somewhere\n")
    (venv / "bin" / "python3").write_text("")
    monkeypatch.setenv("PATH", os.pathsep.join([str(venv / "bin"), "/usr/bin", "/bin"]))
    monkeypatch.setenv("VIRTUAL_ENV", str(venv))
    monkeypatch.setenv("PYTHONHOME", str(venv))
    env = _office.office_environment(_office.Office("/usr/bin/soffice", "/usr/bin/python3"), {"X": "1"})
    assert env["PATH"].split(os.pathsep) == ["/usr/bin", "/bin"]
    assert "VIRTUAL_ENV" not in env and "PYTHONHOME" not in env and env["X"] == "1"


def test_a_book_without_formulas_is_copied_without_libreoffice(tmp_path, monkeypatch):
    monkeypatch.setattr(_recalc, "find_office", lambda: pytest.fail("LibreOffice was started"))
    wb = openpyxl.Workbook()
    wb.active["A1"] = "MPD-S-014"
    wb.save(tmp_path / "plain.xlsx")
    report = calc_host.recalculate(tmp_path / "plain.xlsx", tmp_path / "copy.xlsx")
    assert report.formulas == 0 and not report.problems
    with zipfile.ZipFile(tmp_path / "plain.xlsx") as a, zipfile.ZipFile(tmp_path / "copy.xlsx") as b:
        assert {n: a.read(n) for n in a.namelist()} == {n: b.read(n) for n in b.namelist()}
    with pytest.raises(calc_host.BookRefused, match="is the input workbook"):
        calc_host.recalculate(tmp_path / "plain.xlsx", tmp_path / "plain.xlsx")


def test_libreoffice_without_its_python_scripting_is_refused_by_name(tmp_path, monkeypatch):
    # a soffice with no pythonscript.py beside it (Debian's libreoffice-calc without
    # libreoffice-script-provider-python): every cell function would fail at its first call
    program = tmp_path / "program"
    program.mkdir()
    soffice = program / "soffice"
    soffice.write_text("#!/bin/sh\n")
    monkeypatch.setenv(_office.SOFFICE_ENV, str(soffice))
    with pytest.raises(calc_host.LibreOfficeMissing) as error:
        _office.find_office()
    assert str(error.value) == (f"LibreOffice's Python scripting was not found beside {soffice} (no pythonscript.py); "
                                "install it (Debian, Ubuntu: libreoffice-script-provider-python)")
    (program / "pythonscript.py").write_text("")  # with it, the search goes on to the uno Python
    assert _office._has_python_scripting(str(soffice))


def test_missing_libreoffice_is_one_clear_line(tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("PATH", str(tmp_path))
    monkeypatch.delenv(_office.SOFFICE_ENV, raising=False)
    monkeypatch.setattr(_office, "_default_places", lambda: [])
    book = make_book(tmp_path / "b.xlsx")
    with pytest.raises(calc_host.LibreOfficeMissing, match=r"^LibreOffice is not installed \(no soffice found"):
        calc_host.recalculate(book, tmp_path / "o.xlsx")
    from twistshare.workbook_bridge.commands import main as twistshare

    assert twistshare(["recalc", str(book)]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.startswith("twistshare: LibreOffice is not installed")
    assert not (tmp_path / "b-recalculated.xlsx").exists()


def test_the_generated_modules_follow_the_function_list(monkeypatch):
    from twistshare.engine.cells import _functions
    from twistshare.engine.cells._arguments import read_field
    from twistshare.engine.cells._registry import Argument, cell_function
    from twistshare.engine.intake import field_by_key

    @cell_function("Twice a length, for this test only", Argument("size", "A length", unit="length: mm"),
                   Argument("result_unit", "Unit of the result", unit="length: mm"), returns="a length",
                   shape="one value")
    def TWS_TEST_TWICE(size, result_unit=None):
        return 2 * read_field(size, field_by_key("length"), "size") / 1e-3

    # Adding a function to the engine: declared among the cell functions, so the registry lists it.
    monkeypatch.setattr(_functions, "TWS_TEST_TWICE", TWS_TEST_TWICE, raising=False)
    monkeypatch.setattr(_functions, "__all__", [*_functions.__all__, "TWS_TEST_TWICE"])
    assert "TWS_TEST_TWICE" in [f["name"] for f in cells.list_functions()]
    specs = _function_specs()
    source = basic_source(specs)
    bridge = bridge_source(specs, engine_location())
    for entry in cells.list_functions():
        params = ", ".join(f"Optional {a['name']}" for a in entry["arguments"])
        assert f"Function {entry['name']}({params})\n" in source
        assert f"REM   {entry['description']}\n" in source
        for a in entry["arguments"]:
            assert f"REM   {a['name']}{' (optional)' if a['optional'] else ''}" in source
        assert f"{entry['name']!r}: {tuple(a['name'] for a in entry['arguments'])!r}" in bridge
    assert Runtime(specs).call("TWS_TEST_TWICE", ["21 mm"]) == 42.0


def test_values_from_calc_take_the_shapes_xlwings_gives():
    assert from_calc(((1, "52 mm", None), ("x", 2.5, 1)), block=True) == [[1.0, "52 mm", None], ["x", 2.5, 1.0]]
    assert from_calc(7, block=True) == [[7.0]]
    assert from_calc((("52 mm",),), block=False) == "52 mm"
    assert from_calc((("a", "b"),), block=False) == ["a", "b"]
    assert from_calc((("a",), ("b",)), block=False) == ["a", "b"]
    assert to_calc([[0.5], [float("nan")], [None]]) == ((0.5,), ("⚠ not computed",), ("",))
    assert to_calc([1.0, 2.0]) == ((1.0, 2.0),)
    assert to_calc([[1.0], ["a", "b"]]) == ((1.0, ""), ("a", "b"))
    runtime = Runtime()
    # Calc hands a left-out middle argument over as 0: it means "not given" where 0 cannot be valid ...
    assert runtime.call("TWS_SHARE", [tuple(map(tuple, BLOCK_A)), 0, 0]) == to_calc(cells.TWS_SHARE(BLOCK_A))
    # ... and stays 0 where the engine has something to say about it.
    assert runtime.call("TWS_TORQUE_FROM_POWER", ["15 kW", "1450 rpm", 0]) == cells.TWS_TORQUE_FROM_POWER(
        "15 kW", "1450 rpm", 0.0)
    assert runtime.call("TWS_NOPE", []).startswith("⚠ TWS_NOPE is not a twistshare cell function")


@pytest.mark.parametrize("formula, expected", [
    ("TWS_SHARE(B5:F8,,B11:H12)", 'TWS_SHARE(B5:F8,"",B11:H12)'),
    ("_xludf.TWS_SHARE(B5:F8;;B11:H12)", 'TWS_SHARE(B5:F8;"";B11:H12)'),
    ('TWS_STRESS_AT(A1:C3,B2,"2,,4",,)', 'TWS_STRESS_AT(A1:C3,B2,"2,,4","","")'),
    ("SUM(A1,,B2)+TWS_SHARE(A1, )", 'SUM(A1,,B2)+TWS_SHARE(A1, "")'),
    ("TWS_SHARE('Old, kept'!A1:C3,,X)", "TWS_SHARE('Old, kept'!A1:C3,\"\",X)"),
    ("INDEX(TWS_SHARE(A1:C3),2)", "INDEX(TWS_SHARE(A1:C3),2)"),
    ("TWS_SHARE()", "TWS_SHARE()"),
])
def test_left_out_arguments_of_our_calls_become_empty_text(formula, expected):
    assert fill_left_out_arguments(formula, ["TWS_SHARE", "TWS_STRESS_AT"]) == expected


def test_cached_values_are_set_with_the_formulas_kept():
    sheet = ('<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>'
             '<row r="1"><c r="A1" s="2" t="str"><f>TWS_X()</f><v>old</v></c>'
             '<c r="B1"><f t="array" ref="B1:B2">TWS_Y()</f><v/></c></row></sheetData></worksheet>')
    text = set_cached_values(sheet, {(0, 0): 2.5, (0, 1): "share", (1, 1): OfficeError(519)})
    assert '<c r="A1" s="2"><f>TWS_X()</f><v>2.5</v></c>' in text
    assert '<c r="B1" t="str"><f t="array" ref="B1:B2">TWS_Y()</f><v>share</v></c>' in text
    assert '<row r="2"><c r="B2" t="e"><v>#VALUE!</v></c></row>' in text


SYSTEM_PYTHON = "/usr/bin/python3"


@pytest.mark.skipif(not Path(SYSTEM_PYTHON).is_file(), reason="no system Python to play LibreOffice's part")
@pytest.mark.parametrize("mode, soabi, expected_how", [
    ("in-process", None, "in-process"),
    ("helper", None, "helper"),
    ("auto", "cpython-39-x86_64-linux-gnu", "helper"),  # another minor version: the fallback
])
def test_the_bridge_module_reaches_the_engine_from_another_python(tmp_path, mode, soabi, expected_how):
    """The generated bridge, run by the system Python (as LibreOffice runs it), gives the engine's answers."""
    probe = subprocess.run([SYSTEM_PYTHON, "-c", "import sysconfig; print(sysconfig.get_config_var('SOABI'))"],
                           capture_output=True, text=True)
    here = engine_location()
    if mode == "in-process" and probe.stdout.strip() != here.soabi:
        pytest.skip("the system Python is not the engine's build: in-process cannot apply")
    engine = EngineLocation(here.python, here.site_dirs, soabi or here.soabi)
    (tmp_path / "twistshare_calc.py").write_text(bridge_source(_function_specs(), engine), encoding="utf-8")
    script = ("import json, sys; sys.path.insert(0, sys.argv[1]); import twistshare_calc as b; "
              "print(json.dumps([b.call('TWS_SHARE', (tuple(map(tuple, json.loads(sys.argv[2]))), None, None)), "
              "b.call('TWS_TORQUE_FROM_POWER', ('15 GPa', '1450 rpm')), b.engine().how]))")
    env = {k: v for k, v in os.environ.items() if not k.startswith("PYTHON")}
    env["TWISTSHARE_CALC_ENGINE"] = mode
    run = subprocess.run([SYSTEM_PYTHON, "-c", script, str(tmp_path), json.dumps(BLOCK_A)], capture_output=True,
                         text=True, env=env, timeout=120)
    assert run.returncode == 0, run.stderr
    share, bad, how = json.loads(run.stdout)
    assert how == expected_how
    assert share == [list(r) for r in to_calc(cells.TWS_SHARE(BLOCK_A))]
    assert bad == cells.TWS_TORQUE_FROM_POWER("15 GPa", "1450 rpm")
