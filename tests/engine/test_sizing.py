"""Sizing: solve_dimension, resized, round_up_to_stock and restore_sleeve against closed forms."""

import dataclasses
import math

import numpy as np
import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    Criterion,
    Duty,
    LayerStack,
    OuterLayers,
    SizedDimension,
    SizingStatus,
    StockStatus,
    rate,
    resized,
    restore_sleeve,
    round_up_to_stock,
    sizing_slot,
    solve_dimension,
)

TOL = 1e-6  # the default tolerance on the dimension, m
# Floating-point slack on comparisons of diameters near 0.1 m.
EPS = 1e-12
G_STEEL, G_BRONZE = 79.3e9, 41.4e9


def reserve(stack, duty):
    """Reserve factor by re-rating: governing capacity over |T|."""
    return rate(stack, duty).governing_capacity / np.abs(duty.torque)


def real_root_above(coefficients, floor):
    """The smallest real root above ``floor`` of a polynomial (numpy's polynomial roots)."""
    roots = np.roots(coefficients)
    real = roots[np.abs(roots.imag) < 1e-9 * np.abs(roots)].real
    return float(real[real > floor].min())


def assert_on_safe_side(size, exact, tol=TOL):
    """The size given is the holding end of a bracket tol wide: exact <= size <= exact + tol."""
    assert exact - EPS <= size <= exact + tol + EPS, (size, exact)


class TestSolidShaft:
    """tau = 16 T Kt / (pi d^3) (any mechanics-of-materials text; Roark's Formulas for Stress
    and Strain, torsion of circular sections), solved for d at tau = tau_a / RF."""

    @pytest.mark.parametrize("torque", [50.0, 1_000.0, 25_000.0])
    @pytest.mark.parametrize("allowable", [40e6, 120e6])
    @pytest.mark.parametrize("target", [1.0, 2.5])
    @pytest.mark.parametrize("kt", [1.0, 1.8])
    def test_diameter(self, torque, allowable, target, kt):
        stack = LayerStack.from_layers([0.05], [0.0], [G_STEEL], [allowable], stress_concentration=kt)
        result = solve_dimension(stack, Duty.from_arrays(torque=torque), target_reserve=target)
        exact = (16.0 * torque * target * kt / (math.pi * allowable)) ** (1.0 / 3.0)
        assert result.status[0] == SizingStatus.SOLVED
        assert_on_safe_side(result.size[0], exact)
        assert result.governing_criterion[0] == Criterion.LAYER_STRESS
        assert result.governing_layer[0] == 0
        # RF grows as d^3: within tol of d, it is within 3 tol / d of the target.
        assert target <= result.reserve_factor[0] <= target * (1 + 3.1 * TOL / exact)

    def test_wall_of_a_solid_is_its_radius(self):
        """A solid core's wall, grown from its axis, is d / 2 of the same closed form."""
        stack = LayerStack.from_layers([0.05], [0.0], [G_STEEL], [60e6])
        result = solve_dimension(stack, Duty.from_arrays(torque=1_000.0),
                                 dimension=SizedDimension.WALL, target_reserve=1.5)
        exact = (16.0 * 1_000.0 * 1.5 / (math.pi * 60e6)) ** (1.0 / 3.0)
        assert_on_safe_side(result.size[0], exact / 2)

    def test_tighter_tolerance(self):
        stack = LayerStack.from_layers([0.05], [0.0], [G_STEEL], [60e6])
        result = solve_dimension(stack, Duty.from_arrays(torque=1_000.0), tol=1e-9)
        assert_on_safe_side(result.size[0], (16.0 * 1_000.0 / (math.pi * 60e6)) ** (1 / 3), tol=1e-9)
        # log2 of the default range (1 m) over the tolerance, rounded up.
        assert result.iterations[0] == math.ceil(math.log2((1.0 - 1e-9) / 1e-9))


class TestTubeOfGivenBore:
    """Hollow shaft tau = 16 T D Kt / (pi (D^4 - d^4)) (Roark's, torsion of circular sections):
    at tau = tau_a / RF, D^4 - k D - d^4 = 0 with k = 16 T RF Kt / (pi tau_a), solved with
    numpy's polynomial roots."""

    CASES = [(0.030, 2_000.0, 80e6, 1.0), (0.060, 8_000.0, 50e6, 2.0), (0.010, 150.0, 120e6, 1.5)]

    @pytest.mark.parametrize(("bore", "torque", "allowable", "target"), CASES)
    def test_outer_diameter(self, bore, torque, allowable, target):
        stack = LayerStack.from_layers([bore * 1.5], [bore], [G_STEEL], [allowable])
        result = solve_dimension(stack, Duty.from_arrays(torque=torque), target_reserve=target)
        k = 16.0 * torque * target / (math.pi * allowable)
        exact = real_root_above([1.0, 0.0, 0.0, -k, -bore**4], bore)
        assert result.status[0] == SizingStatus.SOLVED
        assert_on_safe_side(result.size[0], exact)

    @pytest.mark.parametrize(("bore", "torque", "allowable", "target"), CASES)
    def test_wall(self, bore, torque, allowable, target):
        stack = LayerStack.from_layers([bore * 1.5], [bore], [G_STEEL], [allowable])
        result = solve_dimension(stack, Duty.from_arrays(torque=torque), target_reserve=target,
                                 dimension=SizedDimension.WALL)
        k = 16.0 * torque * target / (math.pi * allowable)
        exact = real_root_above([1.0, 0.0, 0.0, -k, -bore**4], bore)
        assert_on_safe_side(result.size[0], (exact - bore) / 2)

    @pytest.mark.parametrize(("outer", "torque", "allowable"), [(0.05, 1_500.0, 100e6), (0.08, 4_000.0, 60e6)])
    def test_bore(self, outer, torque, allowable):
        """The same form solved for the bore, d = (D^4 - k D)^(1/4): the largest bore that
        holds, so the size given lies within tol below it."""
        stack = LayerStack.from_layers([outer], [0.01], [G_STEEL], [allowable])
        result = solve_dimension(stack, Duty.from_arrays(torque=torque), dimension=SizedDimension.BORE)
        k = 16.0 * torque / (math.pi * allowable)
        exact = (outer**4 - k * outer) ** 0.25
        assert result.status[0] == SizingStatus.SOLVED
        assert exact - TOL - EPS <= result.size[0] <= exact + EPS
        assert result.reserve_factor[0] >= 1.0


class TestTwistLimited:
    """phi = T L / (G J), J = pi d^4 / 32 (any mechanics-of-materials text), so a twist limit
    alone needs d = (32 T L RF / (pi G phi_lim))^(1/4)."""

    @pytest.mark.parametrize(("torque", "length", "limit_deg"), [(500.0, 1.2, 1.0), (5_000.0, 3.0, 0.5)])
    def test_total_angle(self, torque, length, limit_deg):
        stack = LayerStack.from_layers([0.05], [0.0], [G_STEEL], [10e9])  # stress never governs
        duty = Duty.from_arrays(torque=torque, length=length, twist_limit_angle=math.radians(limit_deg))
        result = solve_dimension(stack, duty, target_reserve=1.2)
        exact = (32.0 * torque * length * 1.2 / (math.pi * G_STEEL * math.radians(limit_deg))) ** 0.25
        assert result.status[0] == SizingStatus.SOLVED
        assert_on_safe_side(result.size[0], exact)
        assert result.governing_criterion[0] == Criterion.TWIST_ANGLE
        assert result.governing_layer[0] == -1

    def test_per_length(self):
        """1 degree in 20 diameters is a common line-shaft stiffness rule (common practice,
        from memory); here a plain 0.25 deg/m: d = (32 T RF / (pi G theta'))^(1/4)."""
        stack = LayerStack.from_layers([0.05], [0.0], [G_STEEL], [10e9])
        duty = Duty.from_arrays(torque=2_000.0, twist_limit_per_length=math.radians(0.25))
        result = solve_dimension(stack, duty)
        exact = (32.0 * 2_000.0 / (math.pi * G_STEEL * math.radians(0.25))) ** 0.25
        assert_on_safe_side(result.size[0], exact)
        assert result.governing_criterion[0] == Criterion.TWIST_PER_LENGTH

    @pytest.mark.parametrize("torque", [20.0, 200.0, 2_000.0, 20_000.0, 200_000.0])
    def test_governing_criterion_changes_across_the_bracket(self, torque):
        """Stress capacity goes as d^3, twist capacity as d^4: twist governs small shafts,
        stress large ones, so the bracket spans both. Both must hold: the answer is the
        larger of the two closed forms, whichever it is."""
        stack = LayerStack.from_layers([0.05], [0.0], [G_STEEL], [60e6])
        duty = Duty.from_arrays(torque=torque, length=1.0, twist_limit_angle=math.radians(1.0))
        result = solve_dimension(stack, duty)
        by_stress = (16.0 * torque / (math.pi * 60e6)) ** (1 / 3)
        by_twist = (32.0 * torque / (math.pi * G_STEEL * math.radians(1.0))) ** 0.25
        assert_on_safe_side(result.size[0], max(by_stress, by_twist))
        expected = Criterion.LAYER_STRESS if by_stress > by_twist else Criterion.TWIST_ANGLE
        assert result.governing_criterion[0] == expected


