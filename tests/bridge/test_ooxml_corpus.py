"""Real-world-shaped books keep everything; every book we write opens in LibreOffice and openpyxl."""

from __future__ import annotations

import shutil
import subprocess

import pytest
from twistshare.workbook_bridge.ooxml import BarChart, BookWriter, Cell, ScatterChart, SeriesData, inspect_package

CAUTION = ("Preliminary design aid. Verify against the applicable codes and standards and have a "
           "qualified engineer review the results; local codes and licensed practice prevail.")


def _full_run(src, out):
    """Everything the bridge does to a book: three sheets, comments on input and output, two charts."""
    with BookWriter(src) as book:
        results = book.add_sheet("Twistshare results",
                                 [[Cell(h, "header") for h in ("Part", "Capacity [N·m]", "Demand [N·m]", "Margin")],
                                  ["MPD-S-014", 520.0, 310.0, Cell(0.677, "percent")],
                                  [Cell("MPD-T-203", "fail"), Cell(80.0, "fail"), 95.0, Cell(-0.158, "fail+percent")]],
                                 column_widths=[14, 16, 16, 10])
        summary = book.add_sheet("Twistshare summary",
                                 [[Cell("Summary", "title")], [Cell(CAUTION, "caution")], ["Radius [mm]", "Shear stress [MPa]"],
                                  [0.0, 0.0], [20.0, 40.0], [20.0, 13.5], [26.0, 17.6]],
                                 freeze_header=False, print_fit_one_page=True, column_widths=[14, 18])
        book.add_sheet("Twistshare warnings", [[Cell("Cell", "header"), Cell("Message", "header")],
                                               ["Parts!C3", Cell("torque high for this length", "warn")]])
        book.add_chart(summary, "D1", "K16", ScatterChart("Shear stress across the radius", "Radius [mm]", "Stress [MPa]",
                       [SeriesData("MPD-S-014", summary.range_ref(1, 4, 7), summary.range_ref(2, 4, 7),
                                   [0.0, 20.0, 20.0, 26.0], [0.0, 40.0, 13.5, 17.6])]))
        cats = ["MPD-S-014", "MPD-T-203"]
        book.add_chart(summary, "D18", "K33", BarChart("Capacity and demand by part", "Part", "Torque [N·m]",
                       [SeriesData("Capacity", results.range_ref(1, 2, 3), results.range_ref(2, 2, 3), cats, [520.0, 80.0]),
                        SeriesData("Demand", results.range_ref(1, 2, 3), results.range_ref(3, 2, 3), cats, [310.0, 95.0])]))
        book.set_print_area(summary, "A1:K33")
        book.add_comments("Parts", {"B2": "length below series minimum", "C3": "torque high"})
        book.add_comments("Materials", {"B3": "G filled from the built-in library"})
        book.add_comments(results, {"D3": "governing: layer 1 stress"})
        return book.write(out)


@pytest.mark.parametrize("fixture, suffix", [("ooxml_plain_book", ".xlsx"), ("ooxml_rich_book", ".xlsx"),
                                             ("ooxml_macro_book", ".xlsm")])
def test_everything_kept(request, tmp_path, ooxml_kit, fixture, suffix):
    src = request.getfixturevalue(fixture)
    before_hash = ooxml_kit.sha256(src)
    before = ooxml_kit.members(src)
    out = tmp_path / ("out" + suffix)
    report = _full_run(src, out)
    assert ooxml_kit.sha256(src) == before_hash
    after = ooxml_kit.members(out)
    for name in report.copied:
        assert after[name] == before[name], name
    for name in report.changed:
        if name.endswith(".vml"):
            continue
        old, new = ooxml_kit.element_multiset(before[name]), ooxml_kit.element_multiset(after[name])
        assert not [e for e in set(old) if old.count(e) > new.count(e)], name
    # What the rich books hold that openpyxl would lose or reset, byte for byte.
    for kept in ("xl/media/image1.png", "xl/drawings/drawing90.xml", "xl/pivotTables/pivotTable1.xml",
                 "xl/pivotCache/pivotCacheDefinition1.xml", "xl/pivotCache/pivotCacheRecords1.xml",
                 "xl/externalLinks/externalLink1.xml", "xl/vbaProject.bin", "xl/charts/chart1.xml",
                 "xl/tables/table1.xml", "xl/sharedStrings.xml", "xl/calcChain.xml"):
        if kept in before:
            assert after[kept] == before[kept], kept
    info = inspect_package(out)
    assert {s.name: s.state for s in info.sheets}.items() >= {"Old rates": "hidden", "Lookup": "veryHidden"}.items()
    book, caught = ooxml_kit.load_clean(out, keep_vba=suffix == ".xlsm")
    assert caught == []
    assert book.sheetnames[-3:] == ["Twistshare results", "Twistshare summary", "Twistshare warnings"]
    assert book["Parts"]["F1"].value == ("Note (inline)" if fixture != "ooxml_plain_book" else None)
    assert book["Twistshare summary"]["A2"].value == CAUTION
    assert book["Parts"]["D4"].comment.text == "tube alloy per supplier cert"


@pytest.mark.skipif(shutil.which("soffice") is None, reason="LibreOffice (soffice) is not installed")
@pytest.mark.parametrize("fixture, suffix", [("ooxml_rich_book", ".xlsx"), ("ooxml_macro_book", ".xlsm")])
def test_libreoffice_opens_output(request, tmp_path, fixture, suffix):
    src = request.getfixturevalue(fixture)
    out = tmp_path / ("shared" + suffix)
    _full_run(src, out)
    profile = tmp_path / "lo_profile"
    run = subprocess.run(["soffice", f"-env:UserInstallation=file://{profile}", "--headless",
                          "--convert-to", "pdf", "--outdir", str(tmp_path), str(out)],
                         capture_output=True, text=True, timeout=120)
    pdf = tmp_path / ("shared.pdf")
    assert run.returncode == 0, run.stderr
    assert pdf.exists() and pdf.stat().st_size > 1000, (run.stdout, run.stderr)
    assert pdf.read_bytes().startswith(b"%PDF")
