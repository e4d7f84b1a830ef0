"""Torsional buckling of thin-walled circular tubes (Roark's thin-tube formulas, from memory).

Elastic critical shear stress of a thin isotropic tube of mean radius ``r``, wall ``t`` and
length ``L`` between its end supports (Roark's Formulas for Stress and Strain, formulas for
elastic stability of shells: thin-walled circular tube under torsion; coefficients from
memory, verify against the edition in use):

- long tube (the limit as L grows; Timoshenko and Gere's two-lobe result):
  ``tau_long = E / (3 sqrt(2) (1 - nu^2)^(3/4)) * (t / r)^(3/2)``, independent of L;
- moderate length (Donnell; Batdorf's ``k_s = 0.85 Z^(3/4)`` with simply supported ends,
  ``Z = L^2 sqrt(1 - nu^2) / (r t)``):
  ``tau_mod = k_s pi^2 E / (12 (1 - nu^2)) * (t / L)^2``
  ``= 0.699 E / (1 - nu^2)^(5/8) * (t / r)^(5/4) * (r / L)^(1/2)``.

The theoretical stress is the larger of the two (the moderate form falls below the long-tube
limit as L grows). Below ``Z = 50`` the moderate form underestimates the buckling stress of
short tubes (it tends to zero where a short tube tends to a flat plate): the result is kept,
being conservative, and noted. Tests on real tubes buckle below theory; the **knock-down
factor** 0.67 (NASA SP-8007's correlation factor for cylinders in torsion, from memory) is
applied directly to the stress, the more conservative reading. The section torque of a thin
wall at shear stress ``tau`` is ``T = 2 pi r^2 t tau``.

Compound walls: an **equivalent wall of the same membrane and bending stiffness**. With
plane-stress moduli ``E'_i = E_i / (1 - nu_i^2)``: membrane ``S = sum(E'_i t_i)``, neutral
surface ``z_n = sum(E'_i t_i z_i) / S``, bending ``D = sum(E'_i (t_i^3 / 12 +
t_i (z_i - z_n)^2))``; then ``t_eq = sqrt(12 D / S)``, ``E'_eq = S / t_eq``, ``nu_eq`` the
``E' t``-weighted mean, radius that of the neutral surface. Donnell's shell equations hold a
wall by exactly these two stiffnesses, so for isotropic layers of similar Poisson ratio the
equivalent wall buckles as the compound wall does; the stiffest layer taken alone would
ignore the others' support while its share of the torque is not its own. A single layer is
its own equivalent wall. Wound composite layers are orthotropic: their buckling needs the
orthotropic shell formulas, which are not covered here (an effective E is an approximation).

Solid and thick-walled sections (mean radius over wall below 10, common practice for thin-
shell theory) are not checked: their capacity is +inf, since a stocky tube yields first.
Elastic formulas: where the buckling stress would exceed the shear yield stress, the
layer-stress criterion governs in any case.

Preliminary design aid: verify against the applicable codes and standards and have a qualified
engineer review the design; local codes and licensed practice prevail.
"""

from __future__ import annotations

from dataclasses import dataclass, fields
from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import (
    as_float,
    flag_where,
    frozen_view,
    gather_layer_flags,
    layer_arrays,
    part_array,
    scalar_out,
)
from ._diagnoses import LOAD_ERRORS, LoadFlag

__all__ = [
    "BUCKLING_KNOCK_DOWN",
    "THIN_WALL_RATIO",
    "SHORT_TUBE_Z",
    "long_tube_buckling_stress",
    "moderate_tube_buckling_stress",
    "tube_buckling_stress",
    "tube_buckling_capacity",
    "thin_walled",
    "TorsionalBuckling",
    "torsional_buckling",
]

BUCKLING_KNOCK_DOWN = 0.67
"""Tested over theoretical buckling stress, tubes in torsion (NASA SP-8007, from memory)."""
THIN_WALL_RATIO = 10.0
"""Mean radius over wall thickness from which thin-shell buckling is checked (common practice)."""
SHORT_TUBE_Z = 50.0
"""Batdorf's Z below which the moderate-length form is conservative (from memory)."""

_LONG = 1.0 / (3.0 * np.sqrt(2.0))
_BATDORF_KS = 0.85