class TestTwoLayers:
    """Steel core 40 mm in a bronze sleeve, Kt 1.5 on the sleeve: layer capacity
    tau_a sum(GJ) / (G r_o Kt) (BRIEF §2, twist compatibility), solved with numpy's
    polynomial roots."""

    CORE, TAU_CORE, TAU_SLEEVE, KT = 0.040, 100e6, 45e6, 1.5

    def stack(self, sleeve_outer=0.050):
        return LayerStack.from_layers([self.CORE, sleeve_outer], [0.0, self.CORE], [G_STEEL, G_BRONZE],
                                      [self.TAU_CORE, self.TAU_SLEEVE], stress_concentration=[1.0, self.KT])

    def test_sleeve_outer_diameter(self):
        duty = Duty.from_arrays(torque=3_000.0)
        result = solve_dimension(self.stack(), duty, target_reserve=1.25)
        # Sleeve governs: (pi/32) G_s D^4 - (T RF G_s Kt / (2 tau_s)) D + (G_c J_c - (pi/32) G_s d^4) = 0
        c = math.pi / 32
        exact = real_root_above(
            [c * G_BRONZE, 0.0, 0.0, -3_000.0 * 1.25 * G_BRONZE * self.KT / (2 * self.TAU_SLEEVE),
             c * (G_STEEL - G_BRONZE) * self.CORE**4], self.CORE)
        assert result.status[0] == SizingStatus.SOLVED
        assert result.governing_layer[0] == 1
        assert_on_safe_side(result.size[0], exact)

    def test_solved_size_rerated_gives_the_target(self):
        duty = Duty.from_arrays(torque=3_000.0)
        result = solve_dimension(self.stack(), duty, target_reserve=1.25)
        size = result.size[0]
        assert reserve(resized(self.stack(), [size]), duty)[0] >= 1.25
        assert reserve(resized(self.stack(), [size - TOL]), duty)[0] < 1.25
        assert reserve(resized(self.stack(), [size]), duty)[0] == result.reserve_factor[0]

    def test_one_stock_size_down_does_not_hold(self):
        duty = Duty.from_arrays(torque=3_000.0)
        stock = np.round(np.arange(40.5, 120.0, 0.5), 1) / 1000  # every 0.5 mm
        result = solve_dimension(self.stack(), duty, target_reserve=1.25)
        chosen = round_up_to_stock(self.stack(), duty, result.size, stock, target_reserve=1.25)
        index = chosen.index[0]
        assert chosen.status[0] == StockStatus.FOUND
        assert chosen.size[0] == stock[index] >= result.size[0] > stock[index - 1]
        assert reserve(resized(self.stack(), [stock[index]]), duty)[0] >= 1.25
        assert reserve(resized(self.stack(), [stock[index - 1]]), duty)[0] < 1.25
        assert chosen.reserve_factor[0] == reserve(resized(self.stack(), [stock[index]]), duty)[0]

    def test_core_with_the_sleeve_moving(self):
        """Core diameter x, sleeve wall w kept: sum(GJ)(x) = (pi/32)(G_c x^4 + G_s((x+2w)^4 - x^4)),
        and the governing limit, at the answer, meets the target; polynomial solved with numpy."""
        wall = 0.005
        duty = Duty.from_arrays(torque=5_000.0)
        result = solve_dimension(self.stack(self.CORE + 2 * wall), duty, layer=0)
        moved = resized(self.stack(self.CORE + 2 * wall), result.size, layer=0)
        rating = rate(moved, duty)
        assert rating.valid[0]
        assert moved.outer_diameter[0, 1] - moved.inner_diameter[0, 1] == pytest.approx(2 * wall, abs=1e-15)
        assert moved.inner_diameter[0, 1] == moved.outer_diameter[0, 0] == result.size[0]
        x = np.polynomial.Polynomial([0.0, 1.0])
        sum_gj = math.pi / 32 * (G_STEEL * x**4 + G_BRONZE * ((x + 2 * wall) ** 4 - x**4))
        # Each layer: sum(GJ) = T G r_o Kt / tau_a; the answer is the larger root (both hold).
        core_eq = sum_gj - 5_000.0 * G_STEEL * x / (2 * self.TAU_CORE)
        sleeve_eq = sum_gj - 5_000.0 * G_BRONZE * self.KT * (x + 2 * wall) / (2 * self.TAU_SLEEVE)
        exact = max(real_root_above(eq.coef[::-1], 0.0) for eq in (core_eq, sleeve_eq))
        assert_on_safe_side(result.size[0], exact)

    def test_fixed_sleeve_refuses_the_core(self):
        result = solve_dimension(self.stack(), Duty.from_arrays(torque=1.0), layer=0,
                                 outer_layers=OuterLayers.FIXED)
        assert result.status[0] == SizingStatus.NOT_APPLICABLE and np.isnan(result.size[0])

    def test_fixed_and_moving_agree_on_the_outermost_layer(self):
        duty = Duty.from_arrays(torque=3_000.0)
        moving = solve_dimension(self.stack(), duty)
        fixed = solve_dimension(self.stack(), duty, outer_layers=OuterLayers.FIXED)
        assert moving.size[0] == fixed.size[0]


