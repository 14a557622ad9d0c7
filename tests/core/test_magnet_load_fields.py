"""The magnet's field at the currents it is judged at: the worst rotor position the network tells apart."""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import project
from pmdc_sizer.core.armature_mmf import distinct_rotor_positions
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.field import FieldCase, solve_case
from pmdc_sizer.core.magnet_load_fields import magnet_load_fields
from pmdc_sizer.core.pole_magnetics import design_network, pole_states, two_dimensional_states

from .conftest import DEMO_FOLDER


@pytest.fixture(scope="module")
def drill():
    return design_from_project(project.load(DEMO_FOLDER / "power_tool_4pole_48v.toml"))


def test_the_worst_position_is_the_least_field_over_every_position(drill):
    # By hand: the network solved at each distinct rotor position alone; the verdict is the most negative
    # worst-area field among them, and a current that was not solved is refused, not interpolated.
    fields = magnet_load_fields(drill, [-10.0, 60.0], [[80.0, 400.0], [300.0]])
    positions = distinct_rotor_positions(design_network(drill).centre_angle, int(drill.geometry.slots))[0]
    alone = pole_states(drill, np.full(positions.size, 60.0), np.full(positions.size, 300.0), rotor_position=positions)
    entry, worst = fields.worst_at(1, 300.0)
    assert_allclose(worst, alone.worst_field.min(), rtol=1e-6)
    # the states run position after position, three solved currents each
    assert fields.positions[entry // 3] == positions[int(np.argmin(alone.worst_field))]
    assert np.ptp(alone.worst_field) > 0.01 * abs(worst)
    with pytest.raises(KeyError, match=r"not solved at 200\.0 A"):
        fields.worst_at(0, 200.0)


def test_the_drills_direct_supply_reversal_against_the_field_solution(drill):
    # Source: the built-in 2-D field solution (core.field, scikit-fem, default mesh) of the drill demo at
    # its direct-supply reversal current, cold (3.36 kA at -10 °C). The field solution's worst 5 % of the
    # magnet reads -1940 kA/m at four rotor positions over a slot pitch alike, 3 % short of the knee
    # (-2005 kA/m); the network's reading swings with the position (-1791 to -2162 kA/m, measured), and the
    # tool takes the worst: -2162 kA/m, 11 % past the field solution's, so the tool reports this fault past
    # the knee where the field solution keeps it just short. Pinned so that the tool stays on the safe side
    # of the field solution here and within 15 % of it (README, known limits).
    slots = int(drill.geometry.slots)
    field = solve_case(drill, FieldCase("reversal", "armature current", -10.0, 3360.0, rotor_position_rad=0.0))
    positions = distinct_rotor_positions(design_network(drill).centre_angle, slots)[0]
    network = two_dimensional_states(drill, np.full(positions.size, -10.0), np.full(positions.size, 3360.0),
                                     rotor_position=positions).worst_field.min()
    assert field.worst_share_magnet_field_A_per_m > field.knee_field_A_per_m  # short of the knee
    assert network < field.worst_share_magnet_field_A_per_m  # the tool is the more pessimistic
    assert_allclose(network, field.worst_share_magnet_field_A_per_m, rtol=0.15)
