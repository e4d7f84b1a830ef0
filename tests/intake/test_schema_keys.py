"""Every field of the schema under the key its readers ask for, found from the header a user writes.

The headers are those of DEVELOPERS.md's workbook convention and README's column lists and input
tables (materials, parts, sleeves, wound layers, sizing, loads); the keys are the names the readers look columns up by (`spot.column`,
`field_by_key`) and, for the per-part and per-layer inputs, the keys `rate(..., inputs=)` takes
(`section.input(key)`). The kinds are the units kinds of `engine.units.KINDS` a value is read in.
The temperature range is −100 °C to 600 °C (common practice), in kelvin by 0 °C = 273.15 K
(NIST SP 811).
"""

from __future__ import annotations

import dataclasses

import pytest
from twistshare.engine.intake import cell_value
from twistshare.engine.intake._schema import (
    LAYER_ROW_FIELDS,
    MATERIAL_FIELDS,
    PART_FIELDS,
    field_by_key,
    match_header,
    match_layer_group_header,
)

MATERIAL_HEADERS = [
    ("Material", "name", "text"), ("Ultimate strength [MPa]", "ultimate_strength", "stress"),
    ("Density [kg/m³]", "density", "density"), ("Thermal expansion coefficient [1/K]", "expansion_coefficient",
                                                "expansion"),
    ("Ply E1 [GPa]", "ply_e1", "stress"), ("Ply E2 [GPa]", "ply_e2", "stress"), ("Ply G12 [GPa]", "ply_g12", "stress"),
    ("Ply nu12", "ply_nu12", "dimensionless"), ("Ply thickness [mm]", "ply_thickness", "length"),
    ("Layup", "layup", "text"), ("Ply set", "ply_set", "text"),
]
PART_HEADERS = [
    ("Service factor", "service_factor", "dimensionless"), ("Size", "size", "text"),
    ("Target reserve factor", "target_reserve", "dimensionless"), ("Stock sizes [mm]", "stock", "length"),
    ("Outer layers", "outer_layers", "text"), ("Bending moment [N·m]", "bending_moment", "torque"),
    ("Axial force [kN]", "axial_force", "force"), ("Bearing span [mm]", "bearing_span", "length"),
    ("Supports", "end_support", "text"), ("Load path", "load_path", "text"),
    ("Operating temperature [°C]", "operating_temperature", "temperature"),
    ("Assembly temperature [°C]", "assembly_temperature", "temperature"),
]
LAYER_GROUP_HEADERS = [
    ("Layer 2 interference [mm]", "interference", "length"), ("Layer 2 fit length [mm]", "fit_length", "length"),
    ("Layer 2 friction", "friction", "dimensionless"), ("Layer 2 bond length [mm]", "bond_length", "length"),
    ("Layer 2 bond allowable [MPa]", "bond_allowable", "stress"),
    ("Layer 1 allowable shear [MPa]", "allowable_shear", "stress"),
]
# read by the cell functions only, as arguments (one function's result handed to another)
CELL_KEYS = [("fit_pressure", "stress"), ("fit_diameter", "length"), ("points", "dimensionless"),
             ("interface_torque", "torque")]


@pytest.mark.parametrize("header, key, kind", MATERIAL_HEADERS)
def test_material_headers_name_their_fields(header, key, kind):
    field, _ = match_header(header, MATERIAL_FIELDS)
    assert (field.key, field.kind) == (key, kind)
    assert field_by_key(key) is field


@pytest.mark.parametrize("header, key, kind", PART_HEADERS)
def test_part_headers_name_their_fields(header, key, kind):
    field, _ = match_header(header, PART_FIELDS)
    assert (field.key, field.kind) == (key, kind)
    assert field_by_key(key) is field


@pytest.mark.parametrize("header, key, kind", LAYER_GROUP_HEADERS)
def test_layer_group_headers_name_their_fields(header, key, kind):
    layer, field, _ = match_layer_group_header(header)
    assert (layer, field.key, field.kind) == (int(header.split()[1]), key, kind)
    # the row-per-layer table reads the same field from the header without its group
    row_field, _ = match_header(header.split(" ", 2)[2], LAYER_ROW_FIELDS)
    assert row_field is field


@pytest.mark.parametrize("key, kind", CELL_KEYS)
def test_cell_function_fields_by_key(key, kind):
    assert field_by_key(key).kind == kind


@pytest.mark.parametrize("key, needs", [("layup", False), ("keyway", False), ("poisson_ratio", False),
                                        ("shear_modulus", True), ("length", True), ("speed", True)])
def test_a_bare_number_needs_a_unit_except_for_text_flags_and_pure_numbers(key, needs):
    assert field_by_key(key).needs_unit is needs


def test_a_bare_number_for_a_ratio_is_read_and_for_a_length_is_refused():
    # no unit in the header nor the cell
    value, problem, _ = cell_value(0.3, field_by_key("poisson_ratio"), None, 1.0, None)
    assert (value, problem) == (0.3, None)
    value, problem, _ = cell_value(500, field_by_key("length"), None, None, None)
    assert problem is not None


def test_a_temperature_outside_the_plausible_range_is_told_in_kelvin():
    _, problem, code = cell_value("700 °C", field_by_key("operating_temperature"), None, None, None)
    assert code == "plausible"
    assert problem == ("'700 °C' = 973.15 K is outside the plausible range 173.15 to 873.15 K (common practice); "
                       "check the unit")


@pytest.mark.parametrize("thing, attr", [(field_by_key("length"), "key"), (field_by_key("length").plausible, "low"),
                                         (match_header("Length [mm]", PART_FIELDS), None)])
def test_the_schema_s_shared_records_cannot_be_changed(thing, attr):
    # one Field (and its range) serves every reader: a change through one would reach them all
    if attr is None:  # a recognised column of a located table
        from twistshare.engine.intake import SheetGrid, locate_table

        spot = locate_table(SheetGrid("Parts", [["Part", "Length [mm]"], ["P1", 500]]), PART_FIELDS, "part")
        thing, attr = spot.columns[1], "index"
    with pytest.raises(dataclasses.FrozenInstanceError):
        setattr(thing, attr, 0)
