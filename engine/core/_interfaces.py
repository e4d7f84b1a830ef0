"""Interfaces of a batch rated in one pass: fit pressures, slip, bond shear and fit stresses.

Each capacity is a section torque, like a layer's, so it can stand beside the layer and twist
capacities in the governing limit: :attr:`InterfaceRating.slip_limit`,
:attr:`~InterfaceRating.bond_limit` and :attr:`~InterfaceRating.fit_stress_limit` are one
value per part (the smallest over its interfaces or layers), with the slot that gives it.

A fitted interface is one with an interference given (0 for a line-to-line sleeve gripped
only by a fit outside it), a bonded one one with an allowable bond shear given; an interface
with both (a fit with a retaining compound) gets both checks, each on its own, though such a
joint carries more than either. An interface with neither is not checked here: how it passes
its torque is for the user to state. A preliminary design aid: verify against the applicable
codes and standards and have a qualified engineer review.
"""

from __future__ import annotations

from dataclasses import dataclass, fields
from types import SimpleNamespace

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, frozen_view
from ._fits import REFERENCE_TEMPERATURE
from ._interface_rows import RowInputs, rate_rows
from ._load_path import DEFAULT_LOAD_PATH
from ._section import LayerStack

__all__ = ["InterfaceRating", "rate_interfaces"]


@dataclass(frozen=True)
class InterfaceRating:
    """Interface results of P parts of L slots (:func:`rate_interfaces`), SI.

    Interface arrays are ``(P, L)`` at the outer member's slot (NaN at slot 0, at absent
    interfaces and where a check does not apply); layer arrays are ``(P, L)`` at the layer.

    Attributes
    ----------
    interface_share : (P, L) ndarray, 1
        Torque each interface passes per unit section torque.
    interference : (P, L) ndarray, m
        Diametral interference at the operating temperature (fitted interfaces).
    pressure : (P, L) ndarray, Pa
        Contact pressure of every interface of a part with a fit (:func:`stack_fit_pressures`).
    slip_torque : (P, L) ndarray, N*m
        Torque a fitted interface passes before it slips.
    slip_capacity : (P, L) ndarray, N*m
        Section torque at which it slips; inf where it passes no torque.
    bond_capacity : (P, L) ndarray, N*m
        Section torque at which a bond's average shear reaches its allowable.
    fit_stress_capacity : (P, L) ndarray, N*m
        Per layer of a part with a fit: section torque at which fit stresses and torsion
        reach ``S_y / FS`` (0 where the fit alone does).
    fit_stress_face : (P, L) ndarray of int8
        0 inner face, 1 outer face, -1 none.
    interface_flags : (P, L) ndarray of int32
        :class:`InterfaceFlag` bits at the interface.
    layer_fit_flags : (P, L) ndarray of int32
        ``FIT_OVERSTRESSED`` / ``FIT_INPUT_INVALID`` at the layer.
    slip_limit, bond_limit, fit_stress_limit : (P,) ndarray, N*m
        Smallest capacity of the part; inf where the check does not apply; NaN where an
        input of the check is in error.
    slip_slot, bond_slot, fit_stress_slot : (P,) ndarray of int16
        The slot that gives the limit; -1 where none does.
    """

    interface_share: NDArray[np.float64]
    interference: NDArray[np.float64]
    pressure: NDArray[np.float64]
    slip_torque: NDArray[np.float64]
    slip_capacity: NDArray[np.float64]
    bond_capacity: NDArray[np.float64]
    fit_stress_capacity: NDArray[np.float64]
    fit_stress_face: NDArray[np.int8]
    interface_flags: NDArray[np.int32]
    layer_fit_flags: NDArray[np.int32]
    slip_limit: NDArray[np.float64]
    slip_slot: NDArray[np.int16]
    bond_limit: NDArray[np.float64]
    bond_slot: NDArray[np.int16]
    fit_stress_limit: NDArray[np.float64]
    fit_stress_slot: NDArray[np.int16]

    def __post_init__(self) -> None:
        for item in fields(self):
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))


def _grid(value: ArrayLike, shape: tuple[int, int]) -> NDArray[np.float64]:
    return np.broadcast_to(as_float(value), shape)


def _part(value: ArrayLike, n_parts: int) -> NDArray[np.float64]:
    return np.broadcast_to(as_float(value), (n_parts,))


