"""Text-level XML helpers: escaping, cell references, prolog checks, tag scanning.

The writer edits the few user parts it must change at the text level (insert, never
re-serialise) so that everything it does not touch stays exactly as the user's program wrote it.
"""

from __future__ import annotations

import re
from typing import Iterator

__all__ = [
    "NS_MAIN", "NS_REL", "NS_PKG_REL", "NS_CT", "NS_STRICT_MAIN",
    "escape_text", "escape_attr", "clean_text", "column_letters", "column_index",
    "split_ref", "make_ref", "prolog_declares_doctype", "decode_xml", "root_prefix",
    "iter_top_level", "find_element_span", "XML_DECL",
]

NS_MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
NS_STRICT_MAIN = "http://purl.oclc.org/ooxml/spreadsheetml/main"
NS_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
NS_PKG_REL = "http://schemas.openxmlformats.org/package/2006/relationships"
NS_CT = "http://schemas.openxmlformats.org/package/2006/content-types"
XML_DECL = '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'

# Characters XML 1.0 forbids, plus lone surrogates (they cannot be encoded as UTF-8).
_ILLEGAL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ufffe\uffff\ud800-\udfff]")
_TEXT_ESC = str.maketrans({"&": "&amp;", "<": "&lt;", ">": "&gt;"})
_ATTR_ESC = str.maketrans({"&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;",
                           "\n": "&#10;", "\r": "&#13;", "\t": "&#9;"})
_REF = re.compile(r"^\$?([A-Za-z]{1,3})\$?([0-9]{1,7})$")
MAX_COLUMN = 16384
MAX_ROW = 1048576


def clean_text(text: str) -> str:
    """Drop the characters XML 1.0 cannot carry (control characters, lone surrogates)."""
    return _ILLEGAL.sub("", text)


def escape_text(text: str) -> str:
    """Escape element text after dropping XML-illegal characters."""
    return _ILLEGAL.sub("", text).translate(_TEXT_ESC)


def escape_attr(text: str) -> str:
    """Escape an attribute value (double-quoted) after dropping XML-illegal characters."""
    return _ILLEGAL.sub("", text).translate(_ATTR_ESC)


def column_letters(index: int) -> str:
    """Column letters of a 1-based column index (1 -> 'A', 27 -> 'AA')."""
    if not 1 <= index <= MAX_COLUMN:
        raise ValueError(f"column index must be 1..{MAX_COLUMN}: {index}")
    letters = ""
    while index:
        index, rem = divmod(index - 1, 26)
        letters = chr(65 + rem) + letters
    return letters


def column_index(letters: str) -> int:
    """1-based index of column letters ('A' -> 1)."""
    value = 0
    for ch in letters.upper():
        value = value * 26 + ord(ch) - 64
    return value


def split_ref(ref: str) -> tuple[int, int]:
    """Split an A1 cell reference into 1-based (column, row); '$' allowed.

    Raises
    ------
    ValueError
        If ``ref`` is not a single-cell A1 reference inside the sheet grid.
    """
    match = _REF.match(ref.strip()) if isinstance(ref, str) else None
    if match is None:
        raise ValueError(f"cell reference must look like 'B7': {ref!r}")
    col, row = column_index(match.group(1)), int(match.group(2))
    if not (1 <= col <= MAX_COLUMN and 1 <= row <= MAX_ROW):
        raise ValueError(f"cell reference outside the sheet grid: {ref!r}")
    return col, row


def make_ref(col: int, row: int, absolute: bool = False) -> str:
    """A1 reference from 1-based column and row."""
    if absolute:
        return f"${column_letters(col)}${row}"
    return f"{column_letters(col)}{row}"


def decode_xml(data: bytes, part: str) -> str:
    """Decode an XML part we edit; only UTF-8 (the OOXML norm) is accepted.

    Raises
    ------
    ValueError
        If the part is not UTF-8.
    """
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise ValueError(f"{part} is not UTF-8 encoded XML ({exc.reason} at byte {exc.start})") from None


_PROLOG_TOKEN = re.compile(r"\s*(<\?.*?\?>|<!--.*?-->)", re.S)