def long_tube_buckling_stress(
    youngs_modulus: ArrayLike, poisson_ratio: ArrayLike, radius: ArrayLike, wall: ArrayLike
) -> Any:
    """Theoretical torsional buckling stress of a long thin tube (no knock-down).

    ``tau = E / (3 sqrt(2) (1 - nu^2)^(3/4)) * (t / r)^(3/2)``.

    Parameters
    ----------
    youngs_modulus : array_like, Pa
    poisson_ratio : array_like, 1
    radius : array_like, m
        Mean radius of the wall.
    wall : array_like, m

    Returns
    -------
    ndarray or scalar, Pa

    Examples
    --------
    >>> round(float(long_tube_buckling_stress(200e9, 0.3, 0.05, 0.001)) / 1e6, 1)
    143.1
    """
    e, nu = as_float(youngs_modulus), as_float(poisson_ratio)
    with np.errstate(invalid="ignore", divide="ignore"):
        ratio = as_float(wall) / as_float(radius)
        result = _LONG * e / (1.0 - nu * nu) ** 0.75 * ratio * np.sqrt(ratio)
    return scalar_out(result)


def moderate_tube_buckling_stress(
    youngs_modulus: ArrayLike,
    poisson_ratio: ArrayLike,
    radius: ArrayLike,
    wall: ArrayLike,
    length: ArrayLike,
) -> Any:
    """Theoretical torsional buckling stress of a tube of moderate length (no knock-down).

    ``tau = 0.85 Z^(3/4) pi^2 E / (12 (1 - nu^2)) * (t / L)^2``,
    ``Z = L^2 sqrt(1 - nu^2) / (r t)``; simply supported ends.

    Parameters
    ----------
    youngs_modulus : array_like, Pa
    poisson_ratio : array_like, 1
    radius : array_like, m
    wall : array_like, m
    length : array_like, m
        Between the end supports.

    Returns
    -------
    ndarray or scalar, Pa
    """
    e, nu = as_float(youngs_modulus), as_float(poisson_ratio)
    r, t, span = as_float(radius), as_float(wall), as_float(length)
    with np.errstate(invalid="ignore", divide="ignore"):
        factor = 1.0 - nu * nu
        z = span * span * np.sqrt(factor) / (r * t)
        result = _BATDORF_KS * z**0.75 * np.pi**2 * e / (12.0 * factor) * (t / span) ** 2
    return scalar_out(result)


def tube_buckling_stress(
    youngs_modulus: ArrayLike,
    poisson_ratio: ArrayLike,
    radius: ArrayLike,
    wall: ArrayLike,
    length: ArrayLike,
    knock_down: ArrayLike = BUCKLING_KNOCK_DOWN,
) -> Any:
    """Design buckling stress: the knock-down times the larger of the two theoretical forms.

    Parameters
    ----------
    youngs_modulus : array_like, Pa
    poisson_ratio : array_like, 1
    radius : array_like, m
    wall : array_like, m
    length : array_like, m
    knock_down : array_like, 1
        Default 0.67 (NASA SP-8007, from memory).

    Returns
    -------
    ndarray or scalar, Pa
    """
    long = long_tube_buckling_stress(youngs_modulus, poisson_ratio, radius, wall)
    moderate = moderate_tube_buckling_stress(youngs_modulus, poisson_ratio, radius, wall, length)
    return scalar_out(as_float(knock_down) * np.fmax(long, moderate))


def tube_buckling_capacity(
    youngs_modulus: ArrayLike,
    poisson_ratio: ArrayLike,
    radius: ArrayLike,
    wall: ArrayLike,
    length: ArrayLike,
    factor_of_safety: ArrayLike,
    knock_down: ArrayLike = BUCKLING_KNOCK_DOWN,
) -> Any:
    """Section torque at which a thin wall buckles in torsion, over the factor of safety.

    ``T = 2 pi r^2 t tau_cr / FS`` with ``tau_cr`` from :func:`tube_buckling_stress`. For a
    compound wall pass the equivalent wall (:func:`torsional_buckling` does).

    Parameters
    ----------
    youngs_modulus : array_like, Pa
    poisson_ratio : array_like, 1
    radius : array_like, m
    wall : array_like, m
    length : array_like, m
    factor_of_safety : array_like, 1
    knock_down : array_like, 1

    Returns
    -------
    ndarray or scalar, N*m
    """
    stress = tube_buckling_stress(youngs_modulus, poisson_ratio, radius, wall, length,
                                  knock_down)
    r = as_float(radius)
    with np.errstate(invalid="ignore", divide="ignore"):
        result = 2.0 * np.pi * r * r * as_float(wall) * stress / as_float(factor_of_safety)
    return scalar_out(result)


