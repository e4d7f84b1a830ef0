"""The dimension a sizing solves, where it sits in each part's stack, and the stack with it changed.

These are the geometric rules shared by the solver (:mod:`._sizing`), stock sizes and sleeve
restoration.
"""

from __future__ import annotations

import dataclasses
from enum import IntEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float
from ._section import LayerStack

__all__ = ["SizedDimension", "OuterLayers", "sizing_slot", "resized"]

# A default range reaches at least this outer diameter, m, or ten times the present one.
_DEFAULT_REACH = 1.0


class SizedDimension(IntEnum):
    """Which dimension of a part is solved."""

    OUTER_DIAMETER = 0
    """A layer's outer diameter (its inner diameter stays)."""
    BORE = 1
    """The innermost layer's inner diameter (0 = solid); every other diameter stays."""
    WALL = 2
    """A layer's wall thickness ``(Do - Di) / 2``, grown outward (its inner diameter stays)."""


class OuterLayers(IntEnum):
    """What the layers outside a changed outer diameter do."""

    MOVE = 0
    """They move with it and keep their walls, so every interface stays in contact."""
    FIXED = 1
    """They stay where they are; only the outermost layer can then change its outer face."""


def sizing_slot(
    stack: LayerStack,
    dimension: SizedDimension,
    layer: ArrayLike = -1,
    outer_layers: OuterLayers = OuterLayers.MOVE,
) -> tuple[NDArray[np.intp], NDArray[np.bool_]]:
    """The layer slot each part's sized dimension belongs to, and whether it exists there.

    Parameters
    ----------
    stack : LayerStack
    dimension : SizedDimension
    layer : int or (P,) array_like of int
        -1 = each part's outermost present layer; ignored for the bore (slot 0).
    outer_layers : OuterLayers

    Returns
    -------
    slot : (P,) ndarray of intp
        0 where the dimension does not exist.
    applicable : (P,) ndarray of bool
        False where the slot is out of range or absent, or the outer layers are
        ``FIXED`` and the slot is not the outermost.
    """
    n_parts, n_layers = stack.present.shape
    outermost = np.count_nonzero(stack.present, axis=1) - 1
    if dimension == SizedDimension.BORE:
        slot = np.zeros(n_parts, dtype=np.intp)
        return slot, stack.present[:, 0].copy()
    asked = np.broadcast_to(np.asarray(layer, dtype=np.intp), (n_parts,))
    slot = np.where(asked == -1, outermost, asked)
    in_range = (slot >= 0) & (slot < n_layers)
    slot = np.where(in_range, slot, 0)
    applicable = in_range & stack.present[np.arange(n_parts), slot]
    if outer_layers == OuterLayers.FIXED:
        applicable &= slot == outermost
    return slot, applicable


def _apply(
    stack: LayerStack,
    slot: NDArray[np.intp],
    value: NDArray[np.float64],
    dimension: SizedDimension,
    outer_layers: OuterLayers,
) -> LayerStack:
    """``stack`` with the dimension of layer ``slot`` set to ``value``, part by part."""
    rows = np.arange(stack.n_parts)
    outer = np.array(stack.outer_diameter)
    inner = np.array(stack.inner_diameter)
    if dimension == SizedDimension.BORE:
        inner[rows, 0] = value
        return dataclasses.replace(stack, inner_diameter=inner)
    old = outer[rows, slot]
    new = value if dimension == SizedDimension.OUTER_DIAMETER else inner[rows, slot] + 2.0 * value
    outer[rows, slot] = new
    if outer_layers == OuterLayers.MOVE and stack.n_layers > 1:
        outside = (np.arange(stack.n_layers) > slot[:, np.newaxis]) & stack.present
        shift = np.where(outside, (new - old)[:, np.newaxis], 0.0)
        outer += shift
        inner += shift
    return dataclasses.replace(stack, outer_diameter=outer, inner_diameter=inner)


def resized(
    stack: LayerStack,
    value: ArrayLike,
    *,
    dimension: SizedDimension = SizedDimension.OUTER_DIAMETER,
    layer: ArrayLike = -1,
    outer_layers: OuterLayers = OuterLayers.MOVE,
) -> LayerStack:
    """The stack with one dimension of each part set to ``value`` (the sizing's own rule).

    Parameters
    ----------
    stack : LayerStack
        P parts.
    value : (P,) array_like, m
        New outer diameter, bore or wall per part (a scalar applies to all). NaN gives a
        part that :func:`rate` will not rate.
    dimension : SizedDimension
    layer : int or (P,) array_like of int
        Layer slot whose outer diameter or wall changes; -1 = each part's outermost
        layer. Ignored for the bore (slot 0).
    outer_layers : OuterLayers
        ``MOVE``: the layers outside shift by the change in diameter, walls kept.
        ``FIXED``: they stay (only the outermost layer may then be changed).

    Returns
    -------
    LayerStack
        Parts where the dimension does not exist (see ``SizingStatus.NOT_APPLICABLE``)
        are returned unchanged.
    """
    slot, applicable = sizing_slot(stack, dimension, layer, outer_layers)
    target = np.broadcast_to(as_float(value), (stack.n_parts,))
    out = _apply(stack, slot, target, dimension, outer_layers)
    if applicable.all():
        return out
    # The parts it cannot change keep their own numbers (set again from a wall, a diameter
    # need not come back to the last bit: D_i + 2 (D_o - D_i)/2 rounds).
    keep = ~applicable[:, np.newaxis]
    return dataclasses.replace(out, outer_diameter=np.where(keep, stack.outer_diameter, out.outer_diameter),
                               inner_diameter=np.where(keep, stack.inner_diameter, out.inner_diameter))


def _default_range(
    stack: LayerStack, slot: NDArray[np.intp], dimension: SizedDimension, tol: float
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    rows = np.arange(stack.n_parts)
    outer = stack.outer_diameter[rows, slot]
    inner = stack.inner_diameter[rows, slot]
    reach = np.fmax(_DEFAULT_REACH, 10.0 * outer)
    if dimension == SizedDimension.BORE:
        return np.zeros(stack.n_parts), outer - tol
    if dimension == SizedDimension.WALL:
        return np.full(stack.n_parts, tol), 0.5 * (reach - inner)
    return inner + tol, reach


def _range_usable(
    stack: LayerStack,
    slot: NDArray[np.intp],
    dimension: SizedDimension,
    smallest: NDArray[np.float64],
    largest: NDArray[np.float64],
) -> NDArray[np.bool_]:
    rows = np.arange(stack.n_parts)
    with np.errstate(invalid="ignore"):
        usable = np.isfinite(smallest) & np.isfinite(largest) & (smallest < largest)
        if dimension == SizedDimension.BORE:
            usable &= (smallest >= 0.0) & (largest < stack.outer_diameter[:, 0])
        elif dimension == SizedDimension.WALL:
            usable &= smallest > 0.0
        else:
            usable &= smallest > stack.inner_diameter[rows, slot]
    return usable
