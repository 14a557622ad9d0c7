"""Why a search found nothing: the closest design's misses, the binding ranges, and relaxations that were
evaluated (each one re-checked here by the per-design ``evaluate``)."""

from __future__ import annotations

import math
import re

import numpy as np
import pytest

from pmdc_sizer.core import project
from pmdc_sizer.core.batch import evaluate_many
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.edits import with_values
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.sizing import SizingSpec
from pmdc_sizer.core.sizing_shortfall import (
    Shortfall,
    binding_ranges,
    closest_candidates,
    explain,
    load_shortfall_share,
    range_extensions,
    relaxations,
)
from pmdc_sizer.core.sizing_space import FreeRange
from pmdc_sizer.core.units import to_si

from ..conftest import DEMO_FOLDER

THICKNESS = FreeRange("magnets.thickness_mm", 4.0, 8.0, False)
TURNS = FreeRange("winding.turns_per_coil", 14, 30, True)


def _batch(base, thicknesses, turns):
    values = {"magnets.thickness_mm": np.asarray(thicknesses, dtype=float),
              "winding.turns_per_coil": np.asarray(turns, dtype=np.int64)}
    designs = [design_from_project(with_values(base, {"magnets.thickness_mm": float(t),
                                                      "winding.turns_per_coil": int(n)}))
               for t, n in zip(thicknesses, turns, strict=True)]
    return evaluate_many(designs), values


@pytest.fixture(scope="module")
def ferrite():
    return project.load(DEMO_FOLDER / "appliance_ferrite_12v.toml")


@pytest.fixture(scope="module")
def slightly_too_hard(ferrite):
    """The ferrite pump asked for a little more torque than its free ranges can give at 12 V."""
    hard = with_values(ferrite, {"load.torque_mNm": 58.0})
    batch, values = _batch(hard, [4.0, 5.0, 6.0, 7.0, 8.0, 6.0, 6.0], [22, 22, 22, 22, 22, 16, 28])
    assert not batch.passes_all.any(), "the test needs a requirement no candidate meets"
    return hard, batch, values


def test_load_share_is_the_slowest_cases_missing_share_of_speed(ferrite):
    results = evaluate(ferrite)
    torque = to_si(ferrite.load.torque_mNm, "mN·m")
    speed = to_si(ferrite.load.speed_rpm, "rpm")
    batch, _ = _batch(ferrite, [ferrite.magnets.thickness_mm], [ferrite.winding.turns_per_coil])  # the file as drawn
    slowest = min(c.rated.speed_rad_per_s for c in results.cases)
    assert load_shortfall_share(batch.figures, torque, speed)[0] == pytest.approx(max(0.0, 1.0 - slowest / speed),
                                                                                  rel=1e-9, abs=1e-12)
    assert load_shortfall_share(batch.figures, torque, 0.9 * slowest)[0] == 0.0
    share = load_shortfall_share(batch.figures, torque, 1.1 * slowest)[0]
    assert share == pytest.approx(1.0 - 1.0 / 1.1, rel=1e-9)
    # a torque beyond stall ranks behind any merely slow design (share above 1)
    beyond = load_shortfall_share(batch.figures, 2.0 * max(c.stall_torque_N_m for c in results.cases), speed)[0]
    assert beyond > 1.0


def test_the_closest_candidate_fails_fewest_checks(slightly_too_hard):
    _, batch, _ = slightly_too_hard
    torque = to_si(58.0, "mN·m")
    share = load_shortfall_share(batch.figures, torque, to_si(2800.0, "rpm"))
    order = closest_candidates(batch, share)
    fails = [sum(int(batch.status[k][i] == 2) for k in batch.status) for i in order]
    assert fails == sorted(fails)
    assert len(order) == batch.size


