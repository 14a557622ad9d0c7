"""The pole's state over a grid of armature currents, case by case, and the magnet's field read off it.

:func:`load_table` solves a design's network (:func:`core.pole_magnetics.pole_states`) at each temperature
case's magnet temperature over currents from zero to the case's largest; :class:`LoadTable` gives the flux
per pole against current (the curve's Ke = K·Φ(I)), interpolated in I², with the armature's current as a
smeared sheet (its mean over the rotor's turning); :func:`magnet_state_of` reads the magnet's state off one
entry of a batch, as the demagnetization cases take it (the magnet's field under load is solved with the
current in its slots, core.magnet_load_fields).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .pole_magnetics import PoleState, pole_states

#: Currents of each case's table of flux against current, from 0 to the largest current [1].
LOAD_POINTS = 12


@dataclass(frozen=True)
class LoadTable:
    """The pole's state at each case's magnet temperature over a grid of armature currents."""

    currents: np.ndarray  #: (cases, points), from 0 [A]
    states: PoleState  #: flattened, case after case, current after current

    def flux(self, case: int) -> tuple[np.ndarray, np.ndarray]:
        """Currents [A] and the flux per pole there [Wb] for one case.

        Parameters
        ----------
        case : int
            Its index.

        Returns
        -------
        tuple of ndarray
            Currents and flux per pole.
        """
        points = self.currents.shape[1]
        return self.currents[case], self.states.flux_per_pole[case * points:(case + 1) * points]

    def no_load(self, case: int, name: str):
        """A field of the state at zero current for one case.

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


def load_table(design, temperatures_C, largest_currents, points: int = LOAD_POINTS) -> LoadTable:
    """Solve a design's network at each case's temperature over currents from 0 to its largest current.

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

    Returns
    -------
    LoadTable
        One batch solve of cases × points.
    """
    currents = np.linspace(0.0, 1.0, points)[None, :] * np.asarray(largest_currents, dtype=float)[:, None]
    temperatures = np.repeat(np.asarray(temperatures_C, dtype=float), points)
    states = pole_states(design, temperatures, currents.ravel(),
                         what="the magnetic circuit under load (cold, nominal or hot)")
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


__all__ = ["LOAD_POINTS", "LoadTable", "load_table", "magnet_state_of"]
