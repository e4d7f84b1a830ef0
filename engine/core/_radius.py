"""Which layer a radius lies in: the stress jumps at an interface, so there it must be said."""

from __future__ import annotations

from enum import IntEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float

__all__ = ["RadiusPlace", "layer_at_radius"]


class RadiusPlace(IntEnum):
    """Where a radius lies in a section."""

    IN_LAYER = 0
    OUTSIDE = 1
    """Beyond the outer surface or inside the bore."""
    ON_INTERFACE = 2
    """On the interface of two layers, where the stress jumps: a layer must be named."""
    NOT_IN_LAYER = 3
    """Not within the layer named."""


def layer_at_radius(
    outer_diameter: ArrayLike, inner_diameter: ArrayLike, present: ArrayLike, radius: ArrayLike,
    layer: int | None = None,
) -> tuple[NDArray[np.intp], NDArray[np.int8]]:
    """The layer slot each part's radius lies in, and where it lies.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    present : (P, L) array_like of bool
    radius : (P,) array_like, m
        NaN: not asked (the place is `RadiusPlace.OUTSIDE`, the slot 0).
    layer : int, optional
        The slot the radius is said to belong to (needed on an interface only).

    Returns
    -------
    slot : (P,) ndarray of int
        The layer slot (0 where none is found).
    place : (P,) ndarray of int8
        A `RadiusPlace`.
    """
    r_out = as_float(outer_diameter) / 2.0
    r_in = as_float(inner_diameter) / 2.0
    radius = np.atleast_1d(as_float(radius))
    present = np.asarray(present, bool)
    tol = 1e-9 * np.nanmax(np.abs(np.where(present, r_out, 0.0)), axis=1, initial=0.0)[:, None]
    with np.errstate(invalid="ignore"):
        inside = present & (r_in - tol <= radius[:, None]) & (radius[:, None] <= r_out + tol)
    count = inside.sum(axis=1)
    place = np.where(count == 0, RadiusPlace.OUTSIDE,
                     np.where(count > 1, RadiusPlace.ON_INTERFACE, RadiusPlace.IN_LAYER)).astype(np.int8)
    slot = np.argmax(inside, axis=1).astype(np.intp)
    if layer is not None:
        chosen = inside[:, layer] if 0 <= layer < inside.shape[1] else np.zeros(len(radius), bool)
        place = np.where(chosen, RadiusPlace.IN_LAYER, RadiusPlace.NOT_IN_LAYER).astype(np.int8)
        slot = np.full(len(radius), layer, dtype=np.intp)
    return slot, place
