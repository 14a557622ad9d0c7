"""The named cases of a design follow the fast model's demagnetization cases."""

from __future__ import annotations

import pytest

from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.field import CASE_NAMES, FieldCase, field_cases
from pmdc_sizer.core.project import load


def test_cases_of_every_demo(demo_path):
    design = design_from_project(load(demo_path))
    results = evaluate(design)
    cases = field_cases(design, results)
    names = [c.name for c in cases]
    assert names[0] == "no-load" and cases[0].magnet_temperature_C == results.magnetics.temperature_C
    assert names == [n for n in CASE_NAMES if n in names]  # in the table's order, each once
    fast = {c.name: c for c in results.demagnetization.cases}
    for case in cases[1:]:
        mirror = fast[case.demagnetization_case]
        assert case.magnet_temperature_C == mirror.temperature_C and case.current_A == mirror.current_A
        assert case.name.startswith({"stall": "stall", "reversal": "reversal", "current limit": "drive-limit",
                                     "rotor removed": "rotor-removed"}[mirror.kind])
    assert {"rotor-removed-cold", "rotor-removed-hot", "stall-cold", "stall-hot"} <= set(names)
    if not design.reversing:
        assert not any(n.startswith("reversal") for n in names)


def test_a_case_without_current_cannot_carry_one():
    with pytest.raises(ValueError, match="no armature current"):
        FieldCase("no-load", "no load", 20.0, current_A=5.0)
    with pytest.raises(ValueError, match="kind"):
        FieldCase("x", "sideways", 20.0)
