"""Which allowable shear stress a material gives, by its rule — the one decision both front ends use.

A materials row (a book's table or a cell function's materials block) and `TWS_ALLOWABLE`'s
arguments go through `allowable_of`: it says the allowable, or why there is none, and the notes
on inputs the rule ignores or that contradict each other. A book writes the notes as warnings
beside the numbers; a cell, which cannot show both, refuses them.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from twistshare.engine.core import AllowableFlag, AllowableRule, allowable_flags, allowable_shear, is_steel

from ._words import RULE_FORMULAS

__all__ = ["AllowableDecision", "Note", "allowable_of", "CODE_RULE_FOR_STEEL"]

CODE_RULE_FOR_STEEL = (
    "the shafting code rule min(0.30·Sy, 0.18·Su) is a rule for steel shafting; give this material a "
    "row in the materials table with an allowable shear, or a rule (max shear, distortion energy) "
    "and a factor of safety"
)

_FLAG_WORDS = {
    AllowableFlag.FACTOR_OF_SAFETY_IGNORED: ("factor_of_safety", "the factor of safety is not used: the shafting "
                                             "code rule carries its own allowance (FS is not applied on top)"),
    AllowableFlag.KEYWAY_IGNORED: ("keyway", "the keyway is not used by this rule: the 0.75 keyway factor "
                                   "belongs to the shafting code rule; use Kt for a keyway's stress concentration"),
    AllowableFlag.ULTIMATE_BELOW_YIELD: ("ultimate_strength", "the ultimate strength is below the yield "
                                         "strength: check both values"),
    AllowableFlag.FACTOR_OF_SAFETY_BELOW_ONE: ("factor_of_safety", "the factor of safety is below 1"),
}


@dataclass(frozen=True)
class Note:
    """A doubt about one input of the allowable: the field it concerns, a code and the words."""

    field: str
    code: str
    message: str
    assumed: bool = False  # an assumption stated (a note), not a doubt about an input (a warning)


@dataclass(frozen=True)
class AllowableDecision:
    """The allowable a material gives (NaN where none), the rule used, why none, and the notes."""

    allowable: float
    rule: AllowableRule
    missing: str | None
    notes: tuple[Note, ...]


def allowable_of(name: str | None, rule: AllowableRule | None, allowable: float, yield_strength: float,
                 ultimate_strength: float, factor_of_safety: float, keyway: bool) -> AllowableDecision:
    """The allowable shear stress of a material by its rule.

    Parameters
    ----------
    name : str or None
        The material's name, for the words and the steel test (None: no name, no default rule).
    rule : AllowableRule or None
        The rule named; None where none is named (an allowable given means ``GIVEN``; else the
        shafting code rule for a steel, with a note).
    allowable : float, Pa
        The allowable given directly; NaN where none.
    yield_strength, ultimate_strength : float, Pa
        NaN where not given.
    factor_of_safety : float, 1
        NaN where not given (the theories then need one; the code rule ignores it).
    keyway : bool
        Only the shafting code rule applies a keyway factor.

    Returns
    -------
    AllowableDecision
    """
    who = f"material {name!r}: " if name else ""
    notes: list[Note] = []
    missing: str | None = None
    fs, sy, su = factor_of_safety, yield_strength, ultimate_strength
    if rule is None:
        if not math.isnan(allowable):
            rule = AllowableRule.GIVEN
        else:
            rule = AllowableRule.SHAFTING_CODE
            if name is None or not is_steel(name):
                return AllowableDecision(math.nan, rule,
                                         f"{who}no allowable shear and no rule given: {CODE_RULE_FOR_STEEL}", ())
            if not (math.isnan(sy) or math.isnan(su)):
                notes.append(Note("rule", "default-rule", f"{who}no allowable shear and no rule given; used the "
                                  "shafting code rule min(0.30·Sy, 0.18·Su) for steel shafting", assumed=True))
    if rule == AllowableRule.GIVEN:
        if math.isnan(allowable):
            missing = f"{who}rule 'given' but no allowable shear stress"
        for key, what, unused in (("factor_of_safety", "factor of safety", not math.isnan(fs)),
                                  ("keyway", "keyway", keyway)):
            if unused:
                notes.append(Note(key, "input-ignored", f"{who}the {what} is not used: the allowable shear is "
                                  "given directly (it should already include any factor of safety and keyway "
                                  "allowance)"))
        return AllowableDecision(allowable, rule, missing, tuple(notes))
    if rule in (AllowableRule.MAX_SHEAR, AllowableRule.DISTORTION_ENERGY) and math.isnan(fs):
        missing = f"{who}rule {RULE_FORMULAS[rule]} needs a factor of safety"
    need_su = rule == AllowableRule.SHAFTING_CODE
    absent = [words for words, value, needed in (("yield strength", sy, True), ("ultimate strength", su, need_su))
              if needed and math.isnan(value)]
    if absent:
        missing = missing or f"{who}rule {RULE_FORMULAS[rule]} needs the {' and the '.join(absent)}"
    value = math.nan
    if need_su and not math.isnan(fs):
        # Any factor of safety typed, 1 included: the rule carries its own allowance.
        ignored = _FLAG_WORDS[AllowableFlag.FACTOR_OF_SAFETY_IGNORED][1]
        notes.append(Note("factor_of_safety", "factor-of-safety-ignored", f"{who}{ignored}; leave it blank"))
        fs = math.nan
    if missing is None:
        fs_used = fs if not math.isnan(fs) else 1.0
        value = float(allowable_shear(rule, sy, su, fs_used, keyway))
        flags = AllowableFlag(int(allowable_flags(rule, sy, su, fs_used, keyway)))
        for flag, (key, words) in _FLAG_WORDS.items() if flags else ():
            if flag in flags and not (flag == AllowableFlag.FACTOR_OF_SAFETY_IGNORED and math.isnan(fs)):
                # (no FS typed: the default 1 is ours, nothing to tell)
                notes.append(Note(key, flag.name.lower().replace("_", "-"), f"{who}{words}"))
    if not math.isnan(allowable):
        notes.append(Note("allowable_shear", "input-ignored", f"{who}allowable shear given but rule "
                          f"{RULE_FORMULAS[rule]} chosen; the rule's value is used"))
    return AllowableDecision(value, rule, missing, tuple(notes))
