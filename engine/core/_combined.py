"""Combined bending, axial and torsional stress in each layer, against yield over the safety factor.

At each layer's outer and inner radius the normal stress ``sigma`` (bending plus axial, from
:func:`section_bending`) meets the torsional shear ``tau = G_i r T / sum(G J)`` (twist
compatibility). Yield theories combine them (plane stress, one normal and one shear stress):

- maximum shear stress (Tresca): ``sigma_eq = sqrt(sigma^2 + 4 tau^2)``;
- distortion energy (von Mises): ``sigma_eq = sqrt(sigma^2 + 3 tau^2)``;

each against ``Sy / FS``. With zero normal stress both reduce to the torsion-only allowables
``tau_allow = k Sy / FS`` with k = 0.5 and 1/sqrt(3).

The classic transmission-shafting code's combined equation for steel shafts, with shock and
fatigue factors, is in :mod:`._shafting_code`.

Preliminary design aid: verify against the applicable codes and standards and have a qualified
engineer review the design; local codes and licensed practice prevail.
"""

from __future__ import annotations

from dataclasses import dataclass, fields
from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import (
    as_float,
    flag_where,
    frozen_view,
    gather_layer_flags,
    layer_arrays,
    part_array,
    scalar_out,
)
from ._bending import SectionBending
from ._criteria import AllowableRule
from ._diagnoses import LOAD_ERRORS, LoadFlag

__all__ = ["equivalent_stress", "combined_capacity", "CombinedStress", "combined_stress"]

# sigma_eq^2 = sigma^2 + c * tau^2, by AllowableRule code; NaN for rules that do not combine.
_SHEAR_WEIGHT = {int(AllowableRule.MAX_SHEAR): 4.0, int(AllowableRule.DISTORTION_ENERGY): 3.0}


def _shear_weight(rule: ArrayLike) -> NDArray[np.float64]:
    code = np.asarray(rule)
    weight = np.full(code.shape, np.nan)
    for value, c in _SHEAR_WEIGHT.items():
        np.copyto(weight, c, where=code == value)
    return weight


def equivalent_stress(normal: ArrayLike, shear: ArrayLike, rule: ArrayLike) -> Any:
    """Equivalent stress of one normal and one shear stress by a layer's yield theory.

    Parameters
    ----------
    normal : array_like, Pa
    shear : array_like, Pa
    rule : array_like of AllowableRule (int codes)
        ``MAX_SHEAR`` (1): ``sqrt(sigma^2 + 4 tau^2)``, the difference of the extreme
        principal stresses; ``DISTORTION_ENERGY`` (2): ``sqrt(sigma^2 + 3 tau^2)``.

    Returns
    -------
    ndarray or scalar, Pa
        NaN for any other rule.

    Examples
    --------
    >>> float(equivalent_stress(30e6, 20e6, AllowableRule.MAX_SHEAR)) / 1e6
    50.0
    """
    # hypot keeps tiny and huge stresses from under- or overflowing when squared.
    return scalar_out(np.hypot(as_float(normal), np.sqrt(_shear_weight(rule)) * as_float(shear)))


