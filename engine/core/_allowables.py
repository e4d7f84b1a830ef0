"""Allowable shear stress from material strength, by the rule chosen for each material."""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ._arrays import as_bool, as_float, scalar_out
from ._criteria import AllowableRule
from ._diagnoses import AllowableFlag

__all__ = [
    "allowable_shear",
    "allowable_flags",
    "MAX_SHEAR_FACTOR",
    "DISTORTION_ENERGY_FACTOR",
    "SHAFTING_CODE_YIELD_FACTOR",
    "SHAFTING_CODE_ULTIMATE_FACTOR",
    "SHAFTING_CODE_KEYWAY_FACTOR",
]

MAX_SHEAR_FACTOR = 0.5
"""Shear yield over tensile yield, maximum-shear-stress (Tresca) theory."""
DISTORTION_ENERGY_FACTOR = 1.0 / np.sqrt(3.0)
"""Shear yield over tensile yield, distortion-energy (von Mises) theory (0.577)."""
SHAFTING_CODE_YIELD_FACTOR = 0.30
SHAFTING_CODE_ULTIMATE_FACTOR = 0.18
SHAFTING_CODE_KEYWAY_FACTOR = 0.75


def _inputs(
    rule: ArrayLike,
    yield_strength: ArrayLike,
    ultimate_strength: ArrayLike,
    factor_of_safety: ArrayLike,
    keyway: ArrayLike,
) -> tuple[NDArray[Any], ...]:
    rule_array = as_float(rule)
    arrays = np.broadcast_arrays(
        rule_array,
        as_float(yield_strength),
        as_float(ultimate_strength),
        as_float(factor_of_safety),
        as_bool(keyway),
    )
    return tuple(arrays)


def _positive(value: NDArray[np.float64]) -> NDArray[np.bool_]:
    return np.isfinite(value) & (value > 0)


_SCALARS = (int, float, bool, np.floating, np.integer, np.bool_)


def _all_scalars(*values: object) -> bool:
    """Plain numbers only: a spreadsheet cell's call, where numpy's per-call cost dominates."""
    for value in values:  # a plain loop: a generator costs more than the test itself here
        if not isinstance(value, _SCALARS):
            return False
    return True


def _key_scalar(keyway: object) -> bool:
    """A keyway flag as `as_bool` reads it: NaN is no keyway."""
    value = float(keyway)
    return not math.isnan(value) and value != 0


def _positive_scalar(value: float) -> bool:
    return math.isfinite(value) and value > 0


def _allowable_scalar(code: float, sy: float, su: float, fs: float, key: bool) -> float:
    """`allowable_shear` for one set of plain numbers: the same rules, without arrays."""
    if code == AllowableRule.MAX_SHEAR or code == AllowableRule.DISTORTION_ENERGY:
        if not (_positive_scalar(sy) and _positive_scalar(fs)):
            return math.nan
        factor = MAX_SHEAR_FACTOR if code == AllowableRule.MAX_SHEAR else DISTORTION_ENERGY_FACTOR
        return float(factor) * sy / fs
    if code == AllowableRule.SHAFTING_CODE:
        if not (_positive_scalar(sy) and _positive_scalar(su)):
            return math.nan
        value = min(SHAFTING_CODE_YIELD_FACTOR * sy, SHAFTING_CODE_ULTIMATE_FACTOR * su)
        return SHAFTING_CODE_KEYWAY_FACTOR * value if key else value
    return math.nan


_RULE_CODES = frozenset(int(r) for r in AllowableRule)


def _flags_scalar(code: float, sy: float, su: float, fs: float, key: bool) -> int:
    """`allowable_flags` for one set of plain numbers: the same checks, without arrays."""
    flags = 0
    known = code in _RULE_CODES
    theory = code == AllowableRule.MAX_SHEAR or code == AllowableRule.DISTORTION_ENERGY
    shafting = code == AllowableRule.SHAFTING_CODE
    checks = (
        (not known, AllowableFlag.RULE_UNKNOWN),
        ((theory or shafting) and not _positive_scalar(sy), AllowableFlag.YIELD_NOT_POSITIVE),
        (shafting and not _positive_scalar(su), AllowableFlag.ULTIMATE_NOT_POSITIVE),
        (theory and not _positive_scalar(fs), AllowableFlag.FACTOR_OF_SAFETY_NOT_POSITIVE),
        (theory and _positive_scalar(fs) and fs < 1.0, AllowableFlag.FACTOR_OF_SAFETY_BELOW_ONE),
        ((theory or shafting) and su < sy, AllowableFlag.ULTIMATE_BELOW_YIELD),
        (shafting and not math.isnan(fs) and fs != 1.0, AllowableFlag.FACTOR_OF_SAFETY_IGNORED),
        (theory and key, AllowableFlag.KEYWAY_IGNORED),
    )
    for condition, flag in checks:
        if condition:
            flags |= int(flag)
    return flags


