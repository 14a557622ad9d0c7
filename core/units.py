"""Unit conversions between the SI used inside the core and the engineering units at the edges.

Files, screens and reports speak mm, kA/m, rpm, mN·m and °C; the core speaks m, A/m, rad/s, N·m and K
(temperatures stay in °C inside the core where only differences matter, and are named ``*_C``).
This is the one module that converts: nothing else multiplies by 1e-3.

Every factor is an exact definition (SI brochure, 9th edition, 2019; NIST SP 811, 2008) and is checked
against pint in ``tests/core/test_units.py``.

Each conversion takes a float or a numpy array and returns the same kind.

References
----------
.. [1] BIPM, "The International System of Units (SI)", 9th edition, 2019.
.. [2] A. Thompson and B. N. Taylor, "Guide for the Use of the International System of Units (SI)",
   NIST Special Publication 811, 2008 edition, appendix B (factors for inch, pound, ounce, pound-force,
   horsepower of 550 ft·lbf/s, gauss, oersted).
"""

from __future__ import annotations

import math
from typing import TypeVar

import numpy as np
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
    "A/cm2": 1e4,
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
    # speed of a surface
    "m/s": 1.0,
    # sizing
    "kN·m/m3": 1e3,
    "Pa": 1.0,
    "kPa": 1e3,
    # thermal
    "K/W": 1.0,
    "J/K": 1.0,
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


#: What the conversions take and give back in kind: a float, an array, or a field that holds either.
Quantity = TypeVar("Quantity", float, np.ndarray, float | np.ndarray)


def to_si(value: Quantity, unit: str) -> Quantity:
    """Convert a value in an engineering unit to SI.

    Parameters
    ----------
    value : float or ndarray
        The quantity in ``unit``.
    unit : str
        One of :func:`known_units`, e.g. ``"mm"``, ``"kA/m"``, ``"rpm"``. Temperatures: ``"°C"`` stays in
        °C (the core's temperature unit), ``"°F"`` becomes °C.

    Returns
    -------
    float or ndarray
        The quantity in SI [m, A/m, rad/s, N·m, ...], or in °C for a temperature.

    Raises
    ------
    KeyError
        If ``unit`` is not one of :func:`known_units`.

    References
    ----------
    .. [1] exact factors of the SI brochure, 9th ed., 2019, and NIST SP 811, 2008, appendix B
    """
    if unit == "°C":
        return value
    if unit == "°F":
        return (value - 32.0) * 5.0 / 9.0
    return value * _TO_SI[unit]


def from_si(value: Quantity, unit: str) -> Quantity:
    """Convert an SI value to an engineering unit: the inverse of :func:`to_si`.

    Parameters
    ----------
    value : float or ndarray
        The quantity in SI [m, A/m, rad/s, N·m, ...], or in °C for a temperature.
    unit : str
        The unit wanted, one of :func:`known_units`; a KeyError names any other.

    Returns
    -------
    float or ndarray
        The quantity in ``unit``: the SI value divided by the unit's factor, or t·9/5 + 32 for ``"°F"``.

    References
    ----------
    .. [1] NIST SP 811, 2008, appendix B (the same exact factors as :func:`to_si`, and °F from °C)
    """
    if unit == "°C":
        return value
    if unit == "°F":
        return value * 9.0 / 5.0 + 32.0
    return value / _TO_SI[unit]


def factor(unit: str) -> float:
    """The multiplicative factor from an engineering unit to SI.

    Parameters
    ----------
    unit : str
        One of :func:`known_units` except the temperatures, which have an offset.

    Returns
    -------
    float
        The SI value of one ``unit`` [SI unit per ``unit``].

    Raises
    ------
    KeyError
        If ``unit`` is a temperature or not a known unit.
    """
    return _TO_SI[unit]


def known_units() -> tuple[str, ...]:
    """Every unit the conversions accept.

    Returns
    -------
    tuple of str
        The unit names, temperatures (``"°C"``, ``"°F"``) last.
    """
    return (*_TO_SI, "°C", "°F")


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


def convert(value: Quantity, from_unit: str, to_unit: str) -> Quantity:
    """Convert between two engineering units of the same quantity, through SI.

    Parameters
    ----------
    value : float or ndarray
        The quantity in ``from_unit``.
    from_unit, to_unit : str
        Units of the same quantity, each one of :func:`known_units` (``"mm"`` to ``"in"``, ``"°C"`` to
        ``"°F"``).

    Returns
    -------
    float or ndarray
        The quantity in ``to_unit``.
    """
    return from_si(to_si(value, from_unit), to_unit)


def temperature_difference_to_si(value: Quantity, unit: str) -> Quantity:
    """A temperature difference in K, from °C or °F (a difference has no offset).

    Parameters
    ----------
    value : float or ndarray
        A rise or a drop of temperature, in ``unit``.
    unit : str
        ``"°C"`` (or ``"K"``) or ``"°F"``.

    Returns
    -------
    float or ndarray
        The difference [K]; one °F of difference is 5/9 K (NIST SP 811, 2008, appendix B).
    """
    return value * (5.0 / 9.0 if unit == "°F" else 1.0)


def rpm_to_rad_per_s(speed_rpm: Quantity) -> Quantity:
    """A rotational speed in rad/s from rpm.

    Parameters
    ----------
    speed_rpm : float or ndarray
        Speed [rpm].

    Returns
    -------
    float or ndarray
        Speed [rad/s]: one revolution per minute is 2π/60 rad/s.
    """
    return speed_rpm * _TO_SI["rpm"]


def rad_per_s_to_rpm(speed_rad_per_s: Quantity) -> Quantity:
    """A rotational speed in rpm from rad/s: the inverse of :func:`rpm_to_rad_per_s`.

    Parameters
    ----------
    speed_rad_per_s : float or ndarray
        Speed [rad/s].

    Returns
    -------
    float or ndarray
        Speed [rpm].
    """
    return speed_rad_per_s / _TO_SI["rpm"]
