"""The tolerance study: spreads from the file, the draw, the magnet lots, the refused tolerances, the statistics.

The chain runs one motor in a fraction of a second, so the studies here draw tens to a hundred motors;
the statistics they check do not need more (the Latin hypercube stratifies each tolerance).
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
from scipy.stats import truncnorm

from pmdc_sizer.core import batch, project, tolerance_study
from pmdc_sizer.core.conductors import diameter_tolerance
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.errors import ProjectError
from pmdc_sizer.core.tolerance_study import KEY_FIGURES, run_study
from pmdc_sizer.core.tolerances import NORMAL_SIGMAS, check_spreads, draw, drawn_designs, lot_grade, spreads_of
from pmdc_sizer.core.units import to_si

from ..conftest import DEMO_FOLDER

FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"
NDFEB = DEMO_FOLDER / "mobility_ndfeb_24v.toml"

#: Every spread of the file set to zero.
NO_SPREAD = {"tolerances.remanence_pct": 0.0, "tolerances.coercivity_pct": 0.0,
             "tolerances.magnet_thickness_mm": 0.0, "tolerances.airgap_mm": 0.0,
             "tolerances.wire_diameter_mm": 0.0, "tolerances.copper_resistivity_pct": 0.0,
             "tolerances.brush_drop_V": 0.0, "tolerances.friction_torque_pct": 0.0,
             "tolerances.supply_voltage_pct": 0.0}


@pytest.fixture(scope="module")
def ferrite_project():
    return project.load(FERRITE)


# --- the wire's tolerance -----------------------------------------------------------------------


@pytest.mark.parametrize(("diameter_mm", "tolerance_mm"), [
    # Source: a wire maker's table of enamelled round copper wire under IS 13730-0-1, India's adoption of
    # IEC 60317-0-1 (SWG sizes; avanticables.com, "diameters and increase in diameters"); 2.032 mm, where
    # that table gives 0.020 mm and 1 % rounded up gives 0.021 mm, is left out.
    (0.067, 0.003), (0.254, 0.004), (0.315, 0.004), (0.345, 0.005), (0.457, 0.005), (0.508, 0.006),
    (0.610, 0.006), (0.711, 0.008), (0.914, 0.010), (1.016, 0.011), (1.422, 0.015), (2.337, 0.024),
    (2.946, 0.030),
])
def test_wire_diameter_tolerance_follows_iec_60317_0_1(diameter_mm, tolerance_mm):
    assert diameter_tolerance(to_si(diameter_mm, "mm")) == pytest.approx(to_si(tolerance_mm, "mm"), rel=1e-9)


# --- the draw --------------------------------------------------------------------------------------


def test_draw_keeps_normal_spreads_inside_3_sigma_and_uniform_ones_flat(ferrite_project):
    p = ferrite_project
    spreads = spreads_of(p, design_from_project(p))
    deviations = draw(spreads, 4000, seed=3)
    assert deviations.shape == (4000, len(spreads))
    assert np.all(np.abs(deviations) <= 1.0)
    truncated_sd = truncnorm.std(-NORMAL_SIGMAS, NORMAL_SIGMAS) / NORMAL_SIGMAS
    for column, spread in enumerate(spreads):
        expected = truncated_sd if spread.distribution == "normal" else 1.0 / math.sqrt(3.0)
        assert deviations[:, column].std() == pytest.approx(expected, rel=0.01), spread.key
        assert abs(deviations[:, column].mean()) < 0.01


def test_spreads_take_the_wire_tolerance_from_the_standard_when_the_file_leaves_it_out(ferrite_project):
    p = ferrite_project
    design = design_from_project(p)
    wire = {s.key: s for s in spreads_of(p, design)}["tolerances.wire_diameter_mm"]
    assert wire.plus_minus == diameter_tolerance(design.winding.wire.bare_diameter)
    given = project.with_values(p, {"tolerances.wire_diameter_mm": 0.01})
    assert {s.key: s for s in spreads_of(given, design)}["tolerances.wire_diameter_mm"].plus_minus == to_si(0.01, "mm")


# --- magnet lots ---------------------------------------------------------------------------------


@pytest.mark.parametrize("path", [FERRITE, NDFEB])
def test_a_lot_at_the_grade_values_is_the_grade_and_every_lot_keeps_hcb_below_hcj(path):
    grade = design_from_project(project.load(path)).magnet
    same, *lots = lot_grade(grade, np.array([1.0, 1.03, 0.97, 1.03, 0.97]), np.array([1.0, 0.92, 0.92, 1.08, 1.08]))
    assert same is grade
    for lot in lots:
        assert 0.0 < lot.coercivity_hcb <= lot.coercivity_hcj
    # a lot with Br and HcJ both up by 3 % has its HcB up by about as much (the curve scales)
    both_up = lot_grade(grade, np.array([1.03]), np.array([1.03]))[0]
    assert both_up.coercivity_hcb / grade.coercivity_hcb == pytest.approx(1.03, rel=0.01)


# --- refused tolerances ----------------------------------------------------------------------


def test_a_gap_tolerance_as_large_as_the_gap_is_refused_with_its_key_and_limit(ferrite_project):
    with pytest.raises(ProjectError) as caught:
        project.with_values(ferrite_project, {"tolerances.airgap_mm": 0.4})  # the gap is 0.4 mm
    assert caught.value.key == "tolerances.airgap_mm"
    assert "at most 0.35 mm" in str(caught.value)  # the schema's least gap is 0.05 mm


def test_a_magnet_tolerance_that_leaves_no_magnet_and_a_wire_tolerance_that_leaves_no_copper_are_refused(
        ferrite_project):
    with pytest.raises(ProjectError) as caught:
        project.with_values(ferrite_project, {"tolerances.magnet_thickness_mm": 5.8})
    assert caught.value.key == "tolerances.magnet_thickness_mm" and "allowed 0 to 5 mm" in str(caught.value)
    with pytest.raises(ProjectError) as caught:
        project.with_values(ferrite_project, {"tolerances.magnet_thickness_mm": 3.7, "magnets.thickness_mm": 4.0})
    assert caught.value.key == "tolerances.magnet_thickness_mm" and "at most 3.5 mm" in str(caught.value)
    with pytest.raises(ProjectError) as caught:
        project.with_values(ferrite_project, {"tolerances.wire_diameter_mm": 0.45})  # AWG 26, 0.405 mm
    assert caught.value.key == "tolerances.wire_diameter_mm" and "0.4049 mm" in str(caught.value)


def test_a_supply_band_that_would_drop_the_supply_below_the_brush_drop_is_refused(ferrite_project):
    # 12 V, 1 V brushes ±0.2 V: at -90 % the supply (1.2 V) is not above the highest brush drop (1.2 V)
    with pytest.raises(ProjectError) as caught:
        project.with_values(ferrite_project, {"tolerances.supply_voltage_pct": 49.0, "supply.voltage_V": 2.0})
    assert caught.value.key == "tolerances.supply_voltage_pct"
    assert "supply.voltage_V" in str(caught.value) and "at most 40 %" in str(caught.value)


def test_a_bad_distribution_or_a_tolerance_out_of_range_is_refused_with_the_key(ferrite_project):
    for changes, key, limit in [({"tolerances.brush_drop_distribution": "flat"}, "tolerances.brush_drop_distribution",
                                 "'normal', 'uniform'"),
                                ({"tolerances.remanence_pct": 25.0}, "tolerances.remanence_pct", "allowed 0 to 20 %"),
                                ({"tolerances.samples": 10}, "tolerances.samples", "allowed 100 to")]:
        with pytest.raises(ProjectError) as caught:
            project.with_values(ferrite_project, changes)
        assert caught.value.key == key and limit in str(caught.value)


def test_a_default_tolerance_that_does_not_suit_the_design_is_refused_when_the_study_runs(ferrite_project):
    p = project.with_values(ferrite_project, {"supply.brush_drop_V": 0.0})  # the file still loads
    with pytest.raises(ProjectError) as caught:
        check_spreads(p, design_from_project(p), spreads_of(p, design_from_project(p)))
    assert caught.value.key == "tolerances.brush_drop_V" and "at most 0 V" in str(caught.value)


# --- the study ---------------------------------------------------------------------------------------


def test_zero_tolerances_give_zero_spread_and_the_nominal_figures(ferrite_project):
    p = project.with_values(ferrite_project, NO_SPREAD)
    study = run_study(p, samples=12, seed=5)
    nominal = batch.evaluate_many([design_from_project(p)])
    for name in KEY_FIGURES:
        f = study.figures[name]
        expected = nominal.figures[name][0]
        assert f.nominal == expected
        assert f.low == f.typical == f.high == pytest.approx(expected, rel=1e-12, abs=0.0), name
        assert study.drivers[name] == ()
    assert study.failed == 0
    assert study.yield_fraction == float(nominal.passes_all[0])


def test_the_spread_of_ke_from_br_alone_matches_the_first_order_estimate(ferrite_project):
    """Linearised propagation of one input's spread (the first-order Taylor estimate, "delta method"):

    Ke = K·Φ, so σ_Ke/Ke = (∂lnΦ/∂lnBr)·σ_Br/Br, with the elasticity ∂lnΦ/∂lnBr taken from the chain by a
    central difference on Br (it is 1 for a linear circuit and below 1 where the iron saturates or the
    knee bends the curve). σ_Br/Br is the ± over 3 times the standard deviation of a unit normal truncated
    at ±3 (0.9866): the spread is truncated at its tolerance.
    """
    plus_minus = 0.03
    p = project.with_values(ferrite_project, {**NO_SPREAD, "tolerances.remanence_pct": 100 * plus_minus})
    design = design_from_project(p)
    step = 1e-3
    lots = lot_grade(design.magnet, np.array([1 - step, 1 + step]), np.array([1.0, 1.0]))
    ke = batch.evaluate_many([replace(design, magnet=lot) for lot in lots]).figures["nominal.ke_V_s_per_rad"]
    elasticity = (math.log(ke[1]) - math.log(ke[0])) / (math.log1p(step) - math.log1p(-step))
    assert 0.5 < elasticity <= 1.0 + 1e-6
    study = run_study(p, samples=120, seed=11)
    values = study.figures["nominal.ke_V_s_per_rad"].values
    sigma_br = plus_minus / NORMAL_SIGMAS * truncnorm.std(-NORMAL_SIGMAS, NORMAL_SIGMAS)
    expected = elasticity * sigma_br
    assert np.std(values) / study.figures["nominal.ke_V_s_per_rad"].nominal == pytest.approx(expected, rel=0.03)
    assert [d.tolerance for d in study.drivers["nominal.ke_V_s_per_rad"]] == ["tolerances.remanence_pct"]
    assert study.drivers["nominal.ke_V_s_per_rad"][0].share == pytest.approx(1.0, abs=0.05)


def test_the_seed_draws_the_same_motors_and_another_seed_others(ferrite_project):
    p = ferrite_project
    first, again, other = (run_study(p, samples=8, seed=seed) for seed in (21, 21, 22))
    for name in KEY_FIGURES:
        np.testing.assert_array_equal(first.figures[name].values, again.figures[name].values)
    ke = "nominal.ke_V_s_per_rad"
    assert first.figures[ke].values.tolist() != other.figures[ke].values.tolist()
    assert first.seed == 21 and first.samples == 8


def test_failed_motors_are_counted_with_their_messages_and_left_out_of_the_statistics(ferrite_project, monkeypatch):
    real = batch.evaluate_many
    nominal_gap = design_from_project(ferrite_project).geometry.airgap

    def fails_wide_gaps(designs):
        result = real(designs)
        wide = np.array([d.geometry.airgap > nominal_gap for d in designs])
        figures = {name: np.where(wide, np.nan, values) for name, values in result.figures.items()}
        messages = tuple("no solution (test)" if w else m for w, m in zip(wide, result.failure_messages, strict=True))
        return replace(result, figures=figures, failed=result.failed | wide, passes_all=result.passes_all & ~wide,
                       failure_messages=messages)

    monkeypatch.setattr(tolerance_study, "evaluate_many", fails_wide_gaps)
    study = run_study(ferrite_project, samples=16, seed=2)
    wide = study.parts["airgap_m"] > nominal_gap
    assert 0 < study.failed == int(wide.sum()) < 16
    assert study.failure_messages == {"no solution (test)": study.failed}
    values = study.figures["nominal.ke_V_s_per_rad"].values
    assert np.all(np.isnan(values[wide])) and np.all(np.isfinite(values[~wide]))
    assert study.figures["nominal.ke_V_s_per_rad"].low == pytest.approx(np.quantile(values[~wide], 0.00135))
    assert not study.passes[wide].any()


def test_progress_is_reported_and_a_false_answer_stops_the_study(ferrite_project, monkeypatch):
    monkeypatch.setattr(tolerance_study, "CHUNK", 4)
    seen = []

    def stop_after_first(done, total):
        seen.append((done, total))
        return False

    with pytest.raises(tolerance_study.StudyCancelled):
        run_study(ferrite_project, samples=12, seed=1, progress=stop_after_first)
    assert seen == [(4, 12)]


def test_drawn_motors_move_only_the_spread_parts(ferrite_project):
    p = ferrite_project
    design = design_from_project(p)
    spreads = spreads_of(p, design)
    motor = drawn_designs(design, spreads, np.ones((1, len(spreads))))[0]
    assert motor.geometry.airgap == pytest.approx(design.geometry.airgap + to_si(0.04, "mm"))
    assert motor.geometry.magnet_thickness == pytest.approx(design.geometry.magnet_thickness + to_si(0.05, "mm"))
    assert motor.winding.wire.bare_diameter == pytest.approx(design.winding.wire.bare_diameter + to_si(0.005, "mm"))
    assert motor.winding.resistivity_factor == pytest.approx(1.01)
    assert motor.brush_drop == pytest.approx(design.brush_drop + 0.2)
    assert motor.losses.friction_torque == pytest.approx(design.losses.friction_torque * 1.3)
    assert motor.magnet.remanence == pytest.approx(design.magnet.remanence * 1.02)
    assert motor.supply_voltage == design.supply_voltage  # the default supply band is zero
    assert motor.geometry.armature_radius == design.geometry.armature_radius
