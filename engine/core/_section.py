"""Section model: polar moments, moduli and the stack of concentric layers of a part."""

from __future__ import annotations

from dataclasses import dataclass, fields
from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_bool, as_float, frozen_view, scalar_out
from ._criteria import AllowableRule
from ._diagnoses import LayerFlag

__all__ = [
    "polar_moment",
    "shear_modulus_from_elastic",
    "LayerStack",
    "interface_gaps",
    "DEFAULT_CONTACT_ABS_TOL",
    "DEFAULT_CONTACT_REL_TOL",
]

DEFAULT_CONTACT_ABS_TOL = 1e-5
"""Default absolute contact tolerance, m (0.01 mm)."""
DEFAULT_CONTACT_REL_TOL = 2e-4
"""Default contact tolerance relative to the interface diameter (0.02 %)."""


def polar_moment(outer_diameter: ArrayLike, inner_diameter: ArrayLike = 0.0) -> Any:
    """Polar second moment of area of a circular tube, ``J = pi/32 (Do^4 - Di^4)``.

    Parameters
    ----------
    outer_diameter : array_like, m
    inner_diameter : array_like, m
        0 for a solid section.

    Returns
    -------
    ndarray or scalar, m^4
        Broadcast shape of the inputs; a scalar for scalar inputs.

    Examples
    --------
    >>> round(float(polar_moment(0.05)) * 1e9, 1)  # 50 mm solid bar, in 1e-9 m^4
    613.6
    """
    outer = as_float(outer_diameter)
    inner = as_float(inner_diameter)
    return scalar_out(np.pi / 32.0 * (outer**4 - inner**4))


def shear_modulus_from_elastic(youngs_modulus: ArrayLike, poisson_ratio: ArrayLike) -> Any:
    """Shear modulus of an isotropic material, ``G = E / (2 (1 + nu))``.

    Parameters
    ----------
    youngs_modulus : array_like, Pa
    poisson_ratio : array_like, 1

    Returns
    -------
    ndarray or scalar, Pa
        NaN where ``poisson_ratio <= -1`` (no isotropic material has that).
    """
    modulus = as_float(youngs_modulus)
    ratio = as_float(poisson_ratio)
    with np.errstate(divide="ignore", invalid="ignore"):
        result = np.where(ratio > -1.0, modulus / (2.0 * (1.0 + ratio)), np.nan)
    return scalar_out(result)


