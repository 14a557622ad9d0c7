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

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from .design import Design, design_from_project
from .errors import MagneticCircuitError, ProjectError
from .geometry import Geometry
from .magnet_field_share import worst_share_field
from .magnets import GradeLots, MagnetGrade, require_ambient_inside_model
from .results import CaseResult, DemagnetizationCase, Results
from .schema import Project

#: Check verdicts as the status arrays carry them.
PASS_CODE, WARNING_CODE, FAIL_CODE = 0, 1, 2
_STATUS_CODE = {"pass": PASS_CODE, "warning": WARNING_CODE, "fail": FAIL_CODE}

_CASE_NAMES = ("cold", "nominal", "hot")
#: The demagnetization cases by a stable key: (kind, temperature label).
_DEMAGNETIZATION_KEYS = (*(f"{kind}_{label}" for label in ("cold", "hot")
                           for kind in ("stall", "reversal", "current_limit")),
                         "rotor_removed_cold", "rotor_removed_hot")
_FAULT_KEYS = ("stall_cold", "reversal_cold", "stall_hot", "reversal_hot")
#: Every check a design can carry (a check a design does not carry, e.g. the envelope without a limit,
#: counts as passed).
CHECK_KEYS = ("load", "load_points", "start", "demagnetization", "fault_demagnetization", "housing_flux_density",
              "tooth_flux_density", "core_flux_density", "slot_fill", "current_density", "brush_current_density",
              "commutator_speed", "reactance_voltage", "thermal", "magnet_temperature", "envelope")


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


def _optional(value: float | None) -> float:
    return float("nan") if value is None else float(value)


def _case_figures(case: CaseResult) -> dict[str, float]:
    return {
        "flux_per_pole_Wb": case.flux_per_pole_Wb,
        "ke_V_s_per_rad": case.ke_V_s_per_rad,
        "terminal_resistance_ohm": case.terminal_resistance_ohm,
        "magnet_temperature_C": case.magnet_temperature_C,
        "winding_temperature_C": case.winding_temperature_C,
        "no_load_speed_rad_per_s": case.no_load_speed_rad_per_s,
        "no_load_current_A": case.no_load_current_A,
        "stall_torque_N_m": case.stall_torque_N_m,
        "stall_current_A": case.stall_current_A,
        "flux_per_pole_stall_Wb": case.flux_per_pole_stall_Wb,
        "ke_stall_V_s_per_rad": case.ke_stall_V_s_per_rad,
        "rated_torque_N_m": case.rated.torque_N_m,
        "rated_speed_rad_per_s": case.rated.speed_rad_per_s,
        "rated_current_A": case.rated.current_A,
        "rated_input_power_W": case.rated.input_power_W,
        "rated_output_power_W": case.rated.output_power_W,
        "rated_efficiency": case.rated.efficiency,
        "current_limit_torque_N_m": _optional(case.current_limit_torque_N_m),
        "max_efficiency": case.max_efficiency,
        "max_efficiency_torque_N_m": case.max_efficiency_point.torque_N_m,
        "max_efficiency_speed_rad_per_s": case.max_efficiency_point.speed_rad_per_s,
        "max_efficiency_current_A": case.max_efficiency_point.current_A,
        "max_efficiency_output_power_W": case.max_efficiency_point.output_power_W,
        "max_output_power_W": case.max_output_power_W,
        "max_power_torque_N_m": case.max_power_point.torque_N_m,
        "max_power_speed_rad_per_s": case.max_power_point.speed_rad_per_s,
        "max_power_current_A": case.max_power_point.current_A,
        "max_power_efficiency": case.max_power_point.efficiency,
    }


def _demagnetization_key(case: DemagnetizationCase) -> str:
    label = "cold" if ", cold" in case.name else "hot"
    return f"{case.kind.replace(' ', '_')}_{label}"


