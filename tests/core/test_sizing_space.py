"""The free variables of a search: parsing with the schema's limits, choices, and the seeded sample."""

from __future__ import annotations

import numpy as np
import pytest

from pmdc_sizer.core import ProjectError, project
from pmdc_sizer.core.conductors import METRIC_DIAMETERS_MM, parse_wire_size
from pmdc_sizer.core.sizing_space import (
    free_keys,
    from_unit,
    grade_choices,
    parse_free,
    sample_unit,
    steel_choices,
)

from ..conftest import DEMO_FOLDER


@pytest.fixture(scope="module")
def base():
    return project.load(DEMO_FOLDER / "mobility_ndfeb_24v.toml")


def test_numeric_and_integer_ranges(base):
    thickness = parse_free("magnets.thickness_mm=10:2", base)
    assert (thickness.low, thickness.high, thickness.integer) == (2.0, 10.0, False)
    turns = parse_free("winding.turns_per_coil=10:60", base)
    assert (turns.low, turns.high, turns.integer) == (10.0, 60.0, True)
    poles = parse_free("motor.poles=2:5", base)
    assert poles.choices == ("2", "4") and poles.integer


#: Keys a search cannot free: (range, what the message says besides the key).
_NOT_FREE = [
    ("magnets.thicknes_mm=1:2", "no such key"),
    ("winding.type=1:2", "not a numeric key"),
    ("load.speed_rpm=100:200", "requirement"),
    ("housing.max_outer_diameter_mm=50:60", "requirement"),
    ("brushes.width_mm=1:3", "leaves this optional key out"),
]
#: Ranges a free key's own limits or form refuse: (range, the limit or form the message names).
_REFUSED_RANGES = [
    ("magnets.thickness_mm=0.1:10", "0.1", "0.5 to 40 mm"),
    ("armature.slots=2:30", "3 to 72"),
    ("winding.turns_per_coil=1.5:3", "whole number"),
    ("magnets.thickness_mm=2", "LOW:HIGH"),
    ("magnets.thickness_mm=a:3", "not a number"),
    ("winding.wire=0.05:0.5", "0.1 to 2.5 mm"),
    ("winding.wire=AWG 22:0.5", "both ends"),
    ("winding.wire=AWG 20:AWG 50", "AWG must be from 0 to 44"),
]


@pytest.mark.parametrize(("text", "words"), [(text, words) for text, *words in _NOT_FREE + _REFUSED_RANGES])
def test_parse_errors_name_the_key_and_the_limit(base, text, words):
    with pytest.raises(ProjectError) as caught:
        parse_free(text, base)
    for word in (text.partition("=")[0], *words):
        assert word in str(caught.value)


def test_wire_ranges_are_the_standard_series(base):
    awg = parse_free("winding.wire=AWG 30:AWG 22", base)
    assert awg.choices == tuple(f"AWG {n}" for n in range(22, 31))
    metric = parse_free("winding.wire=0.30:0.60", base)
    expected = tuple(f"{d:.3f} mm" for d in METRIC_DIAMETERS_MM if 0.30 <= d <= 0.60)
    assert metric.choices == expected == ("0.315 mm", "0.355 mm", "0.400 mm", "0.450 mm", "0.500 mm", "0.560 mm")
    for size in metric.choices:  # each one a size the file accepts, as written
        assert abs(parse_wire_size(size) - float(size.split()[0]) * 1e-3) < 1e-12


def test_grades_and_steels(base):
    assert grade_choices(["N42SH", "N35", "N42SH"], base).choices == ("N42SH", "N35")
    with pytest.raises(ProjectError, match=r"magnets.grade: unknown grade 'N99'.*known: .*N35"):
        grade_choices(["N99"], base)
    with pytest.raises(ProjectError, match=r"armature\.steel"):
        steel_choices("armature.steel", ["no such steel"], base)
    assert parse_free("magnets.grade=N35,N42", base).choices == ("N35", "N42")


def test_free_keys_list_motor_keys_only(base):
    keys = {k.key: k for k in free_keys(base)}
    assert keys["magnets.thickness_mm"].current == base.magnets.thickness_mm
    assert keys["magnets.thickness_mm"].low_limit == 0.5 and keys["magnets.thickness_mm"].unit == "mm"
    assert keys["armature.slots"].integer and keys["motor.poles"].integer
    assert not any(k.startswith(("load.", "supply.", "temperatures.", "tolerances.", "prices.")) for k in keys)
    assert "housing.max_outer_diameter_mm" not in keys and "brushes.width_mm" not in keys


def test_sample_is_seeded_and_maps_to_the_box(base):
    free = (parse_free("magnets.thickness_mm=2:10", base), parse_free("winding.turns_per_coil=10:12", base),
            grade_choices(["N35", "N42", "N42SH"], base))
    first, again, other = sample_unit(3, 256, 7), sample_unit(3, 256, 7), sample_unit(3, 256, 8)
    assert np.array_equal(first, again) and not np.array_equal(first, other)
    values = from_unit(free, first)
    assert values["magnets.thickness_mm"].min() >= 2.0 and values["magnets.thickness_mm"].max() <= 10.0
    assert values["winding.turns_per_coil"].dtype.kind == "i"
    # equal-width bins: every whole number and every grade gets its share of a space-filling sample
    counts = np.unique(values["winding.turns_per_coil"], return_counts=True)
    assert list(counts[0]) == [10, 11, 12] and counts[1].min() >= 256 // 3 - 2
    grades = np.unique(values["magnets.grade"], return_counts=True)
    assert set(grades[0]) == {"N35", "N42", "N42SH"} and grades[1].min() >= 256 // 3 - 2
    lhs = sample_unit(2, 50, 3, "lhs")
    # a Latin hypercube has exactly one point in each of the 50 strata of each axis
    assert all(np.array_equal(np.sort((lhs[:, j] * 50).astype(int)), np.arange(50)) for j in range(2))
