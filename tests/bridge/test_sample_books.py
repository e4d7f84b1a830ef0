"""The committed sample books: reproducible, complete, and holding the intended bad cells."""

from __future__ import annotations

import re
import shutil
import subprocess
import warnings
from pathlib import Path

import openpyxl
import pytest
from openpyxl.worksheet.formula import ArrayFormula
from twistshare import sample_books as sb
from twistshare.engine.core import material_library
from twistshare.engine.units import parse_value

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"
BOOKS = (sb.CATALOGUE_FILE, sb.CATALOGUE_LONG_FILE, sb.CELL_FUNCTIONS_FILE)

# Header strings as DEVELOPERS.md "Workbook convention (input)" spells them.
CONVENTION_MATERIAL_HEADERS = {
    "Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Allowable shear [MPa]",
    "Yield strength [MPa]", "Ultimate strength [MPa]", "Allowable rule", "Factor of safety",
    "Keyway", "Density [kg/m³]",
}
CONVENTION_PART_HEADERS = {
    "Part", "Length [mm]", "Torque [N·m]", "Power [kW]", "Speed [rpm]", "Service factor",
    "Twist limit [deg]", "Twist limit per length [deg/m]", "Bearing span [mm]",
    "Load path", "Operating temperature [°C]",
}
CONVENTION_LAYER_GROUP = re.compile(
    r"^Layer ([1-9]) (material|outer diameter \[mm\]|inner diameter \[mm\]|Kt"
    r"|interference \[mm\]|fit length \[mm\]|friction|bond allowable \[MPa\]|bond length \[mm\])$")
CONVENTION_LAYER_HEADERS = ["Part", "Layer", "Material", "Outer diameter [mm]",
                            "Inner diameter [mm]", "Kt"]


def _load(path: Path, **kw) -> openpyxl.Workbook:
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # openpyxl warns on anything it had to guess
        return openpyxl.load_workbook(path, **kw)


def _plain(value: object) -> object:
    """Cell values made comparable: an array formula becomes its range and text."""
    if isinstance(value, ArrayFormula):
        return ("array formula", value.ref, value.text)
    return value


def _values(path: Path) -> dict[str, list[tuple]]:
    wb = _load(path)
    return {ws.title: [tuple(_plain(c.value) for c in row) for row in ws.iter_rows()] for ws in wb}


def _table(ws) -> tuple[list[str], list[dict[str, object]]]:
    rows = list(ws.iter_rows(values_only=True))
    headers = list(rows[0])
    return headers, [dict(zip(headers, r)) for r in rows[1:] if any(v is not None for v in r)]


@pytest.fixture(scope="module")
def fresh(tmp_path_factory) -> Path:
    out = tmp_path_factory.mktemp("fresh_samples")
    sb.write_all(out)
    return out


@pytest.fixture(scope="module")
def catalogue() -> openpyxl.Workbook:
    return _load(SAMPLES / sb.CATALOGUE_FILE)


@pytest.fixture(scope="module")
def parts(catalogue) -> list[dict[str, object]]:
    return _table(catalogue["Parts"])[1]


def _layers_of(row: dict[str, object]) -> int:
    return sum(1 for n in range(1, 10) if row.get(f"Layer {n} material") is not None)


class TestReproducible:
    """The committed books are what the script writes today."""

    def test_write_all_returns_the_three_books(self, fresh):
        """write_all writes every sample book and returns their paths, catalogue first."""
        paths = sb.write_all(fresh)
        assert [p.name for p in paths] == list(BOOKS)
        assert all(p.is_file() and p.stat().st_size > 0 for p in paths)

    @pytest.mark.parametrize("name", BOOKS)
    def test_committed_book_has_the_content_of_a_fresh_write(self, fresh, name):
        """Every sheet and cell value of the committed book equals a freshly written one."""
        assert (SAMPLES / name).is_file(), f"run sample_books/make_sample_books.py to create {name}"
        assert _values(SAMPLES / name) == _values(fresh / name)

    @pytest.mark.parametrize("name", BOOKS)
    def test_two_writes_give_the_same_bytes(self, tmp_path, fresh, name):
        """Fixed timestamps: writing twice gives identical files."""
        again = sb.write_all(tmp_path)
        by_name = {p.name: p for p in again}
        assert by_name[name].read_bytes() == (fresh / name).read_bytes()

    def test_document_timestamps_are_fixed(self, catalogue):
        """The created and modified properties are the fixed instant, not the save time."""
        assert catalogue.properties.created == catalogue.properties.modified
        assert catalogue.properties.modified.year == 2024


