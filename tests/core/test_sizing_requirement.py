"""A search meets the requirement only where no check fails and every required margin to the knee is kept."""

from __future__ import annotations

from pathlib import Path

import numpy as np

from pmdc_sizer.core import project
from pmdc_sizer.core.batch import CHECK_KEYS, FAIL_CODE, PASS_CODE, WARNING_CODE
from pmdc_sizer.core.edits import with_values
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.sizing import SizingSpec, size
from pmdc_sizer.core.sizing_requirement import faults_must_survive, requirement_misses
from pmdc_sizer.core.sizing_space import parse_free

FERRITE = Path(__file__).resolve().parents[2] / "demo_projects" / "appliance_ferrite_12v.toml"


def _status(**codes):
    status = {key: np.array([PASS_CODE]) for key in CHECK_KEYS}
    status.update({key: np.array([code]) for key, code in codes.items()})
    return status


def test_a_margin_short_of_the_required_is_a_miss_other_warnings_are_not():
    assert not any(m[0] for m in requirement_misses(_status(tooth_flux_density=WARNING_CODE), False).values())
    assert requirement_misses(_status(demagnetization=WARNING_CODE), False)["demagnetization"][0]
    assert requirement_misses(_status(demagnetization=FAIL_CODE), False)["demagnetization"][0]
    # the faults' margin is required only where the project makes the magnets survive them
    assert requirement_misses(_status(fault_demagnetization=WARNING_CODE), True)["fault_demagnetization"][0]
    assert not requirement_misses(_status(fault_demagnetization=WARNING_CODE), False)["fault_demagnetization"][0]


def test_faults_must_survive_follows_the_supply_table():
    ferrite = project.load(FERRITE)  # "must survive if reversing", and it never reverses
    assert not faults_must_survive(ferrite)
    assert faults_must_survive(with_values(ferrite, {"supply.reversing": True}))
    assert faults_must_survive(with_values(ferrite, {"supply.fault_cases": "must survive"}))


def test_no_returned_design_keeps_less_than_the_required_margin():
    # This search once returned a 2-pole design whose rotor-removed case kept 0.46 of the 16.2 kA/m
    # required, "passing every check": a warning on the file's page, short of the requirement for a search.
    ferrite = project.load(FERRITE)
    spec = SizingSpec(free=tuple(parse_free(f, ferrite) for f in ("motor.poles=2:4", "magnets.thickness_mm=4:8",
                                                                  "winding.turns_per_coil=12:30")),
                      candidates=200, generations=1, population=200, seed=3)
    result = size(ferrite, spec)
    assert result.designs
    for design in result.designs:
        checks = {c.key: c for c in evaluate(design.project).checks}
        assert checks["demagnetization"].status == "pass", checks["demagnetization"].message
        assert all(c.status != "fail" for c in checks.values())
