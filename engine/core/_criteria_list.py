"""The criteria a part is rated against, as a list: each gives its capacity, the least governs.

A criterion is a small function of the `Section` (the stack, the duty, the section's stiffness
and any further inputs by name) returning the section torque at which it is reached: per part
``(P,)`` or per layer slot ``(P, L)``, NaN where it does not apply to a slot, +inf where it sets
no limit (its inputs not given). Adding one is a function in its own module, a `Criterion`
member, a line in `CRITERIA` and a words entry (`twistshare.engine.intake.CRITERION_WORDS`); the
governing limit, the rating and every output pick it up from the list. A criterion's further
inputs arrive in ``Section.inputs`` under the keys the intake's schema reads them into
(``rate(stack, duty, inputs={...})``); a key not given means the criterion sets no limit.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np
from numpy.typing import NDArray

from ._beyond_torsion_criteria import buckling_capacity, combined_stress_capacity, whirl_capacity
from ._criteria import Criterion

__all__ = ["Section", "CriterionCheck", "CRITERIA", "governing_of", "take_inputs"]


@dataclass(frozen=True)
class Section:
    """What every criterion may use, SI; per-layer arrays are NaN in unused slots.

    Attributes
    ----------
    stack : LayerStack
    duty : Duty
    gj : (P, L) ndarray, N*m^2
    sum_gj : (P,) ndarray, N*m^2
        NaN for parts that are not rated.
    unused : (P, L) ndarray of bool
        Absent slots and the slots of parts that are not rated.
    layer_torque : (P, L) ndarray, N*m
        Each layer's torque at the applied torque.
    stress_outer, stress_inner : (P, L) ndarray, Pa
        Nominal shear stress at each layer's radii at the applied torque.
    inputs : mapping of str to ndarray
        Further inputs by name, ``(P,)`` or ``(P, L)``, SI; NaN where not given.
    """

    stack: object
    duty: object
    gj: NDArray[np.float64]
    sum_gj: NDArray[np.float64]
    unused: NDArray[np.bool_]
    layer_torque: NDArray[np.float64] | None = None
    stress_outer: NDArray[np.float64] | None = None
    stress_inner: NDArray[np.float64] | None = None
    inputs: Mapping[str, NDArray[np.float64]] = field(default_factory=dict)
    # Work several criteria share (the interfaces are rated once for slip, bond and fit
    # stress), kept for this one section only.
    shared: dict[str, object] = field(default_factory=dict, compare=False, repr=False)

    def no_limit(self, per_layer: bool = False) -> NDArray[np.float64]:
        """What a criterion that sets no limit returns: +inf per part (or per used slot), NaN
        where the part is not rated (or the slot unused). One read-only array per section,
        shared by every such criterion, so the governing minimum can pass over it."""
        key = "no_limit_layers" if per_layer else "no_limit_parts"
        out = self.shared.get(key)
        if out is None:
            shape = self.gj.shape if per_layer else self.sum_gj.shape
            holes = self.unused if per_layer else np.isnan(self.sum_gj)
            if holes.any():
                out = np.full(shape, np.inf)
                np.copyto(out, np.nan, where=holes)
                out.flags.writeable = False
            else:
                # Every part rated, every slot used (the common case): one +inf broadcast to
                # the shape, read-only and taking no memory however large the batch.
                out = np.broadcast_to(np.float64(np.inf), shape)
            self.shared[key] = out
        return out

    def sets_no_limit(self, values: NDArray[np.float64]) -> bool:
        """Whether `values` is this section's `no_limit` array (a criterion that sets no limit)."""
        return any(values is self.shared.get(k) for k in ("no_limit_layers", "no_limit_parts"))

    def input(self, key: str, per_layer: bool = False) -> NDArray[np.float64] | None:
        """A further input by name, or None where the caller gave none."""
        value = self.inputs.get(key)
        if value is None:
            return None
        value = np.asarray(value, dtype=float)
        shape = self.gj.shape if per_layer else self.sum_gj.shape
        return np.broadcast_to(value, shape)


