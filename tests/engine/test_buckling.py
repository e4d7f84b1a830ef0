"""Torsional buckling of thin tubes (Roark's thin-tube torsion formulas, coefficients from memory)."""

import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._buckling as buckling_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    BUCKLING_KNOCK_DOWN,
    LoadFlag,
    long_tube_buckling_stress,
    moderate_tube_buckling_stress,
    thin_walled,
    torsional_buckling,
    tube_buckling_capacity,
)

SETTINGS = settings(max_examples=100, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)
E, NU = 200e9, 0.3


def test_docstring_examples():
    assert doctest.testmod(buckling_module).failed == 0


def _tube(outer, inner, length, fs=1.0, e=E, nu=NU):
    return torsional_buckling([outer], [inner], [e], [nu], length, fs)


class TestLongTube:
    def test_roark_long_tube_closed_form(self):
        """Roark's Formulas for Stress and Strain, thin tube under torsion, long tube (from
        memory): tau' = E / (3 sqrt 2 (1 - nu^2)^(3/4)) (t/r)^(3/2). Hand-worked for a steel
        tube of 100 mm outside, 1 mm wall, 10 m long: r = 49.5 mm, t/r = 0.020202,
        (t/r)^1.5 = 2.8714e-3, (1 - 0.09)^0.75 = 0.93174, tau' = 0.235702 * 200e9 / 0.93174
        * 2.8714e-3 = 145.27 MPa; times the knock-down 0.67: 97.33 MPa; T = 2 pi r^2 t tau
        = 2 pi * 2.45025e-3 * 1e-3 * 97.33e6 = 1498.4 N m; rtol 5e-4."""
        result = _tube(0.100, 0.098, 10.0)
        assert BUCKLING_KNOCK_DOWN == 0.67
        assert result.critical_stress[0] == pytest.approx(97.33e6, rel=5e-4)
        assert result.critical_torque[0] == pytest.approx(1498.4, rel=5e-4)
        assert result.capacity[0] == result.critical_torque[0]
        assert result.part_flags[0] == 0

    @pytest.mark.parametrize("length", [8.0, 20.0, 100.0])
    def test_long_tubes_do_not_depend_on_length(self, length):
        """Beyond the crossover the long-tube form governs and L drops out (Roark)."""
        reference = _tube(0.100, 0.098, 6.0)
        result = _tube(0.100, 0.098, length)
        assert result.critical_torque[0] == reference.critical_torque[0]
        assert long_tube_buckling_stress(E, NU, 0.0495, 0.001) > moderate_tube_buckling_stress(
            E, NU, 0.0495, 0.001, 6.0)

    def test_factor_of_safety_divides(self):
        result = _tube(0.100, 0.098, 10.0, fs=2.5)
        assert result.capacity[0] == pytest.approx(result.critical_torque[0] / 2.5, rel=1e-12)
        plain = tube_buckling_capacity(E, NU, 0.0495, 0.001, 10.0, 2.5)
        assert plain == pytest.approx(result.capacity[0], rel=1e-12)


class TestModerateLength:
    def test_two_forms_of_the_moderate_length_formula(self):
        """Batdorf's k_s = 0.85 Z^(3/4) (simply supported, from memory) in
        tau = k_s pi^2 E / (12 (1 - nu^2)) (t/L)^2 equals 0.699 E / (1 - nu^2)^(5/8)
        (t/r)^(5/4) (r/L)^(1/2) (hand algebra: 0.85 pi^2 / 12 = 0.6991); at nu = 0.3 the
        coefficient is 0.742, close to Timoshenko and Gere's 0.747 with nu absorbed (from
        memory); rtol 1e-3 and 1 %."""
        r, t, length = 0.1, 0.001, 0.8
        got = moderate_tube_buckling_stress(E, NU, r, t, length)
        closed = 0.6991 * E / (1 - NU**2) ** 0.625 * (t / r) ** 1.25 * (r / length) ** 0.5
        assert got == pytest.approx(closed, rel=1e-3)
        assert got == pytest.approx(0.747 * E * (t / r) ** 1.25 * (r / length) ** 0.5, rel=0.01)

    def test_moderate_length_governs_short_of_the_crossover(self):
        result = _tube(0.200, 0.198, 0.8)
        r, t = 0.0995, 0.001
        expected = BUCKLING_KNOCK_DOWN * moderate_tube_buckling_stress(E, NU, r, t, 0.8)
        assert result.critical_stress[0] == pytest.approx(expected, rel=1e-12)

    def test_short_tube_is_noted(self):
        """Z = L^2 sqrt(1 - nu^2) / (r t) below 50: the formula is used below its range."""
        result = _tube(0.200, 0.196, 0.05)
        assert result.batdorf_z[0] < 50
        assert result.part_flags[0] == LoadFlag.SHORT_TUBE
        assert result.valid[0] and np.isfinite(result.capacity[0])


