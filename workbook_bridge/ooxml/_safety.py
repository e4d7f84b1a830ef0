"""Read-safety checks and a summary of what a workbook package holds."""

from __future__ import annotations

import os
import re
import xml.etree.ElementTree as ET
from dataclasses import dataclass
from types import MappingProxyType

from ._errors import PackageRefused
from ._opc import CT, RT, Relationship, parse_content_types, parse_rels, rels_path_of
from ._package import Limits, Package
from ._xmltext import NS_MAIN, NS_REL, NS_STRICT_MAIN, column_index

__all__ = ["SheetInfo", "TableInfo", "DefinedName", "ExternalLink", "PackageInfo",
           "inspect_package", "read_package_info", "HUGE_ROWS"]

HUGE_ROWS = 1_000_000  # a declared dimension at/above this is flagged (the grid ends at 1,048,576)
_SHEET_KINDS = MappingProxyType({
    RT.WORKSHEET: "worksheet",
    RT.BASE + "chartsheet": "chartsheet",
    RT.BASE + "dialogsheet": "dialogsheet",
    "http://schemas.microsoft.com/office/2006/relationships/xlMacrosheet": "macrosheet",
    "http://schemas.microsoft.com/office/2006/relationships/xlIntlMacrosheet": "macrosheet",
})
_WORKBOOK_TYPES = frozenset({CT.WORKBOOK, CT.MACRO_WORKBOOK, CT.TEMPLATE, CT.MACRO_TEMPLATE, CT.ADDIN})
_DIMENSION = re.compile(rb"<(?:[\w.-]+:)?dimension\s+ref=\"([^\"]+)\"")
_RANGE = re.compile(r"^\$?([A-Z]{1,3})\$?(\d+)(?::\$?([A-Z]{1,3})\$?(\d+))?$")


@dataclass(frozen=True)
class TableInfo:
    """A workbook table (list object) on a sheet."""

    name: str
    display_name: str
    ref: str
    part: str


@dataclass(frozen=True)
class SheetInfo:
    """One entry of the workbook's sheet list.

    Attributes
    ----------
    state : str
        'visible', 'hidden' or 'veryHidden'.
    kind : str
        'worksheet', 'chartsheet', 'dialogsheet' or 'macrosheet'.
    declared_rows, declared_columns : int or None
        From the sheet's <dimension> element, if it has one.
    """

    name: str
    sheet_id: int
    rel_id: str
    part: str | None
    state: str
    kind: str
    comments_part: str | None
    vml_parts: tuple[str, ...]
    drawing_part: str | None
    tables: tuple[TableInfo, ...]
    dimension: str | None
    declared_rows: int | None
    declared_columns: int | None

    @property
    def huge(self) -> bool:
        """True if the declared dimension spans at least ``HUGE_ROWS`` rows."""
        return (self.declared_rows or 0) >= HUGE_ROWS


@dataclass(frozen=True)
class DefinedName:
    """A workbook defined name; ``local_sheet_id`` is the 0-based sheet position or None."""

    name: str
    value: str
    local_sheet_id: int | None
    hidden: bool


@dataclass(frozen=True)
class ExternalLink:
    """An external-link part and the outside file it points at (None if not found)."""

    part: str
    target: str | None


@dataclass(frozen=True)
class PackageInfo:
    """What a workbook package holds, as far as the writer needs to know.

    Attributes
    ----------
    macro_enabled : bool
        The workbook part has the macro-enabled content type (.xlsm).
    has_vba : bool
        A VBA project part is present.
    notes : tuple of str
        Things worth telling the user that do not stop the run (huge declared sheets, ...).
    """

    path: str
    workbook_part: str
    workbook_content_type: str
    macro_enabled: bool
    has_vba: bool
    sheets: tuple[SheetInfo, ...]
    defined_names: tuple[DefinedName, ...]
    external_links: tuple[ExternalLink, ...]
    styles_part: str | None
    shared_strings_part: str | None
    calc_chain_part: str | None
    members: tuple[str, ...]
    total_uncompressed: int
    notes: tuple[str, ...]

    def sheet(self, name: str) -> SheetInfo:
        """The sheet called ``name`` (sheet names compare case-insensitively).

        Raises
        ------
        KeyError
            If there is no such sheet; the message lists the sheets there are.
        """
        for sheet in self.sheets:
            if sheet.name.casefold() == name.casefold():
                return sheet
        raise KeyError(f"no sheet named {name!r}; the book has {[s.name for s in self.sheets]}")


