"""Standard laminate notation (Jones, Mechanics of Composite Materials, laminate orientation code;
Daniel and Ishai, Engineering Mechanics of Composite Materials; from memory) read into angles."""

import doctest

import pytest
import twistshare.engine.intake._layup as notation
from hypothesis import given, settings
from hypothesis import strategies as st
from twistshare.engine.intake._layup import LayupNotationError, parse_layup


def test_docstring_examples():
    assert doctest.testmod(notation).failed == 0


def test_pure_python():
    """The module is meant for the input-reading layer: no numpy."""
    source = open(notation.__file__, encoding="utf-8").read()
    assert "numpy" not in source.split('"""', 2)[2]


@pytest.mark.parametrize(("text", "angles"), [
    # the brief's examples, expanded by the notation's rules
    ("[±45]s", (45, -45, -45, 45)),
    ("[0/90]s", (0, 90, 90, 0)),
    ("[±30/90]", (30, -30, 90)),
    ("[0/±45/90]2s", (0, 45, -45, 90, 0, 45, -45, 90, 90, -45, 45, 0, 90, -45, 45, 0)),
    ("[45/-45]", (45, -45)),
    # other spellings engineers type
    ("[+45/-45]", (45, -45)),
    ("[∓45]", (-45, 45)),
    ("[+-45]s", (45, -45, -45, 45)),
    ("[+/-45]", (45, -45)),
    ("[-/+30/0]", (-30, 30, 0)),
    ("[0_2/90]", (0, 0, 90)),
    ("[0₂/90₃]", (0, 0, 90, 90, 90)),
    ("[0/(±45)2/90]", (0, 45, -45, 45, -45, 90)),
    ("[(0/90)_2]T", (0, 90, 0, 90)),
    ("[0/90]2", (0, 90, 0, 90)),
    ("[0/90]_2s", (0, 90, 0, 90, 90, 0, 90, 0)),
    ("[0/90]S", (0, 90, 90, 0)),
    ("[0°/90°]s", (0, 90, 90, 0)),
    ("[22.5/-67.5]", (22.5, -67.5)),
    ("[0/90\u0304]s", (0, 90, 0)),
    (" [ 0 / ±45 ] s ", (0, 45, -45, -45, 45, 0)),
    ("0/90/0", (0, 90, 0)),
    ("[-0]", (0,)),
])
def test_reads(text, angles):
    assert parse_layup(text) == tuple(float(a) for a in angles)


@pytest.mark.parametrize(("text", "words"), [
    ("", "expected a layup"),
    ("[]", "expected a ply angle"),
    ("[0/90", "expected '/' or ']' at character 6, found the end of the text"),
    ("[0/135]", "between -90 and 90 degrees (write 135 as -45) at character 4, found '135]'"),
    ("[0,90]", "'/' between plies (a comma may be a decimal comma) at character 3"),
    ("[22,5/0]", "a comma may be a decimal comma"),
    ("[±45_2]", "no count after a pair: write (±45)_2 or +45_2/-45_2 at character 5"),
    ("[±0]", "±0 is one angle"),
    ("[±-45]", "an unsigned angle after the pair sign"),
    ("[0/90]x", "a repeat count, 's' (symmetric) or 'T' (total) after ']' at character 7"),
    ("[0/9 0]", "no blank inside a number at character 5"),
    ("[0 90]", "'/' between plies"),
    ("[0/abc]", "expected a ply angle (a number of degrees) at character 4, found 'abc]'"),
    ("[0/(45/90]", "expected '/' or ')'"),
    ("[0/90\u0304/0]s", "nothing after the overlined mid-plane ply"),
    ("[0/90\u0304]", "a mid-plane overline only in a symmetric list"),
    ("[0/90]0", "a repeat count of at least 1"),
    ("0/90s", "expected '/' or the end"),
])
def test_errors_name_the_text_and_what_was_expected(text, words):
    with pytest.raises(LayupNotationError) as caught:
        parse_layup(text)
    message = str(caught.value)
    assert message.startswith(f"layup {text!r}: expected")
    assert words in message
    assert isinstance(caught.value, ValueError)
    assert caught.value.text == text


