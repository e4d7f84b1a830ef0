"""The sizing columns of a parts table read by the intake (`_sizing_input`), through `rate_tables`.

Outside sources: the torsion formula of a solid shaft τ = 16·T/(π·d³) solved for d,
d = (16·T·RF/(π·τa))^(1/3) (Roark's Formulas for Stress and Strain, torsion of circular
sections); millimetres through pint's own definition. The messages are the intake's own wording,
written out here as its specification. Parts and materials are invented (BRIEF §4).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pint
import pytest
from _membook import MemoryBook
from twistshare.engine.core import OuterLayers, SizedDimension, SizingStatus, StockStatus
from twistshare.engine.intake import Severity, cell_value, field_by_key, rate_tables
from twistshare.engine.intake._sizing_input import parse_stock_list, slot_refusal

U = pint.UnitRegistry()
MM = U.Quantity(1, "mm").to("m").magnitude
OD, WALL, BORE = SizedDimension.OUTER_DIAMETER, SizedDimension.WALL, SizedDimension.BORE
MOVE, FIXED = OuterLayers.MOVE, OuterLayers.FIXED
STOCK = field_by_key("stock")
TAU = 60e6  # Pa, the core steel's allowable (invented)
MATERIALS = [["Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule"],
             ["MPD core steel", 80, 60, "given"], ["MPD sleeve steel", 80, 60, "given"]]
# columns A..M
HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
        "Layer 1 inner diameter [mm]", "Layer 2 material", "Layer 2 outer diameter [mm]",
        "Layer 2 inner diameter [mm]", "Size", "Target reserve factor", "Stock sizes [mm]", "Outer layers"]


def _solid(pid, size, target=None, stock=None, outer=None, torque=1000):
    return [pid, 500, torque, "MPD core steel", 50, None, None, None, None, size, target, stock, outer]


def _sleeved(pid, size, target=None, stock=None, outer=None):
    return [pid, 500, 2000, "MPD core steel", 40, None, "MPD sleeve steel", 60, 40, size, target, stock, outer]


def _rated(*rows, head=HEAD):
    return rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": [head, *rows]}))


def _errors(result):
    return [p for p in result.problems if p.severity is Severity.ERROR]


def _d(torque, target):
    """Roark's: the solid diameter whose shear stress is τa/RF."""
    return (16.0 * torque * target / (math.pi * TAU)) ** (1.0 / 3.0)


@pytest.mark.parametrize("dimension, slot, n_layers, outer, why", [
    (OD, 0, 0, MOVE, "size-layer"), (OD, 0, 1, MOVE, None), (OD, 1, 1, MOVE, "size-layer"),
    (OD, 2, 2, MOVE, "size-layer"), (OD, 1, 2, MOVE, None), (OD, 0, 2, MOVE, None),
    (OD, 0, 2, FIXED, "size-fixed"), (WALL, 0, 2, FIXED, "size-fixed"), (BORE, 0, 2, FIXED, None),
    (OD, 1, 2, FIXED, None), (WALL, 1, 2, FIXED, None), (BORE, 0, 1, FIXED, None),
    (OD, 0, 0, FIXED, "size-layer"),
])
def test_slot_refusal(dimension, slot, n_layers, outer, why):
    assert slot_refusal(dimension, slot, n_layers, outer) == why


def test_a_solid_shaft_is_sized_to_the_torsion_formula_and_rounded_up_to_stock():
    result = _rated(_solid("MPD-Z-001", "outer diameter", 1.5, "45; 50; 52; 55"),
                    _solid("MPD-Z-002", "layer 1 outer diameter"),
                    _solid("MPD-Z-003", None))
    s = result.sizing
    d = _d(1000, 1.5)
    assert 50 * MM < d < 52 * MM
    assert s.size[0] == pytest.approx(d, abs=0.002 * MM)
    assert s.size[1] == pytest.approx(_d(1000, 1.0), abs=0.002 * MM)  # blank target: 1
    assert np.isnan(s.size[2]) and s.status[2] == -1 and not s.sized[2]
    assert list(s.status[:2]) == [SizingStatus.SOLVED, SizingStatus.SOLVED]
    assert list(s.sized) == [True, True, False] and s.count == 2
    assert list(s.request.target) == [1.5, 1.0, 1.0]
    assert list(s.request.dimension) == [OD, OD, -1]
    assert list(s.request.slot[:2]) == [0, 0]
    assert s.request.stock[0] == pytest.approx([45 * MM, 50 * MM, 52 * MM, 55 * MM], rel=1e-12)
    assert np.isnan(s.request.stock[1]).all()
    assert list(s.has_stock) == [True, False, False]
    assert s.stock_status[0] == StockStatus.FOUND and s.stock_status[1] == -1
    assert s.stock_size[0] == pytest.approx(52 * MM, rel=1e-12)
    # the reserve factor at 52 mm: τa·π·d³/16 over T
    assert s.stock_reserve_factor[0] == pytest.approx(TAU * math.pi * (52 * MM) ** 3 / 16 / 1000, rel=1e-6)
    assert s.request.size_cell(0) == "J2" and s.request.stock_cell(2) == "L4" and s.request.sheet == "Parts"
    assert list(result.rated) == [True, True, True]
    assert not _errors(result) and not [p for p in result.problems if p.code in ("sizing", "stock")]


