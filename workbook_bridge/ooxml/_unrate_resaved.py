"""Take our work out of a rated copy that a spreadsheet program saved again (the fallback).

Excel and LibreOffice rewrite every part on saving, so the record's checksums no longer match and
its byte-exact undo (``_unrate``) cannot be used. What still identifies our work is what the
record names: our sheets (by name; they must still be the book's last sheets), our comments on
input cells (by cell and exact text), and the cells we filled (by cell and value). Those are taken
out of the saved copy; everything else of it is kept byte for byte. Wherever the copy does not
look as expected (a sheet of ours moved, a comment of ours edited) nothing is written and the
reason is given. Two things cannot be undone in a rewritten package and are said so: a filled
cell emptied again keeps the look we gave it, and the program's styles keep our entries.
"""

from __future__ import annotations

import html
import re
import xml.etree.ElementTree as ET
from dataclasses import dataclass

from ._comments import SEPARATOR
from ._errors import PackageRefused
from ._opc import RT, parse_rels, rels_path_of, remove_overrides, remove_rels, tag_attributes
from ._package import Package
from ._record import OwnershipRecord
from ._safety import PackageInfo
from ._sheetxml import CELL_TAG
from ._xmltext import decode_xml, escape_text, find_element_span, iter_top_level, root_prefix, split_ref

__all__ = ["ResavedPlan", "plan_resaved"]

_T = re.compile(r"<((?:[\w.-]+:)?)t(?:\s[^>]*)?(?:/>|>(.*?)</\1t>)", re.S)
_V = re.compile(r"<(?:[\w.-]+:)?v>([^<]*)</(?:[\w.-]+:)?v>")
_SHAPE = re.compile(r"<((?:[\w.-]+:)?)shape\b[^>]*>.*?</\1shape>", re.S)
_NOTE_AT = re.compile(r"<(?:[\w.-]+:)?Row>\s*(\d+)\s*</(?:[\w.-]+:)?Row>\s*<(?:[\w.-]+:)?Column>\s*(\d+)\s*<")


@dataclass(frozen=True)
class ResavedPlan:
    """What to leave out and replace in a saved-again copy, and what was found."""

    drop: frozenset[str]
    replace: dict[str, bytes]
    sheets: tuple[str, ...]
    comments: int
    marks: int
    kept_cells: tuple[str, ...]


def _refuse(pkg: Package, detail: str) -> PackageRefused:
    from ._unrate import RESAVED_ADVICE

    return PackageRefused(pkg.path, f"this rated copy was saved again by a spreadsheet program and {detail}, so "
                                    f"twistshare cannot take its own work out safely: {RESAVED_ADVICE}")


def _text(pkg: Package, name: str, cache: dict[str, str]) -> str:
    if name not in cache:
        try:
            cache[name] = decode_xml(pkg.read(name), name)
        except ValueError as exc:
            raise _refuse(pkg, str(exc)) from None
    return cache[name]


def _graph(pkg: Package) -> dict[str, list[tuple[str, str, str]]]:
    """Every part's internal relationships: part -> [(rel id, type, target member)]."""
    out: dict[str, list[tuple[str, str, str]]] = {}
    for name in pkg.names:
        if not name.lower().endswith(".rels") or "_rels/" not in name.lower():
            continue
        folder, file = name.rsplit("_rels/", 1)
        source = (folder + file[:-5]).rstrip("/") if file != ".rels" else ""
        try:
            rels = parse_rels(pkg.read(name), source)
        except ET.ParseError as exc:
            raise _refuse(pkg, f"its relationships part {name} is not well-formed XML ({exc})") from None
        out[source] = [(r.rel_id, r.type, pkg.find(r.part)) for r in rels if not r.external and r.part and pkg.find(r.part)]
    return out


def _reachable(graph: dict, roots: list[str], cut: set[tuple[str, str]]) -> set[str]:
    seen, todo = set(), list(roots)
    while todo:
        part = todo.pop()
        for rel_id, _, target in graph.get(part, ()):
            if (part, rel_id) in cut or target in seen:
                continue
            seen.add(target)
            todo.append(target)
    return seen


def _plain(comment: str) -> str:
    text = comment
    for tag in ("rPh", "phoneticPr"):  # phonetic guides are not the comment's text
        text = re.sub(r"<(?:[\w.-]+:)?" + tag + r"\b.*?(?:/>|</(?:[\w.-]+:)?" + tag + ">)", "", text, flags=re.S)
    return "".join(html.unescape(m.group(2) or "") for m in _T.finditer(text))


