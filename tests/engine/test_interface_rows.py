"""A mixed catalogue of sleeved parts rated in one call, each part checked against a hand
calculation written here: fitted, bonded, hot, idle, badly given, two and three layers side by
side. Whatever the block's fast paths do, every part must come out as if worked by hand.

Sources of the hand calculations:
- Lamé's thick-walled cylinders in plane stress (Shigley's Mechanical Engineering Design,
  interference fits; Timoshenko, Strength of Materials, thick-walled cylinders): radial
  displacement u(r) = r/E [(1 - nu) A + (1 + nu) B / r^2] with A = (p_i a^2 - p_o b^2)/(b^2 - a^2)
  and B = a^2 b^2 (p_i - p_o)/(b^2 - a^2); u = -(1 - nu) p_o r / E for a solid member. Each
  interface closes half its diametral interference: u_outer(R) - u_inner(R) = delta/2. The
  pressures of a whole stack come from the tests' own contact oracle (`_lame_oracle.py`: those
  compatibility equations solved with numpy's dense solver, an independent numerical method;
  the engine uses its own tridiagonal elimination).
- Slip torque (pi/2) mu p d^2 L and average bond shear torque (pi/2) tau L d^2 (a cylinder of
  diameter d and length L carrying shear on its surface: T = tau pi d L d/2).
- Torque shares G J / sum(G J) with J = pi (d_o^4 - d_i^4)/32 (twist compatibility, Roark's
  Formulas for Stress and Strain); a core-driven interface passes the torque of every layer
  outside it (the load-path rule of BRIEF section 2).
- Thermal change of a diametral interference: (alpha_inner - alpha_outer) dT d (common
  practice: each member grows by alpha dT d).
Material values are typical handbook figures for a 1045 steel and a phosphor bronze (from
memory), used as inputs only; the part sizes are invented.
"""

import math

import numpy as np
import pytest
from _lame_oracle import oracle
from twistshare.engine.core import InterfaceFlag, LayerStack, LoadPath, rate_interfaces

NAN = np.nan
STEEL = dict(g=79.3e9, e=207e9, nu=0.292, alpha=11.7e-6, sy=310e6)
BRONZE = dict(g=41.4e9, e=111e9, nu=0.349, alpha=17.8e-6, sy=250e6)
OUTER_STEEL = dict(g=77.5e9, e=200e9, nu=0.29, alpha=12.0e-6, sy=350e6)
TWO = [0.05, 0.062]
THREE = [0.05, 0.062, 0.075]
WIDTH = 3
CORE, EVERY, UNKNOWN = int(LoadPath.THROUGH_CORE), int(LoadPath.THROUGH_EVERY_LAYER), 99


def _part(outer, materials, **slots):
    """One part: per-slot lists padded to WIDTH with NaN; `slots` maps an input to {slot: value}."""
    n = len(outer)
    pad = lambda values: list(values) + [NAN] * (WIDTH - len(values))  # noqa: E731
    part = dict(outer=pad(outer), inner=pad([0.0] + outer[:-1]), n=n,
                path=slots.pop("path", CORE), heat=slots.pop("heat", NAN))
    for key in ("g", "e", "nu", "alpha", "sy"):
        part[key] = pad([m[key] for m in materials])
    for key, value in slots.pop("override", {}).items():  # {(key, slot): value}
        part[key[0]][key[1]] = value
    for key in ("interference", "fit_length", "friction", "bond_allowable", "bond_length"):
        row = [NAN] * WIDTH
        for slot, value in slots.pop(key, {}).items():
            row[slot] = value
        part[key] = row
    assert not slots, slots
    return part


def _fit(slot=1, delta=40e-6, length=0.03, mu=0.12):
    return dict(interference={slot: delta}, fit_length={slot: length}, friction={slot: mu})


