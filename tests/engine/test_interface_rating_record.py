"""The interface results record: its documented dtypes, that it cannot be changed, and the share and
sum(G J) a caller hands over from the rating (``rate_interfaces(share=, sum_stiffness=)``).

The dtypes are those the record's docstring states (int8 faces, int32 flag words, int16 slots); the
fit-stress capacity is proportional to sum(G J) at a given pressure (T = tau sum(G J) / (G r), with
tau set by distortion energy at the face: Shigley's Mechanical Engineering Design, §5-5, and the
one-twist compatibility of a compound section), which shows a handed-over sum(G J) is the one used.
Parts are invented (BRIEF §4): a 1045 core in a phosphor-bronze sleeve.
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from twistshare.engine.core import Duty, LayerStack, rate, rate_interfaces

NAN = np.nan
CORE, SLEEVE = 0.05, 0.062
KW = dict(youngs_modulus=[[207e9, 111e9]], poisson_ratio=[[0.292, 0.349]], yield_strength=[[310e6, 250e6]],
          expansion_coefficient=[[11.7e-6, 17.8e-6]], interference=[[NAN, 40e-6]], fit_length=[[NAN, 0.03]],
          friction=[[NAN, 0.12]])


def _stack():
    return LayerStack.from_layers([CORE, SLEEVE], [0.0, CORE], [79.3e9, 41.4e9], [1e8, 1e8])


def test_documented_dtypes():
    got = rate_interfaces(_stack(), **KW)
    ints = {"fit_stress_face": np.int8, "interface_flags": np.int32, "layer_fit_flags": np.int32,
            "slip_slot": np.int16, "bond_slot": np.int16, "fit_stress_slot": np.int16}
    for item in dataclasses.fields(got):
        assert getattr(got, item.name).dtype == ints.get(item.name, np.float64), item.name


def test_the_record_and_its_arrays_cannot_be_changed():
    got = rate_interfaces(_stack(), **KW)
    with pytest.raises(dataclasses.FrozenInstanceError):
        got.slip_limit = np.zeros(1)
    with pytest.raises(ValueError):
        got.pressure[0, 1] = 0.0


def test_share_and_sum_of_gj_handed_over():
    stack = _stack()
    rating = rate(stack, Duty.from_arrays(torque=1.0))
    alone = rate_interfaces(stack, **KW)
    both = rate_interfaces(stack, share=rating.share, sum_stiffness=rating.sum_gj, **KW)
    for item in dataclasses.fields(alone):
        # the same within rounding: the rating works the share out by another order of operations
        np.testing.assert_allclose(getattr(both, item.name), getattr(alone, item.name), rtol=1e-14, err_msg=item.name)
    # one of the two alone is not enough: both are worked out again, as with neither
    for one in (dict(share=rating.share), dict(sum_stiffness=rating.sum_gj)):
        half = rate_interfaces(stack, **one, **KW)
        np.testing.assert_array_equal(half.fit_stress_capacity, alone.fit_stress_capacity)
    # the handed-over sum(G J) is the one used: twice it, twice the fit-stress capacity of each layer
    doubled = rate_interfaces(stack, share=rating.share, sum_stiffness=2 * rating.sum_gj, **KW)
    assert np.all(alone.fit_stress_capacity[0] > 0)
    np.testing.assert_allclose(doubled.fit_stress_capacity, 2 * alone.fit_stress_capacity, rtol=1e-12)
