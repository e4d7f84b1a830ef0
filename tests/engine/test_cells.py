"""Tests of twistshare.engine.cells: the worksheet functions, called as xlwings calls them.

Arguments take the shapes xlwings hands over: scalars (floats, whole numbers as int),
strings, None for an empty cell, Excel errors as text (``err_to_str``) or as the COM integer
codes, a 1-D list for a one-row or one-column range and a list of lists for a block.
Results are compared with the engine core called directly on SI floats, and where a closed
form exists, with that closed form (sources beside each check).
"""

from __future__ import annotations

import inspect
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from twistshare.engine import cells
from twistshare.engine.cells import (
    TWS_ALLOWABLE,
    TWS_GOVERNING_LIMIT,
    TWS_GOVERNS,
    TWS_LAYER_CAPACITY,
    TWS_MARGIN,
    TWS_SHARE,
    TWS_STRESS,
    TWS_STRESS_AT,
    TWS_TORQUE_FROM_POWER,
    TWS_TWIST_ANGLE,
    TWS_TWIST_PER_LENGTH,
    list_functions,
)
from twistshare.engine.core import (
    AllowableRule,
    Duty,
    LayerStack,
    allowable_shear,
    find_material,
    rate,
    torque_from_power,
)

WARN = "⚠"
INCH = 0.0254                      # NIST SP 811, exact
PSI = 4.4482216152605 / INCH**2    # lbf/in², NIST SP 811 exact definitions
LBF_IN = 4.4482216152605 * INCH
DEG = math.pi / 180

STEEL = "AISI 1045 hot rolled"
STAINLESS = "Stainless 316 annealed"
G_STEEL = find_material(STEEL).shear_modulus
G_STAINLESS = find_material(STAINLESS).shear_modulus

# A sleeved pump shaft in the style of the demo catalogue (MPD-S-014; invented values):
# a 40 mm solid steel core and a 50/40 mm stainless sleeve.
HEADER = ["Material", "Outer diameter [mm]", "Inner diameter [mm]", "Allowable [MPa]", "Kt"]
BLOCK = [HEADER, [STEEL, 40.0, 0.0, 100.0, None], [STAINLESS, 50.0, 40.0, 80.0, 1.2]]


def engine_rating(torque=math.nan, length=math.nan, angle=math.nan, per_length=math.nan):
    """The same part rated by the engine core directly, SI."""
    stack = LayerStack.from_layers(
        outer_diameter=[0.040, 0.050], inner_diameter=[0.0, 0.040],
        shear_modulus=[G_STEEL, G_STAINLESS], allowable_shear=[100e6, 80e6],
        stress_concentration=[1.0, 1.2],
    )
    return rate(stack, Duty.from_arrays(torque, length, angle, per_length))


def column(result):
    """The values of a spilled column, header row dropped."""
    assert isinstance(result, list), result
    return [row[0] for row in result[1:]]


def assert_warning(result, *words):
    assert isinstance(result, str) and result.startswith(WARN), result
    for word in words:
        assert word in result, (word, result)


# The same part written in the shapes an engineer may use; all must give the same results.
SHAPES = {
    "header, floats": BLOCK,
    "header, ints": [HEADER, [STEEL, 40, 0, 100, None], [STAINLESS, 50, 40, 80, 1.2]],
    "no header, value-unit strings": [
        [STEEL, "40 mm", 0, "100 MPa", None],
        [STAINLESS, "50mm", "40 mm", "80 N/mm²", 1.2],
    ],
    "G instead of names": [
        ["G [GPa]", "OD [mm]", "ID [mm]", "Allowable [MPa]", "Kt"],
        [G_STEEL / 1e9, 40, None, 100, 1],
        [G_STAINLESS / 1e9, 50, 40, 80, 1.2],
    ],
    "inches and psi": [
        ["Material", "Outer diameter [in]", "Inner diameter [in]", "Allowable [psi]", "Kt"],
        [STEEL, 0.040 / INCH, 0, 100e6 / PSI, None],
        [STAINLESS, 0.050 / INCH, 0.040 / INCH, 80e6 / PSI, 1.2],
    ],
    "columns in another order": [
        ["Kt", "Inner diameter [mm]", "Allowable [MPa]", "Outer diameter [mm]", "Material"],
        [None, 0, 100, 40, STEEL],
        [1.2, 40, 80, 50, STAINLESS],
    ],
    "trailing empty row": BLOCK + [[None] * 5],
    "selection wider than the block": [
        [STEEL, "40 mm", 0, "100 MPa", None, None, ""],
        [STAINLESS, "50 mm", "40 mm", "80 MPa", 1.2, None, None],
    ],
}


def values_of(result):
    """Numbers of a one-part spilled result, whatever its header."""
    if isinstance(result, list):
        rows = [r for r in result if not isinstance(r[0], str) or r[0] == ""]
        return [r[0] for r in rows if r[0] != ""]
    return [result]