def _dimension_size(ref: str) -> tuple[int | None, int | None]:
    match = _RANGE.match(ref.strip().upper())
    if match is None:
        return None, None
    c1, r1, c2, r2 = match.groups()
    c2, r2 = c2 or c1, r2 or r1
    return int(r2) - int(r1) + 1, column_index(c2) - column_index(c1) + 1


def _rels_of(pkg: Package, part: str) -> list[Relationship]:
    name = pkg.find(rels_path_of(part))
    if name is None:
        return []
    try:
        return parse_rels(pkg.read(name), part)
    except ET.ParseError as exc:
        raise PackageRefused(pkg.path, f"relationships part {name!r} is not well-formed XML ({exc})") from None


def _parse(pkg: Package, name: str) -> ET.Element:
    try:
        return ET.fromstring(pkg.read(name))
    except ET.ParseError as exc:
        raise PackageRefused(pkg.path, f"part {name!r} is not well-formed XML ({exc})") from None


def read_package_info(pkg: Package) -> PackageInfo:
    """Summarise an opened package (the writer keeps ``pkg`` open; see ``inspect_package``)."""
    shown = pkg.path
    ct_name = pkg.find("[Content_Types].xml")
    if ct_name is None:
        raise PackageRefused(shown, "not an Office Open XML package: no [Content_Types].xml")
    try:
        defaults, overrides = parse_content_types(pkg.read(ct_name))
    except ET.ParseError as exc:
        raise PackageRefused(shown, f"[Content_Types].xml is not well-formed XML ({exc})") from None
    root_rels = _rels_of(pkg, "")
    if any(r.type == RT.STRICT_OFFICE_DOCUMENT for r in root_rels):
        raise PackageRefused(shown, "Strict Open XML workbook: save it as a regular Excel Workbook (.xlsx)")
    main = next((r for r in root_rels if r.type == RT.OFFICE_DOCUMENT and not r.external), None)
    if main is None or pkg.find(main.part) is None:
        raise PackageRefused(shown, "no workbook part in the package (is it an .xlsx at all?)")
    wb_part = pkg.find(main.part)
    wb_type = overrides.get(wb_part.lower()) or defaults.get(wb_part.rsplit(".", 1)[-1].lower(), "")
    if wb_type not in _WORKBOOK_TYPES:
        raise PackageRefused(shown, f"the main part {wb_part!r} is {wb_type or 'untyped'}, not a spreadsheet workbook")
    wb = _parse(pkg, wb_part)
    if wb.tag == f"{{{NS_STRICT_MAIN}}}workbook":
        raise PackageRefused(shown, "Strict Open XML workbook: save it as a regular Excel Workbook (.xlsx)")
    if wb.tag != f"{{{NS_MAIN}}}workbook":
        raise PackageRefused(shown, f"the workbook part {wb_part!r} has root {wb.tag!r}, not a workbook")
    wb_rels = {r.rel_id: r for r in _rels_of(pkg, wb_part)}
    notes: list[str] = []

    sheets = []
    sheets_el = wb.find(f"{{{NS_MAIN}}}sheets")
    for el in (sheets_el if sheets_el is not None else []):
        rel_id = el.get(f"{{{NS_REL}}}id", "")
        rel = wb_rels.get(rel_id)
        part = pkg.find(rel.part) if rel is not None and rel.part else None
        kind = _SHEET_KINDS.get(rel.type, "other") if rel is not None else "missing"
        sheets.append(_sheet_info(pkg, el, rel_id, part, kind, notes))

    defined = []
    names_el = wb.find(f"{{{NS_MAIN}}}definedNames")
    for el in (names_el if names_el is not None else []):
        local = el.get("localSheetId")
        defined.append(DefinedName(el.get("name", ""), el.text or "",
                                   int(local) if local is not None and local.isdigit() else None,
                                   el.get("hidden") in ("1", "true")))

    links = []
    for rel in wb_rels.values():
        if rel.type == RT.EXTERNAL_LINK and rel.part and pkg.find(rel.part):
            outside = [r.target for r in _rels_of(pkg, pkg.find(rel.part)) if r.external]
            links.append(ExternalLink(pkg.find(rel.part), outside[0] if outside else None))

    def first(rel_type: str) -> str | None:
        for rel in wb_rels.values():
            if rel.type == rel_type and rel.part and pkg.find(rel.part):
                return pkg.find(rel.part)
        return None

    has_vba = first(RT.VBA) is not None or any(n.lower().endswith("vbaproject.bin") for n in pkg.names)
    return PackageInfo(
        path=shown, workbook_part=wb_part, workbook_content_type=wb_type,
        macro_enabled=wb_type in (CT.MACRO_WORKBOOK, CT.MACRO_TEMPLATE, CT.ADDIN), has_vba=has_vba,
        sheets=tuple(sheets), defined_names=tuple(defined), external_links=tuple(links),
        styles_part=first(RT.STYLES), shared_strings_part=first(RT.BASE + "sharedStrings"),
        calc_chain_part=first(RT.CALC_CHAIN), members=tuple(pkg.names),
        total_uncompressed=pkg.total_uncompressed, notes=tuple(notes),
    )