def _both_fits(mu1=0.12, mu2=0.12):
    return dict(interference={1: 30e-6, 2: 35e-6}, fit_length={1: 0.03, 2: 0.025},
                friction={1: mu1, 2: mu2})


CATALOGUE = {
    "A fitted sleeve": _part(TWO, [STEEL, BRONZE], **_fit()),
    "B three layers, inner fit only": _part(THREE, [STEEL, BRONZE, OUTER_STEEL], **_fit(delta=30e-6)),
    "C bonded sleeve": _part(TWO, [STEEL, BRONZE], bond_allowable={1: 20e6}, bond_length={1: 0.04}),
    "D unknown load path": _part(TWO, [STEEL, BRONZE], path=UNKNOWN, **_fit()),
    "E no friction": _part(TWO, [STEEL, BRONZE], **_fit(mu=0.0)),
    "F endless fit": _part(TWO, [STEEL, BRONZE], **_fit(length=np.inf)),
    "G every layer, hot, contact lost": _part(TWO, [STEEL, BRONZE], path=EVERY, heat=100.0,
                                              **_fit(delta=20e-6)),
    "H fitted, 50 K hot": _part(TWO, [STEEL, BRONZE], heat=50.0, **_fit()),
    "J fitted, cold, no expansion given": _part(TWO, [STEEL, BRONZE], **_fit(),
                                                override={("alpha", 0): NAN, ("alpha", 1): NAN}),
    "K hot, core expansion missing, two fits": _part(THREE, [STEEL, BRONZE, OUTER_STEEL], heat=50.0,
                                                     **_both_fits(), override={("alpha", 0): NAN}),
    "K2 hot, core expansion missing, outer fit only": _part(
        THREE, [STEEL, BRONZE, OUTER_STEEL], heat=50.0, **_fit(slot=2, delta=35e-6),
        override={("alpha", 0): NAN}),
    "L fitted, sleeve E missing": _part(TWO, [STEEL, BRONZE], **_fit(), override={("e", 1): NAN}),
    "M every layer, bond allowable zero": _part(TWO, [STEEL, BRONZE], path=EVERY,
                                                bond_allowable={1: 0.0}, bond_length={1: 0.04}),
    "M2 every layer, no friction": _part(TWO, [STEEL, BRONZE], path=EVERY, **_fit(mu=0.0)),
    "N two fits, the inner without friction": _part(THREE, [STEEL, BRONZE, OUTER_STEEL],
                                                    **_both_fits(mu1=0.0)),
    "O two bonds, the inner with no allowable": _part(
        THREE, [STEEL, BRONZE, OUTER_STEEL], bond_allowable={1: 0.0, 2: 15e6}, bond_length={1: 0.04, 2: 0.03}),
    "P fitted, core yield missing": _part(TWO, [STEEL, BRONZE], **_fit(), override={("sy", 0): NAN}),
}
NAMES = list(CATALOGUE)


def _rate(parts):
    grid = lambda key: [p[key] for p in parts]  # noqa: E731
    stack = LayerStack.from_arrays(grid("outer"), grid("inner"), grid("g"), 1e8)
    return rate_interfaces(
        stack, youngs_modulus=grid("e"), poisson_ratio=grid("nu"), yield_strength=grid("sy"),
        expansion_coefficient=grid("alpha"), interference=grid("interference"),
        fit_length=grid("fit_length"), friction=grid("friction"),
        bond_allowable=grid("bond_allowable"), bond_length=grid("bond_length"),
        load_path=[p["path"] for p in parts],
        operating_temperature=[293.15 + p["heat"] if not math.isnan(p["heat"]) else NAN for p in parts],
        reference_temperature=293.15)


@pytest.fixture(scope="module")
def batch():
    return _rate(CATALOGUE.values())


def _row(name):
    return NAMES.index(name)


# ---- hand calculations -------------------------------------------------------------------

