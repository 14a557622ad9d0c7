"""The readable text summary of an evaluation, for the terminal."""

from __future__ import annotations

import textwrap

from pmdc_sizer.core.results import Results

from .figures import LABELS, STATUSES, figure, text_of, unit_for, value_of
from .safety import SHORT_CAUTION

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
    row("", *(f"{case.name} {shown(case, 'case.winding_temperature_C')}" for case in r.cases))
    per_case("case.no_load_speed_rad_per_s", "case.no_load_current_A", "case.stall_torque_N_m", "case.stall_current_A",
             "case.max_efficiency", "case.max_output_power_W", "case.rated.speed_rad_per_s", "case.rated.current_A",
             "case.rated.efficiency")

    section("Demagnetization (margin to the knee; positive is safe)")
    for case in r.demagnetization.cases:
        row(case.name, *(shown(case, f"demagnetization_case.{name}") for name in ("current_A", "margin_A_per_m")),
            "ok" if case.ok else "FAILS")

    t = r.thermal
    section(f"Thermal at {shown(r, 'thermal.ambient_C')} ambient, duty {t.duty}")
    figures("thermal.winding_temperature_C", "thermal.magnet_temperature_C")
    row(LABELS["thermal.insulation_class"], t.insulation_class)

    section("Mass and material cost")
    figures("mass.magnet_kg", "mass.copper_kg", "mass.housing_kg", "mass.lamination_kg", "mass.total_kg")
    row(figure("cost.total").title, figure("cost.total").text(r.cost.total, r.cost.currency))

    section("Checks")
    for check in r.checks:
        lines.append(f"  [{STATUSES[check.status].tag:<4}] {check.sentence}")
    lines.append("")
    lines += textwrap.wrap(SHORT_CAUTION, 100)
    return "\n".join(lines)