class TestCatalogueShape:
    """The one-row-per-part catalogue follows the convention and covers the scenario."""

    def test_headers_follow_the_convention(self, catalogue):
        """Every header is one the convention names (Description is a free extra column)."""
        m_headers, _ = _table(catalogue["Materials"])
        assert set(m_headers) == CONVENTION_MATERIAL_HEADERS
        p_headers, _ = _table(catalogue["Parts"])
        for h in p_headers:
            assert h in CONVENTION_PART_HEADERS or h == "Description" or CONVENTION_LAYER_GROUP.match(h), h

    def test_at_least_30_parts_with_unique_ids(self, parts):
        ids = [r["Part"] for r in parts]
        assert len(ids) >= 30
        assert len(set(ids)) == len(ids)
        assert all(re.fullmatch(r"MPD-[ST]-\d{3}", i) for i in ids)

    def test_one_to_four_layers(self, parts):
        """Parts with 1, 2, 3 and 4 layers are all present, and none with more."""
        counts = {_layers_of(r) for r in parts}
        assert counts == {1, 2, 3, 4}

    def test_both_product_families(self, parts):
        ids = [r["Part"] for r in parts]
        assert sum(i.startswith("MPD-S-") for i in ids) >= 15
        assert sum(i.startswith("MPD-T-") for i in ids) >= 5

    def test_inch_parts_hold_their_own_units(self, parts):
        """The US-line parts type inches in every diameter and length cell; they parse as lengths."""
        inch = [r for r in parts if isinstance(r["Length [mm]"], str) and r["Length [mm]"].endswith(" in")]
        assert len(inch) >= 5
        for r in inch:
            for n in range(1, _layers_of(r) + 1):
                od = r[f"Layer {n} outer diameter [mm]"]
                assert isinstance(od, str) and od.endswith(" in"), (r["Part"], od)
                # 1 in = 25.4 mm exactly (international inch, common practice)
                number = float(od.split()[0])
                assert parse_value(od, "length", "mm") == pytest.approx(number * 0.0254, rel=1e-12)

    def test_us_duties_in_us_units(self, parts):
        """The US line gives torques in lbf·in / lbf·ft and powers in hp, in the cells."""
        cells = [str(r["Torque [N·m]"]) for r in parts] + [str(r["Power [kW]"]) for r in parts]
        assert any(c.endswith(" lbf·in") for c in cells)
        assert any(c.endswith(" lbf·ft") for c in cells)
        assert sum(c.endswith(" hp") for c in cells) >= 3

    def test_duties_as_torque_and_as_power_at_speed(self, parts):
        """Both duty forms occur; every power duty has a speed and no torque."""
        by_torque = [r for r in parts if r["Torque [N·m]"] is not None]
        by_power = [r for r in parts if r["Power [kW]"] is not None]
        assert len(by_torque) >= 10 and len(by_power) >= 10
        for r in by_power:
            assert r["Speed [rpm]"] is not None and r["Torque [N·m]"] is None, r["Part"]
        assert any(r["Service factor"] is not None for r in by_power)

    def test_twist_limits_and_kt(self, parts):
        assert sum(r["Twist limit [deg]"] is not None for r in parts) >= 3
        assert sum(r["Twist limit per length [deg/m]"] is not None for r in parts) >= 3
        assert sum(r["Layer 1 Kt"] is not None for r in parts) >= 10


class TestMaterials:
    """Library rows leave properties blank; the works' own rows give them; every rule occurs."""

    def test_library_rows_name_library_materials_and_leave_properties_blank(self, catalogue):
        _, rows = _table(catalogue["Materials"])
        library = {k.casefold() for k in material_library()}
        lib_rows = [r for r in rows if r["Material"].casefold() in library]
        assert len(lib_rows) >= 5
        for r in lib_rows:
            assert r["G [GPa]"] is None and r["Yield strength [MPa]"] is None, r["Material"]

    def test_own_rows_give_their_properties(self, catalogue):
        _, rows = _table(catalogue["Materials"])
        library = {k.casefold() for k in material_library()}
        own = [r for r in rows if r["Material"].casefold() not in library]
        assert len(own) >= 5
        for r in own:
            assert r["G [GPa]"] is not None and r["E [GPa]"] is not None, r["Material"]
            given = r["Allowable shear [MPa]"] is not None
            derived = r["Yield strength [MPa]"] is not None
            assert given != derived, r["Material"]

    def test_every_allowable_rule_and_both_keyway_answers(self, catalogue):
        _, rows = _table(catalogue["Materials"])
        assert {r["Allowable rule"] for r in rows} == {"given", "max shear", "distortion energy",
                                                       "shafting code"}
        assert {r["Keyway"] for r in rows} >= {"yes", "no"}

    def test_parts_name_known_materials_except_the_planted_one(self, catalogue, parts):
        _, rows = _table(catalogue["Materials"])
        known = {r["Material"].casefold() for r in rows} | {k.casefold() for k in material_library()}
        planted = {p.found for p in sb.planted_problems() if p.kind == "unknown_material"}
        used = {r[f"Layer {n} material"] for r in parts for n in range(1, 5)} - {None}
        assert {m for m in used if m.casefold() not in known} == planted