class TestWalls:
    def test_solid_and_thick_walls_are_not_checked(self):
        """Mean radius over wall below 10 (common practice for thin-shell theory): +inf."""
        result = torsional_buckling([[0.05], [0.05], [0.1]], [[0.0], [0.04], [0.098]],
                                    [[E]], [[NU]], 2.0, 1.0)
        assert result.radius_to_wall[0] == pytest.approx(0.5)
        assert result.radius_to_wall[1] == pytest.approx(4.5)
        assert list(result.capacity[:2]) == [np.inf, np.inf]
        assert list(result.part_flags[:2]) == [LoadFlag.NOT_THIN_WALLED] * 2
        assert np.isfinite(result.capacity[2])

    def test_equivalent_wall_of_one_layer_is_the_layer(self):
        result = _tube(0.1, 0.098, 3.0)
        assert result.wall[0] == pytest.approx(0.001, rel=1e-12)
        assert result.modulus[0] == pytest.approx(E, rel=1e-12)
        assert result.radius[0] == pytest.approx(0.0495, rel=1e-12)

    def test_splitting_a_wall_into_two_layers_changes_nothing(self):
        one = _tube(0.1, 0.097, 3.0)
        two = torsional_buckling([0.0985, 0.1], [0.097, 0.0985], [E, E], [NU, NU], 3.0, 1.0)
        assert two.capacity[0] == pytest.approx(one.capacity[0], rel=1e-12)

    def test_compound_wall_by_hand(self):
        """Equivalent wall of a 1 mm steel tube (E 200 GPa) inside a 1 mm aluminium one
        (E 69 GPa), nu 0.3 both, bore 96 mm. Per unit width, E' = E / 0.91:
        S = (200 + 69) e9 / 0.91 * 1e-3; z_n = (200 * 0.5 + 69 * 1.5) / 269 mm = 0.75651 mm;
        D = E'_s (1/12 + 0.25651^2) + E'_a (1/12 + 0.74349^2) (mm^3);
        t_eq = sqrt(12 D / S), E_eq = S / t_eq * 0.91 (hand algebra)."""
        result = torsional_buckling([0.098, 0.100], [0.096, 0.098], [200e9, 69e9], [NU, NU],
                                    2.0, 1.0)
        zn = (200 * 0.5 + 69 * 1.5) / 269
        d = 200 * (1 / 12 + (0.5 - zn) ** 2) + 69 * (1 / 12 + (1.5 - zn) ** 2)  # GPa mm^3
        t_eq = math.sqrt(12 * d / 269)  # mm
        assert result.wall[0] == pytest.approx(t_eq * 1e-3, rel=1e-12)
        assert result.modulus[0] == pytest.approx(269e9 / t_eq, rel=1e-12)
        assert result.radius[0] == pytest.approx(0.048 + zn * 1e-3, rel=1e-12)
        steel_alone = _tube(0.098, 0.096, 2.0)
        assert result.capacity[0] > steel_alone.capacity[0]


class TestFlags:
    @pytest.mark.parametrize(("args", "flag"), [
        (dict(length=0.0), LoadFlag.LENGTH_NOT_POSITIVE),
        (dict(factor_of_safety=0.0), LoadFlag.STRENGTH_NOT_POSITIVE),
        (dict(youngs_modulus=[0.0]), LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE),
        (dict(poisson_ratio=[0.6]), LoadFlag.POISSON_OUT_OF_RANGE),
    ])
    def test_errors(self, args, flag):
        values = dict(outer_diameter=[0.1], inner_diameter=[0.098], youngs_modulus=[E],
                      poisson_ratio=[NU], length=2.0, factor_of_safety=1.0)
        values.update(args)
        result = torsional_buckling(**values)
        assert result.part_flags[0] & flag
        assert not result.valid[0] and np.isnan(result.capacity[0])


@SETTINGS
@given(st.floats(0.02, 1.0, **finite), st.floats(12.0, 300.0, **finite),
       st.floats(0.05, 30.0, **finite), st.floats(1.01, 5.0, **finite))
