"""Size the motor from a requirement: every feasible design found, and the trade-offs between them.

The orchestrator of a sizing search; it holds no formula. The requirement is the project itself (supply,
drive limit, load, temperatures, duty, reversing, envelope, required demagnetization margin); the free
variables (:mod:`core.sizing_space`) span a box. The search runs like an engineer's study, but over
thousands of designs:

1. **screen**: a scrambled Sobol sample of the box (seeded); each candidate's parts must fit by the
   file's own fit rules (:func:`core.fit_rules.check_fit`, the same function a file passes), and the
   fitting ones are evaluated together by :func:`core.batch.evaluate_many`;
2. **refine**: NSGA-II (pymoo) starts from the best screened candidates and moves towards the
   trade-off front of the chosen objectives, on the unit cube of the free box (whole numbers and
   choices by equal-width bins, a rounding repair), its constraint the checks that fail and how far the
   rated load is missed;
3. **verify**: the non-dominated set of every feasible candidate evaluated, and the best design for
   each objective alone, each rebuilt as a validated project (:func:`project_with`) and evaluated by the
   per-design :func:`core.evaluate.evaluate`; only the designs whose every check is not "fail" at
   every temperature are returned.

A check's *warning* (marginal: inside the required demagnetization margin, a slot hard to wind by
machine, a high current density) does not reject a design: warnings are what an engineer weighs, and
each returned design carries its figures so they can be read. A *fail* always rejects.

The same seed gives the same designs: the sample, pymoo's random numbers and every tie-break follow it.

References
----------
.. [1] K. Deb, A. Pratap, S. Agarwal, T. Meyarivan, "A fast and elitist multiobjective genetic
   algorithm: NSGA-II", IEEE Trans. Evol. Comput. 6 (2002) 182-197; pymoo's NSGA2.
.. [2] I. M. Sobol' (1967), through scipy.stats.qmc (see :mod:`core.sizing_space`).
.. [3] K. Deb, "An efficient constraint handling method for genetic algorithms", Comput. Methods Appl.
   Mech. Eng. 186 (2000) 311-338 (feasible beats infeasible, infeasible ranked by violation).
"""

from __future__ import annotations

import dataclasses
import time
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from .batch import (
    CHECK_KEYS,
    FAIL_CODE,
    BatchFigures,
    check_status,
    evaluate_many,
    screening_figures,
    stack_geometries,
)
from .design import Design, design_from_project, geometry_of
from .edits import with_values
from .errors import MagneticCircuitError, ProjectError
from .fit_rules import check_fit
from .schema import Project
from .sizing_objectives import OBJECTIVES, derived_figures, non_dominated, objective_matrix, validate_objectives
from .sizing_shortfall import Shortfall, explain
from .sizing_space import FreeRange, SizingSpec, file_value, from_unit, sample_unit, values_at

#: The keys :func:`core.design.geometry_of` reads: a candidate that differs from another only in these
#: shares its materials, winding and every other input of :class:`core.design.Design` (a test checks
#: that every other key leaves the geometry alone).
GEOMETRY_KEYS = frozenset({
    "motor.poles", "magnets.thickness_mm", "magnets.arc_deg", "magnets.length_mm", "airgap.length_mm",
    "housing.wall_mm", "housing.length_mm", "armature.outer_diameter_mm", "armature.stack_length_mm",
    "armature.stacking_factor", "armature.slots", "armature.slot_opening_mm", "armature.tooth_width_mm",
    "armature.slot_depth_mm", "armature.shaft_diameter_mm",
})
#: Candidates are screened in chunks of this many (memory stays bounded; progress and cancel between).
SCREEN_CHUNK = 2000
#: At most this many designs of the front are verified and returned (evenly spread along the first
#: objective), besides the best design for each objective alone.
MAX_FRONT_DESIGNS = 40
#: The figures every feasible candidate keeps for the plots (besides the objectives' own).
KEY_FIGURES = ("nominal.no_load_speed_rad_per_s", "nominal.stall_torque_N_m", "constants.ke_V_s_per_rad",
               "nominal.rated_efficiency", "worst_demagnetization_margin_A_per_m", "mass.active_kg",
               "mass.magnet_kg", "mass.copper_kg", "cost.total")