def test_binding_ranges_name_the_end_pressed_against():
    text = binding_ranges((THICKNESS, TURNS), {"magnets.thickness_mm": 7.99, "winding.turns_per_coil": 20})
    assert text == ["magnets.thickness_mm at the high end of its range (8 mm)"]
    assert binding_ranges((THICKNESS, TURNS), {"magnets.thickness_mm": 6.0, "winding.turns_per_coil": 14}) == [
        "winding.turns_per_coil at the low end of its range (14)"]


def test_explanation_names_the_load_the_miss_and_an_evaluated_relaxation(slightly_too_hard):
    hard, batch, values = slightly_too_hard
    shortfalls, text = explain(hard, batch, values, SizingSpec(free=(THICKNESS, TURNS)))
    assert shortfalls and all(isinstance(s, Shortfall) for s in shortfalls)
    assert "None of the 7 candidates examined passes every check" in text
    # read off the closest few of a larger search, the paragraph says so
    _, of_more = explain(hard, batch, values, SizingSpec(free=(THICKNESS, TURNS)), evaluated=4000)
    assert "None of the 7 closest of the 4,000 candidates evaluated passes every check" in of_more
    assert "The closest design (magnets.thickness_mm = " in text
    assert "Re-evaluated with the requirement relaxed" in text
    # every relaxation said to pass is re-checked here, design by design, with evaluate
    voltage = re.search(r"with a ([\d.]+) V supply \(instead of 12 V\) the closest design passes", text)
    torque = re.search(r"at a rated torque of ([\d.]+) mN·m \(instead of 58 mN·m\)", text)
    assert voltage or torque, text
    order = closest_candidates(batch, load_shortfall_share(batch.figures, to_si(58.0, "mN·m"), to_si(2800.0, "rpm")))
    closest = with_values(hard, {"magnets.thickness_mm": float(values["magnets.thickness_mm"][order[0]]),
                                 "winding.turns_per_coil": int(values["winding.turns_per_coil"][order[0]])})
    assert any(c.status == "fail" for c in evaluate(closest).checks)
    if voltage:
        relaxed = evaluate(with_values(closest, {"supply.voltage_V": float(voltage.group(1))}))
        assert all(c.status != "fail" for c in relaxed.checks)
    insulation = re.search(r"with insulation class (\d+ \([A-Z]\)) \(instead of 130 \(B\)\) the closest design", text)
    if insulation:
        relaxed = evaluate(with_values(closest, {"winding.insulation_class": insulation.group(1)}))
        assert all(c.status != "fail" for c in relaxed.checks)
        # ... and it is the lowest class that does: the one below it still fails
        classes = ("130 (B)", "155 (F)", "180 (H)", "200 (N)", "220 (R)")
        below = classes[classes.index(insulation.group(1)) - 1]
        lower = evaluate(with_values(closest, {"winding.insulation_class": below}))
        assert any(c.status == "fail" for c in lower.checks)


def test_ten_times_the_torque_is_explained_with_the_stall_torque_short(ferrite):
    heavy = with_values(ferrite, {"load.torque_mNm": 350.0})
    batch, values = _batch(heavy, [4.0, 6.0, 8.0], [14, 22, 30])
    shortfalls, text = explain(heavy, batch, values, SizingSpec(free=(THICKNESS, TURNS)))
    load = next(s for s in shortfalls if s.requirement == "load")
    assert load.closest_share > 1.0 and "stall torque" in load.text and "% short" in load.text
    assert "No candidate meets rated load" in text


def test_relaxation_of_a_passing_design_is_the_smallest_step(ferrite):
    # a design that meets the requirement as it is (7.5 mm magnets keep the required margin to the knee) meets
    # it at the first refined step above 12 V and below 35 mN·m and 2800 rpm (a fifth of the grid's 2.5 %)
    passing = with_values(ferrite, {"winding.turns_per_coil": 16, "magnets.thickness_mm": 7.5})
    checks = {c.key: c.status for c in evaluate(passing).checks}
    assert all(status != "fail" for status in checks.values()) and checks["demagnetization"] == "pass"
    out = relaxations([passing], ["load"])
    assert out[0] == "with a 12.1 V supply (instead of 12 V) design 1 passes every check"
    assert "at a rated torque of 34.8 mN·m (instead of 35 mN·m) at 2800 rpm design 1 passes every check" in out
    assert "at a required speed of 2786 rpm (instead of 2800 rpm) design 1 passes every check" in out