_DTYPES = {"fit_stress_face": np.int8, "interface_flags": np.int32, "layer_fit_flags": np.int32,
           "slip_slot": np.int16, "bond_slot": np.int16, "fit_stress_slot": np.int16}
_PER_PART = {"slip_limit", "slip_slot", "bond_limit", "bond_slot", "fit_stress_limit",
             "fit_stress_slot"}

#: Rows rated together: 2^16 parts of a few layers keep a block's temporaries in the cache.
BLOCK_ROWS = 1 << 16


def rate_interfaces(
    stack: LayerStack,
    *,
    youngs_modulus: ArrayLike = np.nan,
    poisson_ratio: ArrayLike = np.nan,
    yield_strength: ArrayLike = np.nan,
    expansion_coefficient: ArrayLike = np.nan,
    interference: ArrayLike = np.nan,
    fit_length: ArrayLike = np.nan,
    friction: ArrayLike = np.nan,
    bond_allowable: ArrayLike = np.nan,
    bond_length: ArrayLike = np.nan,
    load_path: ArrayLike = DEFAULT_LOAD_PATH,
    operating_temperature: ArrayLike = np.nan,
    reference_temperature: ArrayLike = REFERENCE_TEMPERATURE,
    factor_of_safety: ArrayLike = 1.0,
    share: ArrayLike | None = None,
    sum_stiffness: ArrayLike | None = None,
) -> InterfaceRating:
    """Rate the fitted and bonded interfaces of every part.

    Parameters
    ----------
    stack : LayerStack
        P parts of L slots (diameters, G, present).
    youngs_modulus, poisson_ratio : (P, L) array_like, Pa and 1
        Per layer; needed by parts with a fit.
    yield_strength : (P, L) array_like, Pa
        Per layer, for the fit-stress check.
    expansion_coefficient : (P, L) array_like, 1/K
        Per layer; needed by parts with a fit where an operating temperature is given.
    interference : (P, L) array_like, m
        Diametral interference at ``reference_temperature``, at the outer member's slot;
        NaN: not a fit (the layers just touch).
    fit_length : (P, L) array_like, m
        Length passing the torque one way (half the fit where the torque goes in and out
        through the same layer, see :func:`slip_torque`).
    friction : (P, L) array_like, 1
        See :data:`FRICTION_GUIDANCE`.
    bond_allowable : (P, L) array_like, Pa
        Allowable average bond shear; NaN: not bonded.
    bond_length : (P, L) array_like, m
        As ``fit_length``.
    load_path : (P,) array_like of LoadPath
    operating_temperature : (P,) array_like, K
        NaN: the reference temperature.
    reference_temperature : (P,) array_like, K
    factor_of_safety : array_like, 1
        On the yield strength in the fit-stress check; broadcast against (P, L).
    share, sum_stiffness : optional
        ``Rating.share`` (P, L) and ``Rating.sum_gj`` (P,), to save working them out again.

    Returns
    -------
    InterfaceRating
    """
    shape = stack.outer_diameter.shape
    n_parts = shape[0]
    given = share is not None and sum_stiffness is not None
    src = RowInputs(
        do=_grid(stack.outer_diameter, shape), di=_grid(stack.inner_diameter, shape),
        g=_grid(stack.shear_modulus, shape), mask=np.broadcast_to(stack.present, shape),
        share=_grid(share, shape) if given else None,
        sum_gj=_part(sum_stiffness, n_parts) if given else None,
        path=_part(load_path, n_parts),
        e=_grid(youngs_modulus, shape), nu=_grid(poisson_ratio, shape),
        sy=_grid(yield_strength, shape), alpha=_grid(expansion_coefficient, shape),
        fs=_grid(factor_of_safety, shape), delta0=_grid(interference, shape),
        length=_grid(fit_length, shape), mu=_grid(friction, shape),
        tau_bond=_grid(bond_allowable, shape), bond_len=_grid(bond_length, shape),
        heat=_part(operating_temperature, n_parts) - _part(reference_temperature, n_parts),
    )
    # Every element of these is written block by block: no fill here.
    arrays = {item.name: np.empty(shape if item.name not in _PER_PART else (n_parts,),
                                  dtype=_DTYPES.get(item.name, np.float64), order="F")
              for item in fields(InterfaceRating)}
    for first in range(0, n_parts, BLOCK_ROWS):
        rows = slice(first, first + BLOCK_ROWS)
        rate_rows(src.rows(rows), SimpleNamespace(**{k: v[rows] for k, v in arrays.items()}))
    return InterfaceRating(**arrays)
