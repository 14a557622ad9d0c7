"""The motor's cross-section as a triangle mesh: a mapped polar mesh, written here.

Why our own mesher. The cross-section is rings of parts (shaft, core, teeth and slots, gap, magnets,
housing, outside air) bounded by circles and by a few edges per slot and per pole. A structured polar
grid whose columns follow those edges (the parallel-sided tooth walls bend the columns inside the slot
band) conforms to every edge and every radius exactly, needs no new dependency, is built in a few
vectorised numpy steps and is the same for the same design every time. Its cells are split into right
triangles, whose largest angle stays at about 90° however elongated they are, which is the condition
for the linear elements' error bound (I. Babuška and A. K. Aziz, SIAM J. Numer. Anal. 13 (1976) 214-226).

Layout, in the stator frame (angle θ measured from the centre of magnet 0, counter-clockwise):

* the **rotor grid**, from the axis (one centre node, a fan of triangles) to a third of the way across
  the gap, turned by the rotor position; at position 0 a slot centre faces the centre of magnet 0;
* the **stator grid**, from two thirds of the way across the gap to the outer air;
* between them the **stitched band** (the middle third of the gap), triangles joining the two rings'
  different nodes, so the rotor may sit at any angle: each edge of one ring is joined to the node of
  the other ring nearest its midpoint (the nodes' spans are split at the edges' midpoints).

Symmetry: the smallest sector that holds whole slots and whole poles, k = p / gcd(S, p) poles; the
potential repeats as A(θ + k·τp) = (-1)^k·A(θ) (anti-periodic for odd k). The nodes on the sector's
closing edge are tied to those on its opening edge with that sign (``node_to_dof``); nodes of the
stitched band that fall past the sector's end are copies of real nodes, tied the same way.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import IntEnum

import numpy as np
import scipy.sparse as sp
import skfem

from ..geometry import Geometry
from ..units import from_si
from .errors import FieldInputError
from .options import FieldOptions
from .stitching import Ties, stitch


class Region(IntEnum):
    """What each element is made of (the material is chosen per region, see :mod:`.materials`)."""

    SHAFT = 0
    CORE = 1  #: lamination below the slots
    TOOTH = 2  #: lamination between the slots
    TOOTH_TIP = 3  #: lamination of the tooth tips that overhang the slot
    SLOT = 4  #: the winding's area
    SLOT_OPENING = 5  #: air between the tooth tips
    GAP = 6
    MAGNET = 7
    INTERPOLAR = 8  #: air between the magnets
    HOUSING = 9
    OUTSIDE_AIR = 10


LAMINATION_REGIONS = (Region.CORE, Region.TOOTH, Region.TOOTH_TIP)
ROTOR_REGIONS = (Region.SHAFT, *LAMINATION_REGIONS, Region.SLOT, Region.SLOT_OPENING)

#: Outside air meshed from the housing's outer radius R to (1 + this)·R; beyond it, a boundary
#: condition carries the field's fundamental to infinity (see :mod:`.solve`).
OUTSIDE_AIR_FACTOR = 0.25
#: Radial over angular element size in the magnets and the housing [1].
RADIAL_ASPECT = 1.5
#: The same in the armature, whose teeth and core saturate first: halving it there cut the flux per
#: pole's change to a mesh twice as fine from 0.5 % to 0.25 % on the demos (measured).
ROTOR_RADIAL_ASPECT = 0.75


@dataclass(frozen=True)
class SectionRadii:
    """The radii at which the parts meet [m]."""

    shaft: float
    slot_bottom: float
    tooth_tip: float  #: where the tooth tips begin
    armature: float
    mid_gap: float  #: where the air-gap field is sampled
    magnet_inner: float
    housing_inner: float
    housing_outer: float
    outer: float  #: edge of the meshed outside air


@dataclass(frozen=True)
class Sector:
    """The part of the circumference that is meshed, in the stator frame."""

    poles: int  #: whole poles in the sector [1]
    slots: int  #: whole slots in the sector [1]
    angle: float  #: [rad]
    start: float  #: the sector's first interpolar axis [rad]
    antiperiodic: bool  #: A(θ + angle) = -A(θ); otherwise periodic
    rotor_start: float  #: the rotor grid's first tooth centre [rad]


@dataclass(frozen=True)
class SectionMesh:
    """A meshed cross-section and what each element is (SI, stator frame)."""

    mesh: skfem.MeshTri  #: nodes [m]
    region: np.ndarray  #: per element, a :class:`Region` code
    part: np.ndarray  #: per element: the slot, tooth or magnet it belongs to (0, 1, ... in the sector), else -1
    node_to_dof: sp.csr_matrix  #: nodes × unknowns, entries ±1: the symmetry ties
    fixed_dofs: np.ndarray  #: unknowns held at A = 0 (the axis, in an anti-periodic sector)
    outer_facets: np.ndarray  #: facets on the outer edge of the outside air
    radii: SectionRadii
    sector: Sector
    rotor_position: float  #: [rad]
    slot_angles: np.ndarray  #: stator-frame angle of each slot's centre in the sector [rad]

    @property
    def elements(self) -> int:
        """Number of triangles [1]."""
        return int(self.mesh.t.shape[1])


def _fail(key: str, message: str) -> None:
    raise FieldInputError(f"{key}: {message}", key=key)


def _mm(length) -> str:
    return f"{float(from_si(length, 'mm')):.4g} mm"


def _half_slot_angle(radius, slot_pitch_angle, tooth_width):
    """Half the slot's angular width at ``radius`` between parallel-sided teeth [rad]."""
    return 0.5 * slot_pitch_angle - np.arcsin(np.minimum(tooth_width / (2.0 * radius), 1.0))


