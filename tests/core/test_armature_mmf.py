"""The armature current the network's loops enclose: in its slots at a rotor position, and as the smeared sheet."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import project
from pmdc_sizer.core.armature_mmf import (
    commutation_zone,
    current_share,
    distinct_rotor_positions,
    enclosed_currents,
    rotor_position_shares,
    slot_angles,
    slot_enclosed_currents,
)
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.pole_magnetics import design_network
from pmdc_sizer.core.winding import parallel_paths, total_conductors

DEMOS = sorted((Path(__file__).resolve().parents[2] / "demo_projects").glob("*.toml"))


@pytest.fixture(scope="module", params=DEMOS, ids=[p.stem for p in DEMOS])
def network(request):
    design = design_from_project(project.load(request.param))
    g, w = design.geometry, design.winding
    winding = (int(g.poles), int(g.slots), w.commutator_segments,
               int(total_conductors(w.commutator_segments, w.turns_per_coil)),
               int(parallel_paths(w.kind, g.poles, w.multiplicity)))
    return design_network(design), winding


def _dense_reference(elements, current, winding, position):
    """The definition, slot by slot and branch by branch: each slot's current counts in the loop whose two
    branch centres it lies between, half to each side when it lies on a centre."""
    poles, slots, segments, conductors, paths = winding
    angles = slot_angles(position, slots, 2.0 * np.pi / poles)[:, None, :]
    start = elements.centre_angle[0][None, :, None]
    end = start + elements.yoke_angle[0][None, :, None]
    on_start, on_end = np.isclose(angles, start, atol=1e-9, rtol=0), np.isclose(angles, end, atol=1e-9, rtol=0)
    weight = np.where(on_start | on_end, 0.5 * (on_start + on_end.astype(float)),
                      ((angles > start) & (angles < end)).astype(float))
    share = current_share(angles, poles, commutation_zone(poles, slots, segments))
    return conductors * current / paths * (weight * share).sum(axis=-1) / slots


def test_slot_currents_are_the_slot_by_slot_sum(network):
    elements, winding = network
    slots = winding[1]
    pitch = 2.0 * np.pi / slots
    rng = np.random.default_rng(3)
    # random positions, and positions that put a slot exactly on each branch centre (counted half each side)
    positions = np.concatenate([rng.uniform(0.0, pitch, 40), np.mod(elements.centre_angle[0], pitch)])
    rows = np.zeros(positions.size, dtype=np.intp)
    slotted = slot_enclosed_currents(elements, np.full(positions.size, 12.5), *winding, positions, rows)
    assert_allclose(slotted, _dense_reference(elements, 12.5, winding, positions), rtol=1e-12, atol=1e-9)


def test_over_a_slot_pitch_the_slots_average_to_the_smeared_sheet(network):
    # The flux per pole takes the smeared sheet as the mean over the rotor's turning: the slots' currents,
    # averaged over evenly spaced rotor positions through one slot pitch, must give the same loop currents.
    elements, winding = network
    count = 4000
    positions = (np.arange(count) + 0.5) / count * 2.0 * np.pi / winding[1]
    slotted = slot_enclosed_currents(elements, np.full(count, 10.0), *winding, positions,
                                     np.zeros(count, dtype=np.intp))
    smeared = enclosed_currents(elements, np.array([10.0]), *winding, np.zeros(1, dtype=np.intp))[0]
    assert_allclose(slotted.mean(axis=0), smeared, atol=1e-3 * np.abs(smeared).max())


def test_the_distinct_positions_weighted_by_their_shares_give_the_smeared_sheet(network):
    # Each distinct position stands for the arrangement between two crossings; weighted by the share of the
    # slot pitch it holds over, the positions' slot currents must average to the smeared sheet, as the
    # 4000 evenly spaced positions above do: exactly where a commutating coil's current changes linearly
    # across the interval, to within a per cent of the peak where a slot enters or leaves the commutation zone
    # between two crossings (the current's kink there is not at the midpoint: 0.6 % on the drill demo).
    elements, winding = network
    positions = distinct_rotor_positions(elements.centre_angle, winding[1])[0]
    shares = rotor_position_shares(elements.centre_angle, winding[1])[0]
    assert shares.shape == positions.shape and np.all(shares >= 0.0)
    assert_allclose(shares.sum(), 1.0, rtol=1e-12)
    slotted = slot_enclosed_currents(elements, np.full(positions.size, 10.0), *winding, positions,
                                     np.zeros(positions.size, dtype=np.intp))
    smeared = enclosed_currents(elements, np.array([10.0]), *winding, np.zeros(1, dtype=np.intp))[0]
    assert_allclose(shares @ slotted, smeared, atol=1e-2 * np.abs(smeared).max())
    # the unweighted mean is not the sheet where the crossings are unevenly spaced
    uneven = np.ptp(shares) > 0.5 / positions.size
    if uneven:
        assert not np.allclose(slotted.mean(axis=0), smeared, atol=1e-2 * np.abs(smeared).max())
