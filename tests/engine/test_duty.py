"""`Duty`: one entry a part, its shape rules and their messages, and taking parts out of it."""

import numpy as np
import pytest
from twistshare.engine.core import Duty


def test_scalars_give_one_part_and_blanks_are_nan():
    duty = Duty.from_arrays(500.0)
    assert duty.n_parts == 1 and duty.torque.tolist() == [500.0]
    assert np.isnan(duty.length).all() and np.isnan(duty.twist_limit_angle).all()


def test_inputs_that_do_not_broadcast_are_named():
    with pytest.raises(ValueError) as error:
        Duty.from_arrays([1.0, 2.0], [1.0, 2.0, 3.0])
    assert str(error.value) == "Duty inputs do not broadcast together: (2,), (3,), (), ()"


def test_two_dimensional_inputs_are_refused():
    with pytest.raises(ValueError) as error:
        Duty.from_arrays(np.ones((2, 2)))
    assert str(error.value) == "Duty inputs must be one value per part; got shape (2, 2)"


def test_the_fields_must_match_the_torque():
    with pytest.raises(ValueError) as error:
        Duty(np.ones((2, 1)), np.ones(2), np.ones(2), np.ones(2))
    assert str(error.value) == "Duty.torque must be a (parts,) array; got shape (2, 1)"
    with pytest.raises(ValueError) as error:
        Duty(np.ones(2), np.ones(3), np.ones(2), np.ones(2))
    assert str(error.value) == "Duty.length has shape (3,); expected (2,) like torque"


def test_fields_are_read_only():
    duty = Duty.from_arrays([1.0, 2.0])
    with pytest.raises(ValueError):
        duty.torque[0] = 5.0
    # and the record itself: a field cannot be swapped for another array
    import dataclasses
    with pytest.raises(dataclasses.FrozenInstanceError):
        duty.torque = np.array([5.0, 6.0])


@pytest.mark.parametrize("rows, expected", [(0, [10.0]), (2, [30.0]), (-1, [30.0]), (-2, [20.0]),
                                            ([0, 2], [10.0, 30.0]), (slice(1, None), [20.0, 30.0])])
def test_take_keeps_the_parts_asked_for_and_stays_one_dimensional(rows, expected):
    duty = Duty.from_arrays([10.0, 20.0, 30.0], [1.0, 2.0, 3.0])
    taken = duty.take(rows)
    assert taken.torque.tolist() == expected
    assert taken.length.tolist() == [t / 10.0 for t in expected]
