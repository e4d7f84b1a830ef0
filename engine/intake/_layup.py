"""Standard laminate notation read into a tuple of ply angles, in degrees as written.

The notation lists ply angles from the first ply (for a wound tube, the mandrel side):

- ``/`` separates plies: ``[0/90/45]``; brackets may be left off a plain list (``0/90``);
- ``±45`` is ``+45`` then ``-45``, ``∓45`` the other way round (also ``+-45``, ``-+45`` and
  ``+/-45``);
- a count repeats a ply, written ``45_2`` or ``45₂``: ``[0_2/90]`` is ``0, 0, 90``;
  a pair takes parentheses to repeat, ``(±45)_2`` (``±45_2`` is refused as ambiguous);
- parentheses group plies, with a count: ``[0/(±45)2/90]``;
- after the closing bracket, a count repeats the whole list and ``s`` (``S``) mirrors it:
  ``[0/90]s`` is ``0, 90, 90, 0``; ``[0/±45/90]2s`` repeats the list twice, then mirrors;
  ``T`` (total) says the list is written out in full;
- an overline on the last ply of a symmetric list (``[0/90̄]s``, a combining overline after
  the angle) marks the mid-plane ply: it is not repeated by the mirror.

Angles must lie in [-90, 90]. Commas are refused, since ``22,5`` may be a decimal comma.
Pure Python: no numpy here, so it can live in any input-reading layer.
"""

from __future__ import annotations

import re

__all__ = ["LayupNotationError", "parse_layup"]

_SUBSCRIPT_DIGITS = str.maketrans("₀₁₂₃₄₅₆₇₈₉", "0123456789")
_OVERLINES = ("\u0304", "\u0305")
_PAIR_SIGNS = {"±": 1.0, "∓": -1.0, "+/-": 1.0, "-/+": -1.0, "+-": 1.0, "-+": -1.0}
_EXAMPLE = "'[0/±45/90]2s'"


class LayupNotationError(ValueError):
    """A layup text that does not follow the notation.

    Attributes
    ----------
    text : str
        The text as given.
    position : int
        Index in the text where reading stopped.
    expected : str
        What was expected there.
    """

    def __init__(self, text: str, position: int, expected: str, found: str | None = None):
        self.text = text
        self.position = position
        self.expected = expected
        found_text = "the end of the text" if not found else repr(found)
        super().__init__(
            f"layup {text!r}: expected {expected} at character {position + 1}, "
            f"found {found_text}; write a layup like {_EXAMPLE}"
        )


