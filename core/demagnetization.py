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
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from .geometry import Geometry
from .magnetic_circuit import PoleCircuit


def armature_reaction_field(current, conductors, paths, magnet_arc, magnet_thickness, recoil_permeability, effective_gap):
    """ΔH at the magnet tip [A/m], negative (demagnetizing), for armature current ``current`` [A]."""
    tip_mmf = np.asarray(conductors) * (np.abs(current) / np.asarray(paths)) * magnet_arc / (4.0 * np.pi)
    return -tip_mmf / (magnet_thickness + recoil_permeability * effective_gap)


OPEN_BORE_PATH_FACTOR = 1.4  #: calibrated against a 2-D field solution (see the module docstring)


def rotor_removed_circuit(geometry: Geometry, circuit: PoleCircuit) -> PoleCircuit:
    """The per-pole circuit with the armature taken out of the housing (see the module docstring)."""
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


@dataclass(frozen=True)
class DemagnetizationCase:
    """One case: a current at a temperature, or the rotor removed."""

    name: str  #: e.g. "stall, cold"
    kind: str  #: "stall", "reversal", "current limit" or "rotor removed"
    temperature_C: float  #: magnet temperature of the case [°C]
    current_A: float  #: armature current [A] (0 for the rotor removed)
    magnet_field_A_per_m: float  #: field at the worst point of the magnet [A/m]
    magnet_flux_density_T: float  #: normal-curve B there [T]
    knee_field_A_per_m: float  #: -Hk at the case's temperature [A/m]
    margin_A_per_m: float  #: magnet field minus knee field; positive is safe [A/m]
    ok: bool


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
    return ADVICE[case.kind]
