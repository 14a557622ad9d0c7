"""The orchestrator: one design through the whole chain, step by step like the hand calculation.

    1. materials at temperature  the grade's model range holds over the ambients    core.magnets
    2. magnetic circuit          no load, over a temperature grid (one solve)        core.magnetic_circuit
    3. winding                   paths, conductors, turn length, resistance          core.winding
    4. constants                 Ke = Kt = K·Φ                                        core.winding
    5. masses                    (the iron loss needs the teeth and core masses)     core.mass
    6. thermal                   hot case: losses ⇄ temperatures to a fixed point    core.thermal
    7. magnetic cases            cold, nominal, hot, rotor removed; and the demand    core.magnetic_circuit
    8. performance               cold, nominal and hot curves and named points        core.performance
    9. demagnetization           stall, reversal, drive limit, rotor removed          core.demagnetization
   10. inertia, time constants, cost, loadings                                       core.mass, core.loadings
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

from . import magnetic_circuit as mc
from .checks import run_checks
from .demagnetization import TemperatureCase, demagnetization_cases, rotor_removed_circuit
from .design import Design, design_from_project
from .geometry import Geometry
from .loadings import armature_loadings
from .magnets import (
    MagnetGrade,
    demagnetization_curves,
    intrinsic_coercivity_at,
    knee_field_at,
    model_temperature_range_C,
    normal_coercivity_at,
    remanence_at,
    require_ambient_inside_model,
)
from .mass import Masses, masses, material_cost, rotor_inertia
from .performance import (
    MotorModel,
    OperatingPoints,
    SpeedTorqueCurve,
    current_limit_torque,
    electrical_time_constant,
    iron_loss_terms,
    loss_torque,
    mechanical_time_constant,
    operating_points,
    speed_torque_curve,
    stall_torque,
)
from .results import (
    CaseResult,
    ConstantsResult,
    CostResult,
    CurveData,
    GeometryResult,
    MagnetChartCase,
    MagneticsResult,
    MagnetResult,
    MassResult,
    PointResult,
    Results,
    ThermalResult,
    WindingResult,
)
from .schema import Project
from .thermal import duty_rise_fraction, flux_grid_temperatures, hot_state, housing_to_ambient_resistance
from .units import from_si
from .winding import (
    armature_inductance_estimate,
    armature_resistance,
    back_emf_constant,
    coil_span_slots,
    conductors_per_slot,
    current_density,
    machine_constant,
    mean_turn_length,
    parallel_paths,
    slot_fill,
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

    # 2. No-load magnetic circuit over a temperature grid, with cold and nominal exactly on it.
    circuit = mc.pole_circuit(g, grade.recoil_permeability)
    grid = flux_grid_temperatures(d.ambient_min_C, d.ambient_nominal_C, d.ambient_max_C,
                                  grade.max_working_temperature_C, model_high_C)
    grid_point = mc.solve(grade, grid, circuit, d.housing_steel, d.lamination_steel)
    mc.require_converged(grid_point)
    rising = np.argsort(grid[2:]) + 2

    def flux_at(temperature_C: float) -> float:
        return float(np.interp(temperature_C, grid[rising], grid_point.flux_per_pole[rising]))

    # 3. Winding.
    paths = int(parallel_paths(w.kind, g.poles, w.multiplicity))
    conductors = int(total_conductors(w.commutator_segments, w.turns_per_coil))
    turn_length = float(mean_turn_length(g, w.end_turn_factor))
    wire_length = float(winding_length(conductors, turn_length))

    def resistance_at(temperature_C: float) -> float:
        return float(armature_resistance(conductors, turn_length, paths, w.wire.copper_area, temperature_C))

    # 4. Constants: Ke = Kt = K·Φ, with Φ at each case's magnet temperature.
    constant = float(machine_constant(g.poles, conductors, paths))

    # 5. Masses; the iron loss scales the nominal tooth and core flux densities with the flux.
    part_masses = masses(g, grade.density, d.housing_steel.density, d.lamination_steel.density,
                         wire_length, w.wire.copper_area)
    nominal_flux = float(grid_point.flux_per_pole[1])
    tooth_b_per_flux = float(grid_point.tooth_flux_density[1]) / nominal_flux
    core_b_per_flux = float(grid_point.core_flux_density[1]) / nominal_flux

    def motor_at(winding_C: float, flux: float) -> MotorModel:
        iron = iron_loss_terms(
            d.lamination_steel, g.poles,
            ((part_masses.teeth, tooth_b_per_flux * flux), (part_masses.core, core_b_per_flux * flux)),
            d.losses.iron_loss_build_factor,
        )
        return MotorModel(voltage=d.supply_voltage, brush_drop=d.brush_drop, resistance=resistance_at(winding_C),
                          constant=back_emf_constant(constant, flux), friction_torque=d.losses.friction_torque,
                          viscous_coeff=d.losses.viscous_coeff, iron=iron)

    # 6. Thermal: the hot case's temperatures at the rated point and the highest ambient.
    housing_resistance = (d.thermal.housing_to_ambient if d.thermal.housing_to_ambient is not None
                          else float(housing_to_ambient_resistance(g, d.thermal.convection_coeff)))

    def rated_losses(winding_C: float, magnet_C: float) -> tuple[float, float, bool]:
        model = motor_at(winding_C, flux_at(magnet_C))
        stall = float(stall_torque(model))
        rated = operating_points(model, min(d.load_torque, stall))
        return (float(rated.copper_loss + rated.brush_loss + rated.iron_loss), float(rated.total_loss),
                d.load_torque < stall)

    hot = hot_state(d.ambient_max_C, rated_losses, d.thermal.winding_to_housing, housing_resistance,
                    duty_rise_fraction(d.thermal.duty, d.thermal.duty_time, d.thermal.time_constant),
                    w.insulation_limit_C, model_high_C)

    # 7. Exact magnetic solves: rotor in at cold, nominal and hot, rotor out at cold and hot, first on
    # the magnet's full curve, then on its recoil line (the demand the demagnetization cases use).
    case_temperatures = np.array([d.ambient_min_C, d.ambient_nominal_C, hot.magnet_C, d.ambient_min_C,
                                  d.ambient_max_C])
    five_points = ((circuit, 3), (rotor_removed_circuit(g, circuit), 2))
    both = mc.solve(grade, np.concatenate((case_temperatures, case_temperatures)),
                    mc.stack_circuits(five_points * 2), d.housing_steel, d.lamination_steel,
                    magnet_on_recoil_line=np.repeat([False, True], 5))
    mc.require_converged(both, "the magnetic circuit (cold, nominal, hot or rotor removed)")
    exact, demand = mc.select_points(both, slice(0, 5)), mc.select_points(both, slice(5, 10))

    # 8. Performance: the speed-torque curve of each case.
    temperatures = {"cold": (d.ambient_min_C, d.ambient_min_C, d.ambient_min_C),
                    "nominal": (d.ambient_nominal_C, d.ambient_nominal_C, d.ambient_nominal_C),
                    "hot": (d.ambient_max_C, hot.winding_C, hot.magnet_C)}
    models, cases = {}, {}
    for index, name in enumerate(_CASE_NAMES):
        ambient_C, winding_C, magnet_C = temperatures[name]
        models[name] = motor_at(winding_C, float(exact.flux_per_pole[index]))
        curve = speed_torque_curve(models[name], d.load_torque, samples=curve_points)
        cases[name] = _case_result(name, ambient_C, winding_C, magnet_C, float(exact.flux_per_pole[index]),
                                   models[name], curve,
                                   current_limit_torque(models[name], d.current_limit), d.load_speed)

    # 9. Demagnetization at the coldest and hottest case, then with the rotor removed.
    effective_gap = float(circuit.effective_gap)
    demagnetization = demagnetization_cases(
        grade, conductors, paths, g, effective_gap,
        [TemperatureCase(label, models[label], cases[label].no_load_speed_rad_per_s,
                         cases[label].magnet_temperature_C, float(demand.magnet_field[index]))
         for label, index in (("cold", 0), ("hot", 2))],
        d.current_limit, d.reversing,
        [("cold", d.ambient_min_C, float(demand.magnet_field[3])),
         ("hot", d.ambient_max_C, float(demand.magnet_field[4]))],
    )

    # 10. Inertia, time constants, cost and the armature's loadings at the nominal rated point.
    inertia = float(rotor_inertia(g, part_masses, slot_share_of_turn(g.stack_length, turn_length), d.extra_inertia))
    inductance = float(armature_inductance_estimate(g, conductors, paths, grade.recoil_permeability,
                                                    effective_gap, turn_length))
    nominal_model, nominal = models["nominal"], cases["nominal"]
    cost = material_cost(part_masses, d.prices)
    sizing = armature_loadings(
        g, conductors, paths, nominal.rated.current_A,
        nominal.rated.torque_N_m + float(loss_torque(nominal_model, nominal.rated.speed_rad_per_s)),
        float(exact.flux_per_pole[1]))

    deepest_field = min(c.magnet_field_A_per_m for c in demagnetization.cases)
    results = Results(
        name=d.name, supply_voltage_V=d.supply_voltage, brush_drop_V=d.brush_drop,
        load_torque_N_m=d.load_torque, load_speed_rad_per_s=d.load_speed,
        magnet=_magnet_result(grade, d.ambient_nominal_C),
        geometry=_geometry_result(g, d.max_outer_diameter),
        magnetics=_magnetics_result(exact, 1, d.ambient_nominal_C),
        winding=_winding_result(d, paths, conductors, turn_length, wire_length, resistance_at(20.0),
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
        thermal=ThermalResult(
            ambient_C=d.ambient_max_C, duty=d.thermal.duty, duty_minutes=from_si(d.thermal.duty_time, "min"),
            housing_temperature_C=hot.housing_C, winding_temperature_C=hot.winding_C,
            magnet_temperature_C=hot.magnet_C, steady_winding_temperature_C=hot.steady_winding_C,
            insulation_class=w.insulation_class, insulation_limit_C=w.insulation_limit_C,
            magnet_limit_C=grade.max_working_temperature_C, losses_W=hot.total_loss_W,
            rotor_losses_W=hot.rotor_loss_W, housing_to_ambient_K_per_W=housing_resistance,
            winding_to_housing_K_per_W=d.thermal.winding_to_housing,
            thermal_time_constant_s=d.thermal.time_constant, iterations=hot.iterations,
            converged=hot.converged, runaway_winding_temperature_C=hot.runaway_winding_C,
            ok=bool(hot.converged and hot.winding_C <= w.insulation_limit_C
                    and hot.magnet_C <= grade.max_working_temperature_C),
        ),
        mass=_mass_result(part_masses),
        cost=CostResult(currency=d.prices.currency, magnet=float(cost.magnet), copper=float(cost.copper),
                        housing=float(cost.housing), lamination=float(cost.lamination), total=float(cost.total)),
        checks=(),
        magnet_chart=tuple(
            MagnetChartCase(
                name=name,
                curves=demagnetization_curves(grade, float(case_temperatures[index]), field_min=deepest_field),
                operating_field_A_per_m=float(exact.magnet_field[index]),
                operating_flux_density_T=float(exact.magnet_flux_density[index]),
                permeance_coefficient=float(exact.permeance_coefficient[index]),
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
                 stc: SpeedTorqueCurve, limit_torque: float | None, load_speed: float) -> CaseResult:
    c = stc.curve
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
    )


def _magnetics_result(point: mc.MagneticOperatingPoint, index: int, temperature_C: float) -> MagneticsResult:
    def at(values) -> float:
        return float(np.asarray(values)[index])

    return MagneticsResult(
        temperature_C=float(temperature_C), flux_per_pole_Wb=at(point.flux_per_pole),
        airgap_flux_density_T=at(point.airgap_flux_density), magnet_flux_density_T=at(point.magnet_flux_density),
        magnet_field_A_per_m=at(point.magnet_field), permeance_coefficient=at(point.permeance_coefficient),
        housing_flux_density_T=at(point.housing_flux_density), tooth_flux_density_T=at(point.tooth_flux_density),
        core_flux_density_T=at(point.core_flux_density), leakage_factor=at(point.leakage_factor),
        carter_factor=at(point.carter_factor), gap_mmf_A=at(point.mmf_drops["gap"]),
        teeth_mmf_A=at(point.mmf_drops["teeth"]), core_mmf_A=at(point.mmf_drops["core"]),
        housing_mmf_A=at(point.mmf_drops["housing"]),
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


def _geometry_result(g: Geometry, max_outer_diameter: float | None) -> GeometryResult:
    return GeometryResult(
        poles=int(g.poles), slots=int(g.slots),
        housing_outer_diameter_m=2.0 * float(g.housing_outer_radius),
        housing_inner_diameter_m=2.0 * float(g.housing_inner_radius),
        housing_wall_m=float(g.housing_wall), housing_length_m=float(g.housing_length),
        magnet_inner_diameter_m=2.0 * float(g.magnet_inner_radius),
        magnet_thickness_m=float(g.magnet_thickness), magnet_arc_rad=float(g.magnet_arc),
        magnet_length_m=float(g.magnet_length), magnet_embrace=float(g.magnet_embrace),
        overhang_m=float(g.overhang), airgap_m=float(g.airgap),
        armature_diameter_m=2.0 * float(g.armature_radius), stack_length_m=float(g.stack_length),
        shaft_diameter_m=2.0 * float(g.shaft_radius), slot_pitch_m=float(g.slot_pitch),
        core_depth_m=float(g.core_depth), max_outer_diameter_m=max_outer_diameter,
    )


def _winding_result(d: Design, paths: int, conductors: int, turn_length: float, wire_length: float,
                    resistance_20C: float, hot_rated_current: float) -> WindingResult:
    g, w = d.geometry, d.winding
    slot_area = float(g.slot_area)
    return WindingResult(
        type=w.kind, parallel_paths=paths, commutator_segments=w.commutator_segments,
        turns_per_coil=w.turns_per_coil, conductors=conductors,
        conductors_per_slot=float(conductors_per_slot(conductors, g.slots)),
        coil_span_slots=int(coil_span_slots(g.slots, g.poles)), wire=w.wire.label,
        wire_bare_diameter_m=w.wire.bare_diameter, wire_overall_diameter_m=w.wire.overall_diameter,
        enamel_grade=w.wire.enamel_grade, mean_turn_length_m=turn_length, wire_length_m=wire_length,
        slot_area_m2=slot_area,
        slot_fill_bare=float(slot_fill(conductors, g.slots, w.wire.bare_diameter, slot_area)),
        slot_fill_gross=float(slot_fill(conductors, g.slots, w.wire.overall_diameter, slot_area)),
        resistance_20C_ohm=resistance_20C,
        rated_current_density_A_per_m2=float(current_density(hot_rated_current, paths, w.wire.copper_area)),
    )


def _mass_result(m: Masses) -> MassResult:
    return MassResult(
        magnet_kg=float(m.magnet), copper_kg=float(m.copper), housing_kg=float(m.housing),
        lamination_kg=float(m.lamination), shaft_kg=float(m.shaft), total_kg=float(m.total),
    )


__all__ = ["Results", "evaluate"]
