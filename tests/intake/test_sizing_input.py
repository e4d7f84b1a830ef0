"""The sizing words and the stock-list rule of the intake (`_words`, `_sizing_input`)."""

import pytest
from twistshare.engine.core import OuterLayers, SizedDimension
from twistshare.engine.intake import field_by_key
from twistshare.engine.intake._sizing_input import parse_stock_list
from twistshare.engine.intake._words import outer_layers_from_text, size_request_from_text, size_text

OD, WALL, BORE = SizedDimension.OUTER_DIAMETER, SizedDimension.WALL, SizedDimension.BORE
STOCK = field_by_key("stock")


class TestSizeWords:
    """A Size cell names a dimension and a layer (1-based in the cell, 0-based slot; -1 outermost)."""

    @pytest.mark.parametrize("text, expected", [
        ("layer 2 outer diameter", (OD, 1)), ("Layer_2 OD", (OD, 1)), ("L3 wall", (WALL, 2)),
        ("layer 2 wall thickness", (WALL, 1)), ("core bore", (BORE, 0)), ("bore", (BORE, 0)),
        ("layer 1 inner diameter", (BORE, 0)), ("outer diameter", (OD, -1)), ("sleeve wall", (WALL, -1)),
        ("core outer diameter", (OD, 0)),
    ])
    def test_read(self, text, expected):
        assert size_request_from_text(text) == expected

    @pytest.mark.parametrize("text", ["layer 2 bore", "sleeve bore", "layer 0 od", "layer 2 diametre", "", 3.0])
    def test_refused(self, text):
        assert size_request_from_text(text) is None

    def test_output_words(self):
        assert size_text(OD, 1) == "layer 2 outer diameter"
        assert size_text(BORE, 0) == "core bore"
        assert size_text(WALL, 0) == "layer 1 wall"


@pytest.mark.parametrize("text, expected", [
    ("move", OuterLayers.MOVE), ("Moving", OuterLayers.MOVE), ("fixed", OuterLayers.FIXED),
    ("stay", OuterLayers.FIXED), ("sideways", None), (None, None),
])
def test_outer_layers_words(text, expected):
    assert outer_layers_from_text(text) == expected


class TestStockList:
    """One cell holds the list: ';' or ',' between sizes, the point for decimals, ascending."""

    @pytest.mark.parametrize("raw, unit, expected_mm", [
        ("60, 63, 65", "mm", [60, 63, 65]), ("60; 63.5; 65", "mm", [60, 63.5, 65]),
        (60, "mm", [60]), ("2.5 in; 2.75 in", None, [63.5, 69.85]),  # 1 in = 25.4 mm exactly
        ("60 mm, 2.5 in", "mm", [60, 63.5]),
        ("60; 63; 65 mm", None, [60, 63, 65]),  # no header unit: the last size's unit serves all
        ("2.5; 2.75 in", None, [63.5, 69.85]),
    ])
    def test_read(self, raw, unit, expected_mm):
        factor = 1e-3 if unit == "mm" else None
        sizes, problem = parse_stock_list(raw, STOCK, unit, factor, "no unit")
        assert problem is None
        assert sizes == pytest.approx([v * 1e-3 for v in expected_mm], rel=1e-12)

    @pytest.mark.parametrize("raw, words", [
        ("60,5", "ascending"), ("65; 60", "ascending"), ("60; ; 65", "empty entry"),
        ("60; sixty-three", "sixty-three"), ("-60", "negative"), ("60; 90000", "plausible"),
    ])
    def test_refused(self, raw, words):
        sizes, problem = parse_stock_list(raw, STOCK, "mm", 1e-3)
        assert sizes == [] and words in problem

    def test_bare_sizes_without_any_unit_refused(self):
        sizes, problem = parse_stock_list("60; 63; 65", STOCK, None, None, "no unit")
        assert sizes == [] and "no unit" in problem
