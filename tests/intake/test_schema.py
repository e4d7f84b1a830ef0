"""Header recognition of the workbook convention (DEVELOPERS.md, 'Workbook convention')."""

import pytest
from twistshare.engine.intake._schema import (
    LAYER_FIELDS,
    MATERIAL_FIELDS,
    PART_FIELDS,
    match_header,
    match_layer_group_header,
)


class TestMatchHeader:
    """match_header finds the field and the unit text of a header."""

    @pytest.mark.parametrize("header, key, unit", [
        ("Part", "part", None),
        ("  part   ID ", "part", None),
        ("Length [mm]", "length", "mm"),
        ("Torque [kN·m]", "torque", "kN·m"),
        ("Power [hp]", "power", "hp"),
        ("Speed [r/min]", "speed", "r/min"),
        ("Twist limit [deg]", "twist_limit_angle", "deg"),
        ("Twist limit per length [°/m]", "twist_limit_per_length", "°/m"),
    ])
    def test_part_headers(self, header, key, unit):
        field, got_unit = match_header(header, PART_FIELDS)
        assert field.key == key
        assert got_unit == unit

    @pytest.mark.parametrize("header, key", [
        ("G [GPa]", "shear_modulus"), ("E [GPa]", "youngs_modulus"), ("Poisson ratio", "poisson_ratio"),
        ("Allowable shear [MPa]", "allowable_shear"), ("Yield strength [ksi]", "yield_strength"),
        ("Allowable rule", "rule"), ("Keyway", "keyway"), ("Factor of safety", "factor_of_safety"),
    ])
    def test_material_headers(self, header, key):
        assert match_header(header, MATERIAL_FIELDS)[0].key == key

    @pytest.mark.parametrize("header", [None, "", 3.0, "Comments", "Layer 1 colour"])
    def test_unknown_headers_are_none(self, header):
        assert match_header(header, PART_FIELDS) is None


class TestLayerGroups:
    """Layer column groups carry their layer number (1 = innermost)."""

    @pytest.mark.parametrize("header, layer, key, unit", [
        ("Layer 1 material", 1, "material", None),
        ("Layer 2 outer diameter [mm]", 2, "outer_diameter", "mm"),
        ("layer 12 inner diameter [in]", 12, "inner_diameter", "in"),
        ("Layer 3 Kt", 3, "kt", None),
    ])
    def test_groups(self, header, layer, key, unit):
        got = match_layer_group_header(header)
        assert got is not None
        assert (got[0], got[1].key, got[2]) == (layer, key, unit)
        assert got[1] in LAYER_FIELDS

    def test_not_a_group(self):
        assert match_layer_group_header("Outer diameter [mm]") is None