def test_longer_never_raises_the_buckling_torque(outer, radius_to_wall, length, factor):
    wall = outer / (2 * radius_to_wall + 1)
    inner = outer - 2 * wall
    short = _tube(outer, inner, length)
    longer = _tube(outer, inner, length * factor)
    assert longer.critical_torque[0] <= short.critical_torque[0] * (1 + 1e-12)


@SETTINGS
@given(st.lists(st.tuples(st.floats(0.02, 1.0, **finite), st.floats(0.5, 0.995, **finite),
                          st.floats(0.1, 20.0, **finite)), min_size=2, max_size=6), st.data())
def test_one_part_alone_equals_the_same_part_in_a_batch(batch, data):
    together = torsional_buckling([[b[0]] for b in batch], [[b[0] * b[1]] for b in batch],
                                  [[E]], [[NU]], [b[2] for b in batch], 1.5)
    pick = data.draw(st.integers(0, len(batch) - 1))
    b = batch[pick]
    alone = _tube(b[0], b[0] * b[1], b[2], fs=1.5)
    assert alone.capacity[0] == together.capacity[pick]
    assert alone.part_flags[0] == together.part_flags[pick]


class TestOneLayerWallAndEdges:
    """One isotropic layer is its own equivalent wall: t, the mean radius, E and nu come back,
    and Batdorf's Z = L^2 sqrt(1 - nu^2) / (r t) (Batdorf 1947, as in NASA SP-8007; from
    memory). A thin steel tube 100/96 mm: t = 2 mm, r = 49 mm, r/t = 24.5."""

    E, NU = 207e9, 0.3

    def _check(self, outer=0.100, inner=0.096, length=1.5, fs=2.0, modulus=None, nu=None, **kw):
        return torsional_buckling([[outer]], [[inner]], [[modulus or self.E]], [[self.NU if nu is None else nu]],
                                  length, fs, **kw)

    def test_the_equivalent_wall_of_one_layer_is_the_layer(self):
        got = self._check()
        t, r, length = 0.002, 0.049, 1.5
        assert got.wall[0] == pytest.approx(t, rel=1e-12)
        assert got.radius[0] == pytest.approx(r, rel=1e-12)
        assert got.modulus[0] == pytest.approx(self.E, rel=1e-12)
        assert got.poisson_ratio[0] == pytest.approx(self.NU, rel=1e-12)
        assert got.radius_to_wall[0] == pytest.approx(r / t, rel=1e-12)
        assert got.batdorf_z[0] == pytest.approx(length**2 * math.sqrt(1 - self.NU**2) / (r * t), rel=1e-12)
        assert got.critical_torque[0] == pytest.approx(2 * math.pi * r * r * t * got.critical_stress[0], rel=1e-12)
        assert got.capacity[0] == pytest.approx(got.critical_torque[0] / 2.0, rel=1e-12)

    def test_an_absent_slot_changes_nothing(self):
        alone = self._check()
        padded = torsional_buckling([[0.100, 0.120]], [[0.096, 0.100]], [[self.E, 70e9]], [[self.NU, 0.33]],
                                    1.5, 2.0, present=[[True, False]])
        for name in ("wall", "radius", "modulus", "poisson_ratio", "batdorf_z", "capacity"):
            assert getattr(padded, name)[0] == pytest.approx(getattr(alone, name)[0], rel=1e-12), name

    def test_the_thin_wall_limit_is_inclusive_and_ten_by_default(self):
        ratio = float(self._check().radius_to_wall[0])
        assert np.isfinite(self._check(thin_wall_ratio=ratio).capacity[0])
        # r/t 10.5 is checked, 9.5 is not (the default limit, 10: common practice)
        for r_over_t, checked in ((10.5, True), (9.5, False)):
            t = 0.002
            r = r_over_t * t
            got = self._check(outer=2 * r + t, inner=2 * r - t)
            assert np.isfinite(got.capacity[0]) == checked
            assert bool(int(got.part_flags[0]) & int(LoadFlag.NOT_THIN_WALLED)) == (not checked)

    def test_a_solid_section_is_never_checked(self):
        got = self._check(inner=0.0, thin_wall_ratio=0.5)  # a solid bar's r/t is 0.5
        assert got.capacity[0] == np.inf and got.critical_torque[0] == np.inf
        assert np.isnan(got.modulus[0]) and np.isnan(got.batdorf_z[0]) and np.isnan(got.critical_stress[0])

    def test_the_short_tube_note_starts_below_z_fifty(self):
        c = math.sqrt(1 - self.NU**2) / (0.049 * 0.002)  # Z per L^2
        for z, short in ((50.5, False), (49.5, True)):
            got = self._check(length=math.sqrt(z / c))
            assert got.batdorf_z[0] == pytest.approx(z, rel=1e-9)
            assert bool(int(got.part_flags[0]) & int(LoadFlag.SHORT_TUBE)) == short

    @pytest.mark.parametrize("kw, flag", [
        ({"modulus": np.inf}, LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE),
        ({"nu": -1.0}, LoadFlag.POISSON_OUT_OF_RANGE), ({"nu": -1.5}, LoadFlag.POISSON_OUT_OF_RANGE),
        ({"nu": 0.5000001}, LoadFlag.POISSON_OUT_OF_RANGE),
        ({"length": np.inf}, LoadFlag.LENGTH_NOT_POSITIVE), ({"fs": np.inf}, LoadFlag.STRENGTH_NOT_POSITIVE),
    ])
    def test_inputs_out_of_range_are_errors(self, kw, flag):
        got = self._check(**kw)
        assert int(got.part_flags[0]) & int(flag) and not bool(got.valid[0])
        assert np.isnan(got.capacity[0])

    @pytest.mark.parametrize("kw", [{"modulus": 0.5}, {"nu": 0.5}, {"nu": -0.9}])
    def test_inputs_at_the_edges_are_rated(self, kw):
        assert bool(self._check(**kw).valid[0])

    @pytest.mark.parametrize("field, position", [("length", 4), ("factor_of_safety", 5)])
    def test_per_part_inputs_of_the_wrong_length_are_named(self, field, position):
        args = [[[0.1], [0.1]], [[0.096], [0.096]], [[self.E], [self.E]], [[self.NU], [self.NU]], 1.5, 2.0]
        args[position] = [1.0, 2.0, 3.0]
        with pytest.raises(ValueError) as error:
            torsional_buckling(*args)
        assert str(error.value) == f"{field} must hold one value or one per part (2); got shape (3,)"

    def test_the_result_is_frozen(self):
        got = self._check()
        with pytest.raises(AttributeError):
            got.capacity = None  # type: ignore[misc]


