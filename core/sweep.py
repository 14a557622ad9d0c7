"""What-if sweeps: any project key, any screening figure, through the batch chain; and the quick sweep of
the pole's reluctance network alone.

:func:`figure_sweep` varies one key of a project over values (each validated like a file), runs the whole
chain on all of them at once (:func:`core.batch.evaluate_many`) and returns the figures asked for::

    from pmdc_sizer.core import load
    from pmdc_sizer.core.sweep import figure_sweep
    motor = load("demo_projects/appliance_ferrite_12v.toml")
    swept = figure_sweep(motor, "winding.turns_per_coil", [20, 22, 24],
                         ["nominal.no_load_speed_rad_per_s", "ratings.continuous_torque_N_m"])
    swept.figures["nominal.no_load_speed_rad_per_s"]   # one value per turn count [rad/s]

A change of grade or steel is a key like any other there. :func:`magnetics_sweep` below is the lighter
look at the no-load magnetics alone (the same reluctance network as the chain, core.pole_magnetics; no
performance, no thermal chain):

Each swept value is validated like a file (so a sweep never computes a motor whose parts do not fit),
the resulting cross-sections are stacked into one :class:`~core.geometry.Geometry` of arrays, and the
network is solved once for all of them::

    from pmdc_sizer.core import load, magnetics_sweep
    motor = load("demo_projects/appliance_ferrite_12v.toml")
    states = magnetics_sweep(motor, "magnets.thickness_mm", [4, 5, 6, 7, 8])
    states.airgap_flux_density_mean   # one value per thickness [T]

Only keys that change the cross-section or the temperature are meaningful here; a change of grade, of a
steel or of the shaft's material is refused, since one solve takes one grade, one pair of steels and one
kind of shaft.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence

import numpy as np

from .batch import BatchFigures, evaluate_many, stack_geometries
from .design import design_from_project
from .edits import with_values
from .errors import ProjectError
from .pole_magnetics import PoleState, pole_states_many
from .schema import Project

__all__ = ["figure_sweep", "magnetics_sweep", "stack_geometries"]


def figure_sweep(project: Project, key: str, values: Sequence[object],
                 figures: Sequence[str] | None = None) -> BatchFigures:
    """The screening figures of the design for each value of one project key, by the batch chain.

    Parameters
    ----------
    project : Project
        The design to vary, in the file's units.
    key : str
        Any project-file key, e.g. ``"magnets.thickness_mm"``, ``"magnets.grade"``, ``"winding.wire"``.
    values : sequence
        The values of ``key``, in the key's file unit; each is validated like a file.
    figures : sequence of str, optional
        The figures to return (names as :func:`core.batch.screening_figures` gives them); all if None.

    Returns
    -------
    BatchFigures
        One element per value: the figures asked for, every check's code, and any value whose chain
        failed, with its message.

    Raises
    ------
    ProjectError
        Naming the key, if a value is refused by the schema or the fit rules; naming the figure, if it
        is not one the batch computes.
    """
    designs = [design_from_project(with_values(project, {key: value})) for value in values]
    batch = evaluate_many(designs)
    if figures is None:
        return batch
    unknown = [name for name in figures if name not in batch.figures]
    if unknown and designs:
        raise ProjectError(f"{unknown[0]}: not a screening figure (e.g. nominal.no_load_speed_rad_per_s)",
                           key=unknown[0])
    return dataclasses.replace(batch, figures={name: batch.figures[name] for name in figures if name in batch.figures})


def magnetics_sweep(project: Project, key: str, values: Sequence[object],
                    temperature_C: float | np.ndarray | None = None) -> PoleState:
    """The no-load state of the pole for each value of one project key, in one vectorised network solve.

    Parameters
    ----------
    project : Project
        The design to vary, in the file's units.
    key : str
        A project-file key that changes the cross-section, e.g. ``"magnets.thickness_mm"``.
    values : sequence
        The values of ``key``, in the key's file unit (mm, deg, ...); each is validated like a file.
    temperature_C : float or ndarray, optional
        Magnet temperature [°C]; the project's nominal ambient if not given, or one per value.

    Returns
    -------
    PoleState
        One entry per value: flux per pole [Wb], air-gap flux densities [T], the magnet's mean operating
        point and worst field [A/m], the iron's flux densities [T], ... (core.pole_magnetics).

    Raises
    ------
    ProjectError
        Naming the key, if a value is refused by the schema or the fit rules, or changes the grade, a
        steel or the shaft's material.
    MagneticCircuitError
        If the network has no solution for some value.

    References
    ----------
    .. [1] the pole's reluctance network, :func:`core.pole_magnetics.pole_states_many` (Ostović 1989).
    """
    base = design_from_project(project)
    designs = [design_from_project(with_values(project, {key: value})) for value in values]
    for design in designs:
        if (design.magnet != base.magnet or design.housing_steel.name != base.housing_steel.name
                or design.lamination_steel.name != base.lamination_steel.name
                or bool(design.shaft_magnetic) != bool(base.shaft_magnetic)):
            raise ProjectError(f"{key}: a sweep keeps one grade, one pair of steels and one kind of shaft; "
                               "sweep one design per grade (or use figure_sweep)", key=key)
    geometry = stack_geometries([d.geometry for d in designs])
    temperature = base.ambient_nominal_C if temperature_C is None else np.asarray(temperature_C, dtype=float)
    return pole_states_many(geometry, base.magnet, base.housing_steel, base.lamination_steel,
                            base.shaft_magnetic, temperature, what=f"the magnetic network in the sweep of {key}")