def check_geometry(geometry: Geometry) -> None:
    """Refuse a cross-section that cannot be meshed, naming the project key and the limit.

    Parameters
    ----------
    geometry : Geometry
        The cross-section (scalar fields).

    Raises
    ------
    FieldInputError
        When parts touch or overlap: a slot wider than its pitch, teeth that meet at the slot bottom, a
        slot opening wider than the slot, slots that reach the shaft, magnets wider than the pole pitch.
    """
    g = geometry
    poles, slots = int(g.poles), int(g.slots)
    if poles < 2 or poles % 2:
        _fail("motor.poles", f"{poles} is not an even number of at least 2")
    if slots < 2:
        _fail("armature.slots", f"{slots} is fewer than 2")
    for key, value in (("airgap.length_mm", g.airgap), ("magnets.thickness_mm", g.magnet_thickness),
                       ("housing.wall_mm", g.housing_wall), ("armature.slot_depth_mm", g.slot_depth),
                       ("armature.tooth_width_mm", g.tooth_width), ("armature.slot_opening_mm", g.slot_opening),
                       ("armature.stack_length_mm", g.stack_length)):
        if not float(value) > 0.0:
            _fail(key, f"{float(from_si(value, 'mm')):g} mm must be positive for the field solution")
    pole_pitch = 2.0 * math.pi / poles
    if not 0.0 < float(g.magnet_arc) < pole_pitch:
        _fail("magnets.arc_deg", f"{math.degrees(float(g.magnet_arc)):g}° must lie between 0° and the pole pitch, "
              f"{math.degrees(pole_pitch):g}°, so that the magnets do not touch")
    if not float(g.shaft_radius) >= 0.0:
        _fail("armature.shaft_diameter_mm", "must not be negative")
    slot_bottom = float(g.slot_bottom_radius)
    if slot_bottom <= float(g.shaft_radius):
        _fail("armature.slot_depth_mm", f"{_mm(g.slot_depth)} reaches the shaft; the slots may be at most "
              f"{_mm(float(g.armature_radius) - float(g.shaft_radius))} deep")
    slot_pitch_angle = 2.0 * math.pi / slots
    widest_tooth = 2.0 * slot_bottom * math.sin(0.5 * slot_pitch_angle)
    if float(g.tooth_width) >= widest_tooth:
        _fail("armature.tooth_width_mm", f"{_mm(g.tooth_width)}: neighbouring teeth touch at the slot bottom; "
              f"the tooth must be narrower than {_mm(widest_tooth)} there")
    tip_radius = float(g.armature_radius) - float(g.tooth_tip_height)
    half_slot_at_tips = float(_half_slot_angle(tip_radius, slot_pitch_angle, g.tooth_width))
    slot_width_at_tips = 2.0 * tip_radius * math.sin(half_slot_at_tips)
    if float(g.slot_opening) > slot_width_at_tips:
        _fail("armature.slot_opening_mm", f"{_mm(g.slot_opening)} is wider than the slot below the tooth tips "
              f"({_mm(slot_width_at_tips)}, the slot pitch less the tooth width there)")


