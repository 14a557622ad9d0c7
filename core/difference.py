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
    a: float  #: A's figure, in the unit of the key (SI)
    b: float  #: B's figure, in the unit of the key (SI)
    difference: float  #: B − A, in the unit of the key
    fraction: float | None  #: (B − A)/|A|; None where A is zero or the key is a temperature in °C

    @property
    def percent(self) -> float | None:
        """(B − A)/|A| in per cent [%]; None where :attr:`fraction` is None."""
        return None if self.fraction is None else 100.0 * self.fraction


def _is_number(value: Any) -> bool:
    return (isinstance(value, (int, float, np.integer, np.floating)) and not isinstance(value, (bool, np.bool_))
            and math.isfinite(float(value)))


def _children(value: Any) -> dict[str, Any] | None:
    """The named parts of a dataclass or mapping; plot arrays are not figures and are left out."""
    if is_dataclass(value) and not isinstance(value, type):
        return {f.name: getattr(value, f.name) for f in fields(value)
                if f.name not in ("curve", "curves", "quoted")  # a check's quoted numbers are in its message
                and not isinstance(getattr(value, f.name), np.ndarray)}
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
            matched = []
            for name, item in zip(names_a, a, strict=True):
                if name in by_name:
                    paired = _pair(item, by_name[name], key, leaf)
                    if paired is not _SKIP:
                        matched.append({"name": name, **paired})
            return matched or _SKIP
        if len(a) == len(b):
            in_order = [p for p in (_pair(x, y, key, leaf) for x, y in zip(a, b, strict=True)) if p is not _SKIP]
            return in_order or _SKIP
    return _SKIP


def _fraction(key: str, a, b) -> float | None:
    # °C is an offset scale: a per cent of it means nothing.
    if key.endswith("_C") or float(a) == 0.0:
        return None
    return (float(b) - float(a)) / abs(float(a))


def nested_difference(a: Any, b: Any, relative: bool = False) -> Any:
    """B − A (or (B − A)/|A| when ``relative``) for every number two nested structures share.

    Parameters
    ----------
    a, b : Results, dict or any nesting of dataclasses, dicts, lists and numbers
        Results dataclasses or their JSON dicts (SI, temperatures in °C).
    relative : bool, optional
        Give (B − A)/|A| [1] instead of B − A; keys in °C and figures where A is 0 are then left out.

    Returns
    -------
    dict
        The nesting and keys of ``a``, numbers only (plus the ``name`` of matched list items), in the
        unit of each key ([1] when ``relative``); what is not a number on both sides is left out.
    """
    def leaf(key: str, x: Any, y: Any) -> Any:
        if relative:
            value = _fraction(key, x, y)
            return _SKIP if value is None else value
        return y - x

    result = _pair(a, b, "", leaf)
    return {} if result is _SKIP else result


def flatten(nested: Any, prefix: str = "") -> Iterator[tuple[str, Any]]:
    """(dotted key, value) for every leaf of a :func:`nested_difference`; list items by name.

    Parameters
    ----------
    nested : dict, list or number
        A :func:`nested_difference` or a part of it.
    prefix : str, optional
        Dotted key of ``nested`` itself ("" at the top).

    Yields
    ------
    tuple of (str, Any)
        The dotted key (list items as ``cases[stall, cold]``) and the leaf's value.
    """
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
    """Every number the two results share, flattened to dotted keys, with B − A.

    Parameters
    ----------
    a, b : Results
        The two evaluations (SI, temperatures in °C).

    Returns
    -------
    tuple of FigureDifference
        In A's order; plot arrays are left out.
    """
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
            A's and B's figure and their difference, in the unit the key names.

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
    """Evaluate both designs (unless their results are given) and difference them.

    Parameters
    ----------
    project_a, project_b : Project
        The two designs.
    results_a, results_b : Results or None, optional
        Their evaluations, when the caller has them already.

    Returns
    -------
    Comparison
        Both results and every difference.

    Raises
    ------
    MagneticCircuitError
        When a design that has to be evaluated has no magnetic solution.
    """
    results_a = evaluate(project_a) if results_a is None else results_a
    results_b = evaluate(project_b) if results_b is None else results_b
    return Comparison(a=results_a, b=results_b, figures=difference(results_a, results_b))


def with_grade(project: Project, grade_name: str) -> Project:
    """The same design with a library magnet grade (an inline custom grade is dropped), priced as that grade.

    The project's ``prices.magnet_per_kg`` is the price of its own grade, so it is dropped with the grade
    and the new grade's typical library price applies (:func:`core.magnet_grades.magnet_price_per_kg`);
    it is kept only when the new grade has no price in the project's currency.

    Parameters
    ----------
    project : Project
        The design.
    grade_name : str
        A grade of the library (:func:`library.magnet_grades`).

    Returns
    -------
    Project
        The changed design, validated.

    Raises
    ------
    ProjectError
        Naming ``magnets.grade`` when there is no such grade.
    """
    from .library import magnet_grade

    grade = magnet_grade(grade_name)  # an unknown name is a ProjectError naming magnets.grade
    changes: dict[str, Any] = {"magnets.custom_grade": None, "magnets.grade": grade_name}
    if grade_name != project.magnets.grade and grade.price_per_kg is not None \
            and grade.price_currency == project.prices.currency:
        changes["prices.magnet_per_kg"] = None
    return with_values(project, changes)
