"""The Material record's rules at their edges, their messages word for word, and the library fill.

Physical bounds (any elasticity text, e.g. Timoshenko and Goodier, Theory of Elasticity, from
memory): an isotropic solid's Poisson's ratio lies in (-1, 0.5] (a positive bulk and shear
modulus); moduli, densities and strengths are positive. An orthotropic laminate's in-plane ratio
may exceed 0.5 (a +/-45 deg winding's is about 0.77), so only -1 bounds it. The messages are the
spec: the intake shows them to users as they are (common practice for this project: a message
names the material, the field, the rule and the value).
"""

import math

import pytest
from twistshare.engine.core import Material, complete_from_library, find_material

PROPERTY_FIELDS = ("youngs_modulus", "shear_modulus", "poisson_ratio", "density", "yield_strength",
                   "ultimate_strength")


class TestDefaults:
    def test_an_unknown_value_is_nan_and_the_note_empty(self):
        m = Material("X")
        for name in (*PROPERTY_FIELDS, "expansion_coefficient"):
            assert math.isnan(getattr(m, name)), name
        assert m.note == "" and m.isotropic is True and dict(m.sources) == {}

    @pytest.mark.parametrize("name", [*PROPERTY_FIELDS, "expansion_coefficient"])
    def test_none_reads_as_nan(self, name):
        assert math.isnan(getattr(Material("X", **{name: None}), name))

    def test_values_are_stored_as_floats(self):
        m = Material("X", youngs_modulus=200_000_000_000, poisson_ratio=0, expansion_coefficient=0)
        assert type(m.youngs_modulus) is float and type(m.poisson_ratio) is float
        assert type(m.expansion_coefficient) is float and m.expansion_coefficient == 0.0

    def test_an_expansion_coefficient_given_is_kept(self):
        """Zero or negative allowed (carbon fibre along its axis is slightly negative, from memory)."""
        for alpha in (11.7e-6, 0.0, -0.5e-6):
            assert Material("X", expansion_coefficient=alpha).expansion_coefficient == alpha


class TestPositiveValues:
    @pytest.mark.parametrize("name", [f for f in PROPERTY_FIELDS if f != "poisson_ratio"])
    def test_half_a_pascal_is_positive(self, name):
        assert getattr(Material("X", **{name: 0.5}), name) == 0.5

    @pytest.mark.parametrize("name", [f for f in PROPERTY_FIELDS if f != "poisson_ratio"])
    @pytest.mark.parametrize("value", [0.0, -1.0, math.inf])
    def test_zero_negative_and_infinite_refused(self, name, value):
        with pytest.raises(ValueError) as err:
            Material("Q1 steel", **{name: value})
        assert str(err.value) == f"material 'Q1 steel': {name} must be a positive finite number; got {value!r}"


class TestPoissonRatio:
    @pytest.mark.parametrize("nu", [-0.999, -0.5, 0.0, 0.3, 0.5])
    def test_isotropic_range_accepted(self, nu):
        assert Material("X", poisson_ratio=nu).poisson_ratio == nu

    @pytest.mark.parametrize("nu", [-1.0, -1.5, 0.5000001, 0.77])
    def test_isotropic_outside_refused(self, nu):
        with pytest.raises(ValueError) as err:
            Material("X", poisson_ratio=nu)
        assert str(err.value) == f"material 'X': poisson_ratio must be in (-1, 0.5]; got {nu!r}"

    @pytest.mark.parametrize("nu", [-0.5, 0.77, 3.0])
    def test_orthotropic_above_half_accepted(self, nu):
        assert Material("X", poisson_ratio=nu, isotropic=False).poisson_ratio == nu

    @pytest.mark.parametrize("nu", [-1.0, -1.5])
    def test_orthotropic_minus_one_refused(self, nu):
        with pytest.raises(ValueError) as err:
            Material("W", poisson_ratio=nu, isotropic=False)
        assert str(err.value) == f"material 'W': poisson_ratio must be in (-1, inf]; got {nu!r}"


