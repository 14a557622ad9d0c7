"""The free variables of a sizing search, the box they span and a space-filling sample of it.

A free variable is a key of the project file with a range (``magnets.thickness_mm=2:10``), a whole
number range (``winding.turns_per_coil=10:60``), or a list of choices: magnet grades, steels, the
standard wire sizes between two sizes (AWG gauges, or the IEC 60317-0-1 R20 metric series), the pole
counts the schema allows. Every range end is checked against the schema's limits here, so every
sampled value is one a file may hold.

The box is sampled on the unit cube (scipy.stats.qmc: a scrambled Sobol sequence, or a Latin hypercube)
and each coordinate mapped to its variable by :func:`from_unit`: numbers linearly, whole numbers and
choices by equal-width bins (every whole number and every choice gets the same share of the cube).

References
----------
.. [1] I. M. Sobol', "On the distribution of points in a cube and the approximate evaluation of
   integrals", USSR Comput. Math. Math. Phys. 7 (1967) 86-112; scipy.stats.qmc.Sobol.
.. [2] M. D. McKay, R. J. Beckman, W. J. Conover, "A comparison of three methods for selecting values
   of input variables", Technometrics 21 (1979) 239-245 (Latin hypercube); scipy.stats.qmc.LatinHypercube.
.. [3] ASTM B258 (AWG) and IEC 60317-0-1 (metric nominal diameters), through :mod:`core.conductors`.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np
from scipy.stats import qmc

from . import library
from .conductors import METRIC_DIAMETERS_MM, parse_wire_size, wire_series
from .edits import get_value
from .errors import ProjectError
from .keys import KeySpec, key_spec, key_specs
from .schema import Project

#: The keys that take choices by name, and which library list they come from.
GRADE_KEY = "magnets.grade"
STEEL_KEYS = {"housing.steel": "housing", "armature.steel": "lamination"}
WIRE_KEY = "winding.wire"
CHOICE_KEYS = (GRADE_KEY, *STEEL_KEYS, WIRE_KEY)

#: Sections that state the requirement or the study, not the motor: never free (the requirement is
#: what a design must meet; change it with ``--set``).
_REQUIREMENT_SECTIONS = ("project", "supply", "load", "temperatures", "prices", "tolerances")
#: Keys of the motor's sections that are requirements or limits, not dimensions of the motor.
_REQUIREMENT_KEYS = frozenset({"housing.max_outer_diameter_mm", "housing.max_length_mm",
                               "magnets.required_margin_pct_of_HcJ"})
_AWG = re.compile(r"^\s*AWG\s*(\d{1,2})\s*$", re.IGNORECASE)


@dataclass(frozen=True)
class FreeRange:
    """One free variable of a search: a numeric range, a whole-number range or a list of choices."""

    key: str  #: schema key, e.g. "magnets.thickness_mm"
    low: float | None  #: lowest value in the key's file unit (mm, deg, 1); None for choices
    high: float | None  #: highest value in the key's file unit; None for choices
    integer: bool  #: a whole-number key (slots, turns per coil, segments)
    choices: tuple[str, ...] = ()  #: grades, steels, wire sizes or pole counts, as the file writes them

    @property
    def is_choice(self) -> bool:
        """Whether the variable takes one of :attr:`choices` [1]."""
        return bool(self.choices)


@dataclass(frozen=True)
class FreeKey:
    """A numeric key a user may free, as the GUI's table of free variables lists it."""

    key: str  #: dotted key
    label: str  #: the schema's one-sentence description
    unit: str  #: the file's unit ("" for a count)
    low_limit: float | None  #: the schema's lowest value, or None
    high_limit: float | None  #: the schema's highest value, or None
    integer: bool  #: a whole-number key
    current: float | int  #: the project's value


def _limits_text(spec: KeySpec) -> str:
    unit = f" {spec.unit}" if spec.unit and spec.unit != "1" else ""
    low = "-inf" if spec.minimum is None else f"{spec.minimum:g}"
    high = "inf" if spec.maximum is None else f"{spec.maximum:g}"
    return f"{low} to {high}{unit}"


