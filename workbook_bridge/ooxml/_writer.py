"""BookWriter: the user's package plus our parts, written atomically.

Every member of the input is copied with its uncompressed bytes and its zip metadata unchanged,
except the few the writer must change, which are edited at the text level:

- the workbook part (``<sheet>`` entries appended; a print-area name added),
- the workbook's relationships and ``[Content_Types].xml`` (entries appended/removed),
- the styles part (our fonts, fills, borders, number formats and cell formats appended),
- an input sheet we comment on (one ``<legacyDrawing>`` link) or whose formulas ``share``
  replaces (those ``<c>`` elements only), with its relationships, comments and VML parts.

Beside them it adds the ownership record (``_record``: a custom XML part listing every member
it added, the members it changed as they were before, and its link and filled cells in the
user's worksheets), so that a re-rating can take exactly its own work back out (``_unrate``).

``docProps/app.xml`` (which lists sheet titles for file browsers) is left as it was: spreadsheet
programs rebuild it on save and do not read it to open a book, and leaving it alone keeps one
more user part byte for byte. ``xl/calcChain.xml`` is removed (with its relationship and content
type) only when formulas are replaced: it lists formula cells, and Excel rebuilds it when absent.
"""

from __future__ import annotations

import os
import re
import shutil
import tempfile
import time
import zipfile
from dataclasses import dataclass, field
from typing import Any, BinaryIO, Iterable, Mapping, Sequence

from ._atomic import atomic_file
from ._cells import Cell, stream_rows
from ._charts import BarChart, ScatterChart, anchor_cell, chart_xml, drawing_xml, range_ref
from ._comments import (
    SEPARATOR,
    comment_refs,
    merge_comments_part,
    merge_vml,
    new_comments_part,
    new_vml,
    vml_blocks,
    vml_note_cells,
)
from ._errors import PackageRefused, WriteRefused
from ._naming import backup_path, free_part, unique_sheet_name
from ._opc import (
    CT,
    RT,
    add_overrides,
    append_rels,
    new_rels,
    next_rel_id,
    parse_content_types,
    parse_rels,
    relative_target,
    rels_path_of,
    remove_overrides,
    remove_rels,
    tag_attributes,
)
from ._package import Limits, Package
from ._print_setup import PrintSetup, merge_cells_xml, page_setup_pr_xml, print_titles_ref, print_xml
from ._record_plan import RecordPlan
from ._safety import PackageInfo, SheetInfo, read_package_info
from ._sheetxml import (
    StyledValue,
    insert_link_element,
    insert_missing_cells,
    relationship_prefix,
    replace_cells,
    sheet_head,
    sheet_tail,
)
from ._styles import MINIMAL_STYLES, StyleBook
from ._xmltext import (
    NS_REL,
    column_letters,
    decode_xml,
    escape_attr,
    escape_text,
    find_element_span,
    iter_top_level,
    root_prefix,
    split_ref,
)
from ._zipcopy import _set_level, copy_members

__all__ = ["BookWriter", "SheetHandle", "WriteReport"]

_CHUNK = 1024 * 1024
_MACRO_SUFFIXES = (".xlsm", ".xltm", ".xlam")
# CT_Workbook children that follow <definedNames> (ECMA-376 Part 1, 18.2.27).
_AFTER_DEFINED_NAMES = ("calcPr", "oleSize", "customWorkbookViews", "pivotCaches", "smartTagPr",
                        "smartTagTypes", "webPublishing", "fileRecoveryPr", "webPublishObjects", "extLst")


@dataclass(frozen=True)
class SheetHandle:
    """A sheet the writer added.

    Attributes
    ----------
    name : str
        The name it got (a taken name gets ' (2)', ' (3)', ...).
    part : str
        Its zip member name.
    rows, columns : int
        Last row number written and widest row (1-based).
    """

    name: str
    part: str
    rows: int
    columns: int

    def range_ref(self, column: int, first_row: int, last_row: int | None = None) -> str:
        """Absolute reference to a one-column range of this sheet (1-based column and rows)."""
        return range_ref(self.name, column, first_row, last_row)


@dataclass(frozen=True)
class WriteReport:
    """What ``BookWriter.write`` did.

    Attributes
    ----------
    changed : tuple of str
        Input members whose content the writer changed.
    added, removed : tuple of str
        Members the writer added / left out (only ``xl/calcChain.xml`` is ever left out).
    copied : tuple of str
        Input members copied with identical uncompressed bytes.
    warnings : tuple of str
        Things the caller should tell the user (e.g. an .xlsm saved under an .xlsx name).
    """

    output: str
    backup: str | None
    changed: tuple[str, ...]
    added: tuple[str, ...]
    removed: tuple[str, ...]
    copied: tuple[str, ...]
    warnings: tuple[str, ...]
    seconds: float