def _sizes(geometry: Geometry, options: FieldOptions) -> tuple[float, float]:
    """Target element size along the gap and radially in the parts [m]."""
    g = geometry
    along_gap = min(float(g.airgap), float(g.slot_pitch) / 8.0) / options.mesh_fineness
    return along_gap, RADIAL_ASPECT * along_gap


def _count(length: float, size: float, least: int) -> int:
    return max(least, math.ceil(length / size - 1e-9))


def _columns(feature_angles: list[np.ndarray], counts: list[int]) -> np.ndarray:
    """Columns between consecutive features, ``counts[i]`` cells between feature i and i + 1.

    ``feature_angles[i]`` has one angle per ring; returns (rings, columns), the last feature included."""
    parts = []
    for i, n in enumerate(counts):
        fraction = np.arange(n) / n
        parts.append(feature_angles[i][:, None] + (feature_angles[i + 1] - feature_angles[i])[:, None] * fraction)
    parts.append(feature_angles[-1][:, None])
    return np.concatenate(parts, axis=1)


def _rings(r0: float, r1: float, cells: int, growth: float = 1.0) -> np.ndarray:
    """Radii from r0 to r1 (both included) in ``cells`` steps growing by ``growth`` each [m]."""
    steps = growth ** np.arange(cells)
    return r0 + (r1 - r0) * np.concatenate([[0.0], np.cumsum(steps) / steps.sum()])


def sector_of(geometry: Geometry, full_machine: bool = False) -> tuple[int, int, bool]:
    """The smallest symmetric sector: (poles, slots, anti-periodic) in it.

    Parameters
    ----------
    geometry : Geometry
        The cross-section.
    full_machine : bool
        Return the whole circumference instead.

    Returns
    -------
    tuple of (int, int, bool)
        Poles and slots in the sector, and whether the potential changes sign across it.
    """
    poles, slots = int(geometry.poles), int(geometry.slots)
    sector_poles = poles if full_machine else poles // math.gcd(slots, poles)
    return sector_poles, slots * sector_poles // poles, sector_poles % 2 == 1


# Segments of a slot pitch, from one tooth centre to the next, and of a pole, interpolar to interpolar.
_TOOTH, _OVERHANG, _OPENING, _INTERPOLAR, _MAGNET = range(5)
# Bands of rings.
_SHAFT, _CORE, _SLOTS, _TIPS, _GAP, _MAGNETS, _HOUSING, _OUTSIDE = range(8)
_REGION = {  # (band, segment) → region
    **{(_SHAFT, s): Region.SHAFT for s in (_TOOTH, _OVERHANG, _OPENING)},
    **{(_CORE, s): Region.CORE for s in (_TOOTH, _OVERHANG, _OPENING)},
    (_SLOTS, _TOOTH): Region.TOOTH, (_SLOTS, _OVERHANG): Region.SLOT, (_SLOTS, _OPENING): Region.SLOT,
    (_TIPS, _TOOTH): Region.TOOTH_TIP, (_TIPS, _OVERHANG): Region.TOOTH_TIP, (_TIPS, _OPENING): Region.SLOT_OPENING,
    **{(_GAP, s): Region.GAP for s in range(5)},
    (_MAGNETS, _INTERPOLAR): Region.INTERPOLAR, (_MAGNETS, _MAGNET): Region.MAGNET,
    **{(_HOUSING, s): Region.HOUSING for s in (_INTERPOLAR, _MAGNET)},
    **{(_OUTSIDE, s): Region.OUTSIDE_AIR for s in (_INTERPOLAR, _MAGNET)},
}


