"""What the datasheet says, as plain tables of formatted text; the HTML and PDF writers only lay it out.

Every number is formatted here through :mod:`app.formatting`: three significant figures, two for the
estimates (inductance and time constants), temperatures to the degree. Nothing is computed here
except unit conversions and picking values out of the results.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field

from pmdc_sizer.core.results import Results
from pmdc_sizer.core.magnets import KNEE_LOSS_FRACTION
from pmdc_sizer.core.project import Project
from pmdc_sizer.core.units import from_si

from ..formatting import money, percent, quantity as q, ratio, significant, temperature
from .charts import demagnetization_point_labels, torque_unit

ESTIMATE_DIGITS = 2

STATUS_WORDS = {"pass": "pass", "warning": "warning", "fail": "FAIL"}

CAUTIONS = (
    "Strong permanent magnets pinch fingers and can shatter into sharp splinters when they snap together; "
    "their fields can disturb pacemakers and other implanted medical devices. Handle magnetized parts with "
    "care, keep them apart, and keep them away from people with implants.",
    "A stalled motor draws its stall current and overheats within seconds to minutes: fit overcurrent and "
    "overtemperature protection sized for the stall current given on this sheet.",
    "Batteries and supplies can deliver currents that burn skin, melt conductors and start fires. Size "
    "wiring, fuses and switches for the stall current, and insulate terminals before connecting.",
    "Every figure on this sheet is an engineering estimate from a model of the design; confirm it by test "
    "on a prototype before release.",
    "Installation, protection and safety must follow local codes and licensed practice, which take "
    "precedence over anything on this sheet.",
)

TERMINAL_ROWS = (
    ("A1", "armature terminal; positive for the rotation stated below"),
    ("A2", "armature terminal; negative for the rotation stated below"),
)
ROTATION_CONVENTION = (
    "Direction of rotation, as this product uses it: with A1 positive with respect to A2, the shaft turns "
    "clockwise seen from the drive end; swapping the supply polarity reverses it. Markings follow "
    "IEC 60034-8 as we recall it (from memory): confirm against IEC 60034-8 and on the prototype test."
)


@dataclass(frozen=True)
class Row:
    cells: tuple[str, ...]
    kind: str = ""  #: "" normal, "group" (a heading across the table), "pass", "warning", "fail", "worst"


@dataclass(frozen=True)
class Table:
    header: tuple[str, ...]
    rows: tuple[Row, ...]
    widths: tuple[int, ...] = ()  #: relative column widths
    numeric_from: int = 1  #: columns from this index on are right-aligned numbers ...
    numeric_until: int = 99  #: ... up to (not including) this one

    def is_numeric(self, column: int) -> bool:
        return self.numeric_from <= column < self.numeric_until
    caption: str = ""
    title: str = ""  #: a small heading above the table
    key: str = ""  #: stable identifier (HTML id, tests)


@dataclass(frozen=True)
class Columns:
    """Two stacks of blocks side by side (each half the page wide)."""

    left: tuple
    right: tuple


@dataclass(frozen=True)
class Chart:
    name: str  #: a key of charts.DRAWERS
    caption: str


@dataclass(frozen=True)
class Paragraph:
    text: str
    kind: str = ""  #: "", "note", "strong", "caution"


@dataclass(frozen=True)
class Section:
    key: str  #: stable identifier, used as an HTML id and by the tests
    title: str
    blocks: tuple = ()
    new_page: bool = False


@dataclass(frozen=True)
class Datasheet:
    title: str
    description: str
    revision: str
    issued: str
    subtitle: str
    identity: tuple[tuple[str, str], ...]
    headline: tuple[tuple[str, str], ...]
    sections: tuple[Section, ...] = field(default_factory=tuple)

    def section(self, key: str) -> Section:
        return next(s for s in self.sections if s.key == key)


def _kv(rows, caption: str = "", title: str = "", key: str = "") -> Table:
    return Table(("", ""), tuple(Row(tuple(r)) for r in rows), widths=(62, 38), caption=caption, title=title, key=key)


def _case_header(results: Results) -> tuple[str, ...]:
    return ("",) + tuple(c.name for c in results.cases)


def _per_case(label: str, values) -> Row:
    return Row((label,) + tuple(values))


NOT_REACHED = "stalls"


def rated(case, text: str) -> str:
    """A rated-point figure, or a plain word where the rated torque is beyond the stall torque."""
    return text if case.rated_reached else NOT_REACHED


def performance_table(results: Results) -> Table:
    r = results
    limit = r.current_limit_A
    unit = torque_unit(r)
    cases = r.cases
    rows = [
        Row(("Temperatures",), "group"),
        _per_case("Ambient", (temperature(c.ambient_C) for c in cases)),
        _per_case("Winding", (temperature(c.winding_temperature_C) for c in cases)),
        _per_case("Magnet", (temperature(c.magnet_temperature_C) for c in cases)),
        Row(("No load",), "group"),
        _per_case("No-load speed", (q(c.no_load_speed_rad_per_s, "rpm") for c in cases)),
        _per_case("No-load current", (q(c.no_load_current_A, "A") for c in cases)),
        Row((f"Rated load, {q(r.load_torque_N_m, unit)} (required speed {q(r.load_speed_rad_per_s, 'rpm')} or more)",),
            "group"),
        _per_case("Speed", (rated(c, q(c.rated.speed_rad_per_s, "rpm")) for c in cases)),
        _per_case("Current", (rated(c, q(c.rated.current_A, "A")) for c in cases)),
        _per_case("Output power", (rated(c, q(c.rated.output_power_W, "W")) for c in cases)),
        _per_case("Efficiency", (rated(c, percent(c.rated.efficiency)) for c in cases)),
        _per_case("Load met", ("yes" if c.meets_load else "NO" for c in cases)),
        Row(("At stall" if limit is None else "At stall, and where the drive limits the current",), "group"),
        _per_case("Stall torque", (q(c.stall_torque_N_m, unit) for c in cases)),
        _per_case("Stall current", (q(c.stall_current_A, "A") for c in cases)),
    ]
    if limit is not None:
        rows.append(_per_case(f"Torque at the {q(limit, 'A')} drive limit", (
            q(c.current_limit_torque_N_m, unit) if c.current_limit_torque_N_m is not None else "limit above stall"
            for c in cases)))
    rows += [
        Row(("Best points",), "group"),
        _per_case("Maximum efficiency", (percent(c.max_efficiency) for c in cases)),
        _per_case("Torque at maximum efficiency", (q(c.max_efficiency_point.torque_N_m, unit) for c in cases)),
        _per_case("Maximum output power", (q(c.max_output_power_W, "W") for c in cases)),
        _per_case("Torque at maximum power", (q(c.max_power_point.torque_N_m, unit) for c in cases)),
        Row(("Constants",), "group"),
        _per_case("Back-EMF constant Ke", (q(c.ke_V_s_per_rad, "V/krpm") for c in cases)),
        _per_case("Ke", (q(c.ke_V_s_per_rad, "V·s/rad") for c in cases)),
        _per_case("Torque constant Kt", (q(c.ke_V_s_per_rad, "mN·m/A") for c in cases)),
        _per_case("Terminal resistance", (q(c.terminal_resistance_ohm, "ohm") for c in cases)),
        _per_case("Speed-torque gradient", (ratio(c.speed_torque_gradient_rad_per_s_per_N_m, "rpm", unit) for c in cases)),
        _per_case("Flux per pole", (q(c.flux_per_pole_Wb, "mWb") for c in cases)),
    ]
    return Table(_case_header(r), tuple(rows), widths=(40, 20, 20, 20),
                 caption="Kt equals Ke in SI units. The stall figures ignore any drive current limit.", key="performance_table")


def electrical_table(results: Results) -> Table:
    r, c = results, results.constants
    limit = r.current_limit_A
    rows = [
        ("Supply voltage", q(r.supply_voltage_V, "V")),
        ("Brush drop (both brushes)", q(r.brush_drop_V, "V")),
        ("Drive current limit", q(limit, "A") if limit is not None else "none (plain supply)"),
        ("Reversed at speed", "yes" if r.reversing else "no"),
        ("Terminal resistance at 20 °C", q(r.winding.resistance_20C_ohm, "ohm")),
        ("Armature inductance (estimate)", q(c.inductance_H_estimate, "mH", ESTIMATE_DIGITS)),
        ("Electrical time constant (estimate)", q(c.electrical_time_constant_s_estimate, "ms", ESTIMATE_DIGITS)),
        ("Mechanical time constant (estimate)", q(c.mechanical_time_constant_s, "ms", ESTIMATE_DIGITS)),
        ("Rotor inertia", q(c.rotor_inertia_kg_m2, "g·cm2")),
    ]
    return _kv(rows, caption="Time constants at the nominal temperature.", title="Electrical and mechanical",
               key="electrical")


def magnet_tables(results: Results) -> tuple[Table, Table]:
    m, mg = results.magnet, results.magnetics
    grade_rows = [
        ("Grade", m.name),
        ("Family", m.family),
        ("Remanence Br at 20 °C", q(m.remanence_20C_T, "T")),
        ("Intrinsic coercivity HcJ at 20 °C", q(m.coercivity_HcJ_20C_A_per_m, "kA/m")),
        (f"Br at {temperature(m.temperature_C)}", q(m.remanence_T, "T")),
        (f"HcB at {temperature(m.temperature_C)}", q(m.coercivity_HcB_A_per_m, "kA/m")),
        (f"HcJ at {temperature(m.temperature_C)}", q(m.coercivity_HcJ_A_per_m, "kA/m")),
        (f"Knee field at {temperature(m.temperature_C)}", q(m.knee_field_A_per_m, "kA/m")),
        ("Maximum working temperature", temperature(m.max_working_temperature_C)),
        ("Air-gap flux density (nominal)", q(mg.airgap_flux_density_T, "T")),
        ("Leakage factor (nominal)", significant(mg.leakage_factor)),
    ]
    chart = results.magnet_chart
    point_rows = (
        _per_case("Magnet [°C]", (f"{c.curves.temperature_C:.0f}" for c in chart)),
        _per_case("Bm [T]", (significant(c.operating_flux_density_T) for c in chart)),
        _per_case("Hm [kA/m]", (significant(from_si(c.operating_field_A_per_m, "kA/m")) for c in chart)),
        _per_case("Permeance coeff.", (significant(c.permeance_coefficient) for c in chart)),
        _per_case("Knee [kA/m]", (significant(from_si(c.curves.knee_field, "kA/m")) for c in chart)),
    )
    points = Table(("",) + tuple(c.name for c in chart), point_rows, widths=(37, 21, 21, 21),
                   title="No-load operating point", key="operating_point")
    grade = _kv(grade_rows, title="Magnet grade", key="magnet_grade",
                caption=f"Grade data: {m.source}. Confirm with the supplier's certified curves.")
    return grade, points


def demagnetization_table(results: Results) -> Table:
    dm = results.demagnetization
    labels = demagnetization_point_labels(results)
    rows = []
    for label, case in zip(labels, dm.cases):
        kind = "fail" if not case.ok else ("worst" if case.name == dm.worst_case else "")
        rows.append(Row((
            label, case.name, temperature(case.temperature_C), q(case.current_A, "A"),
            q(case.magnet_field_A_per_m, "kA/m"), q(case.knee_field_A_per_m, "kA/m"),
            q(case.margin_A_per_m, "kA/m"), "safe" if case.ok else "DEMAGNETIZES",
        ), kind))
    return Table(("No.", "Case", "Magnet", "Current", "Tip field", "Knee", "Margin", "Status"), tuple(rows),
                 widths=(5, 25, 9, 9, 12, 12, 12, 16), numeric_from=2, numeric_until=7, key="demagnetization",
                 caption="Margin is the field at the magnet's most exposed tip minus the knee field; positive is safe. "
                         "The knee is where the magnet starts to lose flux for good: its intrinsic curve has fallen "
                         f"{KNEE_LOSS_FRACTION:.0%} of Br below the recoil line. "
                         "The numbers mark the cases on the magnet chart.")


def worst_case_sentence(results: Results) -> str:
    dm = results.demagnetization
    margin = q(dm.worst_margin_A_per_m, "kA/m")
    if dm.ok:
        return f"Worst case: {dm.worst_case}, margin {margin} to the knee. Every case is safe."
    failing = sum(1 for c in dm.cases if not c.ok)
    return (f"Worst case: {dm.worst_case}, {margin} past the knee. {failing} case(s) demagnetize the magnet: "
            "the design must change before release.")


def thermal_table(results: Results) -> Table:
    t = results.thermal
    duty = "S1, continuous" if t.duty == "S1" else f"S2, {t.duty_minutes:g} min"
    winding_label = "Winding temperature, steady" if t.duty == "S1" else "Winding temperature, end of run"
    if not t.converged:
        winding_label = "Winding temperature (no steady state: shown at the class limit)"
    rows = [
        ("Highest ambient", temperature(t.ambient_C)),
        ("Duty type (IEC 60034-1)", duty),
        ("Losses at the rated load, hot", q(t.losses_W, "W")),
        (winding_label, temperature(t.winding_temperature_C)),
    ]
    if t.duty != "S1":
        rows.append(("Winding temperature if run on (S1)", temperature(t.steady_winding_temperature_C)))
    rows += [
        ("Housing temperature", temperature(t.housing_temperature_C)),
        ("Magnet temperature", temperature(t.magnet_temperature_C)),
        ("Magnet working limit", temperature(t.magnet_limit_C)),
        ("Insulation class (IEC 60085)", t.insulation_class),
        ("Insulation temperature limit", temperature(t.insulation_limit_C)),
        ("Thermal resistance winding to housing", q(t.winding_to_housing_K_per_W, "K/W")),
        ("Thermal resistance housing to ambient", q(t.housing_to_ambient_K_per_W, "K/W")),
        ("Thermal time constant", q(t.thermal_time_constant_s, "min")),
        ("Thermal solution", "converged" if t.converged else "NO STEADY STATE"),
    ]
    return _kv(rows, title="Thermal", key="thermal")


def build_tables(results: Results) -> tuple[Table, Table, Table]:
    r, w, g = results, results.winding, results.geometry

    def mm(length_m: float) -> str:
        return significant(from_si(length_m, "mm"))

    winding_rows = [
        ("Poles", str(g.poles)),
        ("Winding", f"{w.type}, {w.parallel_paths} parallel paths"),
        ("Slots, commutator segments", f"{g.slots}, {w.commutator_segments}"),
        ("Turns per coil, total conductors", f"{w.turns_per_coil}, {w.conductors}"),
        ("Wire (enamel grade, IEC 60317)", f"{w.wire} (grade {w.enamel_grade})"),
        ("Slot fill, copper", percent(w.slot_fill_bare, 2)),
        ("Current density at the rated load, hot", q(w.rated_current_density_A_per_m2, "A/mm2")),
        ("Housing outer diameter × length", f"{mm(g.housing_outer_diameter_m)} × {mm(g.housing_length_m)} mm"),
        ("Armature diameter × stack length", f"{mm(g.armature_diameter_m)} × {mm(g.stack_length_m)} mm"),
        ("Air gap", f"{mm(g.airgap_m)} mm"),
        ("Magnet thickness, arc, length", f"{mm(g.magnet_thickness_m)} mm, "
                                          f"{significant(from_si(g.magnet_arc_rad, 'deg'))}°, {mm(g.magnet_length_m)} mm"),
    ]
    m = r.mass
    mass_rows = [
        ("Magnets", q(m.magnet_kg, "g")),
        ("Copper", q(m.copper_kg, "g")),
        ("Housing steel", q(m.housing_kg, "g")),
        ("Lamination steel", q(m.lamination_kg, "g")),
        ("Shaft", q(m.shaft_kg, "g")),
        ("Total of these", q(m.total_kg, "g")),
    ]
    c = r.cost
    cost_rows = [
        ("Magnets", money(c.magnet, c.currency)),
        ("Copper", money(c.copper, c.currency)),
        ("Housing steel", money(c.housing, c.currency)),
        ("Lamination steel", money(c.lamination, c.currency)),
        ("Material cost", money(c.total, c.currency)),
    ]
    return (_kv(winding_rows, title="Winding and construction", key="winding"),
            _kv(mass_rows, caption="Active parts and shaft; brushes, commutator and end caps not included.",
                title="Masses", key="mass"),
            _kv(cost_rows, caption="Raw material only, at the prices per kilogram set in the project.",
                title="Material cost", key="cost"))


def checks_table(results: Results) -> Table:
    rows = tuple(
        Row((STATUS_WORDS[c.status], c.title, c.message + (f" {c.advice[0].upper() + c.advice[1:]}." if c.advice else "")),
            c.status)
        for c in results.checks
    )
    return Table(("Status", "Check", "Finding"), rows, widths=(10, 19, 71), numeric_from=99, key="checks")


def failing_summary(results: Results) -> tuple[Paragraph, ...]:
    """A line that cannot be missed when any check fails; nothing when all pass."""
    failing = [c.title for c in results.checks if c.status == "fail"]
    if not failing:
        return ()
    return (Paragraph(f"This design fails {len(failing)} check(s): {', '.join(failing)}. See the design checks; "
                      "it is not ready for release.", "fail"),)


def headline(project: Project, results: Results) -> tuple[tuple[str, str], ...]:
    n, c, dm = results.nominal, results.constants, results.demagnetization
    unit = torque_unit(results)
    return (
        ("Supply", q(results.supply_voltage_V, "V")),
        ("Rated torque", q(results.load_torque_N_m, unit)),
        ("Rated speed, nominal", rated(n, q(n.rated.speed_rad_per_s, "rpm"))),
        ("No-load speed", q(n.no_load_speed_rad_per_s, "rpm")),
        ("Stall torque", q(n.stall_torque_N_m, unit)),
        ("Ke", q(c.ke_V_s_per_rad, "V/krpm")),
        ("Kt", q(c.kt_N_m_per_A, "mN·m/A")),
        ("Max. efficiency", percent(n.max_efficiency)),
        ("Max. output power", q(n.max_output_power_W, "W")),
        ("Least demag. margin", q(dm.worst_margin_A_per_m, "kA/m")),
    )


def build(project: Project, results: Results, issued: _dt.date | None = None) -> Datasheet:
    """The complete datasheet content of one evaluated design."""
    r = results
    info = project.project
    # The sheet is issued on its revision's date when the project gives one, else on the day of export.
    if issued is None:
        issued = _dt.date.fromisoformat(info.revision_date) if info.revision_date else _dt.date.today()
    magnet_grade, operating_points = magnet_tables(r)
    winding, mass, cost = build_tables(r)
    notes = info.notes.strip()
    sections = (
        Section("performance", "Performance at three temperatures", failing_summary(r) + (
            Paragraph("Cold: the coldest ambient, motor at rest temperature. Nominal: the nominal ambient. Hot: the "
                      "hottest ambient with winding and magnets at the temperatures they reach at the rated load.",
                      "note"),
            performance_table(r),
        )),
        Section("terminals", "Terminal markings", (
            Table(("Marking", "Meaning"), tuple(Row(t) for t in TERMINAL_ROWS), widths=(15, 85), numeric_from=99,
                  key="terminal_markings"),
            Paragraph(ROTATION_CONVENTION, "note"),
        )),
        Section("performance_chart", "Performance chart", (
            Chart("performance", "Speed, current and output power from no load to stall; efficiency over the working "
                                 "range. Cold, nominal and hot cases."),
            Columns((electrical_table(r),), (thermal_table(r),)),
        ), new_page=True),
        Section("magnet", "Magnet and demagnetization", (
            Chart("magnet", "Second-quadrant curves of the grade at the three magnet temperatures with the load lines, "
                            "no-load operating points, knees and the demagnetization cases numbered as in the table."),
            demagnetization_table(r),
            Paragraph(worst_case_sentence(r), "strong" if r.demagnetization.ok else "fail"),
            Columns((magnet_grade,), (operating_points,)),
        ), new_page=True),
        Section("construction", "Construction, masses and cost", (Columns((winding,), (mass, cost)),), new_page=True),
        Section("checks", "Design checks", (checks_table(r),)),
        Section("notes", "Notes", tuple(Paragraph(line.strip()) for line in notes.splitlines() if line.strip())
                or (Paragraph("No notes."),)),
        Section("cautions", "Cautions", tuple(Paragraph(text, "caution") for text in CAUTIONS)),
    )
    identity = (
        ("Revision", info.revision),
        ("Issued", issued.isoformat()),
        ("Magnet", r.magnet.name),
        ("Poles", str(r.geometry.poles)),
        ("Winding", f"{r.winding.type}, Z = {r.winding.conductors}"),
        ("Wire", r.winding.wire),
        ("Duty", r.thermal.duty),
        ("Insulation", f"class {r.thermal.insulation_class}"),
    )
    subtitle = "Brushed permanent-magnet DC motor: design datasheet (engineering estimates)"
    return Datasheet(title=info.name, description=info.description.strip(), revision=info.revision,
                     issued=issued.isoformat(), subtitle=subtitle, identity=identity,
                     headline=headline(project, r), sections=sections)
