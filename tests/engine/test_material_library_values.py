"""The built-in material library against the published tables it cites, row by row.

Each row below is this test's own copy of a published table, with the table named beside it.
Every figure is recalled, not looked up while writing (no reference was at hand): "from memory"
throughout. Where a table prints a value in US customary units beside the SI one (Shigley's
tables print both), the customary figure is converted here with pint (a general-purpose
reference library) and must agree with the SI figure to the table's own rounding: a check of
the copy, not of the library. The library must then hold the SI figures exactly.

The names, the notes and every source text are checked word for word: the wording is the spec.
Users read them: a library value filled into a blank cell of their materials table carries the
note "...; source: <the field's source text>" as a comment on that cell (the intake's
``_filled_notes``), a material's note is shown where a part first uses it (code
``library-default``), the names are what a book's Material column must spell, and README's table of
built-in materials quotes the names and the sources of G.
"""

import math
import re

import pint
import pytest
from twistshare.engine.core import material_library

LIBRARY = material_library()
U = pint.UnitRegistry()
NAN = math.nan

# -- elastic constants, density, expansion -------------------------------------------------------

# Shigley's Mechanical Engineering Design, table A-5 "Physical constants of materials" (from memory):
# class: (E Mpsi, E GPa, G Mpsi, G GPa, Poisson's ratio, unit weight lbf/in^3)
SHIGLEY_A5 = {
    "carbon steel": (30.0, 207.0, 11.5, 79.3, 0.292, 0.282),
    "stainless steel 18-8": (27.6, 190.0, 10.6, 73.1, 0.305, 0.280),
    "phosphor bronze": (16.1, 111.0, 6.0, 41.4, 0.349, 0.295),
    "grey cast iron": (14.5, 100.0, 6.0, 41.4, 0.211, 0.260),
}

# Which A-5 class each library material takes its elastic constants (and density) from.
A5_CLASS = {
    "AISI 1020 hot rolled": ("carbon steel", True),  # (class, density from A-5 too)
    "AISI 1045 hot rolled": ("carbon steel", True),
    "Stainless 304 annealed": ("stainless steel 18-8", False),
    "Stainless 316 annealed": ("stainless steel 18-8", False),
    "Phosphor bronze": ("phosphor bronze", True),
    "Grey cast iron class 30": ("grey cast iron", True),
}

# Elastic constants and densities of the materials A-5 does not give, SI as the sources print them.
# name: (E GPa, G GPa or None where the library derives it, nu, density kg/m^3, source)
OTHER_ELASTIC = {
    "AISI 4140 quenched and tempered": (205.0, 80.0, 0.29, 7850.0, "ASM Handbook, typical (from memory)"),
    "Aluminium bronze C95400 as cast": (107.0, None, 0.32, 7450.0,
                                        "CDA datasheet C95400, typical; nu typical of copper alloys (from memory)"),
    "Brass C36000 half hard": (97.0, 37.0, 0.31, 8500.0, "CDA datasheet C36000, typical (from memory)"),
    "Aluminium 6061-T6": (68.9, 26.0, 0.33, 2700.0, "ASM Handbook vol. 2, typical (from memory)"),
    "Aluminium 2024-T3": (73.1, 28.0, 0.33, 2780.0, "ASM Handbook vol. 2, typical (from memory)"),
    "Aluminium 7075-T6": (71.7, 26.9, 0.33, 2810.0, "ASM Handbook vol. 2, typical (from memory)"),
    "Ti-6Al-4V annealed": (113.8, 44.0, 0.342, 4430.0, "ASM Handbook, typical (from memory)"),
    "Carbon/epoxy tube 45 wound": (None, None, None, 1550.0,  # E, G, nu: by CLT below
                                   "common handbook density of a 60 % carbon/epoxy (from memory)"),
}

# Stainless 304 / 316 densities: ASM Handbook typical, 8.00 g/cm^3 (from memory).
STAINLESS_DENSITY = 8000.0

# Linear expansion coefficient, 1e-6/K: ASM Handbook typical 20-100 C; the copper alloys CDA
# datasheet typical 20-300 C (all from memory). None: the library gives none.
EXPANSION = {
    "AISI 1020 hot rolled": 11.7,
    "AISI 1045 hot rolled": 11.7,
    "AISI 4140 quenched and tempered": 12.3,
    "Stainless 304 annealed": 17.3,
    "Stainless 316 annealed": 16.0,
    "Aluminium bronze C95400 as cast": 16.2,  # CDA
    "Phosphor bronze": 17.8,  # CDA, C51000
    "Brass C36000 half hard": 20.5,  # CDA
    "Aluminium 6061-T6": 23.6,
    "Aluminium 2024-T3": 23.2,
    "Aluminium 7075-T6": 23.6,
    "Ti-6Al-4V annealed": 8.6,
    "Grey cast iron class 30": 10.8,
    "Carbon/epoxy tube 45 wound": None,
}

