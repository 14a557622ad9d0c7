"""The sizing search: what it returns passes evaluate, the front is non-dominated, the seed reproduces it."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from pmdc_sizer.core import ProjectError, evaluate, project, with_values
from pmdc_sizer.core.batch import FAIL_CODE, PASS_CODE, check_status, screening_figures
from pmdc_sizer.core.design import design_from_project, geometry_of
from pmdc_sizer.core.sizing import (
    GEOMETRY_KEYS,
    SizingCancelled,
    SizingSpec,
    project_with,
    size,
)
from pmdc_sizer.core.sizing_candidates import fitting_designs
from pmdc_sizer.core.sizing_objectives import OBJECTIVES, objective_matrix
from pmdc_sizer.core.sizing_space import free_keys, from_unit, grade_choices, parse_free, sample_unit

from ..conftest import DEMO_FOLDER

FERRITE_RANGES = ("magnets.thickness_mm=4:9", "housing.wall_mm=3:7", "winding.turns_per_coil=12:40",
                  "armature.stack_length_mm=20:28", "winding.wire=AWG 24:AWG 30")
FERRITE_GRADES = ("Y30BH", "Y35", "Y40")
OBJECTIVE_NAMES = ("mass", "efficiency")


def _spec(base, ranges, grades, **kwargs):
    free = (*(parse_free(text, base) for text in ranges), grade_choices(grades, base))
    settings = {"candidates": 256, "generations": 2, "population": 24, "seed": 5, "objectives": OBJECTIVE_NAMES}
    return SizingSpec(free=free, **{**settings, **kwargs})


@pytest.fixture(scope="module")
def ferrite_base():
    return project.load(DEMO_FOLDER / "appliance_ferrite_12v.toml")


@pytest.fixture(scope="module")
def searched(ferrite_base):
    spec = _spec(ferrite_base, FERRITE_RANGES, FERRITE_GRADES)
    return spec, size(ferrite_base, spec)


def test_the_ferrite_requirement_is_feasible(searched, ferrite_base):
    # the demo as drawn keeps less than the required margin to the knee with the rotor removed, cold (a
    # warning on the file, a miss for a search): the search, with the demo's values inside the ranges,
    # finds designs that meet the whole requirement
    assert check_status(evaluate(ferrite_base))["demagnetization"] != PASS_CODE
    _, result = searched
    assert result.feasible_count > 0 and result.designs
    assert result.explanation == "" and result.shortfalls == ()
    assert result.candidates_evaluated >= 256
    # the lightest design that meets the requirement weighs about what the demo does, which does not keep its
    # required margin to the knee (8.6 of 16.2 kA/m rotor removed): a little more magnet
    own = screening_figures(evaluate(ferrite_base))["mass.active_kg"]
    assert min(d.objectives["mass"] for d in result.designs) <= 1.05 * own
    for design in result.designs:  # and every one keeps the required margin, which the demo does not
        assert check_status(evaluate(design.project))["demagnetization"] == PASS_CODE


def test_every_returned_design_passes_evaluate(searched, ferrite_base):
    spec, result = searched
    for design in result.designs:
        codes = check_status(evaluate(design.project))
        assert all(code != FAIL_CODE for code in codes.values()), (design.values, codes)
        assert design.project == project_with(ferrite_base, design.values)
        for variable in spec.free:
            value = design.values[variable.key]
            if variable.is_choice:
                assert value in variable.choices
            else:
                assert variable.low <= value <= variable.high
        # the file keeps every key the search did not free
        assert design.project.load == ferrite_base.load and design.project.supply == ferrite_base.supply


def test_the_front_is_not_dominated_by_any_feasible_candidate(searched):
    _, result = searched
    candidates = objective_matrix(OBJECTIVE_NAMES, result.feasible_figures)
    front = [d for d in result.designs if d.pareto]
    assert front
    for design in front:
        mine = np.array([-design.objectives[n] if OBJECTIVES[n].maximise else design.objectives[n]
                         for n in OBJECTIVE_NAMES])
        slack = 1e-9 * np.maximum(np.abs(mine), 1e-12)  # evaluate agrees with the screen to 1e-9
        beats = np.all(candidates <= mine - slack, axis=1) | (
            np.all(candidates <= mine + slack, axis=1) & np.any(candidates < mine - slack, axis=1))
        assert not beats.any(), design.values


def test_the_best_design_for_each_objective(searched):
    _, result = searched
    candidates = objective_matrix(OBJECTIVE_NAMES, result.feasible_figures)
    for column, name in enumerate(OBJECTIVE_NAMES):
        best = [d for d in result.designs if name in d.best_for]
        assert len(best) == 1
        value = -best[0].objectives[name] if OBJECTIVES[name].maximise else best[0].objectives[name]
        assert value == pytest.approx(candidates[:, column].min(), rel=1e-9)


def test_the_seed_reproduces_the_result(searched, ferrite_base):
    spec, result = searched
    again = size(ferrite_base, spec)
    assert [d.values for d in again.designs] == [d.values for d in result.designs]
    assert again.feasible_count == result.feasible_count
    other = size(ferrite_base, dataclasses.replace(spec, seed=6, generations=0))
    assert [d.values for d in other.designs] != [d.values for d in result.designs]


def test_an_impossible_requirement_gives_no_design_and_says_why(ferrite_base):
    demanding = with_values(ferrite_base, {"load.speed_rpm": 60000.0})
    result = size(demanding, _spec(demanding, FERRITE_RANGES, FERRITE_GRADES, candidates=64, generations=0))
    assert result.designs == () and result.feasible_count == 0
    assert result.explanation and result.shortfalls
    assert "load" in {s.requirement for s in result.shortfalls}


def test_the_mobility_requirement_is_feasible():
    base = project.load(DEMO_FOLDER / "mobility_ndfeb_24v.toml")
    # as drawn it meets the requirement, the magnets surviving a reversal on a failed drive (N35EH); the
    # search over its region, its grade among the choices, finds designs no heavier
    assert not {c.key for c in evaluate(base).checks if c.status == "fail"}
    ranges = ("magnets.thickness_mm=2:6", "housing.wall_mm=4:10", "winding.turns_per_coil=5:14",
              "armature.stack_length_mm=35:49", "winding.wire=0.50:0.90")
    result = size(base, _spec(base, ranges, ("N42SH", "N38UH", "N35EH"), objectives=("mass",), generations=4))
    assert result.designs and all(d.project.housing.max_outer_diameter_mm == 72.0 for d in result.designs)
    own = screening_figures(evaluate(base))["mass.active_kg"]
    assert min(d.objectives["mass"] for d in result.designs) <= own


def test_the_power_tool_requirement_is_feasible_with_its_faults_reported():
    # the direct-supply faults (3.4 kA on reversal, cold: no magnet of this size survives 48 V applied
    # directly) are reported, not required: the demo states that a fuse in the pack guards a failed drive
    base = project.load(DEMO_FOLDER / "power_tool_4pole_48v.toml")
    assert base.supply.fault_cases == "report"
    assert not {c.key for c in evaluate(base).checks if c.status == "fail"}
    requirement = base
    ranges = ("magnets.thickness_mm=2:6", "housing.wall_mm=4:9", "winding.turns_per_coil=1:4",
              "armature.tooth_width_mm=2.5:5", "armature.stack_length_mm=25:50")
    result = size(requirement, _spec(requirement, ranges, ("N42SH", "N38UH", "N35EH"), objectives=("mass",),
                                     candidates=1024, generations=3, population=64, seed=1))
    assert result.designs
    assert all(c.status != "fail" for d in result.designs for c in evaluate(d.project).checks)
    own = screening_figures(evaluate(base))["mass.active_kg"]
    assert min(d.objectives["mass"] for d in result.designs) <= own


def test_cancel(ferrite_base):
    spec = _spec(ferrite_base, FERRITE_RANGES, FERRITE_GRADES, candidates=16, generations=0)
    with pytest.raises(SizingCancelled):
        size(ferrite_base, spec, lambda stage, done, total: stage != "screen" or done == 0)


def test_geometry_keys_are_those_geometry_of_reads(ferrite_base):
    reference = geometry_of(ferrite_base)
    for key in free_keys(ferrite_base):
        value = key.current + 1 if key.integer else key.current * 1.01
        if key.key == "motor.poles":
            value = 4
        section, name = key.key.split(".")
        changed = ferrite_base.model_copy(update={section: getattr(ferrite_base, section).model_copy(
            update={name: value})})
        moved = geometry_of(changed) != reference
        assert moved == (key.key in GEOMETRY_KEYS), key.key


def test_shared_designs_equal_their_own_conversion(ferrite_base):
    spec = _spec(ferrite_base, FERRITE_RANGES, FERRITE_GRADES)
    values = from_unit(spec.free, sample_unit(len(spec.free), 64, 2))
    rows, designs = fitting_designs(ferrite_base, spec.free, values)
    assert rows.size > 10
    for design in designs:
        assert design == design_from_project(design.project)


def test_the_overall_length_limit_is_a_fit_rule(ferrite_base):
    limited = with_values(ferrite_base, {"housing.max_length_mm": 40.0})
    envelope = next(c for c in evaluate(limited).checks if c.key == "envelope")
    assert envelope.status == "pass" and envelope.message == "body 40.0 mm long, within 40 mm."
    with pytest.raises(ProjectError, match=r"housing.max_length_mm: .*40 mm long.*envelope of 39 mm"):
        with_values(ferrite_base, {"housing.max_length_mm": 39.0})


def test_further_load_points_bind_the_search(ferrite_base):
    # a start-up point above the rated torque: every returned design must reach it, and some candidates do not
    demanding = with_values(ferrite_base, {"load.further_points": [{"torque_mNm": 60.0, "speed_rpm": 2900.0}]})
    result = size(demanding, _spec(demanding, FERRITE_RANGES, FERRITE_GRADES, candidates=128, generations=0,
                                   objectives=("mass",)))
    assert result.designs
    plain = size(ferrite_base, _spec(ferrite_base, FERRITE_RANGES, FERRITE_GRADES, candidates=128, generations=0,
                                     objectives=("mass",)))
    assert result.feasible_count < plain.feasible_count  # the point binds
    for design in result.designs:
        check = next(c for c in evaluate(design.project).checks if c.key == "load_points")
        assert check.status == "pass"
