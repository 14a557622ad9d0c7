"""The batch chain: evaluate_many agrees with evaluate design by design, and counts what fails."""

from __future__ import annotations

import dataclasses

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from pmdc_sizer.core import project as pf
from pmdc_sizer.core.batch import CHECK_KEYS, check_status, evaluate_many, screening_figures
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.evaluate import evaluate

from .test_evaluate import DEMO_FOLDER, any_designs

DEMOS = sorted(DEMO_FOLDER.glob("*.toml"))

_BATCH_PROPERTY = settings(max_examples=20, deadline=None,
                           suppress_health_check=[HealthCheck.filter_too_much, HealthCheck.too_slow])


@st.composite
def batch_designs(draw):
    """A design of any demo, perturbed (grade included), with a duty and a wire resistivity drawn."""
    design = design_from_project(draw(any_designs()))
    thermal = dataclasses.replace(design.thermal, duty=draw(st.sampled_from(["S1", "S2", "S3"])))
    winding = dataclasses.replace(design.winding, resistivity_factor=draw(st.floats(0.97, 1.06)))
    return dataclasses.replace(design, thermal=thermal, winding=winding)


def _rounding_floor(name, expected):
    """What a figure that is zero in exact arithmetic reads to rounding: at no load torque (a load of 0 N·m)
    the rated point's torque, output power and efficiency are T·ω of a root's last bits (1e-17 N·m), which
    no two solutions share. Relative to the case's stall torque and no-load speed [unit of the figure]."""
    case = name.split(".", 1)[0]
    torque, speed = expected.get(f"{case}.stall_torque_N_m"), expected.get(f"{case}.no_load_speed_rad_per_s")
    if torque is None or not name.startswith(f"{case}.rated_"):
        return 0.0
    floors = {"rated_efficiency": 1e-12, "rated_torque_N_m": 1e-12 * torque,
              "rated_output_power_W": 1e-12 * torque * speed}
    return floors.get(name.split(".", 1)[1], 0.0)


def _assert_agrees(batch, index, results):
    expected = screening_figures(results)
    assert set(expected) == set(batch.figures), set(expected) ^ set(batch.figures)
    names = sorted(expected)
    got = np.array([batch.figures[name][index] for name in names])
    want = np.array([expected[name] for name in names])
    for name, a, b in zip(names, got, want, strict=True):
        assert_allclose(a, b, rtol=1e-9, atol=_rounding_floor(name, expected), equal_nan=True, err_msg=name)
    codes = check_status(results)
    assert {key: int(batch.status[key][index]) for key in CHECK_KEYS} == codes
    assert bool(batch.passes_all[index]) == all(code < 2 for code in codes.values())


@_BATCH_PROPERTY
@given(st.lists(batch_designs(), min_size=1, max_size=5))
def test_batch_agrees_with_evaluate_on_every_shared_figure(designs):
    batch = evaluate_many(designs)
    assert batch.size == len(designs) and not batch.failed.any()
    for index, design in enumerate(designs):
        _assert_agrees(batch, index, evaluate(design))


def test_batch_of_the_demos_mixed_agrees_with_evaluate():
    designs = [design_from_project(pf.load(path)) for path in DEMOS]
    designs = designs + designs[::-1]
    batch = evaluate_many(designs[:3] + [pf.load(path) for path in DEMOS[::-1]])  # projects are taken too
    for index, design in enumerate(designs):
        _assert_agrees(batch, index, evaluate(design))


def test_resistivity_factor_scales_the_resistance():
    design = design_from_project(pf.load(DEMOS[0]))
    higher = dataclasses.replace(design, winding=dataclasses.replace(design.winding, resistivity_factor=1.05))
    batch = evaluate_many([design, higher])
    r20 = batch.figures["winding.resistance_20C_ohm"]
    assert_allclose(r20[1], 1.05 * r20[0], rtol=1e-12)
    assert batch.figures["nominal.stall_current_A"][1] < batch.figures["nominal.stall_current_A"][0]


def test_failed_designs_are_counted_with_their_message():
    good = design_from_project(pf.load(DEMOS[0]))
    # an ambient far above what the grade's temperature model holds: the chain refuses it
    bad = dataclasses.replace(good, ambient_max_C=900.0)
    batch = evaluate_many([good, bad, good])
    assert batch.failed.tolist() == [False, True, False]
    assert batch.failure_messages[0] == batch.failure_messages[2] == ""
    assert batch.failure_messages[1]
    assert not batch.passes_all[1]
    assert np.isnan(batch.figures["nominal.no_load_speed_rad_per_s"][1])
    assert_allclose(batch.figures["nominal.no_load_speed_rad_per_s"][[0, 2]],
                    evaluate(good).nominal.no_load_speed_rad_per_s, rtol=1e-12)
    assert all(batch.status[key][1] == 2 for key in CHECK_KEYS)


def test_empty_batch():
    batch = evaluate_many([])
    assert batch.size == 0 and batch.passes_all.shape == (0,)


def test_a_design_whose_network_has_no_solution_fails_alone(monkeypatch):
    # The network solve raises for a whole group; the batch finds which design of it has no solution
    # (here: a stand-in network that refuses one air gap) and computes the rest.
    from pmdc_sizer.core import pole_magnetics
    from pmdc_sizer.core.errors import MagneticCircuitError

    good = design_from_project(pf.load(DEMOS[0]))
    bad = dataclasses.replace(good, geometry=dataclasses.replace(good.geometry, airgap=good.geometry.airgap * 1.37))
    solve = pole_magnetics.pole_states_many

    def refusing(geometry, *args, **kwargs):
        if np.any(np.isclose(geometry.airgap, bad.geometry.airgap, rtol=1e-12)):
            raise MagneticCircuitError("the magnetic circuit did not converge (stand-in)")
        return solve(geometry, *args, **kwargs)

    monkeypatch.setattr(pole_magnetics, "pole_states_many", refusing)
    other = design_from_project(pf.load(DEMOS[1]))
    batch = evaluate_many([good, bad, other])
    assert batch.failed.tolist() == [False, True, False]
    assert "stand-in" in batch.failure_messages[1]
    for index, design in ((0, good), (2, other)):
        _assert_agrees(batch, index, evaluate(design))


def test_an_element_does_not_depend_on_its_batch():
    # To rounding only: the network's linear solve is LAPACK's banded Cholesky for up to BANDED_BATCH
    # systems and block elimination above (core.cyclic_tridiagonal), which round differently in the last
    # place; the magnets' cases solve 2 × 3 currents × 15 rotor positions per design, so one design and
    # two land on either side. 1e-12 is far below any figure's meaning and far above the last place.
    designs = [design_from_project(pf.load(path)) for path in DEMOS]
    alone = evaluate_many(designs[:1])
    crowd = evaluate_many(designs * 2)
    for name, values in alone.figures.items():
        assert_allclose(crowd.figures[name][[0, 3]], values[0], rtol=1e-12, atol=0, equal_nan=True, err_msg=name)
