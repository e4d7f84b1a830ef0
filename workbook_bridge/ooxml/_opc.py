"""Open Packaging Conventions pieces: relationships, content types, part names.

Reading goes through ElementTree (after the DOCTYPE check in ``_package``); changes are made as
text insertions/removals so the rest of each part keeps the user's bytes.
"""

from __future__ import annotations

import html
import posixpath
import re
import xml.etree.ElementTree as ET
from dataclasses import dataclass
from urllib.parse import unquote

from ._xmltext import NS_CT, NS_PKG_REL, XML_DECL, escape_attr, iter_top_level, root_prefix

__all__ = [
    "Relationship", "parse_rels", "rels_path_of", "resolve_target", "relative_target",
    "append_rels", "new_rels", "remove_rels", "parse_content_types", "add_overrides",
    "remove_overrides", "tag_attributes", "next_rel_id", "RT", "CT",
]


class RT:
    """Relationship types used here."""

    BASE = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/"
    OFFICE_DOCUMENT = BASE + "officeDocument"
    WORKSHEET = BASE + "worksheet"
    STYLES = BASE + "styles"
    COMMENTS = BASE + "comments"
    VML = BASE + "vmlDrawing"
    DRAWING = BASE + "drawing"
    CHART = BASE + "chart"
    CALC_CHAIN = BASE + "calcChain"
    TABLE = BASE + "table"
    EXTERNAL_LINK = BASE + "externalLink"
    VBA = "http://schemas.microsoft.com/office/2006/relationships/vbaProject"
    STRICT_OFFICE_DOCUMENT = "http://purl.oclc.org/ooxml/officeDocument/relationships/officeDocument"


class CT:
    """Content types used here."""

    _SML = "application/vnd.openxmlformats-officedocument.spreadsheetml."
    WORKSHEET = _SML + "worksheet+xml"
    STYLES = _SML + "styles+xml"
    COMMENTS = _SML + "comments+xml"
    CALC_CHAIN = _SML + "calcChain+xml"
    VML = "application/vnd.openxmlformats-officedocument.vmlDrawing"
    DRAWING = "application/vnd.openxmlformats-officedocument.drawing+xml"
    CHART = "application/vnd.openxmlformats-officedocument.drawingml.chart+xml"
    RELS = "application/vnd.openxmlformats-package.relationships+xml"
    MACRO_WORKBOOK = "application/vnd.ms-excel.sheet.macroEnabled.main+xml"
    WORKBOOK = _SML + "sheet.main+xml"
    TEMPLATE = _SML + "template.main+xml"
    MACRO_TEMPLATE = "application/vnd.ms-excel.template.macroEnabled.main+xml"
    ADDIN = "application/vnd.ms-excel.addin.macroEnabled.main+xml"


@dataclass(frozen=True)
class Relationship:
    """One relationship of a part; ``part`` is the resolved zip member name (None if external)."""

    rel_id: str
    type: str
    target: str
    external: bool
    part: str | None


_ATTR = re.compile(r"([A-Za-z_][\w:.-]*)\s*=\s*(?:\"([^\"]*)\"|'([^']*)')")


def tag_attributes(tag: str) -> dict[str, str]:
    """Attributes of one start tag's text, unescaped (qualified names as written)."""
    return {m.group(1): html.unescape(m.group(2) if m.group(2) is not None else m.group(3))
            for m in _ATTR.finditer(tag)}


def rels_path_of(part: str) -> str:
    """Zip member name of the relationships part of ``part`` ('' for the package)."""
    folder, name = posixpath.split(part)
    return posixpath.join(folder, "_rels", name + ".rels")


def resolve_target(source_part: str, target: str) -> str:
    """Zip member name a relative (or absolute) relationship target points to."""
    target = unquote(target.split("#", 1)[0])
    if target.startswith("/"):
        return posixpath.normpath(target[1:])
    base = posixpath.dirname(source_part)
    return posixpath.normpath(posixpath.join(base, target)).lstrip("/")


def relative_target(source_part: str, part: str) -> str:
    """Relative target from ``source_part`` to ``part`` (as Excel writes them)."""
    return posixpath.relpath(part, posixpath.dirname(source_part) or ".")


