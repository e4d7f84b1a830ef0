"""The interface columns read into the criteria's inputs, and the interface findings worded.

Outside sources: each unit through pint's own definitions (GPa, MPa, mm, °C and °F to kelvin);
the interference at temperature δ(T) = δ₀ − (α_outer − α_inner)·d·(T − T₀) of a sleeve and its
core (the free thermal growth of both members at the fit diameter; common practice); the
same-material shrink fit on a solid shaft p = E·δ·(do² − d²)/(2·d·do²) and the sleeve's bore
hoop stress p·(do² + d²)/(do² − d²) (Lamé; Shigley's Mechanical Engineering Design, press and
shrink fits). The messages are the intake's own wording, written out here as its specification.
Expansion coefficients of steel 11.7e-6/K and of a bronze 18e-6/K are typical values, from
memory. Parts are invented (BRIEF §4).
"""

from __future__ import annotations

import math

import numpy as np
import pint
import pytest
from _membook import MemoryBook
from twistshare.engine.core import DEFAULT_LOAD_PATH, LoadPath
from twistshare.engine.intake import Severity, rate_tables

U = pint.UnitRegistry()

MATERIALS = [["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Yield strength [MPa]",
              "Allowable shear [MPa]", "Expansion coefficient [1/K]", "Factor of safety"],
             ["MPD steel", 79.6, 207, 0.3, 400, 200, 11.7e-6, 2],
             ["MPD bronze", 40, 110, 0.34, 250, 100, 18e-6, 1.5],
             ["MPD plain", 80, None, None, None, 120, None, None]]
BASE = ["Part", "Length [mm]", "Torque [N·m]",
        "Layer 1 material", "Layer 1 outer diameter [mm]", "Layer 1 inner diameter [mm]",
        "Layer 2 material", "Layer 2 outer diameter [mm]", "Layer 2 inner diameter [mm]"]
FIT = ["Layer 2 interference [mm]", "Layer 2 fit length [mm]", "Layer 2 friction"]
BOND = ["Layer 2 bond allowable [MPa]", "Layer 2 bond length [mm]"]
SLEEVED = [500, 300, "MPD steel", 40, None, "MPD steel", 60, 40]


def _si(value, unit, to):
    return U.Quantity(value, unit).to(to).magnitude


def _rated(head, *rows, materials=MATERIALS):
    return rate_tables(MemoryBook({"Materials": materials, "Parts": [head, *rows]}))


def _found(result, code):
    return [p for p in result.problems if p.code == code]


def test_layer_and_part_inputs_are_read_in_si():
    head = BASE + FIT + ["Operating temperature [°C]", "Assembly temperature [°F]"]
    result = _rated(head, ["MPD-I-001", 500, 300, "MPD steel", 40, None, "MPD bronze", 60, 40,
                           0.02, 50, 0.12, 60, 68])
    inputs = result.parts.inputs
    assert inputs["interference"][0, 1] == pytest.approx(_si(0.02, "mm", "m"), rel=1e-12)
    assert inputs["fit_length"][0, 1] == pytest.approx(_si(50, "mm", "m"), rel=1e-12)
    assert inputs["friction"][0, 1] == pytest.approx(0.12, rel=1e-12)
    assert np.isnan(inputs["interference"][0, 0])  # no column for layer 1
    assert inputs["operating_temperature"][0] == pytest.approx(_si(60, "degC", "K"), rel=1e-12)
    assert inputs["assembly_temperature"][0] == pytest.approx(_si(68, "degF", "K"), rel=1e-12)
    assert inputs["load_path"][0] == float(DEFAULT_LOAD_PATH)  # blank: through the core
    # each layer's material values, the materials table's own, in SI
    for key, steel, bronze in (("youngs_modulus", _si(207, "GPa", "Pa"), _si(110, "GPa", "Pa")),
                               ("poisson_ratio", 0.3, 0.34),
                               ("yield_strength", _si(400, "MPa", "Pa"), _si(250, "MPa", "Pa")),
                               ("expansion_coefficient", 11.7e-6, 18e-6),
                               ("factor_of_safety", 2.0, 1.5)):
        assert inputs[key][0, 0] == pytest.approx(steel, rel=1e-12), key
        assert inputs[key][0, 1] == pytest.approx(bronze, rel=1e-12), key
    assert list(result.rated) == [True]
    assert not [p for p in result.problems if p.severity is Severity.ERROR]


