"""Why a sizing search found no feasible design, in words, with a relaxation that was evaluated.

When no candidate of a search passes every check, :func:`explain` picks the *closest* candidate (the
fewest failed checks; among those, the smallest miss of the rated load), evaluates it in full to say
which checks it fails and by how much, names the free variables it presses against the end of their
ranges (the limits that bind), and then re-evaluates that same design with the requirement relaxed (a
higher supply voltage, a lower rated torque) through the batch chain (:func:`core.sweep.figure_sweep`)
to report the least relaxation found, in the grid tried, at which it passes every check. Nothing in the
sentence is estimated: every number is one the chain computed. The relaxed and widened re-evaluations are
:mod:`core.sizing_relaxations` (re-exported here).

References
----------
.. [1] the checks of :func:`core.checks.run_checks` and the screening figures of :mod:`core.batch`.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from .batch import CHECK_KEYS, BatchFigures
from .evaluate import evaluate
from .schema import Project
from .sizing_candidates import project_with
from .sizing_relaxations import (
    AMBIENT_STEP_K,
    BOUND_SHARE,
    ENVELOPE_KEYS,
    EXTENSION_STEPS,
    TORQUE_STEPS,
    VOLTAGE_STEPS,
    binding_ranges,
    fixed_misses_of,
    range_extensions,
    relaxations,
    value_text,
)
from .sizing_requirement import faults_must_survive, missed_checks, requirement_misses
from .sizing_space import FreeRange, SizingSpec
from .units import to_si

_CASES = ("cold", "nominal", "hot")
#: How many of the nearest candidates (and of those nearest the rated load) are re-evaluated relaxed.
RELAXED_DESIGNS = 3


@dataclass(frozen=True)
class Shortfall:
    """One requirement the closest design of a search misses."""

    requirement: str  #: the check's key ("load", "demagnetization", "thermal", ...) or "fit"
    text: str  #: the sentence, with numbers and units
    closest_share: float  #: how far the closest design misses it (0.04 = 4 %); NaN where no measure


def load_shortfall_share(figures: Mapping[str, np.ndarray], torque_N_m: float, speed_rad_per_s: float) -> np.ndarray:
    """How far each design falls short of the rated load, as a share of the requirement.

    Parameters
    ----------
    figures : mapping of str to ndarray
        Screening figures (:func:`core.batch.evaluate_many`), shape (n,) each.
    torque_N_m : float
        The rated load torque [N·m].
    speed_rad_per_s : float
        The speed required at that torque [rad/s].

    Returns
    -------
    ndarray
        Shape (n,): 0 where every temperature case meets the load; else the worst case's missing share of
        the speed, ``1 - speed / required``, or, where the rated torque is beyond stall in some case, one
        plus the missing share of the stall torque (so a motor that cannot reach the torque at all ranks
        behind one that is only slow) [1]. NaN where the chain failed.

    References
    ----------
    .. [1] the rated-load check of :func:`core.checks.run_checks` (every case must turn the rated torque at
       the required speed or faster).
    """
    speed = np.stack([np.asarray(figures[f"{case}.rated_speed_rad_per_s"], dtype=float) for case in _CASES])
    stall = np.stack([np.asarray(figures[f"{case}.stall_torque_N_m"], dtype=float) for case in _CASES])
    slow = np.max(np.clip(1.0 - speed / speed_rad_per_s, 0.0, None), axis=0) if speed_rad_per_s > 0 else \
        np.zeros(speed.shape[1])
    weak = np.max(np.clip(1.0 - stall / torque_N_m, 0.0, None), axis=0) if torque_N_m > 0 else \
        np.zeros(stall.shape[1])
    beyond_stall = np.any(stall <= torque_N_m, axis=0)
    share = np.where(beyond_stall, 1.0 + weak, slow)
    solved = np.all(np.isfinite(stall), axis=0)
    return np.where(solved, np.nan_to_num(share, nan=1.0), np.nan)


def closest_candidates(batch: BatchFigures, load_share: np.ndarray, must_survive: bool = False) -> np.ndarray:
    """The candidates from nearest to passing to farthest: fewest missed checks, then the smallest load miss.

    Parameters
    ----------
    batch : BatchFigures
        The candidates' figures and check codes.
    load_share : ndarray
        :func:`load_shortfall_share` of the candidates.
    must_survive : bool
        The faults' margin is required too (:func:`core.sizing_requirement.requirement_misses`).

    Returns
    -------
    ndarray of int
        The solved candidates' indices, nearest first; empty when none solved.

    References
    ----------
    .. [1] module docstring.
    """
    if batch.size == 0 or bool(np.all(batch.failed)):
        return np.zeros(0, dtype=int)
    fails = sum(miss.astype(int) for miss in requirement_misses(batch.status, must_survive).values())
    fails = np.where(batch.failed, len(CHECK_KEYS) + 1, fails)
    order = np.lexsort((np.nan_to_num(load_share, nan=np.inf), fails))
    solved: np.ndarray = order[~batch.failed[order]]
    return solved


def explain(project: Project, batch: BatchFigures, values: Mapping[str, np.ndarray],
            spec: SizingSpec, evaluated: int | None = None) -> tuple[tuple[Shortfall, ...], str]:
    """Why none of a search's candidates is feasible: the closest design's misses and an evaluated relaxation.

    Parameters
    ----------
    project : Project
        The requirement and the fixed parts (the file the search started from, with any ``--set``).
    batch : BatchFigures
        :func:`core.batch.evaluate_many` over the candidates screened (all, or the closest few hundred).
    values : mapping of str to ndarray
        Free key to the candidates' values, in file units, in the order of ``batch``.
    spec : SizingSpec
        The search (its ``free`` ranges are read).
    evaluated : int, optional
        How many candidates the search evaluated in all, when ``batch`` holds only the closest of them
        (the paragraph then says so: "the 300 closest of 4,000").

    Returns
    -------
    shortfalls : tuple of Shortfall
        One per check the closest design fails (its message, with numbers and units, and its share of
        miss where there is a measure); a single ``"fit"`` shortfall when no candidate could be built.
    explanation : str
        The paragraph in words: how many candidates fail which requirement, the closest design and what
        it misses, the limits that bind, and the relaxations evaluated.

    References
    ----------
    .. [1] module docstring; :func:`core.checks.run_checks` for the checks' messages.
    """
    n = batch.size
    if n == 0 or bool(np.all(batch.failed)):
        reason = next((m for m in batch.failure_messages if m), "") if n else ""
        text = (f"None of the {n} candidates could be evaluated" if n else "No candidate could be built")
        text += (f" ({reason})." if reason else ": no combination of the free ranges fits the fixed parts and the "
                 "envelope (the fit rules refuse every one). Widen the ranges or the envelope.")
        return (Shortfall("fit", text, float("nan")),), text

    torque = to_si(float(project.load.torque_mNm), "mN·m")
    speed = to_si(float(project.load.speed_rpm), "rpm")
    load_share = load_shortfall_share(batch.figures, torque, speed)
    must_survive = faults_must_survive(project)
    order = closest_candidates(batch, load_share, must_survive)
    index = int(order[0])
    # The designs re-evaluated with relaxed requirements: the nearest few, and the few nearest the load alone.
    by_load = np.argsort(np.nan_to_num(load_share, nan=np.inf), kind="stable")[:RELAXED_DESIGNS]
    tried = list(dict.fromkeys([*order[:RELAXED_DESIGNS].tolist(), *by_load.tolist()]))

    def values_of(i: int) -> dict[str, float | int | str]:
        return {v.key: _file_value(v, values[v.key][i]) for v in spec.free}

    design_values = values_of(index)
    closest = project_with(project, design_values)

    counts = {key: int(np.sum(miss & ~batch.failed))
              for key, miss in requirement_misses(batch.status, must_survive).items()}
    solved = int(np.sum(~batch.failed))
    failing = sorted(((c, k) for k, c in counts.items() if c), reverse=True)
    results = evaluate(closest)
    titles = {c.key: c.title for c in results.checks}
    # the checks it fails, and a margin to the knee short of the required (a warning on the file's page)
    missed = missed_checks(results, must_survive)

    shortfalls = []
    for check in missed:
        share = float(load_share[index]) if check.key == "load" else float("nan")
        if check.key == "load" and share <= 1.0:
            tail = f" (the closest design is {100 * share:.1f} % slow)"
        elif check.key == "load":
            tail = f" (the closest design's stall torque is {100 * (share - 1.0):.1f} % short)"
        else:
            tail = ""
        message = check.message.rstrip(".")
        shortfalls.append(Shortfall(check.key, f"{check.title}: {message}{tail}.", share))

    never = [k for k, c in counts.items() if c == solved]
    examined = (f"the {n:,} closest of the {evaluated:,} candidates evaluated" if evaluated and evaluated > n
                else f"the {n:,} candidates examined")
    parts = [f"None of {examined} passes every check ({solved:,} solved)."]
    if failing:
        parts.append("Failed: " + "; ".join(f"{titles.get(k, k).lower()} by {c}" for c, k in failing) + ".")
    if never:
        parts.append("No candidate meets " + ", ".join(titles.get(k, k).lower() for k in never)
                     + (" at all." if len(never) > 1 else " at any point of the free ranges."))
    shown = ", ".join(value_text(k, v) for k, v in design_values.items())
    parts.append(f"The closest design ({shown}) fails: " + " ".join(s.text for s in shortfalls))
    bound = binding_ranges(spec.free, design_values)
    if bound:
        parts.append("It presses against " + "; ".join(bound) + ", so that range binds.")
        widened = range_extensions(closest, spec.free, design_values)
        if widened:
            parts.append("Re-evaluated with the range widened: " + "; ".join(widened) + ".")
    names = ["the closest design", *(f"the design with {', '.join(value_text(k, v) for k, v in values_of(i).items())}"
                                     for i in tried[1:])]
    relaxed_designs = [closest, *(project_with(project, values_of(i)) for i in tried[1:])]
    fixed = fixed_misses_of(batch, must_survive, np.asarray(tried))  # the candidates' own screening
    relaxed = relaxations(relaxed_designs, [c.key for c in missed], names, fixed)
    if relaxed:
        parts.append("Re-evaluated with the requirement relaxed: " + "; ".join(relaxed) + ".")
    elif all(fixed):
        failed = ", ".join(sorted({key.replace("_", " ") for keys in fixed for key in keys}))
        parts.append(f"No relaxation of the requirement can make them pass: each design tried fails {failed}, "
                     "which no supply, rated load, ambient or insulation class changes.")
    else:
        parts.append("No supply voltage, rated torque or rated speed tried makes it pass.")
    return tuple(shortfalls), " ".join(parts)


def _file_value(variable: FreeRange, value: object) -> float | int | str:
    if variable.choices:
        return int(str(value)) if variable.integer else str(value)
    return int(value) if variable.integer else float(value)  # type: ignore[call-overload, arg-type]


__all__ = ["AMBIENT_STEP_K", "BOUND_SHARE", "ENVELOPE_KEYS", "EXTENSION_STEPS", "RELAXED_DESIGNS", "TORQUE_STEPS",
           "VOLTAGE_STEPS", "Shortfall", "binding_ranges", "closest_candidates", "explain", "load_shortfall_share",
           "range_extensions", "relaxations"]
