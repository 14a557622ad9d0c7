"""Screening and refining the candidates of a sizing search: the figures, the constraint, the NSGA-II step.

:class:`CandidateStore` evaluates points of the free box's unit cube through the batch chain and keeps
what the search needs: each point's objectives and constraint violation (:func:`constraint_violation`: the failing
checks and the share by which the load is missed), and the figures of the feasible ones; :func:`refine`
moves from the best screened points towards the trade-off front with NSGA-II (pymoo).

References
----------
.. [1] K. Deb, A. Pratap, S. Agarwal, T. Meyarivan, "A fast and elitist multiobjective genetic
   algorithm: NSGA-II", IEEE Trans. Evol. Comput. 6 (2002) 182-197; pymoo's NSGA2.
.. [2] K. Deb, "An efficient constraint handling method for genetic algorithms", Comput. Methods Appl.
   Mech. Eng. 186 (2000) 311-338 (feasible beats infeasible, infeasible ranked by violation).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

from .batch import BatchFigures, evaluate_many
from .design import Design
from .schema import Project
from .sizing_candidates import fitting_designs, overfull_slots
from .sizing_objectives import OBJECTIVES, derived_figures, objective_matrix
from .sizing_requirement import faults_must_survive, meets_requirement, requirement_misses
from .sizing_space import FreeRange, SizingSpec, from_unit, sample_unit

#: The figures every feasible candidate keeps for the plots (besides the objectives' own).
KEY_FIGURES = ("nominal.no_load_speed_rad_per_s", "nominal.stall_torque_N_m", "constants.ke_V_s_per_rad",
               "nominal.rated_efficiency", "worst_demagnetization_margin_A_per_m", "mass.active_kg",
               "mass.magnet_kg", "mass.copper_kg", "cost.total")
_CASES = ("cold", "nominal", "hot")
#: The constraint value of a candidate whose parts do not fit or whose chain has no solution.
UNUSABLE = 1.0e3


class SizingCancelled(Exception):
    """The progress callback asked the search to stop."""


def screen_figures(batch: BatchFigures, designs: Sequence[Design]) -> dict[str, np.ndarray]:
    """The batch's screening figures with the ones the objectives derive from them (outer diameter, length).

    Parameters
    ----------
    batch : BatchFigures
        What :func:`core.batch.evaluate_many` returned for ``designs``.
    designs : sequence of Design
        The designs, SI.

    Returns
    -------
    dict of str to ndarray
        Figure name to values, shape (N,), SI.

    References
    ----------
    .. [1] :func:`core.sizing_objectives.derived_figures`.
    """
    outer = np.array([2.0 * float(d.geometry.housing_outer_radius) for d in designs])
    length = np.array([float(d.geometry.overall_length) for d in designs])
    return {**batch.figures, **derived_figures(batch.figures, outer, length)}


def constraint_violation(batch: BatchFigures, designs: Sequence[Design], must_survive: bool) -> np.ndarray:
    """How far each design is from the requirement: 0 when it meets it (core.sizing_requirement), else the
    checks it misses counted (a failed check, or a margin to the knee short of the required) and the shares
    by which the rated speed and the further load points' speeds are missed (the load is what sizing most
    often misses).

    Parameters
    ----------
    batch, designs
        As in :func:`screen_figures`.
    must_survive : bool
        The requirement makes the magnets survive the direct-supply faults
        (:func:`core.sizing_requirement.faults_must_survive`).

    Returns
    -------
    ndarray
        The constraint value per design [1]: 0 feasible, :data:`UNUSABLE` where the chain failed.

    References
    ----------
    .. [1] Deb 2000 (module docstring): infeasible designs ranked by violation.
    """
    failing = np.zeros(batch.size)
    for miss in requirement_misses(batch.status, must_survive).values():
        failing += miss
    required = np.array([d.load_speed for d in designs])
    slowest = np.min(np.stack([batch.figures[f"{c}.rated_speed_rad_per_s"] for c in _CASES]), axis=0)
    with np.errstate(invalid="ignore", divide="ignore"):
        slow_share = np.where(required > 0, np.clip(1.0 - slowest / required, 0.0, 1.0), 0.0)
    further = np.clip(1.0 - np.nan_to_num(batch.figures["load_points.least_speed_share"], nan=1.0), 0.0, 1.0)
    violation = failing + np.nan_to_num(slow_share, nan=1.0) + further
    violation[batch.failed] = UNUSABLE
    violation[meets_requirement(batch, must_survive)] = 0.0
    return np.asarray(violation, dtype=float)


@dataclass
class CandidateStore:
    """Every candidate evaluated: the unit-cube point, the violation and the figures of the feasible."""

    free: tuple[FreeRange, ...]
    objectives: tuple[str, ...]
    points: list[np.ndarray] = field(default_factory=list)
    violations: list[np.ndarray] = field(default_factory=list)
    objective_rows: list[np.ndarray] = field(default_factory=list)
    feasible_points: list[np.ndarray] = field(default_factory=list)
    feasible_figures: list[dict[str, np.ndarray]] = field(default_factory=list)
    closest: list[tuple[np.ndarray, np.ndarray]] = field(default_factory=list)  # (points, violation) of the near

    def evaluate(self, project: Project, unit: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Objective matrix (to minimise) and violation of each point; NaN objectives where unusable.

        Parameters
        ----------
        project : Project
            The requirement and the design the search started from.
        unit : ndarray
            Points of the free box's unit cube, shape (N, free variables) [1].

        Returns
        -------
        objectives : ndarray
            Shape (N, objectives), each to minimise (SI); inf where a point is unusable.
        violation : ndarray
            Shape (N,): :func:`constraint_violation` [1].
        """
        values = from_unit(self.free, unit)
        rows, designs = fitting_designs(project, self.free, values)
        n = unit.shape[0]
        objectives = np.full((n, len(self.objectives)), np.inf)
        violation = np.full(n, UNUSABLE)
        overfull = overfull_slots(designs)
        if overfull.any():  # they fail the slot-fill check whatever the chain gives: not worth its time
            violation[rows[overfull]] = UNUSABLE / 2.0
            rows = rows[~overfull]
            designs = [d for d, skip in zip(designs, overfull, strict=True) if not skip]
        if rows.size:
            batch = evaluate_many(designs)
            figures = screen_figures(batch, designs)
            matrix = objective_matrix(self.objectives, figures)
            usable = np.isfinite(matrix).all(axis=1) & ~batch.failed
            objectives[rows[usable]] = matrix[usable]
            must_survive = faults_must_survive(project)
            violation[rows] = np.where(usable, constraint_violation(batch, designs, must_survive), UNUSABLE)
            feasible = meets_requirement(batch, must_survive) & usable
            if feasible.any():
                self.feasible_points.append(unit[rows[feasible]])
                names = {o.figure for o in OBJECTIVES.values()} | set(KEY_FIGURES)
                self.feasible_figures.append({name: figures[name][feasible] for name in sorted(names)})
        self.points.append(unit)
        self.violations.append(violation)
        self.objective_rows.append(objectives)
        return objectives, violation


