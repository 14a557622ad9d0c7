"""Size the motor from a requirement: every feasible design found, and the trade-offs between them.

The orchestrator of a sizing search; it holds no formula. The requirement is the project itself (supply,
drive limit, load, temperatures, duty, reversing, envelope, required demagnetization margin); the free
variables (:mod:`core.sizing_space`) span a box. The search runs like an engineer's study, but over
thousands of designs:

1. **screen**: a scrambled Sobol sample of the box (seeded); each candidate's parts must fit by the
   file's own fit rules (:func:`core.fit_rules.check_fit`, the same function a file passes), and the
   fitting ones are evaluated together by :func:`core.batch.evaluate_many`; with the slots free and the
   commutator segments not, the segments keep the file's segments per slot
   (:func:`core.sizing_candidates.tied_values`), so that the fit rule's whole multiple holds;
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

The candidates are built in :mod:`core.sizing_candidates`, screened and refined in :mod:`core.sizing_screen`.

References
----------
.. [1] K. Deb, A. Pratap, S. Agarwal, T. Meyarivan, "A fast and elitist multiobjective genetic
   algorithm: NSGA-II", IEEE Trans. Evol. Comput. 6 (2002) 182-197; pymoo's NSGA2.
.. [2] I. M. Sobol' (1967), through scipy.stats.qmc (see :mod:`core.sizing_space`).
.. [3] K. Deb, "An efficient constraint handling method for genetic algorithms", Comput. Methods Appl.
   Mech. Eng. 186 (2000) 311-338 (feasible beats infeasible, infeasible ranked by violation).
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from .batch import evaluate_many, screening_figures
from .design import geometry_of
from .errors import MagneticCircuitError, ProjectError
from .schema import Project
from .sizing_candidates import GEOMETRY_KEYS, fitting_designs, project_with, tied_values
from .sizing_objectives import OBJECTIVES, derived_figures, non_dominated, objective_matrix, validate_objectives
from .sizing_requirement import faults_must_survive, missed_checks
from .sizing_screen import UNUSABLE, CandidateStore, SizingCancelled, progress_or_cancel, refine
from .sizing_shortfall import Shortfall, explain
from .sizing_space import FreeRange, SizingSpec, file_value, from_unit, sample_unit, values_at

#: Candidates are screened in chunks of this many: memory stays bounded, and progress is reported and a
#: cancel heard between chunks. The batch chain's cost per design hardly depends on the chunk above a few
#: hundred (ferrite demo, 2026-12-04: 21.6 ms a design at 250, 19.2 at 500, 18.3 at 1000), so a chunk
#: is a few seconds of work, not the half minute that 2000 took.
SCREEN_CHUNK = 500
#: At most this many designs of the front are verified and returned (evenly spread along the first
#: objective), besides the best design for each objective alone.
MAX_FRONT_DESIGNS = 40


@dataclass(frozen=True)
class SizedDesign:
    """One returned design: its free values, the validated project, its figures and objectives."""

    values: dict[str, float | int | str]  #: free key to value in file units, and the keys that follow them
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


# ----------------------------------------------------------------------------------------------
# Verification


def _verified(project: Project, values: dict[str, float | int | str], objectives: tuple[str, ...]
              ) -> tuple[Project, dict[str, float], dict[str, float]] | None:
    """The candidate rebuilt as a validated project and evaluated alone; None unless it meets the
    requirement (no check fails and every margin to the knee is kept: core.sizing_requirement) and its chain
    solves."""
    from .evaluate import evaluate

    try:
        design_project = project_with(project, values)
        results = evaluate(design_project)
    except (ProjectError, MagneticCircuitError):
        return None
    if missed_checks(results, faults_must_survive(design_project)):
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
    store = CandidateStore(tuple(spec.free), tuple(spec.objectives))
    unit = sample_unit(len(spec.free), spec.candidates, spec.seed, "sobol")
    for begin in range(0, spec.candidates, SCREEN_CHUNK):
        progress_or_cancel(progress, "screen", begin, spec.candidates)
        store.evaluate(project, unit[begin:begin + SCREEN_CHUNK])
    progress_or_cancel(progress, "screen", spec.candidates, spec.candidates)
    if spec.generations > 0:
        refine(project, spec, store, progress)
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
            progress_or_cancel(progress, "verify", done, len(candidates))
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
        progress_or_cancel(progress, "verify", len(candidates), len(candidates))
        front_set = set(front.tolist())
        for index, (design_project, design_figures, design_objectives) in verified.items():
            if index not in front_set and index not in best_for:
                continue
            found_values = tied_values(project, values_at(spec.free, values, index))
            designs.append(SizedDesign(values=found_values, project=design_project,
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


def _explain_closest(project: Project, spec: SizingSpec, store: CandidateStore) -> tuple[tuple[Shortfall, ...], str]:
    points = np.concatenate(store.points)
    violation = np.concatenate(store.violations)
    usable = np.flatnonzero(violation < UNUSABLE)
    order = usable[np.argsort(violation[usable], kind="stable")][:_CLOSEST_EXPLAINED]
    values = from_unit(spec.free, points[order])
    rows, designs = fitting_designs(project, spec.free, values)
    batch = evaluate_many(designs) if designs else evaluate_many([])
    kept = {k: v[rows] for k, v in values.items()}
    return explain(project, batch, kept, spec, evaluated=int(points.shape[0]))


__all__ = ["GEOMETRY_KEYS", "FreeRange", "Shortfall", "SizedDesign", "SizingCancelled", "SizingResult",
           "SizingSpec", "file_value", "project_with", "size"]
