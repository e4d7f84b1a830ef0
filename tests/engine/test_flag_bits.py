"""The core's diagnosis flags: each member its own single bit, which members are errors, and the words
of the longer descriptions.

Flags travel as int words beside the values (``Rating.layer_flags`` and the like) and are split and
worded by the intake; two members sharing a bit, or a member worth zero, would merge or lose a
finding without any value changing (common practice for bit flags: one distinct power of two per
member). The error sets are the module's stated rules (errors leave the value NaN or stop the part;
the rest are notes). The descriptions are the user-facing text, checked word for word.
"""

from __future__ import annotations

import pytest
from twistshare.engine.core import (
    ALLOWABLE_ERRORS,
    LAYER_ERRORS,
    LOAD_ERRORS,
    PART_ERRORS,
    PLY_ERRORS,
    AllowableFlag,
    LayerFlag,
    LoadFlag,
    PartFlag,
    PlyFlag,
    describe,
    has_error,
    is_error,
    split_flags,
)

MEMBERS = {
    LayerFlag: ["OUTER_NOT_POSITIVE", "INNER_NEGATIVE", "INNER_NOT_BELOW_OUTER", "MODULUS_NOT_POSITIVE",
                "ALLOWABLE_NOT_POSITIVE", "KT_BELOW_ONE", "NOT_FINITE", "GAP_BELOW", "OVERLAP_BELOW",
                "SOLID_NOT_INNERMOST", "EMPTY_SLOT_BETWEEN_LAYERS"],
    PartFlag: ["NO_LAYERS", "LENGTH_NOT_POSITIVE", "TORQUE_NOT_FINITE", "TORQUE_NEGATIVE", "TWIST_LIMIT_NOT_POSITIVE",
               "TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE", "TWIST_LIMIT_NEEDS_LENGTH", "LAYER_ERROR", "TORQUE_NOT_GIVEN",
               "LENGTH_NOT_GIVEN"],
    AllowableFlag: ["RULE_UNKNOWN", "YIELD_NOT_POSITIVE", "ULTIMATE_NOT_POSITIVE", "FACTOR_OF_SAFETY_NOT_POSITIVE",
                    "FACTOR_OF_SAFETY_BELOW_ONE", "ULTIMATE_BELOW_YIELD", "FACTOR_OF_SAFETY_IGNORED", "KEYWAY_IGNORED"],
    LoadFlag: ["MOMENT_NOT_FINITE", "AXIAL_FORCE_NOT_FINITE", "YOUNGS_MODULUS_NOT_POSITIVE", "DENSITY_NOT_POSITIVE",
               "STRENGTH_NOT_POSITIVE", "RULE_NOT_COMBINABLE", "BENDING_ALONE_EXCEEDS", "TORQUE_NOT_FINITE",
               "LENGTH_NOT_POSITIVE", "SUPPORT_UNKNOWN", "SPEED_NOT_GIVEN", "SPEED_NOT_FINITE",
               "SPEED_ABOVE_WHIRL_LIMIT", "POISSON_OUT_OF_RANGE", "NOT_THIN_WALLED", "SHORT_TUBE",
               "CONCENTRATION_BELOW_ONE"],
    PlyFlag: ["MODULUS_NOT_POSITIVE", "POISSON_OUT_OF_RANGE", "THICKNESS_NOT_POSITIVE", "ANGLE_NOT_FINITE", "NO_PLIES",
              "UNBALANCED"],
}

# The notes (not errors) of each type, as the module states them; every other member is an error.
NOTES = {
    LayerFlag: set(),
    PartFlag: {"TORQUE_NEGATIVE", "TORQUE_NOT_GIVEN", "LENGTH_NOT_GIVEN"},
    AllowableFlag: {"FACTOR_OF_SAFETY_BELOW_ONE", "ULTIMATE_BELOW_YIELD", "FACTOR_OF_SAFETY_IGNORED", "KEYWAY_IGNORED"},
    LoadFlag: {"BENDING_ALONE_EXCEEDS", "SPEED_NOT_GIVEN", "SPEED_ABOVE_WHIRL_LIMIT", "NOT_THIN_WALLED", "SHORT_TUBE"},
    PlyFlag: {"UNBALANCED"},
}
MASKS = {LayerFlag: LAYER_ERRORS, PartFlag: PART_ERRORS, AllowableFlag: ALLOWABLE_ERRORS, LoadFlag: LOAD_ERRORS,
         PlyFlag: PLY_ERRORS}
TYPES = list(MEMBERS)


@pytest.mark.parametrize("flag_type", TYPES, ids=lambda t: t.__name__)
def test_each_member_is_its_own_single_bit_within_int32(flag_type):
    # an alias (a name sharing another's value) is not listed by iteration
    assert [m.name for m in flag_type] == MEMBERS[flag_type]
    values = [int(flag_type[name]) for name in MEMBERS[flag_type]]
    assert all(v > 0 and v & (v - 1) == 0 for v in values), values
    assert len(set(values)) == len(values) and max(values) < 2 ** 31
    word = 0
    for v in values:
        word |= v
    assert split_flags(word, flag_type) == tuple(sorted((flag_type[n] for n in MEMBERS[flag_type]), key=int))


@pytest.mark.parametrize("flag_type", TYPES, ids=lambda t: t.__name__)
def test_which_members_are_errors(flag_type):
    errors = {m.name for m in flag_type if m & MASKS[flag_type]}
    assert errors == set(MEMBERS[flag_type]) - NOTES[flag_type]
    for m in flag_type:
        assert is_error(m) == (m.name not in NOTES[flag_type]), m
    words = [int(m) for m in flag_type] + [0]
    assert has_error(words, flag_type).tolist() == [m.name not in NOTES[flag_type] for m in flag_type] + [False]


WORDS = [
    (LayerFlag.NOT_FINITE,
     "a layer input (diameter, shear modulus, allowable shear stress or Kt) is missing or not a finite number"),
    (LayerFlag.GAP_BELOW,
     "gap between this layer's inner diameter and the outer diameter of the layer inside it: the layers must touch"),
    (LayerFlag.OVERLAP_BELOW,
     "this layer's inner diameter overlaps the outer diameter of the layer inside it: the layers must touch"),
    (LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS,
     "empty layer slot with a layer outside it: layers must be numbered from the innermost without holes"),
    (LoadFlag.RULE_NOT_COMBINABLE,
     "combined bending and torsion needs the maximum-shear-stress or distortion-energy rule and a yield strength"),
    (LoadFlag.SHORT_TUBE,
     "short tube: the moderate-length buckling formula is used below its range (it underestimates the buckling "
     "torque there)"),
    (PlyFlag.UNBALANCED,
     "laminate is not balanced (A16 or A26 not zero): torsion couples with axial and hoop strain, and A66/t is the "
     "shear modulus with those strains restrained"),
]


@pytest.mark.parametrize(("flag", "words"), WORDS, ids=[f"{type(f).__name__}.{f.name}" for f, _ in WORDS])
def test_longer_descriptions_word_for_word(flag, words):
    assert describe(flag) == words


def test_a_combination_is_refused_in_words():
    both = LayerFlag.GAP_BELOW | LayerFlag.OVERLAP_BELOW
    with pytest.raises(ValueError) as caught:
        describe(both)
    assert str(caught.value) == f"describe() takes one flag; got {both!r} (split it with split_flags first)"