class TestStatuses:
    def one(self, **changes):
        part = dict(outer_diameter=[0.05], inner_diameter=[0.0], shear_modulus=[G_STEEL],
                    allowable_shear=[60e6])
        part.update(changes)
        return LayerStack.from_layers(**part)

    def test_holds_at_least(self):
        result = solve_dimension(self.one(), Duty.from_arrays(torque=1.0), smallest=0.02, largest=0.06)
        assert result.status[0] == SizingStatus.HOLDS_AT_LEAST
        assert result.size[0] == 0.02 and result.iterations[0] == 0
        # pi d^3 tau / 16 over T (Roark's, torsion of circular sections)
        assert result.reserve_factor[0] == pytest.approx(math.pi * 0.02**3 * 60e6 / 16, rel=1e-12)

    def test_zero_torque_holds_at_least(self):
        result = solve_dimension(self.one(), Duty.from_arrays(torque=0.0))
        assert result.status[0] == SizingStatus.HOLDS_AT_LEAST and result.reserve_factor[0] == math.inf

    def test_short_at_most_reports_what_stops_it(self):
        duty = Duty.from_arrays(torque=1e6, length=1.0, twist_limit_angle=math.radians(1.0))
        result = solve_dimension(self.one(), duty, smallest=0.02, largest=0.06)
        assert result.status[0] == SizingStatus.SHORT_AT_MOST and np.isnan(result.size[0])
        at_most = rate(self.one(outer_diameter=[0.06]), duty)
        assert result.reserve_factor[0] == at_most.governing_capacity[0] / 1e6 < 1
        assert result.governing_criterion[0] == at_most.governing_criterion[0]

    @pytest.mark.parametrize("changes", [dict(layer=1), dict(layer=3), dict(layer=-2)])
    def test_no_such_layer(self, changes):
        result = solve_dimension(self.one(), Duty.from_arrays(torque=1.0), **changes)
        assert result.status[0] == SizingStatus.NOT_APPLICABLE

    @pytest.mark.parametrize("changes", [
        dict(smallest=0.05, largest=0.04), dict(smallest=np.nan), dict(target_reserve=0.0),
        dict(target_reserve=np.nan), dict(dimension=SizedDimension.BORE, largest=0.05),
        dict(dimension=SizedDimension.WALL, smallest=0.0), dict(smallest=0.0),
    ])
    def test_bad_input(self, changes):
        result = solve_dimension(self.one(), Duty.from_arrays(torque=10.0), **changes)
        assert result.status[0] == SizingStatus.BAD_INPUT and np.isnan(result.size[0])

    def test_no_torque_is_bad_input(self):
        result = solve_dimension(self.one(), Duty.from_arrays(torque=np.nan))
        assert result.status[0] == SizingStatus.BAD_INPUT

    def test_not_rated(self):
        result = solve_dimension(self.one(shear_modulus=[0.0]), Duty.from_arrays(torque=10.0))
        assert result.status[0] == SizingStatus.NOT_RATED and np.isnan(result.reserve_factor[0])

    def test_bad_tolerance_raises(self):
        with pytest.raises(ValueError, match="tol must be a positive finite number of metres; got 0.0"):
            solve_dimension(self.one(), Duty.from_arrays(torque=1.0), tol=0.0)

    def test_mixed_batch_keeps_every_part(self):
        stack = LayerStack.from_arrays([[0.05], [0.05], [0.05]], 0.0, [[G_STEEL], [0.0], [G_STEEL]], 60e6)
        result = solve_dimension(stack, Duty.from_arrays(torque=[1_000.0, 1_000.0, 1e9]), largest=0.5)
        assert result.status.tolist() == [SizingStatus.SOLVED, SizingStatus.NOT_RATED,
                                          SizingStatus.SHORT_AT_MOST]
        assert_on_safe_side(result.size[0], (16.0 * 1_000.0 / (math.pi * 60e6)) ** (1 / 3))


class TestNotMonotone:
    """A soft thin sleeve (G 5 GPa) on a stiff solid core (G 80 GPa, never governing): the
    sleeve's capacity 2 tau_s sum(GJ) / (G_s D) falls until 3 D^4 + d^4 = 16 d^4, i.e.
    D = 5^(1/4) d = 59.8 mm for d = 40 mm, then rises (BRIEF §2 layer capacity)."""

    def stack(self):
        return LayerStack.from_layers([0.040, 0.045], [0.0, 0.040], [80e9, 5e9], [1e9, 20e6])

    @staticmethod
    def sleeve_capacity(outer):
        c = math.pi / 32
        sum_gj = c * 80e9 * 0.040**4 + c * 5e9 * (outer**4 - 0.040**4)
        return 2 * 20e6 * sum_gj / (5e9 * outer)

    def test_the_closed_form_dips(self):
        assert self.sleeve_capacity(0.0401) > self.sleeve_capacity(0.0598) < self.sleeve_capacity(0.1)

    def test_fall_seen_while_bisecting(self):
        """4500 N m: fails at 40.1 mm, holds at 100 mm; the first trial (70 mm) rates below
        the failing end, so the fall is seen; the crossing found still holds."""
        duty = Duty.from_arrays(torque=4_500.0)
        result = solve_dimension(self.stack(), duty, smallest=0.0401, largest=0.1)
        assert result.status[0] == SizingStatus.NOT_MONOTONE
        assert reserve(resized(self.stack(), result.size), duty)[0] >= 1.0
        assert self.sleeve_capacity(result.size[0]) == pytest.approx(4_500.0, rel=1e-4)

    def test_fall_seen_at_the_ends(self):
        result = solve_dimension(self.stack(), Duty.from_arrays(torque=3_000.0),
                                 smallest=0.0401, largest=0.064)
        assert result.status[0] == SizingStatus.NOT_MONOTONE and result.size[0] == 0.0401

    def test_stock_skips_sizes_that_fail(self):
        """From 45 mm, 50, 60 and 70 mm fail in the dip at 3800 N m; 90 mm holds."""
        stock = [0.041, 0.05, 0.06, 0.07, 0.09, 0.1]
        duty = Duty.from_arrays(torque=3_800.0)
        chosen = round_up_to_stock(self.stack(), duty, [0.045], stock)
        assert [self.sleeve_capacity(d) >= 3_800.0 for d in stock[1:]] == [False, False, False, True, True]
        assert chosen.status[0] == StockStatus.FOUND and chosen.size[0] == 0.09 and chosen.index[0] == 4


class TestStock:
    def stack(self, n=1):
        return LayerStack.from_arrays(np.full((n, 1), 0.05), 0.0, G_STEEL, 60e6)

    def test_per_part_stock_with_padding(self):
        stock = [[0.02, 0.03, 0.04, np.nan], [0.02, 0.025, 0.045, 0.05]]
        duty = Duty.from_arrays(torque=[1_000.0, 1_000.0])  # needs 43.9 mm
        chosen = round_up_to_stock(self.stack(2), duty, [0.0439, 0.0439], stock)
        assert chosen.status.tolist() == [StockStatus.NONE_HOLDS, StockStatus.FOUND]
        assert chosen.index.tolist() == [-1, 2] and np.isnan(chosen.size[0]) and chosen.size[1] == 0.045

    def test_no_size_given_searches_every_stock_size(self):
        chosen = round_up_to_stock(self.stack(), Duty.from_arrays(torque=1_000.0), [np.nan],
                                   [0.01, 0.03, 0.044, 0.05])
        assert chosen.size[0] == 0.044

    def test_bore_rounds_down(self):
        stack = LayerStack.from_layers([0.05], [0.01], [G_STEEL], [100e6])
        duty = Duty.from_arrays(torque=1_500.0)
        result = solve_dimension(stack, duty, dimension=SizedDimension.BORE)
        stock = [0.0, 0.01, 0.02, 0.03, 0.04, 0.048]
        chosen = round_up_to_stock(stack, duty, result.size, stock, dimension=SizedDimension.BORE)
        # k = 16 T / (pi tau_a); bore = (D^4 - k D)^(1/4) = 39.5 mm (hollow-shaft form, Roark's)
        k = 16.0 * 1_500.0 / (math.pi * 100e6)
        assert 0.03 < (0.05**4 - k * 0.05) ** 0.25 < 0.04
        assert chosen.size[0] == 0.03 and chosen.status[0] == StockStatus.FOUND
        assert chosen.index[0] == 3

    def test_bore_with_no_size_starts_from_the_largest_that_fits(self):
        stack = LayerStack.from_layers([0.05], [0.01], [G_STEEL], [100e6])
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=1_500.0), [np.nan],
                                   [0.0, 0.03, 0.04, 0.05, 0.06], dimension=SizedDimension.BORE)
        assert chosen.size[0] == 0.03  # 50 and 60 mm leave no wall; 40 mm fails (39.5 mm needed)

    def test_shared_list_equals_the_same_list_per_part(self):
        stack = LayerStack.from_arrays([[0.05], [0.05], [0.05]], 0.0, G_STEEL, 60e6)
        duty = Duty.from_arrays(torque=[100.0, 1_000.0, 5_000.0])
        stock = np.array([0.01, 0.02, 0.03, 0.04, 0.05, 0.06, 0.07])
        sizes = [0.0205, np.nan, 0.08]
        shared = round_up_to_stock(stack, duty, sizes, stock)
        per_part = round_up_to_stock(stack, duty, sizes, np.tile(stock, (3, 1)))
        for item in dataclasses.fields(shared):
            np.testing.assert_array_equal(getattr(shared, item.name), getattr(per_part, item.name))
        assert shared.status.tolist() == [StockStatus.FOUND, StockStatus.FOUND, StockStatus.NONE_HOLDS]

    def test_not_applicable_and_not_rated(self):
        stack = LayerStack.from_arrays([[0.05], [0.05]], 0.0, [[G_STEEL], [0.0]], 60e6)
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=10.0), [0.03, 0.03], [0.04, 0.05],
                                   layer=[1, 0])
        assert chosen.status.tolist() == [StockStatus.NOT_APPLICABLE, StockStatus.NOT_RATED]


