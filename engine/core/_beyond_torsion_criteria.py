"""Bending with torsion, whirl and torsional buckling as criteria of the list.

Each function takes a `Section` and returns a section-torque capacity, reading its further
inputs by name (SI):

``bending_moment`` (P,), N*m; ``axial_force`` (P,), N (+ tension)
    Combined stress per layer (:func:`combined_capacity`). The bending and axial stress are
    held at their given values while the torque rises. The allowable normal stress comes from
    the layer's own allowable shear stress and its rule, so that with no bending the check is
    the torsion check exactly: distortion energy ``sqrt(sigma^2 + 3 tau^2) <= sqrt(3) tau_a``;
    every other rule (maximum shear, a given allowable, the shafting code) by maximum shear
    ``sqrt(sigma^2 + 4 tau^2) <= 2 tau_a`` -- the form in which the shafting code applies its
    allowable shear to combined loading. Needs ``youngs_modulus`` per layer.
``speed`` (P,), rad/s; ``end_support`` (P,) `EndSupport` codes (default simply supported);
``bearing_span`` (P,), m (default the part's length)
    Whirl, a gate (:func:`whirl_gate_capacity`): +inf while the speed is at most
    `WHIRL_SPEED_RATIO_LIMIT` of the first bending critical, 0 above it. The critical speed
    does not change with the torque, so there is no torque at which it is reached; a part run
    too close to its critical must not be given a torque rating at all, and 0 makes it govern
    with margin -1 in every output. Needs ``youngs_modulus`` and ``density`` per layer.
``youngs_modulus``, ``poisson_ratio`` (P, L); ``factor_of_safety`` (P, L)
    Torsional buckling of thin walls (:func:`torsional_buckling`), with the largest factor of
    safety of the part's layers (1 where none is given: the knock-down still applies).

Where an input is not given (absent key, or NaN for a part) the criterion sets no limit
(+inf), so torsion-only batches pay one dictionary look-up per criterion. Where the load is
given but a layer lacks the property it needs, the capacity is 0 (combined stress) -- the
intake refuses such parts with a message first; whirl and buckling are then not checked
(+inf), which the intake notes.

Preliminary design aid: verify against the applicable codes and standards and have a qualified
engineer review the design; local codes and licensed practice prevail.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np
from numpy.typing import NDArray

from ._bending import section_bending
from ._buckling import thin_walled, torsional_buckling
from ._combined import combined_capacity
from ._criteria import AllowableRule
from ._whirl import EndSupport, WhirlCheck, whirl_check

if TYPE_CHECKING:  # the list imports these functions
    from ._criteria_list import Section

__all__ = ["combined_stress_capacity", "whirl_capacity", "buckling_capacity", "whirl_of"]


def _no_limit_layers(section: Section) -> NDArray[np.float64]:
    return section.no_limit(per_layer=True)


def _no_limit_parts(section: Section) -> NDArray[np.float64]:
    return section.no_limit()


def combined_stress_capacity(section: Section) -> NDArray[np.float64]:
    """Per layer: the section torque at which the combined stress reaches the allowable.

    Returns
    -------
    (P, L) ndarray, N*m
        +inf for parts with neither a bending moment nor an axial force; NaN in unused slots.
    """
    moment = section.input("bending_moment")
    force = section.input("axial_force")
    modulus = section.input("youngs_modulus", per_layer=True)
    if moment is None and force is None:
        return _no_limit_layers(section)
    n_parts = section.sum_gj.shape[0]
    moment = np.full(n_parts, np.nan) if moment is None else moment
    force = np.full(n_parts, np.nan) if force is None else force
    loaded = ~(np.isnan(moment) & np.isnan(force))
    if not loaded.any():
        return _no_limit_layers(section)
    stack = section.stack
    used = ~section.unused
    if modulus is None:
        modulus = np.full(section.gj.shape, np.nan)
    with np.errstate(all="ignore"):
        bend = section_bending(stack.outer_diameter, stack.inner_diameter,
                               np.where(used, modulus, 1.0), np.nan_to_num(moment),
                               np.nan_to_num(force), present=used)
        distortion = np.asarray(stack.allowable_rule) == int(AllowableRule.DISTORTION_ENERGY)
        rule = np.where(distortion, int(AllowableRule.DISTORTION_ENERGY), int(AllowableRule.MAX_SHEAR))
        allowable_normal = stack.allowable_shear * np.where(distortion, np.sqrt(3.0), 2.0)
        capacity = np.asarray(combined_capacity(
            bend.normal_outer, allowable_normal, section.sum_gj[:, np.newaxis], stack.shear_modulus,
            stack.outer_diameter, rule, stack.stress_concentration), dtype=float)
    # A load that cannot be checked (a layer without E) is no licence to ignore it.
    missing = loaded[:, np.newaxis] & used & np.isnan(capacity)
    capacity[missing] = 0.0
    capacity[~loaded] = np.inf
    np.copyto(capacity, np.nan, where=section.unused)
    return capacity


def whirl_of(stack, length, inputs, used=None) -> WhirlCheck | None:
    """The whirl check of P parts from their stack, length and inputs; None with no speed given.

    Parameters
    ----------
    stack : LayerStack
    length : (P,) array_like, m
    inputs : mapping of str to ndarray
        ``speed`` (P,) rad/s, ``end_support`` (P,) codes (NaN: simply supported),
        ``bearing_span`` (P,) m (NaN: the length),
        ``youngs_modulus`` and ``density`` (P, L).
    used : (P, L) array_like of bool, optional
        Default: the stack's present slots.
    """
    speed = inputs.get("speed")
    if speed is None:
        return None
    n_parts = stack.n_parts
    speed = np.broadcast_to(np.asarray(speed, dtype=float), (n_parts,))
    if np.isnan(speed).all():
        return None
    used = stack.present if used is None else used
    shape = used.shape
    nan = np.full(shape, np.nan)
    modulus = inputs.get("youngs_modulus")
    density = inputs.get("density")
    span = inputs.get("bearing_span")
    if span is not None:
        span = np.broadcast_to(np.asarray(span, dtype=float), (n_parts,))
        length = np.where(np.isnan(span), np.broadcast_to(np.asarray(length, dtype=float), (n_parts,)), span)
    support = inputs.get("end_support")
    support = (np.full(n_parts, int(EndSupport.PINNED_PINNED)) if support is None else np.where(
        np.isnan(np.broadcast_to(np.asarray(support, dtype=float), (n_parts,))),
        int(EndSupport.PINNED_PINNED), support).astype(np.int64))
    with np.errstate(all="ignore"):
        return whirl_check(stack.outer_diameter, stack.inner_diameter,
                           nan if modulus is None else np.broadcast_to(modulus, shape),
                           nan if density is None else np.broadcast_to(density, shape),
                           length, speed, support, present=used)


def whirl_capacity(section: Section) -> NDArray[np.float64]:
    """Per part: the whirl gate, 0 above the allowed speed ratio, +inf otherwise.

    Returns
    -------
    (P,) ndarray, N*m
        +inf where no speed is given or the check cannot be made (a layer without E or density).
    """
    check = whirl_of(section.stack, section.duty.length, section.inputs, ~section.unused)
    if check is None:
        return _no_limit_parts(section)
    capacity = np.asarray(check.gate_capacity, dtype=float).copy()
    capacity[~np.asarray(check.valid)] = np.inf
    capacity[np.isnan(section.sum_gj)] = np.nan
    return capacity


def buckling_capacity(section: Section) -> NDArray[np.float64]:
    """Per part: the torsional buckling torque of a thin wall over its factor of safety.

    Returns
    -------
    (P,) ndarray, N*m
        +inf for solid and thick-walled parts and where a layer lacks E or Poisson's ratio.
    """
    modulus = section.input("youngs_modulus", per_layer=True)
    poisson = section.input("poisson_ratio", per_layer=True)
    if modulus is None or poisson is None:
        return _no_limit_parts(section)
    used = ~section.unused
    known = ~(np.isnan(modulus) | np.isnan(poisson)) | ~used
    # No span, no buckling torque (the formulas need L): such parts are left out of the work.
    checkable = known.all(axis=1) & np.broadcast_to(np.isfinite(section.duty.length), known.shape[:1])
    if not checkable.any():
        return _no_limit_parts(section)
    stack = section.stack
    # Only thin hollow walls are checked: the rest are +inf whatever their inputs, so the
    # check runs on those parts alone (most of a machine catalogue is stocky).
    rows = np.flatnonzero(checkable & thin_walled(stack.outer_diameter, stack.inner_diameter,
                                                  used))
    capacity = np.full(section.sum_gj.shape, np.inf)
    safety = section.input("factor_of_safety", per_layer=True)
    with np.errstate(all="ignore"):
        if safety is None:
            part_safety = np.ones(rows.size)
        else:
            part_safety = np.fmax.reduce(np.where(used[rows], safety[rows], np.nan), axis=1)
            part_safety = np.where(np.isnan(part_safety), 1.0, part_safety)
        if rows.size:
            result = torsional_buckling(
                stack.outer_diameter[rows], stack.inner_diameter[rows],
                np.where(used[rows], modulus[rows], 1.0), np.where(used[rows], poisson[rows], 0.3),
                np.broadcast_to(section.duty.length, capacity.shape)[rows], part_safety,
                present=used[rows])
            found = np.asarray(result.capacity, dtype=float)
            capacity[rows] = np.where(np.isnan(found), np.inf, found)
    capacity[np.isnan(section.sum_gj)] = np.nan
    return capacity
