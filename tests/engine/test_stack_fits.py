"""Fits in a stack of layers, checked against an independent finite-element solution."""

import doctest
import math

import numpy as np
import pytest
import twistshare.engine.core._stack_fits as stack_fits_module
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    combined_stress_capacity,
    fit_hoop_stresses,
    fit_pressure,
    lame_stresses,
    layer_fit_stress_capacity,
    stack_fit_pressures,
)

SETTINGS = settings(max_examples=40, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)

_GAUSS_X, _GAUSS_W = np.polynomial.legendre.leggauss(6)


def fe_stack(outer, inner, youngs, poisson, interference, closed, elements=60):
    """Independent numerical method: axisymmetric plane-stress finite elements (quadratic,
    6-point Gauss-Legendre from numpy), each layer meshed on its own, every closed interface
    tied by a Lagrange multiplier u_out(a) - u_in(b) = delta / 2. The multiplier is the
    contact force, 2 pi R p per unit length. Returns the pressures and a function giving
    (sigma_r, sigma_t) at the inner or outer face of a layer."""
    n_layers = len(outer)
    per_layer = 2 * elements + 1
    size = n_layers * per_layer
    stiffness = np.zeros((size, size))
    for layer in range(n_layers):
        a, b = inner[layer] / 2, outer[layer] / 2
        e, nu = youngs[layer], poisson[layer]
        d = e / (1 - nu**2) * np.array([[1, nu], [nu, 1]])
        nodes = np.linspace(a, b, per_layer)
        for el in range(elements):
            idx = layer * per_layer + 2 * el + np.arange(3)
            r3 = nodes[2 * el:2 * el + 3]
            jac = (r3[2] - r3[0]) / 2
            for xi, w in zip(_GAUSS_X, _GAUSS_W):
                shape = np.array([xi * (xi - 1) / 2, 1 - xi**2, xi * (xi + 1) / 2])
                slope = np.array([xi - 0.5, -2 * xi, xi + 0.5]) / jac
                r = shape @ r3
                strain = np.vstack([slope, shape / r])
                stiffness[np.ix_(idx, idx)] += strain.T @ d @ strain * 2 * math.pi * r * w * jac
    rows, rhs = [], []
    if inner[0] == 0:
        row = np.zeros(size)
        row[0] = 1.0
        rows.append(row)
        rhs.append(0.0)
    ties = []
    for k in range(1, n_layers):
        if not closed[k]:
            continue
        row = np.zeros(size)
        row[k * per_layer] = 1.0
        row[k * per_layer - 1] = -1.0
        rows.append(row)
        rhs.append(interference[k] / 2)
        ties.append(k)
    c = np.array(rows)
    system = np.block([[stiffness, c.T], [c, np.zeros((len(rows), len(rows)))]])
    solution = np.linalg.solve(system, np.concatenate([np.zeros(size), rhs]))
    u, multipliers = solution[:size], solution[size:]
    offset = 1 if inner[0] == 0 else 0
    pressure = np.zeros(n_layers)
    for j, k in enumerate(ties):
        # K u + C^T lambda = 0: the force on the outer member's bore is -lambda.
        pressure[k] = -multipliers[offset + j] / (2 * math.pi * inner[k] / 2)

    def face_stress(layer, outer_face):
        a, b = inner[layer] / 2, outer[layer] / 2
        e, nu = youngs[layer], poisson[layer]
        h = (b - a) / elements
        base = layer * per_layer + (2 * elements - 2 if outer_face else 0)
        u3 = u[base:base + 3]
        xi = 1.0 if outer_face else -1.0
        slope = np.array([xi - 0.5, -2 * xi, xi + 0.5]) @ u3 / (h / 2)
        r = b if outer_face else a
        value = np.array([xi * (xi - 1) / 2, 1 - xi**2, xi * (xi + 1) / 2]) @ u3
        hoop_strain = value / r
        return (e / (1 - nu**2) * (slope + nu * hoop_strain),
                e / (1 - nu**2) * (hoop_strain + nu * slope))

    return pressure, u, face_stress


