"""Load path: where the torque enters and leaves a part, and so what each interface must pass.

With the layers twisting as one, layer ``i`` carries ``T_i = share_i * T`` along the middle
of the part whatever the load path. Near the ends the torque has to get from the layer that
is driven into the others, and back again: that is the torque an interface must pass.
"""

from __future__ import annotations

from enum import IntEnum

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_bool, as_float

__all__ = ["LoadPath", "DEFAULT_LOAD_PATH", "interface_torque", "interface_share"]


class LoadPath(IntEnum):
    """Where the torque enters and leaves each part (stored as ``int8``).

    The recommended default is :attr:`THROUGH_CORE` (:data:`DEFAULT_LOAD_PATH`): the usual
    sleeved journal, driven by its shaft at both ends, with the sleeves carried along.
    """

    THROUGH_CORE = 0
    """Torque enters and leaves through the innermost layer only (a sleeved journal driven
    by its shaft). An interface passes the torque of every layer outside it."""
    THROUGH_OUTER_LAYER = 1
    """Torque enters and leaves through the outermost layer only (a tube driven by its
    outer fittings, the core carried along). An interface passes the torque of every
    layer inside it."""
    THROUGH_EVERY_LAYER = 2
    """Every layer is gripped at both ends (welded or pinned end fittings): each layer
    takes its own share from the fittings and no interface passes any torque."""


DEFAULT_LOAD_PATH = LoadPath.THROUGH_CORE
"""Recommended default: the torque enters and leaves through the core."""


def _pass_through(
    values: ArrayLike, present: ArrayLike, load_path: ArrayLike,
    out: NDArray[np.float64] | None = None,
) -> NDArray[np.float64]:
    layer = as_float(values)
    if layer.ndim != 2:
        raise ValueError(
            f"interface torque needs (parts, layers) arrays; got shape {layer.shape}"
        )
    n_parts, n_layers = layer.shape
    mask = np.broadcast_to(as_bool(present), layer.shape)
    path = np.broadcast_to(as_float(load_path), (n_parts,))
    full = bool(mask.all())
    # Column by column (a handful of slots, many parts); absent slots carry nothing.
    columns = [layer[:, k] if full else np.where(mask[:, k], layer[:, k], 0.0)
               for k in range(n_layers)]
    codes = (int(LoadPath.THROUGH_CORE), int(LoadPath.THROUGH_OUTER_LAYER),
             int(LoadPath.THROUGH_EVERY_LAYER))
    uniform = n_parts > 0 and bool(np.all(path == path[0]))
    # One load path for the whole batch (the usual case) needs only its own sums.
    need = codes if not uniform else (path[0],)
    inside: list[NDArray[np.float64] | None] = [None] * n_layers
    if codes[1] in need:
        inside[0] = np.zeros(n_parts)
        for k in range(1, n_layers):
            inside[k] = inside[k - 1] + columns[k - 1]
    outside: list[NDArray[np.float64] | None] = list(columns)  # slot k and every slot outside it
    if codes[0] in need:
        for k in range(n_layers - 2, 0, -1):
            outside[k] = outside[k + 1] + columns[k]
    result = np.empty(layer.shape, order="F") if out is None else out
    result[:, 0] = np.nan
    for k in range(1, n_layers):
        choices = (outside[k], inside[k], 0.0)
        if uniform:
            result[:, k] = choices[codes.index(path[0])] if path[0] in codes else np.nan
        else:
            result[:, k] = np.select([path == code for code in codes], choices, np.nan)
        if not full:
            result[:, k][~(mask[:, k] & mask[:, k - 1])] = np.nan
    return result


def interface_torque(
    layer_torque: ArrayLike,
    present: ArrayLike,
    load_path: ArrayLike = DEFAULT_LOAD_PATH,
) -> NDArray[np.float64]:
    """Torque each interface must pass, stored at the slot of its outer member.

    Slot ``k`` holds the interface between slots ``k-1`` and ``k``.

    - ``THROUGH_CORE``: ``sum(T_j for j >= k)`` (every layer outside the interface);
    - ``THROUGH_OUTER_LAYER``: ``sum(T_j for j < k)`` (every layer inside it);
    - ``THROUGH_EVERY_LAYER``: 0.

    Parameters
    ----------
    layer_torque : (P, L) array_like, N*m
        Torque in each layer (``Rating.layer_torque``); absent slots are ignored.
    present : (P, L) array_like of bool
    load_path : array_like of LoadPath, broadcast to (P,)
        Default :data:`DEFAULT_LOAD_PATH` (through the core).

    Returns
    -------
    (P, L) ndarray, N*m
        Signed like the layer torques; NaN at slot 0, where either member is absent and
        where the load path is not a known code.

    Raises
    ------
    ValueError
        If ``layer_torque`` is not two-dimensional.

    Notes
    -----
    The torque is picked up near one end of the part and handed back near the other, so an
    interface passes this torque in each direction over part of its length. The fit and bond
    checks say which length to use with it.

    Examples
    --------
    >>> interface_torque([[600.0, 300.0, 100.0]], [[True, True, True]]).tolist()
    [[nan, 400.0, 100.0]]
    >>> interface_torque([[600.0, 300.0, 100.0]], [[True] * 3], LoadPath.THROUGH_OUTER_LAYER).tolist()
    [[nan, 600.0, 900.0]]
    """
    return _pass_through(layer_torque, present, load_path)


def interface_share(
    share: ArrayLike,
    present: ArrayLike,
    load_path: ArrayLike = DEFAULT_LOAD_PATH,
    *,
    out: NDArray[np.float64] | None = None,
) -> NDArray[np.float64]:
    """Torque each interface must pass per unit section torque.

    The same sums as :func:`interface_torque` over the layers' shares ``G_i J_i / sum(G J)``,
    so an interface whose own limit is ``T_pass,max`` limits the section torque to
    ``T_pass,max / |interface_share|`` (infinite where the share is 0).

    Parameters
    ----------
    share : (P, L) array_like, 1
        ``Rating.share``, or ``torque_share(G*J)``.
    present : (P, L) array_like of bool
    load_path : array_like of LoadPath, broadcast to (P,)
    out : (P, L) ndarray, optional
        Where to write the result.

    Returns
    -------
    (P, L) ndarray, 1
        NaN at slot 0, absent interfaces and unknown load paths.

    Examples
    --------
    >>> interface_share([[0.6, 0.3, 0.1]], [[True] * 3]).round(12).tolist()
    [[nan, 0.4, 0.1]]
    """
    return _pass_through(share, present, load_path, out)