class TestRestore:
    """A machined shaft rebuilt with a sleeve; capacities by rate() (BRIEF §2)."""

    def test_same_material_gives_the_original_back(self):
        """A sleeve of the core's own material, bonded, is the original solid again (twist
        compatibility; common practice): its outer diameter is the original one."""
        result = restore_sleeve(0.05, 0.0, G_STEEL, 100e6, 0.044, G_STEEL, 100e6)
        assert result.status[0, 0] == SizingStatus.SOLVED
        assert_on_safe_side(result.sleeve_outer_diameter[0, 0], 0.05)
        assert result.stiffness_ratio[0, 0] == pytest.approx(1.0, abs=5 * TOL / 0.05)
        # pi d^3 tau / 16 (Roark's, torsion of circular sections)
        assert result.original_capacity[0] == pytest.approx(math.pi * 0.05**3 * 100e6 / 16, rel=1e-12)

    def test_rerating_the_restored_section_gives_the_original_capacity(self):
        result = restore_sleeve([0.05, 0.08], [0.0, 0.03], G_STEEL, 100e6, [0.044, 0.07],
                                [G_BRONZE, 26e9], [45e6, 60e6], stress_concentration=[1.0, 1.3])
        cases = [(0.05, 0.0, 0.044, 1.0), (0.08, 0.03, 0.07, 1.3)]
        for part, (outer, bore, reduced, kt) in enumerate(cases):
            original = rate(LayerStack.from_layers([outer], [bore], [G_STEEL], [100e6], kt),
                            Duty.from_arrays(torque=1.0)).governing_capacity[0]
            for column, (g, tau) in enumerate([(G_BRONZE, 45e6), (26e9, 60e6)]):
                sleeve = result.sleeve_outer_diameter[part, column]
                def capacity(d):
                    stack = LayerStack.from_layers([reduced, d], [bore, reduced], [G_STEEL, g],
                                                   [100e6, tau], [kt, kt])
                    return rate(stack, Duty.from_arrays(torque=1.0)).governing_capacity[0]
                assert result.status[part, column] == SizingStatus.SOLVED
                assert capacity(sleeve) >= original > capacity(sleeve - TOL)
                assert capacity(sleeve) == result.restored_capacity[part, column]

    def test_bronze_sleeve_closed_form(self):
        """Solid steel 50 mm, tau 100 MPa, turned to 44 mm, bronze sleeve tau 45 MPa (sleeve
        governs): T0 = pi D0^3 tau / 16 (Roark's); the sleeve's capacity equation
        (pi/32) G_s D^4 - (T0 G_s / (2 tau_s)) D + (pi/32)(G_c - G_s) d^4 = 0 by numpy roots;
        stiffness ratio (G_c d^4 + G_s (D^4 - d^4)) / (G_c D0^4)."""
        result = restore_sleeve(0.05, 0.0, G_STEEL, 100e6, 0.044, G_BRONZE, 45e6)
        t0 = math.pi * 0.05**3 * 100e6 / 16
        c = math.pi / 32
        exact = real_root_above([c * G_BRONZE, 0, 0, -t0 * G_BRONZE / (2 * 45e6),
                                 c * (G_STEEL - G_BRONZE) * 0.044**4], 0.044)
        sleeve = result.sleeve_outer_diameter[0, 0]
        assert_on_safe_side(sleeve, exact)
        assert result.governing_layer[0, 0] == 1
        ratio = (G_STEEL * 0.044**4 + G_BRONZE * (sleeve**4 - 0.044**4)) / (G_STEEL * 0.05**4)
        assert result.stiffness_ratio[0, 0] == pytest.approx(ratio, rel=1e-12)

    def test_candidates_make_columns(self):
        """(P, M): each column is the one-material call for that candidate."""
        moduli, allowables = [G_BRONZE, 26e9, 190e9 / 2.6], [45e6, 60e6, 140e6]
        both = restore_sleeve([0.05, 0.06], 0.0, G_STEEL, 100e6, [0.044, 0.05], moduli, allowables)
        assert both.sleeve_outer_diameter.shape == (2, 3) and both.original_capacity.shape == (2,)
        for column, (g, tau) in enumerate(zip(moduli, allowables)):
            alone = restore_sleeve([0.05, 0.06], 0.0, G_STEEL, 100e6, [0.044, 0.05], g, tau)
            np.testing.assert_array_equal(alone.sleeve_outer_diameter[:, 0],
                                          both.sleeve_outer_diameter[:, column])

    def test_twist_limit_is_restored_too(self):
        """With only a twist limit, the restored sum(GJ) must equal the original GJ."""
        duty = Duty.from_arrays(length=1.0, twist_limit_angle=math.radians(0.5))
        result = restore_sleeve(0.05, 0.0, G_STEEL, 10e9, 0.044, G_BRONZE, 10e9, duty=duty)
        assert result.governing_criterion[0, 0] == Criterion.TWIST_ANGLE
        assert 1.0 <= result.stiffness_ratio[0, 0] <= 1 + 5 * TOL / 0.05


class TestResized:
    def test_moving_keeps_walls_and_contact(self):
        stack = LayerStack.from_layers([0.03, 0.04, 0.05], [0.01, 0.03, 0.04], 79e9, 1e8)
        moved = resized(stack, [0.032], layer=0)
        np.testing.assert_allclose(moved.outer_diameter[0], [0.032, 0.042, 0.052], rtol=1e-15)
        np.testing.assert_allclose(moved.inner_diameter[0], [0.01, 0.032, 0.042], rtol=1e-15)
        assert rate(moved, Duty.from_arrays(torque=1.0)).valid[0]

    def test_bore_changes_alone(self):
        stack = LayerStack.from_layers([0.03, 0.04], [0.01, 0.03], 79e9, 1e8)
        moved = resized(stack, [0.02], dimension=SizedDimension.BORE)
        assert moved.inner_diameter[0].tolist() == [0.02, 0.03]
        assert moved.outer_diameter[0].tolist() == [0.03, 0.04]

    def test_inapplicable_parts_unchanged_and_input_untouched(self):
        stack = LayerStack.from_arrays([[0.03, 0.04], [0.03, np.nan]],
                                       [[0.0, 0.03], [0.0, np.nan]], 79e9, 1e8)
        slot, applicable = sizing_slot(stack, SizedDimension.OUTER_DIAMETER, layer=1)
        assert applicable.tolist() == [True, False]
        moved = resized(stack, [0.05, 0.05], layer=1)
        assert moved.outer_diameter[0, 1] == 0.05 and moved.outer_diameter[1, 0] == 0.03
        assert stack.outer_diameter[0, 1] == 0.04

    def test_outermost_per_part(self):
        stack = LayerStack.from_arrays([[0.03, 0.04], [0.03, np.nan]],
                                       [[0.0, 0.03], [0.0, np.nan]], 79e9, 1e8)
        slot, applicable = sizing_slot(stack, SizedDimension.OUTER_DIAMETER)
        assert slot.tolist() == [1, 0] and applicable.all()


