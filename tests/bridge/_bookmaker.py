"""Build small input books quickly: a valid Materials + Parts book with chosen cells made bad.

Every book follows the input convention in DEVELOPERS.md ("Workbook convention (input)"): a
``Materials`` sheet and a ``Parts`` sheet with one row per part and two layer column groups.
Part ``i`` (zero-based) sits on sheet row ``i + 2``; its id is ``MPD-S-{i + 1:03d}``. Demo data
follows the invented Marrowby Pump & Drive scenario (BRIEF §4); no number describes a real part.

A :class:`Case` replaces cells of one part (or adds material rows, merges, hides) so that many
cases can share one book, one bad part each, and every other part stays as in the clean book.
"""

from __future__ import annotations

import re
import zipfile
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path

import openpyxl
from openpyxl.utils import get_column_letter

__all__ = [
    "CORE", "SLEEVE", "MATERIAL_HEADERS", "PART_COLUMNS", "Case", "ErrorValue", "RawNumber",
    "base_row", "build_book", "cell_of", "part_id", "read_output", "OutputBook",
]

CORE, SLEEVE = "MPD core steel Q2", "MPD duplex sleeve"
MATERIAL_HEADERS = ("Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule")
_MATERIAL_ROWS = ((CORE, 80, 120, "given"), (SLEEVE, 77, 100, "given"))

# key -> header; the order is the column order of the Parts sheet.
PART_COLUMNS: Mapping[str, str] = {
    "part": "Part",
    "length": "Length [mm]",
    "torque": "Torque [N·m]",
    "power": "Power [kW]",
    "speed": "Speed [rpm]",
    "twist": "Twist limit [deg]",
    "m1": "Layer 1 material",
    "od1": "Layer 1 outer diameter [mm]",
    "id1": "Layer 1 inner diameter [mm]",
    "kt1": "Layer 1 Kt",
    "m2": "Layer 2 material",
    "od2": "Layer 2 outer diameter [mm]",
    "id2": "Layer 2 inner diameter [mm]",
    "kt2": "Layer 2 Kt",
}
_KEYS = tuple(PART_COLUMNS)


@dataclass(frozen=True)
class ErrorValue:
    """An Excel error value held by a cell (``#N/A``), written with data type 'e'."""

    text: str


@dataclass(frozen=True)
class RawNumber:
    """A numeric cell whose stored text is given as is (``NaN``, ``INF``): openpyxl cannot write these."""

    text: str


@dataclass(frozen=True)
class Case:
    """One bad (or doubtful) input placed on one part.

    ``cells`` replaces the part's cells by column key (None empties a cell). ``flag`` is the column
    whose cell must carry the comment ('part' for a part-level finding). ``words`` must all appear
    in that comment (case-insensitive). ``outcome`` is 'refused' (not rated), 'warned' (rated,
    with a comment) or 'same' (read right: rated exactly like the clean part, no comment needed).
    ``materials`` are extra rows appended to the Materials sheet; ``merge`` merges the part's
    cells across the given column keys; ``hidden`` hides the part's row.
    """

    name: str
    cls: str
    cells: Mapping[str, object] = field(default_factory=dict)
    flag: str = "part"
    words: tuple[str, ...] = ()
    outcome: str = "refused"
    materials: tuple[tuple[object, ...], ...] = ()
    merge: tuple[str, str] | None = None
    hidden: bool = False


def part_id(i: int) -> str:
    return f"MPD-S-{i + 1:03d}"


def base_row(i: int) -> dict[str, object]:
    """The clean inputs of part ``i``: a steel core with a duplex sleeve fitted over it."""
    od1 = 40 + (i % 10)
    return {
        "part": part_id(i), "length": 300 + 5 * i, "torque": 400 + 3 * i, "power": None, "speed": None,
        "twist": None, "m1": CORE, "od1": od1, "id1": None, "kt1": 1, "m2": SLEEVE, "od2": od1 + 8,
        "id2": od1, "kt2": None,
    }


def cell_of(i: int, key: str) -> str:
    """The A1 reference of part ``i``'s cell in column ``key``."""
    return f"{get_column_letter(_KEYS.index(key) + 1)}{i + 2}"