def _cut_comment(comment: str, keep: int) -> str:
    """The comment element with its text cut after ``keep`` characters (the runs after it dropped)."""
    p, _ = root_prefix(comment)
    span = find_element_span(comment, p + "text")
    if span is None:
        return comment
    out, count = [comment[:span[1]]], 0
    for name, start, end in iter_top_level(comment, span[1], span[2]):
        child = comment[start:end]
        if name.rsplit(":", 1)[-1] not in ("r", "t"):
            out.append(child)  # phonetic guides and the like stay
            continue
        m = _T.search(child)
        body = html.unescape(m.group(2) or "") if m else ""
        if count < keep < count + len(body):
            child = (child[:m.start()] + f'<{m.group(1)}t xml:space="preserve">{escape_text(body[:keep - count])}'
                     f"</{m.group(1)}t>" + child[m.end():])
        if count < keep:
            out.append(child)
        count += len(body)
    out.append(comment[span[2]:])
    return "".join(out)


def _sheet_rels(graph: dict, part: str, rel_type: str) -> str | None:
    return next((t for _, ty, t in graph.get(part, ()) if ty == rel_type), None)


def _remove_comments(pkg: Package, graph: dict, part: str, notes: dict[str, str], texts: dict[str, str],
                     replace: dict[str, bytes], sheet: str) -> int:
    comments_part = _sheet_rels(graph, part, RT.COMMENTS)
    if comments_part is None:
        return 0
    text = _text(pkg, comments_part, texts)
    p, _ = root_prefix(text)
    span = find_element_span(text, p + "commentList")
    if span is None:
        return 0
    edits, gone = [], []
    for name, start, end in iter_top_level(text, span[1], span[2]):
        element = text[start:end]
        ref = tag_attributes(element[:element.find(">")]).get("ref", "").split(":")[0].upper()
        if name != p + "comment" or ref not in notes:
            continue
        ours, plain = notes[ref], _plain(element)
        if plain.rstrip() == ours.rstrip():
            edits.append((start, end, ""))
            gone.append(split_ref(ref))
        elif plain.rstrip().endswith(SEPARATOR + ours.rstrip()) or plain.rstrip().endswith("\n" + ours.rstrip()):
            cut = len(plain.rstrip()) - len(ours.rstrip())
            user = plain[:cut].rstrip("\n")
            edits.append((start, end, _cut_comment(element, len(user))))
        else:
            raise _refuse(pkg, f"the comment twistshare wrote on {sheet}!{ref} was changed")
    for start, end, piece in sorted(edits, reverse=True):
        text = text[:start] + piece + text[end:]
    replace[comments_part] = text.encode("utf-8")
    vml = _sheet_rels(graph, part, RT.VML)
    if gone and vml is not None:
        drawing = _text(pkg, vml, texts)
        cells = {(c - 1, r - 1) for c, r in gone}
        pieces, last = [], 0
        for m in _SHAPE.finditer(drawing):
            at = _NOTE_AT.search(m.group(0))
            if at and (int(at.group(2)), int(at.group(1))) in cells:
                pieces.append(drawing[last:m.start()])
                last = m.end()
        pieces.append(drawing[last:])
        replace[vml] = "".join(pieces).encode("utf-8")
    return len(edits)


def _clear_marks(pkg: Package, part: str, marks, texts: dict[str, str], replace: dict[str, bytes],
                 sheet: str) -> tuple[int, list[str]]:
    text = replace[part].decode("utf-8") if part in replace else _text(pkg, part, texts)
    wanted = {m.ref: m for m in marks}
    edits, kept = [], []
    for match in CELL_TAG.finditer(text):
        ref = match.group("r").replace("$", "").upper()
        mark = wanted.pop(ref, None)
        if mark is None:
            continue
        end = match.end() if match.group("empty") else text.find(f"</{match.group('p')}c>", match.end()) + len(match.group("p")) + 4
        ours, now = _V.search(mark.after), _V.search(text[match.start():end])
        try:
            same = ours is not None and now is not None and float(ours.group(1)) == float(now.group(1))
        except ValueError:
            same = False
        if same:
            style = tag_attributes(match.group("attrs")).get("s")
            edits.append((match.start(), end, f'<{match.group("p")}c r="{ref}"' + (f' s="{style}"' if style else "") + "/>"))
        else:
            kept.append(f"{sheet}!{ref}")
    for start, end, piece in sorted(edits, reverse=True):
        text = text[:start] + piece + text[end:]
    if edits:
        replace[part] = text.encode("utf-8")
    return len(edits), kept