class _Reader:
    """Recursive-descent reader over the text with blanks removed."""

    def __init__(self, original: str):
        self.original = original
        # Blanks are dropped, but each kept character remembers where it stood.
        self.where = [i for i, char in enumerate(original) if not char.isspace()]
        self.text = "".join(original[i] for i in self.where)
        self.pos = 0

    def fail(self, expected: str, at: int | None = None) -> LayupNotationError:
        if at is None:
            at = self.where[self.pos] if self.pos < len(self.where) else len(self.original)
        found = self.original[at:at + 6].rstrip() or None
        return LayupNotationError(self.original, at, expected, found)

    def peek(self, length: int = 1) -> str:
        return self.text[self.pos:self.pos + length]

    def count(self) -> int | None:
        match = re.compile(r"_?([0-9₀-₉]+)").match(self.text, self.pos)
        if not match:
            return None
        value = int(match.group(1).translate(_SUBSCRIPT_DIGITS))
        if value < 1:
            raise self.fail("a repeat count of at least 1")
        self.pos = match.end()
        return value

    def sequence(self, closing: str | None) -> tuple[list[float], bool]:
        plies: list[float] = []
        mid_plane = False
        while True:
            if mid_plane:
                raise self.fail("nothing after the overlined mid-plane ply")
            item, mid_plane = self.item()
            plies.extend(item)
            if self.peek() == "/":
                self.pos += 1
                continue
            if closing is None and self.pos == len(self.text):
                return plies, mid_plane
            if closing is not None and self.peek() == closing:
                self.pos += 1
                return plies, mid_plane
            expected = "'/' or the end" if closing is None else f"'/' or '{closing}'"
            raise self.fail(expected)

    def item(self) -> tuple[list[float], bool]:
        if self.peek() == "(":
            self.pos += 1
            group, mid = self.sequence(")")
            if mid:
                raise self.fail("the mid-plane overline on the last ply, outside parentheses")
            if not group:
                raise self.fail("plies inside the parentheses")
            repeat = self.count() or 1
            return group * repeat, False
        return self.ply()

    def ply(self) -> tuple[list[float], bool]:
        pair = None
        for sign, first in _PAIR_SIGNS.items():
            if self.text.startswith(sign, self.pos):
                pair, self.pos = first, self.pos + len(sign)
                break
        match = re.compile(r"[+-]?(\d+(\.\d*)?|\.\d+)").match(self.text, self.pos)
        if pair is not None and match and match.group(0)[0] in "+-":
            raise self.fail("an unsigned angle after the pair sign")
        if not match:
            raise self.fail("a ply angle (a number of degrees)")
        angle = float(match.group(0)) + 0.0
        start = self.pos
        self.pos = match.end()
        if self.peek() == "°":
            self.pos += 1
        if not -90.0 <= angle <= 90.0:
            self.pos = start
            raise self.fail("a ply angle between -90 and 90 degrees (write 135 as -45)")
        mid = False
        if self.peek() in _OVERLINES:
            self.pos += 1
            mid = True
        if pair is not None:
            if angle == 0.0:
                self.pos = start
                raise self.fail("a non-zero angle after the pair sign (±0 is one angle)")
            at_count = self.pos
            if self.count() is not None:
                self.pos = at_count
                raise self.fail("no count after a pair: write (±45)_2 or +45_2/-45_2")
            if mid:
                raise self.fail("a single ply at the mid-plane, not a pair")
            return [pair * angle, -pair * angle], False
        repeat = self.count() or 1
        if mid and repeat != 1:
            raise self.fail("one mid-plane ply (no count on the overlined ply)")
        return [angle] * repeat, mid

    def suffix(self) -> tuple[int, bool, bool]:
        repeat = self.count() or 1
        symmetric = total = False
        letter = self.peek()
        if letter in ("s", "S", "ₛ"):
            symmetric = True
            self.pos += 1
        elif letter in ("T", "t"):
            total = True
            self.pos += 1
        if self.pos != len(self.text):
            raise self.fail("a repeat count, 's' (symmetric) or 'T' (total) after ']'")
        return repeat, symmetric, total


def parse_layup(text: str) -> tuple[float, ...]:
    """Ply angles of a layup written in standard laminate notation.

    Parameters
    ----------
    text : str
        For example ``'[±45]s'``, ``'[0/90]s'``, ``'[±30/90]'``, ``'[0/±45/90]2s'``,
        ``'[45/-45]'``. Blanks are ignored.

    Returns
    -------
    tuple of float, degrees
        One angle per ply, from the first ply written (the mandrel side of a tube).

    Raises
    ------
    LayupNotationError
        A ``ValueError`` whose message names the text, the position and what was expected.

    Examples
    --------
    >>> parse_layup("[±45]s")
    (45.0, -45.0, -45.0, 45.0)
    >>> parse_layup("[0/90]s")
    (0.0, 90.0, 90.0, 0.0)
    """
    if not isinstance(text, str):
        raise TypeError(f"layup must be text; got {type(text).__name__} {text!r}")
    reader = _Reader(text)
    compact = reader.text
    split_number = re.search(r"[\d.]\s+[\d.]", text)
    if split_number:
        raise reader.fail("'/' between plies, or no blank inside a number",
                          at=split_number.start() + 1)
    if not compact:
        raise reader.fail("a layup")
    if "," in compact:
        reader.pos = compact.index(",")
        raise reader.fail("'/' between plies (a comma may be a decimal comma)")
    if compact.startswith("["):
        reader.pos = 1
        plies, mid = reader.sequence("]")
        repeat, symmetric, _ = reader.suffix()
    else:
        plies, mid = reader.sequence(None)
        repeat, symmetric = 1, False
    if mid and not (symmetric and repeat == 1):
        reader.pos = 0
        raise reader.fail("a mid-plane overline only in a symmetric list without a count")
    plies = plies * repeat
    if symmetric:
        mirror = plies[-2::-1] if mid else plies[::-1]
        plies = plies + mirror
    return tuple(plies)
