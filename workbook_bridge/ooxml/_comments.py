"""Cell comments: the comments part (the text) and the legacy VML drawing (what makes them show).

Existing comments are never rewritten: ours are appended, and where a cell already has a comment
our text is added after the user's text in the same comment.
"""

from __future__ import annotations

import math
import re
import xml.etree.ElementTree as ET
from types import MappingProxyType
from typing import Mapping

from ._opc import tag_attributes
from ._xmltext import NS_MAIN, XML_DECL, escape_text, find_element_span, root_prefix, split_ref

__all__ = ["new_comments_part", "merge_comments_part", "comment_refs", "new_vml", "merge_vml",
           "vml_note_cells", "vml_blocks", "SEPARATOR"]

SEPARATOR = "\n\n"
_VML_NS = ('xmlns:v="urn:schemas-microsoft-com:vml" xmlns:o="urn:schemas-microsoft-com:office:office" '
           'xmlns:x="urn:schemas-microsoft-com:office:excel"')
_SHAPETYPE = ('<v:shapetype id="_x0000_t202" coordsize="21600,21600" o:spt="202" '
              'path="m,l,21600r21600,l21600,xe"><v:stroke joinstyle="miter"/>'
              '<v:path gradientshapeok="t" o:connecttype="rect"/></v:shapetype>')


def _sorted(comments: Mapping[str, str]) -> list[tuple[str, str]]:
    return sorted(comments.items(), key=lambda item: split_ref(item[0])[::-1])


def _text_runs(p: str, text: str) -> str:
    return f'<{p}t xml:space="preserve">{escape_text(text)}</{p}t>'


def new_comments_part(comments: Mapping[str, str], author: str) -> str:
    """A comments part holding ``comments`` (ref -> text), one author."""
    body = "".join(f'<comment ref="{ref}" authorId="0"><text>{_text_runs("", text)}</text></comment>'
                   for ref, text in _sorted(comments))
    return (f'{XML_DECL}<comments xmlns="{NS_MAIN}"><authors><author>{escape_text(author)}</author></authors>'
            f"<commentList>{body}</commentList></comments>")


def comment_refs(data: bytes) -> set[str]:
    """Cells that already carry a comment in an existing comments part."""
    root = ET.fromstring(data)
    refs = set()
    for el in root.iter(f"{{{NS_MAIN}}}comment"):
        col, row = split_ref(el.get("ref", "").split(":")[0])
        refs.add((col, row))
    return refs


