"""The words every output shares (`_wording`): written out here in full as their specification.

The caution, the method line, what governs, the sizing outcomes: every output, README and the
sample books use these, so each one is pinned word for word here, and README's own tables are
checked to use the same words. Values shown in a unit system through pint's own definitions
(1 in = 25.4 mm, lbf·in, psi).
"""

from __future__ import annotations

from pathlib import Path

import pint
import pytest
from twistshare.engine.core import Criterion, SizingStatus, StockStatus
from twistshare.engine.intake._wording import (
    BOND_CAUTION,
    CAUTION_LINES,
    CRITERION_NOUNS,
    CRITERION_WORDS,
    METHOD_LINE,
    SIZING_CAUTION,
    SIZING_STATUS_WORDS,
    STOCK_STATUS_WORDS,
    Display,
    governs_text,
)

U = pint.UnitRegistry()
README = " ".join((Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8").split())


def test_the_caution_word_for_word():
    assert CAUTION_LINES == (
        "twistshare is a preliminary design aid; its results are not a design approval.",
        "Verify every result against the applicable codes and standards for the machine and its duty.",
        "Have a qualified engineer review the inputs, the method and the results before use.",
        "Local codes and licensed engineering practice prevail over anything this workbook shows.",
    )


def test_the_method_line_word_for_word():
    assert METHOD_LINE == (
        "Method: layers twist as one (full connection along the length), elastic stress only, static torque; "
        "static bending, axial force, whirl, thin-wall buckling, fits and bonds where their inputs are given; "
        "fatigue is not checked here.")


@pytest.mark.parametrize("criterion, layer, text", [
    (Criterion.LAYER_STRESS, 1, "layer 2 stress"),
    (Criterion.TWIST_ANGLE, -1, "twist angle limit"),
    (Criterion.TWIST_PER_LENGTH, -1, "twist per length limit"),
    (Criterion.COMBINED_STRESS, 0, "layer 1 combined stress (bending held at its given value)"),
    (Criterion.WHIRL, -1, "whirl: speed above 70 % of the first critical"),
    (Criterion.TORSIONAL_BUCKLING, -1, "torsional buckling of the wall"),
    (Criterion.INTERFACE_SLIP, 2, "slip of the fit between layers 2 and 3"),
    (Criterion.BOND_SHEAR, 1, "average bond shear between layers 1 and 2"),
    (Criterion.FIT_STRESS, 2, "layer 3 fit and torsion stress"),
])
def test_what_governs_word_for_word(criterion, layer, text):
    # Every criterion has words, and they read as the results sheet prints them.
    assert set(CRITERION_WORDS) == {c for c in Criterion if c != Criterion.NONE}
    assert governs_text(criterion, layer, None) == text


def test_the_criterion_nouns_word_for_word():
    assert dict(CRITERION_NOUNS) == {
        Criterion.LAYER_STRESS: "a layer's shear stress",
        Criterion.TWIST_ANGLE: "twist angle limit",
        Criterion.TWIST_PER_LENGTH: "twist per length limit",
        Criterion.COMBINED_STRESS: "a layer's combined stress, bending held fixed",
        Criterion.WHIRL: "whirl gate (0: too close to the first critical)",
        Criterion.TORSIONAL_BUCKLING: "torsional buckling",
        Criterion.INTERFACE_SLIP: "slip of a fit",
        Criterion.BOND_SHEAR: "average bond shear",
        Criterion.FIT_STRESS: "a layer's fit and torsion stress",
    }


def test_the_bond_and_sizing_cautions_word_for_word():
    assert BOND_CAUTION == (
        "the bond is rated by its average shear T/(2π·r²·L); the shear peaks at the ends of the bond well "
        "above the average, so the allowable must be one meant for the average over a joint of this kind "
        "(the adhesive maker's data), not the peak")
    assert SIZING_CAUTION == (
        "Sizing solves one dimension for the target reserve factor against the criteria rated here only "
        "(layer stresses with Kt, twist limits); fits, bonds, fatigue and bending are not in it. Re-rate the "
        "size chosen with its real tolerances before it is made.")


def test_the_sizing_outcomes_word_for_word():
    assert dict(SIZING_STATUS_WORDS) == {
        SizingStatus.SOLVED: "solved",
        SizingStatus.HOLDS_AT_LEAST: ("holds already with the least material tried (smallest diameter or wall, "
                                      "largest bore)"),
        SizingStatus.SHORT_AT_MOST: "no size in the range holds",
        SizingStatus.NOT_MONOTONE: "capacity falls as material is added: rate the sizes around it",
        SizingStatus.NOT_RATED: "a size tried could not be rated",
        SizingStatus.NOT_APPLICABLE: "the part has no such dimension",
        SizingStatus.BAD_INPUT: "nothing to size for (no torque, or no range to search)",
    }
    assert dict(STOCK_STATUS_WORDS) == {
        StockStatus.FOUND: "stock size found",
        StockStatus.NONE_HOLDS: "no stock size listed holds",
        StockStatus.NOT_RATED: "a stock size tried could not be rated",
        StockStatus.NOT_APPLICABLE: "no stock size to choose (nothing sized)",
    }


@pytest.mark.parametrize("words", ["slip of the fit between layers", "average bond shear between layers",
                                   "fit and torsion stress"])
def test_readme_uses_the_same_words(words):
    assert words in README


@pytest.mark.parametrize("status", [SizingStatus.SOLVED, SizingStatus.HOLDS_AT_LEAST, SizingStatus.SHORT_AT_MOST,
                                    SizingStatus.NOT_MONOTONE])
def test_readme_quotes_the_sizing_outcomes(status):
    assert f"`{SIZING_STATUS_WORDS[status]}`" in README


@pytest.mark.parametrize("criterion, layer, material, text", [
    (Criterion.NONE, -1, "MPD steel", ""),
    (Criterion.NONE, 0, None, ""),
    (Criterion.LAYER_STRESS, 1, "Stainless 316 annealed", "layer 2 stress (Stainless 316 annealed)"),
    (Criterion.LAYER_STRESS, 0, "MPD steel", "layer 1 stress (MPD steel)"),
    (Criterion.LAYER_STRESS, 0, None, "layer 1 stress"),
    (Criterion.LAYER_STRESS, 2, "", "layer 3 stress"),
    (Criterion.TWIST_ANGLE, -1, "MPD steel", "twist angle limit"),
    (Criterion.TWIST_PER_LENGTH, -1, None, "twist per length limit"),
    (Criterion.INTERFACE_SLIP, 1, None, "slip of the fit between layers 1 and 2"),
    (Criterion.BOND_SHEAR, 2, "MPD bronze", "average bond shear between layers 2 and 3 (MPD bronze)"),
    (int(Criterion.FIT_STRESS), 1, None, "layer 2 fit and torsion stress"),
])
def test_governs_text(criterion, layer, material, text):
    assert governs_text(criterion, layer, material) == text


def test_display_in_si_and_us():
    si, us = Display("SI"), Display("US")
    assert si.unit("length") == ("mm", pytest.approx(U.Quantity(1, "mm").to("m").magnitude, rel=1e-12))
    assert us.unit("stress") == ("psi", pytest.approx(U.Quantity(1, "psi").to("Pa").magnitude, rel=1e-12))
    assert si(0.04, "length") == "40 mm"
    assert si(0.0123456, "length") == "12.35 mm"  # four significant digits unless told
    assert si(0.0123456, "length", 3) == "12.3 mm"
    assert us(U.Quantity(1.5, "inch").to("m").magnitude, "length") == "1.5 in"
    assert us(U.Quantity(1200, "lbf * inch").to("N * m").magnitude, "torque") == "1200 lbf·in"
    assert si(-123.4e6, "stress") == "-123.4 MPa"
    assert si(0.3, "dimensionless") == "0.3"  # no unit, no trailing space
    assert si.unit("dimensionless") == ("", 1.0)
    assert si(0.3, "dimensionless") == "0.3"  # from the cache, the same
