"""Restoring a machined shaft: the sleeve over the reduced core that gives back its capacity."""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_float, frozen_view
from ._rating import Duty, rate
from ._section import LayerStack
from ._sizing import DEFAULT_SIZE_TOL, OuterLayers, SizedDimension, resized, solve_dimension

__all__ = ["RestoreResult", "restore_sleeve"]

# Default reach of the sleeve's outer diameter, as a multiple of the original's.
_DEFAULT_REACH = 4.0


@dataclass(frozen=True)
class RestoreResult:
    """What :func:`restore_sleeve` found for P parts and M candidate sleeve materials.

    Attributes
    ----------
    sleeve_outer_diameter : (P, M) ndarray, m
        Outer diameter of the sleeve; NaN where none restores the part.
    status : (P, M) ndarray of int8
        :class:`SizingStatus` of the sleeve's sizing.
    original_capacity : (P,) ndarray, N*m
        Governing capacity of the original section.
    restored_capacity : (P, M) ndarray, N*m
        Governing capacity of the sleeve over the reduced core, re-rated at the sleeve
        outer diameter given (at least the original's, by less than the tolerance's worth).
    stiffness_ratio : (P, M) ndarray, 1
        ``sum(GJ)`` restored over ``GJ`` of the original: the change in twist stiffness.
    governing_criterion : (P, M) ndarray of int8
    governing_layer : (P, M) ndarray of int16
        What governs the restored section: 0 the core, 1 the sleeve, -1 a twist limit.
    iterations : (P, M) ndarray of int16
    """

    sleeve_outer_diameter: NDArray[np.float64]
    status: NDArray[np.int8]
    original_capacity: NDArray[np.float64]
    restored_capacity: NDArray[np.float64]
    stiffness_ratio: NDArray[np.float64]
    governing_criterion: NDArray[np.int8]
    governing_layer: NDArray[np.int16]
    iterations: NDArray[np.int16]

    def __post_init__(self) -> None:
        for item in dataclasses.fields(self):
            value = np.asarray(getattr(self, item.name))
            object.__setattr__(self, item.name, frozen_view(value))


def _per_candidate(value: ArrayLike) -> NDArray[np.float64]:
    """A scalar, one value per candidate (M,), or (P, M), as a (P, M) array."""
    array = as_float(value)
    if array.ndim < 2:
        array = array.reshape(1, -1)
    return array