@dataclass(frozen=True)
class LayerStack:
    """The concentric layers of many parts, one row per part, innermost layer in slot 0.

    Every field is a read-only ``(P, L)`` array: parts on the leading axis, layer slots on
    the last. A part with fewer layers than ``L`` leaves its outer slots absent
    (``present`` False); present slots must be packed from slot 0.

    Parameters
    ----------
    outer_diameter : (P, L) array, m
    inner_diameter : (P, L) array, m
        0 for a solid innermost layer.
    shear_modulus : (P, L) array, Pa
    allowable_shear : (P, L) array, Pa
        Allowable shear stress of each layer (see :func:`allowable_shear`).
    stress_concentration : (P, L) array, 1
        Kt at the layer's outer radius (1 = none).
    present : (P, L) bool array
    allowable_rule : (P, L) int8 array of AllowableRule, optional
        How each allowable was obtained; carried into the rating. Default GIVEN.

    Raises
    ------
    ValueError
        If a field is not two-dimensional or its shape differs from ``outer_diameter``'s.

    Notes
    -----
    Build stacks with :meth:`from_layers` (one part from lists) or :meth:`from_arrays`
    (broadcasting). The constructor takes views, not copies, of float64 input.
    """

    outer_diameter: NDArray[np.float64]
    inner_diameter: NDArray[np.float64]
    shear_modulus: NDArray[np.float64]
    allowable_shear: NDArray[np.float64]
    stress_concentration: NDArray[np.float64]
    present: NDArray[np.bool_]
    allowable_rule: NDArray[np.int8] | None = None

    def __post_init__(self) -> None:
        outer = as_float(self.outer_diameter)
        if outer.ndim != 2:
            raise ValueError(
                f"LayerStack.outer_diameter must be a (parts, layers) array; got shape "
                f"{outer.shape}"
            )
        shape = outer.shape
        for item in fields(self):
            value = getattr(self, item.name)
            if item.name == "present":
                array = as_bool(value)
            elif item.name == "allowable_rule":
                if value is None:
                    value = np.broadcast_to(np.int8(AllowableRule.GIVEN), shape)
                array = np.asarray(value).astype(np.int8, copy=False)
            else:
                array = as_float(value)
            if array.shape != shape:
                raise ValueError(
                    f"LayerStack.{item.name} has shape {array.shape}; expected {shape} "
                    "like outer_diameter"
                )
            object.__setattr__(self, item.name, frozen_view(array))

    @property
    def n_parts(self) -> int:
        """Number of parts (rows)."""
        return int(self.outer_diameter.shape[0])

    @property
    def n_layers(self) -> int:
        """Number of layer slots (columns)."""
        return int(self.outer_diameter.shape[1])

    @classmethod
    def from_layers(
        cls,
        outer_diameter: ArrayLike,
        inner_diameter: ArrayLike,
        shear_modulus: ArrayLike,
        allowable_shear: ArrayLike,
        stress_concentration: ArrayLike = 1.0,
        allowable_rule: ArrayLike = AllowableRule.GIVEN,
    ) -> LayerStack:
        """One part from per-layer sequences, innermost first.

        Parameters
        ----------
        outer_diameter : sequence of float, m
        inner_diameter : sequence of float, m
        shear_modulus : sequence of float, Pa
        allowable_shear : sequence of float, Pa
        stress_concentration : float or sequence of float, 1
        allowable_rule : AllowableRule or sequence of them

        Returns
        -------
        LayerStack
            One row; every layer present.

        Examples
        --------
        >>> stack = LayerStack.from_layers([0.04, 0.05], [0.0, 0.04], [79e9, 40e9], [100e6, 60e6])
        >>> stack.outer_diameter.shape
        (1, 2)
        """
        columns = [
            np.atleast_1d(as_float(v))
            for v in (outer_diameter, inner_diameter, shear_modulus, allowable_shear,
                      stress_concentration)
        ]
        rule = np.atleast_1d(np.asarray(allowable_rule))
        columns = list(np.broadcast_arrays(*columns, rule))
        if columns[0].ndim != 1:
            raise ValueError(
                "LayerStack.from_layers takes one part: sequences of one value per layer; "
                f"got shape {columns[0].shape}"
            )
        rows = [c[np.newaxis, :] for c in columns]
        return cls(
            outer_diameter=rows[0],
            inner_diameter=rows[1],
            shear_modulus=rows[2],
            allowable_shear=rows[3],
            stress_concentration=rows[4],
            present=np.ones_like(rows[0], dtype=bool),
            allowable_rule=rows[5],
        )

    @classmethod
    def from_arrays(
        cls,
        outer_diameter: ArrayLike,
        inner_diameter: ArrayLike,
        shear_modulus: ArrayLike,
        allowable_shear: ArrayLike,
        stress_concentration: ArrayLike = 1.0,
        present: ArrayLike | None = None,
        allowable_rule: ArrayLike = AllowableRule.GIVEN,
    ) -> LayerStack:
        """Many parts from arrays that broadcast to ``(P, L)``.

        Parameters
        ----------
        outer_diameter : array_like, m
            A 1-D input is one part's layers.
        inner_diameter : array_like, m
        shear_modulus : array_like, Pa
        allowable_shear : array_like, Pa
        stress_concentration : array_like, 1
        present : array_like of bool, optional
            Default: a slot is present where its outer diameter is not NaN, so empty
            cells read as NaN become absent slots.
        allowable_rule : array_like of AllowableRule

        Returns
        -------
        LayerStack

        Raises
        ------
        ValueError
            If the inputs do not broadcast or have more than two dimensions.
        """
        floats = [
            as_float(v)
            for v in (outer_diameter, inner_diameter, shear_modulus, allowable_shear,
                      stress_concentration)
        ]
        present_array = None if present is None else as_bool(present)
        extra = [] if present_array is None else [present_array]
        try:
            arrays = np.broadcast_arrays(*floats, np.asarray(allowable_rule), *extra)
        except ValueError as error:
            shapes = ", ".join(str(np.shape(a)) for a in (*floats, *extra))
            raise ValueError(f"LayerStack inputs do not broadcast together: {shapes}") from error
        if arrays[0].ndim > 2:
            raise ValueError(
                f"LayerStack inputs must be at most (parts, layers); got shape {arrays[0].shape}"
            )
        arrays = [np.atleast_2d(a) for a in arrays]
        if present_array is None:
            arrays.append(~np.isnan(arrays[0]))
        return cls(
            outer_diameter=arrays[0],
            inner_diameter=arrays[1],
            shear_modulus=arrays[2],
            allowable_shear=arrays[3],
            stress_concentration=arrays[4],
            present=arrays[6],
            allowable_rule=arrays[5],
        )

    def take(self, rows: int | slice | ArrayLike) -> LayerStack:
        """A new stack holding only the given rows (an int keeps one row, still 2-D).

        Parameters
        ----------
        rows : int, slice or array_like of int or bool

        Returns
        -------
        LayerStack
        """
        if isinstance(rows, (int, np.integer)):
            rows = slice(int(rows), int(rows) + 1 if int(rows) != -1 else None)
        return LayerStack(**{f.name: getattr(self, f.name)[rows] for f in fields(self)})


