"""Numbers for people: engineering units and no more digits than the model deserves.

The chain's inputs are typical catalogue values and its models are estimates, so results are shown to
three significant figures (two for estimates), never more.
"""

from __future__ import annotations

import math

from core.units import from_si


def significant(value: float, digits: int = 3) -> str:
    """``value`` rounded to ``digits`` significant figures, without exponent for everyday magnitudes."""
    if value is None or not math.isfinite(value):
        return "–"
    if value == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(value)))
    decimals = max(digits - 1 - magnitude, 0)
    rounded = round(value, decimals)
    if decimals == 0:
        return f"{rounded:.0f}"
    return f"{rounded:.{decimals}f}"


def quantity(value_si: float, unit: str, digits: int = 3) -> str:
    """An SI value shown in ``unit`` with its unit, e.g. ``quantity(0.0123, "mN·m")`` → "12.3 mN·m"."""
    shown = from_si(value_si, unit) if unit not in ("", "1") else value_si
    text = significant(shown, digits)
    return f"{text} {unit}" if unit not in ("", "1") else text


def percent(fraction: float, digits: int = 3) -> str:
    return f"{significant(100.0 * fraction, digits)} %"


def temperature(value_C: float) -> str:
    return f"{value_C:.0f} °C"
