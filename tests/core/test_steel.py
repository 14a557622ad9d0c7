"""Soft-magnetic steels: monotone B(H), free-space slope beyond the data, loss-separation law."""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import library
from pmdc_sizer.core.steel import Steel
from pmdc_sizer.core.units import MU_0

STEELS = library.steels()


@pytest.mark.parametrize("name", sorted(STEELS))
def test_curve_passes_through_its_data_and_is_monotone(name):
    steel = STEELS[name]
    b_data = np.asarray(steel.flux_density)
    h_data = np.asarray(steel.field_strength)
    # The dense PCHIP table is interpolated linearly between 2048 nodes; at the data points that
    # costs at most a few A/m on the steep upper part of the curve (0.5 % of H or 2 A/m).
    assert_allclose(steel.field_for(b_data), h_data, rtol=5e-3, atol=2.0)
    b = np.linspace(0.0, 1.2 * b_data[-1], 4000)
    h = steel.field_for(b)
    assert np.all(np.diff(h) > 0.0)
    # inverse of each other
    assert_allclose(steel.flux_density_for(h), b, rtol=1e-9, atol=1e-9)


@pytest.mark.parametrize("name", sorted(STEELS))
def test_free_space_slope_beyond_the_data(name):
    # Fully saturated iron: dB/dH = μ0 (the B(H) curve's asymptote; any magnetics text).
    steel = STEELS[name]
    top = steel.saturation_flux_density
    h1, h2 = steel.field_for(np.array([top + 0.1, top + 0.3]))
    assert_allclose((0.2) / (h2 - h1), MU_0, rtol=1e-9)
    h = np.array([1e6, 3e6])
    b = steel.flux_density_for(h)
    assert_allclose((b[1] - b[0]) / (h[1] - h[0]), MU_0, rtol=1e-9)


def test_curve_is_odd():
    steel = STEELS["M400-50A"]
    b = np.linspace(-2.5, 2.5, 51)
    assert_allclose(steel.field_for(-b), -steel.field_for(b), rtol=0, atol=0)
    assert_allclose(steel.flux_density_for(-steel.field_for(b)), -b, atol=1e-9)


@pytest.mark.parametrize("name", sorted(STEELS))
def test_slope_is_the_derivative_of_the_field(name):
    # What Newton's method needs of the lookup (core.reluctance_network): the slope it returns is the
    # exact derivative of the H it returns, cell by cell (a secant inside one cell of the table), μ0's
    # beyond the data, and H is field_for's.
    steel = STEELS[name]
    top = steel.saturation_flux_density
    cell = top / 2047.0  # the dense table's cells
    b = np.concatenate([np.linspace(-0.999 * top, 0.999 * top, 301), [1.3 * top, -1.7 * top]])
    start = np.floor(np.abs(b) / cell) * cell
    beyond = np.abs(b) + np.array([0.0, 0.1])[:, None]
    inside = np.where(np.abs(b) < top, start + np.array([0.3, 0.6])[:, None] * cell, beyond)
    h, slope = steel.field_and_slope(b)
    assert_allclose(h, steel.field_for(b), rtol=0, atol=0)
    h_inside = steel.field_and_slope(inside)[0]
    secant = (h_inside[1] - h_inside[0]) / (inside[1] - inside[0])
    assert_allclose(slope, secant, rtol=1e-6)
    assert_allclose(slope[-2:], 1.0 / MU_0, rtol=1e-9)
    assert np.all(slope > 0.0)
    assert np.isnan(steel.field_and_slope(np.array([np.nan]))[0][0])


def test_loss_separation_law():
    # Source: Steinmetz (1892) hysteresis term plus Bertotti (1988) classical and excess terms.
    steel = Steel("test", "lamination", (0.0, 100.0, 1000.0), (0.0, 1.0, 1.5), 7650.0,
                  hysteresis_coeff=0.02, hysteresis_exponent=1.8, eddy_coeff=5e-5, excess_coeff=1e-3)
    f, b = 50.0, 1.5
    expected = 0.02 * f * b**1.8 + 5e-5 * (f * b) ** 2 + 1e-3 * (f * b) ** 1.5
    assert_allclose(steel.specific_loss(f, b), expected, rtol=1e-14)
    assert_allclose(steel.specific_loss(f, -b), expected, rtol=1e-14)
    assert steel.specific_loss(0.0, 1.5) == 0.0


@pytest.mark.parametrize("name", [n for n, s in STEELS.items() if s.kind == "lamination"])
def test_lamination_loss_is_near_its_grade_name(name):
    # EN 10106 names Mxxx-yyA by the maximum loss at 1.5 T, 50 Hz in W/kg ×100 (from memory of the
    # standard); a typical sheet is some 5 to 20 % below its grade's maximum (common practice), so the
    # fitted law must land between 60 % and 100 % of the grade number.
    steel = STEELS[name]
    grade_loss = float(name[1:4]) / 100.0
    loss = float(steel.specific_loss(50.0, 1.5))
    assert 0.6 * grade_loss <= loss <= 1.0 * grade_loss


def test_kinds_available():
    kinds = [s.kind for s in STEELS.values()]
    assert kinds.count("housing") >= 1 and kinds.count("lamination") >= 2


@pytest.mark.parametrize(
    ("field", "flux", "match"),
    [
        ((0.0, 100.0), (0.0, 1.0), "at least 3"),
        ((1.0, 100.0, 200.0), (0.0, 1.0, 1.2), "start at H = 0"),
        ((0.0, 200.0, 100.0), (0.0, 1.0, 1.2), "increase"),
        ((0.0, 100.0, 1e9), (0.0, 1.0, 1.1), "below μ0"),
    ],
)
def test_bad_curves_are_refused(field, flux, match):
    with pytest.raises(ValueError, match=match):
        Steel("bad", "housing", field, flux, 7800.0)
