"""twistshare engine core: pure-numpy torsion of compound shafts, SI floats in and out.

Functions are ufunc-like: parts on the leading axis, layer slots on the last (innermost
first), one part is the same call with one row. No units, files or spreadsheets here.

Examples
--------
>>> from twistshare.engine.core import Duty, LayerStack, rate
>>> stack = LayerStack.from_layers(
...     outer_diameter=[0.040, 0.050], inner_diameter=[0.0, 0.040],
...     shear_modulus=[79.3e9, 40.0e9], allowable_shear=[100e6, 60e6])
>>> rating = rate(stack, Duty.from_arrays(torque=1000.0, length=1.0))
>>> round(float(rating.share[0, 0]), 3)
0.579
"""

from ._allowables import (
    DISTORTION_ENERGY_FACTOR,
    MAX_SHEAR_FACTOR,
    SHAFTING_CODE_KEYWAY_FACTOR,
    SHAFTING_CODE_ULTIMATE_FACTOR,
    SHAFTING_CODE_YIELD_FACTOR,
    allowable_flags,
    allowable_shear,
)
from ._bond import bond_capacity, bond_inputs_ok, bond_shear, bond_torque_capacity
from ._capacity import layer_capacity, twist_angle_capacity, twist_per_length_capacity
from ._compatibility import (
    layer_stiffness,
    shear_stress_at,
    stress_profile,
    torque_share,
    twist_rate,
)
from ._criteria import AllowableRule, Criterion
from ._demand import torque_from_power
from ._diagnoses import (
    ALLOWABLE_ERRORS,
    LAYER_ERRORS,
    PART_ERRORS,
    AllowableFlag,
    LayerFlag,
    PartFlag,
    describe,
    has_error,
    is_error,
    split_flags,
)
from ._fits import (
    FRICTION_GUIDANCE,
    FRICTION_GUIDANCE_SOURCE,
    REFERENCE_TEMPERATURE,
    FrictionGuide,
    combined_stress_capacity,
    equivalent_stress,
    fit_hoop_stresses,
    fit_pressure,
    interference_at_temperature,
    lame_stresses,
    slip_capacity,
    slip_torque,
)
from ._governing import factor_of_safety, governing_limit, margin
from ._interfaces import InterfaceRating, rate_interfaces
from ._load_path import DEFAULT_LOAD_PATH, LoadPath, interface_share, interface_torque
from ._materials import (
    Material,
    complete_from_library,
    find_material,
    is_steel,
    material_library,
    normalise_name,
)
from ._plastic import (
    PlasticReserve,
    fully_plastic_torque,
    plastic_reserve,
    plastic_torque,
    torque_twist_curve,
    twist_rate_at_torque,
)
from ._plastic_unloading import permanent_twist, residual_stress_profile
from ._rating import Duty, Rating, rate
from ._section import (
    DEFAULT_CONTACT_ABS_TOL,
    DEFAULT_CONTACT_REL_TOL,
    LayerStack,
    interface_gaps,
    polar_moment,
    shear_modulus_from_elastic,
)
from ._sleeve_diagnoses import (
    INTERFACE_ERRORS,
    PLASTIC_ERRORS,
    InterfaceFlag,
    PlasticFlag,
    describe_sleeve_flag,
    has_sleeve_error,
)
from ._stack_fits import layer_fit_stress_capacity, stack_fit_pressures

__all__ = [
    # enumerations and diagnoses
    "Criterion",
    "AllowableRule",
    "LayerFlag",
    "PartFlag",
    "AllowableFlag",
    "LAYER_ERRORS",
    "PART_ERRORS",
    "ALLOWABLE_ERRORS",
    "is_error",
    "has_error",
    "describe",
    "split_flags",
    # section
    "polar_moment",
    "shear_modulus_from_elastic",
    "LayerStack",
    "interface_gaps",
    "DEFAULT_CONTACT_ABS_TOL",
    "DEFAULT_CONTACT_REL_TOL",
    # twist compatibility
    "layer_stiffness",
    "twist_rate",
    "torque_share",
    "shear_stress_at",
    "stress_profile",
    # capacities and the governing limit
    "layer_capacity",
    "twist_angle_capacity",
    "twist_per_length_capacity",
    "governing_limit",
    "margin",
    "factor_of_safety",
    # allowables and demand
    "allowable_shear",
    "allowable_flags",
    "MAX_SHEAR_FACTOR",
    "DISTORTION_ENERGY_FACTOR",
    "SHAFTING_CODE_YIELD_FACTOR",
    "SHAFTING_CODE_ULTIMATE_FACTOR",
    "SHAFTING_CODE_KEYWAY_FACTOR",
    "torque_from_power",
    # materials
    "Material",
    "material_library",
    "complete_from_library",
    "find_material",
    "is_steel",
    "normalise_name",
    # rating
    "Duty",
    "Rating",
    "rate",
    # load path and interfaces
    "LoadPath",
    "DEFAULT_LOAD_PATH",
    "interface_torque",
    "interface_share",
    "InterfaceFlag",
    "INTERFACE_ERRORS",
    "PlasticFlag",
    "PLASTIC_ERRORS",
    "describe_sleeve_flag",
    "has_sleeve_error",
    # fits
    "REFERENCE_TEMPERATURE",
    "FrictionGuide",
    "FRICTION_GUIDANCE",
    "FRICTION_GUIDANCE_SOURCE",
    "interference_at_temperature",
    "fit_pressure",
    "fit_hoop_stresses",
    "lame_stresses",
    "slip_torque",
    "slip_capacity",
    "equivalent_stress",
    "combined_stress_capacity",
    "stack_fit_pressures",
    "layer_fit_stress_capacity",
    # bonds
    "bond_inputs_ok",
    "bond_shear",
    "bond_torque_capacity",
    "bond_capacity",
    # interfaces of a batch
    "InterfaceRating",
    "rate_interfaces",
    # plastic reserve
    "PlasticReserve",
    "plastic_reserve",
    "plastic_torque",
    "fully_plastic_torque",
    "torque_twist_curve",
    "twist_rate_at_torque",
    "residual_stress_profile",
    "permanent_twist",
]