def _pressures(part, deltas):
    """Contact pressures of every interface by the shared oracle (`_lame_oracle.py`); every
    case here keeps all its interfaces closed."""
    n = part["n"]
    columns = (np.array(part[key][:n], float) for key in ("outer", "inner", "e", "nu"))
    p, opened = oracle(*columns, [np.nan, *deltas])
    assert not opened.any()
    return p


def _shares(part):
    n = part["n"]
    gj = [part["g"][k] * math.pi / 32 * (part["outer"][k] ** 4 - part["inner"][k] ** 4) for k in range(n)]
    return [v / sum(gj) for v in gj]


def _passing_core_driven(part, k):
    return sum(_shares(part)[k:])


def _slip_capacity(part, k, p):
    d = part["outer"][k - 1]
    return math.pi / 2 * part["friction"][k] * p * d**2 * part["fit_length"][k] / _passing_core_driven(part, k)


# ---- the parts, one by one ---------------------------------------------------------------

def test_a_fitted_two_layer_part_beside_three_layer_parts(batch):
    part, row = CATALOGUE["A fitted sleeve"], _row("A fitted sleeve")
    (p,) = _pressures(part, [40e-6])
    assert batch.pressure[row, 1] == pytest.approx(p, rel=1e-9)
    assert batch.interference[row, 1] == pytest.approx(40e-6, rel=1e-15)
    assert batch.slip_capacity[row, 1] == pytest.approx(_slip_capacity(part, 1, p), rel=1e-9)
    assert batch.slip_limit[row] == pytest.approx(_slip_capacity(part, 1, p), rel=1e-9)
    assert batch.slip_slot[row] == 1
    # no third layer: nothing at its slot, and slot 0 is never an interface
    for name in ("interference", "pressure", "slip_torque", "slip_capacity", "bond_capacity"):
        assert np.isnan(getattr(batch, name)[row, 2]), name
        assert np.isnan(getattr(batch, name)[row, 0]), name
    assert batch.interface_flags[row].tolist() == [0, 0, 0]
    assert batch.layer_fit_flags[row].tolist() == [0, 0, 0]


def test_three_layers_fitted_at_the_inner_interface_only(batch):
    part, row = CATALOGUE["B three layers, inner fit only"], _row("B three layers, inner fit only")
    p1, p2 = _pressures(part, [30e-6, 0.0])  # the outer steel layer just touches
    assert p2 > 0  # squeezed by the fit inside it
    assert batch.pressure[row, 1] == pytest.approx(p1, rel=1e-9)
    assert batch.pressure[row, 2] == pytest.approx(p2, rel=1e-9)
    assert batch.slip_capacity[row, 1] == pytest.approx(_slip_capacity(part, 1, p1), rel=1e-9)
    assert np.isnan(batch.slip_capacity[row, 2]) and np.isnan(batch.interference[row, 2])
    assert batch.slip_limit[row] == pytest.approx(_slip_capacity(part, 1, p1), rel=1e-9)


def test_a_bonded_part_in_a_batch_with_fits(batch):
    part, row = CATALOGUE["C bonded sleeve"], _row("C bonded sleeve")
    expected = math.pi / 2 * 20e6 * 0.04 * 0.05**2 / _passing_core_driven(part, 1)
    assert batch.bond_capacity[row, 1] == pytest.approx(expected, rel=1e-9)
    assert batch.bond_limit[row] == pytest.approx(expected, rel=1e-9)
    assert batch.bond_slot[row] == 1
    # no fit: no interference, no pressure, no fit-stress face, no slip
    assert np.isnan(batch.interference[row]).all() and np.isnan(batch.pressure[row]).all()
    assert batch.fit_stress_face[row].tolist() == [-1, -1, -1]
    assert np.isinf(batch.slip_limit[row]) and batch.slip_slot[row] == -1
    assert np.isinf(batch.fit_stress_limit[row])