@dataclass(frozen=True)
class CriterionCheck:
    """One criterion: what it is, whether it is per layer slot, and its capacity."""

    criterion: Criterion
    per_layer: bool
    capacity: Callable[[Section], NDArray[np.float64]]

    def rate(self, section: Section) -> NDArray[np.float64]:
        """The criterion's capacity for `section`, held to the shape it declares.

        A criterion that sets no limit for the batch may return either of the section's
        `Section.no_limit` arrays (per part is the cheaper for the governing minimum).

        Raises
        ------
        ValueError
            If the capacity is not ``(P, L)`` for a per-layer criterion or ``(P,)`` for a
            per-part one (a new criterion written against the wrong shape).
        """
        values = self.capacity(section)
        expected = section.gj.shape if self.per_layer else section.sum_gj.shape
        if np.shape(values) != expected and not section.sets_no_limit(values):
            kind = "per layer slot" if self.per_layer else "per part"
            raise ValueError(f"criterion {self.criterion.name} is {kind}, so its capacity must have "
                             f"shape {expected}; got {np.shape(values)}")
        return values


#: Key of `Section.shared` under which the caller may hand `_layer_stress` a writeable
#: ``G * D_o * Kt`` array to finish in place (taken out once used).
LAYER_STRESS_DENOMINATOR = "layer_stress_denominator"


def _layer_stress(section: Section) -> NDArray[np.float64]:
    """``tau_a,i * sum(G J) / (G_i * r_o,i * Kt_i)``, built in place (the batch is large)."""
    stack = section.stack
    # rate() hands over G_i * r_o,i * Kt_i, made from the product its outer stress starts from.
    capacity = section.shared.pop(LAYER_STRESS_DENOMINATOR, None)
    if capacity is None:
        capacity = np.multiply(stack.shear_modulus, stack.outer_diameter)
        capacity *= stack.stress_concentration
    np.divide(stack.allowable_shear, capacity, out=capacity)
    capacity *= (2.0 * section.sum_gj)[:, np.newaxis]
    if section.unused.any():
        np.copyto(capacity, np.nan, where=section.unused)
    return capacity


def _twist_angle(section: Section) -> NDArray[np.float64]:
    """``phi_lim * sum(G J) / L``; +inf where no limit is given."""
    duty = section.duty
    capacity = np.multiply(duty.twist_limit_angle, section.sum_gj)
    capacity /= duty.length
    np.copyto(capacity, np.inf, where=np.isnan(duty.twist_limit_angle))
    return capacity


def _twist_per_length(section: Section) -> NDArray[np.float64]:
    """``theta'_lim * sum(G J)``; +inf where no limit is given."""
    limit = section.duty.twist_limit_per_length
    capacity = limit * section.sum_gj
    np.copyto(capacity, np.inf, where=np.isnan(limit))
    return capacity


from . import _interface_criteria  # noqa: E402  (needs Section, defined above)

#: Every criterion, in the order ties are broken (lowest first).
CRITERIA: tuple[CriterionCheck, ...] = (
    CriterionCheck(Criterion.LAYER_STRESS, True, _layer_stress),
    CriterionCheck(Criterion.TWIST_ANGLE, False, _twist_angle),
    CriterionCheck(Criterion.TWIST_PER_LENGTH, False, _twist_per_length),
    CriterionCheck(Criterion.COMBINED_STRESS, True, combined_stress_capacity),
    CriterionCheck(Criterion.WHIRL, False, whirl_capacity),
    CriterionCheck(Criterion.TORSIONAL_BUCKLING, False, buckling_capacity),
    CriterionCheck(Criterion.INTERFACE_SLIP, True, _interface_criteria.slip),
    CriterionCheck(Criterion.BOND_SHEAR, True, _interface_criteria.bond),
    CriterionCheck(Criterion.FIT_STRESS, True, _interface_criteria.fit_stress),
)


