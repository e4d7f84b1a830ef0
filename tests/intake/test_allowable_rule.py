"""The allowable a material gives by its rule — one decision for a materials row and TWS_ALLOWABLE.

Rules (BRIEF §2): max shear (Tresca) 0.5·Sy/FS and distortion energy (von Mises) Sy/(√3·FS),
textbook factors; the classic transmission-shafting code rule min(0.30·Sy, 0.18·Su), ×0.75 with
a keyway, with its own allowance (no FS on top) — as quoted in machine-design texts, from memory.
"""

import math

import pytest
from twistshare.engine.core import AllowableRule
from twistshare.engine.intake._allowable_rule import allowable_of

NAN = math.nan
MPA = 1e6


@pytest.mark.parametrize("rule, sy, su, fs, keyway, expected", [
    (AllowableRule.MAX_SHEAR, 300, NAN, 2, False, 0.5 * 300 / 2),
    (AllowableRule.DISTORTION_ENERGY, 300, NAN, 2, False, 300 / (math.sqrt(3) * 2)),
    (AllowableRule.SHAFTING_CODE, 300, 500, NAN, False, min(0.30 * 300, 0.18 * 500)),
    (AllowableRule.SHAFTING_CODE, 300, 400, NAN, True, 0.75 * min(0.30 * 300, 0.18 * 400)),
])
def test_rules_give_the_textbook_values(rule, sy, su, fs, keyway, expected):
    decision = allowable_of("MPD shaft steel", rule, NAN, sy * MPA, su * MPA, fs, keyway)
    assert decision.missing is None and decision.notes == ()
    assert decision.allowable == pytest.approx(expected * MPA, rel=1e-12)


def test_no_rule_and_an_allowable_means_given():
    decision = allowable_of("MPD bronze", None, 45 * MPA, NAN, NAN, NAN, False)
    assert decision.rule is AllowableRule.GIVEN and decision.allowable == 45 * MPA


def test_no_rule_for_a_steel_is_the_code_rule_stated_as_an_assumption():
    decision = allowable_of("AISI 1045 hot rolled", None, NAN, 310 * MPA, 570 * MPA, NAN, False)
    assert decision.rule is AllowableRule.SHAFTING_CODE
    assert decision.allowable == pytest.approx(93 * MPA, rel=1e-12)
    assert [n.assumed for n in decision.notes] == [True]


def test_no_rule_for_a_bronze_gives_no_allowable():
    decision = allowable_of("MPD bronze", None, NAN, 200 * MPA, 400 * MPA, NAN, False)
    assert math.isnan(decision.allowable) and "rule for steel shafting" in decision.missing


@pytest.mark.parametrize("rule, sy, su, fs, keyway, words", [
    (AllowableRule.SHAFTING_CODE, 300, 500, 2, False, "factor of safety is not used"),
    (AllowableRule.SHAFTING_CODE, 300, 500, 1, False, "factor of safety is not used"),  # any FS typed
    (AllowableRule.MAX_SHEAR, 300, NAN, 2, True, "keyway is not used by this rule"),
    (AllowableRule.MAX_SHEAR, 300, 200, 2, False, "ultimate strength is below the yield strength"),
])
def test_doubts_are_notes_beside_a_number(rule, sy, su, fs, keyway, words):
    decision = allowable_of("MPD shaft steel", rule, NAN, sy * MPA, su * MPA, fs, keyway)
    assert not math.isnan(decision.allowable)
    assert any(words in n.message and not n.assumed for n in decision.notes), decision.notes


@pytest.mark.parametrize("rule, sy, su, fs, missing", [
    (AllowableRule.MAX_SHEAR, 300, NAN, NAN, "needs a factor of safety"),
    (AllowableRule.SHAFTING_CODE, 300, NAN, NAN, "needs the ultimate strength"),
    (AllowableRule.SHAFTING_CODE, NAN, NAN, NAN, "needs the yield strength and the ultimate strength"),
    (AllowableRule.GIVEN, NAN, NAN, NAN, "no allowable shear stress"),
])
def test_missing_inputs_are_named(rule, sy, su, fs, missing):
    decision = allowable_of(None, rule, NAN, sy * MPA, su * MPA, fs, False)
    assert math.isnan(decision.allowable) and missing in decision.missing


# The whole sentence of each note, field and code: the words a user reads beside the number.
# The 0.30·Sy / 0.18·Su / 0.75 figures are the shafting code rule's (common practice, from memory).
_WHO = "material 'MPD shaft steel': "


@pytest.mark.parametrize("rule, sy, su, fs, keyway, field, code, words", [
    (AllowableRule.SHAFTING_CODE, 300, 500, 2, False, "factor_of_safety", "factor-of-safety-ignored",
     "the factor of safety is not used: the shafting code rule carries its own allowance "
     "(FS is not applied on top); leave it blank"),
    (AllowableRule.MAX_SHEAR, 300, NAN, 2, True, "keyway", "keyway-ignored",
     "the keyway is not used by this rule: the 0.75 keyway factor belongs to the shafting code rule; "
     "use Kt for a keyway's stress concentration"),
    (AllowableRule.MAX_SHEAR, 300, 200, 2, False, "ultimate_strength", "ultimate-below-yield",
     "the ultimate strength is below the yield strength: check both values"),
    (AllowableRule.MAX_SHEAR, 300, NAN, 0.8, False, "factor_of_safety", "factor-of-safety-below-one",
     "the factor of safety is below 1"),
])
def test_note_words_in_full(rule, sy, su, fs, keyway, field, code, words):
    decision = allowable_of("MPD shaft steel", rule, NAN, sy * MPA, su * MPA, fs, keyway)
    assert [(n.field, n.code, n.message) for n in decision.notes] == [(field, code, _WHO + words)]