@dataclass(frozen=True)
class TorsionalBuckling:
    """Result of :func:`torsional_buckling` for P parts.

    Attributes
    ----------
    radius_to_wall : (P,) ndarray, 1
        Mean radius over wall thickness of the whole wall (0.5 for a solid section).
    modulus, poisson_ratio : (P,) ndarray, Pa and 1
        Of the equivalent wall.
    wall : (P,) ndarray, m
        Equivalent wall thickness ``sqrt(12 D / S)``.
    radius : (P,) ndarray, m
        Radius of the equivalent wall's neutral surface.
    batdorf_z : (P,) ndarray, 1
    critical_stress : (P,) ndarray, Pa
        Design buckling stress of the equivalent wall, knock-down included.
    critical_torque : (P,) ndarray, N*m
        ``2 pi r^2 t tau``; +inf where not checked.
    capacity : (P,) ndarray, N*m
        ``critical_torque / FS``; +inf for solid and thick-walled parts.
    layer_flags : (P, L) ndarray of int32
        :class:`LoadFlag`: ``YOUNGS_MODULUS_NOT_POSITIVE``, ``POISSON_OUT_OF_RANGE``.
    part_flags : (P,) ndarray of int32
        ``LENGTH_NOT_POSITIVE``, ``STRENGTH_NOT_POSITIVE`` (a factor of safety not positive)
        (errors), ``NOT_THIN_WALLED``, ``SHORT_TUBE`` (notes) and the layers' bits.
    valid : (P,) ndarray of bool
    """

    radius_to_wall: NDArray[np.float64]
    modulus: NDArray[np.float64]
    poisson_ratio: NDArray[np.float64]
    wall: NDArray[np.float64]
    radius: NDArray[np.float64]
    batdorf_z: NDArray[np.float64]
    critical_stress: NDArray[np.float64]
    critical_torque: NDArray[np.float64]
    capacity: NDArray[np.float64]
    layer_flags: NDArray[np.int32]
    part_flags: NDArray[np.int32]
    valid: NDArray[np.bool_]

    def __post_init__(self) -> None:
        for item in fields(self):
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))


def torsional_buckling(
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    youngs_modulus: ArrayLike,
    poisson_ratio: ArrayLike,
    length: ArrayLike,
    factor_of_safety: ArrayLike,
    *,
    present: ArrayLike | None = None,
    knock_down: float = BUCKLING_KNOCK_DOWN,
    thin_wall_ratio: float = THIN_WALL_RATIO,
) -> TorsionalBuckling:
    """Torsional buckling torque of hollow compound tubes, as a section-torque capacity.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
        Innermost layer first; the bore is slot 0's inner diameter (0: solid, not checked).
    youngs_modulus : (P, L) array_like, Pa
    poisson_ratio : (P, L) array_like, 1
    length : (P,) array_like, m
        Between the supports that hold the tube round (ends, bulkheads).
    factor_of_safety : (P,) array_like, 1
        Applied to the buckling torque (the knock-down is not a safety factor).
    present : (P, L) array_like of bool, optional
        Default: a slot is present where its outer diameter is not NaN.
    knock_down : float, 1
    thin_wall_ratio : float, 1
        Parts whose mean radius over wall is below it are not checked (+inf).

    Returns
    -------
    TorsionalBuckling
        Parts with an error bit get NaN results and ``valid`` False.
    """
    (do, di, modulus, nu), mask = layer_arrays(
        outer_diameter, inner_diameter, youngs_modulus, poisson_ratio, present=present
    )
    n_parts = do.shape[0]
    span = part_array(length, n_parts, "length")
    fs = part_array(factor_of_safety, n_parts, "factor_of_safety")

    with np.errstate(all="ignore"):
        layer_flags = np.zeros(do.shape, dtype=np.int32)
        flag_where(layer_flags, mask & ~((modulus > 0) & (modulus < np.inf)),
                   LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE)
        flag_where(layer_flags, mask & ~((nu > -1.0) & (nu <= 0.5)), LoadFlag.POISSON_OUT_OF_RANGE)
        part_flags = np.zeros(n_parts, dtype=np.int32)
        flag_where(part_flags, ~((span > 0) & (span < np.inf)), LoadFlag.LENGTH_NOT_POSITIVE)
        flag_where(part_flags, ~((fs > 0) & (fs < np.inf)), LoadFlag.STRENGTH_NOT_POSITIVE)
        part_flags = gather_layer_flags(part_flags, layer_flags)
        valid = (part_flags & int(LOAD_ERRORS)) == 0

        bore, radius_to_wall = _bore_and_wall_ratio(do, di, mask)
        checked = valid & (bore > 0) & (radius_to_wall >= thin_wall_ratio)
        # Only thin walls are checked: the equivalent wall is worked out for those parts
        # alone (in a machine catalogue most sections are stocky, and these few lines
        # would otherwise cost the whole rating's time again). Element by element, the same.
        rows = np.flatnonzero(checked)
        wall_results = _equivalent_wall_buckling(
            *(value[rows] for value in (do, di, modulus, nu, mask, bore, span)), knock_down)
        results = [radius_to_wall]
        for value in wall_results:  # e_eq, nu_eq, wall, radius, z, stress, torque
            spread = np.full(n_parts, np.nan)
            spread[rows] = value
            results.append(spread)
        e_eq, nu_eq, wall, radius, z, stress, torque = results[1:]
        flag_where(part_flags, valid & ~checked, LoadFlag.NOT_THIN_WALLED)
        flag_where(part_flags, checked & (z < SHORT_TUBE_Z), LoadFlag.SHORT_TUBE)
        torque[~checked] = np.inf
        capacity = torque / fs
        results += [capacity]
        for array in results:
            array[~valid] = np.nan

    return TorsionalBuckling(
        radius_to_wall=radius_to_wall,
        modulus=e_eq,
        poisson_ratio=nu_eq,
        wall=wall,
        radius=radius,
        batdorf_z=z,
        critical_stress=stress,
        critical_torque=torque,
        capacity=capacity,
        layer_flags=layer_flags,
        part_flags=part_flags,
        valid=valid,
    )


