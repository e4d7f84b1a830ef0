"""Classical lamination theory: effective in-plane moduli of a wound or laid-up wall from ply data.

Each ply's reduced stiffness ``Q`` (plane stress, fibre axes) follows from E1, E2, G12 and
nu12; rotated by the ply angle it is ``Qbar(theta)``; the wall's extensional stiffness is
``A = sum(Qbar_k t_k)`` (R. M. Jones, Mechanics of Composite Materials, ch. 2 and 4). With
``a = A^-1`` and ``t`` the wall thickness, a tube takes

- ``Gxy = A66 / t`` in torsion (as the compound-shaft rating's shear modulus);
- ``Ex = 1 / (t a11)`` axially and in bending;
- ``Ey = 1 / (t a22)`` round the hoop (for an interference fit).

Angles are measured from the tube's axis (x) towards the hoop direction (y), in radians.
Only the membrane stiffness ``A`` is used: coupling ``B`` (unsymmetric layups) and the
wall's bending stiffness ``D`` matter little for a thin tube's section stiffness and are left
out. An unbalanced layup (A16, A26 not zero) couples twist with stretch: it is noted.

Preliminary design aid: verify against the applicable codes and standards and have a qualified
engineer review the design; local codes and licensed practice prevail.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, fields
from types import MappingProxyType
from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_bool, as_float, flag_where, frozen_view, scalar_out
from ._diagnoses import PLY_ERRORS, PlyFlag

__all__ = [
    "PlySet",
    "ply_library",
    "reduced_stiffness",
    "transformed_stiffness",
    "ply_flags",
    "LaminateModuli",
    "laminate_moduli",
]

_GPA = 1e9
_MM = 1e-3


@dataclass(frozen=True)
class PlySet:
    """One unidirectional ply material, SI.

    Parameters
    ----------
    name : str
    e1 : float, Pa
        Modulus along the fibres.
    e2 : float, Pa
        Modulus across the fibres.
    g12 : float, Pa
        In-plane shear modulus.
    nu12 : float, 1
        Major Poisson ratio (strain across over strain along, loaded along the fibres).
    thickness : float, m
        Cured ply thickness.
    density : float, kg/m^3
    source : str
        Where the values come from.
    note : str

    Raises
    ------
    ValueError
        If the name is blank or a value is out of range (:func:`ply_flags`); the message
        names the ply set, the field and the value.
    """

    name: str
    e1: float
    e2: float
    g12: float
    nu12: float
    thickness: float
    density: float
    source: str = ""
    note: str = ""

    def __post_init__(self) -> None:
        if not isinstance(self.name, str) or not self.name.strip():
            raise ValueError(f"PlySet.name must be a non-blank string; got {self.name!r}")
        for name in ("e1", "e2", "g12", "thickness", "density"):
            value = float(getattr(self, name))
            object.__setattr__(self, name, value)
            if not (value > 0 and math.isfinite(value)):
                raise ValueError(
                    f"ply set {self.name!r}: {name} must be a positive finite number; "
                    f"got {value!r}"
                )
        nu = float(self.nu12)
        object.__setattr__(self, "nu12", nu)
        if not (math.isfinite(nu) and nu * nu * self.e2 / self.e1 < 1.0):
            raise ValueError(
                f"ply set {self.name!r}: nu12 must be finite with nu12^2 * E2 / E1 below 1; "
                f"got nu12 = {nu!r}"
            )


_TEXTBOOK_TABLE = (
    "typical unidirectional lamina values as tabulated in composites textbooks "
    "(e.g. A. K. Kaw, Mechanics of Composite Materials, table of typical lamina properties), "
    "from memory"
)


def _library_entries() -> tuple[PlySet, ...]:
    return (
        PlySet(
            "Carbon/epoxy T300/5208-like",
            e1=181 * _GPA, e2=10.3 * _GPA, g12=7.17 * _GPA, nu12=0.28,
            thickness=0.125 * _MM, density=1600,
            source=_TEXTBOOK_TABLE + " (graphite/epoxy, fibre volume about 70 %)",
            note="Typical values, not a specification: use the supplier's cured-ply data.",
        ),
        PlySet(
            "Carbon/epoxy standard modulus",
            e1=135 * _GPA, e2=10 * _GPA, g12=5 * _GPA, nu12=0.3,
            thickness=0.125 * _MM, density=1550,
            source=(
                "typical standard-modulus carbon/epoxy ply at about 60 % fibre volume "
                "(the ply data of the materials library's wound carbon tube), from memory"
            ),
            note="Typical values, not a specification: use the supplier's cured-ply data.",
        ),
        PlySet(
            "Glass/epoxy E-glass",
            e1=38.6 * _GPA, e2=8.27 * _GPA, g12=4.14 * _GPA, nu12=0.26,
            thickness=0.125 * _MM, density=1800,
            source=_TEXTBOOK_TABLE + " (E-glass/epoxy, fibre volume about 45 %)",
            note="Typical values, not a specification: use the supplier's cured-ply data.",
        ),
    )


def ply_library() -> Mapping[str, PlySet]:
    """Typical ply sets, read-only, keyed by name (a fresh mapping on every call).

    Returns
    -------
    Mapping[str, PlySet]
    """
    return MappingProxyType({p.name: p for p in _library_entries()})


def ply_flags(
    e1: ArrayLike, e2: ArrayLike, g12: ArrayLike, nu12: ArrayLike, thickness: ArrayLike = 1.0
) -> Any:
    """Diagnosis of ply data, elementwise: :class:`PlyFlag` bits (all errors).

    Parameters
    ----------
    e1, e2, g12 : array_like, Pa
    nu12 : array_like, 1
    thickness : array_like, m

    Returns
    -------
    ndarray or scalar of int32
    """
    arrays = np.broadcast_arrays(*(as_float(v) for v in (e1, e2, g12, nu12, thickness)))
    m1, m2, shear, nu, t = arrays
    flags = np.zeros(m1.shape, dtype=np.int32)
    with np.errstate(invalid="ignore", divide="ignore"):
        moduli_ok = np.ones(m1.shape, dtype=bool)
        for modulus in (m1, m2, shear):
            moduli_ok &= (modulus > 0) & (modulus < np.inf)
        flag_where(flags, ~moduli_ok, PlyFlag.MODULUS_NOT_POSITIVE)
        flag_where(flags, moduli_ok & ~(nu * nu * m2 / m1 < 1.0), PlyFlag.POISSON_OUT_OF_RANGE)
        flag_where(flags, ~((t > 0) & (t < np.inf)), PlyFlag.THICKNESS_NOT_POSITIVE)
    return scalar_out(flags)


def _q_terms(e1: ArrayLike, e2: ArrayLike, g12: ArrayLike, nu12: ArrayLike):
    m1, m2, nu = as_float(e1), as_float(e2), as_float(nu12)
    with np.errstate(invalid="ignore", divide="ignore"):
        denominator = 1.0 - nu * nu * m2 / m1
        q11 = m1 / denominator
        q22 = m2 / denominator
        q12 = nu * q22
        q66 = as_float(g12) + 0.0 * q11  # broadcast to Q's shape (inf * 0 is NaN there: flagged anyway)
    return q11, q22, q12, q66


def _matrix(q11, q12, q16, q22, q26, q66) -> NDArray[np.float64]:
    rows = np.broadcast_arrays(q11, q12, q16, q22, q26, q66)
    return np.stack(
        [np.stack([rows[0], rows[1], rows[2]], -1),
         np.stack([rows[1], rows[3], rows[4]], -1),
         np.stack([rows[2], rows[4], rows[5]], -1)], -2)


def reduced_stiffness(e1: ArrayLike, e2: ArrayLike, g12: ArrayLike, nu12: ArrayLike) -> Any:
    """Reduced stiffness ``Q`` of a ply in its fibre axes (plane stress, engineering shear).

    ``Q11 = E1 / (1 - nu12 nu21)``, ``Q22 = E2 / (1 - nu12 nu21)``, ``Q12 = nu12 Q22``,
    ``Q66 = G12``, with ``nu21 = nu12 E2 / E1``.

    Parameters
    ----------
    e1, e2, g12 : array_like, Pa
    nu12 : array_like, 1

    Returns
    -------
    (..., 3, 3) ndarray, Pa
        NaN where :func:`ply_flags` reports an error.
    """
    q11, q22, q12, q66 = _q_terms(e1, e2, g12, nu12)
    zero = np.zeros_like(q11 + q22 + q66)
    bad = ply_flags(e1, e2, g12, nu12) != 0
    matrix = _matrix(q11, q12, zero, q22, zero, q66)
    return np.where(np.asarray(bad)[..., np.newaxis, np.newaxis], np.nan, matrix)


def _rotated(q11, q22, q12, q66, angle):
    c, s = np.cos(angle), np.sin(angle)
    c2, s2, cs = c * c, s * s, c * s
    c4, s4, s2c2 = c2 * c2, s2 * s2, s2 * c2
    return (
        q11 * c4 + 2.0 * (q12 + 2.0 * q66) * s2c2 + q22 * s4,
        (q11 + q22 - 4.0 * q66) * s2c2 + q12 * (s4 + c4),
        (q11 - q12 - 2.0 * q66) * cs * c2 + (q12 - q22 + 2.0 * q66) * cs * s2,
        q11 * s4 + 2.0 * (q12 + 2.0 * q66) * s2c2 + q22 * c4,
        (q11 - q12 - 2.0 * q66) * cs * s2 + (q12 - q22 + 2.0 * q66) * cs * c2,
        (q11 + q22 - 2.0 * q12 - 2.0 * q66) * s2c2 + q66 * (s4 + c4),
    )


def transformed_stiffness(
    e1: ArrayLike, e2: ArrayLike, g12: ArrayLike, nu12: ArrayLike, angle: ArrayLike
) -> Any:
    """Ply stiffness ``Qbar(theta)`` in the tube's axes, the ply's fibres at ``angle``.

    Parameters
    ----------
    e1, e2, g12 : array_like, Pa
    nu12 : array_like, 1
    angle : array_like, rad
        From the tube's axis towards the hoop direction.

    Returns
    -------
    (..., 3, 3) ndarray, Pa
        Rows and columns in the order x (axial), y (hoop), xy (shear).
    """
    q11, q22, q12, q66 = _q_terms(e1, e2, g12, nu12)
    terms = _rotated(q11, q22, q12, q66, as_float(angle))
    bad = np.asarray(ply_flags(e1, e2, g12, nu12)) != 0
    matrix = _matrix(*terms)
    return np.where(np.broadcast_to(bad, matrix.shape[:-2])[..., np.newaxis, np.newaxis],
                    np.nan, matrix)


@dataclass(frozen=True)
class LaminateModuli:
    """Effective in-plane properties of N laminates (:func:`laminate_moduli`).

    Attributes
    ----------
    extensional : (N, 3, 3) ndarray, N/m
        ``A = sum(Qbar_k t_k)``, order x (axial), y (hoop), xy.
    thickness : (N,) ndarray, m
    shear_modulus : (N,) ndarray, Pa
        ``A66 / t``: in torsion.
    shear_modulus_unrestrained : (N,) ndarray, Pa
        ``1 / (t a66)``: with axial and hoop stress free; equals ``A66 / t`` when balanced.
    axial_modulus : (N,) ndarray, Pa
        ``1 / (t a11)``: axially and in bending.
    hoop_modulus : (N,) ndarray, Pa
        ``1 / (t a22)``.
    poisson_ratio : (N,) ndarray, 1
        ``nu_xy = -a12 / a11``.
    flags : (N,) ndarray of int32
        :class:`PlyFlag` bits of the laminate's plies, ``NO_PLIES``, ``UNBALANCED`` (a note).
    valid : (N,) ndarray of bool
    """

    extensional: NDArray[np.float64]
    thickness: NDArray[np.float64]
    shear_modulus: NDArray[np.float64]
    shear_modulus_unrestrained: NDArray[np.float64]
    axial_modulus: NDArray[np.float64]
    hoop_modulus: NDArray[np.float64]
    poisson_ratio: NDArray[np.float64]
    flags: NDArray[np.int32]
    valid: NDArray[np.bool_]

    def __post_init__(self) -> None:
        for item in fields(self):
            object.__setattr__(self, item.name, frozen_view(np.asarray(getattr(self, item.name))))


BALANCE_REL_TOL = 1e-9
"""``|A16|, |A26|`` above this fraction of ``A11 + A22`` make a laminate unbalanced."""


def laminate_moduli(
    e1: ArrayLike,
    e2: ArrayLike,
    g12: ArrayLike,
    nu12: ArrayLike,
    ply_thickness: ArrayLike,
    angles: ArrayLike,
    *,
    present: ArrayLike | None = None,
) -> LaminateModuli:
    """Effective moduli of laminates from ply data and ply angles, by classical lamination theory.

    Parameters
    ----------
    e1, e2, g12 : array_like, Pa
        Ply data, broadcast against ``angles``: one ply set for all, one per laminate
        (shape ``(N, 1)``) or one per ply (hybrid walls).
    nu12 : array_like, 1
    ply_thickness : array_like, m
    angles : (N, K) array_like, rad
        Ply angles from the axis, K ply slots per laminate; a 1-D input is one laminate.
    present : (N, K) array_like of bool, optional
        Default: a ply is present where its angle is not NaN.

    Returns
    -------
    LaminateModuli
        Laminates with a ply error or no plies get NaN moduli and ``valid`` False.

    Examples
    --------
    >>> ply = ply_library()["Carbon/epoxy T300/5208-like"]
    >>> zero = laminate_moduli(ply.e1, ply.e2, ply.g12, ply.nu12, ply.thickness, [0.0, 0.0])
    >>> round(float(zero.axial_modulus[0]) / 1e9, 1)  # all plies along the axis: E1
    181.0
    """
    theta = np.atleast_2d(as_float(angles))
    if theta.ndim != 2:
        raise ValueError(f"angles must be (laminates, plies); got shape {theta.shape}")
    mask = ~np.isnan(theta) if present is None else as_bool(present)
    try:
        m1, m2, shear, nu, t, theta, mask = np.broadcast_arrays(
            *(as_float(v) for v in (e1, e2, g12, nu12, ply_thickness)), theta, mask
        )
    except ValueError as error:
        raise ValueError(
            f"ply data do not broadcast against the angles of shape {theta.shape}"
        ) from error
    with np.errstate(invalid="ignore", divide="ignore"):
        ply = np.where(mask, np.asarray(ply_flags(m1, m2, shear, nu, t)), 0).astype(np.int32)
        flag_where(ply, mask & ~np.isfinite(theta), PlyFlag.ANGLE_NOT_FINITE)
        flags = np.bitwise_or.reduce(ply, axis=1).astype(np.int32)
        flag_where(flags, ~mask.any(axis=1), PlyFlag.NO_PLIES)

        q11, q22, q12, q66 = _q_terms(m1, m2, shear, nu)
        weight = np.where(mask, t, 0.0)
        terms = [
            np.where(mask, term, 0.0) * weight
            for term in _rotated(q11, q22, q12, q66, np.where(mask, theta, 0.0))
        ]
        a11, a12, a16, a22, a26, a66 = (term.sum(axis=1) for term in terms)
        thickness = weight.sum(axis=1)
        det = a11 * (a22 * a66 - a26 * a26) - a12 * (a12 * a66 - a26 * a16) \
            + a16 * (a12 * a26 - a22 * a16)
        c11 = (a22 * a66 - a26 * a26) / det
        c22 = (a11 * a66 - a16 * a16) / det
        c66 = (a11 * a22 - a12 * a12) / det
        c12 = -(a12 * a66 - a16 * a26) / det
        scale = BALANCE_REL_TOL * (np.abs(a11) + np.abs(a22))
        valid = (flags & int(PLY_ERRORS)) == 0
        unbalanced = (np.abs(a16) > scale) | (np.abs(a26) > scale)
        flag_where(flags, valid & unbalanced, PlyFlag.UNBALANCED)
        extensional = _matrix(a11, a12, a16, a22, a26, a66)
        results = [a66 / thickness, 1.0 / (thickness * c66), 1.0 / (thickness * c11),
                   1.0 / (thickness * c22), -c12 / c11]
        for array in (*results, thickness):
            array[~valid] = np.nan
        extensional[~valid] = np.nan
    return LaminateModuli(
        extensional=extensional,
        thickness=thickness,
        shear_modulus=results[0],
        shear_modulus_unrestrained=results[1],
        axial_modulus=results[2],
        hoop_modulus=results[3],
        poisson_ratio=results[4],
        flags=flags,
        valid=valid,
    )