def screening_figures(results: Results) -> dict[str, float]:
    """The screening figures of one evaluated design, under the names :func:`evaluate_many` gives them.

    Parameters
    ----------
    results : Results
        What :func:`core.evaluate.evaluate` returned for the design.

    Returns
    -------
    dict of str to float
        Figure name to value, SI (temperatures in °C); NaN where the design has no such figure.
    """
    r = results
    out: dict[str, float] = {}
    for temperature_case in r.cases:
        out.update({f"{temperature_case.name}.{name}": float(value)
                    for name, value in _case_figures(temperature_case).items()})
    m = r.magnetics
    out.update({
        "magnetics.airgap_flux_density_T": m.airgap_flux_density_mean_T,
        "magnetics.magnet_field_A_per_m": m.magnet_field_A_per_m,
        "magnetics.permeance_coefficient": m.permeance_coefficient,
        "magnetics.housing_flux_density_T": m.housing_flux_density_T,
        "magnetics.tooth_flux_density_T": m.tooth_flux_density_T,
        "magnetics.core_flux_density_T": m.core_flux_density_T,
        "magnetics.worst_magnet_field_A_per_m": m.worst_magnet_field_A_per_m,
    })
    c = r.constants
    out.update({
        "constants.machine_constant": c.machine_constant,
        "constants.ke_V_s_per_rad": c.ke_V_s_per_rad,
        "constants.terminal_resistance_ohm": c.terminal_resistance_ohm,
        "constants.inductance_H_estimate": c.inductance_H_estimate,
        "constants.electrical_time_constant_s_estimate": c.electrical_time_constant_s_estimate,
        "constants.mechanical_time_constant_s": c.mechanical_time_constant_s,
        "constants.rotor_inertia_kg_m2": c.rotor_inertia_kg_m2,
    })
    w = r.winding
    out.update({
        "winding.resistance_20C_ohm": w.resistance_20C_ohm,
        "winding.slot_fill_bare": w.slot_fill_bare,
        "winding.slot_fill_gross": w.slot_fill_gross,
        "winding.rated_current_density_A_per_m2": w.rated_current_density_A_per_m2,
    })
    demagnetization = {_demagnetization_key(c): c for c in r.demagnetization.cases}
    for key in _DEMAGNETIZATION_KEYS:
        found = demagnetization.get(key)
        out[f"demagnetization.{key}.margin_A_per_m"] = float("nan") if found is None else found.margin_A_per_m
        out[f"demagnetization.{key}.current_A"] = float("nan") if found is None else found.current_A
    out["worst_demagnetization_margin_A_per_m"] = r.demagnetization.worst_margin_A_per_m
    if r.faults is not None:
        faults = {_demagnetization_key(c): c for c in r.faults.cases}
        for key in _FAULT_KEYS:
            found = faults.get(key)
            out[f"faults.{key}.margin_A_per_m"] = float("nan") if found is None else found.margin_A_per_m
            out[f"faults.{key}.current_A"] = float("nan") if found is None else found.current_A
        out["faults.worst_margin_A_per_m"] = r.faults.worst_margin_A_per_m
    t = r.thermal
    out.update({
        "thermal.winding_temperature_C": t.winding_temperature_C,
        "thermal.housing_temperature_C": t.housing_temperature_C,
        "thermal.magnet_temperature_C": t.magnet_temperature_C,
        "thermal.steady_winding_temperature_C": t.steady_winding_temperature_C,
        "thermal.losses_W": t.losses_W,
        "thermal.time_to_limit_s": _optional(t.time_to_limit_s),
    })
    if r.ratings is not None:
        g = r.ratings
        out.update({
            "ratings.continuous_torque_N_m": g.continuous_torque_N_m,
            "ratings.continuous_current_A": g.continuous_current_A,
            "ratings.continuous_speed_rad_per_s": g.continuous_speed_rad_per_s,
            "ratings.continuous_output_power_W": g.continuous_output_power_W,
            "ratings.stall_current_A": g.stall_current_A,
            "ratings.stall_time_cold_s": _optional(g.stall_time_cold_s),
            "ratings.stall_time_hot_s": _optional(g.stall_time_hot_s),
        })
    out["load_points.least_speed_share"] = _least_speed_share(results)
    ms = r.mass
    out.update({f"mass.{f.name}": getattr(ms, f.name) for f in dataclasses.fields(ms)})
    out["mass.active_kg"] = ms.magnet_kg + ms.copper_kg + ms.housing_kg + ms.lamination_kg
    co = r.cost
    out.update({"cost.magnet": co.magnet, "cost.copper": co.copper, "cost.housing": co.housing,
                "cost.lamination": co.lamination, "cost.total": co.total})
    if r.commutation is not None:
        cm = r.commutation
        out.update({
            "commutation.brush_current_density_A_per_m2": cm.brush_current_density_A_per_m2,
            "commutation.surface_speed_m_per_s": cm.surface_speed_m_per_s,
            "commutation.reactance_voltage_V": cm.reactance_voltage_V,
        })
    return {name: float(value) for name, value in out.items()}


def _least_speed_share(results: Results) -> float:
    """The least share of a further point's required speed reached over the cases (NaN without points)."""
    required = results.further_point_required_speeds_rad_per_s
    shares = [(speed / need if np.isfinite(speed) else 0.0) for case in results.cases
              for speed, need in zip(case.further_point_speeds_rad_per_s, required, strict=True) if need > 0]
    return min(shares) if shares else float("nan")


def check_status(results: Results) -> dict[str, int]:
    """Each check's verdict as a code (0 pass, 1 warning, 2 fail); a check the design lacks passes.

    Parameters
    ----------
    results : Results
        One design's results.

    Returns
    -------
    dict of str to int
        Check key (:data:`CHECK_KEYS`) to its code.
    """
    codes = dict.fromkeys(CHECK_KEYS, PASS_CODE)
    codes.update({c.key: _STATUS_CODE[c.status] for c in results.checks})
    return codes


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
            figures, codes = _chain([resolved[i] for i in alive])
            break
        except _DesignsFailed as failure:
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


def stack_geometries(geometries: Sequence[Geometry]) -> Geometry:
    """One geometry of arrays from several geometries of floats.

    Parameters
    ----------
    geometries : sequence of Geometry
        The cross-sections, each with float fields.

    Returns
    -------
    Geometry
        Every field an array, element i from ``geometries[i]`` (in the fields' units, m and rad).
    """
    return Geometry(**{
        f.name: np.array([getattr(g, f.name) for g in geometries]) for f in dataclasses.fields(Geometry)
    })


