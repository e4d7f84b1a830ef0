"""A layer's fit stresses with torsion, against the thick-walled-cylinder equations written out here.

Oracle: Shigley's Mechanical Engineering Design (10th ed.), §3-16 "Stresses in pressurized
cylinders", eqs. (3-49): for a cylinder of inner radius a and outer radius b under an internal
pressure p_i and an external pressure p_o,

    sigma_t(r) = (p_i a^2 - p_o b^2 - a^2 b^2 (p_o - p_i) / r^2) / (b^2 - a^2)
    sigma_r(r) = (p_i a^2 - p_o b^2 + a^2 b^2 (p_o - p_i) / r^2) / (b^2 - a^2)

the torsional shear of a layer in a compound section tau = G r T / sum(G J) (one twist for all
layers, any mechanics-of-materials text), and distortion energy (von Mises) for a plane stress
state with one shear, sigma' = sqrt(st^2 - st sr + sr^2 + 3 tau^2), against S_y / FS (Shigley
§5-5). The capacity is the section torque at which the first face of the layer reaches that;
the pressures are given directly, so the module's own shape-factor form is not reused.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from twistshare.engine.core import layer_fit_stress_capacity


def _lame(a: float, b: float, p_i: float, p_o: float, r: float) -> tuple[float, float]:
    """Shigley eq. (3-49): hoop and radial stress at radius r (a = 0 is a solid cylinder)."""
    if a == 0.0:  # solid: uniform state, sigma_t = sigma_r = -p_o
        return -p_o, -p_o
    k = a * a * b * b * (p_o - p_i) / (r * r)
    wall = b * b - a * a
    return (p_i * a * a - p_o * b * b - k) / wall, (p_i * a * a - p_o * b * b + k) / wall


def _face_torque(st: float, sr: float, limit: float, g: float, r: float, sum_gj: float) -> float:
    room = limit * limit - (st * st - st * sr + sr * sr)
    if room <= 0.0:
        return 0.0
    tau = math.sqrt(room / 3.0)
    return tau * sum_gj / (g * r)


def _by_hand(do, di, g, p, sy, fs):
    """Per layer: (capacity, face) by the equations above; p[k] is the pressure between layers k-1 and k."""
    n = len(do)
    sum_gj = sum(g[k] * math.pi * (do[k] ** 4 - di[k] ** 4) / 32.0 for k in range(n))
    out = []
    for k in range(n):
        a, b = di[k] / 2.0, do[k] / 2.0
        p_i = p[k] if k > 0 else 0.0
        p_o = p[k + 1] if k + 1 < n else 0.0
        limit = sy[k] / fs[k] if fs[k] else math.nan  # only the sum of G J is wanted from a bad row
        faces = []
        if a > 0.0:
            faces.append(_face_torque(*_lame(a, b, p_i, p_o, a), limit, g[k], a, sum_gj))
        else:
            faces.append(math.inf)
        faces.append(_face_torque(*_lame(a, b, p_i, p_o, b), limit, g[k], b, sum_gj))
        out.append((min(faces), int(faces[1] < faces[0])))
    return out, sum_gj


def _call(do, di, g, p, sy, fs, present=None):
    row = lambda v: np.array([v], dtype=float)  # noqa: E731
    present = np.ones((1, len(do)), bool) if present is None else np.array([present])
    _, sum_gj = _by_hand(do, di, g, p, sy, fs)
    return layer_fit_stress_capacity(row(do), row(di), present, row(g), np.array([sum_gj]),
                                     row(p), row(sy), row(fs))


# A hollow steel core, a bronze sleeve and a steel jacket (diameters in m, G in Pa, pressures in
# Pa, yield in Pa); invented demo values, the pressures chosen rather than solved for.
DO3, DI3 = [0.040, 0.052, 0.060], [0.020, 0.040, 0.052]
G3 = [79.3e9, 44.0e9, 79.3e9]
SY3, FS3 = [350e6, 250e6, 420e6], [1.5, 2.0, 1.25]


def test_middle_layer_squeezed_from_both_sides():
    # the middle layer is loaded on both faces: its inner-face hoop stress carries both pressures
    p = [math.nan, 40e6, 25e6]
    capacity, face = _call(DO3, DI3, G3, p, SY3, FS3)
    hand, _ = _by_hand(DO3, DI3, G3, [0.0, 40e6, 25e6], SY3, FS3)
    for k, (t, f) in enumerate(hand):
        assert capacity[0, k] == pytest.approx(t, rel=1e-12), k
        assert face[0, k] == f, k


def test_four_layers_three_fits():
    do, di = [0.030, 0.040, 0.050, 0.056], [0.0, 0.030, 0.040, 0.050]
    g = [79.3e9, 26.0e9, 44.0e9, 79.3e9]
    sy, fs = [500e6, 160e6, 260e6, 420e6], [1.5, 1.5, 1.5, 1.5]
    p = [0.0, 30e6, 22e6, 12e6]
    capacity, face = _call(do, di, g, p, sy, fs)
    hand, _ = _by_hand(do, di, g, p, sy, fs)
    assert capacity[0].tolist() == pytest.approx([t for t, _ in hand], rel=1e-12)
    assert face[0].tolist() == [f for _, f in hand]
    assert all(t > 0.0 for t, _ in hand)  # each layer has room left: the torque term decides


def test_a_zero_strength_or_factor_gives_no_capacity_beside_a_weak_but_positive_one():
    # the rule: a strength and a factor of safety must be positive; a tiny positive strength is
    # still a strength (here the fit alone exceeds it: capacity 0, a result, not NaN)
    p = [0.0, 40e6, 25e6]
    for sy, fs in (([0.0, 250e6, 0.5], FS3), ([350e6, 250e6, 0.5], [1.5, 0.0, 1.25])):
        capacity, face = _call(DO3, DI3, G3, p, sy, fs)
        bad = 0 if sy[0] == 0.0 else 1
        assert math.isnan(capacity[0, bad]) and face[0, bad] == -1
        assert capacity[0, 2] == 0.0 and face[0, 2] != -1
        good = 1 - bad
        assert capacity[0, good] == pytest.approx(_by_hand(DO3, DI3, G3, p, [350e6, 250e6, 1.0], [1.5, 2.0, 1.25])[0]
                                                  [good][0], rel=1e-12)


def test_an_absent_slot_with_numbers_left_in_it_is_not_rated():
    # numbers left in an empty slot are not a layer: NaN, face -1; the present layers keep theirs
    p = [0.0, 40e6, 25e6]
    capacity, face = _call(DO3, DI3, G3, p, SY3, FS3, present=[True, True, False])
    assert math.isnan(capacity[0, 2]) and face[0, 2] == -1
    assert np.isfinite(capacity[0, :2]).all() and (face[0, :2] >= 0).all()


def test_a_zero_strength_beside_an_absent_slot_still_has_no_face():
    # both reasons for no capacity in one part: the absent slot and a present layer without a strength
    p = [0.0, 40e6, 25e6]
    capacity, face = _call(DO3, DI3, G3, p, [0.0, 250e6, 420e6], FS3, present=[True, True, False])
    assert math.isnan(capacity[0, 0]) and face[0, 0] == -1
    assert math.isnan(capacity[0, 2]) and face[0, 2] == -1
    assert np.isfinite(capacity[0, 1]) and face[0, 1] in (0, 1)