def test_the_outermost_layer_is_resolved_per_part():
    result = _rated(_sleeved("MPD-Z-004", "outer diameter"), _solid("MPD-Z-005", "outer diameter"),
                    _sleeved("MPD-Z-006", "core bore"))
    req = result.sizing.request
    assert list(req.slot) == [1, 0, 0]
    assert list(req.dimension) == [OD, OD, BORE]
    assert list(req.outer_layers) == [MOVE, MOVE, MOVE]


def test_a_stock_list_that_does_not_hold_is_warned_on_its_cell():
    result = _rated(_solid("MPD-Z-007", "outer diameter", 1.5, "40; 45; 48"), _solid("MPD-Z-008", "outer diameter"))
    (p,) = [p for p in result.problems if p.code == "stock"]
    assert p.severity is Severity.WARNING and p.cell == "L2" and p.part == "MPD-Z-007"
    assert p.message == "part MPD-Z-007: stock: no stock size listed holds"
    assert list(result.rated) == [True, True]


def test_a_bad_size_word_is_refused_in_full():
    result = _rated(_sleeved("MPD-Z-009", "layer 2 diametre"), _sleeved("MPD-Z-010", "layer 2 outer diameter"))
    (p,) = _errors(result)
    assert p.code == "size-word" and p.cell == "J2" and p.part == "MPD-Z-009"
    assert p.message == ("part MPD-Z-009: dimension to size: 'layer 2 diametre' is not a dimension twistshare "
                         "sizes; expected 'layer 2 outer diameter', 'layer 2 wall', 'core bore' (or 'outer diameter' "
                         "/ 'wall' for the outermost layer, 'core outer diameter'); the part is not rated")
    assert list(result.rated) == [False, True]
    assert list(result.sizing.request.asked) == [False, True]
    assert list(result.sizing.request.dimension) == [-1, OD]


def test_the_same_bad_word_twice_is_refused_twice():
    result = _rated(_sleeved("MPD-Z-011", "layer 2 diametre"), _sleeved("MPD-Z-012", "layer 2 diametre"),
                    _sleeved("MPD-Z-013", "layer 2 wall"))
    assert [(p.code, p.cell) for p in _errors(result)] == [("size-word", "J2"), ("size-word", "J3")]
    assert list(result.rated) == [False, False, True]


def test_an_error_value_in_the_size_cell_is_refused():
    result = _rated(_sleeved("MPD-Z-014", "#N/A"), _sleeved("MPD-Z-015", "layer 2 wall"))
    (p,) = _errors(result)
    assert p.code == "error-value" and p.cell == "J2"
    assert p.message == ("part MPD-Z-014: dimension to size: the cell holds the error value #N/A; expected a "
                         "dimension to size; the part is not rated")
    assert list(result.rated) == [False, True]


def test_a_layer_the_part_does_not_have_is_refused():
    result = _rated(_sleeved("MPD-Z-016", "layer 3 outer diameter"), _solid("MPD-Z-017", "layer 2 wall"),
                    _sleeved("MPD-Z-018", "layer 2 wall"))
    errors = _errors(result)
    assert [(p.code, p.cell) for p in errors] == [("size-layer", "J2"), ("size-layer", "J3")]
    assert errors[0].message == ("part MPD-Z-016: dimension to size: 'layer 3 outer diameter': the part has 2 "
                                 "layer(s); the part is not rated")
    assert errors[1].message.startswith("part MPD-Z-017: dimension to size: 'layer 2 wall': the part has 1 layer(s)")
    assert list(result.rated) == [False, False, True]