def governing_of(
    capacities: Sequence[tuple[Criterion, NDArray[np.float64]]], n_parts: int
) -> tuple[NDArray[np.float64], NDArray[np.int8], NDArray[np.int16]]:
    """The smallest capacity over a list of criteria, with the criterion and layer giving it.

    Ties go to the criterion listed first, then to the innermost layer, so the answer never
    depends on floating-point luck in the order of evaluation.

    Parameters
    ----------
    capacities : sequence of (Criterion, ndarray)
        ``(P,)`` per part or ``(P, L)`` per layer slot, N*m; NaN where a slot has none,
        +inf where a criterion sets no limit.
    n_parts : int

    Returns
    -------
    capacity : (P,) ndarray, N*m
        NaN where no criterion gives a finite number.
    criterion : (P,) ndarray of int8
        ``Criterion.NONE`` where ``capacity`` is NaN.
    layer : (P,) ndarray of int16
        Governing layer slot; -1 where a per-part criterion (or nothing) governs.
    """
    capacity = np.full(n_parts, np.nan)
    criterion = np.full(n_parts, int(Criterion.NONE), dtype=np.int8)
    layer = np.full(n_parts, -1, dtype=np.int16)
    holes: NDArray[np.bool_] | None = np.ones(n_parts, bool)  # parts no criterion has a number for yet
    # Scratch, reused for every column: a fresh array per step costs as much as the step.
    wins = np.empty(n_parts, bool)
    won = np.empty(n_parts, bool)  # parts one of this criterion's columns took over
    criterion_step = np.empty(n_parts, np.int8)
    layer_step = np.empty(n_parts, np.int16)
    with np.errstate(invalid="ignore"):
        for code, values in capacities:
            # Few layer slots, many parts: a loop over slots beats argmin along a short axis.
            columns = ((slot, values[:, slot]) for slot in range(values.shape[1])) if values.ndim == 2 \
                else ((-1, values),)
            won.fill(False)
            for slot, column in columns:
                # Strictly smaller takes over; NaN never wins; a number fills a hole.
                np.less(column, capacity, out=wins)
                if holes is not None:
                    fills = holes & ~np.isnan(column)
                    wins |= fills
                    holes &= ~fills
                    if not holes.any():
                        holes = None  # the common case after the first criterion: no more NaN checks
                if (column == 0.0).any():
                    # fmin may give either zero of a tie of 0.0 and -0.0: the masked copy keeps
                    # the first, as the rule says.
                    np.copyto(capacity, column, where=wins)
                else:
                    # The same values as copying where `wins` (NaN passed over, a number filling
                    # a hole, equal numbers alike), without the masked copy's branch per element.
                    np.fmin(capacity, column, out=capacity)
                _take_over(layer, slot, wins, layer_step)
                won |= wins
            _take_over(criterion, int(code), won, criterion_step)
        none = ~(capacity < np.inf)
        if none.any():
            capacity[none] = np.nan
            criterion[none] = int(Criterion.NONE)
            layer[none] = -1
    return capacity, criterion, layer


def _take_over(target: NDArray[np.integer], value: int, where: NDArray[np.bool_],
               scratch: NDArray[np.integer]) -> None:
    """``target[where] = value`` in place, by arithmetic: ``target += (value - target) * where``.

    A masked copy branches on every element and costs several times as much where the mask
    is random (which of two limits governs a part is).
    """
    np.subtract(target.dtype.type(value), target, out=scratch)
    np.multiply(scratch, where, out=scratch)
    target += scratch


def take_inputs(inputs: Mapping[str, NDArray[np.float64]] | None, rows: NDArray[np.intp] | slice,
                n_parts: int) -> dict[str, NDArray[np.float64]]:
    """The further inputs of some parts only: per-part arrays (leading axis `n_parts`) are
    sliced to `rows`; anything else (one value for every part) is kept as it is."""
    out: dict[str, NDArray[np.float64]] = {}
    for key, value in (inputs or {}).items():
        array = np.asarray(value)
        out[key] = array[rows] if array.ndim >= 1 and array.shape[0] == n_parts else array
    return out