def _stack(outer, inner, youngs, poisson, interference):
    return stack_fit_pressures([outer], [inner], [[True] * len(outer)], [youngs], [poisson],
                               [interference])


def test_docstring_examples():
    assert doctest.testmod(stack_fits_module).failed == 0


class TestAgainstFiniteElements:
    @pytest.mark.parametrize("bore", [0.0, 0.02])
    @pytest.mark.parametrize("materials", [((207e9, 0.292), (111e9, 0.349)),
                                           ((68.9e9, 0.33), (190e9, 0.305))])
    def test_two_cylinders(self, bore, materials):
        """Two different materials: the stack solution, the two-cylinder formula (Shigley's
        Mechanical Engineering Design, interference fits) and the finite elements agree
        (rtol 1e-6, the elements' error)."""
        (ei, nui), (eo, nuo) = materials
        outer, inner = [0.05, 0.075], [bore, 0.05]
        fe, _, face = fe_stack(outer, inner, [ei, eo], [nui, nuo], [0, 45e-6], [False, True])
        p, opened = _stack(outer, inner, [ei, eo], [nui, nuo], [np.nan, 45e-6])
        closed_form = fit_pressure(45e-6, 0.05, bore, 0.075, ei, nui, eo, nuo)
        assert p[0, 1] == pytest.approx(closed_form, rel=1e-12)
        assert p[0, 1] == pytest.approx(fe[1], rel=1e-6)
        assert not opened.any()
        # Hoop stresses at the interface agree with the elements' too.
        hoop_outer, hoop_inner = fit_hoop_stresses(p[0, 1], 0.05, bore, 0.075)
        assert face(1, False)[1] == pytest.approx(hoop_outer, rel=1e-4)
        assert face(0, True)[1] == pytest.approx(hoop_inner, rel=1e-4)

    @pytest.mark.parametrize("bore", [0.0, 0.015])
    def test_three_layers_two_fits(self, bore):
        """Two fits in one part squeeze each other: the stack solution matches the finite
        elements (rtol 1e-6), and the two-cylinder formula alone would not (> 5 % off)."""
        outer, inner = [0.04, 0.052, 0.062], [bore, 0.04, 0.052]
        youngs, poisson = [207e9, 111e9, 190e9], [0.292, 0.349, 0.305]
        delta = [0.0, 30e-6, 40e-6]
        fe, _, face = fe_stack(outer, inner, youngs, poisson, delta, [False, True, True])
        p, opened = _stack(outer, inner, youngs, poisson, [np.nan, 30e-6, 40e-6])
        np.testing.assert_allclose(p[0, 1:], fe[1:], rtol=1e-6)
        assert not opened.any()
        alone = fit_pressure(30e-6, 0.04, bore, 0.052, 207e9, 0.292, 111e9, 0.349)
        assert abs(alone / p[0, 1] - 1) > 0.05
        # Each layer's face stresses from its two pressures (Lamé) match the elements'.
        pressures = [0.0, p[0, 1], p[0, 2], 0.0]
        # A free face's zero radial stress holds only weakly in the elements: 1e-3 of p there.
        floor = 1e-3 * max(pressures)
        for layer in range(3):
            for outer_face in (False, True):
                r = (outer if outer_face else inner)[layer] / 2
                if r == 0:
                    continue
                radial, hoop = lame_stresses(r, inner[layer], outer[layer], pressures[layer],
                                             pressures[layer + 1])
                fe_radial, fe_hoop = face(layer, outer_face)
                assert fe_hoop == pytest.approx(hoop, rel=1e-4, abs=floor)
                assert fe_radial == pytest.approx(radial, rel=1e-4, abs=floor)

    def test_an_interface_that_would_pull_opens(self):
        """A clearance inside a tight outer fit: closed, the inner interface would be in
        tension; the stack solution opens it, and the elements with that interface free
        agree on the outer pressure and show the gap stays open."""
        outer, inner = [0.03, 0.05, 0.08], [0.0, 0.03, 0.05]
        youngs, poisson = [207e9, 100e9, 207e9], [0.3, 0.3, 0.3]
        p, opened = _stack(outer, inner, youngs, poisson, [np.nan, -30e-6, 40e-6])
        assert opened[0, 1] and p[0, 1] == 0.0
        fe, u, _ = fe_stack(outer, inner, youngs, poisson, [0, -30e-6, 40e-6],
                            [False, False, True])
        assert p[0, 2] == pytest.approx(fe[2], rel=1e-6)
        per_layer = len(u) // 3
        closure = u[per_layer] - u[per_layer - 1]
        assert closure > -30e-6 / 2  # the bore is further out than the clearance needs


