"""The built-in material library and the user's override by name."""

import dataclasses
import math

import pytest
from twistshare.engine.core import (
    Material,
    complete_from_library,
    find_material,
    is_steel,
    material_library,
    normalise_name,
)

LIBRARY = material_library()
PROPERTY_FIELDS = (
    "youngs_modulus", "shear_modulus", "poisson_ratio", "density", "yield_strength", "ultimate_strength",
)


def _isotropic_checked(material: Material) -> bool:
    return material.isotropic and "derived" not in material.sources.get("shear_modulus", "")


@pytest.mark.parametrize("name", sorted(LIBRARY))
def test_shear_modulus_consistent_with_e_and_nu(name):
    """G = E / (2 (1 + nu)) for an isotropic metal holds within the handbooks'
    rounding of the three values (5 %, common practice for tabulated moduli)."""
    material = LIBRARY[name]
    if not material.isotropic:
        pytest.skip("orthotropic (wound composite): its effective G is not fixed by E and nu")
    if not _isotropic_checked(material):
        pytest.skip("G is derived from E and nu in the library itself: the check would be circular")
    derived = material.youngs_modulus / (2 * (1 + material.poisson_ratio))
    assert material.shear_modulus == pytest.approx(derived, rel=0.05)


def test_most_metals_have_independent_shear_modulus():
    """The check above must bite: most library metals carry a handbook G of their own."""
    assert sum(_isotropic_checked(m) for m in LIBRARY.values()) >= 10


@pytest.mark.parametrize("name", sorted(LIBRARY))
def test_every_value_names_its_source(name):
    """Each value present names where it comes from; recalled values say 'from memory'."""
    material = LIBRARY[name]
    for field in PROPERTY_FIELDS:
        if math.isnan(getattr(material, field)):
            continue
        source = material.sources.get(field, "")
        assert source, f"{name}: {field} has no source"
        assert "from memory" in source or "derived" in source, f"{name}: {field}: {source}"


@pytest.mark.parametrize("name", sorted(LIBRARY))
def test_values_plausible(name):
    """Broad ranges for engineering solids (common practice): catches unit slips
    (MPa for Pa, g/cm3 for kg/m3) rather than checking the handbook."""
    material = LIBRARY[name]
    assert 10e9 < material.youngs_modulus < 250e9
    assert 5e9 < material.shear_modulus < 100e9
    assert 1000 < material.density < 9000
    if not math.isnan(material.yield_strength) and not math.isnan(material.ultimate_strength):
        assert material.ultimate_strength >= material.yield_strength


@pytest.mark.parametrize(
    "words",
    [("1020",), ("1045",), ("4140",), ("stainless", "304"), ("stainless", "316"), ("bronze",),
     ("brass",), ("6061",), ("7075",), ("2024",), ("ti-6al-4v",), ("cast iron",), ("carbon/epoxy",)],
)
def test_library_covers_the_common_classes(words):
    """Issue 2's list: carbon and alloy steel, stainless, bronze, brass, aluminium
    alloys, titanium alloy, grey cast iron, a carbon/epoxy tube."""
    assert any(all(w in n.casefold() for w in words) for n in LIBRARY)


def test_steel_handbook_values():
    """Carbon steel E 207 GPa, G 79.3 GPa, nu 0.292 (Shigley's Mechanical Engineering
    Design, table of physical constants of materials, from memory)."""
    steel = LIBRARY["AISI 1045 hot rolled"]
    assert (steel.youngs_modulus, steel.shear_modulus, steel.poisson_ratio) == (207e9, 79.3e9, 0.292)


def test_library_is_read_only():
    with pytest.raises(TypeError):
        LIBRARY["Mystery"] = LIBRARY["AISI 1045 hot rolled"]  # type: ignore[index]
    with pytest.raises(dataclasses.FrozenInstanceError):
        LIBRARY["AISI 1045 hot rolled"].shear_modulus = 1.0  # type: ignore[misc]
    with pytest.raises(TypeError):
        LIBRARY["AISI 1045 hot rolled"].sources["density"] = "x"  # type: ignore[index]


def test_library_cannot_be_changed_through_a_copy():
    copy = dict(material_library())
    copy.clear()
    assert len(material_library()) == len(LIBRARY)


