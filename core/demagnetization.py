"""Demagnetization: armature reaction at the trailing magnet tip, and the rotor-removed magnet.

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

from collections.abc import Sequence
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


def demagnetization_case(name: str, kind: str, grade: MagnetGrade, temperature_C: float, current: float,
                         magnet_field: float) -> DemagnetizationCase:
    """A case's verdict: the field the circuit demands of the magnet against the knee at its temperature.

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
    magnet_field : float
        Field in the magnet at its worst point, the no-load demand plus the armature reaction [A/m].

    Returns
    -------
    DemagnetizationCase
        With the margin H - H_knee [A/m]; positive is safe.

    Notes
    -----
    The knee is where irreversible loss begins (``core.magnets.knee_field_at``: J has fallen 1 % of Br
    below its recoil line, our definition); a case passes while its field stays above it.

    References
    ----------
    .. [1] the project's own knee criterion on its own curve model (:func:`magnets.knee_field_at`); no
       published source.
    """
    knee = float(knee_field_at(grade, temperature_C))
    return DemagnetizationCase(
        name=name, kind=kind, temperature_C=float(temperature_C), current_A=float(current),
        magnet_field_A_per_m=float(magnet_field),
        magnet_flux_density_T=float(flux_density(grade, magnet_field, temperature_C)),
        knee_field_A_per_m=knee, margin_A_per_m=float(magnet_field) - knee, ok=bool(magnet_field > knee),
    )


@dataclass(frozen=True)
class TemperatureCase:
    """What the demagnetization cases need of one temperature case (cold or hot)."""

    label: str  #: "cold" or "hot"
    model: MotorModel  #: the motor at that case's temperatures
    no_load_speed: float  #: [rad/s]
    magnet_temperature_C: float  #: [°C]
    no_load_magnet_field: float  #: the circuit's demand on the magnet's recoil line [A/m]


def demagnetization_cases(
    grade: MagnetGrade, conductors: int, paths: int, geometry: Geometry, effective_gap: float,
    temperature_cases: Sequence[TemperatureCase], current_limit: float | None, reversing: bool,
    rotor_removed: Sequence[tuple[str, float, float]],
) -> DemagnetizationResult:
    """Stall, reversal and drive-limit cases at each temperature, then the rotor removed; the worst named.

    Parameters
    ----------
    grade : MagnetGrade
        The magnet grade.
    conductors, paths : int
        Total armature conductors Z and parallel paths a [1].
    geometry : Geometry
        The cross-section (magnet arc and thickness) [m, rad].
    effective_gap : float
        Gap with Carter's coefficient [m].
    temperature_cases : sequence of TemperatureCase
        The coldest and the hottest case.
    current_limit : float or None
        The drive's current limit [A]; it caps the stall and reversal currents.
    reversing : bool
        The application plugs the motor at speed.
    rotor_removed : sequence of (label, temperature [°C], magnet field [A/m])
        The rotor-removed circuit's demand on the magnet at each temperature.

    Returns
    -------
    DemagnetizationResult
        Every case, and the one with the least margin.

    References
    ----------
    .. [1] D. Hanselman, Brushless Permanent Magnet Motor Design, 2nd ed., 2006, ch. 5 (armature
       reaction at the magnet tip; from memory).
    """
    cases: list[DemagnetizationCase] = []

    def add(name: str, kind: str, temperature_C: float, current: float, no_load_field: float) -> None:
        reaction = float(armature_reaction_field(current, conductors, paths, geometry.magnet_arc,
                                                 geometry.magnet_thickness, grade.recoil_permeability,
                                                 effective_gap))
        cases.append(demagnetization_case(name, kind, grade, temperature_C, current, no_load_field + reaction))

    def limited(current: float) -> str:
        return " (drive-limited)" if current == current_limit else ""

    for case in temperature_cases:
        stall_i = float(stall_current(case.model))
        reversal_i = float(plugging_current(case.model, case.no_load_speed))
        if current_limit is not None:
            # The drive holds the current at its limit whatever the load asks for.
            stall_i, reversal_i = min(stall_i, current_limit), min(reversal_i, current_limit)
        t, h = case.magnet_temperature_C, case.no_load_magnet_field
        add(f"stall, {case.label}{limited(stall_i)}", "stall", t, stall_i, h)
        if reversing:
            add(f"reversal at no-load speed, {case.label}{limited(reversal_i)}", "reversal", t, reversal_i, h)
        if current_limit is not None:
            add(f"drive current limit, {case.label}", "current limit", t, current_limit, h)
    for label, temperature_C, magnet_field in rotor_removed:
        add(f"rotor removed, {label}", "rotor removed", temperature_C, 0.0, magnet_field)
    worst = min(cases, key=lambda c: c.margin_A_per_m)
    return DemagnetizationResult(ok=all(c.ok for c in cases), worst_case=worst.name,
                                 worst_margin_A_per_m=worst.margin_A_per_m, cases=tuple(cases))
