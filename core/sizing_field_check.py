"""The field check of a sizing front: each returned design's no-load flux per pole, fast model against field.

The search screens with the reluctance network; :func:`check_designs` solves the no-load case of each
returned design with the built-in 2-D field solution (:mod:`core.field`, many at once on dask.distributed)
and :func:`compare_flux` marks any design whose flux per pole differs from the fast model's by more than
:data:`FLUX_TOLERANCE` (3 %), so an engineer knows which points of the front to trust less.

References
----------
.. [1] :func:`core.field.agreement` (the same comparison, flux per pole at no load, per design).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from .design import design_from_project
from .evaluate import evaluate
from .schema import Project

#: A design is marked when its fast-model flux per pole differs from the field solution's by more.
FLUX_TOLERANCE = 0.03  # the project's 3 % agreement band (core.field.agreement.TOLERANCE_PERCENT)


@dataclass(frozen=True)
class FluxCheck:
    """One design's no-load flux per pole by both models."""

    label: str  #: how the caller names the design ("1", a file name)
    fast_Wb: float  #: the fast model's flux per pole at no load [Wb]
    field_Wb: float  #: the field solution's [Wb]; NaN when it failed
    difference: float  #: (fast - field) / field [1]; NaN when it failed
    flagged: bool  #: |difference| above the tolerance, or the field solution failed
    error: str = ""  #: why the field solution failed ("" when it solved)


def compare_flux(label: str, fast_Wb: float, field_Wb: float | None, error: str = "",
                 tolerance: float = FLUX_TOLERANCE) -> FluxCheck:
    """Compare one design's flux per pole by the fast model and by the field solution.

    Parameters
    ----------
    label : str
        The design's name in the report.
    fast_Wb : float
        Flux per pole of the fast model at no load [Wb].
    field_Wb : float or None
        Flux per pole of the field solution [Wb]; None when the solution failed.
    error : str, optional
        Why the field solution failed.
    tolerance : float, optional
        The share of difference above which the design is marked [1] (default 3 %).

    Returns
    -------
    FluxCheck
        The difference relative to the field solution, and whether it is marked (a failed or
        non-finite field solution is always marked: the design is unverified).

    References
    ----------
    .. [1] module docstring.
    """
    if field_Wb is None or not math.isfinite(field_Wb) or field_Wb == 0.0:
        return FluxCheck(label, fast_Wb, float("nan"), float("nan"), True, error or "no field solution")
    difference = (fast_Wb - field_Wb) / field_Wb
    return FluxCheck(label, fast_Wb, field_Wb, difference, abs(difference) > tolerance)


def check_designs(projects: Sequence[Project], labels: Sequence[str] | None = None, scheduler: str | None = None,
                  workers: int = 2, options: object | None = None,
                  progress: Callable[[int, int], None] | None = None) -> tuple[FluxCheck, ...]:
    """Solve the no-load field of each design (dask.distributed) and compare its flux per pole.

    Parameters
    ----------
    projects : sequence of Project
        The designs (e.g. a sizing result's designs' ``project``).
    labels : sequence of str, optional
        Their names; "1", "2", ... if not given.
    scheduler : str, optional
        Address of a running dask scheduler; None starts a local cluster of ``workers`` processes.
    workers : int
        Processes of the local cluster [1].
    options : FieldOptions, optional
        Mesh and Newton settings (:data:`core.field.COARSE` for a quick look).
    progress : callable, optional
        ``progress(finished, total)`` as each solution comes back.

    Returns
    -------
    tuple of FluxCheck
        One per design, in order.

    References
    ----------
    .. [1] :func:`core.field.solve_many`; :func:`compare_flux`.
    """
    from .field import BatchItem, no_load_case, solve_many

    labels = [str(i + 1) for i in range(len(projects))] if labels is None else list(labels)
    fast, items = [], []
    for label, project in zip(labels, projects, strict=True):
        results = evaluate(project)
        fast.append(float(results.magnetics.flux_per_pole_Wb))
        items.append(BatchItem(label, design_from_project(project),
                               no_load_case(float(results.magnetics.temperature_C))))

    def report(finished, total, _outcome):
        if progress is not None:
            progress(finished, total)

    outcomes = solve_many(items, scheduler=scheduler, workers=workers, progress=report,
                          options=options)  # type: ignore[arg-type]
    return tuple(compare_flux(o.label, f, None if o.solution is None else float(o.solution.flux_per_pole_Wb),
                              o.error or "") for o, f in zip(outcomes, fast, strict=True))


__all__ = ["FLUX_TOLERANCE", "FluxCheck", "check_designs", "compare_flux"]