class TestShapesGiveTheEngineResult:
    """Every block shape gives the engine core's numbers."""

    @pytest.mark.parametrize("name", SHAPES)
    def test_share(self, name):
        expected = engine_rating().share[0]
        assert values_of(TWS_SHARE(SHAPES[name])) == pytest.approx(expected, rel=1e-9)

    @pytest.mark.parametrize("name", SHAPES)
    def test_layer_capacity(self, name):
        expected = engine_rating().capacity[0]
        assert values_of(TWS_LAYER_CAPACITY(SHAPES[name])) == pytest.approx(expected, rel=1e-9)

    @pytest.mark.parametrize("name", SHAPES)
    def test_governing_limit(self, name):
        expected = engine_rating().governing_capacity[0]
        assert TWS_GOVERNING_LIMIT(SHAPES[name]) == pytest.approx(expected, rel=1e-9)

    @pytest.mark.parametrize("name", SHAPES)
    def test_stress(self, name):
        expected = engine_rating(torque=1000.0).stress_outer[0] / 1e6
        got = values_of(TWS_STRESS(SHAPES[name], "1000 N·m"))
        assert got == pytest.approx(expected, rel=1e-9)

    def test_one_row_per_part_groups_of_five(self):
        row = [[STEEL, "40 mm", 0, "100 MPa", None, STAINLESS, "50 mm", "40 mm", "80 MPa", 1.2]]
        rating = engine_rating()
        assert TWS_LAYER_CAPACITY(row)[0] == pytest.approx(rating.capacity[0], rel=1e-9)
        assert TWS_GOVERNING_LIMIT(row) == pytest.approx(rating.governing_capacity[0], rel=1e-9)
        assert TWS_GOVERNS(row) == "layer 2 stress (Stainless 316 annealed)"

    def test_one_row_per_part_with_layer_headers(self):
        header = ["Part", "Layer 1 material", "Layer 1 outer diameter [mm]",
                  "Layer 1 inner diameter [mm]", "Layer 1 allowable [MPa]",
                  "Layer 2 material", "Layer 2 outer diameter [mm]",
                  "Layer 2 inner diameter [mm]", "Layer 2 allowable [MPa]", "Layer 2 Kt"]
        table = [header,
                 ["MPD-S-014", STEEL, 40, 0, 100, STAINLESS, 50, 40, 80, 1.2],
                 ["MPD-S-015", STEEL, 30, 0, 100, None, None, None, None, None]]
        result = TWS_GOVERNING_LIMIT(table)
        assert result[0] == ["governing limit [N·m]"]
        assert result[1][0] == pytest.approx(engine_rating().governing_capacity[0], rel=1e-9)
        single = rate(LayerStack.from_layers([0.03], [0.0], [G_STEEL], [100e6]),
                      Duty.from_arrays())
        assert result[2][0] == pytest.approx(single.governing_capacity[0], rel=1e-9)
        capacities = TWS_LAYER_CAPACITY(table)
        assert capacities[0] == ["Layer 1 capacity [N·m]", "Layer 2 capacity [N·m]"]
        assert capacities[2][1] == ""  # no second layer on that part

    def test_result_units(self):
        rating = engine_rating(torque=1000.0, length=0.85)
        assert values_of(TWS_SHARE(BLOCK, "%")) == pytest.approx(rating.share[0] * 100)
        assert values_of(TWS_LAYER_CAPACITY(BLOCK, "lbf·in")) == pytest.approx(
            rating.capacity[0] / LBF_IN)
        assert values_of(TWS_STRESS(BLOCK, "1 kN·m", "psi")) == pytest.approx(
            rating.stress_outer[0] / PSI)
        assert TWS_TWIST_ANGLE(BLOCK, "1000 N·m", "850 mm", "rad") == pytest.approx(
            rating.twist_angle[0])
        assert TWS_TWIST_PER_LENGTH(BLOCK, "1000 N·m", "°/ft") == pytest.approx(
            rating.twist_per_length[0] / DEG * 0.3048)
        assert TWS_MARGIN(BLOCK, "1000 N·m", None, None, None, "%") == pytest.approx(
            rating.margin[0] * 100)

    def test_twist_defaults_to_degrees(self):
        rating = engine_rating(torque=1000.0, length=0.85)
        assert TWS_TWIST_ANGLE(BLOCK, "1000 N·m", "850 mm") == pytest.approx(
            rating.twist_angle[0] / DEG)
        assert TWS_TWIST_PER_LENGTH(BLOCK, "1000 N·m") == pytest.approx(rating.twist_per_length[0] / DEG)


class TestClosedForms:
    """The cell results against the hand method itself, not only against the engine."""

    def test_share_and_capacity_by_hand(self):
        # Twist compatibility (BRIEF §2; Roark's Formulas for Stress and Strain, torsion of
        # circular sections: J = pi/32 (Do^4 - Di^4), tau = G r theta').
        j1 = math.pi / 32 * 0.040**4
        j2 = math.pi / 32 * (0.050**4 - 0.040**4)
        gj = [G_STEEL * j1, G_STAINLESS * j2]
        total = sum(gj)
        assert values_of(TWS_SHARE(BLOCK)) == pytest.approx([g / total for g in gj], rel=1e-12)
        capacity = [100e6 * total / (G_STEEL * 0.020 * 1.0),
                    80e6 * total / (G_STAINLESS * 0.025 * 1.2)]
        assert values_of(TWS_LAYER_CAPACITY(BLOCK)) == pytest.approx(capacity, rel=1e-12)
        # the smaller layer capacity governs (common practice)
        assert TWS_GOVERNING_LIMIT(BLOCK) == pytest.approx(min(capacity), rel=1e-12)
        theta = 1000.0 / total
        assert TWS_STRESS_AT(BLOCK, "1000 N·m", "15 mm") == pytest.approx(
            G_STEEL * 0.015 * theta / 1e6, rel=1e-12)
        assert TWS_TWIST_ANGLE(BLOCK, "1000 N·m", "2 m", "rad") == pytest.approx(
            1000.0 * 2.0 / total, rel=1e-12)

    def test_torque_from_power_rules_of_thumb(self):
        # T[N·m] = 9549·P[kW]/n[rpm] and T[lbf·in] = 63 025·P[hp]/n[rpm] (BRIEF §2; common
        # practice, rounded constants: hence the 1e-4 tolerance).
        assert TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm") == pytest.approx(
            9549 * 15 / 1450, rel=1e-4)
        assert TWS_TORQUE_FROM_POWER("20 hp", "1750 rpm", None, "lbf·in") == pytest.approx(
            63025 * 20 / 1750, rel=1e-4)

    @pytest.mark.parametrize(
        "rule, sy, su, fs, keyway, expected_mpa",
        [
            # maximum-shear-stress theory 0.5·Sy/FS; distortion energy Sy/(√3·FS) (textbook);
            # transmission-shafting code rule min(0.30 Sy, 0.18 Su), ×0.75 with a keyway.
            ("max shear", "310 MPa", None, 2, None, 0.5 * 310 / 2),
            ("Tresca", "310 MPa", None, 2.0, False, 0.5 * 310 / 2),
            ("distortion energy", "310 MPa", None, 2, None, 310 / (math.sqrt(3) * 2)),
            ("von Mises", "45 ksi", None, 1.5, None, 45e3 * PSI / 1e6 / (math.sqrt(3) * 1.5)),
            ("shafting code", "310 MPa", "570 MPa", None, None, min(0.30 * 310, 0.18 * 570)),
            ("shafting code", "310 MPa", "570 MPa", None, True,
             0.75 * min(0.30 * 310, 0.18 * 570)),
            ("Shafting_Code", "310 MPa", "400 MPa", None, "yes", 0.75 * min(0.30 * 310, 0.18 * 400)),
        ],
    )
    def test_allowable(self, rule, sy, su, fs, keyway, expected_mpa):
        assert TWS_ALLOWABLE(rule, sy, su, fs, keyway) == pytest.approx(expected_mpa, rel=1e-12)


