"""Contact pressures of stacks of two to five Lamé cylinders against an independent solution of the
contact problem, and the rules for absent slots, holes and unusable layers.

Oracle: `_lame_oracle.py` (Lamé displacements in plane stress, Shigley; every set of closed
interfaces tried with numpy.linalg.solve, an independent numerical method), not the module's
tridiagonal form. Stacks are random but seeded; materials span aluminium to steel (invented values).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from _lame_oracle import closed_system as _closed_system
from _lame_oracle import oracle
from twistshare.engine.core import LayerStack, fit_pressure, rate_interfaces, stack_fit_pressures


def _random_stacks(rng, n_layers, count):
    do, di, e, nu, delta = (np.empty((count, n_layers)) for _ in range(5))
    for i in range(count):
        bore = rng.choice([0.0, rng.uniform(0.005, 0.02)])
        walls = rng.uniform(0.003, 0.012, n_layers)
        edges = bore + np.concatenate([[0.0], np.cumsum(2 * walls)])
        di[i], do[i] = edges[:-1], edges[1:]
        e[i] = rng.choice([71.7e9, 111e9, 190e9, 207e9], n_layers)
        nu[i] = rng.uniform(0.26, 0.35, n_layers)
        delta[i] = np.concatenate([[np.nan], rng.uniform(-40e-6, 60e-6, n_layers - 1)])  # clearances too
    return do, di, e, nu, delta


@pytest.mark.parametrize("n_layers", [2, 3, 4, 5])
def test_random_stacks_against_the_contact_oracle(n_layers):
    rng = np.random.default_rng(20261203 + n_layers)
    do, di, e, nu, delta = _random_stacks(rng, n_layers, 60)
    pressure, opened = stack_fit_pressures(do, di, np.ones_like(do, bool), e, nu, delta)
    assert np.isnan(pressure[:, 0]).all() and not opened[:, 0].any()
    some_open = 0
    reclosed = 0
    for i in range(len(do)):
        p, is_open = oracle(do[i], di[i], e[i], nu[i], delta[i])
        np.testing.assert_allclose(pressure[i, 1:], p, rtol=1e-9, atol=1e-3, err_msg=str(i))
        assert opened[i, 1:].tolist() == is_open.tolist(), i
        some_open += bool(is_open.any())
        # an interface that pulls when all are closed but is closed in the answer: it had to close again
        p_all = np.linalg.solve(*_closed_system(do[i], di[i], e[i], nu[i], delta[i]))
        reclosed += bool(((p_all < 0) & ~is_open).any() and is_open.any())
    assert some_open >= 5  # the contact path is exercised
    if n_layers >= 4:
        assert reclosed >= 1  # and so is closing again



def test_a_clearance_between_two_layers_opens():
    # two layers with a diametral clearance: no pressure, the interface open
    p, opened = stack_fit_pressures([[0.04, 0.06]], [[0.0, 0.04]], [[True, True]], [[207e9, 111e9]],
                                    [[0.292, 0.34]], [[np.nan, -10e-6]])
    assert p[0, 1] == 0.0 and opened[0, 1]


def test_two_layers_match_the_two_cylinder_formula():
    # Shigley's two-cylinder interference-fit pressure, through the module's own point function
    p, _ = stack_fit_pressures([[0.04, 0.06]], [[0.01, 0.04]], [[True, True]], [[207e9, 111e9]],
                               [[0.292, 0.34]], [[np.nan, 30e-6]])
    assert p[0, 1] == pytest.approx(fit_pressure(30e-6, 0.04, 0.01, 0.06, 207e9, 0.292, 111e9, 0.34), rel=1e-12)


def _batch(parts, n_slots):
    """Rows of (do, di, e, nu, delta, present) padded to n_slots with numbers left in absent slots."""
    filler = dict(do=0.2, di=0.19, e=200e9, nu=0.3, delta=25e-6)
    arrays = {k: np.full((len(parts), n_slots), v) for k, v in filler.items()}
    present = np.zeros((len(parts), n_slots), bool)
    for i, (do, di, e, nu, delta, here) in enumerate(parts):
        for k in range(len(do)):
            arrays["do"][i, k], arrays["di"][i, k], arrays["e"][i, k], arrays["nu"][i, k] = do[k], di[k], e[k], nu[k]
            arrays["delta"][i, k] = delta[k]
        present[i, : len(do)] = True if here is None else here
    return arrays["do"], arrays["di"], present, arrays["e"], arrays["nu"], arrays["delta"]


THREE = ([0.03, 0.05, 0.062], [0.0, 0.03, 0.05], [207e9, 71.7e9, 190e9], [0.292, 0.33, 0.305], [np.nan, 40e-6, -40e-6])
TWO = ([0.04, 0.06], [0.01, 0.04], [207e9, 111e9], [0.292, 0.34], [np.nan, 30e-6])


@pytest.mark.parametrize("n_slots", [3, 4, 5])
def test_absent_slots_holding_numbers_do_not_count(n_slots):
    parts = [(*THREE, None), (*TWO, None)]
    args = _batch(parts, n_slots)
    p, opened = stack_fit_pressures(*args)
    for i, (do, di, e, nu, delta, _) in enumerate(parts):
        want, want_open = oracle(do, di, e, nu, delta)
        np.testing.assert_allclose(p[i, 1:len(do)], want, rtol=1e-9, atol=1e-3)
        assert opened[i, 1:len(do)].tolist() == want_open.tolist()
        assert np.isnan(p[i, len(do):]).all() and not opened[i, len(do):].any()
    assert opened[0, 2]  # the three-layer part's clearance opens: the contact path ran with absent slots


def test_a_hole_makes_both_its_interfaces_absent():
    # slots 0, 2, 3 present, 1 absent: interfaces 1 and 2 have a missing member; 3 is the pair 2-3 alone
    do, di = [0.03, 0.04, 0.05, 0.062], [0.0, 0.03, 0.04, 0.05]
    e, nu = [207e9, 207e9, 71.7e9, 190e9], [0.292, 0.292, 0.33, 0.305]
    for last in (30e-6, -12e-6):  # a fit, and a clearance (the contact path)
        delta = [np.nan, 20e-6, 35e-6, last]
        parts = [(do, di, e, nu, delta, [True, False, True, True]), (*THREE, None)]
        p, opened = stack_fit_pressures(*_batch(parts, 4))
        assert np.isnan(p[0, :3]).all() and not opened[0, :3].any()
        pair, pair_open = oracle(do[2:], di[2:], e[2:], nu[2:], [np.nan, last])
        assert p[0, 3] == pytest.approx(pair[0], rel=1e-9, abs=1e-3) and opened[0, 3] == pair_open[0]
        assert pair_open[0] == (last < 0)


# one bad value per row, each in another slot; the last row is good. The rules: 0 < E < inf,
# -1 < nu <= 0.5, 0 <= D_i < D_o (the module's stated ranges).
BAD = [("e", 0, 0.0), ("nu", 1, -1.0), ("nu", 2, 0.6), ("e", 1, math.inf), ("di", 0, -0.001), ("di", 2, 0.07),
       ("e", 2, -5e9), ("nu", 0, math.nan)]


@pytest.mark.parametrize("pulling", [False, True])
@pytest.mark.parametrize("full", [True, False])
def test_unusable_layers_give_nan(full, pulling):
    rows = []
    for field, slot, value in BAD + [(None, None, None)]:
        do, di, e, nu = (list(v) for v in THREE[:4])
        delta = [np.nan, 40e-6, -40e-6 if pulling else 20e-6]
        target = {"e": e, "nu": nu, "di": di}.get(field)
        if target is not None:
            target[slot] = value
        rows.append((do, di, e, nu, delta, None))
    args = list(_batch(rows, 3 if full else 4))
    p, _ = stack_fit_pressures(*args)
    for i in range(len(BAD)):
        assert np.isnan(p[i]).all(), BAD[i]
    want, _ = oracle(*(np.array(v, float) for v in (THREE[0], THREE[1], THREE[2], THREE[3])),
                     [np.nan, 40e-6, -40e-6 if pulling else 20e-6])
    np.testing.assert_allclose(p[-1, 1:3], want, rtol=1e-9, atol=1e-3)
    assert want[1] == 0.0 if pulling else want[1] > 0.0  # the clearance opens: the contact path ran


def test_edges_of_the_ranges_are_usable():
    # nu = 0.5 (incompressible) and a bore of exactly 0 are inside the ranges, also on the contact path
    do, di = [0.03, 0.05, 0.062], [0.0, 0.03, 0.05]
    e, nu = [207e9, 3e9, 190e9], [0.292, 0.5, 0.305]
    for last in (20e-6, -40e-6):
        delta = [np.nan, 40e-6, last]
        p, opened = stack_fit_pressures([do], [di], [[True] * 3], [e], [nu], [delta])
        want, want_open = oracle(do, di, e, nu, delta)
        np.testing.assert_allclose(p[0, 1:], want, rtol=1e-9, atol=1e-3)
        assert opened[0, 1:].tolist() == want_open.tolist()
        assert want_open[1] == (last < 0)  # the clearance opens: the contact path ran


def test_the_interface_record_has_no_pressure_at_slot_0():
    stack = LayerStack.from_arrays([THREE[0]] * 3, [THREE[1]] * 3, 79.3e9, 100e6)
    got = rate_interfaces(stack, youngs_modulus=[THREE[2]], poisson_ratio=[THREE[3]],
                          interference=[THREE[4]], fit_length=0.03, friction=0.12, yield_strength=300e6)
    assert np.isnan(got.pressure[:, 0]).all()
    assert np.isfinite(got.pressure[:, 1:]).all()


@pytest.mark.parametrize("field, slot, value", [*BAD, ("nu", 1, -1.5)])
def test_one_unusable_layer_beside_a_good_part_gives_nan_for_its_part_only(field, slot, value):
    # a batch of two full parts, the second with one value out of range: the batch as a whole
    # is not all good, yet no other bad row is there to give that away
    do, di, e, nu = (list(v) for v in THREE[:4])
    {"e": e, "nu": nu, "di": di}[field][slot] = value
    delta = [np.nan, 40e-6, 20e-6]
    p, _ = stack_fit_pressures(*_batch([(*THREE[:4], delta, None), (do, di, e, nu, delta, None)], 3))
    assert np.isnan(p[1]).all()
    want, _ = oracle(*(np.array(v, float) for v in THREE[:4]), delta)
    np.testing.assert_allclose(p[0, 1:], want, rtol=1e-9)


def test_any_positive_modulus_is_usable_on_the_contact_path():
    # 0 < E is the whole rule: E = 0.5 Pa as for steel. The outer clearance opens, leaving the
    # inner fit alone; same material, solid core: p = E delta (D_o^2 - d^2)/(2 d D_o^2)
    # (Shigley's Mechanical Engineering Design, interference fits, same-material form).
    # A two-layer part beside it leaves a slot absent, so the batch is checked part by part.
    three = ([0.03, 0.05, 0.062], [0.0, 0.03, 0.05], [0.5] * 3, [0.3] * 3, [np.nan, 40e-6, -40e-6])
    p, opened = stack_fit_pressures(*_batch([(*three, None), (*TWO, None)], 3))
    expected = 0.5 * 40e-6 * (0.05**2 - 0.03**2) / (2 * 0.03 * 0.05**2)
    assert p[0, 1] == pytest.approx(expected, rel=1e-12)
    assert p[0, 2] == 0.0 and opened[0, 2] and not opened[0, 1]
    assert p[1, 1] == pytest.approx(fit_pressure(30e-6, 0.04, 0.01, 0.06, 207e9, 0.292, 111e9, 0.34), rel=1e-12)


@pytest.mark.parametrize("last", [20e-6, -40e-6])  # the first pass, and the contact path
def test_a_missing_innermost_slot_leaves_the_stack_above_it_alone(last):
    # slot 0 absent (its numbers left in): the tube and three sleeves above it are rated alone
    do, di = [0.02, 0.03, 0.05, 0.062, 0.075], [0.0, 0.02, 0.03, 0.05, 0.062]
    e, nu = [207e9, 207e9, 71.7e9, 190e9, 200e9], [0.292, 0.292, 0.33, 0.305, 0.29]
    delta = [np.nan, 15e-6, 40e-6, 30e-6, last]
    parts = [(do, di, e, nu, delta, [False, True, True, True, True]), (*THREE, None)]
    p, opened = stack_fit_pressures(*_batch(parts, 5))
    want, want_open = oracle(*(np.array(v[1:], float) for v in (do, di, e, nu)), [np.nan, 40e-6, 30e-6, last])
    assert np.isnan(p[0, :2]).all()
    np.testing.assert_allclose(p[0, 2:], want, rtol=1e-9, atol=1e-3)
    assert opened[0, 2:].tolist() == want_open.tolist()


def test_two_pairs_on_either_side_of_a_hole_are_two_separate_fits():
    # slots 0-1 and 3-4 present, 2 absent: each pair is Shigley's two-cylinder fit alone
    do, di = [0.03, 0.05, 0.06, 0.07, 0.09], [0.0, 0.03, 0.05, 0.06, 0.07]
    e, nu = [207e9, 111e9, 200e9, 190e9, 71.7e9], [0.292, 0.34, 0.3, 0.305, 0.33]
    delta = [np.nan, 30e-6, 10e-6, 10e-6, 45e-6]
    parts = [(do, di, e, nu, delta, [True, True, False, True, True]), (*TWO, None)]
    p, _ = stack_fit_pressures(*_batch(parts, 5))
    assert p[0, 1] == pytest.approx(fit_pressure(30e-6, 0.03, 0.0, 0.05, 207e9, 0.292, 111e9, 0.34), rel=1e-12)
    assert p[0, 4] == pytest.approx(fit_pressure(45e-6, 0.07, 0.06, 0.09, 190e9, 0.305, 71.7e9, 0.33), rel=1e-12)
    assert np.isnan(p[0, [0, 2, 3]]).all()


def test_a_touching_sleeve_outside_an_open_clearance_is_not_opened():
    # a clearance at the inner interface leaves the middle layer free; the outer sleeve just
    # touches it (no interference): nothing pulls it apart, so it is closed at zero pressure,
    # not opened (opened means it would otherwise be in radial tension)
    p, opened = stack_fit_pressures([[0.03, 0.05, 0.062]], [[0.0, 0.03, 0.05]], [[True] * 3],
                                    [[207e9, 71.7e9, 190e9]], [[0.292, 0.33, 0.305]], [[np.nan, -20e-6, np.nan]])
    assert p[0, 1:].tolist() == [0.0, 0.0]
    assert opened[0].tolist() == [False, True, False]