def restore_sleeve(
    outer_diameter: ArrayLike,
    bore: ArrayLike,
    shear_modulus: ArrayLike,
    allowable_shear: ArrayLike,
    reduced_diameter: ArrayLike,
    sleeve_shear_modulus: ArrayLike,
    sleeve_allowable_shear: ArrayLike,
    *,
    stress_concentration: ArrayLike = 1.0,
    core_stress_concentration: ArrayLike | None = None,
    sleeve_stress_concentration: ArrayLike | None = None,
    duty: Duty | None = None,
    largest: ArrayLike | None = None,
    tol: float = DEFAULT_SIZE_TOL,
) -> RestoreResult:
    """Sleeve outer diameter that gives a machined single-material shaft its capacity back.

    The original section is one layer; the restored section is its core turned down to
    ``reduced_diameter`` with a sleeve from there out, twisting as one. The sleeve's outer
    diameter is solved with :func:`solve_dimension` (outermost layer, so nothing outside
    it moves) for a governing capacity equal to the original's.

    Parameters
    ----------
    outer_diameter : (P,) array_like, m
        Original outer diameter.
    bore : (P,) array_like, m
        Original inner diameter (0 = solid); the reduced core keeps it.
    shear_modulus : (P,) array_like, Pa
    allowable_shear : (P,) array_like, Pa
        Of the original material, which the core stays.
    reduced_diameter : (P,) array_like, m
        Core diameter after machining.
    sleeve_shear_modulus, sleeve_allowable_shear : array_like, Pa
        The sleeve material: a scalar (one for all), an (M,) list of candidates, or
        (P, M). A 1-D array is always a list of candidates; give (P, 1) for one sleeve
        material per part.
    stress_concentration : (P,) array_like, 1
        Kt of the original at its outer radius.
    core_stress_concentration : (P,) array_like, 1, optional
        Kt at the reduced core's surface; default ``stress_concentration``.
    sleeve_stress_concentration : array_like, 1, optional
        Kt at the sleeve's outer radius, shaped like the sleeve material; default
        ``stress_concentration``.
    duty : Duty, optional
        Length and twist limits that both sections must meet (P parts or one); its torque
        is not used. Default: stress limits only.
    largest : array_like, m, optional
        Largest sleeve outer diameter tried, (P,) or (P, M); default four times the
        original outer diameter.
    tol : float, m
        Tolerance on the sleeve outer diameter (default 0.001 mm).

    Returns
    -------
    RestoreResult
        (P, M) arrays, M = 1 for a single sleeve material.

    Notes
    -----
    The sleeve is the outermost layer, so its capacity and the core's are monotone in its
    outer diameter whenever the sleeve's G is at least a quarter of the core's (see
    :func:`solve_dimension`); other pairs are checked and flagged ``NOT_MONOTONE``.
    """
    columns = np.broadcast_arrays(
        *(np.atleast_1d(as_float(v)) for v in (
            outer_diameter, bore, shear_modulus, allowable_shear, reduced_diameter,
            stress_concentration,
            stress_concentration if core_stress_concentration is None
            else core_stress_concentration,
        ))
    )
    outer, inner, modulus, allowable, reduced, kt, core_kt = (c.reshape(-1, 1) for c in columns)
    n_parts = outer.shape[0]
    sleeve = [
        _per_candidate(v)
        for v in (sleeve_shear_modulus, sleeve_allowable_shear,
                  kt if sleeve_stress_concentration is None else sleeve_stress_concentration)
    ]
    sleeve_modulus, sleeve_allowable, sleeve_kt = np.broadcast_arrays(*sleeve, outer)[:3]
    n_candidates = sleeve_modulus.shape[1]
    given = Duty.from_arrays(torque=np.ones(n_parts)) if duty is None else duty

    def per_part(value: ArrayLike) -> NDArray[np.float64]:
        return np.broadcast_to(as_float(value), (n_parts,))

    one = dict(torque=np.ones(n_parts), length=per_part(given.length),
               twist_limit_angle=per_part(given.twist_limit_angle),
               twist_limit_per_length=per_part(given.twist_limit_per_length))
    original = rate(LayerStack.from_arrays(outer, inner, modulus, allowable, kt, present=True),
                    Duty(**one))
    capacity = original.governing_capacity

    shape = (n_parts, n_candidates)

    def both_layers(core: NDArray[np.float64], shell: NDArray[np.float64]) -> NDArray[np.float64]:
        pair = np.stack([np.broadcast_to(core, shape), np.broadcast_to(shell, shape)], axis=-1)
        return pair.reshape(n_parts * n_candidates, 2)

    compound = LayerStack(
        outer_diameter=both_layers(reduced, outer),
        inner_diameter=both_layers(inner, reduced),
        shear_modulus=both_layers(modulus, sleeve_modulus),
        allowable_shear=both_layers(allowable, sleeve_allowable),
        stress_concentration=both_layers(core_kt, sleeve_kt),
        present=np.ones((n_parts * n_candidates, 2), dtype=bool),
    )
    demand = Duty(**{key: np.repeat(value if key != "torque" else capacity, n_candidates)
                     for key, value in one.items()})
    reach = _DEFAULT_REACH * outer if largest is None else as_float(largest)
    flat = np.broadcast_to(reach, (n_parts, n_candidates)).reshape(-1)
    found = solve_dimension(
        compound, demand, dimension=SizedDimension.OUTER_DIAMETER, layer=1,
        outer_layers=OuterLayers.FIXED, target_reserve=1.0,
        smallest=np.repeat(reduced[:, 0], n_candidates) + tol, largest=flat, tol=tol,
    )
    restored = rate(resized(compound, found.size, layer=1, outer_layers=OuterLayers.FIXED),
                    demand)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = restored.sum_gj / np.repeat(original.sum_gj, n_candidates)
    return RestoreResult(
        sleeve_outer_diameter=found.size.reshape(shape),
        status=found.status.reshape(shape),
        original_capacity=capacity,
        restored_capacity=restored.governing_capacity.reshape(shape),
        stiffness_ratio=ratio.reshape(shape),
        governing_criterion=found.governing_criterion.reshape(shape),
        governing_layer=found.governing_layer.reshape(shape),
        iterations=found.iterations.reshape(shape),
    )
