"""Magnetization directions and the armature's slot currents with brushes on the neutral axis."""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core.field import COARSE, Region, build_mesh
from pmdc_sizer.core.field.excitation import (
    commutation_zone_angle,
    current_pattern,
    element_centroids,
    magnetization_direction,
    slot_currents,
)
from pmdc_sizer.core.winding import parallel_paths, total_conductors


@pytest.mark.parametrize("kind", ["radial", "parallel"])
def test_magnets_alternate_and_point_the_right_way(ndfeb, kind):
    section = build_mesh(ndfeb.geometry, 0.0, COARSE)
    direction = magnetization_direction(section, 4, kind)
    magnet = section.region == Region.MAGNET
    assert_allclose(np.hypot(*direction[:, magnet]), 1.0, rtol=1e-12)
    assert np.all(direction[:, ~magnet] == 0.0)
    x = element_centroids(section)[:, magnet]
    radial = (direction[:, magnet] * x).sum(axis=0) / np.hypot(*x)
    assert np.all(radial < 0.0)  # magnet 0, the only one in this sector, points at the axis (north inwards)
    if kind == "radial":
        assert_allclose(radial, -1.0, rtol=1e-12)
    else:
        assert_allclose(direction[:, magnet], np.array([[-1.0], [0.0]]) * np.ones(magnet.sum()), atol=1e-12)


def test_current_pattern_alternates_and_ramps_through_the_commutation_zone():
    poles, zone = 4, math.radians(18.0)
    pitch = 2.0 * math.pi / poles
    angles = np.array([0.0, pitch, 0.5 * pitch, 0.5 * pitch - 0.25 * zone, 0.5 * pitch + 0.25 * zone, 0.4 * pitch])
    assert_allclose(current_pattern(angles, poles, zone), [-1.0, 1.0, 0.0, -0.5, 0.5, -1.0], atol=1e-12)
    # anti-periodic over one pole pitch
    theta = np.linspace(-3.0, 3.0, 101)
    assert_allclose(current_pattern(theta + pitch, poles, zone), -current_pattern(theta, poles, zone), atol=1e-12)


def test_slot_currents_carry_the_winding_ampere_conductors(ferrite):
    # Z/S conductors of I/a in each slot; away from the commutation zones every slot carries it all.
    g, w = ferrite.geometry, ferrite.winding
    section = build_mesh(g, 0.0, COARSE)
    currents = slot_currents(section, 10.0, w.kind, w.multiplicity, 2, int(g.slots), w.commutator_segments,
                             w.turns_per_coil)
    per_slot = float(total_conductors(w.commutator_segments, w.turns_per_coil)) / int(g.slots) * 10.0 / float(
        parallel_paths(w.kind, 2, w.multiplicity))
    zone = commutation_zone_angle(2, int(g.slots), w.commutator_segments)
    from_neutral = 0.5 * math.pi - np.abs(section.slot_angles)
    full = from_neutral >= 0.5 * zone
    assert full.sum() >= 4
    assert_allclose(np.abs(currents[full]), per_slot, rtol=1e-12)
    assert np.all(np.abs(currents) <= per_slot * (1 + 1e-12))
    assert np.all(currents[np.abs(section.slot_angles) < 0.4 * math.pi] < 0.0)  # under magnet 0