def test_bronze_without_a_rule_is_told_what_to_give():
    decision = allowable_of("MPD bronze", None, NAN, 200 * MPA, 400 * MPA, NAN, False)
    assert decision.missing == (
        "material 'MPD bronze': no allowable shear and no rule given: the shafting code rule "
        "min(0.30·Sy, 0.18·Su) is a rule for steel shafting; give this material a row in the materials "
        "table with an allowable shear, or a rule (max shear, distortion energy) and a factor of safety")


def test_decision_and_notes_are_frozen_and_doubts_are_not_assumptions():
    import dataclasses

    decision = allowable_of("MPD shaft steel", AllowableRule.MAX_SHEAR, NAN, 300 * MPA, 200 * MPA, 2, False)
    assert decision.missing is None
    (note,) = decision.notes
    assert note.assumed is False
    with pytest.raises(dataclasses.FrozenInstanceError):
        decision.allowable = 1.0  # type: ignore[misc]
    with pytest.raises(dataclasses.FrozenInstanceError):
        note.message = ""  # type: ignore[misc]


def test_a_nameless_material_is_not_named_in_its_notes():
    decision = allowable_of(None, AllowableRule.MAX_SHEAR, NAN, 300 * MPA, 200 * MPA, 2, False)
    assert [n.message for n in decision.notes] == ["the ultimate strength is below the yield strength: check both values"]


# The notes' fields and codes (what a book writes beside which input) and their key words.

def test_the_default_rule_note_names_the_rule_and_the_material():
    decision = allowable_of("AISI 1045 hot rolled", None, NAN, 310 * MPA, 570 * MPA, NAN, False)
    (note,) = decision.notes
    assert (note.field, note.code) == ("rule", "default-rule")
    assert note.message.startswith("material 'AISI 1045 hot rolled': no allowable shear and no rule given")
    assert note.message.endswith("used the shafting code rule min(0.30·Sy, 0.18·Su) for steel shafting")


def test_a_steel_without_a_rule_and_one_strength_missing_says_which_not_the_default():
    decision = allowable_of("AISI 1045 hot rolled", None, NAN, 310 * MPA, NAN, NAN, False)
    assert math.isnan(decision.allowable)
    assert "ultimate strength" in decision.missing and "yield" not in decision.missing
    assert decision.notes == ()  # no rule was applied, so none is stated as assumed


def test_given_without_a_value_says_so():
    decision = allowable_of("Steel X", AllowableRule.GIVEN, NAN, NAN, NAN, NAN, False)
    assert decision.missing == "material 'Steel X': rule 'given' but no allowable shear stress"


@pytest.mark.parametrize("fs, keyway, fields", [
    (2.0, False, ["factor_of_safety"]),
    (NAN, True, ["keyway"]),
    (2.0, True, ["factor_of_safety", "keyway"]),
    (NAN, False, []),
])
def test_given_directly_the_factor_of_safety_and_keyway_are_ignored_inputs(fs, keyway, fields):
    decision = allowable_of("Steel X", AllowableRule.GIVEN, 50 * MPA, NAN, NAN, fs, keyway)
    assert decision.allowable == 50 * MPA and decision.missing is None
    assert [n.field for n in decision.notes] == fields
    words = {"factor_of_safety": "the factor of safety is not used", "keyway": "the keyway is not used"}
    for n in decision.notes:
        assert n.code == "input-ignored" and not n.assumed
        assert n.message.startswith("material 'Steel X': " + words[n.field])
        assert "given directly" in n.message and "keyway allowance)" in n.message


def test_a_theory_without_factor_of_safety_names_it():
    decision = allowable_of("Steel X", AllowableRule.MAX_SHEAR, NAN, 300 * MPA, NAN, NAN, False)
    assert decision.missing.startswith("material 'Steel X': rule ")
    assert decision.missing.endswith("needs a factor of safety")


def test_the_code_rule_names_both_missing_strengths():
    decision = allowable_of("Steel X", AllowableRule.SHAFTING_CODE, NAN, NAN, NAN, NAN, False)
    assert decision.missing.startswith("material 'Steel X': rule ")
    assert decision.missing.endswith("needs the yield strength and the ultimate strength")


def test_the_code_rule_warns_of_ultimate_below_yield_without_an_fs_note():
    # Su < Sy is a doubt about the inputs; no FS was typed, so nothing is said about one.
    decision = allowable_of("Steel X", AllowableRule.SHAFTING_CODE, NAN, 400 * MPA, 300 * MPA, NAN, False)
    assert decision.allowable == pytest.approx(min(0.30 * 400, 0.18 * 300) * MPA, rel=1e-12)
    assert [(n.field, n.code) for n in decision.notes] == [("ultimate_strength", "ultimate-below-yield")]
    assert decision.notes[0].message.startswith("material 'Steel X': the ultimate strength is below")


def test_a_rule_chosen_over_a_given_allowable_says_the_rule_wins():
    decision = allowable_of("Steel X", AllowableRule.MAX_SHEAR, 80 * MPA, 300 * MPA, NAN, 2.0, False)
    assert decision.allowable == pytest.approx(0.5 * 300 / 2 * MPA, rel=1e-12)  # Tresca, not the 80 given
    (note,) = decision.notes
    assert (note.field, note.code) == ("allowable_shear", "input-ignored")
    assert note.message.startswith("material 'Steel X': allowable shear given but rule ")
    assert note.message.endswith("chosen; the rule's value is used")
