"""The vectorised what-if sweeps agree with evaluating each design on its own."""

import numpy as np
import pytest

from pmdc_sizer.core import project, sweep
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.pole_magnetics import pole_states
from pmdc_sizer.core.project import ProjectError


def _single(design_project, key, value):
    d = design_from_project(project.with_values(design_project, {key: value}))
    return pole_states(d, d.ambient_nominal_C)


@pytest.mark.parametrize("key, values", [
    ("magnets.thickness_mm", [4.0, 5.0, 6.0, 7.5]),
    ("airgap.length_mm", [0.3, 0.4, 0.6, 1.0]),
    ("housing.wall_mm", [3.0, 4.0, 5.0]),
])
def test_sweep_equals_the_network_one_by_one(ferrite_demo, key, values):
    base = project.load(ferrite_demo)
    swept = sweep.magnetics_sweep(base, key, values)
    assert swept.flux_per_pole.shape == (len(values),)
    for i, value in enumerate(values):
        single = _single(base, key, value)
        # the same network and Newton steps; only the batch differs, so agreement is to rounding
        for name in ("flux_per_pole", "magnet_field", "worst_field", "housing_flux_density",
                     "airgap_flux_density_mean"):
            np.testing.assert_allclose(getattr(swept, name)[i], getattr(single, name)[0], rtol=1e-9, err_msg=name)


def test_sweep_is_the_chain_s_no_load_network(ferrite_demo):
    """The sweep's flux is the one the whole chain puts on the datasheet at the nominal temperature."""
    from pmdc_sizer.core.evaluate import evaluate

    base = project.load(ferrite_demo)
    swept = sweep.magnetics_sweep(base, "housing.wall_mm", [3.0, 5.0])
    for i, wall in enumerate([3.0, 5.0]):
        results = evaluate(project.with_values(base, {"housing.wall_mm": wall}))
        np.testing.assert_allclose(swept.permeance_coefficient[i], results.magnetics.permeance_coefficient, rtol=1e-9)


def test_larger_gap_lowers_the_gap_flux(ferrite_demo):
    swept = sweep.magnetics_sweep(project.load(ferrite_demo), "airgap.length_mm", [0.2, 0.4, 0.8, 1.6])
    assert np.all(np.diff(swept.airgap_flux_density_mean) < 0)
    assert np.all(np.diff(swept.flux_per_pole) < 0)
    assert np.all(np.diff(swept.permeance_coefficient) < 0)


def test_thinner_wall_saturates_the_housing(ferrite_demo):
    swept = sweep.magnetics_sweep(project.load(ferrite_demo), "housing.wall_mm", [1.5, 3.0, 6.0])
    assert np.all(np.diff(swept.housing_flux_density) < 0)
    assert np.all(np.diff(swept.flux_per_pole) > 0)


def test_sweep_validates_every_value(ferrite_demo):
    with pytest.raises(ProjectError) as error:
        sweep.magnetics_sweep(project.load(ferrite_demo), "magnets.thickness_mm", [5.0, 100.0])
    assert "magnets.thickness_mm" in str(error.value)


@pytest.mark.parametrize("key, values", [("magnets.grade", ["Y30", "Y40"]),
                                         ("armature.shaft_magnetic", [True, False])])
def test_sweep_refuses_a_change_of_material(ferrite_demo, key, values):
    with pytest.raises(ProjectError) as error:
        sweep.magnetics_sweep(project.load(ferrite_demo), key, values)
    assert key in str(error.value)


def test_figure_sweep_equals_evaluate_one_by_one(ferrite_demo):
    from pmdc_sizer.core.batch import screening_figures
    from pmdc_sizer.core.evaluate import evaluate

    base = project.load(ferrite_demo)
    names = ["nominal.no_load_speed_rad_per_s", "hot.stall_torque_N_m", "ratings.continuous_torque_N_m",
             "worst_demagnetization_margin_A_per_m"]
    swept = sweep.figure_sweep(base, "winding.turns_per_coil", [18, 24], names)
    assert sorted(swept.figures) == sorted(names)
    for i, turns in enumerate([18, 24]):
        expected = screening_figures(evaluate(project.with_values(base, {"winding.turns_per_coil": turns})))
        for name in names:
            np.testing.assert_allclose(swept.figures[name][i], expected[name], rtol=1e-9, err_msg=name)
    # more turns: a higher Ke, so a lower no-load speed
    assert swept.figures["nominal.no_load_speed_rad_per_s"][1] < swept.figures["nominal.no_load_speed_rad_per_s"][0]


def test_figure_sweep_takes_a_change_of_grade_and_refuses_an_unknown_figure(ferrite_demo):
    base = project.load(ferrite_demo)
    swept = sweep.figure_sweep(base, "magnets.grade", ["Y30", "Y35"], ["nominal.flux_per_pole_Wb"])
    assert swept.figures["nominal.flux_per_pole_Wb"][1] > swept.figures["nominal.flux_per_pole_Wb"][0]
    with pytest.raises(ProjectError) as error:
        sweep.figure_sweep(base, "magnets.grade", ["Y30"], ["nominal.top_speed"])
    assert "nominal.top_speed" in str(error.value)
