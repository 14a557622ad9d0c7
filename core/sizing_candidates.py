"""The candidates of a sizing search as projects and designs: changed keys, fit rules, shared materials.

A candidate is the project with its free keys changed (:func:`project_with` validates it like a file),
and with the keys that follow a free key (:func:`tied_values`: the commutator segments keep the file's
segments per slot when the slots vary); :func:`fitting_designs` keeps the candidates whose parts fit and
builds their designs, sharing the materials and winding among those that differ only in the geometric keys
(:data:`GEOMETRY_KEYS`); :func:`overfull_slots` finds the wire that cannot fit the slot before the costly
magnetic solution.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping, Sequence
from typing import Any

import numpy as np

from .batch_arrays import stack_geometries
from .design import Design, design_from_project, geometry_of
from .edits import with_values
from .errors import ProjectError
from .fit_rules import check_fit
from .keys import key_spec
from .schema import Project
from .sizing_space import FreeRange, values_at

#: The keys :func:`core.design.geometry_of` reads: a candidate that differs from another only in these
#: shares its materials, winding and every other input of :class:`core.design.Design` (a test checks
#: that every other key leaves the geometry alone).
GEOMETRY_KEYS = frozenset({
    "motor.poles", "magnets.thickness_mm", "magnets.arc_deg", "magnets.length_mm", "airgap.length_mm",
    "housing.wall_mm", "housing.length_mm", "armature.outer_diameter_mm", "armature.stack_length_mm",
    "armature.stacking_factor", "armature.slots", "armature.slot_opening_mm", "armature.tooth_width_mm",
    "armature.slot_depth_mm", "armature.shaft_diameter_mm",
})


SLOTS_KEY, SEGMENTS_KEY = "armature.slots", "winding.commutator_segments"


def tied_values(project: Project, values: Mapping[str, Any]) -> dict[str, Any]:
    """A candidate's free values with the keys that follow them: the commutator segments when the slots are
    free and the segments are not.

    The fit rules ask for a whole multiple of the slots (one, two or more coils per slot); a file's
    segment count fits its own slot count only, so with the slots free and the segments fixed most
    candidates would be refused. The segments keep the file's ratio instead: segments = (file's segments
    per slot) × slots.

    Parameters
    ----------
    project : Project
        The design the search started from (a validated file: its segments are a multiple of its slots).
    values : mapping of str to object
        Free key to value in the key's file unit.

    Returns
    -------
    dict
        ``values``, with ``winding.commutator_segments`` added when it follows the slots.

    Raises
    ------
    ProjectError
        Naming the segments and the schema's limit, when the ratio takes them outside it.

    References
    ----------
    .. [1] :func:`core.fit_rules.check_fit` (segments a whole multiple of the slots).
    """
    out = dict(values)
    if SLOTS_KEY in out and SEGMENTS_KEY not in out:
        per_slot = project.winding.commutator_segments // project.armature.slots
        segments = per_slot * int(out[SLOTS_KEY])
        spec = key_spec(SEGMENTS_KEY)
        if not spec.minimum <= segments <= spec.maximum:
            raise ProjectError(f"{SEGMENTS_KEY}: {per_slot} per slot on {out[SLOTS_KEY]} slots makes {segments}, "
                               f"outside the allowed {spec.minimum} to {spec.maximum}", key=SEGMENTS_KEY)
        out[SEGMENTS_KEY] = segments
    return out


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
        Free key to value in the key's file unit (the keys that follow them are added: :func:`tied_values`).

    Returns
    -------
    Project
        The start's project with the candidate's values, checked against the schema and the fit rules.

    Raises
    ------
    ProjectError
        Naming the key and the limit, when the candidate is not a valid design.

    References
    ----------
    .. [1] :func:`core.edits.with_values`.
    """
    changes: dict[str, Any] = tied_values(project, values)
    if "magnets.grade" in changes and project.magnets.custom_grade is not None:
        changes["magnets.custom_grade"] = None
    return with_values(project, changes)


def fitting_designs(project: Project, free: Sequence[FreeRange], values: Mapping[str, np.ndarray]
                     ) -> tuple[np.ndarray, list[Design]]:
    """The candidates whose parts fit (by :func:`check_fit`), and their designs.

    Candidates that share every non-geometric value (the keys that follow a free key included:
    :func:`tied_values`) share one :func:`design_from_project` (the materials, the wire, the winding); the
    others take its design with their own project and :func:`geometry_of`, which is all that the geometric
    keys change.

    Parameters
    ----------
    project : Project
        The requirement and the design the search started from.
    free : sequence of FreeRange
        The free variables.
    values : mapping of str to ndarray
        Free key to each candidate's value in the key's file unit, shape (N,).

    Returns
    -------
    rows : ndarray of int
        The candidates that fit, by position.
    designs : list of Design
        Their designs, SI.

    References
    ----------
    .. [1] :func:`core.fit_rules.check_fit`, the rules a file passes.
    """
    count = len(next(iter(values.values()))) if values else 0
    resolved: dict[tuple, Design | None] = {}
    fits: list[int] = []
    designs: list[Design] = []
    for i in range(count):
        try:
            changes = tied_values(project, values_at(free, values, i))
            candidate = _changed(project, changes)
            check_fit(candidate)
        except ProjectError:
            continue
        shared = tuple((k, v) for k, v in changes.items() if k not in GEOMETRY_KEYS)
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


def overfull_slots(designs: Sequence[Design]) -> np.ndarray:
    """The designs whose enamelled wire does not fit in the slot: the slot-fill check's fail, by the same
    functions :func:`core.batch.evaluate_many` calls, before the costly magnetic solution.

    Parameters
    ----------
    designs : sequence of Design
        The candidates' designs, SI (only their winding, wire and slot are read).

    Returns
    -------
    ndarray of bool
        True where the gross slot fill is past :data:`core.checks.SLOT_FILL_GROSS_FAIL`.

    References
    ----------
    .. [1] :func:`core.winding.slot_fill`.
    """
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


__all__ = ["GEOMETRY_KEYS", "SEGMENTS_KEY", "SLOTS_KEY", "fitting_designs", "overfull_slots", "project_with",
           "tied_values"]
