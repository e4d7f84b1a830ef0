"""Finding and evaluating formulas that call our cell functions."""

import pytest
from twistshare.engine.intake import SheetGrid
from twistshare.workbook_bridge.commands._formula_eval import (
    NotEvaluable,
    evaluate_formula,
    find_our_formulas,
    shift_formula,
)

NAMES = frozenset({"TWS_ECHO", "TWS_SUM"})


def _echo(*args):
    return list(args)


def _sum(block, scale=None):
    total = sum(v for row in block for v in row if isinstance(v, float))
    return total * (scale if scale is not None else 1.0)


FUNCS = {"TWS_ECHO": _echo, "TWS_SUM": _sum}
GRID = SheetGrid("Data", [["", "x"], [1.0, 2.0], [3.0, "52 mm"]])
OTHER = SheetGrid("My sheet", [[10.0]])


def grids(name):
    return {"Data": GRID, "My sheet": OTHER}.get(name)


class TestFind:
    """find_our_formulas reads cells, cached values and shared formulas from sheet XML."""

    XML = (b'<sheetData><row r="2"><c r="B2"><f>TWS_SUM(A1:B3)</f><v>6</v></c>'
           b'<c r="C2" t="str"><f t="shared" si="0" ref="C2:C3">TWS_ECHO(A2)</f><v>x</v></c>'
           b'<c r="D2"><f>SUM(A1:A2)</f><v>3</v></c></row>'
           b'<row r="3"><c r="C3"><f t="shared" si="0"/></c></row></sheetData>')

    def test_finds_only_ours(self):
        found = find_our_formulas(self.XML, NAMES)
        assert [f.ref for f in found] == ["B2", "C2", "C3"]

    def test_cached_values(self):
        found = {f.ref: f for f in find_our_formulas(self.XML, NAMES)}
        assert found["B2"].cached == 6.0
        assert found["C2"].cached == "x"
        assert found["C3"].cached is None

    def test_shared_follower_is_shifted(self):
        found = {f.ref: f for f in find_our_formulas(self.XML, NAMES)}
        assert found["C3"].formula == "TWS_ECHO(A3)"


class TestShift:
    def test_relative_and_absolute(self):
        assert shift_formula('F(A1:$B$2, "A1", C$3)', "A1", "B3") == 'F(B3:$B$2, "A1", D$3)'


class TestEvaluate:
    """evaluate_formula handles refs, ranges, literals, empty and nested arguments only."""

    def test_range_and_number(self):
        assert evaluate_formula("TWS_SUM(A2:B3, 2)", "Data", grids, FUNCS) == pytest.approx(12.0)

    def test_literals_and_empty(self):
        got = evaluate_formula('TWS_ECHO(1.5, "a""b", TRUE, , B3)', "Data", grids, FUNCS)
        assert got == [1.5, 'a"b', True, None, "52 mm"]

    def test_other_sheet_and_nested(self):
        got = evaluate_formula("=TWS_ECHO('My sheet'!A1, TWS_SUM(A2:A3))", "Data", grids, FUNCS)
        assert got == [10.0, 4.0]

    @pytest.mark.parametrize("formula", [
        "TWS_SUM(A1:B3)*2", "SUM(A1:A2)", "TWS_ECHO(myname)", "TWS_ECHO(1", "TWS_ECHO(Nope!A1)",
        "__import__('os')",
    ])
    def test_refuses_the_rest(self, formula):
        with pytest.raises(NotEvaluable):
            evaluate_formula(formula, "Data", grids, FUNCS)
