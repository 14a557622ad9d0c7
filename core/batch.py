"""Many designs at once: the screening figures of every design of a batch, one array per figure.

:func:`evaluate_many` runs the chain of :func:`core.evaluate.evaluate` over a sequence of designs and
returns, for each figure a study reads (the magnetic solution at each case, the constants, the named
points of each case, the demagnetization margins, the thermal state, the ratings, masses, cost and
every check's verdict), one array over the designs. :func:`screening_figures` reads the same names off
one design's :class:`~core.results.Results`, so the two compare like for like.

Figure names are ``group.name_unit``: ``nominal.no_load_speed_rad_per_s``,
``demagnetization.stall_cold.margin_A_per_m``, ``ratings.stall_time_hot_s``; SI throughout,
temperatures in °C. A figure a design does not have (a current-limit torque without a drive limit, a
reversal case of a motor that never reverses, a stall time that is never reached) is NaN.

A design whose chain raises (no solution of its magnetic circuit, an ambient outside its grade's data)
is not dropped: ``failed`` marks it, ``failure_messages`` says why, and its figures are NaN.

Usage::

    from pmdc_sizer.core import load
    from pmdc_sizer.core.batch import evaluate_many
    from pmdc_sizer.core.design import design_from_project
    designs = [design_from_project(load(path)) for path in paths]
    batch = evaluate_many(designs)
    batch.figures["nominal.no_load_speed_rad_per_s"], batch.passes_all
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from .batch_arrays import DesignsFailed, stack_geometries
from .batch_chain import chain_figures
from .design import Design, design_from_project
from .errors import MagneticCircuitError, ProjectError
from .schema import Project
from .screening import CHECK_KEYS, FAIL_CODE, PASS_CODE, WARNING_CODE, check_status, screening_figures


@dataclass(frozen=True)
class BatchFigures:
    """The screening figures of N designs (arrays of shape (N,), SI, temperatures in °C)."""

    figures: dict[str, np.ndarray]  #: figure name (unit-suffixed) to its values; NaN where a design has none
    status: dict[str, np.ndarray]  #: check key to int8 codes: 0 pass, 1 warning (marginal), 2 fail
    passes_all: np.ndarray  #: bool: solved, and no check failed
    failed: np.ndarray  #: bool: the chain raised for this design (its figures are NaN)
    failure_messages: tuple[str, ...]  #: why, per design ("" where it solved)

    @property
    def size(self) -> int:
        """Number of designs [1]."""
        return int(self.failed.shape[0])



def evaluate_many(designs: Sequence[Design | Project]) -> BatchFigures:
    """The screening figures of every design, one array per figure, the chain vectorised over the designs.

    The chain is :func:`core.evaluate.evaluate`'s, step for step, on arrays: the topic modules' functions
    take arrays of designs, the thermal fixed points and the root finders run each design to its own end
    (so a design's figures do not depend on its batch), and the reluctance network is solved once per
    group of designs that share a magnet grade family (a grade and its lots: Br and HcJ go in per design,
    so a tolerance study's motors are one group), a pair of steels, a shaft and a slot, pole and segment
    count (what one network solve and one armature current sheet take); each design's cross-section is
    built once for all its temperatures and currents.

    Parameters
    ----------
    designs : sequence of Design or Project
        The designs, SI, or validated projects (converted here); any grades, steels, windings and duties,
        mixed.

    Returns
    -------
    BatchFigures
        Figures and check codes of shape (N,); a design whose chain raised is marked ``failed`` with its
        message and NaN figures (it also fails every check and ``passes_all``).
    """
    resolved = [design_from_project(d) if isinstance(d, Project) else d for d in designs]
    count = len(resolved)
    messages = [""] * count
    alive = list(range(count))
    figures: dict[str, np.ndarray] = {}
    codes: dict[str, np.ndarray] = {}
    while alive:
        try:
            figures, codes = chain_figures([resolved[i] for i in alive])
            break
        except DesignsFailed as failure:
            for position, message in failure.messages.items():
                messages[alive[position]] = message
            alive = [i for position, i in enumerate(alive) if position not in failure.messages]
    failed = np.array([bool(m) for m in messages], dtype=bool)
    rows = np.array(alive, dtype=int)

    def spread(values: np.ndarray, fill) -> np.ndarray:
        out = np.full(count, fill, dtype=values.dtype)
        out[rows] = values
        return out

    every = {name: spread(np.asarray(values, dtype=float), np.nan) for name, values in figures.items()}
    status = {key: spread(codes[key].astype(np.int8), np.int8(FAIL_CODE)) if key in codes
              else np.where(failed, FAIL_CODE, PASS_CODE).astype(np.int8) for key in CHECK_KEYS}
    failing = np.zeros(count, dtype=bool)
    for values in status.values():
        failing |= values == FAIL_CODE
    return BatchFigures(figures=every, status=status, passes_all=~failing & ~failed, failed=failed,
                        failure_messages=tuple(messages))


def evaluate_each(designs: Sequence[Design]) -> BatchFigures:
    """The same figures as :func:`evaluate_many`, by :func:`core.evaluate.evaluate` one design at a time.

    The reference the batch chain is tested and measured against.

    Parameters
    ----------
    designs : sequence of Design
        The designs, SI.

    Returns
    -------
    BatchFigures
        As :func:`evaluate_many`.
    """
    from .evaluate import evaluate

    count = len(designs)
    rows: list[dict[str, float] | None] = []
    results_codes: list[dict[str, int] | None] = []
    messages: list[str] = []
    for design in designs:
        try:
            results = evaluate(design)
        except (MagneticCircuitError, ProjectError) as error:
            rows.append(None)
            results_codes.append(None)
            messages.append(str(error) or type(error).__name__)
            continue
        rows.append(screening_figures(results))
        results_codes.append(check_status(results))
        messages.append("")
    names = list(dict.fromkeys(name for row in rows if row is not None for name in row))
    figures = {name: np.array([np.nan if row is None else row.get(name, np.nan) for row in rows])
               for name in names}
    failed = np.array([row is None for row in rows], dtype=bool)
    status = {key: np.array([FAIL_CODE if c is None else c[key] for c in results_codes], dtype=np.int8)
              for key in CHECK_KEYS}
    failing = np.zeros(count, dtype=bool)
    for values in status.values():
        failing |= values == FAIL_CODE
    return BatchFigures(figures=figures, status=status, passes_all=~failing & ~failed, failed=failed,
                        failure_messages=tuple(messages))


__all__ = ["CHECK_KEYS", "FAIL_CODE", "PASS_CODE", "WARNING_CODE", "BatchFigures", "check_status", "evaluate_each",
           "evaluate_many", "screening_figures", "stack_geometries"]
