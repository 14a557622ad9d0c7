"""The readable text summary of an evaluation, for the terminal."""

from __future__ import annotations

from pmdc_sizer.core.results import Results

from .formatting import percent, quantity as q, significant, temperature

_STATUS = {"pass": "ok  ", "warning": "WARN", "fail": "FAIL"}


def summary_text(r: Results) -> str:
    lines: list[str] = []

    def section(title: str):
        lines.append("")
        lines.append(title)
        lines.append("-" * len(title))

    def row(label: str, *values: str):
        lines.append(f"  {label:<34}" + "  ".join(f"{v:>14}" for v in values))

    lines.append(f"{r.name}")
    lines.append(f"Supply {q(r.supply_voltage_V, 'V')}, rated load {q(r.load_torque_N_m, 'mN·m')} "
                 f"at {q(r.load_speed_rad_per_s, 'rpm')} or faster")

    m, mg = r.magnet, r.magnetics
    section(f"Magnet {m.name} ({m.family}) at {temperature(m.temperature_C)}")
    row("Br, HcJ", q(m.remanence_T, "T"), q(m.coercivity_HcJ_A_per_m, "kA/m"))
    row("Operating point Bm, Hm", q(mg.magnet_flux_density_T, "T"), q(mg.magnet_field_A_per_m, "kA/m"))
    row("Permeance coefficient", significant(mg.permeance_coefficient))
    row("Flux per pole", q(mg.flux_per_pole_Wb, "mWb"))
    row("Air-gap flux density", q(mg.airgap_flux_density_T, "T"))
    row("Tooth, core, housing flux density", q(mg.tooth_flux_density_T, "T"), q(mg.core_flux_density_T, "T"),
        q(mg.housing_flux_density_T, "T"))
    row("Leakage factor, Carter factor", significant(mg.leakage_factor, 4), significant(mg.carter_factor, 4))

    w, c = r.winding, r.constants
    section("Winding and constants")
    row("Winding", f"{w.type}, a = {w.parallel_paths}", f"Z = {w.conductors}")
    row("Wire, slot fill (copper)", w.wire, percent(w.slot_fill_bare, 2))
    row("Ke", q(c.ke_V_s_per_rad, "V/krpm"), q(c.ke_V_s_per_rad, "V·s/rad", 4))
    row("Kt", q(c.kt_N_m_per_A, "mN·m/A"))
    row("Terminal resistance", q(c.terminal_resistance_ohm, "ohm"))
    row("Inductance (estimate)", q(c.inductance_H_estimate, "mH", 2))
    row("Mechanical time constant", q(c.mechanical_time_constant_s, "ms"))

    if r.sizing is not None:
        row("Electric loading, TRV (rated)", q(r.sizing.electric_loading_A_per_m, "kA/m"),
            q(r.sizing.torque_per_rotor_volume_N_m_per_m3, "kN·m/m3"))

    section("Performance")
    row("", *(f"{case.name} {temperature(case.winding_temperature_C)}" for case in r.cases))
    row("No-load speed", *(q(case.no_load_speed_rad_per_s, "rpm") for case in r.cases))
    row("No-load current", *(q(case.no_load_current_A, "A") for case in r.cases))
    row("Stall torque", *(q(case.stall_torque_N_m, "mN·m") for case in r.cases))
    row("Stall current", *(q(case.stall_current_A, "A") for case in r.cases))
    row("Max efficiency", *(percent(case.max_efficiency) for case in r.cases))
    row("Max output power", *(q(case.max_output_power_W, "W") for case in r.cases))
    row("Rated speed", *(q(case.rated.speed_rad_per_s, "rpm") for case in r.cases))
    row("Rated current", *(q(case.rated.current_A, "A") for case in r.cases))
    row("Rated efficiency", *(percent(case.rated.efficiency) for case in r.cases))

    section("Demagnetization (margin to the knee; positive is safe)")
    for case in r.demagnetization.cases:
        row(case.name, q(case.current_A, "A"), q(case.margin_A_per_m, "kA/m"), "ok" if case.ok else "FAILS")

    t = r.thermal
    section(f"Thermal at {temperature(t.ambient_C)} ambient, duty {t.duty}")
    row("Winding, magnet temperature", temperature(t.winding_temperature_C), temperature(t.magnet_temperature_C))
    row("Insulation class (IEC 60085)", t.insulation_class)

    section("Mass and material cost")
    row("Magnet, copper, steel", q(r.mass.magnet_kg, "g"), q(r.mass.copper_kg, "g"),
        q(r.mass.housing_kg + r.mass.lamination_kg, "g"))
    row("Material cost", f"{significant(r.cost.total)} {r.cost.currency}")

    section("Checks")
    for check in r.checks:
        lines.append(f"  [{_STATUS[check.status]}] {check.sentence}")
    lines.append("")
    lines.append("Engineering estimates: confirm by test. Strong magnets pinch and can harm implanted medical devices;")
    lines.append("a stalled motor overheats. Follow local codes and licensed practice.")
    return "\n".join(lines)