def prolog_declares_doctype(head: bytes, complete: bool) -> bool | None:
    """Whether an XML document's prolog holds a DOCTYPE (the only place entities are declared).

    Parameters
    ----------
    head : bytes
        The first bytes of the document (a few KiB are enough for any sane prolog).
    complete : bool
        True if ``head`` is the whole document.

    Returns
    -------
    bool or None
        True if a DOCTYPE (or a stray ENTITY declaration) comes before the root element,
        False if the root element starts first (or the whole document has none),
        None if ``head`` ends inside the prolog (an absurdly long prolog).
    """
    if head.startswith(b"\xef\xbb\xbf"):
        text = head[3:].decode("utf-8", "replace")
    elif head.startswith((b"\xff\xfe", b"\xfe\xff")) or head[:4] in (b"<\x00?\x00", b"\x00<\x00?"):
        big = head.startswith(b"\xfe\xff") or head[:1] == b"\x00"
        text = head[: len(head) // 2 * 2].decode("utf-16-be" if big else "utf-16-le", "replace")
        text = text.lstrip("\ufeff")
    else:
        text = head.decode("utf-8", "replace")
    pos = 0
    while True:
        match = _PROLOG_TOKEN.match(text, pos)
        if match is None:
            break
        pos = match.end()
    rest = text[pos:].lstrip()
    if rest.startswith(("<!DOCTYPE", "<!ENTITY")):
        return True
    if len(rest) > 1 and rest[0] == "<" and rest[1] not in "!?":
        return False
    return False if complete else None


_ROOT = re.compile(r"<(?:([A-Za-z_][\w.-]*):)?([A-Za-z_][\w.-]*)[\s>/]")


def root_prefix(text: str) -> tuple[str, str]:
    """Return (prefix-with-colon or '', local name) of the root element of ``text``."""
    pos = 0
    while True:
        match = _PROLOG_TOKEN.match(text, pos)
        if match is None:
            break
        pos = match.end()
    match = _ROOT.search(text, pos)
    if match is None:
        raise ValueError("no root element")
    prefix = match.group(1)
    return (prefix + ":" if prefix else ""), match.group(2)


_TAG = re.compile(r"<(/?)((?:[A-Za-z_][\w.-]*:)?[A-Za-z_][\w.-]*)((?:\s[^>]*?)?)(/?)>|<!--.*?-->|<!\[CDATA\[.*?\]\]>|<\?.*?\?>",
                  re.S)


def iter_top_level(text: str, start: int, end: int) -> Iterator[tuple[str, int, int]]:
    """Yield (qualified name, start, end) of each element at depth 0 within text[start:end].

    Comments, CDATA and processing instructions are skipped; nesting is tracked so that
    children of children are not reported.
    """
    depth = 0
    open_name = ""
    open_start = 0
    for match in _TAG.finditer(text, start, end):
        name = match.group(2)
        if name is None:
            continue
        closing, selfclosing = match.group(1) == "/", match.group(4) == "/"
        if closing:
            depth -= 1
            if depth == 0:
                yield open_name, open_start, match.end()
            if depth < 0:
                return  # reached the parent's end tag
        elif selfclosing:
            if depth == 0:
                yield name, match.start(), match.end()
        else:
            if depth == 0:
                open_name, open_start = name, match.start()
            depth += 1


def find_element_span(text: str, qname: str, start: int = 0) -> tuple[int, int, int, int] | None:
    """Find the first element ``qname`` from ``start``.

    Returns
    -------
    tuple or None
        (start of start tag, end of start tag, start of end tag, end of element); for a
        self-closing element the two inner positions are both the end of the start tag.
    """
    opener = re.compile(r"<" + re.escape(qname) + r"(?:\s[^>]*?)?(/?)>", re.S)
    match = opener.search(text, start)
    if match is None:
        return None
    if match.group(1) == "/":
        return match.start(), match.end(), match.end(), match.end()
    depth = 1
    pattern = re.compile(r"<(/?)" + re.escape(qname) + r"(?:\s[^>]*?)?(/?)>", re.S)
    for inner in pattern.finditer(text, match.end()):
        if inner.group(2) == "/":
            continue
        depth += -1 if inner.group(1) == "/" else 1
        if depth == 0:
            return match.start(), match.end(), inner.start(), inner.end()
    raise ValueError(f"element <{qname}> is not closed")
