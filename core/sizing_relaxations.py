"""What would make a sizing search's closest design pass: the same design re-evaluated, relaxed or widened.

:func:`relaxations` re-evaluates designs with the requirement relaxed (a higher supply voltage, a lower
rated torque or speed, a cooler hottest ambient, a higher insulation class) and :func:`range_extensions`
with a free variable stepped beyond the end of its range (:func:`binding_ranges` names those it presses
against), each grid through :func:`core.batch.evaluate_many` in ascending blocks that stop at the first
pass; every number said is one the chain computed. :mod:`core.sizing_shortfall` puts them into the explanation.

References
----------
.. [1] the checks of :func:`core.checks.run_checks`; IEC 60085 thermal classes.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

import numpy as np

from .batch import BatchFigures, evaluate_many
from .design import design_from_project
from .edits import with_values
from .errors import ProjectError
from .keys import key_spec
from .schema import Project
from .sizing_candidates import project_with
from .sizing_requirement import faults_must_survive, meets_requirement, requirement_misses
from .sizing_space import FreeRange

#: The supply voltages tried, as multiples of the file's (the first that passes is reported).
VOLTAGE_STEPS = tuple(1.0 + 0.025 * i for i in range(1, 41))  # +2.5 % ... +100 %
#: The rated torques tried, as fractions of the file's.
TORQUE_STEPS = tuple(1.0 - 0.025 * i for i in range(1, 37))  # -2.5 % ... -90 %
#: The step of the hottest ambient tried [K], down to the nominal ambient.
AMBIENT_STEP_K = 2.5
#: A free variable within this share of its range's width from an end "presses against" that end.
BOUND_SHARE = 0.03
#: The checks no relaxation tried here can change: the iron's flux densities are the nominal case's at no
#: load (the nominal ambient is not relaxed), the slot fill and the envelope are the part's geometry. A design
#: that fails one of them cannot pass at any supply, rated load, hottest ambient or insulation class, so it
#: is not re-evaluated relaxed.
FIXED_CHECKS = ("housing_flux_density", "tooth_flux_density", "core_flux_density", "slot_fill", "envelope")


def value_text(key: str, value: object) -> str:
    """A key and its value with the key's file unit: ``"magnets.thickness_mm = 9.6 mm"``.

    The core's sentences name fields by their keys; the edges word them with the field's label
    (``app.field_labels.worded_keys``: "magnet thickness 9.6 mm").

    Parameters
    ----------
    key : str
        The project key.
    value : float, int or str
        Its value in the key's file unit.

    Returns
    -------
    str
        Four significant figures for a number; a choice as it is written.
    """
    if isinstance(value, str):
        return f"{key} = {value}"
    return f"{key} = {value:.4g}" + _unit_after(key)


def _with_unit(key: str, value: float) -> str:
    """A range end as the user typed it, with the key's file unit: "8 mm"."""
    return f"{value:g}{_unit_after(key)}"


def _unit_after(key: str) -> str:
    unit = key_spec(key).unit
    return f" {unit}" if unit and unit != "1" else ""


def _pressed_end(variable: FreeRange, value: object) -> float | None:
    """-1 or +1 when a numeric value lies within ``BOUND_SHARE`` of its range's low or high end, else None."""
    if variable.choices or variable.low is None or variable.high is None or variable.high <= variable.low:
        return None
    width = variable.high - variable.low
    if float(value) <= variable.low + BOUND_SHARE * width:  # type: ignore[arg-type]
        return -1.0
    if float(value) >= variable.high - BOUND_SHARE * width:  # type: ignore[arg-type]
        return 1.0
    return None


def binding_ranges(free: Sequence[FreeRange], values: Mapping[str, object]) -> list[str]:
    """The free variables a design presses against the end of their ranges, in words.

    Parameters
    ----------
    free : sequence of FreeRange
        The search's free variables (numeric ranges; choices are skipped).
    values : mapping of str to object
        The design's values in the keys' file units.

    Returns
    -------
    list of str
        One phrase per free variable within ``BOUND_SHARE`` of an end, in the order of ``free``, e.g.
        ``"winding.turns_per_coil at the low end of its range (10)"``.

    References
    ----------
    .. [1] module docstring (``BOUND_SHARE`` of the range's width).
    """
    out = []
    for variable in free:
        pressed = _pressed_end(variable, values[variable.key])
        if pressed is None:
            continue
        side, end = ("low", variable.low) if pressed < 0 else ("high", variable.high)
        if end is not None:  # a pressed end is a numeric range's (_pressed_end)
            out.append(f"{variable.key} at the {side} end of its range ({_with_unit(variable.key, end)})")
    return out


