"""Screen units: the project file's engineering units (SI system) or US customary, for display only.

The conversions themselves live in ``core.units``; this module only decides which unit the screen
shows for a file unit, and how many decimals a spin box needs for it.
"""

from __future__ import annotations

import math

from pmdc_sizer.core.units import US_CUSTOMARY, convert

# Results stay in watts in both systems: horsepower for a 20 W motor reads worse than watts.
_KEEP_IN_US = {"W"}


class DisplayUnits:
    def __init__(self, system: str = "SI"):
        self.system = system

    @property
    def us_customary(self) -> bool:
        return self.system == "US customary"

    def screen_unit(self, unit: str) -> str:
        if self.us_customary and unit not in _KEEP_IN_US:
            return US_CUSTOMARY.get(unit, unit)
        return unit

    def to_screen(self, value, unit: str):
        shown = self.screen_unit(unit)
        return value if shown == unit or value is None else convert(value, unit, shown)

    def from_screen(self, value, unit: str):
        shown = self.screen_unit(unit)
        return value if shown == unit or value is None else convert(value, shown, unit)


def decimals_for(minimum: float | None, maximum: float | None, screen_unit: str) -> int:
    """Enough decimals to step a small part of the smallest sensible value of the range."""
    if screen_unit == "in":
        return 4
    if screen_unit in ("°C", "°F"):
        return 1
    low = abs(minimum) if minimum else 0.0
    if low == 0.0 and maximum:
        low = abs(maximum) / 1e4
    if low == 0.0:
        return 2
    return int(min(max(2 - math.floor(math.log10(low)), 1), 6))
