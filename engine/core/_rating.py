"""Rating: one vectorised pass that rates every part of a batch against every criterion of the list."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field, fields
from types import MappingProxyType

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import frozen_view
from ._criteria import Criterion
from ._criteria_list import CRITERIA, LAYER_STRESS_DENOMINATOR, Section, governing_of
from ._diagnoses import PART_ERRORS
from ._duty import Duty, take_rows
from ._rating_flags import layer_flags as layer_flags_of
from ._rating_flags import part_flags as part_flags_of
from ._section import (
    DEFAULT_CONTACT_ABS_TOL,
    DEFAULT_CONTACT_REL_TOL,
    LayerStack,
)

__all__ = ["Duty", "Rating", "rate"]


@dataclass(frozen=True)
class Rating:
    """Results of :func:`rate` for P parts of L layer slots, SI.

    Per-layer arrays are ``(P, L)`` and NaN where the slot is absent or the part is not
    rated; per-part arrays are ``(P,)``. Results use the torque's magnitude.

    Attributes
    ----------
    gj : (P, L) ndarray, N*m^2
        Layer torsional stiffness ``G*J``.
    share : (P, L) ndarray, 1
        Fraction of the torque each layer carries; sums to 1 over a part.
    layer_torque : (P, L) ndarray, N*m
        Torque in each layer at the applied torque.
    stress_outer, stress_inner : (P, L) ndarray, Pa
        Nominal shear stress at the layer's outer and inner radius (no Kt).
    capacity : (P, L) ndarray, N*m
        Section torque at which the layer reaches its allowable (Kt included).
    utilisation : (P, L) ndarray, 1
        ``Kt * stress_outer / allowable`` = ``|T| / capacity``.
    layer_flags : (P, L) ndarray of int32
        :class:`LayerFlag` bits, also for parts that are not rated.
    interface_gap : (P, L) ndarray, m
        Signed ``inner_d[i] - outer_d[i-1]`` (> 0 gap, < 0 overlap); NaN for slot 0 and
        absent slots; kept for unrated parts, since it explains them.
    allowable_rule : (P, L) ndarray of int8
        The :class:`AllowableRule` each layer's allowable came from.
    sum_gj : (P,) ndarray, N*m^2
    twist_per_length : (P,) ndarray, rad/m
        The twist per length common to every layer, ``|T| / sum(G J)``.
    twist_angle : (P,) ndarray, rad
        NaN if no length is given.
    twist_capacity : (P,) ndarray, N*m
        The smaller of the two twist limits' torques; inf if neither is given.
    governing_capacity : (P,) ndarray, N*m
        Smallest capacity of all criteria.
    governing_criterion : (P,) ndarray of int8
        :class:`Criterion`; ``NONE`` for unrated parts.
    governing_layer : (P,) ndarray of int16
        Layer slot that governs; -1 if a twist limit governs or the part is unrated.
    margin : (P,) ndarray, 1
        ``governing_capacity / |T| - 1``; inf at zero torque, NaN with no torque.
    reserve_factor : (P,) ndarray, 1
        ``governing_capacity / |T|`` (limit over demand; not a material's factor of safety).
    part_flags : (P,) ndarray of int32
        :class:`PartFlag` bits.
    valid : (P,) ndarray of bool
        The part was rated (no error flag).
    criterion_capacity : mapping of Criterion to ndarray, N*m
        Every criterion's capacity, ``(P,)`` or ``(P, L)``, as `CRITERIA` lists them.
    """

    gj: NDArray[np.float64]
    share: NDArray[np.float64]
    layer_torque: NDArray[np.float64]
    stress_outer: NDArray[np.float64]
    stress_inner: NDArray[np.float64]
    capacity: NDArray[np.float64]
    utilisation: NDArray[np.float64]
    layer_flags: NDArray[np.int32]
    interface_gap: NDArray[np.float64]
    allowable_rule: NDArray[np.int8]
    sum_gj: NDArray[np.float64]
    twist_per_length: NDArray[np.float64]
    twist_angle: NDArray[np.float64]
    twist_capacity: NDArray[np.float64]
    governing_capacity: NDArray[np.float64]
    governing_criterion: NDArray[np.int8]
    governing_layer: NDArray[np.int16]
    margin: NDArray[np.float64]
    reserve_factor: NDArray[np.float64]
    part_flags: NDArray[np.int32]
    valid: NDArray[np.bool_]
    criterion_capacity: Mapping[Criterion, NDArray[np.float64]] = field(default_factory=dict)

    def __post_init__(self) -> None:
        for item in fields(self):
            if item.name == "criterion_capacity":
                continue
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))
        object.__setattr__(self, "criterion_capacity", MappingProxyType(
            {Criterion(k): frozen_view(np.asarray(v)) for k, v in self.criterion_capacity.items()}))

    @property
    def n_parts(self) -> int:
        """Number of parts."""
        return int(self.sum_gj.shape[0])

    def take(self, rows: int | slice | ArrayLike) -> Rating:
        """A new rating holding only the given parts (an int keeps one part)."""
        index = take_rows(rows)
        values = {f.name: getattr(self, f.name) for f in fields(self)}
        values = {k: ({c: a[index] for c, a in v.items()} if k == "criterion_capacity" else v[index])
                  for k, v in values.items()}
        return Rating(**values)


def rate(
    stack: LayerStack,
    duty: Duty,
    *,
    inputs: Mapping[str, ArrayLike] | None = None,
    contact_abs_tol: float = DEFAULT_CONTACT_ABS_TOL,
    contact_rel_tol: float = DEFAULT_CONTACT_REL_TOL,
) -> Rating:
    """Rate every part: torque split, stresses, capacities, twist and the governing limit.

    Layers are fully connected along the length and twist as one (twist compatibility):
    ``theta' = |T| / sum(G J)``, ``T_i = G_i J_i theta'``, ``tau = G_i r theta'``, layer
    capacity ``tau_a,i sum(G J) / (G_i r_o,i Kt_i)``, twist capacities
    ``phi_lim sum(G J) / L`` and ``theta'_lim sum(G J)``.

    Parameters
    ----------
    stack : LayerStack
        P parts of L layer slots.
    duty : Duty
        P parts, or one duty applied to every part.
    inputs : mapping of str to array_like, optional
        Further inputs of the criteria beyond torsion, by name (see `CRITERIA`); ``(P,)`` or
        ``(P, L)``, SI, NaN where not given. A criterion whose inputs are absent sets no limit.
    contact_abs_tol : float, m
        Absolute tolerance of the layer-contact check (default 0.01 mm).
    contact_rel_tol : float, 1
        Tolerance relative to the interface diameter (default 0.02 %); the larger of
        the two applies.

    Returns
    -------
    Rating
        Parts with an error flag get NaN results and ``valid`` False; the others are rated.

    Raises
    ------
    ValueError
        If ``duty`` has neither one part nor as many parts as ``stack``.
    """
    n_parts = stack.n_parts
    if duty.n_parts not in (1, n_parts):
        raise ValueError(
            f"duty has {duty.n_parts} parts; expected 1 or {n_parts} like the layer stack"
        )
    if duty.n_parts != n_parts:
        duty = Duty(*(np.broadcast_to(getattr(duty, f.name), (n_parts,)) for f in fields(duty)))
    do, di = stack.outer_diameter, stack.inner_diameter
    modulus = stack.shear_modulus
    nan = np.nan
    with np.errstate(all="ignore"):
        layer_flags, gap = layer_flags_of(stack, contact_abs_tol, contact_rel_tol)
        part_flags = part_flags_of(stack, duty, layer_flags)
        valid = (part_flags & int(PART_ERRORS)) == 0
        unused = ~(stack.present & valid[:, np.newaxis])

        torque = np.abs(duty.torque)
        mask_needed = bool(unused.any())
        # G*J built in place: the batch is large, temporaries are what cost time.
        gj = np.multiply(do, do)
        np.multiply(gj, gj, out=gj)
        # stress_inner's buffer holds Di^4 first, sparing a (P, L) temporary.
        stress_inner = np.multiply(di, di)
        np.multiply(stress_inner, stress_inner, out=stress_inner)
        gj -= stress_inner
        gj *= modulus
        gj *= np.pi / 32.0
        if mask_needed:
            np.copyto(gj, 0.0, where=unused)
        sum_gj = gj[:, 0].copy()
        for slot in range(1, stack.n_layers):
            sum_gj += gj[:, slot]
        invalid = None if valid.all() else ~valid
        if invalid is not None:
            sum_gj[invalid] = nan
        if mask_needed:
            np.copyto(gj, nan, where=unused)

        theta = torque / sum_gj
        share = gj / sum_gj[:, np.newaxis]
        layer_torque = share * torque[:, np.newaxis]

        half_theta = (0.5 * theta)[:, np.newaxis]
        stress_outer = np.multiply(modulus, do)
        # The layer-stress capacity starts from the same G * D_o (one product fewer).
        denominator = np.multiply(stress_outer, stack.stress_concentration)
        stress_outer *= half_theta
        np.multiply(modulus, di, out=stress_inner)
        stress_inner *= half_theta
        if mask_needed:
            for array in (stress_outer, stress_inner):
                np.copyto(array, nan, where=unused)

        section = Section(stack, duty, gj, sum_gj, unused, layer_torque, stress_outer, stress_inner,
                          MappingProxyType(dict(inputs or {})))
        section.shared[LAYER_STRESS_DENOMINATOR] = denominator
        del denominator
        capacities = {check.criterion: check.rate(section) for check in CRITERIA}
        for values in capacities.values():
            # A shared "no limit" array is read-only and NaN for these parts already.
            if invalid is not None and values.ndim == 1 and values.flags.writeable:
                values[invalid] = nan
        capacity = capacities[Criterion.LAYER_STRESS]
        utilisation = torque[:, np.newaxis] / capacity
        twist_angle = theta * duty.length
        twist_capacity = np.minimum(capacities[Criterion.TWIST_ANGLE], capacities[Criterion.TWIST_PER_LENGTH])

        # A criterion that sets no limit for any part cannot change the minimum: passed over.
        governing, criterion, layer = governing_of(
            tuple((code, v) for code, v in capacities.items() if not section.sets_no_limit(v)), n_parts)
        if invalid is not None:
            governing[invalid] = nan
            criterion[invalid] = int(Criterion.NONE)
            layer[invalid] = -1
        factor = np.divide(governing, torque)
        margin = np.subtract(factor, 1.0)

    return Rating(
        gj=gj,
        share=share,
        layer_torque=layer_torque,
        stress_outer=stress_outer,
        stress_inner=stress_inner,
        capacity=capacity,
        utilisation=utilisation,
        layer_flags=layer_flags,
        interface_gap=gap,
        allowable_rule=stack.allowable_rule,
        sum_gj=sum_gj,
        twist_per_length=theta,
        twist_angle=twist_angle,
        twist_capacity=twist_capacity,
        governing_capacity=governing,
        governing_criterion=criterion,
        governing_layer=layer,
        margin=margin,
        reserve_factor=factor,
        part_flags=part_flags,
        valid=valid,
        criterion_capacity=capacities,
    )