def test_a_material_without_values_gives_nan_and_an_empty_slot_nan():
    head = BASE + FIT
    result = _rated(head, ["MPD-I-002", 500, 300, "MPD plain", 40, None, "MPD steel", 60, 40, 0.02, 50, 0.12],
                    ["MPD-I-003", 500, 300, "MPD steel", 40, None, None, None, None, None, None, None])
    inputs = result.parts.inputs
    for key in ("youngs_modulus", "poisson_ratio", "yield_strength", "expansion_coefficient"):
        assert np.isnan(inputs[key][0, 0]), key
        assert not np.isnan(inputs[key][0, 1]), key
        assert np.isnan(inputs[key][1, 1]), key  # no layer 2 in that part
    assert inputs["youngs_modulus"][1, 0] == pytest.approx(_si(207, "GPa", "Pa"), rel=1e-12)


def test_no_interface_column_adds_no_inputs():
    head = BASE + ["Operating temperature [°C]", "Load path"]
    result = _rated(head, ["MPD-I-004", *SLEEVED, 60, "sideways"])
    assert "interference" not in result.parts.inputs
    assert "load_path" not in result.parts.inputs
    assert "yield_strength" not in result.parts.inputs  # E and ν are read for bending anyway
    assert "expansion_coefficient" not in result.parts.inputs
    assert list(result.rated) == [True]  # nothing reads the load path without an interface column


@pytest.mark.parametrize("text, path", [("every layer", LoadPath.THROUGH_EVERY_LAYER),
                                        ("Through the outer layer", LoadPath.THROUGH_OUTER_LAYER),
                                        ("through the core", LoadPath.THROUGH_CORE),
                                        (None, DEFAULT_LOAD_PATH)])
def test_load_path_words(text, path):
    result = _rated(BASE + FIT + ["Load path"], ["MPD-I-005", *SLEEVED, 0.02, 50, 0.12, text])
    assert result.parts.inputs["load_path"][0] == float(path)
    assert list(result.rated) == [True]


def test_an_unknown_load_path_is_refused_on_its_cell():
    result = _rated(BASE + FIT + ["Load path"], ["MPD-I-006", *SLEEVED, 0.02, 50, 0.12, "sideways"],
                    ["MPD-I-007", *SLEEVED, 0.02, 50, 0.12, "every layer"])
    (p,) = _found(result, "load-path-word")
    assert p.severity is Severity.ERROR and p.sheet == "Parts" and p.cell == "M2"
    assert p.message == ("part MPD-I-006: load path 'sideways' is not one of: through the core (the default), "
                         "through the outer layer, every layer")
    assert p.part == "MPD-I-006" and p.values == ("sideways",)
    assert list(result.rated) == [False, True]
    assert result.parts.inputs["load_path"][1] == float(LoadPath.THROUGH_EVERY_LAYER)


def _stray(layer, field):
    return (f"is given but there is no interface under layer {layer} (an interface is between a layer and "
            "the one inside it); the value is ignored", field)


def test_an_interference_under_the_innermost_layer_is_ignored_with_a_warning():
    head = BASE + ["Layer 1 interference [mm]", "Layer 1 fit length [mm]"]
    result = _rated(head, ["MPD-I-008", *SLEEVED, 0.02, None], ["MPD-I-009", *SLEEVED, None, None])
    (p,) = _found(result, "stray-interface")
    assert p.severity is Severity.WARNING and p.cell == "J2" and p.part == "MPD-I-008" and p.layer == 1
    assert p.message == ("part MPD-I-008, layer 1: diametral interference of the fit under the layer is given but "
                         "there is no interface under layer 1 (an interface is between a layer and the one inside "
                         "it); the value is ignored")
    assert np.isnan(result.parts.inputs["interference"]).all()
    assert list(result.rated) == [True, True]


def test_an_interference_on_a_missing_layer_is_ignored_with_a_warning():
    head = BASE + FIT
    result = _rated(head, ["MPD-I-010", 500, 300, "MPD steel", 40, None, None, None, None, 0.02, 50, 0.12],
                    ["MPD-I-011", *SLEEVED, 0.02, 50, 0.12])
    stray = _found(result, "stray-interface")
    assert [(p.part, p.cell, p.layer) for p in stray] == [("MPD-I-010", "J2", 2), ("MPD-I-010", "K2", 2),
                                                          ("MPD-I-010", "L2", 2)]
    assert stray[1].message == ("part MPD-I-010, layer 2: fit length is given but there is no interface under "
                                "layer 2 (an interface is between a layer and the one inside it); the value is "
                                "ignored")
    assert np.isnan(result.parts.inputs["interference"][0]).all()
    assert result.parts.inputs["interference"][1, 1] == pytest.approx(2e-5, rel=1e-12)
    assert list(result.rated) == [True, True]


