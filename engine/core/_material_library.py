"""The built-in material library: typical values, each with its source (or "from memory").

Values are typical or specified minima from the handbooks named beside them, recalled rather
than looked up where so marked: a preliminary design aid's defaults, never a material
certificate. A user's materials table overrides them.
"""

from __future__ import annotations

from ._materials import _FIELDS, DERIVED_SHEAR_MODULUS, Material  # noqa: F401 - the derivation note the entries name

__all__ = ["library_entries"]


_GPA = 1e9
_MPA = 1e6
# lb/in^3 -> kg/m^3 (0.45359237 kg per lb, 0.0254 m per in, both exact).
_LB_PER_IN3 = 0.45359237 / 0.0254**3

_SHIGLEY_A5 = (
    "Shigley's Mechanical Engineering Design, table of physical constants of materials, "
    "from memory"
)
_SHIGLEY_A5_DENSITY = _SHIGLEY_A5 + " (unit weight in lbf/in^3 converted)"
_SHIGLEY_A20 = (
    "Shigley's Mechanical Engineering Design, table of strengths of hot-rolled and "
    "cold-drawn steels (from ASTM/SAE minima), from memory"
)
_SHIGLEY_A21 = (
    "Shigley's Mechanical Engineering Design, table of mean properties of heat-treated "
    "steels, from memory"
)
_ASM_TYPICAL = "ASM Handbook typical value, from memory"
_ASTM_A276 = "ASTM A276 / A240 specified minimum for the annealed condition, from memory"
_CDA = "Copper Development Association datasheet typical value, from memory"
_CLT = (
    "effective in-plane value of a balanced +/-45 deg laminate by classical lamination "
    "theory from typical standard-modulus carbon/epoxy ply data (E1 135 GPa, E2 10 GPa, "
    "G12 5 GPa, nu12 0.3, fibre volume about 60 %), ply data from memory"
)
_COMMON_DENSITY = "common handbook value, from memory"
_PER_K = 1e-6  # expansion coefficients are quoted in 1e-6/K
_ASM_EXPANSION = "ASM Handbook typical value, 20-100 C, from memory"
_CDA_EXPANSION = "Copper Development Association datasheet typical value, 20-300 C, from memory"


def _sources(**by_field: str) -> dict[str, str]:
    return dict(by_field)