def _bore_and_wall_ratio(
    do: NDArray[np.float64], di: NDArray[np.float64], mask: NDArray[np.bool_]
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Per part: the bore's radius (NaN without slot 0) and the whole wall's mean radius over
    its thickness (0.5 for a solid section)."""
    with np.errstate(all="ignore"):
        bore = np.where(mask[:, 0], di[:, 0], np.nan) / 2.0
        # Column by column: a reduction along the few slots of each row is slow.
        outside = np.where(mask[:, 0], do[:, 0], np.nan)
        for slot in range(1, do.shape[1]):
            np.fmax(outside, np.where(mask[:, slot], do[:, slot], np.nan), out=outside)
        outside /= 2.0
        return bore, (bore + outside) / (2.0 * (outside - bore))


def thin_walled(
    outer_diameter: ArrayLike, inner_diameter: ArrayLike, present: ArrayLike,
    thin_wall_ratio: float = THIN_WALL_RATIO,
) -> NDArray[np.bool_]:
    """Per part: is the section hollow and thin enough for :func:`torsional_buckling` to check
    it (its inputs aside)? Elsewhere that capacity is +inf or, for bad inputs, NaN.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    present : (P, L) array_like of bool
    thin_wall_ratio : float, 1

    Returns
    -------
    (P,) ndarray of bool
    """
    (do, di), mask = layer_arrays(outer_diameter, inner_diameter, present=present)
    bore, radius_to_wall = _bore_and_wall_ratio(do, di, mask)
    with np.errstate(invalid="ignore"):
        return (bore > 0) & (radius_to_wall >= thin_wall_ratio)


def _equivalent_wall_buckling(
    do: NDArray[np.float64], di: NDArray[np.float64], modulus: NDArray[np.float64],
    nu: NDArray[np.float64], mask: NDArray[np.bool_], bore: NDArray[np.float64],
    span: NDArray[np.float64], knock_down: float,
) -> tuple[NDArray[np.float64], ...]:
    """The equivalent wall of each part's layers and its buckling (the module's notes):
    ``E_eq, nu_eq, t_eq``, the neutral surface's radius, Batdorf's Z, the design buckling
    stress and the critical torque ``2 pi r^2 t tau``, one value per part."""
    plane = np.where(mask, modulus / (1.0 - nu * nu), 0.0)
    thickness = np.where(mask, (do - di) / 2.0, 0.0)
    centre = np.where(mask, (do + di) / 4.0, 0.0) - bore[:, np.newaxis]
    membrane = (plane * thickness).sum(axis=1)
    neutral = (plane * thickness * centre).sum(axis=1) / membrane
    offset = centre - neutral[:, np.newaxis]
    bending = (plane * (thickness**3 / 12.0 + thickness * offset * offset)).sum(axis=1)
    wall = np.sqrt(12.0 * bending / membrane)
    nu_eq = (np.where(mask, nu, 0.0) * plane * thickness).sum(axis=1) / membrane
    e_eq = membrane / wall * (1.0 - nu_eq * nu_eq)
    radius = bore + neutral
    z = span * span * np.sqrt(1.0 - nu_eq * nu_eq) / (radius * wall)
    stress = np.asarray(tube_buckling_stress(e_eq, nu_eq, radius, wall, span, knock_down))
    torque = 2.0 * np.pi * radius * radius * wall * stress
    return e_eq, nu_eq, wall, radius, z, stress, torque
