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


def nan_to_zero(
    value: NDArray[np.float64], out: NDArray[np.float64] | None = None
) -> NDArray[np.float64]:
    """``np.nan_to_num(value, nan=0.0)`` as a new array (or in ``out``), faster where no
    infinity is present.

    nan_to_num clears NaN by a masked copy, and ``np.where`` branches: both are slow where NaN
    and numbers alternate at random (a catalogue's blank cells). Here the bits are kept by an
    integer AND with a mask that is all ones where the value is a number and 0 (+0.0) where
    it is NaN: the same result bit for bit, in a few plain passes. ``out`` may be ``value``.
    """
    if np.isinf(value).any():
        result = np.nan_to_num(value, nan=0.0)
        if out is None:
            return result
        np.copyto(out, result)
        return out
    mask = _ones_where(~np.isnan(value))
    target = mask if out is None else out.view(np.int64)
    np.bitwise_and(mask, value.view(np.int64), out=target)
    return target.view(np.float64)


_NAN_BITS = np.int64(0x7FF8000000000000)  # np.nan
_ONE_BITS = np.int64(0x3FF0000000000000)  # 1.0


def _flag_bits(keep: NDArray[np.bool_]) -> NDArray[np.int64]:
    """1 where ``keep``, 0 elsewhere, as int64 (via float: a bool-to-int64 cast is slow)."""
    bits = keep.astype(np.float64).view(np.int64)  # the bits of 1.0 or of 0.0
    bits >>= 61  # 0x3FF0... >> 61 is 1
    return bits


def _ones_where(keep: NDArray[np.bool_]) -> NDArray[np.int64]:
    """An int64 mask: all bits set where ``keep``, none elsewhere."""
    bits = _flag_bits(~keep)
    bits -= 1  # 1 -> 0, 0 -> -1 (all ones)
    return bits


def one_or_nan(keep: NDArray[np.bool_]) -> NDArray[np.float64]:
    """1.0 where ``keep``, NaN (``np.nan``'s bits) elsewhere: a factor that blanks values
    without a masked copy (a random mask makes a masked copy or a gather several times
    slower than these few plain passes)."""
    bits = _flag_bits(keep)
    bits *= _ONE_BITS - _NAN_BITS
    bits += _NAN_BITS
    return bits.view(np.float64)