def test_fixed_outer_layers_leave_only_the_outermost_face_free():
    result = _rated(_sleeved("MPD-Z-019", "layer 1 outer diameter", outer="fixed"),
                    _sleeved("MPD-Z-020", "layer 2 outer diameter", outer="Fixed"),
                    _sleeved("MPD-Z-021", "core bore", outer="fixed"),
                    _sleeved("MPD-Z-022", "layer 1 outer diameter", outer="move"))
    (p,) = _errors(result)
    assert p.code == "size-fixed" and p.cell == "J2" and p.part == "MPD-Z-019"
    assert p.message == ("part MPD-Z-019: dimension to size: 'layer 1 outer diameter' with the outer layers "
                         "fixed: only the outermost layer (layer 2) can change its outer face without breaking a "
                         "contact; say 'move' under Outer layers or size that layer; the part is not rated")
    assert list(result.sizing.request.outer_layers) == [FIXED, FIXED, FIXED, MOVE]
    assert list(result.rated) == [False, True, True, True]
    assert list(result.sizing.sized) == [False, True, True, True]


def test_a_bad_outer_layers_word_refuses_only_a_part_that_sizes():
    result = _rated(_sleeved("MPD-Z-023", "layer 2 wall", outer="sideways"),
                    _sleeved("MPD-Z-024", None, outer="sideways"),
                    _sleeved("MPD-Z-025", "layer 2 wall", outer="#REF!"),
                    _sleeved("MPD-Z-026", "layer 2 wall", outer="move"))
    errors = _errors(result)
    assert [(p.code, p.cell, p.part) for p in errors] == [("outer-layers", "M2", "MPD-Z-023"),
                                                          ("outer-layers", "M4", "MPD-Z-025")]
    assert errors[0].message == ("part MPD-Z-023: outer layers: 'sideways': expected 'move' (the layers outside "
                                 "keep their walls and move out) or 'fixed'; the part is not rated")
    assert list(result.rated) == [False, True, False, True]


def test_a_refused_part_is_not_refused_twice():
    result = _rated(_sleeved("MPD-Z-027", "layer 3 wall", outer="sideways"))
    assert [p.code for p in _errors(result)] == ["outer-layers"]


def test_sizing_columns_without_a_size_column_are_warned_and_nothing_is_sized():
    head = HEAD[:9] + ["Target reserve factor", "Stock sizes [mm]", "Outer layers"]
    result = _rated(_sleeved("MPD-Z-028", None)[:9] + [1.5, "60; 65", "move"], head=head)
    warned = [p for p in result.problems if p.code == "sizing-no-size"]
    assert [(p.cell, p.severity) for p in warned] == [("J1", Severity.WARNING), ("K1", Severity.WARNING),
                                                      ("L1", Severity.WARNING)]
    assert warned[0].message == ("parts column 'Target reserve factor' is read only with a 'Size' column naming "
                                 "the dimension to size; nothing is sized")
    assert result.sizing is None and list(result.rated) == [True]


def test_a_blank_size_column_sizes_nothing_and_reads_nothing_else():
    result = _rated(_sleeved("MPD-Z-029", None, "abc", "x; y", "sideways"))
    assert result.sizing is None
    assert list(result.rated) == [True]


def test_a_bad_target_refuses_the_part_that_sizes():
    result = _rated(_sleeved("MPD-Z-030", "layer 2 wall", -1.5), _sleeved("MPD-Z-031", "layer 2 wall", 1.2))
    (p,) = _errors(result)
    assert p.cell == "K2" and p.part == "MPD-Z-030"
    assert list(result.rated) == [False, True]
    assert list(result.sizing.request.asked) == [False, True]
    assert result.sizing.request.target[1] == 1.2


def test_stock_cells_refused_only_on_parts_that_size():
    result = _rated(_solid("MPD-Z-032", "outer diameter", stock="50; fifty-five"),
                    _solid("MPD-Z-033", None, stock="50; fifty-five"),
                    _solid("MPD-Z-034", "outer diameter", stock="#N/A"),
                    _solid("MPD-Z-035", "outer diameter", stock="  "),
                    _solid("MPD-Z-036", "outer diameter", stock=55))
    errors = _errors(result)
    assert [(p.code, p.cell, p.part) for p in errors] == [("stock", "L2", "MPD-Z-032"), ("stock", "L4", "MPD-Z-034")]
    assert errors[0].message.startswith("part MPD-Z-032: stock sizes: stock size 'fifty-five': ")
    assert errors[0].message.endswith("; the part is not rated") and errors[0].values == ("50; fifty-five",)
    assert errors[1].message == ("part MPD-Z-034: stock sizes: the cell holds the error value #N/A; expected a "
                                 "list of stock sizes; the part is not rated")
    assert list(result.rated) == [False, True, False, True, True]
    s = result.sizing
    assert list(s.request.asked) == [False, False, False, True, True]
    assert list(s.has_stock) == [False, False, False, False, True]
    assert s.request.stock.shape == (5, 1) and s.request.stock[4, 0] == pytest.approx(55 * MM, rel=1e-12)
    assert s.stock_size[4] == pytest.approx(55 * MM, rel=1e-12)


