"""Stock sizes: the first stock size at or beyond a solved size that holds, re-rated."""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping
from dataclasses import dataclass
from enum import IntEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, frozen_view
from ._criteria import Criterion
from ._criteria_list import take_inputs
from ._rating import Duty, rate
from ._section import LayerStack
from ._sizing import DEFAULT_SIZE_TOL, OuterLayers, SizedDimension, resized, sizing_slot

__all__ = ["StockStatus", "StockResult", "round_up_to_stock"]


class StockStatus(IntEnum):
    """Outcome of choosing a stock size for one part (``int8`` in results)."""

    FOUND = 0
    """A stock size holds; it is the first one at or beyond the solved size that does."""
    NONE_HOLDS = 1
    """No stock size at or beyond the solved size holds (or there is none)."""
    NOT_RATED = 2
    """:func:`rate` did not rate the part at a stock size tried; its flags say why."""
    NOT_APPLICABLE = 3
    """The dimension does not exist on this part, or there is no finite torque or a
    target above zero to hold."""


@dataclass(frozen=True)
class StockResult:
    """What :func:`round_up_to_stock` chose for P parts.

    Attributes
    ----------
    size : (P,) ndarray, m
        The stock size chosen; NaN unless ``FOUND``.
    index : (P,) ndarray of int32
        Its position in the part's stock list; -1 unless ``FOUND``.
    status : (P,) ndarray of int8
        :class:`StockStatus`.
    reserve_factor : (P,) ndarray, 1
        ``governing_capacity / |T|`` at the stock size, re-rated; NaN unless ``FOUND``.
    governing_criterion : (P,) ndarray of int8
    governing_layer : (P,) ndarray of int16
        What governs at the stock size (``NONE`` / -1 unless ``FOUND``).
    """

    size: NDArray[np.float64]
    index: NDArray[np.int32]
    status: NDArray[np.int8]
    reserve_factor: NDArray[np.float64]
    governing_criterion: NDArray[np.int8]
    governing_layer: NDArray[np.int16]

    def __post_init__(self) -> None:
        for item in dataclasses.fields(self):
            value = np.asarray(getattr(self, item.name))
            object.__setattr__(self, item.name, frozen_view(value))