@pytest.fixture(scope="module")
def problems() -> dict[str, sb.PlantedProblem]:
    return {p.kind: p for p in sb.planted_problems()}


class TestPlantedProblems:
    """Each deliberately bad cell holds exactly the fault the list says."""

    def test_all_intended_kinds_are_planted(self, problems):
        assert set(problems) == {"gap", "inner_not_less_than_outer", "unknown_material",
                                 "wrong_dimension", "implausible_magnitude", "missing_value",
                                 "not_a_number", "unknown_part", "duplicate_layer"}

    def _row_of(self, ws, cell: str) -> dict[str, object]:
        headers = [c.value for c in ws[1]]
        row = ws[cell].row
        return dict(zip(headers, (c.value for c in ws[row])))

    def test_gap_between_layers(self, catalogue, problems):
        p = problems["gap"]
        row = self._row_of(catalogue[p.sheet], p.cell)
        assert catalogue[p.sheet][p.cell].value == row[f"Layer {p.layer} inner diameter [mm]"]
        assert row[f"Layer {p.layer} inner diameter [mm]"] > row[f"Layer {p.layer - 1} outer diameter [mm]"]

    def test_inner_not_less_than_outer(self, catalogue, problems):
        p = problems["inner_not_less_than_outer"]
        row = self._row_of(catalogue[p.sheet], p.cell)
        assert catalogue[p.sheet][p.cell].value == row[f"Layer {p.layer} inner diameter [mm]"]
        assert row[f"Layer {p.layer} inner diameter [mm]"] >= row[f"Layer {p.layer} outer diameter [mm]"]

    def test_unknown_material(self, catalogue, problems):
        p = problems["unknown_material"]
        name = catalogue[p.sheet][p.cell].value
        assert name == p.found
        assert name.casefold() not in {k.casefold() for k in material_library()}
        assert name not in {r["Material"] for r in _table(catalogue["Materials"])[1]}

    def test_wrong_dimension_in_a_diameter(self, catalogue, problems):
        p = problems["wrong_dimension"]
        ws = catalogue[p.sheet]
        assert ws.cell(1, ws[p.cell].column).value.endswith("outer diameter [mm]")
        assert ws[p.cell].value == "52 GPa"
        with pytest.raises(ValueError, match="length"):
            parse_value(ws[p.cell].value, "length", "mm")

    def test_implausible_shear_modulus(self, catalogue, problems):
        p = problems["implausible_magnitude"]
        ws = catalogue[p.sheet]
        assert ws.cell(1, ws[p.cell].column).value == "G [GPa]"
        # Steels are near 80 GPa (Shigley's table of physical constants, from memory): 79000 is MPa.
        assert ws[p.cell].value == 79000

    def test_missing_required_value(self, catalogue, problems):
        p = problems["missing_value"]
        ws = catalogue[p.sheet]
        row = self._row_of(ws, p.cell)
        assert ws[p.cell].value is None
        assert row[f"Layer {p.layer} material"] is not None  # the layer is used, its size is not

    def test_text_in_a_number_cell(self, catalogue, problems):
        p = problems["not_a_number"]
        ws = catalogue[p.sheet]
        assert ws.cell(1, ws[p.cell].column).value == "Torque [N·m]"
        assert ws[p.cell].value == "tbc"

    def test_layer_book_orphan_and_duplicate(self, problems):
        wb = _load(SAMPLES / sb.CATALOGUE_LONG_FILE)
        part_ids = {r["Part"] for r in _table(wb["Parts"])[1]}
        orphan, dup = problems["unknown_part"], problems["duplicate_layer"]
        assert wb[orphan.sheet][orphan.cell].value == orphan.part
        assert orphan.part not in part_ids
        ws = wb[dup.sheet]
        r = ws[dup.cell].row
        key = (ws.cell(r, 1).value, ws.cell(r, 2).value)
        earlier = [(ws.cell(i, 1).value, ws.cell(i, 2).value) for i in range(2, r)]
        assert key == (dup.part, dup.layer) and key in earlier

    def test_good_rows_carry_no_planted_fault(self, parts):
        """Outside the planted rows, layers touch and every diameter cell is a number or a length."""
        bad_parts = {p.part for p in sb.planted_problems()}
        for r in parts:
            if r["Part"] in bad_parts:
                continue
            prev_od = None
            for n in range(1, _layers_of(r) + 1):
                od = parse_value(r[f"Layer {n} outer diameter [mm]"], "length", "mm")
                inner = parse_value(r[f"Layer {n} inner diameter [mm]"], "length", "mm")
                assert inner < od, (r["Part"], n)
                if prev_od is not None:
                    assert inner == pytest.approx(prev_od, abs=1e-9), (r["Part"], n)
                prev_od = od


