"""Governing limit: smallest capacity, deterministic ties, margin and factor of safety."""

import numpy as np
import pytest
from twistshare.engine.core import Criterion, governing_limit, margin, reserve_factor

INF = np.inf
NAN = np.nan


def test_smallest_capacity_governs():
    """The smaller capacity governs (common practice)."""
    capacity, criterion, layer = governing_limit(
        [[300.0, 200.0, 250.0], [300.0, 200.0, 250.0], [300.0, 200.0, 250.0]],
        [INF, 150.0, 190.0],
        [INF, INF, 180.0],
    )
    np.testing.assert_array_equal(capacity, [200.0, 150.0, 180.0])
    assert criterion.tolist() == [Criterion.LAYER_STRESS, Criterion.TWIST_ANGLE, Criterion.TWIST_PER_LENGTH]
    assert layer.tolist() == [1, -1, -1]
    assert criterion.dtype == np.int8 and layer.dtype == np.int16


def test_ties_are_deterministic():
    """Ties go to the lowest criterion value, then the innermost layer."""
    capacity, criterion, layer = governing_limit(
        [[100.0, 100.0], [100.0, 120.0], [130.0, 120.0]],
        [INF, 100.0, 110.0],
        [INF, 100.0, 110.0],
    )
    np.testing.assert_array_equal(capacity, [100.0, 100.0, 110.0])
    assert criterion.tolist() == [Criterion.LAYER_STRESS, Criterion.LAYER_STRESS, Criterion.TWIST_ANGLE]
    assert layer.tolist() == [0, 0, -1]


def test_absent_slots_never_govern():
    capacity, criterion, layer = governing_limit([[NAN, 90.0], [NAN, NAN]], [INF, INF], [INF, 40.0])
    assert capacity[0] == 90.0 and layer[0] == 1
    assert capacity[1] == 40.0 and criterion[1] == Criterion.TWIST_PER_LENGTH


def test_nothing_to_govern_is_none():
    capacity, criterion, layer = governing_limit([[NAN, NAN]], [INF], [INF])
    assert np.isnan(capacity[0]) and criterion[0] == Criterion.NONE and layer[0] == -1


@pytest.mark.parametrize(
    ("capacity", "torque", "fos", "expected_margin"),
    [(200.0, 100.0, 2.0, 1.0), (200.0, -100.0, 2.0, 1.0), (50.0, 100.0, 0.5, -0.5), (10.0, 0.0, INF, INF)],
)
def test_margin_and_reserve_factor(capacity, torque, fos, expected_margin):
    """margin = cap / |T| - 1 and factor of safety = cap / |T| (issue 2 definition)."""
    assert reserve_factor(capacity, torque) == fos
    assert margin(capacity, torque) == expected_margin


def test_no_torque_gives_nan_margin():
    assert np.isnan(margin(10.0, NAN))