_CASES = ("cold", "nominal", "hot")
#: The constraint value of a candidate whose parts do not fit or whose chain has no solution.
_UNUSABLE = 1.0e3


@dataclass(frozen=True)
class SizedDesign:
    """One returned design: its free values, the validated project, its figures and objectives."""

    values: dict[str, float | int | str]  #: free key to value in file units
    project: Project  #: the whole validated project of this design
    figures: dict[str, float]  #: screening figures of ``evaluate`` (SI, unit-suffixed) and the derived ones
    objectives: dict[str, float]  #: objective name to value (SI, natural sign)
    pareto: bool  #: on the non-dominated set of the chosen objectives
    best_for: tuple[str, ...]  #: the objectives it is the best design for


@dataclass(frozen=True)
class SizingResult:
    """What a search found: the designs, and every feasible candidate for the plots."""

    spec: SizingSpec
    designs: tuple[SizedDesign, ...]  #: front and best per objective, each verified by ``evaluate``
    candidates_evaluated: int  #: candidates screened and refined, fitting or not [1]
    feasible_count: int  #: candidates that fit and passed every check of the screen [1]
    seconds: float  #: wall time of the whole search [s]
    seed: int
    feasible_values: dict[str, np.ndarray] = field(default_factory=dict)  #: free key to every feasible value
    feasible_figures: dict[str, np.ndarray] = field(default_factory=dict)  #: objective and key figures
    shortfalls: tuple[Shortfall, ...] = ()  #: empty when designs exist
    explanation: str = ""  #: "" when designs exist; else the paragraph in words


class SizingCancelled(Exception):
    """The progress callback asked the search to stop."""


# ----------------------------------------------------------------------------------------------
# Candidates as projects and designs


def _changed(project: Project, values: Mapping[str, object]) -> Project:
    """``project`` with the keys changed, without validation (the values are inside the schema's limits:
    :func:`core.sizing_space.parse_free` checked the ranges); the fit rules are applied by the caller."""
    sections: dict[str, dict[str, object]] = {}
    for key, value in values.items():
        section, name = key.split(".")
        sections.setdefault(section, {})[name] = value
    update = {}
    for section, changes in sections.items():
        if section == "magnets" and "grade" in changes:
            changes = {**changes, "custom_grade": None}
        update[section] = getattr(project, section).model_copy(update=changes)
    return project.model_copy(update=update)


def project_with(project: Project, values: Mapping[str, object]) -> Project:
    """A candidate as a whole project, validated like a file (schema and fit rules).

    Parameters
    ----------
    project : Project
        The requirement and the design the search started from.
    values : mapping of str to object
        Free key to value in the key's file unit.

    Returns
    -------
    Project
        Validated.

    Raises
    ------
    ProjectError
        Naming the key and the limit, when the candidate is not a valid design.

    References
    ----------
    .. [1] :func:`core.edits.with_values`.
    """
    changes: dict[str, Any] = dict(values)
    if "magnets.grade" in changes and project.magnets.custom_grade is not None:
        changes["magnets.custom_grade"] = None
    return with_values(project, changes)


def _fitting_designs(project: Project, free: Sequence[FreeRange], values: Mapping[str, np.ndarray]
                     ) -> tuple[np.ndarray, list[Design]]:
    """The candidates whose parts fit (by :func:`check_fit`), and their designs.

    Candidates that share every non-geometric value share one :func:`design_from_project` (the
    materials, the wire, the winding); the others take its design with their own project and
    :func:`geometry_of`, which is all that the geometric keys change.
    """
    count = len(next(iter(values.values()))) if values else 0
    shared_keys = [v.key for v in free if v.key not in GEOMETRY_KEYS]
    resolved: dict[tuple, Design | None] = {}
    fits: list[int] = []
    designs: list[Design] = []
    for i in range(count):
        changes = values_at(free, values, i)
        candidate = _changed(project, changes)
        try:
            check_fit(candidate)
        except ProjectError:
            continue
        shared = tuple(changes[k] for k in shared_keys)
        if shared not in resolved:
            try:
                resolved[shared] = design_from_project(candidate)
            except ProjectError:
                resolved[shared] = None
            base = resolved[shared]
            if base is None:
                continue
            fits.append(i)
            designs.append(base)
            continue
        base = resolved[shared]
        if base is None:
            continue
        fits.append(i)
        designs.append(dataclasses.replace(base, project=candidate, geometry=geometry_of(candidate)))
    return np.array(fits, dtype=int), designs


