"""Interfaces of a batch: slip, bond and fit-stress limits from one call, with their flags."""

import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from twistshare.engine.core import (
    INTERFACE_ERRORS,
    PLASTIC_ERRORS,
    Duty,
    InterfaceFlag,
    LayerStack,
    LoadPath,
    PlasticFlag,
    combined_stress_capacity,
    describe_sleeve_flag,
    fit_pressure,
    has_sleeve_error,
    rate,
    rate_interfaces,
)

SETTINGS = settings(max_examples=40, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow])
finite = dict(allow_nan=False, allow_infinity=False)
NAN = np.nan

# A Marrowby-style rebuilt journal (invented numbers): 1045 core, phosphor-bronze sleeve.
CORE, SLEEVE = 0.05, 0.062
G = [79.3e9, 41.4e9]
E, NU = [207e9, 111e9], [0.292, 0.349]
ALPHA = [11.7e-6, 17.8e-6]
SY = [310e6, 250e6]


def _journal(**overrides):
    stack = LayerStack.from_layers([CORE, SLEEVE], [0.0, CORE], G, [1e8, 1e8])
    kwargs = dict(youngs_modulus=[E], poisson_ratio=[NU], yield_strength=[SY],
                  expansion_coefficient=[ALPHA], interference=[[NAN, 40e-6]],
                  fit_length=[[NAN, 0.03]], friction=[[NAN, 0.12]])
    kwargs.update(overrides)
    return stack, rate_interfaces(stack, **kwargs)


def test_slip_limit_by_hand():
    """Slip limit = (pi/2) mu p d^2 L / share, with p from the two-cylinder Lamé formula
    (Shigley's Mechanical Engineering Design, interference fits) and the sleeve's share
    G_s J_s / sum(G J) (twist compatibility). rtol 1e-12."""
    stack, result = _journal()
    p = fit_pressure(40e-6, CORE, 0.0, SLEEVE, E[0], NU[0], E[1], NU[1])
    share = rate(stack, Duty.from_arrays(torque=1.0)).share[0, 1]
    expected = math.pi / 2 * 0.12 * p * CORE**2 * 0.03 / share
    assert result.pressure[0, 1] == pytest.approx(p, rel=1e-12)
    assert result.slip_limit[0] == pytest.approx(expected, rel=1e-12)
    assert result.slip_slot[0] == 1
    assert result.interface_flags[0, 1] == 0
    assert np.isinf(result.bond_limit[0]) and result.bond_slot[0] == -1


def test_fit_stress_limit_by_hand():
    """The sleeve's bore: sigma_t = p (d_o^2 + d^2)/(d_o^2 - d^2), sigma_r = -p, tau = G_s r
    T/sum(GJ); the core's surface: -p, -p, G_c r T / sum(GJ) (Shigley; von Mises). The
    smallest over the faces governs. rtol 1e-12."""
    stack, result = _journal(factor_of_safety=1.5)
    p = result.pressure[0, 1]
    gj = rate(stack, Duty.from_arrays(torque=1.0)).sum_gj[0]
    hoop_bore = p * (SLEEVE**2 + CORE**2) / (SLEEVE**2 - CORE**2)
    hoop_outside = 2 * p * CORE**2 / (SLEEVE**2 - CORE**2)
    candidates = [
        combined_stress_capacity(-p, -p, G[0] * CORE / 2 / gj, SY[0], 1.5),
        combined_stress_capacity(hoop_bore, -p, G[1] * CORE / 2 / gj, SY[1], 1.5),
        combined_stress_capacity(hoop_outside, 0.0, G[1] * SLEEVE / 2 / gj, SY[1], 1.5),
    ]
    assert result.fit_stress_limit[0] == pytest.approx(min(candidates), rel=1e-12)


def test_heat_loosens_the_bronze_sleeve_until_it_slips_freely():
    """At 80 K above assembly the 20 um fit is gone ((17.8 - 11.7)e-6 x 80 x 50 mm =
    24.4 um, hand calculation): no pressure, contact lost, no slip capacity."""
    _, result = _journal(interference=[[NAN, 20e-6]], operating_temperature=293.15 + 80)
    assert result.interference[0, 1] == pytest.approx(20e-6 - 6.1e-6 * 80 * CORE, rel=1e-9)
    assert result.pressure[0, 1] == 0.0
    assert result.interface_flags[0, 1] & InterfaceFlag.CONTACT_LOST
    assert result.slip_limit[0] == 0.0


def test_every_layer_path_has_no_slip_limit_even_without_contact():
    _, result = _journal(interference=[[NAN, -5e-6]], load_path=LoadPath.THROUGH_EVERY_LAYER)
    assert result.interface_flags[0, 1] & InterfaceFlag.CONTACT_LOST
    assert np.isinf(result.slip_limit[0])


def test_missing_expansion_with_a_temperature_is_an_error():
    _, result = _journal(expansion_coefficient=[[11.7e-6, NAN]], operating_temperature=350.0)
    assert result.interface_flags[0, 1] & InterfaceFlag.EXPANSION_NOT_GIVEN
    assert np.isnan(result.slip_limit[0]) and np.isnan(result.fit_stress_limit[0])


def test_missing_friction_is_an_error_and_unknown_load_path_too():
    _, result = _journal(friction=[[NAN, NAN]])
    assert result.interface_flags[0, 1] & InterfaceFlag.FIT_INPUT_INVALID
    assert np.isnan(result.slip_limit[0])
    _, result = _journal(load_path=9)
    assert result.interface_flags[0, 1] & InterfaceFlag.LOAD_PATH_UNKNOWN
    assert np.isnan(result.slip_limit[0])