# ----------------------------------------------------------------------------------------------
# The chain on arrays. Like the orchestrator it holds no formula: each step calls the topic module.


class _DesignsFailed(Exception):
    """Some designs of a chain raised: their positions in it and the messages."""

    def __init__(self, messages: dict[int, str]) -> None:
        super().__init__(f"{len(messages)} designs failed")
        self.messages = messages


@dataclass(frozen=True)
class _Steels:
    """The lamination steels' loss coefficients, per design (core.motor_model.LossCoefficients)."""

    hysteresis_coeff: np.ndarray
    hysteresis_exponent: np.ndarray
    eddy_coeff: np.ndarray
    excess_coeff: np.ndarray

    def at(self, rows) -> _Steels:
        return _Steels(self.hysteresis_coeff[rows], self.hysteresis_exponent[rows], self.eddy_coeff[rows],
                       self.excess_coeff[rows])


def _grade_family(grade: MagnetGrade) -> MagnetGrade:
    """The grade with its lot values (Br, HcJ, HcB, (BH)max) cleared: the lots of one grade share it, and
    the network takes those values per design (:class:`core.magnets.GradeLots`)."""
    return dataclasses.replace(grade, remanence=0.0, coercivity_hcj=0.0, coercivity_hcb=0.0, energy_product=0.0)


def _group_key(d: Design):
    g, w = d.geometry, d.winding
    return (_grade_family(d.magnet), id(d.housing_steel), id(d.lamination_steel), bool(d.shaft_magnetic),
            int(g.poles), int(g.slots), int(w.commutator_segments))


def _groups(designs: Sequence[Design]) -> list[np.ndarray]:
    groups: dict[object, list[int]] = {}
    for i, d in enumerate(designs):
        groups.setdefault(_group_key(d), []).append(i)
    return [np.array(members) for members in groups.values()]


def _solve_groups(designs, groups, geometry, lots: GradeLots, repeat: int, temperatures, currents,
                  rotor_present: bool, winding, what: str):
    """The pole states of every design at ``repeat`` (temperature, current) pairs each, group by group
    (each design's cross-section built once, its magnet lot's Br and HcJ per design).

    Returns the PoleState fields as arrays of shape (N, repeat, ...), or raises _DesignsFailed naming the
    designs whose network has no solution."""
    from . import pole_magnetics as pm

    count = len(designs)
    out: dict[str, np.ndarray] = {}
    failures: dict[int, str] = {}
    for members in groups:
        d = designs[members[0]]

        def solve(members, d=d):
            rows = np.repeat(members, repeat)  # the design of each entry
            part = Geometry(**{f.name: (getattr(d.geometry, f.name) if f.name in ("poles", "slots")
                                        else np.asarray(getattr(geometry, f.name))[members])
                               for f in dataclasses.fields(Geometry)})
            part_winding = None if winding is None else (int(d.geometry.poles), int(d.geometry.slots),
                                                          int(d.winding.commutator_segments),
                                                          winding[0][rows], winding[1][rows])
            return pm.pole_states_many(part, d.magnet, d.housing_steel, d.lamination_steel, d.shaft_magnetic,
                                       temperatures.reshape(count * repeat)[_flat(rows, repeat)],
                                       np.broadcast_to(currents, temperatures.shape).reshape(count * repeat)[
                                           _flat(rows, repeat)],
                                       rotor_present, part_winding, what,
                                       rows=np.repeat(np.arange(members.size), repeat), lots=lots.at(rows))
        try:
            states = solve(members)
        except MagneticCircuitError:
            for member in members:  # which of the group has no solution
                try:
                    solve(np.array([member]))
                except MagneticCircuitError as error:
                    failures[int(member)] = str(error)
            if failures:
                continue
            raise
        for f in dataclasses.fields(states):
            value = np.asarray(getattr(states, f.name))
            if f.name not in out:
                out[f.name] = np.zeros((count, repeat, *value.shape[1:]), dtype=value.dtype)
            out[f.name][members] = value.reshape(len(members), repeat, *value.shape[1:])
    if failures:
        raise _DesignsFailed(failures)
    return out