def test_an_interference_on_a_layer_beyond_the_table_is_ignored_with_a_warning():
    head = BASE + ["Layer 3 interference [mm]"]
    result = _rated(head, ["MPD-I-012", *SLEEVED, 0.02], ["MPD-I-013", *SLEEVED, None])
    (p,) = _found(result, "stray-interface")
    assert p.cell == "J2" and p.layer == 3 and p.part == "MPD-I-012"
    assert "there is no interface under layer 3" in p.message
    assert list(result.rated) == [True, True]


def test_an_unreadable_interference_is_an_error_not_a_stray_value():
    head = BASE + ["Layer 1 interference [mm]"] + FIT
    result = _rated(head, ["MPD-I-014", *SLEEVED, "abc", 0.02, 50, 0.12],
                    ["MPD-I-015", *SLEEVED, None, "abc", 50, 0.12])
    assert not _found(result, "stray-interface")
    errors = [p for p in result.problems if p.severity is Severity.ERROR]
    assert sorted(p.cell for p in errors) == ["J2", "K3"]
    assert list(result.rated) == [False, False]


def _bronze_sleeve(pid, celsius, delta=0.02):
    return [pid, 500, 300, "MPD steel", 40, None, "MPD bronze", 60, 40, delta, 50, 0.12, celsius]


def test_contact_lost_at_temperature_is_a_warning_on_the_interference_cell():
    # δ(T) = 0.02 mm − (18 − 11.7)e-6/K · 40 mm · (T − 20 °C): zero at about 99 °C
    zero_at = 20 + 0.02 / ((18e-6 - 11.7e-6) * 40)
    assert 90 < zero_at < 110
    result = _rated(BASE + FIT + ["Operating temperature [°C]"],
                    _bronze_sleeve("MPD-I-016", 150), _bronze_sleeve("MPD-I-017", 60))
    (p,) = [p for p in _found(result, "interface") if "loses contact" in p.message]
    assert p.severity is Severity.WARNING and p.cell == "J2" and p.part == "MPD-I-016" and p.layer == 2
    assert p.message == ("part MPD-I-016: the fit between layers 1 and 2 loses contact at the operating "
                         "temperature (the interference at temperature is zero or less): it grips nothing "
                         "and its slip capacity is zero")
    assert list(result.rated) == [True, True]


def test_an_overstressing_fit_is_a_warning_naming_its_layer():
    # p = E·δ·(do² − d²)/(2·d·do²) and the sleeve's bore hoop stress, far above Sy/FS = 200 MPa
    p = 207e3 * 0.2 * (60**2 - 40**2) / (2 * 40 * 60**2)  # MPa
    assert p * (60**2 + 40**2) / (60**2 - 40**2) > 2 * 200
    result = _rated(BASE + FIT, ["MPD-I-018", *SLEEVED, 0.2, 50, 0.12], ["MPD-I-019", *SLEEVED, 0.002, 50, 0.12])
    said = _found(result, "interface")
    assert said and all(p.part == "MPD-I-018" and p.severity is Severity.WARNING for p in said)
    text = ("the fit's own stresses already reach the yield strength over the factor of safety before any "
            "torque is applied")
    assert {p.layer for p in said} >= {2}
    for p in said:
        assert p.message == f"part MPD-I-018: layer {p.layer}: {text}"
    (sleeve,) = [p for p in said if p.layer == 2]
    assert sleeve.cell == "J2"
    assert list(result.rated) == [True, True]


def test_a_fit_missing_its_length_refuses_the_part():
    result = _rated(BASE + FIT, ["MPD-I-020", *SLEEVED, 0.02, None, 0.12], ["MPD-I-021", *SLEEVED, 0.02, 50, 0.12])
    (p,) = _found(result, "interface")
    assert p.severity is Severity.ERROR and p.cell == "J2" and p.layer == 2 and p.part == "MPD-I-020"
    assert p.message == ("part MPD-I-020: a fit input is missing or out of range: the diameters must satisfy "
                         "bore < fit diameter < outer diameter, E, fit length and friction coefficient must be "
                         "positive and Poisson's ratio in (-1, 0.5]; the part is not rated")
    assert list(result.rated) == [False, True]


def test_a_bond_missing_its_length_is_refused_on_the_allowable_cell():
    result = _rated(BASE + BOND, ["MPD-I-022", *SLEEVED, 10, None], ["MPD-I-023", *SLEEVED, 10, 30])
    (p,) = _found(result, "interface")
    assert p.severity is Severity.ERROR and p.cell == "J2" and p.layer == 2
    assert p.message == ("part MPD-I-022: a bond input is missing or not positive (bond diameter, bond length, "
                         "allowable bond shear); the part is not rated")
    assert list(result.rated) == [False, True]