class TestAgainstEngineScalars:
    """Scalar functions equal the core functions they call."""

    @pytest.mark.parametrize("power, speed, sf", [("15 kW", "1450 rpm", None),
                                                  ("15 kW", "1450 r/min", 1.25),
                                                  ("20 hp", "30 rad/s", 2),
                                                  ([15, "kW"], ["Speed [rpm]", 1450], None)])
    def test_torque_from_power(self, power, speed, sf):
        from twistshare.engine.units import parse_value

        p = parse_value(power if isinstance(power, str) else f"{power[0]} {power[1]}", "power")
        n = parse_value(speed if isinstance(speed, str) else f"{speed[1]} rpm", "speed")
        expected = float(torque_from_power(p, n, 1.0 if sf is None else sf))
        assert TWS_TORQUE_FROM_POWER(power, speed, sf) == pytest.approx(expected, rel=1e-12)

    def test_allowable_equals_core(self):
        expected = float(allowable_shear(AllowableRule.DISTORTION_ENERGY, 310e6, np.nan, 2.0))
        assert TWS_ALLOWABLE("distortion energy", "310 MPa", None, 2, None, "Pa") == \
            pytest.approx(expected, rel=1e-12)


class TestGoverningCriteria:
    """The governing limit and what governs, with twist limits."""

    def test_twist_angle_governs(self):
        rating = engine_rating(length=1.0, angle=0.5 * DEG)
        assert TWS_GOVERNING_LIMIT(BLOCK, "1 m", "0.5°") == pytest.approx(
            rating.governing_capacity[0], rel=1e-9)
        assert TWS_GOVERNS(BLOCK, "1 m", "0.5 deg") == "twist angle limit"

    def test_twist_per_length_governs(self):
        rating = engine_rating(per_length=0.25 * DEG)
        assert TWS_GOVERNING_LIMIT(BLOCK, None, None, "0.25 °/m") == pytest.approx(
            rating.governing_capacity[0], rel=1e-9)
        assert TWS_GOVERNS(BLOCK, None, None, "0.25 deg/m") == "twist per length limit"

    def test_layer_governs(self):
        # The results sheet's words for what governs (one wording everywhere).
        assert TWS_GOVERNS(BLOCK) == "layer 2 stress (Stainless 316 annealed)"
        assert TWS_GOVERNS(BLOCK, "1 m", "10°") == "layer 2 stress (Stainless 316 annealed)"

    def test_twist_limit_without_length(self):
        assert_warning(TWS_GOVERNS(BLOCK, None, "0.5°"), "needs the length")

    def test_margin(self):
        rating = engine_rating(torque=1000.0)
        # In per cent by default, as the results sheet's "Margin [%]"; "1" gives a fraction.
        assert TWS_MARGIN(BLOCK, "1000 N·m") == pytest.approx(100 * rating.margin[0], rel=1e-12)
        assert TWS_MARGIN(BLOCK, "1000 N·m", None, None, None, "1") == pytest.approx(rating.margin[0], rel=1e-12)
        assert TWS_MARGIN(BLOCK, "2 kN·m") < 0
        assert_warning(TWS_MARGIN(BLOCK, "0 N·m"), "torque is zero")


class TestStressAt:
    """Stress at a radius: inside a layer, on an interface, outside."""

    def test_inside_layers(self):
        rating = engine_rating(torque=1000.0)
        theta = rating.twist_per_length[0]
        assert TWS_STRESS_AT(BLOCK, "1000 N·m", "10 mm") == pytest.approx(
            G_STEEL * 0.010 * theta / 1e6, rel=1e-12)
        assert TWS_STRESS_AT(BLOCK, "1000 N·m", "25 mm") == pytest.approx(
            rating.stress_outer[0, 1] / 1e6, rel=1e-12)

    def test_interface_needs_layer(self):
        rating = engine_rating(torque=1000.0)
        assert_warning(TWS_STRESS_AT(BLOCK, "1000 N·m", "20 mm"), "interface of layers 1 and 2",
                       "give the layer")
        assert TWS_STRESS_AT(BLOCK, "1000 N·m", "20 mm", 1) == pytest.approx(
            rating.stress_outer[0, 0] / 1e6, rel=1e-12)
        assert TWS_STRESS_AT(BLOCK, "1000 N·m", "20 mm", 2.0) == pytest.approx(
            rating.stress_inner[0, 1] / 1e6, rel=1e-12)

    def test_outside_and_wrong_layer(self):
        assert_warning(TWS_STRESS_AT(BLOCK, "1000 N·m", "30 mm"), "outside the section")
        assert_warning(TWS_STRESS_AT(BLOCK, "1000 N·m", "10 mm", 2), "not in layer 2")
        assert_warning(TWS_STRESS_AT(BLOCK, "1000 N·m", "10 mm", 3), "layer number from 1 to 2")


