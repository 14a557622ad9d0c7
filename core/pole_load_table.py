"""The pole's state over a grid of armature currents, case by case, and the magnet's field read off it.

:func:`load_table` solves a design's network (:func:`core.pole_magnetics.pole_states`) at each temperature
case's magnet temperature over currents from zero to the case's largest; :class:`LoadTable` gives the flux
per pole against current (the curve's Ke = K·Φ(I)), interpolated in I². The flux is the back-EMF's: the
mean over the rotor's turning, taken over :data:`TURNING_POSITIONS` rotor positions spread evenly over a slot
pitch with the armature's current in its slots (core.armature_mmf.turning_positions). Where the iron
saturates that mean lies below the flux of the smeared current sheet (the mean current): against the mean
of the field solution's two rotor positions over the calibration's 48 loaded designs, the smeared sheet
reads 3.5 % high on average and this mean 0.2 % (docs/network-calibration.md). :func:`magnet_state_of` reads
the magnet's state off one entry of a batch, as the demagnetization cases take it (the magnet's field under
load is solved at the worst rotor position, core.magnet_load_fields).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .armature_mmf import turning_positions
from .pole_magnetics import PoleState, pole_states
from .reluctance_network import seeds_within

#: Currents of each case's table of flux against current, from 0 to the largest current [1].
LOAD_POINTS = 12

#: Rotor positions per slot pitch the flux under load is averaged over [1]. Chosen, not fitted, against the
#: network's own exact mean over the turning (every position it tells apart, each weighted by the share of
#: the pitch it holds over: core.armature_mmf.rotor_position_shares), at 150 loaded points (the
#: calibration's 48 loaded designs at 0.3, 1 and 2 times their larger current; the demos at their stall and
#: reversal currents): 4 positions are within 0.9 % rms and 2.9 % at worst; 3 give 1.7 % and 7.8 %, 6 give
#: 0.6 % and 3.3 %, 8 give 0.55 % and 2.8 %; the smeared sheet 5.7 % and 28 %. The network's flux with the
#: current in its slots swings with the position far more than the field solution's (at the drill demo's
#: 2 kA stall from 7.5 to 15.7 mWb/m where the field solution stays at 11.8), so few positions can alias.
TURNING_POSITIONS = 4


@dataclass(frozen=True)
class LoadTable:
    """The pole's state at each case's magnet temperature over a grid of armature currents."""

    currents: np.ndarray  #: (cases, points), from 0 [A]
    states: PoleState  #: flattened: rotor position after position, each case after case, current after current

    def flux(self, case: int) -> tuple[np.ndarray, np.ndarray]:
        """Currents [A] and the flux per pole there [Wb] for one case: the mean over the rotor positions.

        Parameters
        ----------
        case : int
            Its index.

        Returns
        -------
        tuple of ndarray
            Currents and flux per pole.
        """
        cases, points = self.currents.shape
        per_position = np.asarray(self.states.flux_per_pole).reshape(-1, cases, points)
        return self.currents[case], per_position[:, case].mean(axis=0)

    def no_load(self, case: int, name: str):
        """A field of the state at zero current for one case (where the rotor's position makes no difference).

        Parameters
        ----------
        case : int
            Its index.
        name : str
            The PoleState field.

        Returns
        -------
        float or ndarray
            The value (a row for per-segment fields).
        """
        return getattr(self.states, name)[case * self.currents.shape[1]]

    def flux_at(self, case: int, current: float) -> float:
        """The flux per pole at a current of one case [Wb], interpolated in I² (the flux is even in the
        current near 0, as core.motor_model.constant_at takes it).

        Parameters
        ----------
        case : int
            Its index.
        current : float
            Armature current [A] (its magnitude; within the grid).

        Returns
        -------
        float
            [Wb].
        """
        grid, flux = self.flux(case)
        return float(np.interp(current**2, grid**2, flux))


def load_table(design, temperatures_C, largest_currents, points: int = LOAD_POINTS,
               turning_points: int = TURNING_POSITIONS) -> LoadTable:
    """Solve a design's network at each case's temperature over currents from 0 to its largest current,
    at rotor positions spread over a slot pitch with the current in its slots.

    Parameters
    ----------
    design : Design
        The design (SI).
    temperatures_C : sequence of float
        Each case's magnet temperature [°C].
    largest_currents : sequence of float
        Each case's largest current [A] (reversal at speed, stall, the drive's limit).
    points : int
        Currents per case [1].
    turning_points : int
        Rotor positions per slot pitch [1].

    Returns
    -------
    LoadTable
        One batch solve of positions × cases × points.

    References
    ----------
    .. [1] core.armature_mmf (the current in its slots; the positions); core.reluctance_network (Ostović 1989).
    """
    currents = np.linspace(0.0, 1.0, points)[None, :] * np.asarray(largest_currents, dtype=float)[:, None]
    temperatures = np.repeat(np.asarray(temperatures_C, dtype=float), points)
    positions = turning_positions(int(design.geometry.slots), turning_points)
    entries = currents.size
    states = pole_states(design, np.tile(temperatures, positions.size), np.tile(currents.ravel(), positions.size),
                         what="the magnetic circuit under load (cold, nominal or hot)",
                         rotor_position=np.repeat(positions, entries),
                         # each position starts from the first position's solution at the same current
                         seeded_by=seeds_within(1, positions.size * entries, entries))
    return LoadTable(currents=currents, states=states)


def magnet_state_of(states: PoleState, index: int):
    """The magnet's field of one entry of a batch, as the demagnetization cases take it.

    Parameters
    ----------
    states : PoleState
        A batch.
    index : int
        The entry.

    Returns
    -------
    MagnetState
        The worst-area field, its position, the share past the knee and the flux per pole.
    """
    from .demagnetization import MagnetState

    return MagnetState(
        worst_field=float(states.worst_field[index]), worst_angle=float(states.worst_angle[index]),
        past_knee_fraction=float(states.past_knee_fraction[index]), flux_per_pole=float(states.flux_per_pole[index]),
        segment_angle=states.segment_angle[index], segment_field=states.segment_field[index],
        segment_share=states.segment_share[index],
    )


__all__ = ["LOAD_POINTS", "TURNING_POSITIONS", "LoadTable", "load_table", "magnet_state_of"]
