"""What the datasheet says, as plain tables of formatted text; the HTML and PDF writers only lay it out.

Every figure's title, unit and significant figures come from :mod:`app.figures` (two figures for the
estimates, temperatures to the degree), the cautions from :mod:`app.safety`. Nothing is computed here
except unit conversions and picking values out of the results.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field

from pmdc_sizer.core.magnets import KNEE_LOSS_FRACTION
from pmdc_sizer.core.project import Project
from pmdc_sizer.core.results import Results

from ..figures import LABELS, STATUSES, figure, text_of, unit_for, value_of
from ..formatting import unit_label
from ..safety import caution_sentences
from .charts import demagnetization_point_labels

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
class Picture:
    """A picture made elsewhere (the field solution's), carried as PNG bytes."""

    name: str  #: unique within the sheet; the resource name in the paged document
    png: bytes = field(repr=False)
    caption: str = ""


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
    return ("", *tuple(c.name for c in results.cases))


def _per_case(label: str, values) -> Row:
    return Row((label, *tuple(values)))


NOT_REACHED = "stalls"


def rated(case, text: str) -> str:
    """A rated-point figure, or a plain word where the rated torque is beyond the stall torque."""
    return text if case.rated_reached else NOT_REACHED


def _shown(source, key: str, results: Results, unit: str | None = None) -> str:
    return text_of(source, key, unit or unit_for(key, results))


def _case_rows(results: Results, *keys: str) -> list[Row]:
    """A row per key of a temperature case (and one per further unit the figure is given in)."""
    rows = []
    for key in keys:
        item = figure(key)
        is_rated = key.startswith("case.rated.")
        for unit in (unit_for(key, results), *item.also):
            title = item.title if unit == unit_for(key, results) else f"{item.title} in {unit_label(unit)}"
            rows.append(_per_case(title, (rated(c, _shown(c, key, results, unit)) if is_rated
                                          else _shown(c, key, results, unit) for c in results.cases)))
    return rows


def _figure_rows(results: Results, *keys: str, source=None) -> list[tuple[str, str]]:
    """(title, text) for each key of the results (or of ``source``)."""
    return [(figure(key).title, _shown(results if source is None else source, key, results)) for key in keys]


def performance_table(results: Results) -> Table:
    r = results
    limit = r.current_limit_A
    rows = [
        Row(("Temperatures",), "group"),
        *_case_rows(r, "case.ambient_C", "case.winding_temperature_C", "case.magnet_temperature_C"),
        Row(("No load",), "group"),
        *_case_rows(r, "case.no_load_speed_rad_per_s", "case.no_load_current_A"),
        Row((f"Rated load, {_shown(r, 'load_torque_N_m', r)} (required speed {_shown(r, 'load_speed_rad_per_s', r)} "
             "or more)",), "group"),
        *_case_rows(r, "case.rated.speed_rad_per_s", "case.rated.current_A", "case.rated.output_power_W",
                    "case.rated.efficiency"),
        _per_case("Load met", ("yes" if c.meets_load else "NO" for c in r.cases)),
        Row(("At stall" if limit is None else "At stall, and where the drive limits the current",), "group"),
        *_case_rows(r, "case.stall_torque_N_m", "case.stall_current_A"),
    ]
    if limit is not None:
        key = "case.current_limit_torque_N_m"
        rows.append(_per_case(f"{figure(key).title} ({_shown(r, 'current_limit_A', r)})", (
            _shown(c, key, r) if c.current_limit_torque_N_m is not None else "limit above stall" for c in r.cases)))
    rows += [
        Row(("Best points",), "group"),
        *_case_rows(r, "case.max_efficiency", "case.max_efficiency_point.torque_N_m", "case.max_output_power_W",
                    "case.max_power_point.torque_N_m"),
        Row(("Constants",), "group"),
        *_case_rows(r, "case.ke_V_s_per_rad", "case.kt_N_m_per_A", "case.terminal_resistance_ohm",
                    "case.speed_torque_gradient_rad_per_s_per_N_m", "case.flux_per_pole_Wb"),
    ]
    return Table(_case_header(r), tuple(rows), widths=(40, 20, 20, 20),
                 caption="Kt equals Ke in SI units. The stall figures ignore any drive current limit.",
                 key="performance_table")


def electrical_table(results: Results) -> Table:
    r = results
    limit = r.current_limit_A
    rows = [
        *_figure_rows(r, "supply_voltage_V", "brush_drop_V"),
        (figure("current_limit_A").title, _shown(r, "current_limit_A", r) if limit is not None
         else "none (plain supply)"),
        (LABELS["reversing"], "yes" if r.reversing else "no"),
        *_figure_rows(r, "winding.resistance_20C_ohm", "constants.inductance_H_estimate",
                      "constants.electrical_time_constant_s_estimate", "constants.mechanical_time_constant_s",
                      "constants.rotor_inertia_kg_m2"),
    ]
    return _kv(rows, caption="Time constants at the nominal temperature.", title="Electrical and mechanical",
               key="electrical")


def magnet_tables(results: Results) -> tuple[Table, Table]:
    r, m = results, results.magnet
    at = f"at {_shown(r, 'magnetics.temperature_C', r)}"
    grade_rows = [
        (LABELS["magnet.name"], m.name),
        (LABELS["magnet.family"], m.family),
        *_figure_rows(r, "magnet.remanence_20C_T", "magnet.coercivity_HcJ_20C_A_per_m"),
        *((f"{title} {at}", text) for title, text in _figure_rows(
            r, "magnet.remanence_T", "magnet.coercivity_HcB_A_per_m", "magnet.coercivity_HcJ_A_per_m",
            "magnet.knee_field_A_per_m")),
        *_figure_rows(r, "magnet.max_working_temperature_C"),
        *((f"{title} (nominal)", text) for title, text in _figure_rows(
            r, "magnetics.airgap_flux_density_T", "magnetics.leakage_factor")),
    ]
    chart = r.magnet_chart
    point_rows = tuple(
        _per_case(figure(key).label(), (figure(key).number(value_of(c, key)) for c in chart))
        for key in ("magnet_chart_case.curves.temperature_C", "magnet_chart_case.operating_flux_density_T",
                    "magnet_chart_case.operating_field_A_per_m", "magnet_chart_case.permeance_coefficient",
                    "magnet_chart_case.curves.knee_field")
    )
    points = Table(("", *tuple(c.name for c in chart)), point_rows, widths=(37, 21, 21, 21),
                   title="No-load operating point", key="operating_point")
    grade = _kv(grade_rows, title="Magnet grade", key="magnet_grade",
                caption=f"Grade data: {m.source}. Confirm with the supplier's certified curves.")
    return grade, points


DEMAGNETIZATION_KEYS = tuple(f"demagnetization_case.{name}" for name in (
    "temperature_C", "current_A", "magnet_field_A_per_m", "knee_field_A_per_m", "margin_A_per_m"))


def demagnetization_table(results: Results) -> Table:
    dm = results.demagnetization
    labels = demagnetization_point_labels(results)
    rows = []
    for label, case in zip(labels, dm.cases, strict=True):
        kind = "fail" if not case.ok else ("worst" if case.name == dm.worst_case else "")
        rows.append(Row((label, case.name, *(_shown(case, key, results) for key in DEMAGNETIZATION_KEYS),
                         "safe" if case.ok else "DEMAGNETIZES"), kind))
    header = ("No.", LABELS["demagnetization_case.name"], *(figure(key).title for key in DEMAGNETIZATION_KEYS),
              LABELS["demagnetization_case.ok"])
    return Table(header, tuple(rows),
                 widths=(4, 26, 14, 8, 13, 11, 13, 11), numeric_from=2, numeric_until=8, key="demagnetization",
                 caption="The margin is the field at the magnet's most exposed tip minus the knee field; positive is "
                         "safe. The knee is where the magnet starts to lose flux for good: its intrinsic curve has "
                         f"fallen {KNEE_LOSS_FRACTION:.0%} of Br below the recoil line. "
                         "The numbers mark the cases on the magnet chart.")


def worst_case_sentence(results: Results) -> str:
    dm = results.demagnetization
    margin = _shown(results, "demagnetization.worst_margin_A_per_m", results)
    if dm.ok:
        return f"Worst case: {dm.worst_case}, margin {margin} to the knee. Every case is safe."
    failing = sum(1 for c in dm.cases if not c.ok)
    return (f"Worst case: {dm.worst_case}, {margin} past the knee. {failing} case(s) demagnetize the magnet: "
            "the design must change before release.")


def thermal_table(results: Results) -> Table:
    r, t = results, results.thermal
    duty = "S1, continuous" if t.duty == "S1" else f"S2, {t.duty_minutes:g} min"
    winding = figure("thermal.winding_temperature_C").title
    winding_label = f"{winding}, steady" if t.duty == "S1" else f"{winding}, end of the run"
    if not t.converged:
        winding_label = f"{winding} (no steady state: shown at the class limit)"
    rows = [
        *_figure_rows(r, "thermal.ambient_C"),
        (LABELS["thermal.duty"], duty),
        *_figure_rows(r, "thermal.losses_W"),
        (winding_label, _shown(r, "thermal.winding_temperature_C", r)),
    ]
    if t.duty != "S1":
        rows += _figure_rows(r, "thermal.steady_winding_temperature_C")
    rows += [
        *_figure_rows(r, "thermal.housing_temperature_C", "thermal.magnet_temperature_C", "thermal.magnet_limit_C"),
        (LABELS["thermal.insulation_class"], t.insulation_class),
        *_figure_rows(r, "thermal.insulation_limit_C", "thermal.winding_to_housing_K_per_W",
                      "thermal.housing_to_ambient_K_per_W", "thermal.thermal_time_constant_s"),
        (LABELS["thermal.converged"], "converged" if t.converged else "NO STEADY STATE"),
    ]
    return _kv(rows, title="Thermal", key="thermal")


def build_tables(results: Results) -> tuple[Table, Table, Table]:
    r, w, g = results, results.winding, results.geometry
    winding_rows = [
        (LABELS["geometry.poles"], str(g.poles)),
        (LABELS["winding.type"], f"{w.type}, {w.parallel_paths} parallel paths"),
        (LABELS["geometry.slots"], str(g.slots)),
        (LABELS["winding.commutator_segments"], str(w.commutator_segments)),
        (LABELS["winding.turns_per_coil"], str(w.turns_per_coil)),
        (LABELS["winding.conductors"], str(w.conductors)),
        (LABELS["winding.wire"], f"{w.wire} (grade {w.enamel_grade})"),
        *_figure_rows(r, "winding.slot_fill_bare", "winding.rated_current_density_A_per_m2",
                      "geometry.housing_outer_diameter_m", "geometry.housing_length_m", "geometry.armature_diameter_m",
                      "geometry.stack_length_m", "geometry.airgap_m", "geometry.magnet_thickness_m",
                      "geometry.magnet_arc_rad", "geometry.magnet_length_m"),
    ]
    mass_rows = _figure_rows(r, "mass.magnet_kg", "mass.copper_kg", "mass.housing_kg", "mass.lamination_kg",
                             "mass.shaft_kg", "mass.total_kg")
    currency = r.cost.currency
    cost_rows = [(figure(key).title, text_of(r, key, currency))
                 for key in ("cost.magnet", "cost.copper", "cost.housing", "cost.lamination", "cost.total")]
    return (_kv(winding_rows, title="Winding and construction", key="winding"),
            _kv(mass_rows, caption="Active parts and shaft; brushes, commutator and end caps not included.",
                title="Masses", key="mass"),
            _kv(cost_rows, caption="Raw material only, at the prices per kilogram set in the project.",
                title="Material cost", key="cost"))


def checks_table(results: Results) -> Table:
    rows = tuple(
        Row((STATUSES[c.status].word, c.title,
             c.message + (f" {c.advice[0].upper() + c.advice[1:]}." if c.advice else "")), c.status)
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


#: The tiles at the head of the sheet.
HEADLINE_KEYS = ("supply_voltage_V", "load_torque_N_m", "nominal.rated.speed_rad_per_s",
                 "nominal.no_load_speed_rad_per_s", "nominal.stall_torque_N_m", "constants.ke_V_s_per_rad",
                 "constants.kt_N_m_per_A", "nominal.max_efficiency", "nominal.max_output_power_W",
                 "demagnetization.worst_margin_A_per_m")


def headline(project: Project, results: Results) -> tuple[tuple[str, str], ...]:
    return tuple((figure(key).title, rated(results.nominal, _shown(results, key, results)) if ".rated." in key
                  else _shown(results, key, results)) for key in HEADLINE_KEYS)


def build(project: Project, results: Results, issued: _dt.date | None = None,
          appendix: tuple[Section, ...] = ()) -> Datasheet:
    """The complete datasheet content of one evaluated design; ``appendix`` sections come last."""
    r = results
    info = project.project
    # The sheet is issued on its revision's date when the project gives one, else on the day of export.
    if issued is None:
        issued = _dt.date.fromisoformat(info.revision_date) if info.revision_date else _dt.date.today()
    magnet_grade, operating_points = magnet_tables(r)
    winding, mass, cost = build_tables(r)
    notes = info.notes.strip()
    sections = (
        Section("performance", "Performance at three temperatures", (
            *failing_summary(r),
            Paragraph("Cold: the coldest ambient, motor at rest temperature. Nominal: the nominal ambient. Hot: the "
                      "hottest ambient with winding and magnets at the temperatures they reach at the rated load.",
                      "note"),
            performance_table(r),
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
        Section("terminals", "Terminal markings", (
            Table(("Marking", "Meaning"), tuple(Row(t) for t in TERMINAL_ROWS), widths=(15, 85), numeric_from=99,
                  key="terminal_markings"),
            Paragraph(ROTATION_CONVENTION, "note"),
        )),
        Section("checks", "Design checks", (checks_table(r),), new_page=True),
        Section("notes", "Notes", tuple(Paragraph(line.strip()) for line in notes.splitlines() if line.strip())
                or (Paragraph("No notes."),)),
        Section("cautions", "Cautions", tuple(Paragraph(text, "caution") for text in caution_sentences())),
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
                     headline=headline(project, r), sections=sections + tuple(appendix))
