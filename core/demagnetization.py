"""Demagnetization: the field in every magnet segment at stall, reversal, the drive's limit and with the
rotor removed, against the knee; the worst spot and the share of the magnet past the knee.

The chain takes the fields from the pole's reluctance network (core.pole_magnetics: the magnet in
angular segments, the armature's current as a sheet in the slots, the rotor-removed case with the
armature's region as air), so the worst spot is wherever the network puts it, not only at a tip; the
verdict rests on the mean field over the magnet's most-demagnetized 5 % of area (core.magnet_field_share).
:func:`demagnetization_cases` turns those fields into the cases and their verdicts.

The lumped estimate below (the armature reaction at the magnet tip on a local load line, and the
rotor-removed lumped circuit) stays as the simple model of core.magnetic_circuit:

With the brushes on the geometric neutral, the armature MMF across one gap crossing is a triangle,
zero at the pole centre and F(θ) = A·R·θ at an angle θ from it, where A = Z·(I/a)/(2π·R) is the
armature's linear current density. At the magnet tip (θ = θm/2) it opposes the magnet at one tip (the
trailing tip when motoring; the other tip when the current reverses). Along the local path through
magnet and gap in series, with the magnet on its recoil line, the extra field in the magnet is

    ΔH = -F_tip / (lm + μrec·g_e),   F_tip = Z·(I/a)·θm / (4π)

(the standard local-load-line argument, e.g. Hanselman 2006, ch. 5, from memory), and the tip's field
is the no-load field plus ΔH (common practice: the no-load operating point stands for the tip's). The
no-load field used here is the circuit's demand with the magnet on its recoil line
(``magnetic_circuit.solve(..., magnet_on_recoil_line=True)``): past the knee, the full curve would let
the point slide down with it and understate how far the circuit drives the magnet.

Rotor removed: the magnets face the open bore. The per-pole circuit keeps the housing and the magnet
and replaces gap, teeth and core by an air path from the magnet's inner face round to the interpolar
plane, taken as OPEN_BORE_PATH_FACTOR·π·R/p (R the magnet's inner radius) across the face's area. The
leakage from the magnets' sides and round to the housing stays; the edge-to-edge leakage across the gap
goes, being part of the open path now. The factor 1.4 is calibrated, not derived: with it the lumped
field is 1 % to 3 % more demagnetizing than the mean field of a 2-D field solution (scikit-fem, in
tests/core/test_magnetic_circuit.py) for 2-, 4- and 6-pole reference cross-sections, so the estimate
errs toward safety. Locally, at the magnets' edges, the field solution is 20 % to 35 % stronger than
its mean: a small rotor-removed margin is no margin.

A case passes when its field stays above the knee at its temperature: margin = H - H_knee > 0.

References
----------
.. [1] D. Hanselman, Brushless Permanent Magnet Motor Design, 2nd ed., 2006, ch. 5 (armature reaction
   and the local load line at the magnet tip; from memory).
.. [2] OPEN_BORE_PATH_FACTOR: the project's own calibration against its 2-D field solution (above).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace

import numpy as np

from .geometry import Geometry
from .magnetic_circuit import PoleCircuit
from .magnets import MagnetGrade, flux_density, knee_field_at
from .performance import MotorModel, plugging_current, stall_current
from .results import DemagnetizationCase, DemagnetizationResult


def armature_reaction_field(current: float | np.ndarray, conductors: int | np.ndarray, paths: int | np.ndarray,
                            magnet_arc: float | np.ndarray, magnet_thickness: float | np.ndarray,
                            recoil_permeability: float | np.ndarray, effective_gap: float | np.ndarray):
    """The armature reaction's extra field at the magnet tip, negative (demagnetizing).

    Parameters
    ----------
    current : float or ndarray
        Armature current I [A]; its sign does not matter (one tip or the other is opposed).
    conductors, paths : int or ndarray
        Total conductors Z and parallel paths a [1].
    magnet_arc : float or ndarray
        Mechanical arc of one magnet θm [rad].
    magnet_thickness : float or ndarray
        Radial magnet thickness lm [m].
    recoil_permeability : float or ndarray
        Relative recoil permeability μrec [1].
    effective_gap : float or ndarray
        Gap with Carter's coefficient g_e [m].

    Returns
    -------
    float or ndarray
        ΔH = -F_tip/(lm + μrec·g_e) with F_tip = Z·(|I|/a)·θm/(4π) [A/m].

    References
    ----------
    .. [1] Hanselman 2006, ch. 5 (from memory); see the module docstring.
    """
    tip_mmf = np.asarray(conductors) * (np.abs(current) / np.asarray(paths)) * magnet_arc / (4.0 * np.pi)
    return -tip_mmf / (magnet_thickness + recoil_permeability * effective_gap)


OPEN_BORE_PATH_FACTOR = 1.4  #: calibrated against a 2-D field solution (see the module docstring)


def rotor_removed_circuit(geometry: Geometry, circuit: PoleCircuit) -> PoleCircuit:
    """The per-pole circuit with the armature taken out of the housing (see the module docstring).

    Parameters
    ----------
    geometry : Geometry
        The cross-section (magnet inner radius, arc and length; poles) [m, rad].
    circuit : PoleCircuit
        The per-pole circuit with the rotor in (:func:`magnetic_circuit.pole_circuit`).

    Returns
    -------
    PoleCircuit
        The same housing and magnet; gap, teeth and core replaced by an air path of
        OPEN_BORE_PATH_FACTOR·π·R/p [m] across the magnet's inner face [m²]; the edge-to-edge leakage
        removed.

    References
    ----------
    .. [1] the project's own estimate, calibrated against its 2-D field solution (module docstring).
    """
    g = geometry
    open_path = OPEN_BORE_PATH_FACTOR * np.pi * g.magnet_inner_radius / g.poles
    face_area = g.magnet_arc * g.magnet_inner_radius * g.magnet_length
    zero = np.zeros_like(np.asarray(circuit.effective_gap, dtype=float))
    return replace(
        circuit,
        gap_area=face_area,
        effective_gap=open_path + zero,
        leakage_permeance=circuit.leakage_permeance - circuit.edge_leakage_permeance,
        edge_leakage_permeance=zero,
        tooth_path=zero,
        core_path=zero,
    )


ADVICE = {
    "stall": "at stall the armature current is highest: choose a grade with higher HcJ, thicken the magnet, "
             "add resistance or limit the current",
    "reversal": "reversing at speed (plugging) drives about (V + E)/R through the armature: limit the current "
                "during reversal, choose a grade with higher HcJ or thicken the magnet",
    "current limit": "the drive's current limit demagnetizes the magnet: lower the limit, choose a grade with "
                     "higher HcJ or thicken the magnet",
    "rotor removed": "the magnets demagnetize when the armature is pulled out: magnetize after assembly, fit a "
                     "keeper before removing the armature, or thicken the magnet",
}


def advice_for(case: DemagnetizationCase) -> str:
    """What to change when ``case`` goes past the knee, in words.

    Parameters
    ----------
    case : DemagnetizationCase
        A case that failed.

    Returns
    -------
    str
        Advice, lower case, no full stop.
    """
    return ADVICE[case.kind]


@dataclass(frozen=True)
class MagnetState:
    """The field in the magnet for one case, from the network (core.pole_magnetics.PoleState)."""

    worst_field: float  #: mean over the most-demagnetized WORST_AREA_SHARE of the magnet [A/m]
    worst_angle: float  #: where it is, from the pole centre [rad]
    past_knee_fraction: float  #: share of the magnet's area past the knee [1]
    flux_per_pole: float  #: [Wb]
    segment_angle: np.ndarray  #: centres of the magnet segments [rad]
    segment_field: np.ndarray  #: field in each [A/m]
    segment_share: np.ndarray | None = None  #: each segment's share of the magnet's area [1]; None: not known


def demagnetization_case(name: str, kind: str, grade: MagnetGrade, temperature_C: float, current: float,
                         state: MagnetState) -> DemagnetizationCase:
    """A case's verdict: the magnet's worst-area field against the knee at the case's temperature.

    Parameters
    ----------
    name, kind : str
        The case's name (e.g. "stall, cold") and kind ("stall", "reversal", "current limit",
        "rotor removed").
    grade : MagnetGrade
        The magnet grade.
    temperature_C : float
        Magnet temperature of the case [°C].
    current : float
        Armature current of the case [A].
    state : MagnetState
        The magnet's field in every segment for the case.

    Returns
    -------
    DemagnetizationCase
        With the margin H - H_knee [A/m] of the worst-area field; positive is safe.

    Notes
    -----
    The knee is where irreversible loss begins (``core.magnets.knee_field_at``: J has fallen 1 % of Br
    below its recoil line, our definition); a case passes while the mean field over the magnet's
    most-demagnetized 5 % of area stays above it (core.magnet_field_share: a single corner point is a
    figure of the mesh or of the segments, not of the magnet). The share of the magnet past the knee is
    reported beside it.

    References
    ----------
    .. [1] the project's own knee criterion on its own curve model (:func:`magnets.knee_field_at`); no
       published source.
    """
    knee = float(knee_field_at(grade, temperature_C))
    field = float(state.worst_field)
    return DemagnetizationCase(
        name=name, kind=kind, temperature_C=float(temperature_C), current_A=float(current),
        magnet_field_A_per_m=field,
        magnet_flux_density_T=float(flux_density(grade, field, temperature_C)),
        knee_field_A_per_m=knee, margin_A_per_m=field - knee, ok=bool(field > knee),
        flux_per_pole_Wb=float(state.flux_per_pole), worst_angle_rad=float(state.worst_angle),
        magnet_area_past_knee_fraction=float(state.past_knee_fraction),
        segment_angle_rad=np.asarray(state.segment_angle), segment_field_A_per_m=np.asarray(state.segment_field),
        segment_area_fraction=np.asarray(state.segment_share if state.segment_share is not None else [], dtype=float),
        segment_flux_density_T=np.asarray(flux_density(grade, np.asarray(state.segment_field), temperature_C),
                                          dtype=float),
    )


@dataclass(frozen=True)
class TemperatureCase:
    """What the demagnetization cases need of one temperature case (cold or hot)."""

    label: str  #: "cold" or "hot"
    model: MotorModel  #: the motor at that case's temperatures
    no_load_speed: float  #: [rad/s]
    magnet_temperature_C: float  #: [°C]


def judged_currents(case: TemperatureCase, current_limit: float | None) -> tuple[float, ...]:
    """Every armature current at which a temperature case's magnets are judged, finite and distinct.

    Parameters
    ----------
    case : TemperatureCase
        The cold or the hot case.
    current_limit : float or None
        The drive's current limit [A].

    Returns
    -------
    tuple of float
        The stall current and the reversal (plugging) current from the no-load speed, as the direct-supply
        faults take them, and the drive's limit, which caps both in the ordinary cases (so that every
        current :func:`demagnetization_cases` and core.margins.direct_supply_faults ask for is one of
        them) [A].

    References
    ----------
    .. [1] Chapman 2012, ch. 9 (stall (V - Vb)/R and plugging (V + E)/R currents; from memory).
    """
    values = (float(stall_current(case.model)), float(plugging_current(case.model, case.no_load_speed)),
              *(() if current_limit is None else (float(current_limit),)))
    return tuple(dict.fromkeys(value for value in values if np.isfinite(value)))


def demagnetization_cases(
    grade: MagnetGrade, temperature_cases: Sequence[TemperatureCase], current_limit: float | None,
    reversing: bool, magnet_state: Callable[[str, float], MagnetState],
    rotor_removed: Sequence[tuple[str, float, MagnetState]],
) -> DemagnetizationResult:
    """Stall, reversal and drive-limit cases at each temperature, then the rotor removed; the worst named.

    Parameters
    ----------
    grade : MagnetGrade
        The magnet grade.
    temperature_cases : sequence of TemperatureCase
        The coldest and the hottest case.
    current_limit : float or None
        The drive's current limit [A]; it caps the stall and reversal currents.
    reversing : bool
        The application plugs the motor at speed.
    magnet_state : callable
        ``magnet_state(label, current)``: the magnet's field in every segment at that temperature case's
        magnet temperature and armature current [A].
    rotor_removed : sequence of (label, temperature [°C], MagnetState)
        The magnet's field with the armature pulled out, at each temperature.

    Returns
    -------
    DemagnetizationResult
        Every case, and the one with the least margin.

    References
    ----------
    .. [1] S. J. Chapman, Electric Machinery Fundamentals, 5th ed., 2012, ch. 9 (stall current and
       plugging; from memory); the fields from core.pole_magnetics.
    """
    cases: list[DemagnetizationCase] = []

    def limited(current: float) -> str:
        return " (drive-limited)" if current == current_limit else ""

    for case in temperature_cases:
        stall_i = float(stall_current(case.model))
        reversal_i = float(plugging_current(case.model, case.no_load_speed))
        if current_limit is not None:
            # The drive holds the current at its limit whatever the load asks for.
            stall_i, reversal_i = min(stall_i, current_limit), min(reversal_i, current_limit)
        t = case.magnet_temperature_C
        cases.append(demagnetization_case(f"stall, {case.label}{limited(stall_i)}", "stall", grade, t, stall_i,
                                          magnet_state(case.label, stall_i)))
        if reversing:
            cases.append(demagnetization_case(f"reversal at no-load speed, {case.label}{limited(reversal_i)}",
                                              "reversal", grade, t, reversal_i, magnet_state(case.label, reversal_i)))
        if current_limit is not None:
            cases.append(demagnetization_case(f"drive current limit, {case.label}", "current limit", grade, t,
                                              current_limit, magnet_state(case.label, current_limit)))
    for label, temperature_C, state in rotor_removed:
        cases.append(demagnetization_case(f"rotor removed, {label}", "rotor removed", grade, temperature_C, 0.0,
                                          state))
    worst = min(cases, key=lambda c: c.margin_A_per_m)
    return DemagnetizationResult(ok=all(c.ok for c in cases), worst_case=worst.name,
                                 worst_margin_A_per_m=worst.margin_A_per_m, cases=tuple(cases))
