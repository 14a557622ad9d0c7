"""Design B re-fitted to one of design A's figures.

A re-fit changes one of B's inputs until B meets A's figure:

    ke             same Ke (= Kt)           by B's magnets.thickness_mm
    no-load-speed  same no-load speed       by B's winding.turns_per_coil (whole turns)
    stall-torque   same stall torque        by B's armature.stack_length_mm (magnets and housing follow)

all in the nominal case. Each re-fit is a bracketed root solve (core.solvers.find_root) over the
input's schema limits, narrowed to what the rest of the design allows: a value the project validator
refuses (the envelope, a part that no longer fits) or that the chain cannot evaluate closes the bracket
there, and the result says which limit it met. A target outside the bracket is reported, not forced:
the result then holds B at the nearest limit and a sentence saying what B would need.

Usage::

    from pmdc_sizer.core import difference, evaluate, project, refit
    a = project.load("demo_projects/appliance_ferrite_12v.toml")
    b = difference.with_grade(a, "N42")
    fit = refit.refit("ke", evaluate(a), b)
    fit.value_after, fit.reached, fit.range_limits

SI throughout, like the results; the parameter values are in the project file's units (mm, turns).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from .checks import FAIL, SLOT_FILL_GROSS_FAIL
from .edits import get_value, with_values
from .errors import MagneticCircuitError, ProjectError
from .evaluate import evaluate
from .keys import key_spec
from .results import Results
from .schema import Project
from .solvers import find_root


@dataclass(frozen=True)
class RefitTarget:
    """One of A's figures that B can be re-fitted to, and the input of B that moves it."""

    name: str  #: "ke", "no-load-speed" or "stall-torque"
    figure_key: str  #: where the figure is in the results
    parameter: str  #: the project key that changes
    integer: bool = False  #: the parameter takes whole numbers (turns)


TARGETS: dict[str, RefitTarget] = {
    target.name: target for target in (
        RefitTarget("ke", "constants.ke_V_s_per_rad", "magnets.thickness_mm"),
        RefitTarget("no-load-speed", "nominal.no_load_speed_rad_per_s", "winding.turns_per_coil", integer=True),
        RefitTarget("stall-torque", "nominal.stall_torque_N_m", "armature.stack_length_mm"),
    )
}


@dataclass(frozen=True)
class ParameterChange:
    """One input of B that a re-fit changed."""

    key: str  #: project key
    before: float  #: in the project file's unit
    after: float  #: in the project file's unit
    reason: str = ""  #: why it changed, when it follows the parameter ("" for the parameter itself)


@dataclass(frozen=True)
class Refit:
    """B re-fitted to one of A's figures (or brought as close as its limits allow).

    The figures are SI; the app words them (``app/refit_text.py``) with the titles and units it shows.
    """

    target: str  #: key of :data:`TARGETS`
    target_value: float  #: A's figure [SI]
    figure_before: float  #: B's figure before the re-fit [SI]
    figure_after: float  #: B's figure after it [SI]
    target_error_fraction: float  #: (after − target)/target
    parameter: str  #: project key that changed
    parameter_unit: str  #: "mm" or "" for turns
    value_before: float  #: in the file's unit
    value_after: float  #: in the file's unit
    search_range: tuple[float, float]  #: the bracket searched, after narrowing to what fits
    range_limits: tuple[str, str]  #: what sets each end of the bracket
    reached: bool  #: the target lies inside the bracket (for whole turns: the nearest whole number was taken)
    limit_side: str  #: "" when reached; else "upper" or "lower": the end of the bracket B stops at
    changes: tuple[ParameterChange, ...]  #: every key that changed, the parameter first
    new_failures: tuple[str, ...]  #: checks that fail after the re-fit but did not before
    magnet_mass_difference_kg: float  #: B after − A
    magnet_cost_difference: float  #: B after − A, in ``currency``
    material_cost_difference: float  #: B after − A, all materials
    currency: str  #: B's currency
    currency_a: str  #: A's currency (the cost differences mean nothing when the two differ)
    evaluations: int  #: chain evaluations the re-fit took
    project: Project = field(repr=False, compare=False)  #: B after the re-fit
    results: Results = field(repr=False, compare=False)  #: B's results after the re-fit
    solver_converged: bool = True  #: the root solve met its tolerance (always True for whole turns)
    solver_iterations: int = 0  #: iterations of the root solve
    alternative_value: float | None = None  #: whole turns: the other neighbour of the target, in turns
    alternative_error_fraction: float | None = None  #: its (figure − target)/target
    overhang_mm: float | None = None  #: stack re-fit: the magnets' overhang kept at each end [mm]
    end_room_mm: float | None = None  #: stack re-fit: the housing's length kept beyond the magnets [mm]



class _Unusable(Exception):
    """A parameter value that the project validator refuses or the chain cannot evaluate."""


def _lookup(results: Results, key: str) -> float:
    node: Any = results
    for part in key.split("."):
        node = getattr(node, part)
    return float(node)