def test_results_are_frozen():
    result = solve_dimension(LayerStack.from_layers([0.05], [0.0], [G_STEEL], [60e6]),
                             Duty.from_arrays(torque=1.0))
    with pytest.raises(dataclasses.FrozenInstanceError):
        result.size = np.zeros(1)  # type: ignore[misc]
    with pytest.raises(ValueError):
        result.size[0] = 0.0


# --- properties -------------------------------------------------------------------------

SETTINGS = settings(max_examples=60, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)
SETTLED = (SizingStatus.SOLVED, SizingStatus.HOLDS_AT_LEAST)


@st.composite
def parts(draw, max_layers=3):
    """One valid part: a solid or bored core and touching tubes, as layer lists."""
    n = draw(st.integers(1, max_layers))
    core = draw(st.floats(0.005, 0.2, **finite))
    bore = draw(st.one_of(st.just(0.0), st.floats(0.05, 0.9, **finite))) * core
    outer = [core]
    for wall in draw(st.lists(st.floats(0.0005, 0.03, **finite), min_size=n - 1, max_size=n - 1)):
        outer.append(outer[-1] + 2 * wall)
    return dict(outer_diameter=outer, inner_diameter=[bore] + outer[:-1],
                shear_modulus=draw(st.lists(st.floats(20e9, 120e9, **finite), min_size=n, max_size=n)),
                allowable_shear=draw(st.lists(st.floats(20e6, 600e6, **finite), min_size=n, max_size=n)),
                stress_concentration=draw(st.lists(st.floats(1.0, 3.0, **finite), min_size=n, max_size=n)))


torques = st.floats(1.0, 1e5, **finite)


@SETTINGS
@given(parts(), torques, st.floats(1.0, 50.0, **finite), st.integers(0, 2))
def test_larger_demand_never_gives_a_smaller_answer(part, torque, factor, which):
    stack = LayerStack.from_layers(**part)
    layer = min(which, stack.n_layers - 1)
    small = solve_dimension(stack, Duty.from_arrays(torque=torque), layer=layer)
    large = solve_dimension(stack, Duty.from_arrays(torque=torque * factor), layer=layer)
    assume(small.status[0] in SETTLED and large.status[0] in SETTLED)
    assert large.size[0] >= small.size[0]


@SETTINGS
@given(st.floats(0.01, 0.3, **finite), st.floats(0.5, 0.98, **finite), st.floats(20e6, 400e6, **finite),
       st.floats(20e9, 120e9, **finite), st.floats(10e6, 400e6, **finite), st.floats(1.0, 4.0, **finite))
def test_stronger_sleeve_never_needs_a_thicker_sleeve(outer, reduced, allowable, sleeve_g, sleeve_tau, gain):
    """Same G, higher allowable: every capacity is at least as high at every size."""
    weak = restore_sleeve(outer, 0.0, G_STEEL, allowable, reduced * outer, sleeve_g, sleeve_tau)
    strong = restore_sleeve(outer, 0.0, G_STEEL, allowable, reduced * outer, sleeve_g, sleeve_tau * gain)
    assume(weak.status[0, 0] in SETTLED and strong.status[0, 0] in SETTLED)
    assert strong.sleeve_outer_diameter[0, 0] <= weak.sleeve_outer_diameter[0, 0]


def _padded(part_list, width):
    fields = ("outer_diameter", "inner_diameter", "shear_modulus", "allowable_shear", "stress_concentration")
    arrays = {f: np.full((len(part_list), width), np.nan) for f in fields}
    for row, part in enumerate(part_list):
        for f in fields:
            arrays[f][row, :len(part[f])] = part[f]
    return LayerStack.from_arrays(**arrays)


@SETTINGS
@given(st.lists(st.tuples(parts(), torques), min_size=2, max_size=6), st.data())
def test_one_part_alone_equals_the_same_part_in_a_batch(cases, data):
    """Each part takes its own number of halvings, so neighbours change nothing."""
    part_list = [part for part, _ in cases]
    torque = [t for _, t in cases]
    dimension = data.draw(st.sampled_from(list(SizedDimension)), label="dimension")
    row = data.draw(st.integers(0, len(cases) - 1), label="row")
    batch = solve_dimension(_padded(part_list, 4), Duty.from_arrays(torque=torque, length=1.0),
                            dimension=dimension)
    alone = solve_dimension(LayerStack.from_layers(**part_list[row]),
                            Duty.from_arrays(torque=torque[row], length=1.0), dimension=dimension)
    for item in dataclasses.fields(alone):
        np.testing.assert_array_equal(getattr(batch, item.name)[row], getattr(alone, item.name)[0])


# --- mutation testing (issue 9): boundaries, defaults, codes and messages -----------------

def solid(outer=0.05, allowable=60e6, bore=0.0):
    return LayerStack.from_layers([outer], [bore], [G_STEEL], [allowable])


def solid_diameter(torque, allowable=60e6, target=1.0):
    """d = (16 T RF / (pi tau_a))^(1/3) (Roark's Formulas for Stress and Strain, torsion of
    circular sections)."""
    return (16.0 * torque * target / (math.pi * allowable)) ** (1.0 / 3.0)


def tube_capacity(outer, bore, allowable):
    """T = tau_a J / r = pi (D^4 - d^4) tau_a / (16 D) (Roark's, torsion of circular sections)."""
    return math.pi * (outer**4 - bore**4) * allowable / (16.0 * outer)


def capacity_at(stack, value, **where):
    """Governing capacity of ``stack`` with its sized dimension set to ``value``, by rate()."""
    return float(rate(resized(stack, [value], **where), Duty.from_arrays(torque=1.0)).governing_capacity[0])


class TestCodes:
    """The int8 codes in results are the public API listed in DEVELOPERS.md (engine reference):
    callers and books store them, so a value must not move."""

    def test_sizing_status_codes(self):
        one = solid()
        codes = [
            solve_dimension(one, Duty.from_arrays(torque=1_000.0)).status[0],
            solve_dimension(one, Duty.from_arrays(torque=1.0), smallest=0.02, largest=0.06).status[0],
            solve_dimension(one, Duty.from_arrays(torque=1e6), smallest=0.02, largest=0.06).status[0],
            solve_dimension(TestNotMonotone().stack(), Duty.from_arrays(torque=3_000.0),
                            smallest=0.0401, largest=0.064).status[0],
            solve_dimension(LayerStack.from_layers([0.05], [0.0], [0.0], [60e6]),
                            Duty.from_arrays(torque=10.0)).status[0],
            solve_dimension(one, Duty.from_arrays(torque=1.0), layer=1).status[0],
            solve_dimension(one, Duty.from_arrays(torque=10.0), target_reserve=0.0).status[0],
        ]
        # SOLVED=0, HOLDS_AT_LEAST=1, SHORT_AT_MOST=2, NOT_MONOTONE=3, NOT_RATED=4,
        # NOT_APPLICABLE=5, BAD_INPUT=6 (DEVELOPERS.md)
        assert [int(c) for c in codes] == [0, 1, 2, 3, 4, 5, 6]
        assert [SizingStatus(int(c)).name for c in codes] == [
            "SOLVED", "HOLDS_AT_LEAST", "SHORT_AT_MOST", "NOT_MONOTONE", "NOT_RATED",
            "NOT_APPLICABLE", "BAD_INPUT"]

    def test_stock_status_codes(self):
        """FOUND=0, NONE_HOLDS=1, NOT_RATED=2, NOT_APPLICABLE=3, in the order the StockStatus
        docstring gives them (int8 in StockResult.status)."""
        stack = LayerStack.from_arrays([[0.05], [0.05], [0.05], [0.05]], 0.0,
                                       [[G_STEEL], [G_STEEL], [0.0], [G_STEEL]], 60e6)
        duty = Duty.from_arrays(torque=[1_000.0, 1e6, 10.0, 10.0])
        chosen = round_up_to_stock(stack, duty, [np.nan] * 4, [0.04, 0.05], layer=[0, 0, 0, 1])
        assert chosen.status.tolist() == [0, 1, 2, 3]
        assert [StockStatus(int(c)).name for c in chosen.status] == [
            "FOUND", "NONE_HOLDS", "NOT_RATED", "NOT_APPLICABLE"]

    def test_plain_codes_name_the_dimension_and_the_outer_layers(self):
        """SizedDimension WALL=2 and OuterLayers FIXED=1 (DEVELOPERS.md): a caller may pass
        the plain number. The wall of a solid grown from its axis is d / 2 (Roark's)."""
        by_code = solve_dimension(solid(), Duty.from_arrays(torque=1_000.0), dimension=2)
        assert_on_safe_side(by_code.size[0], solid_diameter(1_000.0) / 2)
        fixed = solve_dimension(TestTwoLayers().stack(), Duty.from_arrays(torque=1.0), layer=0,
                                outer_layers=1)
        assert fixed.status[0] == SizingStatus.NOT_APPLICABLE


