"""Recomputing a workbook's formulas in headless LibreOffice, ours included.

LibreOffice runs on a private, throw-away profile holding our functions and one setting
(recalculate every formula when a workbook is loaded, so stale cached values are renewed too).
The book itself is never opened: a copy in a temporary folder is (see `_feed`). LibreOffice
writes nothing; its values come back through UNO and go into a copy of the user's package.

The private profile is made once per LibreOffice version, set of functions and engine, kept in
the user's cache folder as a template, and copied for each run.
"""

from __future__ import annotations

import hashlib
import os
import shutil
import sys
import tempfile
import time
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from twistshare.engine.intake import cell_ref, parse_ref

from ._errors import BookRefused, LibreOfficeFailed, LibreOfficeTimeout
from ._feed import feed_copy
from ._names import ENGINE_ENV
from ._office import Office, find_office, run_office, start_profile
from ._package_values import CellValue, OfficeError, formula_cells, write_with_values
from ._profile import Installed, install, user_folder
from ._runtime import WARNING_SIGN
from ._specs import _function_specs

__all__ = ["RecalcReport", "ComputedValues", "recalculate", "computed_values", "DEFAULT_TIMEOUT"]

DEFAULT_TIMEOUT = 300.0  # seconds for one run, LibreOffice's start included
_RECALC_ON_LOAD = ('<item oor:path="/org.openoffice.Office.Calc/Formula/Load">'
                   '<prop oor:name="OOXMLRecalcMode" oor:op="fuse"><value>0</value></prop></item>\n')
_TEMPLATE_VERSION = "1"


def _cache_root() -> Path:
    if os.name == "nt":
        base = os.environ.get("LOCALAPPDATA") or str(Path.home() / "AppData" / "Local")
    elif sys.platform == "darwin":
        base = str(Path.home() / "Library" / "Caches")
    else:
        base = os.environ.get("XDG_CACHE_HOME") or str(Path.home() / ".cache")
    return Path(base) / "twistshare" / "calc-profiles"


def _office_identity(office: Office) -> bytes:
    program = Path(os.path.realpath(office.soffice)).parent
    for name in ("versionrc", "version.ini", "setuprc"):
        if (program / name).is_file():
            return (program / name).read_bytes()
    return str(os.stat(os.path.realpath(office.soffice)).st_mtime_ns).encode()


def _build_profile(profile: Path, office: Office, files: Installed, timeout: float) -> None:
    profile.mkdir(parents=True)
    start_profile(office.soffice, profile, timeout, office_python=office.uno_python)
    install(profile, files)
    xcu = user_folder(profile) / "registrymodifications.xcu"
    text = xcu.read_text(encoding="utf-8")
    close = text.rfind("</oor:items>")
    if close < 0:
        raise LibreOfficeFailed(f"LibreOffice made an unexpected settings file {xcu}")
    xcu.write_text(text[:close] + _RECALC_ON_LOAD + text[close:], encoding="utf-8")


def private_profile(folder: Path, office: Office, files: Installed, timeout: float) -> Path:
    """A fresh profile with our functions in `folder` (copied from the cached template)."""
    key = hashlib.sha256(b"\0".join([_TEMPLATE_VERSION.encode(), os.path.realpath(office.soffice).encode(),
                                     _office_identity(office), files.basic_xml.encode(),
                                     files.bridge_py.encode(), _RECALC_ON_LOAD.encode()])).hexdigest()[:20]
    target = folder / "profile"
    root = _cache_root()
    template = root / key
    if not (template / "ready").is_file():
        try:
            root.mkdir(parents=True, exist_ok=True)
            building = Path(tempfile.mkdtemp(prefix=".build-", dir=root))
        except OSError:  # no cache: make the profile in place, every run
            _build_profile(target, office, files, timeout)
            return target
        try:
            _build_profile(building / "p", office, files, timeout)
            (building / "p" / "ready").write_text("twistshare Calc host profile template\n", encoding="utf-8")
            try:
                os.rename(building / "p", template)
            except OSError:  # another run made it meanwhile
                pass
        finally:
            shutil.rmtree(building, ignore_errors=True)
        for old in root.iterdir():  # templates of other versions are never used again
            if old.name != key and not old.name.startswith(".build-"):
                shutil.rmtree(old, ignore_errors=True)
    shutil.copytree(template, target, ignore=shutil.ignore_patterns("ready"))
    return target


def _open(book: Path):
    from twistshare.workbook_bridge.ooxml import OoxmlError, inspect_package

    book = Path(book)
    if not book.is_file():
        raise BookRefused(f"{book}: no such file" if not book.exists() else f"{book}: not a workbook file")
    try:
        return inspect_package(book)
    except OoxmlError as error:
        raise BookRefused(str(error)) from None


