"""Copper (IEC 60028) and round winding wire (ASTM B258 AWG, IEC 60317 metric sizes and enamel)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import conductors
from pmdc_sizer.core.units import to_si


def test_iec_60028_copper_constants():
    # Source: IEC 60028 (International standard of resistance for copper): annealed copper at 20 °C has
    # 1/58 Ω·mm²/m, a temperature coefficient 0.00393 1/K and a density of 8.89 g/cm³.
    assert_allclose(conductors.COPPER_RESISTIVITY_20C, 1.0 / 58.0 * 1e-6, rtol=1e-15)
    assert_allclose(conductors.COPPER_RESISTIVITY_20C, 1.7241e-8, rtol=1e-4)  # 0.017241 μΩ·m as printed
    assert conductors.COPPER_TEMP_COEFF_20C == 0.00393
    assert conductors.COPPER_DENSITY == 8890.0
    assert_allclose(conductors.copper_resistivity(20.0), conductors.COPPER_RESISTIVITY_20C, rtol=1e-15)
    assert_allclose(conductors.copper_resistivity(120.0), 1.0 / 58.0 * 1e-6 * 1.393, rtol=1e-14)
    temperatures = np.array([-40.0, 20.0, 155.0])
    assert conductors.copper_resistivity(temperatures).shape == (3,)


def test_resistance_of_a_hand_computed_wire():
    # 100 m of 0.50 mm bare copper at 75 °C, by hand from IEC 60028:
    # A = π/4·0.5² = 0.196350 mm²; R20 = (1/58)·100/0.196350 = 8.78096 Ω; R75 = R20·(1 + 0.00393·55)
    # = 8.78096·1.21615 = 10.6790 Ω. Hand arithmetic to 6 digits: 1e-5.
    wire = conductors.wire("0.50 mm", 2)
    resistance = conductors.copper_resistivity(75.0) * 100.0 / wire.copper_area
    assert_allclose(wire.copper_area, 0.196350e-6, rtol=1e-5)
    assert_allclose(conductors.copper_resistivity(20.0) * 100.0 / wire.copper_area, 8.78096, rtol=1e-5)
    assert_allclose(resistance, 10.6790, rtol=1e-5)


# ASTM B258 tabulated diameters in inches (from memory of the standard's table), rounded there to
# 0.0001 in: the formula must land within half of that last digit, 0.00005 in.
ASTM_B258_INCHES = {
    -3: 0.4600,  # 0000
    0: 0.3249,
    10: 0.1019,
    14: 0.0641,
    18: 0.0403,
    20: 0.0320,
    24: 0.0201,
    26: 0.0159,
    30: 0.0100,
    36: 0.0050,
    40: 0.0031,
}


@pytest.mark.parametrize("gauge", sorted(ASTM_B258_INCHES))
def test_awg_diameters_per_astm_b258(gauge):
    # Source: ASTM B258 (from memory): d = 0.005 in · 92^((36 - n)/39).
    assert abs(conductors.awg_diameter(gauge) - to_si(ASTM_B258_INCHES[gauge], "in")) <= to_si(0.00005, "in")


@pytest.mark.parametrize(("gauge", "millimetres"), [(10, 2.588), (20, 0.8128), (24, 0.5106), (30, 0.2540)])
def test_awg_diameters_in_millimetres(gauge, millimetres):
    # Source: ASTM B258 metric equivalents as usually quoted (from memory); AWG 20 and 30 are quoted as
    # the inch table's 0.0320 and 0.0100 in, which the formula misses by up to 1.3 μm (see above).
    assert_allclose(conductors.awg_diameter(gauge), to_si(millimetres, "mm"), atol=to_si(0.0013, "mm"))


def test_awg_steps():
    # Three gauges double the area (to 0.25 %): (92^(3/39))² ≈ 2.005 (ASTM B258's geometric series).
    ratio = (conductors.awg_diameter(21) / conductors.awg_diameter(24)) ** 2
    assert_allclose(ratio, 92.0 ** (6.0 / 39.0), rtol=1e-12)
    assert_allclose(ratio, 2.005, rtol=1e-3)


@pytest.mark.parametrize(
    ("label", "millimetres"),
    [("AWG 24", None), ("awg24", None), (" 0.50 mm", 0.5), ("1.12mm", 1.12), ("0.1 mm", 0.1), ("2.50 mm", 2.5)],
)
def test_wire_labels(label, millimetres):
    diameter = conductors.parse_wire_size(label)
    if millimetres is None:
        assert diameter == conductors.awg_diameter(24)
    else:
        assert_allclose(diameter, to_si(millimetres, "mm"), rtol=1e-12)


@pytest.mark.parametrize("label", ["AWG 45", "0.47 mm", "3.0 mm", "24", "AWG", "half a millimetre", "0.5"])
def test_bad_wire_labels_name_the_problem(label):
    with pytest.raises(ValueError, match="wire size"):
        conductors.parse_wire_size(label)


def test_metric_sizes_are_the_r20_series():
    # IEC 60317-0-1 nominal diameters follow the R20 preferred numbers (ratio 10^(1/20) ≈ 1.122) with a
    # few R40 intermediates, rounded (from memory of the standard's table): successive ratios 1.05 to 1.15.
    sizes = np.array(conductors.METRIC_DIAMETERS_MM)
    ratios = sizes[1:] / sizes[:-1]
    assert np.all(ratios > 1.04) and np.all(ratios < 1.15)
    assert {0.1, 0.5, 1.0, 2.0} <= set(conductors.METRIC_DIAMETERS_MM)


def test_enamel_grades_thicken_in_order():
    # IEC 60317-0-1: grade 1 < grade 2 < grade 3 film build (from memory, see core.conductors).
    for label in ("0.10 mm", "0.50 mm", "AWG 20", "2.00 mm"):
        bare = conductors.parse_wire_size(label)
        d1, d2, d3 = (conductors.overall_diameter(bare, grade) for grade in (1, 2, 3))
        assert bare < d1 < d2 < d3
        # a medium (grade 2) film adds a few percent to about a quarter of the bare diameter
        assert 1.02 < d2 / bare < 1.25


def test_grade_2_overall_diameter_of_half_a_millimetre():
    # IEC 60317-0-1 grade 2 maximum overall diameter of 0.50 mm wire is 0.554 mm (from memory);
    # the core's fraction-plus-floor rule is stated to a few micrometres.
    wire = conductors.wire("0.50 mm", 2)
    assert abs(wire.overall_diameter - to_si(0.554, "mm")) <= to_si(0.005, "mm")
    assert wire.enamel_grade == 2 and wire.label == "0.50 mm"
    assert_allclose(wire.copper_area, math.pi / 4.0 * (0.5e-3) ** 2, rtol=1e-14)


@pytest.mark.parametrize(("label", "first", "last", "count"), [
    ("AWG 26", "AWG 0", "AWG 44", 45), ("0.71 mm", "0.100 mm", "2.500 mm", len(conductors.METRIC_DIAMETERS_MM))])
def test_a_wire_size_names_its_own_series(label, first, last, count):
    series = conductors.wire_series(label)
    assert (series[0], series[-1], len(series)) == (first, last, count)
    assert all(conductors.parse_wire_size(size) > 0 for size in series)  # each one a size a file may hold
    with pytest.raises(ValueError, match="wire size"):
        conductors.wire_series("AWG 50")