def round_up_to_stock(
    stack: LayerStack,
    duty: Duty,
    size: ArrayLike,
    stock: ArrayLike,
    *,
    dimension: SizedDimension = SizedDimension.OUTER_DIAMETER,
    layer: ArrayLike = -1,
    outer_layers: OuterLayers = OuterLayers.MOVE,
    target_reserve: ArrayLike = 1.0,
    tol: float = DEFAULT_SIZE_TOL,
    inputs: Mapping[str, ArrayLike] | None = None,
) -> StockResult:
    """The first stock size on the more-material side of ``size`` that holds, re-rated.

    Parameters
    ----------
    stack : LayerStack
        P parts, as given to :func:`solve_dimension`.
    duty : Duty
        P parts or one for all.
    size : (P,) array_like, m
        Solved sizes (``SizingResult.size``); NaN = none, then every stock size that fits
        the part is a candidate.
    stock : (S,) or (P, S) array_like, m
        Stock outer diameters, walls or bores, ascending; shared or one row per part. NaN
        pads the end of shorter rows.
    dimension, layer, outer_layers
        As for :func:`solve_dimension`.
    target_reserve : (P,) array_like, 1
        Reserve factor to hold, ``governing_capacity / |T|``.
    tol : float, m
        A stock size up to ``tol`` on the less-material side of ``size`` is tried too: the
        solved size is the holding end of a bracket ``tol`` wide.

    Returns
    -------
    StockResult

    Notes
    -----
    Outer diameters and walls round up (the smallest stock size ``>= size - tol`` first);
    bores round down (the largest ``<= size + tol`` first). Stock sizes that leave no wall
    are skipped. Each candidate is re-rated with :func:`rate`; where it fails the next one
    is tried, so a governing limit that is not monotone in the size cannot slip through.
    The loop runs over stock positions, each over all parts still looking, never over
    parts; usually the first candidate holds.
    """
    n_parts = stack.n_parts
    if duty.n_parts not in (1, n_parts):
        raise ValueError(
            f"duty has {duty.n_parts} parts; expected 1 or {n_parts} like the layer stack"
        )
    dimension = SizedDimension(dimension)
    outer_layers = OuterLayers(outer_layers)
    slot, applicable = sizing_slot(stack, dimension, layer, outer_layers)
    rows = np.arange(n_parts)
    sizes = as_float(stock)
    shared = sizes.ndim == 1
    n_stock = sizes.shape[-1]
    solved = np.broadcast_to(as_float(size), (n_parts,))
    target = np.broadcast_to(as_float(target_reserve), (n_parts,))
    torque = np.abs(np.broadcast_to(duty.torque, (n_parts,)))
    demand = torque * target
    bore = dimension == SizedDimension.BORE
    # A stock size must leave a wall: a bore below the core's outer diameter, an outer
    # diameter above the layer's inner diameter, a wall above zero.
    if bore:
        bound = stack.outer_diameter[:, 0]
    elif dimension == SizedDimension.WALL:
        bound = np.zeros(n_parts)
    else:
        bound = stack.inner_diameter[rows, slot]

    def below(limit: NDArray[np.float64], inclusive: bool) -> NDArray[np.intp]:
        """How many stock sizes lie below ``limit`` (at or below if ``inclusive``)."""
        if shared:
            return np.searchsorted(sizes, limit, side="right" if inclusive else "left")
        with np.errstate(invalid="ignore"):
            less = (sizes <= limit[:, np.newaxis]) if inclusive else (sizes < limit[:, np.newaxis])
        return np.count_nonzero(less, axis=1)

    with np.errstate(invalid="ignore"):
        if bore:
            step = -1
            last = below(np.where(np.isnan(solved), np.inf, solved + tol), inclusive=True)
            index = np.minimum(last, below(bound, inclusive=False)) - 1
        else:
            step = 1
            index = np.maximum(below(bound, inclusive=True),
                               below(np.where(np.isnan(solved), -np.inf, solved - tol), False))
        usable = applicable & np.isfinite(target) & (target > 0.0) & np.isfinite(torque)

    def value_at(part: NDArray[np.intp]) -> tuple[NDArray[np.float64], NDArray[np.bool_]]:
        """Stock size at each part's index, and whether it is a candidate at all."""
        position = index[part]
        inside = (position >= 0) & (position < n_stock)
        position = np.clip(position, 0, n_stock - 1)
        values = sizes[position] if shared else sizes[part, position]
        with np.errstate(invalid="ignore"):
            fits = (values >= 0.0) & (values < bound[part]) if bore else values > bound[part]
        return values, inside & fits

    status = np.where(usable, StockStatus.NONE_HOLDS, StockStatus.NOT_APPLICABLE).astype(np.int8)
    chosen = np.full(n_parts, np.nan)
    reserve = np.full(n_parts, np.nan)
    criterion = np.full(n_parts, int(Criterion.NONE), dtype=np.int8)
    governing_layer = np.full(n_parts, -1, dtype=np.int16)
    part = np.flatnonzero(usable)
    part = part[value_at(part)[1]]

    for _ in range(n_stock):
        if part.size == 0:
            break
        values = value_at(part)[0]
        whole = part.size == n_parts
        trial_stack = resized(stack if whole else stack.take(part), values, dimension=dimension,
                              layer=slot[part], outer_layers=outer_layers)
        trial = rate(trial_stack, duty if duty.n_parts == 1 or whole else duty.take(part),
                     inputs=inputs if whole else take_inputs(inputs, part, n_parts))
        cap = trial.governing_capacity
        with np.errstate(invalid="ignore"):
            holds = trial.valid & (cap >= demand[part])
        found = part[holds]
        status[found] = StockStatus.FOUND
        chosen[found] = values[holds]
        with np.errstate(divide="ignore", invalid="ignore"):
            reserve[found] = cap[holds] / torque[found]
        criterion[found] = trial.governing_criterion[holds]
        governing_layer[found] = trial.governing_layer[holds]
        status[part[~trial.valid]] = StockStatus.NOT_RATED
        part = part[trial.valid & ~holds]
        index[part] += step
        part = part[value_at(part)[1]]

    index = np.where(status == StockStatus.FOUND, index, -1).astype(np.int32)
    return StockResult(
        size=chosen,
        index=index,
        status=status,
        reserve_factor=reserve,
        governing_criterion=criterion,
        governing_layer=governing_layer,
    )