def _decode(answer: dict[str, Any]) -> dict[str, dict[tuple[int, int], CellValue]]:
    out: dict[str, dict[tuple[int, int], CellValue]] = {}
    for name, sheet in answer.get("sheets", {}).items():
        cells: dict[tuple[int, int], CellValue] = {}
        for r, c, v in sheet.get("values", []):
            cells[(r, c)] = float(v) if isinstance(v, (int, float)) and not isinstance(v, bool) else str(v)
        for r, c, code in sheet.get("errors", []):
            cells[(r, c)] = OfficeError(int(code))
        out[name] = cells
    return out


@dataclass(frozen=True)
class _Run:
    values: dict[str, dict[tuple[int, int], CellValue]]
    missing_sheets: tuple[str, ...]
    seconds: dict[str, float]


def _compute(book: Path, info, cells: dict[str, list[tuple[int, int]]], timeout: float) -> _Run:
    started = time.monotonic()
    office = find_office()
    files = Installed.build()
    try:
        return _compute_with(office, files, book, info, cells, timeout, started)
    except LibreOfficeTimeout:
        raise LibreOfficeTimeout(f"LibreOffice did not finish within {timeout:g} s; it was stopped and "
                                 "nothing was written", timeout) from None


def _compute_with(office: Office, files: Installed, book: Path, info, cells: dict[str, list[tuple[int, int]]],
                  timeout: float, started: float) -> _Run:
    with tempfile.TemporaryDirectory(prefix="twistshare-calc-") as tmp:
        folder = Path(tmp)
        profile = private_profile(folder, office, files, timeout)
        prepared = time.monotonic() - started
        feed = feed_copy(book, info, folder, [f.name for f in _function_specs()])
        remaining = timeout - (time.monotonic() - started)
        if remaining <= 0:
            raise LibreOfficeTimeout("no time left", timeout)
        env = {ENGINE_ENV: os.environ[ENGINE_ENV]} if ENGINE_ENV in os.environ else None
        answer = run_office(office, profile, feed, cells, timeout=remaining, env=env)
    seconds = {k: float(v) for k, v in answer.get("seconds", {}).items()}
    seconds["prepare"] = prepared
    seconds["total"] = time.monotonic() - started
    return _Run(_decode(answer), tuple(answer.get("missing_sheets", ())), seconds)


def _problem(value: CellValue) -> str | None:
    if isinstance(value, OfficeError):
        return f"LibreOffice shows {value}"
    if isinstance(value, str) and value.startswith(WARNING_SIGN):
        return value
    return None


@dataclass(frozen=True)
class RecalcReport:
    """What a recalculation did.

    Attributes
    ----------
    book, out : Path
        The input (never changed) and the copy written.
    formulas : int
        Cells whose values were renewed (every formula cell, and every cell of an array formula).
    problems : tuple of (sheet, cell, what it shows)
        Cells that show an error or a ``⚠`` message.
    seconds : dict of str to float
        ``prepare`` (the private profile), ``connect`` (LibreOffice's start), ``load``, ``read``, ``total``.
    kept : str or None
        Where a file that was already at the output name was kept.
    """

    book: Path
    out: Path
    formulas: int
    problems: tuple[tuple[str, str, str], ...]
    seconds: dict[str, float] = field(default_factory=dict)
    kept: str | None = None

    def __str__(self) -> str:
        total = self.seconds.get("total", 0.0)
        line = f"twistshare: recalculated {self.formulas} formula cells with LibreOffice in {total:.1f} s; wrote {self.out}"
        if self.problems:
            first = self.problems[0]
            line += (f" ({len(self.problems)} show a problem, first {first[0]}!{first[1]}: "
                     f"{' '.join(first[2].split())[:160]})")
        if self.kept:
            line = f"twistshare: kept the file that was at {self.out} as {self.kept}\n" + line
        return line