def test_an_unknown_load_path_is_flagged_at_its_one_interface_only(batch):
    row = _row("D unknown load path")
    assert batch.interface_flags[row].tolist() == [0, int(InterfaceFlag.LOAD_PATH_UNKNOWN), 0]
    assert np.isnan(batch.slip_limit[row]) and batch.slip_slot[row] == -1
    for name in NAMES:  # the known paths of every other part are not flagged
        if name != "D unknown load path":
            assert not (batch.interface_flags[_row(name)] & InterfaceFlag.LOAD_PATH_UNKNOWN).any(), name


@pytest.mark.parametrize("name", ["E no friction", "F endless fit"])
def test_friction_and_fit_length_must_be_positive_and_finite(batch, name):
    row = _row(name)
    assert batch.interface_flags[row, 1] == InterfaceFlag.FIT_INPUT_INVALID
    assert np.isnan(batch.slip_capacity[row, 1]) and np.isnan(batch.slip_torque[row, 1])
    assert np.isnan(batch.slip_limit[row]) and batch.slip_slot[row] == -1


def test_an_idle_interface_that_lost_contact_never_slips(batch):
    # driven through every layer the interface passes no torque: the capacity is inf even
    # with no grip left (the sleeve grew 30.5 um more than the core's 20 um fit)
    row = _row("G every layer, hot, contact lost")
    loss = (STEEL["alpha"] - BRONZE["alpha"]) * 100.0 * 0.05
    assert batch.interference[row, 1] == pytest.approx(20e-6 + loss, rel=1e-9)
    assert batch.pressure[row, 1] == 0.0
    assert batch.interface_flags[row, 1] == InterfaceFlag.CONTACT_LOST
    assert batch.slip_torque[row, 1] == 0.0
    assert np.isinf(batch.slip_capacity[row, 1])
    assert np.isinf(batch.slip_limit[row]) and batch.slip_slot[row] == -1


def test_heat_changes_the_interference_by_hand(batch):
    part, row = CATALOGUE["H fitted, 50 K hot"], _row("H fitted, 50 K hot")
    delta = 40e-6 + (STEEL["alpha"] - BRONZE["alpha"]) * 50.0 * 0.05  # 24.75 um
    (p,) = _pressures(part, [delta])
    assert batch.interference[row, 1] == pytest.approx(delta, rel=1e-9)
    assert batch.slip_limit[row] == pytest.approx(_slip_capacity(part, 1, p), rel=1e-9)


def test_a_cold_part_needs_no_expansion_coefficient_even_beside_hot_parts(batch):
    part, row = CATALOGUE["J fitted, cold, no expansion given"], _row("J fitted, cold, no expansion given")
    (p,) = _pressures(part, [40e-6])
    assert batch.interference[row, 1] == pytest.approx(40e-6, rel=1e-15)
    assert batch.slip_limit[row] == pytest.approx(_slip_capacity(part, 1, p), rel=1e-9)
    assert batch.interface_flags[row].tolist() == [0, 0, 0]


def test_a_missing_expansion_of_a_hot_part_is_said_at_every_fit_by_its_cause(batch):
    expansion = int(InterfaceFlag.EXPANSION_NOT_GIVEN)
    row = _row("K hot, core expansion missing, two fits")
    assert batch.interface_flags[row].tolist() == [0, expansion, expansion]
    assert np.isnan(batch.interference[row, 1])  # not known at temperature
    assert np.isnan(batch.pressure[row, 1:]).all()
    assert np.isnan(batch.slip_limit[row]) and batch.slip_slot[row] == -1
    assert batch.fit_stress_face[row].tolist() == [-1, -1, -1]
    # the inner interface is not fitted but still moves with temperature: said there too
    row = _row("K2 hot, core expansion missing, outer fit only")
    assert batch.interface_flags[row].tolist() == [0, expansion, expansion]


