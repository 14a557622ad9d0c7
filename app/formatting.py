"""Numbers for people: engineering units and no more digits than the model deserves.

The chain's inputs are typical catalogue values and its models are estimates, so results are shown to
three significant figures (two for estimates), never more.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable

from pmdc_sizer.core.checks import quoted_text
from pmdc_sizer.core.results import Check, QuotedValue
from pmdc_sizer.core.units import convert, factor, from_si, known_units


def significant(value: float, digits: int = 3) -> str:
    """``value`` rounded to ``digits`` significant figures, without exponent for everyday magnitudes."""
    if value is None or not math.isfinite(value):
        return "–"
    if value == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(value)))
    decimals = digits - 1 - magnitude
    rounded = round(value, decimals)
    if rounded != 0 and math.floor(math.log10(abs(rounded))) > magnitude:
        decimals -= 1  # 9.996 rounds up to 10.0: one decimal fewer keeps the count of figures
        rounded = round(value, decimals)
    if decimals <= 0:
        # Past the decimal point the figures beyond ``digits`` become zeros: 23389 → "23400".
        return f"{rounded:.0f}"
    return f"{rounded:.{decimals}f}"


#: How a unit key of core.units is printed for people, where the key is spelt in plain ASCII.
UNIT_LABELS = {"ohm": "Ω", "mohm": "mΩ", "mm2": "mm²", "m2": "m²", "A/mm2": "A/mm²", "g·cm2": "g·cm²",
               "kg·m2": "kg·m²", "kJ/m3": "kJ/m³", "kN·m/m3": "kN·m/m³", "kg/m3": "kg/m³", "W/(m2·K)": "W/(m²·K)",
               "uWb": "µWb", "oz·in2": "oz·in²"}


def unit_label(unit: str) -> str:
    return UNIT_LABELS.get(unit, unit)


def quantity(value_si: float, unit: str, digits: int = 3) -> str:
    """An SI value shown in ``unit`` with its unit, e.g. ``quantity(0.0123, "mN·m")`` → "12.3 mN·m"."""
    shown = from_si(value_si, unit) if unit not in ("", "1") else value_si
    text = significant(shown, digits)
    return f"{text} {unit_label(unit)}" if unit not in ("", "1") else text


def percent(fraction: float, digits: int = 3) -> str:
    return f"{significant(100.0 * fraction, digits)} %"


def temperature(value_C: float) -> str:
    return f"{value_C:.0f} °C"


def ratio(value_si: float, numerator_unit: str, denominator_unit: str, digits: int = 3) -> str:
    """A ratio of two quantities in engineering units, e.g. a speed-torque gradient in rpm/mN·m."""
    shown = from_si(value_si, numerator_unit) * factor(denominator_unit)
    return f"{significant(shown, digits)} {unit_label(numerator_unit)}/{unit_label(denominator_unit)}"


def money(amount: float, currency: str, digits: int = 3) -> str:
    return f"{significant(amount, digits)} {currency}"


def significant_figures(text: str) -> int:
    """How many significant figures a number written as ``text`` shows: "45.8" → 3, "0.0457" → 3, "8.0" → 2,
    "2890" → 4 (trailing zeros of a whole number count: the writer chose them)."""
    digits = "".join(ch for ch in text if ch.isdigit()).lstrip("0")
    return max(len(digits), 1)


def quoted_in(quoted: QuotedValue, unit: str) -> str:
    """A number a check quotes, in ``unit`` (a view's unit for ``quoted.unit``), to the same significant figures.

    In its own unit it reads exactly as the check's message; in another, a temperature keeps the message's
    decimals (°C to °F: whole degrees stay whole degrees) and anything else its count of significant figures.
    """
    if unit == quoted.unit:
        return quoted_text(quoted)
    shown = from_si(quoted.value, unit)
    own = quoted_text(QuotedValue(quoted.value, quoted.unit, quoted.digits, quoted.spec, bare=True))
    if unit in ("°C", "°F"):
        decimals = len(own.partition(".")[2])
        number = f"{shown:.{decimals}f}"
    else:
        # A number rounded to significant figures keeps their count; one written with a format spec ("45.8"
        # from ".1f") keeps as many as its text shows.
        number = significant(shown, significant_figures(own) if quoted.spec else quoted.digits)
    return number if quoted.bare else f"{number} {unit_label(unit)}"


def check_message(check: Check, unit_of: Callable[[str], str]) -> str:
    """A check's message with its quoted numbers in the view's units (``unit_of`` maps a unit to the shown one)."""
    if not check.quoted:
        return check.message
    return check.filled([quoted_in(q, unit_of(q.unit)) for q in check.quoted])


def check_sentence(check: Check, unit_of: Callable[[str], str]) -> str:
    """Title, message in the view's units and advice as one line."""
    return check.sentence_with(check_message(check, unit_of))


def in_view_units(text: str, unit_of: Callable[[str], str]) -> str:
    """Free text with every "number unit" it quotes in the view's units ("9.6 mm" → "0.378 in").

    For sentences composed from many parts (a sizing search's explanation, its shortfalls), where a check's
    template of quoted values (:func:`check_message`) does not reach. A temperature keeps its decimals (whole
    degrees stay whole); anything else the significant figures it was written with, at least three, so that a
    range end written "8 mm" reads "0.315 in". Units the view leaves alone, and numbers without a unit, stay
    as written.
    """
    changed = sorted((u for u in known_units() if unit_of(u) != u), key=len, reverse=True)
    if not changed:
        return text
    pattern = re.compile(r"(?<![\w.])(-?\d+(?:\.\d+)?) (" + "|".join(map(re.escape, changed)) + r")(?![\w·/²])")

    def shown(match: re.Match[str]) -> str:
        number, unit = match.group(1), match.group(2)
        target = unit_of(unit)
        value = convert(float(number), unit, target)
        if unit in ("°C", "°F"):
            written = f"{value:.{len(number.partition('.')[2])}f}"
        else:
            written = significant(value, max(significant_figures(number), 3))
        return f"{written} {unit_label(target)}"

    return pattern.sub(shown, text)
