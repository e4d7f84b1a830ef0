"""Why an allowable by rule cannot be shown as a number: the engine's flags, worded for a cell.

The core (`allowable_flags`) reports errors, which leave the allowable NaN, and notes (an FS or
a keyway the rule ignores, FS below 1, Su below Sy), which leave a number. A cell cannot show
a number and a warning together, so the cell functions refuse both kinds with one sentence.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from types import MappingProxyType

from twistshare.engine.core import is_steel  # noqa: F401 - re-exported for the block reader
from twistshare.engine.core import (
    AllowableFlag,
    AllowableRule,
    allowable_flags,
    describe,
    split_flags,
)

__all__ = ["RULE_WORDS", "allowable_refusal", "is_steel", "FACTOR_IGNORED_BY_CODE"]

RULE_WORDS: Mapping[AllowableRule, str] = MappingProxyType(
    {
        AllowableRule.GIVEN: "given",
        AllowableRule.MAX_SHEAR: "max shear",
        AllowableRule.DISTORTION_ENERGY: "distortion energy",
        AllowableRule.SHAFTING_CODE: "shafting code",
    }
)

FACTOR_IGNORED_BY_CODE = (
    "factor of safety is not used by the shafting code rule (it carries its own allowance); "
    "leave it blank"
)

# The same words as the workbook bridge's rule: the transmission-shafting code rule was
# written for steel shafting (common practice).


def _stress(value: float) -> str:
    return f"{value / 1e6:g} MPa"


def allowable_refusal(rule: AllowableRule, yield_strength: float, ultimate_strength: float,
                      factor_of_safety: float, keyway: bool, *, factor_typed: bool) -> str | None:
    """The sentence that refuses these inputs for `rule`, or None if the allowable stands.

    Parameters
    ----------
    rule : AllowableRule
        Not ``GIVEN`` (nothing to compute).
    yield_strength, ultimate_strength : float, Pa
        NaN where not given.
    factor_of_safety : float, 1
        NaN where not given.
    keyway : bool
    factor_typed : bool
        A factor of safety was typed (the shafting code rule refuses any, 1 included, as
        `TWS_ALLOWABLE` does: the rule carries its own allowance).

    Returns
    -------
    str or None
        A sentence naming the input and the rule.
    """
    words = RULE_WORDS[rule]
    shafting = rule == AllowableRule.SHAFTING_CODE
    if shafting and factor_typed:
        return FACTOR_IGNORED_BY_CODE
    flags = AllowableFlag(int(allowable_flags(
        int(rule), yield_strength, ultimate_strength,
        math.nan if shafting else factor_of_safety, keyway)))
    if AllowableFlag.KEYWAY_IGNORED in flags:
        return (f"keyway is not used by the {words} rule (the ×0.75 keyway factor belongs to "
                "the shafting code rule); leave it blank and give the keyway's Kt instead")
    if AllowableFlag.YIELD_NOT_POSITIVE in flags:
        if math.isnan(yield_strength):
            return f"the {words} rule needs the yield strength"
        return f"yield strength must be greater than zero; got {_stress(yield_strength)}"
    if AllowableFlag.ULTIMATE_NOT_POSITIVE in flags:
        if math.isnan(ultimate_strength):
            return "the shafting code rule needs the ultimate strength"
        return f"ultimate strength must be greater than zero; got {_stress(ultimate_strength)}"
    if AllowableFlag.FACTOR_OF_SAFETY_NOT_POSITIVE in flags:
        if math.isnan(factor_of_safety):
            return (f"the {words} rule needs a factor of safety (1 gives the shear yield "
                    "strength itself)")
        return f"factor of safety must be greater than zero; got {factor_of_safety:g}"
    if AllowableFlag.FACTOR_OF_SAFETY_BELOW_ONE in flags:
        return (f"factor of safety {factor_of_safety:g} is below 1: the {words} allowable "
                "would exceed the shear yield strength; give 1 or more")
    if AllowableFlag.ULTIMATE_BELOW_YIELD in flags:
        return (f"ultimate strength {_stress(ultimate_strength)} is below the yield strength "
                f"{_stress(yield_strength)}: check both values")
    if flags:
        # A flag added to the core later: refuse rather than show a number it questions.
        return describe(split_flags(int(flags), AllowableFlag)[0])
    return None
