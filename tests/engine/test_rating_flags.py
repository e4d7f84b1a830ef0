"""The diagnoses `rate` gives each layer and part (engine/core/_rating_flags.py): exact flags at
the edges of each rule.

The rules are common practice for a shaft's inputs: diameters, moduli and allowables must be
positive, a bore at least zero and below its outer diameter, Kt at least 1, each layer outside
the one below it and touching it, no empty slot between layers, a torque not negative, a length
and twist limits positive. Each test builds a batch where one part sits just inside or just
outside one rule, beside a good part, so the fast screen and the detailed check both run.
"""

from __future__ import annotations

import numpy as np
import pytest
from twistshare.engine.core import Duty, LayerFlag, LayerStack, PartFlag, rate

G, TAU = 79.3e9, 80e6  # steel (Shigley's table A-5: G 79.3 GPa); an allowable


def _stack(rows):
    """rows: per part, per slot (outer, inner, G, allowable, Kt) or None for an empty slot."""
    n_slots = max(len(r) for r in rows)
    def grid(k, blank):
        return [[(s[k] if s is not None else blank) for s in r] + [blank] * (n_slots - len(r)) for r in rows]
    present = [[s is not None for s in r] + [False] * (n_slots - len(r)) for r in rows]
    return LayerStack(outer_diameter=grid(0, np.nan), inner_diameter=grid(1, np.nan),
                      shear_modulus=grid(2, np.nan), allowable_shear=grid(3, np.nan),
                      stress_concentration=grid(4, np.nan), present=present)


def _duty(n, torque=100.0, length=0.5, angle=np.nan, per_length=np.nan):
    def col(v):
        return list(v) if isinstance(v, (list, tuple)) else [v] * n
    return Duty(torque=col(torque), length=col(length), twist_limit_angle=col(angle),
                twist_limit_per_length=col(per_length))


GOOD = [(0.040, 0.0, G, TAU, 1.0), (0.050, 0.040, G, TAU, 1.0)]


def _layer_flags(part):
    r = rate(_stack([GOOD, part]), _duty(2))
    assert r.layer_flags[0].tolist() == [0, 0] and bool(r.valid[0])
    return [LayerFlag(int(f)) for f in r.layer_flags[1]], bool(r.valid[1])


@pytest.mark.parametrize("slot, k, value, flag", [
    (0, 2, 0.5, None), (0, 2, 0.0, LayerFlag.MODULUS_NOT_POSITIVE),          # G > 0
    (1, 3, 0.5, None), (1, 3, 0.0, LayerFlag.ALLOWABLE_NOT_POSITIVE),        # allowable > 0
    (1, 4, 1.0, None), (1, 4, 0.999, LayerFlag.KT_BELOW_ONE),                # Kt >= 1
    (0, 0, 0.040, None), (0, 0, -0.040, LayerFlag.OUTER_NOT_POSITIVE),
])
def test_value_rules_at_their_edges(slot, k, value, flag):
    part = [list(GOOD[0]), list(GOOD[1])]
    part[slot][k] = value
    if (slot, k, value) == (0, 0, -0.040):
        part[0][1] = -0.050  # keep the bore below the outer diameter: only the sign is wrong
    flags, valid = _layer_flags([tuple(p) for p in part])
    if flag is None:
        assert flags == [0, 0] and valid
    else:
        assert flag in flags[slot] and not valid


def test_solid_layer_outside_another_is_flagged():
    flags, valid = _layer_flags([(0.040, 0.0, G, TAU, 1.0), (0.050, 0.0, G, TAU, 1.0)])
    assert LayerFlag.SOLID_NOT_INNERMOST in flags[1] and not valid


def test_touching_within_the_tolerance_and_a_gap_beyond_it():
    # contact within the larger of 0.01 mm and 0.02 % of the diameter (the rating's tolerance)
    flags, valid = _layer_flags([(0.040, 0.0, G, TAU, 1.0), (0.050, 0.040 + 0.009e-3, G, TAU, 1.0)])
    assert flags == [0, 0] and valid
    flags, valid = _layer_flags([(0.040, 0.0, G, TAU, 1.0), (0.050, 0.040 + 0.02e-3, G, TAU, 1.0)])
    assert flags[1] == LayerFlag.GAP_BELOW and not valid


@pytest.mark.parametrize("part, holes", [
    ([None, (0.050, 0.040, G, TAU, 1.0)], [0]),
    ([(0.040, 0.0, G, TAU, 1.0), None, (0.060, 0.050, G, TAU, 1.0)], [1]),
    ([(0.040, 0.0, G, TAU, 1.0), None, None, (0.070, 0.060, G, TAU, 1.0)], [1, 2]),
    ([(0.040, 0.0, G, TAU, 1.0), (0.050, 0.040, G, TAU, 1.0), None, None], []),  # empty outer slots: fine
])
def test_an_empty_slot_between_layers_is_a_hole(part, holes):
    r = rate(_stack([GOOD, part]), _duty(2))
    got = [k for k, f in enumerate(r.layer_flags[1].tolist()) if LayerFlag(f) & LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS]
    assert got == holes
    assert bool(r.valid[1]) == (not holes)
    assert bool(r.valid[0])
    no_layers = bool(PartFlag(int(r.part_flags[1])) & PartFlag.NO_LAYERS)
    assert not no_layers  # the part has layers, in whichever slot