@dataclass
class _NewSheet:
    handle: SheetHandle
    body: BinaryIO
    head: str
    print_setup: PrintSetup | None
    merged_xml: str = ""
    comments: dict[str, str] = field(default_factory=dict)
    author: str = "twistshare"
    charts: list[tuple[tuple[int, int], tuple[int, int], ScatterChart | BarChart]] = field(default_factory=list)
    print_area: str | None = None
    print_titles: str | None = None


@dataclass
class _InputSheetEdit:
    info: SheetInfo
    text: str | None = None          # sheet XML (loaded on first need)
    dirty: bool = False              # text differs from the input's
    comments: dict[str, str] = field(default_factory=dict)
    author: str = "twistshare"
    marks: list[str] = field(default_factory=list)  # cells fill_cells filled (for the ownership record)


def _new_info(name: str) -> zipfile.ZipInfo:
    info = zipfile.ZipInfo(name, time.localtime()[:6])
    info.compress_type = zipfile.ZIP_DEFLATED
    info.external_attr = 0o600 << 16
    return info


_VALUE_IN_CELL = re.compile(r"<(?:[\w.-]+:)?(?:v|is|f)\b")


def _holds_values(text: str, refs: Sequence[str]) -> bool:
    """True if any of the cells holds a value or a formula in the sheet XML."""
    for ref in refs:
        col, row = split_ref(ref)
        m = re.search(rf'<(?P<p>(?:[\w.-]+:)?)c\s[^>]*?\br="{column_letters(col)}{row}"[^>]*?(?P<e>/?)>', text)
        if m and not m.group("e"):
            close = text.find("</" + m.group("p") + "c>", m.end())
            if _VALUE_IN_CELL.search(text, m.end(), close):
                return True
    return False


