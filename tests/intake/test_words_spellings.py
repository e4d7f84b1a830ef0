"""Every word an engineer may type for a choice, one by one, against the list README gives
(engine/intake/_words.py): rules, load paths, yes/no, the sizing words and the end supports.

The expected spellings are written here, not read from the module, so a spelling dropped or
misspelt in the module fails its own case. The formulas the rule words stand for are the
published ones: Tresca's maximum shear 0.5·Sy/FS and von Mises' distortion energy Sy/(√3·FS)
(any mechanics-of-materials text, e.g. Shigley's Mechanical Engineering Design, failure
theories), the transmission-shafting code's min(0.30·Sy, 0.18·Su) (the ASME code for
transmission shafting, as handbooks give it; from memory)."""

from __future__ import annotations

import pytest
from twistshare.engine.core import AllowableRule, LoadPath
from twistshare.engine.core._sizing_geometry import OuterLayers, SizedDimension
from twistshare.engine.core._whirl import EndSupport
from twistshare.engine.intake import _words as words

RULES = [
    ("given", AllowableRule.GIVEN), ("direct", AllowableRule.GIVEN),
    ("max shear", AllowableRule.MAX_SHEAR), ("maximum shear", AllowableRule.MAX_SHEAR),
    ("max shear stress", AllowableRule.MAX_SHEAR), ("maximum shear stress", AllowableRule.MAX_SHEAR),
    ("tresca", AllowableRule.MAX_SHEAR),
    ("distortion energy", AllowableRule.DISTORTION_ENERGY), ("von mises", AllowableRule.DISTORTION_ENERGY),
    ("mises", AllowableRule.DISTORTION_ENERGY),
    ("shafting code", AllowableRule.SHAFTING_CODE), ("transmission shafting code", AllowableRule.SHAFTING_CODE),
    ("code", AllowableRule.SHAFTING_CODE),
]


@pytest.mark.parametrize("text, rule", RULES)
def test_each_rule_spelling(text, rule):
    assert words.rule_from_text(text) is rule
    assert words.rule_from_text(text.upper().replace(" ", "_")) is rule


def test_rule_words_and_formulas_as_outputs_write_them():
    assert dict(words.RULE_WORDS) == {
        AllowableRule.GIVEN: "given", AllowableRule.MAX_SHEAR: "max shear",
        AllowableRule.DISTORTION_ENERGY: "distortion energy", AllowableRule.SHAFTING_CODE: "shafting code"}
    assert dict(words.RULE_FORMULAS) == {
        AllowableRule.GIVEN: "given",
        AllowableRule.MAX_SHEAR: "max shear (Tresca) 0.5·Sy/FS",
        AllowableRule.DISTORTION_ENERGY: "distortion energy (von Mises) Sy/(√3·FS)",
        AllowableRule.SHAFTING_CODE: "shafting code min(0.30·Sy, 0.18·Su)"}
    assert words.RULE_CHOICES == "given, max shear, distortion energy, shafting code"
    for word in words.RULE_WORDS.values():  # every word the outputs write reads back
        assert words.rule_from_text(word) is not None


LOAD_PATHS = [
    ("through the core", LoadPath.THROUGH_CORE), ("through core", LoadPath.THROUGH_CORE),
    ("core", LoadPath.THROUGH_CORE), ("core driven", LoadPath.THROUGH_CORE), ("core-driven", LoadPath.THROUGH_CORE),
    ("through the outer layer", LoadPath.THROUGH_OUTER_LAYER), ("through outer layer", LoadPath.THROUGH_OUTER_LAYER),
    ("outer layer", LoadPath.THROUGH_OUTER_LAYER), ("outer", LoadPath.THROUGH_OUTER_LAYER),
    ("sleeve driven", LoadPath.THROUGH_OUTER_LAYER),
    ("every layer", LoadPath.THROUGH_EVERY_LAYER), ("all layers", LoadPath.THROUGH_EVERY_LAYER),
    ("through every layer", LoadPath.THROUGH_EVERY_LAYER), ("each layer", LoadPath.THROUGH_EVERY_LAYER),
]


@pytest.mark.parametrize("text, path", LOAD_PATHS)
def test_each_load_path_spelling(text, path):
    assert words.load_path_from_text(text) is path
    assert words.load_path_from_text(f"  {text.title()} ") is path


def test_load_path_choices_text():
    assert words.LOAD_PATH_CHOICES == "through the core (the default), through the outer layer, every layer"


@pytest.mark.parametrize("word", ["yes", "y", "true", "1", "x", "keyway", "with keyway"])
def test_each_yes_word(word):
    assert words.flag_from_value(word) is True
    assert words.flag_from_value(word.upper()) is True


