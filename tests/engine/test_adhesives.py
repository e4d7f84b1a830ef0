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
