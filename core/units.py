"""Unit conversions between the SI used inside the core and the engineering units at the edges.

Files, screens and reports speak mm, kA/m, rpm, mN·m and °C; the core speaks m, A/m, rad/s, N·m and K
(temperatures stay in °C inside the core where only differences matter, and are named ``*_C``).
This is the one module that converts: nothing else multiplies by 1e-3.

Every factor is an exact definition (SI brochure, 9th edition, 2019; NIST SP 811, 2008) and is checked
against pint in ``tests/test_units.py``.
"""

from __future__ import annotations

import math

from scipy import constants as _const

MU_0: float = _const.mu_0  #: vacuum permeability [H/m], CODATA value via scipy.constants

# Factor to SI for each engineering unit that appears in files, screens and reports.
_TO_SI: dict[str, float] = {
    # length
    "m": 1.0,
    "mm": 1e-3,
    "in": 0.0254,
    # area
    "mm2": 1e-6,
    "m2": 1.0,
    # magnetic flux density
    "T": 1.0,
    "mT": 1e-3,
    "G": 1e-4,
    "kG": 0.1,
    # magnetic field strength
    "A/m": 1.0,
    "kA/m": 1e3,
    "Oe": 1e3 / (4.0 * math.pi),
    "kOe": 1e6 / (4.0 * math.pi),
    # energy product
    "kJ/m3": 1e3,
    # 1 MGOe = 1e6 G·Oe = 1e6 · 1e-4 T · 1e3/(4π) A/m ≈ 7957.7 J/m³
    "MGOe": 1e6 * 1e-4 * 1e3 / (4.0 * math.pi),
    # flux
    "Wb": 1.0,
    "mWb": 1e-3,
    "uWb": 1e-6,
    # torque
    "N·m": 1.0,
    "mN·m": 1e-3,
    "oz·in": 0.28349523125e-1 * 9.80665 * 0.0254,
    "lbf·in": 0.45359237 * 9.80665 * 0.0254,
    # speed
    "rad/s": 1.0,
    "rpm": 2.0 * math.pi / 60.0,
    "krpm": 2000.0 * math.pi / 60.0,
    # constants
    "V·s/rad": 1.0,
    "V/krpm": 60.0 / (2000.0 * math.pi),
    "N·m/A": 1.0,
    "mN·m/A": 1e-3,
    # viscous friction
    "N·m·s/rad": 1.0,
    "mN·m/krpm": 1e-3 * 60.0 / (2000.0 * math.pi),
    # electrical
    "V": 1.0,
    "A": 1.0,
    "ohm": 1.0,
    "mohm": 1e-3,
    "H": 1.0,
    "mH": 1e-3,
    "A/mm2": 1e6,
    "W": 1.0,
    "hp": 745.69987158227022,
    # mass, density, inertia
    "kg": 1.0,
    "g": 1e-3,
    "lb": 0.45359237,
    "kg/m3": 1.0,
    "kg·m2": 1.0,
    "g·cm2": 1e-7,
    "oz·in2": 0.028349523125 * 0.0254**2,
    # time
    "s": 1.0,
    "ms": 1e-3,
    "min": 60.0,
    # sizing
    "kN·m/m3": 1e3,
    "Pa": 1.0,
    "kPa": 1e3,
    # thermal
    "K/W": 1.0,
    "W/(m2·K)": 1.0,
    "1/K": 1.0,
    "%/K": 1e-2,
    "ohm·m": 1.0,
    # dimensionless
    "1": 1.0,
    "%": 1e-2,
    "deg": math.pi / 180.0,
    "rad": 1.0,
}


def to_si(value, unit: str):
    """Convert ``value`` given in engineering ``unit`` to SI. Works on floats and numpy arrays."""
    if unit == "°C":
        return value
    if unit == "°F":
        return (value - 32.0) * 5.0 / 9.0
    return value * _TO_SI[unit]


def from_si(value, unit: str):
    """Convert an SI ``value`` to engineering ``unit``. Works on floats and numpy arrays."""
    if unit == "°C":
        return value
    if unit == "°F":
        return value * 9.0 / 5.0 + 32.0
    return value / _TO_SI[unit]


def factor(unit: str) -> float:
    """The multiplicative factor from ``unit`` to SI (not defined for temperatures)."""
    return _TO_SI[unit]


def known_units() -> tuple[str, ...]:
    return tuple(_TO_SI) + ("°C", "°F")


# Screen units for the US customary display (the files always keep the metric engineering units).
US_CUSTOMARY: dict[str, str] = {
    "mm": "in",
    "mN·m": "oz·in",
    "N·m": "lbf·in",
    "°C": "°F",
    "kg": "lb",
    "g": "lb",
    "W": "hp",
    "kg·m2": "oz·in2",
    "g·cm2": "oz·in2",
    "mN·m/A": "oz·in/A",
}
_TO_SI["oz·in/A"] = _TO_SI["oz·in"]


def convert(value, from_unit: str, to_unit: str):
    """Convert between two engineering units of the same quantity."""
    return from_si(to_si(value, from_unit), to_unit)


def temperature_difference_to_si(value, unit: str):
    """A temperature *difference* in K from °C or °F (no offset)."""
    return value * (5.0 / 9.0 if unit == "°F" else 1.0)


def rpm_to_rad_per_s(speed_rpm):
    return speed_rpm * _TO_SI["rpm"]


def rad_per_s_to_rpm(speed_rad_per_s):
    return speed_rad_per_s / _TO_SI["rpm"]