@dataclass(frozen=True)
class _Grid:
    x: np.ndarray  #: node coordinates (2, rings·columns)
    radii: np.ndarray
    angles: np.ndarray  #: (rings, columns) [rad]
    triangles: np.ndarray  #: (3, n), node numbers local to the grid
    region: np.ndarray
    part: np.ndarray
    segments: np.ndarray  #: per column interval
    column_parts: np.ndarray  #: per column interval


def _region_table() -> np.ndarray:
    table = np.full((8, 5), -1)
    for (band, segment), region in _REGION.items():
        table[band, segment] = region
    return table


def _grid(radii, angles, bands, segments, parts) -> _Grid:
    """Right triangles on a mapped polar grid; ``bands`` per ring interval, ``segments``/``parts`` per column
    interval."""
    rings, columns = angles.shape
    ids = np.arange(rings * columns).reshape(rings, columns)
    n00, n01, n10, n11 = ids[:-1, :-1], ids[:-1, 1:], ids[1:, :-1], ids[1:, 1:]
    lower, upper = np.stack([n00, n01, n11]).reshape(3, -1), np.stack([n00, n11, n10]).reshape(3, -1)
    triangles = np.concatenate([lower, upper], axis=1)
    region = _region_table()[np.asarray(bands)[:, None], np.asarray(segments)[None, :]].ravel()
    part = np.broadcast_to(np.asarray(parts)[None, :], (rings - 1, columns - 1)).ravel()
    x = np.stack([radii[:, None] * np.cos(angles), radii[:, None] * np.sin(angles)]).reshape(2, -1)
    return _Grid(x, radii, angles, triangles, np.tile(region, 2), np.tile(part, 2), np.asarray(segments),
                 np.asarray(parts))


def _rotor_grid(g: Geometry, sector_slots: int, rotor_start: float, size: float, radial: float) -> tuple[_Grid, int]:
    """The rotor's grid, and the band of the fan of triangles round the axis inside its first ring."""
    slot_pitch = 2.0 * math.pi / int(g.slots)
    r_a, r_sb, r_sh = float(g.armature_radius), float(g.slot_bottom_radius), float(g.shaft_radius)
    r_tip = r_a - float(g.tooth_tip_height)
    width, opening = float(g.tooth_width), float(g.slot_opening)
    radii, bands = [np.zeros(1)], []
    for band, r0, r1, least, step in ((_SHAFT, 0.0, r_sh, 2, 2.0 * radial), (_CORE, r_sh, r_sb, 2, radial),
                                      (_SLOTS, r_sb, r_tip, 3, radial), (_TIPS, r_tip, r_a, 1, radial),
                                      (_GAP, r_a, r_a + float(g.airgap) / 3.0, 2, np.inf)):
        if r1 - r0 <= 0.0:
            continue
        n = _count(r1 - r0, step, least)
        radii.append(_rings(r0, r1, n)[1:])
        bands += [band] * n
    r = np.concatenate(radii)[1:]  # the axis is the fan's centre node, added by the caller
    wall = _half_slot_angle(np.clip(r, r_sb, r_tip), slot_pitch, width)
    fraction = np.arcsin(opening / (2.0 * r_tip)) / _half_slot_angle(r_tip, slot_pitch, width)
    open_edge = np.where(r >= r_tip, np.arcsin(opening / (2.0 * np.clip(r, r_tip, r_a))),
                         fraction * _half_slot_angle(np.clip(r, r_sb, r_tip), slot_pitch, width))
    tooth_arc = r_a * (0.5 * slot_pitch - _half_slot_angle(r_tip, slot_pitch, width))
    overhang_arc = r_a * (_half_slot_angle(r_tip, slot_pitch, width) - math.asin(opening / (2.0 * r_a)))
    opening_arc = 2.0 * r_a * math.asin(opening / (2 * r_a))
    counts_one = [_count(tooth_arc, size, 1), _count(overhang_arc, size, 1), _count(opening_arc, size, 2)]
    features, counts, segments, parts = [], [], [], []
    for m in range(sector_slots):
        centre = (m + 0.5) * slot_pitch + np.zeros_like(r)
        features += [m * slot_pitch + np.zeros_like(r), centre - wall, centre - open_edge, centre + open_edge,
                     centre + wall]
        for segment, n, part in ((_TOOTH, counts_one[0], m), (_OVERHANG, counts_one[1], m),
                                 (_OPENING, counts_one[2], m),
                                 (_OVERHANG, counts_one[1], m), (_TOOTH, counts_one[0], (m + 1) % sector_slots)):
            counts.append(n)
            segments += [segment] * n
            parts += [part] * n
    features.append(sector_slots * slot_pitch + np.zeros_like(r))
    angles = rotor_start + _columns(features, counts)
    return _grid(r, angles, bands[1:], segments, parts), bands[0]