def combined_capacity(
    normal_outer: ArrayLike,
    allowable_normal: ArrayLike,
    sum_stiffness: ArrayLike,
    shear_modulus: ArrayLike,
    outer_diameter: ArrayLike,
    rule: ArrayLike,
    stress_concentration: ArrayLike = 1.0,
) -> Any:
    """Section torque at which a layer's combined stress reaches ``Sy / FS``, bending held fixed.

    The bending (and axial) stress is held at its given value while the torque rises: the
    capacity is the section torque ``T`` for which ``sigma_eq(sigma, Kt G r_o T / sum(GJ))``
    equals the allowable at the layer's outer radius,
    ``T = 2 sum(GJ) sqrt((S^2 - sigma^2) / c) / (G D_o Kt)`` with ``c`` 4 (maximum shear) or
    3 (distortion energy). Within a layer both ``|sigma|`` and ``tau`` grow with the radius
    and Kt acts at the outer surface, so the outer radius governs the layer.

    Parameters
    ----------
    normal_outer : array_like, Pa
        Normal stress at the layer's outer radius, stress concentration included.
    allowable_normal : array_like, Pa
        ``Sy / FS``.
    sum_stiffness : array_like, N*m^2
        ``sum(G J)`` of the section (broadcast against the layers).
    shear_modulus : array_like, Pa
    outer_diameter : array_like, m
    rule : array_like of AllowableRule (int codes)
    stress_concentration : array_like, 1
        Kt for torsion at the outer radius.

    Returns
    -------
    ndarray or scalar, N*m
        0 where the normal stress alone reaches the allowable (no torque can be carried);
        NaN where the rule is neither maximum shear nor distortion energy.

    Examples
    --------
    >>> stiffness = 79.3e9 * np.pi / 32 * 0.025**4  # one 25 mm bar, G J
    >>> free = combined_capacity(0.0, 200e6, stiffness, 79.3e9, 0.025, AllowableRule.MAX_SHEAR)
    >>> round(float(free), 1)  # pi/16 D^3 * (0.5 * 200 MPa)
    306.8
    """
    sigma = as_float(normal_outer)
    allowable = as_float(allowable_normal)
    with np.errstate(divide="ignore", invalid="ignore"):
        room = allowable * allowable - sigma * sigma
        room = np.sqrt(np.maximum(room, 0.0) / _shear_weight(rule))
        result = (
            2.0 * as_float(sum_stiffness) * room
            / (as_float(shear_modulus) * as_float(outer_diameter) * as_float(stress_concentration))
        )
    return scalar_out(result)


@dataclass(frozen=True)
class CombinedStress:
    """Result of :func:`combined_stress` for P parts of L layer slots.

    Per-layer arrays are ``(P, L)``, NaN in absent slots and in parts not evaluated; the
    stresses are NaN as well where no torque is given (the capacities are still rated).

    Attributes
    ----------
    shear_outer, shear_inner : (P, L) ndarray, Pa
        Nominal torsional shear ``G_i r |T| / sum(GJ)`` at the outer and inner radius.
    equivalent_outer : (P, L) ndarray, Pa
        Equivalent stress at the outer radius with both stress-concentration factors.
    equivalent_inner : (P, L) ndarray, Pa
        Equivalent stress at the inner radius (nominal: the factors act at the surface).
    allowable : (P, L) ndarray, Pa
        ``Sy / FS``.
    utilisation : (P, L) ndarray, 1
        ``equivalent_outer / allowable``.
    capacity : (P, L) ndarray, N*m
        Section torque at which the layer reaches the allowable with the bending held at
        its given value (:func:`combined_capacity`); 0 with ``BENDING_ALONE_EXCEEDS``.
    sum_gj : (P,) ndarray, N*m^2
    layer_flags : (P, L) ndarray of int32
        :class:`LoadFlag`: ``STRENGTH_NOT_POSITIVE``, ``RULE_NOT_COMBINABLE``,
        ``CONCENTRATION_BELOW_ONE`` (the bending factor; errors), ``BENDING_ALONE_EXCEEDS``
        (a note).
    part_flags : (P,) ndarray of int32
        ``TORQUE_NOT_FINITE``, the bending result's bits and the layers' bits.
    valid : (P,) ndarray of bool
    """

    shear_outer: NDArray[np.float64]
    shear_inner: NDArray[np.float64]
    equivalent_outer: NDArray[np.float64]
    equivalent_inner: NDArray[np.float64]
    allowable: NDArray[np.float64]
    utilisation: NDArray[np.float64]
    capacity: NDArray[np.float64]
    sum_gj: NDArray[np.float64]
    layer_flags: NDArray[np.int32]
    part_flags: NDArray[np.int32]
    valid: NDArray[np.bool_]

    def __post_init__(self) -> None:
        for item in fields(self):
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))

    @property
    def n_parts(self) -> int:
        """Number of parts."""
        return int(self.sum_gj.shape[0])


