"""Enumerations that travel with results: what governs a rating, and how an allowable was set."""

from __future__ import annotations

from enum import IntEnum

__all__ = ["Criterion", "AllowableRule"]


class Criterion(IntEnum):
    """The limit that governs a part's rating.

    Stored in results as ``int8``. Later criteria (interface slip, bond shear, ...) append
    new values; existing values never change meaning.
    """

    NONE = 0
    """The part could not be rated (see its diagnosis flags)."""
    LAYER_STRESS = 1
    """A layer reaches its allowable shear stress; the governing layer says which."""
    TWIST_ANGLE = 2
    """The total twist over the length reaches its limit."""
    TWIST_PER_LENGTH = 3
    """The twist per unit length reaches its limit."""
    COMBINED_STRESS = 4
    """A layer's combined bending (and axial) and torsional stress reaches its allowable,
    the bending held at its given value; the governing layer says which."""
    WHIRL = 5
    """The operating speed is above the allowed fraction of the first bending critical speed
    (a gate: capacity 0 when it fails, +inf when it passes)."""
    TORSIONAL_BUCKLING = 6
    """The thin wall buckles in torsion (over its factor of safety)."""
    INTERFACE_SLIP = 7
    """A fitted interface slips; the governing layer is the outer member of the interface."""
    BOND_SHEAR = 8
    """A bond's average shear reaches its allowable; the layer is the bond's outer member."""
    FIT_STRESS = 9
    """A layer of a fitted part reaches ``S_y / FS`` under the fit's stresses and torsion."""


class AllowableRule(IntEnum):
    """How a layer's allowable shear stress is obtained from its material."""

    GIVEN = 0
    """The allowable shear stress is given directly."""
    MAX_SHEAR = 1
    """Maximum-shear-stress (Tresca) theory: ``0.5 * Sy / FS``."""
    DISTORTION_ENERGY = 2
    """Distortion-energy (von Mises) theory: ``Sy / (sqrt(3) * FS)``."""
    SHAFTING_CODE = 3
    """Transmission-shafting code rule: ``min(0.30 Sy, 0.18 Su)``, x0.75 with a keyway.

    The rule embeds its own safety allowance, so no factor of safety is applied on top.
    """
