"""Plausible ranges for inputs, in SI: a value outside is a typing slip until shown otherwise.

The ranges are common practice for shafts and sleeves in machinery and drive lines (not taken
from a standard). They are wide on purpose: they catch a unit slip (G typed in MPa where GPa is
declared, a diameter in micrometres) rather than judge a design. A value outside its range stops
that part from being rated; the comment says what was found and the range expected.
"""

from __future__ import annotations

from types import MappingProxyType

__all__ = ["PLAUSIBLE", "plausible_range"]

# key -> (low, high, unit shown in the message, SI factor of that unit)
PLAUSIBLE = MappingProxyType({
    "shear_modulus": (0.1e9, 200e9, "GPa", 1e9),
    "youngs_modulus": (0.3e9, 500e9, "GPa", 1e9),
    # up to 1: the in-plane ratio of a ±45° laminate is about 0.77; for an isotropic material the
    # bridge refuses a G derived from a ratio above 0.5
    "poisson_ratio": (0.0, 1.0, "", 1.0),
    "allowable_shear": (0.5e6, 2000e6, "MPa", 1e6),
    "yield_strength": (1e6, 3000e6, "MPa", 1e6),
    "ultimate_strength": (1e6, 4000e6, "MPa", 1e6),
    "factor_of_safety": (1.0, 20.0, "", 1.0),
    "density": (500.0, 25000.0, "kg/m³", 1.0),
    "length": (1e-3, 200.0, "mm", 1e-3),
    "outer_diameter": (0.1e-3, 5.0, "mm", 1e-3),
    "inner_diameter": (0.0, 5.0, "mm", 1e-3),
    "kt": (1.0, 10.0, "", 1.0),
    "torque": (0.0, 50e6, "N·m", 1.0),
    "power": (0.0, 200e6, "kW", 1e3),
    "speed": (0.1 * 2 * 3.141592653589793 / 60, 200_000 * 2 * 3.141592653589793 / 60, "rpm",
              2 * 3.141592653589793 / 60),
    "service_factor": (1.0, 5.0, "", 1.0),
    "twist_limit_angle": (1e-5, 3.141592653589793, "deg", 3.141592653589793 / 180),
    "twist_limit_per_length": (1e-6, 3.141592653589793, "deg/m", 3.141592653589793 / 180),
})


def plausible_range(key: str) -> tuple[float, float, str, float] | None:
    """The (low, high, unit, factor) for an input key, or None if any value is accepted."""
    return PLAUSIBLE.get(key)
