"""Materials: a frozen record per material and the built-in library of shaft and sleeve materials.

Every library value names its source. Nothing here was looked up while writing it: the
values are typical handbook figures recalled from memory, and say so. They are typical
values for a preliminary design aid, not specified minima; verify against the supplier's
certificate and the applicable standard.
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from functools import lru_cache
from types import MappingProxyType

__all__ = ["Material", "material_library", "find_material", "normalise_name", "is_steel",
           "complete_from_library"]

_FIELDS = (
    "youngs_modulus",
    "shear_modulus",
    "poisson_ratio",
    "density",
    "yield_strength",
    "ultimate_strength",
)

DERIVED_SHEAR_MODULUS = "derived here from E and nu: G = E / (2 (1 + nu))"


@dataclass(frozen=True)
class Material:
    """One material's properties, SI; NaN where no value is known.

    Parameters
    ----------
    name : str
    youngs_modulus : float, Pa
    shear_modulus : float, Pa
        If NaN and ``youngs_modulus`` and ``poisson_ratio`` are known, it is derived as
        ``E / (2 (1 + nu))`` and its source says so.
    poisson_ratio : float, 1
    density : float, kg/m^3
    yield_strength : float, Pa
    ultimate_strength : float, Pa
    sources : mapping of field name to str
        Where each value comes from.
    isotropic : bool
        False for orthotropic materials (wound composites), whose ``shear_modulus`` is
        an effective in-plane value that E and nu do not determine.
    note : str
        A caution that travels with the material.
    expansion_coefficient : float, 1/K
        Linear thermal expansion coefficient near room temperature (for an orthotropic
        tube, the hoop value, which is what changes a fit).

    Raises
    ------
    ValueError
        If the name is blank, a modulus, density or strength is not positive, the
        Poisson ratio is outside (-1, 0.5] for an isotropic material, or the expansion
        coefficient is infinite. The message names the material, the field and the value.
    """

    name: str
    youngs_modulus: float = math.nan
    shear_modulus: float = math.nan
    poisson_ratio: float = math.nan
    density: float = math.nan
    yield_strength: float = math.nan
    ultimate_strength: float = math.nan
    sources: Mapping[str, str] = field(default_factory=dict, hash=False, compare=False)
    isotropic: bool = True
    note: str = ""
    expansion_coefficient: float = math.nan

    def __post_init__(self) -> None:
        if not isinstance(self.name, str) or not self.name.strip():
            raise ValueError(f"Material.name must be a non-blank string; got {self.name!r}")
        for name in _FIELDS:
            value = getattr(self, name)
            value = math.nan if value is None else float(value)
            object.__setattr__(self, name, value)
            if name == "poisson_ratio":
                continue
            if not math.isnan(value) and not (value > 0 and math.isfinite(value)):
                raise ValueError(
                    f"material {self.name!r}: {name} must be a positive finite number; "
                    f"got {value!r}"
                )
        alpha = math.nan if self.expansion_coefficient is None else float(self.expansion_coefficient)
        object.__setattr__(self, "expansion_coefficient", alpha)
        # May be zero or negative (fibre composites along the fibre); only infinity is wrong.
        if math.isinf(alpha):
            raise ValueError(
                f"material {self.name!r}: expansion_coefficient must be a finite number; "
                f"got {alpha!r}"
            )
        nu = self.poisson_ratio
        upper = 0.5 if self.isotropic else math.inf
        if not math.isnan(nu) and not (-1.0 < nu <= upper):
            raise ValueError(
                f"material {self.name!r}: poisson_ratio must be in (-1, {upper}]; got {nu!r}"
            )
        sources = dict(self.sources)
        if (
            math.isnan(self.shear_modulus)
            and self.isotropic
            and not math.isnan(self.youngs_modulus)
            and not math.isnan(nu)
        ):
            object.__setattr__(self, "shear_modulus", self.youngs_modulus / (2.0 * (1.0 + nu)))
            sources["shear_modulus"] = DERIVED_SHEAR_MODULUS
        object.__setattr__(self, "sources", MappingProxyType(sources))


_STEEL_WORDS = ("steel", "aisi", "stainless", "sae ")


def is_steel(name: str) -> bool:
    """True for a material name that says it is a steel (steel, AISI, stainless, SAE).

    The classic transmission-shafting code rule min(0.30·Sy, 0.18·Su) was written for steel
    shafting; callers use this to decide where that rule may stand in for a missing allowable.
    """
    lowered = name.lower()
    return any(word in lowered for word in _STEEL_WORDS)


def normalise_name(name: str) -> str:
    """Key used to match material names: case-folded, runs of whitespace made one space."""
    return re.sub(r"\s+", " ", str(name)).strip().casefold()


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


def _library_entries() -> tuple[Material, ...]:
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


def material_library() -> Mapping[str, Material]:
    """The built-in materials, read-only, keyed by name.

    Returns
    -------
    Mapping[str, Material]
        A fresh read-only mapping on every call; nothing in it can be changed.
    """
    return MappingProxyType({m.name: m for m in _library_entries()})


# Properties that belong together: the library fills a group only where the caller gives none of
# it, so a user's value is never paired with the library's (a user's Sy with a typical Su).
_FILL_GROUPS = (("youngs_modulus", "poisson_ratio"), ("yield_strength", "ultimate_strength"), ("density",))


def complete_from_library(
    values: Mapping[str, float], library: Material, given: frozenset[str] | None = None
) -> tuple[dict[str, float], tuple[str, ...]]:
    """A user's partial properties completed from a library material, group by group.

    Parameters
    ----------
    values : mapping of property name to float, SI
        The user's values; NaN where blank.
    library : Material
        The built-in material the user's row names.
    given : frozenset of str, optional
        The properties the user gave (default: those not NaN). A caller may count an unusable
        cell as given so that the library does not quietly stand in for it.

    Returns
    -------
    values : dict
        The completed values.
    filled : tuple of str
        The properties taken from the library.

    Notes
    -----
    G is taken from the library where the user gives none, unless the user's own E and ν give
    it for an isotropic material; for an orthotropic one (a wound tube) G = E/2(1+ν) does not
    hold, so the library's G is always used.
    """
    given = frozenset(k for k, v in values.items() if not math.isnan(v)) if given is None else given
    out = dict(values)
    filled: list[str] = []

    def fill(key: str) -> None:
        value = getattr(library, key, None)
        if value is not None and math.isfinite(float(value)):
            out[key] = float(value)
            filled.append(key)

    for group in _FILL_GROUPS:
        if not given.intersection(group):
            for key in group:
                fill(key)
    own_elastic = {"youngs_modulus", "poisson_ratio"} <= given
    if "shear_modulus" not in given and (not own_elastic or not library.isotropic):
        fill("shear_modulus")
    return out, tuple(filled)


def find_material(
    name: str,
    user_materials: Mapping[str, Material] | Iterable[Material] | None = None,
) -> Material | None:
    """Look a material up by name: the user's own materials first, then the library.

    Names match case- and whitespace-insensitively (``"aisi  1045 HOT rolled"`` finds
    ``"AISI 1045 hot rolled"``).

    Parameters
    ----------
    name : str
    user_materials : mapping of name to Material, or iterable of Material, optional
        A user's material of the same name overrides the library's.

    Returns
    -------
    Material or None
        None if no material has that name.
    """
    key = normalise_name(name)
    if user_materials is not None:
        pairs = (
            user_materials.items()
            if isinstance(user_materials, Mapping)
            else ((m.name, m) for m in user_materials)
        )
        for user_name, material in pairs:
            if normalise_name(user_name) == key:
                return material
    return _library_by_key().get(key)


@lru_cache(maxsize=1)
def _library_by_key() -> Mapping[str, Material]:
    """The library by normalised name, built once: its entries are frozen, so sharing is safe."""
    return MappingProxyType({normalise_name(m.name): m for m in _library_entries()})
