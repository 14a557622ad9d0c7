"""The chain of :func:`core.evaluate.evaluate` on arrays: the screening figures of many designs at once.

:func:`chain_figures` runs each step of the hand calculation over arrays of designs, calling the topic
modules' functions (like the orchestrator it holds no formula), and returns the figures and check codes
that :func:`core.batch.evaluate_many` spreads over the batch. Designs whose chain raises are named in
:class:`core.batch_arrays.DesignsFailed`.
"""

from __future__ import annotations

import dataclasses
from typing import Any

import numpy as np

from .batch_arrays import (
    DesignsFailed,
    PriceArrays,
    SteelArrays,
    as_float_array,
    design_groups,
    solve_groups,
    stack_geometries,
)
from .batch_magnets import magnet_cases_many
from .design import Design
from .errors import MagneticCircuitError
from .load_points import points_met_many
from .magnets import require_ambient_inside_model
from .screening import FAIL_CODE, PASS_CODE, WARNING_CODE

_CASE_NAMES = ("cold", "nominal", "hot")


def chain_figures(designs: list[Design]) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray]]:
    """The screening figures and check codes of designs, the chain of :func:`core.evaluate.evaluate` on arrays.

    Parameters
    ----------
    designs : list of Design
        The designs, SI.

    Returns
    -------
    figures : dict of str to array
        Figure name (as :func:`core.screening.screening_figures` names it) to its values, shape (N,), SI,
        temperatures in °C.
    status : dict of str to array of int8
        Check key to codes: 0 pass, 1 warning, 2 fail.

    Raises
    ------
    DesignsFailed
        When some designs' chain raised (an ambient outside the grade's data, a network without solution);
        the caller drops them and runs the others again.

    References
    ----------
    .. [1] the topic modules each step calls, cited there.
    """
    from .armature_mmf import turning_positions
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
    from .pole_load_table import LOAD_POINTS, TURNING_POSITIONS
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
    steels = SteelArrays(*(per(lambda d, name=name: getattr(d.lamination_steel, name))
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
        raise DesignsFailed(failures)
    groups = design_groups(designs)

    # 2. No-load magnetic circuit over each design's temperature grid.
    grid = flux_grid_temperatures(ambient_min, ambient_nominal, ambient_max,
                                  per(lambda d: d.magnet.max_working_temperature_C), model_high)
    # (the rising grid starts at the coldest ambient, the grid's first temperature: solved once)
    rising_grid = solve_groups(designs, groups, g, lots, grid.shape[1] - 1, grid[:, 1:], 0.0, True, None,
                                "the magnetic circuit")
    no_load = {key: np.concatenate([values[:, 1:2], values], axis=1) for key, values in rising_grid.items()}
    grid_flux = no_load["flux_per_pole"]

    def flux_at(rows, temperature_C):
        return interp_rows(temperature_C, grid[rows, 2:], grid_flux[rows, 2:])

    # 3. Winding.
    paths = np.array([int(parallel_paths(d.winding.kind, d.geometry.poles, d.winding.multiplicity)) for d in designs])
    conductors = np.array([int(total_conductors(d.winding.commutator_segments, d.winding.turns_per_coil))
                           for d in designs])
    turn_length = as_float_array(mean_turn_length(g, per(lambda d: d.winding.end_turn_factor)))
    wire_length = as_float_array(winding_length(conductors, turn_length))

    def resistance_at(rows, temperature_C):
        return armature_resistance(conductors[rows], turn_length[rows], paths[rows], copper_area[rows], temperature_C,
                                   resistivity[rows])

    # 4. Constants.
    constant = as_float_array(machine_constant(g.poles, conductors, paths))

    # 5. Masses; the iron loss scales the nominal tooth and core flux densities with the flux.
    part_masses = masses(g, per(lambda d: d.magnet.density), per(lambda d: d.housing_steel.density),
                         per(lambda d: d.lamination_steel.density), wire_length, copper_area,
                         optional(lambda d: d.brushes.commutator_diameter))
    nominal_flux = grid_flux[:, 1]
    tooth_b_per_flux = no_load["tooth_flux_density"][:, 1] / nominal_flux
    core_b_per_flux = no_load["core_flux_density"][:, 1] / nominal_flux
    teeth_mass, core_mass = as_float_array(part_masses.teeth), as_float_array(part_masses.core)

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
    # each at the rotor positions the flux is averaged over (core.pole_load_table), position after position,
    # each position starting from the first's solution at the same current
    positions = turning_positions(g.slots, TURNING_POSITIONS)
    turning = TURNING_POSITIONS * under_load.size
    solved = solve_groups(designs, groups, g, lots, turning, np.tile(temperatures[:, under_load], TURNING_POSITIONS),
                           np.tile(currents[:, under_load], TURNING_POSITIONS), True, (conductors, paths),
                           "the magnetic circuit under load (cold, nominal or hot)",
                           rotor_positions=np.repeat(positions, under_load.size, axis=1), seed_period=under_load.size)
    loaded = {}
    for key, values in solved.items():
        # the flux per pole is the mean over the positions; the other figures are read at zero current
        # only, where the position makes no difference, so the first position's serve
        by_position = values.reshape(n, TURNING_POSITIONS, under_load.size, *values.shape[2:])
        loaded[key] = np.empty((n, 3 * points, *values.shape[2:]), dtype=values.dtype)
        loaded[key][:, under_load] = by_position.mean(axis=1) if key == "flux_per_pole" else by_position[:, 0]
        for entry, column in again.items():
            loaded[key][:, entry] = no_load[key][:, column]
    rotor_out = solve_groups(designs, groups, g, lots, 2, np.stack([ambient_min, ambient_max], axis=1), 0.0, False,
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
        stall = as_float_array(stall_torque(model))
        no_load_point = operating_points(model, np.zeros(n))
        stall_point = operating_points(model, stall)
        rated = operating_points(model, np.minimum(load_torque, stall))
        rated_reached = load_torque < stall
        points_of[name] = (no_load_point, stall, rated, rated_reached)
        ke_stall = as_float_array(constant_at(model, stall_point.current))
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
        out.update({f"{name}.{key}": as_float_array(value) for key, value in figures_of_case.items()})

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

    # The magnet's field at exactly the currents its cases are judged at, with the current in its slots at
    # every rotor position the network tells apart, the worst counting (core.magnet_load_fields).
    judged_at = {label: (as_float_array(stall_current(models[label])),
                         as_float_array(plugging_current(models[label], points_of[label][0].speed)))
                 for label in ("cold", "hot")}
    cases, fault_cases = magnet_cases_many(designs, groups, g, lots, (conductors, paths), judged_at,
                                           {label: case_magnet[label] for label in ("cold", "hot")},
                                           current_limit, reversing)
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
    inertia = as_float_array(rotor_inertia(g, part_masses, slot_share_of_turn(g.stack_length, turn_length),
                                       per(lambda d: d.extra_inertia)))
    effective_gap = as_float_array(pole_circuit(g, recoil).effective_gap)
    inductance = as_float_array(armature_inductance_estimate(g, conductors, paths, recoil, effective_gap, turn_length))
    nominal_model = models["nominal"]
    out.update({
        "constants.machine_constant": constant,
        "constants.ke_V_s_per_rad": as_float_array(nominal_model.constant),
        "constants.terminal_resistance_ohm": as_float_array(nominal_model.resistance),
        "constants.inductance_H_estimate": inductance,
        "constants.electrical_time_constant_s_estimate": as_float_array(
            electrical_time_constant(inductance, nominal_model.resistance)),
        "constants.mechanical_time_constant_s": as_float_array(
            mechanical_time_constant(inertia, nominal_model.resistance, nominal_model.constant)),
        "constants.rotor_inertia_kg_m2": inertia,
    })
    hot_rated = points_of["hot"][2]
    slot_area = as_float_array(g.slot_area)
    fill_bare = as_float_array(slot_fill(conductors, g.slots, per(lambda d: d.winding.wire.bare_diameter),
                                         slot_area))
    fill_gross = as_float_array(slot_fill(conductors, g.slots, per(lambda d: d.winding.wire.overall_diameter),
                                          slot_area))
    density = as_float_array(current_density(hot_rated.current, paths, copper_area))
    out.update({
        "winding.resistance_20C_ohm": as_float_array(resistance_at(rows_all, 20.0)),
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
            out[f"mass.{f.name}"] = np.broadcast_to(as_float_array(value), (n,)).copy()
    out["mass.active_kg"] = as_float_array(part_masses.magnet + part_masses.copper + part_masses.housing
                                       + part_masses.lamination)
    prices = [d.prices for d in designs]
    cost: Any = material_cost(part_masses, PriceArrays(  # type: ignore[arg-type]
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
    brush_density = as_float_array(brush_current_density(as_float_array(hot_rated.current), as_float_array(count_b),
                                                         as_float_array(width_b), as_float_array(length_b)))
    speed_c = as_float_array(surface_speed(top_speed, as_float_array(diameter_b)))
    reactance = as_float_array(reactance_voltage(as_float_array(hot_rated.current), paths,
                                                 per(lambda d: d.winding.turns_per_coil), g.stack_length,
                                                 as_float_array(hot_rated.speed), diameter_b, width_b))
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
    # load.further_points: each point at every case, one point at a time over the designs (core.load_points).
    met, out["load_points.least_speed_share"] = points_met_many(
        [d.load_points for d in designs], models, {name: points_of[name][1] for name in _CASE_NAMES})
    status["load_points"] = np.where(met, PASS_CODE, FAIL_CODE).astype(np.int8)
    return out, status
