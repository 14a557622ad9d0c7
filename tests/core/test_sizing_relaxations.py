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
