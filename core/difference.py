"""Two designs side by side: the difference of every number two evaluations share, B − A.

Absolute and as a fraction of A; a temperature in °C has no fraction (an offset scale). Lists of named
items (the demagnetization cases) are matched by name, since two designs need not have the same cases.
What the views show of it (titles, display units) is the app's business.

Usage::

    from pmdc_sizer.core import difference, evaluate, project
    a = project.load("demo_projects/appliance_ferrite_12v.toml")
    b = difference.with_grade(a, "N42")
    comparison = difference.compare(a, b)
    comparison.figure("constants.ke_V_s_per_rad").percent
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field, fields, is_dataclass
from typing import Any

import numpy as np

from .edits import with_values
from .evaluate import evaluate
from .results import Results
from .schema import Project


@dataclass(frozen=True)
class FigureDifference:
    """One number both designs have, and how B differs from A."""

    key: str  #: dotted path into the results, e.g. "constants.ke_V_s_per_rad" (the unit is in the name)
    a: float
    b: float
    difference: float  #: B − A, in the unit of the key
    fraction: float | None  #: (B − A)/|A|; None where A is zero or the key is a temperature in °C

    @property
    def percent(self) -> float | None:
        return None if self.fraction is None else 100.0 * self.fraction


def _is_number(value) -> bool:
    return (isinstance(value, (int, float, np.integer, np.floating)) and not isinstance(value, (bool, np.bool_))
            and math.isfinite(float(value)))


def _children(value) -> dict | None:
    """The named parts of a dataclass or mapping; plot arrays are not figures and are left out."""
    if is_dataclass(value) and not isinstance(value, type):
        return {f.name: getattr(value, f.name) for f in fields(value)
                if f.name not in ("curve", "curves") and not isinstance(getattr(value, f.name), np.ndarray)}
    if isinstance(value, dict):
        return value
    return None


def _name_of(item):
    children = _children(item)
    return None if children is None else children.get("name")


_SKIP = object()


def _pair(a, b, key: str, leaf: Callable[[str, Any, Any], Any]):
    """``leaf`` applied to every number A and B share, in A's nesting; lists of named items are
    matched by name (two designs need not have the same demagnetization cases), others by position."""
    if _is_number(a) and _is_number(b):
        return leaf(key, a, b)
    children_a, children_b = _children(a), _children(b)
    if children_a is not None and children_b is not None:
        out = {}
        for name, value in children_a.items():
            if name in children_b:
                paired = _pair(value, children_b[name], name, leaf)
                if paired is not _SKIP:
                    out[name] = paired
        return out or _SKIP
    if isinstance(a, (list, tuple)) and isinstance(b, (list, tuple)):
        names_a = [_name_of(item) for item in a]
        if all(isinstance(n, str) for n in names_a):
            by_name = {_name_of(item): item for item in b}
            out = []
            for name, item in zip(names_a, a):
                if name in by_name:
                    paired = _pair(item, by_name[name], key, leaf)
                    if paired is not _SKIP:
                        out.append({"name": name, **paired})
            return out or _SKIP
        if len(a) == len(b):
            out = [p for p in (_pair(x, y, key, leaf) for x, y in zip(a, b)) if p is not _SKIP]
            return out or _SKIP
    return _SKIP


def _fraction(key: str, a, b) -> float | None:
    # °C is an offset scale: a per cent of it means nothing.
    if key.endswith("_C") or float(a) == 0.0:
        return None
    return (float(b) - float(a)) / abs(float(a))


def nested_difference(a, b, relative: bool = False):
    """B − A (or (B − A)/|A| when ``relative``) for every number two nested structures share.

    ``a`` and ``b`` are results dataclasses or their JSON dicts; the answer keeps their nesting and
    keys, holds numbers only (plus the ``name`` of matched list items) and leaves out what is not a
    number on both sides.
    """
    def leaf(key, x, y):
        if relative:
            value = _fraction(key, x, y)
            return _SKIP if value is None else value
        return y - x

    result = _pair(a, b, "", leaf)
    return {} if result is _SKIP else result


def flatten(nested, prefix: str = "") -> Iterator[tuple[str, Any]]:
    """(dotted key, value) for every leaf of a :func:`nested_difference`; list items by name."""
    if isinstance(nested, dict):
        for name, value in nested.items():
            if name == "name" and prefix.endswith("]"):
                continue
            yield from flatten(value, f"{prefix}.{name}" if prefix else name)
    elif isinstance(nested, list):
        for index, item in enumerate(nested):
            label = item.get("name", index) if isinstance(item, dict) else index
            yield from flatten(item, f"{prefix}[{label}]")
    else:
        yield prefix, nested


def difference(a: Results, b: Results) -> tuple[FigureDifference, ...]:
    """Every number the two results share, flattened to dotted keys, with B − A."""
    pairs = _pair(a, b, "", lambda key, x, y: (key, x, y))
    if pairs is _SKIP:
        return ()
    return tuple(
        FigureDifference(key=path, a=x, b=y, difference=y - x, fraction=_fraction(leaf_key, x, y))
        for path, (leaf_key, x, y) in flatten(pairs)
    )


@dataclass(frozen=True)
class Comparison:
    """Two evaluated designs and every difference between them."""

    a: Results = field(repr=False)
    b: Results = field(repr=False)
    figures: tuple[FigureDifference, ...]  #: every number both results have

    def figure(self, key: str) -> FigureDifference:
        """The difference of one figure, by its dotted key into the results.

        Parameters
        ----------
        key : str
            e.g. ``"constants.ke_V_s_per_rad"``.

        Returns
        -------
        FigureDifference

        Raises
        ------
        KeyError
            When the two results do not share the key.
        """
        for item in self.figures:
            if item.key == key:
                return item
        raise KeyError(key)


def compare(project_a: Project, project_b: Project, results_a: Results | None = None,
            results_b: Results | None = None) -> Comparison:
    """Evaluate both designs (unless their results are given) and difference them."""
    results_a = evaluate(project_a) if results_a is None else results_a
    results_b = evaluate(project_b) if results_b is None else results_b
    return Comparison(a=results_a, b=results_b, figures=difference(results_a, results_b))


def with_grade(project: Project, grade_name: str) -> Project:
    """The same design with a library magnet grade (an inline custom grade is dropped)."""
    from .library import magnet_grade

    magnet_grade(grade_name)  # an unknown name is a ProjectError naming magnets.grade
    return with_values(project, {"magnets.custom_grade": None, "magnets.grade": grade_name})