def test_a_fit_with_no_modulus_is_an_input_error_not_a_missing_expansion(batch):
    row = _row("L fitted, sleeve E missing")
    assert batch.interface_flags[row].tolist() == [0, int(InterfaceFlag.FIT_INPUT_INVALID), 0]
    assert np.isnan(batch.slip_limit[row]) and batch.slip_slot[row] == -1
    assert batch.fit_stress_face[row].tolist() == [-1, -1, -1]
    assert np.isnan(batch.fit_stress_limit[row]) and batch.fit_stress_slot[row] == -1


def test_an_idle_interface_with_bad_input_has_no_capacity_not_an_endless_one(batch):
    row = _row("M every layer, bond allowable zero")
    assert np.isnan(batch.bond_capacity[row, 1])
    assert batch.interface_flags[row, 1] == InterfaceFlag.BOND_INPUT_INVALID
    assert np.isnan(batch.bond_limit[row]) and batch.bond_slot[row] == -1
    row = _row("M2 every layer, no friction")
    assert np.isnan(batch.slip_capacity[row, 1])
    assert np.isnan(batch.slip_limit[row]) and batch.slip_slot[row] == -1


def test_one_bad_fit_of_two_leaves_the_part_without_a_slip_limit(batch):
    part, row = CATALOGUE["N two fits, the inner without friction"], _row("N two fits, the inner without friction")
    p1, p2 = _pressures(part, [30e-6, 35e-6])
    assert batch.pressure[row, 2] == pytest.approx(p2, rel=1e-9)
    assert batch.slip_capacity[row, 2] == pytest.approx(_slip_capacity(part, 2, p2), rel=1e-9)
    assert np.isnan(batch.slip_capacity[row, 1])
    assert np.isnan(batch.slip_limit[row]) and batch.slip_slot[row] == -1


def test_one_bad_bond_of_two_leaves_the_part_without_a_bond_limit(batch):
    part, row = CATALOGUE["O two bonds, the inner with no allowable"], _row("O two bonds, the inner with no allowable")
    expected = math.pi / 2 * 15e6 * 0.03 * 0.062**2 / _passing_core_driven(part, 2)
    assert batch.bond_capacity[row, 2] == pytest.approx(expected, rel=1e-9)
    assert np.isnan(batch.bond_capacity[row, 1])
    assert np.isnan(batch.bond_limit[row]) and batch.bond_slot[row] == -1


def test_a_fit_stress_input_missing_in_the_core_leaves_no_fit_stress_limit(batch):
    row = _row("P fitted, core yield missing")
    assert batch.layer_fit_flags[row, 0] == InterfaceFlag.FIT_INPUT_INVALID
    assert batch.layer_fit_flags[row, 1] == 0
    assert np.isnan(batch.fit_stress_limit[row]) and batch.fit_stress_slot[row] == -1


def test_every_part_alone_gives_what_it_gives_in_the_catalogue(batch):
    for name, part in CATALOGUE.items():
        alone = _rate([part])
        row = _row(name)
        for field in ("slip_limit", "bond_limit", "fit_stress_limit", "slip_slot", "bond_slot",
                      "fit_stress_slot"):
            np.testing.assert_allclose(getattr(alone, field)[0], getattr(batch, field)[row], rtol=1e-12,
                                       err_msg=f"{name}: {field}")
        np.testing.assert_array_equal(alone.interface_flags[0], batch.interface_flags[row], err_msg=name)


# ---- inputs given once for every part ----------------------------------------------------

def _scalar_batch(**inputs):
    stack = LayerStack.from_arrays([TWO + [NAN], THREE], [[0.0, 0.05, NAN], [0.0, 0.05, 0.062]],
                                   [[STEEL["g"], BRONZE["g"], NAN], [STEEL["g"], BRONZE["g"], OUTER_STEEL["g"]]],
                                   1e8)
    kwargs = dict(youngs_modulus=[[STEEL["e"], BRONZE["e"], NAN], [STEEL["e"], BRONZE["e"], OUTER_STEEL["e"]]],
                  poisson_ratio=[[STEEL["nu"], BRONZE["nu"], NAN], [STEEL["nu"], BRONZE["nu"], OUTER_STEEL["nu"]]],
                  interference=40e-6, fit_length=0.03, friction=0.12)
    kwargs.update(inputs)
    return rate_interfaces(stack, **kwargs)