# -- strengths -----------------------------------------------------------------------------------

# name: (Sy MPa, Su MPa, Sy kpsi, Su kpsi, rounding of the SI column in MPa, source); None: not given
# (or, for a kpsi figure, not recalled)
STRENGTHS = {
    "AISI 1020 hot rolled": (210, 380, 30, 55, 10, "Shigley table A-20, HR, ASTM minimum (from memory)"),
    "AISI 1045 hot rolled": (310, 570, 45, 82, 10, "Shigley table A-20, HR, ASTM minimum (from memory)"),
    "AISI 4140 quenched and tempered": (655, 758, 95, 110, 1,
                                        "Shigley table A-21, Q&T, tempered at 650 C / 1200 F (from memory)"),
    "Stainless 304 annealed": (205, 515, 30, 75, 5, "ASTM A240 / A276 annealed, minimum (from memory)"),
    "Stainless 316 annealed": (205, 515, 30, 75, 5, "ASTM A240 / A276 annealed, minimum (from memory)"),
    "Aluminium bronze C95400 as cast": (241, 586, 35, 85, 1, "CDA datasheet C95400 as cast, typical (from memory)"),
    "Phosphor bronze": (None, None, None, None, 1, "none: depends on the temper"),
    "Brass C36000 half hard": (310, 385, None, None, 1,  # its ksi figures not recalled with confidence
                               "CDA datasheet C36000 H02, typical (from memory)"),
    "Aluminium 6061-T6": (276, 310, 40, 45, 1, "ASM Handbook vol. 2, typical (from memory)"),
    "Aluminium 2024-T3": (345, 483, 50, 70, 1, "ASM Handbook vol. 2, typical (from memory)"),
    "Aluminium 7075-T6": (503, 572, 73, 83, 1, "ASM Handbook vol. 2, typical (from memory)"),
    "Ti-6Al-4V annealed": (880, 950, 128, 138, 10, "ASM Handbook, typical (from memory)"),
    "Grey cast iron class 30": (None, 214, None, 31, 1,
                                "Shigley table of grey cast iron, ASTM A48 class 30 tensile (from memory)"),
    "Carbon/epoxy tube 45 wound": (None, None, None, None, 1, "none: a fibre composite has no yield"),
}


def _close(library_value: float, expected: float | None) -> bool:
    if expected is None:
        return math.isnan(library_value)
    return library_value == pytest.approx(expected, rel=1e-12)


def test_the_names_are_exactly_these():
    """The names a book's Material column must spell (README's table of built-in materials)."""
    assert sorted(LIBRARY) == sorted(EXPANSION)
    assert sorted(LIBRARY) == sorted(STRENGTHS)


@pytest.mark.parametrize("cls", sorted(SHIGLEY_A5))
def test_the_a5_copy_agrees_with_itself_through_pint(cls):
    """A-5 prints GPa and Mpsi side by side: converted by pint they agree to the SI column's
    rounding (half a unit of its last digit: 0.5 GPa for E, 0.05 GPa for G)."""
    e_us, e_si, g_us, g_si, _, _ = SHIGLEY_A5[cls]
    assert abs(U.Quantity(e_us, "Mpsi").m_as("GPa") - e_si) <= 0.5
    assert abs(U.Quantity(g_us, "Mpsi").m_as("GPa") - g_si) <= 0.05


@pytest.mark.parametrize("name", sorted(A5_CLASS))
def test_elastic_constants_from_shigley_a5(name):
    cls, with_density = A5_CLASS[name]
    _, e_si, _, g_si, nu, weight = SHIGLEY_A5[cls]
    m = LIBRARY[name]
    assert _close(m.youngs_modulus, e_si * 1e9)
    assert _close(m.shear_modulus, g_si * 1e9)
    assert m.poisson_ratio == nu
    if with_density:  # a unit weight: mass density = weight density / standard gravity (pint)
        rho = (U.Quantity(weight, "lbf/in**3") / U.standard_gravity).m_as("kg/m**3")
        assert m.density == pytest.approx(rho, rel=1e-9)
    else:
        assert _close(m.density, STAINLESS_DENSITY)


@pytest.mark.parametrize("name", sorted(OTHER_ELASTIC))
def test_elastic_constants_and_density_of_the_others(name):
    e, g, nu, rho, _source = OTHER_ELASTIC[name]
    m = LIBRARY[name]
    assert _close(m.density, rho)
    if e is None:
        return  # the wound tube: by classical lamination theory, below
    assert _close(m.youngs_modulus, e * 1e9)
    assert m.poisson_ratio == nu
    if g is None:  # no handbook G: the isotropic relation G = E / 2(1 + nu) (any elasticity text)
        assert _close(m.shear_modulus, e * 1e9 / (2 * (1 + nu)))
    else:
        assert _close(m.shear_modulus, g * 1e9)


