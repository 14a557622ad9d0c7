"""The readable text summary of an evaluation, for the terminal."""

from __future__ import annotations

import textwrap

from pmdc_sizer.core.results import Results

from .figures import DEMAGNETIZATION_STATES, LABELS, STATUSES, figure, text_of, unit_for, value_of
from .safety import SHORT_CAUTION
from .thermal_text import no_continuous_rating, stall_time_text

NOT_REACHED = "stalls"  #: a rated figure where the rated torque is beyond the stall torque


def summary_text(r: Results) -> str:
    lines: list[str] = []

    def section(title: str):
        lines.append("")
        lines.append(title)
        lines.append("-" * len(title))

    def row(label: str, *values: str):
        lines.append(f"  {label:<38}" + "  ".join(f"{v:>14}" for v in values))

    def shown(source, key: str, unit: str | None = None) -> str:
        return text_of(source, key, unit or unit_for(key, r))

    def figures(*keys: str):
        """A row per key of the results, with the figure's further units beside it."""
        for key in keys:
            item = figure(key)
            row(item.title, shown(r, key), *(item.text(value_of(r, key), unit) for unit in item.also))

    def demagnetization_rows(cases):
        row("", "current", "margin", "required", "state")
        for case in cases:
            row(case.name, *(shown(case, f"demagnetization_case.{name}")
                             for name in ("current_A", "margin_A_per_m", "required_margin_A_per_m")),
                DEMAGNETIZATION_STATES.get(case.status, case.status))

    def per_case(*keys: str):
        for key in keys:
            rated = key.startswith("case.rated.")
            row(figure(key).title, *(NOT_REACHED if rated and not case.rated_reached else shown(case, key)
                                     for case in r.cases))

    lines.append(f"{r.name}")
    lines.append(f"Supply {shown(r, 'supply_voltage_V')}, rated load {shown(r, 'load_torque_N_m')} "
                 f"at {shown(r, 'load_speed_rad_per_s')} or faster")

    m = r.magnet
    section(f"Magnet {m.name} ({m.family}) at {shown(r, 'magnetics.temperature_C')}")
    figures("magnet.remanence_T", "magnet.coercivity_HcJ_A_per_m", "magnetics.magnet_flux_density_T",
            "magnetics.magnet_field_A_per_m", "magnetics.permeance_coefficient", "magnetics.flux_per_pole_Wb",
            "magnetics.airgap_flux_density_T", "magnetics.tooth_flux_density_T", "magnetics.core_flux_density_T",
            "magnetics.housing_flux_density_T", "magnetics.leakage_factor", "magnetics.carter_factor")

    w = r.winding
    section("Winding and constants")
    row(LABELS["winding.type"], f"{w.type}, a = {w.parallel_paths}", f"Z = {w.conductors}")
    row(LABELS["winding.wire"], f"{w.wire} (grade {w.enamel_grade})")
    figures("winding.slot_fill_bare", "constants.ke_V_s_per_rad", "constants.kt_N_m_per_A",
            "constants.terminal_resistance_ohm", "constants.inductance_H_estimate",
            "constants.mechanical_time_constant_s")
    if r.sizing is not None:
        figures("sizing.electric_loading_A_per_m", "sizing.torque_per_rotor_volume_N_m_per_m3")

    section("Performance")
    row("", *(case.name for case in r.cases))
    row("Ambient", *(shown(case, "case.ambient_C") for case in r.cases))
    row("Winding, magnets", *(f"{shown(case, 'case.winding_temperature_C')}, {shown(case, 'case.magnet_temperature_C')}"
                              for case in r.cases))
    per_case("case.no_load_speed_rad_per_s", "case.no_load_current_A", "case.stall_torque_N_m", "case.stall_current_A",
             "case.max_efficiency", "case.max_output_power_W", "case.rated.speed_rad_per_s", "case.rated.current_A",
             "case.rated.efficiency")

    dm = r.demagnetization
    section(f"Demagnetization (margin to the knee; safe from {dm.required_margin_share:.0%} of HcJ)")
    demagnetization_rows(dm.cases)
    if r.faults is not None:
        must = "must survive" if r.faults.must_survive else "reported only"
        section(f"Faults: the supply applied directly, no limiter ({must})")
        demagnetization_rows(r.faults.cases)

    t = r.thermal
    section(f"Thermal at {shown(r, 'thermal.ambient_C')} ambient, duty {t.duty}")
    figures("thermal.winding_temperature_C", "thermal.housing_temperature_C", "thermal.magnet_temperature_C",
            "thermal.steady_winding_temperature_C")
    if t.time_to_limit_s is not None:
        figures("thermal.time_to_limit_s")
    if not t.steady_state_exists:
        row("No usable steady state", "hot case shown at the class limit" if t.time_to_limit_s else "")
    figures("thermal.winding_time_constant_s", "thermal.thermal_time_constant_s")
    row(LABELS["thermal.insulation_class"], t.insulation_class)
    if r.ratings is not None:
        section(f"Ratings at {shown(r, 'thermal.ambient_C')} ambient (winding up to its class limit)")
        no_rating = no_continuous_rating(r)
        if no_rating is None:
            figures("ratings.continuous_torque_N_m", "ratings.continuous_current_A",
                    "ratings.continuous_output_power_W")
        else:
            lines.append(f"  {figure('ratings.continuous_torque_N_m').title}")
            lines.append(f"    {no_rating}")
        figures("ratings.stall_current_A")
        for key in ("ratings.stall_time_cold_s", "ratings.stall_time_hot_s"):
            text = stall_time_text(r, key)
            if len(text) > 14:  # a sentence, not a figure: on its own line under the title
                lines.append(f"  {figure(key).title}")
                lines.append(f"    {text}")
            else:
                row(figure(key).title, text)
    if r.commutation is not None:
        section(f"Brushes ({r.commutation.brush_grade}) and commutator")
        figures("commutation.brush_current_density_A_per_m2", "commutation.brush_density_high_A_per_m2",
                "commutation.surface_speed_m_per_s", "commutation.reactance_voltage_V")

    section("Mass and material cost")
    figures("mass.magnet_kg", "mass.copper_kg", "mass.housing_kg", "mass.lamination_kg", "mass.total_kg")
    if r.mass.estimated_total_kg is not None:
        figures("mass.other_parts_kg", "mass.estimated_total_kg")
    row(figure("cost.total").title, figure("cost.total").text(r.cost.total, r.cost.currency))

    section("Checks")
    for check in r.checks:
        lines.append(f"  [{STATUSES[check.status].tag:<4}] {check.sentence}")
    lines.append("")
    lines += textwrap.wrap(SHORT_CAUTION, 100)
    return "\n".join(lines)