class TestManyParts:
    """A block of many parts: one bad part does not stop the others."""

    TABLE = [
        ["Part", *HEADER],
        ["MPD-S-014", STEEL, 40, 0, 100, None],
        [None, STAINLESS, 50, 40, 80, 1.2],            # an empty part cell continues the part
        ["MPD-S-015", STEEL, 30, 0, 100, None],
        ["MPD-S-016", STEEL, "30 GPa", 0, 100, None],  # wrong dimension
        [None, None, None, None, None, None],          # blank row stays blank
        ["MPD-S-017", "Unobtainium", 30, 0, 100, None],
    ]

    def test_per_layer_results_line_up_with_rows(self):
        result = TWS_LAYER_CAPACITY(self.TABLE)
        assert len(result) == len(self.TABLE)
        assert result[0] == ["capacity [N·m]"]
        assert [result[1][0], result[2][0]] == pytest.approx(list(engine_rating().capacity[0]))
        assert isinstance(result[3][0], float)
        assert_warning(result[4][0], "part MPD-S-016, layer 1: outer diameter: '30 GPa'",
                       "expected a length, got 'GPa'")
        assert result[5] == [""]
        assert_warning(result[6][0], "unknown material 'Unobtainium'")

    def test_per_part_results_on_each_row(self):
        result = TWS_GOVERNING_LIMIT(self.TABLE)
        expected = engine_rating().governing_capacity[0]
        assert result[1][0] == pytest.approx(expected) and result[2][0] == pytest.approx(expected)
        assert_warning(result[4][0], "GPa")

    def test_torque_column_beside_the_block(self):
        torques = [["Torque [N·m]"], [1000], [None], [500], [10], [None], [10]]
        result = TWS_MARGIN(self.TABLE, torques)
        assert result[1][0] == pytest.approx(100 * engine_rating(torque=1000.0).margin[0])
        assert result[2][0] == result[1][0]
        assert_warning(result[4][0], "GPa")

    def test_conflicting_torques_within_a_part(self):
        torques = [["Torque [N·m]"], [1000], [900], [500], [10], [None], [10]]
        assert_warning(TWS_MARGIN(self.TABLE, torques)[1][0], "differs from the value")

    def test_layer_column_orders_layers(self):
        table = [["Part", "Layer", *HEADER],
                 ["A", 2, STAINLESS, 50, 40, 80, 1.2],
                 ["A", 1, STEEL, 40, 0, 100, None]]
        result = TWS_LAYER_CAPACITY(table)
        assert [result[2][0], result[1][0]] == pytest.approx(list(engine_rating().capacity[0]))

    def test_repeated_layer_number(self):
        table = [["Part", "Layer", *HEADER],
                 ["A", 1, STAINLESS, 50, 40, 80, 1.2],
                 ["A", 1, STEEL, 40, 0, 100, None]]
        assert_warning(TWS_LAYER_CAPACITY(table)[1][0], "layer 1: the layer is given twice")


class TestMaterials:
    """Materials by name: the materials block first, then the built-in library."""

    MATERIALS = [
        ["Material", "G [GPa]", "Yield strength [MPa]", "Ultimate strength [MPa]",
         "Allowable rule", "Factor of safety", "Notes"],
        ["Marrowby bronze", 40, 200, 400, "max shear", 2, "invented for the demo"],
        [STEEL, 70, 300, 500, None, None, "overrides the library"],
        ["Broken", -3, 1, 1, None, None, None],
    ]

    def test_block_material_and_its_allowable(self):
        # 0.5·Sy/FS = 50 MPa (maximum-shear-stress theory); T = tau J / r for one solid layer
        # (Roark's, torsion of circular sections).
        result = TWS_LAYER_CAPACITY([["Marrowby bronze", "40 mm", 0, None]], None, self.MATERIALS)
        assert result[0][0] == pytest.approx(50e6 * (math.pi / 32 * 0.04**4) / 0.02, rel=1e-12)

    def test_block_overrides_library(self):
        share = TWS_SHARE([[STEEL, "40 mm", 0], [STAINLESS, "50 mm", "40 mm"]], None,
                          self.MATERIALS)
        j1, j2 = math.pi / 32 * 0.04**4, math.pi / 32 * (0.05**4 - 0.04**4)
        expected = 70e9 * j1 / (70e9 * j1 + G_STAINLESS * j2)
        assert share[0][0] == pytest.approx(expected, rel=1e-12)

    def test_case_and_space_insensitive(self):
        assert TWS_SHARE([["aisi  1045 HOT rolled", "40 mm", 0]]) == [[1.0]]

    def test_problems(self):
        assert_warning(TWS_SHARE([["Broken", "40 mm", 0]], None, self.MATERIALS),
                       "material 'Broken' has an unusable property: shear modulus G: -3 GPa is negative")
        # A library stainless named with no row takes the shafting code rule with the library's
        # Sy 205, Su 515 MPa (ASTM A276 minima, from memory): min(61.5, 92.7) = 61.5 MPa; T = τJ/r.
        assert TWS_LAYER_CAPACITY([[STAINLESS, "40 mm", 0, None]])[0][0] == pytest.approx(
            61.5e6 * math.pi / 32 * 0.040**4 / 0.020, rel=1e-12)
        assert_warning(TWS_SHARE([["Unobtainium", "40 mm", 0]], None, self.MATERIALS),
                       "unknown material 'Unobtainium': not in the materials table nor the built-in library")
        assert_warning(TWS_SHARE([[STEEL, "40 mm", 0]], None, [["G [GPa]"], [80]]),
                       "header with a 'Material' column")