class TestMixedBatch:
    """Only thin walls are worked out (the others' results are set, not computed): in a batch
    mixing thin, thick, solid and bad parts every field of each part is what the part gives
    alone, and a part not checked has NaN for the wall's figures and +inf torque (the
    module's rule; Roark's thin-shell formulas apply to thin walls only, common practice)."""

    PARTS = [  # outer, inner per layer; E of layer 0; length
        ([0.100, 0.104], [0.098, 0.100], E, 3.0),     # thin two-layer wall: checked
        ([0.100, 0.140], [0.060, 0.100], E, 3.0),     # thick: not thin-walled
        ([0.050, 0.054], [0.000, 0.050], E, 3.0),     # solid core: not checked
        ([0.200, 0.203], [0.198, 0.200], np.nan, 3.0),  # E missing: an error
        ([0.300, 0.302], [0.298, 0.300], E, 0.05),    # thin and short: checked, noted
        ([0.100, 0.104], [0.098, 0.100], E, -1.0),    # bad length: an error
    ]
    FIELDS = ("radius_to_wall", "modulus", "poisson_ratio", "wall", "radius", "batdorf_z",
              "critical_stress", "critical_torque", "capacity", "part_flags", "valid")

    def _rate(self, parts):
        return torsional_buckling([p[0] for p in parts], [p[1] for p in parts],
                                  [[p[2], 70e9] for p in parts], [[NU, 0.33]],
                                  [p[3] for p in parts], 1.5)

    def test_each_part_as_alone(self):
        together = self._rate(self.PARTS)
        for i, part in enumerate(self.PARTS):
            alone = self._rate([part])
            for name in self.FIELDS:
                np.testing.assert_array_equal(getattr(together, name)[i], getattr(alone, name)[0],
                                              err_msg=f"part {i}, {name}")

    def test_what_is_not_checked(self):
        result = self._rate(self.PARTS)
        checked = np.array([True, False, False, False, True, False])
        valid = np.array([True, True, True, False, True, False])
        np.testing.assert_array_equal(result.valid, valid)
        for name in ("modulus", "poisson_ratio", "wall", "radius", "batdorf_z", "critical_stress"):
            values = getattr(result, name)
            assert np.isfinite(values[checked]).all(), name
            assert np.isnan(values[~checked]).all(), name
        torque = result.critical_torque
        assert np.isfinite(torque[checked]).all()
        np.testing.assert_array_equal(torque[~checked & valid], np.inf)
        assert np.isnan(torque[~valid]).all() and np.isnan(result.capacity[~valid]).all()
        np.testing.assert_array_equal(result.capacity[valid], torque[valid] / 1.5)
        assert result.part_flags[1] & LoadFlag.NOT_THIN_WALLED
        assert result.part_flags[2] & LoadFlag.NOT_THIN_WALLED
        assert result.part_flags[4] & LoadFlag.SHORT_TUBE
        assert not result.part_flags[0] & (LoadFlag.SHORT_TUBE | LoadFlag.NOT_THIN_WALLED)

    def test_no_thin_wall_at_all(self):
        result = self._rate([self.PARTS[1], self.PARTS[2]])
        np.testing.assert_array_equal(result.capacity, np.inf)
        assert np.isnan(result.wall).all()


