"""Re-fitting design B to one of design A's figures."""

from __future__ import annotations

import math

import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import difference, evaluate, project, refit

#: The issue asks re-fits to meet their target within 0.5 %.
TARGET_TOLERANCE = 5e-3


def test_refit_ke_by_thickness_sintered_ndfeb_against_ferrite_needs_a_much_thinner_magnet(ferrite):
    # A ferrite motor with 10 mm arcs; N42 in the same frame should need a small fraction of that.
    # Common practice, no source: Br of sintered NdFeB is about three times that of hard ferrite, so
    # at the same air-gap flux the arc is several times thinner.
    design, _ = ferrite
    design_a = project.with_values(design, {"magnets.thickness_mm": 10.0})
    results_a = evaluate(design_a)
    fit = refit.refit("ke", results_a, difference.with_grade(design_a, "N42"))
    assert fit.reached
    assert abs(fit.target_error_fraction) < TARGET_TOLERANCE
    assert_allclose(fit.results.constants.ke_V_s_per_rad, results_a.constants.ke_V_s_per_rad, rtol=TARGET_TOLERANCE)
    assert fit.value_before == 10.0 and fit.value_after < 10.0 / 5.0
    assert fit.project.magnets.thickness_mm == fit.value_after
    assert [c.key for c in fit.changes] == ["magnets.thickness_mm"]
    assert fit.magnet_mass_difference_kg == pytest.approx(fit.results.mass.magnet_kg - results_a.mass.magnet_kg)
    assert fit.magnet_mass_difference_kg < 0  # much thinner, and NdFeB is only about 1.5 × as dense
    assert fit.material_cost_difference == pytest.approx(fit.results.cost.total - results_a.cost.total)
    assert fit.limit_side == "" and fit.solver_converged


def test_refit_ke_stops_at_the_envelope_and_names_it(ferrite):
    design, results_a = ferrite
    weak = project.with_values(difference.with_grade(design, "ferrite isotropic"),
                               {"housing.max_outer_diameter_mm": 46.0})
    fit = refit.refit("ke", results_a, weak)
    assert not fit.reached
    # 46 mm = 24 + 2·(0.4 + t + 4.5) → t = 6.1 mm is the thickest arc the envelope takes.
    assert fit.value_after == pytest.approx(6.1, abs=1e-3) and fit.value_after <= 6.1
    assert fit.limit_side == "upper" and "housing.max_outer_diameter_mm" in fit.range_limits[1]


def test_refit_no_load_speed_by_whole_turns(ferrite):
    design, results_a = ferrite
    fit = refit.refit("no-load-speed", results_a, difference.with_grade(design, "N42"))
    assert fit.reached and isinstance(fit.value_after, int)
    assert fit.project.winding.turns_per_coil == fit.value_after < 22  # stronger flux, fewer turns
    # Within one whole-turn step: the speed goes as about 1/turns, so the step is about 1/turns.
    assert abs(fit.target_error_fraction) <= 1.0 / fit.value_after
    neighbours = [refit.refit("no-load-speed", results_a, project.with_values(
        fit.project, {"winding.turns_per_coil": n})).value_after for n in (fit.value_after - 1, fit.value_after + 1)]
    assert neighbours == [fit.value_after, fit.value_after]  # the closest whole number, from either side
    assert fit.alternative_value in (fit.value_after - 1, fit.value_after + 1)
    assert abs(fit.alternative_error_fraction) >= abs(fit.target_error_fraction)


def test_refit_no_load_speed_limited_by_the_slot(ferrite):
    design, results_a = ferrite
    fit = refit.refit("no-load-speed", results_a, difference.with_grade(design, "ferrite isotropic"))
    assert not fit.reached
    assert fit.limit_side == "upper" and "would not fit the slot" in fit.range_limits[1]
    assert fit.results.winding.slot_fill_gross <= 0.78


