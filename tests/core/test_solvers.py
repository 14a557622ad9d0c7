"""The vectorised bracketed root finder against scipy.optimize.brentq (an independent reference)."""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose
from scipy.optimize import brentq

from pmdc_sizer.core.solvers import find_root


def test_cubic_batch_matches_brentq():
    # Source: scipy.optimize.brentq (Brent 1973) as the reference root of each equation.
    shifts = np.linspace(-5.0, 5.0, 101)

    def residual(x):
        return x**3 + x - shifts

    result = find_root(residual, -3.0 * np.ones_like(shifts), 3.0 * np.ones_like(shifts), xtol=1e-14, rtol=1e-14)
    expected = [brentq(lambda x, s=s: x**3 + x - s, -3.0, 3.0, xtol=1e-15, rtol=1e-15) for s in shifts]
    assert result.converged.all() and result.bracketed.all()
    # Both stop within a few ulps of the 1e-14 tolerance band.
    assert_allclose(result.root, expected, rtol=0, atol=1e-12)


@settings(max_examples=60, deadline=None)
@given(
    st.floats(0.1, 10.0), st.floats(-2.0, 2.0), st.floats(0.5, 5.0),
)
def test_transcendental_roots_match_brentq(scale, offset, width):
    # A monotone residual with curvature, like the magnetic-circuit one. Source: scipy.optimize.brentq.
    def f(x):
        return np.tanh(scale * (x - offset)) + 0.1 * (x - offset)

    lower, upper = offset - width, offset + width * 1.3
    result = find_root(f, lower, upper, xtol=1e-13, rtol=1e-13)
    reference = brentq(f, lower, upper, xtol=1e-15)
    assert bool(result.converged)
    assert_allclose(result.root, reference, atol=5e-12)


def test_unbracketed_elements_are_nan_and_flagged():
    result = find_root(lambda x: x**2 + 1.0, np.array([-1.0, -1.0]), np.array([1.0, 2.0]))
    assert not result.bracketed.any()
    assert not result.converged.any()
    assert np.isnan(result.root).all()


def test_mixed_batch_keeps_good_elements():
    targets = np.array([0.5, 5.0, -0.25])  # the middle one has no root in [-1, 1]
    result = find_root(lambda x: x - targets, -np.ones(3), np.ones(3))
    assert result.bracketed.tolist() == [True, False, True]
    assert_allclose(result.root[[0, 2]], [0.5, -0.25], atol=1e-12)
    assert np.isnan(result.root[1])


def test_root_at_a_bracket_end_is_exact():
    result = find_root(lambda x: x, np.array([0.0]), np.array([1.0]))
    assert result.root[0] == 0.0 and result.converged[0]


def test_first_guess_cannot_break_the_bracket():
    for guess in (-100.0, 0.0, 0.7, 100.0, np.nan):
        result = find_root(lambda x: x - 0.7, 0.0, 1.0, first_guess=guess, xtol=1e-14, rtol=1e-14)
        assert_allclose(result.root, 0.7, atol=1e-13)


def test_broadcasts_scalar_and_array_bounds():
    result = find_root(lambda x: x - np.array([[0.1], [0.2]]), 0.0, np.ones((2, 3)))
    assert result.root.shape == (2, 3)
    assert_allclose(result.root, [[0.1] * 3, [0.2] * 3], atol=1e-12)


def test_scalar_equals_element_of_batch_exactly():
    # The batch iterates every element until the slowest is done; elements already done sit in their
    # collapsed bracket, so the answer must not depend on the company an element keeps.
    shifts = np.linspace(0.1, 3.0, 50)
    batch = find_root(lambda x: np.exp(x) - 1.0 - shifts, np.zeros(50), 2.0 * np.ones(50))
    for i in (0, 17, 49):
        single = find_root(lambda x, s=shifts[i]: np.exp(x) - 1.0 - s, 0.0, 2.0)
        assert single.root == batch.root[i]