def merge_comments_part(text: str, comments: Mapping[str, str], author: str) -> str:
    """Add ``comments`` to an existing comments part, keeping every existing byte of it.

    A cell that already has a comment keeps it; our text is appended as a new run after
    a blank line. Other cells get new <comment> entries at the end of the list.
    """
    p, root = root_prefix(text)
    if root != "comments":
        raise ValueError(f"comments part has root <{root}>")
    # Author: reuse ours if present, else append it.
    span = find_element_span(text, p + "authors")
    if span is None:
        raise ValueError("comments part has no <authors>")
    authors = re.findall(r"<" + re.escape(p) + r"author(?:\s[^>]*)?>(.*?)</" + re.escape(p) + "author>",
                         text[span[1]:span[2]], re.S)
    if escape_text(author) in authors:
        author_id = authors.index(escape_text(author))
    else:
        author_id = len(authors)
        added = f"<{p}author>{escape_text(author)}</{p}author>"
        if span[1] == span[2]:  # <authors/>
            text = text[:span[0]] + f"<{p}authors>{added}</{p}authors>" + text[span[3]:]
        else:
            text = text[:span[2]] + added + text[span[2]:]
    wanted = {split_ref(ref): (ref, body) for ref, body in comments.items()}
    # Append to existing comments on the same cells (from the end so positions stay valid).
    opener = re.compile(r"<" + re.escape(p) + r"comment\s([^>]*)>")
    edits: list[tuple[int, str]] = []
    for match in opener.finditer(text):
        ref = tag_attributes(match.group(1)).get("ref", "").split(":")[0]
        try:
            key = split_ref(ref)
        except ValueError:
            continue
        if key not in wanted or match.group(0).endswith("/>"):
            continue
        end = text.find(f"</{p}comment>", match.end())
        text_end = text.rfind(f"</{p}text>", match.end(), end)
        if text_end < 0:
            continue
        inner_start = text.find(">", text.find(f"<{p}text", match.end())) + 1
        tail = re.search(r"<" + re.escape(p) + r"(?:rPh|phoneticPr)[\s>/]", text[inner_start:text_end])
        at = inner_start + tail.start() if tail else text_end
        _, body = wanted.pop(key)
        edits.append((at, f"<{p}r>{_text_runs(p, SEPARATOR + body)}</{p}r>"))
    for at, piece in sorted(edits, reverse=True):
        text = text[:at] + piece + text[at:]
    if wanted:
        new = "".join(f'<{p}comment ref="{ref}" authorId="{author_id}"><{p}text>{_text_runs(p, body)}</{p}text></{p}comment>'
                      for ref, body in _sorted(dict(wanted.values())))
        close = text.rfind(f"</{p}commentList>")
        if close >= 0:
            text = text[:close] + new + text[close:]
        else:
            empty = re.search(r"<" + re.escape(p) + r"commentList\s*/>", text)
            if empty is None:
                raise ValueError("comments part has no <commentList>")
            text = text[:empty.start()] + f"<{p}commentList>{new}</{p}commentList>" + text[empty.end():]
    return text


def _shape(shape_id: int, ref: str, text: str) -> str:
    col, row = split_ref(ref)
    c0, r0 = col - 1, row - 1
    # The box is sized to its text (about 50 characters a line, 15 pt a line) so long notes such
    # as a library value's source show whole; Excel reads the anchor, LibreOffice the style.
    lines = sum(max(1, math.ceil(len(line) / 50)) for line in text.split("\n"))
    height = min(40, max(4, lines + 1))
    anchor = f"{c0 + 1}, 15, {max(r0 - 1, 0)}, 4, {c0 + 5}, 15, {max(r0 - 1, 0) + height}, 4"
    return (f'<v:shape id="_x0000_s{shape_id}" type="#_x0000_t202" '
            f'style="position:absolute;margin-left:60pt;margin-top:2pt;width:260pt;height:{height * 15}pt;'
            'z-index:1;visibility:hidden" fillcolor="#fdf8e4" o:insetmode="auto">'
            '<v:fill color2="#fdf8e4"/><v:shadow on="t" color="black" obscured="t"/>'
            '<v:path o:connecttype="none"/><v:textbox style="mso-direction-alt:auto">'
            '<div style="text-align:left"></div></v:textbox>'
            '<x:ClientData ObjectType="Note"><x:MoveWithCells/><x:SizeWithCells/>'
            f"<x:Anchor>{anchor}</x:Anchor><x:AutoFill>False</x:AutoFill>"
            f"<x:Row>{r0}</x:Row><x:Column>{c0}</x:Column></x:ClientData></v:shape>")


def _shapes(comments: Mapping[str, str], block: int) -> tuple[str, list[int]]:
    pieces, blocks = [], [block]
    for k, (ref, text) in enumerate(_sorted(comments)):
        this_block = block + (k + 1) // 1024
        if this_block not in blocks:
            blocks.append(this_block)
        pieces.append(_shape(block * 1024 + k + 1, ref, text))
    return "".join(pieces), blocks


def new_vml(comments: Mapping[str, str], block: int) -> bytes:
    """A legacy VML drawing with one (hidden until hovered) note shape per comment.

    ``block`` is a shape-id block (ids block*1024+1 ...) no other drawing of the book uses.
    """
    shapes, blocks = _shapes(comments, block)
    return (f'<xml {_VML_NS}><o:shapelayout v:ext="edit"><o:idmap v:ext="edit" '
            f'data="{",".join(map(str, blocks))}"/></o:shapelayout>{_SHAPETYPE}{shapes}</xml>').encode("utf-8")


