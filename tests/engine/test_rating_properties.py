"""Properties of rate() with hypothesis: invariants any correct torsion rating must keep."""

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import Duty, LayerStack, rate

SETTINGS = settings(max_examples=150, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])

finite = dict(allow_nan=False, allow_infinity=False)


@st.composite
def parts(draw, min_layers=1, max_layers=4):
    """One valid part: a solid or bored core and touching tubes, as layer lists."""
    n = draw(st.integers(min_layers, max_layers))
    core = draw(st.floats(0.005, 0.3, **finite))
    bore = draw(st.one_of(st.just(0.0), st.floats(0.05, 0.9, **finite))) * core
    walls = draw(st.lists(st.floats(0.0005, 0.05, **finite), min_size=n - 1, max_size=n - 1))
    outer = [core]
    for wall in walls:
        outer.append(outer[-1] + 2 * wall)
    inner = [bore] + outer[:-1]
    modulus = draw(st.lists(st.floats(5e9, 120e9, **finite), min_size=n, max_size=n))
    allowable = draw(st.lists(st.floats(5e6, 600e6, **finite), min_size=n, max_size=n))
    kt = draw(st.lists(st.floats(1.0, 3.0, **finite), min_size=n, max_size=n))
    return dict(outer_diameter=outer, inner_diameter=inner, shear_modulus=modulus,
                allowable_shear=allowable, stress_concentration=kt)


torques = st.floats(1e-3, 1e6, **finite)


@SETTINGS
@given(parts(), torques)
def test_shares_sum_to_one(part, torque):
    """The layers carry the whole torque (equilibrium)."""
    rating = rate(LayerStack.from_layers(**part), Duty.from_arrays(torque=torque))
    assert rating.valid[0]
    assert np.nansum(rating.share[0]) == pytest.approx(1.0, rel=1e-12)
    assert np.nansum(rating.layer_torque[0]) == pytest.approx(torque, rel=1e-12)


@SETTINGS
@given(parts(), st.data())
def test_splitting_a_layer_changes_no_limit(part, data):
    """Two touching layers of the same material are one layer: sum(GJ), the governing
    limit and the outer piece's capacity are unchanged; the inner piece's capacity is
    higher, its outer radius being smaller."""
    n = len(part["outer_diameter"])
    slot = data.draw(st.integers(0, n - 1), label="slot")
    fraction = data.draw(st.floats(0.05, 0.95, **finite), label="fraction")
    lo, hi = part["inner_diameter"][slot], part["outer_diameter"][slot]
    cut = lo + fraction * (hi - lo)
    split = {key: list(values) for key, values in part.items()}
    for key in split:
        split[key].insert(slot, split[key][slot])
    split["outer_diameter"][slot] = cut
    split["inner_diameter"][slot + 1] = cut
    duty = Duty.from_arrays(torque=100.0)
    whole = rate(LayerStack.from_layers(**part), duty)
    pieces = rate(LayerStack.from_layers(**split), duty)
    assert pieces.valid[0]
    assert pieces.sum_gj[0] == pytest.approx(whole.sum_gj[0], rel=1e-9)
    assert pieces.governing_capacity[0] == pytest.approx(whole.governing_capacity[0], rel=1e-9)
    assert pieces.capacity[0, slot + 1] == pytest.approx(whole.capacity[0, slot], rel=1e-9)
    # same ΣGJ, G, τa and Kt: the capacity goes as 1/r_o, so the inner piece's is higher by D_o/cut
    assert pieces.capacity[0, slot] == pytest.approx(whole.capacity[0, slot] * hi / cut, rel=1e-9)
    assert pieces.capacity[0, slot] > whole.capacity[0, slot]


@SETTINGS
@given(parts(), st.floats(0.1, 10.0, **finite))
def test_scaling_diameters_scales_capacity_by_cube(part, scale):
    """T_cap = tau_a sum(GJ) / (G r_o Kt): sum(GJ) ~ s^4, r_o ~ s, so T_cap ~ s^3."""
    scaled = dict(part)
    scaled["outer_diameter"] = [d * scale for d in part["outer_diameter"]]
    scaled["inner_diameter"] = [d * scale for d in part["inner_diameter"]]
    duty = Duty.from_arrays(torque=1.0)
    base = rate(LayerStack.from_layers(**part), duty)
    big = rate(LayerStack.from_layers(**scaled), duty, contact_abs_tol=0.0)
    np.testing.assert_allclose(big.capacity[0], base.capacity[0] * scale**3, rtol=1e-9)
    assert big.governing_capacity[0] == pytest.approx(base.governing_capacity[0] * scale**3, rel=1e-9)


@SETTINGS
@given(parts(), torques, st.floats(0.05, 10.0, **finite),
       st.one_of(st.none(), st.floats(1e-4, 0.5, **finite)),
       st.one_of(st.none(), st.floats(1e-5, 0.5, **finite)))