#: Values tried between the last grid step that fails and the first that passes, to report the least
#: relaxation to a fifth of the grid's step (one more batch).
REFINE_POINTS = 4


def _least_passing(designs: Sequence[Project], key: str, start: float,
                   values: Sequence[float]) -> tuple[float | str | None, int, str]:
    """As :func:`_first_passing` over the grid ``values``, then refined between the first passing value and
    the one before it (``start``, the requirement itself, before the first) by :data:`REFINE_POINTS` more."""
    found, who, still = _first_passing(designs, key, values)
    if not isinstance(found, float):
        return found, who, still
    index = min(range(len(values)), key=lambda i: abs(values[i] - found))
    before = start if index == 0 else values[index - 1]
    between = [before + (found - before) * (i + 1) / (REFINE_POINTS + 1) for i in range(REFINE_POINTS)]
    finer, finer_who, _ = _first_passing(designs, key, between)
    return (finer, finer_who, "") if finer is not None else (found, who, still)


#: Grid values evaluated per batch: the grid is walked in ascending blocks and stops at the first block with a
#: design that passes, which gives the same first value as the whole grid at once, at a fraction of the cost.
_BLOCK_VALUES = 8


def _first_passing(designs: Sequence[Project], key: str,
                   values: Sequence[float] | Sequence[str]) -> tuple[float | str | None, int, str]:
    """The first value of ``key`` (in order) at which one of ``designs`` passes every check, which one, and,
    when none does, what still fails for the first design at the last value."""
    spec = key_spec(key)
    low = -np.inf if spec.minimum is None else spec.minimum
    high = np.inf if spec.maximum is None else spec.maximum
    accepted: list[float | str] = [v if isinstance(v, str) else round(v, 6) for v in values
                                   if isinstance(v, str) or low <= v <= high]
    if not accepted:
        return None, -1, ""
    must_survive = faults_must_survive(designs[0])
    outcome: tuple[list[tuple[float | str, int]], BatchFigures] | None = None  # the last block: owners, batch
    for start in range(0, len(accepted), _BLOCK_VALUES):
        built, owners = [], []
        for value in accepted[start:start + _BLOCK_VALUES]:
            for index, project in enumerate(designs):
                try:
                    built.append(design_from_project(with_values(project, {key: value})))
                except ProjectError:
                    continue
                owners.append((value, index))
        if not built:
            continue
        batch = evaluate_many(built)
        passing = np.flatnonzero(meets_requirement(batch, must_survive))
        if passing.size:
            value, index = owners[int(passing[0])]
            return value, index, ""
        outcome = (owners, batch)
    if outcome is None:
        return None, -1, ""
    owners, batch = outcome
    last = max(i for i, (_, owner) in enumerate(owners) if owner == owners[0][1])
    still = [k for k, miss in requirement_misses(batch.status, must_survive).items() if miss[last]]
    return None, -1, ", ".join(k.replace("_", " ") for k in still) if still else "the chain"


#: The envelope keys: a design refused by one of them is tried again without it, to say what it would need.
ENVELOPE_KEYS = ("housing.max_outer_diameter_mm", "housing.max_length_mm")
#: Steps beyond a range's end tried for a binding free variable, as shares of the range's width.
EXTENSION_STEPS = (0.1, 0.2, 0.35, 0.5)