def allowable_shear(
    rule: ArrayLike,
    yield_strength: ArrayLike,
    ultimate_strength: ArrayLike = np.nan,
    factor_of_safety: ArrayLike = 1.0,
    keyway: ArrayLike = False,
) -> Any:
    """Allowable shear stress by rule, elementwise over arrays of rule codes.

    - ``MAX_SHEAR``: ``0.5 * Sy / FS`` (maximum-shear-stress theory);
    - ``DISTORTION_ENERGY``: ``Sy / (sqrt(3) * FS)`` (distortion-energy theory);
    - ``SHAFTING_CODE``: ``min(0.30 Sy, 0.18 Su)``, times 0.75 where a keyway is cut. The
      rule embeds its own safety allowance, so ``factor_of_safety`` is **not** applied;
    - ``GIVEN``: NaN — the caller supplies the allowable directly.

    Parameters
    ----------
    rule : array_like of AllowableRule (int codes)
    yield_strength : array_like, Pa
    ultimate_strength : array_like, Pa
        Needed by ``SHAFTING_CODE`` only.
    factor_of_safety : array_like, 1
        Needed by ``MAX_SHEAR`` and ``DISTORTION_ENERGY``.
    keyway : array_like of bool
        Used by ``SHAFTING_CODE`` only (NaN counts as no keyway).

    Returns
    -------
    ndarray or scalar, Pa
        NaN for ``GIVEN`` and wherever :func:`allowable_flags` reports an error
        (unknown rule, or a needed input missing or not positive).

    Examples
    --------
    >>> float(allowable_shear(AllowableRule.MAX_SHEAR, 300e6, factor_of_safety=2.0)) / 1e6
    75.0
    """
    if _all_scalars(rule, yield_strength, ultimate_strength, factor_of_safety, keyway):
        return np.float64(_allowable_scalar(float(rule), float(yield_strength), float(ultimate_strength),
                                            float(factor_of_safety), _key_scalar(keyway)))
    code, sy, su, fs, key = _inputs(
        rule, yield_strength, ultimate_strength, factor_of_safety, keyway
    )
    with np.errstate(divide="ignore", invalid="ignore"):
        fs_ok = _positive(fs)
        sy_ok = _positive(sy)
        su_ok = _positive(su)
        tresca = np.where(sy_ok & fs_ok, MAX_SHEAR_FACTOR * sy / fs, np.nan)
        mises = np.where(sy_ok & fs_ok, DISTORTION_ENERGY_FACTOR * sy / fs, np.nan)
        code_rule = np.minimum(SHAFTING_CODE_YIELD_FACTOR * sy, SHAFTING_CODE_ULTIMATE_FACTOR * su)
        code_rule = np.where(key, SHAFTING_CODE_KEYWAY_FACTOR * code_rule, code_rule)
        code_rule = np.where(sy_ok & su_ok, code_rule, np.nan)
        result = np.select(
            [
                code == int(AllowableRule.MAX_SHEAR),
                code == int(AllowableRule.DISTORTION_ENERGY),
                code == int(AllowableRule.SHAFTING_CODE),
            ],
            [tresca, mises, code_rule],
            default=np.nan,
        )
    return scalar_out(result)


def allowable_flags(
    rule: ArrayLike,
    yield_strength: ArrayLike,
    ultimate_strength: ArrayLike = np.nan,
    factor_of_safety: ArrayLike = 1.0,
    keyway: ArrayLike = False,
) -> Any:
    """Diagnosis of :func:`allowable_shear`'s inputs, elementwise.

    Parameters are those of :func:`allowable_shear`.

    Returns
    -------
    ndarray or scalar of int32
        :class:`AllowableFlag` bits. Errors (``ALLOWABLE_ERRORS``) are where the allowable
        is NaN for want of an input; notes (FS below 1, Su below Sy, an FS or keyway
        the rule ignores) leave it in place. ``GIVEN`` checks nothing.
    """
    if _all_scalars(rule, yield_strength, ultimate_strength, factor_of_safety, keyway):
        return np.int32(_flags_scalar(float(rule), float(yield_strength), float(ultimate_strength),
                                      float(factor_of_safety), _key_scalar(keyway)))
    code, sy, su, fs, key = _inputs(
        rule, yield_strength, ultimate_strength, factor_of_safety, keyway
    )
    flags = np.zeros(code.shape, dtype=np.int32)
    known = np.isin(code, [int(r) for r in AllowableRule])
    theory = (code == int(AllowableRule.MAX_SHEAR)) | (code == int(AllowableRule.DISTORTION_ENERGY))
    shafting = code == int(AllowableRule.SHAFTING_CODE)
    with np.errstate(invalid="ignore"):
        checks = [
            (~known, AllowableFlag.RULE_UNKNOWN),
            ((theory | shafting) & ~_positive(sy), AllowableFlag.YIELD_NOT_POSITIVE),
            (shafting & ~_positive(su), AllowableFlag.ULTIMATE_NOT_POSITIVE),
            (theory & ~_positive(fs), AllowableFlag.FACTOR_OF_SAFETY_NOT_POSITIVE),
            (theory & _positive(fs) & (fs < 1.0), AllowableFlag.FACTOR_OF_SAFETY_BELOW_ONE),
            ((theory | shafting) & (su < sy), AllowableFlag.ULTIMATE_BELOW_YIELD),
            (shafting & ~np.isnan(fs) & (fs != 1.0), AllowableFlag.FACTOR_OF_SAFETY_IGNORED),
            (theory & key, AllowableFlag.KEYWAY_IGNORED),
        ]
    for condition, flag in checks:
        flags |= np.where(condition, np.int32(flag), np.int32(0))
    return scalar_out(flags)
