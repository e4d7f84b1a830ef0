"""Unit spellings engineers type, through the whole workbook pipeline: read right, or refused with advice.

Each accepted spelling is typed into a cell (``"37 lbf·ft"``) and, separately, into a column
header; the part must rate exactly like the same part typed in the canonical unit of the
convention (N·m, mm, deg, rpm, kW, GPa/MPa), the canonical value computed here from the exact
definitions of the units, not from pint:

  inch = 0.0254 m, foot = 0.3048 m, pound-force = 4.4482216152605 N, kilogram-force = 9.80665 N,
  horsepower (550 ft·lbf/s) = 745.69987158227022 W, metric horsepower = 735.49875 W,
  psi = 6894.757293168 Pa — NIST Special Publication 811 (2008), Appendix B;
  degree = π/180 rad, revolution = 2π rad, arcminute = 1/60 degree — SI Brochure, 9th ed., Table 8.

Refused spellings must get a comment saying what to write instead (units.py's advice).
"""

from __future__ import annotations

import math
from pathlib import Path

import _bookmaker
import pytest
from twistshare.workbook_bridge.commands import main

bm = _bookmaker  # the book builder shared by the bad-input tests (tests/bridge on pythonpath)
Case = bm.Case

IN, FT, LBF, KGF = 0.0254, 0.3048, 4.4482216152605, 9.80665  # NIST SP 811, Appendix B
HP, PS, PSI = 745.69987158227022, 735.49875, 6894.757293168  # NIST SP 811, Appendix B
DEG, REV = math.pi / 180, 2 * math.pi  # SI Brochure, Table 8

# (column key, spelling, factor to the column's canonical unit: N·m, mm, deg, rpm, kW)
READ_RIGHT = [
    ("torque", "N·m", 1.0), ("torque", "N m", 1.0), ("torque", "Nm", 1.0), ("torque", "N-m", 1.0),
    ("torque", "N.m", 1.0), ("torque", "N*m", 1.0), ("torque", "N⋅m", 1.0), ("torque", "kN·m", 1e3),
    ("torque", "kN-m", 1e3), ("torque", "kNm", 1e3), ("torque", "KNm", 1e3), ("torque", "kN m", 1e3),
    ("torque", "N·mm", 1e-3), ("torque", "Nmm", 1e-3), ("torque", "N·cm", 1e-2), ("torque", "daNm", 10.0),
    ("torque", "lbf·in", LBF * IN), ("torque", "lbf-in", LBF * IN), ("torque", "lbf in", LBF * IN),
    ("torque", "in-lbf", LBF * IN), ("torque", "lbf·ft", LBF * FT), ("torque", "lbf-ft", LBF * FT),
    ("torque", "ft-lbf", LBF * FT), ("torque", "ft·lbf", LBF * FT), ("torque", "kip·ft", 1e3 * LBF * FT),
    ("torque", "kgf·m", KGF),
    ("length", "mm", 1.0), ("length", "MM", 1.0), ("length", "millimetre", 1.0), ("length", "cm", 10.0),
    ("length", "m", 1e3), ("length", "in", IN * 1e3), ("length", "inch", IN * 1e3),
    ("length", "inches", IN * 1e3), ("length", "ft", FT * 1e3),
    ("od1", "µm", 1e-3), ("od1", "μm", 1e-3), ("od1", "um", 1e-3), ("od1", "thou", IN),
    ("od1", "in", IN * 1e3),
    ("twist", "°", 1.0), ("twist", "deg", 1.0), ("twist", "degrees", 1.0), ("twist", "DEG", 1.0),
    ("twist", "rad", 1 / DEG), ("twist", "arcmin", 1 / 60), ("twist", "rev", REV / DEG),
    ("speed", "rpm", 1.0), ("speed", "RPM", 1.0), ("speed", "r/min", 1.0), ("speed", "rev/min", 1.0),
    ("speed", "U/min", 1.0), ("speed", "rps", 60.0), ("speed", "rev/s", 60.0),
    ("speed", "rad/s", 60 / REV), ("speed", "deg/s", 60 / 360),
    ("power", "kW", 1.0), ("power", "KW", 1.0), ("power", "kw", 1.0), ("power", "W", 1e-3),
    ("power", "hp", HP / 1e3), ("power", "HP", HP / 1e3), ("power", "PS", PS / 1e3),
]

