"""Magnet grades and the demagnetization-curve model at temperature."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import library
from pmdc_sizer.core import magnet_curve_figures as curve_figures
from pmdc_sizer.core import magnets as mg
from pmdc_sizer.core.magnet_knee import knee_shape
from pmdc_sizer.core.units import MU_0, to_si

GRADES = library.magnet_grades()

# A grade whose knee lies far beyond HcB: its normal curve is the straight recoil line to machine
# precision over the whole second quadrant (the knee term underflows to 0 there).
LINEAR = mg.MagnetGrade(
    name="linear test grade", family="SmCo 2:17", remanence=1.0, coercivity_hcb=758e3,
    coercivity_hcj=1.5e6, energy_product=190e3, recoil_permeability=1.05, squareness=0.98,
    remanence_temp_coeff=0.0, coercivity_temp_coeff=0.0, max_working_temperature_C=300.0, density=8300.0,
)


def test_linear_energy_product_closed_form():
    # Source: Campbell 1994, ch. 2 (from memory): on B = Br + μ0·μrec·H the product -B·H peaks at
    # H = -HcB/2 with (BH)max = Br²/(4·μ0·μrec).
    assert_allclose(curve_figures.linear_energy_product(1.0, 1.05), 1.0 / (4.0 * MU_0 * 1.05), rtol=1e-15)
    assert_allclose(curve_figures.linear_energy_product(1.0, 1.0), 198.9437e3, rtol=1e-6)  # 1 T, μrec = 1: 198.94 kJ/m³


@pytest.mark.parametrize("recoil", [1.0, 1.03, 1.05])
@pytest.mark.parametrize("remanence", [0.4, 1.0, 1.3])
def test_energy_product_of_a_linear_curve(remanence, recoil):
    # Source: Campbell 1994, ch. 2 (from memory), against the model's own sampled (BH)max. The sampling
    # grid of 4001 points contains H = -HcB/2 up to the root finder's 1e-12 on HcB: 1e-9 is ample.
    # HcJ 1.6·HcB keeps the knee ~100 knee widths beyond HcB and the recoil line above 0.9·Br to Hk
    hcj = 1.6 * remanence / (MU_0 * recoil)
    grade = dataclasses.replace(LINEAR, remanence=remanence, recoil_permeability=recoil, coercivity_hcj=hcj)
    assert_allclose(curve_figures.energy_product_of_curve(grade, 20.0),
                    curve_figures.linear_energy_product(remanence, recoil), rtol=1e-9)
    assert_allclose(curve_figures.normal_coercivity_at(grade, 20.0), remanence / (MU_0 * recoil), rtol=1e-9)


# Published ranges at 20 °C, from memory of the grade tables of IEC 60404-8-1, MMPA Standard
# No. 0100-00, SJ/T 10410 (ferrite Y classes) and makers' catalogues: (Br min, Br max) in T,
# (HcJ min, HcJ max) in kA/m. Minimum HcJ of the sintered NdFeB coercivity classes: none 955,
# M 1114, H 1353, SH 1592, UH 1990, EH 2388 (the trade's 12, 14, 17, 20, 25, 30 kOe).
PUBLISHED_RANGES = {
    "N35": ((1.17, 1.22), (955.0, 1300.0)),
    "N42": ((1.28, 1.32), (955.0, 1300.0)),
    "N52": ((1.42, 1.48), (876.0, 1100.0)),
    "N42M": ((1.28, 1.32), (1114.0, 1400.0)),
    "N42H": ((1.28, 1.32), (1353.0, 1700.0)),
    "N42SH": ((1.28, 1.32), (1592.0, 2000.0)),
    "N38UH": ((1.22, 1.26), (1990.0, 2400.0)),
    "N35EH": ((1.17, 1.22), (2388.0, 2800.0)),
    "SmCo5 20": ((0.85, 0.95), (1200.0, 2400.0)),
    "Sm2Co17 26": ((1.00, 1.08), (1400.0, 2400.0)),
    "Y25": ((0.36, 0.40), (150.0, 210.0)),
    "Y30": ((0.37, 0.40), (180.0, 220.0)),
    "Y30BH": ((0.38, 0.40), (230.0, 250.0)),
    "Y40": ((0.44, 0.46), (330.0, 360.0)),
}


@pytest.mark.parametrize("name", sorted(PUBLISHED_RANGES))
def test_library_grade_inside_published_ranges(name):
    # Source: IEC 60404-8-1 / MMPA 0100-00 / SJ/T 10410 class ranges (from memory), see the table above.
    (br_low, br_high), (hcj_low, hcj_high) = PUBLISHED_RANGES[name]
    grade = GRADES[name]
    assert br_low <= grade.remanence <= br_high
    assert to_si(hcj_low, "kA/m") <= grade.coercivity_hcj <= to_si(hcj_high, "kA/m")


def test_every_family_is_in_the_library():
    assert {g.family for g in GRADES.values()} == set(mg.FAMILIES)


@pytest.mark.parametrize("name", sorted(GRADES))
def test_grade_data_are_consistent(name):
    grade = GRADES[name]
    assert grade.source, "every entry carries a source note"
    assert 0.0 < grade.coercivity_hcb <= grade.coercivity_hcj
    # (BH)max can never exceed the ideal straight line through Br with μrec = 1 (Campbell 1994, ch. 2)
    assert grade.energy_product < curve_figures.linear_energy_product(grade.remanence, 1.0)
    expected_sign = 1.0 if grade.family.startswith("hard ferrite") else -1.0
    assert np.sign(grade.coercivity_temp_coeff) == expected_sign
    assert grade.remanence_temp_coeff < 0.0


@pytest.mark.parametrize("name", sorted(GRADES))
def test_model_reproduces_the_grade_hcb_and_energy_product_within_two_percent(name):
    # The model meets Br and HcJ exactly and must reproduce the grade's own HcB and (BH)max within 2 %
    # (the library refuses a grade otherwise; the trade's class ranges span about ±5 %).
    grade = GRADES[name]
    assert_allclose(curve_figures.normal_coercivity_at(grade, 20.0), grade.coercivity_hcb, rtol=0.02)
    assert_allclose(curve_figures.energy_product_of_curve(grade, 20.0), grade.energy_product, rtol=0.02)
    assert_allclose(mg.remanence_at(grade, 20.0), grade.remanence, rtol=1e-15)
    assert_allclose(mg.flux_density(grade, -grade.coercivity_hcj, 20.0), -MU_0 * grade.coercivity_hcj, atol=1e-12)


@pytest.mark.parametrize("name", [n for n, g in GRADES.items() if knee_shape(g).through_hcb])
def test_a_knee_fitted_through_hcb_meets_it(name):
    # Where the stored HcB lies on the knee (J more than 1 % of Br below the recoil line there), the
    # two-parameter knee passes through it: to the root finder's precision.
    grade = GRADES[name]
    assert_allclose(curve_figures.normal_coercivity_at(grade, 20.0), grade.coercivity_hcb, rtol=1e-9)


def test_the_measured_misfits_are_gone():
    # The misfits the review measured on the old one-parameter knee: Y40's HcB 313 against 330 kA/m,
    # bonded NdFeB 8's +6.5 % (both fitted now); the model's HcB of Y40 must be 330 within 2 %.
    assert_allclose(curve_figures.normal_coercivity_at(GRADES["Y40"], 20.0), to_si(330.0, "kA/m"), rtol=0.02)
    assert_allclose(curve_figures.normal_coercivity_at(GRADES["bonded NdFeB 8"], 20.0), to_si(400.0, "kA/m"), rtol=1e-6)


@pytest.mark.parametrize("name", sorted(GRADES))
def test_curve_model_passes_through_its_defining_points(name):
    grade = GRADES[name]
    hcj, hk = grade.coercivity_hcj, grade.squareness * grade.coercivity_hcj
    assert_allclose(mg.polarization(grade, 0.0, 20.0), grade.remanence, rtol=1e-14)
    assert_allclose(mg.polarization(grade, -hcj, 20.0), 0.0, atol=1e-12)
    # Hk is the field at which J = 0.9·Br (IEC 60404-5 usage, from memory)
    assert_allclose(mg.polarization(grade, -hk, 20.0), 0.9 * grade.remanence, rtol=1e-9)
    # near H = 0 the normal curve has the recoil slope μ0·μrec; the knee term only steepens it, and for
    # square grades (Hk/HcJ ≥ 0.7) by less than 1 %
    step = 1e-3 * hcj
    slope = (mg.flux_density(grade, 0.0, 20.0) - mg.flux_density(grade, -step, 20.0)) / step
    assert slope >= MU_0 * grade.recoil_permeability * (1.0 - 1e-9)
    if grade.squareness >= 0.7:
        assert_allclose(slope, MU_0 * grade.recoil_permeability, rtol=1e-2)
    h = np.linspace(-1.1 * hcj, 0.0, 500)
    assert np.all(np.diff(mg.flux_density(grade, h, 20.0)) > 0.0)
    assert np.all(np.diff(mg.polarization(grade, h, 20.0)) >= 0.0)
    assert_allclose(mg.flux_density(grade, h, 20.0), MU_0 * h + mg.polarization(grade, h, 20.0), rtol=1e-14, atol=1e-15)


def test_reversible_temperature_coefficients():
    grade = GRADES["N42SH"]
    assert_allclose(mg.remanence_at(grade, 120.0),
                    grade.remanence * (1.0 + 100.0 * grade.remanence_temp_coeff), rtol=1e-14)
    assert_allclose(mg.intrinsic_coercivity_at(grade, -20.0),
                    grade.coercivity_hcj * (1.0 - 40.0 * grade.coercivity_temp_coeff), rtol=1e-14)
    assert mg.remanence_at(grade, 20.0) == grade.remanence
    temperatures = np.array([-40.0, 20.0, 150.0])
    assert mg.remanence_at(grade, temperatures).shape == (3,)


@pytest.mark.parametrize("name", [n for n, g in GRADES.items() if g.family.startswith("hard ferrite")])
def test_ferrite_knee_moves_toward_the_operating_region_when_cold(name):
    # Common practice (and IEC 60404-8-1's positive HcJ coefficient for ferrite): ferrite magnets
    # demagnetize when cold.
    grade = GRADES[name]
    knees = [float(mg.knee_field_at(grade, t)) for t in (-40.0, 20.0, 100.0)]
    assert knees[0] > knees[1] > knees[2]  # less negative = closer to the operating region
    # the whole curve's knee moves: where the cold curve has collapsed (J = 0 at -HcJ cold), the hot
    # one still holds more than half its Br
    field = -float(mg.intrinsic_coercivity_at(grade, -40.0))
    assert_allclose(mg.polarization(grade, field, -40.0), 0.0, atol=1e-12)
    assert mg.polarization(grade, field, 100.0) > 0.5 * mg.remanence_at(grade, 100.0)


@pytest.mark.parametrize("name", [n for n, g in GRADES.items() if "NdFeB" in g.family])
def test_ndfeb_knee_moves_toward_the_operating_region_when_hot(name):
    grade = GRADES[name]
    knees = [float(mg.knee_field_at(grade, t)) for t in (-40.0, 20.0, 100.0)]
    assert knees[0] < knees[1] < knees[2]
    field = -float(mg.intrinsic_coercivity_at(grade, 100.0))
    assert_allclose(mg.polarization(grade, field, 100.0), 0.0, atol=1e-12)
    assert mg.polarization(grade, field, -40.0) > 0.5 * mg.remanence_at(grade, -40.0)


@pytest.mark.parametrize("name", sorted(GRADES))
@pytest.mark.parametrize("temperature", [-30.0, 20.0, 90.0])
def test_knee_is_where_the_curve_has_left_its_recoil_line_by_one_percent(name, temperature):
    # By definition (core.magnets.KNEE_LOSS_FRACTION): J has fallen 1 % of Br(T) below the recoil line.
    grade, knee = GRADES[name], float(mg.knee_field_at(GRADES[name], temperature))
    curve = mg.curve_at(grade, temperature)
    recoil_line = curve.remanence + mg.MU_0 * (grade.recoil_permeability - 1.0) * knee
    assert_allclose(recoil_line - curve.polarization(knee), mg.KNEE_LOSS_FRACTION * curve.remanence, rtol=1e-9)
    # It comes before HcJ, and for the square sintered grades also before the trade's Hk (J = 0.9·Br).
    assert -float(mg.intrinsic_coercivity_at(grade, temperature)) < knee < 0.0
    if grade.squareness >= 0.85:
        assert knee > float(mg.squareness_field_at(grade, temperature))


def test_squareness_field_is_squareness_times_hcj():
    grade = GRADES["Y30"]
    assert_allclose(mg.squareness_field_at(grade, 60.0), -grade.squareness * mg.intrinsic_coercivity_at(grade, 60.0),
                    rtol=1e-15)


def test_model_temperature_range():
    # Our bound (core.magnets.model_temperature_range_C), found on a 0.5 K grid.
    low, high = mg.model_temperature_range_C(GRADES["N42SH"])
    beta = GRADES["N42SH"].coercivity_temp_coeff
    assert 20.0 - 0.75 / beta - 0.5 <= high <= 20.0 - 0.75 / beta  # HcJ down to a quarter of its 20 °C value
    assert low == -273.0  # NdFeB's coefficients are both negative: nothing bounds it from below
    low, high = mg.model_temperature_range_C(GRADES["Y30"])
    assert low > -273.0
    # at the edge HcJ has fallen to about a quarter of its 20 °C value
    assert_allclose(mg.intrinsic_coercivity_at(GRADES["Y30"], low), 0.25 * GRADES["Y30"].coercivity_hcj, rtol=0.01)
    # Ferrite's recoil line meets zero at -HcJ when hot (Br falls, HcJ rises): the knee would vanish,
    # so the range stops first.
    grade = GRADES["ferrite isotropic"]
    low, high = mg.model_temperature_range_C(grade)
    recoil_slope = mg.MU_0 * (grade.recoil_permeability - 1.0)
    amplitude = mg.remanence_at(grade, high) - recoil_slope * mg.intrinsic_coercivity_at(grade, high)
    assert amplitude >= 0.05 * mg.remanence_at(grade, high)
    assert high < 20.0 + 0.75 / 0.002  # before Br alone would bound it


def test_squareness_too_low_for_the_recoil_line_is_refused():
    grade = dataclasses.replace(LINEAR, recoil_permeability=1.3, squareness=0.9)
    with pytest.raises(ValueError, match="squareness"):
        mg.curve_at(grade, 20.0)


def test_demagnetization_curves_for_charts():
    grade = GRADES["Y30BH"]
    curves = curve_figures.demagnetization_curves(grade, -20.0, samples=120)
    assert curves.field_strength.shape == curves.flux_density.shape == curves.polarization.shape == (120,)
    assert curves.field_strength[0] == pytest.approx(-1.1 * curves.coercivity_hcj)
    assert curves.field_strength[-1] == 0.0
    assert curves.remanence == pytest.approx(float(mg.remanence_at(grade, -20.0)))
    assert curves.knee_field == pytest.approx(float(mg.knee_field_at(grade, -20.0)))
    assert curves.knee_flux_density == pytest.approx(float(mg.flux_density(grade, curves.knee_field, -20.0)))
