"""The built-in adhesive classes: generic names, typical figures labelled as recalled.

No outside table is checked here: the figures are typical values from memory (the module says
so) and the design factor of 3 is common practice, from memory. What is checked is what the
library promises: each allowable is its strength over the design factor, every entry names its
test and its source, lookups ignore case and spacing, and nothing in it can be changed.
"""

import doctest

import pytest
import twistshare.engine.core._adhesives as adhesives_module
from twistshare.engine.core import (
    ADHESIVE_DESIGN_FACTOR,
    ADHESIVE_SOURCE,
    Adhesive,
    adhesive_library,
    find_adhesive,
)


def test_docstring_examples():
    assert doctest.testmod(adhesives_module).failed == 0


def test_every_allowable_is_the_strength_over_the_design_factor():
    library = adhesive_library()
    assert len(library) >= 3
    for adhesive in library.values():
        assert adhesive.allowable == pytest.approx(adhesive.typical_strength / ADHESIVE_DESIGN_FACTOR,
                                                   rel=1e-15)
        assert 1e6 < adhesive.allowable < 20e6  # inside the bond allowable's plausible range
        assert "from memory" in adhesive.source and "typical" in adhesive.source
        assert "test" in adhesive.test
        assert adhesive.max_temperature > 273.15


def test_the_classes_asked_for_are_there_by_generic_names():
    names = set(adhesive_library())
    for wanted in ("toughened epoxy", "high-strength anaerobic retaining compound", "cyanoacrylate"):
        assert wanted in names
    assert "from memory" in ADHESIVE_SOURCE


def test_lookup_ignores_case_and_spacing_and_needs_the_class_name():
    assert find_adhesive("  Toughened   EPOXY ").name == "toughened epoxy"
    assert find_adhesive("epoxy") is None
    assert find_adhesive("") is None


def test_the_library_cannot_be_changed_and_a_bad_entry_is_refused():
    library = adhesive_library()
    with pytest.raises(TypeError):
        library["mine"] = library["cyanoacrylate"]  # type: ignore[index]
    with pytest.raises(ValueError, match="typical strength must be > 0: -1"):
        Adhesive("bad", -1.0, "test", 300.0, "")


def test_readme_table_is_the_library():
    """README prints the classes users may name: every row is a class here, in order, with the
    same figures (strength and allowable in MPa, temperature in °C), under the library's source."""
    from pathlib import Path

    text = (Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8")
    start = text.index("| adhesive class |")
    rows = [line.strip("|").split(" | ") for line in text[start:].split("\n\n")[0].splitlines()[2:]]
    expected = [[a.name, f"{a.typical_strength / 1e6:g}", a.test, f"{a.allowable / 1e6:.1f}",
                 f"{a.max_temperature - 273.15:g}", a.notes] for a in adhesive_library().values()]
    assert [[c.strip() for c in row] for row in rows] == expected
    assert f"*{ADHESIVE_SOURCE}*" in text
    assert all(a.source == ADHESIVE_SOURCE for a in adhesive_library().values())


def test_entries_are_frozen_and_any_positive_strength_is_accepted():
    entry = adhesive_library()["cyanoacrylate"]
    with pytest.raises(AttributeError):
        entry.typical_strength = 1.0  # type: ignore[misc]
    with pytest.raises(ValueError, match="typical strength must be > 0: 0.0"):
        Adhesive("bad", 0.0, "test", 300.0, "")
    assert Adhesive("weak", 0.5, "test", 300.0, "").allowable == pytest.approx(0.5 / ADHESIVE_DESIGN_FACTOR)