# (column key, spelling, words the comment must hold: what was found and what to write)
REFUSED = [
    ("torque", "lb-in", ("lb-in", "lbf·in")), ("torque", "lb-ft", ("lb-ft", "lbf·ft")),
    ("torque", "in-lb", ("in-lb", "lbf·in")), ("torque", "ft-lb", ("ft-lb", "lbf·ft")),
    ("torque", "lb·in", ("lb·in", "lbf")), ("torque", "J", ("'J'", "N·m")), ("torque", "N", ("'N'", "a torque")),
    ("length", "mil", ("mil", "thou")), ("length", "mils", ("mils", "thou")), ("od1", '"', ('"', "'in'")),
    ("twist", "%", ("%", "°")), ("speed", "Hz", ("Hz", "rpm")), ("speed", "1/s", ("1/s", "rpm")),
    ("speed", "min^-1", ("min^-1", "rpm")), ("power", "kWh", ("kWh", "a power")),
]

_CANONICAL = {"torque": 500.0, "length": 400.0, "od1": 45.0, "twist": 0.25, "speed": 1450.0, "power": 60.0}
_LABEL = {"torque": "Torque", "length": "Length", "od1": "Layer 1 outer diameter", "twist": "Twist limit",
          "speed": "Speed", "power": "Power"}
_COMPARED_OUT = ("Part", "Demand from")


def _cells(key: str, value: object) -> dict[str, object]:
    """One part's inputs: fixed geometry, and the column under test set to ``value``."""
    cells: dict[str, object] = {"length": 400.0, "torque": 500.0, "twist": 0.25, "od1": 45.0, "id2": 45.0,
                                "od2": 53.0}
    if key in ("speed", "power"):
        cells.update(torque=None, power=60.0, speed=1450.0)
    cells[key] = value
    return cells


def _number(x: float) -> str:
    return repr(float(f"{x:.9g}"))


def _run(path: Path):
    out = path.with_name(path.stem + "-rated.xlsx")
    code = main(["rate", str(path), "-o", str(out), "-q"])
    return code, bm.read_output(out)


def _close(a: dict, b: dict) -> list[str]:
    bad = []
    for k in a:
        if k in _COMPARED_OUT:
            continue
        x, y = a[k], b[k]
        if isinstance(x, float) and isinstance(y, float):
            if not math.isclose(x, y, rel_tol=1e-9, abs_tol=1e-12):
                bad.append(f"{k}: {x} != {y}")
        elif x != y:
            bad.append(f"{k}: {x!r} != {y!r}")
    return bad


@pytest.fixture(scope="module")
def cell_book(tmp_path_factory):
    """One book: for every accepted spelling, a part typed in it and a twin typed canonically."""
    placed = {}
    for k, (key, unit, factor) in enumerate(READ_RIGHT):
        x = _CANONICAL[key] / factor
        shown = _number(x)
        placed[2 * k] = Case(f"{key} {unit}", "spelling", _cells(key, f"{shown} {unit}"), outcome="same")
        placed[2 * k + 1] = Case(f"{key} {unit} canonical", "spelling", _cells(key, float(shown) * factor),
                                 outcome="same")
    path = bm.build_book(tmp_path_factory.mktemp("spell") / "cells.xlsx", 2 * len(READ_RIGHT), placed)
    return _run(path)


@pytest.mark.parametrize("k", range(len(READ_RIGHT)), ids=[f"{k} {u}" for k, u, _ in READ_RIGHT])
def test_cell_spelling_reads_right(k, cell_book):
    """``x <spelling>`` in a cell rates exactly like ``x·factor`` in the canonical unit."""
    code, out = cell_book
    assert code == 0
    spelled, twin = out.results[2 * k], out.results[2 * k + 1]
    assert spelled["Status"] in ("ok", "FAILS") and isinstance(spelled["Governing limit [N·m]"], float)
    assert _close(spelled, twin) == []
    assert not out.comments.get("Parts", {}), out.comments.get("Parts")


_HEADER_SPELLINGS = [(k, u, f) for k, u, f in READ_RIGHT if k != "od1"]  # an inch OD header makes the results US


@pytest.mark.parametrize("key, unit, factor", _HEADER_SPELLINGS, ids=[f"{k} {u}" for k, u, _ in _HEADER_SPELLINGS])
def test_header_spelling_reads_right(tmp_path, key, unit, factor):
    """``<Label> [spelling]`` over plain numbers rates like the canonical header over the scaled numbers."""
    x = float(_number(_CANONICAL[key] / factor))
    spelled = bm.build_book(tmp_path / "spelled.xlsx", 2, {0: Case("s", "spelling", _cells(key, x)),
                                                           1: Case("s", "spelling", _cells(key, x))},
                            headers={key: f"{_LABEL[key]} [{unit}]"})
    canon = bm.build_book(tmp_path / "canon.xlsx", 2, {0: Case("c", "spelling", _cells(key, x * factor)),
                                                       1: Case("c", "spelling", _cells(key, x * factor))})
    (c1, o1), (c2, o2) = _run(spelled), _run(canon)
    assert c1 == c2 == 0
    assert not o1.comments.get("Parts"), o1.comments.get("Parts")
    for a, b in zip(o1.results, o2.results):
        assert _close(a, b) == []