def build_book(path: Path, n_parts: int, cases: Mapping[int, Case] | None = None, *,
               headers: Mapping[str, str] | None = None, sheet_cells: Mapping[str, object] | None = None) -> Path:
    """Write a book of ``n_parts`` parts; ``cases`` maps a part index to the case placed on it.

    ``headers`` overrides header texts by column key; ``sheet_cells`` sets any Parts cell by A1
    reference after the rows are written (for the odd case that is not about one part).
    """
    cases = dict(cases or {})
    wb = openpyxl.Workbook()
    ms = wb.active
    ms.title = "Materials"
    ms.append(list(MATERIAL_HEADERS))
    for row in _MATERIAL_ROWS:
        ms.append(list(row))
    raw: dict[str, dict[str, str]] = {"Materials": {}, "Parts": {}}
    for case in cases.values():
        for row in case.materials:
            r = ms.max_row + 1
            for c, v in enumerate(row, start=1):
                _put(ms, r, c, v, raw["Materials"])
    ps = wb.create_sheet("Parts")
    head = dict(PART_COLUMNS)
    head.update(headers or {})
    ps.append([head[k] for k in _KEYS])
    for i in range(n_parts):
        values = base_row(i)
        case = cases.get(i)
        if case is not None:
            values.update(case.cells)
        for c, k in enumerate(_KEYS, start=1):
            _put(ps, i + 2, c, values[k], raw["Parts"])
        if case is not None and case.merge:
            a, b = (_KEYS.index(k) + 1 for k in case.merge)
            ps.merge_cells(start_row=i + 2, start_column=min(a, b), end_row=i + 2, end_column=max(a, b))
        if case is not None and case.hidden:
            ps.row_dimensions[i + 2].hidden = True
    for ref, v in (sheet_cells or {}).items():
        r, c = openpyxl.utils.cell.coordinate_to_tuple(ref)
        _put(ps, r, c, v, raw["Parts"])
    wb.save(path)
    if raw["Materials"] or raw["Parts"]:
        _patch_raw_numbers(path, raw)
    return path


def _put(ws, row: int, col: int, value: object, raw: dict[str, str]) -> None:
    cell = ws.cell(row=row, column=col)
    if isinstance(value, ErrorValue):
        cell.value = value.text
        cell.data_type = "e"
    elif isinstance(value, RawNumber):
        cell.value = 0  # a numeric placeholder, its stored text replaced after saving
        raw[cell.coordinate] = value.text
    else:
        cell.value = value


def _patch_raw_numbers(path: Path, raw: dict[str, dict[str, str]]) -> None:
    """Replace the stored text of placeholder numeric cells in the saved package."""
    members = {"Materials": "xl/worksheets/sheet1.xml", "Parts": "xl/worksheets/sheet2.xml"}
    with zipfile.ZipFile(path) as zf:
        items = [(info, zf.read(info.filename)) for info in zf.infolist()]
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
        for info, data in items:
            for sheet, member in members.items():
                if info.filename == member:
                    text = data.decode("utf-8")
                    for ref, stored in raw[sheet].items():
                        pat = re.compile(rf'(<c r="{ref}"[^>]*>)<v>0</v>')
                        text, n = pat.subn(lambda m: f"{m.group(1)}<v>{stored}</v>", text)
                        assert n == 1, f"placeholder {sheet}!{ref} not found"
                    data = text.encode("utf-8")
            zf.writestr(info, data)


@dataclass
class OutputBook:
    """What the tool wrote, read back with openpyxl: comments by sheet and cell, result rows by part."""

    comments: dict[str, dict[str, str]]
    results: list[dict[str, object]]
    sheetnames: list[str]

    def comment(self, sheet: str, ref: str) -> str | None:
        return self.comments.get(sheet, {}).get(ref)

    def result_rows(self, pid: str) -> list[dict[str, object]]:
        return [r for r in self.results if r.get("Part") == pid]


def read_output(path: Path, scrub: Sequence[str] = ()) -> OutputBook:
    """Read comments of every sheet and the results sheet's rows (header -> value).

    ``scrub`` lists stored numeric texts openpyxl cannot read (``NaN``, ``INF``): in a scratch
    copy they become 0 before loading; comments and our sheets are untouched by that.
    """
    if scrub:
        path = _scrubbed_copy(path, scrub)
    wb = openpyxl.load_workbook(path)
    comments: dict[str, dict[str, str]] = {}
    for ws in wb.worksheets:
        got = {}
        for row in ws.iter_rows():
            for c in row:
                if c.comment is not None:
                    got[c.coordinate] = c.comment.text
        comments[ws.title] = got
    results: list[dict[str, object]] = []
    if "Twistshare results" in wb.sheetnames:
        rows = list(wb["Twistshare results"].iter_rows(values_only=True))
        head = rows[0]
        results = [dict(zip(head, r)) for r in rows[1:]]
    return OutputBook(comments, results, list(wb.sheetnames))


def _scrubbed_copy(path: Path, scrub: Sequence[str]) -> Path:
    dst = path.with_name(path.stem + ".scrubbed.xlsx")
    pat = re.compile(rb"<v>(?:" + b"|".join(re.escape(t.encode()) for t in scrub) + rb")</v>")
    with zipfile.ZipFile(path) as zin, zipfile.ZipFile(dst, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            data = zin.read(info.filename)
            if info.filename.startswith("xl/worksheets/"):
                data = pat.sub(b"<v>0</v>", data)
            zout.writestr(info, data)
    return dst


def parts_table(cases: Sequence[Case], clean_between: int = 1) -> tuple[int, dict[int, Case]]:
    """Place cases on parts with ``clean_between`` clean parts between them: (part count, placement)."""
    step = clean_between + 1
    placed = {1 + k * step: case for k, case in enumerate(cases)}
    return 1 + len(cases) * step, placed