class TestStockListWords:
    """The stock-list messages in full."""

    def test_an_empty_entry(self):
        assert parse_stock_list("60; ; 65", STOCK, "mm", MM) == (
            [], "'60; ; 65': an empty entry in the list; write the sizes ascending, separated by ';' or ',' "
                "(the decimal separator is the point)")

    def test_a_decimal_comma_is_told_why(self):
        assert parse_stock_list("60,5", STOCK, "mm", MM) == (
            [], "'60,5': stock sizes must be listed ascending, each once (a comma separates sizes: write "
                "decimals with a point, e.g. 60.5)")

    @pytest.mark.parametrize("raw", ["65; 60", "60; 60"])
    def test_not_ascending_without_a_comma(self, raw):
        assert parse_stock_list(raw, STOCK, "mm", MM) == (
            [], f"'{raw}': stock sizes must be listed ascending, each once")

    def test_one_bad_size_alone_is_the_cells_own_problem(self):
        sizes, problem = parse_stock_list("sixty", STOCK, "mm", MM)
        assert sizes == [] and problem == cell_value("sixty", STOCK, "mm", MM, None)[1]
        assert not problem.startswith("stock size")

    def test_one_bad_size_in_a_list_is_named(self):
        sizes, problem = parse_stock_list("60; sixty-five", STOCK, "mm", MM)
        assert sizes == []
        assert problem == "stock size 'sixty-five': " + cell_value("sixty-five", STOCK, "mm", MM, None)[1]

    def test_a_number_is_a_list_of_one(self):
        assert parse_stock_list(60, STOCK, "mm", MM) == ([pytest.approx(60 * MM, rel=1e-12)], None)

    def test_an_unknown_tail_unit_leaves_the_bare_sizes_without_a_unit(self):
        sizes, problem = parse_stock_list("60; 63 parsecs-ish", STOCK, None, None, "no unit in the header")
        assert sizes == [] and problem.startswith("stock size '60': ")


def test_a_request_and_its_results_cannot_be_changed_after_the_fact():
    s = _rated(_solid("MPD-Z-037", "outer diameter")).sizing
    with pytest.raises(dataclasses.FrozenInstanceError):
        s.request.target = np.ones(1)
    with pytest.raises(dataclasses.FrozenInstanceError):
        s.size = np.zeros(1)


def test_a_bore_no_size_of_which_holds_is_warned_on_the_size_cell():
    # even solid, 50 mm holds only τa·π·d³/16 ≈ 1.47 kN·m (Roark's): no bore carries 10 kN·m
    assert TAU * math.pi * (50 * MM) ** 3 / 16 < 10000
    result = _rated(_solid("MPD-Z-038", "core bore", torque=10000), _solid("MPD-Z-039", "core bore", torque=100))
    s = result.sizing
    assert list(s.status) == [SizingStatus.SHORT_AT_MOST, SizingStatus.SOLVED]
    (p,) = [p for p in result.problems if p.code == "sizing"]
    assert (p.severity, p.cell, p.part) == (Severity.WARNING, "J2", "MPD-Z-038")
    assert p.message == "part MPD-Z-038: sizing: no size in the range holds"
    # the bore where τ = τa: d_i⁴ = d⁴ − 16·T·d/(π·τa) (Roark's, hollow round)
    bore = ((50 * MM) ** 4 - 16 * 100 * (50 * MM) / (math.pi * TAU)) ** 0.25
    assert s.size[1] == pytest.approx(bore, abs=0.002 * MM)
    assert list(result.rated) == [True, True]