class TestSolverEdges:
    def test_messages_word_for_word(self):
        three = LayerStack.from_arrays(np.full((3, 1), 0.05), 0.0, G_STEEL, 60e6)
        two = Duty.from_arrays(torque=[1.0, 2.0])
        expected = "duty has 2 parts; expected 1 or 3 like the layer stack"
        with pytest.raises(ValueError) as raised:
            solve_dimension(three, two)
        assert str(raised.value) == expected
        with pytest.raises(ValueError) as raised:
            round_up_to_stock(three, two, [0.05] * 3, [0.05])
        assert str(raised.value) == expected
        with pytest.raises(ValueError) as raised:
            solve_dimension(three, Duty.from_arrays(torque=1.0), tol=-1.0)
        assert str(raised.value) == "tol must be a positive finite number of metres; got -1.0"

    def test_one_duty_for_every_part(self):
        stack = LayerStack.from_arrays([[0.05], [0.05]], 0.0, G_STEEL, [[60e6], [120e6]])
        result = solve_dimension(stack, Duty.from_arrays(torque=1_000.0))
        for part, allowable in enumerate([60e6, 120e6]):
            assert_on_safe_side(result.size[part], solid_diameter(1_000.0, allowable))

    def test_least_end_meeting_the_demand_exactly_holds(self):
        """A reserve factor equal to the target holds (>=): the demand is set to the
        capacity rated at the least-material end itself."""
        demand = capacity_at(solid(), 0.03)
        result = solve_dimension(solid(), Duty.from_arrays(torque=demand), smallest=0.03, largest=0.06)
        assert result.status[0] == SizingStatus.HOLDS_AT_LEAST and result.size[0] == 0.03
        assert result.reserve_factor[0] == 1.0

    def test_most_end_meeting_the_demand_exactly_holds(self):
        """Every smaller size fails (capacity ~ d^3, Roark's), so the answer is the end itself."""
        demand = capacity_at(solid(), 0.06)
        result = solve_dimension(solid(), Duty.from_arrays(torque=demand), smallest=0.03, largest=0.06)
        assert result.status[0] == SizingStatus.SOLVED and result.size[0] == 0.06
        assert result.reserve_factor[0] == 1.0

    def test_a_trial_meeting_the_demand_exactly_holds(self):
        """The first trial is the midpoint (binary-exact numbers); the demand is the capacity
        there, so it holds, every later trial lies below it and fails (capacity ~ d^3)."""
        low, high = 0.03125, 0.0625
        mid = 0.5 * (low + high)
        demand = capacity_at(solid(), mid)
        result = solve_dimension(solid(), Duty.from_arrays(torque=demand), smallest=low, largest=high)
        assert result.status[0] == SizingStatus.SOLVED and result.size[0] == mid
        assert result.reserve_factor[0] == 1.0

    def test_iterations_follow_the_width_of_the_range(self):
        """ceil(log2(width / tol)) halvings (the solver's documented count): 40 mm / 1 um."""
        result = solve_dimension(solid(), Duty.from_arrays(torque=1_000.0), smallest=0.02, largest=0.06)
        assert result.iterations[0] == math.ceil(math.log2(0.04 / TOL)) == 16
        assert_on_safe_side(result.size[0], solid_diameter(1_000.0))

    def test_a_range_narrower_than_tol_is_not_bisected(self):
        exact = solid_diameter(1_000.0)
        low, high = exact - 0.4 * TOL, exact + 0.1 * TOL
        result = solve_dimension(solid(), Duty.from_arrays(torque=1_000.0), smallest=low, largest=high)
        assert result.status[0] == SizingStatus.SOLVED
        assert result.iterations[0] == 0 and result.size[0] == high

    def test_a_very_fine_tolerance_stays_monotone(self):
        """d^3 rises (Roark's): no trial may look like a fall however close the brackets get."""
        result = solve_dimension(solid(), Duty.from_arrays(torque=1_000.0), tol=1e-13)
        assert result.status[0] == SizingStatus.SOLVED
        assert result.iterations[0] == math.ceil(math.log2((1.0 - 1e-13) / 1e-13))
        assert_on_safe_side(result.size[0], solid_diameter(1_000.0), tol=1e-13)

    @pytest.mark.parametrize(("torque", "status"), [(1_000.0, SizingStatus.HOLDS_AT_LEAST),
                                                     (1e6, SizingStatus.SHORT_AT_MOST)])
    def test_a_nearly_flat_range_is_not_a_fall(self, torque, status):
        """From 50 mm to 50 mm + 10 pm the capacity rises by 6 parts in 10^10 (d^3): a rise."""
        result = solve_dimension(solid(), Duty.from_arrays(torque=torque), smallest=0.05,
                                 largest=0.05 + 1e-11, tol=1e-12)
        assert result.status[0] == status

    def test_a_trial_above_the_holding_end_is_a_fall(self):
        """Core tau 256 MPa (G 80 GPa, 40 mm) in a soft sleeve (G 5 GPa, tau 20 MPa): the core's
        capacity 2 tau_c sum(GJ) / (G_c d) governs up to D = tau_s G_c d / (tau_c G_s) = 50 mm,
        then the sleeve's 2 tau_s sum(GJ) / (G_s D), falling to 59.8 mm (twist compatibility).
        Range 40.1 to 59.9 mm at 3300 N m: the first trial, 50 mm, holds and rates well above
        the holding end, though by less than double."""
        c = math.pi / 32

        def closed_form(outer):
            sum_gj = c * (80e9 * 0.040**4 + 5e9 * (outer**4 - 0.040**4))
            return min(2 * 256e6 * sum_gj / (80e9 * 0.040), 2 * 20e6 * sum_gj / (5e9 * outer))

        assert closed_form(0.0401) < 3_300.0 < closed_form(0.0599) < closed_form(0.05) < 2 * closed_form(0.0599)
        stack = LayerStack.from_layers([0.040, 0.045], [0.0, 0.040], [80e9, 5e9], [256e6, 20e6])
        result = solve_dimension(stack, Duty.from_arrays(torque=3_300.0), smallest=0.0401, largest=0.0599)
        assert result.status[0] == SizingStatus.NOT_MONOTONE
        assert closed_form(result.size[0]) >= 3_300.0 * (1 - 1e-12)

    def test_nothing_shown_gives_no_layer(self):
        """-1 = no layer, NONE = no criterion where nothing is given (SizingResult docstring)."""
        stack = LayerStack.from_arrays([[0.05], [0.05], [0.05]], 0.0, [[G_STEEL], [G_STEEL], [0.0]], 60e6)
        result = solve_dimension(stack, Duty.from_arrays(torque=[10.0, 10.0, 10.0]), layer=[1, 0, 0],
                                 target_reserve=[1.0, 0.0, 1.0])
        assert result.status.tolist() == [SizingStatus.NOT_APPLICABLE, SizingStatus.BAD_INPUT,
                                          SizingStatus.NOT_RATED]
        assert result.governing_layer.tolist() == [-1, -1, -1]
        assert result.governing_criterion.tolist() == [Criterion.NONE] * 3

    def test_an_empty_range_is_bad_input(self):
        """smallest == largest, and ranges upside down for the bore and the wall."""
        duty = Duty.from_arrays(torque=10.0)
        cases = [dict(smallest=0.05, largest=0.05),
                 dict(dimension=SizedDimension.BORE, smallest=0.03, largest=0.02),
                 dict(dimension=SizedDimension.WALL, smallest=0.01, largest=0.005)]
        for changes in cases:
            assert solve_dimension(solid(), duty, **changes).status[0] == SizingStatus.BAD_INPUT

    def test_fixed_layer_out_of_range(self):
        result = solve_dimension(solid(), Duty.from_arrays(torque=1.0), layer=3, outer_layers=OuterLayers.FIXED)
        assert result.status[0] == SizingStatus.NOT_APPLICABLE