def progress_or_cancel(progress, stage: str, done: int, total: int) -> None:
    """Report progress; stop the search when the callback returns False.

    Parameters
    ----------
    progress : callable or None
        ``progress(stage, done, total)``, as :func:`core.sizing.size` takes it.
    stage : str
        "screen", "refine" or "verify".
    done, total : int
        Candidates, generations or designs done, and in all [1].

    Raises
    ------
    SizingCancelled
        When the callback returned False.
    """
    if progress is not None and progress(stage, done, total) is False:
        raise SizingCancelled(f"sizing cancelled during {stage} ({done} of {total})")


def refine(project: Project, spec: SizingSpec, store: CandidateStore, progress) -> None:
    """NSGA-II from the best screened candidates, on the unit cube of the free box.

    Parameters
    ----------
    project : Project
        The requirement and the design the search started from.
    spec : SizingSpec
        Population, generations, objectives and seed.
    store : CandidateStore
        The screened candidates; every refined one is added to it.
    progress : callable or None
        As :func:`progress_or_cancel` takes it.

    References
    ----------
    .. [1] Deb et al. 2002 (NSGA-II), pymoo's NSGA2 (module docstring).
    """
    from pymoo.algorithms.moo.nsga2 import NSGA2
    from pymoo.core.problem import Problem
    from pymoo.optimize import minimize

    dimensions = len(spec.free)
    points = np.concatenate(store.points)
    violation = np.concatenate(store.violations)
    objectives = np.concatenate(store.objective_rows)
    order = np.lexsort((objectives[:, 0], violation))  # feasible first, then by the first objective
    start = points[order[:spec.population]]
    if start.shape[0] < spec.population:  # a tiny screen: fill from the sample's continuation
        extra = sample_unit(dimensions, spec.population - start.shape[0], spec.seed + 1, "lhs")
        start = np.concatenate([start, extra])
    generation = [0]

    class _Sizing(Problem):
        def __init__(self) -> None:
            super().__init__(n_var=dimensions, n_obj=len(spec.objectives), n_ieq_constr=1, xl=0.0, xu=1.0)

        def _evaluate(self, x, out, *args, **kwargs):
            progress_or_cancel(progress, "refine", generation[0], spec.generations)
            f, v = store.evaluate(project, np.asarray(x, dtype=float))
            out["F"] = np.where(np.isfinite(f), f, 1.0e30)
            out["G"] = v[:, None]
            generation[0] += 1

    algorithm = NSGA2(pop_size=spec.population, sampling=start, eliminate_duplicates=True)
    minimize(_Sizing(), algorithm, ("n_gen", spec.generations), seed=spec.seed, verbose=False)
    progress_or_cancel(progress, "refine", spec.generations, spec.generations)


__all__ = ["KEY_FIGURES", "UNUSABLE", "CandidateStore", "SizingCancelled", "constraint_violation",
           "progress_or_cancel", "refine", "screen_figures"]
