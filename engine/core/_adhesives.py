"""Built-in adhesive classes: a typical allowable average bond shear for a sleeve's bond.

Generic classes only (no product): a typical room-temperature shear strength from the test
named beside it, and the allowable **average** shear that a bond check may use, the strength
divided by :data:`ADHESIVE_DESIGN_FACTOR`. All figures are typical and recalled from memory,
not looked up: the adhesive maker's data for the product, the gap, the surfaces and the
service temperature replace them. The shear of a bonded joint peaks at the ends of the bond,
well above the average, and ageing, moisture and heat weaken every class here; the design
factor is meant to cover that in a preliminary check, not to replace a test. A preliminary
design aid: verify against the applicable codes and standards and have a qualified engineer
review.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType

from ._materials import normalise_name

__all__ = ["Adhesive", "ADHESIVE_DESIGN_FACTOR", "ADHESIVE_SOURCE", "adhesive_library",
           "find_adhesive"]

ADHESIVE_DESIGN_FACTOR = 3.0
"""Typical test strength over the allowable average shear of a bonded sleeve: a factor of
about 3 on the mean strength, for the peaks at the bond ends, scatter and ageing (common
practice, from memory)."""

ADHESIVE_SOURCE = ("typical, from memory: room-temperature shear strength of the class on "
                   "degreased steel, divided by a design factor of 3 (common practice, from "
                   "memory); use the maker's data for your product, gap and temperature")

_MPA = 1e6
_LAP = "single-lap shear test on steel (ISO 4587 / ASTM D1002 kind)"
_PIN = "pin-and-collar push-out test on steel (ISO 10123 kind)"


@dataclass(frozen=True)
class Adhesive:
    """A generic adhesive class and its typical figures, SI.

    Attributes
    ----------
    name : str
        Generic class name (no brand).
    typical_strength : float, Pa
        Typical room-temperature shear strength of the class in the test named by `test`.
    test : str
        The kind of test the strength is typical of.
    max_temperature : float, K
        Typical upper service temperature of the class.
    notes : str
        Where the class is used and what weakens it.
    source : str
        Where the figures come from (typical, from memory).
    """

    name: str
    typical_strength: float
    test: str
    max_temperature: float
    notes: str
    source: str = ADHESIVE_SOURCE

    def __post_init__(self) -> None:
        if not self.typical_strength > 0:
            raise ValueError(f"adhesive {self.name!r}: typical strength must be > 0: "
                             f"{self.typical_strength}")

    @property
    def allowable(self) -> float:
        """Allowable average bond shear, Pa: the typical strength over the design factor."""
        return self.typical_strength / ADHESIVE_DESIGN_FACTOR


_C = 273.15


def _entries() -> tuple[Adhesive, ...]:
    return (
        Adhesive("toughened epoxy", 30 * _MPA, _LAP, _C + 100,
                 "two-part toughened epoxy structural adhesive; fills gaps to about 0.5 mm; "
                 "loses strength above about 80-120 C"),
        Adhesive("high-strength anaerobic retaining compound", 25 * _MPA, _PIN, _C + 150,
                 "for close cylindrical fits (diametral clearance up to about 0.1-0.25 mm); "
                 "cures without air between metal surfaces"),
        Adhesive("medium-strength anaerobic retaining compound", 15 * _MPA, _PIN, _C + 150,
                 "as the high-strength grade, for parts meant to come apart again"),
        Adhesive("cyanoacrylate", 18 * _MPA, _LAP, _C + 80,
                 "instant adhesive for very thin bond lines (up to about 0.1 mm); poor against "
                 "peel, moisture and heat"),
    )


def adhesive_library() -> Mapping[str, Adhesive]:
    """The built-in adhesive classes, read-only, keyed by name.

    Returns
    -------
    Mapping[str, Adhesive]

    Examples
    --------
    >>> round(adhesive_library()["toughened epoxy"].allowable / 1e6, 1)
    10.0
    """
    return MappingProxyType({a.name: a for a in _entries()})


def find_adhesive(name: str) -> Adhesive | None:
    """An adhesive class by name, matched ignoring case and spacing; None if unknown.

    ``"epoxy"`` alone is not matched: the toughened class is named so the user knows which.
    """
    key = normalise_name(name)
    for adhesive in _entries():
        if normalise_name(adhesive.name) == key:
            return adhesive
    return None