@pytest.mark.parametrize("name", sorted(EXPANSION))
def test_expansion_coefficient(name):
    alpha = EXPANSION[name]
    assert _close(LIBRARY[name].expansion_coefficient, None if alpha is None else alpha * 1e-6)


@pytest.mark.parametrize("name", sorted(STRENGTHS))
def test_strengths(name):
    """SI exactly as the table prints it; the table's kpsi column, converted by pint, agrees with
    its MPa column to the MPa column's rounding (A-20 rounds to 10 MPa, ASTM's SI to 5 MPa)."""
    sy, su, sy_us, su_us, step, _source = STRENGTHS[name]
    m = LIBRARY[name]
    assert _close(m.yield_strength, None if sy is None else sy * 1e6)
    assert _close(m.ultimate_strength, None if su is None else su * 1e6)
    for si, us in ((sy, sy_us), (su, su_us)):
        if si is not None and us is not None:
            assert abs(U.Quantity(us, "kpsi").m_as("MPa") - si) <= step / 2 + 1e-9
    if sy is not None:
        assert sy < su  # a yield below the ultimate (definition); will not catch a small slip


# -- the +/-45 carbon/epoxy tube by classical lamination theory ---------------------------------

def _ply_data(text: str) -> tuple[float, float, float, float]:
    found = re.search(r"E1 ([\d.]+) GPa, E2 ([\d.]+) GPa, G12 ([\d.]+) GPa, nu12 ([\d.]+)", text)
    assert found, text
    e1, e2, g12, nu12 = (float(x) for x in found.groups())
    return e1 * 1e9, e2 * 1e9, g12 * 1e9, nu12


def test_wound_tube_by_lamination_invariants():
    """Classical lamination theory in the Tsai-Pagano invariant form (S. W. Tsai and H. T. Hahn,
    Introduction to Composite Materials, ch. 5, from memory): Q11 = E1/d, Q22 = E2/d,
    Q12 = nu12 E2/d, Q66 = G12 with d = 1 - nu12^2 E2/E1; U1 = (3Q11 + 3Q22 + 2Q12 + 4Q66)/8,
    U3 = (Q11 + Q22 - 2Q12 - 4Q66)/8, U4 = (Q11 + Q22 + 6Q12 - 4Q66)/8,
    U5 = (Q11 + Q22 - 2Q12 + 4Q66)/8. At +/-45 deg (cos 2θ = 0, cos 4θ = -1), balanced:
    A11/t = A22/t = U1 - U3, A12/t = U4 + U3, A66/t = U5 + U3, A16 = A26 = 0, hence
    Ex = (A11^2 - A12^2) / (A11 t), nu_xy = A12 / A11, Gxy = A66 / t. The ply data are read from
    the library's own source text; the results must round to the figures the library states
    (E and G to 0.1 GPa, nu to 0.01)."""
    tube = LIBRARY["Carbon/epoxy tube 45 wound"]
    e1, e2, g12, nu12 = _ply_data(tube.sources["shear_modulus"])
    d = 1 - nu12**2 * e2 / e1
    q11, q22, q12, q66 = e1 / d, e2 / d, nu12 * e2 / d, g12
    u1 = (3 * q11 + 3 * q22 + 2 * q12 + 4 * q66) / 8
    u3 = (q11 + q22 - 2 * q12 - 4 * q66) / 8
    u4 = (q11 + q22 + 6 * q12 - 4 * q66) / 8
    u5 = (q11 + q22 - 2 * q12 + 4 * q66) / 8
    a11, a12, a66 = u1 - u3, u4 + u3, u5 + u3
    ex, nuxy, gxy = (a11**2 - a12**2) / a11, a12 / a11, a66
    assert round(tube.youngs_modulus / 1e9, 1) == round(ex / 1e9, 1)
    assert round(tube.shear_modulus / 1e9, 1) == round(gxy / 1e9, 1)
    assert round(tube.poisson_ratio, 2) == round(nuxy, 2)
    assert tube.youngs_modulus == pytest.approx(round(ex / 1e9, 1) * 1e9, rel=1e-12)
    assert tube.shear_modulus == pytest.approx(round(gxy / 1e9, 1) * 1e9, rel=1e-12)
    assert tube.poisson_ratio == round(nuxy, 2)
    assert not tube.isotropic


def test_only_the_wound_tube_is_orthotropic():
    assert [n for n, m in LIBRARY.items() if not m.isotropic] == ["Carbon/epoxy tube 45 wound"]


# -- the words: source of every property, and the notes ------------------------------------------