def library_entries() -> tuple[Material, ...]:
    return (
        Material(
            "AISI 1020 hot rolled",
            youngs_modulus=207 * _GPA, shear_modulus=79.3 * _GPA, poisson_ratio=0.292,
            density=0.282 * _LB_PER_IN3,
            yield_strength=210 * _MPA, ultimate_strength=380 * _MPA,
            expansion_coefficient=11.7 * _PER_K,
            sources=_sources(
                youngs_modulus=_SHIGLEY_A5 + " (carbon steel)",
                shear_modulus=_SHIGLEY_A5 + " (carbon steel)",
                poisson_ratio=_SHIGLEY_A5 + " (carbon steel)",
                density=_SHIGLEY_A5_DENSITY + " (carbon steel)",
                yield_strength=_SHIGLEY_A20, ultimate_strength=_SHIGLEY_A20,
                expansion_coefficient=_ASM_EXPANSION + " (plain carbon steel)",
            ),
        ),
        Material(
            "AISI 1045 hot rolled",
            youngs_modulus=207 * _GPA, shear_modulus=79.3 * _GPA, poisson_ratio=0.292,
            density=0.282 * _LB_PER_IN3,
            yield_strength=310 * _MPA, ultimate_strength=570 * _MPA,
            expansion_coefficient=11.7 * _PER_K,
            sources=_sources(
                youngs_modulus=_SHIGLEY_A5 + " (carbon steel)",
                shear_modulus=_SHIGLEY_A5 + " (carbon steel)",
                poisson_ratio=_SHIGLEY_A5 + " (carbon steel)",
                density=_SHIGLEY_A5_DENSITY + " (carbon steel)",
                yield_strength=_SHIGLEY_A20, ultimate_strength=_SHIGLEY_A20,
                expansion_coefficient=_ASM_EXPANSION + " (plain carbon steel)",
            ),
        ),
        Material(
            "AISI 4140 quenched and tempered",
            youngs_modulus=205 * _GPA, shear_modulus=80 * _GPA, poisson_ratio=0.29,
            density=7850,
            yield_strength=655 * _MPA, ultimate_strength=758 * _MPA,
            expansion_coefficient=12.3 * _PER_K,
            sources=_sources(
                youngs_modulus=_ASM_TYPICAL, shear_modulus=_ASM_TYPICAL, poisson_ratio=_ASM_TYPICAL,
                density=_ASM_TYPICAL,
                yield_strength=_SHIGLEY_A21 + " (tempered at 650 C)",
                ultimate_strength=_SHIGLEY_A21 + " (tempered at 650 C)",
                expansion_coefficient=_ASM_EXPANSION,
            ),
            note="Strength depends strongly on the tempering temperature: use the certificate.",
        ),
        Material(
            "Stainless 304 annealed",
            youngs_modulus=190 * _GPA, shear_modulus=73.1 * _GPA, poisson_ratio=0.305,
            density=8000,
            yield_strength=205 * _MPA, ultimate_strength=515 * _MPA,
            expansion_coefficient=17.3 * _PER_K,
            sources=_sources(
                youngs_modulus=_SHIGLEY_A5 + " (stainless steel 18-8)",
                shear_modulus=_SHIGLEY_A5 + " (stainless steel 18-8)",
                poisson_ratio=_SHIGLEY_A5 + " (stainless steel 18-8)",
                density=_ASM_TYPICAL,
                yield_strength=_ASTM_A276, ultimate_strength=_ASTM_A276,
                expansion_coefficient=_ASM_EXPANSION,
            ),
        ),
        Material(
            "Stainless 316 annealed",
            youngs_modulus=190 * _GPA, shear_modulus=73.1 * _GPA, poisson_ratio=0.305,
            density=8000,
            yield_strength=205 * _MPA, ultimate_strength=515 * _MPA,
            expansion_coefficient=16.0 * _PER_K,
            sources=_sources(
                youngs_modulus=_SHIGLEY_A5 + " (stainless steel 18-8)",
                shear_modulus=_SHIGLEY_A5 + " (stainless steel 18-8)",
                poisson_ratio=_SHIGLEY_A5 + " (stainless steel 18-8)",
                density=_ASM_TYPICAL,
                yield_strength=_ASTM_A276, ultimate_strength=_ASTM_A276,
                expansion_coefficient=_ASM_EXPANSION,
            ),
        ),
        Material(
            "Aluminium bronze C95400 as cast",
            youngs_modulus=107 * _GPA, poisson_ratio=0.32, density=7450,
            yield_strength=241 * _MPA, ultimate_strength=586 * _MPA,
            expansion_coefficient=16.2 * _PER_K,
            sources=_sources(
                youngs_modulus=_CDA, density=_CDA, yield_strength=_CDA, ultimate_strength=_CDA,
                poisson_ratio="typical value for copper alloys, from memory",
                expansion_coefficient=_CDA_EXPANSION,
            ),
        ),
        Material(
            "Phosphor bronze",
            youngs_modulus=111 * _GPA, shear_modulus=41.4 * _GPA, poisson_ratio=0.349,
            density=0.295 * _LB_PER_IN3,
            expansion_coefficient=17.8 * _PER_K,
            sources=_sources(
                youngs_modulus=_SHIGLEY_A5, shear_modulus=_SHIGLEY_A5,
                poisson_ratio=_SHIGLEY_A5, density=_SHIGLEY_A5_DENSITY,
                yield_strength="no single typical value: it depends strongly on the temper",
                ultimate_strength="no single typical value: it depends strongly on the temper",
                expansion_coefficient=_CDA_EXPANSION + " (C51000)",
            ),
            note="Give the strength of the temper supplied.",
        ),
        Material(
            "Brass C36000 half hard",
            youngs_modulus=97 * _GPA, shear_modulus=37 * _GPA, poisson_ratio=0.31,
            density=8500,
            yield_strength=310 * _MPA, ultimate_strength=385 * _MPA,
            expansion_coefficient=20.5 * _PER_K,
            sources=_sources(
                youngs_modulus=_CDA, shear_modulus=_CDA, poisson_ratio=_CDA, density=_CDA,
                yield_strength=_CDA, ultimate_strength=_CDA,
                expansion_coefficient=_CDA_EXPANSION,
            ),
        ),
        Material(
            "Aluminium 6061-T6",
            youngs_modulus=68.9 * _GPA, shear_modulus=26 * _GPA, poisson_ratio=0.33,
            density=2700,
            yield_strength=276 * _MPA, ultimate_strength=310 * _MPA,
            expansion_coefficient=23.6 * _PER_K,
            sources={**{name: _ASM_TYPICAL for name in _FIELDS},
                     "expansion_coefficient": _ASM_EXPANSION},
        ),
        Material(
            "Aluminium 2024-T3",
            youngs_modulus=73.1 * _GPA, shear_modulus=28 * _GPA, poisson_ratio=0.33,
            density=2780,
            yield_strength=345 * _MPA, ultimate_strength=483 * _MPA,
            expansion_coefficient=23.2 * _PER_K,
            sources={**{name: _ASM_TYPICAL for name in _FIELDS},
                     "expansion_coefficient": _ASM_EXPANSION},
        ),
        Material(
            "Aluminium 7075-T6",
            youngs_modulus=71.7 * _GPA, shear_modulus=26.9 * _GPA, poisson_ratio=0.33,
            density=2810,
            yield_strength=503 * _MPA, ultimate_strength=572 * _MPA,
            expansion_coefficient=23.6 * _PER_K,
            sources={**{name: _ASM_TYPICAL for name in _FIELDS},
                     "expansion_coefficient": _ASM_EXPANSION},
        ),
        Material(
            "Ti-6Al-4V annealed",
            youngs_modulus=113.8 * _GPA, shear_modulus=44 * _GPA, poisson_ratio=0.342,
            density=4430,
            yield_strength=880 * _MPA, ultimate_strength=950 * _MPA,
            expansion_coefficient=8.6 * _PER_K,
            sources={**{name: _ASM_TYPICAL for name in _FIELDS},
                     "expansion_coefficient": _ASM_EXPANSION},
        ),
        Material(
            "Grey cast iron class 30",
            youngs_modulus=100 * _GPA, shear_modulus=41.4 * _GPA, poisson_ratio=0.211,
            density=0.260 * _LB_PER_IN3,
            ultimate_strength=214 * _MPA,
            expansion_coefficient=10.8 * _PER_K,
            sources=_sources(
                youngs_modulus=_SHIGLEY_A5 + " (grey cast iron)",
                shear_modulus=_SHIGLEY_A5 + " (grey cast iron)",
                poisson_ratio=_SHIGLEY_A5 + " (grey cast iron)",
                density=_SHIGLEY_A5_DENSITY + " (grey cast iron)",
                yield_strength="none: grey iron is brittle and has no yield point",
                ultimate_strength=(
                    "Shigley's Mechanical Engineering Design, table of grey cast iron "
                    "properties (ASTM A48 class 30, tensile), from memory"
                ),
                expansion_coefficient=_ASM_EXPANSION + " (grey cast iron)",
            ),
            note=(
                "Brittle, no yield point: give the allowable shear directly, "
                "from the ultimate strength with a suitable factor."
            ),
        ),
        Material(
            "Carbon/epoxy tube 45 wound",
            youngs_modulus=17.7 * _GPA, shear_modulus=35.0 * _GPA, poisson_ratio=0.77,
            density=1550,
            sources=_sources(
                youngs_modulus=_CLT + " (axial modulus)",
                shear_modulus=_CLT,
                poisson_ratio=_CLT + " (axial-hoop ratio)",
                density=_COMMON_DENSITY,
                yield_strength="none: fibre composites have no yield point",
                ultimate_strength="none: use the laminate's shear strength from test data",
                expansion_coefficient=(
                    "none: the hoop expansion of a wound tube depends on the layup; give "
                    "the supplier's value"
                ),
            ),
            isotropic=False,
            note=(
                "Orthotropic: G is the effective in-plane shear modulus of a +/-45 deg "
                "winding; E and nu do not determine it. Give the allowable shear directly "
                "from the supplier's or test data."
            ),
        ),
    )