def test_a_temperature_without_expansion_refuses_the_part():
    result = _rated(BASE + FIT + ["Operating temperature [°C]"],
                    ["MPD-I-024", 500, 300, "MPD plain", 40, None, "MPD steel", 60, 40, 0.02, 50, 0.12, 80])
    errors = [p for p in _found(result, "interface") if p.severity is Severity.ERROR]
    assert errors and all(p.message.endswith("; the part is not rated") for p in errors)
    assert any("an operating temperature is given but an expansion coefficient is not" in p.message for p in errors)
    assert list(result.rated) == [False]


def test_the_bond_caution_is_noted_once_on_the_first_bonded_cell():
    result = _rated(BASE + BOND, ["MPD-I-025", *SLEEVED, None, None], ["MPD-I-026", *SLEEVED, 10, 30],
                    ["MPD-I-027", *SLEEVED, 12, 30])
    (p,) = _found(result, "bond-average")
    assert p.severity is Severity.NOTE and p.cell == "J3" and p.part == "MPD-I-026" and p.layer == 2
    assert p.message == ("part MPD-I-026, layer 2: the bond is rated by its average shear T/(2π·r²·L); the shear "
                         "peaks at the ends of the bond well above the average, so the allowable must be one meant "
                         "for the average over a joint of this kind (the adhesive maker's data), not the peak")
    assert list(result.rated) == [True, True, True]


def test_a_hot_adhesive_warning_in_full():
    # cyanoacrylate's typical upper service temperature, the library's (from memory): 80 °C
    head = BASE + BOND + ["Operating temperature [°C]"]
    result = _rated(head, ["MPD-I-028", *SLEEVED, "cyanoacrylate", 30, 80],
                    ["MPD-I-029", *SLEEVED, "cyanoacrylate", 30, 80.5])
    (p,) = _found(result, "adhesive-too-hot")
    assert p.part == "MPD-I-029" and p.cell == "J3" and p.layer == 2 and p.severity is Severity.WARNING
    assert p.message == ("part MPD-I-029, layer 2: the operating temperature 80.5 °C is above the typical upper "
                         "service temperature of cyanoacrylate (about 80 °C; typical, from memory): its "
                         "room-temperature allowable does not hold there; give the maker's strength at that "
                         "temperature instead")
    assert math.isfinite(result.parts.inputs["bond_allowable"][1, 1])


def test_a_hot_adhesive_without_a_temperature_column_is_not_warned():
    result = _rated(BASE + BOND, ["MPD-I-030", *SLEEVED, "cyanoacrylate", 30])
    assert not _found(result, "adhesive-too-hot")
    assert list(result.rated) == [True]


LAYERS_HEAD = ["Part", "Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]",
               "Interference [mm]", "Fit length [mm]", "Friction", "Bond allowable [MPa]", "Bond length [mm]"]


def test_the_row_per_layer_table_reads_the_same_inputs_and_places_findings_on_its_cells():
    parts = [["Part", "Length [mm]", "Torque [N·m]", "Operating temperature [°C]"],
             ["MPD-I-031", 500, 300, 150], ["MPD-I-032", 500, 300, 95]]
    layers = [LAYERS_HEAD,
              ["MPD-I-031", 1, "MPD steel", 40, None, None, None, None, None, None],
              ["MPD-I-031", 2, "MPD bronze", 60, 40, 0.02, 50, 0.12, None, None],
              ["MPD-I-032", 1, "MPD steel", 40, None, None, None, None, None, None],
              ["MPD-I-032", 2, "MPD steel", 60, 40, None, None, None, "cyanoacrylate", 30]]
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": parts, "Layers": layers}))
    inputs = result.parts.inputs
    assert inputs["interference"][0, 1] == pytest.approx(2e-5, rel=1e-12)
    assert inputs["fit_length"][0, 1] == pytest.approx(0.05, rel=1e-12)
    assert np.isnan(inputs["interference"][1, 1]) and np.isnan(inputs["interference"][0, 0])
    assert inputs["bond_length"][1, 1] == pytest.approx(0.03, rel=1e-12)
    (lost,) = [p for p in _found(result, "interface") if "loses contact" in p.message]
    assert (lost.sheet, lost.cell, lost.part) == ("Layers", "F3", "MPD-I-031")
    (hot,) = _found(result, "adhesive-too-hot")
    assert (hot.sheet, hot.cell, hot.part, hot.layer) == ("Layers", "I5", "MPD-I-032", 2)
    (note,) = _found(result, "bond-average")
    assert (note.sheet, note.cell) == ("Layers", "I5")
    assert list(result.rated) == [True, True]


