"""Small array helpers shared by the core modules (internal)."""

from __future__ import annotations

from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray


def as_float(value: ArrayLike) -> NDArray[np.float64]:
    """Return ``value`` as a float64 array, without copying when it already is one."""
    return np.asarray(value, dtype=np.float64)


def scalar_out(result: NDArray[Any]) -> Any:
    """Unwrap a 0-d array to a numpy scalar, ufunc-style; leave other arrays alone."""
    return result[()] if result.ndim == 0 else result


def frozen_view(array: NDArray[Any]) -> NDArray[Any]:
    """Read-only view of ``array``; the caller's own array stays writeable."""
    view = array.view()
    view.flags.writeable = False
    return view


def as_bool(value: ArrayLike) -> NDArray[np.bool_]:
    """Truth of each element, NaN counted as False (``bool(nan)`` would be True)."""
    array = np.asarray(value)
    if array.dtype == np.bool_:
        return array
    if array.dtype.kind in "fc":
        return np.nan_to_num(array, nan=0.0) != 0
    return array.astype(bool)