def plan_resaved(pkg: Package, info: PackageInfo, record: OwnershipRecord, record_part: str) -> ResavedPlan:
    """Find our work in a saved-again copy by the names, cells and texts the record gives.

    Our sheets go with every part only they lead to (drawings, charts, comments, printer
    settings), the names local to them, the calculation chain (it lists their cells; programs
    rebuild it) and the record itself.

    Raises
    ------
    PackageRefused
        Our sheets are not the book's last sheets, or a comment of ours was changed.
    """
    ours = {name.casefold() for name in record.sheets}
    present = [s for s in info.sheets if s.name.casefold() in ours]
    n = len(present)
    if n and [s.name for s in info.sheets[-n:]] != [s.name for s in present]:
        raise _refuse(pkg, "twistshare's sheets are no longer the last sheets of the book")
    graph = _graph(pkg)
    wb = info.workbook_part
    cut = {(wb, s.rel_id) for s in present}
    record_rels = [(src, rid) for src, rels in graph.items() for rid, _, t in rels if t == record_part]
    cut |= set(record_rels)
    calc = [(wb, rid) for rid, ty, _ in graph.get(wb, ()) if ty == RT.CALC_CHAIN]  # it lists cells of our sheets
    cut |= set(calc)
    before = _reachable(graph, [""], set()) | {record_part}
    after = _reachable(graph, [""], cut)
    drop = (before - after) | {pkg.find(part) for part in record.own_parts if pkg.find(part)}
    drop |= {pkg.find(rels_path_of(m)) for m in drop if pkg.find(rels_path_of(m))}
    texts: dict[str, str] = {}
    replace: dict[str, bytes] = {}
    # The workbook part: our sheet entries, names on or about our sheets, views pointing past the end.
    text = _text(pkg, wb, texts)
    p, _ = root_prefix(text)
    positions = {str(i) for i in range(len(info.sheets) - n, len(info.sheets))}
    edits = []
    for block, child in (("sheets", "sheet"), ("definedNames", "definedName")):
        span = find_element_span(text, p + block)
        if span is None or span[1] == span[2]:
            continue
        kids = list(iter_top_level(text, span[1], span[2]))
        mine = []
        for name, start, end in kids:
            attrs = tag_attributes(text[start:text.find(">", start)])
            if block == "sheets":
                hit = attrs.get("name", "").casefold() in ours and any(attrs.get("name") == s.name for s in present)
            else:  # names of our sheets (print titles); the user's own names stay, whatever they point at
                hit = attrs.get("localSheetId") in positions
            if name == p + child and hit:
                mine.append((start, end, ""))
        if block == "definedNames" and mine and len(mine) == len(kids):
            edits.append((span[0], span[3], ""))
        else:
            edits.extend(mine)
    for start, end, piece in sorted(edits, reverse=True):
        text = text[:start] + piece + text[end:]
    left = len(info.sheets) - n
    text = re.sub(r'(\s(?:activeTab|firstSheet)=")(\d+)(")',
                  lambda m: m.group(1) + (m.group(2) if int(m.group(2)) < left else "0") + m.group(3), text)
    replace[wb] = text.encode("utf-8")
    # Relationship parts that point at what is left out, and the content types.
    for src, rid in cut:
        rels_name = pkg.find(rels_path_of(src)) if src else pkg.find("_rels/.rels")
        if rels_name and rels_name not in drop:
            current = replace[rels_name].decode("utf-8") if rels_name in replace else _text(pkg, rels_name, texts)
            replace[rels_name] = remove_rels(current, {rid}).encode("utf-8")
    ct = pkg.find("[Content_Types].xml")
    replace[ct] = remove_overrides(_text(pkg, ct, texts), drop).encode("utf-8")
    # Our comments and filled cells on the user's sheets.
    by_name = {s.name.casefold(): s for s in info.sheets}
    comments = marks = 0
    kept: list[str] = []
    notes: dict[str, dict[str, str]] = {}
    for sheet, ref, body in record.notes:
        notes.setdefault(sheet.casefold(), {})[ref.upper()] = body
    wanted = set(notes) | {c.name.casefold() for c in record.worksheets if c.marks}
    gone = [name for name in wanted if name not in by_name or not by_name[name].part]
    if gone:  # renamed or deleted: our comments and marks on it could not be found
        raise _refuse(pkg, f"sheet {gone[0]!r}, which twistshare commented on, is not in the book under that name")
    for sheet, cells in notes.items():
        target = by_name[sheet]
        comments += _remove_comments(pkg, graph, target.part, cells, texts, replace, target.name)
    for change in record.worksheets:
        target = by_name.get(change.name.casefold())
        if target is not None and target.part and change.marks:
            cleared, k = _clear_marks(pkg, target.part, change.marks, texts, replace, target.name)
            marks += cleared
            kept += k
    return ResavedPlan(frozenset(drop), {k: v for k, v in replace.items() if k not in drop},
                       tuple(s.name for s in present), comments, marks, tuple(kept))