def test_a_part_whose_only_layer_is_not_in_the_first_slot_has_layers():
    r = rate(_stack([GOOD, [None, None, (0.060, 0.0, G, TAU, 1.0)]]), _duty(2))
    assert not PartFlag(int(r.part_flags[1])) & PartFlag.NO_LAYERS
    r = rate(_stack([GOOD, [None, None]]), _duty(2))
    assert PartFlag(int(r.part_flags[1])) & PartFlag.NO_LAYERS


@pytest.mark.parametrize("duty, flag", [
    (dict(torque=[100.0, 0.0]), None),                  # no torque: rated, an infinite reserve
    (dict(torque=[100.0, 0.5]), None),
    (dict(torque=[100.0, -0.5]), PartFlag.TORQUE_NEGATIVE),
    (dict(per_length=[np.nan, 0.0]), PartFlag.TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE),
    (dict(per_length=[np.nan, 0.01]), None),
    (dict(angle=[np.nan, 0.0]), PartFlag.TWIST_LIMIT_NOT_POSITIVE),
    (dict(length=[0.5, 0.0]), PartFlag.LENGTH_NOT_POSITIVE),
])
def test_duty_rules_at_their_edges(duty, flag):
    r = rate(_stack([GOOD, GOOD]), _duty(2, **duty))
    assert int(r.part_flags[0]) == 0
    got = PartFlag(int(r.part_flags[1]))
    if flag is None:
        assert got == 0
    else:
        assert flag in got


def test_detailed_check_flags_only_what_is_wrong():
    # A row the screen rejects (Kt below 1 on the sleeve) goes through every rule one by one:
    # a tiny but positive G and allowable on the core are not errors.
    flags, valid = _layer_flags([(0.040, 0.0, 0.5, 0.5, 1.0), (0.050, 0.040, G, TAU, 0.99)])
    assert flags == [0, LayerFlag.KT_BELOW_ONE] and not valid


def test_a_solid_layer_on_a_very_thin_core_is_still_flagged():
    # 5 µm core: the sleeve's zero bore is within the contact tolerance of it (0.01 mm), yet a
    # solid layer outside another is an error
    flags, valid = _layer_flags([(5e-6, 0.0, G, TAU, 1.0), (0.050, 0.0, G, TAU, 1.0)])
    assert flags[1] == LayerFlag.SOLID_NOT_INNERMOST and not valid


def test_a_hole_is_found_when_the_empty_slot_still_holds_numbers():
    # a slot marked absent keeps the values a template left in it; the layers either side of
    # it touch through those numbers, yet the slot is empty
    stack = LayerStack(outer_diameter=[[0.040, 0.050, 0.060], [0.040, 0.050, 0.060]],
                       inner_diameter=[[0.0, 0.040, 0.050], [0.0, 0.040, 0.050]],
                       shear_modulus=[[G] * 3] * 2, allowable_shear=[[TAU] * 3] * 2,
                       stress_concentration=[[1.0] * 3] * 2,
                       present=[[True, True, True], [True, False, True]])
    r = rate(stack, _duty(2))
    assert r.layer_flags[0].tolist() == [0, 0, 0]
    assert [LayerFlag(int(f)) for f in r.layer_flags[1]] == [0, LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS, 0]
    assert r.valid.tolist() == [True, False]


def test_an_empty_first_slot_below_a_layer_of_three():
    r = rate(_stack([GOOD + [(0.060, 0.050, G, TAU, 1.0)], [None, (0.050, 0.040, G, TAU, 1.0), None]]), _duty(2))
    holes = [k for k, f in enumerate(r.layer_flags[1].tolist()) if LayerFlag(f) & LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS]
    assert holes == [0]


def test_batch_with_one_layer_parts_still_screens_the_others():
    # a one-layer part beside two-layer ones (some slots absent): a 1 mm gap and a Kt below 1
    # are still found, and the gap is reported as written (inner minus the outer below it)
    one = [(0.040, 0.0, G, TAU, 1.0)]
    gap = [(0.040, 0.0, G, TAU, 1.0), (0.050, 0.041, G, TAU, 1.0)]
    low_kt = [(0.040, 0.0, G, TAU, 0.99), (0.050, 0.040, G, TAU, 1.0)]
    r = rate(_stack([one, GOOD, gap, low_kt]), _duty(4))
    flags = [[LayerFlag(int(f)) for f in row] for row in r.layer_flags]
    assert flags[0] == [0, 0] and flags[1] == [0, 0]
    assert flags[2] == [0, LayerFlag.GAP_BELOW]
    assert flags[3] == [LayerFlag.KT_BELOW_ONE, 0]
    assert r.valid.tolist() == [True, True, False, False]
    assert np.isnan(r.interface_gap[0, 1])
    assert r.interface_gap[1, 1] == 0.0
    assert r.interface_gap[2, 1] == pytest.approx(0.001, abs=1e-12)