class TestBadInputNeverANumber:
    """Bad cells give a short message naming the argument, the row and what was expected."""

    @pytest.mark.parametrize(
        "block, words",
        [
            ([["Material", "Outer diameter [GPa]", "Inner diameter [mm]", "Allowable [MPa]"],
              [STEEL, 40, 0, 100]], ["header unit", "expected a length, got 'GPa'"]),
            ([[STEEL, "40 mm", 0, "100 MPa"], [STAINLESS, "50 GPa", "40 mm", "80 MPa"]],
             ["row 2, layer 2: outer diameter: '50 GPa': expected a length, got 'GPa'"]),
            ([[STEEL, 40, 0, "100 MPa"]], ["row 1, layer 1: outer diameter", "no unit"]),
            ([[STEEL, "#N/A", 0, "100 MPa"]], ["row 1, layer 1: outer diameter: the cell holds the error value #N/A"]),
            ([[STEEL, "#VALUE!", 0, "100 MPa"]], ["the cell holds the error value #VALUE!"]),
            ([[STEEL, None, 0, "100 MPa"]], ["layer 1: outer diameter is missing"]),
            ([[None, "40 mm", 0, "100 MPa"]], ["layer 1: no material given"]),
            ([["79 GPa", "40 mm", 0, "100 MPa"], ["73 GPa", "50 mm", "41 mm", "80 MPa"]],
             ["layer 2: gap of 1 mm on the diameter", "inner diameter 41 mm"]),
            ([["79 GPa", "50 mm", "40 mm", "100 MPa"], ["73 GPa", "40 mm", 0, "80 MPa"]],
             ["innermost first"]),
            ([["79 GPa", "40 mm", "45 mm", "100 MPa"]], ["inner diameter 45 mm must be less than outer diameter 40 mm"]),
            ([["79 GPa", "12,5 mm", 0, "100 MPa"]], ["decimal comma"]),
            ([["79 GPa", "1,200 mm", 0, "100 MPa"]], ["thousands separator"]),
            ([["79000 GPa", "40 mm", 0, "100 MPa"]],
             ["shear modulus G: '79000 GPa' is outside the plausible range 0.1 to 200 GPa", "check the unit"]),
            ([["79 GPa", "40 m", 0, "100 MPa"]], ["'40 m' = 40000 mm is outside the plausible range"]),
            ([["79 GPa", "40 mm", 0, "100 MPa", 0.5]], ["Kt: 0.5 is outside the plausible range 1 to 10"]),
            ([["79 GPa", "40 mm", 0, "-100 MPa"]], ["allowable shear stress: '-100 MPa' is negative"]),
            ([["79 GPa", "40 mm", 0, "100 mm"]], ["row 1, layer 1: allowable shear stress", "got 'mm' (a length)"]),
            ([["Foo [mm]", "OD [mm]", "ID [mm]"], [1, 2, 3]], ["'Foo [mm]' is not an input"]),
            ([[1, 2, 3, 4, 5, 6, 7]], ["got 7 columns"]),
            ("not a block", ["expected a block"]),
            (None, ["expected a block"]),
        ],
    )
    def test_layer_block_problems(self, block, words):
        assert_warning(TWS_LAYER_CAPACITY(block), *words)

    @pytest.mark.parametrize(
        "torque, words",
        [
            (1000, ["torque", "no unit", "'1000 N·m'"]),
            ("1000 lb-in", ["lb is a pound of mass", "lbf·in"]),
            ("1000 J", ["energy"]),
            ("1000 mm", ["expected a torque, got 'mm' (a length)"]),
            ("#N/A", ["torque: the cell holds the error value #N/A"]),
            ("-5 N·m", ["'-5 N·m' is negative; expected a torque zero or more"]),
            (None, ["torque: cell is empty"]),
            ("", ["torque: cell is empty"]),
            (True, ["expected a torque, got TRUE"]),
            (float("nan"), ["expected a finite number"]),
            ([1, 2, 3], ["column of 2 cells"]),
        ],
    )
    def test_torque_problems(self, torque, words):
        assert_warning(TWS_STRESS(BLOCK, torque), *words)

    def test_result_unit_problems(self):
        assert_warning(TWS_LAYER_CAPACITY(BLOCK, "mm"), "result unit",
                       "expected a torque, got 'mm' (a length)")
        assert_warning(TWS_SHARE(BLOCK, "deg"), "result unit")
        assert_warning(TWS_TWIST_ANGLE(BLOCK, "1 kN·m", "1 m", "Hz"), "result unit")
        assert_warning(TWS_STRESS(BLOCK, "1 kN·m", 5), "result unit")

    def test_scalar_function_problems(self):
        assert_warning(TWS_TORQUE_FROM_POWER("15 kW", "1450 Hz"), "speed", "rpm")
        assert_warning(TWS_TORQUE_FROM_POWER("15 kW", "0 rpm"), "speed", "greater than zero")
        assert_warning(TWS_TORQUE_FROM_POWER("15 kW", "1450 rpm", 0), "service factor")
        assert_warning(TWS_TORQUE_FROM_POWER(15, "1450 rpm"), "power", "no unit")
        assert_warning(TWS_TORQUE_FROM_POWER("15 N·m", "1450 rpm"), "expected a power")
        assert_warning(TWS_TORQUE_FROM_POWER(["15 kW", "20 kW", "1"], "1450 rpm"), "one cell")
        assert_warning(TWS_ALLOWABLE("given", "310 MPa"), "typed directly")
        assert_warning(TWS_ALLOWABLE("max shear", "310 MPa"), "needs a factor of safety")
        assert_warning(TWS_ALLOWABLE("max shear", "310 MPa", None, 2, True), "keyway")
        assert_warning(TWS_ALLOWABLE("shafting code", "310 MPa", "570 MPa", 2),
                       "the factor of safety is not used: the shafting code rule")
        assert_warning(TWS_ALLOWABLE("shafting code", "310 MPa"), "ultimate strength")
        assert_warning(TWS_ALLOWABLE("Rankine", "310 MPa", None, 2), "rule", "'Rankine'")
        assert_warning(TWS_ALLOWABLE("max shear", "310 MPa", None, 2, "maybe"), "yes or no")
        assert_warning(TWS_ALLOWABLE("max shear", "-310 MPa", None, 2), "yield strength")

    CELL_VALUES = st.one_of(
        st.none(), st.booleans(), st.integers(-10**6, 10**6), st.floats(allow_nan=True),
        st.sampled_from(["40 mm", "1.5 in", "#N/A", "#VALUE!", "", "79 GPa", "100 MPa",
                         "lb-in", "12,5 mm", STEEL, "N·m", "abc", "2*3 mm"]),
        st.text(max_size=12),
    )

    @settings(max_examples=150, deadline=None)
    @given(st.lists(st.lists(CELL_VALUES, min_size=0, max_size=6), min_size=0, max_size=4),
           CELL_VALUES, st.one_of(st.none(), st.sampled_from(["N·m", "mm", "%", "foo"])))
    def test_any_cells_give_a_value_or_a_message(self, block, torque, unit):
        for result in (TWS_LAYER_CAPACITY(block, unit), TWS_MARGIN(block, torque),
                       TWS_GOVERNS(block), TWS_STRESS_AT(block, torque, torque)):
            _assert_cell_result(result)

    @settings(max_examples=150, deadline=None)
    @given(CELL_VALUES, CELL_VALUES, CELL_VALUES, CELL_VALUES)
    def test_scalar_functions_any_cells(self, a, b, c, d):
        _assert_cell_result(TWS_TORQUE_FROM_POWER(a, b, c, d if isinstance(d, str) else None))
        _assert_cell_result(TWS_ALLOWABLE(a, b, c, d))


