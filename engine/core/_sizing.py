"""Sizing: solve one dimension of every part for a target reserve factor, by bisection on rate().

Only :func:`rate` is consulted, so every criterion it knows, now or later, takes part in the
sizing: the answer is the size at which the governing limit meets the target.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping
from dataclasses import dataclass
from enum import IntEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, frozen_view
from ._criteria import Criterion
from ._rating import Duty, Rating, rate
from ._section import LayerStack
from ._sizing_geometry import (
    OuterLayers,
    SizedDimension,
    _apply,
    _default_range,
    _range_usable,
    resized,
    sizing_slot,
)

__all__ = [
    "SizedDimension",
    "OuterLayers",
    "SizingStatus",
    "SizingResult",
    "DEFAULT_SIZE_TOL",
    "sizing_slot",
    "resized",
    "solve_dimension",
]

DEFAULT_SIZE_TOL = 1e-6
"""Default tolerance on the solved dimension, m (0.001 mm)."""

# Relative slack before a fall in capacity with added material counts as real, not rounding.
_MONOTONE_SLACK = 1e-9


class SizingStatus(IntEnum):
    """Outcome of sizing one part (``int8`` in results)."""

    SOLVED = 0
    """The size found meets the target to the tolerance."""
    HOLDS_AT_LEAST = 1
    """The target is met already at the least-material end of the range (smallest outer
    diameter or wall, largest bore); that end is the size given."""
    SHORT_AT_MOST = 2
    """The target is not met even at the most-material end; no size is given, the reserve
    factor and governing limit are those of that end (what stops the part)."""
    NOT_MONOTONE = 3
    """The governing capacity was seen to fall as material was added. A size that holds is
    given if one was found, but other sizes may hold or fail: rate them."""
    NOT_RATED = 4
    """:func:`rate` did not rate the part at a size tried; its flags say why."""
    NOT_APPLICABLE = 5
    """The dimension does not exist on this part: the layer slot is absent, or the outer
    layers are fixed around a diameter that is not the outermost."""
    BAD_INPUT = 6
    """Nothing to size for or within: no finite torque, a target not above zero, or a range
    that is not finite, is empty or leaves no wall (outer diameter at or below the layer's
    inner diameter, a bore at or beyond the core's outer diameter)."""


@dataclass(frozen=True)
class SizingResult:
    """What :func:`solve_dimension` found for P parts.

    Attributes
    ----------
    size : (P,) ndarray, m
        The solved dimension: the end of the final bracket that holds, so re-rating it gives
        at least the target reserve factor; NaN where no size holds.
    status : (P,) ndarray of int8
        :class:`SizingStatus`.
    reserve_factor : (P,) ndarray, 1
        ``governing_capacity / |T|`` at ``size`` (at the most-material end for
        ``SHORT_AT_MOST``); inf at zero torque, NaN where not rated.
    governing_criterion : (P,) ndarray of int8
        :class:`Criterion` that governs at the same size.
    governing_layer : (P,) ndarray of int16
        Layer slot that governs there; -1 for a twist limit or no rating.
    iterations : (P,) ndarray of int16
        Bisection steps taken for the part (0 where it was not bisected).
    """

    size: NDArray[np.float64]
    status: NDArray[np.int8]
    reserve_factor: NDArray[np.float64]
    governing_criterion: NDArray[np.int8]
    governing_layer: NDArray[np.int16]
    iterations: NDArray[np.int16]

    def __post_init__(self) -> None:
        for item in dataclasses.fields(self):
            value = np.asarray(getattr(self, item.name))
            object.__setattr__(self, item.name, frozen_view(value))


def _reserve(capacity: NDArray[np.float64], torque: NDArray[np.float64]) -> NDArray[np.float64]:
    with np.errstate(divide="ignore", invalid="ignore"):
        return capacity / torque


def solve_dimension(
    stack: LayerStack,
    duty: Duty,
    *,
    dimension: SizedDimension = SizedDimension.OUTER_DIAMETER,
    layer: ArrayLike = -1,
    outer_layers: OuterLayers = OuterLayers.MOVE,
    target_reserve: ArrayLike = 1.0,
    smallest: ArrayLike | None = None,
    largest: ArrayLike | None = None,
    tol: float = DEFAULT_SIZE_TOL,
    inputs: Mapping[str, ArrayLike] | None = None,
) -> SizingResult:
    """Solve one dimension of every part so that its governing capacity is ``|T| * target``.

    The other inputs of each part stay as given; :func:`rate` judges every size tried.

    Parameters
    ----------
    stack : LayerStack
        P parts; the present value of the solved dimension is only a starting point (it
        sets the default range and, with ``MOVE``, where the outer layers start from).
    duty : Duty
        P parts or one for all; the torque is the demand.
    dimension : SizedDimension
        Outer diameter or wall of ``layer``, or the bore of the innermost layer.
    layer : int or (P,) array_like of int
        Layer slot; -1 (default) = each part's outermost layer. Ignored for the bore.
    outer_layers : OuterLayers
        ``MOVE`` (default): layers outside the changed one move with it, walls kept.
        ``FIXED``: they stay; then only the outermost layer's outer diameter or wall can
        be solved (elsewhere the contact would break: ``NOT_APPLICABLE``). The bore has
        nothing inside it and changes alone either way.
    target_reserve : (P,) array_like, 1
        Reserve factor wanted, ``governing_capacity / |T|`` (> 0).
    smallest, largest : (P,) array_like, m, optional
        Range of the solved dimension. Defaults: outer diameter from the layer's inner
        diameter + ``tol`` to the larger of 1 m and ten times the present outer diameter;
        wall from ``tol`` to the wall of that same reach; bore from 0 to the core's outer
        diameter - ``tol``.
    tol : float, m
        Width of the final bracket (default 0.001 mm). The size given is the bracket end
        that holds, so it lies within ``tol`` of the exact size, on the safe side.

    Returns
    -------
    SizingResult

    Raises
    ------
    ValueError
        If ``tol`` is not a positive finite number, or ``duty`` has neither one part nor
        as many as ``stack``.

    Examples
    --------
    A solid steel shaft for 1 kN*m at a reserve factor of 1.5, allowable 60 MPa:

    >>> from twistshare.engine.core import Duty, LayerStack
    >>> stack = LayerStack.from_layers([0.05], [0.0], [79.3e9], [60e6])
    >>> result = solve_dimension(stack, Duty.from_arrays(torque=1000.0), target_reserve=1.5)
    >>> round(float(result.size[0]) * 1000, 3)  # mm; (16 T RF / (pi tau_a))^(1/3) = 50.308
    50.308
    >>> SizingStatus(result.status[0]).name, int(result.iterations[0])
    ('SOLVED', 20)

    Notes
    -----
    Bisection on all parts at once. The ends of the range are rated first: if the
    least-material end holds, that is the answer (``HOLDS_AT_LEAST``); if the most-material
    end fails, there is none (``SHORT_AT_MOST``). Otherwise part p takes
    ``ceil(log2(width_p / tol))`` halvings, its own count, so a part's answer does not
    depend on the batch it is in; ``rate`` is called ``2 + max(iterations)`` times.

    Why bisection on the governing limit works when the governing criterion changes inside
    the bracket: the governing capacity is the minimum of the criteria's capacities. If each
    capacity is non-decreasing in the material added, so is their minimum (at every size it
    is at most each capacity, and each capacity only grows), and it is continuous. One
    bracket with a failing and a holding end then contains one crossing, whichever criterion
    governs on either side, and the criterion at the answer is reported.

    Which criteria are monotone (the twist-compatibility formulas): twist limits go with ``sum(GJ)``, which
    any added material raises; a layer's stress capacity ``tau_a sum(GJ) / (G r_o Kt)`` rises
    too where its ``r_o`` does not move (layers inside the change, every layer when the bore
    changes). A layer whose ``r_o`` moves gains if ``D dsum(GJ)/dD >= sum(GJ)``; for the
    outermost layer this holds at every size when the ``G J`` inside it is at most
    ``G_layer pi d^4 / 8`` (``d`` its inner diameter): a sleeve of at least a quarter of a
    solid core's G. A very soft thin sleeve on a stiff core fails this: thickening it first
    raises its stress. The solver does not assume monotonicity: it marks ``NOT_MONOTONE``
    where the most-material end rates below the least, or a trial size rates above the
    holding end or below the failing end of its bracket. A fall between the points tried
    cannot be seen.
    """
    if not (np.isfinite(tol) and tol > 0.0):
        raise ValueError(f"tol must be a positive finite number of metres; got {tol!r}")
    n_parts = stack.n_parts
    if duty.n_parts not in (1, n_parts):
        raise ValueError(
            f"duty has {duty.n_parts} parts; expected 1 or {n_parts} like the layer stack"
        )
    dimension = SizedDimension(dimension)
    outer_layers = OuterLayers(outer_layers)
    slot, applicable = sizing_slot(stack, dimension, layer, outer_layers)
    low_default, high_default = _default_range(stack, slot, dimension, tol)
    low = low_default if smallest is None else np.broadcast_to(as_float(smallest), (n_parts,))
    high = high_default if largest is None else np.broadcast_to(as_float(largest), (n_parts,))
    target = np.broadcast_to(as_float(target_reserve), (n_parts,))
    torque = np.abs(np.broadcast_to(duty.torque, (n_parts,)))
    demand = torque * target
    usable = _range_usable(stack, slot, dimension, low, high)
    with np.errstate(invalid="ignore"):
        usable &= np.isfinite(target) & (target > 0.0) & np.isfinite(torque)
    ok = applicable & usable

    def rating_at(value: NDArray[np.float64]) -> Rating:
        # Parts not sized are rated with no size (not rated): none of their results is shown.
        return rate(_apply(stack, slot, np.where(ok, value, np.nan), dimension, outer_layers),
                    duty, inputs=inputs)

    # Least- and most-material ends: a larger bore has less material.
    if dimension == SizedDimension.BORE:
        least, most = high, low
    else:
        least, most = low, high
    at_least, at_most = rating_at(least), rating_at(most)
    cap_least, cap_most = at_least.governing_capacity, at_most.governing_capacity

    status = np.full(n_parts, SizingStatus.NOT_APPLICABLE, dtype=np.int8)
    status[applicable] = SizingStatus.BAD_INPUT
    rated = ok & at_least.valid & at_most.valid
    status[ok & ~rated] = SizingStatus.NOT_RATED
    with np.errstate(invalid="ignore"):
        holds_least = rated & (cap_least >= demand)
        holds_most = rated & (cap_most >= demand)
        falls = rated & (cap_most < cap_least * (1.0 - _MONOTONE_SLACK))
    status[rated & ~holds_most] = SizingStatus.SHORT_AT_MOST
    status[holds_least] = SizingStatus.HOLDS_AT_LEAST
    bisect = rated & holds_most & ~holds_least & ~falls
    status[bisect] = SizingStatus.SOLVED
    status[falls] = SizingStatus.NOT_MONOTONE

    # The bracket: a failing and a holding end, with the holding end's rating kept.
    fail, hold = np.array(least), np.array(most)
    cap_fail, cap_hold = np.array(cap_least), np.array(cap_most)
    criterion = np.array(at_most.governing_criterion)
    governing_layer = np.array(at_most.governing_layer)
    with np.errstate(divide="ignore", invalid="ignore"):
        steps = np.ceil(np.log2(np.abs(most - least) / tol))
    iterations = np.where(bisect, np.clip(np.nan_to_num(steps), 0, None), 0).astype(np.int16)

    for step in range(int(iterations.max(initial=0))):
        active = iterations > step
        mid = np.where(active, 0.5 * (fail + hold), hold)
        trial = rating_at(mid)
        cap = trial.governing_capacity
        refused = active & ~trial.valid
        active &= trial.valid
        with np.errstate(invalid="ignore"):
            holds = active & (cap >= demand)
            fails = active & ~holds
            # More material at the holding end, less at the failing end: a trial rating
            # outside the two ends' capacities shows a fall somewhere between them.
            contradicts = (holds & (cap > cap_hold * (1.0 + _MONOTONE_SLACK))) | (
                fails & (cap < cap_fail * (1.0 - _MONOTONE_SLACK))
            )
        status[contradicts & (status == SizingStatus.SOLVED)] = SizingStatus.NOT_MONOTONE
        status[refused] = SizingStatus.NOT_RATED
        iterations[refused] = step
        np.copyto(hold, mid, where=holds)
        np.copyto(cap_hold, cap, where=holds)
        np.copyto(criterion, trial.governing_criterion, where=holds)
        np.copyto(governing_layer, trial.governing_layer, where=holds)
        np.copyto(fail, mid, where=fails)
        np.copyto(cap_fail, cap, where=fails)

    # The least-material end is the answer where it holds (with or without a fall).
    np.copyto(hold, least, where=holds_least)
    np.copyto(cap_hold, cap_least, where=holds_least)
    np.copyto(criterion, at_least.governing_criterion, where=holds_least)
    np.copyto(governing_layer, at_least.governing_layer, where=holds_least)
    found = bisect | holds_least
    found &= status != SizingStatus.NOT_RATED
    short = status == SizingStatus.SHORT_AT_MOST
    size = np.where(found, hold, np.nan)
    reserve = np.where(found | short, _reserve(cap_hold, torque), np.nan)
    shown = found | short
    criterion = np.where(shown, criterion, int(Criterion.NONE)).astype(np.int8)
    governing_layer = np.where(shown, governing_layer, -1).astype(np.int16)
    return SizingResult(
        size=size,
        status=status,
        reserve_factor=reserve,
        governing_criterion=criterion,
        governing_layer=governing_layer,
        iterations=iterations,
    )
