"""Interface slip, bond shear and fit stress as criteria: `rate_interfaces` on a `Section`.

The inputs arrive by name in ``Section.inputs`` (SI, NaN where not given), per layer slot at
the outer member of each interface: ``interference`` (m, at the assembly temperature),
``fit_length`` (m), ``friction`` (1), ``bond_length`` (m), ``bond_allowable`` (Pa), and the
layers' ``youngs_modulus`` (Pa), ``poisson_ratio``, ``yield_strength`` (Pa),
``expansion_coefficient`` (1/K) and ``factor_of_safety``; per part ``load_path``
(`LoadPath` codes), ``operating_temperature`` and ``assembly_temperature`` (K). Without an
``interference`` or a ``bond_allowable`` somewhere the criteria set no limit and cost nothing.
"""

from __future__ import annotations

from collections.abc import Mapping

import numpy as np
from numpy.typing import NDArray

from ._fits import REFERENCE_TEMPERATURE
from ._interfaces import InterfaceRating, rate_interfaces
from ._load_path import DEFAULT_LOAD_PATH
from ._sleeve_diagnoses import InterfaceFlag
from ._sleeve_diagnoses import has_sleeve_error as interface_errors

__all__ = ["INTERFACE_KEYS", "LAYER_PROPERTY_KEYS", "has_interfaces",
           "interfaces_of", "interface_rating", "slip", "bond", "fit_stress"]

#: Per-layer inputs of an interface, at its outer member's slot.
INTERFACE_KEYS: tuple[str, ...] = ("interference", "fit_length", "friction", "bond_length",
                                   "bond_allowable")
#: Per-layer material properties the fits need.
LAYER_PROPERTY_KEYS: tuple[str, ...] = ("youngs_modulus", "poisson_ratio", "yield_strength",
                                        "expansion_coefficient", "factor_of_safety")


def has_interfaces(inputs: Mapping[str, object]) -> bool:
    """Is any interference or bond allowable given? (Cheap when neither key is present.)"""
    for key in ("interference", "bond_allowable"):
        value = inputs.get(key)
        if value is not None and not np.isnan(np.asarray(value, dtype=float)).all():
            return True
    return False


def _nan_to(value: NDArray[np.float64] | None, fill: float) -> NDArray[np.float64] | float:
    if value is None:
        return fill
    return np.where(np.isnan(value), fill, value)


def interface_rating(stack, inputs: Mapping[str, object], share=None, sum_stiffness=None
                     ) -> InterfaceRating:
    """`rate_interfaces` with its inputs taken by name (the keys of this module), SI.

    Blank per-part entries take their stated defaults: the load path through the core,
    the operating temperature equal to the assembly temperature, the assembly temperature
    20 °C; a blank factor of safety is 1.
    """
    shape = np.shape(stack.outer_diameter)

    def get(key: str, per_layer: bool) -> NDArray[np.float64] | None:
        value = inputs.get(key)
        if value is None:
            return None
        return np.broadcast_to(np.asarray(value, dtype=float), shape if per_layer else shape[:1])

    nan = np.nan
    layer = {k: nan if (v := get(k, True)) is None else v for k in INTERFACE_KEYS + LAYER_PROPERTY_KEYS}
    operating = get("operating_temperature", False)
    return rate_interfaces(
        stack,
        youngs_modulus=layer["youngs_modulus"],
        poisson_ratio=layer["poisson_ratio"],
        yield_strength=layer["yield_strength"],
        expansion_coefficient=layer["expansion_coefficient"],
        interference=layer["interference"],
        fit_length=layer["fit_length"],
        friction=layer["friction"],
        bond_allowable=layer["bond_allowable"],
        bond_length=layer["bond_length"],
        load_path=_nan_to(get("load_path", False), float(DEFAULT_LOAD_PATH)),
        operating_temperature=nan if operating is None else operating,
        reference_temperature=_nan_to(get("assembly_temperature", False), REFERENCE_TEMPERATURE),
        factor_of_safety=_nan_to(layer["factor_of_safety"], 1.0),
        share=share,
        sum_stiffness=sum_stiffness,
    )


def interfaces_of(section) -> InterfaceRating | None:
    """The section's interfaces rated once (shared by the three criteria); None without any."""
    if "interfaces" not in section.shared:
        rating = None
        if has_interfaces(section.inputs):
            with np.errstate(all="ignore"):
                share = section.gj / section.sum_gj[:, np.newaxis]
            rating = interface_rating(section.stack, section.inputs, share, section.sum_gj)
        section.shared["interfaces"] = rating
    return section.shared["interfaces"]  # type: ignore[return-value]


def _per_slot(section, got: InterfaceRating | None, name: str, flags: str
              ) -> NDArray[np.float64]:
    """Capacities per slot: +inf where the check does not apply, NaN in unused slots and where
    an input of the check is in error (its flags say which; the intake refuses such parts).

    Without any interface input: one +inf per part, no per-slot work.
    """
    if got is None:
        return section.no_limit()
    values = getattr(got, name)
    out = np.where(np.isnan(values), np.inf, values)
    # Masked writes only where some element is masked: the check is cheap, the write is not.
    for blank in (interface_errors(getattr(got, flags), InterfaceFlag), section.unused):
        if blank.any():
            np.copyto(out, np.nan, where=blank)
    return out


def slip(section) -> NDArray[np.float64]:
    """Section torque at which each fitted interface slips, at the outer member's slot, N*m."""
    return _per_slot(section, interfaces_of(section), "slip_capacity", "interface_flags")


def bond(section) -> NDArray[np.float64]:
    """Section torque at which each bond's average shear reaches its allowable, N*m."""
    return _per_slot(section, interfaces_of(section), "bond_capacity", "interface_flags")


def fit_stress(section) -> NDArray[np.float64]:
    """Section torque at which each layer of a fitted part reaches ``S_y / FS``, N*m."""
    return _per_slot(section, interfaces_of(section), "fit_stress_capacity", "layer_fit_flags")