class TestThinWalledScreen:
    """`thin_walled`: hollow, and mean radius over wall at least the limit (10 by default,
    common practice), the same screen `torsional_buckling` checks with."""

    @staticmethod
    def _screen(outer, inner, **kw):
        return thin_walled([outer], [inner], [[True] * len(outer)], **kw)

    def test_hollow_thin_walls_pass_and_the_limit_is_inclusive(self):
        t = 0.002
        for r_over_t, expected in ((10.5, True), (9.5, False), (60.0, True)):
            r = r_over_t * t
            assert self._screen([2 * r + t], [2 * r - t]).tolist() == [expected]
        outer, inner = [0.104], [0.096]
        ratio = float(torsional_buckling([outer], [inner], [E], [NU], 1.0, 1.0).radius_to_wall[0])
        assert self._screen(outer, inner, thin_wall_ratio=ratio).tolist() == [True]
        assert self._screen(outer, inner, thin_wall_ratio=ratio * (1 + 1e-12)).tolist() == [False]

    def test_solid_and_thick_sections_fail(self):
        assert self._screen([0.100], [0.0]).tolist() == [False]
        assert self._screen([0.100], [0.0], thin_wall_ratio=0.0).tolist() == [False]  # no bore
        assert self._screen([0.100], [0.060]).tolist() == [False]  # r/t = 2, hollow

    def test_agrees_with_the_buckling_flag_part_by_part(self):
        rng = np.random.default_rng(3)
        core = rng.uniform(0.02, 0.5, 400)
        bore = np.where(rng.random(400) < 0.2, 0.0, core * rng.uniform(0.5, 0.995, 400))
        sleeve = core + 2 * rng.uniform(0.0002, 0.01, 400)
        outer, inner = np.stack([core, sleeve], 1), np.stack([bore, core], 1)
        present = np.ones((400, 2), bool)
        present[::7, 1] = False
        screen = thin_walled(outer, inner, present)
        result = torsional_buckling(outer, inner, [[E, 70e9]], [[NU, 0.33]], 2.0, 1.0, present=present)
        not_thin = (result.part_flags & int(LoadFlag.NOT_THIN_WALLED)) != 0
        np.testing.assert_array_equal(screen, ~not_thin)
        assert 20 < screen.sum() < 380  # both kinds in the sample

    def test_the_whole_wall_counts_not_the_core_alone(self):
        """Mean radius over wall of the compound wall, by hand: bore radius a, outside b,
        (a + b) / (2 (b - a)). A thin core under a thick sleeve is thick as a whole."""
        result = torsional_buckling([[0.100, 0.104]], [[0.096, 0.100]], [[E, E]], [[NU, NU]], 2.0, 1.0)
        assert result.radius_to_wall[0] == pytest.approx((0.048 + 0.052) / (2 * 0.004), rel=1e-12)
        assert self._screen([0.100, 0.104], [0.096, 0.100]).tolist() == [True]
        # core 100/98 alone: r/t 49.5; with a sleeve to 120: (0.049 + 0.06) / 0.022 = 4.95
        assert self._screen([0.100, 0.120], [0.098, 0.100]).tolist() == [False]
        assert self._screen([0.100, 0.120, 0.122], [0.098, 0.100, 0.120]).tolist() == [False]
