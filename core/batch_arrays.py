"""The designs of a batch as arrays: stacked cross-sections and materials, and the network solved group by group.

:func:`stack_geometries` turns N cross-sections into one of arrays; :func:`design_groups` gathers the
designs that one reluctance-network solve can take together (a magnet grade family, a pair of steels, a
shaft, a slot, pole and segment count), and :func:`solve_groups` solves each group at its temperatures and
currents, naming in :class:`DesignsFailed` the designs whose network has no solution. The array chain of
:mod:`core.batch_chain` is built on these.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from .design import Design
from .errors import MagneticCircuitError
from .geometry import Geometry
from .magnets import GradeLots, MagnetGrade
from .reluctance_network import seeds_within


def stack_geometries(geometries: Sequence[Geometry]) -> Geometry:
    """One geometry of arrays from several geometries of floats.

    Parameters
    ----------
    geometries : sequence of Geometry
        The cross-sections, each with float fields.

    Returns
    -------
    Geometry
        Every field an array, element i from ``geometries[i]`` (in the fields' units, m and rad).
    """
    return Geometry(**{
        f.name: np.array([getattr(g, f.name) for g in geometries]) for f in dataclasses.fields(Geometry)
    })


class DesignsFailed(Exception):
    """Some designs of a chain raised: their positions in it and the messages."""

    def __init__(self, messages: dict[int, str]) -> None:
        super().__init__(f"{len(messages)} designs failed")
        self.messages = messages


@dataclass(frozen=True)
class SteelArrays:
    """The lamination steels' loss coefficients, per design (core.motor_model.LossCoefficients)."""

    hysteresis_coeff: np.ndarray
    hysteresis_exponent: np.ndarray
    eddy_coeff: np.ndarray
    excess_coeff: np.ndarray

    def at(self, rows) -> SteelArrays:
        """The coefficients of some of the designs.

        Parameters
        ----------
        rows : array of int
            Positions of the designs in the batch.

        Returns
        -------
        SteelArrays
            Each coefficient at ``rows`` (units as in :class:`core.motor_model.LossCoefficients`).
        """
        return SteelArrays(self.hysteresis_coeff[rows], self.hysteresis_exponent[rows], self.eddy_coeff[rows],
                           self.excess_coeff[rows])


def _grade_family(grade: MagnetGrade) -> MagnetGrade:
    """The grade with its lot values (Br, HcJ, HcB, (BH)max) cleared: the lots of one grade share it, and
    the network takes those values per design (:class:`core.magnets.GradeLots`)."""
    return dataclasses.replace(grade, remanence=0.0, coercivity_hcj=0.0, coercivity_hcb=0.0, energy_product=0.0)


def _group_key(d: Design):
    g, w = d.geometry, d.winding
    return (_grade_family(d.magnet), id(d.housing_steel), id(d.lamination_steel), bool(d.shaft_magnetic),
            int(g.poles), int(g.slots), int(w.commutator_segments))


def design_groups(designs: Sequence[Design]) -> list[np.ndarray]:
    """The designs one network solve takes together: a magnet grade family (a grade and its lots), a pair
    of steels, a shaft, and a slot, pole and segment count.

    Parameters
    ----------
    designs : sequence of Design
        The designs of the batch, SI.

    Returns
    -------
    list of array of int
        Each group's positions in ``designs``, in the order the groups first appear.
    """
    groups: dict[object, list[int]] = {}
    for i, d in enumerate(designs):
        groups.setdefault(_group_key(d), []).append(i)
    return [np.array(members) for members in groups.values()]


def solve_groups(designs, groups, geometry, lots: GradeLots, repeat: int, temperatures, currents,
                 rotor_present: bool, winding, what: str, rotor_positions: np.ndarray | None = None,
                 seed_period: int | None = None):
    """The pole states of every design at ``repeat`` (temperature, current) pairs each, group by group
    (each design's cross-section built once, its magnet lot's Br and HcJ per design).

    Parameters
    ----------
    designs : sequence of Design
        The designs of the batch, SI.
    groups : list of array of int
        The groups of :func:`design_groups`.
    geometry : Geometry
        The designs' cross-sections stacked (:func:`stack_geometries`) [m, rad].
    lots : GradeLots
        Each design's magnet lot (Br [T], HcJ [A/m], ...).
    repeat : int
        How many (temperature, current) pairs each design is solved at.
    temperatures : array
        Magnet temperatures, shape (N, repeat) [°C].
    currents : float or array
        Armature currents, broadcast to ``temperatures`` [A].
    rotor_present : bool
        False for the rotor pulled out.
    winding : tuple of (conductors, parallel paths) arrays, or None
        The armature's total conductors and parallel paths per design [1], where the current magnetizes;
        None at no load.
    what : str
        The circuit named in an error message.
    rotor_positions : ndarray, optional
        None: the armature's current as a smeared sheet; else shape (N, repeat): the current in its slots
        with the rotor at that angle from a slot centre on the pole centre [rad] (core.armature_mmf).
    seed_period : int, optional
        Speed only: each design's pair j starts its Newton solve from the solution of its pair
        ``j % seed_period``, solved first (the same currents at the first rotor position, where the pairs
        repeat every ``seed_period``); None: every pair from zero flux.

    Returns
    -------
    dict of str to array
        The :class:`core.pole_magnetics.PoleState` fields, each of shape (N, repeat, ...).

    Raises
    ------
    DesignsFailed
        Naming the designs whose network has no solution.
    """
    from . import pole_magnetics as pm

    count = len(designs)
    out: dict[str, np.ndarray] = {}
    failures: dict[int, str] = {}
    for members in groups:
        d = designs[members[0]]

        def solve(members, d=d):
            rows = np.repeat(members, repeat)  # the design of each entry
            part = Geometry(**{f.name: (getattr(d.geometry, f.name) if f.name in ("poles", "slots")
                                        else np.asarray(getattr(geometry, f.name))[members])
                               for f in dataclasses.fields(Geometry)})
            part_winding = None if winding is None else (int(d.geometry.poles), int(d.geometry.slots),
                                                          int(d.winding.commutator_segments),
                                                          winding[0][rows], winding[1][rows])
            return pm.pole_states_many(part, d.magnet, d.housing_steel, d.lamination_steel, d.shaft_magnetic,
                                       temperatures.reshape(count * repeat)[_flat(rows, repeat)],
                                       np.broadcast_to(currents, temperatures.shape).reshape(count * repeat)[
                                           _flat(rows, repeat)],
                                       rotor_present, part_winding, what,
                                       rows=np.repeat(np.arange(members.size), repeat), lots=lots.at(rows),
                                       rotor_position=None if rotor_positions is None else
                                       rotor_positions.reshape(count * repeat)[_flat(rows, repeat)],
                                       seeded_by=None if seed_period is None else
                                       seeds_within(members.size, repeat, seed_period))
        try:
            states = solve(members)
        except MagneticCircuitError:
            for member in members:  # which of the group has no solution
                try:
                    solve(np.array([member]))
                except MagneticCircuitError as error:
                    failures[int(member)] = str(error)
            if failures:
                continue
            raise
        for f in dataclasses.fields(states):
            value = np.asarray(getattr(states, f.name))
            if f.name not in out:
                out[f.name] = np.zeros((count, repeat, *value.shape[1:]), dtype=value.dtype)
            out[f.name][members] = value.reshape(len(members), repeat, *value.shape[1:])
    if failures:
        raise DesignsFailed(failures)
    return out


def _flat(rows: np.ndarray, repeat: int) -> np.ndarray:
    """Indices into a (N·repeat,) flattening of (N, repeat) for the rows ``rows`` (each repeated)."""
    return rows * repeat + np.tile(np.arange(repeat), rows.size // repeat)


def as_float_array(value: Any) -> Any:
    """``value`` as a float array (typed loosely: the topic modules annotate their scalar use).

    Parameters
    ----------
    value : float or array_like
        Any figure, in its own unit.

    Returns
    -------
    array of float64
        The same values, same unit.
    """
    return np.asarray(value, dtype=np.float64)


@dataclass(frozen=True)
class PriceArrays:
    """Prices per design, shaped like :class:`core.design.Prices`."""

    currency: str
    magnet: np.ndarray
    copper: np.ndarray
    housing_steel: np.ndarray
    lamination: np.ndarray

