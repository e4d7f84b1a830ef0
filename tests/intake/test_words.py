"""The words an engineer types, read once for both front ends (engine/intake/_words.py)."""

import pytest
from twistshare.engine.core import AllowableRule, LoadPath
from twistshare.engine.intake import flag_from_value, header_key, material_key, rule_from_text, where_text
from twistshare.engine.intake._words import LOAD_PATH_WORDS, error_value_text, load_path_from_text, quoted


class TestRuleWords:
    """Rule names as tables and cells write them, and the published methods' own names."""

    @pytest.mark.parametrize("text, rule", [
        ("given", AllowableRule.GIVEN), ("Direct", AllowableRule.GIVEN),
        ("max shear", AllowableRule.MAX_SHEAR), ("Maximum_shear-stress", AllowableRule.MAX_SHEAR),
        ("TRESCA", AllowableRule.MAX_SHEAR),
        ("distortion energy", AllowableRule.DISTORTION_ENERGY), ("von Mises", AllowableRule.DISTORTION_ENERGY),
        ("mises", AllowableRule.DISTORTION_ENERGY),
        ("shafting code", AllowableRule.SHAFTING_CODE), ("Transmission shafting code", AllowableRule.SHAFTING_CODE),
        ("code", AllowableRule.SHAFTING_CODE),
    ])
    def test_known(self, text, rule):
        assert rule_from_text(text) is rule

    @pytest.mark.parametrize("text", ["Rankine", "", "max", 3, None])
    def test_unknown(self, text):
        assert rule_from_text(text) is None


class TestYesNo:
    @pytest.mark.parametrize("value, expected", [
        (True, True), (False, False), (1, True), (0, False), (1.0, True), ("yes", True), ("Y", True),
        ("x", True), ("keyway", True), ("With  keyway", True), ("no", False), ("n", False), ("-", False),
        ("none", False), ("without keyway", False), ("TRUE", True), ("false", False),
    ])
    def test_read(self, value, expected):
        assert flag_from_value(value) is expected

    @pytest.mark.parametrize("value", ["maybe", 2, 0.5, None, ""])
    def test_neither(self, value):
        assert flag_from_value(value) is None


def test_header_key_folds_case_apostrophes_and_separators():
    assert header_key("Young's_modulus") == "youngs modulus"
    assert header_key("  Stress-Concentration   factor ") == "stress concentration factor"
    assert header_key("Poisson’s ratio") == "poissons ratio"


def test_material_key_is_the_cores_rule():
    assert material_key("  AISI   1045 HOT rolled ") == material_key("aisi 1045 hot rolled")
    assert material_key("Straße") == material_key("STRASSE")  # casefold, not lower


@pytest.mark.parametrize("part, layer, expected", [
    ("MPD-S-014", 2, "part MPD-S-014, layer 2"), ("MPD-S-014", None, "part MPD-S-014"),
    ("", 2, "layer 2"), ("row 5", 1, "row 5, layer 1"), (None, None, "the part"),
])
def test_where_text(part, layer, expected):
    assert where_text(part, layer) == expected


@pytest.mark.parametrize("text, expected", [("#N/A", "#N/A"), (" #div/0! ", "#DIV/0!"), ("Err:502", "ERR:502"),
                                            ("#5", None), ("N/A", None), (7, None)])
def test_error_values(text, expected):
    assert error_value_text(text) == expected


def test_quoted_cuts_a_pasted_paragraph():
    assert quoted("  52 mm ") == "'52 mm'"
    long = "x" * 100
    assert quoted(long) == repr("x" * 60) + " (… 100 characters)"


# --- load path words (engine/intake/_words.py) ----------------------------------------------


@pytest.mark.parametrize("text, path", [
    ("through the core", LoadPath.THROUGH_CORE), ("Through-the-Core", LoadPath.THROUGH_CORE),
    ("core", LoadPath.THROUGH_CORE), ("through the outer layer", LoadPath.THROUGH_OUTER_LAYER),
    ("outer layer", LoadPath.THROUGH_OUTER_LAYER), ("every layer", LoadPath.THROUGH_EVERY_LAYER),
    ("ALL LAYERS", LoadPath.THROUGH_EVERY_LAYER),
])
def test_load_path_words(text, path):
    assert load_path_from_text(text) is path


@pytest.mark.parametrize("text", ["sideways", "", "inner", 2, None])
def test_unknown_load_path_words_are_none(text):
    assert load_path_from_text(text) is None


def test_every_load_path_has_words_that_read_back():
    for path, words in LOAD_PATH_WORDS.items():
        assert load_path_from_text(words) is path