def recalculate(book: str | os.PathLike, out: str | os.PathLike, *, timeout: float = DEFAULT_TIMEOUT) -> RecalcReport:
    """Recompute every formula of `book` in headless LibreOffice and write the result to `out`.

    The copy is the user's package with only the cached values of formula cells renewed; the
    input is never touched. LibreOffice (and the helper process, when there is one) is ended on
    every path.

    Parameters
    ----------
    book : path
        An .xlsx or .xlsm workbook.
    out : path
        The copy to write (a file already there is kept as ``NAME.bak-<time>``).
    timeout : float, s
        The longest the whole run may take, LibreOffice's start included.

    Returns
    -------
    RecalcReport

    Raises
    ------
    LibreOfficeMissing, LibreOfficeTimeout, LibreOfficeFailed, BookRefused
        With a one-line message; nothing was written.
    """
    from twistshare.engine.errors import BookUnusable
    from twistshare.workbook_bridge.ooxml import check_output_name, check_output_place, keep_previous

    book, out = Path(book), Path(out)
    info = _open(book)
    try:
        if out.exists() and out.resolve() == book.resolve():
            raise BookUnusable(f"{out} is the input workbook: recalculate writes a copy, choose another name")
        check_output_name(info, out)
        check_output_place(out)
    except BookUnusable as error:
        raise BookRefused(str(error)) from None
    cells = formula_cells(book, info)
    # Nothing to compute: the copy is the book itself, and LibreOffice need not start.
    run = _compute(book, info, cells, timeout) if cells else _Run({}, (), {"total": 0.0})
    values = {name: {rc: v for rc, v in run.values.get(name, {}).items()} for name in cells}
    problems = tuple((name, cell_ref(r, c), _problem(v) or "")
                     for name, got in values.items() for (r, c), v in sorted(got.items()) if _problem(v))
    problems += tuple((name, "", "LibreOffice did not find this sheet: its formulas keep their old values")
                      for name in run.missing_sheets)
    try:
        kept = keep_previous(out, False)
        write_with_values(book, out, info, values)
    except OSError as error:
        raise BookRefused(f"cannot write {out}: {error.strerror or error}; nothing was written") from None
    return RecalcReport(book, out, sum(len(v) for v in values.values()), problems, run.seconds, kept)


@dataclass(frozen=True)
class ComputedValues:
    """Cell values after a LibreOffice recalculation.

    Attributes
    ----------
    values : mapping of (sheet, cell) to float or str
        Every cell LibreOffice gave a number or a text (our ``⚠`` messages included, as text).
    not_computed : mapping of (sheet, cell) to str
        Cells with no usable value, and why: an error in LibreOffice, a ``⚠`` message, an unknown
        sheet or a cell that is not a reference.
    seconds : dict of str to float
    """

    values: Mapping[tuple[str, str], float | str]
    not_computed: Mapping[tuple[str, str], str]
    seconds: dict[str, float] = field(default_factory=dict)


def _wanted(info, cells: Mapping[str, Iterable[str]] | Iterable[tuple[str, str]]):
    pairs = ([(s, r) for s, refs in cells.items() for r in ([refs] if isinstance(refs, str) else refs)]
             if isinstance(cells, Mapping) else list(cells))
    by_lower = {s.name.casefold(): s.name for s in info.sheets if s.kind == "worksheet"}
    asked: dict[str, list[tuple[int, int]]] = {}
    refused: dict[tuple[str, str], str] = {}
    keys: dict[tuple[str, tuple[int, int]], tuple[str, str]] = {}
    for sheet, ref in pairs:
        name = by_lower.get(str(sheet).casefold())
        if name is None:
            refused[(sheet, ref)] = f"the book has no worksheet {sheet!r}"
            continue
        try:
            rc = parse_ref(str(ref))
        except ValueError:
            refused[(sheet, ref)] = f"{ref!r} is not a cell reference"
            continue
        asked.setdefault(name, []).append(rc)
        keys[(name, rc)] = (name, cell_ref(*rc))
    return asked, refused, keys


def computed_values(book: str | os.PathLike,
                    cells: Mapping[str, Iterable[str]] | Iterable[tuple[str, str]] | None = None, *,
                    timeout: float = DEFAULT_TIMEOUT) -> ComputedValues:
    """The values of `cells` of `book` after LibreOffice has recomputed every formula.

    For the values-only copy: formulas the project's own evaluator cannot do
    (``INDEX(TWS_SHARE(…);2)``, ``B5*2`` as an argument, a result with no room to spill) get the
    value LibreOffice computes. Nothing is written anywhere.

    Parameters
    ----------
    book : path
    cells : mapping of sheet to cell references, or (sheet, cell) pairs, optional
        Default: every formula cell of the book. Sheet names compare ignoring case; the answer
        uses the book's spelling and plain references (``B7``).
    timeout : float, s

    Returns
    -------
    ComputedValues

    Raises
    ------
    LibreOfficeMissing, LibreOfficeTimeout, LibreOfficeFailed, BookRefused
    """
    book = Path(book)
    info = _open(book)
    if cells is None:
        asked = formula_cells(book, info)
        refused: dict[tuple[str, str], str] = {}
        keys = {(n, rc): (n, cell_ref(*rc)) for n, rcs in asked.items() for rc in rcs}
    else:
        asked, refused, keys = _wanted(info, cells)
    run = _compute(book, info, asked, timeout) if asked else _Run({}, (), {})
    values: dict[tuple[str, str], float | str] = {}
    not_computed = dict(refused)
    for (name, rc), key in keys.items():
        got = run.values.get(name, {})
        if rc not in got:
            not_computed[key] = "LibreOffice gave no value"
            continue
        value = got[rc]
        if not isinstance(value, OfficeError):
            values[key] = value
        why = _problem(value)
        if why:
            not_computed[key] = why
    return ComputedValues(values, not_computed, run.seconds)
