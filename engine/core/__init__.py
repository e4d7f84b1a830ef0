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

from ._adhesives import (
    ADHESIVE_DESIGN_FACTOR,
    ADHESIVE_SOURCE,
    Adhesive,
    adhesive_library,
    find_adhesive,
)
from ._allowables import (
    DISTORTION_ENERGY_FACTOR,
    MAX_SHEAR_FACTOR,
    SHAFTING_CODE_KEYWAY_FACTOR,
    SHAFTING_CODE_ULTIMATE_FACTOR,
    SHAFTING_CODE_YIELD_FACTOR,
    allowable_flags,
    allowable_shear,
)
from ._bending import SectionBending, area_moment, section_area, section_bending
from ._beyond_torsion_criteria import whirl_of
from ._bond import bond_capacity, bond_inputs_ok, bond_shear, bond_torque_capacity
from ._buckling import (
    BUCKLING_KNOCK_DOWN,
    SHORT_TUBE_Z,
    THIN_WALL_RATIO,
    TorsionalBuckling,
    long_tube_buckling_stress,
    moderate_tube_buckling_stress,
    thin_walled,
    torsional_buckling,
    tube_buckling_capacity,
    tube_buckling_stress,
)
from ._capacity import layer_capacity, twist_angle_capacity, twist_per_length_capacity
from ._combined import CombinedStress, combined_capacity, combined_stress, equivalent_stress
from ._compatibility import (
    layer_stiffness,
    shear_stress_at,
    stress_profile,
    torque_share,
    twist_per_length,
)
from ._criteria import AllowableRule, Criterion
from ._criteria_list import CRITERIA, CriterionCheck, Section, governing_of
from ._demand import torque_from_power
from ._diagnoses import (
    ALLOWABLE_ERRORS,
    LAYER_ERRORS,
    LOAD_ERRORS,
    PART_ERRORS,
    PLY_ERRORS,
    AllowableFlag,
    LayerFlag,
    LoadFlag,
    PartFlag,
    PlyFlag,
    describe,
    has_error,
    is_error,
    split_flags,
)
from ._duty import Duty
from ._fits import (
    FRICTION_GUIDANCE,
    FRICTION_GUIDANCE_SOURCE,
    REFERENCE_TEMPERATURE,
    FrictionGuide,
    combined_stress_capacity,
    fit_equivalent_stress,
    fit_hoop_stresses,
    fit_pressure,
    interference_at_temperature,
    lame_stresses,
    slip_capacity,
    slip_torque,
)
from ._governing import governing_limit, margin, reserve_factor
from ._interfaces import InterfaceRating, rate_interfaces
from ._laminate import (
    LaminateModuli,
    PlySet,
    laminate_moduli,
    ply_flags,
    ply_library,
    reduced_stiffness,
    transformed_stiffness,
)
from ._layer_fit_stress import layer_fit_stress_capacity
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
    twist_per_length_at_torque,
)
from ._plastic_unloading import permanent_twist, residual_stress_profile
from ._radius import RadiusPlace, layer_at_radius
from ._rating import Rating, rate
from ._restoring import RestoreResult, restore_sleeve
from ._section import (
    DEFAULT_CONTACT_ABS_TOL,
    DEFAULT_CONTACT_REL_TOL,
    LayerStack,
    interface_gaps,
    polar_moment,
    shear_modulus_from_elastic,
)
from ._shafting_code import (
    SHAFTING_CODE_SHOCK_FATIGUE_FACTORS,
    ShockFatigueFactors,
    shafting_code_capacity,
    shafting_code_diameter,
    shafting_code_shear_stress,
)
from ._sizing import (
    DEFAULT_SIZE_TOL,
    OuterLayers,
    SizedDimension,
    SizingResult,
    SizingStatus,
    resized,
    sizing_slot,
    solve_dimension,
)
from ._sleeve_diagnoses import (
    INTERFACE_ERRORS,
    PLASTIC_ERRORS,
    InterfaceFlag,
    PlasticFlag,
    describe_sleeve_flag,
    has_sleeve_error,
)
from ._stack_fits import stack_fit_pressures
from ._stock import StockResult, StockStatus, round_up_to_stock
from ._whirl import (
    WHIRL_SPEED_RATIO_LIMIT,
    EndSupport,
    WhirlCheck,
    critical_speed,
    frequency_parameter,
    mass_per_length,
    whirl_check,
    whirl_gate_capacity,
    whirl_reserve,
)

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
    "LoadFlag",
    "PlyFlag",
    "LOAD_ERRORS",
    "PLY_ERRORS",
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
    "twist_per_length",
    "torque_share",
    "shear_stress_at",
    "stress_profile",
    "layer_at_radius",
    "RadiusPlace",
    # capacities and the governing limit
    "layer_capacity",
    "twist_angle_capacity",
    "twist_per_length_capacity",
    "governing_limit",
    "margin",
    "reserve_factor",
    "governing_of",
    "CRITERIA",
    "CriterionCheck",
    "Section",
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
    # sizing
    "SizedDimension",
    "OuterLayers",
    "SizingStatus",
    "SizingResult",
    "DEFAULT_SIZE_TOL",
    "sizing_slot",
    "resized",
    "solve_dimension",
    "StockStatus",
    "StockResult",
    "round_up_to_stock",
    "RestoreResult",
    "restore_sleeve",
    # bending and combined stress
    "area_moment",
    "section_area",
    "SectionBending",
    "section_bending",
    "equivalent_stress",
    "combined_capacity",
    "CombinedStress",
    "combined_stress",
    # the transmission-shafting code's combined equation
    "ShockFatigueFactors",
    "SHAFTING_CODE_SHOCK_FATIGUE_FACTORS",
    "shafting_code_shear_stress",
    "shafting_code_capacity",
    "shafting_code_diameter",
    # whirl
    "EndSupport",
    "WHIRL_SPEED_RATIO_LIMIT",
    "frequency_parameter",
    "mass_per_length",
    "critical_speed",
    "whirl_reserve",
    "whirl_gate_capacity",
    "WhirlCheck",
    "whirl_of",
    "whirl_check",
    # laminates
    "PlySet",
    "ply_library",
    "reduced_stiffness",
    "transformed_stiffness",
    "ply_flags",
    "LaminateModuli",
    "laminate_moduli",
    # torsional buckling
    "BUCKLING_KNOCK_DOWN",
    "THIN_WALL_RATIO",
    "SHORT_TUBE_Z",
    "long_tube_buckling_stress",
    "moderate_tube_buckling_stress",
    "tube_buckling_stress",
    "thin_walled",
    "tube_buckling_capacity",
    "TorsionalBuckling",
    "torsional_buckling",
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
    "Adhesive",
    "ADHESIVE_DESIGN_FACTOR",
    "ADHESIVE_SOURCE",
    "adhesive_library",
    "find_adhesive",
    "FRICTION_GUIDANCE_SOURCE",
    "interference_at_temperature",
    "fit_pressure",
    "fit_hoop_stresses",
    "lame_stresses",
    "slip_torque",
    "slip_capacity",
    "fit_equivalent_stress",
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
    "twist_per_length_at_torque",
    "residual_stress_profile",
    "permanent_twist",
]