# ----------------------------------------------------------------------------------------------
# Screening: figures, feasibility and the constraint


def _screen_figures(batch: BatchFigures, designs: Sequence[Design]) -> dict[str, np.ndarray]:
    outer = np.array([2.0 * float(d.geometry.housing_outer_radius) for d in designs])
    length = np.array([float(d.geometry.overall_length) for d in designs])
    return {**batch.figures, **derived_figures(batch.figures, outer, length)}


def _violation(batch: BatchFigures, designs: Sequence[Design]) -> np.ndarray:
    """How far each design is from passing: 0 when no check fails, else the failing checks counted and
    the shares by which the rated speed and the further load points' speeds are missed (the load is what
    sizing most often misses)."""
    failing = np.zeros(batch.size)
    for key in CHECK_KEYS:
        failing += batch.status[key] == FAIL_CODE
    required = np.array([d.load_speed for d in designs])
    slowest = np.min(np.stack([batch.figures[f"{c}.rated_speed_rad_per_s"] for c in _CASES]), axis=0)
    with np.errstate(invalid="ignore", divide="ignore"):
        slow_share = np.where(required > 0, np.clip(1.0 - slowest / required, 0.0, 1.0), 0.0)
    further = np.clip(1.0 - np.nan_to_num(batch.figures["load_points.least_speed_share"], nan=1.0), 0.0, 1.0)
    violation = failing + np.nan_to_num(slow_share, nan=1.0) + further
    violation[batch.failed] = _UNUSABLE
    violation[batch.passes_all] = 0.0
    return np.asarray(violation, dtype=float)


@dataclass
class _Store:
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
        """Objective matrix (to minimise) and violation of each point; NaN objectives where unusable."""
        values = from_unit(self.free, unit)
        rows, designs = _fitting_designs(project, self.free, values)
        n = unit.shape[0]
        objectives = np.full((n, len(self.objectives)), np.inf)
        violation = np.full(n, _UNUSABLE)
        overfull = _overfull(designs)
        if overfull.any():  # they fail the slot-fill check whatever the chain gives: not worth its time
            violation[rows[overfull]] = _UNUSABLE / 2.0
            rows = rows[~overfull]
            designs = [d for d, skip in zip(designs, overfull, strict=True) if not skip]
        if rows.size:
            batch = evaluate_many(designs)
            figures = _screen_figures(batch, designs)
            matrix = objective_matrix(self.objectives, figures)
            usable = np.isfinite(matrix).all(axis=1) & ~batch.failed
            objectives[rows[usable]] = matrix[usable]
            violation[rows] = np.where(usable, _violation(batch, designs), _UNUSABLE)
            feasible = batch.passes_all & usable
            if feasible.any():
                self.feasible_points.append(unit[rows[feasible]])
                names = {o.figure for o in OBJECTIVES.values()} | set(KEY_FIGURES)
                self.feasible_figures.append({name: figures[name][feasible] for name in sorted(names)})
        self.points.append(unit)
        self.violations.append(violation)
        self.objective_rows.append(objectives)
        return objectives, violation


def _overfull(designs: Sequence[Design]) -> np.ndarray:
    """The designs whose enamelled wire does not fit in the slot: the slot-fill check's fail, by the same
    functions :func:`core.batch.evaluate_many` calls, before the costly magnetic solution."""
    from .checks import SLOT_FILL_GROSS_FAIL
    from .winding import slot_fill, total_conductors

    if not designs:
        return np.zeros(0, dtype=bool)
    geometry = stack_geometries([d.geometry for d in designs])
    conductors = total_conductors(np.array([d.winding.commutator_segments for d in designs]),
                                  np.array([d.winding.turns_per_coil for d in designs]))
    fill = slot_fill(conductors, geometry.slots, np.array([d.winding.wire.overall_diameter for d in designs]),
                     np.asarray(geometry.slot_area))
    return np.asarray(fill > SLOT_FILL_GROSS_FAIL, dtype=bool)


def _progress_or_cancel(progress, stage: str, done: int, total: int) -> None:
    if progress is not None and progress(stage, done, total) is False:
        raise SizingCancelled(f"sizing cancelled during {stage} ({done} of {total})")


