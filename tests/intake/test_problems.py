"""engine/intake/_problems.py: severities, which ones stop a result, and a problem's words.

The expected texts are the module's documented forms (``Sheet!A1``, "error: Parts!C5: ...")
written out here; the severity order is the one the module states (an error stops more than a
warning, a warning more than a note)."""

from __future__ import annotations

import dataclasses

import pytest
from twistshare.engine.intake import Problem, Severity, stops

E, W, N = Severity.ERROR, Severity.WARNING, Severity.NOTE


def test_severity_words():
    assert [s.value for s in Severity] == ["error", "warning", "note"]


@pytest.mark.parametrize(("severity", "threshold", "expected"), [
    (E, E, True), (W, E, False), (N, E, False),
    (E, W, True), (W, W, True), (N, W, False),
    (E, N, True), (W, N, True), (N, N, True),
])
def test_stops_at_least_as_severe_as_the_threshold(severity, threshold, expected):
    assert stops(severity, threshold) is expected


def test_defaults():
    p = Problem(E, "Parts", "C5", "m")
    assert (p.part, p.layer, p.code, p.values, p.material) == (None, None, "input", (), None)


def test_frozen():
    with pytest.raises(dataclasses.FrozenInstanceError):
        Problem(E, "Parts", "C5", "m").message = "x"  # type: ignore[misc]


@pytest.mark.parametrize(("sheet", "cell", "place", "line"), [
    ("Parts", "C5", "Parts!C5", "error: Parts!C5: layer 2 is missing"),
    ("Parts", None, "Parts", "error: Parts: layer 2 is missing"),
    (None, "C5", "", "error: layer 2 is missing"),
    (None, None, "", "error: layer 2 is missing"),
])
def test_place_and_line(sheet, cell, place, line):
    p = Problem(E, sheet, cell, "layer 2 is missing")
    assert p.place == place
    assert p.line() == line


def test_line_of_a_note():
    assert Problem(N, "Materials", "B3", "G filled in").line() == "note: Materials!B3: G filled in"
