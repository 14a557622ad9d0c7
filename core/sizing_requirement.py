"""What a sizing search counts as meeting the requirement: no check fails, and the magnets keep the margin.

A design check fails, warns or passes (core.checks). A search must return only designs that meet the
requirement, and the required margin to the knee (``magnets.required_margin_pct_of_HcJ``) is part of it:
the demagnetization check *warns* when a case keeps less than that margin, and so do the direct-supply
faults where the project requires the magnets to survive them. For the file an engineer drew, a warning is
a thing to look at; for a search choosing among thousands of candidates, a design inside the required
margin is short of the requirement, as a slow one is. Every other warning (tooth flux above the steel's
comfortable level, a slot hard to wind) stays a warning and does not make a design infeasible.
"""

from __future__ import annotations

from collections.abc import Mapping

import numpy as np

from .batch import CHECK_KEYS, FAIL_CODE, PASS_CODE, BatchFigures, check_status
from .margins import must_survive_faults
from .results import Check, Results
from .schema import Project

#: The checks whose warning means a case keeps less than the required margin to the knee.
MARGIN_CHECKS = ("demagnetization", "fault_demagnetization")


def faults_must_survive(project: Project) -> bool:
    """Whether the requirement makes the magnets survive the direct-supply faults (``supply.fault_cases``).

    Parameters
    ----------
    project : Project
        The requirement (its supply table; neither key can be a free variable of a search).

    Returns
    -------
    bool
    """
    return must_survive_faults(project.supply.fault_cases, project.supply.reversing)


def requirement_misses(status: Mapping[str, np.ndarray], must_survive: bool) -> dict[str, np.ndarray]:
    """Per check, where a design misses the requirement: the check fails, or keeps less than the margin.

    Parameters
    ----------
    status : mapping of str to ndarray
        Check key to the designs' codes (core.batch: pass, warning, fail).
    must_survive : bool
        :func:`faults_must_survive`: the faults' margin is required too.

    Returns
    -------
    dict of str to ndarray of bool
        Every check of ``status`` (core.screening.CHECK_KEYS) → where it is missed.
    """
    misses = {}
    for key in CHECK_KEYS:
        if key not in status:
            continue
        codes = np.asarray(status[key])
        margin_required = key in MARGIN_CHECKS and (key == "demagnetization" or must_survive)
        misses[key] = codes != PASS_CODE if margin_required else codes == FAIL_CODE
    return misses


def missed_checks(results: Results, must_survive: bool) -> list[Check]:
    """The checks one evaluated design misses the requirement by (as :func:`requirement_misses`).

    Parameters
    ----------
    results : Results
        The design's evaluation (core.evaluate).
    must_survive : bool
        :func:`faults_must_survive`.

    Returns
    -------
    list of Check
        In the order of ``results.checks``; empty when the design meets the requirement.
    """
    codes = {key: np.array([code]) for key, code in check_status(results).items()}
    misses = requirement_misses(codes, must_survive)
    return [c for c in results.checks if (bool(misses[c.key][0]) if c.key in misses else c.status == "fail")]


def meets_requirement(batch: BatchFigures, must_survive: bool) -> np.ndarray:
    """Where each design of a batch meets the requirement: solved, no check failed, every margin kept.

    Parameters
    ----------
    batch : BatchFigures
        The designs' figures and check codes (core.batch.evaluate_many).
    must_survive : bool
        :func:`faults_must_survive`.

    Returns
    -------
    ndarray of bool
        Shape (N,).
    """
    missed = np.zeros(batch.size, dtype=bool)
    for miss in requirement_misses(batch.status, must_survive).values():
        missed |= miss
    return np.asarray(~missed & ~batch.failed)


__all__ = ["MARGIN_CHECKS", "faults_must_survive", "meets_requirement", "missed_checks", "requirement_misses"]
