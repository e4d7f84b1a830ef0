"""The bad-cell corpus: every doubtful input gets a comment on its cell, and only its part goes unrated.

Books are built with openpyxl (``_bookmaker``), rated through the command line in-process
(``cli.main``) and read back with openpyxl. Many cases share one book, one bad part each, with
clean parts between them; every clean part must come out exactly as in the same book without
the bad cells. Expected wording: the comment names what was found and what was expected
(STYLE.md, "Messages name the part, the layer, the input, the value with its unit and the rule").

The rule for numbers with commas is units.py's: a comma in a cell number is refused ('1,200'
could be a thousands separator or a decimal comma).
"""

from __future__ import annotations

import contextlib
import datetime as dt
import io
import math
from pathlib import Path

import _bookmaker
import pytest
from hypothesis import HealthCheck, Phase, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import find_material
from twistshare.workbook_bridge.commands import main

bm = _bookmaker  # the book builder shared by the bad-input tests (tests/bridge on pythonpath)
Case, ErrorValue, RawNumber = bm.Case, bm.ErrorValue, bm.RawNumber
CORE, SLEEVE = bm.CORE, bm.SLEEVE

STATUS, LIMIT = "Status", "Governing limit [N·m]"
RAW_TEXTS = ("NaN", "INF", "-INF", "1E+400", "nan", "inf")

