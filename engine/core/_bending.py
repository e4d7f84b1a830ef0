"""Compound section in bending: plane sections, one curvature, stress by each layer's modulus.

The layers act together (no slip at the interfaces), so plane sections stay plane and every
layer bends to one curvature ``kappa = M / sum(E I)`` with ``I_i = pi/64 (Do^4 - Di^4)``.
The strain ``kappa * r`` is continuous through the wall; the stress ``E_i * kappa * r`` jumps
at each interface, as the shear stress does in torsion. An axial force ``N`` stretches every
layer alike: ``eps = N / sum(E A)``, ``sigma_i = E_i * eps``. The layers are concentric
circles, so the neutral axis is the centre line and bending and stretching do not couple.

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

__all__ = ["area_moment", "section_area", "SectionBending", "section_bending"]


def area_moment(outer_diameter: ArrayLike, inner_diameter: ArrayLike = 0.0) -> Any:
    """Second moment of area of a circular tube about a diameter, ``I = pi/64 (Do^4 - Di^4)``.

    Parameters
    ----------
    outer_diameter : array_like, m
    inner_diameter : array_like, m
        0 for a solid section.

    Returns
    -------
    ndarray or scalar, m^4
        Half the polar moment ``J`` of the same tube.

    Examples
    --------
    >>> round(float(area_moment(0.05)) * 1e9, 2)  # 50 mm solid bar, in 1e-9 m^4
    306.8
    """
    outer = as_float(outer_diameter)
    inner = as_float(inner_diameter)
    return scalar_out(np.pi / 64.0 * (outer**4 - inner**4))


def section_area(outer_diameter: ArrayLike, inner_diameter: ArrayLike = 0.0) -> Any:
    """Area of a circular tube's section, ``A = pi/4 (Do^2 - Di^2)``.

    Parameters
    ----------
    outer_diameter : array_like, m
    inner_diameter : array_like, m

    Returns
    -------
    ndarray or scalar, m^2
    """
    outer = as_float(outer_diameter)
    inner = as_float(inner_diameter)
    return scalar_out(np.pi / 4.0 * (outer**2 - inner**2))


@dataclass(frozen=True)
class SectionBending:
    """Bending (and axial) result of :func:`section_bending` for P parts of L layer slots.

    Per-layer arrays are ``(P, L)``, NaN in absent slots and in parts not evaluated;
    per-part arrays are ``(P,)``. Stresses use the moment's magnitude: the bending stress
    is given on the fibre where it adds to the axial stress (with no axial force, the
    tension side), which is the fibre a strength check needs.

    Attributes
    ----------
    ei : (P, L) ndarray, N*m^2
        Layer bending stiffness ``E_i I_i``.
    sum_ei : (P,) ndarray, N*m^2
    sum_ea : (P,) ndarray, N
        Axial stiffness ``sum(E_i A_i)``.
    curvature : (P,) ndarray, 1/m
        ``|M| / sum(E I)``.
    axial_strain : (P,) ndarray, 1
        ``N / sum(E A)`` (+ tension).
    bending_outer, bending_inner : (P, L) ndarray, Pa
        Bending stress magnitude ``E_i * kappa * r`` at the layer's outer and inner radius
        (0 at the centre of a solid core).
    axial : (P, L) ndarray, Pa
        Axial stress ``E_i * N / sum(E A)`` (+ tension), uniform over the layer.
    normal_outer, normal_inner : (P, L) ndarray, Pa
        Axial plus bending stress on the fibre where they add: ``axial + bending`` with the
        axial stress's sign (+ where there is no axial force).
    layer_flags : (P, L) ndarray of int32
        :class:`LoadFlag`: ``YOUNGS_MODULUS_NOT_POSITIVE``.
    part_flags : (P,) ndarray of int32
        ``MOMENT_NOT_FINITE``, ``AXIAL_FORCE_NOT_FINITE`` and the layers' bits.
    valid : (P,) ndarray of bool
        No error bit: the part was evaluated.
    """

    ei: NDArray[np.float64]
    sum_ei: NDArray[np.float64]
    sum_ea: NDArray[np.float64]
    curvature: NDArray[np.float64]
    axial_strain: NDArray[np.float64]
    bending_outer: NDArray[np.float64]
    bending_inner: NDArray[np.float64]
    axial: NDArray[np.float64]
    normal_outer: NDArray[np.float64]
    normal_inner: NDArray[np.float64]
    layer_flags: NDArray[np.int32]
    part_flags: NDArray[np.int32]
    valid: NDArray[np.bool_]

    def __post_init__(self) -> None:
        for item in fields(self):
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))

    @property
    def n_parts(self) -> int:
        """Number of parts."""
        return int(self.sum_ei.shape[0])


def section_bending(
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    youngs_modulus: ArrayLike,
    moment: ArrayLike,
    axial_force: ArrayLike = 0.0,
    *,
    present: ArrayLike | None = None,
) -> SectionBending:
    """Bending and axial stress in every layer of compound sections.

    ``kappa = |M| / sum(E I)``, ``sigma_b = E_i * kappa * r`` at the layer's outer and
    inner radius; ``sigma_N = E_i * N / sum(E A)``. Layers must act together (bonded,
    welded or fitted tightly enough not to slip axially).

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
        Innermost layer first; a 1-D input is one part. The geometry is not checked here:
        :func:`rate` checks it (``LayerFlag``), and a caller passes rated parts.
    youngs_modulus : (P, L) array_like, Pa
    moment : (P,) array_like, N*m
        Resultant bending moment at the section checked; for moments in two planes give
        ``sqrt(My^2 + Mz^2)`` (the section is round). Its magnitude is used.
    axial_force : (P,) array_like, N
        + tension, - compression (no column buckling is checked here). Default 0.
    present : (P, L) array_like of bool, optional
        Default: a slot is present where its outer diameter is not NaN.

    Returns
    -------
    SectionBending
        Parts with an error bit (a non-finite moment or force, a present layer's modulus
        not positive) get NaN results and ``valid`` False; the others are evaluated.

    Raises
    ------
    ValueError
        If the inputs do not broadcast to ``(P, L)`` and ``(P,)``.

    Examples
    --------
    >>> result = section_bending([0.05], [0.0], [200e9], moment=1000.0)
    >>> round(float(result.bending_outer[0, 0]) / 1e6, 2)  # 32 M / (pi D^3)
    81.49
    """
    (do, di, modulus), mask = layer_arrays(
        outer_diameter, inner_diameter, youngs_modulus, present=present
    )
    n_parts = do.shape[0]
    bend = part_array(moment, n_parts, "moment")
    force = part_array(axial_force, n_parts, "axial_force")

    with np.errstate(all="ignore"):
        layer_flags = np.zeros(do.shape, dtype=np.int32)
        bad = modulus > 0
        bad &= modulus < np.inf
        np.logical_not(bad, out=bad)
        bad &= mask
        if bad.any():
            flag_where(layer_flags, bad, LoadFlag.YOUNGS_MODULUS_NOT_POSITIVE)
        part_flags = np.zeros(n_parts, dtype=np.int32)
        flag_where(part_flags, ~np.isfinite(bend), LoadFlag.MOMENT_NOT_FINITE)
        flag_where(part_flags, ~np.isfinite(force), LoadFlag.AXIAL_FORCE_NOT_FINITE)
        part_flags = gather_layer_flags(part_flags, layer_flags)
        valid = (part_flags & int(LOAD_ERRORS)) == 0
        unused = ~mask if valid.all() else ~(mask & valid[:, np.newaxis])
        mask_needed = bool(unused.any())

        # Built in place: the batches are large and temporaries are what cost time.
        # E A = E (Do^2 - Di^2) pi/4 and E I = E (Do^2 - Di^2)(Do^2 + Di^2) pi/64 share a term.
        outer2 = np.multiply(do, do)
        inner2 = np.multiply(di, di)
        ea = np.subtract(outer2, inner2)
        ea *= modulus
        ei = np.add(outer2, inner2, out=outer2)
        ei *= ea
        del inner2
        if mask_needed:
            np.copyto(ei, 0.0, where=unused)
            np.copyto(ea, 0.0, where=unused)
        sum_ei = ei[:, 0].copy()
        sum_ea = ea[:, 0].copy()
        for slot in range(1, do.shape[1]):
            sum_ei += ei[:, slot]
            sum_ea += ea[:, slot]
        ei *= np.pi / 64.0
        sum_ei *= np.pi / 64.0
        sum_ea *= np.pi / 4.0
        if not valid.all():
            sum_ei[~valid] = np.nan
            sum_ea[~valid] = np.nan

        curvature = np.abs(bend) / sum_ei
        strain = force / sum_ea
        # Spread per part once: numpy multiplies equal shapes far faster than (P, 1) by (P, L).
        stress_per_diameter = np.repeat(0.5 * curvature, do.shape[1]).reshape(do.shape)
        stress_per_diameter *= modulus  # E kappa / 2
        bending_outer = np.multiply(stress_per_diameter, do)
        bending_inner = np.multiply(stress_per_diameter, di, out=stress_per_diameter)
        if mask_needed:
            for array in (ei, bending_outer, bending_inner):
                np.copyto(array, np.nan, where=unused)
        if np.any(force):
            axial = np.multiply(modulus, strain[:, np.newaxis], out=ea)
            if mask_needed:
                np.copyto(axial, np.nan, where=unused)
            compressive = axial < 0
            magnitude = np.abs(axial)
            normal_outer = np.add(bending_outer, magnitude)
            normal_inner = np.add(magnitude, bending_inner, out=magnitude)
            if compressive.any():
                np.negative(normal_outer, out=normal_outer, where=compressive)
                np.negative(normal_inner, out=normal_inner, where=compressive)
        else:
            # No axial force anywhere: the normal stress is the bending stress (shared,
            # read-only), sparing three passes over the batch.
            axial = np.multiply(bending_outer, 0.0, out=ea)
            normal_outer, normal_inner = bending_outer, bending_inner

    return SectionBending(
        ei=ei,
        sum_ei=sum_ei,
        sum_ea=sum_ea,
        curvature=curvature,
        axial_strain=strain,
        bending_outer=bending_outer,
        bending_inner=bending_inner,
        axial=axial,
        normal_outer=normal_outer,
        normal_inner=normal_inner,
        layer_flags=layer_flags,
        part_flags=part_flags,
        valid=valid,
    )
