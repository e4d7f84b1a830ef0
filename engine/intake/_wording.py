"""Words every output shares: the caution, what governs, and values shown in a unit system.

Defined once; the result sheets, the summary, the warnings, the sample books, `TWS_GOVERNS` and
README all use these, so the same limit is never called three things.
"""

from __future__ import annotations

from collections.abc import Mapping
from types import MappingProxyType

from twistshare.engine.core import Criterion, SizingStatus, StockStatus
from twistshare.engine.units import display_unit, si_factor

__all__ = ["CAUTION_LINES", "METHOD_LINE", "CRITERION_WORDS", "CRITERION_NOUNS", "BOND_CAUTION", "governs_text",
           "Display", "SIZING_STATUS_WORDS", "STOCK_STATUS_WORDS", "SIZING_CAUTION"]

#: The caution every output carries, one sentence a line.
CAUTION_LINES: tuple[str, ...] = (
    "twistshare is a preliminary design aid; its results are not a design approval.",
    "Verify every result against the applicable codes and standards for the machine and its duty.",
    "Have a qualified engineer review the inputs, the method and the results before use.",
    "Local codes and licensed engineering practice prevail over anything this workbook shows.",
)

#: What the rating covers, beside the caution.
METHOD_LINE = ("Method: layers twist as one (full connection along the length), elastic stress only, "
               "static torque; static bending, axial force, whirl, thin-wall buckling, fits and bonds where "
               "their inputs are given; fatigue is not checked here.")

#: What governs, as results, the summary and ``TWS_GOVERNS`` write it; ``{layer}`` is 1-based.
CRITERION_WORDS: Mapping[Criterion, str] = MappingProxyType({
    Criterion.LAYER_STRESS: "layer {layer} stress",
    Criterion.TWIST_ANGLE: "twist angle limit",
    Criterion.TWIST_PER_LENGTH: "twist per length limit",
    Criterion.COMBINED_STRESS: "layer {layer} combined stress (bending held at its given value)",
    Criterion.WHIRL: "whirl: speed above 70 % of the first critical",
    Criterion.TORSIONAL_BUCKLING: "torsional buckling of the wall",
    # {inner} and {layer}: the two layers of the interface, inner and outer member
    Criterion.INTERFACE_SLIP: "slip of the fit between layers {inner} and {layer}",
    Criterion.BOND_SHEAR: "average bond shear between layers {inner} and {layer}",
    Criterion.FIT_STRESS: "layer {layer} fit and torsion stress",
})

#: The criterion as a noun, for counts ("governed by a layer's shear stress: 31 parts").
CRITERION_NOUNS: Mapping[Criterion, str] = MappingProxyType({
    Criterion.LAYER_STRESS: "a layer's shear stress",
    Criterion.TWIST_ANGLE: "twist angle limit",
    Criterion.TWIST_PER_LENGTH: "twist per length limit",
    Criterion.COMBINED_STRESS: "a layer's combined stress, bending held fixed",
    Criterion.WHIRL: "whirl gate (0: too close to the first critical)",
    Criterion.TORSIONAL_BUCKLING: "torsional buckling",
    Criterion.INTERFACE_SLIP: "slip of a fit",
    Criterion.BOND_SHEAR: "average bond shear",
    Criterion.FIT_STRESS: "a layer's fit and torsion stress",
})

#: The caution on the bond criterion, where a bond is rated.
BOND_CAUTION = ("the bond is rated by its average shear T/(2π·r²·L); the shear peaks at the ends "
                "of the bond well above the average, so the allowable must be one meant for the "
                "average over a joint of this kind (the adhesive maker's data), not the peak")


#: The outcome of sizing a part, as the sizing sheet, the summary and the cell functions write it.
SIZING_STATUS_WORDS: Mapping[SizingStatus, str] = MappingProxyType({
    SizingStatus.SOLVED: "solved",
    SizingStatus.HOLDS_AT_LEAST: ("holds already with the least material tried (smallest diameter or wall, "
                                  "largest bore)"),
    SizingStatus.SHORT_AT_MOST: "no size in the range holds",
    SizingStatus.NOT_MONOTONE: "capacity falls as material is added: rate the sizes around it",
    SizingStatus.NOT_RATED: "a size tried could not be rated",
    SizingStatus.NOT_APPLICABLE: "the part has no such dimension",
    SizingStatus.BAD_INPUT: "nothing to size for (no torque, or no range to search)",
})

#: The outcome of rounding a sized part up to a stock size.
STOCK_STATUS_WORDS: Mapping[StockStatus, str] = MappingProxyType({
    StockStatus.FOUND: "stock size found",
    StockStatus.NONE_HOLDS: "no stock size listed holds",
    StockStatus.NOT_RATED: "a stock size tried could not be rated",
    StockStatus.NOT_APPLICABLE: "no stock size to choose (nothing sized)",
})

#: Beside every sizing result.
SIZING_CAUTION = ("Sizing solves one dimension for the target reserve factor against the criteria rated "
                  "here only (layer stresses with Kt, twist limits); fits, bonds, fatigue and bending are "
                  "not in it. Re-rate the size chosen with its real tolerances before it is made.")


def governs_text(criterion: int, layer: int, material: str | None = None) -> str:
    """Short words for what governs: ``layer 2 stress (Stainless 316 annealed)``; ``""`` for none.

    Parameters
    ----------
    criterion : int
        A `Criterion`.
    layer : int
        The governing layer slot (0-based), -1 for a per-part criterion.
    material : str, optional
        The governing layer's material, shown in brackets.
    """
    c = Criterion(int(criterion))
    if c == Criterion.NONE:
        return ""
    text = CRITERION_WORDS[c].format(layer=layer + 1, inner=layer)
    if layer >= 0 and material:
        text += f" ({material})"
    return text


class Display:
    """Formats SI values in the unit system the results use (``"SI"`` or ``"US"``)."""

    def __init__(self, system: str) -> None:
        self.system = system
        self._cache: dict[str, tuple[str, float]] = {}

    def unit(self, kind: str) -> tuple[str, float]:
        """(unit text, its SI factor) for a kind."""
        got = self._cache.get(kind)
        if got is None:
            u = display_unit(kind, self.system)
            got = self._cache[kind] = (u, si_factor(u, kind) if u else 1.0)
        return got

    def __call__(self, value: float, kind: str, digits: int = 4) -> str:
        u, f = self.unit(kind)
        return f"{value / f:.{digits}g} {u}".strip()
