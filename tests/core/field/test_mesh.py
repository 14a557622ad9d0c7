"""The mapped polar mesh: parts where they belong, the symmetric sector, and designs it refuses."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core.field import COARSE, FieldInputError, FieldOptions, Region, build_mesh, check_geometry
from pmdc_sizer.core.field.mesh import sector_of


def _areas(section):
    c = section.mesh.p[:, section.mesh.t]
    return 0.5 * ((c[0, 1] - c[0, 0]) * (c[1, 2] - c[1, 0]) - (c[0, 2] - c[0, 0]) * (c[1, 1] - c[1, 0]))


@pytest.mark.parametrize("position", [0.0, 0.0371, 1.3])
def test_every_triangle_is_counter_clockwise_and_the_parts_have_their_areas(ferrite, position):
    section = build_mesh(ferrite.geometry, position, COARSE)
    g, areas = ferrite.geometry, _areas(section)
    assert areas.min() > 0.0
    span = section.sector.angle
    # Straight-sided elements on circles: the chords cut each arc by ~(Δθ)²/12, under 1e-3 here.
    assert_allclose(areas.sum(), 0.5 * section.radii.outer**2 * span, rtol=1e-3)
    magnet = 0.5 * float(g.magnet_arc) * (float(g.housing_inner_radius) ** 2 - float(g.magnet_inner_radius) ** 2)
    assert_allclose(areas[section.region == Region.MAGNET].sum(), magnet * section.sector.poles, rtol=1e-3)
    housing = 0.5 * span * (float(g.housing_outer_radius) ** 2 - float(g.housing_inner_radius) ** 2)
    assert_allclose(areas[section.region == Region.HOUSING].sum(), housing, rtol=1e-3)
    # Slots between parallel-sided teeth: geometry's slot area less the tooth tips' overhang
    slot = areas[section.region == Region.SLOT].sum() / section.sector.slots
    assert 0.8 * float(g.slot_area) < slot < float(g.slot_area)
    assert section.elements == section.region.size == section.part.size


def test_nodes_conform_to_the_tooth_walls(ndfeb):
    # Every tooth element's corners lie within the tooth: at most half the tooth width from its centre line.
    section = build_mesh(ndfeb.geometry, 0.0, COARSE)
    teeth = np.nonzero(section.region == Region.TOOTH)[0]
    slot_pitch = 2.0 * math.pi / int(ndfeb.geometry.slots)
    corners = section.mesh.p[:, section.mesh.t[:, teeth]]  # (2, 3, n)
    angle = np.arctan2(corners[1].mean(axis=0), corners[0].mean(axis=0)) - section.sector.rotor_start
    centre = section.sector.rotor_start + slot_pitch * np.rint(angle / slot_pitch)
    # distance of each corner from its tooth's centre line (through the axis at angle `centre`)
    distance = np.abs(-corners[0] * np.sin(centre) + corners[1] * np.cos(centre))
    assert distance.max() <= 0.5 * float(ndfeb.geometry.tooth_width) * (1.0 + 1e-9)
    assert distance.max() >= 0.5 * float(ndfeb.geometry.tooth_width) * (1.0 - 1e-9)


@pytest.mark.parametrize(("poles", "slots", "expected"), [(2, 12, (1, 6, True)), (4, 20, (1, 5, True)),
                                                          (4, 21, (4, 21, False)), (4, 18, (2, 9, False)),
                                                          (6, 27, (2, 9, False)), (6, 9, (2, 3, False))])
def test_smallest_symmetric_sector(ferrite, poles, slots, expected):
    geometry = dataclasses.replace(ferrite.geometry, poles=poles, slots=slots)
    assert sector_of(geometry) == expected
    assert sector_of(geometry, full_machine=True) == (poles, slots, False)


def test_anti_periodic_ties_pair_the_sector_edges(ferrite):
    section = build_mesh(ferrite.geometry, 0.2, COARSE)
    ties = section.node_to_dof.tocoo()
    assert np.all(np.abs(ties.data) == 1.0)
    assert np.all(np.bincount(ties.row, minlength=section.mesh.p.shape[1]) == 1)  # each node is one unknown
    # each node tied with -1 shares its unknown with a node one pole pitch (the sector) away, same radius
    x = section.mesh.p
    unknown_of = dict(zip(ties.row[ties.data > 0], ties.col[ties.data > 0], strict=True))
    owner = {}
    for node, unknown in unknown_of.items():
        owner.setdefault(unknown, node)
    minus = ties.row[ties.data < 0]
    assert minus.size > 30  # one per ring of each grid, and the stitched band's copies
    for node, unknown in zip(minus, ties.col[ties.data < 0], strict=True):
        partner = owner[unknown]
        assert_allclose(np.hypot(*x[:, node]), np.hypot(*x[:, partner]), rtol=1e-12)
        turn = np.mod(np.arctan2(x[1, node], x[0, node]) - np.arctan2(x[1, partner], x[0, partner]), 2.0 * math.pi)
        assert_allclose(min(turn, 2.0 * math.pi - turn), section.sector.angle, rtol=1e-9)
    assert section.fixed_dofs.size == 1  # the axis, where A = -A


@pytest.mark.parametrize(("change", "key", "limit"), [
    ({"tooth_width": 4.0e-3}, "armature.tooth_width_mm", "narrower than"),
    ({"slot_opening": 4.5e-3}, "armature.slot_opening_mm", "wider than the slot"),
    ({"slot_depth": 10.5e-3}, "armature.slot_depth_mm", "reaches the shaft"),
    ({"magnet_arc": math.pi}, "magnets.arc_deg", "pole pitch"),
    ({"airgap": 0.0}, "airgap.length_mm", "positive"),
    ({"poles": 3}, "motor.poles", "even"),
])
def test_a_design_that_cannot_be_meshed_is_refused_naming_the_key(ferrite, change, key, limit):
    geometry = dataclasses.replace(ferrite.geometry, **change)
    with pytest.raises(FieldInputError, match=limit) as raised:
        build_mesh(geometry, 0.0, COARSE)
    assert raised.value.key == key and str(raised.value).startswith(key)
    assert isinstance(raised.value, ValueError)
    with pytest.raises(FieldInputError):
        check_geometry(geometry)


def test_finer_options_give_more_elements(ferrite):
    counts = [build_mesh(ferrite.geometry, 0.0, FieldOptions(mesh_fineness=f)).elements for f in (0.5, 1.0, 2.0)]
    assert counts[0] < counts[1] < counts[2]
    assert 3.0 < counts[2] / counts[1] < 4.5  # about four times the elements for twice the fineness