def range_extensions(project: Project, free: Sequence[FreeRange], values: Mapping[str, object]) -> list[str]:
    """Whether the design passes once a range it presses against is widened, found by re-evaluating it.

    For each numeric free variable at the end of its range (:func:`binding_ranges`), the design is built
    with the value stepped beyond that end (``EXTENSION_STEPS`` of the range's width, whole numbers for
    counts, within the schema's limits) and evaluated through :func:`core.batch.evaluate_many`. A value the
    envelope refuses (a fit rule on ``ENVELOPE_KEYS``) is tried without that limit, and the sentence says
    what envelope it would need.

    Parameters
    ----------
    project : Project
        The design (the closest candidate), with the search's requirement.
    free : sequence of FreeRange
        The search's free variables.
    values : mapping of str to object
        The design's free values, in file units.

    Returns
    -------
    list of str
        One sentence per pressed range whose first widening passes every check (with the envelope it
        would need, if any), e.g. ``"with magnets.thickness_mm = 9.6 mm (beyond the range's 9) it passes
        every check"``.

    References
    ----------
    .. [1] module docstring; :func:`core.fit_rules.check_fit` (the envelope rule).
    """
    out = []
    for variable in free:
        sign = _pressed_end(variable, values[variable.key])
        if sign is None or variable.low is None or variable.high is None:
            continue
        end, width = (variable.low if sign < 0 else variable.high), variable.high - variable.low
        spec = key_spec(variable.key)
        tried: list[float | int] = []
        for step in EXTENSION_STEPS:
            beyond = end + sign * step * width
            candidate: float | int = max(round(beyond), 0) if variable.integer else round(beyond, 6)
            inside = ((spec.minimum is None or candidate >= spec.minimum)
                      and (spec.maximum is None or candidate <= spec.maximum))
            if inside and candidate != end and candidate not in tried:
                tried.append(candidate)
        built, labels = [], []
        for candidate in tried:
            changes: dict[str, object] = {variable.key: candidate}
            try:
                built.append(design_from_project(project_with(project, changes)))
                labels.append((candidate, ""))
            except ProjectError as error:
                if error.key not in ENVELOPE_KEYS:
                    continue
                try:
                    built.append(design_from_project(project_with(project, {**changes, error.key: None})))
                except ProjectError:
                    continue
                labels.append((candidate, error.key))
        if not built:
            continue
        batch = evaluate_many(built)
        passing = np.flatnonzero(meets_requirement(batch, faults_must_survive(project)))
        if not passing.size:
            continue
        candidate, envelope = labels[int(passing[0])]
        shown = value_text(variable.key, candidate)
        sentence = f"with {shown} (beyond the range's {_with_unit(variable.key, end)}) it passes every check"
        if envelope:
            design = built[int(passing[0])]
            needed = (2.0 * float(design.geometry.housing_outer_radius) if envelope.endswith("diameter_mm")
                      else float(design.geometry.housing_length))
            limit = project.housing.max_outer_diameter_mm if envelope.endswith("diameter_mm") else \
                getattr(project.housing, "max_length_mm", None)
            sentence += (f", but only with {envelope} widened to {1e3 * needed:.1f} mm "
                         f"(it is {limit:g} mm)")
        out.append(sentence)
    return out


def fixed_misses(designs: Sequence[Project]) -> list[tuple[str, ...]]:
    """Per design, the checks of :data:`FIXED_CHECKS` it fails: those no relaxation of the requirement changes.

    Parameters
    ----------
    designs : sequence of Project
        The designs, with the search's requirement.

    Returns
    -------
    list of tuple of str
        One tuple per design, in the order of :data:`FIXED_CHECKS`; empty where it fails none of them (or
        where it cannot be built or solved: the relaxed grids say what happens to it).

    References
    ----------
    .. [1] :func:`core.checks.run_checks` (where each of these checks takes its figure).
    """
    built, owners = [], []
    for index, project in enumerate(designs):
        try:
            built.append(design_from_project(project))
        except ProjectError:
            continue
        owners.append(index)
    out: list[tuple[str, ...]] = [() for _ in designs]
    if not built:
        return out
    batch = evaluate_many(built)
    rows = fixed_misses_of(batch, faults_must_survive(designs[0]), np.arange(len(built)))
    for row, index in enumerate(owners):
        out[index] = rows[row]
    return out


def fixed_misses_of(batch: BatchFigures, must_survive: bool, rows: np.ndarray) -> list[tuple[str, ...]]:
    """As :func:`fixed_misses`, read off designs already evaluated: ``rows`` of ``batch``.

    Parameters
    ----------
    batch : BatchFigures
        :func:`core.batch.evaluate_many` of the designs.
    must_survive : bool
        :func:`core.sizing_requirement.faults_must_survive` of the requirement.
    rows : ndarray of int
        The designs asked about.

    Returns
    -------
    list of tuple of str
        One tuple per row, in the order of :data:`FIXED_CHECKS`; empty where the chain failed.
    """
    misses = requirement_misses(batch.status, must_survive)
    return [() if batch.failed[row] else tuple(key for key in FIXED_CHECKS if key in misses and misses[key][row])
            for row in rows]