def test_refit_stall_torque_by_stack_grows_magnets_and_housing_with_it(ferrite):
    design, results_a = ferrite
    fit = refit.refit("stall-torque", results_a, difference.with_grade(design, "Y25"))
    assert fit.reached
    assert abs(fit.target_error_fraction) < TARGET_TOLERANCE
    assert_allclose(fit.results.nominal.stall_torque_N_m, results_a.nominal.stall_torque_N_m, rtol=TARGET_TOLERANCE)
    after = fit.project
    assert after.armature.stack_length_mm > design.armature.stack_length_mm  # weaker grade, longer stack
    assert math.isclose(after.magnets.length_mm - after.armature.stack_length_mm, 3.0)
    assert math.isclose(after.housing.length_mm - after.magnets.length_mm, 12.0)
    assert [c.key for c in fit.changes] == ["armature.stack_length_mm", "magnets.length_mm", "housing.length_mm"]
    assert (fit.overhang_mm, fit.end_room_mm) == pytest.approx((3.0, 12.0))


def test_unknown_target_is_refused(ferrite):
    design, results_a = ferrite
    with pytest.raises(ValueError, match="ke, no-load-speed, stall-torque"):
        refit.refit("power", results_a, design)


def test_turns_refit_scales_ke_as_the_textbook_relation_says(ferrite):
    # Source: textbook DC-machine relation E = K·Φ·ω with K = p·Z/(2π·a); Z = 2·segments·turns, and
    # the no-load flux does not depend on the turns, so Ke goes exactly as the turns per coil.
    design, results_a = ferrite
    design_b = difference.with_grade(design, "N42")
    results_b = evaluate(design_b)
    fit = refit.refit("no-load-speed", results_a, design_b, results_b)
    assert fit.results.magnetics.flux_per_pole_Wb == pytest.approx(results_b.magnetics.flux_per_pole_Wb, rel=1e-9)
    assert_allclose(fit.results.constants.ke_V_s_per_rad / results_b.constants.ke_V_s_per_rad,
                    fit.value_after / fit.value_before, rtol=1e-9)


def test_thickness_refit_agrees_with_scipy_brentq(ferrite):
    # Source: scipy.optimize.brentq as an independent bracketed root finder on the same residual.
    from scipy.optimize import brentq

    design, _ = ferrite
    design_a = project.with_values(design, {"magnets.thickness_mm": 10.0})
    results_a = evaluate(design_a)
    design_b = difference.with_grade(design_a, "N42")
    fit = refit.refit("ke", results_a, design_b)

    def residual(thickness_mm):
        trial = project.with_values(design_b, {"magnets.thickness_mm": thickness_mm})
        return evaluate(trial).constants.ke_V_s_per_rad - results_a.constants.ke_V_s_per_rad

    reference = brentq(residual, 0.5, 40.0, xtol=1e-7)
    assert fit.value_after == pytest.approx(reference, abs=1e-4)  # 0.1 µm: far below any magnet tolerance


def test_cost_differences_across_currencies_are_flagged(ferrite):
    design, results_a = ferrite
    dollars = project.with_values(difference.with_grade(design, "Y25"),
                                  {"prices.currency": "USD", "prices.magnet_per_kg": 4.0})  # the grade is priced in EUR
    fit = refit.refit("stall-torque", results_a, dollars)
    assert (fit.currency_a, fit.currency) == ("EUR", "USD")


def test_ndfeb_cannot_come_down_to_the_ferrite_demo_and_says_why(ferrite):
    # With the demo's 6 mm ferrite arcs, N42 would need less than the 0.5 mm the schema allows.
    design, results_a = ferrite
    fit = refit.refit("ke", results_a, difference.with_grade(design, "N42"))
    assert not fit.reached
    assert fit.value_after == 0.5
    assert fit.limit_side == "lower" and "lower limit of magnets.thickness_mm" in fit.range_limits[0]
    assert fit.figure_after > fit.target_value  # still too strong at the thinnest magnet allowed