class TestOtherMessages:
    @pytest.mark.parametrize("alpha", [math.inf, -math.inf])
    def test_infinite_expansion_refused(self, alpha):
        with pytest.raises(ValueError) as err:
            Material("X", expansion_coefficient=alpha)
        assert str(err.value) == f"material 'X': expansion_coefficient must be a finite number; got {alpha!r}"

    @pytest.mark.parametrize("name", ["", "   ", None, 7])
    def test_blank_or_not_a_string_name_refused(self, name):
        with pytest.raises(ValueError) as err:
            Material(name)  # type: ignore[arg-type]
        assert str(err.value) == f"Material.name must be a non-blank string; got {name!r}"


class TestDerivedShearModulus:
    def test_derived_with_its_source_text(self):
        """G = E / 2(1 + nu) (isotropic elasticity); the source text is what a filled cell's comment shows."""
        m = Material("X", youngs_modulus=207e9, poisson_ratio=0.292)
        assert m.shear_modulus == pytest.approx(207e9 / 2.584, rel=1e-12)
        assert m.sources["shear_modulus"] == "derived here from E and nu: G = E / (2 (1 + nu))"

    def test_not_derived_for_an_orthotropic_material(self):
        m = Material("W", youngs_modulus=17.7e9, poisson_ratio=0.77, isotropic=False)
        assert math.isnan(m.shear_modulus) and "shear_modulus" not in m.sources


class TestRecord:
    def test_equal_values_are_equal_materials_whatever_their_sources(self):
        """A record is its values (sources are compare=False); it is hashable like any frozen record."""
        a = Material("X", shear_modulus=80e9, sources={"shear_modulus": "certificate 1"})
        b = Material("X", shear_modulus=80e9, sources={"shear_modulus": "certificate 2"})
        assert a == b and hash(a) == hash(b) and len({a, b}) == 1

    def test_the_library_is_built_once(self):
        """find_material shares the one library built on first use (its entries are frozen)."""
        assert find_material("AISI 1045 hot rolled") is find_material("aisi 1045 HOT rolled")


NAN = math.nan
ALL_BLANK = dict.fromkeys(PROPERTY_FIELDS, NAN)


class TestFillGroups:
    """The library fills a group (E with nu, Sy with Su, density) only where none of it is given."""

    def test_everything_blank_fills_every_group_then_g(self):
        lib = find_material("AISI 1045 hot rolled")
        values, filled = complete_from_library(ALL_BLANK, lib)
        assert filled == ("youngs_modulus", "poisson_ratio", "yield_strength", "ultimate_strength", "density",
                          "shear_modulus")
        assert all(values[k] == getattr(lib, k) for k in PROPERTY_FIELDS)

    @pytest.mark.parametrize("own, group", [("youngs_modulus", "poisson_ratio"), ("poisson_ratio", "youngs_modulus"),
                                            ("ultimate_strength", "yield_strength")])
    def test_one_value_of_a_group_keeps_the_other_blank(self, own, group):
        lib = find_material("AISI 1045 hot rolled")
        values, filled = complete_from_library({**ALL_BLANK, own: 0.3 if own == "poisson_ratio" else 1e9}, lib)
        assert own not in filled and group not in filled and math.isnan(values[group])

    def test_own_density_kept(self):
        lib = find_material("AISI 1045 hot rolled")
        values, filled = complete_from_library({**ALL_BLANK, "density": 7800.0}, lib)
        assert "density" not in filled and values["density"] == 7800.0

    def test_a_value_the_library_lacks_is_not_filled(self):
        lib = find_material("Phosphor bronze")  # no yield or ultimate strength in the library
        values, filled = complete_from_library(ALL_BLANK, lib)
        assert "yield_strength" not in filled and "ultimate_strength" not in filled
        assert math.isnan(values["yield_strength"])

    def test_own_g_kept(self):
        lib = find_material("AISI 1045 hot rolled")
        values, filled = complete_from_library({**ALL_BLANK, "shear_modulus": 81e9}, lib)
        assert "shear_modulus" not in filled and values["shear_modulus"] == 81e9
