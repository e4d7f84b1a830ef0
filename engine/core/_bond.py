"""Bonded interfaces: the average shear stress in the adhesive and the torque it allows.

The average bond shear over a bonded length is ``tau_b = T_pass / (2 pi r^2 L_bond)`` with
``r`` the bond radius. **The real shear is not uniform**: the adhesive takes the torque
mostly near the ends of the bond, where it peaks well above this average, and the longer
the bond compared with the adhesive's load-transfer length the more the average flatters
the joint. Check against an allowable from tests of a joint like the real one (same
adherends, gap and bond length), or give the allowable a knock-down for the peak. No
shear-lag model is applied here. A preliminary design aid: verify against the applicable
codes and standards and have a qualified engineer review.
"""

from __future__ import annotations

from typing import Any

import numpy as np
from numpy.typing import ArrayLike

from ._arrays import as_float, scalar_out, valid_or_nan

__all__ = ["bond_shear", "bond_torque_capacity", "bond_capacity", "bond_inputs_ok"]


def bond_inputs_ok(bond_diameter: ArrayLike, bond_length: ArrayLike,
                   allowable_shear: ArrayLike = 1.0) -> Any:
    """True where the bond's diameter, length and allowable are positive finite numbers.

    Parameters
    ----------
    bond_diameter : array_like, m
    bond_length : array_like, m
    allowable_shear : array_like, Pa

    Returns
    -------
    ndarray or scalar of bool
    """
    d, length, tau = (as_float(v) for v in (bond_diameter, bond_length, allowable_shear))
    with np.errstate(invalid="ignore"):
        ok = (np.isfinite(d) & (d > 0) & np.isfinite(length) & (length > 0)
              & np.isfinite(tau) & (tau > 0))
    return scalar_out(np.asarray(ok))


def bond_shear(interface_torque: ArrayLike, bond_diameter: ArrayLike,
               bond_length: ArrayLike) -> Any:
    """Average shear stress in a bond passing a torque, ``|T_pass| / (2 pi r^2 L_bond)``.

    Parameters
    ----------
    interface_torque : array_like, N*m
        Torque the interface passes (:func:`interface_torque`).
    bond_diameter : array_like, m
        Diameter of the bonded interface (``r = d / 2``).
    bond_length : array_like, m
        The length over which the torque passes in one direction. Where the torque goes in
        and out through the same layer (through the core, or the outer layer), the carried
        layer takes its torque up near one end and gives it back near the other: use half
        the bonded length there.

    Returns
    -------
    ndarray or scalar, Pa
        The **average**; the peak at the bond ends is higher (module notes). NaN where the
        diameter or length is not a positive number.

    Examples
    --------
    >>> round(float(bond_shear(500.0, 0.05, 0.04)) / 1e6, 3)
    3.183
    """
    torque = np.abs(as_float(interface_torque))
    d, length = as_float(bond_diameter), as_float(bond_length)
    with np.errstate(divide="ignore", invalid="ignore"):
        result = torque / (0.5 * np.pi * d * d * length)
    return valid_or_nan(bond_inputs_ok(d, length), result)


def bond_torque_capacity(allowable_shear: ArrayLike, bond_diameter: ArrayLike,
                         bond_length: ArrayLike) -> Any:
    """Torque a bond may pass at its allowable average shear, ``tau_a 2 pi r^2 L_bond``.

    Parameters
    ----------
    allowable_shear : array_like, Pa
        Allowable **average** bond shear (module notes on the end peaks).
    bond_diameter : array_like, m
    bond_length : array_like, m
        As in :func:`bond_shear`.

    Returns
    -------
    ndarray or scalar, N*m
        NaN where an input is not a positive number.
    """
    tau, d, length = (as_float(v) for v in (allowable_shear, bond_diameter, bond_length))
    result = tau * 0.5 * np.pi * d * d * length
    return valid_or_nan(bond_inputs_ok(d, length, tau), result)


def bond_capacity(allowable_shear: ArrayLike, bond_diameter: ArrayLike, bond_length: ArrayLike,
                  interface_share: ArrayLike) -> Any:
    """Section torque at which a bond's average shear reaches its allowable.

    ``T = tau_a 2 pi r^2 L_bond / |interface_share|``.

    Parameters
    ----------
    allowable_shear : array_like, Pa
    bond_diameter : array_like, m
    bond_length : array_like, m
    interface_share : array_like, 1
        Torque the interface passes per unit section torque (:func:`interface_share`).

    Returns
    -------
    ndarray or scalar, N*m
        Infinite where the interface passes no torque; NaN where an input is NaN or not a
        positive number.

    Examples
    --------
    >>> round(float(bond_capacity(10e6, 0.05, 0.04, 0.25)), 1)
    6283.2
    """
    own = as_float(bond_torque_capacity(allowable_shear, bond_diameter, bond_length))
    share = np.abs(as_float(interface_share))
    with np.errstate(divide="ignore", invalid="ignore"):
        result = np.where(share == 0, np.inf, own / share)
    return scalar_out(np.where(np.isnan(own) | np.isnan(share), np.nan, result))