def _stator_grid(g: Geometry, sector_poles: int, start: float, size: float, radial: float) -> _Grid:
    pitch, arc = 2.0 * math.pi / int(g.poles), float(g.magnet_arc)
    r_a, r_m = float(g.armature_radius), float(g.magnet_inner_radius)
    r_h, r_o = float(g.housing_inner_radius), float(g.housing_outer_radius)
    outer = r_o * (1.0 + OUTSIDE_AIR_FACTOR)
    r = [np.linspace(r_a + 2.0 * float(g.airgap) / 3.0, r_m, 3)]
    bands = [_GAP, _GAP]
    for band, r0, r1, least, growth in ((_MAGNETS, r_m, r_h, 3, 1.0), (_HOUSING, r_h, r_o, 3, 1.0),
                                        (_OUTSIDE, r_o, outer, 4, 1.35)):
        n = _count(r1 - r0, radial * (2.0 if growth > 1.0 else 1.0), least)
        r.append(_rings(r0, r1, n, growth)[1:])
        bands += [band] * n
    radii = np.concatenate(r)
    interpolar_n = _count(0.5 * (pitch - arc) * r_m, size, 1)
    magnet_n = _count(0.5 * arc * r_m, size, 2)
    features, counts, segments, parts = [], [], [], []
    for k in range(sector_poles):
        for offset, n, segment in ((0.0, interpolar_n, _INTERPOLAR), (0.5 * (pitch - arc), magnet_n, _MAGNET),
                                   (0.5 * pitch, magnet_n, _MAGNET), (0.5 * (pitch + arc), interpolar_n, _INTERPOLAR)):
            features.append(k * pitch + offset + np.zeros_like(radii))
            counts.append(n)
            segments += [segment] * n
            parts += [k if segment == _MAGNET else -1] * n
    features.append(sector_poles * pitch + np.zeros_like(radii))
    return _grid(radii, start + _columns(features, counts), bands, segments, parts)