def test_one_interference_for_the_whole_batch_fits_only_the_interfaces_that_exist():
    result = _scalar_batch()
    two = _part(TWO, [STEEL, BRONZE], **_fit())
    (p,) = _pressures(two, [40e-6])
    assert result.slip_limit[0] == pytest.approx(_slip_capacity(two, 1, p), rel=1e-9)
    assert np.isnan(result.interference[0, 2]) and result.interface_flags[0].tolist() == [0, 0, 0]
    three = _part(THREE, [STEEL, BRONZE, OUTER_STEEL], interference={1: 40e-6, 2: 40e-6},
                  fit_length={1: 0.03, 2: 0.03}, friction={1: 0.12, 2: 0.12})
    p1, p2 = _pressures(three, [40e-6, 40e-6])
    expected = min(_slip_capacity(three, 1, p1), _slip_capacity(three, 2, p2))
    assert result.slip_limit[1] == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("name, value", [("friction", np.inf), ("friction", 0.0), ("fit_length", np.inf),
                                         ("fit_length", -0.03)])
def test_one_unusable_value_for_the_whole_batch_is_refused_for_every_part(name, value):
    result = _scalar_batch(**{name: value})
    assert result.interface_flags[:, 1].tolist() == [int(InterfaceFlag.FIT_INPUT_INVALID)] * 2
    assert np.isnan(result.slip_limit).all() and result.slip_slot.tolist() == [-1, -1]


def test_an_unfitted_interface_of_a_fitted_part_has_no_interference():
    # alone in its call every part has a fit (the block's all-fitted case): the inner
    # interface only touches, so it has a pressure (squeezed by the outer fit) but no
    # interference of its own
    part = _part(THREE, [STEEL, BRONZE, OUTER_STEEL], **_fit(slot=2, delta=35e-6))
    result = _rate([part])
    p1, p2 = _pressures(part, [0.0, 35e-6])
    assert np.isnan(result.interference[0, 1]) and np.isnan(result.interference[0, 0])
    assert np.isnan(result.pressure[0, 0])  # slot 0 is never an interface
    assert result.interference[0, 2] == pytest.approx(35e-6, rel=1e-15)
    assert result.pressure[0, 1] == pytest.approx(p1, rel=1e-9)
    assert result.slip_limit[0] == pytest.approx(_slip_capacity(part, 2, p2), rel=1e-9)


@pytest.mark.parametrize("name, values", [("friction", [0.12, 0.0]), ("friction", [0.12, -0.1]),
                                          ("fit_length", [0.03, np.inf])])
def test_one_unusable_value_in_a_column_without_blanks_is_refused_for_its_part_only(name, values):
    # a column with no blank cell (no NaN): its smallest and largest values decide at once
    inputs = dict(friction=[0.12, 0.12], fit_length=[0.03, 0.03])
    inputs[name] = values
    parts = [_part(TWO, [STEEL, BRONZE], **_fit(mu=inputs["friction"][i], length=inputs["fit_length"][i]))
             for i in range(2)]
    for p in parts:  # every slot given, so no column of the call holds a NaN
        p["friction"] = [1.0, p["friction"][1], 1.0]
        p["fit_length"] = [1.0, p["fit_length"][1], 1.0]
    result = _rate(parts)
    (p,) = _pressures(parts[0], [40e-6])
    assert result.slip_limit[0] == pytest.approx(_slip_capacity(parts[0], 1, p), rel=1e-9)
    assert result.interface_flags[1, 1] == InterfaceFlag.FIT_INPUT_INVALID
    assert np.isnan(result.slip_limit[1]) and result.slip_slot[1] == -1