class TestDefaultRange:
    """Defaults (solve_dimension docstring): outer diameter up to the larger of 1 m and ten
    times the present one; wall up to the wall of that same reach."""

    def test_outer_diameter_reach_is_ten_times(self):
        """200 mm now: the reach is 2 m. A torque needing 2.1 m is short, and what stops it is
        the 2 m shaft, pi D^3 tau / 16 (Roark's)."""
        torque = math.pi * 2.1**3 * 60e6 / 16
        result = solve_dimension(solid(0.2), Duty.from_arrays(torque=torque))
        assert result.status[0] == SizingStatus.SHORT_AT_MOST
        assert result.reserve_factor[0] == pytest.approx(tube_capacity(2.0, 0.0, 60e6) / torque, rel=1e-12)
        assert result.iterations[0] == 0

    def test_wall_reach_is_the_same_diameter(self):
        """A tube of bore 100 mm, 200 mm now: walls up to (2 m - 0.1 m) / 2, i.e. D = 2 m."""
        torque = 1e9
        result = solve_dimension(solid(0.2, bore=0.1), Duty.from_arrays(torque=torque),
                                 dimension=SizedDimension.WALL)
        assert result.status[0] == SizingStatus.SHORT_AT_MOST
        assert result.reserve_factor[0] == pytest.approx(tube_capacity(2.0, 0.1, 60e6) / torque, rel=1e-12)


class TestResizedRules:
    def stack(self, core=(0.015625, 0.03125)):
        """A bored core and a sleeve, binary-exact diameters."""
        return LayerStack.from_layers([core[1], 0.0625], [core[0], core[1]], [G_STEEL, G_BRONZE], 1e8)

    @pytest.mark.parametrize("dimension", [SizedDimension.OUTER_DIAMETER, SizedDimension.WALL])
    def test_a_part_it_cannot_change_is_unchanged(self, dimension):
        """FIXED outer layers: the core cannot change (resized docstring: returned unchanged)."""
        stack = self.stack()
        moved = resized(stack, [0.04], dimension=dimension, layer=0, outer_layers=OuterLayers.FIXED)
        assert moved.outer_diameter.tolist() == stack.outer_diameter.tolist()
        assert moved.inner_diameter.tolist() == stack.inner_diameter.tolist()

    def test_fixed_outer_layers_stay_exactly(self):
        """FIXED: the layers outside stay where they are (OuterLayers docstring), to the bit,
        whatever the wall's round trip (Do - Di) / 2 does to the core's diameter."""
        stack = LayerStack.from_layers([0.0428, 0.06], [0.0115, 0.0428], [G_STEEL, G_BRONZE], 1e8)
        moved = resized(stack, [0.02], dimension=SizedDimension.WALL, layer=0, outer_layers=OuterLayers.FIXED)
        assert moved.outer_diameter[0, 1] == 0.06 and moved.inner_diameter[0, 1] == 0.0428
        # and the core, which FIXED does not let it change, is returned unchanged (resized's
        # docstring), not 0.04279999999999999 from D_i + 2 (D_o - D_i)/2
        assert moved.outer_diameter[0].tolist() == [0.0428, 0.06]
        assert moved.inner_diameter[0].tolist() == [0.0115, 0.0428]

    def test_default_layer_is_the_outermost(self):
        stack = LayerStack.from_layers([0.03, 0.04, 0.05], [0.01, 0.03, 0.04], 79e9, 1e8)
        moved = resized(stack, [0.06])
        assert moved.outer_diameter[0].tolist() == [0.03, 0.04, 0.06]


