"""The core's small array helpers (`engine/core/_arrays.py`), each against its stated contract.

The expected values are written here from the numpy semantics each helper documents (common
practice: a blank is NaN, NaN counts as "no flag", a scalar applies to every part).
"""

import numpy as np
import pytest
from twistshare.engine.core._arrays import (
    as_bool,
    as_float,
    frozen_view,
    gather_layer_flags,
    layer_arrays,
    nan_to_zero,
    one_or_nan,
    part_array,
    scalar_out,
    valid_or_nan,
)

NAN = float("nan")


class TestAsFloat:
    @pytest.mark.parametrize("value", [1.5, 3, np.float64(2.25)])
    def test_a_plain_number_becomes_a_numpy_scalar(self, value):
        got = as_float(value)
        assert type(got) is np.float64 and not isinstance(got, np.ndarray)
        assert got == float(value) and got.ndim == 0 and got.shape == ()

    def test_a_list_becomes_a_float_array(self):
        got = as_float([1, 2])
        assert isinstance(got, np.ndarray) and got.dtype == np.float64
        assert got.tolist() == [1.0, 2.0]

    def test_a_float_array_is_not_copied(self):
        array = np.array([1.0, 2.0])
        assert as_float(array) is array

    def test_true_is_read_as_an_array_of_one(self):
        # bool is not a plain number here: it goes through numpy's conversion, 1.0
        got = as_float(True)
        assert isinstance(got, np.ndarray) and got.ndim == 0 and float(got) == 1.0


class TestScalarOut:
    def test_a_zero_d_array_is_unwrapped(self):
        got = scalar_out(np.asarray(2.0))
        assert type(got) is np.float64 and got == 2.0

    def test_a_one_d_array_stays_an_array(self):
        array = np.array([2.0])
        got = scalar_out(array)
        assert isinstance(got, np.ndarray) and got.shape == (1,)


class TestValidOrNan:
    def test_one_value(self):
        assert valid_or_nan(True, 3.0) == 3.0 and type(valid_or_nan(True, 3.0)) is np.float64
        assert np.isnan(valid_or_nan(False, 3.0))
        assert valid_or_nan(np.bool_(True), np.float64(4.0)) == 4.0

    def test_a_mask_over_one_value_broadcasts(self):
        got = valid_or_nan(np.array([True, False]), 2.0)
        assert got[0] == 2.0 and np.isnan(got[1])

    def test_one_flag_over_an_array(self):
        assert valid_or_nan(True, np.array([1.0, 2.0])).tolist() == [1.0, 2.0]
        blank = valid_or_nan(False, np.array([1.0, 2.0]))
        assert blank.shape == (2,) and np.isnan(blank).all()

    def test_matches_the_where_form(self):
        ok = np.array([[True, False], [False, True]])
        values = np.array([[1.0, 2.0], [3.0, 4.0]])
        np.testing.assert_array_equal(valid_or_nan(ok, values), np.where(ok, values, np.nan))


def test_frozen_view_is_read_only_and_leaves_the_array_writeable():
    array = np.array([1.0, 2.0])
    view = frozen_view(array)
    assert not view.flags.writeable and array.flags.writeable
    with pytest.raises(ValueError):
        view[0] = 5.0
    array[0] = 5.0
    assert view[0] == 5.0  # a view, not a copy


class TestAsBool:
    def test_a_bool_array_is_returned_as_it_is(self):
        flags = np.array([True, False])
        assert as_bool(flags) is flags

    def test_nan_counts_as_false(self):
        got = as_bool(np.array([NAN, 0.0, 2.5, 1.0, -1.0]))
        assert got.dtype == np.bool_
        assert got.tolist() == [False, False, True, True, True]

    def test_complex_and_integers(self):
        assert as_bool(np.array([0j, 1j])).tolist() == [False, True]
        assert as_bool([0, 3]).tolist() == [False, True]