def test_governing_is_the_smallest_capacity(part, torque, length, angle, per_length):
    """The governing limit is never above any single capacity, and equals one of them."""
    duty = Duty.from_arrays(torque=torque, length=length,
                            twist_limit_angle=np.nan if angle is None else angle,
                            twist_limit_per_length=np.nan if per_length is None else per_length)
    rating = rate(LayerStack.from_layers(**part), duty)
    candidates = list(rating.capacity[0])
    candidates.append(np.inf if angle is None else angle * rating.sum_gj[0] / length)
    candidates.append(np.inf if per_length is None else per_length * rating.sum_gj[0])
    governing = rating.governing_capacity[0]
    assert all(governing <= c * (1 + 1e-12) for c in candidates)
    assert governing == pytest.approx(min(candidates), rel=1e-12)
    assert governing <= rating.twist_capacity[0]
    assert rating.reserve_factor[0] == pytest.approx(governing / torque, rel=1e-12)


def _padded(part_list, width):
    fields = ("outer_diameter", "inner_diameter", "shear_modulus", "allowable_shear", "stress_concentration")
    arrays = {f: np.full((len(part_list), width), np.nan) for f in fields}
    for row, part in enumerate(part_list):
        for f in fields:
            arrays[f][row, :len(part[f])] = part[f]
    return LayerStack.from_arrays(**arrays)


@SETTINGS
@given(st.lists(parts(), min_size=1, max_size=8), st.data())
def test_one_part_alone_equals_the_same_part_in_a_batch(part_list, data):
    """Same code path for one row: padding, neighbours and batch size change nothing."""
    torque = data.draw(st.lists(torques, min_size=len(part_list), max_size=len(part_list)))
    batch = rate(_padded(part_list, 5), Duty.from_arrays(torque=torque, length=1.5))
    for row, part in enumerate(part_list):
        alone = rate(LayerStack.from_layers(**part), Duty.from_arrays(torque=torque[row], length=1.5))
        n = len(part["outer_diameter"])
        for name in ("gj", "share", "layer_torque", "stress_outer", "stress_inner", "capacity", "utilisation"):
            np.testing.assert_allclose(getattr(batch, name)[row, :n], getattr(alone, name)[0], rtol=1e-14)
            assert np.isnan(getattr(batch, name)[row, n:]).all()
        for name in ("sum_gj", "twist_per_length", "twist_angle", "governing_capacity", "margin",
                     "governing_criterion", "governing_layer", "part_flags", "valid"):
            np.testing.assert_allclose(getattr(batch, name)[row], getattr(alone, name)[0], rtol=1e-14)


def _expected_valid(part, abs_tol=1e-5, rel_tol=2e-4):
    """Independent oracle: the issue's validity rules, one layer at a time in plain Python."""
    layers = list(zip(*(part[f] for f in ("outer_diameter", "inner_diameter", "shear_modulus",
                                          "allowable_shear", "stress_concentration"))))
    for i, (do, di, g, ta, kt) in enumerate(layers):
        if not all(np.isfinite(v) for v in (do, di, g, ta, kt)):
            return False
        if not (do > 0 and 0 <= di < do and g > 0 and ta > 0 and kt >= 1):
            return False
        if i and (di == 0 or abs(di - layers[i - 1][0]) > max(abs_tol, rel_tol * layers[i - 1][0])):
            return False
    return True


corruptions = st.sampled_from([
    ("outer_diameter", -1.0), ("outer_diameter", 0.0), ("inner_diameter", -1e-3),
    ("inner_diameter", 1.5), ("shear_modulus", 0.0), ("shear_modulus", np.nan),
    ("allowable_shear", -5.0), ("allowable_shear", np.inf), ("stress_concentration", 0.5),
    ("inner_diameter", 1.0 + 5e-5), ("inner_diameter", 1.0 - 3e-4), ("inner_diameter", 0.0),
])


@SETTINGS
@given(st.lists(st.tuples(parts(min_layers=2), st.lists(st.tuples(corruptions, st.integers(0, 3)),
                                                        max_size=2)), min_size=1, max_size=12))
def test_validity_matches_an_independent_oracle(cases):
    """The batch screen and the detailed checks agree with the rules written out per layer.
    Corruptions scale diameters relative to the layer below, so gaps land both inside and
    outside the tolerance."""
    part_list = []
    for part, changes in cases:
        part = {k: list(v) for k, v in part.items()}
        n = len(part["outer_diameter"])
        for (field, value), slot in changes:
            slot = slot % n
            if field == "inner_diameter" and value > 0 and slot:
                value = value * part["outer_diameter"][slot - 1]
            elif field == "inner_diameter" and value > 0:
                value = value * part["outer_diameter"][slot]
            part[field][slot] = value
        part_list.append(part)
    rating = rate(_padded(part_list, 4), Duty.from_arrays(torque=1.0, length=1.0))
    assert rating.valid.tolist() == [_expected_valid(p) for p in part_list]
    assert (rating.valid == (rating.layer_flags == 0).all(axis=1)).all()