def relaxations(designs: Sequence[Project], failed_checks: Sequence[str],
                names: Sequence[str] | None = None,
                fixed: Sequence[tuple[str, ...]] | None = None) -> list[str]:
    """Relaxed requirements at which one of the given designs passes every check, found by re-evaluating them.

    Tries a higher supply voltage (``VOLTAGE_STEPS`` of the file's), a lower rated torque and, when the
    load fails, a lower required speed (``TORQUE_STEPS`` of the file's); when the winding or the magnets
    run too hot, a cooler hottest ambient (``AMBIENT_STEP_K`` steps down to the nominal) and each higher
    insulation class (IEC 60085); every design at every step in one
    batch of :func:`core.batch.evaluate_many`; reports the least relaxation of each kind that makes one of
    them pass (refined to a fifth of the grid's step by one more batch between the last step that fails and
    the first that passes), or, when none in the grid does, the checks still failing for the first design at the end of
    the grid.

    Parameters
    ----------
    designs : sequence of Project
        The designs (the closest candidates of a search, closest first), with the search's requirement.
    failed_checks : sequence of str
        The check keys the closest design fails (the voltage and the speed are tried when the load or the
        start fails; the torque always).
    names : sequence of str, optional
        How to name each design in the sentence ("the closest design", ...).
    fixed : sequence of tuple of str, optional
        :func:`fixed_misses` of ``designs``, when the caller has it. A design that fails one of
        :data:`FIXED_CHECKS` is not re-evaluated relaxed (no relaxation tried changes those checks); when
        the closest is such a design, the first sentence says so.

    Returns
    -------
    list of str
        Sentences, e.g. ``"with a 13.8 V supply (instead of 12 V) the closest design passes every check"``;
        empty when every design fails one of :data:`FIXED_CHECKS`.

    References
    ----------
    .. [1] :func:`core.batch.evaluate_many` (the same chain and checks as :func:`core.evaluate.evaluate`).
    """
    if not designs:
        return []
    names = list(names) if names is not None else [f"design {i + 1}" for i in range(len(designs))]
    fixed = fixed_misses(designs) if fixed is None else fixed
    out = []
    if all(fixed):
        return []
    if fixed[0]:
        out.append(f"{names[0]} is left out (its {', '.join(k.replace('_', ' ') for k in fixed[0])} does not "
                   "depend on the supply, the rated load, the ambient or the insulation class)")
    kept = [i for i, keys in enumerate(fixed) if not keys]
    designs, names = [designs[i] for i in kept], [names[i] for i in kept]
    closest = "the closest" if kept[0] == 0 else names[0]
    first = designs[0]
    load_fails = bool({"load", "start"} & set(failed_checks))
    if load_fails:
        volts = float(first.supply.voltage_V)
        found, who, still = _least_passing(designs, "supply.voltage_V", volts,
                                           [volts * s for s in VOLTAGE_STEPS])
        if found is not None:
            out.append(f"with a {found:.3g} V supply (instead of {volts:g} V) {names[who]} passes every check")
        elif still:
            out.append(f"a supply of up to {volts * VOLTAGE_STEPS[-1]:.3g} V makes none of them pass "
                       f"({still} still failing for {closest})")
    torque = float(first.load.torque_mNm)
    speed = float(first.load.speed_rpm)
    found, who, still = _least_passing(designs, "load.torque_mNm", torque,
                                       [torque * s for s in TORQUE_STEPS])
    if found is not None:
        out.append(f"at a rated torque of {found:.3g} mN·m (instead of {torque:g} mN·m) at {speed:g} rpm "
                   f"{names[who]} passes every check")
    elif still:
        out.append(f"a rated torque as low as {torque * TORQUE_STEPS[-1]:.3g} mN·m makes none of them pass "
                   f"({still} still failing for {closest})")
    if load_fails:
        found, who, _ = _least_passing(designs, "load.speed_rpm", speed, [speed * s for s in TORQUE_STEPS])
        if found is not None:
            out.append(f"at a required speed of {found:.4g} rpm (instead of {speed:g} rpm) {names[who]} passes "
                       "every check")
    if {"thermal", "magnet_temperature"} & set(failed_checks):
        hottest = float(first.temperatures.ambient_max_C)
        nominal = float(first.temperatures.ambient_nominal_C)
        cooler = [hottest - AMBIENT_STEP_K * i for i in range(1, 41) if hottest - AMBIENT_STEP_K * i >= nominal]
        found, who, _ = _least_passing(designs, "temperatures.ambient_max_C", hottest, cooler)
        if found is not None:
            out.append(f"up to {found:g} °C ambient (instead of {hottest:g} °C) {names[who]} passes every check")
        classes = key_spec("winding.insulation_class").choices
        current = first.winding.insulation_class
        higher = list(classes[classes.index(current) + 1:]) if current in classes else []
        found, who, _ = _first_passing(designs, "winding.insulation_class", higher)
        if found is not None:
            out.append(f"with insulation class {found} (instead of {current}) {names[who]} passes every check")
    return out


__all__ = ["AMBIENT_STEP_K", "BOUND_SHARE", "ENVELOPE_KEYS", "EXTENSION_STEPS", "FIXED_CHECKS", "TORQUE_STEPS",
           "VOLTAGE_STEPS", "binding_ranges", "fixed_misses", "fixed_misses_of", "range_extensions", "relaxations",
           "value_text"]