def combined_stress(
    bending: SectionBending,
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    shear_modulus: ArrayLike,
    torque: ArrayLike,
    yield_strength: ArrayLike,
    factor_of_safety: ArrayLike,
    rule: ArrayLike,
    *,
    present: ArrayLike | None = None,
    stress_concentration: ArrayLike = 1.0,
    bending_concentration: ArrayLike = 1.0,
    sum_stiffness: ArrayLike | None = None,
    shear_outer: ArrayLike | None = None,
    shear_inner: ArrayLike | None = None,
) -> CombinedStress:
    """Combined stress at each layer's outer and inner radius, and each layer's capacity.

    Parameters
    ----------
    bending : SectionBending
        The same parts' bending result (:func:`section_bending`).
    outer_diameter, inner_diameter : (P, L) array_like, m
    shear_modulus : (P, L) array_like, Pa
    torque : (P,) array_like, N*m
        Its magnitude is used; NaN rates the capacities only.
    yield_strength : (P, L) array_like, Pa
    factor_of_safety : (P, L) array_like, 1
    rule : (P, L) array_like of AllowableRule (int codes)
        Each layer's theory: 1 maximum shear, 2 distortion energy.
    present : (P, L) array_like of bool, optional
        Default: a slot is present where its outer diameter is not NaN.
    stress_concentration : (P, L) array_like, 1
        Kt for torsion at the outer radius: the stack's ``stress_concentration``, checked
        with the stack by :func:`rate` (as are the diameters and G).
    bending_concentration : (P, L) array_like, 1
        Kt for bending (and axial) stress at the outer radius.
    sum_stiffness : (P,) array_like, N*m^2, optional
        ``sum(G J)`` when the caller has it (``Rating.sum_gj``); computed otherwise.
    shear_outer, shear_inner : (P, L) array_like, Pa, optional
        Nominal torsional shear ``G_i r |T| / sum(GJ)`` at the two radii when the caller
        has it (``Rating.stress_outer``, ``Rating.stress_inner`` for the same torque);
        computed otherwise. Give both or neither.

    Returns
    -------
    CombinedStress
        Parts with an error bit, here or in ``bending``, get NaN results and ``valid``
        False. The capacity is the section torque at which the layer's combined stress
        reaches ``Sy / FS`` with the bending held fixed at its given value; it is 0, with
        the note ``BENDING_ALONE_EXCEEDS``, where the bending stress alone reaches it.

    Raises
    ------
    ValueError
        If the inputs do not broadcast to the bending result's ``(P, L)`` and ``(P,)``,
        or only one of ``shear_outer`` and ``shear_inner`` is given.
    """
    (do, di, modulus, sy, fs), mask = layer_arrays(
        outer_diameter, inner_diameter, shear_modulus, yield_strength, factor_of_safety,
        present=present,
    )
    shape = do.shape
    if shape != bending.ei.shape:
        raise ValueError(
            f"layer inputs have shape {shape}; expected {bending.ei.shape} like the "
            "bending result"
        )
    if (shear_outer is None) != (shear_inner is None):
        raise ValueError("give both shear_outer and shear_inner, or neither")
    try:
        code = np.broadcast_to(np.asarray(rule), shape)
        kt = np.broadcast_to(as_float(stress_concentration), shape)
        kb_given = as_float(bending_concentration)
        kb = np.broadcast_to(kb_given, shape)
        given_shear = None if shear_outer is None else (
            np.broadcast_to(as_float(shear_outer), shape),
            np.broadcast_to(as_float(shear_inner), shape))
    except ValueError as error:
        raise ValueError(
            f"rule, stress-concentration factors and shear stresses must broadcast to {shape}"
        ) from error
    n_parts = shape[0]
    demand = np.abs(part_array(torque, n_parts, "torque"))

    with np.errstate(all="ignore"):
        # Kt belongs to the layer stack and is checked there (rate's LayerFlag); the inputs
        # new to this check are checked here.
        allowable = np.divide(sy, fs)
        strength_ok = allowable > 0
        strength_ok &= allowable < np.inf
        strength_ok &= fs > 0
        rule_ok = (code == int(AllowableRule.MAX_SHEAR)) | (
            code == int(AllowableRule.DISTORTION_ENERGY))
        if code.dtype.kind not in "iu":  # codes read as floats (NaN for a blank cell)
            code = np.where(rule_ok, code, 0).astype(np.int8)
        kb_ok = np.broadcast_to((kb_given >= 1) & (kb_given < np.inf), shape)
        layer_flags = np.zeros(shape, dtype=np.int32)
        for ok, flag in ((strength_ok, LoadFlag.STRENGTH_NOT_POSITIVE),
                         (rule_ok, LoadFlag.RULE_NOT_COMBINABLE),
                         (kb_ok, LoadFlag.CONCENTRATION_BELOW_ONE)):
            bad = mask & ~ok
            if bad.any():
                flag_where(layer_flags, bad, flag)
        part_flags = bending.part_flags.copy()
        flag_where(part_flags, np.isinf(demand), LoadFlag.TORQUE_NOT_FINITE)
        part_flags = gather_layer_flags(part_flags, layer_flags)
        valid = (part_flags & int(LOAD_ERRORS)) == 0
        unused = ~mask if valid.all() else ~(mask & valid[:, np.newaxis])
        mask_needed = bool(unused.any())

        if sum_stiffness is None:
            gj = np.multiply(do, do)
            np.multiply(gj, gj, out=gj)
            inner4 = np.multiply(di, di)
            gj -= np.multiply(inner4, inner4, out=inner4)
            gj *= modulus
            np.copyto(gj, 0.0, where=~mask)
            sum_gj = gj[:, 0].copy()
            for slot in range(1, shape[1]):
                sum_gj += gj[:, slot]
            sum_gj *= np.pi / 32.0
            del gj, inner4
        else:
            sum_gj = part_array(sum_stiffness, n_parts, "sum_stiffness").copy()
        if not valid.all():
            sum_gj[~valid] = np.nan

        # The batch is large: outputs are built in place and scratch space is borrowed from
        # outputs not yet filled, since fresh memory costs more than the arithmetic.
        # sigma_eq^2 = sigma^2 + c tau^2 with c = 4 (code 1) or 3 (code 2): c = 5 - code,
        # kept as small integers (numpy converts them in chunks, no float copy).
        weight = np.subtract(np.int8(5), code, dtype=np.int8)
        arm = np.multiply(modulus, do)  # G D Kt: shear per twist rate, and the capacity's
        arm *= kt
        if given_shear is None:
            half_theta = np.repeat(0.5 * demand / sum_gj, shape[1]).reshape(shape)
            outer_shear = np.multiply(modulus, do)
            outer_shear *= half_theta
            inner_shear = np.multiply(modulus, di)
            inner_shear *= half_theta
            del half_theta
        else:
            outer_shear, inner_shear = given_shear
        sigma_outer = bending.normal_outer
        if not bool(np.all(kb_given == 1.0)):
            sigma_outer = np.multiply(sigma_outer, kb)

        equivalent_outer = np.multiply(outer_shear, kt)
        equivalent_outer *= equivalent_outer
        equivalent_outer *= weight
        capacity = np.multiply(sigma_outer, sigma_outer)  # sigma^2 for now
        equivalent_outer += capacity
        np.sqrt(equivalent_outer, out=equivalent_outer)

        # combined_capacity, inline: T = 2 sum(GJ) sqrt((S^2 - sigma^2) / c) / (G D Kt).
        utilisation = np.multiply(allowable, allowable)  # S^2 for now
        np.subtract(utilisation, capacity, out=capacity)
        exceeded = capacity <= 0
        np.maximum(capacity, 0.0, out=capacity)
        capacity /= weight
        np.sqrt(capacity, out=capacity)
        capacity *= (2.0 * sum_gj)[:, np.newaxis]
        capacity /= arm
        del arm

        equivalent_inner = np.multiply(inner_shear, inner_shear)
        equivalent_inner *= weight
        normal_inner = bending.normal_inner
        equivalent_inner += np.multiply(normal_inner, normal_inner, out=utilisation)
        np.sqrt(equivalent_inner, out=equivalent_inner)
        np.divide(equivalent_outer, allowable, out=utilisation)

        exceeded &= ~unused
        if exceeded.any():
            flag_where(layer_flags, exceeded, LoadFlag.BENDING_ALONE_EXCEEDS)
            flag_where(part_flags, exceeded.any(axis=1), LoadFlag.BENDING_ALONE_EXCEEDS)
        if mask_needed and given_shear is not None:
            # The caller's arrays are read, never written: NaN goes into copies.
            outer_shear, inner_shear = np.array(outer_shear), np.array(inner_shear)
        if mask_needed:
            for array in (outer_shear, inner_shear, equivalent_outer, equivalent_inner,
                          allowable, utilisation, capacity):
                np.copyto(array, np.nan, where=unused)

    return CombinedStress(
        shear_outer=outer_shear,
        shear_inner=inner_shear,
        equivalent_outer=equivalent_outer,
        equivalent_inner=equivalent_inner,
        allowable=allowable,
        utilisation=utilisation,
        capacity=capacity,
        sum_gj=sum_gj,
        layer_flags=layer_flags,
        part_flags=part_flags,
        valid=valid,
    )