def _assert_cell_result(result):
    """A cell shows a finite number, a text, or a spilled list of those."""
    if isinstance(result, list):
        for row in result:
            assert isinstance(row, list)
            for cell in row:
                _assert_cell_result(cell)
    elif isinstance(result, str):
        assert "Traceback" not in result
        assert "could not compute" not in result, result  # the last-resort boundary
    else:
        assert isinstance(result, float) and math.isfinite(result), result


class TestCatalogue:
    """list_functions names every function, argument and description."""

    def test_every_function_listed(self):
        listed = [f["name"] for f in list_functions()]
        assert listed == [n for n in cells.__all__ if n.startswith("TWS_")]
        assert len(listed) == 25  # 11 of torsion, 3 sizing, 6 beyond torsion, 5 fits, bonds, plastic

    def test_arguments_match_signatures(self):
        for entry in list_functions():
            function = getattr(cells, entry["name"])
            assert [a["name"] for a in entry["arguments"]] == list(
                inspect.signature(function).parameters)
            assert entry["description"] and len(entry["description"]) <= 255
            for argument in entry["arguments"]:
                # Excel's function help takes at most 255 characters per argument.
                assert argument["description"] and len(argument["description"]) <= 255
                assert isinstance(argument["optional"], bool)

    def test_quantities_say_their_units(self):
        by_name = {f["name"]: f for f in list_functions()}
        torque = next(a for a in by_name["TWS_STRESS"]["arguments"] if a["name"] == "torque")
        assert "N·m" in torque["unit"]
        speed = next(a for a in by_name["TWS_TORQUE_FROM_POWER"]["arguments"]
                     if a["name"] == "speed")
        assert "rpm" in speed["unit"]

    def test_fresh_every_call(self):
        first = list_functions()
        first[0]["name"] = "changed"
        assert list_functions()[0]["name"] == "TWS_SHARE"

    def test_names_are_ours(self):
        for entry in list_functions():
            assert entry["name"].startswith("TWS_") and entry["name"].isupper()


# --- Allowables, library fall-back, isotropy and the sign of the torque -----------------------

MPA = 1e6
GPA = 1e9
SOLID_40_J = math.pi / 32 * 0.040**4  # J = π/32·D⁴ (Roark's, torsion of circular sections)
MAT_HEADER = ["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Yield strength [MPa]",
              "Ultimate strength [MPa]", "Allowable shear [MPa]", "Allowable rule",
              "Factor of safety", "Keyway"]


def materials_row(name, g=None, e=None, nu=None, sy=None, su=None, allowable=None, rule=None,
                  fs=None, keyway=None):
    """A materials block of one row (header first), as xlwings passes it."""
    return [MAT_HEADER, [name, g, e, nu, sy, su, allowable, rule, fs, keyway]]


def solid_capacity(name, materials):
    """TWS_LAYER_CAPACITY of one solid 40 mm layer of `name`, allowable from the material."""
    result = TWS_LAYER_CAPACITY([[name, "40 mm", 0, None]], None, materials)
    return result[0][0] if isinstance(result, list) else result


def solid_twist_rate(name, materials):
    """TWS_TWIST_PER_LENGTH [rad/m] of one solid 40 mm layer of `name` at 1000 N·m."""
    return TWS_TWIST_PER_LENGTH([[name, "40 mm", 0]], "1000 N·m", "rad/m", materials)


class TestMaterialsBlockRefusesWhatTheRuleIgnores:
    """A materials-block row whose allowable the engine would flag is refused, not rated.

    The engine's notes (allowable_flags) leave a number in place; a cell cannot show a number
    and a warning together, so the row is refused with the material, the input and the rule.
    """

    @pytest.mark.parametrize(
        "row, words",
        [
            # The shafting code rule embeds its own allowance: an FS on top is ignored
            # (ASME code for transmission shafting as quoted in machine-design texts, from
            # memory). FS 1 is refused too, as TWS_ALLOWABLE refuses it.
            (dict(sy=300, su=500, rule="shafting code", fs=2),
             ["factor of safety is not used", "carries its own allowance", "leave it blank"]),
            (dict(sy=300, su=500, rule="shafting code", fs=1), ["factor of safety is not used"]),
            # The 0.75 keyway factor belongs to the shafting code rule only (same source).
            (dict(sy=300, rule="max shear", fs=2, keyway="yes"), ["keyway is not used by this rule", "Kt"]),
            (dict(sy=300, rule="distortion energy", fs=2, keyway=True), ["keyway is not used by this rule"]),
            # FS below 1 puts the allowable above the shear yield strength (common practice).
            (dict(sy=300, rule="max shear", fs=0.5),
             ["factor of safety: 0.5 is outside the plausible range 1 to 20"]),
            # The ultimate strength of a metal is not below its yield strength (common practice).
            (dict(sy=300, su=200, rule="max shear", fs=2), ["ultimate strength is below the yield strength"]),
            (dict(sy=300, su=200, rule="shafting code"), ["ultimate strength is below the yield strength"]),
            # Contradictions between the row's own cells.
            (dict(sy=300, allowable=90, rule="max shear", fs=2), ["allowable shear given but rule max shear"]),
            (dict(allowable=90, fs=2), ["factor of safety is not used: the allowable shear is given directly"]),
            (dict(sy=300, su=500, fs=2), ["factor of safety is not used"]),
        ],
    )
    def test_row_refused(self, row, words):
        materials = materials_row("MPD shaft steel", g=80, **row)
        for result in (solid_capacity("MPD shaft steel", materials),
                       TWS_SHARE([["MPD shaft steel", "40 mm", 0]], None, materials)):
            assert_warning(result, "material 'MPD shaft steel'", *words)

    @pytest.mark.parametrize(
        "rule, sy, su, fs, keyway",
        [("shafting code", "300 MPa", "500 MPa", 2, None),
         ("max shear", "300 MPa", None, 2, "yes"),
         ("max shear", "300 MPa", None, 0.5, None),
         ("max shear", "300 MPa", "200 MPa", 2, None)],
    )
    def test_tws_allowable_refuses_the_same_inputs(self, rule, sy, su, fs, keyway):
        assert_warning(TWS_ALLOWABLE(rule, sy, su, fs, keyway))

    def test_the_same_rows_without_the_offending_input_are_rated(self):
        # Controls for the refusals above. min(0.30·Sy, 0.18·Su) (shafting code rule);
        # 0.5·Sy/FS (maximum-shear-stress theory, textbook); T = τ·J/r (Roark's).
        for row, tau in (
            (dict(sy=300, su=500, rule="shafting code"), min(0.30 * 300, 0.18 * 500) * MPA),
            (dict(sy=300, su=500, rule="shafting code", keyway="yes"),
             0.75 * min(0.30 * 300, 0.18 * 500) * MPA),
            (dict(sy=300, rule="max shear", fs=1), 0.5 * 300 * MPA),
            (dict(sy=300, su=500, rule="distortion energy", fs=2),
             300 * MPA / (math.sqrt(3) * 2)),
            (dict(allowable=90, rule="given"), 90 * MPA),
            (dict(allowable=90), 90 * MPA),
        ):
            materials = materials_row("MPD shaft steel", g=80, **row)
            assert solid_capacity("MPD shaft steel", materials) == pytest.approx(
                tau * SOLID_40_J / 0.020, rel=1e-12), row