def test_no_candidate_fits_says_so():
    from pmdc_sizer.core.batch import BatchFigures

    empty = BatchFigures({}, {}, np.zeros(0, bool), np.zeros(0, bool), ())
    shortfalls, text = explain(project.load(DEMO_FOLDER / "appliance_ferrite_12v.toml"), empty, {},
                               SizingSpec(free=(THICKNESS,)))
    assert shortfalls[0].requirement == "fit" and math.isnan(shortfalls[0].closest_share)
    assert "fit rules refuse every one" in text


def test_a_binding_range_is_widened_and_the_envelope_it_would_need_is_evaluated(ferrite):
    # a 3.5 mm wall saturates with this magnet, and the envelope is just the housing at 3.5 mm: the wall
    # range 2.5:3.5 binds, and a thicker wall passes only in a wider envelope (7.5 mm magnets: thinner ones
    # keep less than the required margin to the knee with the rotor removed, cold, whatever the wall)
    tight = with_values(ferrite, {"winding.turns_per_coil": 16, "magnets.thickness_mm": 7.5, "housing.wall_mm": 3.5,
                                  "housing.max_outer_diameter_mm": 46.8})
    assert "housing_flux_density" in {c.key for c in evaluate(tight).checks if c.status == "fail"}
    wall = FreeRange("housing.wall_mm", 2.5, 3.5, False)
    out = range_extensions(tight, (wall,), {"housing.wall_mm": 3.5})
    match = re.fullmatch(r"with housing.wall_mm = ([\d.]+) mm \(beyond the range's 3.5 mm\) it passes every check, "
                         r"but only with housing.max_outer_diameter_mm widened to ([\d.]+) mm \(it is 46.8 mm\)",
                         out[0])
    assert match, out
    wider = with_values(tight, {"housing.wall_mm": float(match.group(1)),
                                "housing.max_outer_diameter_mm": float(match.group(2)) + 0.05})
    checks = {c.key: c.status for c in evaluate(wider).checks}
    assert all(status != "fail" for status in checks.values()) and checks["demagnetization"] == "pass"
    # a value inside its range binds nothing and is not widened
    assert range_extensions(tight, (wall,), {"housing.wall_mm": 3.0}) == []


def test_a_relaxation_is_the_least_to_a_fifth_of_the_grid_step(ferrite):
    # a design slow in the cold case (7.5 mm magnets keep the margin; 22 turns are too many for 2800 rpm)
    from pmdc_sizer.core.batch import evaluate_many
    from pmdc_sizer.core.design import design_from_project
    from pmdc_sizer.core.sizing_relaxations import REFINE_POINTS, VOLTAGE_STEPS, _least_passing
    from pmdc_sizer.core.sizing_requirement import faults_must_survive, meets_requirement

    slow = with_values(ferrite, {"magnets.thickness_mm": 7.5})
    grid = [12.0 * s for s in VOLTAGE_STEPS]
    found, who, _ = _least_passing([slow], "supply.voltage_V", 12.0, grid)
    assert isinstance(found, float) and who == 0
    fine = (VOLTAGE_STEPS[1] - VOLTAGE_STEPS[0]) * 12.0 / (REFINE_POINTS + 1)
    batch = evaluate_many([design_from_project(with_values(slow, {"supply.voltage_V": v}))
                           for v in (found, found - 0.999 * fine)])
    assert meets_requirement(batch, faults_must_survive(slow)).tolist() == [True, False]