A5 = "Shigley's Mechanical Engineering Design, table of physical constants of materials, from memory"
A5_RHO = A5 + " (unit weight in lbf/in^3 converted)"
A20 = ("Shigley's Mechanical Engineering Design, table of strengths of hot-rolled and cold-drawn steels "
       "(from ASTM/SAE minima), from memory")
A21 = "Shigley's Mechanical Engineering Design, table of mean properties of heat-treated steels, from memory"
ASM = "ASM Handbook typical value, from memory"
ASM_20_100 = "ASM Handbook typical value, 20-100 C, from memory"
ASTM = "ASTM A276 / A240 specified minimum for the annealed condition, from memory"
CDA = "Copper Development Association datasheet typical value, from memory"
CDA_20_300 = "Copper Development Association datasheet typical value, 20-300 C, from memory"
DERIVED = "derived here from E and nu: G = E / (2 (1 + nu))"
CLT = ("effective in-plane value of a balanced +/-45 deg laminate by classical lamination theory from typical "
       "standard-modulus carbon/epoxy ply data (E1 135 GPa, E2 10 GPa, G12 5 GPa, nu12 0.3, fibre volume "
       "about 60 %), ply data from memory")
FIELDS = ("youngs_modulus", "shear_modulus", "poisson_ratio", "density", "yield_strength", "ultimate_strength",
          "expansion_coefficient")


def _row(*texts: str) -> dict[str, str]:
    return dict(zip(FIELDS, texts, strict=True))


_CARBON_STEEL = _row(A5 + " (carbon steel)", A5 + " (carbon steel)", A5 + " (carbon steel)",
                     A5_RHO + " (carbon steel)", A20, A20, ASM_20_100 + " (plain carbon steel)")
_STAINLESS = _row(*(3 * [A5 + " (stainless steel 18-8)"]), ASM, ASTM, ASTM, ASM_20_100)
_ASM_ALLOY = _row(*(6 * [ASM]), ASM_20_100)

SOURCES = {
    "AISI 1020 hot rolled": _CARBON_STEEL,
    "AISI 1045 hot rolled": _CARBON_STEEL,
    "AISI 4140 quenched and tempered": _row(ASM, ASM, ASM, ASM, A21 + " (tempered at 650 C)",
                                            A21 + " (tempered at 650 C)", ASM_20_100),
    "Stainless 304 annealed": _STAINLESS,
    "Stainless 316 annealed": _STAINLESS,
    "Aluminium bronze C95400 as cast": _row(CDA, DERIVED, "typical value for copper alloys, from memory", CDA, CDA,
                                            CDA, CDA_20_300),
    "Phosphor bronze": _row(A5, A5, A5, A5_RHO, "no single typical value: it depends strongly on the temper",
                            "no single typical value: it depends strongly on the temper", CDA_20_300 + " (C51000)"),
    "Brass C36000 half hard": _row(*(6 * [CDA]), CDA_20_300),
    "Aluminium 6061-T6": _ASM_ALLOY,
    "Aluminium 2024-T3": _ASM_ALLOY,
    "Aluminium 7075-T6": _ASM_ALLOY,
    "Ti-6Al-4V annealed": _ASM_ALLOY,
    "Grey cast iron class 30": _row(
        A5 + " (grey cast iron)", A5 + " (grey cast iron)", A5 + " (grey cast iron)", A5_RHO + " (grey cast iron)",
        "none: grey iron is brittle and has no yield point",
        "Shigley's Mechanical Engineering Design, table of grey cast iron properties (ASTM A48 class 30, tensile), "
        "from memory",
        ASM_20_100 + " (grey cast iron)"),
    "Carbon/epoxy tube 45 wound": _row(
        CLT + " (axial modulus)", CLT, CLT + " (axial-hoop ratio)", "common handbook value, from memory",
        "none: fibre composites have no yield point", "none: use the laminate's shear strength from test data",
        "none: the hoop expansion of a wound tube depends on the layup; give the supplier's value"),
}

NOTES = {
    "AISI 4140 quenched and tempered": "Strength depends strongly on the tempering temperature: use the certificate.",
    "Phosphor bronze": "Give the strength of the temper supplied.",
    "Grey cast iron class 30": ("Brittle, no yield point: give the allowable shear directly, from the ultimate "
                                "strength with a suitable factor."),
    "Carbon/epoxy tube 45 wound": ("Orthotropic: G is the effective in-plane shear modulus of a +/-45 deg winding; "
                                   "E and nu do not determine it. Give the allowable shear directly from the "
                                   "supplier's or test data."),
}


@pytest.mark.parametrize("name", sorted(SOURCES))
def test_source_of_every_property_word_for_word(name):
    assert dict(LIBRARY[name].sources) == SOURCES[name]


@pytest.mark.parametrize("name", sorted(SOURCES))
def test_note_word_for_word(name):
    assert LIBRARY[name].note == NOTES.get(name, "")