def build_mesh(geometry: Geometry, rotor_position: float = 0.0, options: FieldOptions | None = None) -> SectionMesh:
    """Mesh the cross-section of ``geometry`` with the rotor turned by ``rotor_position``.

    Parameters
    ----------
    geometry : Geometry
        The cross-section (scalar fields), checked first by :func:`check_geometry`.
    rotor_position : float
        Mechanical angle of the rotor [rad]; at 0 a slot centre faces the centre of magnet 0.
    options : FieldOptions, optional
        Mesh fineness and symmetry; the defaults when None.

    Returns
    -------
    SectionMesh
        The mesh, each element's region and part, the symmetry ties and the boundaries.

    Raises
    ------
    FieldInputError
        When the cross-section cannot be meshed (see :func:`check_geometry`).

    References
    ----------
    .. [1] I. Babuška and A. K. Aziz, "On the angle condition in the finite element method", SIAM J.
       Numer. Anal. 13 (1976) 214-226 (why elongated right triangles are sound).
    """
    options = options or FieldOptions()
    check_geometry(geometry)
    g = geometry
    size, radial = _sizes(g, options)
    sector_poles, sector_slots, antiperiodic = sector_of(g, options.full_machine)
    pole_pitch, slot_pitch = 2.0 * math.pi / int(g.poles), 2.0 * math.pi / int(g.slots)
    span, start = sector_poles * pole_pitch, -0.5 * pole_pitch
    # the rotor grid begins at the tooth centre nearest the sector's start
    first_tooth = rotor_position + 0.5 * slot_pitch
    rotor_start = first_tooth + round((start - first_tooth) / slot_pitch) * slot_pitch
    rotor, fan_band = _rotor_grid(g, sector_slots, rotor_start, size, radial * ROTOR_RADIAL_ASPECT / RADIAL_ASPECT)
    stator = _stator_grid(g, sector_poles, start, size, radial)
    rotor_ids = 1 + np.arange(rotor.x.shape[1]).reshape(rotor.angles.shape)
    stator_ids = 1 + rotor.x.shape[1] + np.arange(stator.x.shape[1]).reshape(stator.angles.shape)
    ties = Ties(1 + rotor.x.shape[1] + stator.x.shape[1], -1.0 if antiperiodic else 1.0)
    for ids in (rotor_ids, stator_ids):
        ties.tie(ids[:, -1], ids[:, 0])
    first_ring = rotor_ids[0]
    fan = np.stack([np.zeros(first_ring.size - 1, dtype=int), first_ring[:-1], first_ring[1:]])
    band = stitch((rotor_ids[-1], rotor.angles[-1], float(rotor.radii[-1])),
                   (stator_ids[0], stator.angles[0], float(stator.radii[0])), span, ties)
    x = np.concatenate([np.zeros((2, 1)), rotor.x, stator.x, *(c[:, None] for c in ties.extra_x)], axis=1)
    triangles = np.concatenate([fan, rotor.triangles + 1, band, stator.triangles + stator_ids[0, 0]], axis=1)
    region = np.concatenate([_region_table()[fan_band, rotor.segments], rotor.region,
                             np.full(band.shape[1], int(Region.GAP)), stator.region])
    part = np.concatenate([rotor.column_parts, rotor.part, np.full(band.shape[1], -1), stator.part])
    # counter-clockwise throughout
    corners = x[:, triangles]
    twice_area = ((corners[0, 1] - corners[0, 0]) * (corners[1, 2] - corners[1, 0])
                  - (corners[0, 2] - corners[0, 0]) * (corners[1, 1] - corners[1, 0]))
    triangles[1:, twice_area < 0.0] = triangles[2:0:-1, twice_area < 0.0]
    mesh = skfem.MeshTri(x, triangles, sort_t=False)
    outer_ring = np.zeros(x.shape[1], dtype=bool)
    outer_ring[stator_ids[-1]] = True
    outer_facets = np.nonzero(outer_ring[mesh.facets].all(axis=0))[0]
    node_to_dof, dof_of_node = ties.matrix()
    r_a = float(g.armature_radius)
    radii = SectionRadii(
        shaft=float(g.shaft_radius), slot_bottom=float(g.slot_bottom_radius), tooth_tip=r_a - float(g.tooth_tip_height),
        armature=r_a, mid_gap=r_a + 0.5 * float(g.airgap), magnet_inner=float(g.magnet_inner_radius),
        housing_inner=float(g.housing_inner_radius), housing_outer=float(g.housing_outer_radius),
        outer=float(stator.radii[-1]),
    )
    return SectionMesh(
        mesh=mesh, region=region.astype(np.int8), part=part.astype(np.int16), node_to_dof=node_to_dof,
        fixed_dofs=np.array([dof_of_node[0]]) if antiperiodic else np.zeros(0, dtype=int),
        outer_facets=outer_facets, radii=radii,
        sector=Sector(poles=sector_poles, slots=sector_slots, angle=span, start=start, antiperiodic=antiperiodic,
                      rotor_start=rotor_start),
        rotor_position=float(rotor_position),
        slot_angles=rotor_start + (np.arange(sector_slots) + 0.5) * slot_pitch,
    )
