"""Find the formulas that call twistshare's cell functions, and evaluate them headless.

The evaluator understands exactly what our functions are called with: a call of one of our
functions whose arguments are cell references, ranges (on this or another sheet), numbers,
strings, TRUE/FALSE, empty arguments and nested calls of our functions. Anything else is not
evaluated (the caller then keeps the book's cached value, or says it has none). Nothing from a
workbook is ever evaluated as Python.
"""

from __future__ import annotations

import html
import re
from collections.abc import Callable, Mapping
from dataclasses import dataclass

from twistshare.engine.intake import SheetGrid, cell_ref, parse_ref

__all__ = ["FormulaCell", "find_our_formulas", "evaluate_formula", "NotEvaluable", "shift_formula"]


class NotEvaluable(ValueError):
    """The formula uses something beyond a call of our functions with plain arguments."""


@dataclass(frozen=True)
class FormulaCell:
    """A cell whose formula calls one of our functions."""

    ref: str
    formula: str  # without the leading '='
    cached: object  # the cached value (float, str, bool) or None when the cache is empty
    kind: str  # "normal", "shared" or "array"
    spill_ref: str | None = None
    cached_error: bool = False  # the cached value is an error (#NAME? where the add-in was missing)


_CELL = re.compile(rb"<c\b([^>]*?)(?:/>|>(.*?)</c>)", re.S)
_ATTR = re.compile(rb'\b(r|t)="([^"]*)"')
_F = re.compile(rb"<f\b([^>]*?)(?:/>|>(.*?)</f>)", re.S)
_F_ATTR = re.compile(rb'\b(t|si|ref)="([^"]*)"')
_V = re.compile(rb"<v>(.*?)</v>", re.S)
_IS = re.compile(rb"<t\b[^>]*>(.*?)</t>", re.S)


def _calls_ours(text: str, names: frozenset[str]) -> bool:
    up = text.upper()
    return any(re.search(r"(?<![A-Z0-9_.])(?:_XLUDF\.)?" + re.escape(n) + r"\s*\(", up) for n in names)


def find_our_formulas(sheet_xml: bytes, names: frozenset[str]) -> list[FormulaCell]:
    """Every cell of a sheet whose formula (own or shared) calls one of ``names`` (upper case)."""
    if b"<f" not in sheet_xml:
        return []
    shared: dict[str, tuple[str, str]] = {}  # si -> (master ref, master formula)
    out: list[FormulaCell] = []
    for m in _CELL.finditer(sheet_xml):
        body = m.group(2)
        if not body or b"<f" not in body:
            continue
        attrs = dict(_ATTR.findall(m.group(1)))
        ref = attrs.get(b"r", b"").decode()
        fm = _F.search(body)
        if fm is None or not ref:
            continue
        fattrs = dict(_F_ATTR.findall(fm.group(1)))
        ftext = html.unescape((fm.group(2) or b"").decode("utf-8", "replace"))
        kind = fattrs.get(b"t", b"normal").decode()
        if kind == "shared":
            si = fattrs.get(b"si", b"").decode()
            if ftext:
                shared[si] = (ref, ftext)
            elif si in shared:
                mref, mtext = shared[si]
                ftext = shift_formula(mtext, mref, ref)
        if not ftext or not _calls_ours(ftext, names):
            continue
        vm = _V.search(body)
        t = attrs.get(b"t", b"n").decode()
        cached: object = None
        if vm is not None:
            raw = html.unescape(vm.group(1).decode("utf-8", "replace"))
            if t in ("str", "e"):
                cached = raw
            elif t == "b":
                cached = raw == "1"
            else:
                try:
                    cached = float(raw)
                except ValueError:
                    cached = raw
        elif t == "inlineStr":
            tm = _IS.search(body)
            cached = html.unescape(tm.group(1).decode()) if tm else None
        spill = fattrs.get(b"ref", b"").decode() or None if kind == "array" else None
        out.append(FormulaCell(ref, ftext, cached, kind, spill, cached_error=t == "e" and cached is not None))
    return out


_REF_IN_FORMULA = re.compile(r"(?<![A-Za-z0-9_!'\"])(\$?)([A-Z]{1,3})(\$?)([0-9]{1,7})(?![A-Za-z0-9_(])")


def shift_formula(text: str, from_ref: str, to_ref: str) -> str:
    """The formula of a shared-formula master moved from ``from_ref`` to ``to_ref``."""
    r0, c0 = parse_ref(from_ref)
    r1, c1 = parse_ref(to_ref)
    dr, dc = r1 - r0, c1 - c0
    out = []
    pos = 0
    # Leave string literals alone.
    for m in re.finditer(r'"(?:[^"]|"")*"', text):
        out.append(_shift_part(text[pos:m.start()], dr, dc))
        out.append(m.group(0))
        pos = m.end()
    out.append(_shift_part(text[pos:], dr, dc))
    return "".join(out)