class TestClosedForms:
    def test_same_material_solid_core_is_hydrostatic(self):
        """Two touching layers of one material are one solid bar: the outer fit's pressure is
        the two-cylinder one on a solid of that diameter, and inside a solid under external
        pressure sigma_r = sigma_t = -p throughout (Lamé; Timoshenko & Goodier, thick
        cylinder), so the inner interface carries the same p. rtol 1e-12."""
        p, _ = _stack([0.03, 0.05, 0.08], [0.0, 0.03, 0.05], [207e9] * 3, [0.3] * 3,
                      [np.nan, np.nan, 40e-6])
        expected = fit_pressure(40e-6, 0.05, 0.0, 0.08, 207e9, 0.3, 207e9, 0.3)
        assert p[0, 2] == pytest.approx(expected, rel=1e-12)
        assert p[0, 1] == pytest.approx(expected, rel=1e-12)

    def test_same_material_hollow_core(self):
        """Hollow core of bore a under the outer fit's pressure q at b: at radius R the
        radial stress is -q b^2 (R^2 - a^2) / (R^2 (b^2 - a^2)) (Lamé). rtol 1e-12."""
        a, big_r, b = 0.01, 0.015, 0.025
        p, _ = _stack([2 * big_r, 2 * b, 0.08], [2 * a, 2 * big_r, 2 * b], [207e9] * 3, [0.3] * 3,
                      [np.nan, np.nan, 40e-6])
        q = fit_pressure(40e-6, 2 * b, 2 * a, 0.08, 207e9, 0.3, 207e9, 0.3)
        assert p[0, 2] == pytest.approx(q, rel=1e-12)
        assert p[0, 1] == pytest.approx(q * b**2 * (big_r**2 - a**2) / (big_r**2 * (b**2 - a**2)),
                                        rel=1e-12)

    def test_absent_slots_and_bad_layers(self):
        p, _ = stack_fit_pressures([[0.05, 0.08, np.nan], [0.05, 0.08, 0.09]],
                                   [[0.0, 0.05, np.nan], [0.0, 0.05, 0.08]],
                                   [[True, True, False], [True, True, True]],
                                   [[207e9, 207e9, np.nan], [207e9, -1.0, 207e9]],
                                   [[0.3, 0.3, np.nan], [0.3, 0.3, 0.3]],
                                   [[np.nan, 40e-6, np.nan], [np.nan, 40e-6, 10e-6]])
        assert p[0, 1] > 0 and np.isnan(p[0, 2]) and np.isnan(p[0, 0])
        assert np.isnan(p[1]).all()


@SETTINGS
@given(st.floats(1e-6, 80e-6, **finite), st.floats(1e-6, 80e-6, **finite),
       st.floats(0.5, 2.0, **finite))
def test_fits_add_while_all_stay_closed(first, second, modulus_ratio):
    """Linear elasticity: with every interface closed, the pressures of two fits together
    are the sum of each alone (superposition)."""
    outer, inner = [0.04, 0.052, 0.062], [0.0, 0.04, 0.052]
    youngs, poisson = [207e9, 207e9 * modulus_ratio, 190e9], [0.29, 0.33, 0.3]
    both, _ = _stack(outer, inner, youngs, poisson, [np.nan, first, second])
    one, _ = _stack(outer, inner, youngs, poisson, [np.nan, first, 0.0])
    two, _ = _stack(outer, inner, youngs, poisson, [np.nan, 0.0, second])
    np.testing.assert_allclose(both[0, 1:], one[0, 1:] + two[0, 1:], rtol=1e-9)


