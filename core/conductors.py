"""Copper and round enamelled winding wire.

Copper: IEC 60028 (International standard of resistance for copper) fixes annealed copper at 20 °C
at 1/58 Ω·mm²/m (0.017241 μΩ·m) with a temperature coefficient of resistance of 0.00393 1/K (the
standard's constant-mass coefficient at 20 °C), and a density of 8890 kg/m³.

Wire sizes: American Wire Gauge diameters per ASTM B258, d = 0.127 mm · 92^((36 - n)/39), with 0000,
000, 00 and 0 as n = -3, -2, -1, 0. Metric sizes are the nominal bare diameters of IEC 60317-0-1
(R20 series). The overall diameter with enamel follows IEC 60317-0-1's grades 1, 2 and 3 (thin,
medium, thick film); the increments below are typical maxima read as a fraction of the bare diameter
plus a floor, from memory of that standard's table, accurate to a few micrometres.

References
----------
.. [1] IEC 60028:1925, International standard of resistance for copper.
.. [2] ASTM B258, Standard specification for standard nominal diameters and cross-sectional areas of
   AWG sizes of solid round wires used as electrical conductors.
.. [3] IEC 60317-0-1, Specifications for particular types of winding wires, part 0-1: general
   requirements, enamelled round copper wire (the grade increments here are from memory).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

import numpy as np

from .units import from_si, to_si

COPPER_RESISTIVITY_20C = 1.0 / 58.0 * 1e-6  #: ρ20 [Ω·m], IEC 60028
COPPER_TEMP_COEFF_20C = 0.00393  #: α20 [1/K], IEC 60028
COPPER_DENSITY = 8890.0  #: [kg/m³], IEC 60028


def copper_resistivity(temperature_C: float | np.ndarray) -> float | np.ndarray:
    """Resistivity of annealed copper at a temperature, ρ(T) = ρ20·(1 + α20·(T - 20 °C)).

    Parameters
    ----------
    temperature_C : float or ndarray
        Conductor temperature [°C].

    Returns
    -------
    float or ndarray
        Resistivity [Ω·m].

    References
    ----------
    .. [1] IEC 60028:1925: ρ20 = 1/58 Ω·mm²/m and α20 = 0.00393 1/K for annealed copper.
    """
    return COPPER_RESISTIVITY_20C * (1.0 + COPPER_TEMP_COEFF_20C * (temperature_C - 20.0))


def awg_diameter(gauge: int) -> float:
    """Bare diameter of an American Wire Gauge size, d = 0.127 mm · 92^((36 - n)/39).

    Parameters
    ----------
    gauge : int
        The gauge number n [1]: 0 to 44, or -1, -2, -3 for 00, 000 and 0000.

    Returns
    -------
    float
        Bare diameter [m].

    References
    ----------
    .. [1] ASTM B258, the defining formula of the AWG diameters.
    """
    # float ** float is typed Any (a negative base would give a complex); this base is positive
    return to_si(float(0.127 * 92.0 ** ((36 - gauge) / 39.0)), "mm")


# Nominal bare diameters [mm] of IEC 60317-0-1, R20 series, 0.10 mm to 2.50 mm.
METRIC_DIAMETERS_MM = (
    0.100, 0.112, 0.125, 0.140, 0.160, 0.180, 0.200, 0.224, 0.250, 0.280, 0.315, 0.355, 0.400, 0.450,
    0.500, 0.560, 0.630, 0.710, 0.750, 0.800, 0.850, 0.900, 0.950, 1.000, 1.060, 1.120, 1.180, 1.250,
    1.320, 1.400, 1.500, 1.600, 1.700, 1.800, 1.900, 2.000, 2.120, 2.240, 2.360, 2.500,
)

#: The AWG gauges a project file may name (ASTM B258), thickest first.
AWG_GAUGES = tuple(range(45))  # AWG 0 to 44

# IEC 60317-0-1's tolerance on the nominal conductor diameter: (largest nominal diameter of the band, ±),
# both in mm; above the last band, 1 % of the diameter rounded up to the micrometre. From memory of the
# standard's table, read against a wire maker's table under IS 13730-0-1 (India's adoption of IEC
# 60317-0-1), which agrees on every listed size to within 0.001 mm. The standard states no diameter
# tolerance below 0.063 mm (the resistance per metre governs there); 0.002 mm is assumed (common practice,
# no source).
_DIAMETER_TOLERANCE_BANDS_MM = ((0.063, 0.002), (0.224, 0.003), (0.315, 0.004), (0.500, 0.005), (0.630, 0.006))


def diameter_tolerance(bare_diameter: float) -> float:
    """The ± on the bare diameter of a round enamelled copper wire, per IEC 60317-0-1.

    Parameters
    ----------
    bare_diameter : float
        Nominal bare (conductor) diameter [m].

    Returns
    -------
    float
        Tolerance [m], plus or minus.

    References
    ----------
    .. [1] IEC 60317-0-1, table of conductor dimensions: ±0.003 mm up to 0.224 mm, ±0.004 mm to 0.315 mm,
       ±0.005 mm to 0.500 mm, ±0.006 mm to 0.630 mm, then 1 % of the nominal diameter (from memory; see
       ``_DIAMETER_TOLERANCE_BANDS_MM``).
    """
    diameter_mm = float(from_si(bare_diameter, "mm"))
    for largest_mm, tolerance_mm in _DIAMETER_TOLERANCE_BANDS_MM:
        if diameter_mm <= largest_mm + 1e-9:
            return to_si(tolerance_mm, "mm")
    return to_si(math.ceil(round(diameter_mm * 10.0, 9)) / 1000.0, "mm")  # 1 % in mm, up to the next µm


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
    """Bare diameter of a wire size as a project file writes it.

    Parameters
    ----------
    label : str
        ``"AWG n"`` with n from 0 to 44, or ``"d mm"`` with d a nominal size of IEC 60317-0-1 (R20
        series, 0.10 to 2.50 mm), e.g. ``"AWG 24"`` or ``"0.50 mm"``.

    Returns
    -------
    float
        Bare diameter [m].

    Raises
    ------
    ValueError
        Naming the label and what is accepted, if it is neither form or not a standard size.

    References
    ----------
    .. [1] ASTM B258 (AWG) and IEC 60317-0-1 (metric nominal diameters).
    """
    match = _WIRE_PATTERN.match(label)
    if not match:
        raise ValueError(f"wire size {label!r} is not 'AWG n' or 'd mm' (for example 'AWG 24' or '0.50 mm')")
    if match["awg"] is not None:
        gauge = int(match["awg"])
        if gauge not in AWG_GAUGES:
            raise ValueError(f"wire size {label!r}: AWG must be from {AWG_GAUGES[0]} to {AWG_GAUGES[-1]}")
        return awg_diameter(gauge)
    diameter_mm = float(match["mm"])
    if not any(abs(diameter_mm - d) < 5e-4 for d in METRIC_DIAMETERS_MM):
        raise ValueError(
            f"wire size {label!r}: {diameter_mm:g} mm is not a standard metric size "
            f"(IEC 60317-0-1 R20, {METRIC_DIAMETERS_MM[0]:g} to {METRIC_DIAMETERS_MM[-1]:g} mm)"
        )
    return to_si(diameter_mm, "mm")


def wire_series(label: str) -> tuple[str, ...]:
    """Every standard size of the series a wire size belongs to, as a project file writes them.

    Parameters
    ----------
    label : str
        A size as in :func:`parse_wire_size`: ``"AWG 24"`` names the AWG series, ``"0.50 mm"`` the metric one.

    Returns
    -------
    tuple of str
        ``"AWG 0"`` ... ``"AWG 44"`` (thickest first), or the R20 metric sizes ``"0.100 mm"`` ... ``"2.500 mm"``
        (thinnest first).

    Raises
    ------
    ValueError
        If the label is not a standard size (see :func:`parse_wire_size`).

    References
    ----------
    .. [1] ASTM B258 (AWG) and IEC 60317-0-1 (metric nominal diameters).
    """
    parse_wire_size(label)
    if _WIRE_PATTERN.match(label)["awg"] is not None:  # type: ignore[index]
        return tuple(f"AWG {gauge}" for gauge in AWG_GAUGES)
    return tuple(f"{d:.3f} mm" for d in METRIC_DIAMETERS_MM)


def overall_diameter(bare_diameter: float, enamel_grade: int) -> float:
    """Maximum overall diameter of an enamelled wire: the bare diameter plus the film build.

    The build on the diameter is the larger of a fraction of the bare diameter and a floor, per grade.

    Parameters
    ----------
    bare_diameter : float
        Bare copper diameter [m].
    enamel_grade : int
        IEC 60317-0-1 grade [1]: 1 (thin), 2 (medium) or 3 (thick film).

    Returns
    -------
    float
        Overall diameter with enamel [m], a maximum, accurate to a few micrometres.

    References
    ----------
    .. [1] IEC 60317-0-1, table of maximum overall diameters; the fractions and floors here are read
       from that table from memory.
    """
    fraction, floor_mm = _ENAMEL_BUILD[enamel_grade]
    return bare_diameter + max(fraction * bare_diameter, to_si(floor_mm, "mm"))


def wire(label: str, enamel_grade: int) -> Wire:
    """The enamelled round wire of a size label and an enamel grade.

    Parameters
    ----------
    label : str
        Size as in :func:`parse_wire_size`, e.g. ``"AWG 24"`` or ``"0.50 mm"``.
    enamel_grade : int
        IEC 60317-0-1 grade [1]: 1, 2 or 3.

    Returns
    -------
    Wire
        Bare and overall diameters [m], with the label as given (stripped).

    Raises
    ------
    ValueError
        If the label is not a standard size (see :func:`parse_wire_size`).
    """
    bare = parse_wire_size(label)
    return Wire(label=label.strip(), bare_diameter=bare, overall_diameter=overall_diameter(bare, enamel_grade),
                enamel_grade=enamel_grade)