def _flat(rows: np.ndarray, repeat: int) -> np.ndarray:
    """Indices into a (N·repeat,) flattening of (N, repeat) for the rows ``rows`` (each repeated)."""
    return rows * repeat + np.tile(np.arange(repeat), rows.size // repeat)


def _chain(designs: list[Design]) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray]]:
    from .checks import (
        BRUSH_DENSITY_FAIL,
        CURRENT_DENSITY_WARNING,
        REACTANCE_FAIL,
        REACTANCE_WARNING,
        SATURATION_MARGIN,
        SLOT_FILL_BARE_WARNING,
        SLOT_FILL_GROSS_FAIL,
        SURFACE_SPEED_FAIL,
        SURFACE_SPEED_WARNING,
    )
    from .commutation import brush_current_density, brush_set, reactance_voltage, surface_speed
    from .magnetic_circuit import pole_circuit
    from .magnets import grade_lots, intrinsic_coercivity_at, knee_field_at, model_temperature_ranges_C
    from .margins import must_survive_faults
    from .mass import masses, material_cost, rotor_inertia
    from .motor_model import interp_rows
    from .performance import (
        MAXIMA,
        MotorModel,
        constant_at,
        electrical_time_constant,
        iron_loss_terms,
        largest_currents,
        limit_torque,
        mechanical_time_constant,
        operating_points,
        plugging_current,
        refined_maxima,
        stall_current,
        stall_torque,
    )
    from .pole_magnetics import LOAD_POINTS
    from .results import MassResult
    from .thermal import flux_grid_temperatures
    from .thermal_ratings import networks_of, thermal_figures
    from .winding import (
        armature_inductance_estimate,
        armature_resistance,
        back_emf_constant,
        current_density,
        machine_constant,
        mean_turn_length,
        parallel_paths,
        slot_fill,
        slot_share_of_turn,
        total_conductors,
        winding_length,
    )

    n = len(designs)
    rows_all = np.arange(n)

    def per(read, dtype=float) -> Any:
        return np.array([read(d) for d in designs], dtype=dtype)

    def optional(read) -> Any:
        return per(lambda d: np.nan if read(d) is None else read(d))

    g: Any = stack_geometries([d.geometry for d in designs])
    grades = [d.magnet for d in designs]
    voltage, brush_drop = per(lambda d: d.supply_voltage), per(lambda d: d.brush_drop)
    current_limit = optional(lambda d: d.current_limit)
    reversing = per(lambda d: d.reversing, bool)
    load_torque, load_speed = per(lambda d: d.load_torque), per(lambda d: d.load_speed)
    ambient_min, ambient_nominal, ambient_max = (per(lambda d: d.ambient_min_C), per(lambda d: d.ambient_nominal_C),
                                                 per(lambda d: d.ambient_max_C))
    friction, viscous = per(lambda d: d.losses.friction_torque), per(lambda d: d.losses.viscous_coeff)
    build_factor = per(lambda d: d.losses.iron_loss_build_factor)
    copper_area = per(lambda d: d.winding.wire.copper_area)
    resistivity = per(lambda d: d.winding.resistivity_factor)
    recoil = per(lambda d: d.magnet.recoil_permeability)
    steels = _Steels(*(per(lambda d, name=name: getattr(d.lamination_steel, name))
                       for name in ("hysteresis_coeff", "hysteresis_exponent", "eddy_coeff", "excess_coeff")))

    # 1. Materials: each grade's model range holds over the design's ambients (each distinct grade or
    # magnet lot taken once).
    distinct = {grade: position for position, grade in enumerate(dict.fromkeys(grades))}
    distinct_lots = grade_lots(list(distinct))
    lot_of = np.array([distinct[grade] for grade in grades], dtype=np.intp)
    lots = distinct_lots.at(lot_of)
    model_low, model_high = (values[lot_of] for values in model_temperature_ranges_C(distinct_lots))
    outside = np.flatnonzero(~((model_low < ambient_min) & (ambient_max < model_high)))
    if outside.size:
        failures = {}
        for i in outside:
            try:
                require_ambient_inside_model(designs[i].magnet, designs[i].ambient_min_C, designs[i].ambient_max_C)
            except MagneticCircuitError as error:
                failures[int(i)] = str(error)
        raise _DesignsFailed(failures)
    groups = _groups(designs)

    # 2. No-load magnetic circuit over each design's temperature grid.
    grid = flux_grid_temperatures(ambient_min, ambient_nominal, ambient_max,
                                  per(lambda d: d.magnet.max_working_temperature_C), model_high)
    # (the rising grid starts at the coldest ambient, the grid's first temperature: solved once)
    rising_grid = _solve_groups(designs, groups, g, lots, grid.shape[1] - 1, grid[:, 1:], 0.0, True, None,
                                "the magnetic circuit")
    no_load = {key: np.concatenate([values[:, 1:2], values], axis=1) for key, values in rising_grid.items()}
    grid_flux = no_load["flux_per_pole"]

    def flux_at(rows, temperature_C):
        return interp_rows(temperature_C, grid[rows, 2:], grid_flux[rows, 2:])

    # 3. Winding.
    paths = np.array([int(parallel_paths(d.winding.kind, d.geometry.poles, d.winding.multiplicity)) for d in designs])
    conductors = np.array([int(total_conductors(d.winding.commutator_segments, d.winding.turns_per_coil))
                           for d in designs])
    turn_length = _array(mean_turn_length(g, per(lambda d: d.winding.end_turn_factor)))
    wire_length = _array(winding_length(conductors, turn_length))

    def resistance_at(rows, temperature_C):
        return armature_resistance(conductors[rows], turn_length[rows], paths[rows], copper_area[rows], temperature_C,
                                   resistivity[rows])

    # 4. Constants.
    constant = _array(machine_constant(g.poles, conductors, paths))

    # 5. Masses; the iron loss scales the nominal tooth and core flux densities with the flux.
    part_masses = masses(g, per(lambda d: d.magnet.density), per(lambda d: d.housing_steel.density),
                         per(lambda d: d.lamination_steel.density), wire_length, copper_area,
                         optional(lambda d: d.brushes.commutator_diameter))
    nominal_flux = grid_flux[:, 1]
    tooth_b_per_flux = no_load["tooth_flux_density"][:, 1] / nominal_flux
    core_b_per_flux = no_load["core_flux_density"][:, 1] / nominal_flux
    teeth_mass, core_mass = _array(part_masses.teeth), _array(part_masses.core)

    def motor(rows, winding_C, flux, table=None) -> MotorModel:
        iron = iron_loss_terms(steels.at(rows), g.poles[rows],
                               ((teeth_mass[rows], tooth_b_per_flux[rows] * flux),
                                (core_mass[rows], core_b_per_flux[rows] * flux)), build_factor[rows])
        return MotorModel(voltage=voltage[rows], brush_drop=brush_drop[rows], resistance=resistance_at(rows, winding_C),
                          constant=back_emf_constant(constant[rows], flux), friction_torque=friction[rows],
                          viscous_coeff=viscous[rows], iron=iron,
                          constant_table=None if table is None else
                          (table[0], back_emf_constant(constant[rows][:, None], table[1])))

    # 6. Thermal: the duty's hot state, the continuous rating and the stall times at the highest ambient.
    network = networks_of(designs, part_masses, g)
    heat = thermal_figures(designs, network, lambda rows, winding_C, magnet_C: motor(rows, winding_C,
                                                                                     flux_at(rows, magnet_C)),
                           model_high)
    hot_winding, hot_magnet = heat.hot.winding_C, heat.hot.magnet_C

    # 7. The network at cold, nominal and hot against armature current; the rotor removed.
    case_winding = {"cold": ambient_min, "nominal": ambient_nominal, "hot": hot_winding}
    case_magnet = {"cold": ambient_min, "nominal": ambient_nominal, "hot": hot_magnet}
    largest = np.stack([largest_currents(motor(rows_all, case_winding[c], flux_at(rows_all, case_magnet[c])),
                                         current_limit) for c in _CASE_NAMES], axis=1)
    points = LOAD_POINTS
    currents = (np.linspace(0.0, 1.0, points)[None, None, :] * largest[:, :, None]).reshape(n, 3 * points)
    temperatures = np.repeat(np.stack([case_magnet[c] for c in _CASE_NAMES], axis=1), points, axis=1)
    # the cold and nominal cases at zero current are the no-load grid's first two temperatures: not solved again
    again = {0: 0, points: 1}  # entry of the load table: column of the no-load grid
    under_load = np.array([j for j in range(3 * points) if j not in again])
    solved = _solve_groups(designs, groups, g, lots, under_load.size, temperatures[:, under_load],
                           currents[:, under_load], True, (conductors, paths),
                           "the magnetic circuit under load (cold, nominal or hot)")
    loaded = {}
    for key, values in solved.items():
        loaded[key] = np.empty((n, 3 * points, *values.shape[2:]), dtype=values.dtype)
        loaded[key][:, under_load] = values
        for entry, column in again.items():
            loaded[key][:, entry] = no_load[key][:, column]
    rotor_out = _solve_groups(designs, groups, g, lots, 2, np.stack([ambient_min, ambient_max], axis=1), 0.0, False,
                              None, "the magnetic circuit with the rotor removed")
    table_currents = currents.reshape(n, 3, points)
    table_flux = loaded["flux_per_pole"].reshape(n, 3, points)

    # 8. Performance: the named points of each case, with Ke = K·Φ(I).
    out: dict[str, np.ndarray] = {}
    models = {}
    points_of = {}
    for index, name in enumerate(_CASE_NAMES):
        flux = table_flux[:, index, 0]
        model = motor(rows_all, case_winding[name], flux, (table_currents[:, index], table_flux[:, index]))
        models[name] = model
        stall = _array(stall_torque(model))
        no_load_point = operating_points(model, np.zeros(n))
        stall_point = operating_points(model, stall)
        rated = operating_points(model, np.minimum(load_torque, stall))
        rated_reached = load_torque < stall
        points_of[name] = (no_load_point, stall, rated, rated_reached)
        ke_stall = _array(constant_at(model, stall_point.current))
        efficiency_torque, power_torque = refined_maxima(model, stall, MAXIMA)
        best_efficiency, best_power = operating_points(model, efficiency_torque), operating_points(model, power_torque)
        figures_of_case = {
            "flux_per_pole_Wb": flux, "ke_V_s_per_rad": model.constant,
            "terminal_resistance_ohm": model.resistance, "magnet_temperature_C": case_magnet[name],
            "winding_temperature_C": case_winding[name],
            "no_load_speed_rad_per_s": no_load_point.speed, "no_load_current_A": no_load_point.current,
            "stall_torque_N_m": stall, "stall_current_A": stall_point.current,
            "flux_per_pole_stall_Wb": flux * ke_stall / model.constant, "ke_stall_V_s_per_rad": ke_stall,
            "rated_torque_N_m": rated.torque, "rated_speed_rad_per_s": rated.speed, "rated_current_A": rated.current,
            "rated_input_power_W": rated.input_power, "rated_output_power_W": rated.output_power,
            "rated_efficiency": rated.efficiency, "current_limit_torque_N_m": limit_torque(model, current_limit),
            "max_efficiency": best_efficiency.efficiency, "max_efficiency_torque_N_m": best_efficiency.torque,
            "max_efficiency_speed_rad_per_s": best_efficiency.speed,
            "max_efficiency_current_A": best_efficiency.current,
            "max_efficiency_output_power_W": best_efficiency.output_power,
            "max_output_power_W": best_power.output_power, "max_power_torque_N_m": best_power.torque,
            "max_power_speed_rad_per_s": best_power.speed, "max_power_current_A": best_power.current,
            "max_power_efficiency": best_power.efficiency,
        }
        out.update({f"{name}.{key}": _array(value) for key, value in figures_of_case.items()})

    # The nominal case's no-load magnetic circuit (the load table's nominal entry at zero current).
    nominal_row = 1 * points
    magnetics = {key: loaded[key][:, nominal_row] for key in (
        "airgap_flux_density_mean", "magnet_field", "permeance_coefficient", "housing_flux_density",
        "tooth_flux_density", "core_flux_density", "worst_field")}
    out.update({
        "magnetics.airgap_flux_density_T": magnetics["airgap_flux_density_mean"],
        "magnetics.magnet_field_A_per_m": magnetics["magnet_field"],
        "magnetics.permeance_coefficient": magnetics["permeance_coefficient"],
        "magnetics.housing_flux_density_T": magnetics["housing_flux_density"],
        "magnetics.tooth_flux_density_T": magnetics["tooth_flux_density"],
        "magnetics.core_flux_density_T": magnetics["core_flux_density"],
        "magnetics.worst_magnet_field_A_per_m": magnetics["worst_field"],
    })

    # 9. Demagnetization: the worst share of the magnet's field at each case's current, against the knee.
    share = per(lambda d: d.required_margin_share)

    def magnet_field_at(case: int, current):
        """The mean field over the magnet's worst area share at a current, each cell's field interpolated in
        I² (core.pole_magnetics, core.magnet_field_share)."""
        fields = loaded["cell_field"].reshape(n, 3, points, -1)[:, case]  # (n, points, cells)
        shares = loaded["cell_share"].reshape(n, 3, points, -1)[:, case, 0]  # (n, cells)
        grid_sq = np.square(table_currents[:, case])
        field = interp_rows(np.square(current)[:, None], grid_sq[:, None, :], np.swapaxes(fields, 1, 2))
        return worst_share_field(field, shares)

    cases: dict[str, tuple[np.ndarray, np.ndarray, np.ndarray]] = {}  # key: (margin, current, temperature)
    fault_cases: dict[str, tuple[np.ndarray, np.ndarray, np.ndarray]] = {}
    for label, case in (("cold", 0), ("hot", 2)):
        model, temperature = models[label], case_magnet[label]
        knee = knee_field_at(lots, temperature)
        no_load_speed = points_of[label][0].speed
        stall_i = _array(stall_current(model))
        reversal_i = _array(plugging_current(model, no_load_speed))
        limited = ~np.isnan(current_limit)
        limit_or_inf = np.where(limited, current_limit, np.inf)
        drive_stall, drive_reversal = np.minimum(stall_i, limit_or_inf), np.minimum(reversal_i, limit_or_inf)
        nan = np.full(n, np.nan)
        cases[f"stall_{label}"] = (magnet_field_at(case, drive_stall) - knee, drive_stall, temperature)
        reversal = magnet_field_at(case, np.where(reversing, drive_reversal, 0.0)) - knee
        cases[f"reversal_{label}"] = (np.where(reversing, reversal, nan), np.where(reversing, drive_reversal, nan),
                                      temperature)
        at_limit = magnet_field_at(case, np.where(limited, current_limit, 0.0)) - knee
        cases[f"current_limit_{label}"] = (np.where(limited, at_limit, nan), np.where(limited, current_limit, nan),
                                           temperature)
        fault_cases[f"stall_{label}"] = (magnet_field_at(case, stall_i) - knee, stall_i, temperature)
        finite = np.isfinite(reversal_i)
        fault_reversal = magnet_field_at(case, np.where(finite, reversal_i, 0.0)) - knee
        fault_cases[f"reversal_{label}"] = (np.where(finite, fault_reversal, nan), np.where(finite, reversal_i, nan),
                                            temperature)
    for position, (label, ambient) in enumerate((("cold", ambient_min), ("hot", ambient_max))):
        knee = knee_field_at(lots, ambient)
        cases[f"rotor_removed_{label}"] = (rotor_out["worst_field"][:, position] - knee, np.zeros(n), ambient)

    def judged(group):
        """Each case's state: 2 past the knee, 1 inside the required margin, 0 safe (NaN cases: -1)."""
        states = {}
        for key, (margin, _, temperature) in group.items():
            required = share * np.abs(intrinsic_coercivity_at(lots, temperature))
            states[key] = np.where(np.isnan(margin), -1, np.where(margin <= 0.0, 2, np.where(margin < required, 1, 0)))
        return states

    for prefix, group in (("demagnetization", cases), ("faults", fault_cases)):
        for key, (margin, current, _) in group.items():
            out[f"{prefix}.{key}.margin_A_per_m"] = margin
            out[f"{prefix}.{key}.current_A"] = current
    out["worst_demagnetization_margin_A_per_m"] = np.nanmin(np.stack([m for m, _, _ in cases.values()]), axis=0)
    out["faults.worst_margin_A_per_m"] = np.nanmin(np.stack([m for m, _, _ in fault_cases.values()]), axis=0)
    demagnetization_state = np.max(np.stack(list(judged(cases).values())), axis=0)
    fault_state = np.max(np.stack(list(judged(fault_cases).values())), axis=0)

    # 10. Inertia, time constants, cost; the winding as built; brushes and commutator.
    inertia = _array(rotor_inertia(g, part_masses, slot_share_of_turn(g.stack_length, turn_length),
                                       per(lambda d: d.extra_inertia)))
    effective_gap = _array(pole_circuit(g, recoil).effective_gap)
    inductance = _array(armature_inductance_estimate(g, conductors, paths, recoil, effective_gap, turn_length))
    nominal_model = models["nominal"]
    out.update({
        "constants.machine_constant": constant,
        "constants.ke_V_s_per_rad": _array(nominal_model.constant),
        "constants.terminal_resistance_ohm": _array(nominal_model.resistance),
        "constants.inductance_H_estimate": inductance,
        "constants.electrical_time_constant_s_estimate": _array(
            electrical_time_constant(inductance, nominal_model.resistance)),
        "constants.mechanical_time_constant_s": _array(
            mechanical_time_constant(inertia, nominal_model.resistance, nominal_model.constant)),
        "constants.rotor_inertia_kg_m2": inertia,
    })
    hot_rated = points_of["hot"][2]
    slot_area = _array(g.slot_area)
    fill_bare = _array(slot_fill(conductors, g.slots, per(lambda d: d.winding.wire.bare_diameter), slot_area))
    fill_gross = _array(slot_fill(conductors, g.slots, per(lambda d: d.winding.wire.overall_diameter), slot_area))
    density = _array(current_density(hot_rated.current, paths, copper_area))
    out.update({
        "winding.resistance_20C_ohm": _array(resistance_at(rows_all, 20.0)),
        "winding.slot_fill_bare": fill_bare, "winding.slot_fill_gross": fill_gross,
        "winding.rated_current_density_A_per_m2": density,
    })
    hot_state = heat.hot
    out.update({
        "thermal.winding_temperature_C": hot_state.winding_C, "thermal.housing_temperature_C": hot_state.housing_C,
        "thermal.magnet_temperature_C": hot_state.magnet_C,
        "thermal.steady_winding_temperature_C": heat.s1.iterated_winding_C,
        "thermal.losses_W": hot_state.losses.winding + hot_state.losses.housing,
        "thermal.time_to_limit_s": hot_state.time_to_limit_s,
        "ratings.continuous_torque_N_m": heat.rating.torque, "ratings.continuous_current_A": heat.rating.current,
        "ratings.continuous_speed_rad_per_s": heat.rating.speed,
        "ratings.continuous_output_power_W": heat.rating.torque * heat.rating.speed,
        "ratings.stall_current_A": heat.stall_current_A,
        "ratings.stall_time_cold_s": np.where(np.isfinite(heat.stall_time_cold_s), heat.stall_time_cold_s, np.nan),
        "ratings.stall_time_hot_s": np.where(np.isfinite(heat.stall_time_hot_s), heat.stall_time_hot_s, np.nan),
    })
    for f in dataclasses.fields(MassResult):
        value = getattr(part_masses, f.name.removesuffix("_kg"), None)
        if value is not None:
            out[f"mass.{f.name}"] = np.broadcast_to(_array(value), (n,)).copy()
    out["mass.active_kg"] = _array(part_masses.magnet + part_masses.copper + part_masses.housing
                                       + part_masses.lamination)
    prices = [d.prices for d in designs]
    cost: Any = material_cost(part_masses, _PriceArrays(  # type: ignore[arg-type]
        currency="", magnet=np.array([p.magnet for p in prices]), copper=np.array([p.copper for p in prices]),
        housing_steel=np.array([p.housing_steel for p in prices]), lamination=np.array([p.lamination for p in prices])))
    out.update({"cost.magnet": cost.magnet, "cost.copper": cost.copper, "cost.housing": cost.housing,
                "cost.lamination": cost.lamination, "cost.total": cost.total})
    brush_sets = [brush_set(d) for d in designs]
    count_b = np.array([b.count for b in brush_sets])
    width_b = np.array([b.width for b in brush_sets])
    length_b = np.array([b.length for b in brush_sets])
    diameter_b = np.array([b.commutator_diameter for b in brush_sets])
    high_b = np.array([b.density_range[1] for b in brush_sets])
    top_speed = np.max(np.stack([points_of[c][0].speed for c in _CASE_NAMES]), axis=0)
    brush_density = _array(brush_current_density(_array(hot_rated.current), _array(count_b), _array(width_b),
                                                 _array(length_b)))
    speed_c = _array(surface_speed(top_speed, _array(diameter_b)))
    reactance = _array(reactance_voltage(_array(hot_rated.current), paths, per(lambda d: d.winding.turns_per_coil),
                                         g.stack_length, _array(hot_rated.speed), diameter_b, width_b))
    out.update({"commutation.brush_current_density_A_per_m2": brush_density,
                "commutation.surface_speed_m_per_s": speed_c, "commutation.reactance_voltage_V": reactance})

    # 11. Checks, as codes (the thresholds of core.checks).
    def graded(fail, warn):
        return np.where(fail, FAIL_CODE, np.where(warn, WARNING_CODE, PASS_CODE)).astype(np.int8)

    reached = np.stack([points_of[c][3] for c in _CASE_NAMES])
    meets = reached & np.stack([points_of[c][2].speed >= load_speed * (1.0 - 1e-9) for c in _CASE_NAMES])
    stalls = np.stack([points_of[c][1] for c in _CASE_NAMES])
    no = np.zeros(n, dtype=bool)

    def iron(value, steel_of):
        limit = per(lambda d: steel_of(d).recommended_max_flux_density)
        return graded(value > limit + SATURATION_MARGIN, value > limit)

    must_survive = per(lambda d: must_survive_faults(d.fault_cases, d.reversing), bool)
    duty_limit = per(lambda d: CURRENT_DENSITY_WARNING[d.thermal.duty])
    hot_limit = per(lambda d: d.winding.insulation_limit_C)
    status = {
        "load": graded(~reached.all(axis=0) | ~meets.all(axis=0), no),
        "start": graded((stalls <= 0.0).any(axis=0), no),
        "demagnetization": graded(demagnetization_state == 2, demagnetization_state == 1),
        "fault_demagnetization": graded(must_survive & (fault_state == 2), fault_state >= 1),
        "housing_flux_density": iron(magnetics["housing_flux_density"], lambda d: d.housing_steel),
        "tooth_flux_density": iron(magnetics["tooth_flux_density"], lambda d: d.lamination_steel),
        "core_flux_density": iron(magnetics["core_flux_density"], lambda d: d.lamination_steel),
        "slot_fill": graded(fill_gross > SLOT_FILL_GROSS_FAIL, fill_bare > SLOT_FILL_BARE_WARNING),
        "current_density": graded(no, density > duty_limit),
        "brush_current_density": graded(brush_density > BRUSH_DENSITY_FAIL * high_b, brush_density > high_b),
        "commutator_speed": graded(speed_c > SURFACE_SPEED_FAIL, speed_c > SURFACE_SPEED_WARNING),
        "reactance_voltage": graded(reactance > REACTANCE_FAIL, reactance > REACTANCE_WARNING),
        "thermal": graded(~hot_state.steady_state_exists | (hot_state.winding_C > hot_limit), no),
        "magnet_temperature": graded(hot_state.magnet_C > per(lambda d: d.magnet.max_working_temperature_C), no),
        "envelope": graded(no, no),
    }
    status["load_points"], out["load_points.least_speed_share"] = _further_points(designs, models, points_of)
    return out, status