def _number(key: str, text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise ProjectError(f"{key}: range end {text!r} is not a number", key=key) from None
    if not math.isfinite(value):
        raise ProjectError(f"{key}: range end {text!r} is not a finite number", key=key)
    return value


def _wire_range(key: str, low_text: str, high_text: str) -> FreeRange:
    """The standard wire sizes between two sizes: AWG gauges, or R20 metric bare diameters [mm]."""
    low_awg, high_awg = _AWG.match(low_text), _AWG.match(high_text)
    if low_awg and high_awg:
        gauges = sorted((int(low_awg.group(1)), int(high_awg.group(1))))
        for gauge in gauges:
            try:
                parse_wire_size(f"AWG {gauge}")
            except ValueError as error:
                raise ProjectError(f"{key}: {error}", key=key) from None
        return FreeRange(key, None, None, False, wire_series(f"AWG {gauges[0]}")[gauges[0]:gauges[1] + 1])
    if low_awg or high_awg:
        raise ProjectError(f"{key}: give both ends as AWG sizes ('AWG 22:AWG 30') or both as metric bare "
                           "diameters in mm ('0.30:0.60')", key=key)
    low = _number(key, low_text.strip().removesuffix("mm").strip())
    high = _number(key, high_text.strip().removesuffix("mm").strip())
    low, high = min(low, high), max(low, high)
    smallest, largest = METRIC_DIAMETERS_MM[0], METRIC_DIAMETERS_MM[-1]
    if low < smallest - 5e-4 or high > largest + 5e-4:
        raise ProjectError(f"{key}: {low:g} to {high:g} mm lies outside the metric series of IEC 60317-0-1 "
                           f"(allowed {smallest:g} to {largest:g} mm)", key=key)
    sizes = tuple(size for size, d in zip(wire_series(f"{smallest} mm"), METRIC_DIAMETERS_MM, strict=True)
                  if low - 5e-4 <= d <= high + 5e-4)
    if not sizes:
        raise ProjectError(f"{key}: no standard metric size lies between {low:g} and {high:g} mm", key=key)
    return FreeRange(key, None, None, False, sizes)


def parse_free(text: str, project: Project) -> FreeRange:
    """A free variable from its command-line form, its range checked against the schema's limits.

    Parameters
    ----------
    text : str
        ``KEY=LOW:HIGH`` in the key's file unit (``"magnets.thickness_mm=2:10"``,
        ``"winding.turns_per_coil=10:60"``, ``"motor.poles=2:6"``), ``"winding.wire=AWG 22:AWG 30"`` or
        ``"winding.wire=0.30:0.60"`` (metric bare diameters [mm]), or ``KEY=A,B,C`` for grades and
        steels (``"magnets.grade=Y30BH,Y40"``).
    project : Project
        The design the search starts from (a key must be one it can change).

    Returns
    -------
    FreeRange
        The variable; whole-number keys keep whole-number ends.

    Raises
    ------
    ProjectError
        Naming the key and the schema's limit when an end lies outside what a file accepts, the key is
        unknown, not numeric, a requirement rather than a dimension, or the text is malformed.

    References
    ----------
    .. [1] module docstring.
    """
    key, sep, rest = text.partition("=")
    key, rest = key.strip(), rest.strip()
    if not sep or not key or not rest:
        raise ProjectError(f"{text!r}: write a free variable as KEY=LOW:HIGH (e.g. magnets.thickness_mm=2:10)",
                           key=key or "free")
    if key == GRADE_KEY:
        return grade_choices([name.strip() for name in rest.split(",")], project)
    if key in STEEL_KEYS:
        return steel_choices(key, [name.strip() for name in rest.split(",")], project)
    if key == WIRE_KEY:
        low_text, colon, high_text = rest.partition(":")
        if not colon:
            raise ProjectError(f"{key}: write the range as two sizes, 'AWG 22:AWG 30' or '0.30:0.60'", key=key)
        return _wire_range(key, low_text, high_text)
    spec = key_spec(key)  # raises naming an unknown key
    section = key.split(".")[0]
    if section in _REQUIREMENT_SECTIONS or key in _REQUIREMENT_KEYS:
        raise ProjectError(f"{key}: is part of the requirement, not a dimension of the motor; change it with "
                           "--set, not --free", key=key)
    low_text, colon, high_text = rest.partition(":")
    if not colon:
        raise ProjectError(f"{key}: write the range as LOW:HIGH (e.g. {key}=1:5)", key=key)
    low, high = sorted((_number(key, low_text), _number(key, high_text)))
    if spec.kind == "choice" and all(isinstance(c, int) and not isinstance(c, bool) for c in spec.choices):
        picked = tuple(str(c) for c in spec.choices if low <= c <= high)
        if not picked:
            raise ProjectError(f"{key}: no allowed value lies between {low:g} and {high:g} (allowed: "
                               + ", ".join(str(c) for c in spec.choices) + ")", key=key)
        return FreeRange(key, None, None, True, picked)
    if spec.kind not in ("float", "int"):
        raise ProjectError(f"{key}: is not a numeric key (it is a {spec.kind}); only numbers, whole numbers, "
                           "grades, steels and wire sizes can be freed", key=key)
    if spec.kind == "int" and (low != int(low) or high != int(high)):
        raise ProjectError(f"{key}: is a whole number; give whole-number range ends, not {low:g}:{high:g}", key=key)
    for end in (low, high):
        if (spec.minimum is not None and end < spec.minimum) or (spec.maximum is not None and end > spec.maximum):
            raise ProjectError(f"{key}: range end {end:g} lies outside what a file accepts "
                               f"(allowed {_limits_text(spec)})", key=key)
    if get_value(project, key) is None:
        raise ProjectError(f"{key}: the project leaves this optional key out (the tool estimates it); give it a "
                           "value in the file before freeing it", key=key)
    if spec.kind == "int":
        return FreeRange(key, float(int(low)), float(int(high)), True)
    return FreeRange(key, low, high, False)


def grade_choices(names: Sequence[str], project: Project) -> FreeRange:
    """The magnet grades a search may choose from.

    Parameters
    ----------
    names : sequence of str
        Library grade names (``pmdc-sizer grades`` lists them).
    project : Project
        The design the search starts from.

    Returns
    -------
    FreeRange
        ``magnets.grade`` with the names as its choices, in the order given, repeats dropped.

    Raises
    ------
    ProjectError
        Naming ``magnets.grade`` and the known grades, for an unknown name or an empty list.

    References
    ----------
    .. [1] the grade library, :mod:`core.library`.
    """
    picked = tuple(dict.fromkeys(n for n in names if n))
    known = library.magnet_grades()
    if not picked:
        raise ProjectError(f"{GRADE_KEY}: give at least one grade (known: {', '.join(sorted(known))})",
                           key=GRADE_KEY)
    for name in picked:
        if name not in known:
            raise ProjectError(f"{GRADE_KEY}: unknown grade {name!r} (known: {', '.join(sorted(known))})",
                               key=GRADE_KEY)
    return FreeRange(GRADE_KEY, None, None, False, picked)


def steel_choices(key: str, names: Sequence[str], project: Project) -> FreeRange:
    """The steels a search may choose from for the housing or the armature stack.

    Parameters
    ----------
    key : str
        ``"housing.steel"`` or ``"armature.steel"``.
    names : sequence of str
        Library steel names.
    project : Project
        The design the search starts from.

    Returns
    -------
    FreeRange
        The key with the names as its choices, repeats dropped.

    Raises
    ------
    ProjectError
        Naming the key, for another key, an empty list or a steel the library lacks for that part.

    References
    ----------
    .. [1] the steel library, :mod:`core.library`.
    """
    if key not in STEEL_KEYS:
        raise ProjectError(f"{key}: steels are chosen for {' or '.join(STEEL_KEYS)} only", key=key)
    picked = tuple(dict.fromkeys(n for n in names if n))
    if not picked:
        raise ProjectError(f"{key}: give at least one steel", key=key)
    for name in picked:
        library.steel(name, STEEL_KEYS[key], key)  # raises naming the key and the known steels
    return FreeRange(key, None, None, False, picked)


def free_keys(project: Project) -> tuple[FreeKey, ...]:
    """Every numeric key of the motor a user may free, with its limits and the project's value.

    Parameters
    ----------
    project : Project
        The design the search starts from.

    Returns
    -------
    tuple of FreeKey
        In file order; requirement keys (supply, load, temperatures, envelope limits, required margin),
        prices, tolerances, the inline grade's data and optional keys the project leaves out are not listed.

    References
    ----------
    .. [1] the schema, :mod:`core.schema`.
    """
    out = []
    for spec in key_specs():
        section = spec.path.split(".")[0]
        if (section in _REQUIREMENT_SECTIONS or spec.path in _REQUIREMENT_KEYS or ".custom_grade." in spec.path
                or spec.path == "format_version"):
            continue
        integer_choice = spec.kind == "choice" and all(isinstance(c, int) and not isinstance(c, bool)
                                                       for c in spec.choices)
        if spec.kind not in ("float", "int") and not integer_choice:
            continue
        current = get_value(project, spec.path)
        if current is None:
            continue
        low = min(spec.choices) if integer_choice else spec.minimum
        high = max(spec.choices) if integer_choice else spec.maximum
        out.append(FreeKey(spec.path, spec.description, spec.unit, low, high, spec.kind != "float", current))
    return tuple(out)


def sample_unit(dimensions: int, count: int, seed: int, method: str = "sobol") -> np.ndarray:
    """A space-filling sample of the unit cube, scrambled with the seed.

    Parameters
    ----------
    dimensions : int
        Number of free variables [1].
    count : int
        Number of points [1]; a Sobol sample is drawn to the next power of two and cut.
    seed : int
        Seed of the scrambling: the same seed gives the same points.
    method : str, optional
        ``"sobol"`` (scrambled Sobol) or ``"lhs"`` (Latin hypercube).

    Returns
    -------
    ndarray
        Shape (count, dimensions), in [0, 1).

    References
    ----------
    .. [1] module docstring.
    """
    if method == "sobol":
        sampler: qmc.QMCEngine = qmc.Sobol(dimensions, scramble=True, seed=seed)
        power = max(math.ceil(math.log2(max(count, 2))), 1)
        return np.asarray(sampler.random_base2(power)[:count])
    if method == "lhs":
        return np.asarray(qmc.LatinHypercube(dimensions, seed=seed).random(count))
    raise ValueError(f"sampling method {method!r}: use 'sobol' or 'lhs'")


def from_unit(free: Sequence[FreeRange], unit: np.ndarray) -> dict[str, np.ndarray]:
    """The free variables' values at points of the unit cube.

    Parameters
    ----------
    free : sequence of FreeRange
        The variables, one per column of ``unit``.
    unit : ndarray
        Shape (n, len(free)), in [0, 1].

    Returns
    -------
    dict of str to ndarray
        Key to the n values in its file unit: floats, whole numbers as int64, choices as str arrays.

    References
    ----------
    .. [1] module docstring (equal-width bins for whole numbers and choices).
    """
    unit = np.clip(np.asarray(unit, dtype=float), 0.0, 1.0)
    out: dict[str, np.ndarray] = {}
    for column, variable in enumerate(free):
        u = unit[:, column]
        if variable.is_choice:
            index = np.minimum((u * len(variable.choices)).astype(int), len(variable.choices) - 1)
            out[variable.key] = np.array(variable.choices, dtype=object)[index].astype(str)
        elif variable.integer:
            low, high = int(variable.low), int(variable.high)  # type: ignore[arg-type]
            out[variable.key] = np.minimum(low + (u * (high - low + 1)).astype(np.int64), high)
        else:
            out[variable.key] = variable.low + u * (variable.high - variable.low)  # type: ignore[operator]
    return out


def file_value(variable: FreeRange, value: object) -> float | int | str:
    """One sampled value as the project file writes it (an int pole count from its choice, a float).

    Parameters
    ----------
    variable : FreeRange
        The variable.
    value : object
        A value :func:`from_unit` gave for it.

    Returns
    -------
    float, int or str
        In the key's file unit and type.

    References
    ----------
    .. [1] the schema, :mod:`core.schema`.
    """
    if variable.is_choice:
        return int(str(value)) if variable.integer else str(value)
    if variable.integer:
        return int(value)  # type: ignore[call-overload,no-any-return]
    return float(value)  # type: ignore[arg-type]


def values_at(free: Sequence[FreeRange], values: Mapping[str, np.ndarray], index: int) -> dict[str, float | int | str]:
    """The file values of candidate ``index``.

    Parameters
    ----------
    free : sequence of FreeRange
        The variables.
    values : mapping of str to ndarray
        What :func:`from_unit` returned.
    index : int
        The candidate.

    Returns
    -------
    dict
        Key to value in its file unit and type.

    References
    ----------
    .. [1] the schema, :mod:`core.schema`.
    """
    return {v.key: file_value(v, values[v.key][index]) for v in free}


@dataclass(frozen=True)
class SizingSpec:
    """What a search frees, what it optimises and how hard it looks."""

    free: tuple[FreeRange, ...]  #: the free variables (grades and steels as choices too)
    objectives: tuple[str, ...] = ("mass",)  #: names of :data:`core.sizing_objectives.OBJECTIVES`
    candidates: int = 20_000  #: the space-filling sample [1]
    seed: int = 1  #: the same seed gives the same designs
    generations: int = 30  #: NSGA-II generations of the refinement [1]; 0 skips it
    population: int = 200  #: NSGA-II population [1]



__all__ = ["CHOICE_KEYS", "FreeKey", "FreeRange", "SizingSpec", "file_value", "free_keys", "from_unit", "grade_choices",
           "parse_free", "sample_unit", "steel_choices", "values_at"]