class TestFindMaterial:
    def test_case_and_whitespace_insensitive(self):
        found = find_material("  aisi   1045 HOT\trolled ")
        assert found is not None and found.name == "AISI 1045 hot rolled"

    def test_user_material_overrides_library(self):
        own = Material("AISI 1045 Hot Rolled", shear_modulus=80e9, yield_strength=350e6,
                       sources={"shear_modulus": "our test certificate"})
        assert find_material("aisi 1045 hot rolled", {"AISI 1045 hot rolled": own}) is own
        assert find_material("aisi 1045 hot rolled", [own]) is own

    def test_user_only_and_unknown(self):
        own = Material("MPD bronze B7", shear_modulus=40e9)
        assert find_material("mpd bronze b7", [own]) is own
        assert find_material("unobtainium") is None

    def test_normalise_name(self):
        assert normalise_name(" Stainless   304\nannealed ") == "stainless 304 annealed"


class TestMaterialValidation:
    def test_shear_modulus_derived_when_missing(self):
        material = Material("Test alloy", youngs_modulus=200e9, poisson_ratio=0.25)
        assert material.shear_modulus == pytest.approx(80e9)
        assert "derived" in material.sources["shear_modulus"]

    @pytest.mark.parametrize(
        ("kwargs", "message"),
        [
            ({"shear_modulus": -79e9}, r"material 'X': shear_modulus must be a positive finite number; got -79000000000.0"),
            ({"density": 0.0}, r"density must be a positive finite number; got 0.0"),
            ({"poisson_ratio": 0.6}, r"poisson_ratio must be in \(-1, 0.5\]; got 0.6"),
        ],
    )
    def test_messages_name_field_and_value(self, kwargs, message):
        with pytest.raises(ValueError, match=message):
            Material("X", **kwargs)

    def test_blank_name_refused(self):
        with pytest.raises(ValueError, match="non-blank"):
            Material("  ")

    def test_none_reads_as_unknown(self):
        assert math.isnan(Material("X", yield_strength=None).yield_strength)  # type: ignore[arg-type]


class TestIsSteel:
    """is_steel decides where the steel-shafting code rule may stand in (common practice)."""

    @pytest.mark.parametrize("name", ["AISI 1045 hot rolled", "Stainless 316 annealed", "MPD core steel Q2",
                                      "SAE 4140"])
    def test_steels(self, name):
        assert is_steel(name)

    @pytest.mark.parametrize("name", ["Aluminium 6061-T6", "Ti-6Al-4V annealed", "Phosphor bronze",
                                      "Carbon/epoxy tube 45 wound", "Grey cast iron class 30"])
    def test_not_steels(self, name):
        assert not is_steel(name)


class TestCompleteFromLibrary:
    """complete_from_library fills whole groups only, and never an isotropic G for a wound tube."""

    NAN = float("nan")

    def test_blank_groups_are_filled(self):
        lib = find_material("AISI 1045 hot rolled")
        values, filled = complete_from_library({"yield_strength": self.NAN, "ultimate_strength": self.NAN}, lib)
        assert values["yield_strength"] == lib.yield_strength
        assert set(filled) >= {"yield_strength", "ultimate_strength", "shear_modulus"}

    def test_a_users_strength_is_not_paired_with_the_librarys(self):
        lib = find_material("AISI 1045 hot rolled")
        values, filled = complete_from_library({"yield_strength": 400e6, "ultimate_strength": self.NAN}, lib)
        assert values["yield_strength"] == 400e6 and "ultimate_strength" not in filled

    def test_own_e_and_nu_keep_g_open_for_an_isotropic_material(self):
        lib = find_material("AISI 1045 hot rolled")
        _, filled = complete_from_library({"youngs_modulus": 200e9, "poisson_ratio": 0.3}, lib)
        assert "shear_modulus" not in filled

    def test_wound_tube_always_takes_the_librarys_g(self):
        lib = find_material("Carbon/epoxy tube 45 wound")
        values, filled = complete_from_library({"youngs_modulus": 17.7e9, "poisson_ratio": 0.77}, lib)
        assert "shear_modulus" in filled and values["shear_modulus"] == lib.shear_modulus


@pytest.mark.parametrize("name, lb_per_in3", [
    ("AISI 1020 hot rolled", 0.282),  # Shigley table A-5 states steel densities in lb/in³
    ("AISI 1045 hot rolled", 0.282),
    ("Phosphor bronze", 0.295),       # the library states these two in lb/in³ as well
    ("Grey cast iron class 30", 0.260),
])
def test_us_density_converted_with_the_nist_factor(name, lb_per_in3):
    """pound per cubic inch = 2.767 990 E+04 kg/m³ (NIST SP 811 (2008) App. B.9); a wrong inch
    factor (e.g. 0.025 m) moves the density by 5 % and fails here."""
    assert LIBRARY[name].density == pytest.approx(lb_per_in3 * 2.767990e4, rel=5e-7)
