"""Results outside the workbook: the terminal table, CSV/JSON for scripts, the failing exit code.

The files must say what the results sheet says (read back with openpyxl, an independent
reader); exit 3 with --exit-if-failing is checked against the sheet's own FAILS count.
"""

from __future__ import annotations

import csv
import json
from pathlib import Path

import openpyxl
import pytest
from twistshare.workbook_bridge.commands import main

SAMPLES = Path(__file__).resolve().parents[2] / "sample_books"
CATALOGUE = SAMPLES / "marrowby_catalogue.xlsx"


@pytest.fixture(scope="module")
def rated(tmp_path_factory):
    folder = tmp_path_factory.mktemp("terminal")
    out, data = folder / "rated.xlsx", folder / "results.csv"
    assert main(["rate", str(CATALOGUE), "-o", str(out), "-q", "--lenient", "--results", str(data)]) == 0
    sheet = openpyxl.load_workbook(out)["Twistshare results"]
    head = [c.value for c in sheet[1]]
    rows = {r[0]: dict(zip(head, r)) for r in sheet.iter_rows(min_row=2, values_only=True)}
    return folder, out, data, rows


def test_csv_equals_the_results_sheet(rated):
    _, _, data, rows = rated
    with data.open(encoding="utf-8") as f:
        records = list(csv.DictReader(f))
    assert [r["Part"] for r in records] == list(rows)
    for record in records:
        row = rows[record["Part"]]
        assert record["Status"] == row["Status"]
        for key in ("Governing limit [N·m]", "Margin [%]", "Reserve factor (limit / demand)", "Demand torque [N·m]"):
            if row[key] is None:
                assert record[key] == ""
            else:
                assert float(record[key]) == pytest.approx(row[key], rel=1e-12), (record["Part"], key)
        assert (record["Governs"] or None) == row["Governs"]


def test_json_holds_the_same_records(rated, tmp_path):
    folder, _, data, rows = rated
    js = tmp_path / "results.json"
    assert main(["rate", str(CATALOGUE), "-o", str(tmp_path / "r.xlsx"), "-q", "--lenient", "--results", str(js)]) == 0
    records = json.loads(js.read_text(encoding="utf-8"))
    assert [r["Part"] for r in records] == list(rows)
    failing = [r["Part"] for r in records if r["Status"] == "FAILS"]
    assert failing == [p for p, row in rows.items() if row["Status"] == "FAILS"] and failing


def test_exit_code_tells_failing_parts(rated, tmp_path):
    _, _, _, rows = rated
    assert any(row["Status"] == "FAILS" for row in rows.values())
    code = main(["rate", str(CATALOGUE), "-o", str(tmp_path / "x.xlsx"), "-q", "--lenient", "--exit-if-failing"])
    assert code == 3
    # without the option the sample's failing parts do not change the exit code
    assert main(["rate", str(CATALOGUE), "-o", str(tmp_path / "y.xlsx"), "-q", "--lenient"]) == 0


def test_terminal_table_lists_the_lowest_margins(rated, tmp_path, capsys):
    _, _, _, rows = rated
    main(["rate", str(CATALOGUE), "-o", str(tmp_path / "t.xlsx"), "--lenient"])
    err = capsys.readouterr().err
    lowest = sorted((row["Margin [%]"], p) for p, row in rows.items() if row["Margin [%]"] is not None)[:10]
    assert "lowest margins" in err
    for margin, part in lowest:
        assert f"{part:<22}{margin:>11.1f}" in err
    main(["rate", str(CATALOGUE), "-o", str(tmp_path / "q.xlsx"), "--lenient", "-q"])
    assert "lowest margins" not in capsys.readouterr().err
