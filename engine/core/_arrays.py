"""Small array helpers shared by the core modules (internal)."""

from __future__ import annotations

from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

_PLAIN_NUMBERS = (float, int, np.float64)


def as_float(value: ArrayLike) -> NDArray[np.float64]:
    """Return ``value`` as a float64 array, without copying when it already is one.

    A plain number (one cell's value) becomes a numpy ``float64`` scalar instead of a 0-d
    array: it has the same ``shape``, ``ndim`` and ufunc behaviour, and arithmetic on it is
    several times cheaper, which is what a cell function's one-value call spends its time on.
    """
    if type(value) in _PLAIN_NUMBERS:
        return np.float64(value)  # type: ignore[return-value]
    return np.asarray(value, dtype=np.float64)


def scalar_out(result: NDArray[Any]) -> Any:
    """Unwrap a 0-d array to a numpy scalar, ufunc-style; leave other arrays alone."""
    return result[()] if result.ndim == 0 else result


def valid_or_nan(ok: Any, values: Any) -> Any:
    """``values`` where ``ok``, NaN elsewhere, unwrapped like `scalar_out`.

    The same as ``scalar_out(np.where(ok, values, np.nan))``; one value (a cell function's
    call) takes a plain branch, a few microseconds cheaper than ``np.where``.
    """
    if np.ndim(ok) == 0 and np.ndim(values) == 0:
        return np.float64(values) if ok else np.float64(np.nan)
    return scalar_out(np.where(ok, values, np.nan))


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


def layer_arrays(
    *values: ArrayLike, present: ArrayLike | None = None
) -> tuple[list[NDArray[np.float64]], NDArray[np.bool_]]:
    """Per-layer inputs broadcast to one ``(P, L)`` float shape, and the ``present`` mask.

    A 1-D input is one part's layers. ``present`` defaults to "the first input is not NaN",
    the convention of ``LayerStack.from_arrays``.

    Raises
    ------
    ValueError
        If the inputs do not broadcast or have more than two dimensions.
    """
    floats = [as_float(v) for v in values]
    extra = [] if present is None else [as_bool(present)]
    try:
        arrays = np.broadcast_arrays(*floats, *extra)
    except ValueError as error:
        shapes = ", ".join(str(np.shape(a)) for a in (*floats, *extra))
        raise ValueError(f"layer inputs do not broadcast together: {shapes}") from error
    if arrays[0].ndim > 2:
        raise ValueError(
            f"layer inputs must be at most (parts, layers); got shape {arrays[0].shape}"
        )
    arrays = [np.atleast_2d(a) for a in arrays]
    mask = ~np.isnan(arrays[0]) if present is None else arrays.pop()
    return arrays, mask


def part_array(value: ArrayLike, n_parts: int, name: str) -> NDArray[np.float64]:
    """A per-part input broadcast to ``(P,)`` floats (a scalar applies to every part).

    Raises
    ------
    ValueError
        If ``value`` has neither one value nor one per part; the message names it.
    """
    array = np.atleast_1d(as_float(value))
    if array.ndim != 1 or array.shape[0] not in (1, n_parts):
        raise ValueError(
            f"{name} must hold one value or one per part ({n_parts}); got shape {array.shape}"
        )
    return np.broadcast_to(array, (n_parts,))


def flag_where(words: NDArray[np.int32], condition: NDArray[np.bool_], flag: int) -> None:
    """Set ``flag`` in ``words`` where ``condition`` holds, in place."""
    np.bitwise_or(words, np.int32(flag), out=words, where=condition)


def gather_layer_flags(
    part_flags: NDArray[np.int32], layer_flags: NDArray[np.int32]
) -> NDArray[np.int32]:
    """Part words with every layer's bits OR-ed in (a loop over the few layer slots)."""
    result = part_flags.copy()
    if not layer_flags.any():  # the common case, and a cheap test
        return result
    for slot in range(layer_flags.shape[1]):
        result |= layer_flags[:, slot]
    return result


def nan_to_zero(value: NDArray[np.float64]) -> NDArray[np.float64]:
    """``np.nan_to_num(value, nan=0.0)`` as a new array, faster where no infinity is present.

    nan_to_num clears NaN by a masked copy, slow where NaN and numbers alternate at random
    (a catalogue's blank cells); a select does the same without branching.
    """
    if np.isinf(value).any():
        return np.nan_to_num(value, nan=0.0)
    return np.where(np.isnan(value), 0.0, value)
