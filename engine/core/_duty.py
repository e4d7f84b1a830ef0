"""What each part must carry: the torque, the length and the twist limits, one entry a part."""

from __future__ import annotations

from dataclasses import dataclass, fields

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, frozen_view

__all__ = ["Duty", "take_rows"]


def take_rows(rows: int | slice | ArrayLike) -> slice | ArrayLike:
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
        index = take_rows(rows)
        return Duty(**{f.name: getattr(self, f.name)[index] for f in fields(self)})
