"""No-load magnetic circuit of a radial-arc-magnet DC motor, per pole.

The flux of one pole leaves the magnet, crosses the air gap, runs down one tooth pitch into the
armature core, along the core to the next pole, up through the teeth and gap into the next magnet, and
back through the housing. Per pole (half of that loop) Ampère's law reads

    -Hm·lm = F_housing + F_gap + F_tooth + F_core

with the magnet as a non-ideal source (its normal curve B(H) at temperature, which includes its own
internal permeance through μrec and the knee), and the gap-side flux reduced by the leakage between
adjacent magnets, which sees the MMF across gap, teeth and core:

    Φm = Bm·Am,   Φg = Φm - P_leak·(-Hm·lm - F_housing).

Iron drops come from the steels' B(H) curves; the equation is solved for Hm with a bracketed method on
[-HcJ(T), 0], where the residual changes sign exactly once.

Conventions (each named where it is used): gap area with fringing of one gap length at each magnet edge
and each stack end; Carter's coefficient on the magnetic gap g + lm/μrec; yoke drops at the peak flux
density over half the pole-to-pole path (conservative).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from .errors import MagneticCircuitError
from .geometry import Geometry
from .magnets import MagnetGrade, curve_at
from .solvers import find_root
from .steel import Steel
from .units import MU_0


def carter_coefficient(slot_pitch: float | np.ndarray, slot_opening: float | np.ndarray,
                       gap: float | np.ndarray):
    """Carter's coefficient kc ≥ 1 for slots of opening ``slot_opening`` facing a smooth surface.

    kc = τs / (τs - γ·g),  γ = (4/π)·[x·arctan(x) - ln√(1 + x²)],  x = w/(2g)

    Parameters
    ----------
    slot_pitch : float or ndarray
        Slot pitch τs at the armature surface [m].
    slot_opening : float or ndarray
        Width w of the slot opening [m].
    gap : float or ndarray
        The magnetic gap g the slotting is seen across [m] (here the air gap plus lm/μrec).

    Returns
    -------
    float or ndarray
        kc [1]: the gap is effectively kc times longer than the smooth one.

    References
    ----------
    .. [1] F. W. Carter, "Note on air-gap and interpolar induction", J. IEE 29 (1900) 925-933; the
       form with γ as above is the one in J. R. Hendershot and T. J. E. Miller, "Design of Brushless
       Permanent-Magnet Machines", Motor Design Books, 2010, §5 (from memory).
    """
    x = slot_opening / (2.0 * gap)
    gamma = 4.0 / np.pi * (x * np.arctan(x) - np.log(np.sqrt(1.0 + x * x)))
    return slot_pitch / (slot_pitch - gamma * gap)


def magnet_leakage_permeance(axial_length: float | np.ndarray, gap: float | np.ndarray,
                             embrace: float | np.ndarray, pole_pitch_arc: float | np.ndarray):
    """Permeance of the leakage between the edges of two adjacent magnets.

    P = (μ0·L/π)·ln(1 + π·g / ((1 - α)·τp)), flux tubes of circular arcs across the interpolar space.

    Parameters
    ----------
    axial_length : float or ndarray
        Axial length L of the magnets that carries the leakage [m].
    gap : float or ndarray
        Air gap g [m].
    embrace : float or ndarray
        Magnet arc over pole pitch α [1].
    pole_pitch_arc : float or ndarray
        Pole pitch τp as an arc length at the magnets' inner face [m].

    Returns
    -------
    float or ndarray
        Leakage permeance [H] (Wb per A of MMF across the interpolar space).

    References
    ----------
    .. [1] D. Hanselman, "Brushless Permanent Magnet Motor Design", 2nd ed., Magna Physics, 2006,
       ch. 5, magnet-to-magnet leakage permeance (from memory).
    """
    interpolar = (1.0 - embrace) * pole_pitch_arc
    return MU_0 * axial_length / np.pi * np.log1p(np.pi * gap / interpolar)


@dataclass(frozen=True)
class PoleCircuit:
    """The lumped per-pole circuit (SI): what :func:`solve` needs of the cross-section.

    Each field is a float for one design or an array for a batch (they broadcast together).
    """

    magnet_area: np.ndarray | float  #: area of the magnet face carrying the pole's flux [m²]
    magnet_thickness: np.ndarray | float  #: lm, in the direction of magnetization [m]
    gap_area: np.ndarray | float  #: air-gap area with fringing [m²]
    effective_gap: np.ndarray | float  #: g + (kc - 1)·(g + lm/μrec) [m]
    leakage_permeance: np.ndarray | float  #: magnet-to-magnet leakage seen by one pole [H]
    housing_area: np.ndarray | float  #: cross-section carrying half the magnet flux [m²]
    housing_path: np.ndarray | float  #: per-pole path in the housing [m]
    tooth_flux_ratio: np.ndarray | float  #: B_tooth / B_gap [1]
    tooth_path: np.ndarray | float  #: slot depth [m]
    core_area: np.ndarray | float  #: cross-section carrying half the gap flux [m²]
    core_path: np.ndarray | float  #: per-pole path in the core [m]
    carter_factor: np.ndarray | float  #: kc [1]
    #: the part of ``leakage_permeance`` that runs from the magnets' inner-face edges across the gap to
    #: the next magnet; it depends on the armature being there (see core.demagnetization)
    edge_leakage_permeance: np.ndarray | float = 0.0


def pole_circuit(geometry: Geometry, recoil_permeability: float) -> PoleCircuit:
    """The per-pole circuit of a motor's cross-section (conventions in the module docstring).

    Parameters
    ----------
    geometry : Geometry
        The cross-section and lengths (floats, or arrays for a batch).
    recoil_permeability : float
        The magnet's relative recoil permeability μrec [1], which sets the magnetic gap g + lm/μrec
        that Carter's coefficient applies to.

    Returns
    -------
    PoleCircuit
        Areas [m²], paths [m], permeances [H] and ratios [1] of one pole.

    References
    ----------
    .. [1] Carter's coefficient (see :func:`carter_coefficient`); magnet-to-magnet leakage after
       Hanselman 2006 (:func:`magnet_leakage_permeance`, from memory).
    .. [2] fringing of one gap length, the useful overhang, the side-face leakage tubes and the
       half-path yoke drops are our estimates (common practice, no source).
    """
    g = geometry
    gap_radius = g.armature_radius + 0.5 * g.airgap
    magnet_radius = g.magnet_inner_radius + 0.5 * g.magnet_thickness
    # Overhang helps only within about one magnet thickness plus gap of the stack end: flux from
    # further out returns by leakage (our assumption, common practice, no source).
    useful_magnet_length = np.minimum(g.magnet_length, g.stack_length + 2.0 * (g.magnet_thickness + g.airgap))
    # Fringing: one gap length beyond each magnet edge and each stack end (common practice, no source).
    gap_arc = g.magnet_arc * gap_radius + 2.0 * g.airgap
    gap_axial = g.stack_length + 2.0 * g.airgap
    carter = carter_coefficient(g.slot_pitch, g.slot_opening, g.airgap + g.magnet_thickness / recoil_permeability)
    effective_gap = g.airgap + (carter - 1.0) * (g.airgap + g.magnet_thickness / recoil_permeability)
    interpolar_width = (1.0 - g.magnet_embrace) * g.pole_pitch_angle * magnet_radius
    # inner-face edges to the adjacent magnets: two edges, each facing twice the gap-side MMF
    edge_leakage = 4.0 * magnet_leakage_permeance(useful_magnet_length, g.airgap, g.magnet_embrace,
                                                  g.pole_pitch_angle * g.magnet_inner_radius)
    leakage = (
        edge_leakage
        # side faces to the adjacent magnets' side faces, across the interpolar space: the potential
        # rises linearly through the magnet, so the mean difference equals the gap-side MMF
        + 2.0 * MU_0 * useful_magnet_length * g.magnet_thickness / interpolar_width
        # inner-face edges round the magnet's side to the housing bore between the poles
        + 2.0 * MU_0 * useful_magnet_length / np.pi * np.log1p(np.pi * 0.5 * interpolar_width / g.magnet_thickness)
    )  # the last two are our estimates by flux tubes (straight and quarter-circle), no source
    housing_mean_radius = g.housing_inner_radius + 0.5 * g.housing_wall
    core_mean_radius = g.shaft_radius + 0.5 * g.core_depth
    return PoleCircuit(
        magnet_area=g.magnet_arc * magnet_radius * useful_magnet_length,
        magnet_thickness=np.asarray(g.magnet_thickness, dtype=float),
        gap_area=gap_arc * gap_axial,
        effective_gap=effective_gap,
        leakage_permeance=leakage,
        housing_area=g.housing_wall * g.magnet_length,
        housing_path=np.pi * housing_mean_radius / g.poles,
        tooth_flux_ratio=g.slot_pitch * gap_axial / (g.tooth_width * g.stack_length * g.stacking_factor),
        tooth_path=np.asarray(g.slot_depth, dtype=float),
        core_area=g.core_depth * g.stack_length * g.stacking_factor,
        core_path=np.pi * core_mean_radius / g.poles,
        carter_factor=carter,
        edge_leakage_permeance=edge_leakage,
    )


@dataclass(frozen=True)
class MagneticOperatingPoint:
    """No-load solution of the per-pole circuit (SI; arrays when the inputs are arrays)."""

    magnet_flux_density: np.ndarray  #: Bm [T]
    magnet_field: np.ndarray  #: Hm [A/m], negative in the second quadrant
    permeance_coefficient: np.ndarray  #: Pc = -Bm/(μ0·Hm) [1]
    flux_per_pole: np.ndarray  #: Φ crossing the gap per pole [Wb]
    magnet_flux: np.ndarray  #: Φm leaving one magnet [Wb]
    airgap_flux_density: np.ndarray  #: mean over the gap area [T]
    tooth_flux_density: np.ndarray  #: [T]
    housing_flux_density: np.ndarray  #: peak, between poles [T]
    core_flux_density: np.ndarray  #: peak, between poles [T]
    leakage_factor: np.ndarray  #: Φm/Φ [1]
    carter_factor: np.ndarray  #: kc [1]
    mmf_drops: dict[str, np.ndarray]  #: per-pole MMF [A] in "gap", "teeth", "core", "housing"
    converged: np.ndarray  #: False where the solve failed (see :func:`solve`)


def _drop(steel: Steel | None, flux_density_in_iron, path):
    if steel is None:
        return np.zeros_like(flux_density_in_iron)
    return steel.field_for(flux_density_in_iron) * path


def solve(
    grade: MagnetGrade,
    temperature_C: float | np.ndarray,
    circuit: PoleCircuit,
    housing_steel: Steel | None,
    lamination_steel: Steel | None,
    magnet_on_recoil_line: bool | np.ndarray = False,
) -> MagneticOperatingPoint:
    """Solve the per-pole circuit for the magnet's no-load operating point.

    Every argument broadcasts; one call solves a whole sweep. Elements that fail to converge are
    returned with ``converged`` False and NaN values; :func:`require_converged` turns that into an
    error with a reason.

    ``magnet_on_recoil_line`` replaces the magnet's curve by its straight recoil line, B = Br + μ0·μrec·H:
    the field the circuit then asks of the magnet is its demand, which the demagnetization checks compare
    with the knee. (On the full curve, a point past the knee slides down with the collapsing curve and
    no longer says how far past it the circuit drives the magnet.) It may be an array of booleans that
    broadcasts with the rest, to solve both kinds in one call.

    Parameters
    ----------
    grade : MagnetGrade
        The magnet grade.
    temperature_C : float or ndarray
        Magnet temperature [°C].
    circuit : PoleCircuit
        The per-pole circuit (see :func:`pole_circuit`).
    housing_steel, lamination_steel : Steel or None
        The steels of the housing and of the armature (teeth and core); None is ideal iron.
    magnet_on_recoil_line : bool or ndarray of bool, optional
        Use the straight recoil line instead of the full curve (see above).

    Returns
    -------
    MagneticOperatingPoint
        Bm [T], Hm [A/m], Pc [1], the fluxes [Wb], flux densities [T] and MMF drops [A], arrays of the
        broadcast shape.

    References
    ----------
    .. [1] Ampère's circuital law round one pole of the lumped circuit (module docstring); the
       per-pole formulation and its conventions are the project's own.
    .. [2] Chandrupatla 1997, the bracketed root finder (:func:`core.solvers.find_root`).
    """
    c = circuit
    curve = curve_at(grade, np.asarray(temperature_C, dtype=float))
    recoil_mask: bool | np.ndarray | None
    if np.ndim(magnet_on_recoil_line) == 0:
        recoil_mask = True if bool(magnet_on_recoil_line) else None
    else:
        recoil_mask = np.asarray(magnet_on_recoil_line, dtype=bool)

    def parts(field):
        magnet_mmf = -field * c.magnet_thickness
        if recoil_mask is None:
            magnet_b = curve.flux_density(field)
        elif recoil_mask is True:
            magnet_b = curve.recoil_flux_density(field)
        else:
            magnet_b = np.where(recoil_mask, curve.recoil_flux_density(field), curve.flux_density(field))
        magnet_flux = magnet_b * c.magnet_area
        housing_mmf = _drop(housing_steel, 0.5 * magnet_flux / c.housing_area, c.housing_path)
        gap_flux = magnet_flux - c.leakage_permeance * (magnet_mmf - housing_mmf)
        gap_b = gap_flux / c.gap_area
        gap_mmf = gap_b / MU_0 * c.effective_gap
        tooth_b = gap_b * c.tooth_flux_ratio
        tooth_mmf = _drop(lamination_steel, tooth_b, c.tooth_path)
        core_b = 0.5 * gap_flux / c.core_area
        core_mmf = _drop(lamination_steel, core_b, c.core_path)
        return magnet_mmf, magnet_flux, housing_mmf, gap_flux, gap_b, gap_mmf, tooth_b, tooth_mmf, core_b, core_mmf

    def residual(field):
        magnet_mmf, _, housing_mmf, _, _, gap_mmf, _, tooth_mmf, _, core_mmf = parts(field)
        return magnet_mmf - housing_mmf - gap_mmf - tooth_mmf - core_mmf

    # The bracket's lower end is where the magnet's B reaches zero or below: -HcJ on the full curve;
    # on the recoil line, which may still be positive there, its own zero crossing if that is further.
    hcj = curve.coercivity_hcj
    if recoil_mask is not None:
        hcj = np.where(recoil_mask, np.maximum(hcj, curve.remanence / (MU_0 + curve.recoil_slope)), hcj)
    shape = np.broadcast_shapes(np.shape(hcj), *(np.shape(v) for v in vars(c).values()))
    lower = np.broadcast_to(-hcj, shape)
    upper = np.zeros(shape)
    # Opening guess: the same circuit with ideal iron, no leakage and a straight recoil line.
    area_ratio = c.magnet_area / c.gap_area
    linear_guess = -curve.remanence * c.effective_gap * area_ratio / (
        MU_0 * (c.magnet_thickness + grade.recoil_permeability * c.effective_gap * area_ratio))
    # Real iron and leakage only ever ask more of the magnet than that guess, and rarely more than
    # three times as much: try that tighter bracket first and keep -HcJ where it does not hold. One
    # extra evaluation saves the solver the long bisection steps from a far-away lower end.
    tight = np.maximum(lower, 3.0 * linear_guess)
    lower = np.where(residual(tight) > 0.0, tight, lower)
    result = find_root(residual, lower, upper, xtol=1e-6, rtol=1e-9, first_guess=linear_guess)
    field = result.root
    _, magnet_flux, housing_mmf, gap_flux, gap_b, gap_mmf, tooth_b, tooth_mmf, core_b, core_mmf = parts(field)
    bm = magnet_flux / c.magnet_area
    with np.errstate(divide="ignore", invalid="ignore"):
        permeance = np.where(field < 0.0, -bm / (MU_0 * field), np.inf)
        leakage = magnet_flux / gap_flux
    return MagneticOperatingPoint(
        magnet_flux_density=bm,
        magnet_field=field,
        permeance_coefficient=permeance,
        flux_per_pole=gap_flux,
        magnet_flux=magnet_flux,
        airgap_flux_density=gap_b,
        tooth_flux_density=tooth_b,
        housing_flux_density=0.5 * magnet_flux / c.housing_area,
        core_flux_density=core_b,
        leakage_factor=leakage,
        carter_factor=np.broadcast_to(c.carter_factor, shape),
        mmf_drops={"gap": gap_mmf, "teeth": tooth_mmf, "core": core_mmf, "housing": housing_mmf},
        converged=result.converged & np.isfinite(field),
    )


def require_converged(point: MagneticOperatingPoint, what: str = "the magnetic circuit") -> None:
    """Stop with a reason if any element of a solution failed to converge.

    Parameters
    ----------
    point : MagneticOperatingPoint
        A solution from :func:`solve`.
    what : str, optional
        What was solved, for the message (e.g. "the magnetic circuit in the sweep of magnets.thickness_mm").

    Raises
    ------
    MagneticCircuitError
        Naming ``what`` and the likely cause, if any element has ``converged`` False.
    """
    if not np.all(point.converged):
        raise MagneticCircuitError(
            f"{what} has no solution: the magnet's operating point could not be bracketed between "
            "-HcJ and 0 (check that the magnet data and dimensions are finite and positive)"
        )


def load_line(point: MagneticOperatingPoint, field_min: float, samples: int = 2):
    """The load line B = -μ0·Pc·H of an operating point, as plot data.

    Parameters
    ----------
    point : MagneticOperatingPoint
        A solution of one design (its permeance coefficient Pc).
    field_min : float
        Where the line ends [A/m], negative.
    samples : int, optional
        Points on the line [1] (two draw a straight line).

    Returns
    -------
    h : ndarray
        Field strength from 0 to ``field_min`` [A/m].
    b : ndarray
        Flux density on the line [T].

    References
    ----------
    .. [1] the definition of the permeance coefficient, Pc = -Bm/(μ0·Hm), as in Campbell 1994, ch. 2
       (from memory)
    """
    h = np.linspace(0.0, field_min, samples)
    return h, -MU_0 * point.permeance_coefficient * h


def stack_circuits(parts: Sequence[tuple[PoleCircuit, int]]) -> PoleCircuit:
    """One circuit of arrays from (circuit, copies) pairs, in order, for a single batch solve.

    Parameters
    ----------
    parts : sequence of (PoleCircuit, int)
        Each circuit and how many times it repeats.

    Returns
    -------
    PoleCircuit
        Every field concatenated along one axis.
    """
    return PoleCircuit(**{
        name: np.concatenate([np.broadcast_to(getattr(c, name), (copies,)) for c, copies in parts])
        for name in vars(parts[0][0])
    })


def select_points(point: MagneticOperatingPoint, index: slice | int) -> MagneticOperatingPoint:
    """Part of a batch solution, as a solution of its own.

    Parameters
    ----------
    point : MagneticOperatingPoint
        A batch solution.
    index : slice or int
        Which entries.

    Returns
    -------
    MagneticOperatingPoint
        The same fields, indexed.
    """
    values: dict[str, Any] = {}
    for name, value in vars(point).items():
        if isinstance(value, dict):
            values[name] = {k: np.asarray(v)[index] for k, v in value.items()}
        else:
            values[name] = np.asarray(value)[index]
    return MagneticOperatingPoint(**values)