def _sheet_info(pkg: Package, el: ET.Element, rel_id: str, part: str | None, kind: str,
                notes: list[str]) -> SheetInfo:
    name = el.get("name", "")
    state = el.get("state", "visible")
    sheet_id = int(el.get("sheetId", "0")) if el.get("sheetId", "0").isdigit() else 0
    comments = drawing = None
    vml: list[str] = []
    tables: list[TableInfo] = []
    dimension = rows = cols = None
    if part is not None:
        for rel in _rels_of(pkg, part):
            target = pkg.find(rel.part) if rel.part else None
            if target is None:
                continue
            if rel.type == RT.COMMENTS:
                comments = target
            elif rel.type == RT.VML:
                vml.append(target)
            elif rel.type == RT.DRAWING:
                drawing = target
            elif rel.type == RT.TABLE:
                t = _parse(pkg, target)
                tables.append(TableInfo(t.get("name", ""), t.get("displayName", ""), t.get("ref", ""), target))
        match = _DIMENSION.search(pkg.head(part, 64 * 1024))
        if match:
            dimension = match.group(1).decode("ascii", "replace")
            rows, cols = _dimension_size(dimension)
            if (rows or 0) >= HUGE_ROWS:
                notes.append(f"sheet {name!r} declares dimension {dimension} ({rows:,} rows): "
                             "only the cells actually present are read")
    return SheetInfo(name, sheet_id, rel_id, part, state, kind, comments, tuple(vml), drawing,
                     tuple(tables), dimension, rows, cols)


def inspect_package(path: str | os.PathLike, limits: Limits | None = None) -> PackageInfo:
    """Check a workbook file is safe to read and summarise what it holds.

    Parameters
    ----------
    path : str or os.PathLike
        An .xlsx/.xlsm file.
    limits : Limits, optional
        Size caps (defaults: 2 GiB declared in total, 200:1 ratio above 10 MiB, 20,000 members).

    Returns
    -------
    PackageInfo

    Raises
    ------
    PackageRefused
        With a one-line reason: not a file, empty, not a zip, old binary .xls, password-protected,
        truncated/corrupt, zip bomb, DOCTYPE/ENTITY declarations, no workbook part, Strict OOXML.
    """
    pkg = Package(path, limits)
    try:
        return read_package_info(pkg)
    finally:
        pkg.close()