class TestLayerArrays:
    def test_one_part_as_a_one_d_row(self):
        (outer, inner), present = layer_arrays([0.04, 0.05, NAN], [0.0, 0.04, NAN])
        assert outer.shape == inner.shape == (1, 3)
        assert present.tolist() == [[True, True, False]]  # the first input is not NaN

    def test_present_given_wins_and_is_not_returned_as_an_input(self):
        arrays, present = layer_arrays([[0.04, NAN]], present=[[1, 1]])
        assert len(arrays) == 1 and present.tolist() == [[True, True]]

    def test_scalars_broadcast_to_the_layers(self):
        (outer, kt), present = layer_arrays([[0.04, 0.05]], 1.3)
        assert kt.tolist() == [[1.3, 1.3]] and present.all()

    def test_inputs_that_do_not_broadcast_are_named(self):
        with pytest.raises(ValueError) as error:
            layer_arrays([1.0, 2.0], [1.0, 2.0, 3.0])
        assert str(error.value) == "layer inputs do not broadcast together: (2,), (3,)"

    @pytest.mark.parametrize("n_inputs", [1, 2])
    def test_more_than_two_dimensions_are_refused(self, n_inputs):
        cube = np.zeros((2, 2, 2))
        with pytest.raises(ValueError) as error:
            layer_arrays(*([cube] * n_inputs))
        assert str(error.value) == "layer inputs must be at most (parts, layers); got shape (2, 2, 2)"

    def test_two_dimensions_are_accepted(self):
        (grid,), present = layer_arrays(np.ones((3, 2)))
        assert grid.shape == (3, 2) and present.all()


class TestPartArray:
    def test_a_scalar_applies_to_every_part(self):
        assert part_array(2.0, 3, "torque").tolist() == [2.0, 2.0, 2.0]

    def test_one_value_per_part(self):
        assert part_array([1.0, 2.0, 3.0], 3, "torque").tolist() == [1.0, 2.0, 3.0]

    @pytest.mark.parametrize("value, shape", [([1.0, 2.0], "(2,)"), (np.ones((3, 1)), "(3, 1)"),
                                              (np.ones((1, 3)), "(1, 3)")])
    def test_any_other_shape_is_refused_by_name(self, value, shape):
        with pytest.raises(ValueError) as error:
            part_array(value, 3, "torque")
        assert str(error.value) == f"torque must hold one value or one per part (3); got shape {shape}"


class TestGatherLayerFlags:
    def test_every_slot_is_or_ed_into_its_part(self):
        parts = np.array([1, 0], np.int32)
        layers = np.array([[2, 4], [0, 8]], np.int32)
        got = gather_layer_flags(parts, layers)
        assert got.tolist() == [1 | 2 | 4, 8]
        assert parts.tolist() == [1, 0]  # the input is not changed

    def test_no_layer_flags_gives_a_copy_of_the_part_flags(self):
        parts = np.array([1, 0], np.int32)
        got = gather_layer_flags(parts, np.zeros((2, 3), np.int32))
        assert got.tolist() == [1, 0] and got is not parts


@pytest.mark.parametrize("value", [np.array([NAN, 1.5, -2.0]), np.array([NAN, np.inf, -np.inf, 3.0])])
def test_nan_to_zero_is_numpys_nan_to_num(value):
    # The stated contract is numpy's own nan_to_num with nan=0 (the reference): NaN -> 0, and
    # an infinity -> the largest finite float of its sign.
    got = nan_to_zero(value)
    np.testing.assert_array_equal(got, np.nan_to_num(value, nan=0.0))
    assert got[0] == 0.0
    assert np.isnan(value[0])  # a new array


def test_nan_to_zero_in_place_is_bit_for_bit_numpys():
    # Signed zeros and NaN payloads included: compared as raw bits.
    value = np.array([NAN, -0.0, 0.0, 1.5, -2.5, NAN, 1e308])
    expected = np.nan_to_num(value.copy(), nan=0.0)
    got = nan_to_zero(value, out=value)
    assert got.view(np.int64).tolist() == expected.view(np.int64).tolist()
    assert value.view(np.int64).tolist() == expected.view(np.int64).tolist()  # written in place
    with_inf = np.array([NAN, np.inf])
    out = np.empty(2)
    assert nan_to_zero(with_inf, out=out) is out and out.tolist() == np.nan_to_num(with_inf, nan=0.0).tolist()


def test_one_or_nan_is_one_where_kept_and_numpys_nan_elsewhere():
    keep = np.array([True, False, True, False])
    got = one_or_nan(keep)
    assert got.dtype == np.float64 and got[0] == 1.0 and got[2] == 1.0
    assert np.isnan(got[[1, 3]]).all()
    # the very bits of np.nan, so a product with it is numpy's own NaN
    assert got.view(np.int64)[1] == np.array([np.nan]).view(np.int64)[0]
    np.testing.assert_array_equal(np.array([2.0, 3.0, 4.0, 5.0]) * got, np.where(keep, [2.0, 3.0, 4.0, 5.0], np.nan))