class TestAllowableFunctionRefusals:
    """TWS_ALLOWABLE refuses FS < 1 and Su < Sy, and says a missing Su is missing."""

    def test_factor_of_safety_below_one(self):
        assert_warning(TWS_ALLOWABLE("max shear", "310 MPa", None, 0.5),
                       "factor of safety: 0.5 is outside the plausible range 1 to 20")
        assert_warning(TWS_ALLOWABLE("distortion energy", "310 MPa", None, 0.99), "outside the plausible range")
        # FS = 1 is the shear yield strength itself: 0.5·Sy (Tresca, textbook).
        assert TWS_ALLOWABLE("max shear", "310 MPa", None, 1) == pytest.approx(155.0, rel=1e-12)

    def test_ultimate_below_yield(self):
        assert_warning(TWS_ALLOWABLE("shafting code", "310 MPa", "300 MPa"),
                       "ultimate strength is below the yield strength")
        assert_warning(TWS_ALLOWABLE("max shear", "310 MPa", "300 MPa", 2), "below the yield")
        # Su equal to Sy is not below it: min(0.30·310, 0.18·310) = 55.8 MPa.
        assert TWS_ALLOWABLE("shafting code", "310 MPa", "310 MPa") == pytest.approx(
            0.18 * 310, rel=1e-12)

    def test_missing_ultimate_strength_is_called_missing(self):
        result = TWS_ALLOWABLE("shafting code", "310 MPa")
        assert_warning(result, "needs the ultimate strength")
        assert "yield strength" not in result and "positive" not in result
        assert_warning(TWS_ALLOWABLE("shafting code", "310 MPa", ""), "needs the ultimate")
        assert_warning(TWS_ALLOWABLE("shafting code", "310 MPa", "-5 MPa"),
                       "ultimate strength: '-5 MPa' is negative")


class TestMaterialsBlockLibraryFallBack:
    """A materials-block row naming a built-in material, with blanks: the bridge's rule.

    Groups the row leaves wholly blank come from the library (E and ν; Sy and Su; density;
    G); with no allowable and no rule, steels take the shafting code rule, others are refused.
    """

    def test_steel_with_blank_strengths_takes_the_shafting_code_rule(self):
        # AISI 1045 hot rolled: Sy 310 MPa, Su 570 MPa (Shigley's Mechanical Engineering
        # Design, table of hot-rolled and cold-drawn steels, from memory);
        # min(0.30·Sy, 0.18·Su) = 93 MPa; T = τ·J/r (Roark's).
        materials = materials_row(STEEL)
        assert solid_capacity(STEEL, materials) == pytest.approx(
            min(0.30 * 310, 0.18 * 570) * MPA * SOLID_40_J / 0.020, rel=1e-12)
        # Stainless 316 annealed: Sy 205 MPa, Su 515 MPa (ASTM A276 minima, from memory).
        materials = materials_row(STAINLESS)
        assert solid_capacity(STAINLESS, materials) == pytest.approx(
            min(0.30 * 205, 0.18 * 515) * MPA * SOLID_40_J / 0.020, rel=1e-12)

    def test_keyway_with_library_strengths(self):
        # ×0.75 with a keyway (shafting code rule, as above).
        materials = materials_row(STEEL, keyway="yes")
        assert solid_capacity(STEEL, materials) == pytest.approx(
            0.75 * 93 * MPA * SOLID_40_J / 0.020, rel=1e-12)

    def test_blank_row_takes_the_library_shear_modulus(self):
        # G of carbon steel 79.3 GPa (Shigley's, table of physical constants, from memory);
        # θ' = T/(G·J) (Roark's).
        assert solid_twist_rate(STEEL, materials_row(STEEL)) == pytest.approx(
            1000.0 / (79.3 * GPA * SOLID_40_J), rel=1e-12)

    def test_a_rule_named_takes_the_library_strengths(self):
        # 0.5·Sy/FS with the library's Sy 310 MPa (Tresca, textbook; Sy as above).
        materials = materials_row(STEEL, rule="max shear", fs=2)
        assert solid_capacity(STEEL, materials) == pytest.approx(
            0.5 * 310 / 2 * MPA * SOLID_40_J / 0.020, rel=1e-12)

    @pytest.mark.parametrize("name", ["Phosphor bronze", "Aluminium 6061-T6",
                                      "Aluminium bronze C95400 as cast", "MPD bronze"])
    def test_not_a_steel_needs_an_allowable(self, name):
        # The transmission-shafting code rule is a rule for steel shafting (common practice).
        materials = materials_row(name, g=40)
        assert_warning(solid_capacity(name, materials),
                       f"material {name!r}", "no allowable shear and no rule given",
                       "is a rule for steel shafting",
                       "or a rule (max shear, distortion energy) and a factor of safety")
        # Results that need no allowable still work, and an allowable typed in the layer
        # block is used.
        assert TWS_SHARE([[name, "40 mm", 0]], None, materials) == [[1.0]]
        capacity = TWS_LAYER_CAPACITY([[name, "40 mm", 0, "50 MPa"]], None, materials)
        assert capacity[0][0] == pytest.approx(50 * MPA * SOLID_40_J / 0.020, rel=1e-12)

    @pytest.mark.parametrize("given, missing", [(dict(sy=300), "ultimate strength"),
                                                (dict(su=500), "yield strength")])
    def test_one_strength_is_never_paired_with_the_library_other(self, given, missing):
        materials = materials_row(STEEL, **given)
        assert_warning(solid_capacity(STEEL, materials), f"needs the {missing}",
                       "not paired with it")
        # The same row with both strengths: min(0.30·300, 0.18·500) = 90 MPa, not the
        # library-paired 93 MPa or 0.18·570/0.30·300 mixtures.
        materials = materials_row(STEEL, sy=300, su=500)
        assert solid_capacity(STEEL, materials) == pytest.approx(
            90 * MPA * SOLID_40_J / 0.020, rel=1e-12)

    def test_library_steel_not_in_the_block_takes_the_shafting_code_rule(self):
        # As in a parts table: a library steel named with no materials row takes the library's
        # typical strengths and min(0.30·Sy, 0.18·Su) = 93 MPa (Sy, Su as above); T = τ·J/r.
        assert TWS_LAYER_CAPACITY([[STEEL, "40 mm", 0, None]])[0][0] == pytest.approx(
            93 * MPA * SOLID_40_J / 0.020, rel=1e-12)
        # A library material that is not a steel still needs an allowable.
        assert_warning(TWS_LAYER_CAPACITY([["Phosphor bronze", "40 mm", 0, None]]), "rule for steel shafting")


