"""What an engineer reads off a field solution: fluxes, flux densities, the field in the magnets, torque.

Fluxes come from the potential: per metre of stack, the flux crossing a line between two points is the
difference of A there. The flux per pole is the flux crossing the mid-gap arc between the two neutral
axes that bound a pole (where the brushes commutate), which is what the back-EMF E = K·Φ·ω counts
(Fitzgerald et al., "Electric Machinery", ch. 7, from memory), under load as at no load.

Stack basis. A 2-D solution has no ends: times the stack length it is the flux of a machine whose magnet
ends with the stack. The fast model adds the magnet's overhang beyond the stack and the fringing at the
stack ends (core.pole_magnetics); its own ratio of the flux of the design to that of the same
cross-section infinitely long is shown separately as ``end_factor``, and ``flux_per_pole_Wb`` =
Φ_2D·L·end_factor is on the same basis as the fast model's flux per pole, so the two compare like for like.

Torque: Arkkio's method, the Maxwell stress averaged over the whole gap annulus,
T = ∫ r·B_r·B_θ dS / (μ0·(r2 - r1)) per metre (A. Arkkio, "Analysis of induction motors based on the
numerical solution of the magnetic field and circuit equations", Acta Polytechnica Scandinavica EE 59,
Helsinki, 1987). At no load it is the cogging torque at that rotor position.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..magnet_field_share import worst_share_field
from ..units import MU_0
from .cases import FieldCase
from .materials import sheet_flux_density
from .mesh import LAMINATION_REGIONS, Region
from .solve import NewtonResult, Problem

#: Samples of the air-gap flux density per pole pitch.
AIRGAP_SAMPLES_PER_POLE = 180


@dataclass(frozen=True)
class FieldSolution:
    """One case's field solution and what it says about the design (SI, stator frame, angles from the
    centre of magnet 0). Fields ``*_per_m`` are per metre of stack (the 2-D result)."""

    design_name: str
    case: FieldCase
    # flux per pole
    flux_per_pole_Wb_per_m: float  #: crossing mid-gap between the neutral axes, mean of the sector's poles [Wb/m]
    stack_length_m: float  #: [m]
    flux_per_pole_stack_Wb: float  #: Φ_2D × stack length: no end effects [Wb]
    end_factor: float  #: the fast model's overhang and end fringing, Φ(design)/(L·Φ per metre of a long machine) [1]
    flux_per_pole_Wb: float  #: Φ_2D × L × end_factor, the fast model's basis [Wb]
    # air gap
    airgap_angle_rad: np.ndarray  #: sample angles over two pole pitches from an interpolar axis [rad]
    airgap_flux_density_T: np.ndarray  #: radial B at mid-gap there (outward positive) [T]
    airgap_flux_density_mean_T: float  #: mean |B_r| under the arc of magnet 0 [T]
    airgap_flux_density_centre_T: float  #: |B_r| at the pole centre, averaged over one slot pitch [T]
    # iron: lamination figures are the flux density in the steel sheets (stacking factor taken out)
    tooth_flux_density_mean_T: float  #: area mean over all teeth [T]
    tooth_flux_density_peak_T: float  #: highest element [T]
    tooth_flux_density_busiest_T: float  #: area mean of the most loaded tooth [T]
    core_flux_density_mean_T: float  #: area mean over the armature core [T]
    core_flux_density_peak_T: float  #: highest element [T]
    core_section_flux_density_T: float  #: flux crossing the core at an interpolar axis over its depth [T]
    housing_flux_density_mean_T: float  #: area mean over the housing [T]
    housing_flux_density_peak_T: float  #: highest element [T]
    housing_section_flux_density_T: float  #: flux crossing the wall at an interpolar axis over the wall [T]
    housing_section_flux_Wb_per_m: float  #: flux crossing the wall at an interpolar axis [Wb/m]
    outside_air_flux_Wb_per_m: float  #: flux crossing the interpolar axis outside the housing, to infinity [Wb/m]
    # magnets
    magnet_flux_Wb_per_m: float  #: crossing magnet 0 at mid-thickness [Wb/m]
    leakage_factor: float  #: magnet flux over the flux per pole [1]
    magnet_elements: np.ndarray  #: element numbers of the magnets
    magnet_field_A_per_m: np.ndarray  #: H along the magnetization in each magnet element (negative demagnetizes) [A/m]
    knee_field_A_per_m: float  #: at the case's temperature (negative) [A/m]
    magnet_area_past_knee_fraction: float  #: of all magnet area in the sector [1]
    magnet_past_knee_fractions: tuple[float, ...]  #: per magnet of the sector [1]
    worst_magnet_field_A_per_m: float  #: the most negative element field [A/m]
    #: area mean over the most-demagnetized WORST_AREA_SHARE of each magnet, the worst magnet's
    #: (core.magnet_field_share) [A/m]
    worst_share_magnet_field_A_per_m: float
    worst_magnet_position_m: tuple[float, float]  #: x, y of that element's centroid [m]
    worst_magnet: int  #: which magnet of the sector
    # load
    current_A: float  #: armature current [A]
    slot_currents_A: np.ndarray  #: per slot of the sector [A]
    torque_N_m_per_m: float  #: Arkkio's gap torque, whole machine [N·m/m]
    torque_N_m: float  #: times the stack length [N·m]
    # the solve
    iterations: int  #: Newton steps [1]
    residual_history: tuple[float, ...]  #: relative residual before each step and at the end [1]
    elements: int  #: triangles [1]
    seconds: float  #: meshing, assembly and solve [s]
    sector_poles: int  #: poles meshed (symmetry) [1]
    # for plotting
    nodes_m: np.ndarray  #: (2, nodes) [m]
    triangles: np.ndarray  #: (3, elements)
    region: np.ndarray  #: per element, core.field.mesh.Region codes
    potential_Wb_per_m: np.ndarray  #: A per node [Wb/m]
    flux_density_T: np.ndarray  #: (2, elements), Bx and By, the section's mean (laminations: steel and gaps) [T]
    flux_density_magnitude_T: np.ndarray  #: |B| per element, in the steel sheets for laminations (for a map) [T]
    knee_margin_A_per_m: np.ndarray  #: per element: magnet field less the knee field; NaN outside the magnets


class PointLocator:
    """Finds the element holding any point of the circumference, using the sector's symmetry.

    A point is turned into the sector by whole sector angles (the potential changing sign with each
    turn when the sector is anti-periodic); near the sector's edges the stitched band's triangles may lie
    one sector angle further on, so both neighbours are tried.

    Parameters
    ----------
    problem : Problem
        The meshed problem.
    """

    def __init__(self, problem: Problem):
        from scipy.spatial import cKDTree

        mesh = problem.section.mesh
        self._sector = problem.section.sector
        self._corners = mesh.p[:, mesh.t]  # (2, 3, elements)
        self._tree = cKDTree(self._corners.mean(axis=1).T)
        self._triangles = mesh.t
        self.moved = np.zeros((2, 0))  #: the last points found, turned into the sector [m]

    def _try(self, x: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        neighbours = min(12, self._triangles.shape[1])
        candidates = self._tree.query(x.T, neighbours)[1]  # (points, neighbours)
        c = self._corners[:, :, candidates]  # (2, 3, points, neighbours)
        e1, e2, d = c[:, 1] - c[:, 0], c[:, 2] - c[:, 0], x[:, :, None] - c[:, 0]
        det = e1[0] * e2[1] - e1[1] * e2[0]
        l1 = (d[0] * e2[1] - d[1] * e2[0]) / det
        l2 = (e1[0] * d[1] - e1[1] * d[0]) / det
        inside = (l1 >= -1e-10) & (l2 >= -1e-10) & (1.0 - l1 - l2 >= -1e-10)
        first = inside.argmax(axis=1)
        rows = np.arange(x.shape[1])
        found = np.where(inside[rows, first], candidates[rows, first], -1)
        weights = np.stack([1.0 - l1[rows, first] - l2[rows, first], l1[rows, first], l2[rows, first]])
        return found, weights

    def find(self, x: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """The element holding each point, its barycentric weights, and the potential's sign there.

        Parameters
        ----------
        x : numpy.ndarray
            Points (2, n) [m].

        Returns
        -------
        tuple of numpy.ndarray
            Elements (n,), weights (3, n) of the element's corners, and ±1 (n,).

        Raises
        ------
        ValueError
            When a point lies outside the meshed radii.
        """
        sector = self._sector
        radius = np.hypot(x[0], x[1])
        angle = np.arctan2(x[1], x[0]) - sector.start
        turns = np.floor(angle / sector.angle)
        elements = np.full(x.shape[1], -1)
        weights = np.zeros((3, x.shape[1]))
        self.moved = np.zeros_like(x)
        for extra in (0, -1, 1):
            todo = elements < 0
            if not todo.any():
                break
            inside = angle[todo] - (turns[todo] + extra) * sector.angle + sector.start
            moved = np.stack([radius[todo] * np.cos(inside), radius[todo] * np.sin(inside)])
            found, w = self._try(moved)
            hit = found >= 0
            index = np.nonzero(todo)[0][hit]
            elements[index], weights[:, index] = found[hit], w[:, hit]
            self.moved[:, index] = moved[:, hit]
            turns[index] += extra
        if np.any(elements < 0):
            raise ValueError("a point asked of the field solution lies outside the meshed cross-section")
        sign = (-1.0) ** turns if sector.antiperiodic else np.ones_like(turns)
        return elements, weights, sign

    def potential(self, potential: np.ndarray, x: np.ndarray) -> np.ndarray:
        """A [Wb/m] at points (2, n) [m], from the nodal potential ``potential``.

        Parameters
        ----------
        potential : numpy.ndarray
            A per node [Wb/m].
        x : numpy.ndarray
            Points [m].

        Returns
        -------
        numpy.ndarray
            The interpolated potential [Wb/m].
        """
        elements, weights, sign = self.find(x)
        return np.asarray(sign * (weights * potential[self._triangles[:, elements]]).sum(axis=0))

    def radial_flux_density(self, flux_density: np.ndarray, angles: np.ndarray, radius: float) -> np.ndarray:
        """Radial B [T] (outward positive) on the arc of ``radius`` [m] at ``angles`` [rad].

        Parameters
        ----------
        flux_density : numpy.ndarray
            B per element (2, elements) [T].
        angles : numpy.ndarray
            [rad].
        radius : float
            [m].

        Returns
        -------
        numpy.ndarray
            B_r [T].
        """
        points = radius * np.stack([np.cos(angles), np.sin(angles)])
        elements, _, sign = self.find(points)
        direction = self.moved / np.hypot(self.moved[0], self.moved[1])  # at the point, not the element's centre
        return np.asarray(sign * (flux_density[:, elements] * direction).sum(axis=0))


def fast_model_end_factor(design, temperature_C: float) -> float:
    """The fast model's flux of the design over that of its cross-section with no ends, per unit length.

    Parameters
    ----------
    design : Design
        The design.
    temperature_C : float
        Magnet temperature [°C].

    Returns
    -------
    float
        Φ_fast(design) / (L_stack · Φ_fast(L → ∞)/L) [1]: the magnet's overhang and the end fringing as
        the fast model (the pole's reluctance network, core.pole_magnetics) counts them.
    """
    from ..pole_magnetics import pole_states, two_dimensional_states

    stack = float(pole_states(design, temperature_C).flux_per_pole[0])
    per_metre = float(two_dimensional_states(design, temperature_C).flux_per_pole[0])
    return stack / (float(design.geometry.stack_length) * per_metre)


def _area_mean_and_peak(values: np.ndarray, areas: np.ndarray, mask: np.ndarray) -> tuple[float, float]:
    if not mask.any():
        return 0.0, 0.0
    return float(np.average(values[mask], weights=areas[mask])), float(values[mask].max())


def _polar(r: float, angle: float) -> np.ndarray:
    return np.array([[r * math.cos(angle)], [r * math.sin(angle)]])


def field_solution(design, case: FieldCase, problem: Problem, result: NewtonResult, seconds: float) -> FieldSolution:
    """Every output of a converged solve.

    Parameters
    ----------
    design : Design
        The design.
    case : FieldCase
        The case solved.
    problem : Problem
        Mesh, materials and sources.
    result : NewtonResult
        The converged field.
    seconds : float
        Time taken so far [s].

    Returns
    -------
    FieldSolution
        The outputs (see the class).
    """
    g, section, areas = design.geometry, problem.section, problem.areas
    radii, region = section.radii, section.region
    poles, kf = int(g.poles), float(g.stacking_factor)
    pitch = 2.0 * math.pi / poles
    b = result.flux_density
    magnitude = np.hypot(b[0], b[1])
    field = result.reluctivity * magnitude

    locator = PointLocator(problem)

    def a(r: float, angle: float) -> float:
        return float(locator.potential(result.potential, _polar(r, angle))[0])

    # flux per pole: between the neutral axes of each pole of the sector, polarity taken out
    neutrals = section.sector.start + pitch * np.arange(section.sector.poles + 1)
    at_gap = locator.potential(result.potential, radii.mid_gap * np.stack([np.cos(neutrals), np.sin(neutrals)]))
    flux_per_pole = float(np.mean(np.abs(np.diff(at_gap))))
    end_factor = fast_model_end_factor(design, case.magnet_temperature_C)
    length = float(g.stack_length)

    angles = -0.5 * pitch + np.linspace(0.0, 2.0 * pitch, 2 * AIRGAP_SAMPLES_PER_POLE + 1)
    gap_b = locator.radial_flux_density(b, angles, radii.mid_gap)
    under_magnet = np.abs(angles) <= 0.5 * float(g.magnet_arc)
    slot_pitch = 2.0 * math.pi / int(g.slots)
    centre = locator.radial_flux_density(b, np.linspace(-0.5, 0.5, 41) * slot_pitch, radii.mid_gap)

    lamination = np.isin(region, LAMINATION_REGIONS)
    sheet = np.where(lamination, sheet_flux_density(magnitude, field, kf), magnitude)
    teeth = region == Region.TOOTH
    tooth_mean, tooth_peak = _area_mean_and_peak(sheet, areas, teeth)
    per_tooth = np.bincount(section.part[teeth], weights=(sheet * areas)[teeth]) / np.maximum(
        np.bincount(section.part[teeth], weights=areas[teeth]), 1e-300)
    core_mean, core_peak = _area_mean_and_peak(sheet, areas, region == Region.CORE)
    housing_mean, housing_peak = _area_mean_and_peak(magnitude, areas, region == Region.HOUSING)
    interpolar = section.sector.start
    housing_flux = abs(a(radii.housing_inner, interpolar) - a(radii.housing_outer, interpolar))
    outside_flux = abs(a(radii.housing_outer, interpolar))  # A → 0 at infinity
    core_flux = abs(a(radii.slot_bottom, interpolar) - a(radii.shaft, interpolar))
    core_depth = radii.slot_bottom - radii.shaft

    magnet_mid = 0.5 * (radii.magnet_inner + radii.housing_inner)
    half_arc = 0.5 * float(g.magnet_arc)
    magnet_flux = abs(a(magnet_mid, half_arc) - a(magnet_mid, -half_arc))
    in_magnet = np.nonzero(region == Region.MAGNET)[0]
    remanence = problem.magnet.remanence
    direction = problem.remanence[:, in_magnet] / remanence
    magnet_field = problem.magnet.reluctivity * ((b[:, in_magnet] * direction).sum(axis=0) - remanence)
    knee = problem.magnet.knee_field
    past = magnet_field < knee
    which = section.part[in_magnet]
    fractions = tuple(float(areas[in_magnet][past & (which == k)].sum() / areas[in_magnet][which == k].sum())
                      for k in range(section.sector.poles))
    worst = int(np.argmin(magnet_field))
    worst_share = min(float(worst_share_field(magnet_field[which == k], areas[in_magnet][which == k]))
                      for k in range(section.sector.poles))
    centroid = section.mesh.p[:, section.mesh.t[:, in_magnet[worst]]].mean(axis=1)
    margin = np.full(section.elements, np.nan)
    margin[in_magnet] = magnet_field - knee

    gap = region == Region.GAP
    x = section.mesh.p[:, section.mesh.t[:, gap]].mean(axis=1)
    r = np.hypot(x[0], x[1])
    b_r = (b[0, gap] * x[0] + b[1, gap] * x[1]) / r
    b_theta = (-b[0, gap] * x[1] + b[1, gap] * x[0]) / r
    sector_torque = float(np.sum(r * b_r * b_theta * areas[gap])) / (MU_0 * (radii.magnet_inner - radii.armature))
    torque = sector_torque * 2.0 * math.pi / section.sector.angle

    return FieldSolution(
        design_name=design.name, case=case,
        flux_per_pole_Wb_per_m=flux_per_pole, stack_length_m=length, flux_per_pole_stack_Wb=flux_per_pole * length,
        end_factor=end_factor, flux_per_pole_Wb=flux_per_pole * length * end_factor,
        airgap_angle_rad=angles, airgap_flux_density_T=gap_b,
        airgap_flux_density_mean_T=float(np.mean(np.abs(gap_b[under_magnet]))),
        airgap_flux_density_centre_T=float(np.mean(np.abs(centre))),
        tooth_flux_density_mean_T=tooth_mean, tooth_flux_density_peak_T=tooth_peak,
        tooth_flux_density_busiest_T=float(per_tooth.max()) if per_tooth.size else 0.0,
        core_flux_density_mean_T=core_mean, core_flux_density_peak_T=core_peak,
        core_section_flux_density_T=core_flux / (core_depth * kf),
        housing_flux_density_mean_T=housing_mean, housing_flux_density_peak_T=housing_peak,
        housing_section_flux_density_T=housing_flux / float(g.housing_wall),
        housing_section_flux_Wb_per_m=housing_flux, outside_air_flux_Wb_per_m=outside_flux,
        magnet_flux_Wb_per_m=magnet_flux, leakage_factor=magnet_flux / flux_per_pole,
        magnet_elements=in_magnet, magnet_field_A_per_m=magnet_field, knee_field_A_per_m=knee,
        magnet_area_past_knee_fraction=float(areas[in_magnet][past].sum() / areas[in_magnet].sum()),
        magnet_past_knee_fractions=fractions, worst_magnet_field_A_per_m=float(magnet_field[worst]),
        worst_share_magnet_field_A_per_m=worst_share,
        worst_magnet_position_m=(float(centroid[0]), float(centroid[1])), worst_magnet=int(which[worst]),
        current_A=float(case.current_A), slot_currents_A=problem.slot_currents,
        torque_N_m_per_m=torque, torque_N_m=torque * length,
        iterations=result.iterations, residual_history=result.residual_history, elements=section.elements,
        seconds=seconds, sector_poles=section.sector.poles,
        nodes_m=section.mesh.p, triangles=section.mesh.t, region=region, potential_Wb_per_m=result.potential,
        flux_density_T=b, flux_density_magnitude_T=sheet, knee_margin_A_per_m=margin,
    )