class TestLayerBook:
    """The one-row-per-layer variant."""

    def test_layout_and_size(self):
        wb = _load(SAMPLES / sb.CATALOGUE_LONG_FILE)
        p_headers, parts = _table(wb["Parts"])
        assert not any(CONVENTION_LAYER_GROUP.match(str(h)) for h in p_headers)
        l_headers, layers = _table(wb["Layers"])
        assert l_headers == CONVENTION_LAYER_HEADERS
        assert len(parts) >= 10
        keyed = {r["Part"] for r in layers}
        assert {r["Part"] for r in parts} <= keyed

    def test_layers_agree_with_the_wide_catalogue(self, parts):
        """Each part's layers in the long book equal that part's layer groups in the catalogue."""
        wb = _load(SAMPLES / sb.CATALOGUE_LONG_FILE)
        _, layers = _table(wb["Layers"])
        wide = {r["Part"]: r for r in parts}
        seen: set[tuple[str, int]] = set()
        for r in layers:
            key = (r["Part"], r["Layer"])
            if r["Part"] not in wide or key in seen:
                continue  # the planted orphan and duplicate
            seen.add(key)
            w, n = wide[r["Part"]], r["Layer"]
            assert (r["Material"], r["Outer diameter [mm]"], r["Inner diameter [mm]"], r["Kt"]) == (
                w[f"Layer {n} material"], w[f"Layer {n} outer diameter [mm]"],
                w[f"Layer {n} inner diameter [mm]"], w[f"Layer {n} Kt"])


class TestReadMe:
    """Every sample book says it is invented and carries the cautions."""

    @pytest.mark.parametrize("name", BOOKS)
    def test_read_me_sheet_carries_the_cautions(self, name):
        wb = _load(SAMPLES / name)
        assert wb.sheetnames[0] == "Read me"
        text = " ".join(str(c.value) for row in wb["Read me"].iter_rows() for c in row if c.value).lower()
        for phrase in ("invented", "preliminary design aid", "codes and standards",
                       "qualified engineer", "local codes", "licensed engineering practice"):
            assert phrase in text, (name, phrase)

    def test_read_me_lists_each_planted_cell(self):
        wb = _load(SAMPLES / sb.CATALOGUE_FILE)
        text = " ".join(str(c.value) for row in wb["Read me"].iter_rows() for c in row if c.value)
        for p in sb.planted_problems():
            if p.book == sb.CATALOGUE_FILE:
                assert f"{p.sheet}!{p.cell}" in text


@pytest.fixture(scope="module")
def formula_cells() -> dict[tuple[str, str], str]:
    """(sheet, cell) -> formula text of every formula cell in the cell-functions book."""
    wb = _load(SAMPLES / sb.CELL_FUNCTIONS_FILE)
    out = {}
    for ws in wb:
        for row in ws.iter_rows():
            for c in row:
                text = c.value.text if isinstance(c.value, ArrayFormula) else c.value
                if isinstance(text, str) and text.startswith("="):
                    out[(ws.title, c.coordinate)] = text
    return out