@pytest.mark.parametrize("word", ["no", "n", "false", "0", "none", "-", "without keyway"])
def test_each_no_word(word):
    assert words.flag_from_value(word) is False


@pytest.mark.parametrize("text, expected", [
    ([None, "1.5", "#N/A"], True), (["#VALUE!"], True), (["err:502"], True), (["ok", "Err:508"], True),
    (["ok", "a#b"], False), (["xerr:"], False), ([], False), ([None, ""], False), (["1", "2"], False),
])
def test_may_hold_error_values(text, expected):
    assert words.may_hold_error_values(text) is expected


def test_quoted_keeps_a_text_of_exactly_the_limit_whole():
    text = "a" * words.QUOTE_MAX
    assert words.quoted(text) == repr(text)
    assert words.quoted(text + "b") == repr(text) + f" (… {words.QUOTE_MAX + 1} characters)"
    assert words.QUOTE_MAX == 60


OD, W, B = SizedDimension.OUTER_DIAMETER, SizedDimension.WALL, SizedDimension.BORE


@pytest.mark.parametrize("text, expected", [
    # each word for the outer diameter, the wall and the bore, with and without a layer
    *[(f"layer 2 {w}", (OD, 1)) for w in ("outer diameter", "outer dia", "outer dia.", "outer d", "od",
                                         "outside diameter", "diameter")],
    *[(f"L3 {w}", (W, 2)) for w in ("wall", "wall thickness", "thickness")],
    *[(f"core {w}", (B, 0)) for w in ("bore", "inner diameter", "inner dia", "id", "inside diameter")],
    *[(w, (B, 0)) for w in ("bore", "inner diameter", "inner dia", "id", "inside diameter")],
    ("layer 1 bore", (B, 0)), ("core outer diameter", (OD, 0)), ("core: wall", (W, 0)),
    ("outer diameter", (OD, -1)), ("wall", (W, -1)), ("sleeve wall", (W, -1)),
    ("outer layer outer diameter", (OD, -1)), ("outermost layer wall", (W, -1)), ("layer 12 od", (OD, 11)),
    ("layer 1 od", (OD, 0)),
])
def test_size_request_words(text, expected):
    assert words.size_request_from_text(text) == expected


@pytest.mark.parametrize("text", ["layer 0 wall", "layer 2 bore", "sleeve bore", "layer 2 colour", "", 7, None])
def test_size_requests_refused(text):
    assert words.size_request_from_text(text) is None


@pytest.mark.parametrize("dimension, slot, text", [
    (OD, 1, "layer 2 outer diameter"), (W, 0, "layer 1 wall"), (B, 0, "core bore"), (B, 3, "core bore"),
    (OD, -1, "outermost layer outer diameter"), (W, -1, "outermost layer wall"),
])
def test_size_text(dimension, slot, text):
    assert words.size_text(dimension, slot) == text
    if dimension != B:  # what outputs write reads back
        assert words.size_request_from_text(text) == (dimension, slot)


@pytest.mark.parametrize("text, expected", [
    *[(w, OuterLayers.MOVE) for w in ("move", "moves", "moving", "move with it", "follow")],
    *[(w, OuterLayers.FIXED) for w in ("fixed", "fix", "stay", "stays", "keep", "kept")],
    ("Move_With-It", OuterLayers.MOVE), ("sideways", None), (3, None),
])
def test_outer_layers_words(text, expected):
    assert words.outer_layers_from_text(text) is expected


def test_outer_layers_words_written():
    assert dict(words.OUTER_LAYERS_WORDS) == {OuterLayers.MOVE: "move", OuterLayers.FIXED: "fixed"}
    assert words.OUTER_LAYERS_CHOICES == "'move' (the layers outside keep their walls and move out) or 'fixed'"


@pytest.mark.parametrize("text, expected", [
    *[(w, EndSupport.PINNED_PINNED) for w in ("simply supported", "simple", "pinned", "pinned pinned",
                                              "pinned-pinned", "pinned/pinned", "two bearings")],
    *[(w, EndSupport.FIXED_FIXED) for w in ("clamped", "fixed", "fixed fixed", "fixed–fixed",
                                            "clamped both ends")],
    *[(w, EndSupport.FIXED_FREE) for w in ("overhung", "cantilever", "fixed free", "clamped free", "Fixed/Free")],
    *[(w, EndSupport.FIXED_PINNED) for w in ("fixed pinned", "clamped pinned", "clamped-pinned", "propped")],
    ("floating", None),
])
def test_support_words(text, expected):
    assert words.support_from_text(text) is expected


def test_support_choices_text():
    assert words.SUPPORT_CHOICES == "simply supported (blank), clamped, overhung, clamped-pinned"
    for word in ("clamped", "overhung", "clamped-pinned"):  # every choice offered reads
        assert words.support_from_text(word) is not None
