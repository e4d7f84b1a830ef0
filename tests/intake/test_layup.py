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
