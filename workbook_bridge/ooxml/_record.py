"""The ownership record: which members, entries, comments and marks of a package are ours.

Written at rating time as a custom XML part (``customXml/itemN.xml`` with its properties part,
related from the workbook part), read at re-rating time to take exactly our own work back out.
Custom XML parts outlive a re-save (LibreOffice was seen to keep it, relating it from the package
root instead; Excel keeps custom XML parts too, from memory), which is how a stale record is
recognised rather than missed. It holds:

- ``added``: every member the writer added (our sheets, their drawings, charts, comments and
  VML, comments parts and relationship parts it created for input sheets), with the SHA-256 of
  the bytes written;
- ``stored``: every member the writer changed that is not a worksheet (the workbook part, its
  relationships, ``[Content_Types].xml``, the styles part, an input sheet's relationships, the
  user's comments and VML parts we appended to): the member as it was before (deflated,
  base64) and the SHA-256 of the member as written; re-rating puts the old bytes back;
- ``worksheet``: every input worksheet the writer changed (the comment link it inserted, the
  blank cells it filled with marked values): the exact text it inserted and replaced, so that
  re-rating takes them out again while keeping the user's later edits of other cells;
- ``sheet`` and ``comments``: our sheet names and the number of comments per sheet, for the report;
- ``note``: the text of each comment of ours on an input cell, to find it again in a copy that a
  spreadsheet program saved again (``_unrate_resaved``).
"""

from __future__ import annotations

import base64
import hashlib
import xml.etree.ElementTree as ET
import zlib
from dataclasses import dataclass

from ._opc import RT

__all__ = ["RECORD_NS", "RT_CUSTOM_XML", "RT_CUSTOM_XML_PROPS", "CT_CUSTOM_XML_PROPS", "CT_XML",
           "MarkChange", "SheetChange", "StoredPart", "OwnershipRecord", "record_xml", "parse_record",
           "item_props_xml", "is_record", "sha256"]

RECORD_NS = "urn:twistshare:ownership-record:1"
RT_CUSTOM_XML = RT.BASE + "customXml"
RT_CUSTOM_XML_PROPS = RT.BASE + "customXmlProps"
CT_CUSTOM_XML_PROPS = "application/vnd.openxmlformats-officedocument.customXmlProperties+xml"
CT_XML = "application/xml"
_NS_DS = "http://schemas.openxmlformats.org/officeDocument/2006/customXml"
# One record per book, so one fixed datastore id (a GUID made for twistshare).
_ITEM_ID = "{5E0C7A61-93B4-4F2D-8C1E-2A7D6B9F4E30}"
_FORMAT = "1"


def sha256(data: bytes) -> str:
    """Hex SHA-256 of ``data``."""
    return hashlib.sha256(data).hexdigest()


@dataclass(frozen=True)
class MarkChange:
    """One blank input cell the writer filled with a marked value.

    Attributes
    ----------
    ref : str
        The cell ('D5').
    before, after : str
        The cell's ``<c>`` element before ('' where the sheet held none) and as written.
    row_before, row_after : str or None
        Where filling the cell changed its row: the row's start tag before (the whole element
        if it was empty and self-closing, '' if the row did not exist) and as written; None
        where the row's start tag was left as it was.
    """

    ref: str
    before: str
    after: str
    row_before: str | None = None
    row_after: str | None = None


@dataclass(frozen=True)
class SheetChange:
    """What the writer changed in one of the user's worksheets."""

    part: str
    name: str
    before_sha: str
    after_sha: str
    link: str | None                 # the <legacyDrawing .../> element inserted, if any
    marks: tuple[MarkChange, ...] = ()


@dataclass(frozen=True)
class StoredPart:
    """A member the writer changed, kept as it was before; ``after_sha`` is of the bytes written."""

    part: str
    before: bytes
    after_sha: str


@dataclass(frozen=True)
class OwnershipRecord:
    """Everything of ours in a written package (see the module docstring)."""

    own_parts: tuple[str, ...]                  # the record's item, properties and relationships parts
    sheets: tuple[str, ...]
    added: tuple[tuple[str, str], ...]          # (member, sha256)
    stored: tuple[StoredPart, ...]
    worksheets: tuple[SheetChange, ...]
    comments: tuple[tuple[str, int], ...]       # (sheet name, comments of ours on it)
    unrecoverable: tuple[str, ...] = ()         # worksheets whose changes the record cannot undo exactly
    notes: tuple[tuple[str, str, str], ...] = ()  # (input sheet, cell, our comment text) for a re-saved copy

    @property
    def comment_count(self) -> int:
        """Comments of ours in the package (one per cell)."""
        return sum(n for _, n in self.comments)

    @property
    def mark_count(self) -> int:
        """Input cells we filled with a marked value."""
        return sum(len(w.marks) for w in self.worksheets)


