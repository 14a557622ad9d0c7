"""The knee of the intrinsic curve: its logistic shape and its fit to a grade's Hk and HcB."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import library
from pmdc_sizer.core import magnets as mg
from pmdc_sizer.core.magnet_grades import GradeDataError
from pmdc_sizer.core.magnet_knee import (
    EXPONENTIAL_LIMIT_WIDTHS,
    knee_fraction,
    knee_fraction_inverse,
    knee_shape,
)
from pmdc_sizer.core.units import MU_0

GRADES = library.magnet_grades()
SHAPES = [(0.0, 0.3), (0.6, 0.03), (0.97, 0.004), (1.2, 0.02), (1.0 + EXPONENTIAL_LIMIT_WIDTHS * 0.05, 0.05)]


@pytest.mark.parametrize(("centre", "width"), SHAPES)
def test_knee_fraction_runs_from_zero_to_one_and_rises(centre, width):
    assert_allclose(knee_fraction(0.0, centre, width), 0.0, atol=1e-15)
    assert_allclose(knee_fraction(1.0, centre, width), 1.0, rtol=1e-12)
    x = np.linspace(0.0, 1.0, 2001)
    assert np.all(np.diff(knee_fraction(x, centre, width)) >= 0.0)


@pytest.mark.parametrize(("centre", "width"), SHAPES)
def test_knee_fraction_inverse_is_its_inverse(centre, width):
    x = np.array([0.3, 0.8, 0.95, 0.999])
    fraction = knee_fraction(x, centre, width)
    keep = fraction > 1e-12  # far below the step the fraction underflows and x is not recoverable
    assert_allclose(knee_fraction_inverse(fraction[keep], centre, width), x[keep], rtol=1e-9)


def test_the_exponential_limit_is_the_one_parameter_knee():
    # With the centre 30 widths beyond HcJ the step is the exponential knee of the earlier model,
    # (exp((x - 1)/w) - exp(-1/w)) / (1 - exp(-1/w)), to ~1e-13 relative.
    width = 0.02
    x = np.linspace(0.0, 1.0, 501)
    exponential = (np.exp((x - 1.0) / width) - np.exp(-1.0 / width)) / (1.0 - np.exp(-1.0 / width))
    assert_allclose(knee_fraction(x, 1.0 + EXPONENTIAL_LIMIT_WIDTHS * width, width), exponential,
                    rtol=1e-11, atol=1e-300)


@pytest.mark.parametrize("name", sorted(GRADES))
def test_the_knee_passes_through_hk(name):
    # Hk is the field at which J = 0.9·Br (IEC 60404-5 usage, from memory); the fit pins it exactly.
    grade = GRADES[name]
    hk = grade.squareness * grade.coercivity_hcj
    assert_allclose(mg.polarization(grade, -hk, 20.0), 0.9 * grade.remanence, rtol=1e-9)


@pytest.mark.parametrize("name", sorted(GRADES))
@pytest.mark.parametrize("temperature_C", [-40.0, 20.0, 150.0])
def test_curves_at_temperature_are_monotone_and_keep_br_and_hcj(name, temperature_C):
    grade = GRADES[name]
    br = float(mg.remanence_at(grade, temperature_C))
    hcj = float(mg.intrinsic_coercivity_at(grade, temperature_C))
    h = np.linspace(-hcj, 0.0, 3001)
    j = mg.polarization(grade, h, temperature_C)
    assert np.all(np.diff(j) >= 0.0) and np.all(np.diff(mg.flux_density(grade, h, temperature_C)) > 0.0)
    assert_allclose(j[-1], br, rtol=1e-14)
    assert_allclose(j[0], 0.0, atol=1e-12)
    # never above the recoil line: the knee only takes polarization away
    assert np.all(j <= br + MU_0 * (grade.recoil_permeability - 1.0) * h + 1e-12)


@pytest.mark.parametrize("name", [n for n, g in GRADES.items() if knee_shape(g).through_hcb])
def test_a_knee_through_hcb_is_used_only_where_hcb_lies_on_the_knee(name):
    # the fit goes through HcB only where J there lies more than KNEE_LOSS_FRACTION·Br below the recoil line
    grade = GRADES[name]
    recoil_line = grade.remanence - MU_0 * (grade.recoil_permeability - 1.0) * grade.coercivity_hcb
    assert recoil_line - MU_0 * grade.coercivity_hcb > mg.KNEE_LOSS_FRACTION * grade.remanence


def test_a_squareness_the_recoil_line_cannot_reach_is_refused_by_key():
    grade = dataclasses.replace(GRADES["Y30"], recoil_permeability=1.4, squareness=0.9)
    knee_shape.cache_clear()
    with pytest.raises(GradeDataError, match=r"'Y30'.*squareness 0\.9") as caught:
        knee_shape(grade)
    assert caught.value.key == "squareness"


def test_many_lots_fitted_at_once_have_the_knee_each_has_alone():
    # knee_shapes scans the widths of every lot in one root finding; the bracket it picks, and so the fit,
    # must be the one knee_shape picks lot by lot
    from pmdc_sizer.core.magnet_knee import knee_shapes
    from pmdc_sizer.core.tolerances import lot_grade

    rng = np.random.default_rng(7)
    for name in ("Y30BH", "Y40", "N35"):
        if name not in GRADES:
            continue
        lots = lot_grade(GRADES[name], rng.uniform(0.96, 1.04, 40), rng.uniform(0.9, 1.1, 40))
        knee_shape.cache_clear()
        together = knee_shapes(lots)
        knee_shape.cache_clear()
        assert together == [knee_shape(lot) for lot in lots], name
    assert any(shape.through_hcb for shape in together)  # the two-point fit was exercised


def test_lots_as_arrays_give_each_lot_its_knee_and_coercivity():
    from pmdc_sizer.core.tolerances import lot_grade

    lots = lot_grade(GRADES["Y30BH"], np.array([0.97, 1.0, 1.03]), np.array([1.05, 1.0, 0.93]))
    arrays = mg.grade_lots(lots)
    temperatures = np.array([-20.0, 23.0, 95.0])
    assert_allclose(mg.knee_field_at(arrays, temperatures),
                    [float(mg.knee_field_at(lot, t)) for lot, t in zip(lots, temperatures, strict=True)], rtol=1e-15)
    assert_allclose(mg.intrinsic_coercivity_at(arrays.at(np.array([2, 2])), 60.0),
                    float(mg.intrinsic_coercivity_at(lots[2], 60.0)), rtol=1e-15)