def parse_rels(data: bytes, source_part: str) -> list[Relationship]:
    """Relationships of a .rels part (already checked for DOCTYPE)."""
    root = ET.fromstring(data)
    out = []
    for el in root:
        if el.tag != f"{{{NS_PKG_REL}}}Relationship":
            continue
        external = el.get("TargetMode", "Internal") == "External"
        target = el.get("Target", "")
        part = None if external else resolve_target(source_part, target)
        out.append(Relationship(el.get("Id", ""), el.get("Type", ""), target, external, part))
    return out


def next_rel_id(existing: set[str]) -> str:
    """A relationship id not in ``existing`` (rIdN, N one past the largest number used)."""
    numbers = [int(m.group(1)) for i in existing if (m := re.fullmatch(r"rId(\d+)", i))]
    n = max(numbers, default=0) + 1
    while f"rId{n}" in existing:
        n += 1
    return f"rId{n}"


def _rel_xml(prefix: str, rel_id: str, rel_type: str, target: str) -> str:
    return (f'<{prefix}Relationship Id="{escape_attr(rel_id)}" Type="{escape_attr(rel_type)}" '
            f'Target="{escape_attr(target)}"/>')


def new_rels(entries: list[tuple[str, str, str]]) -> str:
    """A new .rels part from (id, type, target) triples."""
    body = "".join(_rel_xml("", *e) for e in entries)
    return f'{XML_DECL}<Relationships xmlns="{NS_PKG_REL}">{body}</Relationships>'


def append_rels(text: str, entries: list[tuple[str, str, str]]) -> str:
    """Insert relationships before the closing tag of an existing .rels part."""
    prefix, _ = root_prefix(text)
    body = "".join(_rel_xml(prefix, *e) for e in entries)
    close = f"</{prefix}Relationships>"
    at = text.rfind(close)
    if at < 0:  # self-closing empty root
        match = re.search(r"<" + re.escape(prefix) + r"Relationships\b[^>]*?/>", text)
        if match is None:
            raise ValueError("relationships part has no <Relationships> root")
        opened = match.group(0)[:-2].rstrip() + ">"
        return text[: match.start()] + opened + body + close + text[match.end():]
    return text[:at] + body + text[at:]


def remove_rels(text: str, rel_ids: set[str]) -> str:
    """Remove the relationships with the given ids, leaving the rest of the text as it was."""
    prefix, _ = root_prefix(text)
    open_match = re.search(r"<" + re.escape(prefix) + r"Relationships\b[^>]*>", text)
    pieces, last = [], 0
    for name, start, end in iter_top_level(text, open_match.end(), len(text)):
        if name == prefix + "Relationship" and tag_attributes(text[start:end]).get("Id") in rel_ids:
            pieces.append(text[last:start])
            last = end
    pieces.append(text[last:])
    return "".join(pieces)


def parse_content_types(data: bytes) -> tuple[dict[str, str], dict[str, str]]:
    """(defaults by lower-case extension, overrides by lower-case part name without '/')."""
    root = ET.fromstring(data)
    defaults, overrides = {}, {}
    for el in root:
        if el.tag == f"{{{NS_CT}}}Default":
            defaults[el.get("Extension", "").lower()] = el.get("ContentType", "")
        elif el.tag == f"{{{NS_CT}}}Override":
            overrides[el.get("PartName", "").lstrip("/").lower()] = el.get("ContentType", "")
    return defaults, overrides


def add_overrides(text: str, entries: list[tuple[str, str]]) -> str:
    """Insert <Override> entries (part member name, content type) before </Types>."""
    prefix, _ = root_prefix(text)
    body = "".join(f'<{prefix}Override PartName="/{escape_attr(p)}" ContentType="{escape_attr(c)}"/>'
                   for p, c in entries)
    close = f"</{prefix}Types>"
    at = text.rfind(close)
    if at < 0:
        raise ValueError("[Content_Types].xml has no closing </Types>")
    return text[:at] + body + text[at:]


def remove_overrides(text: str, parts: set[str]) -> str:
    """Remove <Override> entries for the given member names (case-insensitive)."""
    prefix, _ = root_prefix(text)
    wanted = {p.lower() for p in parts}
    open_match = re.search(r"<" + re.escape(prefix) + r"Types\b[^>]*>", text)
    pieces, last = [], 0
    for name, start, end in iter_top_level(text, open_match.end(), len(text)):
        if name != prefix + "Override":
            continue
        part = tag_attributes(text[start:end]).get("PartName", "").lstrip("/").lower()
        if part in wanted:
            pieces.append(text[last:start])
            last = end
    pieces.append(text[last:])
    return "".join(pieces)
