"""The relaxations' grid walk: evaluated in ascending blocks that stop at the first pass, it finds what the
whole grid evaluated at once finds."""

from __future__ import annotations

from pathlib import Path

import pytest

from pmdc_sizer.core import project, sizing_relaxations, with_values

FERRITE = Path(__file__).resolve().parents[2] / "demo_projects" / "appliance_ferrite_12v.toml"


@pytest.fixture(scope="module")
def too_slow():
    # the ferrite demo with 7.5 mm magnets (which keep the required margin to the knee) asked for 3100 rpm at
    # its rated torque: 12 V is too little, some per cent more passes; a second design with 7 mm magnets beside it
    base = with_values(project.load(FERRITE), {"load.speed_rpm": 3100.0, "magnets.thickness_mm": 7.5})
    return [base, with_values(base, {"magnets.thickness_mm": 7.0})]


@pytest.mark.parametrize("block", [1, 3])
def test_blocks_find_what_the_whole_grid_finds(too_slow, monkeypatch, block):
    voltages = [12.0 * (1.0 + 0.025 * i) for i in range(1, 13)]
    monkeypatch.setattr(sizing_relaxations, "_BLOCK_VALUES", len(voltages))
    whole = sizing_relaxations._first_passing(too_slow, "supply.voltage_V", voltages)
    monkeypatch.setattr(sizing_relaxations, "_BLOCK_VALUES", block)
    walked = sizing_relaxations._first_passing(too_slow, "supply.voltage_V", voltages)
    assert whole == walked
    # the pass lies past the first blocks (13.2 V, the fourth value), so the walk crossed a block's end
    assert isinstance(whole[0], float) and whole[0] > voltages[2]


def test_when_nothing_passes_the_last_value_says_what_still_fails(too_slow, monkeypatch):
    lower = [12.0 * (1.0 - 0.025 * i) for i in range(1, 6)]  # less voltage: slower still, never passes
    monkeypatch.setattr(sizing_relaxations, "_BLOCK_VALUES", len(lower))
    whole = sizing_relaxations._first_passing(too_slow, "supply.voltage_V", lower)
    monkeypatch.setattr(sizing_relaxations, "_BLOCK_VALUES", 2)
    walked = sizing_relaxations._first_passing(too_slow, "supply.voltage_V", lower)
    assert whole == walked
    value, who, still = walked
    assert value is None and who == -1 and "load" in still


@pytest.fixture(scope="module")
def short_stack():
    # the ferrite demo on a 15 mm stack under its 28 mm magnets: the overhang's flux saturates the teeth
    return with_values(project.load(FERRITE), {"armature.stack_length_mm": 15.0})


def _tooth_status(design):
    from pmdc_sizer.core.evaluate import evaluate

    return next(c.status for c in evaluate(design).checks if c.key == "tooth_flux_density")


def test_a_fixed_check_does_not_move_with_any_relaxation_tried(short_stack):
    # The claim FIXED_CHECKS rests on (core.checks: the iron's flux at the nominal case, no load): the most
    # relaxed value of every grid leaves the tooth check failing, with the same message.
    from pmdc_sizer.core.evaluate import evaluate

    def message(design):
        return next(c.message for c in evaluate(design).checks if c.key == "tooth_flux_density")

    assert _tooth_status(short_stack) == "fail"
    relaxed = [{"supply.voltage_V": 24.0}, {"load.torque_mNm": 3.5}, {"load.speed_rpm": 280.0},
               {"temperatures.ambient_max_C": short_stack.temperatures.ambient_nominal_C},
               {"winding.insulation_class": "220 (R)"}]
    for change in relaxed:
        assert message(with_values(short_stack, change)) == message(short_stack), change


def test_a_design_failing_a_fixed_check_is_not_re_evaluated_relaxed(short_stack, monkeypatch):
    ferrite = project.load(FERRITE)
    fixed = sizing_relaxations.fixed_misses([short_stack, ferrite])
    assert fixed == [("tooth_flux_density",), ()]
    calls = []
    original = sizing_relaxations.evaluate_many
    monkeypatch.setattr(sizing_relaxations, "evaluate_many", lambda designs: calls.append(len(designs))
                        or original(designs))
    # alone, nothing is tried, and nothing evaluated
    assert sizing_relaxations.relaxations([short_stack], ["tooth_flux_density"], ["the closest design"],
                                          fixed[:1]) == []
    assert calls == []
    # beside a design that can be relaxed (too slow at 12 V, a few per cent more supply passes), only that one
    # is, and the sentence says why the closest is left out
    too_slow = with_values(ferrite, {"load.speed_rpm": 3100.0, "magnets.thickness_mm": 7.5})
    sentences = sizing_relaxations.relaxations([with_values(short_stack, {"load.speed_rpm": 3100.0}), too_slow],
                                               ["tooth_flux_density", "load"], ["the closest design", "the other"],
                                               [fixed[0], ()])
    assert sentences[0].startswith("the closest design is left out (its tooth flux density does not depend")
    assert calls and max(calls) <= sizing_relaxations._BLOCK_VALUES  # one design per value: the other alone
    assert any(s.startswith("with a ") and "the other passes every check" in s for s in sentences[1:]), sentences
