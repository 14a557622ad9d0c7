"""The element values of the pole's reluctance network, from the cross-section (see core.reluctance_network).

Layout. One pole pitch τp = 2π/p from the left interpolar axis to the right one, θ measured from the
pole (magnet) centre: :data:`INTERPOLAR_SEGMENTS` segments over each interpolar half, doubling in width
away from the magnet, and :data:`MAGNET_SEGMENTS` over the magnet arc, finest at its edges. Branch k sits
at the centre θk of its segment;
yoke segment k joins θk to θk+1 (the last one crosses the right interpolar axis to the next pole).

Per radial branch (segment width Δθ):

* magnet column, height lm, area Δθ·rm·Lm (rm the magnets' mean radius, Lm the useful magnet length),
  permeability μ0·μrec, source Br·lm/(μ0·μrec); or, between the magnets, an air column of the same size;
* air gap g·kc' with kc' = 1 + (kc - 1)·(g + lm/μrec)/g (Carter's coefficient on the magnetic gap), area
  Δθ·rg·(L + 2g) (one gap of fringing at each stack end);
* the teeth under the segment, Δθ·S/(2π) teeth of width wt, over the slot depth, lamination steel; beside
  them the air of the slots (their share of the circumference at mid-depth) and between the sheets.

Per yoke segment (angle Δψ between two branch centres), two pairs of parallel paths:

* the housing wall, area t·Lm, path rh·Δψ (rh its mean radius); beside it the air outside the housing;
* the armature core, area dc·L·kf, path rc·Δψ; beside it the shaft (steel or not).

Air outside the housing and air (or a steel shaft) inside the core. Outside a circle of radius R whose
potential varies as cos(P·θ) (P pole pairs), the exterior solution of Laplace's equation is
u = U·(R/r)^P·cos(P·θ), and the flux it carries tangentially across a radius from R to infinity is
μ0·L/P per radian of potential gradient along the circle: exactly the flux of a layer of air of
thickness R/P lying along the circle. The same holds inside a disc of radius R (u ∝ (r/R)^P), with the
disc's permeability. So the outside air is a layer of thickness Ro/P beside the housing, and the shaft a
layer of thickness rs/P beside the core (of the housing steel when the shaft is magnetic, air when not);
with the rotor removed, the bore is a layer of air of thickness rmi/P at the magnets' inner radius. Exact
for the fundamental of the potential, our approximation for its harmonics (which see a thinner layer,
R/(n·P)). Source: the separable solutions of Laplace's equation in polar coordinates (any text on
potential theory, e.g. J. D. Jackson, "Classical Electrodynamics", 3rd ed., Wiley, 1999, §2.11).

What the network leaves out (our estimates, measured against the field solution in
docs/network-calibration.md): the tooth tips, magnet-to-magnet
leakage that bypasses the armature (the field solution gives leakage factors of 1.01-1.02 on the demos).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .geometry import Geometry, tooth_tip_height
from .magnetic_circuit import carter_coefficient
from .steel import Steel
from .units import MU_0

#: Segments over the magnet arc [1] (odd, so one branch sits on the pole centre).
MAGNET_SEGMENTS = 9
#: Radial layers of the teeth and slots [1].
TOOTH_LAYERS = 3
#: Fitted (once, over the sample of docs/network-calibration.md, to the least worst-case error of the
#: no-load flux per pole): the share of the magnet's height that carries tangential flux at the gradient
#: of its inner face. A potential falling linearly to the housing's would give 0.5; 0.25 fits the field
#: solution best (its magnets' edges lose more to the interpolar space than a linear profile allows).
MAGNET_LAYER_SHARE = 0.25
#: Fitted the same way: the slots' air beside the teeth carries flux as this many times its own area would
#: (flux entering through the slot opening runs down the slot and into the tooth sides, which the radial
#: layers do not resolve); 1 would be the slots' area alone.
SLOT_AIR_FACTOR = 1.5
#: Segments over each interpolar half [1].
INTERPOLAR_SEGMENTS = 3


@dataclass(frozen=True)
class Element:
    """A flux path of one material: drop = path·H(flux/area); ``steel`` None is air (H = B/μ0)."""

    steel: Steel | None
    area: np.ndarray  #: cross-section carrying the flux [m²]
    path: np.ndarray  #: length along the flux [m]

    def drop(self, flux: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """MMF drop [A] and its derivative with respect to the flux [A/Wb].

        Parameters
        ----------
        flux : ndarray
            Flux through the element [Wb].

        Returns
        -------
        tuple of ndarray
            The drop l·H(Φ/A) [A] and its derivative l·(dH/dB)/A [A/Wb] (l/(μ0·A) in air).

        References
        ----------
        .. [1] Ampère's law along a uniform flux tube, F = H(B)·l with B = Φ/A.
        """
        b = flux / self.area
        if self.steel is None:
            return b / MU_0 * self.path, self.path / (MU_0 * self.area)
        h, slope = field_and_slope(self.steel, b)
        return h * self.path, slope * self.path / self.area


@dataclass(frozen=True)
class TipPath:
    """The gap over the tooth tips' overhangs and the tips themselves, in series.

    The flux landing on an overhang of width wo runs along the tip to the tooth body, growing linearly
    from its end to its root: the drop ∫H(B(x))dx is taken by Simpson's rule,
    (wo/6)·(4·H(Broot/2) + H(Broot)) (exact for an H(B) quadratic over the tip).
    """

    gap_reluctance: np.ndarray  #: of the gap over the overhangs [A/Wb]
    steel: Steel
    root_area: np.ndarray  #: tip height × stack × kf × the number of overhangs in the segment [m²]
    overhang: np.ndarray  #: wo [m]

    def drop(self, flux: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """MMF drop [A] and its slope [A/Wb] (see the class).

        Parameters
        ----------
        flux : ndarray
            Flux landing on the overhangs [Wb].

        Returns
        -------
        tuple of ndarray
            The drop across gap and tips [A] and its derivative with respect to the flux [A/Wb].

        References
        ----------
        .. [1] Simpson's rule on the tip's H along its length (our estimate of the tip's drop).
        """
        root = flux / self.root_area
        h_half, slope_half = field_and_slope(self.steel, 0.5 * root)
        h_root, slope_root = field_and_slope(self.steel, root)
        drop = flux * self.gap_reluctance + self.overhang / 6.0 * (4.0 * h_half + h_root)
        slope = self.gap_reluctance + self.overhang / (6.0 * self.root_area) * (2.0 * slope_half + slope_root)
        return drop, slope


@dataclass(frozen=True)
class ParallelPair:
    """Two paths side by side, sharing one flux and one MMF drop (the split between them is solved for)."""

    first: Element  #: the steel of the housing, the core or the teeth; the gap over the tooth bodies
    second: Element | TipPath  #: beside it: the air outside the housing, the shaft, the slots' air; the tips


@dataclass(frozen=True)
class NetworkElements:
    """Every element of the pole's network, arrays of shape (batch, segments) unless noted."""

    magnet_mask: np.ndarray  #: (segments,) 1.0 where the branch holds magnet, 0.0 in the interpolar air
    segment_angle: np.ndarray  #: Δθ of each branch's segment [rad]
    centre_angle: np.ndarray  #: θk of each branch, from the pole centre [rad]
    yoke_angle: np.ndarray  #: Δψk, from branch k to branch k+1 [rad]
    magnet_thickness: np.ndarray  #: (batch,) lm [m]
    magnet_inner_radius: np.ndarray  #: (batch,) of the magnets' inner face, armature radius plus gap [m]
    column_area: np.ndarray  #: of the magnet or air column [m²]
    column_height: np.ndarray  #: lm [m]
    column_permeability: np.ndarray  #: μ0·μrec in the magnet, μ0 in the air [H/m]
    gap_area: np.ndarray  #: [m²]
    tangential_reluctance: np.ndarray  #: along the magnets' inner face, branch k to k+1 (magnet, outer half-gap) [A/Wb]
    surface_reluctance: np.ndarray  #: along the armature surface, branch k to k+1 (inner half-gap, tooth tips) [A/Wb]
    #: across the gap: the gap over the tooth bodies beside the gap over the tips' overhangs and the tips
    gap_series: tuple[ParallelPair, ...]
    #: down the teeth: the teeth beside the slots' air, in :data:`TOOTH_LAYERS` radial layers
    tooth_series: tuple[ParallelPair, ...]
    housing: ParallelPair
    core: ParallelPair
    carter_factor: np.ndarray  #: (batch,) kc [1]


def field_and_slope(steel: Steel, flux_density: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """H(B) of a steel [A/m] and dH/dB [A/(m·T)] from the same table, so Newton's Jacobian is consistent.

    Parameters
    ----------
    steel : Steel
        The steel (its dense monotone table, core.steel).
    flux_density : ndarray
        B [T], either sign.

    Returns
    -------
    tuple of ndarray
        H, of the sign of B, and its slope (1/μ0 beyond the data).

    References
    ----------
    .. [1] Fritsch and Carlson 1980 (the PCHIP table of core.steel), read cell by cell.
    """
    field, slope = steel.field_and_slope(flux_density)
    return field, slope


def branch_centres(embrace: np.ndarray, pole_pitch: np.ndarray) -> np.ndarray:
    """The centres θk of the network's branches [rad], (batch, segments), from the pole centre.

    Parameters
    ----------
    embrace : ndarray
        Magnet arc over pole pitch, (batch,) [1].
    pole_pitch : ndarray
        2π/p, (batch,) [rad].

    Returns
    -------
    ndarray
        The layout's branch centres (see the module docstring).
    """
    return np.asarray(_layout(np.atleast_1d(embrace), np.atleast_1d(pole_pitch))[1])


def _layout(embrace: np.ndarray, pole_pitch: np.ndarray):
    """Segment widths, centres and yoke angles over one pole pitch, (batch, segments) each [rad].

    The magnet's segment edges are Chebyshev-Lobatto points over its arc and the interpolar segments
    double in width away from the magnet, so the segments are finest at the magnet's edges, where the
    field changes fastest (edge leakage, fringing into the teeth beyond).
    """
    magnet_edges = -0.5 * np.cos(np.pi * np.arange(MAGNET_SEGMENTS + 1) / MAGNET_SEGMENTS)  # -0.5 … 0.5
    growth = 2.0 ** np.arange(INTERPOLAR_SEGMENTS)
    interpolar_edges = np.concatenate([[0.0], np.cumsum(growth) / growth.sum()])  # 0 … 1, from the magnet out
    half_interpolar = ((1.0 - embrace) * pole_pitch / 2.0)[:, None]
    half_arc = (embrace * pole_pitch)[:, None]
    edges = np.concatenate([
        -half_arc / 2.0 - half_interpolar * interpolar_edges[::-1],
        half_arc * magnet_edges[1:-1],
        half_arc / 2.0 + half_interpolar * interpolar_edges,
    ], axis=1)
    widths = np.diff(edges, axis=1)
    centres = edges[:, :-1] + 0.5 * widths
    following = np.concatenate([centres[:, 1:], centres[:, :1] + pole_pitch[:, None]], axis=1)
    return widths, centres, following - centres


def magnet_segment_mask() -> np.ndarray:
    """Which branches hold magnet, in the layout's order.

    Returns
    -------
    ndarray
        1.0 for the magnet's segments, 0.0 for the interpolar ones [1].
    """
    return np.concatenate([np.zeros(INTERPOLAR_SEGMENTS), np.ones(MAGNET_SEGMENTS), np.zeros(INTERPOLAR_SEGMENTS)])


def network_elements(geometry: Geometry, recoil_permeability: float, housing_steel: Steel,
                     lamination_steel: Steel, shaft_magnetic: bool | np.ndarray = True,
                     rotor_present: bool = True) -> NetworkElements:
    """The pole's network for a cross-section (a batch when the geometry's fields are arrays).

    Parameters
    ----------
    geometry : Geometry
        The cross-section and lengths (floats or arrays of one shape).
    recoil_permeability : float
        μrec of the magnet [1].
    housing_steel, lamination_steel : Steel
        The steels of the housing (and of a magnetic shaft) and of the armature.
    shaft_magnetic : bool or ndarray of bool
        The shaft is steel (housing steel's B(H)) or not (air).
    rotor_present : bool
        False: the armature pulled out, its region air.

    Returns
    -------
    NetworkElements
        Areas [m²], paths [m], reluctances [A/Wb] of every element.

    References
    ----------
    .. [1] Carter's coefficient (core.magnetic_circuit.carter_coefficient, Carter 1900).
    .. [2] the layers of air outside the housing and inside the core: the polar separable solutions of
       Laplace's equation (module docstring).
    .. [3] the useful overhang (one magnet thickness plus gap at each stack end) and the gap's end
       fringing (one gap length) as core.magnetic_circuit takes them (common practice, no source).
    """
    g = geometry

    def batch(value) -> np.ndarray:
        return np.atleast_1d(np.asarray(value, dtype=float))

    size = np.broadcast_shapes(*(np.shape(v) for v in vars(g).values()))
    fields = {name: np.broadcast_to(batch(value), size or (1,)).ravel() for name, value in vars(g).items()}
    poles, lm, airgap = fields["poles"], fields["magnet_thickness"], fields["airgap"]
    armature, stack, kf = fields["armature_radius"], fields["stack_length"], fields["stacking_factor"]
    magnet_length, wall, shaft = fields["magnet_length"], fields["housing_wall"], fields["shaft_radius"]
    slots, slot_depth = fields["slots"], fields["slot_depth"]
    pole_pitch = 2.0 * np.pi / poles
    pole_pairs = (poles / 2.0)[:, None]
    widths, centres, yoke = _layout(fields["magnet_arc"] / pole_pitch, pole_pitch)
    mask = magnet_segment_mask()

    magnet_inner = armature + airgap
    housing_inner = magnet_inner + lm
    housing_outer = housing_inner + wall
    useful_length = np.minimum(magnet_length, stack + 2.0 * (lm + airgap))
    column_permeability = MU_0 * np.where(mask > 0.0, recoil_permeability, 1.0) * np.ones_like(widths)
    column_area = widths * ((magnet_inner + 0.5 * lm) * useful_length)[:, None]
    slot_pitch = 2.0 * np.pi * armature / slots
    carter = carter_coefficient(slot_pitch, np.broadcast_to(batch(g.slot_opening), size or (1,)).ravel(),
                                airgap + lm / recoil_permeability)
    effective_gap = airgap + (carter - 1.0) * (airgap + lm / recoil_permeability)
    gap_area = widths * ((armature + 0.5 * airgap) * (stack + 2.0 * airgap))[:, None]
    housing_mean = housing_inner + 0.5 * wall
    outside = ParallelPair(
        Element(housing_steel, (wall * magnet_length)[:, None] * np.ones_like(yoke), housing_mean[:, None] * yoke),
        Element(None, (housing_outer * magnet_length)[:, None] / pole_pairs, housing_outer[:, None] * yoke),
    )
    if rotor_present:
        core_depth = armature - slot_depth - shaft
        core_mean = shaft + 0.5 * core_depth
        shaft_steel = np.broadcast_to(np.asarray(shaft_magnetic), size or (1,)).ravel()
        if shaft_steel.all() or not shaft_steel.any():
            shaft_element = Element(housing_steel if shaft_steel.all() else None,
                                    (shaft * stack)[:, None] / pole_pairs, shaft[:, None] * yoke)
        else:
            raise ValueError("a batch must have all shafts magnetic or none (solve the two kinds apart)")
        core = ParallelPair(Element(lamination_steel, (core_depth * stack * kf)[:, None] * np.ones_like(yoke),
                                core_mean[:, None] * yoke), shaft_element)
        teeth_per_radian = slots / (2.0 * np.pi)
        tooth_width = fields["tooth_width"]
        gap_reluctance = effective_gap[:, None] / (MU_0 * gap_area)
        # the tooth's face at the gap (pitch less opening): the body's width, and the overhangs
        face = np.maximum(slot_pitch - fields["slot_opening"], tooth_width)
        overhang = np.maximum(0.5 * (face - tooth_width), 1e-6)
        tip = tooth_tip_height(slot_depth)
        body_share, tip_share = tooth_width / face, 2.0 * overhang / face
        gap = ParallelPair(
            Element(None, gap_area * body_share[:, None], effective_gap[:, None] * np.ones_like(widths)),
            TipPath(gap_reluctance / tip_share[:, None], lamination_steel,
                    widths * (teeth_per_radian * 2.0 * tip * stack * kf)[:, None], overhang[:, None]),
        )
        # the teeth and the slots' air beside them, in radial layers: the slots widen outwards between
        # parallel-sided teeth, so the share of flux the air takes grows towards the gap
        layer_depth = (slot_depth - tip) / TOOTH_LAYERS
        tooth_area = widths * (teeth_per_radian * tooth_width * stack * kf)[:, None]
        layers = []
        for index in range(TOOTH_LAYERS):
            radius = armature - tip - (index + 0.5) * layer_depth
            # beside the teeth: the slots (their share of the circumference) and the insulation between
            # the sheets, both air, SLOT_AIR_FACTOR (fitted) times
            beside = SLOT_AIR_FACTOR * (radius - teeth_per_radian * tooth_width * kf)
            depth = layer_depth[:, None] * np.ones_like(widths)
            layers.append(ParallelPair(Element(lamination_steel, tooth_area, depth),
                                       Element(None, widths * (beside * stack)[:, None], depth)))
        gap_series, tooth_series = (gap,), tuple(layers)
    else:
        # the bore's air as two equal halves of one layer (the pair form needs two paths)
        half = Element(None, (magnet_inner * useful_length)[:, None] / (2.0 * pole_pairs), magnet_inner[:, None] * yoke)
        core = ParallelPair(half, half)
        nothing = Element(None, np.ones_like(widths), np.zeros_like(widths))
        gap_series = tooth_series = (ParallelPair(nothing, nothing),)
    # Tangential paths at two levels. At the magnets' inner face: the magnet (or interpolar air), whose
    # potential falls towards the housing's, so its height carries tangential flux as a share of it
    # would at the inner face's gradient, and the outer half of the gap. At the armature surface: the
    # inner half of the gap and the ring of tooth tips, steel broken by the slot openings, as air of
    # thickness h_tip·τs/w_open (the steel's own reluctance neglected). Each element spans half of each
    # neighbouring segment, at the radius of its level.
    def tangential(thickness, radius):
        half = 0.5 * widths * radius[:, None] / (MU_0 * thickness * useful_length[:, None])
        return half + np.concatenate([half[:, 1:], half[:, :1]], axis=1)

    half_gap = 0.5 * airgap if rotor_present else np.zeros_like(airgap)
    magnet_layer = np.where(mask > 0.0, recoil_permeability, 1.0) * MAGNET_LAYER_SHARE * lm[:, None]
    inner_face = tangential(magnet_layer + half_gap[:, None], magnet_inner)
    if rotor_present:
        tips = np.minimum(tooth_tip_height(slot_depth) * slot_pitch
                          / np.maximum(fields["slot_opening"], 1e-5), slot_depth)
        surface = tangential((half_gap + tips)[:, None] * np.ones_like(widths), armature)
    else:
        surface = 1e3 * inner_face  # no armature: nothing runs along its surface
    return NetworkElements(
        tangential_reluctance=inner_face, surface_reluctance=surface,
        magnet_mask=mask, segment_angle=widths, centre_angle=centres, yoke_angle=yoke, magnet_thickness=lm,
        magnet_inner_radius=magnet_inner,
        column_area=column_area, column_height=lm[:, None] * np.ones_like(widths),
        column_permeability=column_permeability, gap_area=gap_area,
        gap_series=gap_series, tooth_series=tooth_series, housing=outside, core=core, carter_factor=carter,
    )
