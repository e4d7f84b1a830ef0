"""Diagnoses of a batch: every layer's and every part's flags, screened fast, detailed where needed."""

from __future__ import annotations

import numpy as np
from numpy.typing import NDArray

from ._arrays import flag_where as _flag
from ._diagnoses import LAYER_ERRORS, LayerFlag, PartFlag
from ._duty import Duty
from ._section import LayerStack, interface_gaps

__all__ = ["layer_flags", "part_flags"]


def _detailed_layer_flags(
    stack: LayerStack, abs_tol: float, rel_tol: float
) -> NDArray[np.int32]:
    """Every layer flag, one check at a time (run on the rows the screen rejects)."""
    do, di = stack.outer_diameter, stack.inner_diameter
    modulus, allowable, kt = stack.shear_modulus, stack.allowable_shear, stack.stress_concentration
    present = stack.present
    _, flags = interface_gaps(do, di, present, abs_tol, rel_tol)
    finite = np.isfinite(do)
    for value in (di, modulus, allowable, kt):
        finite &= np.isfinite(value)
    _flag(flags, ~finite, LayerFlag.NOT_FINITE)
    _flag(flags, do <= 0, LayerFlag.OUTER_NOT_POSITIVE)
    _flag(flags, di < 0, LayerFlag.INNER_NEGATIVE)
    _flag(flags, di >= do, LayerFlag.INNER_NOT_BELOW_OUTER)
    _flag(flags, modulus <= 0, LayerFlag.MODULUS_NOT_POSITIVE)
    _flag(flags, allowable <= 0, LayerFlag.ALLOWABLE_NOT_POSITIVE)
    _flag(flags, kt < 1, LayerFlag.KT_BELOW_ONE)
    if stack.n_layers > 1:
        _flag(flags[:, 1:], di[:, 1:] == 0, LayerFlag.SOLID_NOT_INNERMOST)
    # Absent slots carry no value flags; a hole (absent slot below a present one) does.
    np.copyto(flags, 0, where=~present)
    if stack.n_layers > 1:
        present_outside = np.logical_or.accumulate(present[:, :0:-1], axis=1)[:, ::-1]
        _flag(
            flags[:, :-1],
            ~present[:, :-1] & present_outside,
            LayerFlag.EMPTY_SLOT_BETWEEN_LAYERS,
        )
    return flags


def layer_flags(
    stack: LayerStack, abs_tol: float, rel_tol: float
) -> tuple[NDArray[np.int32], NDArray[np.float64]]:
    """Layer flags and signed interface gaps of the whole batch.

    A cheap screen (comparisons that NaN fails) passes the good rows; the detailed
    checks run only on rows it rejects, so a clean million-part batch pays for a few
    comparisons rather than a dozen flag passes. The screen is at least as strict as
    the detailed checks, and the flags (hence validity) always come from the latter.
    """
    do, di = stack.outer_diameter, stack.inner_diameter
    present = stack.present
    n_parts, n_layers = do.shape
    ok = np.empty(do.shape, dtype=bool)
    scratch = np.empty(do.shape, dtype=bool)
    np.greater(do, 0.0, out=ok)
    for value, low, strict in (
        (do, None, False),
        (di, 0.0, False),
        (stack.shear_modulus, 0.0, True),
        (stack.allowable_shear, 0.0, True),
        (stack.stress_concentration, 1.0, False),
    ):
        if low is not None:
            (np.greater if strict else np.greater_equal)(value, low, out=scratch)
            ok &= scratch
        np.less(value, np.inf, out=scratch)
        ok &= scratch
    np.less(di, do, out=scratch)
    ok &= scratch
    # Absent slots need no values; the hole check below may still reject one.
    ok |= ~present

    gap = np.full(do.shape, np.nan)
    # Column by column: numpy is far slower on (P, L-1) slices of a (P, L) array.
    for slot in range(1, n_layers):
        below = do[:, slot - 1]
        size = np.subtract(di[:, slot], below)
        tol = np.abs(below)
        tol *= rel_tol
        np.maximum(tol, abs_tol, out=tol)
        touching = np.abs(size) <= tol
        touching &= di[:, slot] != 0
        both = present[:, slot] & present[:, slot - 1]
        if not both.all():
            np.copyto(size, np.nan, where=~both)
            touching |= ~both
            # A present slot outside an absent one is a hole; reject the row.
            ok[:, slot - 1] &= present[:, slot - 1] | ~present[:, slot]
        gap[:, slot] = size
        ok[:, slot] &= touching

    flags = np.zeros(do.shape, dtype=np.int32)
    if not ok.all():
        row_ok = ok[:, 0].copy()
        for slot in range(1, n_layers):
            row_ok &= ok[:, slot]
        rejected = np.flatnonzero(~row_ok)
        flags[rejected] = _detailed_layer_flags(stack.take(rejected), abs_tol, rel_tol)
    return flags, gap


def part_flags(
    stack: LayerStack, duty: Duty, layer_flags: NDArray[np.int32]
) -> NDArray[np.int32]:
    torque, length = duty.torque, duty.length
    angle_limit, rate_limit = duty.twist_limit_angle, duty.twist_limit_per_length
    present = stack.present
    flags = np.zeros(stack.n_parts, dtype=np.int32)
    any_present = present[:, 0].copy()
    for slot in range(1, stack.n_layers):
        any_present |= present[:, slot]
    _flag(flags, ~any_present, PartFlag.NO_LAYERS)
    layer_error = (layer_flags & int(LAYER_ERRORS)) != 0
    if layer_error.any():
        _flag(flags, layer_error.any(axis=1), PartFlag.LAYER_ERROR)
    _flag(flags, np.isnan(torque), PartFlag.TORQUE_NOT_GIVEN)
    _flag(flags, np.isinf(torque), PartFlag.TORQUE_NOT_FINITE)
    _flag(flags, torque < 0, PartFlag.TORQUE_NEGATIVE)
    no_length = np.isnan(length)
    _flag(flags, no_length, PartFlag.LENGTH_NOT_GIVEN)
    _flag(flags, (length <= 0) | np.isinf(length), PartFlag.LENGTH_NOT_POSITIVE)
    angle_given = ~np.isnan(angle_limit)
    _flag(flags, angle_given & ~(angle_limit > 0), PartFlag.TWIST_LIMIT_NOT_POSITIVE)
    _flag(flags, angle_given & no_length, PartFlag.TWIST_LIMIT_NEEDS_LENGTH)
    _flag(
        flags,
        ~np.isnan(rate_limit) & ~(rate_limit > 0),
        PartFlag.TWIST_PER_LENGTH_LIMIT_NOT_POSITIVE,
    )
    return flags