# ----------------------------------------------------------------------------------------------
# load.further_points: each point at every case, one point at a time over the designs (core.load_points).


def _further_points(designs, models, points_of) -> tuple[np.ndarray, np.ndarray]:
    """The further points' status codes (fail where a point is missed in a case) and the least share of a
    point's required speed reached (NaN without points; 0 where a torque is beyond stall)."""
    from .load_points import point_speeds, points_met

    n = len(designs)
    met = np.ones(n, dtype=bool)
    least = np.full(n, np.nan)
    for j in range(max((len(d.load_points) for d in designs), default=0)):
        has = np.array([len(d.load_points) > j for d in designs])
        torque = np.array([d.load_points[j][0] if len(d.load_points) > j else 0.0 for d in designs])
        required = np.array([d.load_points[j][1] if len(d.load_points) > j else 0.0 for d in designs])
        for name in _CASE_NAMES:
            speed = point_speeds(models[name], points_of[name][1], torque)
            met &= ~has | points_met(speed, required)
            with np.errstate(invalid="ignore", divide="ignore"):
                share = np.where(np.isfinite(speed), speed / np.where(required > 0, required, np.inf), 0.0)
            share = np.where(required > 0, share, np.inf)
            least = np.where(has, np.fmin(least, share), least)
    least = np.where(np.isinf(least), np.nan, least)
    return np.where(met, PASS_CODE, FAIL_CODE).astype(np.int8), least


def _array(value: Any) -> Any:
    """``value`` as a float array (typed loosely: the topic modules annotate their scalar use)."""
    return np.asarray(value, dtype=np.float64)


@dataclass(frozen=True)
class _PriceArrays:
    """Prices per design, shaped like :class:`core.design.Prices`."""

    currency: str
    magnet: np.ndarray
    copper: np.ndarray
    housing_steel: np.ndarray
    lamination: np.ndarray


__all__ = ["CHECK_KEYS", "BatchFigures", "check_status", "evaluate_each", "evaluate_many", "screening_figures",
           "stack_geometries"]
