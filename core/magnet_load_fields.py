"""The magnet's field at the armature currents it is judged at, with the current in the armature's slots.

The flux per pole under load (core.pole_load_table) is the back-EMF's, a mean over the rotor's turning.
The magnet's field is a matter of the worst moment instead: with the
current in its slots, a slot's step that falls just inside the trailing tip loads it at once
(core.armature_mmf). So each temperature case's magnet is solved at exactly the currents its cases are
judged at (:func:`core.demagnetization.judged_currents`: the stall and reversal currents and the drive's
limit), each at every rotor position the network can tell apart
(:func:`core.armature_mmf.distinct_rotor_positions`), in one batch; the position that gives the most
demagnetized share of the magnet counts. Solving at the currents themselves leaves no interpolation
between currents in a verdict.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, replace

import numpy as np

from .armature_mmf import distinct_rotor_positions
from .pole_load_table import magnet_state_of
from .pole_magnetics import PoleState, design_network, pole_states
from .reluctance_network import seeds_within


@dataclass(frozen=True)
class MagnetLoadFields:
    """The pole's state at each temperature case's judged currents and every rotor position."""

    currents: tuple[tuple[float, ...], ...]  #: per temperature case, the currents solved [A]
    positions: np.ndarray  #: the rotor positions solved [rad]
    states: PoleState  #: flattened: rotor position after position, each case after case, current after current

    def worst_at(self, case: int, current: float) -> tuple[int, float]:
        """The entry of the rotor position that demagnetizes most at a solved current, and its field.

        Parameters
        ----------
        case : int
            The temperature case's index.
        current : float
            Armature current [A]: one of ``currents[case]``.

        Returns
        -------
        tuple of (int, float)
            The entry in ``states`` and the mean field over the worst area share there [A/m].

        Raises
        ------
        KeyError
            When the current was not solved (a defect of the caller: every judged current is).
        """
        solved = self.currents[case]
        if current not in solved:
            raise KeyError(f"the magnet's field was not solved at {current!r} A in temperature case {case}")
        per_position = sum(len(c) for c in self.currents)
        first = sum(len(c) for c in self.currents[:case]) + solved.index(current)
        entries = first + per_position * np.arange(self.positions.size)
        worst = self.states.worst_field[entries]
        position = int(np.argmin(worst))
        return int(entries[position]), float(worst[position])

    def magnet_state(self, case: int, current: float, flux_per_pole: float):
        """The magnet's field at a judged current, at the rotor position where it is worst.

        Parameters
        ----------
        case, current
            As :meth:`worst_at`.
        flux_per_pole : float
            The flux per pole at that current, the mean over the rotor's turning (core.pole_load_table) [Wb].

        Returns
        -------
        MagnetState
            The worst-area field, its position, the share past the knee, the segments' fields.
        """
        entry, _ = self.worst_at(case, current)
        return replace(magnet_state_of(self.states, entry), flux_per_pole=flux_per_pole)


def magnet_load_fields(design, temperatures_C: Sequence[float],
                       currents: Sequence[Sequence[float]]) -> MagnetLoadFields:
    """Solve a design's network at each temperature case's judged currents, at every rotor position.

    Parameters
    ----------
    design : Design
        The design (SI).
    temperatures_C : sequence of float
        Each temperature case's magnet temperature [°C].
    currents : sequence of sequences of float
        Each case's currents [A] (finite, distinct).

    Returns
    -------
    MagnetLoadFields
        One batch solve of positions × currents.

    References
    ----------
    .. [1] core.armature_mmf (the current in its slots); core.reluctance_network (Ostović 1989).
    """
    solved = tuple(tuple(float(i) for i in case) for case in currents)
    flat_currents = np.array([i for case in solved for i in case])
    flat_temperatures = np.array([t for t, case in zip(temperatures_C, solved, strict=True) for _ in case])
    positions = distinct_rotor_positions(design_network(design).centre_angle, int(design.geometry.slots))[0]
    states = pole_states(design, np.tile(flat_temperatures, positions.size), np.tile(flat_currents, positions.size),
                         what="the magnetic circuit under load (the magnets' cases)",
                         rotor_position=np.repeat(positions, flat_currents.size),
                         # each position starts from the first position's solution at the same current
                         seeded_by=seeds_within(1, positions.size * flat_currents.size, flat_currents.size))
    return MagnetLoadFields(currents=solved, positions=positions, states=states)

__all__ = ["MagnetLoadFields", "magnet_load_fields"]
