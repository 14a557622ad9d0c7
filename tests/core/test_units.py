"""Unit conversions of core.units against scipy.constants and pint (independent references)."""

from __future__ import annotations

import math

import numpy as np
import pint
import pytest
from numpy.testing import assert_allclose
from scipy import constants

from pmdc_sizer.core import units

UREG = pint.UnitRegistry()

# pint derives the Gaussian units from its own CODATA μ0 (no longer exactly 4π·1e-7 H/m since the 2019
# SI); the two differ by about 1e-10 relative, so conversions that go through Oe or G are held to 1e-9.
GAUSSIAN_RTOL = 1e-9


def test_mu_0_is_the_codata_value():
    # Source: scipy.constants (CODATA 2018), an independent reference for the vacuum permeability.
    assert constants.mu_0 == units.MU_0
    assert_allclose(units.MU_0, 4e-7 * math.pi, rtol=1e-9)  # 2019 SI: within 1e-9 of 4π·1e-7 H/m


def _pint_factor(unit: str, si_unit: str, context: str | None = None) -> float:
    if context:
        with UREG.context(context):
            return UREG.Quantity(1.0, unit).to(si_unit).magnitude
    return UREG.Quantity(1.0, unit).to(si_unit).magnitude


def test_oersted_to_ampere_per_metre_against_pint():
    # Source: pint's Gaussian context (1 Oe = 1000/(4π) A/m).
    assert_allclose(units.to_si(1.0, "Oe"), _pint_factor("oersted", "A/m", "Gaussian"), rtol=GAUSSIAN_RTOL)
    assert_allclose(units.to_si(1.0, "kOe"), 1e3 * _pint_factor("oersted", "A/m", "Gaussian"), rtol=GAUSSIAN_RTOL)


def test_gauss_to_tesla_against_pint():
    # Source: pint's Gaussian context (1 G = 1e-4 T).
    assert_allclose(units.to_si(1.0, "G"), _pint_factor("gauss", "T", "Gaussian"), rtol=GAUSSIAN_RTOL)
    assert_allclose(units.to_si(1.0, "kG"), 1e3 * _pint_factor("gauss", "T", "Gaussian"), rtol=GAUSSIAN_RTOL)


def test_mgoe_to_kilojoule_per_cubic_metre_against_pint():
    # (BH)max in MGOe is the product of B in gauss and H in oersted (MMPA 0100-00 usage, from memory);
    # pint's Gaussian context treats G·Oe as erg/cm³ (a factor 4π apart), so the product is formed from
    # pint's G→T and Oe→A/m conversions. Source: pint.
    expected = 1e6 * _pint_factor("gauss", "T", "Gaussian") * _pint_factor("oersted", "A/m", "Gaussian")
    assert_allclose(units.to_si(1.0, "MGOe"), expected, rtol=GAUSSIAN_RTOL)
    assert_allclose(units.convert(1.0, "MGOe", "kJ/m3"), 7.957747, rtol=1e-6)  # the trade's 7.96 kJ/m³ per MGOe


@pytest.mark.parametrize(
    ("ours", "pint_unit", "si_unit"),
    [
        ("mm", "millimeter", "m"),
        ("in", "inch", "m"),
        ("mm2", "mm**2", "m**2"),
        ("mT", "millitesla", "T"),
        ("kA/m", "kA/m", "A/m"),
        ("mN·m", "mN*m", "N*m"),
        ("oz·in", "ounce_force*inch", "N*m"),
        ("lbf·in", "lbf*inch", "N*m"),
        ("rpm", "rpm", "rad/s"),
        ("krpm", "kilorpm", "rad/s"),
        ("V/krpm", "V/kilorpm", "V*s/rad"),
        ("mN·m/A", "mN*m/A", "N*m/A"),
        ("mN·m/krpm", "mN*m/kilorpm", "N*m*s/rad"),
        ("hp", "hp", "W"),
        ("lb", "lb", "kg"),
        ("g·cm2", "g*cm**2", "kg*m**2"),
        ("oz·in2", "oz*inch**2", "kg*m**2"),
        ("min", "minute", "s"),
        ("A/mm2", "A/mm**2", "A/m**2"),
        ("deg", "degree", "rad"),
        ("%/K", "percent/K", "1/K"),
    ],
)
def test_engineering_units_against_pint(ours, pint_unit, si_unit):
    # Source: pint's default registry (NIST SP 811 definitions). All these are exact definitions, so
    # only floating-point rounding separates the two.
    assert_allclose(units.to_si(1.0, ours), _pint_factor(pint_unit, si_unit), rtol=1e-12)


def test_fahrenheit_against_pint():
    # Source: pint offset units.
    for value in (-40.0, 32.0, 212.0, 98.6):
        assert_allclose(units.to_si(value, "°F"), UREG.Quantity(value, "degF").to("degC").magnitude,
                        rtol=1e-12, atol=1e-12)
    assert_allclose(units.temperature_difference_to_si(9.0, "°F"), 5.0)
    assert units.to_si(25.0, "°C") == 25.0


@pytest.mark.parametrize("unit", list(units.known_units()))
def test_round_trip_through_si_for_every_unit(unit):
    values = np.array([-3.5, 0.0, 1.0, 1234.5])
    assert_allclose(units.from_si(units.to_si(values, unit), unit), values, rtol=1e-13, atol=1e-12)


def test_arrays_convert_elementwise_like_scalars():
    values = np.linspace(0.0, 5000.0, 7)
    assert_allclose(units.to_si(values, "rpm"), [units.to_si(float(v), "rpm") for v in values], rtol=0, atol=0)
    assert_allclose(units.rpm_to_rad_per_s(60.0), 2.0 * math.pi, rtol=1e-15)
    assert_allclose(units.rad_per_s_to_rpm(2.0 * math.pi), 60.0, rtol=1e-15)


def test_unknown_unit_is_refused():
    with pytest.raises(KeyError):
        units.to_si(1.0, "furlong")