def _shift_part(text: str, dr: int, dc: int) -> str:
    def sub(m: re.Match) -> str:
        cabs, col, rabs, row = m.groups()
        r, c = parse_ref(col + row)
        if not cabs:
            c += dc
        if not rabs:
            r += dr
        letters = cell_ref(0, c)[:-1]
        return f"{cabs}{letters}{rabs}{r + 1}"

    return _REF_IN_FORMULA.sub(sub, text)


# ---- evaluation -------------------------------------------------------------------------------

_TOKEN = re.compile(
    r"""\s*(?:
      (?P<str>"(?:[^"]|"")*")
    | (?P<ref>(?:(?:'(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_. ]*)!)?\$?[A-Za-z]{1,3}\$?[0-9]{1,7}(?::\$?[A-Za-z]{1,3}\$?[0-9]{1,7})?)(?![A-Za-z0-9_(])
    | (?P<num>[-+]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][-+]?[0-9]+)?)
    | (?P<name>(?:_xludf\.)?[A-Za-z_][A-Za-z0-9_.]*)\s*(?P<open>\()?
    | (?P<punct>[(),;])
    )""",
    re.X,
)


def _tokens(text: str) -> list[tuple[str, str]]:
    toks: list[tuple[str, str]] = []
    pos = 0
    text = text.strip()
    while pos < len(text):
        m = _TOKEN.match(text, pos)
        if m is None or m.end() == pos:
            raise NotEvaluable(f"cannot read the formula at {text[pos:pos + 12]!r}")
        pos = m.end()
        if m.group("str") is not None:
            toks.append(("str", m.group("str")[1:-1].replace('""', '"')))
        elif m.group("ref") is not None:
            toks.append(("ref", m.group("ref")))
        elif m.group("num") is not None:
            toks.append(("num", m.group("num")))
        elif m.group("name") is not None:
            name = m.group("name")
            if m.group("open"):
                toks.append(("call", name.upper().removeprefix("_XLUDF.")))
            elif name.upper() in ("TRUE", "FALSE"):
                toks.append(("bool", name.upper()))
            else:
                raise NotEvaluable(f"named ranges and names such as {name!r} are not evaluated")
        else:
            toks.append(("punct", m.group("punct")))
        while pos < len(text) and text[pos] == " ":
            pos += 1
    return toks


GridSource = Callable[[str], SheetGrid | None]


def evaluate_formula(formula: str, sheet: str, grids: GridSource, functions: Mapping[str, Callable]) -> object:
    """Evaluate ``formula`` (no leading '=') found on ``sheet``; raises NotEvaluable."""
    toks = _tokens(formula.lstrip("="))
    value, pos = _expr(toks, 0, sheet, grids, functions)
    if pos != len(toks):
        raise NotEvaluable("the formula does more than call a twistshare function")
    return value


def _expr(toks, pos, sheet, grids, functions):
    if pos >= len(toks):
        raise NotEvaluable("the formula ends early")
    kind, text = toks[pos]
    if kind == "call":
        fn = functions.get(text)
        if fn is None:
            raise NotEvaluable(f"{text} is not a twistshare function")
        args = []
        pos += 1
        if pos < len(toks) and toks[pos] == ("punct", ")"):
            return fn(*args), pos + 1
        while True:
            if pos < len(toks) and toks[pos][0] == "punct" and toks[pos][1] in ",;":
                args.append(None)  # an empty argument
                pos += 1
                continue
            if pos < len(toks) and toks[pos] == ("punct", ")"):
                args.append(None)
                return fn(*args), pos + 1
            v, pos = _expr(toks, pos, sheet, grids, functions)
            args.append(v)
            if pos >= len(toks):
                raise NotEvaluable("a bracket is not closed")
            k, t = toks[pos]
            if (k, t) == ("punct", ")"):
                return fn(*args), pos + 1
            if k == "punct" and t in ",;":
                pos += 1
                continue
            raise NotEvaluable(f"unexpected {t!r} in the arguments")
    if kind == "str":
        return text, pos + 1
    if kind == "num":
        return float(text), pos + 1
    if kind == "bool":
        return text == "TRUE", pos + 1
    if kind == "ref":
        return _resolve(text, sheet, grids), pos + 1
    raise NotEvaluable(f"unexpected {text!r}")


def _resolve(ref: str, sheet: str, grids: GridSource) -> object:
    if "!" in ref:
        sheet_part, ref = ref.rsplit("!", 1)
        sheet = sheet_part[1:-1].replace("''", "'") if sheet_part.startswith("'") else sheet_part
    grid = grids(sheet)
    if grid is None:
        raise NotEvaluable(f"the formula refers to a sheet {sheet!r} the book does not have")
    if ":" in ref:
        a, b = ref.split(":")
        (r0, c0), (r1, c1) = parse_ref(a), parse_ref(b)
        r0, r1 = sorted((r0, r1))
        c0, c1 = sorted((c0, c1))
        return [[_cell(grid, r, c) for c in range(c0, c1 + 1)] for r in range(r0, r1 + 1)]
    r, c = parse_ref(ref)
    return _cell(grid, r, c)


def _cell(grid: SheetGrid, r: int, c: int) -> object:
    # Values go to our functions exactly as the host passes them: numbers as floats, text as
    # str, empty cells as None.
    return grid.value(r, c)
