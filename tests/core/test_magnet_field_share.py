"""The worst field over a share of the magnet's area: by hand, its limits, and its refusals."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from pmdc_sizer.core.magnet_field_share import WORST_AREA_SHARE, worst_share_field


def test_by_hand_with_a_cell_straddling_the_share():
    # cells of 2 %, 2 %, 6 % and 90 % of the area: the worst 5 % is the first two and half of the third,
    # (-300·2 + -200·2 + -100·1)/5 = -220
    field = np.array([-100.0, -300.0, -50.0, -200.0])
    area = np.array([6.0, 2.0, 90.0, 2.0])
    assert worst_share_field(field, area) == pytest.approx(-220.0, rel=1e-12)


def test_share_one_is_the_area_mean_and_a_tiny_share_the_minimum():
    rng = np.random.default_rng(3)
    field, area = rng.normal(-2e5, 5e4, 40), rng.uniform(0.1, 2.0, 40)
    assert worst_share_field(field, area, 1.0) == pytest.approx(np.average(field, weights=area), rel=1e-12)
    assert worst_share_field(field, area, 1e-9) == pytest.approx(field.min(), rel=1e-12)


def test_batched_along_the_last_axis():
    field = np.array([[-1.0, -2.0, -3.0, -4.0], [-4.0, -3.0, -2.0, -1.0]])
    got = worst_share_field(field, np.ones(4), 0.5)
    assert_allclose(got, [-3.5, -3.5], rtol=1e-12)


@given(st.lists(st.floats(-2e6, 0.0), min_size=1, max_size=30), st.floats(0.01, 1.0))
def test_between_the_minimum_and_the_mean(values, share):
    field = np.array(values)
    area = np.linspace(1.0, 2.0, field.size)
    got = float(worst_share_field(field, area, share))
    tolerance = 1e-9 * max(1.0, float(np.abs(field).max()))
    assert field.min() - tolerance <= got <= np.average(field, weights=area) + tolerance


@pytest.mark.parametrize("share", [0.0, -0.1, 1.5])
def test_refuses_a_share_outside_zero_to_one(share):
    with pytest.raises(ValueError, match="share"):
        worst_share_field(np.zeros(3), np.ones(3), share)


def test_refuses_areas_that_are_not_positive():
    with pytest.raises(ValueError, match="areas"):
        worst_share_field(np.zeros(3), np.array([1.0, -1.0, 1.0]))


def test_the_share_is_small():
    assert 0.0 < WORST_AREA_SHARE <= 0.1
