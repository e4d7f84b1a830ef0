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


def material_library() -> Mapping[str, Material]:
    """The built-in materials, read-only, keyed by name.

    Returns
    -------
    Mapping[str, Material]
        A fresh read-only mapping on every call; nothing in it can be changed.
    """
    from ._material_library import library_entries

    return MappingProxyType({m.name: m for m in library_entries()})


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
    from ._material_library import library_entries

    return MappingProxyType({normalise_name(m.name): m for m in library_entries()})