class TestLayerFitStress:
    def test_two_layer_faces_by_hand(self):
        """The brief's two surfaces by hand: outer member's bore sigma_t = p (d_o^2 + d^2) /
        (d_o^2 - d^2), sigma_r = -p, tau = G_o r theta'; solid core's surface sigma_t =
        sigma_r = -p, tau = G_i r theta'; von Mises sqrt(st^2 + sr^2 - st sr + 3 tau^2).
        The sleeve's outer face is checked too. rtol 1e-12."""
        d, do, p = 0.05, 0.07, 30e6
        g_in, g_out = 79.3e9, 41.4e9
        gj = g_in * math.pi * d**4 / 32 + g_out * math.pi * (do**4 - d**4) / 32
        sy, fs = [310e6, 250e6], 1.5
        cap, face = layer_fit_stress_capacity([[d, do]], [[0.0, d]], [[True, True]],
                                              [[g_in, g_out]], [gj], [[np.nan, p]], [sy], fs)
        hoop_bore = p * (do**2 + d**2) / (do**2 - d**2)
        hoop_out = 2 * p * d**2 / (do**2 - d**2)
        sleeve = min(combined_stress_capacity(hoop_bore, -p, g_out * d / 2 / gj, sy[1], fs),
                     combined_stress_capacity(hoop_out, 0.0, g_out * do / 2 / gj, sy[1], fs))
        core = combined_stress_capacity(-p, -p, g_in * d / 2 / gj, sy[0], fs)
        assert cap[0, 0] == pytest.approx(core, rel=1e-12) and face[0, 0] == 1
        assert cap[0, 1] == pytest.approx(sleeve, rel=1e-12)

    def test_thin_hollow_core_governed_at_its_bore(self):
        """A thin hollow core under a sleeve's pressure: its bore carries the largest hoop
        compression, -2 p b^2 / (b^2 - a^2) with no radial stress (Lamé; Shigley), and
        governs. rtol 1e-12 against the point functions."""
        a_d, b_d, c_d, p, sy = 0.04, 0.05, 0.06, 50e6, 300e6
        g = [79.3e9, 41.4e9]
        gj = g[0] * math.pi * (b_d**4 - a_d**4) / 32 + g[1] * math.pi * (c_d**4 - b_d**4) / 32
        cap, face = layer_fit_stress_capacity([[b_d, c_d]], [[a_d, b_d]], [[True, True]], [g], [gj],
                                              [[np.nan, p]], [[sy, 900e6]])
        hoop_bore = -2 * p * b_d**2 / (b_d**2 - a_d**2)
        bore = combined_stress_capacity(hoop_bore, 0.0, g[0] * a_d / 2 / gj, sy)
        radial, hoop = lame_stresses(b_d / 2, a_d, b_d, 0.0, p)
        surface = combined_stress_capacity(hoop, radial, g[0] * b_d / 2 / gj, sy)
        assert bore < surface
        assert face[0, 0] == 0 and cap[0, 0] == pytest.approx(bore, rel=1e-12)

    def test_overstressed_fit_has_no_capacity(self):
        cap, face = layer_fit_stress_capacity([[0.05, 0.055]], [[0.0, 0.05]], [[True, True]],
                                              [[79.3e9, 41.4e9]], [1e5], [[np.nan, 200e6]],
                                              [[310e6, 200e6]])
        assert cap[0, 1] == 0.0 and face[0, 1] >= 0


