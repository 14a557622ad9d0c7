"""The orchestrator: one design through the whole chain, step by step like the hand calculation.

    1. materials at temperature   (magnet grade, steels, copper)           core.magnets, core.steel
    2. geometry                   (checked when the project was validated) core.geometry
    3. magnetic circuit           per temperature, one vectorised solve    core.magnetic_circuit
    4. winding                    paths, conductors, resistance, fill      core.winding
    5. constants                  Ke = Kt = K·Φ                            core.winding
    6. thermal                    hot case: iterate losses ⇄ temperatures  core.thermal
    7. performance                cold, nominal and hot curves             core.performance
    8. demagnetization            stall, reversal, limit, rotor removed    core.demagnetization
    9. mass, inertia, cost                                                 core.mass
   10. checks                     pass / warning / fail, with the reason   core.checks

Usage from a Python session or notebook::

    from pmdc_sizer.core import project, evaluate
    design = project.load("demo_projects/appliance_ferrite_12v.toml")
    thinner = project.with_values(design, {"magnets.thickness_mm": 4.0})
    results = evaluate.evaluate(thinner)
    results.nominal.no_load_speed_rad_per_s, results.demagnetization.worst_case

Every field of the results names its unit; all values are SI (temperatures in °C).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from . import checks as checks_module
from . import magnetic_circuit as mc
from .demagnetization import DemagnetizationCase, armature_reaction_field, rotor_removed_circuit
from .design import Design, design_from_project
from .magnets import (
    DemagnetizationCurves,
    demagnetization_curves,
    flux_density,
    intrinsic_coercivity_at,
    knee_field_at,
    model_temperature_range_C,
    normal_coercivity_at,
    remanence_at,
)
from .mass import material_cost, masses, rotor_inertia
from .performance import (
    MotorModel,
    OperatingPoints,
    iron_loss_terms,
    loss_torque,
    operating_points,
    speed_torque_curve,
    stall_current,
    stall_torque,
)
from .project import Project
from .thermal import housing_to_ambient_resistance, short_time_rise, steady_temperatures
from .units import MU_0, from_si
from .winding import (
    armature_inductance_estimate,
    armature_resistance,
    coil_span_slots,
    conductors_per_slot,
    current_density,
    machine_constant,
    mean_turn_length,
    parallel_paths,
    slot_fill,
    total_conductors,
    winding_length,
)

# ----------------------------------------------------------------------------------------------
# Results


@dataclass(frozen=True)
class MagnetResult:
    name: str
    family: str
    temperature_C: float  #: the nominal ambient, at which the properties below are given
    remanence_T: float
    coercivity_HcB_A_per_m: float
    coercivity_HcJ_A_per_m: float
    knee_field_A_per_m: float
    remanence_20C_T: float
    coercivity_HcJ_20C_A_per_m: float
    max_working_temperature_C: float
    density_kg_per_m3: float
    source: str


@dataclass(frozen=True)
class MagneticsResult:
    temperature_C: float  #: magnet temperature
    flux_per_pole_Wb: float
    airgap_flux_density_T: float
    magnet_flux_density_T: float
    magnet_field_A_per_m: float
    permeance_coefficient: float
    housing_flux_density_T: float
    tooth_flux_density_T: float
    core_flux_density_T: float
    leakage_factor: float
    carter_factor: float
    gap_mmf_A: float
    teeth_mmf_A: float
    core_mmf_A: float
    housing_mmf_A: float


@dataclass(frozen=True)
class WindingResult:
    type: str
    parallel_paths: int
    commutator_segments: int
    turns_per_coil: int
    conductors: int
    conductors_per_slot: float
    coil_span_slots: int
    wire: str
    wire_bare_diameter_m: float
    wire_overall_diameter_m: float
    enamel_grade: int
    mean_turn_length_m: float
    wire_length_m: float
    slot_area_m2: float
    slot_fill_bare: float  #: copper area over slot area
    slot_fill_gross: float  #: enamelled round-wire area over slot area
    resistance_20C_ohm: float
    rated_current_density_A_per_m2: float  #: in the hot case at the rated point


@dataclass(frozen=True)
class ConstantsResult:
    machine_constant: float  #: K = p·Z/(2π·a)
    ke_V_s_per_rad: float
    kt_N_m_per_A: float
    ke_V_per_krpm: float
    kt_mN_m_per_A: float
    terminal_resistance_ohm: float  #: nominal case
    inductance_H_estimate: float
    electrical_time_constant_s_estimate: float
    mechanical_time_constant_s: float
    rotor_inertia_kg_m2: float


@dataclass(frozen=True)
class PointResult:
    torque_N_m: float
    speed_rad_per_s: float
    current_A: float
    input_power_W: float
    output_power_W: float
    total_loss_W: float
    efficiency: float


@dataclass(frozen=True)
class CurveData:
    """The speed-torque table of one case (SI arrays, no load first, stall last)."""

    torque_N_m: np.ndarray
    speed_rad_per_s: np.ndarray
    current_A: np.ndarray
    input_power_W: np.ndarray
    output_power_W: np.ndarray
    efficiency: np.ndarray
    copper_loss_W: np.ndarray
    brush_loss_W: np.ndarray
    friction_loss_W: np.ndarray
    viscous_loss_W: np.ndarray
    iron_loss_W: np.ndarray


@dataclass(frozen=True)
class CaseResult:
    """Performance at one temperature case."""

    name: str  #: "cold", "nominal" or "hot"
    temperature_C: float  #: winding temperature
    ambient_C: float
    magnet_temperature_C: float
    winding_temperature_C: float
    flux_per_pole_Wb: float
    ke_V_s_per_rad: float
    terminal_resistance_ohm: float
    no_load_speed_rad_per_s: float
    no_load_current_A: float
    stall_torque_N_m: float
    stall_current_A: float
    speed_torque_gradient_rad_per_s_per_N_m: float
    max_efficiency: float
    max_efficiency_point: PointResult
    max_output_power_W: float
    max_power_point: PointResult
    rated: PointResult
    rated_reached: bool
    meets_load: bool  #: rated torque reached at or above the required speed
    curve: CurveData = field(repr=False)
    #: shaft torque at which the armature current reaches the drive's limit; None without a limit or
    #: when the limit is above the stall current (the curve beyond it is not reachable with that drive)
    current_limit_torque_N_m: float | None = None


@dataclass(frozen=True)
class DemagnetizationResult:
    ok: bool
    worst_case: str
    worst_margin_A_per_m: float
    cases: tuple[DemagnetizationCase, ...]


@dataclass(frozen=True)
class ThermalResult:
    ambient_C: float  #: the highest ambient
    duty: str
    duty_minutes: float
    housing_temperature_C: float
    winding_temperature_C: float  #: steady state (S1) or at the end of the short-time run (S2)
    magnet_temperature_C: float
    steady_winding_temperature_C: float  #: S1 steady state, also shown for S2
    insulation_class: str
    insulation_limit_C: float
    magnet_limit_C: float
    losses_W: float  #: total at the rated point, hot
    rotor_losses_W: float
    housing_to_ambient_K_per_W: float
    winding_to_housing_K_per_W: float
    thermal_time_constant_s: float
    iterations: int
    converged: bool  #: False when no steady state exists; the hot case is then at the class limit
    ok: bool
    runaway_winding_temperature_C: float | None = None  #: where the iteration stopped, when it did not converge


@dataclass(frozen=True)
class MassResult:
    magnet_kg: float
    copper_kg: float
    housing_kg: float
    lamination_kg: float
    shaft_kg: float
    total_kg: float


@dataclass(frozen=True)
class CostResult:
    currency: str
    magnet: float
    copper: float
    housing: float
    lamination: float
    total: float


@dataclass(frozen=True)
class GeometryResult:
    housing_outer_diameter_m: float
    housing_inner_diameter_m: float
    magnet_inner_diameter_m: float
    armature_diameter_m: float
    magnet_embrace: float
    overhang_m: float
    slot_pitch_m: float
    core_depth_m: float


@dataclass(frozen=True)
class SizingResult:
    """The classic sizing figures of the armature at the rated point, nominal case."""

    electric_loading_A_per_m: float  #: ampere-conductors per metre of armature circumference
    magnetic_loading_T: float  #: mean gap flux density over the whole circumference
    rotor_volume_m3: float  #: π/4·D²·L
    torque_per_rotor_volume_N_m_per_m3: float  #: rated torque over rotor volume (TRV)
    airgap_shear_stress_Pa: float  #: TRV/2


@dataclass(frozen=True)
class MagnetChartCase:
    """Plot data of the magnet operating chart for one temperature."""

    name: str
    curves: DemagnetizationCurves
    operating_field_A_per_m: float
    operating_flux_density_T: float
    permeance_coefficient: float


@dataclass(frozen=True)
class Results:
    """Everything one evaluation computes. SI throughout; temperatures in °C."""

    name: str
    supply_voltage_V: float
    brush_drop_V: float
    load_torque_N_m: float
    load_speed_rad_per_s: float
    magnet: MagnetResult
    geometry: GeometryResult
    magnetics: MagneticsResult  #: nominal case
    winding: WindingResult
    constants: ConstantsResult
    cold: CaseResult
    nominal: CaseResult
    hot: CaseResult
    demagnetization: DemagnetizationResult
    thermal: ThermalResult
    mass: MassResult
    cost: CostResult
    checks: tuple  #: of core.checks.Check
    magnet_chart: tuple[MagnetChartCase, ...] = field(repr=False)
    sizing: SizingResult | None = None

    @property
    def cases(self) -> tuple[CaseResult, CaseResult, CaseResult]:
        return (self.cold, self.nominal, self.hot)

    @property
    def warnings(self) -> list[str]:
        """Sentences for every check that did not pass."""
        return [c.sentence for c in self.checks if c.status != "pass"]


# ----------------------------------------------------------------------------------------------
# The chain

_GRID_POINTS = 24  # temperatures at which the thermal iteration reads the flux


def _stacked(parts) -> mc.PoleCircuit:
    """One circuit of arrays from (circuit, copies) pairs, in order."""
    return mc.PoleCircuit(**{
        name: np.concatenate([np.broadcast_to(getattr(c, name), (copies,)) for c, copies in parts])
        for name in vars(parts[0][0])
    })


def _select(point: mc.MagneticOperatingPoint, index) -> mc.MagneticOperatingPoint:
    """Part of a batch solution, as a solution of its own."""
    values = {}
    for name, value in vars(point).items():
        if isinstance(value, dict):
            values[name] = {k: np.asarray(v)[index] for k, v in value.items()}
        else:
            values[name] = np.asarray(value)[index]
    return mc.MagneticOperatingPoint(**values)


def _point(points: OperatingPoints) -> PointResult:
    return PointResult(
        torque_N_m=float(points.torque),
        speed_rad_per_s=float(points.speed),
        current_A=float(points.current),
        input_power_W=float(points.input_power),
        output_power_W=float(points.output_power),
        total_loss_W=float(points.total_loss),
        efficiency=float(points.efficiency),
    )


def _magnetics(point: mc.MagneticOperatingPoint, index, temperature_C) -> MagneticsResult:
    def at(values):
        return float(np.asarray(values)[index])

    return MagneticsResult(
        temperature_C=float(temperature_C),
        flux_per_pole_Wb=at(point.flux_per_pole),
        airgap_flux_density_T=at(point.airgap_flux_density),
        magnet_flux_density_T=at(point.magnet_flux_density),
        magnet_field_A_per_m=at(point.magnet_field),
        permeance_coefficient=at(point.permeance_coefficient),
        housing_flux_density_T=at(point.housing_flux_density),
        tooth_flux_density_T=at(point.tooth_flux_density),
        core_flux_density_T=at(point.core_flux_density),
        leakage_factor=at(point.leakage_factor),
        carter_factor=at(point.carter_factor),
        gap_mmf_A=at(point.mmf_drops["gap"]),
        teeth_mmf_A=at(point.mmf_drops["teeth"]),
        core_mmf_A=at(point.mmf_drops["core"]),
        housing_mmf_A=at(point.mmf_drops["housing"]),
    )


def evaluate(design: Design | Project, curve_points: int = 200) -> Results:
    """Run the whole chain on one design and return its :class:`Results`."""
    if isinstance(design, Project):
        design = design_from_project(design)
    d = design
    g = d.geometry
    grade = d.magnet
    w = d.winding

    # 1-3. Magnetic circuit: one vectorised solve over a temperature grid for the thermal iteration,
    # with the cold and nominal cases exactly on it.
    circuit = mc.pole_circuit(g, grade.recoil_permeability)
    model_low_C, model_high_C = model_temperature_range_C(grade)
    if not (model_low_C < d.ambient_min_C and d.ambient_max_C < model_high_C):
        raise mc.MagneticCircuitError(
            f"the ambient range {d.ambient_min_C:g} to {d.ambient_max_C:g} °C is outside the range where "
            f"{grade.name}'s temperature coefficients hold ({model_low_C:.0f} to {model_high_C:.0f} °C)")
    grid_top = min(max(d.ambient_max_C + 250.0, grade.max_working_temperature_C + 50.0), model_high_C)
    grid = np.concatenate((
        [d.ambient_min_C, d.ambient_nominal_C],
        np.linspace(d.ambient_min_C, grid_top, _GRID_POINTS),
    ))
    grid_point = mc.solve(grade, grid, circuit, d.housing_steel, d.lamination_steel)
    mc.require_converged(grid_point)
    order = np.argsort(grid[2:]) + 2
    grid_temperatures = grid[order]

    def flux_at(temperature_C):
        return float(np.interp(temperature_C, grid_temperatures, grid_point.flux_per_pole[order]))

    # 4. Winding.
    paths = int(parallel_paths(w.kind, g.poles, w.multiplicity))
    conductors = int(total_conductors(w.commutator_segments, w.turns_per_coil))
    turn_length = float(mean_turn_length(g, w.end_turn_factor))
    wire_length = float(winding_length(conductors, turn_length))
    copper_area = w.wire.copper_area

    def resistance_at(temperature_C):
        return float(armature_resistance(conductors, turn_length, paths, copper_area, temperature_C))

    # 5. Constants.
    constant = float(machine_constant(g.poles, conductors, paths))

    # 9a. Masses (the iron loss needs the teeth and core masses).
    part_masses = masses(g, grade.density, d.housing_steel.density, d.lamination_steel.density, wire_length, copper_area)
    nominal_flux = float(grid_point.flux_per_pole[1])
    tooth_b_per_flux = float(grid_point.tooth_flux_density[1]) / nominal_flux
    core_b_per_flux = float(grid_point.core_flux_density[1]) / nominal_flux

    def motor_at(winding_C, flux):
        iron = iron_loss_terms(
            d.lamination_steel, g.poles,
            ((part_masses.teeth, tooth_b_per_flux * flux), (part_masses.core, core_b_per_flux * flux)),
            d.losses.iron_loss_build_factor,
        )
        return MotorModel(
            voltage=d.supply_voltage, brush_drop=d.brush_drop, resistance=resistance_at(winding_C),
            constant=constant * flux, friction_torque=d.losses.friction_torque,
            viscous_coeff=d.losses.viscous_coeff, iron=iron,
        )

    # 6. Thermal: the hot case's winding and magnet temperatures at the rated point, highest ambient.
    housing_resistance = (
        d.thermal.housing_to_ambient if d.thermal.housing_to_ambient is not None
        else float(housing_to_ambient_resistance(g, d.thermal.convection_coeff))
    )
    rise_fraction = 1.0 if d.thermal.duty == "S1" else float(
        short_time_rise(1.0, d.thermal.duty_time, d.thermal.time_constant))
    ambient = d.ambient_max_C
    winding_C = magnet_C = housing_C = ambient
    steady_winding_C = ambient
    converged = False
    iterations = 0
    rotor_loss = total_loss = 0.0
    rated_reached = True
    for iterations in range(1, 101):
        model = motor_at(winding_C, flux_at(magnet_C))
        stall = float(stall_torque(model))
        rated_reached = d.load_torque < stall
        rated = operating_points(model, min(d.load_torque, stall))
        rotor_loss = float(rated.copper_loss + rated.brush_loss + rated.iron_loss)
        total_loss = float(rated.total_loss)
        steady = steady_temperatures(ambient, rotor_loss, total_loss, d.thermal.winding_to_housing, housing_resistance)
        new_winding = ambient + rise_fraction * (steady.winding_C - ambient)
        new_housing = ambient + rise_fraction * (steady.housing_C - ambient)
        change = abs(new_winding - winding_C) + abs(new_housing - housing_C)
        winding_C, housing_C, magnet_C = new_winding, new_housing, new_housing
        steady_winding_C = steady.winding_C
        if change < 1e-4:
            converged = rated_reached  # a stalled motor at the rated load has no steady state to speak of
            break
        if winding_C > 1000.0:
            break  # thermal runaway: losses grow faster than the heat can leave

    # 3b. Exact magnetic solves at the hot magnet temperature and for the rotor removed.
    open_circuit = rotor_removed_circuit(g, circuit)
    runaway_winding_C = None
    if magnet_C >= model_high_C:
        # The magnets would pass the temperature up to which their data mean anything: no usable
        # steady state either.
        converged = False
    if not converged:
        # No steady state (thermal runaway, or the rated load stalls the hot motor): the temperatures
        # the loop stopped at mean nothing. The hot case is then shown at the insulation class limit,
        # the hottest the winding may run, with the magnet at the matching share of the rise; the
        # thermal check fails and says so.
        runaway_winding_C = winding_C
        rise = max(winding_C - ambient, 1e-9)
        share = min(max((housing_C - ambient) / rise, 0.0), 1.0)
        winding_C = max(w.insulation_limit_C, ambient)
        housing_C = magnet_C = ambient + share * (winding_C - ambient)
    if magnet_C >= model_high_C:
        # Even at the class limit: evaluate at the model's edge.
        magnet_C = model_high_C
    case_temperatures = np.array([d.ambient_min_C, d.ambient_nominal_C, magnet_C, d.ambient_min_C, d.ambient_max_C])
    # One call: the five points (rotor in at cold, nominal, hot; rotor out at cold, hot) on the magnet's
    # full curve, then the same five with the magnet on its recoil line, which is what the circuit asks
    # of it (the demand the demagnetization checks use).
    five_points = ((circuit, 3), (open_circuit, 2))
    both = mc.solve(
        grade, np.concatenate((case_temperatures, case_temperatures)), _stacked(five_points * 2),
        d.housing_steel, d.lamination_steel, magnet_on_recoil_line=np.repeat([False, True], 5),
    )
    mc.require_converged(both, "the magnetic circuit (cold, nominal, hot or rotor removed)")
    exact = _select(both, slice(0, 5))
    demand = _select(both, slice(5, 10))

    # 7. Performance for the three cases.
    case_specs = (
        ("cold", d.ambient_min_C, d.ambient_min_C, d.ambient_min_C, 0),
        ("nominal", d.ambient_nominal_C, d.ambient_nominal_C, d.ambient_nominal_C, 1),
        ("hot", d.ambient_max_C, winding_C, magnet_C, 2),
    )
    cases = []
    models = {}
    for name, ambient_C, case_winding_C, case_magnet_C, index in case_specs:
        flux = float(exact.flux_per_pole[index])
        model = motor_at(case_winding_C, flux)
        models[name] = model
        stc = speed_torque_curve(model, d.load_torque, samples=curve_points)
        c = stc.curve
        rated = _point(stc.rated)
        limit_torque = None
        if d.current_limit is not None and d.current_limit < float(stc.stall.current):
            limit_speed = (d.supply_voltage - d.brush_drop - model.resistance * d.current_limit) / model.constant
            limit_torque = float(model.constant * d.current_limit - loss_torque(model, limit_speed))
        cases.append(CaseResult(
            name=name,
            temperature_C=float(case_winding_C),
            ambient_C=float(ambient_C),
            magnet_temperature_C=float(case_magnet_C),
            winding_temperature_C=float(case_winding_C),
            flux_per_pole_Wb=flux,
            ke_V_s_per_rad=model.constant,
            terminal_resistance_ohm=model.resistance,
            no_load_speed_rad_per_s=float(stc.no_load.speed),
            no_load_current_A=float(stc.no_load.current),
            stall_torque_N_m=float(stc.stall.torque),
            stall_current_A=float(stc.stall.current),
            speed_torque_gradient_rad_per_s_per_N_m=float(stc.speed_torque_gradient) if np.isfinite(stc.speed_torque_gradient) else 0.0,
            max_efficiency=float(stc.max_efficiency.efficiency),
            max_efficiency_point=_point(stc.max_efficiency),
            max_output_power_W=float(stc.max_power.output_power),
            max_power_point=_point(stc.max_power),
            rated=rated,
            rated_reached=stc.rated_reached,
            meets_load=bool(stc.rated_reached and rated.speed_rad_per_s >= d.load_speed * (1.0 - 1e-9)),
            curve=CurveData(
                torque_N_m=c.torque, speed_rad_per_s=c.speed, current_A=c.current,
                input_power_W=c.input_power, output_power_W=c.output_power, efficiency=c.efficiency,
                copper_loss_W=c.copper_loss, brush_loss_W=c.brush_loss, friction_loss_W=c.friction_loss,
                viscous_loss_W=c.viscous_loss, iron_loss_W=c.iron_loss,
            ),
            current_limit_torque_N_m=limit_torque,
        ))
    cold, nominal, hot = cases

    # 8. Demagnetization at the lowest and highest temperature.
    effective_gap = float(circuit.effective_gap)

    def reaction(current):
        return float(armature_reaction_field(current, conductors, paths, g.magnet_arc, g.magnet_thickness,
                                             grade.recoil_permeability, effective_gap))

    demag_cases = []

    def add_case(name, kind, temperature_C, current, no_load_field):
        h = no_load_field + reaction(current)
        knee = float(knee_field_at(grade, temperature_C))

        demag_cases.append(DemagnetizationCase(
            name=name, kind=kind, temperature_C=float(temperature_C), current_A=float(current),
            magnet_field_A_per_m=h, magnet_flux_density_T=float(flux_density(grade, h, temperature_C)),
            knee_field_A_per_m=knee, margin_A_per_m=h - knee, ok=bool(h > knee),
        ))

    for label, case, index in (("cold", cold, 0), ("hot", hot, 2)):
        model = models[case.name]
        no_load_field = float(demand.magnet_field[index])
        stall_i = float(stall_current(model))
        back_emf = model.constant * case.no_load_speed_rad_per_s
        reversal_i = (d.supply_voltage + back_emf - d.brush_drop) / model.resistance
        if d.current_limit is not None:
            # The drive holds the current at its limit whatever the load asks for.
            stall_i, reversal_i = min(stall_i, d.current_limit), min(reversal_i, d.current_limit)

        def limited(current):
            return " (drive-limited)" if current == d.current_limit else ""

        add_case(f"stall, {label}{limited(stall_i)}", "stall", case.magnet_temperature_C, stall_i, no_load_field)
        if d.reversing:
            add_case(f"reversal at no-load speed, {label}{limited(reversal_i)}", "reversal",
                     case.magnet_temperature_C, reversal_i, no_load_field)
        if d.current_limit is not None:
            add_case(f"drive current limit, {label}", "current limit", case.magnet_temperature_C, d.current_limit, no_load_field)
    add_case("rotor removed, cold", "rotor removed", d.ambient_min_C, 0.0, float(demand.magnet_field[3]))
    add_case("rotor removed, hot", "rotor removed", d.ambient_max_C, 0.0, float(demand.magnet_field[4]))
    worst = min(demag_cases, key=lambda c: c.margin_A_per_m)
    demagnetization = DemagnetizationResult(
        ok=all(c.ok for c in demag_cases), worst_case=worst.name,
        worst_margin_A_per_m=worst.margin_A_per_m, cases=tuple(demag_cases),
    )

    # 9b. Inertia, time constants, cost.
    slot_copper_fraction = 2.0 * g.stack_length / turn_length
    inertia = float(rotor_inertia(g, part_masses, slot_copper_fraction, d.extra_inertia))
    inductance = float(armature_inductance_estimate(g, conductors, paths, grade.recoil_permeability, effective_gap, turn_length))
    nominal_model = models["nominal"]
    cost = material_cost(part_masses, d.prices)

    thermal = ThermalResult(
        ambient_C=ambient, duty=d.thermal.duty, duty_minutes=from_si(d.thermal.duty_time, "min"),
        housing_temperature_C=housing_C, winding_temperature_C=winding_C, magnet_temperature_C=magnet_C,
        steady_winding_temperature_C=steady_winding_C,
        insulation_class=w.insulation_class, insulation_limit_C=w.insulation_limit_C,
        magnet_limit_C=grade.max_working_temperature_C, losses_W=total_loss, rotor_losses_W=rotor_loss,
        housing_to_ambient_K_per_W=housing_resistance, winding_to_housing_K_per_W=d.thermal.winding_to_housing,
        thermal_time_constant_s=d.thermal.time_constant, iterations=iterations, converged=converged,
        runaway_winding_temperature_C=runaway_winding_C,
        ok=bool(converged and winding_C <= w.insulation_limit_C and magnet_C <= grade.max_working_temperature_C),
    )
    slot_area = float(g.slot_area)
    winding = WindingResult(
        type=w.kind, parallel_paths=paths, commutator_segments=w.commutator_segments,
        turns_per_coil=w.turns_per_coil, conductors=conductors,
        conductors_per_slot=float(conductors_per_slot(conductors, g.slots)),
        coil_span_slots=int(coil_span_slots(g.slots, g.poles)), wire=w.wire.label,
        wire_bare_diameter_m=w.wire.bare_diameter, wire_overall_diameter_m=w.wire.overall_diameter,
        enamel_grade=w.wire.enamel_grade, mean_turn_length_m=turn_length, wire_length_m=wire_length,
        slot_area_m2=slot_area,
        slot_fill_bare=float(slot_fill(conductors, g.slots, w.wire.bare_diameter, slot_area)),
        slot_fill_gross=float(slot_fill(conductors, g.slots, w.wire.overall_diameter, slot_area)),
        resistance_20C_ohm=resistance_at(20.0),
        rated_current_density_A_per_m2=float(current_density(hot.rated.current_A, paths, copper_area)),
    )
    constants = ConstantsResult(
        machine_constant=constant,
        ke_V_s_per_rad=nominal_model.constant,
        kt_N_m_per_A=nominal_model.constant,
        ke_V_per_krpm=float(from_si(nominal_model.constant, "V/krpm")),
        kt_mN_m_per_A=float(from_si(nominal_model.constant, "mN·m/A")),
        terminal_resistance_ohm=nominal_model.resistance,
        inductance_H_estimate=inductance,
        electrical_time_constant_s_estimate=inductance / nominal_model.resistance,
        mechanical_time_constant_s=inertia * nominal_model.resistance / nominal_model.constant**2,
        rotor_inertia_kg_m2=inertia,
    )
    t_nom = d.ambient_nominal_C
    magnet = MagnetResult(
        name=grade.name, family=grade.family, temperature_C=t_nom,
        remanence_T=float(remanence_at(grade, t_nom)),
        coercivity_HcB_A_per_m=float(normal_coercivity_at(grade, t_nom)),
        coercivity_HcJ_A_per_m=float(intrinsic_coercivity_at(grade, t_nom)),
        knee_field_A_per_m=float(knee_field_at(grade, t_nom)),
        remanence_20C_T=grade.remanence, coercivity_HcJ_20C_A_per_m=grade.coercivity_hcj,
        max_working_temperature_C=grade.max_working_temperature_C, density_kg_per_m3=grade.density,
        source=grade.source,
    )
    geometry = GeometryResult(
        housing_outer_diameter_m=2.0 * float(g.housing_outer_radius),
        housing_inner_diameter_m=2.0 * float(g.housing_inner_radius),
        magnet_inner_diameter_m=2.0 * float(g.magnet_inner_radius),
        armature_diameter_m=2.0 * float(g.armature_radius),
        magnet_embrace=float(g.magnet_embrace), overhang_m=float(g.overhang),
        slot_pitch_m=float(g.slot_pitch), core_depth_m=float(g.core_depth),
    )
    deepest_field = min(c.magnet_field_A_per_m for c in demag_cases)
    chart = tuple(
        MagnetChartCase(
            name=name, curves=demagnetization_curves(grade, float(case_temperatures[index]), field_min=deepest_field),
            operating_field_A_per_m=float(exact.magnet_field[index]),
            operating_flux_density_T=float(exact.magnet_flux_density[index]),
            permeance_coefficient=float(exact.permeance_coefficient[index]),
        )
        for name, index in (("cold", 0), ("nominal", 1), ("hot", 2))
    )
    rotor_volume = float(np.pi * g.armature_radius**2 * g.stack_length)
    electric_loading = conductors * (nominal.rated.current_A / paths) / (2.0 * np.pi * float(g.armature_radius))
    torque_density = (nominal.rated.torque_N_m + float(loss_torque(nominal_model, nominal.rated.speed_rad_per_s))) / rotor_volume
    sizing = SizingResult(
        electric_loading_A_per_m=float(electric_loading),
        magnetic_loading_T=float(g.poles * exact.flux_per_pole[1] / (2.0 * np.pi * g.armature_radius * g.stack_length)),
        rotor_volume_m3=rotor_volume,
        torque_per_rotor_volume_N_m_per_m3=float(torque_density),
        airgap_shear_stress_Pa=float(torque_density / 2.0),
    )
    results = Results(
        name=d.name, supply_voltage_V=d.supply_voltage, brush_drop_V=d.brush_drop,
        load_torque_N_m=d.load_torque, load_speed_rad_per_s=d.load_speed,
        magnet=magnet, geometry=geometry, magnetics=_magnetics(exact, 1, t_nom), winding=winding,
        constants=constants, cold=cold, nominal=nominal, hot=hot, demagnetization=demagnetization,
        thermal=thermal,
        mass=MassResult(
            magnet_kg=part_masses.magnet, copper_kg=part_masses.copper, housing_kg=part_masses.housing,
            lamination_kg=part_masses.lamination, shaft_kg=part_masses.shaft, total_kg=part_masses.total,
        ),
        cost=CostResult(currency=d.prices.currency, magnet=cost.magnet, copper=cost.copper,
                        housing=cost.housing, lamination=cost.lamination, total=cost.total),
        checks=(),
        magnet_chart=chart,
        sizing=sizing,
    )
    from dataclasses import replace

    return replace(results, checks=tuple(checks_module.run_checks(d, results)))


__all__ = ["evaluate", "Results", "MU_0"]
