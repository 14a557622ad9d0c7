"""The field check of a sizing front: the comparison itself, and two designs solved on a local dask cluster."""

from __future__ import annotations

import math

import pytest

from pmdc_sizer.core import project
from pmdc_sizer.core.edits import with_values
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.field import COARSE
from pmdc_sizer.core.sizing_field_check import FLUX_TOLERANCE, check_designs, compare_flux

from ..conftest import DEMO_FOLDER


def test_compare_marks_a_difference_over_three_percent_only():
    inside = compare_flux("1", 1.029e-3, 1.0e-3)
    assert inside.difference == pytest.approx(0.029) and not inside.flagged
    over = compare_flux("2", 0.969e-3, 1.0e-3)
    assert over.difference == pytest.approx(-0.031) and over.flagged
    assert FLUX_TOLERANCE == 0.03


def test_a_failed_field_solution_is_marked_unverified():
    failed = compare_flux("3", 1.0e-3, None, "FieldInputError: the slot opening is too narrow to mesh")
    assert failed.flagged and math.isnan(failed.difference) and "mesh" in failed.error


def test_two_designs_on_a_local_cluster_agree_with_the_network():
    base = project.load(DEMO_FOLDER / "appliance_ferrite_12v.toml")
    designs = [base, with_values(base, {"magnets.thickness_mm": 5.0})]
    checks = check_designs(designs, labels=["demo", "thinner"], workers=1, options=COARSE)
    assert [c.label for c in checks] == ["demo", "thinner"]
    for design, check in zip(designs, checks, strict=True):
        assert not check.error
        assert check.fast_Wb == evaluate(design).magnetics.flux_per_pole_Wb
        assert check.difference == pytest.approx((check.fast_Wb - check.field_Wb) / check.field_Wb)
        # the reluctance network is checked to agree within 3 % on the demos (tests/core/field)
        assert abs(check.difference) < FLUX_TOLERANCE and not check.flagged
    assert checks[1].field_Wb < checks[0].field_Wb  # a thinner magnet drives less flux
