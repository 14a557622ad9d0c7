"""The built-in 2-D nonlinear magnetostatic field solution of the motor's cross-section.

The independent check of the fast model (core.magnetic_circuit): the real cross-section (shaft, slotted
lamination, gap, arc magnets, housing, outside air) meshed by :mod:`.mesh`, the project's own steels and
the magnet on its recoil line (:mod:`.materials`), magnets and slot currents (:mod:`.excitation`),
Newton's method on scikit-fem's linear triangles (:mod:`.solve`), and what an engineer reads off it
(:mod:`.postprocess`), for the named cases of a design (:mod:`.cases`), compared with the fast model
(:mod:`.agreement`), many at once on dask.distributed (:mod:`.batch`).

Typical use::

    results = evaluate(design)
    for case in field_cases(design, results):
        solution = solve_case(design, case)
    table = agreement(results, solutions)
"""

from __future__ import annotations

from .agreement import TOLERANCE_PERCENT, AgreementRow, AgreementTable, agreement
from .batch import BatchItem, BatchOutcome, solve_many
from .case_solution import solve_case
from .cases import CASE_NAMES, FieldCase, field_cases, no_load_case
from .errors import FieldCancelled, FieldConvergenceError, FieldInputError
from .mesh import Region, SectionMesh, build_mesh, check_geometry
from .options import COARSE, FINE, FieldOptions
from .postprocess import FieldSolution

__all__ = [
    "CASE_NAMES",
    "COARSE",
    "FINE",
    "TOLERANCE_PERCENT",
    "AgreementRow",
    "AgreementTable",
    "BatchItem",
    "BatchOutcome",
    "FieldCancelled",
    "FieldCase",
    "FieldConvergenceError",
    "FieldInputError",
    "FieldOptions",
    "FieldSolution",
    "Region",
    "SectionMesh",
    "agreement",
    "build_mesh",
    "check_geometry",
    "field_cases",
    "no_load_case",
    "solve_case",
    "solve_many",
]
