"""A bond allowable cell may name a built-in adhesive class: read through the one schema.

Outside source: the average bond shear of a cylindrical bond, T/(2·π·r²·L) (BRIEF §2, thin
adhesive layer in shear), gives the torque a bond allows as allowable·2·π·r²·L; the interface
passes the sleeve's share G·J/ΣG·J of the section torque (twist compatibility). The adhesive
figures are the library's own (typical, from memory). Parts are invented (BRIEF §4).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from _membook import MemoryBook
from twistshare.engine.cells import TWS_GOVERNING_LIMIT
from twistshare.engine.core import Criterion, adhesive_library
from twistshare.engine.intake import Severity, rate_tables

MATERIALS = [["Material", "G [GPa]", "Allowable shear [MPa]"], ["MPD core steel", 80, 120],
             ["MPD sleeve steel", 80, 120]]
HEAD = ["Part", "Length [mm]", "Torque [N·m]",
        "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 1 inner diameter [mm]",
        "Layer 2 material", "Layer 2 outer diameter [mm]", "Layer 2 inner diameter [mm]",
        "Layer 2 bond allowable [MPa]", "Layer 2 bond length [mm]"]
EPOXY = adhesive_library()["toughened epoxy"].allowable


def _row(pid, bond):
    return [pid, 400, 100, "MPD core steel", 40, None, "MPD sleeve steel", 48, 40, bond, 30]


def _rated(*rows):
    return rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": [HEAD, *rows]}))


def _bond_limit(allowable):
    share = (48**4 - 40**4) / 48**4  # same G: the sleeve's share of ΣGJ
    return allowable * 2 * math.pi * 0.020**2 * 0.030 / share


def test_a_named_adhesive_gives_its_allowable_and_a_note_on_the_cell():
    result = _rated(_row("MPD-S-301", "Toughened  Epoxy"), _row("MPD-S-302", EPOXY / 1e6))
    bond = result.rating.criterion_capacity[Criterion.BOND_SHEAR]
    assert bond[0, 1] == pytest.approx(_bond_limit(EPOXY), rel=1e-12)
    assert bond[0, 1] == pytest.approx(bond[1, 1], rel=1e-12)  # the name equals its number
    notes = [p for p in result.problems if p.code == "library-value"]
    assert len(notes) == 1 and notes[0].severity is Severity.NOTE
    assert notes[0].cell == "J2" and "toughened epoxy" in notes[0].message
    assert "from memory" in notes[0].message and "10 MPa" in notes[0].message


def test_an_unknown_name_is_refused_on_its_cell_and_the_other_parts_are_rated():
    result = _rated(_row("MPD-S-303", "super glue"), _row("MPD-S-304", "cyanoacrylate"))
    errors = [p for p in result.problems if p.severity is Severity.ERROR]
    assert len(errors) == 1 and errors[0].cell == "J2"
    assert "'super glue' is neither a stress" in errors[0].message
    assert "'toughened epoxy'" in errors[0].message  # the names it could have been
    assert list(result.rated) == [False, True]


def test_blank_means_not_bonded_and_a_number_with_a_wrong_unit_is_still_a_unit_error():
    result = _rated(_row("MPD-S-305", None), _row("MPD-S-306", "8 mm"))
    bond = result.rating.criterion_capacity[Criterion.BOND_SHEAR]
    assert np.all(np.isinf(bond[0]))  # no bond anywhere: one +inf per part
    errors = [p for p in result.problems if p.severity is Severity.ERROR]
    assert len(errors) == 1 and errors[0].code == "unit" and errors[0].cell == "J3"


def test_a_cell_function_block_reads_the_name_by_the_same_rule():
    # One row per part with layer groups, as in a parts table.
    layers = [["Part", *HEAD[3:]], ["MPD-S-307", *_row("", "toughened epoxy")[3:]]]
    limit = TWS_GOVERNING_LIMIT(layers, "400 mm", None, None, "N·m", MATERIALS)
    layer_cap = 120e6 * (math.pi / 32 * 0.048**4) / 0.024  # the sleeve's stress, same G
    assert limit[0] == ["governing limit [N·m]"]
    assert limit[1][0] == pytest.approx(min(_bond_limit(EPOXY), layer_cap), rel=1e-9)
    assert _bond_limit(EPOXY) < layer_cap  # the bond governs


def test_a_named_adhesive_running_above_its_service_temperature_is_warned_and_still_rated():
    # cyanoacrylate's typical upper service temperature is 80 °C (the library's, from memory)
    head = HEAD + ["Operating temperature [°C]"]
    rows = [_row("MPD-S-308", "cyanoacrylate") + [95], _row("MPD-S-309", "cyanoacrylate") + [60],
            _row("MPD-S-310", 6) + [95]]
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": [head, *rows]}))
    hot = [p for p in result.problems if p.code == "adhesive-too-hot"]
    assert len(hot) == 1 and hot[0].severity is Severity.WARNING and hot[0].cell == "J2"
    assert "95 °C is above the typical upper service temperature of cyanoacrylate (about 80 °C" in hot[0].message
    assert list(result.rated) == [True, True, True]


def test_the_one_row_per_layer_layout_reads_the_name_and_warns_the_same():
    parts = [["Part", "Length [mm]", "Torque [N·m]", "Operating temperature [°C]"],
             ["MPD-S-311", 400, 100, 95]]
    layers = [["Part", "Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]",
               "Bond allowable [MPa]", "Bond length [mm]"],
              ["MPD-S-311", 1, "MPD core steel", 40, None, None, None],
              ["MPD-S-311", 2, "MPD sleeve steel", 48, 40, "Cyanoacrylate", 30]]
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": parts, "Layers": layers}))
    bond = result.rating.criterion_capacity[Criterion.BOND_SHEAR]
    assert bond[0, 1] == pytest.approx(_bond_limit(adhesive_library()["cyanoacrylate"].allowable), rel=1e-12)
    hot = [p for p in result.problems if p.code == "adhesive-too-hot"]
    assert len(hot) == 1 and hot[0].sheet == "Layers" and hot[0].cell == "F3"