class BookWriter:
    """Adds sheets, comments and charts to a copy of a workbook package.

    The source file is opened read-only, checked (see ``inspect_package``) and never modified;
    ``write`` produces the copy. Use as a context manager, or call ``close``.

    Parameters
    ----------
    source_path : str or os.PathLike
        The user's .xlsx/.xlsm.
    limits : Limits, optional
        Size caps for the safety checks.
    record : bool
        Also write the ownership record (``_record``): which members, comments and marks are
        ours, so that a later re-rating can take exactly them out. It is left out when formulas
        were replaced (a handout cannot be taken back).
    compress_level : int
        zlib level for every member written (1 = fastest; a 50,000 x 40 sheet compresses in
        about 0.7 s at 1 and 2.9 s at 6, 13 % larger). Copied members keep their uncompressed
        bytes and zip metadata; their compressed bytes may differ from the input's.

    Raises
    ------
    PackageRefused
        If the source cannot be used safely (one-line reason).

    Examples
    --------
    >>> with BookWriter("catalogue.xlsx") as book:                      # doctest: +SKIP
    ...     results = book.add_sheet("Twistshare results", [["Part", "Margin"], ["MPD-S-014", 0.42]])
    ...     book.add_comments("Parts", {"D7": "layer 2: inner diameter 38 mm >= outer 36 mm"})
    ...     report = book.write("catalogue-rated.xlsx")
    """

    def __init__(self, source_path: str | os.PathLike, *, limits: Limits | None = None,
                 compress_level: int = 1, record: bool = True) -> None:
        if not (isinstance(compress_level, int) and 0 <= compress_level <= 9):
            raise ValueError(f"compress_level must be an integer 0..9: {compress_level!r}")
        self._level = compress_level
        self._record = record
        self._source = os.path.abspath(os.fspath(source_path))
        self._pkg = Package(self._source, limits)
        try:
            self.info: PackageInfo = read_package_info(self._pkg)
            self._stat = os.stat(self._source)
            self._used = {n.lower() for n in self._pkg.names}
            styles = self.info.styles_part
            try:
                text = decode_xml(self._pkg.read(styles), styles) if styles else MINIMAL_STYLES
                self._styles = StyleBook(text)
            except ValueError as exc:
                raise PackageRefused(self._source, f"styles part cannot be extended: {exc}") from None
        except BaseException:
            self._pkg.close()
            raise
        self._new: list[_NewSheet] = []
        self._inputs: dict[str, _InputSheetEdit] = {}
        self._formulas_replaced = False
        self._closed = False

    # -- context management ------------------------------------------------------------------
    def __enter__(self) -> "BookWriter":
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    def close(self) -> None:
        """Release the source file and the temporary row stores."""
        if not self._closed:
            self._closed = True
            self._pkg.close()
            for sheet in self._new:
                sheet.body.close()

    def _check_open(self) -> None:
        if self._closed:
            raise WriteRefused("this BookWriter is closed (write() can be called once)")

    # -- styles --------------------------------------------------------------------------------
    def style_index(self, style: str) -> int:
        """Cell-format index of a style name (see ``STYLE_NAMES``; names may be joined with '+')."""
        return self._styles.xf(style)

    def _style_attr(self, style: str | None) -> str:
        return f' s="{self._styles.xf(style)}"' if style else ""

    # -- sheets --------------------------------------------------------------------------------
    def _taken_names(self) -> list[str]:
        return [s.name for s in self.info.sheets] + [n.handle.name for n in self._new]

    def add_sheet(self, name: str, rows: Iterable[Sequence[Any]], *,
                  column_widths: Sequence[float | None] | None = None,
                  column_styles: Sequence[str | None] | None = None,
                  freeze_header: bool | int = True, tab_color: str | None = None,
                  print_fit_one_page: bool = False, header_height: float | None = None,
                  print_fit_width: bool = False, row_heights: Mapping[int, float] | None = None,
                  print_setup: PrintSetup | None = None, merged_cells: Sequence[str] = ()) -> SheetHandle:
        """Add a worksheet after the book's own sheets, streaming ``rows`` into it.

        Parameters
        ----------
        name : str
            Sheet name; ' (2)', ' (3)', ... is appended if the book already has it.
        rows : iterable of sequences
            Row 1 first. Values: None (empty), bool, int, float (NaN/inf -> empty), str (always
            text, never a formula), or ``Cell(value, style)``.
        column_widths : sequence of float, optional
            Widths in characters, column A first (None keeps the default).
        column_styles : sequence of str, optional
            Style name for plain values of each column (a ``Cell`` style overrides it).
        freeze_header : bool or int
            Keep row 1 in view when scrolling (a number n: rows 1 to n).
        tab_color : str, optional
            ARGB hex such as 'FF1F3A4D'.
        print_fit_one_page : bool
            Scale the sheet to print on one page (shorthand for a ``PrintSetup``).
        print_fit_width : bool
            Print landscape with every column on the page width (as many pages down as needed).
        print_setup : PrintSetup, optional
            How the sheet prints (orientation, fit or scale and breaks, repeated titles, footer);
            overrides the two shorthands. Without any, the sheet prints portrait, one page wide.
        merged_cells : sequence of str
            Ranges such as 'A3:E3' merged into one cell (long wrapped texts across a table's width).
        row_heights : mapping of int to float, optional
            Heights in points by 1-based row number (room for wrapped text).
        header_height : float, optional
            Height of row 1 in points (room for wrapped header text).

        Returns
        -------
        SheetHandle

        Raises
        ------
        WriteRefused
            For an invalid sheet name.
        TypeError
            For a value that is not one of the types above (the message names the cell).
        """
        self._check_open()
        actual = unique_sheet_name(name, self._taken_names())
        if tab_color is not None and not (len(tab_color) == 8 and all(c in "0123456789abcdefABCDEF" for c in tab_color)):
            raise WriteRefused(f"tab_color must be 8 hex digits ARGB such as 'FF1F3A4D': {tab_color!r}")
        merged_xml = merge_cells_xml(list(merged_cells))  # a bad range is refused before any row is written
        col_attrs = [self._style_attr(s) for s in (column_styles or ())]
        body = tempfile.TemporaryFile(prefix="twistshare-rows-")
        try:
            last_row, widest = stream_rows(rows, body.write, self._style_attr, col_attrs,
                                           first_row_height=header_height, row_heights=row_heights)
        except BaseException:
            body.close()
            raise
        part = free_part("xl/worksheets/sheet{}.xml", self._used)
        dimension = f"A1:{column_letters(widest)}{last_row}" if widest and last_row else None
        if print_setup is None:
            print_setup = PrintSetup(fit_height=1) if print_fit_one_page else \
                PrintSetup(orientation="landscape") if print_fit_width else PrintSetup()
        head = sheet_head(tab_color=tab_color.upper() if tab_color else None,
                          page_setup_pr=page_setup_pr_xml(print_setup), freeze_header=freeze_header,
                          column_widths=column_widths, dimension=dimension)
        handle = SheetHandle(actual, part, last_row, widest)
        self._new.append(_NewSheet(handle, body, head, print_setup, merged_xml,
                                   print_titles=print_titles_ref(actual, print_setup)))
        return handle

    def _new_sheet(self, sheet: SheetHandle | str) -> _NewSheet | None:
        name = sheet.name if isinstance(sheet, SheetHandle) else sheet
        for new in self._new:
            if new.handle.name.casefold() == str(name).casefold():
                return new
        return None

    def _input_sheet(self, name: str) -> _InputSheetEdit:
        try:
            info = self.info.sheet(name)
        except KeyError as exc:
            raise WriteRefused(str(exc.args[0])) from None
        if info.kind != "worksheet" or info.part is None:
            raise WriteRefused(f"sheet {info.name!r} is a {info.kind}, not a worksheet: it cannot take cell comments")
        if info.part not in self._inputs:
            self._inputs[info.part] = _InputSheetEdit(info)
        return self._inputs[info.part]

    def _load_text(self, edit: _InputSheetEdit) -> str:
        if edit.text is None:
            try:
                edit.text = decode_xml(self._pkg.read(edit.info.part), edit.info.part)
            except ValueError as exc:
                raise WriteRefused(f"sheet {edit.info.name!r}: {exc}") from None
        return edit.text

    # -- comments ------------------------------------------------------------------------------
    def add_comments(self, sheet: SheetHandle | str, comments: Mapping[str, str], *,
                     author: str = "twistshare") -> None:
        """Put comments on cells of an input sheet or of a sheet we added.

        Existing comments are kept; where a cell already has one, our text is appended to it
        after a blank line. Calling again for the same cell appends again.

        Parameters
        ----------
        sheet : SheetHandle or str
            A sheet we added, or the name of one of the book's worksheets.
        comments : mapping of str to str
            Cell reference ('D7') to comment text (written as text).
        author : str
            Author shown with new comments.

        Raises
        ------
        WriteRefused
            Unknown sheet, or a sheet that is not a worksheet.
        ValueError
            A malformed cell reference.
        """
        self._check_open()
        target = self._new_sheet(sheet)
        store = target if target is not None else self._input_sheet(str(sheet))
        if not store.comments:
            store.author = author
        for ref, text in comments.items():
            col, row = split_ref(ref)
            key = f"{column_letters(col)}{row}"
            text = str(text)
            store.comments[key] = store.comments[key] + SEPARATOR + text if key in store.comments else text

    # -- charts & printing ---------------------------------------------------------------------
    def add_chart(self, sheet: SheetHandle, anchor_from: tuple[int, int] | str,
                  anchor_to: tuple[int, int] | str, chart: ScatterChart | BarChart) -> None:
        """Place a native chart on a sheet we added, between two cells (1-based or 'B3').

        Raises
        ------
        WriteRefused
            If ``sheet`` is not one we added, or a series refers to a sheet the book lacks.
        """
        self._check_open()
        target = self._new_sheet(sheet)
        if target is None:
            raise WriteRefused(f"charts go on sheets this writer added; {getattr(sheet, 'name', sheet)!r} is not one")
        if not isinstance(chart, (ScatterChart, BarChart)):
            raise TypeError(f"chart must be a ScatterChart or BarChart, not {type(chart).__name__}")
        names = {n.casefold() for n in self._taken_names()}
        for series in chart.series:
            for ref in (series.x_ref, series.y_ref):
                sheet_name = ref.rsplit("!", 1)[0]
                if sheet_name.startswith("'"):
                    sheet_name = sheet_name[1:-1].replace("''", "'")
                if sheet_name.casefold() not in names:
                    raise WriteRefused(f"chart {chart.title!r}, series {series.name!r}: no sheet {sheet_name!r} in the book")
        start, end = anchor_cell(anchor_from), anchor_cell(anchor_to)
        if not (end[0] > start[0] and end[1] > start[1]):
            raise ValueError(f"chart anchor_to {anchor_to!r} must be below and right of anchor_from {anchor_from!r}")
        target.charts.append((start, end, chart))

    def set_print_area(self, sheet: SheetHandle, area: str) -> None:
        """Set the print area of a sheet we added ('A1:H40')."""
        self._check_open()
        target = self._new_sheet(sheet)
        if target is None:
            raise WriteRefused(f"print areas are set on sheets this writer added; {getattr(sheet, 'name', sheet)!r} is not one")
        ends = area.replace("$", "").split(":")
        if len(ends) != 2:
            raise ValueError(f"print area must look like 'A1:H40': {area!r}")
        (c1, r1), (c2, r2) = split_ref(ends[0]), split_ref(ends[1])
        quoted = "'" + target.handle.name.replace("'", "''") + "'"
        target.print_area = f"{quoted}!${column_letters(c1)}${r1}:${column_letters(c2)}${r2}"

    def set_print_titles(self, sheet: SheetHandle, *, columns: int = 0, rows: int = 0) -> None:
        """Repeat the first ``columns`` columns and the first ``rows`` rows on every printed page."""
        self._check_open()
        target = self._new_sheet(sheet)
        if target is None:
            raise WriteRefused(f"print titles are set on sheets this writer added; {getattr(sheet, 'name', sheet)!r} is not one")
        if columns < 0 or rows < 0 or not (columns or rows):
            raise ValueError(f"print titles need columns or rows > 0: columns={columns!r}, rows={rows!r}")
        quoted = "'" + target.handle.name.replace("'", "''") + "'"
        parts = []
        if columns:
            parts.append(f"{quoted}!$A:${column_letters(columns)}")
        if rows:
            parts.append(f"{quoted}!$1:${rows}")
        target.print_titles = ",".join(parts)

    # -- share ---------------------------------------------------------------------------------
    def replace_formulas(self, sheet_name: str, values: Mapping[str, Any], *,
                         create_missing: bool = False) -> dict[str, str]:
        """Replace formula cells of an input sheet by plain values (for a copy without the add-in).

        Only those ``<c>`` elements are rewritten; their style is kept. The calculation chain
        (``xl/calcChain.xml``), which lists formula cells, is dropped from the output; Excel
        rebuilds it.

        Parameters
        ----------
        sheet_name : str
            One of the book's worksheets.
        values : mapping of str to value
            Cell reference to the value to write (None, bool, number or text; text stays text).
        create_missing : bool
            Add cells the sheet does not hold yet (the other cells of an array formula's range,
            which a book may leave out when it has no cached values) instead of refusing.

        Returns
        -------
        dict of str to str
            The formula each replaced cell held, for the caller's comment ('' if it held none;
            also '' for the follower cells of a shared formula, whose text is in its anchor cell).

        Raises
        ------
        WriteRefused
            Unknown sheet, a cell not present, or a shared formula that would be broken.
        """
        self._check_open()
        edit = self._input_sheet(sheet_name)
        text = self._load_text(edit)
        if create_missing:
            text = insert_missing_cells(text, list(values))
        text, formulas, had_formula = replace_cells(text, values)
        edit.text, edit.dirty = text, True
        if had_formula:
            self._formulas_replaced = True
        return formulas

    def fill_cells(self, sheet_name: str, values: Mapping[str, Any]) -> None:
        """Put values into cells of an input sheet that hold nothing (blank or absent).

        Used to show what the tool filled in (e.g. library properties in the user's materials
        table, in the copy only). A ``Cell(value, style)`` also gives the cell one of our styles.

        Raises
        ------
        WriteRefused
            Unknown sheet, or a cell that already holds a value or a formula (nothing of the
            user's is ever overwritten).
        """
        self._check_open()
        edit = self._input_sheet(sheet_name)
        text = self._load_text(edit)
        if _holds_values(text, list(values)):
            raise WriteRefused(f"sheet {sheet_name!r}: a cell among {', '.join(list(values)[:5])} already holds "
                               "something; fill_cells only fills empty cells")
        text = insert_missing_cells(text, list(values))
        wanted = {}
        for ref, v in values.items():
            if isinstance(v, Cell):
                v = StyledValue(v.value, self._styles.xf(v.style)) if v.style else v.value
            wanted[ref] = v
        text, _formulas, _had = replace_cells(text, wanted)
        edit.text, edit.dirty = text, True
        edit.marks.extend(values)

    # -- writing -------------------------------------------------------------------------------
    def write(self, out_path: str | os.PathLike, *, in_place: bool = False) -> WriteReport:
        """Write the output package atomically (temporary file in the same folder, then rename).

        Parameters
        ----------
        out_path : str or os.PathLike
            Output file. It must differ from the source unless ``in_place``.
        in_place : bool
            Replace the source itself, after copying it to ``<name>.bak-YYYYmmdd-HHMMSS``.

        Returns
        -------
        WriteReport

        Raises
        ------
        WriteRefused
            Output is the source without ``in_place``, or the source changed since it was read.
        """
        self._check_open()
        started = time.perf_counter()
        out = os.path.abspath(os.fspath(out_path))
        same = os.path.exists(out) and os.path.samefile(out, self._source)
        if same and not in_place:
            raise WriteRefused(f"output {out} is the input workbook; choose another name "
                               "(or ask for in-place writing, which keeps a backup)")
        if in_place and not same:
            raise WriteRefused("in_place=True needs out_path to be the input workbook itself")
        now = os.stat(self._source)
        if (now.st_size, now.st_mtime_ns) != (self._stat.st_size, self._stat.st_mtime_ns):
            raise WriteRefused(f"input {self._source} changed while it was being processed; run again")
        warnings = []
        suffix = os.path.splitext(out)[1].lower()
        if self.info.macro_enabled and suffix not in _MACRO_SUFFIXES:
            warnings.append(f"the workbook holds macros (macro-enabled package) but the output is named "
                            f"{os.path.basename(out)!r}; Excel opens it only under an .xlsm name")
        elif not self.info.macro_enabled and suffix in _MACRO_SUFFIXES:
            warnings.append(f"the output is named {os.path.basename(out)!r} but the workbook holds no macros; "
                            "Excel expects an .xlsx name")
        plan = self._plan()
        backup = None
        if in_place:
            backup = backup_path(self._source)
            shutil.copy2(self._source, backup)
        self._write_zip(out, plan)
        self.close()
        changed = tuple(n for n in self._pkg.names if n in plan.changed)
        removed = tuple(n for n in self._pkg.names if n in plan.removed)
        copied = tuple(n for n in self._pkg.names if n not in plan.changed and n not in plan.removed)
        return WriteReport(out, backup, changed, tuple(n for n, _ in plan.added), removed, copied,
                           tuple(warnings), time.perf_counter() - started)

    def _write_zip(self, out: str, plan: "_Plan") -> None:
        mode = os.stat(out).st_mode if os.path.exists(out) else (self._stat.st_mode | 0o200)
        with atomic_file(out, mode) as raw:
            with zipfile.ZipFile(raw, "w", allowZip64=True) as zout:
                zout.comment = self._pkg.zip.comment
                copy_members(self._pkg, zout, self._level, drop=plan.removed, replace=plan.changed)
                for name, payload in plan.added:
                    info = _set_level(_new_info(name), self._level)
                    if isinstance(payload, bytes):
                        zout.writestr(info, payload)
                    else:
                        head, body, tail = payload
                        body.seek(0, os.SEEK_END)
                        size = body.tell()
                        body.seek(0)
                        with zout.open(info, "w", force_zip64=size > (1 << 30)) as dst:
                            dst.write(head)
                            shutil.copyfileobj(body, dst, _CHUNK)
                            dst.write(tail)

    # -- planning: every changed and added part, computed before anything is written ----------
    def _plan(self) -> "_Plan":
        plan = _Plan()
        pkg, info = self._pkg, self.info
        ct_name = pkg.find("[Content_Types].xml")
        content_types = decode_xml(pkg.read(ct_name), ct_name)
        wb_part = info.workbook_part
        wb_text = decode_xml(pkg.read(wb_part), wb_part)
        wb_rels_name = pkg.find(rels_path_of(wb_part)) or rels_path_of(wb_part)
        wb_rels_text = decode_xml(pkg.read(wb_rels_name), wb_rels_name) if pkg.find(wb_rels_name) else None
        wb_rel_ids = {r.rel_id for r in parse_rels(pkg.read(wb_rels_name), wb_part)} if wb_rels_text else set()
        wb_rel_entries: list[tuple[str, str, str]] = []
        overrides: list[tuple[str, str]] = []
        blocks_used = self._vml_blocks_in_use()

        # Input sheets: comments (merge or new) and the sheet XML edits.
        for part, edit in self._inputs.items():
            if edit.comments:
                self._plan_input_comments(plan, edit, overrides, blocks_used)
            if edit.dirty:
                plan.changed[part] = edit.text.encode("utf-8")

        # New sheets.
        sheet_entries, defined_names = [], []
        sheet_parts: list[tuple[str, Any]] = []
        next_id = max([s.sheet_id for s in info.sheets] + [0]) + 1
        position = len(info.sheets)
        for new in self._new:
            rel_id = next_rel_id(wb_rel_ids)
            wb_rel_ids.add(rel_id)
            wb_rel_entries.append((rel_id, RT.WORKSHEET, relative_target(wb_part, new.handle.part)))
            overrides.append((new.handle.part, CT.WORKSHEET))
            sheet_entries.append((new.handle.name, next_id, rel_id))
            if new.print_area:
                defined_names.append(("_xlnm.Print_Area", position, new.print_area))
            if new.print_titles:
                defined_names.append(("_xlnm.Print_Titles", position, new.print_titles))
            next_id += 1
            position += 1
            sheet_rels: list[tuple[str, str, str]] = []
            drawing_rel = legacy_rel = None
            if new.charts:
                drawing_rel = f"rId{len(sheet_rels) + 1}"
                drawing = free_part("xl/drawings/drawing{}.xml", self._used)
                sheet_rels.append((drawing_rel, RT.DRAWING, relative_target(new.handle.part, drawing)))
                frames, drawing_rels = [], []
                for k, (start, end, chart) in enumerate(new.charts, start=1):
                    chart_part = free_part("xl/charts/chart{}.xml", self._used)
                    drawing_rels.append((f"rId{k}", RT.CHART, relative_target(drawing, chart_part)))
                    frames.append((start, end, f"rId{k}", f"Chart {k}"))
                    plan.added.append((chart_part, chart_xml(chart).encode("utf-8")))
                    overrides.append((chart_part, CT.CHART))
                plan.added.append((drawing, drawing_xml(frames).encode("utf-8")))
                plan.added.append((rels_path_of(drawing), new_rels(drawing_rels).encode("utf-8")))
                overrides.append((drawing, CT.DRAWING))
            if new.comments:
                comments_part = free_part("xl/comments{}.xml", self._used)
                vml_part = free_part("xl/drawings/vmlDrawing{}.vml", self._used)
                block = self._fresh_block(blocks_used, len(new.comments))
                legacy_rel = f"rId{len(sheet_rels) + 1}"
                sheet_rels.append((legacy_rel, RT.VML, relative_target(new.handle.part, vml_part)))
                sheet_rels.append((f"rId{len(sheet_rels) + 1}", RT.COMMENTS,
                                   relative_target(new.handle.part, comments_part)))
                plan.added.append((comments_part, new_comments_part(new.comments, new.author).encode("utf-8")))
                plan.added.append((vml_part, new_vml(new.comments, block)))
                overrides.append((comments_part, CT.COMMENTS))
                overrides.append((vml_part, CT.VML))
            tail = sheet_tail(print_setup_xml=print_xml(new.print_setup), drawing_rel=drawing_rel,
                              legacy_rel=legacy_rel, merged_cells_xml=new.merged_xml)
            sheet_parts.append((new.handle.part, (new.head.encode("utf-8"), new.body, tail.encode("utf-8"))))
            if sheet_rels:
                plan.added.append((rels_path_of(new.handle.part), new_rels(sheet_rels).encode("utf-8")))

        # Styles.
        if self._styles.changed:
            if info.styles_part:
                plan.changed[info.styles_part] = self._styles.render().encode("utf-8")
            else:
                styles_part = free_part("xl/styles{}.xml", self._used)
                rel_id = next_rel_id(wb_rel_ids)
                wb_rel_ids.add(rel_id)
                wb_rel_entries.append((rel_id, RT.STYLES, relative_target(wb_part, styles_part)))
                plan.added.append((styles_part, self._styles.render().encode("utf-8")))
                overrides.append((styles_part, CT.STYLES))

        # Calculation chain: stale once formulas are gone.
        removed_rel_ids: set[str] = set()
        if self._formulas_replaced and info.calc_chain_part:
            plan.removed.add(info.calc_chain_part)
            removed_rel_ids = {r.rel_id for r in parse_rels(pkg.read(wb_rels_name), wb_part)
                               if r.type == RT.CALC_CHAIN}

        defaults, _ = parse_content_types(content_types.encode("utf-8"))
        record = None
        if self._record and not self._formulas_replaced:
            record = RecordPlan(self._used, wb_part, wb_rel_ids, "xml" in defaults)
            wb_rel_entries.append(record.workbook_rel())
            overrides.extend(record.overrides())
            plan.added.extend(record.fixed_parts())

        # Workbook part, its relationships, content types.
        if sheet_entries or defined_names:
            plan.changed[wb_part] = self._edit_workbook(wb_text, sheet_entries, defined_names).encode("utf-8")
        if wb_rel_entries or removed_rel_ids:
            if wb_rels_text is None:
                plan.added.append((wb_rels_name, new_rels(wb_rel_entries).encode("utf-8")))
            else:
                text = remove_rels(wb_rels_text, removed_rel_ids) if removed_rel_ids else wb_rels_text
                if wb_rel_entries:
                    text = append_rels(text, wb_rel_entries)
                plan.changed[wb_rels_name] = text.encode("utf-8")
        plan.added[:0] = sheet_parts
        if "rels" not in defaults:  # every real package has this default; a hand-made one may not
            overrides.extend((n, CT.RELS) for n, _ in plan.added if n.endswith(".rels"))
        new_ct = content_types
        if plan.removed:
            new_ct = remove_overrides(new_ct, plan.removed)
        if overrides:
            new_ct = add_overrides(new_ct, overrides)
        if new_ct != content_types:
            plan.changed[ct_name] = new_ct.encode("utf-8")
        if record is not None:
            plan.added.append(self._record_part(record, plan))
        return plan

    def _record_part(self, record: RecordPlan, plan: "_Plan") -> tuple[str, bytes]:
        sheets = {part: (edit.info.name, decode_xml(self._pkg.read(part), part), edit.text, edit.marks)
                  for part, edit in self._inputs.items() if part in plan.changed}
        comments = [(e.info.name, len(e.comments)) for e in self._inputs.values()]
        comments += [(n.handle.name, len(n.comments)) for n in self._new]
        return record.record_part(added=plan.added, changed=plan.changed, read_before=self._pkg.read,
                                  worksheets=sheets, sheets=[n.handle.name for n in self._new], comments=comments,
                                  notes=[(e.info.name, ref, text) for e in self._inputs.values()
                                         for ref, text in e.comments.items()])

    def _vml_blocks_in_use(self) -> set[int]:
        blocks: set[int] = set()
        for name in self._pkg.names:
            if name.lower().endswith(".vml"):
                blocks |= vml_blocks(self._pkg.read(name))
        return blocks

    @staticmethod
    def _fresh_block(used: set[int], count: int) -> int:
        need = count // 1024 + 1
        block = max(used | {0}) + 1
        used.update(range(block, block + need))
        return block

    def _plan_input_comments(self, plan: "_Plan", edit: _InputSheetEdit, overrides: list, blocks: set[int]) -> None:
        pkg, part = self._pkg, edit.info.part
        text = self._load_text(edit)
        rels_name = pkg.find(rels_path_of(part))
        rels = parse_rels(pkg.read(rels_name), part) if rels_name else []
        rel_ids = {r.rel_id for r in rels}
        new_rel_entries: list[tuple[str, str, str]] = []
        comments = dict(edit.comments)

        # Comment text.
        if edit.info.comments_part:
            name = edit.info.comments_part
            try:
                merged = merge_comments_part(decode_xml(pkg.read(name), name), comments, edit.author)
            except ValueError as exc:
                raise WriteRefused(f"sheet {edit.info.name!r}: existing comments part {name} cannot be extended ({exc})") from None
            plan.changed[name] = merged.encode("utf-8")
            already = comment_refs(pkg.read(name))
        else:
            name = free_part("xl/comments{}.xml", self._used)
            plan.added.append((name, new_comments_part(comments, edit.author).encode("utf-8")))
            overrides.append((name, CT.COMMENTS))
            rel_id = next_rel_id(rel_ids)
            rel_ids.add(rel_id)
            new_rel_entries.append((rel_id, RT.COMMENTS, relative_target(part, name)))
            already = set()

        # Note shapes: into the VML the sheet already links with <legacyDrawing>, else a new one.
        legacy_rel = self._legacy_rel_id(text)
        vml_part = next((r.part for r in rels if r.rel_id == legacy_rel and r.type == RT.VML), None)
        vml_part = pkg.find(vml_part) if vml_part else None
        if vml_part is not None:
            data = pkg.read(vml_part)
            shown = vml_note_cells(data)
            todo = {ref: body for ref, body in comments.items() if split_ref(ref) not in shown}
            if todo:
                plan.changed[vml_part] = merge_vml(data, todo, self._fresh_block(blocks, len(todo)))
        else:
            if legacy_rel is not None:
                raise WriteRefused(f"sheet {edit.info.name!r} links a legacy drawing ({legacy_rel}) that is missing")
            vml_part = free_part("xl/drawings/vmlDrawing{}.vml", self._used)
            # Show every comment of the sheet, the user's too (they had no shapes before).
            shapes = {ref: body for ref, body in comments.items()}
            for col, row in already:
                shapes.setdefault(f"{column_letters(col)}{row}", "")
            plan.added.append((vml_part, new_vml(shapes, self._fresh_block(blocks, len(shapes)))))
            overrides.append((vml_part, CT.VML))
            rel_id = next_rel_id(rel_ids)
            rel_ids.add(rel_id)
            new_rel_entries.append((rel_id, RT.VML, relative_target(part, vml_part)))
            edit.text, edit.dirty = insert_link_element(text, "legacyDrawing", rel_id), True
        if new_rel_entries:
            if rels_name:
                plan.changed[rels_name] = append_rels(decode_xml(pkg.read(rels_name), rels_name),
                                                      new_rel_entries).encode("utf-8")
            else:
                plan.added.append((rels_path_of(part), new_rels(new_rel_entries).encode("utf-8")))

    @staticmethod
    def _legacy_rel_id(text: str) -> str | None:
        p, _ = root_prefix(text)
        tail_from = text.rfind(f"</{p}sheetData>")
        match = re.search(r"<" + re.escape(p) + r"legacyDrawing\s([^>]*?)/?>", text[max(tail_from, 0):])
        if match is None:
            return None
        for key, value in tag_attributes(match.group(1)).items():
            if key.endswith(":id"):
                return value
        return None

    def _edit_workbook(self, text: str, sheets: list[tuple[str, int, str]],
                       names: list[tuple[str, int, str]]) -> str:
        p, _ = root_prefix(text)
        rp = relationship_prefix(text)
        rel_attr = (lambda rid: f'{rp}:id="{rid}"') if rp else (lambda rid: f'xmlns:tsr="{NS_REL}" tsr:id="{rid}"')
        if sheets:
            entries = "".join(f'<{p}sheet name="{escape_attr(n)}" sheetId="{i}" {rel_attr(r)}/>' for n, i, r in sheets)
            span = find_element_span(text, p + "sheets")
            if span is None:
                raise WriteRefused("workbook part has no <sheets> list")
            if span[1] == span[2] and text[span[0]:span[1]].endswith("/>"):
                text = text[:span[0]] + f"<{p}sheets>{entries}</{p}sheets>" + text[span[3]:]
            else:
                text = text[:span[2]] + entries + text[span[2]:]
        if names:
            entries = "".join(f'<{p}definedName name="{n}" localSheetId="{i}">{escape_text(v)}</{p}definedName>'
                              for n, i, v in names)
            span = find_element_span(text, p + "definedNames")
            if span is not None and span[1] != span[2]:
                text = text[:span[2]] + entries + text[span[2]:]
            elif span is not None:
                text = text[:span[0]] + f"<{p}definedNames>{entries}</{p}definedNames>" + text[span[3]:]
            else:
                opened = find_element_span(text, p + "workbook")
                at = text.rfind(f"</{p}workbook>")
                for name, start, _ in iter_top_level(text, opened[1], at):
                    if name[len(p):] in _AFTER_DEFINED_NAMES:
                        at = start
                        break
                text = text[:at] + f"<{p}definedNames>{entries}</{p}definedNames>" + text[at:]
        return text


@dataclass
class _Plan:
    changed: dict[str, bytes] = field(default_factory=dict)
    added: list[tuple[str, Any]] = field(default_factory=list)
    removed: set[str] = field(default_factory=set)