def _q(tag: str) -> str:
    return f"{{{RECORD_NS}}}{tag}"


def _text_el(parent: ET.Element, tag: str, text: str | None) -> None:
    if text is not None:
        ET.SubElement(parent, _q(tag)).text = text


def record_xml(record: OwnershipRecord) -> bytes:
    """The record as its custom XML part."""
    ET.register_namespace("", RECORD_NS)
    root = ET.Element(_q("record"), {"format": _FORMAT})
    for part in record.own_parts:
        ET.SubElement(root, _q("own"), {"part": part})
    for name in record.sheets:
        ET.SubElement(root, _q("sheet"), {"name": name})
    for sheet, count in record.comments:
        ET.SubElement(root, _q("comments"), {"sheet": sheet, "count": str(count)})
    for sheet, ref, text in record.notes:
        ET.SubElement(root, _q("note"), {"sheet": sheet, "ref": ref}).text = text
    for name in record.unrecoverable:
        ET.SubElement(root, _q("unrecoverable"), {"sheet": name})
    for part, digest in record.added:
        ET.SubElement(root, _q("added"), {"part": part, "sha256": digest})
    for stored in record.stored:
        el = ET.SubElement(root, _q("stored"), {"part": stored.part, "after": stored.after_sha,
                                                "before": sha256(stored.before), "encoding": "deflate-base64"})
        el.text = base64.b64encode(zlib.compress(stored.before, 6)).decode("ascii")
    for ws in record.worksheets:
        el = ET.SubElement(root, _q("worksheet"), {"part": ws.part, "name": ws.name,
                                                   "before": ws.before_sha, "after": ws.after_sha})
        _text_el(el, "link", ws.link)
        for mark in ws.marks:
            m = ET.SubElement(el, _q("mark"), {"ref": mark.ref})
            _text_el(m, "before", mark.before)
            _text_el(m, "after", mark.after)
            _text_el(m, "rowBefore", mark.row_before)
            _text_el(m, "rowAfter", mark.row_after)
    return b'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n' + ET.tostring(root, encoding="utf-8")


def item_props_xml() -> bytes:
    """The properties part every custom XML item has (its datastore id)."""
    return ('<?xml version="1.0" encoding="UTF-8" standalone="no"?>\n'
            f'<ds:datastoreItem ds:itemID="{_ITEM_ID}" xmlns:ds="{_NS_DS}"><ds:schemaRefs/></ds:datastoreItem>'
            ).encode("utf-8")


def is_record(head: bytes) -> bool:
    """True if a custom XML item (its first few hundred bytes) is a twistshare ownership record."""
    return RECORD_NS.encode() in head


def parse_record(data: bytes) -> OwnershipRecord:
    """Read a record written by ``record_xml``.

    Raises
    ------
    ValueError
        Not a record of a format this version reads, or a stored member that does not match
        its own checksum (the message says which).
    """
    root = ET.fromstring(data)
    if root.tag != _q("record"):
        raise ValueError(f"not an ownership record (root {root.tag!r})")
    if root.get("format") != _FORMAT:
        raise ValueError(f"ownership record format {root.get('format')!r}; this version reads format {_FORMAT}")

    def text(el: ET.Element, tag: str) -> str | None:
        child = el.find(_q(tag))
        return None if child is None else (child.text or "")

    stored = []
    for el in root.iter(_q("stored")):
        before = zlib.decompress(base64.b64decode(el.text or ""))
        if sha256(before) != el.get("before"):
            raise ValueError(f"the record's copy of {el.get('part')!r} does not match its checksum")
        stored.append(StoredPart(el.get("part", ""), before, el.get("after", "")))
    worksheets = []
    for el in root.iter(_q("worksheet")):
        marks = tuple(MarkChange(m.get("ref", ""), text(m, "before") or "", text(m, "after") or "",
                                 text(m, "rowBefore"), text(m, "rowAfter")) for m in el.iter(_q("mark")))
        worksheets.append(SheetChange(el.get("part", ""), el.get("name", ""), el.get("before", ""),
                                      el.get("after", ""), text(el, "link"), marks))
    return OwnershipRecord(
        own_parts=tuple(el.get("part", "") for el in root.iter(_q("own"))),
        sheets=tuple(el.get("name", "") for el in root.iter(_q("sheet"))),
        added=tuple((el.get("part", ""), el.get("sha256", "")) for el in root.iter(_q("added"))),
        stored=tuple(stored), worksheets=tuple(worksheets),
        comments=tuple((el.get("sheet", ""), int(el.get("count", "0"))) for el in root.iter(_q("comments"))),
        unrecoverable=tuple(el.get("sheet", "") for el in root.iter(_q("unrecoverable"))),
        notes=tuple((el.get("sheet", ""), el.get("ref", ""), el.text or "") for el in root.iter(_q("note"))),
    )
