"""Rating: one vectorised pass that rates every part of a batch against every criterion."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field, fields
from types import MappingProxyType

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, frozen_view
from ._criteria import Criterion
from ._criteria_list import CRITERIA, Section, governing_of
from ._diagnoses import LAYER_ERRORS, PART_ERRORS, LayerFlag, PartFlag
from ._section import (
    DEFAULT_CONTACT_ABS_TOL,
    DEFAULT_CONTACT_REL_TOL,
    LayerStack,
    interface_gaps,
)

__all__ = ["Duty", "Rating", "rate"]


def _rows(rows: int | slice | ArrayLike) -> slice | ArrayLike:
    if isinstance(rows, (int, np.integer)):
        start = int(rows)
        return slice(start, start + 1 if start != -1 else None)
    return rows


@dataclass(frozen=True)
class Duty:
    """What each part must carry, one entry per part; NaN means "not given".

    Parameters
    ----------
    torque : (P,) array, N*m
        Applied torque; its magnitude is used (a negative torque is noted).
    length : (P,) array, m
        Length over which the layers twist together.
    twist_limit_angle : (P,) array, rad
        Largest total twist allowed over the length.
    twist_limit_per_length : (P,) array, rad/m
        Largest twist per unit length allowed.

    Raises
    ------
    ValueError
        If a field is not one-dimensional or its length differs from ``torque``'s.
    """

    torque: NDArray[np.float64]
    length: NDArray[np.float64]
    twist_limit_angle: NDArray[np.float64]
    twist_limit_per_length: NDArray[np.float64]

    def __post_init__(self) -> None:
        shape = as_float(self.torque).shape
        if len(shape) != 1:
            raise ValueError(f"Duty.torque must be a (parts,) array; got shape {shape}")
        for item in fields(self):
            array = as_float(getattr(self, item.name))
            if array.shape != shape:
                raise ValueError(
                    f"Duty.{item.name} has shape {array.shape}; expected {shape} like torque"
                )
            object.__setattr__(self, item.name, frozen_view(array))

    @property
    def n_parts(self) -> int:
        """Number of parts."""
        return int(self.torque.shape[0])

    @classmethod
    def from_arrays(
        cls,
        torque: ArrayLike = np.nan,
        length: ArrayLike = np.nan,
        twist_limit_angle: ArrayLike = np.nan,
        twist_limit_per_length: ArrayLike = np.nan,
    ) -> Duty:
        """Duty from values that broadcast to one ``(P,)`` shape (scalars give one part).

        Parameters
        ----------
        torque : array_like, N*m
        length : array_like, m
        twist_limit_angle : array_like, rad
        twist_limit_per_length : array_like, rad/m

        Returns
        -------
        Duty

        Raises
        ------
        ValueError
            If the inputs do not broadcast to one dimension.
        """
        values = [as_float(v) for v in (torque, length, twist_limit_angle, twist_limit_per_length)]
        try:
            arrays = np.broadcast_arrays(*values)
        except ValueError as error:
            shapes = ", ".join(str(v.shape) for v in values)
            raise ValueError(f"Duty inputs do not broadcast together: {shapes}") from error
        if arrays[0].ndim > 1:
            raise ValueError(f"Duty inputs must be one value per part; got shape {arrays[0].shape}")
        arrays = [np.atleast_1d(a) for a in arrays]
        return cls(*arrays)

    def take(self, rows: int | slice | ArrayLike) -> Duty:
        """A new duty holding only the given parts (an int keeps one part, still 1-D)."""
        index = _rows(rows)
        return Duty(**{f.name: getattr(self, f.name)[index] for f in fields(self)})


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
        index = _rows(rows)
        values = {f.name: getattr(self, f.name) for f in fields(self)}
        values = {k: ({c: a[index] for c, a in v.items()} if k == "criterion_capacity" else v[index])
                  for k, v in values.items()}
        return Rating(**values)


def _flag(words: NDArray[np.int32], condition: NDArray[np.bool_], flag: int) -> None:
    np.bitwise_or(words, np.int32(flag), out=words, where=condition)


def _detailed_layer_flags(
    stack: LayerStack, abs_tol: float, rel_tol: float
) -> NDArray[np.int32]:
    """Every layer flag, one check at a time (run on the rows the screen rejects)."""
    do, di = stack.outer_diameter, stack.inner_diameter
    modulus, allowable, kt = stack.shear_modulus, stack.allowable_shear, stack.stress_concentration
    present = stack.present
    _, flags = interface_gaps(do, di, present, abs_tol, rel_tol)
    finite = np.isfinite(do)
    for value in (di, modulus, allowable, kt):
        finite &= np.isfinite(value)
    _flag(flags, ~finite, LayerFlag.NOT_FINITE)
    _flag(flags, do <= 0, LayerFlag.OUTER_NOT_POSITIVE)
    _flag(flags, di < 0, LayerFlag.INNER_NEGATIVE)
    _flag(flags, di >= do, LayerFlag.INNER_NOT_BELOW_OUTER)
    _flag(flags, modulus <= 0, LayerFlag.MODULUS_NOT_POSITIVE)
    _flag(flags, allowable <= 0, LayerFlag.ALLOWABLE_NOT_POSITIVE)
    _flag(flags, kt < 1, LayerFlag.KT_BELOW_ONE)
    if stack.n_layers > 1:
        _flag(flags[:, 1:], di[:, 1:] == 0, LayerFlag.SOLID_NOT_INNERMOST)
    # Absent slots carry no value flags; a hole (absent slot below a present one) does.
    np.copyto(flags, 0, where=~present)
    if stack.n_layers > 1:
        present_outside = np.logical_or.accumulate(present[:, :0:-1], axis=1)[:, ::-1]
        _flag(
            flags[:, :-1],
            ~present[:, :-1] & present_outside,
            LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS,
        )
    return flags


def _layer_flags(
    stack: LayerStack, abs_tol: float, rel_tol: float
) -> tuple[NDArray[np.int32], NDArray[np.float64]]:
    """Layer flags and signed interface gaps of the whole batch.

    A cheap screen (comparisons that NaN fails) passes the good rows; the detailed
    checks run only on rows it rejects, so a clean million-part batch pays for a few
    comparisons rather than a dozen flag passes. The screen is at least as strict as
    the detailed checks, and the flags (hence validity) always come from the latter.
    """
    do, di = stack.outer_diameter, stack.inner_diameter
    present = stack.present
    n_parts, n_layers = do.shape
    ok = np.empty(do.shape, dtype=bool)
    scratch = np.empty(do.shape, dtype=bool)
    np.greater(do, 0.0, out=ok)
    for value, low, strict in (
        (do, None, False),
        (di, 0.0, False),
        (stack.shear_modulus, 0.0, True),
        (stack.allowable_shear, 0.0, True),
        (stack.stress_concentration, 1.0, False),
    ):
        if low is not None:
            (np.greater if strict else np.greater_equal)(value, low, out=scratch)
            ok &= scratch
        np.less(value, np.inf, out=scratch)
        ok &= scratch
    np.less(di, do, out=scratch)
    ok &= scratch
    # Absent slots need no values; the hole check below may still reject one.
    ok |= ~present

    gap = np.full(do.shape, np.nan)
    # Column by column: numpy is far slower on (P, L-1) slices of a (P, L) array.
    for slot in range(1, n_layers):
        below = do[:, slot - 1]
        size = np.subtract(di[:, slot], below)
        tol = np.abs(below)
        tol *= rel_tol
        np.maximum(tol, abs_tol, out=tol)
        touching = np.abs(size) <= tol
        touching &= di[:, slot] != 0
        both = present[:, slot] & present[:, slot - 1]
        if not both.all():
            np.copyto(size, np.nan, where=~both)
            touching |= ~both
            # A present slot outside an absent one is a hole; reject the row.
            ok[:, slot - 1] &= present[:, slot - 1] | ~present[:, slot]
        gap[:, slot] = size
        ok[:, slot] &= touching

    flags = np.zeros(do.shape, dtype=np.int32)
    if not ok.all():
        row_ok = ok[:, 0].copy()
        for slot in range(1, n_layers):
            row_ok &= ok[:, slot]
        rejected = np.flatnonzero(~row_ok)
        flags[rejected] = _detailed_layer_flags(stack.take(rejected), abs_tol, rel_tol)
    return flags, gap


def _part_flags(
    stack: LayerStack, duty: Duty, layer_flags: NDArray[np.int32]
) -> NDArray[np.int32]:
    torque, length = duty.torque, duty.length
    angle_limit, rate_limit = duty.twist_limit_angle, duty.twist_limit_per_length
    present = stack.present
    flags = np.zeros(stack.n_parts, dtype=np.int32)
    any_present = present[:, 0].copy()
    for slot in range(1, stack.n_layers):
        any_present |= present[:, slot]
    _flag(flags, ~any_present, PartFlag.NO_LAYERS)
    layer_error = (layer_flags & int(LAYER_ERRORS)) != 0
    if layer_error.any():
        _flag(flags, layer_error.any(axis=1), PartFlag.LAYER_ERROR)
    _flag(flags, np.isnan(torque), PartFlag.TORQUE_NOT_GIVEN)
    _flag(flags, np.isinf(torque), PartFlag.TORQUE_NOT_FINITE)
    _flag(flags, torque < 0, PartFlag.TORQUE_NEGATIVE)
    no_length = np.isnan(length)
    _flag(flags, no_length, PartFlag.LENGTH_NOT_GIVEN)
    _flag(flags, (length <= 0) | np.isinf(length), PartFlag.LENGTH_NOT_POSITIVE)
    angle_given = ~np.isnan(angle_limit)
    _flag(flags, angle_given & ~(angle_limit > 0), PartFlag.TWIST_LIMIT_NOT_POSITIVE)
    _flag(flags, angle_given & no_length, PartFlag.TWIST_LIMIT_NEEDS_LENGTH)
    _flag(
        flags,
        ~np.isnan(rate_limit) & ~(rate_limit > 0),
        PartFlag.TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE,
    )
    return flags


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
        layer_flags, gap = _layer_flags(stack, contact_abs_tol, contact_rel_tol)
        part_flags = _part_flags(stack, duty, layer_flags)
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
        stress_outer *= half_theta
        np.multiply(modulus, di, out=stress_inner)
        stress_inner *= half_theta
        if mask_needed:
            for array in (stress_outer, stress_inner):
                np.copyto(array, nan, where=unused)

        section = Section(stack, duty, gj, sum_gj, unused, layer_torque, stress_outer, stress_inner,
                          MappingProxyType(dict(inputs or {})))
        capacities = {check.criterion: check.capacity(section) for check in CRITERIA}
        for values in capacities.values():
            if invalid is not None and values.ndim == 1:
                values[invalid] = nan
        capacity = capacities[Criterion.LAYER_STRESS]
        utilisation = torque[:, np.newaxis] / capacity
        twist_angle = theta * duty.length
        twist_capacity = np.minimum(capacities[Criterion.TWIST_ANGLE], capacities[Criterion.TWIST_PER_LENGTH])

        governing, criterion, layer = governing_of(tuple(capacities.items()), n_parts)
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
