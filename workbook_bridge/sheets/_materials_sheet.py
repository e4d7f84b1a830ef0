"""The materials sheet: the materials as used, book rows completed from the library."""

from __future__ import annotations

from twistshare.engine.intake import RULE_FORMULAS, Display, MaterialSet

from ..ooxml import BookWriter, PrintSetup
from ._cells import Styled
from ._cells import finite_or_none as _num
from ._layout import column_width, header_height, number_chars, number_style, row_heights, text_chars

__all__ = ["materials_rows", "add_materials_sheet", "MATERIALS_SHEET"]

MATERIALS_SHEET = "Twistshare materials"
_NUMBER_COLUMNS = (2, 3, 5, 6, 7)  # G, allowable, yield, ultimate, factor of safety
_PROBLEM_WIDTH = 50.0


def _from(m, filled: set[tuple[str, str]]) -> str:
    """Where the row's values come from: the book, the library, or the book completed from the library."""
    if m.origin == "book" and any(name == m.name.lower() for name, _ in filled):
        return "book, blanks from the library"
    return m.origin


def materials_rows(materials: MaterialSet, display: Display) -> list[list]:
    """The materials as used: book rows completed from the library, filled values marked."""
    su, sf = display.unit("stress")
    header = ["Material", "From", "G [GPa]", f"Allowable shear [{su}]", "Allowable rule", f"Yield strength [{su}]",
              f"Ultimate strength [{su}]", "Factor of safety", "Keyway", "Problem"]
    rows: list[list] = [[Styled(h, "header") for h in header]]
    filled = {(f.material.lower(), f.field) for f in materials.filled}
    for m in materials.by_name.values():
        def v(x: float, field: str, scale: float) -> object:
            val = _num(x / scale) if x is not None else None
            if (m.name.lower(), field) in filled and val is not None:
                return Styled(val, "filled")
            return val
        if m.problem:  # nothing derived from unusable inputs is shown as if it were used
            rows.append([m.name, _from(m, filled), None, None, RULE_FORMULAS.get(m.rule, str(m.rule)), None, None,
                         None, "yes" if m.keyway else "no", m.problem])
            continue
        rows.append([m.name, _from(m, filled), v(m.shear_modulus, "shear_modulus", 1e9), _num(m.allowable_shear / sf),
                     RULE_FORMULAS.get(m.rule, str(m.rule)), v(m.yield_strength, "yield_strength", sf),
                     v(m.ultimate_strength, "ultimate_strength", sf), _num(m.factor_of_safety),
                     "yes" if m.keyway else "no", m.problem])
    return rows


def add_materials_sheet(writer: BookWriter, materials: MaterialSet, display: Display) -> None:
    """The materials sheet, each number column to four significant digits, problems wrapped; landscape, one page wide."""
    rows = materials_rows(materials, display)
    headers = [c.value for c in rows[0]]
    body = rows[1:]
    styles: list[str | None] = ["top"] * len(headers)
    chars = []
    for c, _ in enumerate(headers):
        values = [r[c].value if hasattr(r[c], "value") else r[c] for r in body]
        if c in _NUMBER_COLUMNS:
            numbers = [x for x in values if isinstance(x, (int, float))]
            styles[c] = ("fixed2" if headers[c] == "Factor of safety" else number_style(numbers)) + "+top"
            chars.append(number_chars(numbers, styles[c].split("+")[0]))
        else:
            chars.append(text_chars(values))
    styles[-1] = "wrap"
    for c in range(1, len(headers)):  # a text right of a number is kept off it
        if c not in _NUMBER_COLUMNS and c - 1 in _NUMBER_COLUMNS:
            styles[c] += "+indent"
            chars[c] += 2
    widths = [column_width(h, n, maximum=_PROBLEM_WIDTH if h == "Problem" else 40.0) for h, n in zip(headers, chars)]
    heights = row_heights(body, widths, [len(headers) - 1], first_row=2)
    # a filled value keeps its mark; its number format is the column's
    rows = [rows[0]] + [[Styled(x.value, f"filled+{styles[c].split('+')[0]}") if getattr(x, "style", None) == "filled"
                         else x for c, x in enumerate(r)] for r in body]
    writer.add_sheet(MATERIALS_SHEET, rows, column_widths=widths, column_styles=styles,
                     header_height=header_height(headers, widths), row_heights=heights,
                     print_setup=PrintSetup(orientation="landscape", title_rows=(1, 1), title_columns=1))