class _Trial:
    """B with the parameter at a value: validated and evaluated once, then remembered."""

    def __init__(self, project_b: Project, target: RefitTarget, results_b: Results):
        self.project_b = project_b
        self.target = target
        self.cache: dict[float, tuple[Project, Results]] = {}
        self.evaluations = 0
        if target.name == "stall-torque":
            # The axial build stays as it is apart from the stack: the magnets keep their overhang and
            # the housing its room for commutator, brushes and bearings.
            self.overhang_mm = project_b.magnets.length_mm - project_b.armature.stack_length_mm
            self.end_room_mm = project_b.housing.length_mm - project_b.magnets.length_mm

    def changes(self, value: float) -> dict[str, Any]:
        if self.target.integer:
            return {self.target.parameter: int(value)}
        value = float(value)
        if self.target.name == "stall-torque":
            magnet = value + self.overhang_mm
            return {"armature.stack_length_mm": value, "magnets.length_mm": magnet,
                    "housing.length_mm": magnet + self.end_room_mm}
        return {self.target.parameter: value}

    def project(self, value: float) -> Project:
        try:
            return with_values(self.project_b, self.changes(value))
        except ProjectError as error:
            raise _Unusable(str(error)) from None

    def results(self, value: float) -> tuple[Project, Results]:
        value = float(value)
        if value not in self.cache:
            design = self.project(value)
            self.evaluations += 1
            try:
                self.cache[value] = (design, evaluate(design, curve_points=40))
            except (MagneticCircuitError, ProjectError) as error:
                raise _Unusable(str(error)) from None
        return self.cache[value]

    def figure(self, value: float) -> float:
        return _lookup(self.results(value)[1], self.target.figure_key)


def _usable_end(usable: Callable[[float], bool], inside: float, outside: float,
                integer: bool) -> tuple[float, float]:
    """The last usable value from ``inside`` (usable) toward ``outside`` (not), by bisection, and the
    first unusable one found beyond it."""
    span = abs(outside - inside)
    while abs(outside - inside) > (1 if integer else 1e-5 * span):
        middle = (inside + outside) // 2 if integer else 0.5 * (inside + outside)
        if middle in (inside, outside):
            break
        if usable(middle):
            inside = middle
        else:
            outside = middle
    return inside, outside


def _bracket_end(trial: _Trial, start: float, limit: float, schema_reason: str) -> tuple[float, str]:
    """The end of the searchable range on one side of B's value, and what sets it."""
    integer = trial.target.integer

    def first_problem(check: Callable[[float], Any], value: float) -> str:
        try:
            check(value)
            return ""
        except _Unusable as error:
            return str(error)

    problem = first_problem(trial.project, limit)
    end = limit
    reason = schema_reason
    if problem:
        end, outside = _usable_end(lambda v: not first_problem(trial.project, v), start, limit, integer)
        if not integer:
            # Step out to the next tenth of a millimetre, so the validator's message shows a clear excess
            # ("72.2 mm across, over the envelope of 72 mm") rather than rounding noise.
            outside = math.floor(outside * 10 + 1) / 10 if limit > start else math.ceil(outside * 10 - 1) / 10
        reason = first_problem(trial.project, outside) or problem
    problem = first_problem(trial.results, end)
    if problem:
        end, outside = _usable_end(lambda v: not first_problem(trial.results, v), start, end, integer)
        reason = f"beyond it the chain cannot evaluate B: {first_problem(trial.results, outside) or problem}"
    return end, reason


def _new_failures(before: Results, after: Results) -> tuple[str, ...]:
    failed_before = {c.key for c in before.checks if c.status == FAIL}
    return tuple(c.sentence for c in after.checks if c.status == FAIL and c.key not in failed_before)