def test_a_core_grown_under_a_moving_sleeve_is_a_solid_shaft_of_the_same_steel():
    # core and sleeve of one steel: the section is a solid bar of the sleeve's outer diameter,
    # d_o = (16·T·RF/(π·τa))^(1/3) (Roark's); the sleeve keeps its 10 mm wall and moves out
    result = _rated(_sleeved("MPD-Z-040", "layer 1 outer diameter"), _solid("MPD-Z-041", "outer diameter"),
                    _sleeved("MPD-Z-042", "layer 2 outer diameter", outer="fixed"))
    s = result.sizing
    assert s.size[0] == pytest.approx(_d(2000, 1.0) - 20 * MM, abs=0.002 * MM)
    assert s.size[1] == pytest.approx(_d(1000, 1.0), abs=0.002 * MM)
    assert s.size[2] == pytest.approx(_d(2000, 1.0), abs=0.002 * MM)
    assert list(s.status) == [SizingStatus.SOLVED] * 3


def test_a_size_column_alone_sizes_to_a_reserve_of_one_without_stock():
    head = HEAD[:10]
    result = _rated(_solid("MPD-Z-043", "outer diameter")[:10], _solid("MPD-Z-044", "layer 4 wall")[:10],
                    _solid("MPD-Z-045", None)[:10], head=head)
    s = result.sizing
    assert s.size[0] == pytest.approx(_d(1000, 1.0), abs=0.002 * MM)
    assert list(s.request.target) == [1.0, 1.0, 1.0]
    assert s.request.stock.shape == (3, 0) and s.request.stock_col is None and s.request.stock_cell(0) is None
    assert list(s.request.asked) == [True, False, False]  # the refused part asks nothing any more
    assert list(s.request.dimension) == [OD, -1, -1]
    assert list(s.has_stock) == [False, False, False]
    # not sized, or no stock: -1 for the layers, as the results sheet writes them
    assert list(s.governing_layer) == [0, -1, -1] and list(s.stock_layer) == [-1, -1, -1]
    assert list(s.stock_status) == [-1, -1, -1]
    assert [p.code for p in _errors(result)] == ["size-layer"]


def test_every_size_cell_after_an_error_value_is_still_read():
    result = _rated(_solid("MPD-Z-046", "#N/A")[:10], _solid("MPD-Z-047", "outer diameter")[:10], head=HEAD[:10])
    assert list(result.sizing.request.asked) == [False, True]
    assert list(result.sizing.sized) == [False, True]


def test_every_outer_layers_cell_after_a_blank_is_still_read():
    result = _rated(_sleeved("MPD-Z-048", "core bore"), _sleeved("MPD-Z-049", "core bore", outer="fixed"))
    assert list(result.sizing.request.outer_layers) == [MOVE, FIXED]


def test_a_part_refused_by_another_cell_does_not_stop_the_layer_check_of_the_next():
    bad = _sleeved("MPD-Z-050", "layer 2 wall")
    bad[2] = "abc"  # the torque cell
    result = _rated(bad, _sleeved("MPD-Z-051", "layer 3 outer diameter"))
    assert [(p.code, p.cell) for p in _errors(result)][-1] == ("size-layer", "J3")
    assert [p.cell for p in _errors(result)][0] == "C2"
    assert list(result.rated) == [False, False]


def test_a_stock_list_on_a_part_that_sizes_nothing_is_not_read():
    result = _rated(_solid("MPD-Z-052", None, stock="60; 65; 70"), _solid("MPD-Z-053", "outer diameter", stock="55"))
    s = result.sizing
    assert s.request.stock.shape == (2, 1)
    assert np.isnan(s.request.stock[0]).all() and s.request.stock[1, 0] == pytest.approx(55 * MM, rel=1e-12)


def test_sizing_judges_every_size_with_the_parts_other_inputs():
    # bending held at its value: the maximum-shear (Tresca) shaft, d³ = 16·√(M² + T²)/(π·τa)
    # (Shigley's Mechanical Engineering Design, shafts under steady bending and torsion)
    mats = [["Material", "G [GPa]", "E [GPa]", "Allowable shear [MPa]", "Allowable rule"],
            ["MPD core steel", 80, 200, 60, "given"]]
    head = HEAD[:10] + ["Bending moment [N·m]"]
    rows = [_solid("MPD-Z-054", "outer diameter")[:10] + [800], _solid("MPD-Z-055", "outer diameter")[:10] + [None]]
    result = rate_tables(MemoryBook({"Materials": mats, "Parts": [head, *rows]}))
    s = result.sizing
    d_bent = (16 * math.hypot(800, 1000) / (math.pi * TAU)) ** (1 / 3)
    assert s.size[0] == pytest.approx(d_bent, abs=0.002 * MM)
    assert s.size[1] == pytest.approx(_d(1000, 1.0), abs=0.002 * MM)