def test_overstressed_fit_is_flagged_with_no_capacity():
    _, result = _journal(interference=[[NAN, 400e-6]])
    assert result.layer_fit_flags[0, 1] & InterfaceFlag.FIT_OVERSTRESSED
    assert result.fit_stress_limit[0] == 0.0 and result.fit_stress_slot[0] == 1


def test_bond_limit_and_a_part_without_any_fit():
    stack = LayerStack.from_layers([CORE, SLEEVE], [0.0, CORE], G, [1e8, 1e8])
    result = rate_interfaces(stack, bond_allowable=[[NAN, 15e6]], bond_length=[[NAN, 0.025]])
    share = rate(stack, Duty.from_arrays(torque=1.0)).share[0, 1]
    expected = 15e6 * 2 * math.pi * (CORE / 2) ** 2 * 0.025 / share
    assert result.bond_limit[0] == pytest.approx(expected, rel=1e-12)
    assert np.isinf(result.slip_limit[0]) and np.isinf(result.fit_stress_limit[0])
    assert np.isnan(result.pressure).all()
    bad = rate_interfaces(stack, bond_allowable=[[NAN, 15e6]], bond_length=[[NAN, 0.0]])
    assert bad.interface_flags[0, 1] & InterfaceFlag.BOND_INPUT_INVALID
    assert np.isnan(bad.bond_limit[0])


def test_given_rating_arrays_give_the_same_answer():
    stack, result = _journal()
    rating = rate(stack, Duty.from_arrays(torque=1.0))
    again = rate_interfaces(stack, youngs_modulus=[E], poisson_ratio=[NU], yield_strength=[SY],
                            interference=[[NAN, 40e-6]], fit_length=[[NAN, 0.03]],
                            friction=[[NAN, 0.12]], share=rating.share, sum_stiffness=rating.sum_gj)
    assert again.slip_limit[0] == pytest.approx(result.slip_limit[0], rel=1e-12)
    assert again.fit_stress_limit[0] == pytest.approx(result.fit_stress_limit[0], rel=1e-12)


@st.composite
def journals(draw):
    n = draw(st.integers(2, 3))
    core = draw(st.floats(0.02, 0.15, **finite))
    outer = [core]
    for _ in range(n - 1):
        outer.append(outer[-1] + 2 * draw(st.floats(0.002, 0.02, **finite)))
    inner = [0.0] + outer[:-1]
    row = lambda lo, hi: draw(st.lists(st.floats(lo, hi, **finite), min_size=n, max_size=n))  # noqa: E731
    fits = [NAN] + [draw(st.one_of(st.just(NAN), st.floats(-10e-6, 80e-6, **finite))) for _ in range(n - 1)]
    bonds = [NAN] + [draw(st.one_of(st.just(NAN), st.floats(5e6, 30e6, **finite))) for _ in range(n - 1)]
    return dict(outer=outer, inner=inner, g=row(25e9, 80e9), e=row(68e9, 210e9),
                nu=row(0.28, 0.35), sy=row(150e6, 700e6), alpha=row(9e-6, 24e-6),
                fits=fits, bonds=bonds, path=draw(st.sampled_from(list(LoadPath))),
                heat=draw(st.one_of(st.just(NAN), st.floats(250.0, 420.0, **finite))))


def _pad(values, width=3):
    return list(values) + [NAN] * (width - len(values))


@SETTINGS
@given(st.lists(journals(), min_size=2, max_size=4))
def test_one_part_alone_equals_the_same_part_in_a_batch(parts):
    def build(chosen):
        stack = LayerStack.from_arrays(
            [_pad(p["outer"]) for p in chosen], [_pad(p["inner"]) for p in chosen],
            [_pad(p["g"]) for p in chosen], 1e8)
        grid = lambda key: [_pad(p[key]) for p in chosen]  # noqa: E731
        return rate_interfaces(
            stack, youngs_modulus=grid("e"), poisson_ratio=grid("nu"), yield_strength=grid("sy"),
            expansion_coefficient=grid("alpha"), interference=grid("fits"),
            fit_length=0.02, friction=0.12, bond_allowable=grid("bonds"), bond_length=0.02,
            load_path=[p["path"] for p in chosen], operating_temperature=[p["heat"] for p in chosen])

    together = build(parts)
    for row, part in enumerate(parts):
        alone = build([part])
        for name in ("slip_limit", "bond_limit", "fit_stress_limit"):
            np.testing.assert_allclose(getattr(alone, name)[0], getattr(together, name)[row],
                                       rtol=1e-12)
        np.testing.assert_array_equal(alone.interface_flags[0], together.interface_flags[row])


def test_every_flag_is_described_and_findings_are_not_errors():
    for flag in (*InterfaceFlag, *PlasticFlag):
        assert describe_sleeve_flag(flag)
    with pytest.raises(ValueError, match="takes one flag"):
        describe_sleeve_flag(InterfaceFlag.CONTACT_LOST | InterfaceFlag.FIT_OVERSTRESSED)
    assert not INTERFACE_ERRORS & (InterfaceFlag.CONTACT_LOST | InterfaceFlag.FIT_OVERSTRESSED)
    assert not PLASTIC_ERRORS & PlasticFlag.REVERSE_YIELD_ON_UNLOADING
    np.testing.assert_array_equal(
        has_sleeve_error([0, int(InterfaceFlag.CONTACT_LOST), int(InterfaceFlag.FIT_INPUT_INVALID)],
                         InterfaceFlag), [False, False, True])
