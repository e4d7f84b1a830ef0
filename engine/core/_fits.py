"""Interference fits: Lamé contact pressure, interference at temperature, slip and fit stresses.

Thick-walled cylinders (Lamé) in plane stress (open ends, no axial stress from the fit),
linear elastic, uniform temperature, no speed effects (a fast-turning sleeve loses some
pressure to its own centrifugal growth; not modelled). Diameters in m, moduli and stresses
in Pa. "Inner member" is the cylinder inside the interface, "outer member" the one around it.

The stress at the ends of a fitted length concentrates above these nominal values, and the
friction traction (at most ``mu * p``, where the torque is being passed) is not included in
the equivalent stress: both are for the designer's factor of safety. A preliminary design aid:
verify against the applicable codes and standards and have a qualified engineer review.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import ArrayLike

from ._arrays import as_float, scalar_out, valid_or_nan

__all__ = [
    "REFERENCE_TEMPERATURE",
    "FrictionGuide",
    "FRICTION_GUIDANCE",
    "FRICTION_GUIDANCE_SOURCE",
    "interference_at_temperature",
    "fit_pressure",
    "fit_hoop_stresses",
    "lame_stresses",
    "slip_torque",
    "slip_capacity",
    "fit_equivalent_stress",
    "combined_stress_capacity",
]

REFERENCE_TEMPERATURE = 293.15
"""Default temperature at which an interference is measured, K (20 °C, the standard reference
temperature of dimensional measurement, common practice)."""


@dataclass(frozen=True)
class FrictionGuide:
    """A typical range of the friction coefficient of a fitted interface.

    Attributes
    ----------
    surfaces : str
        The pairing and how the fit is made.
    low, high : float, 1
        The usual range.
    """

    surfaces: str
    low: float
    high: float

    @property
    def for_slip(self) -> float:
        """The value to check slip with: the low end of the range (the cautious side)."""
        return self.low


FRICTION_GUIDANCE: tuple[FrictionGuide, ...] = (
    FrictionGuide("steel on steel, press fit, oiled", 0.06, 0.10),
    FrictionGuide("steel on steel, press fit, dry", 0.10, 0.15),
    FrictionGuide("steel on steel, shrink fit, dry and degreased", 0.14, 0.20),
    FrictionGuide("steel on cast iron, dry", 0.10, 0.15),
    FrictionGuide("steel on bronze or brass, dry", 0.07, 0.12),
    FrictionGuide("steel on aluminium alloy, dry", 0.07, 0.10),
)
"""Typical friction coefficients of fits (common practice, from memory). Read-only. Check slip
with :attr:`FrictionGuide.for_slip`, the low end; surface finish, plating and fretting move
these values, so confirm by test where slip governs."""
FRICTION_GUIDANCE_SOURCE = "common practice, from memory; confirm by test for a critical fit"


# Comparisons only (NaN compares false, and each value is also bounded below): as exact as
# np.isfinite, and several times cheaper on the numpy scalars of a one-cell call.
def _fit_geometry_ok(bore: Any, fit: Any, outer: Any) -> Any:
    return (bore >= 0) & (bore < fit) & (fit < outer) & (outer < np.inf)


def _material_ok(youngs: Any, poisson: Any) -> Any:
    return (youngs > 0) & (youngs < np.inf) & (poisson > -1.0) & (poisson <= 0.5)


def interference_at_temperature(
    interference: ArrayLike,
    fit_diameter: ArrayLike,
    expansion_inner: ArrayLike,
    expansion_outer: ArrayLike,
    operating_temperature: ArrayLike = np.nan,
    reference_temperature: ArrayLike = REFERENCE_TEMPERATURE,
) -> Any:
    """Diametral interference at the operating temperature.

    ``delta(T) = delta + (alpha_i - alpha_o) * (T_op - T_ref) * d``. Sign convention:
    ``delta > 0`` is interference (the inner member's free diameter exceeds the outer
    member's free bore), ``delta < 0`` clearance. Heating (``T_op > T_ref``) with an outer
    member that expands more (``alpha_o > alpha_i``, a bronze sleeve on steel) reduces the
    interference: each free diameter grows by ``alpha * dT * d``, and the interference is
    the inner one less the outer one.

    Parameters
    ----------
    interference : array_like, m
        Diametral interference measured at ``reference_temperature`` (the temperature of
        measurement, not the heating temperature of a shrink fit).
    fit_diameter : array_like, m
    expansion_inner, expansion_outer : array_like, 1/K
        Linear expansion coefficients of the two members.
    operating_temperature : array_like, K
        NaN (the default) means the reference temperature: no change, and the expansion
        coefficients are not needed.
    reference_temperature : array_like, K
        Only the difference of the two temperatures matters.

    Returns
    -------
    ndarray or scalar, m
        NaN where an operating temperature is given and an expansion coefficient is not.

    Examples
    --------
    >>> round(float(interference_at_temperature(50e-6, 0.05, 11.5e-6, 18e-6, 373.15)) * 1e6, 2)
    24.0
    """
    delta = as_float(interference)
    change = (as_float(expansion_inner) - as_float(expansion_outer)) * (
        as_float(operating_temperature) - as_float(reference_temperature)
    ) * as_float(fit_diameter)
    result = np.where(np.isnan(as_float(operating_temperature)), delta, delta + change)
    return scalar_out(np.asarray(result, dtype=np.float64))


def fit_pressure(
    interference: ArrayLike,
    fit_diameter: ArrayLike,
    inner_bore: ArrayLike,
    outer_diameter: ArrayLike,
    youngs_inner: ArrayLike,
    poisson_inner: ArrayLike,
    youngs_outer: ArrayLike,
    poisson_outer: ArrayLike,
) -> Any:
    """Contact pressure of an interference fit of two cylinders of different materials (Lamé).

    ``p = delta / (d [ (1/E_o)((d_o^2 + d^2)/(d_o^2 - d^2) + nu_o)
    + (1/E_i)((d^2 + d_i^2)/(d^2 - d_i^2) - nu_i) ])``.

    Parameters
    ----------
    interference : array_like, m
        Diametral interference (at the temperature wanted, see
        :func:`interference_at_temperature`). ``<= 0`` means no contact: ``p = 0``.
    fit_diameter : array_like, m
        Nominal diameter of the interface.
    inner_bore : array_like, m
        Bore of the inner member; 0 for a solid one.
    outer_diameter : array_like, m
        Outer diameter of the outer member.
    youngs_inner, poisson_inner : array_like, Pa and 1
    youngs_outer, poisson_outer : array_like, Pa and 1

    Returns
    -------
    ndarray or scalar, Pa
        NaN where the interference is NaN or an input is out of range (the diameters must
        satisfy ``0 <= d_i < d < d_o``, E > 0, nu in (-1, 0.5]).

    Notes
    -----
    This is the two-cylinder solution: with several fits or more layers in one part, the
    layers around and inside change each other's pressure; :func:`stack_fit_pressures`
    solves the whole stack.

    Examples
    --------
    >>> round(float(fit_pressure(40e-6, 0.05, 0.0, 0.08, 207e9, 0.292, 207e9, 0.292)) / 1e6, 2)
    50.46
    """
    delta, d, di, do = (as_float(v) for v in (interference, fit_diameter, inner_bore,
                                               outer_diameter))
    ei, nui, eo, nuo = (as_float(v) for v in (youngs_inner, poisson_inner, youngs_outer,
                                               poisson_outer))
    with np.errstate(divide="ignore", invalid="ignore"):
        d2, di2, do2 = d * d, di * di, do * do
        compliance = d * (
            ((do2 + d2) / (do2 - d2) + nuo) / eo + ((d2 + di2) / (d2 - di2) - nui) / ei
        )
        pressure = np.maximum(delta, 0.0) / compliance
        ok = _fit_geometry_ok(di, d, do) & _material_ok(ei, nui) & _material_ok(eo, nuo)
    return valid_or_nan(ok & (delta == delta), pressure)  # delta == delta: not NaN


def fit_hoop_stresses(
    pressure: ArrayLike, fit_diameter: ArrayLike, inner_bore: ArrayLike, outer_diameter: ArrayLike
) -> tuple[Any, Any]:
    """Hoop stresses either side of a fitted interface; the radial stress there is ``-p``.

    Outer member's bore: ``p (d_o^2 + d^2)/(d_o^2 - d^2)`` (tension); inner member's
    surface: ``-p (d^2 + d_i^2)/(d^2 - d_i^2)`` (compression; ``-p`` for a solid member).

    Parameters
    ----------
    pressure : array_like, Pa
    fit_diameter, inner_bore, outer_diameter : array_like, m

    Returns
    -------
    outer_bore_hoop, inner_surface_hoop : ndarray or scalar, Pa
    """
    p, d, di, do = (as_float(v) for v in (pressure, fit_diameter, inner_bore, outer_diameter))
    with np.errstate(divide="ignore", invalid="ignore"):
        d2 = d * d
        outer = p * (do * do + d2) / (do * do - d2)
        inner = -p * (d2 + di * di) / (d2 - di * di)
    return scalar_out(outer), scalar_out(inner)


def lame_stresses(
    radius: ArrayLike,
    inner_diameter: ArrayLike,
    outer_diameter: ArrayLike,
    inner_pressure: ArrayLike,
    outer_pressure: ArrayLike,
) -> tuple[Any, Any]:
    """Radial and hoop stress at a radius of a thick cylinder under two pressures (Lamé).

    ``sigma_r = A - B/r^2``, ``sigma_t = A + B/r^2`` with
    ``A = (p_i a^2 - p_o b^2)/(b^2 - a^2)``, ``B = (p_i - p_o) a^2 b^2 / (b^2 - a^2)``,
    ``a``, ``b`` the inner and outer radii. A solid cylinder (``a = 0``) is in uniform
    ``sigma_r = sigma_t = -p_o``.

    Parameters
    ----------
    radius : array_like, m
    inner_diameter, outer_diameter : array_like, m
    inner_pressure, outer_pressure : array_like, Pa
        Compressive pressures on the bore and on the outer surface.

    Returns
    -------
    radial, hoop : ndarray or scalar, Pa
    """
    r, a, b = (as_float(v) / f for v, f in ((radius, 1.0), (inner_diameter, 2.0),
                                            (outer_diameter, 2.0)))
    pi, po = as_float(inner_pressure), as_float(outer_pressure)
    with np.errstate(divide="ignore", invalid="ignore"):
        a2, b2 = a * a, b * b
        first = (pi * a2 - po * b2) / (b2 - a2)
        second = np.where(a2 > 0, (pi - po) * a2 * b2 / ((b2 - a2) * r * r), 0.0)
    return scalar_out(first - second), scalar_out(first + second)


def slip_torque(
    pressure: ArrayLike, friction: ArrayLike, fit_diameter: ArrayLike, fit_length: ArrayLike
) -> Any:
    """Torque a fitted interface passes before it slips, ``(pi/2) mu p d^2 L_fit``.

    Parameters
    ----------
    pressure : array_like, Pa
    friction : array_like, 1
        Friction coefficient (see :data:`FRICTION_GUIDANCE`).
    fit_diameter : array_like, m
    fit_length : array_like, m
        The length over which the interface torque is passed in one direction. Where the
        torque goes in and out through the same layer (:class:`LoadPath` through the core
        or the outer layer) the carried layer picks its torque up near one end and hands it
        back near the other, so use half the fitted length there.

    Returns
    -------
    ndarray or scalar, N*m

    Examples
    --------
    >>> round(float(slip_torque(50e6, 0.12, 0.05, 0.04)), 1)
    942.5
    """
    p, mu, d, length = (as_float(v) for v in (pressure, friction, fit_diameter, fit_length))
    return scalar_out(0.5 * np.pi * mu * p * d * d * length)


def slip_capacity(slip_torque: ArrayLike, interface_share: ArrayLike) -> Any:
    """Section torque at which an interface slips, ``T_slip / |interface_share|``.

    Parameters
    ----------
    slip_torque : array_like, N*m
    interface_share : array_like, 1
        Torque the interface passes per unit section torque (:func:`interface_share`).

    Returns
    -------
    ndarray or scalar, N*m
        Infinite where the interface passes no torque (every layer driven at its ends),
        even if it has no grip; NaN where either input is NaN.
    """
    grip = as_float(slip_torque)
    share = np.abs(as_float(interface_share))
    with np.errstate(divide="ignore", invalid="ignore"):
        result = np.where(share == 0, np.inf, grip / share)
    return scalar_out(np.where(np.isnan(grip) | np.isnan(share), np.nan, result))


def fit_equivalent_stress(hoop: ArrayLike, radial: ArrayLike, shear: ArrayLike) -> Any:
    """Distortion-energy (von Mises) stress of the fit stresses with the torsional shear.

    ``sigma_vm = sqrt(sigma_t^2 + sigma_r^2 - sigma_t sigma_r + 3 tau^2)``: the general von
    Mises form with no axial stress (plane stress, open-ended cylinders) and the torsional
    shear ``tau = tau_tz`` (hoop-axial plane) as the only shear component; the fit's
    principal stresses are radial and hoop. The friction traction ``tau_rt`` is left out
    (module notes).

    Parameters
    ----------
    hoop, radial, shear : array_like, Pa

    Returns
    -------
    ndarray or scalar, Pa

    Examples
    --------
    >>> float(fit_equivalent_stress(0.0, 0.0, 100.0)) == float(np.sqrt(3.0) * 100.0)
    True
    """
    t, r, s = as_float(hoop), as_float(radial), as_float(shear)
    return scalar_out(np.sqrt(t * t + r * r - t * r + 3.0 * s * s))


def combined_stress_capacity(
    hoop: ArrayLike,
    radial: ArrayLike,
    shear_per_torque: ArrayLike,
    yield_strength: ArrayLike,
    factor_of_safety: ArrayLike = 1.0,
) -> Any:
    """Section torque at which the fit stresses plus torsion reach ``S_y / FS`` at a point.

    Solves ``sigma_t^2 + sigma_r^2 - sigma_t sigma_r + 3 (c T)^2 = (S_y/FS)^2`` for ``T``,
    with ``c = tau / T`` the torsional shear per unit section torque at the point
    (``G r / sum(G J)``).

    Parameters
    ----------
    hoop, radial : array_like, Pa
        The fit's stresses at the point.
    shear_per_torque : array_like, Pa/(N*m)
    yield_strength : array_like, Pa
    factor_of_safety : array_like, 1

    Returns
    -------
    ndarray or scalar, N*m
        0 where the fit alone already reaches ``S_y / FS``; NaN where the yield strength or
        the factor of safety is not a positive number.
    """
    t, r = as_float(hoop), as_float(radial)
    c = np.abs(as_float(shear_per_torque))
    sy, fs = as_float(yield_strength), as_float(factor_of_safety)
    with np.errstate(divide="ignore", invalid="ignore"):
        limit = sy / fs
        room = limit * limit - (t * t + r * r - t * r)
        # c = 0 (the axis) carries no torsional shear: infinite unless the fit alone yields.
        result = np.where(room > 0, np.sqrt(room / 3.0) / c, 0.0)
        ok = (sy > 0) & (fs > 0) & np.isfinite(sy) & np.isfinite(fs)
    return scalar_out(np.where(ok & ~np.isnan(room), result, np.nan))
