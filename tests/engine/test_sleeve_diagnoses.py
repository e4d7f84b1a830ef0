"""The interface and plastic diagnosis bits: distinct single bits, which of them are errors, their words.

The bits are data carried beside the values in int32 words and worded by the intake; a bit shared by two
members, or a member worth zero, would silently merge or lose a finding (common practice for bit flags:
one distinct power of two per member). Which bits are errors (the value left NaN) and which are findings
is the module's stated rule; the descriptions are the user-facing text, checked word for word.
"""

from __future__ import annotations

import numpy as np
import pytest
from twistshare.engine.core import (
    INTERFACE_ERRORS,
    PLASTIC_ERRORS,
    InterfaceFlag,
    PlasticFlag,
    describe_sleeve_flag,
    has_sleeve_error,
)

INTERFACE_MEMBERS = ("LOAD_PATH_UNKNOWN", "FIT_INPUT_INVALID", "EXPANSION_NOT_GIVEN", "CONTACT_LOST",
                     "FIT_OVERSTRESSED", "BOND_INPUT_INVALID")
PLASTIC_MEMBERS = ("LAYER_INPUT_INVALID", "TORQUE_ABOVE_PLASTIC", "REVERSE_YIELD_ON_UNLOADING", "NOT_CONVERGED")


@pytest.mark.parametrize(("flag_type", "names"), [(InterfaceFlag, INTERFACE_MEMBERS),
                                                  (PlasticFlag, PLASTIC_MEMBERS)])
def test_each_member_is_its_own_single_bit_within_int32(flag_type, names):
    # an alias (two names, one value) would not be listed by iteration: every name must be a member of its own
    assert [m.name for m in flag_type] == list(names)
    values = [int(flag_type[name]) for name in names]
    assert all(v > 0 and v & (v - 1) == 0 for v in values), values  # one bit each, none zero
    assert len(set(values)) == len(values)
    assert max(values) < 2 ** 31  # stored in int32 words
    word = np.int32(0)
    for v in values:
        word |= np.int32(v)
    assert bin(int(word)).count("1") == len(values)


ERRORS = {
    InterfaceFlag: {"LOAD_PATH_UNKNOWN", "FIT_INPUT_INVALID", "EXPANSION_NOT_GIVEN", "BOND_INPUT_INVALID"},
    PlasticFlag: {"LAYER_INPUT_INVALID", "TORQUE_ABOVE_PLASTIC", "NOT_CONVERGED"},
}


@pytest.mark.parametrize("flag_type", [InterfaceFlag, PlasticFlag])
def test_errors_leave_nan_findings_do_not(flag_type):
    mask = INTERFACE_ERRORS if flag_type is InterfaceFlag else PLASTIC_ERRORS
    assert {m.name for m in flag_type if m & mask} == ERRORS[flag_type]
    words = np.array([int(m) for m in flag_type] + [0], dtype=np.int32)
    got = has_sleeve_error(words, flag_type)
    assert got.tolist() == [m.name in ERRORS[flag_type] for m in flag_type] + [False]
    # a finding beside an error is still an error; two findings together are not
    findings = [m for m in flag_type if m.name not in ERRORS[flag_type]]
    errors = [m for m in flag_type if m.name in ERRORS[flag_type]]
    assert has_sleeve_error(int(findings[0] | errors[-1]), flag_type)
    assert not has_sleeve_error(int(np.bitwise_or.reduce([int(f) for f in findings])), flag_type)


# a list, not a dict: InterfaceFlag and PlasticFlag members of one value compare equal as ints
WORDS = [
    (InterfaceFlag.LOAD_PATH_UNKNOWN, "load path is not one of the known load paths"),
    (InterfaceFlag.FIT_INPUT_INVALID, (
        "a fit input is missing or out of range: the diameters must satisfy bore < fit diameter < outer "
        "diameter, E, fit length and friction coefficient must be positive and Poisson's ratio in (-1, 0.5]")),
    (InterfaceFlag.EXPANSION_NOT_GIVEN, (
        "an operating temperature is given but an expansion coefficient is not: the interference at "
        "temperature cannot be worked out")),
    (InterfaceFlag.CONTACT_LOST, (
        "the fit has lost contact at the operating temperature (interference <= 0): no contact pressure, "
        "no friction, no slip capacity")),
    (InterfaceFlag.FIT_OVERSTRESSED, (
        "the fit's own stresses already reach the yield strength over the factor of safety before any "
        "torque is applied")),
    (InterfaceFlag.BOND_INPUT_INVALID, (
        "a bond input is missing or not positive (bond diameter, bond length, allowable bond shear)")),
    (PlasticFlag.LAYER_INPUT_INVALID, (
        "a layer input is missing or out of range: diameters, shear modulus and shear yield stress must be "
        "positive with the inner diameter below the outer")),
    (PlasticFlag.TORQUE_ABOVE_PLASTIC, (
        "the torque is above the fully plastic torque: the section cannot carry it, no twist or residual "
        "stress follows")),
    (PlasticFlag.REVERSE_YIELD_ON_UNLOADING, (
        "on unloading, the residual stress somewhere exceeds the shear yield stress: the layer yields in "
        "reverse and the elastic-unloading residuals are not exact")),
    (PlasticFlag.NOT_CONVERGED, "the twist at this torque did not converge"),
]


@pytest.mark.parametrize(("flag", "words"), WORDS, ids=[f"{type(f).__name__}.{f.name}" for f, _ in WORDS])
def test_each_flag_is_worded(flag, words):
    assert describe_sleeve_flag(flag) == words


def test_a_combination_or_zero_is_refused_in_words():
    both = InterfaceFlag.CONTACT_LOST | InterfaceFlag.FIT_OVERSTRESSED
    with pytest.raises(ValueError) as caught:
        describe_sleeve_flag(both)
    assert str(caught.value) == f"describe_sleeve_flag() takes one flag; got {both!r} (split a combination first)"
    with pytest.raises(ValueError, match=r"^describe_sleeve_flag\(\) takes one flag; got "):
        describe_sleeve_flag(PlasticFlag(0))