class TestIsotropicShearModulus:
    """G = E/2(1+ν) only for isotropic materials, and only with ν ≤ 0.5."""

    CARBON = "Carbon/epoxy tube 45 wound"

    def test_orthotropic_library_material_keeps_its_g(self):
        # The library's ±45° wound tube: G 35 GPa by classical lamination theory; its E and ν
        # do not determine G. A row giving E and ν (even ν ≤ 0.5) must not derive
        # E/2(1+ν) = 17.7/2.6 = 6.8 GPa from them.
        carbon_g = find_material(self.CARBON).shear_modulus
        assert carbon_g == pytest.approx(35 * GPA)
        for row in (dict(e=17.7, nu=0.3), dict(e=17.7, nu=0.77), dict()):
            materials = materials_row(self.CARBON, allowable=60, **row)
            assert solid_twist_rate(self.CARBON, materials) == pytest.approx(
                1000.0 / (carbon_g * SOLID_40_J), rel=1e-12), row
        materials = materials_row(self.CARBON, g=30, e=17.7, nu=0.77)
        assert solid_twist_rate(self.CARBON, materials) == pytest.approx(
            1000.0 / (30 * GPA * SOLID_40_J), rel=1e-12)

    def test_isotropic_row_derives_g(self):
        # G = E/(2(1+ν)) for an isotropic material (Timoshenko & Goodier, Theory of
        # Elasticity); θ' = T/(G·J) (Roark's).
        materials = materials_row("MPD bronze", e=110, nu=0.34, allowable=40)
        assert solid_twist_rate("MPD bronze", materials) == pytest.approx(
            1000.0 / (110 * GPA / 2.68 * SOLID_40_J), rel=1e-12)
        # A library steel with the row's own E and ν: derived from those, not the library G.
        materials = materials_row(STEEL, e=210, nu=0.3)
        assert solid_twist_rate(STEEL, materials) == pytest.approx(
            1000.0 / (210 * GPA / 2.6 * SOLID_40_J), rel=1e-12)

    def test_poisson_ratio_above_half_is_refused_for_the_derivation(self):
        # ν ≤ 0.5 bounds an isotropic material (positive strain energy; Timoshenko & Goodier).
        materials = materials_row("MPD wrap", e=17.7, nu=0.77, allowable=60)
        assert_warning(TWS_SHARE([["MPD wrap", "40 mm", 0]], None, materials),
                       "material 'MPD wrap'", "Poisson ratio 0.77 is above 0.5",
                       "impossible for an isotropic material", "give G")
        # With its own G the row is usable: no derivation is made.
        materials = materials_row("MPD wrap", g=30, e=17.7, nu=0.77, allowable=60)
        assert solid_twist_rate("MPD wrap", materials) == pytest.approx(
            1000.0 / (30 * GPA * SOLID_40_J), rel=1e-12)

    def test_layer_block_of_several_layers_uses_the_derived_g(self):
        # Share G_i·J_i/ΣGJ with the block's G from E and ν (BRIEF §2, twist compatibility).
        materials = materials_row("MPD bronze", e=110, nu=0.34, allowable=40)
        share = TWS_SHARE([[STEEL, "40 mm", 0], ["MPD bronze", "50 mm", "40 mm"]], None,
                          materials)
        g1, g2 = G_STEEL, 110 * GPA / 2.68
        j1, j2 = SOLID_40_J, math.pi / 32 * (0.05**4 - 0.04**4)
        assert [share[0][0], share[1][0]] == pytest.approx(
            [g1 * j1 / (g1 * j1 + g2 * j2), g2 * j2 / (g1 * j1 + g2 * j2)], rel=1e-12)


class TestNegativeTorque:
    """A negative torque is refused, in a cell as in a parts table (one rule): its sign is a
    convention the rating does not use, and a slip is more likely than a meaning."""

    @pytest.mark.parametrize("call", [
        lambda t: TWS_STRESS(BLOCK, t), lambda t: TWS_STRESS_AT(BLOCK, t, "15 mm"),
        lambda t: TWS_TWIST_ANGLE(BLOCK, t, "850 mm"), lambda t: TWS_TWIST_PER_LENGTH(BLOCK, t),
        lambda t: TWS_MARGIN(BLOCK, t)])
    def test_refused_with_the_table_words(self, call):
        assert_warning(call("-1000 N·m"), "torque: '-1000 N·m' is negative; expected a torque zero or more")
        assert not isinstance(call("1000 N·m"), str)

    def test_one_part_of_many(self):
        table = TestManyParts.TABLE[:4]
        torques = [["Torque [N·m]"], [-1000], [None], [500]]
        stress = TWS_STRESS(table, torques)
        assert_warning(stress[1][0], "is negative")
        assert stress[3][0] > 0