def interface_gaps(
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike,
    present: ArrayLike,
    abs_tol: float = DEFAULT_CONTACT_ABS_TOL,
    rel_tol: float = DEFAULT_CONTACT_REL_TOL,
) -> tuple[NDArray[np.float64], NDArray[np.int32]]:
    """Signed gap at each layer's inner face, and GAP/OVERLAP flags beyond the tolerance.

    Parameters
    ----------
    outer_diameter, inner_diameter : (P, L) array_like, m
    present : (P, L) array_like of bool
    abs_tol : float, m
    rel_tol : float, 1
        The tolerance at an interface is ``max(abs_tol, rel_tol * d)`` with ``d`` the
        outer diameter of the layer inside it.

    Returns
    -------
    gap : (P, L) ndarray, m
        ``inner_diameter[:, i] - outer_diameter[:, i-1]`` (> 0 gap, < 0 overlap); NaN for
        slot 0 and where either slot is absent.
    flags : (P, L) ndarray of int32
        ``LayerFlag.GAP_BELOW`` / ``LayerFlag.OVERLAP_BELOW`` on the outer layer ``i``.
    """
    outer = as_float(outer_diameter)
    inner = as_float(inner_diameter)
    mask = as_bool(present)
    gap = np.full(outer.shape, np.nan)
    flags = np.zeros(outer.shape, dtype=np.int32)
    # The loop runs over layer slots (a handful), never over parts.
    with np.errstate(invalid="ignore"):
        for i in range(1, outer.shape[1]):
            both = mask[:, i] & mask[:, i - 1]
            below = outer[:, i - 1]
            size = inner[:, i] - below
            tol = np.maximum(abs_tol, rel_tol * np.abs(below))
            gap[:, i] = np.where(both, size, np.nan)
            flags[:, i] = np.where(both & (size > tol), int(LayerFlag.GAP_BELOW), 0) | np.where(
                both & (size < -tol), int(LayerFlag.OVERLAP_BELOW), 0
            )
    return gap, flags