_NOTE_CELL = re.compile(rb"<(?:[\w.-]+:)?Row>\s*(\d+)\s*</(?:[\w.-]+:)?Row>\s*"
                        rb"<(?:[\w.-]+:)?Column>\s*(\d+)\s*</(?:[\w.-]+:)?Column>")
_IDMAP = re.compile(rb'(<(?:[\w.-]+:)?idmap\b[^>]*?\sdata=")([^"]*)(")')
_VML_URIS = MappingProxyType({"v": b"urn:schemas-microsoft-com:vml", "o": b"urn:schemas-microsoft-com:office:office",
             "x": b"urn:schemas-microsoft-com:office:excel"})


def vml_note_cells(data: bytes) -> set[tuple[int, int]]:
    """(column, row), 1-based, of the note shapes an existing VML drawing holds."""
    return {(int(c) + 1, int(r) + 1) for r, c in _NOTE_CELL.findall(data)}


def vml_blocks(data: bytes) -> set[int]:
    """Shape-id blocks an existing VML drawing uses (from idmap and from the shape ids)."""
    blocks = set()
    for match in _IDMAP.finditer(data):
        blocks.update(int(x) for x in re.findall(rb"\d+", match.group(2)))
    blocks.update(int(n) // 1024 for n in re.findall(rb"_x0000_s(\d+)", data))
    return blocks


def _bind_prefixes(data: bytes, xml: str) -> str:
    """Rewrite our v:/o:/x: prefixes to the ones the existing drawing binds to those namespaces.

    Writers differ (some serialise as ns0:, ns1:, ...); a namespace the root does not declare is
    declared on each element we insert instead, so the root is left as it was.
    """
    root = re.search(rb"<(?![?!])[^>]*>", data)
    declared = {}
    for prefix, uri in re.findall(rb'xmlns:([\w.-]+)="([^"]*)"', root.group(0) if root else b""):
        declared.setdefault(uri, prefix.decode())
    mapping = {ours: declared.get(uri) for ours, uri in _VML_URIS.items()}
    missing = " ".join(f'xmlns:{ours}="{uri.decode()}"' for ours, uri in _VML_URIS.items() if mapping[ours] is None)
    if all(mapping[k] == k for k in mapping):
        return xml
    # Declare the undeclared ones on our top-level elements, then rename the declared ones.
    if missing:
        xml = re.sub(r"<(v:shape|v:shapetype)\s", lambda m: f"<{m.group(1)} {missing} ", xml)
    renamed = {k: v for k, v in mapping.items() if v is not None and v != k}
    if renamed:
        pattern = re.compile(r"(</?|\s)(" + "|".join(renamed) + r"):(?=[A-Za-z_])")
        xml = pattern.sub(lambda m: m.group(1) + renamed[m.group(2)] + ":", xml)
    return xml


def merge_vml(data: bytes, comments: Mapping[str, str], block: int) -> bytes:
    """Append note shapes to an existing VML drawing (bytes: its encoding is left alone)."""
    shapes, blocks = _shapes(comments, block)
    if b'id="_x0000_t202"' not in data:
        shapes = _SHAPETYPE + shapes
    shapes = _bind_prefixes(data, shapes)
    out = data
    idmap = _IDMAP.search(out)
    if idmap:
        listed = idmap.group(2) + b"".join(b"," + str(b).encode() for b in blocks)
        out = out[:idmap.start(2)] + listed + out[idmap.end(2):]
    close = re.search(rb"</(?:[\w.-]+:)?xml>\s*$", out)
    if close is None:
        raise ValueError("VML drawing has no closing </xml>")
    return out[:close.start()] + shapes.encode("utf-8") + out[close.start():]