def refit(target_name: str, results_a: Results, project_b: Project, results_b: Results | None = None) -> Refit:
    """Change B's input named by ``target_name`` (a key of :data:`TARGETS`) until B meets A's figure.

    Never raises for a target out of reach: the result's ``reached`` is False, B is left at the
    nearest limit (``limit_side``), and ``range_limits`` say what sets each end of the bracket.

    Parameters
    ----------
    target_name : str
        ``"ke"``, ``"no-load-speed"`` or ``"stall-torque"``.
    results_a : Results
        A's evaluation, which holds the figure to meet (SI).
    project_b : Project
        The design to re-fit.
    results_b : Results or None, optional
        B's evaluation, when the caller has it already.

    Returns
    -------
    Refit
        B after the re-fit, its figure before and after (SI), the parameter before and after (in the
        file's unit), the bracket searched and what limits it, and the mass and cost differences to A.

    Raises
    ------
    ValueError
        When ``target_name`` is not a key of :data:`TARGETS`.

    References
    ----------
    .. [1] bracketed root solve: :func:`solvers.find_root`; whole turns by bisection on the integers,
       opened at the estimate that the no-load speed falls as 1/turns (E = K·Φ·ω).
    """
    if target_name not in TARGETS:
        raise ValueError(f"re-fit target {target_name!r}: choose one of {', '.join(TARGETS)}")
    target = TARGETS[target_name]
    results_b = evaluate(project_b) if results_b is None else results_b
    trial = _Trial(project_b, target, results_b)
    spec = key_spec(target.parameter)
    unit = spec.unit
    start = get_value(project_b, target.parameter)
    trial.cache[float(start)] = (project_b, results_b)
    goal = _lookup(results_a, target.figure_key)

    low_reason = f"the lower limit of {target.parameter} in the project schema"
    high_reason = f"the upper limit of {target.parameter} in the project schema"
    high_limit = spec.maximum
    if target.integer:
        # More turns of the same wire must still fit the slot: the gross fill grows with the turns.
        fill = results_b.winding.slot_fill_gross
        fitting = math.floor(start * SLOT_FILL_GROSS_FAIL / fill) if fill > 0 else spec.maximum
        if fitting < high_limit:
            high_limit = max(fitting, spec.minimum)
            high_reason = (f"more turns of {results_b.winding.wire} would not fit the slot: the gross fill "
                           f"would pass {100 * SLOT_FILL_GROSS_FAIL:.0f} %")
    low, low_reason = _bracket_end(trial, start, spec.minimum, low_reason)
    high, high_reason = _bracket_end(trial, start, high_limit, high_reason)

    figure_low, figure_high = trial.figure(low), trial.figure(high)
    rising = figure_high >= figure_low
    reached = min(figure_low, figure_high) <= goal <= max(figure_low, figure_high)
    limit_side = ""
    converged, iterations = True, 0
    alternative: tuple[float | None, float | None] = (None, None)
    if not reached:
        wants_more = goal > max(figure_low, figure_high)
        at_high = wants_more == rising
        value = high if at_high else low
        limit_side = "upper" if at_high else "lower"
    elif target.integer:
        value, alternative = _whole_turns(trial, low, high, goal)
    else:
        solution = find_root(lambda x: np.vectorize(trial.figure)(x) - goal, low, high,
                             xtol=1e-6 * (high - low), rtol=1e-9, max_iterations=40)
        value = float(solution.root)
        converged, iterations = bool(solution.converged), int(solution.iterations)

    design, _ = trial.results(value)
    final = evaluate(design)
    after = _lookup(final, target.figure_key)
    error = (after - goal) / goal
    changes = []
    for key, new in trial.changes(value).items():
        old = get_value(project_b, key)
        if new != old:
            why = "" if key == target.parameter else "follows the stack, keeping B's overhang and end room"
            changes.append(ParameterChange(key, old, new, why))
    follows_stack = target.name == "stall-torque" and len(changes) > 1
    return Refit(
        target=target.name,
        target_value=goal, figure_before=_lookup(results_b, target.figure_key), figure_after=after,
        target_error_fraction=error, parameter=target.parameter, parameter_unit=unit,
        value_before=start, value_after=value, search_range=(low, high), range_limits=(low_reason, high_reason),
        reached=reached, limit_side=limit_side, changes=tuple(changes),
        new_failures=_new_failures(results_b, final),
        magnet_mass_difference_kg=final.mass.magnet_kg - results_a.mass.magnet_kg,
        magnet_cost_difference=final.cost.magnet - results_a.cost.magnet,
        material_cost_difference=final.cost.total - results_a.cost.total,
        currency=final.cost.currency, currency_a=results_a.cost.currency, evaluations=trial.evaluations + 1,
        project=design, results=final, solver_converged=converged, solver_iterations=iterations,
        alternative_value=alternative[0], alternative_error_fraction=alternative[1],
        overhang_mm=trial.overhang_mm if follows_stack else None,
        end_room_mm=trial.end_room_mm if follows_stack else None,
    )


def _whole_turns(trial: _Trial, low: float, high: float, goal: float) -> tuple[float, tuple[float, float]]:
    """The whole number of turns whose figure is closest to ``goal`` (which lies between the ends), and the
    other neighbour with its error."""
    start = get_value(trial.project_b, trial.target.parameter)
    figure_start = trial.figure(start)

    def below(n):  # True where the figure is on the low side of the goal
        return trial.figure(n) < goal

    # Bisection on whole numbers, opened at the estimate that the speed falls as 1/turns (E = Ke·ω).
    a, b = low, high
    guess = round(start * figure_start / goal)
    lower_side = below(a)
    for candidate in (guess, guess + 1, guess - 1):
        if a < candidate < b:
            if below(candidate) == lower_side:
                a = candidate
            else:
                b = candidate
    while b - a > 1:
        middle = (a + b) // 2
        if below(middle) == lower_side:
            a = middle
        else:
            b = middle
    errors = {n: (trial.figure(n) - goal) / goal for n in (a, b)}
    best = min(errors, key=lambda n: abs(errors[n]))
    other = b if best == a else a
    return best, (other, errors[other])