def _refine(project: Project, spec: SizingSpec, store: _Store, progress) -> None:
    """NSGA-II from the best screened candidates, on the unit cube of the free box."""
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
            _progress_or_cancel(progress, "refine", generation[0], spec.generations)
            f, v = store.evaluate(project, np.asarray(x, dtype=float))
            out["F"] = np.where(np.isfinite(f), f, 1.0e30)
            out["G"] = v[:, None]
            generation[0] += 1

    algorithm = NSGA2(pop_size=spec.population, sampling=start, eliminate_duplicates=True)
    minimize(_Sizing(), algorithm, ("n_gen", spec.generations), seed=spec.seed, verbose=False)
    _progress_or_cancel(progress, "refine", spec.generations, spec.generations)


# ----------------------------------------------------------------------------------------------
# Verification


def _verified(project: Project, values: dict[str, float | int | str], objectives: tuple[str, ...]
              ) -> tuple[Project, dict[str, float], dict[str, float]] | None:
    """The candidate rebuilt as a validated project and evaluated alone; None unless every check passes
    or warns (no check fails) and its chain solves."""
    from .evaluate import evaluate

    try:
        design_project = project_with(project, values)
        results = evaluate(design_project)
    except (ProjectError, MagneticCircuitError):
        return None
    if any(code == FAIL_CODE for code in check_status(results).values()):
        return None
    figures = screening_figures(results)
    g = results.geometry
    derived = derived_figures({k: np.array([v]) for k, v in figures.items()},
                              np.array([g.housing_outer_diameter_m]),
                              np.array([float(geometry_of(design_project).overall_length)]))
    figures.update({k: float(v[0]) for k, v in derived.items()})
    return design_project, figures, {name: figures[OBJECTIVES[name].figure] for name in objectives}


def _spread_along(indices: np.ndarray, key: np.ndarray, limit: int) -> np.ndarray:
    """At most ``limit`` of ``indices``, evenly spread along ``key`` (its ends kept)."""
    if indices.size <= limit:
        return indices
    ordered = indices[np.argsort(key[indices], kind="stable")]
    return np.asarray(ordered[np.unique(np.linspace(0, ordered.size - 1, limit).round().astype(int))])