class TestCellFunctionsBook:
    """The small book calls the cell functions by their real names and stores no cached values."""

    def test_formulas_call_only_defined_cell_functions(self, formula_cells):
        cells = pytest.importorskip("twistshare.engine.cells")
        defined = {n.upper() for n in getattr(cells, "__all__", ()) if n.upper().startswith("TWS_")}
        if not defined:
            pytest.skip("twistshare.engine.cells exports no TWS_ functions yet")
        called = {m.upper() for f in formula_cells.values()
                  for m in re.findall(r"\b(TWS_[A-Z0-9_]+)\s*\(", f, re.I)}
        assert len(formula_cells) >= 5 and called
        assert called <= defined, called - defined

    def test_formula_cells_have_no_cached_value(self, formula_cells):
        """openpyxl stores no cached value, so a value-only read finds every formula cell empty."""
        assert formula_cells
        wb = _load(SAMPLES / sb.CELL_FUNCTIONS_FILE, data_only=True)
        assert {key: wb[key[0]][key[1]].value for key in formula_cells} == dict.fromkeys(formula_cells)


@pytest.mark.skipif(shutil.which("soffice") is None, reason="LibreOffice not installed")
def test_sample_books_open_in_libreoffice(tmp_path):
    """Headless LibreOffice Calc converts every sample book without an error."""
    profile = tmp_path / "lo_profile"
    cmd = ["soffice", "--headless", f"-env:UserInstallation=file://{profile}", "--convert-to", "pdf",
           "--outdir", str(tmp_path / "pdf")] + [str(SAMPLES / n) for n in BOOKS]
    proc = subprocess.run(cmd, capture_output=True, text=True, timeout=300)
    assert proc.returncode == 0, proc.stderr
    for n in BOOKS:
        assert (tmp_path / "pdf" / n.replace(".xlsx", ".pdf")).stat().st_size > 0


def test_cell_functions_book_inputs_rate_as_a_hand_calculation():
    """The sheet's blocks, passed to the cell functions, give the hand method's numbers.

    Hand method (BRIEF §2, twist compatibility): J = π/32·(Do⁴ − Di⁴), capacity of layer i
    τa·ΣGJ/(G·ro·Kt), twist capacity φ·ΣGJ/L; the smallest governs (common practice).
    Allowable of the core by distortion energy, Sy/(√3·FS) (textbook von Mises factor).
    """
    cells = pytest.importorskip("twistshare.engine.cells")
    import math

    ws = _load(SAMPLES / sb.CELL_FUNCTIONS_FILE)["Shaft MPD-S-061"]
    layers = [[c.value for c in row] for row in ws["B5:F8"]]
    materials = [[c.value for c in row] for row in ws["B11:H12"]]
    length, twist_limit = ws["B15"].value, ws["B19"].value
    torque = cells.TWS_TORQUE_FROM_POWER(ws["B16"].value, ws["B17"].value, ws["B18"].value)
    # T[N·m] ≈ 9549·P[kW]/n[rpm] (BRIEF §2; 9549 is 60000/2π rounded)
    assert torque == pytest.approx(60000 / (2 * math.pi) * 45 * 1.25 / 2950, rel=1e-12)

    lib = material_library()
    g = [80e9, lib[layers[2][0]].shear_modulus, lib[layers[3][0]].shear_modulus]
    tau = [650e6 / (math.sqrt(3) * 2.0), 55.6e6, 51.2e6]
    kt = [1.5, 1.0, 1.0]
    od = [0.048, 0.052, 0.058]
    idd = [0.0, 0.048, 0.052]
    gj = [gi * math.pi / 32 * (o**4 - i**4) for gi, o, i in zip(g, od, idd)]
    total = sum(gj)
    caps = [t * total / (gi * o / 2 * k) for t, gi, o, k in zip(tau, g, od, kt)]
    twist_cap = math.radians(0.25) * total / 0.8
    got = cells.TWS_GOVERNING_LIMIT(layers, length, twist_limit, None, None, materials)
    assert got == pytest.approx(min(caps + [twist_cap]), rel=1e-9)
    assert cells.TWS_GOVERNS(layers, length, twist_limit, None, materials) == "twist angle limit"
    shares = [row[0] for row in cells.TWS_SHARE(layers, None, materials)[1:]]
    assert shares == pytest.approx([x / total for x in gj], rel=1e-9)


def test_a_part_id_names_one_part_across_the_sample_books():
    """The cell-functions book's shaft has an id of its own: the catalogue's ids name other parts."""
    from twistshare.sample_books import sample_part_ids

    catalogue_ids = set(sample_part_ids())
    ws_names = _load(SAMPLES / sb.CELL_FUNCTIONS_FILE).sheetnames
    shaft = next(name for name in ws_names if name.startswith("Shaft "))
    assert shaft.removeprefix("Shaft ") not in catalogue_ids