# Spellings that start with a digit ('12 1/s') are also tested on their own below.
_CELL_REFUSED = list(REFUSED)


def test_refused_cell_spelling_starting_with_a_digit(tmp_path):
    """'12 1/s' in a speed cell: refused with the advice to write rpm, as in a header."""
    code, out = _run(bm.build_book(tmp_path / "digit.xlsx", 2, {1: Case("d", "spelling", _cells("speed", "12 1/s"))}))
    assert code == 1 and out.results[1]["Status"] == "not rated"
    assert "rpm" in (out.comment("Parts", bm.cell_of(1, "speed")) or "")


def test_refused_cell_spellings(tmp_path):
    """Each refused spelling in a cell: the part is not rated; the comment says what to write."""
    placed = {2 * k + 1: Case(f"{key} {unit}", "spelling", _cells(key, f"12 {unit}"))
              for k, (key, unit, _w) in enumerate(_CELL_REFUSED)}
    code, out = _run(bm.build_book(tmp_path / "refused.xlsx", 2 * len(_CELL_REFUSED) + 1, placed))
    assert code == 1
    problems = []
    for k, (key, unit, words) in enumerate(_CELL_REFUSED):
        i = 2 * k + 1
        text = out.comment("Parts", bm.cell_of(i, key)) or ""
        if not all(w in text for w in words) or "twistshare error" not in text:
            problems.append(f"{key} {unit!r}: {text!r}")
        if out.results[i]["Status"] != "not rated":
            problems.append(f"{key} {unit!r} was rated")
        if out.results[i - 1]["Status"] not in ("ok", "FAILS"):
            problems.append(f"the clean part before {unit!r} was not rated")
    assert problems == []


@pytest.mark.parametrize("key, unit, words", REFUSED, ids=[f"{k} {u}" for k, u, _ in REFUSED])
def test_refused_header_spellings(tmp_path, key, unit, words):
    """A refused spelling in a header: the header cell says what to write; no part uses the column."""
    code, out = _run(bm.build_book(tmp_path / "hdr.xlsx", 2, {0: Case("h", "spelling", _cells(key, 12)),
                                                              1: Case("h", "spelling", _cells(key, 12))},
                                   headers={key: f"{_LABEL[key]} [{unit}]"}))
    assert code == 1
    text = out.comment("Parts", bm.cell_of(-1, key)) or ""
    assert all(w in text for w in words) and "twistshare error" in text, text
    assert [r["Status"] for r in out.results] == ["not rated", "not rated"]


# Moduli and allowables in the materials table: (header unit, G value, allowable value, factor to GPa, to MPa)
MATERIAL_SPELLINGS = [
    ("GPa", "MPa", 1.0, 1.0), ("N/mm²", "N/mm²", 1e-3, 1.0), ("N/mm2", "N/mm2", 1e-3, 1.0),
    ("N/mm^2", "N/mm^2", 1e-3, 1.0), ("Msi", "ksi", PSI * 1e6 / 1e9, PSI * 1e3 / 1e6),
    ("ksi", "psi", PSI * 1e3 / 1e9, PSI / 1e6), ("kN/mm²", "MN/m²", 1.0, 1.0), ("Mpa", "MPA", 1e-3, 1.0),
]


@pytest.mark.parametrize("g_unit, tau_unit, g_f, tau_f", MATERIAL_SPELLINGS,
                         ids=[f"{a}|{b}" for a, b, _, _ in MATERIAL_SPELLINGS])
def test_material_cell_spellings(tmp_path, g_unit, tau_unit, g_f, tau_f):
    """A material whose G and allowable are typed with their own units rates like the canonical one."""
    g, tau = float(_number(80.0 / g_f)), float(_number(110.0 / tau_f))
    spelled_row = ("MPD spelled steel", f"{_number(g)} {g_unit}", f"{_number(tau)} {tau_unit}", "given")
    canon_row = ("MPD canonical steel", g * g_f, tau * tau_f, "given")
    # part 1 gets part 0's geometry and duty, and the canonically typed material
    twin = {k: v for k, v in bm.base_row(0).items() if k != "part"}
    placed = {0: Case("s", "spelling", {"m1": "MPD spelled steel"}, materials=(spelled_row, canon_row)),
              1: Case("c", "spelling", {**twin, "m1": "MPD canonical steel"})}
    code, out = _run(bm.build_book(tmp_path / "mat.xlsx", 2, placed))
    assert code == 0, out.comments
    assert out.results[0]["Status"] in ("ok", "FAILS")
    assert [d for d in _close(out.results[0], out.results[1]) if not d.startswith("L1 material")] == []