def test_not_text():
    with pytest.raises(TypeError, match="layup must be text; got int 45"):
        parse_layup(45)  # type: ignore[arg-type]


angles = st.lists(st.integers(-90, 90), min_size=1, max_size=8)


@settings(max_examples=150, deadline=None, database=None)
@given(angles)
def test_written_out_list_reads_back(values):
    text = "[" + "/".join(str(v) for v in values) + "]"
    assert parse_layup(text) == tuple(float(v) for v in values)


@settings(max_examples=150, deadline=None, database=None)
@given(angles, st.integers(1, 3))
def test_symmetric_is_a_palindrome_of_twice_the_plies(values, repeat):
    text = "[" + "/".join(str(v) for v in values) + f"]{repeat}s"
    plies = parse_layup(text)
    assert plies == plies[::-1]
    assert len(plies) == 2 * repeat * len(values)


# The notation's less common spellings and every refusal's words (Jones; Daniel and Ishai; the
# combining overline U+0304/U+0305 marks the unrepeated mid-plane ply of a symmetric list,
# common practice). Expected angles are written out by hand from the notation.

@pytest.mark.parametrize("text, angles", [
    ("-+45", (-45.0, 45.0)),
    ("∓30", (-30.0, 30.0)),
    ("+-45", (45.0, -45.0)),
    ("[0/45/90\u0305]s", (0.0, 45.0, 90.0, 45.0, 0.0)),
    ("[0/45/90\u0304]s", (0.0, 45.0, 90.0, 45.0, 0.0)),
    ("[(0/90)]", (0.0, 90.0)),
    ("[0/90]ₛ", (0.0, 90.0, 90.0, 0.0)),
    ("[0/90]t", (0.0, 90.0)),
    ("[0/90]T", (0.0, 90.0)),
    ("[-90/90]", (-90.0, 90.0)),
])
def test_other_spellings(text, angles):
    assert parse_layup(text) == angles


def test_minus_zero_is_zero():
    assert str(parse_layup("[-0]")[0]) == "0.0"


@pytest.mark.parametrize("text, words", [
    ("[0]0", "a repeat count of at least 1"),
    ("[0\u0305/45]s", "nothing after the overlined mid-plane ply"),
    ("[(0/90\u0305)]s", "the mid-plane overline on the last ply, outside parentheses"),
    ("[±-45]", "an unsigned angle after the pair sign"),
    ("[±+-45]", "a ply angle (a number of degrees)"),  # one pair sign, not two
    ("[±0]", "a non-zero angle after the pair sign (±0 is one angle)"),
    ("[0/±45\u0305]s", "a single ply at the mid-plane, not a pair"),
    ("[0/90\u03052]s", "one mid-plane ply (no count on the overlined ply)"),
    ("[-90.5]", "a ply angle between -90 and 90 degrees"),
    ("[90.5]", "a ply angle between -90 and 90 degrees"),
])
def test_refusals_say_what_was_expected(text, words):
    with pytest.raises(LayupNotationError) as got:
        parse_layup(text)
    assert got.value.expected.startswith(words)
    assert f"expected {words}" in str(got.value)
    assert str(got.value).endswith("write a layup like '[0/±45/90]2s'")


def test_a_refusal_quotes_six_characters_from_where_it_stopped():
    with pytest.raises(LayupNotationError) as got:
        parse_layup("[0/abcdefgh]")
    assert got.value.position == 3  # the 'a', zero-based, as the test wrote it
    assert "at character 4, found 'abcdef';" in str(got.value)
    assert got.value.text == "[0/abcdefgh]"


def test_an_overline_outside_a_symmetric_list_is_refused_at_the_start():
    with pytest.raises(LayupNotationError) as got:
        parse_layup("[0/90\u0305]")
    assert got.value.position == 0
    assert got.value.expected == "a mid-plane overline only in a symmetric list without a count"
    assert "at character 1," in str(got.value)


def test_not_text_is_a_type_error_naming_the_type():
    with pytest.raises(TypeError, match=r"^layup must be text; got int 45$"):
        parse_layup(45)