# The phrase each column's messages use for what was expected (_column_values.describe_kind).
EXPECTED = {
    "length": "a length", "od1": "a length", "id1": "a length", "od2": "a length", "id2": "a length",
    "torque": "a torque", "power": "a power", "speed": "a rotational speed", "twist": "an angle",
    "kt1": "a plain number", "kt2": "a plain number",
}
NUMERIC_KEYS = tuple(EXPECTED)
ERRORS = ("#N/A", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#NULL!")


# ---------------------------------------------------------------------------------------------
# Running the tool
# ---------------------------------------------------------------------------------------------


def run_cli(*argv: str) -> tuple[int, str, str]:
    """``twistshare ARGV`` in-process: (exit code, stdout, stderr). Any exception fails the test."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(list(argv))
    return code, out.getvalue(), err.getvalue()


def rate_book(path: Path, scrub: bool = False):
    out = path.with_name(path.stem + "-rated.xlsx")
    code, _so, se = run_cli("rate", str(path), "-o", str(out))
    assert "Traceback" not in se
    assert out.exists(), f"no output written (exit {code}): {se}"
    return code, bm.read_output(out, RAW_TEXTS if scrub else ()), se


@pytest.fixture(scope="module")
def baseline(tmp_path_factory):
    """Results of the clean book of n parts, by part index (built once per n)."""
    made: dict[int, list[dict]] = {}
    folder = tmp_path_factory.mktemp("clean")

    def get(n: int) -> list[dict]:
        if n not in made:
            code, out, _ = rate_book(bm.build_book(folder / f"clean{n}.xlsx", n))
            assert code == 0, "the clean book must rate without errors"
            assert not any(out.comments.get("Parts", {}).values()), "the clean book must get no comments"
            made[n] = out.results
        return made[n]

    return get


# ---------------------------------------------------------------------------------------------
# Checks
# ---------------------------------------------------------------------------------------------


def _same_row(a: dict, b: dict, names_too: bool = True) -> bool:
    if a.keys() != b.keys():
        return False
    for k in a:
        if not names_too and k.endswith(" material"):
            continue
        x, y = a[k], b[k]
        if isinstance(x, float) and isinstance(y, (int, float)):
            if not (math.isclose(x, y, rel_tol=1e-9, abs_tol=1e-12) or (math.isnan(x) and math.isnan(y))):
                return False
        elif x != y:
            return False
    return True


def _row_comments(out, i: int) -> dict[str, str]:
    row = str(i + 2)
    return {ref: text for ref, text in out.comments.get("Parts", {}).items()
            if ref.lstrip("ABCDEFGHIJKLMNOPQRSTUVWXYZ") == row}


def check_case(out, clean: list[dict], i: int, case) -> list[str]:
    """Problems with how the tool treated ``case`` placed on part ``i`` (empty when right)."""
    problems: list[str] = []
    results = out.results
    if len(results) != len(clean):
        return [f"results sheet has {len(results)} rows, the clean book {len(clean)}"]
    got = results[i]
    ref = bm.cell_of(i, case.flag)
    comment = out.comment("Parts", ref)
    if case.outcome in ("refused", "warned"):
        severity = "twistshare error" if case.outcome == "refused" else "twistshare warning"
        if comment is None:
            problems.append(f"no comment on Parts!{ref}; comments on the row: {_row_comments(out, i)}")
        else:
            low = comment.lower()
            missing = [w for w in case.words if w.lower() not in low]
            if missing:
                problems.append(f"comment on {ref} lacks {missing}: {comment!r}")
            if severity not in comment:
                problems.append(f"comment on {ref} is not a {severity!r}: {comment!r}")
    if case.outcome == "refused":
        if got[STATUS] != "not rated" or got[LIMIT] is not None:
            problems.append(f"part rated although refused: status {got[STATUS]!r}, limit {got[LIMIT]!r}")
        # the layer count and the demand are inputs echoed; no result may be shown
        numbers = [k for k, v in got.items() if isinstance(v, (int, float))
                   and k != "Layers" and not k.startswith("Demand torque")]
        if numbers:
            problems.append(f"refused part shows numbers in {numbers}")
        if not got.get("First problem"):
            problems.append("refused part has no 'First problem' text")
    elif case.outcome in ("warned", "same"):
        if not _same_row(got, clean[i], names_too=case.cls != "unknown/duplicate material"):
            problems.append(f"results differ from the clean part: {got} != {clean[i]}")
        if case.outcome == "same":
            errs = {r: t for r, t in _row_comments(out, i).items() if "error" in t}
            if errs:
                problems.append(f"read-right value got error comments: {errs}")
    elif case.outcome == "rated":
        if got[STATUS] not in ("ok", "FAILS") or not isinstance(got[LIMIT], float):
            problems.append(f"part not rated: {got[STATUS]!r}")
        errs = {r: t for r, t in _row_comments(out, i).items() if "error" in t}
        if errs:
            problems.append(f"rated part got error comments: {errs}")
    return problems


def check_clean_parts(out, clean: list[dict], bad: set[int]) -> list[str]:
    problems = []
    for i, row in enumerate(clean):
        if i in bad:
            continue
        if not _same_row(out.results[i], row):
            problems.append(f"clean part {i} ({row['Part']}) changed: {out.results[i]} != {row}")
        if _row_comments(out, i):
            problems.append(f"clean part {i} got comments: {_row_comments(out, i)}")
    return problems


# ---------------------------------------------------------------------------------------------
# The handwritten corpus (class, cells, the cell that must carry the comment, words it must hold)
# ---------------------------------------------------------------------------------------------


def C(name, cls, cells=None, flag="part", words=(), outcome="refused", **kw):
    return Case(name, cls, dict(cells or {}), flag, tuple(words), outcome, **kw)


def _handwritten() -> list:
    cases = []
    add = cases.append
    # wrong or missing units: the unit text is not a unit we read
    for key, text, words in [
        ("od1", "40 xyz", ("'40 xyz'", "xyz", "a length")),
        ("od1", "40 mmm", ("mmm", "a length")),
        ("od2", "52 millimetre s", ("millimetre s", "a length")),
        ("length", "300 mil", ("mil", "thou")),  # units.py: 'mil' is refused with advice
        ("length", "12 thou x", ("a length",)),
        ("od1", '1.6"', ('1.6"', "'in'")),
        ("length", "1'", ("'ft'",)),
        ("torque", "400 lb-in", ("lb-in", "lbf·in")),
        ("torque", "400 ft-lb", ("ft-lb", "lbf")),
        ("torque", "400 J", ("energy", "N·m")),
        ("torque", "400 kWh", ("a torque",)),
        ("torque", "400 Nmx", ("Nmx", "a torque")),
        ("speed", "1450 Hz", ("Hz", "rpm"), ),
        ("speed", "1450 1/min", ("1/min", "rpm")),
        ("twist", "0.5 %", ("%", "an angle")),
        ("twist", "0.5 mrad2", ("an angle",)),
        ("kt1", "1.5 mm", ("1.5 mm", "a plain number")),
        ("kt2", "1.2 x", ("a plain number",)),
        ("id2", "40 mPa", ("mPa", "MPa")),
        ("length", "300 furlongs x", ("a length",)),
    ]:
        cells = {key: text}
        if key == "speed":
            cells = {"torque": None, "power": 15, "speed": text}
        add(C(f"unit {key} {text}", "wrong unit", cells, key, words))
    # wrong dimension: a real unit of another kind
    for key, text in [
        ("od1", "40 MPa"), ("od1", "40 N·m"), ("od1", "40 kg"), ("od1", "40 s"), ("od1", "40 rpm"),
        ("id2", "40 deg"), ("od2", "48 kW"), ("length", "300 N"), ("length", "300 kg/m³"),
        ("length", "300 GPa"), ("torque", "400 MPa"), ("torque", "400 N"), ("torque", "400 mm"),
        ("torque", "400 kW"), ("twist", "1 mm"), ("twist", "1 N·m"), ("twist", "1 deg/m"),
        ("kt1", "1.2 MPa"), ("kt2", "1.1 deg"), ("speed", "1450 kW"), ("power", "15 rpm"),
        ("power", "15 N·m"),
    ]:
        cells = {key: text}
        if key in ("speed", "power"):
            cells = {"torque": None, "power": 15, "speed": 1450, key: text}
        add(C(f"dimension {key} {text}", "wrong dimension", cells, key, (text.split()[1], EXPECTED[key])))
    # text in number cells
    for key, text in [
        ("od1", "abc"), ("od1", "forty"), ("od1", "tbc"), ("od2", "n/a"), ("id2", "-"), ("length", "?"),
        ("length", "see drawing"), ("torque", "TBD"), ("torque", "approx 400"), ("kt1", "high"),
        ("twist", "none"), ("od1", "40 mm approx"), ("torque", "400 N·m or so"),
        ("length", "300 mm 2"), ("od1", "4O"),
    ]:
        add(C(f"text {key} {text}", "text in number", {key: text}, key, (text, EXPECTED[key])))
    for key, value, word in [("od1", True, "TRUE"), ("length", False, "FALSE"),
                             ("torque", dt.date(2024, 3, 1), "date"), ("od2", dt.datetime(2024, 3, 1, 8), "date")]:
        add(C(f"typed {key} {value!r}", "text in number", {key: value}, key, (word, EXPECTED[key])))
    # Excel error values, in number and in text cells
    for k, key in enumerate(("od1", "length", "torque", "kt1", "id2", "od2", "twist")):
        for err in (ERRORS[k], ERRORS[(k + 3) % len(ERRORS)]):
            add(C(f"error {key} {err}", "error value", {key: ErrorValue(err)}, key, (err, EXPECTED[key])))
    for key in ("m1", "m2", "part"):
        for err in ("#N/A", "#REF!"):
            add(C(f"error {key} {err}", "error value", {key: ErrorValue(err)}, key, (err, "error value")))
    # empty cells
    add(C("empty od1", "empty", {"od1": None}, "od1", ("outer diameter", "missing")))
    add(C("empty od2", "empty", {"od2": None}, "od2", ("outer diameter", "missing")))
    add(C("empty id2", "empty", {"id2": None}, "id2", ("inner diameter", "missing", "layer 1")))
    add(C("empty length", "empty", {"length": None}, "length", ("length", "missing", "mm")))
    add(C("empty torque", "empty", {"torque": None}, "torque", ("no duty", "torque", "power")))
    add(C("empty m1", "empty", {"m1": None}, "m1", ("layer 1", "no material")))
    add(C("empty m2", "empty", {"m2": None}, "m2", ("layer 2", "no material")))
    add(C("empty part id", "empty", {"part": None}, "part", ("no id",)))
    add(C("empty speed", "empty", {"torque": None, "power": 15, "speed": None}, "speed", ("speed", "missing")))
    add(C("empty power", "empty", {"torque": None, "power": None, "speed": 1450}, "power", ("power", "missing")))
    add(C("zero id1 = solid core", "empty", {"id1": 0}, outcome="same"))
    # a formula with no saved value: the fast reader has only cached values, so say so
    add(C("formula without value od2", "empty", {"od2": "=B3*2"}, "od2", ("outer diameter", "no saved result")))
    add(C("formula without value m1", "empty", {"m1": "=Materials!A2"}, "m1", ("material", "no saved result")))
    add(C("empty kt = 1", "empty", {"kt1": None}, outcome="same"))
    add(C("blank text id1", "empty", {"id1": "   "}, outcome="same"))
    # NaN and infinity, as text and as stored numbers
    for key, text in [("od1", "nan"), ("od1", "NaN"), ("length", "inf"), ("torque", "-inf"), ("od2", "Infinity"),
                      ("torque", "1e999"), ("kt1", "nan"), ("id2", "INF")]:
        add(C(f"nan text {key} {text}", "NaN/inf", {key: text}, key, (text, EXPECTED[key])))
    for key, text in [("od1", "NaN"), ("length", "INF"), ("torque", "1E+400"), ("id2", "-INF"), ("kt1", "NaN")]:
        add(C(f"nan number {key} {text}", "NaN/inf", {key: RawNumber(text)}, key, ("finite number",)))
    # negative or zero sizes and duties
    for key, value, words in [
        ("od1", -40, ("-40", "negative")), ("od1", 0, ("0", "greater than zero")),
        ("od2", -48, ("-48", "negative")), ("id1", -5, ("-5", "negative")), ("id2", -40, ("-40", "negative")),
        ("length", -300, ("-300", "negative")), ("length", 0, ("0", "greater than zero")),
        ("torque", -400, ("-400", "negative")), ("twist", 0, ("0", "greater than zero")),
        ("twist", -1, ("-1", "negative")), ("kt1", 0.5, ("0.5", "1 to 10")), ("kt2", 0, ("0", "1 to 10")),
        ("od1", "-40 mm", ("-40", "negative")), ("length", "-0.3 m", ("-0.3", "negative")),
    ]:
        add(C(f"sign {key} {value}", "negative/zero", {key: value}, key, words))
    add(C("sign speed 0", "negative/zero", {"torque": None, "power": 15, "speed": 0}, "speed",
          ("speed", "greater than zero")))
    add(C("sign power -15", "negative/zero", {"torque": None, "power": -15, "speed": 1450}, "power",
          ("-15", "negative")))
    # inner diameter at or above the outer
    add(C("bore = od layer 1", "inner >= outer", {"od1": 42, "id1": 42, "id2": 42}, "id1",
          ("inner diameter 42 mm", "less than outer diameter 42 mm")))
    add(C("bore > od layer 1", "inner >= outer", {"od1": 30, "id1": 35, "id2": 30}, "id1",
          ("35 mm", "less than outer diameter 30 mm")))
    add(C("bore = od layer 2", "inner >= outer", {"od1": 50, "id2": 50, "od2": 50}, "id2",
          ("inner diameter 50 mm", "less than outer diameter 50 mm")))
    add(C("od/id swapped layer 2", "inner >= outer", {"od1": 50, "od2": 50, "id2": 58}, "id2",
          ("58 mm", "less than outer diameter 50 mm")))
    add(C("bore > od layer 2 as text", "inner >= outer", {"od1": 50, "od2": "5 cm", "id2": "51 mm"}, "id2",
          ("less than outer diameter 50 mm",)))
    # gaps and overlaps between layers (tolerance: the larger of 0.01 mm and 0.02 % of the diameter)
    for d in (1, 0.5, 0.05, -0.05, -1, -3):
        kind = "gap" if d > 0 else "overlap"
        add(C(f"{kind} {d}", "gap/overlap", {"od1": 40, "id2": 40 + d, "od2": 48}, "id2",
              (kind, f"{abs(d):g} mm", "layer 1")))
    add(C("gap within tolerance", "gap/overlap", {"od1": 40, "id2": 40.005, "od2": 48}, outcome="rated"))
    # unknown or doubly defined materials
    for key, name in [("m1", "Unobtainium"), ("m2", "Stainles 316 annealed"), ("m1", "MPD core steel Q3"),
                      ("m2", "42"), ("m1", "MPD core steel Q2 (old)")]:
        value = 42 if name == "42" else name
        add(C(f"material {name}", "unknown/duplicate material", {key: value}, key, ("unknown material", name)))
    add(C("material name case and spaces", "unknown/duplicate material", {"m1": "  mpd CORE  steel q2 "},
          outcome="same"))  # the results echo the name as typed; the numbers are the clean part's
    add(C("material defined twice", "unknown/duplicate material", {"m1": "MPD twice steel"}, "m1",
          ("MPD twice steel", "more than once"),
          materials=(("MPD twice steel", 80, 120, "given"), ("MPD twice steel", 81, 120, "given"))))
    add(C("material defined twice, other case", "unknown/duplicate material", {"m2": "MPD Twice Sleeve"}, "m2",
          ("more than once",),
          materials=(("MPD twice sleeve", 77, 100, "given"), ("mpd  twice SLEEVE", 77, 100, "given"))))
    add(C("material with text G", "unknown/duplicate material", {"m1": "MPD text G steel"}, "m1",
          ("MPD text G steel", "unusable"), materials=(("MPD text G steel", "eighty", 120, "given"),)))
    add(C("material with G in MPa", "unknown/duplicate material", {"m2": "MPD MPa G sleeve"}, "m2",
          ("unusable",), materials=(("MPD MPa G sleeve", 77000, 100, "given"),)))
    add(C("material with no allowable", "unknown/duplicate material", {"m1": "MPD no allowable"}, "m1",
          ("no allowable shear",), materials=(("MPD no allowable", 80, None, "given"),)))
    add(C("material with unknown rule", "unknown/duplicate material", {"m1": "MPD odd rule"}, "m1",
          ("unknown allowable rule", "guess"), materials=(("MPD odd rule", 80, 120, "guess"),)))
    add(C("material with error G", "unknown/duplicate material", {"m2": "MPD error G"}, "m2",
          ("unusable",), materials=(("MPD error G", ErrorValue("#N/A"), 100, "given"),)))
    add(C("library material without strengths", "unknown/duplicate material", {"m2": "Phosphor bronze"}, "m2",
          ("Phosphor bronze", "allowable shear")))
    # merged cells within a part's row
    # (a covered cell cannot carry a visible comment: it goes on the merged range's top-left cell)
    add(C("merged od2:id2", "merged", merge=("od2", "id2"), flag="od2", words=("merged", "inner diameter", "missing")))
    add(C("merged m2:od2", "merged", merge=("m2", "od2"), flag="m2", words=("merged", "outer diameter")))
    add(C("merged length:torque", "merged", merge=("length", "torque"), flag="length", words=("merged", "no duty")))
    add(C("merged part:length", "merged", merge=("part", "length"), flag="part", words=("merged", "length")))
    add(C("merged kt1:m2", "merged", merge=("kt1", "m2"), flag="kt1", words=("merged", "no material")))
    add(C("merged od1:id1 (bore blank anyway)", "merged", merge=("od1", "id1"), flag="od1",
          words=("merged", "empty"), outcome="warned"))
    # hidden rows: rated like any other row, with a warning
    add(C("hidden row", "hidden", hidden=True, words=("hidden", "rated"), outcome="warned"))
    add(C("hidden row, another", "hidden", hidden=True, words=("hidden",), outcome="warned"))
    add(C("hidden row with a bad cell", "hidden", {"od1": "abc"}, "od1", ("abc",), hidden=True))
    # numbers stored as text: read right, or (commas, spaced digits) refused per units.py
    for key, text in [
        ("od1", "42"), ("od1", "42.0"), ("od1", " 42 "), ("od1", "4.2e1"), ("od1", "42mm"), ("od1", "42 mm"),
        ("od1", "0.042 m"), ("od1", "4.2 cm"), ("od1", "42 MM"), ("length", "310"), ("length", "+310"),
        ("length", "0.31 m"), ("length", "310 mm"), ("torque", "406"), ("torque", "406 N m"),
        ("torque", "406 N·m"), ("torque", "0.406 kN·m"), ("torque", "406 Nm"), ("torque", "406 N-m"),
        ("torque", "406 N.m"), ("kt1", "1"), ("kt1", "1.0"),
    ]:
        # part 2: od1 42, length 310, torque 406 (base_row)
        add(C(f"text number {key} {text!r}", "text numbers", {key: text}, outcome="same"))
    for key, text, word in [
        ("torque", "1,200", "comma"), ("torque", "1,200.5", "comma"), ("length", "12,5", "decimal comma"),
        ("od1", "40,5", "decimal comma"), ("length", "1.200,5", "decimal comma"), ("torque", "1 200", "spaces"),
        ("torque", "1,200 N·m", "comma"), ("od2", "48,0 mm", "decimal comma"), ("length", "1'200", "not read"),
    ]:
        add(C(f"text number {key} {text!r}", "text numbers", {key: text}, key, (text, word)))
    return cases


HANDWRITTEN = _handwritten()
# "same" cases that restate part 2's own values must sit on part 2 (index 1) of their book.
_ON_PART_2 = {c.name for c in HANDWRITTEN if c.outcome == "same" and c.cls == "text numbers"}
CHUNK = 40


def _chunks() -> list[tuple[int, dict[int, object]]]:
    """Books of at most CHUNK cases, one clean part between bad parts.

    Cases that restate a clean part's own values go alone on part index 1 of a small book.
    """
    books = []
    free = [c for c in HANDWRITTEN if c.name not in _ON_PART_2]
    for k in range(0, len(free), CHUNK):
        n, placed = bm.parts_table(free[k:k + CHUNK])
        books.append((n, placed))
    for c in HANDWRITTEN:
        if c.name in _ON_PART_2:
            books.append((4, {2: c}))
    return books


BOOKS = _chunks()
CASE_BOOK = {case.name: (b, i) for b, (_n, placed) in enumerate(BOOKS) for i, case in placed.items()}


@pytest.fixture(scope="module")
def rated_books(tmp_path_factory):
    folder = tmp_path_factory.mktemp("bad_cells")
    done: dict[int, tuple] = {}

    def get(b: int):
        if b not in done:
            n, placed = BOOKS[b]
            scrub = any(isinstance(v, RawNumber) for c in placed.values() for v in c.cells.values())
            path = bm.build_book(folder / f"book{b}.xlsx", n, placed)
            done[b] = rate_book(path, scrub)
        return done[b]

    return get


def test_corpus_is_large_enough():
    """Issue 5 asks for at least 300 cases; the handwritten part alone holds well over a hundred."""
    assert len(HANDWRITTEN) >= 150
    assert len({c.name for c in HANDWRITTEN}) == len(HANDWRITTEN), "case names must be unique"


# Refused, but without the advice the class promises: the cell-value parser in engine/units
# (not owned here) never reaches the unit check for these spellings.
XFAIL: dict[str, str] = {}  # cases known to fail, with the reason; none at present


def _param(name: str):
    return pytest.param(name, marks=pytest.mark.xfail(strict=True, reason=XFAIL[name])) if name in XFAIL else name


@pytest.mark.parametrize("name", [_param(c.name) for c in HANDWRITTEN])
def test_handwritten_case(name, rated_books, baseline):
    """The bad part gets its comment and no number (or is read right); see the case's words."""
    b, i = CASE_BOOK[name]
    n, placed = BOOKS[b]
    _code, out, _ = rated_books(b)
    assert check_case(out, baseline(n), i, placed[i]) == []


@pytest.mark.parametrize("b", range(len(BOOKS)))
def test_other_parts_rated_as_in_clean_book(b, rated_books, baseline):
    """Every part without a bad cell is rated exactly as in the clean book and gets no comment."""
    n, placed = BOOKS[b]
    code, out, _ = rated_books(b)
    assert check_clean_parts(out, baseline(n), set(placed)) == []
    refused = any(c.outcome == "refused" for c in placed.values())
    assert code == (1 if refused else 0)


# ---------------------------------------------------------------------------------------------
# Book-level cases: one case per book
# ---------------------------------------------------------------------------------------------


def test_duplicate_part_ids_rate_neither_row(tmp_path, baseline):
    """An id given twice names two different rows: neither is rated, both rows say where the other is."""
    n = 12
    placed = {2: C("dup a", "duplicate id", {"part": "MPD-S-900"}),
              7: C("dup b", "duplicate id", {"part": "MPD-S-900 "}),
              4: C("dup c", "duplicate id", {"part": "MPD-S-010"})}  # part 9 (index 9) is MPD-S-010
    code, out, _ = rate_book(bm.build_book(tmp_path / "dups.xlsx", n, placed))
    assert code == 1
    for i, other in ((2, 9), (7, 4), (4, 11), (9, 6)):
        got = out.results[i]
        assert got[STATUS] == "not rated" and got[LIMIT] is None, got
        text = out.comment("Parts", bm.cell_of(i, "part"))
        assert text and "twistshare error" in text and f"row {other}" in text, text
    assert check_clean_parts(out, baseline(n), {2, 7, 4, 9}) == []


def test_vertical_merge_over_two_parts(tmp_path, baseline):
    """A torque merged down over the next part's row: that part has no duty and says why."""
    import openpyxl

    path = bm.build_book(tmp_path / "vmerge.xlsx", 8)
    wb = openpyxl.load_workbook(path)
    wb["Parts"].merge_cells(bm.cell_of(3, "torque") + ":" + bm.cell_of(4, "torque"))
    wb.save(path)
    code, out, _ = rate_book(path)
    assert code == 1
    # the covered cell's message goes on the merged cell a user can see: part 4's torque cell
    text = out.comment("Parts", bm.cell_of(3, "torque"))
    assert text and "merged" in text and "no duty" in text and bm.cell_of(4, "torque") in text, text
    assert bm.part_id(4) in text and "twistshare error" in text
    assert out.results[4][STATUS] == "not rated"
    assert _same_row(out.results[3], baseline(8)[3])
    assert check_clean_parts(out, baseline(8), {3, 4}) == []


@pytest.mark.parametrize("key, header, words", [
    ("od1", "Layer 1 outer diameter [MPa]", ("MPa", "a length")),
    ("od1", "Layer 1 outer diameter", ("no unit", "outer diameter [mm]")),
    ("length", "Length [xyz]", ("xyz", "a length")),
    ("torque", "Torque [lb-in]", ("lb-in", "lbf·in")),
    ("torque", "Torque [J]", ("energy",)),
    ("twist", "Twist limit", ("no unit",)),
])
def test_bad_header_unit_refuses_the_column(tmp_path, key, header, words):
    """A header unit that cannot be read: a comment on the header; every part using the column is refused."""
    n = 6
    sheet_cells = {}
    if key == "twist":
        sheet_cells = {bm.cell_of(i, "twist"): 2 for i in range(n)}
    code, out, _ = rate_book(bm.build_book(tmp_path / "hdr.xlsx", n, headers={key: header},
                                           sheet_cells=sheet_cells))
    assert code == 1
    head = out.comment("Parts", bm.cell_of(-1, key))
    assert head and all(w.lower() in head.lower() for w in words), head
    for i in range(n):
        assert out.results[i][STATUS] == "not rated"
        assert out.comment("Parts", bm.cell_of(i, key)), f"part {i}: no comment on its cell"


def test_cell_unit_rescues_a_header_without_unit(tmp_path, baseline):
    """With no unit in the header, cells that carry their own unit are read; bare numbers are refused."""
    n = 4
    cells = {bm.cell_of(i, "length"): f"{300 + 5 * i} mm" for i in range(n)}
    cells[bm.cell_of(2, "length")] = 310
    code, out, _ = rate_book(bm.build_book(tmp_path / "nohdr.xlsx", n, headers={"length": "Length"},
                                           sheet_cells=cells))
    assert code == 1
    clean = baseline(n)
    for i in (0, 1, 3):
        assert _same_row(out.results[i], clean[i])
    assert out.results[2][STATUS] == "not rated"
    assert "no unit" in out.comment("Parts", bm.cell_of(2, "length"))


def test_long_text_in_a_cell_gives_a_short_comment(tmp_path):
    """A pasted paragraph in a number cell: refused, and the comment quotes only its start."""
    text = "see the drawing " * 400
    code, out, _ = rate_book(bm.build_book(tmp_path / "long.xlsx", 3, {1: C("long", "text", {"od1": text})}))
    assert code == 1
    comment = out.comment("Parts", bm.cell_of(1, "od1"))
    assert "see the drawing" in comment and "a length" in comment
    assert len(comment) < 600, len(comment)


def test_kt_alone_does_not_make_a_layer(tmp_path, baseline):
    """A template that pre-fills Kt = 1 for every layer slot: an empty layer with only Kt is ignored."""
    n = 4
    cells = {bm.cell_of(i, "kt2"): 1 for i in range(n)}
    path = bm.build_book(tmp_path / "kt.xlsx", n, {1: C("kt only", "empty", {"m2": None, "od2": None, "id2": None})},
                         sheet_cells=cells)
    code, out, _ = rate_book(path)
    assert out.results[1][STATUS] in ("ok", "FAILS") and out.results[1]["Layers"] == 1
    text = out.comment("Parts", bm.cell_of(1, "kt2"))
    assert text and "twistshare warning" in text and "Kt" in text, text
    assert code == 0


def test_check_command_on_the_corpus(tmp_path):
    """``twistshare check`` reads the same book: exit 1, the same comments, no results sheet."""
    n, placed = BOOKS[0]
    path = bm.build_book(tmp_path / "chk.xlsx", n, placed)
    out_path = tmp_path / "chk-checked.xlsx"
    code, _so, se = run_cli("check", str(path), "-o", str(out_path))
    assert code == 1 and "Traceback" not in se
    out = bm.read_output(out_path, RAW_TEXTS)
    assert "Twistshare results" not in out.sheetnames
    for i, case in placed.items():
        if case.outcome == "refused":
            assert out.comment("Parts", bm.cell_of(i, case.flag)), case.name


# ---------------------------------------------------------------------------------------------
# Generated corpus (hypothesis): one book per example, PER_BOOK bad parts in it
# ---------------------------------------------------------------------------------------------

PER_BOOK = 12
EXAMPLES = 5
GENERATED_CLASSES = ("wrong dimension", "text in number", "text numbers", "negative/zero", "error value",
                     "gap/overlap", "inner >= outer", "unknown/duplicate material")

_WRONG_UNITS = {
    "length": ("MPa", "N·m", "kW", "rpm", "kg", "s", "N", "GPa", "psi", "hp", "lbf·ft", "kg/m³"),
    "torque": ("mm", "MPa", "kW", "N", "lbf", "in", "rpm", "psi", "kg", "hp"),
    "angle": ("mm", "N·m", "MPa", "kW", "%", "m", "in"),
    "dimensionless": ("mm", "MPa", "N·m", "deg", "kg", "in"),
}
_KIND_OF = {"length": "length", "od1": "length", "od2": "length", "id2": "length", "torque": "torque",
            "twist": "angle", "kt1": "dimensionless", "kt2": "dimensionless"}
_SAFE_TEXT = st.text(alphabet=st.sampled_from("abcdefghijklmnopqrstuvwxyzABCXYZ ?!-_/()&%#@:;<>*+"),
                     min_size=1, max_size=20).filter(lambda s: s.strip() and s.strip()[0] not in "=+-")


@st.composite
def _wrong_dimension(draw):
    key = draw(st.sampled_from(tuple(_KIND_OF)))
    unit = draw(st.sampled_from(_WRONG_UNITS[_KIND_OF[key]]))
    x = draw(st.integers(1, 900))
    return C("gen", "wrong dimension", {key: f"{x} {unit}"}, key, (unit, EXPECTED[key]))


@st.composite
def _text(draw):
    key = draw(st.sampled_from(NUMERIC_KEYS))
    text = draw(_SAFE_TEXT)
    cells = {key: text}
    if key in ("speed", "power"):
        cells = {"torque": None, "power": 15, "speed": 1450, key: text}
    return C("gen", "text in number", cells, key, (text.strip(), EXPECTED[key]))


@st.composite
def _comma_number(draw):
    key = draw(st.sampled_from(("length", "torque", "od1", "od2")))
    a, b = draw(st.integers(1, 999)), draw(st.integers(0, 999))
    form = draw(st.sampled_from(("thousands", "decimal", "spaced")))
    text, word = {
        "thousands": (f"{a},{b:03d}", "comma"),
        "decimal": (f"{a},{b}", "comma"),
        "spaced": (f"{a} {b:03d}", "spaces"),
    }[form]
    if draw(st.booleans()):
        text += " " + {"length": "mm", "torque": "N·m", "od1": "mm", "od2": "mm"}[key]
    return C("gen", "text numbers", {key: text}, key, (text, word))


@st.composite
def _negative(draw):
    key = draw(st.sampled_from(("length", "torque", "od1", "od2", "id1", "id2", "twist")))
    x = draw(st.floats(0.001, 1e4, allow_nan=False).map(lambda v: round(v, 3)).filter(lambda v: v > 0))
    shown = f"-{int(x)}" if x.is_integer() else f"-{x!r}"
    value = shown if draw(st.booleans()) else -x
    return C("gen", "negative/zero", {key: value}, key, (shown, "negative"))


@st.composite
def _error_value(draw):
    key = draw(st.sampled_from(NUMERIC_KEYS + ("m1", "m2", "part")))
    err = draw(st.sampled_from(ERRORS))
    cells = {key: ErrorValue(err)}
    if key in ("speed", "power"):
        cells = {"torque": None, "power": 15, "speed": 1450, key: ErrorValue(err)}
    return C("gen", "error value", cells, key, (err, "error value"))


@st.composite
def _gap(draw):
    d = draw(st.floats(0.02, 5.0).map(lambda v: round(v, 2)))
    sign = draw(st.sampled_from((1, -1)))
    od1 = draw(st.integers(20, 80))
    kind = "gap" if sign > 0 else "overlap"
    return C("gen", "gap/overlap", {"od1": od1, "id2": round(od1 + sign * d, 2), "od2": od1 + 10}, "id2",
             (kind, f"{d:g} mm"))


@st.composite
def _inner_ge_outer(draw):
    d = draw(st.floats(0.0, 10.0).map(lambda v: round(v, 1)))
    od = draw(st.integers(20, 80))
    if draw(st.booleans()):
        return C("gen", "inner >= outer", {"od1": od, "id1": od + d, "id2": od, "od2": od + 8}, "id1",
                 (f"less than outer diameter {od} mm",))
    return C("gen", "inner >= outer", {"od1": od, "id2": od, "od2": round(od - d, 1)}, "id2",
             (f"less than outer diameter {round(od - d, 1):g} mm",))


_KNOWN = {CORE.lower(), SLEEVE.lower()}
_NAME = st.text(alphabet=st.sampled_from("abcdefghijklmnopqrstuvwxyz ABCDEFXYZ0123456789-/()"),
                min_size=1, max_size=24).filter(
    lambda s: s.strip() and s.strip()[0] not in "=+-" and " ".join(s.lower().split()) not in _KNOWN
    and find_material(s) is None)


@st.composite
def _unknown_material(draw):
    key = draw(st.sampled_from(("m1", "m2")))
    name = draw(_NAME)
    if name.strip().isdigit() or _looks_numeric(name):
        name = "X" + name
    return C("gen", "unknown/duplicate material", {key: name}, key, ("unknown material", name.strip()))


def _looks_numeric(s: str) -> bool:
    try:
        float(s)
    except ValueError:
        return False
    return True


_GENERATORS = {
    "wrong dimension": _wrong_dimension(), "text in number": _text(), "text numbers": _comma_number(),
    "negative/zero": _negative(), "error value": _error_value(), "gap/overlap": _gap(),
    "inner >= outer": _inner_ge_outer(), "unknown/duplicate material": _unknown_material(),
}


@pytest.mark.parametrize("cls", GENERATED_CLASSES)
def test_generated_cases(cls, tmp_path_factory, baseline):
    """Hypothesis-made bad cells of one class, PER_BOOK per book: each refused with its comment."""
    folder = tmp_path_factory.mktemp("generated")
    counter = iter(range(10_000))

    # No shrinking: a failing example names its cases in full, and shrinking rebuilds many books.
    @settings(max_examples=EXAMPLES, deadline=None, derandomize=True, database=None,
              phases=(Phase.explicit, Phase.generate),
              suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
    @given(st.lists(_GENERATORS[cls], min_size=PER_BOOK, max_size=PER_BOOK))
    def run(cases):
        n, placed = bm.parts_table(cases)
        path = bm.build_book(folder / f"gen{next(counter)}.xlsx", n, placed)
        code, out, _ = rate_book(path)
        problems = check_clean_parts(out, baseline(n), set(placed))
        for i, case in placed.items():
            problems += [f"{case.cells}: {p}" for p in check_case(out, baseline(n), i, case)]
        assert problems == []
        assert code == 1

    run()
    assert next(counter) == EXAMPLES, "every example must have built and rated its book"
