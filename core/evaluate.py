"""The orchestrator: one design through the whole chain, step by step like the hand calculation.

    1. materials at temperature  the grade's model range holds over the ambients    core.magnets
    2. magnetic circuit          no load, over a temperature grid (one solve)        core.pole_magnetics
    3. winding                   paths, conductors, turn length, resistance          core.winding
    4. constants                 Ke = Kt = K·Φ                                        core.winding
    5. masses                    (the iron loss needs the teeth and core masses)     core.mass
    6. thermal                   the duty's hot state, ratings, stall times          core.thermal_ratings
    7. magnetic cases            cold, nominal, hot against current; rotor removed   core.pole_magnetics
    8. performance               cold, nominal and hot curves with Φ(I)               core.performance
    9. demagnetization           stall, reversal, drive limit, rotor removed          core.demagnetization
       required margin, faults   the state of every case; the supply applied directly core.margins
   10. inertia, time constants, cost, loadings, brushes and commutator   core.mass, core.loadings, core.commutation
   11. checks                    pass / warning / fail, with the reason               core.checks

This module holds no formula: each step calls the topic module that owns it and keeps what it returns.

Usage from a Python session or notebook::

    from pmdc_sizer.core import load, with_values, evaluate
    design = load("demo_projects/appliance_ferrite_12v.toml")
    thinner = with_values(design, {"magnets.thickness_mm": 4.0})
    results = evaluate(thinner)
    results.nominal.no_load_speed_rad_per_s, results.demagnetization.worst_case

Every field of the results names its unit; all values are SI (temperatures in °C).
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from . import pole_magnetics as pm
from .checks import run_checks
from .commutation import commutation_result
from .demagnetization import TemperatureCase, demagnetization_cases, judged_currents
from .design import Design, design_from_project
from .envelope import operating_envelope
from .load_points import point_speeds
from .loadings import armature_loadings
from .magnet_curve_figures import demagnetization_curves, normal_coercivity_at
from .magnet_load_fields import magnet_load_fields
from .magnets import (
    MagnetGrade,
    intrinsic_coercivity_at,
    knee_field_at,
    model_temperature_range_C,
    remanence_at,
    require_ambient_inside_model,
)
from .margins import direct_supply_faults, must_survive_faults, with_required_margin
from .mass import masses, material_cost, rotor_inertia
from .performance import (
    MotorModel,
    OperatingPoints,
    SpeedTorqueCurve,
    constant_at,
    current_limit_torque,
    electrical_time_constant,
    iron_loss_terms,
    largest_current,
    loss_torque,
    mechanical_time_constant,
    speed_torque_curve,
)
from .pole_load_table import load_table, magnet_state_of
from .result_assembly import geometry_result, mass_result, winding_result
from .results import (
    CaseResult,
    ConstantsResult,
    CostResult,
    CurveData,
    MagnetChartCase,
    MagneticsResult,
    MagnetResult,
    PointResult,
    Results,
)
from .schema import Project
from .thermal import flux_grid_temperatures
from .thermal_ratings import thermal_outcome
from .units import from_si
from .winding import (
    armature_inductance_estimate,
    armature_resistance,
    back_emf_constant,
    machine_constant,
    mean_turn_length,
    parallel_paths,
    slot_share_of_turn,
    total_conductors,
    winding_length,
)

_CASE_NAMES = ("cold", "nominal", "hot")


def evaluate(design: Design | Project, curve_points: int = 200) -> Results:
    """Run the whole chain on one design.

    Parameters
    ----------
    design : Design or Project
        A validated project (converted to SI here) or a design already in SI.
    curve_points : int
        Points of each speed-torque curve, no load to stall.

    Returns
    -------
    Results
        Every figure of the design, SI throughout (temperatures in °C).

    Raises
    ------
    MagneticCircuitError
        When the magnetic circuit has no solution, or the ambient range is outside the grade's data.
    """
    d = design_from_project(design) if isinstance(design, Project) else design
    g, grade, w = d.geometry, d.magnet, d.winding

    # 1. Materials: the grade's temperature model must hold over every ambient.
    require_ambient_inside_model(grade, d.ambient_min_C, d.ambient_max_C)
    model_high_C = model_temperature_range_C(grade)[1]

    # 2. No-load magnetic circuit (the pole's reluctance network) over a temperature grid, with cold and
    # nominal exactly on it.
    grid = flux_grid_temperatures(d.ambient_min_C, d.ambient_nominal_C, d.ambient_max_C,
                                  grade.max_working_temperature_C, model_high_C)
    grid_point = pm.pole_states(d, grid)
    rising = np.argsort(grid[2:]) + 2

    def flux_at(temperature_C):
        return np.interp(temperature_C, grid[rising], grid_point.flux_per_pole[rising])

    # 3. Winding.
    paths = int(parallel_paths(w.kind, g.poles, w.multiplicity))
    conductors = int(total_conductors(w.commutator_segments, w.turns_per_coil))
    turn_length = float(mean_turn_length(g, w.end_turn_factor))
    wire_length = float(winding_length(conductors, turn_length))

    def resistance_at(temperature_C):
        return armature_resistance(conductors, turn_length, paths, w.wire.copper_area, temperature_C,
                                   w.resistivity_factor)

    # 4. Constants: Ke = Kt = K·Φ, with Φ at each case's magnet temperature.
    constant = float(machine_constant(g.poles, conductors, paths))

    # 5. Masses; the iron loss scales the nominal tooth and core flux densities with the flux.
    part_masses = masses(g, grade.density, d.housing_steel.density, d.lamination_steel.density,
                         wire_length, w.wire.copper_area, d.brushes.commutator_diameter)
    nominal_flux = float(grid_point.flux_per_pole[1])
    tooth_b_per_flux = float(grid_point.tooth_flux_density[1]) / nominal_flux
    core_b_per_flux = float(grid_point.core_flux_density[1]) / nominal_flux

    def motor_at(winding_C, flux, flux_table: tuple[np.ndarray, np.ndarray] | None = None) -> MotorModel:
        iron = iron_loss_terms(
            d.lamination_steel, g.poles,
            ((part_masses.teeth, tooth_b_per_flux * flux), (part_masses.core, core_b_per_flux * flux)),
            d.losses.iron_loss_build_factor,
        )
        return MotorModel(voltage=d.supply_voltage, brush_drop=d.brush_drop, resistance=resistance_at(winding_C),
                          constant=back_emf_constant(constant, flux), friction_torque=d.losses.friction_torque,
                          viscous_coeff=d.losses.viscous_coeff, iron=iron,
                          constant_table=None if flux_table is None else
                          (flux_table[0], back_emf_constant(constant, flux_table[1])))

    # 6. Thermal: the duty's hot state, the continuous rating and the stall times at the highest ambient.
    heat = thermal_outcome(d, part_masses, lambda rows, winding_C, magnet_C: motor_at(winding_C, flux_at(magnet_C)),
                           model_high_C)
    hot_winding_C, hot_magnet_C = float(heat.hot.winding_C[0]), float(heat.hot.magnet_C[0])

    # 7. The network at cold, nominal and hot against armature current (the armature's reaction lowers
    # the flux), and with the rotor removed at the coldest and hottest ambient.
    temperatures = {"cold": (d.ambient_min_C, d.ambient_min_C, d.ambient_min_C),
                    "nominal": (d.ambient_nominal_C, d.ambient_nominal_C, d.ambient_nominal_C),
                    "hot": (d.ambient_max_C, hot_winding_C, hot_magnet_C)}
    case_temperatures = np.array([temperatures[name][2] for name in _CASE_NAMES])
    table = load_table(d, case_temperatures, [
        largest_current(motor_at(temperatures[name][1], float(flux_at(temperatures[name][2]))), d.current_limit)
        for name in _CASE_NAMES])
    rotor_out = pm.pole_states(d, [d.ambient_min_C, d.ambient_max_C], rotor_present=False,
                               what="the magnetic circuit with the rotor removed")

    # 8. Performance: the speed-torque curve of each case, with Ke = K·Φ(I).
    models, cases = {}, {}
    for index, name in enumerate(_CASE_NAMES):
        ambient_C, winding_C, magnet_C = temperatures[name]
        flux = float(table.no_load(index, "flux_per_pole"))
        models[name] = motor_at(winding_C, flux, table.flux(index))
        curve = speed_torque_curve(models[name], d.load_torque, samples=curve_points)
        cases[name] = _case_result(name, ambient_C, winding_C, magnet_C, flux, models[name], curve,
                                   current_limit_torque(models[name], d.current_limit), d.load_speed,
                                   table.flux(index))

    cases = {name: replace(case, envelope=operating_envelope(models[name], case, d.current_limit))
             for name, case in cases.items()}
    if d.load_points:
        torques = np.array([torque for torque, _ in d.load_points])
        cases = {name: replace(case, further_point_speeds_rad_per_s=tuple(
            float(v) for v in point_speeds(models[name], case.stall_torque_N_m, torques)))
            for name, case in cases.items()}

    # 9. Demagnetization at the coldest and hottest case (the network at the currents judged, with the
    # current in the slots at each rotor position), then with the rotor removed.
    extremes = [TemperatureCase(label, models[label], cases[label].no_load_speed_rad_per_s,
                                cases[label].magnet_temperature_C) for label in ("cold", "hot")]
    fields = magnet_load_fields(d, [case.magnet_temperature_C for case in extremes],
                                [judged_currents(case, d.current_limit) for case in extremes])

    def magnet_state(label: str, current: float):
        case = ("cold", "hot").index(label)
        return fields.magnet_state(case, current, table.flux_at(_CASE_NAMES.index(label), current))

    demagnetization = demagnetization_cases(
        grade, extremes, d.current_limit, d.reversing, magnet_state,
        [("cold", d.ambient_min_C, magnet_state_of(rotor_out, 0)),
         ("hot", d.ambient_max_C, magnet_state_of(rotor_out, 1))],
    )
    # 9b. Every case against the required margin; the faults: the supply applied directly, no limiter.
    demagnetization = with_required_margin(demagnetization, grade, d.required_margin_share)
    faults = direct_supply_faults(grade, extremes, magnet_state, d.required_margin_share,
                                  must_survive_faults(d.fault_cases, d.reversing))

    # 10. Inertia, time constants, cost and the armature's loadings at the nominal rated point.
    inertia = float(rotor_inertia(g, part_masses, slot_share_of_turn(g.stack_length, turn_length), d.extra_inertia))
    inductance = float(armature_inductance_estimate(g, conductors, paths, grade.recoil_permeability,
                                                    pm.effective_gap(d), turn_length))
    nominal_model, nominal = models["nominal"], cases["nominal"]
    cost = material_cost(part_masses, d.prices)
    sizing = armature_loadings(
        g, conductors, paths, nominal.rated.current_A,
        nominal.rated.torque_N_m + float(loss_torque(nominal_model, nominal.rated.speed_rad_per_s)),
        float(table.no_load(1, "flux_per_pole")))

    deepest_field = min(c.magnet_field_A_per_m for c in demagnetization.cases)
    results = Results(
        name=d.name, supply_voltage_V=d.supply_voltage, brush_drop_V=d.brush_drop,
        load_torque_N_m=d.load_torque, load_speed_rad_per_s=d.load_speed,
        further_point_torques_N_m=tuple(t for t, _ in d.load_points),
        further_point_required_speeds_rad_per_s=tuple(w for _, w in d.load_points),
        magnet=_magnet_result(grade, d.ambient_nominal_C),
        geometry=geometry_result(g, d.max_outer_diameter, d.max_length),
        magnetics=_magnetics_result(table.states, table.currents.shape[1], d.ambient_nominal_C),
        winding=winding_result(d, paths, conductors, turn_length, wire_length, float(resistance_at(20.0)),
                                cases["hot"].rated.current_A),
        constants=ConstantsResult(
            machine_constant=constant,
            ke_V_s_per_rad=nominal_model.constant, kt_N_m_per_A=nominal_model.constant,
            ke_V_per_krpm=float(from_si(nominal_model.constant, "V/krpm")),
            kt_mN_m_per_A=float(from_si(nominal_model.constant, "mN·m/A")),
            terminal_resistance_ohm=nominal_model.resistance,
            inductance_H_estimate=inductance,
            electrical_time_constant_s_estimate=float(electrical_time_constant(inductance, nominal_model.resistance)),
            mechanical_time_constant_s=float(mechanical_time_constant(inertia, nominal_model.resistance,
                                                                      nominal_model.constant)),
            rotor_inertia_kg_m2=inertia,
        ),
        cold=cases["cold"], nominal=nominal, hot=cases["hot"],
        demagnetization=demagnetization,
        thermal=heat.thermal, ratings=heat.ratings, faults=faults,
        commutation=commutation_result(d, paths, cases["hot"].rated.current_A, cases["hot"].rated.speed_rad_per_s,
                                       max(c.no_load_speed_rad_per_s for c in cases.values())),
        mass=mass_result(part_masses),
        cost=CostResult(currency=d.prices.currency, magnet=float(cost.magnet), copper=float(cost.copper),
                        housing=float(cost.housing), lamination=float(cost.lamination), total=float(cost.total)),
        checks=(),
        magnet_chart=tuple(
            MagnetChartCase(
                name=name,
                curves=demagnetization_curves(grade, float(case_temperatures[index]), field_min=deepest_field),
                operating_field_A_per_m=float(table.no_load(index, "magnet_field")),
                operating_flux_density_T=float(table.no_load(index, "magnet_flux_density")),
                permeance_coefficient=float(table.no_load(index, "permeance_coefficient")),
            )
            for index, name in enumerate(_CASE_NAMES)
        ),
        sizing=sizing,
        current_limit_A=d.current_limit, reversing=d.reversing,
        ambient_min_C=d.ambient_min_C, ambient_nominal_C=d.ambient_nominal_C, ambient_max_C=d.ambient_max_C,
    )

    # 11. Checks, in words, on the finished results.
    return replace(results, checks=tuple(run_checks(d, results)))


# ----------------------------------------------------------------------------------------------
# Results assembled from what the topic modules return: copies and unit-named fields, no physics.


def _point_result(points: OperatingPoints) -> PointResult:
    return PointResult(
        torque_N_m=float(points.torque), speed_rad_per_s=float(points.speed), current_A=float(points.current),
        input_power_W=float(points.input_power), output_power_W=float(points.output_power),
        total_loss_W=float(points.total_loss), efficiency=float(points.efficiency),
    )


def _case_result(name: str, ambient_C: float, winding_C: float, magnet_C: float, flux: float, model: MotorModel,
                 stc: SpeedTorqueCurve, limit_torque: float | None, load_speed: float,
                 flux_table: tuple[np.ndarray, np.ndarray]) -> CaseResult:
    c = stc.curve
    ke_stall = float(constant_at(model, float(stc.stall.current)))
    rated = _point_result(stc.rated)
    return CaseResult(
        name=name, temperature_C=float(winding_C), ambient_C=float(ambient_C),
        magnet_temperature_C=float(magnet_C), winding_temperature_C=float(winding_C),
        flux_per_pole_Wb=float(flux),
        ke_V_s_per_rad=model.constant, terminal_resistance_ohm=model.resistance,
        no_load_speed_rad_per_s=float(stc.no_load.speed), no_load_current_A=float(stc.no_load.current),
        stall_torque_N_m=float(stc.stall.torque), stall_current_A=float(stc.stall.current),
        speed_torque_gradient_rad_per_s_per_N_m=(float(stc.speed_torque_gradient)
                                                 if np.isfinite(stc.speed_torque_gradient) else 0.0),
        max_efficiency=float(stc.max_efficiency.efficiency), max_efficiency_point=_point_result(stc.max_efficiency),
        max_output_power_W=float(stc.max_power.output_power), max_power_point=_point_result(stc.max_power),
        rated=rated, rated_reached=stc.rated_reached,
        meets_load=bool(stc.rated_reached and rated.speed_rad_per_s >= load_speed * (1.0 - 1e-9)),
        curve=CurveData(
            torque_N_m=c.torque, speed_rad_per_s=c.speed, current_A=c.current, input_power_W=c.input_power,
            output_power_W=c.output_power, efficiency=c.efficiency, copper_loss_W=c.copper_loss,
            brush_loss_W=c.brush_loss, friction_loss_W=c.friction_loss, viscous_loss_W=c.viscous_loss,
            iron_loss_W=c.iron_loss,
        ),
        current_limit_torque_N_m=limit_torque,
        flux_per_pole_stall_Wb=flux * ke_stall / model.constant, ke_stall_V_s_per_rad=ke_stall,
        flux_current_A=flux_table[0], flux_under_load_Wb=flux_table[1],
    )


def _magnetics_result(states: pm.PoleState, index: int, temperature_C: float) -> MagneticsResult:
    def at(values) -> float:
        return float(np.asarray(values)[index])

    return MagneticsResult(
        temperature_C=float(temperature_C), flux_per_pole_Wb=at(states.flux_per_pole),
        airgap_flux_density_T=at(states.airgap_flux_density_mean), magnet_flux_density_T=at(states.magnet_flux_density),
        magnet_field_A_per_m=at(states.magnet_field), permeance_coefficient=at(states.permeance_coefficient),
        housing_flux_density_T=at(states.housing_flux_density), tooth_flux_density_T=at(states.tooth_flux_density),
        core_flux_density_T=at(states.core_flux_density), leakage_factor=at(states.leakage_factor),
        carter_factor=at(states.carter_factor), gap_mmf_A=at(states.gap_mmf),
        teeth_mmf_A=at(states.teeth_mmf), core_mmf_A=at(states.core_mmf),
        housing_mmf_A=at(states.housing_mmf),
        airgap_flux_density_mean_T=at(states.airgap_flux_density_mean),
        airgap_flux_density_centre_T=at(states.airgap_flux_density_centre),
        outside_air_flux_Wb=at(states.outside_flux), worst_magnet_field_A_per_m=at(states.worst_field),
    )


def _magnet_result(grade: MagnetGrade, temperature_C: float) -> MagnetResult:
    return MagnetResult(
        name=grade.name, family=grade.family, temperature_C=temperature_C,
        remanence_T=float(remanence_at(grade, temperature_C)),
        coercivity_HcB_A_per_m=float(normal_coercivity_at(grade, temperature_C)),
        coercivity_HcJ_A_per_m=float(intrinsic_coercivity_at(grade, temperature_C)),
        knee_field_A_per_m=float(knee_field_at(grade, temperature_C)),
        remanence_20C_T=grade.remanence, coercivity_HcJ_20C_A_per_m=grade.coercivity_hcj,
        max_working_temperature_C=grade.max_working_temperature_C, density_kg_per_m3=grade.density,
        source=grade.source,
    )


__all__ = ["Results", "evaluate"]