def test_a_bad_cell_in_the_row_per_layer_table_refuses_only_its_part():
    parts = [["Part", "Length [mm]", "Torque [N·m]"], ["MPD-I-033", 500, 300], ["MPD-I-034", 500, 300]]
    layers = [LAYERS_HEAD,
              ["MPD-I-033", 1, "MPD steel", 40, None, None, None, None, None, None],
              ["MPD-I-033", 2, "MPD steel", 60, 40, "abc", 50, 0.12, None, None],
              ["MPD-I-034", 1, "MPD steel", 40, None, None, None, None, None, None],
              ["MPD-I-034", 2, "MPD steel", 60, 40, 0.02, 50, 0.12, None, None]]
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": parts, "Layers": layers}))
    errors = [p for p in result.problems if p.severity is Severity.ERROR]
    assert [(p.sheet, p.cell) for p in errors] == [("Layers", "F3")]
    assert list(result.rated) == [False, True]


def test_a_layer_row_of_an_unknown_part_names_no_adhesive():
    parts = [["Part", "Length [mm]", "Torque [N·m]", "Operating temperature [°C]"], ["MPD-I-035", 500, 300, 95]]
    layers = [LAYERS_HEAD,
              ["MPD-I-035", 1, "MPD steel", 40, None, None, None, None, None, None],
              ["MPD-I-035", 2, "MPD steel", 60, 40, None, None, None, 12, 30],
              ["MPD-I-099", 2, "MPD steel", 60, 40, None, None, None, "cyanoacrylate", 30]]
    result = rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": parts, "Layers": layers}))
    assert [p.code for p in result.problems if p.severity is Severity.ERROR] == ["unknown-part"]
    assert not _found(result, "adhesive-too-hot")
    assert result.parts.inputs["bond_allowable"][0, 1] == pytest.approx(_si(12, "MPa", "Pa"), rel=1e-12)


def test_an_interference_over_an_empty_layer_is_stray():
    result = _rated(BASE + FIT, ["MPD-I-036", 500, 300, None, None, None, "MPD steel", 60, 40, 0.02, None, None])
    assert [(p.cell, p.layer) for p in _found(result, "stray-interface")] == [("J2", 2)]


def test_an_assembly_temperature_alone_is_read():
    result = _rated(BASE + FIT + ["Assembly temperature [°C]"], ["MPD-I-037", *SLEEVED, 0.02, 50, 0.12, 35])
    assert "operating_temperature" not in result.parts.inputs
    assert result.parts.inputs["assembly_temperature"][0] == pytest.approx(_si(35, "degC", "K"), rel=1e-12)


def test_a_bad_interface_cell_still_refuses_its_part_beside_a_temperature_column():
    result = _rated(BASE + FIT + ["Operating temperature [°C]"], ["MPD-I-038", *SLEEVED, "abc", 50, 0.12, 40],
                    ["MPD-I-039", *SLEEVED, 0.02, 50, 0.12, 40])
    assert [p.cell for p in result.problems if p.severity is Severity.ERROR] == ["J2"]
    assert list(result.rated) == [False, True]


def test_an_adhesive_name_in_a_fit_cell_is_not_a_bond():
    result = _rated(BASE + FIT + ["Operating temperature [°C]"],
                    ["MPD-I-040", *SLEEVED, "cyanoacrylate", 50, 0.12, 95])
    assert [p.cell for p in result.problems if p.severity is Severity.ERROR] == ["J2"]
    assert not _found(result, "adhesive-too-hot")


def test_a_cell_function_without_allowables_reads_the_fit_from_the_materials_own_values():
    # TWS_SHARE needs no allowable: E and ν of a material without one still feed the fit;
    # same G, so the shares are J_i/ΣJ, (40/60)⁴ for the core (twist compatibility)
    from twistshare.engine.cells import TWS_SHARE

    mats = [["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Yield strength [MPa]"], ["MPD core", 79.6, 207, 0.3, 400]]
    block = [["Material", "Outer diameter [mm]", "Inner diameter [mm]", "Interference [mm]", "Fit length [mm]",
              "Friction"], ["MPD core", 40, None, None, None, None], ["MPD core", 60, 40, 0.02, 50, 0.12]]
    got = TWS_SHARE(block, None, mats)
    assert got[0] == ["share"]
    assert got[1][0] == pytest.approx((40 / 60) ** 4, rel=1e-12)
    assert got[2][0] == pytest.approx(1 - (40 / 60) ** 4, rel=1e-12)
