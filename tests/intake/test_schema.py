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


# --- plausible ranges read in US units (the ranges are stated in SI; 1 in = 25.4 mm exactly,
# NIST SP 811; 1 rpm = 2π/60 rad/s by definition) ---------------------------------------------

def _plausible(head, row):
    from _membook import rate_parts

    return [p for p in rate_parts(head, row).problems if p.code == "plausible"]


_US_HEAD = ["Part", "Length [in]", "Torque [lbf·in]", "Speed [rpm]", "Layer 1 material", "Layer 1 outer diameter [in]"]


def test_outer_diameter_in_inches_message_and_range():
    # upper bound 5000 mm = 196.85 in
    assert not _plausible(_US_HEAD, ["P1", 20, 100, None, "Core steel", 196.5])
    (p,) = _plausible(_US_HEAD, ["P1", 20, 100, None, "Core steel", 400])
    assert "400 in = 10160 mm is outside the plausible range 0.1 to 5000 mm (common practice)" in p.message
    assert p.cell == "F2"


def test_speed_range_in_rpm():
    # upper bound 200 000 rpm, lower 0.1 rpm
    assert not _plausible(_US_HEAD, ["P1", 20, 100, 199_000, "Core steel", 2])
    assert not _plausible(_US_HEAD, ["P1", 20, 100, 0.11, "Core steel", 2])
    (p,) = _plausible(_US_HEAD, ["P1", 20, 100, 201_000, "Core steel", 2])
    assert "201000 rpm" in p.message and "0.1 to 200000 rpm" in p.message
    (p,) = _plausible(_US_HEAD, ["P1", 20, 100, 0.09, "Core steel", 2])
    assert p.cell == "D2"