def size(project: Project, spec: SizingSpec,
         progress: Callable[[str, int, int], bool] | None = None) -> SizingResult:
    """Search the free box for every design that meets the project's requirement, and the trade-offs.

    Parameters
    ----------
    project : Project
        The requirement (supply, drive limit, load, temperatures, duty, envelope, required margin) and
        the design's fixed values; the free keys' values in it are ignored.
    spec : SizingSpec
        Free variables, objectives, sample size, seed and refinement effort.
    progress : callable, optional
        ``progress(stage, done, total)`` with stage ``"screen"`` (candidates), ``"refine"``
        (generations) or ``"verify"`` (designs); return False to cancel.

    Returns
    -------
    SizingResult
        The designs (the non-dominated set of the chosen objectives over every feasible candidate
        evaluated, at most :data:`MAX_FRONT_DESIGNS` of it spread along the first objective, and the best
        design for each objective alone), each rebuilt as a validated project and evaluated by
        :func:`core.evaluate.evaluate` with no check failing at any temperature (warnings are allowed:
        module docstring); every feasible candidate's values and figures; with no design, the
        shortfalls and the explanation.

    Raises
    ------
    SizingCancelled
        When ``progress`` returned False.
    ValueError
        For no free variable, an unknown objective, or fewer than 2 candidates.

    References
    ----------
    .. [1] module docstring.
    """
    started = time.perf_counter()
    validate_objectives(spec.objectives)
    if not spec.free:
        raise ValueError("free: give at least one free variable")
    if len({v.key for v in spec.free}) != len(spec.free):
        raise ValueError("free: each key once")
    if spec.candidates < 2:
        raise ValueError("candidates: at least 2")
    store = _Store(tuple(spec.free), tuple(spec.objectives))
    unit = sample_unit(len(spec.free), spec.candidates, spec.seed, "sobol")
    for begin in range(0, spec.candidates, SCREEN_CHUNK):
        _progress_or_cancel(progress, "screen", begin, spec.candidates)
        store.evaluate(project, unit[begin:begin + SCREEN_CHUNK])
    _progress_or_cancel(progress, "screen", spec.candidates, spec.candidates)
    if spec.generations > 0:
        _refine(project, spec, store, progress)
    evaluated = int(sum(p.shape[0] for p in store.points))

    # every feasible candidate, each once
    if store.feasible_points:
        points = np.concatenate(store.feasible_points)
        figures = {k: np.concatenate([f[k] for f in store.feasible_figures]) for k in store.feasible_figures[0]}
        values = from_unit(spec.free, points)
        keys = np.array([repr(values_at(spec.free, values, i)) for i in range(points.shape[0])])
        _, first = np.unique(keys, return_index=True)
        first = np.sort(first)
        points = points[first]
        figures = {k: v[first] for k, v in figures.items()}
        values = {k: v[first] for k, v in values.items()}
    else:
        points, figures, values = np.zeros((0, len(spec.free))), {}, {v.key: np.array([]) for v in spec.free}
    feasible_count = points.shape[0]

    designs: list[SizedDesign] = []
    if feasible_count:
        matrix = objective_matrix(spec.objectives, figures)
        front = np.flatnonzero(non_dominated(matrix))
        chosen = _spread_along(front, matrix[:, 0], MAX_FRONT_DESIGNS)
        best = {name: np.argsort(matrix[:, column], kind="stable") for column, name in enumerate(spec.objectives)}
        candidates = list(dict.fromkeys([*chosen.tolist(), *(int(order[0]) for order in best.values())]))
        verified: dict[int, tuple[Project, dict[str, float], dict[str, float]]] = {}
        for done, index in enumerate(candidates):
            _progress_or_cancel(progress, "verify", done, len(candidates))
            found = _verified(project, values_at(spec.free, values, index), spec.objectives)
            if found is not None:
                verified[index] = found
        # an objective's best that failed verification: the next best that passes
        best_for: dict[int, list[str]] = {}
        for name, order in best.items():
            for index in order[:20].tolist():
                if index not in verified:
                    found = _verified(project, values_at(spec.free, values, index), spec.objectives)
                    if found is None:
                        continue
                    verified[index] = found
                best_for.setdefault(index, []).append(name)
                break
        _progress_or_cancel(progress, "verify", len(candidates), len(candidates))
        front_set = set(front.tolist())
        for index, (design_project, design_figures, design_objectives) in verified.items():
            if index not in front_set and index not in best_for:
                continue
            designs.append(SizedDesign(values=values_at(spec.free, values, index), project=design_project,
                                       figures=design_figures, objectives=design_objectives,
                                       pareto=index in front_set, best_for=tuple(best_for.get(index, ()))))
        designs.sort(key=lambda d: tuple(-d.objectives[n] if OBJECTIVES[n].maximise else d.objectives[n]
                                         for n in spec.objectives))

    shortfalls: tuple[Shortfall, ...] = ()
    explanation = ""
    if not designs:
        shortfalls, explanation = _explain_closest(project, spec, store)
    return SizingResult(spec=spec, designs=tuple(designs), candidates_evaluated=evaluated,
                        feasible_count=int(feasible_count), seconds=time.perf_counter() - started, seed=spec.seed,
                        feasible_values=values, feasible_figures=figures, shortfalls=shortfalls,
                        explanation=explanation)


_CLOSEST_EXPLAINED = 300  #: the closest candidates whose figures the explanation reads


def _explain_closest(project: Project, spec: SizingSpec, store: _Store) -> tuple[tuple[Shortfall, ...], str]:
    points = np.concatenate(store.points)
    violation = np.concatenate(store.violations)
    usable = np.flatnonzero(violation < _UNUSABLE)
    order = usable[np.argsort(violation[usable], kind="stable")][:_CLOSEST_EXPLAINED]
    values = from_unit(spec.free, points[order])
    rows, designs = _fitting_designs(project, spec.free, values)
    batch = evaluate_many(designs) if designs else evaluate_many([])
    kept = {k: v[rows] for k, v in values.items()}
    return explain(project, batch, kept, spec)


__all__ = ["GEOMETRY_KEYS", "FreeRange", "Shortfall", "SizedDesign", "SizingCancelled", "SizingResult",
           "SizingSpec", "file_value", "project_with", "size"]
