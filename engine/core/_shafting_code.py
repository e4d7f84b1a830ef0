"""The classic transmission-shafting code's combined equation for steel shafts.

For a solid or hollow steel shaft (bore ratio ``k = d / D``) under a bending moment ``M`` and
a torque ``T``, with combined shock and fatigue factors ``K_m`` on the bending moment and
``K_t`` on the torque, the code's allowable-stress form is

    tau_max = 16 / (pi D^3 (1 - k^4)) * sqrt((K_m M)^2 + (K_t T)^2),

held against the code's allowable shear stress, ``min(0.30 Sy, 0.18 Su)``, times 0.75 where
a keyway is cut (:func:`allowable_shear` with ``AllowableRule.SHAFTING_CODE``). The statement
of the code, with its table of shock and fatigue factors, is in Machinery's Handbook, section
on shafts (from memory). It is a single-material rule: for a compound shaft use
:func:`combined_stress`. The code's axial-load term (with its column factor) is not included.

Careful: ``K_t`` here is the code's shock and fatigue factor on torsion, not a
stress-concentration factor (the layer stack's ``stress_concentration``).

Preliminary design aid: verify against the applicable codes and standards and have a qualified
engineer review the design; local codes and licensed practice prevail.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import ArrayLike

from ._arrays import as_float, scalar_out

__all__ = [
    "ShockFatigueFactors",
    "SHAFTING_CODE_SHOCK_FATIGUE_FACTORS",
    "shafting_code_shear_stress",
    "shafting_code_capacity",
    "shafting_code_diameter",
]


@dataclass(frozen=True)
class ShockFatigueFactors:
    """One row of the shafting code's table of combined shock and fatigue factors.

    Parameters
    ----------
    duty : str
        How the shaft is loaded.
    bending_low, bending_high : float, 1
        Range of ``K_m`` (equal where the table gives one value).
    torsion_low, torsion_high : float, 1
        Range of ``K_t``.
    """

    duty: str
    bending_low: float
    bending_high: float
    torsion_low: float
    torsion_high: float


SHAFTING_CODE_SHOCK_FATIGUE_FACTORS: tuple[ShockFatigueFactors, ...] = (
    ShockFatigueFactors("stationary shaft, load gradually applied", 1.0, 1.0, 1.0, 1.0),
    ShockFatigueFactors("stationary shaft, load suddenly applied", 1.5, 2.0, 1.5, 2.0),
    ShockFatigueFactors("rotating shaft, load gradually applied or steady", 1.5, 1.5, 1.0, 1.0),
    ShockFatigueFactors("rotating shaft, load suddenly applied, minor shock", 1.5, 2.0, 1.0, 1.5),
    ShockFatigueFactors("rotating shaft, load suddenly applied, heavy shock", 2.0, 3.0, 1.5, 3.0),
)
"""Typical ``K_m`` and ``K_t`` of the shafting code (Machinery's Handbook, shafts; from memory).

Read-only. Typical values: the designer chooses within the range for the duty.
"""


def _section_factor(outer_diameter: ArrayLike, inner_diameter: ArrayLike) -> Any:
    outer = as_float(outer_diameter)
    inner = as_float(inner_diameter)
    # pi D^3 (1 - k^4) / 16 = pi (D^4 - d^4) / (16 D): the polar section modulus.
    return np.pi * (outer**4 - inner**4) / (16.0 * outer)


def shafting_code_shear_stress(
    moment: ArrayLike,
    torque: ArrayLike,
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike = 0.0,
    shock_fatigue_bending: ArrayLike = 1.0,
    shock_fatigue_torsion: ArrayLike = 1.0,
) -> Any:
    """The shafting code's combined equation: the maximum shear stress it assigns a shaft.

    ``tau_max = 16 / (pi D^3 (1 - k^4)) * sqrt((K_m M)^2 + (K_t T)^2)``, ``k = d / D``.

    Parameters
    ----------
    moment : array_like, N*m
        Resultant bending moment (magnitude).
    torque : array_like, N*m
    outer_diameter : array_like, m
    inner_diameter : array_like, m
        0 for a solid shaft.
    shock_fatigue_bending : array_like, 1
        ``K_m`` (see :data:`SHAFTING_CODE_SHOCK_FATIGUE_FACTORS`).
    shock_fatigue_torsion : array_like, 1
        ``K_t``.

    Returns
    -------
    ndarray or scalar, Pa
        To be held against the code's allowable shear stress.

    Examples
    --------
    >>> round(float(shafting_code_shear_stress(1000.0, 0.0, 0.05)) / 1e6, 2)  # 16 M / (pi D^3)
    40.74
    """
    bend = as_float(shock_fatigue_bending) * as_float(moment)
    twist = as_float(shock_fatigue_torsion) * as_float(torque)
    with np.errstate(divide="ignore", invalid="ignore"):
        result = np.hypot(bend, twist) / _section_factor(outer_diameter, inner_diameter)
    return scalar_out(result)


def shafting_code_capacity(
    allowable_shear: ArrayLike,
    moment: ArrayLike,
    outer_diameter: ArrayLike,
    inner_diameter: ArrayLike = 0.0,
    shock_fatigue_bending: ArrayLike = 1.0,
    shock_fatigue_torsion: ArrayLike = 1.0,
) -> Any:
    """Torque at which the code's combined equation reaches the allowable, bending held fixed.

    ``T = sqrt((tau_a Z_p)^2 - (K_m M)^2) / K_t`` with ``Z_p = pi D^3 (1 - k^4) / 16``.

    Parameters
    ----------
    allowable_shear : array_like, Pa
        The code's allowable (``allowable_shear`` with ``AllowableRule.SHAFTING_CODE``).
    moment : array_like, N*m
    outer_diameter : array_like, m
    inner_diameter : array_like, m
    shock_fatigue_bending : array_like, 1
    shock_fatigue_torsion : array_like, 1

    Returns
    -------
    ndarray or scalar, N*m
        0 where the bending term alone reaches the allowable.
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        strength = as_float(allowable_shear) * _section_factor(outer_diameter, inner_diameter)
        bend = as_float(shock_fatigue_bending) * np.abs(as_float(moment))
        room = np.sqrt(np.maximum(strength * strength - bend * bend, 0.0))
        result = room / as_float(shock_fatigue_torsion)
    return scalar_out(result)


def shafting_code_diameter(
    allowable_shear: ArrayLike,
    moment: ArrayLike,
    torque: ArrayLike,
    bore_ratio: ArrayLike = 0.0,
    shock_fatigue_bending: ArrayLike = 1.0,
    shock_fatigue_torsion: ArrayLike = 1.0,
) -> Any:
    """Smallest outer diameter the code's combined equation allows, at a given bore ratio.

    ``D = (16 / (pi tau_a (1 - k^4)) * sqrt((K_m M)^2 + (K_t T)^2))^(1/3)``.

    Parameters
    ----------
    allowable_shear : array_like, Pa
    moment : array_like, N*m
    torque : array_like, N*m
    bore_ratio : array_like, 1
        ``k = d / D`` in [0, 1); NaN outside it.
    shock_fatigue_bending : array_like, 1
    shock_fatigue_torsion : array_like, 1

    Returns
    -------
    ndarray or scalar, m
    """
    ratio = as_float(bore_ratio)
    bend = as_float(shock_fatigue_bending) * as_float(moment)
    twist = as_float(shock_fatigue_torsion) * as_float(torque)
    with np.errstate(divide="ignore", invalid="ignore"):
        cube = 16.0 * np.hypot(bend, twist) / (np.pi * as_float(allowable_shear) * (1.0 - ratio**4))
        result = np.where((ratio >= 0) & (ratio < 1), np.cbrt(cube), np.nan)
    return scalar_out(result)
