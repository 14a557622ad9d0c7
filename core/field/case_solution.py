"""One case of a design solved end to end: mesh, problem, Newton's method, what an engineer reads off it.

Apart from :mod:`.solve` (the nonlinear solve) and :mod:`.postprocess` (the outputs, which read the
solve's Problem), so that neither imports the other.
"""

from __future__ import annotations

import time
from collections.abc import Callable

from .cases import FieldCase
from .mesh import build_mesh
from .options import FieldOptions
from .postprocess import FieldSolution, field_solution
from .solve import build_problem, newton


def solve_case(design, case: FieldCase, options: FieldOptions | None = None,
               progress: Callable[[float, str], None] | None = None,
               should_stop: Callable[[], bool] | None = None) -> FieldSolution:
    """The field solution of one case of a design.

    Parameters
    ----------
    design : Design
        The design, SI.
    case : FieldCase
        What to solve (see :func:`~.cases.field_cases`).
    options : FieldOptions, optional
        Mesh fineness, tolerance, iteration limit; the defaults when None.
    progress : callable, optional
        ``progress(fraction, message)``, called as the solve advances.
    should_stop : callable, optional
        Checked between Newton iterations; True stops the solve with :class:`FieldCancelled`.

    Returns
    -------
    FieldSolution
        Every output, SI (see :mod:`.postprocess`).

    Raises
    ------
    FieldInputError
        When the cross-section cannot be meshed.
    FieldConvergenceError
        When Newton's method does not converge.
    FieldCancelled
        When stopped.
    """
    options = options or FieldOptions()
    started = time.perf_counter()
    section = build_mesh(design.geometry, case.rotor_position_rad, options)
    problem = build_problem(design, case, section)
    result = newton(problem, options, progress, should_stop)
    return field_solution(design, case, problem, result, time.perf_counter() - started)
