"""How every figure the app shows is presented, written once.

Screen, paper and terminal read from here, none of them repeats it:

* :data:`FIGURES`: key → :class:`Figure` (title, unit shown, significant figures) for every number the
  results panel, the charts, the datasheet, the terminal summary and the comparison show. A key is the
  figure's path in ``core``'s results (``"constants.kt_N_m_per_A"``); ``case.`` stands for any of the
  three temperature cases (``results.cold``, ``.nominal``, ``.hot``), ``demagnetization_case.`` for one
  of ``results.demagnetization.cases`` and ``magnet_chart_case.`` for one of ``results.magnet_chart``.
* :data:`LABELS`: titles of what is shown as words or whole counts (the wire, the poles).
* :data:`POINTS`: the marker and colour of every named point on a chart (rated, best efficiency,
  maximum power, required, no-load operating point, knee, demagnetization cases), and :data:`LINES`
  for the marked lines (the drive's current limit, the rated torque, the load line).
* :data:`CASES`, :data:`STATUSES`, :data:`SIDES`: colours of the temperature cases, of the check
  statuses and of the two designs of a comparison.

The colours and shapes are this tool's own. Temperature cases run from a cool blue through charcoal to a
warm brick and differ by dash too; demagnetization results differ by shape as well as colour (a hollow
triangle is safe, a large cross is past the knee), so everything reads in grey print and for
colour-blind readers. No Qt here: the charts turn the names of shapes and dashes into their own drawing.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

from pmdc_sizer.core.units import factor, from_si, known_units

from .formatting import significant, unit_label

# ----------------------------------------------------------------------------------------------
# Figures


@dataclass(frozen=True)
class Figure:
    """How one number is shown: its title, the unit it is shown in and its significant figures."""

    title: str
    unit: str  #: a ``core.units`` unit; "1" for a pure number, "%" for a fraction, "°C"; "rpm/mN·m" a ratio
    digits: int = 3  #: significant figures; temperatures are shown to the whole degree
    also: tuple[str, ...] = ()  #: further units a view with room shows it in, e.g. Ke in V·s/rad too

    def text(self, value_si, unit: str | None = None, digits: int | None = None) -> str:
        """``value_si`` in ``unit`` (default: the figure's own) with its unit, e.g. "12.3 mN·m"."""
        return quantity_text(value_si, unit or self.unit, self.digits if digits is None else digits)

    def number(self, value_si, unit: str | None = None, digits: int | None = None) -> str:
        """The same without the unit, for tables whose header carries it."""
        return number_text(value_si, unit or self.unit, self.digits if digits is None else digits)

    def label(self, unit: str | None = None) -> str:
        """The title with the unit, e.g. "Stall torque [mN·m]"; a pure number's title alone."""
        unit = unit or self.unit
        return self.title if unit == "1" else f"{self.title} [{unit_label(unit)}]"


_UNITS = frozenset(known_units())


def shown_value(value_si, unit: str) -> float:
    """An SI value in a shown unit: a core.units unit, "1", degrees of angle, or a ratio of two units."""
    if unit == "1":
        return value_si
    if unit == "°":
        return math.degrees(value_si)
    if unit in _UNITS:
        return from_si(value_si, unit)
    numerator, _, denominator = unit.partition("/")
    if numerator in _UNITS and denominator in _UNITS:
        return from_si(value_si, numerator) * factor(denominator)
    return value_si  # a currency: shown as it is


def number_text(value_si, unit: str, digits: int = 3) -> str:
    """The number of :func:`quantity_text` alone."""
    if value_si is None or not math.isfinite(value_si):
        return "–"
    if unit in ("°C", "°F"):
        return f"{from_si(value_si, unit):.0f}"
    return significant(shown_value(value_si, unit), digits)


def quantity_text(value_si, unit: str, digits: int = 3) -> str:
    """A value with its unit: "12.3 mN·m", "85.0 %", "40 °C", "1.23", "4.50 EUR", "17.2 rpm/mN·m"."""
    text = number_text(value_si, unit, digits)
    if unit == "1":
        return text
    if unit == "°":
        return f"{text}°"
    numerator, _, denominator = unit.partition("/")
    if unit not in _UNITS and numerator in _UNITS and denominator in _UNITS:
        return f"{text} {unit_label(numerator)}/{unit_label(denominator)}"
    return f"{text} {unit_label(unit)}"


def _f(title: str, unit: str, digits: int = 3, also: tuple[str, ...] = ()) -> Figure:
    return Figure(title, unit, digits, also)


ESTIMATE_DIGITS = 2  #: the inductance and the time constants rest on rough estimates

FIGURES: dict[str, Figure] = {
    # What the motor is asked to do
    "supply_voltage_V": _f("Supply voltage", "V"),
    "brush_drop_V": _f("Brush drop (both brushes)", "V"),
    "load_torque_N_m": _f("Rated torque", "mN·m"),
    "load_speed_rad_per_s": _f("Required speed at rated torque", "rpm"),
    "current_limit_A": _f("Drive current limit", "A"),
    # Each temperature case
    "case.ambient_C": _f("Ambient", "°C"),
    "case.winding_temperature_C": _f("Winding temperature", "°C"),
    "case.magnet_temperature_C": _f("Magnet temperature", "°C"),
    "case.no_load_speed_rad_per_s": _f("No-load speed", "rpm"),
    "case.no_load_current_A": _f("No-load current", "A"),
    "case.stall_torque_N_m": _f("Stall torque, no current limit", "mN·m"),
    "case.stall_current_A": _f("Stall current, no current limit", "A"),
    "case.rated.speed_rad_per_s": _f("Speed at rated torque", "rpm"),
    "case.rated.current_A": _f("Current at rated torque", "A"),
    "case.rated.output_power_W": _f("Output power at rated torque", "W"),
    "case.rated.efficiency": _f("Efficiency at rated torque", "%"),
    "case.current_limit_torque_N_m": _f("Torque at the drive current limit", "mN·m"),
    "case.envelope.torque_limit_N_m": _f("Torque at the drive current limit", "mN·m"),
    "case.envelope.max_output_power_W": _f("Maximum output power within the drive's limit", "W"),
    "case.max_efficiency": _f("Maximum efficiency", "%"),
    "case.max_efficiency_point.torque_N_m": _f("Torque at maximum efficiency", "mN·m"),
    "case.max_output_power_W": _f("Maximum output power, no current limit", "W"),
    "case.max_power_point.torque_N_m": _f("Torque at maximum power", "mN·m"),
    "case.ke_V_s_per_rad": _f("Back-EMF constant Ke", "V/krpm"),
    "case.kt_N_m_per_A": _f("Torque constant Kt", "mN·m/A"),  # the case's Ke: Kt = Ke in SI units
    "case.terminal_resistance_ohm": _f("Terminal resistance", "ohm"),
    "case.speed_torque_gradient_rad_per_s_per_N_m": _f("Speed drop per unit torque", "rpm/mN·m"),
    "case.flux_per_pole_Wb": _f("Flux per pole", "mWb"),
    # The curves of a case, as the charts' axes and cursor read them
    "curve.torque_N_m": _f("Shaft torque", "mN·m"),
    "curve.speed_rad_per_s": _f("Speed", "rpm"),
    "curve.current_A": _f("Armature current", "A"),
    "curve.efficiency": _f("Efficiency", "%"),
    "curve.output_power_W": _f("Output power", "W"),
    # Constants (nominal)
    "constants.ke_V_s_per_rad": _f("Back-EMF constant Ke", "V/krpm"),
    "constants.kt_N_m_per_A": _f("Torque constant Kt", "mN·m/A"),
    "constants.terminal_resistance_ohm": _f("Terminal resistance", "ohm"),
    "constants.inductance_H_estimate": _f("Armature inductance (estimate)", "mH", ESTIMATE_DIGITS),
    "constants.electrical_time_constant_s_estimate": _f("Electrical time constant (estimate)", "ms", ESTIMATE_DIGITS),
    "constants.mechanical_time_constant_s": _f("Mechanical time constant (estimate)", "ms", ESTIMATE_DIGITS),
    "constants.rotor_inertia_kg_m2": _f("Rotor inertia", "g·cm2"),
    # The magnet grade at the nominal magnet temperature
    "magnet.remanence_20C_T": _f("Remanence Br at 20 °C", "T"),
    "magnet.coercivity_HcJ_20C_A_per_m": _f("Intrinsic coercivity HcJ at 20 °C", "kA/m"),
    "magnet.remanence_T": _f("Br", "T"),
    "magnet.coercivity_HcB_A_per_m": _f("HcB", "kA/m"),
    "magnet.coercivity_HcJ_A_per_m": _f("HcJ", "kA/m"),
    "magnet.knee_field_A_per_m": _f("Knee field", "kA/m"),
    "magnet.max_working_temperature_C": _f("Maximum working temperature", "°C"),
    # Magnetic circuit (nominal, no load)
    "magnetics.temperature_C": _f("Magnet temperature", "°C"),
    "magnetics.flux_per_pole_Wb": _f("Flux per pole", "mWb"),
    "magnetics.airgap_flux_density_T": _f("Air-gap flux density", "T"),
    "magnetics.magnet_flux_density_T": _f("Operating point Bm", "T"),
    "magnetics.magnet_field_A_per_m": _f("Operating point Hm", "kA/m"),
    "magnetics.permeance_coefficient": _f("Permeance coefficient", "1"),
    "magnetics.leakage_factor": _f("Leakage factor", "1"),
    "magnetics.carter_factor": _f("Carter factor", "1"),
    "magnetics.housing_flux_density_T": _f("Housing flux density", "T"),
    "magnetics.tooth_flux_density_T": _f("Tooth flux density", "T"),
    "magnetics.core_flux_density_T": _f("Armature core flux density", "T"),
    # The no-load operating point of each temperature case (magnet chart)
    "magnet_chart_case.curves.temperature_C": _f("Magnet temperature", "°C"),
    "magnet_chart_case.operating_flux_density_T": _f("Operating point Bm", "T"),
    "magnet_chart_case.operating_field_A_per_m": _f("Operating point Hm", "kA/m"),
    "magnet_chart_case.permeance_coefficient": _f("Permeance coefficient", "1"),
    "magnet_chart_case.curves.knee_field": _f("Knee field", "kA/m"),
    "magnet_chart_case.curves.field_strength": _f("Field strength H", "kA/m"),
    "magnet_chart_case.curves.flux_density": _f("Flux density B, polarization J", "T"),
    # Demagnetization
    "demagnetization.worst_margin_A_per_m": _f("Least margin to the knee", "kA/m"),
    "demagnetization_case.temperature_C": _f("Magnet temperature", "°C"),
    "demagnetization_case.current_A": _f("Current", "A"),
    "demagnetization_case.magnet_field_A_per_m": _f("Field, worst 5 %", "kA/m"),  # the tables' notes explain
    "demagnetization_case.magnet_flux_density_T": _f("Flux density at that field", "T"),
    "demagnetization_case.worst_angle_rad": _f("Worst spot from the pole centre", "°"),
    "demagnetization_case.mean_field_A_per_m": _f("Mean field over the magnet", "kA/m"),
    "demagnetization_case.mean_flux_density_T": _f("Mean flux density over the magnet", "T"),
    "demagnetization_case.magnet_area_past_knee_fraction": _f("Magnet area past the knee", "%", 2),
    "demagnetization_case.knee_field_A_per_m": _f("Knee field", "kA/m"),
    "demagnetization_case.margin_A_per_m": _f("Margin to the knee", "kA/m"),
    "demagnetization_case.required_margin_A_per_m": _f("Required margin", "kA/m"),
    "demagnetization.required_margin_A_per_m": _f("Required margin to the knee, at most", "kA/m"),
    "demagnetization.required_margin_share": _f("Required margin, share of HcJ", "%", 2),
    "faults.worst_margin_A_per_m": _f("Least margin with the supply applied directly", "kA/m"),
    # Ratings at the highest ambient (S1 with the winding at its class limit; stall to the class limit)
    "ratings.continuous_torque_N_m": _f("Continuous torque (S1), hot ambient", "mN·m"),
    "ratings.continuous_current_A": _f("Continuous current (S1), hot ambient", "A"),
    "ratings.continuous_speed_rad_per_s": _f("Speed at the continuous torque", "rpm"),
    "ratings.continuous_output_power_W": _f("Continuous output power (S1)", "W"),
    "ratings.stall_current_A": _f("Stall current held", "A"),
    "ratings.stall_time_cold_s": _f("Permitted stall time from cold", "s", 2),
    "ratings.stall_time_hot_s": _f("Permitted stall time from hot (S1)", "s", 2),
    # Brushes and commutator
    "commutation.brush_current_density_A_per_m2": _f("Brush current density at rated torque, hot", "A/cm2"),
    "commutation.brush_density_high_A_per_m2": _f("Brush current density allowed", "A/cm2"),
    "commutation.surface_speed_m_per_s": _f("Commutator surface speed, highest no-load speed", "m/s"),
    "commutation.reactance_voltage_V": _f("Reactance voltage (estimate)", "V", 2),
    "commutation.commutator_diameter_m": _f("Commutator diameter", "mm"),
    # Winding
    "winding.slot_fill_bare": _f("Slot fill, copper", "%", 2),
    "winding.slot_fill_gross": _f("Slot fill, enamelled wire", "%", 2),
    "winding.rated_current_density_A_per_m2": _f("Current density at rated torque, hot", "A/mm2"),
    "winding.resistance_20C_ohm": _f("Terminal resistance at 20 °C", "ohm"),
    "winding.wire_length_m": _f("Wire length", "m"),
    "winding.conductors_per_slot": _f("Conductors per slot", "1"),
    # Sizing figures (nominal, rated torque)
    "sizing.electric_loading_A_per_m": _f("Electric loading at rated torque", "kA/m"),
    "sizing.torque_per_rotor_volume_N_m_per_m3": _f("Torque per rotor volume (TRV)", "kN·m/m3"),
    # Thermal: the hot case at the highest ambient
    "thermal.ambient_C": _f("Highest ambient", "°C"),
    "thermal.losses_W": _f("Losses at rated torque, hot", "W"),
    "thermal.winding_temperature_C": _f("Winding temperature, hot", "°C"),
    "thermal.steady_winding_temperature_C": _f("Winding temperature if run on (S1)", "°C"),
    "thermal.housing_temperature_C": _f("Housing temperature", "°C"),
    "thermal.magnet_temperature_C": _f("Magnet temperature, hot", "°C"),
    "thermal.magnet_limit_C": _f("Magnet working limit", "°C"),
    "thermal.insulation_limit_C": _f("Insulation temperature limit", "°C"),
    "thermal.winding_to_housing_K_per_W": _f("Thermal resistance winding to housing", "K/W"),
    "thermal.housing_to_ambient_K_per_W": _f("Thermal resistance housing to ambient", "K/W"),
    "thermal.thermal_time_constant_s": _f("Thermal time constant of the motor", "min"),
    "thermal.winding_time_constant_s": _f("Thermal time constant of the winding", "s", 2),
    "thermal.time_to_limit_s": _f("Time to the class limit at rated load, from cold", "min", 2),
    "thermal.winding_heat_capacity_J_per_K": _f("Heat capacity of the winding", "J/K", 2),
    "thermal.housing_heat_capacity_J_per_K": _f("Heat capacity of housing and magnets", "J/K", 2),
    "thermal.winding_to_magnet_K_per_W": _f("Thermal resistance across the gap", "K/W"),
    "thermal.transient.time_s": _f("Time from the start at ambient", "min"),  # the duty chart's time axis
    # Construction
    "geometry.housing_outer_diameter_m": _f("Housing outer diameter", "mm"),
    "geometry.housing_length_m": _f("Housing length", "mm"),
    "geometry.armature_diameter_m": _f("Armature diameter", "mm"),
    "geometry.stack_length_m": _f("Stack length", "mm"),
    "geometry.airgap_m": _f("Air gap", "mm"),
    "geometry.magnet_thickness_m": _f("Magnet thickness", "mm"),
    "geometry.magnet_arc_rad": _f("Magnet arc", "°"),
    "geometry.magnet_length_m": _f("Magnet length", "mm"),
    "geometry.shaft_diameter_m": _f("Shaft diameter", "mm"),
    "geometry.overhang_m": _f("Magnet overhang beyond the stack, each end", "mm"),
    # Masses and material cost (the cost's unit is the project's currency, given by the view)
    "mass.magnet_kg": _f("Magnet mass", "g"),
    "mass.copper_kg": _f("Copper mass", "g"),
    "mass.housing_kg": _f("Housing steel mass", "g"),
    "mass.lamination_kg": _f("Lamination steel mass", "g"),
    "mass.shaft_kg": _f("Shaft mass", "g"),
    "mass.total_kg": _f("Active mass, with shaft", "g"),
    "mass.shaft_extension_kg": _f("Shaft run-out beyond the drive end (estimate)", "g", ESTIMATE_DIGITS),
    "mass.end_caps_kg": _f("End caps (estimate)", "g", ESTIMATE_DIGITS),
    "mass.brush_gear_kg": _f("Brush holder, brushes and terminals (estimate)", "g", ESTIMATE_DIGITS),
    "mass.commutator_kg": _f("Commutator (estimate)", "g", ESTIMATE_DIGITS),
    "mass.bearings_kg": _f("Bearings (estimate)", "g", ESTIMATE_DIGITS),
    "mass.other_parts_kg": _f("Other parts (estimate)", "g", ESTIMATE_DIGITS),
    "mass.estimated_total_kg": _f("Estimated total mass", "g"),
    "cost.magnet": _f("Magnet material cost", "currency"),
    "cost.copper": _f("Copper cost", "currency"),
    "cost.housing": _f("Housing steel cost", "currency"),
    "cost.lamination": _f("Lamination steel cost", "currency"),
    "cost.total": _f("Material cost", "currency"),
}

#: Titles of what is shown as words or whole counts, not as a rounded quantity.
LABELS: dict[str, str] = {
    "magnet.name": "Grade",
    "magnet.family": "Family",
    "geometry.poles": "Poles",
    "geometry.slots": "Slots",
    "winding.type": "Winding",
    "winding.commutator_segments": "Commutator segments",
    "winding.turns_per_coil": "Turns per coil",
    "winding.conductors": "Conductors",
    "winding.wire": "Wire (enamel grade, IEC 60317)",
    "thermal.duty": "Duty type (IEC 60034-1)",
    "thermal.insulation_class": "Insulation class (IEC 60085)",
    "thermal.converged": "Thermal solution",
    "reversing": "Reversed at speed",
    "demagnetization_case.name": "Case",
    "demagnetization_case.ok": "Result",
    "demagnetization_case.status": "State",
    "commutation.brush_grade": "Brush grade",
}

#: The temperature cases a key's ``case.`` may stand for, and how a comparison names a case that is not
#: the nominal one.
CASE_NAMES = ("cold", "nominal", "hot")


def figure(key: str) -> Figure:
    """The :class:`Figure` of ``key``; ``cold.``, ``nominal.`` and ``hot.`` read as ``case.``."""
    head, _, rest = key.partition(".")
    if head in CASE_NAMES:
        key = f"case.{rest}"
    try:
        return FIGURES[key]
    except KeyError:
        raise KeyError(f"{key!r} is not in app.figures.FIGURES: add its title, unit and digits there") from None


def title_of(key: str) -> str:
    """The title of ``key``, with the temperature case named when the key picks one other than nominal."""
    head = key.partition(".")[0]
    title = figure(key).title
    return f"{title}, {head}" if head in ("cold", "hot") else title


def value_of(source, key: str):
    """The value at ``key``'s path in ``source`` (results, a case, ...); the first part of a ``case.``,
    ``demagnetization_case.`` or ``magnet_chart_case.`` key names the object passed, not an attribute."""
    parts = key.split(".")
    if parts[0] in ("case", "demagnetization_case", "magnet_chart_case"):
        parts = parts[1:]
    if parts == ["kt_N_m_per_A"]:
        parts = ["ke_V_s_per_rad"]  # a case's Kt is its Ke: equal in SI units
    node = source
    for part in parts:
        node = getattr(node, part)
    return node


def text_of(source, key: str, unit: str | None = None, digits: int | None = None) -> str:
    """``key``'s value in ``source``, shown as its figure says."""
    return figure(key).text(value_of(source, key), unit, digits)


def torque_unit(results) -> str:
    """mN·m for small motors, N·m once any stall torque reaches 10 N·m; every view of a design uses one."""
    return "N·m" if max(c.stall_torque_N_m for c in results.cases) >= 10.0 else "mN·m"


def unit_for(key: str, results) -> str:
    """The unit ``key`` is shown in for this design: torques follow :func:`torque_unit`."""
    return design_unit(figure(key).unit, results)


def design_unit(unit: str, results) -> str:
    """``unit`` as this design's figures are shown in it: a torque in :func:`torque_unit`, the rest as given."""
    if "mN·m" in unit and unit != "mN·m/A":
        return unit.replace("mN·m", torque_unit(results))
    return unit


def units_of_design(results, view_unit: Callable[[str], str]) -> Callable[[str], str]:
    """The unit a view shows a quoted figure of ``results`` in (a check's torque as the key figures' torque).

    ``view_unit`` maps an SI unit to the view's own (the screen's or the paper's unit system).
    """
    return lambda unit: view_unit(design_unit(unit, results))


#: The comparison's rows, in order: what an engineer reads first when choosing between two designs.
#: Nominal case unless the key names another.
COMPARE_KEYS: tuple[str, ...] = (
    "magnet.remanence_T",
    "magnet.coercivity_HcJ_A_per_m",
    "geometry.magnet_thickness_m",
    "magnetics.permeance_coefficient",
    "magnetics.magnet_flux_density_T",
    "magnetics.airgap_flux_density_T",
    "magnetics.flux_per_pole_Wb",
    "constants.ke_V_s_per_rad",
    "constants.kt_N_m_per_A",
    "constants.terminal_resistance_ohm",
    "nominal.no_load_speed_rad_per_s",
    "nominal.no_load_current_A",
    "nominal.stall_torque_N_m",
    "nominal.stall_current_A",
    "nominal.rated.speed_rad_per_s",
    "hot.rated.speed_rad_per_s",
    "nominal.rated.current_A",
    "nominal.max_efficiency",
    "nominal.max_output_power_W",
    "demagnetization.worst_margin_A_per_m",
    "thermal.winding_temperature_C",
    "geometry.housing_outer_diameter_m",  # a re-fit by magnet thickness grows the housing: show it
    "geometry.housing_length_m",
    "mass.magnet_kg",
    "mass.total_kg",
    "mass.estimated_total_kg",
    "cost.magnet",
    "cost.total",
)

#: The tolerance study's key figures (``core.tolerance_study.KEY_FIGURES``, named as ``core.batch`` names
#: them) → the :data:`FIGURES` key that titles them; the first five are those a datasheet's tolerance
#: column carries.
TOLERANCE_FIGURES: dict[str, str] = {
    "nominal.no_load_speed_rad_per_s": "case.no_load_speed_rad_per_s",
    "nominal.no_load_current_A": "case.no_load_current_A",
    "nominal.ke_V_s_per_rad": "case.ke_V_s_per_rad",
    "nominal.terminal_resistance_ohm": "case.terminal_resistance_ohm",
    "nominal.stall_torque_N_m": "case.stall_torque_N_m",
    "nominal.stall_current_A": "case.stall_current_A",
    "nominal.rated_speed_rad_per_s": "case.rated.speed_rad_per_s",
    "nominal.rated_current_A": "case.rated.current_A",
    "worst_demagnetization_margin_A_per_m": "demagnetization.worst_margin_A_per_m",
}
DATASHEET_TOLERANCE_FIGURES = tuple(TOLERANCE_FIGURES)[:5]

#: The figures a sizing search keeps of every feasible design, by the names ``core.sizing`` gives them
#: (``core.batch`` names, and the few it derives: the worst case's efficiency, the envelope), as the sizing
#: page plots, colours and lists them: each objective's figure and the key figures.
SIZING_FIGURES: dict[str, Figure] = {
    "mass.active_kg": _f("Active mass: magnets, copper, steel", "g"),
    "mass.magnet_kg": FIGURES["mass.magnet_kg"],
    "mass.copper_kg": FIGURES["mass.copper_kg"],
    "cost.total": FIGURES["cost.total"],
    "worst.rated_efficiency": _f("Efficiency at rated torque, worst case", "%"),
    "nominal.rated_efficiency": _f("Efficiency at rated torque, nominal", "%"),
    "envelope.outer_diameter_m": FIGURES["geometry.housing_outer_diameter_m"],
    "envelope.overall_length_m": _f("Overall length", "mm"),
    "worst_demagnetization_margin_A_per_m": FIGURES["demagnetization.worst_margin_A_per_m"],
    "hot.rated_copper_loss_W": _f("Copper loss at rated torque, hot", "W"),
    "nominal.no_load_speed_rad_per_s": _f("No-load speed, nominal", "rpm"),
    "nominal.stall_torque_N_m": _f("Stall torque, nominal, no current limit", "mN·m"),
    "constants.ke_V_s_per_rad": FIGURES["constants.ke_V_s_per_rad"],
    "hot.rated_speed_rad_per_s": FIGURES["case.rated.speed_rad_per_s"],
    "hot.rated_efficiency": FIGURES["case.rated.efficiency"],
    "thermal.winding_temperature_C": FIGURES["thermal.winding_temperature_C"],
}

#: The :data:`SIZING_FIGURES` the terminal's table of returned designs shows, with their short column headings.
SIZING_COLUMN_HEADINGS: dict[str, str] = {
    "mass.active_kg": "mass", "cost.total": "cost", "envelope.outer_diameter_m": "outer dia.",
    "nominal.no_load_speed_rad_per_s": "no-load", "hot.rated_speed_rad_per_s": "rated hot",
    "hot.rated_efficiency": "eff. hot", "thermal.winding_temperature_C": "winding",
    "worst_demagnetization_margin_A_per_m": "knee margin",
}

# ----------------------------------------------------------------------------------------------
# Named points and lines on the charts


@dataclass(frozen=True)
class PointStyle:
    """How a named point is marked, on screen and on paper alike."""

    title: str  #: legend text
    marker: str  #: one of :data:`MARKERS`
    colour: str | None  #: "#rrggbb", or None: the colour of the point's temperature case
    filled: bool = True
    size: float = 1.0  #: relative to the chart's usual marker size
    short: str = ""  #: a key's text where room is short (the title explains it in a tooltip)

    @property
    def key_text(self) -> str:
        return self.short or self.title

    @property
    def glyph(self) -> str:
        """A text character of the same shape, for keys written as text."""
        filled, hollow = MARKERS[self.marker]
        return filled if self.filled else hollow

    def colour_for(self, case_name: str) -> str:
        return self.colour or CASES[case_name].colour


#: Marker shapes: name → (filled glyph, hollow glyph).
MARKERS: dict[str, tuple[str, str]] = {
    "circle": ("●", "○"),
    "square": ("■", "□"),
    "diamond": ("◆", "◇"),
    "triangle": ("▲", "△"),
    "plus": ("✚", "✚"),
    "cross": ("✖", "✕"),
}


#: A line sample of each dash, written as text (for keys and legends in rich text).
DASH_GLYPHS: dict[str, str] = {"solid": "━━━", "dash": "╍╍╍", "dot": "┈┈┈", "dash_dot": "━·━"}


@dataclass(frozen=True)
class LineStyle:
    title: str
    colour: str
    dash: str  #: "solid", "dash", "dot" or "dash_dot"
    short: str = ""  #: a key's text where room is short

    @property
    def key_text(self) -> str:
        return self.short or self.title


@dataclass(frozen=True)
class CaseStyle:
    title: str
    colour: str
    dash: str  #: of its speed-torque curves, so the cases differ in grey print too


CASES: dict[str, CaseStyle] = {
    "cold": CaseStyle("cold", "#1d5fb4", "dash"),
    "nominal": CaseStyle("nominal", "#3a3f47", "solid"),
    "hot": CaseStyle("hot", "#c2410c", "dash_dot"),
}

REQUIRED_COLOUR = "#111111"
DRIVE_LIMIT_COLOUR = "#7a3db8"
FAIL_COLOUR = "#c0137a"
SAFE_COLOUR = "#1b7f3b"
WARNING_COLOUR = "#9a6200"
WINDING_COLOUR = "#b3471d"  #: the duty chart's winding (copper) and its class limit
MAGNET_COLOUR = "#2b6cb0"  #: ... the magnets and their grade's limit

POINTS: dict[str, PointStyle] = {
    # performance chart: one of each per temperature case, in the case's colour
    "rated": PointStyle("rated point", "square", None),
    "best_efficiency": PointStyle("best efficiency", "circle", None),
    "max_power": PointStyle("maximum output power", "triangle", None),
    "required": PointStyle("required: rated torque at this speed or faster", "plus", REQUIRED_COLOUR, size=1.7),
    # magnet chart
    "operating_point": PointStyle("no-load operating point, on its load line", "circle", None, short="no load"),
    "knee": PointStyle("knee: irreversible loss begins", "diamond", None, filled=False, short="knee"),
    # a case's mark sits at the mean over the worst 5 % of the magnet's area, the one its verdict rests on
    "demagnetization_safe": PointStyle("demagnetization case, safe", "triangle", None, filled=False, short="safe"),
    "demagnetization_marginal": PointStyle("demagnetization case inside the required margin: marginal", "square",
                                           WARNING_COLOUR, filled=False, size=1.3, short="marginal"),
    "demagnetization_fails": PointStyle("demagnetization case past the knee: demagnetizes", "cross", FAIL_COLOUR,
                                        size=1.6, short="past the knee"),
    # the same three states for the faults (supply applied directly), filled so that they read apart
    "fault_safe": PointStyle("fault, safe", "triangle", None),
    "fault_marginal": PointStyle("fault, marginal", "square", WARNING_COLOUR, size=1.3),
    "fault_fails": PointStyle("fault past the knee", "cross", FAIL_COLOUR, size=1.6),
    # the magnet's segments under a case's current (the worst one is the case's mark) and their mean
    "magnet_segment": PointStyle("magnet segments across the arc", "circle", None, size=0.45, short="segments"),
    "magnet_mean": PointStyle("mean over the magnet", "circle", None, filled=False, size=0.8, short="mean"),
    # the duty chart: where a duty with no steady state takes the winding to its class limit
    "class_limit_reached": PointStyle("winding reaches its class limit", "diamond", FAIL_COLOUR, size=1.3),
    # the sizing page: every feasible design (coloured by the chosen figure), the trade-off front over
    # them, the best design for each objective alone, and the one picked to open
    "sizing_feasible": PointStyle("feasible design", "circle", None, size=0.55, short="feasible"),
    "sizing_front": PointStyle("on the trade-off front (no other feasible design is better in every objective)",
                               "circle", REQUIRED_COLOUR, filled=False, size=1.2, short="front"),
    "sizing_best": PointStyle("best for one objective alone", "diamond", REQUIRED_COLOUR, filled=False, size=1.8,
                              short="best for one objective"),
    "sizing_picked": PointStyle("design picked", "plus", FAIL_COLOUR, size=1.8, short="picked"),
}
#: The sizing page's colour scale for the third figure, low to high: a dark blue through teal to straw,
#: light enough at the top that the front's dark rings stay visible and ordered in grey print too.
SIZING_COLOUR_STOPS: tuple[tuple[float, str], ...] = (
    (0.0, "#27306b"), (0.3, "#2c6f9e"), (0.6, "#3fa39a"), (0.82, "#a3c96b"), (1.0, "#f0d66a"),
)
SIZING_PLAIN_COLOUR = "#7b8490"  #: feasible designs when no figure is chosen for the colour

@dataclass(frozen=True)
class RegionStyle:
    """A shaded band of a chart."""

    title: str
    colour: str  #: "#rrggbb"
    opacity: float  #: 0 to 1

    @property
    def swatch(self) -> str:
        """The shade on white, "#rrggbb", for keys written as rich text (which read "#aarrggbb"); a little
        deeper than on the chart, so that the small sample shows beside its words."""
        red, green, blue = (int(self.colour[i:i + 2], 16) for i in (1, 3, 5))
        depth = min(1.0, 2.5 * self.opacity)
        return "#" + "".join(f"{round(255 - depth * (255 - c)):02x}" for c in (red, green, blue))


#: The torque range beyond the drive's current limit, shaded on screen and on paper alike.
REGIONS: dict[str, RegionStyle] = {
    "beyond_limit": RegionStyle("beyond the drive's limit", DRIVE_LIMIT_COLOUR, 0.10),
    "loaded": RegionStyle("under the rated load", WINDING_COLOUR, 0.09),  #: the duty chart's S2 run, S3 spells
}

#: How a demagnetization case's state reads, in words, on screen, in the summary and on paper.
DEMAGNETIZATION_STATES: dict[str, str] = {"safe": "safe", "marginal": "marginal", "past_knee": "past the knee"}

LINES: dict[str, LineStyle] = {
    "drive_limit": LineStyle("drive current limit", DRIVE_LIMIT_COLOUR, "dash_dot"),
    "rated_torque": LineStyle("rated torque", "#7b8490", "dash"),
    "load_line": LineStyle("load line", "#5b6470", "dot"),
    #: the no-load load line moved along H until it passes through the worst case's worst spot
    "shifted_load_line": LineStyle("load line shifted by the armature reaction", "#5b6470", "dash_dot",
                                   short="shifted load line"),
    # the duty chart: each part's temperature, and each limit in its part's colour (dash-dot)
    "winding_temperature": LineStyle("winding", WINDING_COLOUR, "solid"),
    "magnet_temperature": LineStyle("magnets", MAGNET_COLOUR, "dash"),
    "housing_temperature": LineStyle("housing", "#5b6470", "dot"),
    "insulation_limit": LineStyle("insulation class limit", WINDING_COLOUR, "dash_dot"),
    "magnet_limit": LineStyle("magnet grade's maximum working temperature", MAGNET_COLOUR, "dash_dot"),
}
#: The duty chart's temperature axis.
TEMPERATURE_AXIS = Figure("Temperature", "°C")

#: The tolerance page: the drawn motors' bars, the design's own value, and the 0.135 % / 99.865 % points.
SPREAD_BAR_COLOUR = "#6f8fb0"
SPREAD_NOMINAL_LINE = LineStyle("design as drawn, no tolerance", REQUIRED_COLOUR, "solid", short="as drawn")
SPREAD_LIMIT_LINE = LineStyle("0.135 % and 99.865 % points (±3σ)", WARNING_COLOUR, "dash", short="±3σ points")
#: The band of the drawn motors' nominal speed-torque curves (lowest to highest speed at each torque).
SPREAD_BAND = RegionStyle("spread of the drawn motors, nominal case", CASES["nominal"].colour, 0.16)


def demagnetization_case_colour(case) -> str:
    """A demagnetization case in the colour of its temperature: cold cases cold, the others hot."""
    return CASES["cold" if "cold" in case.name else "hot"].colour


def demagnetization_point(case, fault: bool = False) -> str:
    """The :data:`POINTS` key of a demagnetization case by its state; ``fault``: one of ``results.faults``."""
    state = "fails" if not case.ok else ("marginal" if case.status == "marginal" else "safe")
    return f"{'fault' if fault else 'demagnetization'}_{state}"


# ----------------------------------------------------------------------------------------------
# Check statuses and the sides of a comparison


@dataclass(frozen=True)
class StatusStyle:
    word: str  #: on screen and paper
    tag: str  #: four letters for the terminal's columns
    mark: str
    colour: str
    shade: str  #: a light background for its rows


STATUSES: dict[str, StatusStyle] = {
    "pass": StatusStyle("pass", "ok", "✔", SAFE_COLOUR, "#e3f4e8"),
    "warning": StatusStyle("warning", "WARN", "▲", WARNING_COLOUR, "#fdf3dc"),
    "fail": StatusStyle("FAIL", "FAIL", "✖", FAIL_COLOUR, "#fbe3ef"),
}


@dataclass(frozen=True)
class SideStyle:
    colour: str
    dash: str
    size: float  #: of its marks: A's larger, so B's at the same point still lets it show

    @property
    def line_glyph(self) -> str:
        return DASH_GLYPHS[self.dash]


#: A solid in slate, B dashed in teal: told apart by colour and by line, also in grey print.
SIDES: dict[str, SideStyle] = {
    "A": SideStyle("#334155", "solid", 1.25),
    "B": SideStyle("#0d9488", "dash", 0.8),
}


#: The speed-torque quantities the performance charts plot against torque, in their order on screen and
#: on paper (the efficiency last: its panel is narrowed to the working range).
CURVE_QUANTITIES: tuple[str, ...] = ("speed_rad_per_s", "current_A", "output_power_W", "efficiency")

#: The named points of a temperature case on the performance chart: point key → its ``CaseResult`` field.
CASE_POINTS: dict[str, str] = {"rated": "rated", "best_efficiency": "max_efficiency_point",
                               "max_power": "max_power_point"}


def drive_current_limit(results) -> float | None:
    """The drive's current limit [A], or None for a plain supply."""
    return results.current_limit_A


def qt_pen_style(dash: str):
    """The Qt pen style of a dash name, for the screen's and the paper's charts alike."""
    from PySide6.QtCore import Qt

    return {"solid": Qt.PenStyle.SolidLine, "dash": Qt.PenStyle.DashLine, "dot": Qt.PenStyle.DotLine,
            "dash_dot": Qt.PenStyle.DashDotLine}[dash]


# ----------------------------------------------------------------------------------------------
# The field solution's picture (app/field_picture.py): the same colours on screen, in --png and on paper.

#: |B| in the iron, from white through straw and orange to a deep red at saturation, so that the
#: saturated parts stand out and the picture still reads in grey.
FIELD_MAX_FLUX_DENSITY_T = 2.2
FIELD_FLUX_DENSITY_STOPS: tuple[tuple[float, str], ...] = (
    (0.0, "#fbfbf6"), (0.35, "#f3e3a1"), (0.6, "#e8a34a"), (0.8, "#c8532c"), (1.0, "#6e1423"),
)
#: Magnets by their margin to the knee as a share of |H_knee|: past the knee in the failure colour,
#: little margin amber, ample margin the safe green.
FIELD_KNEE_MARGIN_STOPS: tuple[tuple[float, str], ...] = (
    (0.0, FAIL_COLOUR), (0.12, WARNING_COLOUR), (0.4, "#8fbf8f"), (1.0, SAFE_COLOUR),
)
FIELD_FLUX_LINE_COLOUR = "#1f2a44"