class TestStockRules:
    """round_up_to_stock's documented rules: round up from size - tol, bores down from
    size + tol, skip sizes that leave no wall, re-rate each candidate."""

    BINARY_TOL = 2.0**-20  # so that size -/+ tol is exact

    @staticmethod
    def lists(stock, per_part):
        return np.array([stock]) if per_part else np.array(stock)

    @pytest.mark.parametrize("per_part", [False, True])
    def test_a_size_tol_below_is_tried(self, per_part):
        """1000 N m needs 43.9 mm (Roark's); 46.875 mm is exactly size - tol."""
        stock = self.lists([0.03125, 0.046875, 0.0625], per_part)
        chosen = round_up_to_stock(solid(), Duty.from_arrays(torque=1_000.0), [0.046875 + self.BINARY_TOL],
                                   stock, tol=self.BINARY_TOL)
        assert solid_diameter(1_000.0) < 0.046875
        assert chosen.status[0] == StockStatus.FOUND and chosen.size[0] == 0.046875 and chosen.index[0] == 1

    def test_the_size_itself_is_tried(self):
        chosen = round_up_to_stock(solid(), Duty.from_arrays(torque=1_000.0), [0.045], [0.04, 0.045, 0.05])
        assert chosen.size[0] == 0.045 and chosen.index[0] == 1

    @pytest.mark.parametrize("per_part", [False, True])
    def test_a_bore_tol_above_is_tried(self, per_part):
        """D 50 mm, 1500 N m, tau 100 MPa: bores up to 39.5 mm hold (Roark's hollow shaft);
        31.25 mm is exactly size + tol."""
        stack = solid(0.05, 100e6, bore=0.01)
        stock = self.lists([0.0, 0.015625, 0.03125, 0.046875], per_part)
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=1_500.0), [0.03125 - self.BINARY_TOL],
                                   stock, dimension=SizedDimension.BORE, tol=self.BINARY_TOL)
        assert tube_capacity(0.05, 0.03125, 100e6) >= 1_500.0
        assert chosen.status[0] == StockStatus.FOUND and chosen.size[0] == 0.03125

    @pytest.mark.parametrize("per_part", [False, True])
    def test_a_bore_equal_to_the_outer_diameter_is_skipped(self, per_part):
        stack = solid(0.05, 100e6, bore=0.01)
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=1_500.0), [np.nan],
                                   self.lists([0.0, 0.03, 0.05], per_part), dimension=SizedDimension.BORE)
        assert chosen.status[0] == StockStatus.FOUND and chosen.size[0] == 0.03

    @pytest.mark.parametrize("per_part", [False, True])
    def test_outer_diameters_at_or_below_the_bore_are_skipped(self, per_part):
        """Tube bore 30 mm, 1000 N m, tau 60 MPa: D^4 - k D - d^4 = 0 (Roark's) gives 46.0 mm;
        20 and 30 mm leave no wall."""
        stack = solid(0.04, 60e6, bore=0.03)
        stock = self.lists([0.02, 0.03, 0.035, 0.045, 0.05, 0.06], per_part)
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=1_000.0), [np.nan], stock)
        k = 16.0 * 1_000.0 / (math.pi * 60e6)
        exact = real_root_above([1.0, 0.0, 0.0, -k, -0.03**4], 0.03)
        assert 0.045 < exact < 0.05
        assert chosen.status[0] == StockStatus.FOUND and chosen.size[0] == 0.05

    def test_walls(self):
        """The same tube by its wall: (46.0 - 30) / 2 = 8.0 mm, so 9 mm is the first that holds."""
        stack = solid(0.04, 60e6, bore=0.03)
        walls = [0.002, 0.004, 0.006, 0.008, 0.009, 0.012]
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=1_000.0), [np.nan], walls,
                                   dimension=SizedDimension.WALL)
        k = 16.0 * 1_000.0 / (math.pi * 60e6)
        exact = (real_root_above([1.0, 0.0, 0.0, -k, -0.03**4], 0.03) - 0.03) / 2
        assert 0.008 < exact < 0.009
        assert chosen.status[0] == StockStatus.FOUND and chosen.size[0] == 0.009 and chosen.index[0] == 4
        assert chosen.reserve_factor[0] == pytest.approx(tube_capacity(0.048, 0.03, 60e6) / 1_000.0, rel=1e-12)

    def test_a_solid_bore_is_a_stock_size(self):
        """D 50 mm, tau 100 MPa, 2300 N m: solid 2454 N m holds, a 30 mm bore 2136 N m fails."""
        stack = solid(0.05, 100e6, bore=0.01)
        assert tube_capacity(0.05, 0.03, 100e6) < 2_300.0 < tube_capacity(0.05, 0.0, 100e6)
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=2_300.0), [np.nan], [0.0, 0.03, 0.04],
                                   dimension=SizedDimension.BORE)
        assert chosen.status[0] == StockStatus.FOUND and chosen.size[0] == 0.0 and chosen.index[0] == 0

    def test_a_negative_bore_is_no_stock_size(self):
        """Not a size at all: skipped, not rated; nothing else holds at 2300 N m."""
        stack = solid(0.05, 100e6, bore=0.01)
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=2_300.0), [np.nan], [-0.01, 0.03, 0.04],
                                   dimension=SizedDimension.BORE)
        assert chosen.status[0] == StockStatus.NONE_HOLDS

    def test_first_and_last_stock_sizes(self):
        """1000 N m needs 43.9 mm (Roark's): from nothing, 50 mm first of [50, 60];
        of [10, 20, 50] the last."""
        duty = Duty.from_arrays(torque=1_000.0)
        first = round_up_to_stock(solid(), duty, [np.nan], [0.05, 0.06])
        assert first.size[0] == 0.05 and first.index[0] == 0
        last = round_up_to_stock(solid(), duty, [np.nan], [0.01, 0.02, 0.05])
        assert last.status[0] == StockStatus.FOUND and last.size[0] == 0.05 and last.index[0] == 2

    def test_nothing_at_or_beyond_the_size(self):
        """A size beyond every stock size: none is tried, even one that would hold; nothing
        chosen gives NaN, -1 and NONE (StockResult docstring)."""
        chosen = round_up_to_stock(solid(), Duty.from_arrays(torque=1_000.0), [0.07], [0.05, 0.06])
        assert chosen.status[0] == StockStatus.NONE_HOLDS and np.isnan(chosen.size[0])
        assert chosen.index[0] == -1 and chosen.governing_layer[0] == -1
        assert chosen.governing_criterion[0] == Criterion.NONE and np.isnan(chosen.reserve_factor[0])

    def test_the_target_multiplies_the_torque(self):
        """RF 2 at 1000 N m: d = (16 T RF / (pi tau_a))^(1/3) = 55.4 mm (Roark's)."""
        assert 0.055 < solid_diameter(1_000.0, target=2.0) < 0.056
        chosen = round_up_to_stock(solid(), Duty.from_arrays(torque=1_000.0), [np.nan],
                                   [0.045, 0.05, 0.055, 0.056, 0.06], target_reserve=2.0)
        assert chosen.size[0] == 0.056 and chosen.reserve_factor[0] >= 2.0

    def test_no_target_is_not_applicable(self):
        chosen = round_up_to_stock(solid(), Duty.from_arrays(torque=1_000.0), [np.nan], [0.05],
                                   target_reserve=0.0)
        assert chosen.status[0] == StockStatus.NOT_APPLICABLE

    def test_a_stock_size_meeting_the_demand_exactly_holds(self):
        demand = capacity_at(solid(), 0.05)
        chosen = round_up_to_stock(solid(), Duty.from_arrays(torque=demand), [np.nan], [0.045, 0.05, 0.055])
        assert chosen.size[0] == 0.05 and chosen.reserve_factor[0] == 1.0

    def test_core_with_the_sleeve_moving(self):
        """Stock core diameters x, the 5 mm bronze wall moving with it: each layer's capacity
        2 tau sum(GJ) / (G D Kt) with sum(GJ) = (pi/32)(G_c x^4 + G_s((x + 10 mm)^4 - x^4))
        (twist compatibility); the first stock x that holds is chosen."""
        two = TestTwoLayers()
        stack = two.stack(two.CORE + 0.01)
        c = math.pi / 32

        def closed_form(x):
            sum_gj = c * (G_STEEL * x**4 + G_BRONZE * ((x + 0.01) ** 4 - x**4))
            return min(2 * two.TAU_CORE * sum_gj / (G_STEEL * x),
                       2 * two.TAU_SLEEVE * sum_gj / (G_BRONZE * two.KT * (x + 0.01)))

        stock = [0.030, 0.035, 0.040, 0.045, 0.050, 0.055]
        first = next(x for x in stock if closed_form(x) >= 1_500.0)
        chosen = round_up_to_stock(stack, Duty.from_arrays(torque=1_500.0), [np.nan], stock, layer=0)
        assert first != stock[0]
        assert chosen.status[0] == StockStatus.FOUND and chosen.size[0] == first
        assert chosen.reserve_factor[0] == pytest.approx(closed_form(first) / 1_500.0, rel=1e-12)

    def test_results_are_frozen(self):
        chosen = round_up_to_stock(solid(), Duty.from_arrays(torque=1.0), [np.nan], [0.05])
        with pytest.raises(dataclasses.FrozenInstanceError):
            chosen.size = np.zeros(1)  # type: ignore[misc]


class TestRestoreRules:
    def test_default_reach_is_four_times_the_original(self):
        """Twist alone (allowables 10 GPa): the restored sum(GJ) must equal G_c J_0, so
        D^4 = d^4 + (G_c / G_s)(D_0^4 - d^4) (phi = T L / (G J), any mechanics-of-materials
        text). A 60 MPa sleeve on a core turned to 0.9 D_0 needs D = 4.6 D_0: beyond the
        default reach of 4 D_0, within 5 D_0."""
        duty = Duty.from_arrays(length=1.0, twist_limit_angle=math.radians(0.5))
        exact = (0.045**4 + (G_STEEL / 60e6) * (0.05**4 - 0.045**4)) ** 0.25
        assert 4 * 0.05 < exact < 5 * 0.05
        short = restore_sleeve(0.05, 0.0, G_STEEL, 10e9, 0.045, 60e6, 10e9, duty=duty)
        assert short.status[0, 0] == SizingStatus.SHORT_AT_MOST and np.isnan(short.sleeve_outer_diameter[0, 0])
        wider = restore_sleeve(0.05, 0.0, G_STEEL, 10e9, 0.045, 60e6, 10e9, duty=duty, largest=5 * 0.05)
        assert wider.status[0, 0] == SizingStatus.SOLVED
        assert exact * (1 - 1e-9) <= wider.sleeve_outer_diameter[0, 0] <= exact + TOL + EPS

    def test_results_are_frozen(self):
        result = restore_sleeve(0.05, 0.0, G_STEEL, 100e6, 0.044, G_STEEL, 100e6)
        with pytest.raises(dataclasses.FrozenInstanceError):
            result.status = np.zeros((1, 1))  # type: ignore[misc]
