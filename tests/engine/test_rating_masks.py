"""``rate`` over a batch that mixes a two-layer part, a one-layer part in the same two slots and a part in
error, with one duty for all: each against the compound-shaft closed forms, and the masking rules.

Oracle: twist compatibility of concentric layers that twist as one (any mechanics-of-materials text,
e.g. Gere & Goodno, Mechanics of Materials, composite bars in torsion): J = pi (D^4 - d^4) / 32,
theta' = T / sum(G J), T_i = G_i J_i theta', tau_i = G_i (D_o,i / 2) theta', layer capacity
tau_a,i sum(G J) / (G_i D_o,i / 2). The masking rules are the record's stated ones: per-layer arrays are
NaN where the slot is absent or the part is not valid, a part in error has NaN results, no governing
criterion and layer -1. Parts are invented (BRIEF §4).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from twistshare.engine.core import Criterion, Duty, LayerStack, rate

# slot 2 of the one-layer part keeps numbers (left in a sheet) but is absent
DO = [[0.040, 0.050], [0.045, 0.055], [0.040, 0.050]]
DI = [[0.000, 0.040], [0.010, 0.045], [0.000, 0.040]]
G = [[79.3e9, 41.4e9], [26.9e9, 79.3e9], [-79.3e9, 41.4e9]]  # the third part: G not positive
TAU = [[140e6, 80e6], [90e6, 100e6], [140e6, 80e6]]
PRESENT = [[True, True], [True, False], [True, True]]
TORQUE = 1500.0


def _j(d_out, d_in):
    return math.pi * (d_out ** 4 - d_in ** 4) / 32.0


def _rated():
    stack = LayerStack.from_arrays(DO, DI, G, TAU, present=PRESENT)
    return rate(stack, Duty.from_arrays(torque=[TORQUE], length=[0.8]))  # one duty for all three


def test_each_valid_part_by_the_closed_forms():
    r = _rated()
    assert r.valid.tolist() == [True, True, False]
    for i, slots in ((0, (0, 1)), (1, (0,))):
        gj = [G[i][k] * _j(DO[i][k], DI[i][k]) for k in slots]
        total = sum(gj)
        assert r.sum_gj[i] == pytest.approx(total, rel=1e-13)
        theta = TORQUE / total
        caps = []
        for k, g_j in zip(slots, gj):
            assert r.gj[i, k] == pytest.approx(g_j, rel=1e-13)
            assert r.layer_torque[i, k] == pytest.approx(g_j * theta, rel=1e-12)
            assert r.stress_outer[i, k] == pytest.approx(G[i][k] * DO[i][k] / 2 * theta, rel=1e-12)
            caps.append(TAU[i][k] * total / (G[i][k] * DO[i][k] / 2))
            assert r.capacity[i, k] == pytest.approx(caps[-1], rel=1e-12)
        assert r.governing_capacity[i] == pytest.approx(min(caps), rel=1e-12)
        assert r.governing_layer[i] == int(np.argmin(caps))
        assert r.governing_criterion[i] == int(Criterion.LAYER_STRESS)
        assert r.twist_angle[i] == pytest.approx(theta * 0.8, rel=1e-12)


def test_an_absent_slot_is_nan_even_with_numbers_in_it():
    r = _rated()
    for name in ("gj", "share", "layer_torque", "stress_outer", "stress_inner", "capacity", "utilisation"):
        assert math.isnan(getattr(r, name)[1, 1]), name
        assert np.isfinite(getattr(r, name)[1, 0]), name


def test_a_part_in_error_has_no_results():
    r = _rated()
    for name in ("gj", "share", "layer_torque", "stress_outer", "stress_inner", "capacity"):
        assert np.isnan(getattr(r, name)[2]).all(), name
    assert math.isnan(r.sum_gj[2]) and math.isnan(r.governing_capacity[2]) and math.isnan(r.margin[2])
    assert r.governing_criterion[2] == int(Criterion.NONE) and r.governing_layer[2] == -1
    for criterion, values in r.criterion_capacity.items():
        if values.ndim == 1:
            assert math.isnan(values[2]), criterion


def test_one_duty_for_all_equals_the_duty_repeated():
    stack = LayerStack.from_arrays(DO, DI, G, TAU, present=PRESENT)
    repeated = rate(stack, Duty.from_arrays(torque=[TORQUE] * 3, length=[0.8] * 3))
    one = _rated()
    for item in dataclasses.fields(one):
        a, b = getattr(one, item.name), getattr(repeated, item.name)
        if item.name == "criterion_capacity":
            assert a.keys() == b.keys()
            for k in a:
                np.testing.assert_array_equal(a[k], b[k])
        else:
            assert a.shape == b.shape, item.name
            np.testing.assert_array_equal(a, b, err_msg=item.name)


def test_a_duty_of_another_size_is_refused_in_words():
    stack = LayerStack.from_arrays(DO, DI, G, TAU, present=PRESENT)
    with pytest.raises(ValueError) as caught:
        rate(stack, Duty.from_arrays(torque=[1.0, 2.0]))
    assert str(caught.value) == "duty has 2 parts; expected 1 or 3 like the layer stack"


def test_the_rating_cannot_be_changed():
    r = _rated()
    with pytest.raises(dataclasses.FrozenInstanceError):
        r.margin = np.zeros(3)
    with pytest.raises(ValueError):
        r.capacity[0, 0] = 1.0
    with pytest.raises(TypeError):
        r.criterion_capacity[Criterion.LAYER_STRESS] = np.zeros(3)
    with pytest.raises(ValueError):
        r.criterion_capacity[Criterion.LAYER_STRESS][0] = 1.0
