"""Copper and round enamelled winding wire.

Copper: IEC 60028 (International standard of resistance for copper) fixes annealed copper at 20 °C
at 1/58 Ω·mm²/m (0.017241 μΩ·m) with a temperature coefficient of resistance of 0.00393 1/K (the
standard's constant-mass coefficient at 20 °C), and a density of 8890 kg/m³.

Wire sizes: American Wire Gauge diameters per ASTM B258, d = 0.127 mm · 92^((36 - n)/39), with 0000,
000, 00 and 0 as n = -3, -2, -1, 0. Metric sizes are the nominal bare diameters of IEC 60317-0-1
(R20 series). The overall diameter with enamel follows IEC 60317-0-1's grades 1, 2 and 3 (thin,
medium, thick film); the increments below are typical maxima read as a fraction of the bare diameter
plus a floor, from memory of that standard's table, accurate to a few micrometres.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

import numpy as np

from .units import to_si

COPPER_RESISTIVITY_20C = 1.0 / 58.0 * 1e-6  #: ρ20 [Ω·m], IEC 60028
COPPER_TEMP_COEFF_20C = 0.00393  #: α20 [1/K], IEC 60028
COPPER_DENSITY = 8890.0  #: [kg/m³], IEC 60028


def copper_resistivity(temperature_C):
    """Resistivity of annealed copper [Ω·m] at temperature [°C] (IEC 60028)."""
    return COPPER_RESISTIVITY_20C * (1.0 + COPPER_TEMP_COEFF_20C * (temperature_C - 20.0))


def awg_diameter(gauge: int) -> float:
    """Bare diameter of AWG ``gauge`` [m] (ASTM B258: d = 0.127 mm · 92^((36 - n)/39))."""
    return to_si(0.127 * 92.0 ** ((36 - gauge) / 39.0), "mm")


# Nominal bare diameters [mm] of IEC 60317-0-1, R20 series, 0.10 mm to 2.50 mm.
METRIC_DIAMETERS_MM = (
    0.100, 0.112, 0.125, 0.140, 0.160, 0.180, 0.200, 0.224, 0.250, 0.280, 0.315, 0.355, 0.400, 0.450,
    0.500, 0.560, 0.630, 0.710, 0.750, 0.800, 0.850, 0.900, 0.950, 1.000, 1.060, 1.120, 1.180, 1.250,
    1.320, 1.400, 1.500, 1.600, 1.700, 1.800, 1.900, 2.000, 2.120, 2.240, 2.360, 2.500,
)

# Enamel grade → (fraction of bare diameter, floor in mm) for the maximum film build on the diameter.
_ENAMEL_BUILD = {1: (0.07, 0.012), 2: (0.11, 0.020), 3: (0.15, 0.030)}

_WIRE_PATTERN = re.compile(r"^\s*(?:AWG\s*(?P<awg>\d{1,2})|(?P<mm>\d+(?:\.\d+)?)\s*mm)\s*$", re.IGNORECASE)


@dataclass(frozen=True)
class Wire:
    """A round enamelled copper wire."""

    label: str  #: as written in the project file, e.g. "AWG 24" or "0.50 mm"
    bare_diameter: float  #: [m]
    overall_diameter: float  #: with enamel [m]
    enamel_grade: int  #: IEC 60317-0-1 grade 1, 2 or 3

    @property
    def copper_area(self) -> float:
        """Cross-section of the copper [m²]."""
        return np.pi / 4.0 * self.bare_diameter**2


def parse_wire_size(label: str) -> float:
    """Bare diameter [m] from "AWG n" (n from 0 to 44) or "d mm" (an IEC 60317-0-1 R20 size)."""
    match = _WIRE_PATTERN.match(label)
    if not match:
        raise ValueError(f"wire size {label!r} is not 'AWG n' or 'd mm' (for example 'AWG 24' or '0.50 mm')")
    if match["awg"] is not None:
        gauge = int(match["awg"])
        if not 0 <= gauge <= 44:
            raise ValueError(f"wire size {label!r}: AWG must be from 0 to 44")
        return awg_diameter(gauge)
    diameter_mm = float(match["mm"])
    if not any(abs(diameter_mm - d) < 5e-4 for d in METRIC_DIAMETERS_MM):
        raise ValueError(
            f"wire size {label!r}: {diameter_mm:g} mm is not a standard metric size "
            f"(IEC 60317-0-1 R20, {METRIC_DIAMETERS_MM[0]:g} to {METRIC_DIAMETERS_MM[-1]:g} mm)"
        )
    return to_si(diameter_mm, "mm")


def overall_diameter(bare_diameter: float, enamel_grade: int) -> float:
    """Maximum overall diameter with enamel [m] for IEC 60317-0-1 grade 1, 2 or 3 (from memory)."""
    fraction, floor_mm = _ENAMEL_BUILD[enamel_grade]
    return bare_diameter + max(fraction * bare_diameter, to_si(floor_mm, "mm"))


def wire(label: str, enamel_grade: int) -> Wire:
    bare = parse_wire_size(label)
    return Wire(label=label.strip(), bare_diameter=bare, overall_diameter=overall_diameter(bare, enamel_grade),
                enamel_grade=enamel_grade)
