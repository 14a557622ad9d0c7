"""The armature winding: paths, conductors, the machine constant, resistance, fill, current density."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import winding
from pmdc_sizer.core.conductors import copper_resistivity
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.project import load
from pmdc_sizer.core.units import MU_0, from_si, rpm_to_rad_per_s


@pytest.mark.parametrize(
    ("kind", "poles", "multiplicity", "paths"),
    [("lap", 2, 1, 2), ("lap", 4, 1, 4), ("lap", 6, 2, 12), ("wave", 2, 1, 2), ("wave", 6, 1, 2), ("wave", 4, 3, 6)],
)
def test_parallel_paths(kind, poles, multiplicity, paths):
    # Source: Fitzgerald, Kingsley and Umans, "Electric Machinery", 6th ed., 2003, ch. 7 (from memory):
    # a lap winding has a = m·p paths, a wave winding a = 2·m whatever the poles.
    assert int(winding.parallel_paths(kind, poles, multiplicity)) == paths


def test_unknown_winding_type_is_refused():
    with pytest.raises(ValueError, match="lap"):
        winding.parallel_paths("frog", 4)


def test_textbook_worked_example_of_the_machine_constant():
    # Source: S. J. Chapman, "Electric Machinery Fundamentals", 4th ed., McGraw-Hill, 2005, ch. 8,
    # worked example of a 12-pole simplex wave-wound armature (from memory): 144 coils of 10 turns,
    # 0.011 Ω per turn, 0.05 Wb per pole at 200 r/min give a = 2, Z = 2880, K = Z·P/(2π·a) = 2750,
    # E = 2880 V and an armature resistance of 3.96 Ω.
    paths = int(winding.parallel_paths("wave", 12, 1))
    conductors = int(winding.total_conductors(144, 10))
    assert paths == 2 and conductors == 2880
    constant = float(winding.machine_constant(12, conductors, paths))
    assert_allclose(constant, 2750.2, rtol=2e-5)  # the book prints 2750.2
    back_emf = float(winding.back_emf_constant(constant, 0.05)) * rpm_to_rad_per_s(200.0)
    assert_allclose(back_emf, 2880.0, rtol=1e-12)  # an exact 2880 V in the book
    # Resistance: choose a turn length and wire so that one turn has 0.011 Ω at 20 °C.
    copper_area = 1e-6
    turn_length = 0.011 * copper_area / copper_resistivity(20.0)
    resistance = float(winding.armature_resistance(conductors, turn_length, paths, copper_area, 20.0))
    assert_allclose(resistance, 3.96, rtol=1e-12)


def test_a_lap_example_by_hand():
    # 4-pole simplex lap, 24 segments × 8 turns: Z = 384, a = 4, K = 4·384/(2π·4) = 61.115;
    # with 1.2 mWb per pole Ke = 0.073338 V·s/rad = 7.680 V/krpm (hand arithmetic, 5 digits).
    conductors = int(winding.total_conductors(24, 8))
    paths = int(winding.parallel_paths("lap", 4))
    ke = float(winding.back_emf_constant(winding.machine_constant(4, conductors, paths), 1.2e-3))
    assert_allclose(winding.machine_constant(4, conductors, paths), 61.115, rtol=1e-5)
    assert_allclose(ke, 0.073338, rtol=1e-5)
    assert_allclose(from_si(ke, "V/krpm"), 7.6798, rtol=1e-4)


def test_constant_broadcasts():
    flux = np.array([1e-3, 2e-3])
    constant = winding.machine_constant(2, 400, 2)
    assert_allclose(winding.back_emf_constant(constant, flux), 400 / (2 * math.pi) * flux, rtol=1e-15)


def test_resistance_scales_with_iec_60028_copper():
    # R(T)/R(20 °C) = 1 + 0.00393·(T - 20) for annealed copper (IEC 60028).
    r20 = winding.armature_resistance(400, 0.1, 2, 0.2e-6, 20.0)
    r120 = winding.armature_resistance(400, 0.1, 2, 0.2e-6, 120.0)
    assert_allclose(r120 / r20, 1.393, rtol=1e-14)
    # a paths in parallel, each of Z/(2a) turns: R = ρ·(Z/2·l)/(a²·A)
    assert_allclose(r20, copper_resistivity(20.0) * 200 * 0.1 / (4 * 0.2e-6), rtol=1e-14)


def test_mean_turn_length_of_a_demo(ferrite_demo):
    design = design_from_project(load(ferrite_demo))
    g = design.geometry
    # 12 slots on 2 poles: full pitch of 6 slots, a diameter at the mid-slot radius; the end turn is a
    # half circle over that chord (the core's estimate, common practice, no source).
    mid_slot_radius = g.armature_radius - 0.5 * g.slot_depth
    chord = 2.0 * mid_slot_radius * math.sin(0.5 * 6 * 2.0 * math.pi / 12)
    expected = 2.0 * g.stack_length + 2.0 * (0.5 * math.pi * chord)
    assert int(winding.coil_span_slots(12, 2)) == 6
    assert_allclose(winding.mean_turn_length(g), expected, rtol=1e-14)
    longer = winding.mean_turn_length(g, end_turn_factor=1.5)
    assert_allclose(longer - 2.0 * g.stack_length, 1.5 * (expected - 2.0 * g.stack_length), rtol=1e-14)


def test_coil_span_rounds_down_to_whole_slots():
    assert winding.coil_span_slots(np.array([12, 13, 7, 3]), np.array([4, 4, 2, 6])).tolist() == [3, 3, 3, 1]


def test_slot_fill_and_current_density():
    # 44 conductors of 0.4 mm in a 20 mm² slot: 44·π/4·0.16 mm² / 20 mm² = 0.27646
    fill = winding.slot_fill(528, 12, 0.4e-3, 20e-6)
    assert_allclose(fill, 44 * math.pi / 4 * 0.16 / 20, rtol=1e-14)
    # 3 A over 2 paths in 0.1 mm²: 15 A/mm²
    assert_allclose(winding.current_density(3.0, 2, 0.1e-6), 15e6, rtol=1e-14)


def test_inductance_estimate_is_positive_and_grows_with_turns_squared(ferrite_demo):
    design = design_from_project(load(ferrite_demo))
    g = design.geometry
    turn = float(winding.mean_turn_length(g))
    l1 = winding.armature_inductance_estimate(g, 528, 2, 1.07, 0.4e-3, turn)
    l2 = winding.armature_inductance_estimate(g, 1056, 2, 1.07, 0.4e-3, turn)
    assert l1 > 0.0
    assert_allclose(l2 / l1, 4.0, rtol=1e-12)  # both parts scale with (Z/a)²
    thinner_gap = winding.armature_inductance_estimate(dataclasses.replace(g), 528, 2, 1.07, 0.2e-3, turn)
    assert thinner_gap > l1


def test_a_shallow_slot_keeps_a_quarter_of_its_depth_for_the_tips_in_the_inductance(ferrite_demo):
    # The one tooth-tip rule (core.geometry.tooth_tip_height): 0.5 mm, at most a quarter of the slot depth,
    # so a 1.2 mm slot has 0.3 mm tips. Only the slot-opening term, (Z/S)²·S/a²·μ0·L·h_tip/b_opening, depends
    # on the opening: the difference between two openings gives back the tip height the estimate used.
    g = dataclasses.replace(design_from_project(load(ferrite_demo)).geometry, slot_depth=1.2e-3)
    turn = float(winding.mean_turn_length(g))
    z, a, openings = 528, 2, (1.0e-3, 2.0e-3)
    wide, narrow = (winding.armature_inductance_estimate(dataclasses.replace(g, slot_opening=b), z, a, 1.07, 0.4e-3,
                                                         turn) for b in openings)
    per_tip_metre = (z / g.slots) ** 2 * g.slots / a**2 * MU_0 * g.stack_length * (1 / openings[0] - 1 / openings[1])
    assert (wide - narrow) / per_tip_metre == pytest.approx(0.3e-3, rel=1e-9)