@st.composite
def stacks(draw):
    """A part of 1-3 layers in a batch of width 3: diameters, E, nu, G, Sy and fits (some
    with clearance, so some interfaces open)."""
    n = draw(st.integers(1, 3))
    core = draw(st.floats(0.01, 0.2, **finite))
    bore = draw(st.one_of(st.just(0.0), st.floats(0.1, 0.8, **finite))) * core
    outer = [core]
    for _ in range(n - 1):
        outer.append(outer[-1] * draw(st.floats(1.05, 1.6, **finite)))
    inner = [bore] + outer[:-1]
    row = lambda lo, hi: draw(st.lists(st.floats(lo, hi, **finite), min_size=n, max_size=n))  # noqa: E731
    fits = [np.nan] + [draw(st.one_of(st.just(np.nan), st.floats(-40e-6, 80e-6, **finite)))
                       for _ in range(n - 1)]
    return dict(outer=outer, inner=inner, e=row(60e9, 215e9), nu=row(0.25, 0.36),
                g=row(25e9, 82e9), sy=row(150e6, 900e6), fits=fits)


def _as_batch(parts, width=3):
    def grid(key):
        out = np.full((len(parts), width), np.nan)
        for i, part in enumerate(parts):
            out[i, :len(part[key])] = part[key]
        return out

    present = ~np.isnan(grid("outer"))
    return {key: grid(key) for key in ("outer", "inner", "e", "nu", "g", "sy", "fits")}, present


@SETTINGS
@given(st.lists(stacks(), min_size=1, max_size=6))
def test_fast_pass_agrees_with_the_full_contact_solution_and_rows_stand_alone(parts):
    """The column-by-column first pass (with its fallback) equals the general contact
    solution on every row, and one part alone equals the same part in a batch."""
    from twistshare.engine.core._stack_fits import _solve_with_contact

    b, present = _as_batch(parts)
    args = (b["outer"], b["inner"], present, b["e"], b["nu"], b["fits"])
    pressure, opened = stack_fit_pressures(*args)
    general, general_open = _solve_with_contact(*args[:5], np.nan_to_num(b["fits"], nan=0.0))
    np.testing.assert_allclose(pressure, general, rtol=1e-9, atol=1e-3)
    np.testing.assert_array_equal(opened, general_open)
    for i in range(len(parts)):
        alone, _ = stack_fit_pressures(*(a[i:i + 1] for a in args))
        np.testing.assert_allclose(alone[0], pressure[i], rtol=1e-12, atol=1e-6)
    assert np.all((pressure[:, 1:] >= 0) | np.isnan(pressure[:, 1:]))


@SETTINGS
@given(st.lists(stacks(), min_size=1, max_size=6), st.floats(1.0, 3.0, **finite))
def test_layer_fit_stress_equals_the_point_functions(parts, fs):
    """The column kernel (Lamé faces through the shape factor s) equals the same check
    composed from lame_stresses and combined_stress_capacity at each layer's two faces."""
    b, present = _as_batch(parts)
    pressure, _ = stack_fit_pressures(b["outer"], b["inner"], present, b["e"], b["nu"], b["fits"])
    gj = np.nansum(b["g"] * np.pi / 32 * (b["outer"] ** 4 - b["inner"] ** 4), axis=1)
    cap, face = layer_fit_stress_capacity(b["outer"], b["inner"], present, b["g"], gj, pressure,
                                          b["sy"], fs)
    p = np.nan_to_num(pressure, nan=0.0)
    for i, part in enumerate(parts):
        for j in range(len(part["outer"])):
            p_in = p[i, j] if j > 0 else 0.0
            p_out = p[i, j + 1] if j + 1 < len(part["outer"]) else 0.0
            found = []
            for d in (part["inner"][j], part["outer"][j]):
                if d == 0:
                    found.append(np.inf)
                    continue
                radial, hoop = lame_stresses(d / 2, part["inner"][j], part["outer"][j], p_in, p_out)
                found.append(combined_stress_capacity(hoop, radial, part["g"][j] * d / 2 / gj[i],
                                                      part["sy"][j], fs))
            assert cap[i, j] == pytest.approx(min(found), rel=1e-9, abs=1e-9 * gj[i])
            if abs(found[0] - found[1]) > 1e-6 * max(min(found), 1.0):
                assert face[i, j] == int(found[1] < found[0])
        assert np.isnan(cap[i, len(part["outer"]):]).all()
