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

from ..figures import (
    DEMAGNETIZATION_STATES,
    LABELS,
    STATUSES,
    figure,
    text_of,
    unit_for,
    units_of_design,
    value_of,
)
from ..formatting import check_message, unit_label
from ..magnet_marks import fault_labels
from ..safety import caution_sentences
from ..thermal_text import NO_STALL, chart_notes, no_continuous_rating, stall_time_reason, stall_time_text
from .charts import demagnetization_point_labels
from .options import DEFAULT_OPTIONS, SheetOptions
from .paper_units import paper_unit, printed_in

TERMINAL_ROWS = (
    ("A1", "armature terminal; positive for the rotation stated below"),
    ("A2", "armature terminal; negative for the rotation stated below"),
)
ROTATION_CONVENTION = (
    "Direction of rotation: with A1 positive with respect to A2, the shaft turns clockwise seen from the "
    "drive end (the shaft end); swapping the supply polarity reverses it. Terminal markings A1 and A2 as "
    "in IEC 60034-8."
)
#: Internal edition only: how sure we are of the marking rule.
ROTATION_SOURCE_NOTE = ("The rotation rule for A1 positive is IEC 60034-8 as we recall it (from memory): "
                        "confirm against the standard and on the prototype test.")

#: The design checks a customer's sheet states: what the motor does and whether it stays whole and cool.
#: The rest (slot fill, current density, envelope, ...) are the designer's own matters.
CUSTOMER_CHECKS = frozenset({"load", "start", "demagnetization", "thermal", "magnet_temperature"})


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
    options: SheetOptions = DEFAULT_OPTIONS
    logo: str = ""  #: the project's logo path, as written in the file

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
    return text_of(source, key, paper_unit(unit or unit_for(key, results)))


def _number_shown(source, key: str, results: Results) -> str:
    """The figure without its unit, for a table whose header carries it (see :func:`_header_with_unit`)."""
    return figure(key).number(value_of(source, key), paper_unit(unit_for(key, results)))


def _header_with_unit(key: str, results: Results) -> str:
    return figure(key).label(paper_unit(unit_for(key, results)))


def _case_rows(results: Results, *keys: str) -> list[Row]:
    """A row per key of a temperature case (and one per further unit the figure is given in)."""
    rows = []
    for key in keys:
        item = figure(key)
        is_rated = key.startswith("case.rated.")
        units = dict.fromkeys(paper_unit(u) for u in (unit_for(key, results), *item.also))
        for unit in units:
            title = item.title if unit == paper_unit(unit_for(key, results)) else f"{item.title} in {unit_label(unit)}"
            rows.append(_per_case(title, (rated(c, _shown(c, key, results, unit)) if is_rated
                                          else _shown(c, key, results, unit) for c in results.cases)))
    return rows


def _figure_rows(results: Results, *keys: str, source=None) -> list[tuple[str, str]]:
    """(title, text) for each key of the results (or of ``source``)."""
    return [(figure(key).title, _shown(results if source is None else source, key, results)) for key in keys]


def performance_table(results: Results) -> Table:
    """The motor's figures per temperature case, grouped by the question a user brings to the sheet."""
    r = results
    limit = r.current_limit_A
    supply = _shown(r, "supply_voltage_V", r)
    rows = [
        Row((f"What it does at {supply}",), "group"),
        *_case_rows(r, "case.no_load_speed_rad_per_s"),
        Row((f"At the rated torque, {_shown(r, 'load_torque_N_m', r)} (needs {_shown(r, 'load_speed_rad_per_s', r)} "
             "or more)",), "group"),
        *_case_rows(r, "case.rated.speed_rad_per_s", "case.rated.output_power_W", "case.rated.efficiency"),
        _per_case("Rated load met", ("yes" if c.meets_load else "NO" for c in r.cases)),
        Row(("Its best and its limits",), "group"),
        *_case_rows(r, "case.max_output_power_W", "case.max_power_point.torque_N_m", "case.max_efficiency",
                    "case.max_efficiency_point.torque_N_m", "case.stall_torque_N_m"),
    ]
    if limit is not None:
        key = "case.current_limit_torque_N_m"
        rows.append(_per_case(f"{figure(key).title} ({_shown(r, 'current_limit_A', r)})", (
            _shown(c, key, r) if c.current_limit_torque_N_m is not None else "limit above stall" for c in r.cases)))
    rows += [
        Row(("What it draws from the supply",), "group"),
        *_case_rows(r, "case.no_load_current_A", "case.rated.current_A", "case.stall_current_A"),
        Row(("How it is built: its constants",), "group"),
        *_case_rows(r, "case.ke_V_s_per_rad", "case.kt_N_m_per_A", "case.terminal_resistance_ohm",
                    "case.speed_torque_gradient_rad_per_s_per_N_m", "case.flux_per_pole_Wb"),
        Row(("How heat changes it: the temperatures behind each column",), "group"),
        *_case_rows(r, "case.ambient_C", "case.winding_temperature_C", "case.magnet_temperature_C"),
    ]
    return Table(_case_header(r), tuple(rows), widths=(40, 20, 20, 20),
                 caption="Kt equals Ke in SI units. Stall figures ignore any drive current limit. Warmer windings "
                         "resist more and warmer magnets give less flux: hence the hot column's lower stall torque "
                         "and higher speed drop per unit torque.",
                 key="performance_table")


def tolerance_table(results: Results, study) -> Table:
    """Min / typ / max of the figures a customer reads, over the production spread (a ``ToleranceStudy``)."""
    from ..figures import DATASHEET_TOLERANCE_FIGURES, TOLERANCE_FIGURES
    from ..tolerance_text import basis_text, figure_row, spread_text

    rows = []
    for name in DATASHEET_TOLERANCE_FIGURES:
        title, low, typical, high, _ = figure_row(name, study, paper_unit(unit_for(TOLERANCE_FIGURES[name], results)))
        rows.append(Row((title, low, typical, high)))
    spreads = "; ".join(f"{s.label} {spread_text(s)}" for s in study.spreads if s.plus_minus > 0.0)
    return Table(("At the nominal temperature", "min", "typ", "max"), tuple(rows), widths=(52, 16, 16, 16),
                 caption=f"Production spread: {basis_text(study)}. Stated spreads: {spreads or 'none'}.",
                 key="tolerance_table")


def electrical_table(results: Results) -> Table:
    r = results
    limit = r.current_limit_A
    rows = [
        *_figure_rows(r, "supply_voltage_V", "brush_drop_V"),
        (figure("current_limit_A").title, _shown(r, "current_limit_A", r) if limit is not None
         else "none (plain supply)"),
        (LABELS["reversing"], "yes" if r.reversing else "no"),
        *_figure_rows(r, "winding.resistance_20C_ohm", "constants.inductance_H_estimate",
                      "constants.electrical_time_constant_s_estimate", "constants.rotor_inertia_kg_m2",
                      "constants.mechanical_time_constant_s"),
    ]
    return _kv(rows, caption="How fast it answers, at the nominal temperature: the electrical time constant is "
                             "the current's rise, the mechanical one the speed's, with no load on the shaft.",
               title="Supply and response", key="electrical")


def magnet_tables(results: Results, internal: bool = True) -> tuple[Table, Table]:
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
        _per_case(_header_with_unit(key, r), (_number_shown(c, key, r) for c in chart))
        for key in ("magnet_chart_case.curves.temperature_C", "magnet_chart_case.operating_flux_density_T",
                    "magnet_chart_case.operating_field_A_per_m", "magnet_chart_case.permeance_coefficient",
                    "magnet_chart_case.curves.knee_field")
    )
    points = Table(("", *tuple(c.name for c in chart)), point_rows, widths=(37, 21, 21, 21),
                   title="No-load operating point", key="operating_point")
    source = f"Grade data: {m.source}." if internal else "Typical grade data."
    grade = _kv(grade_rows, title="Magnet grade", key="magnet_grade",
                caption=f"{source} Confirm with the supplier's certified curves.")
    return grade, points


DEMAGNETIZATION_KEYS = tuple(f"demagnetization_case.{name}" for name in (
    "temperature_C", "current_A", "magnet_field_A_per_m", "knee_field_A_per_m", "margin_A_per_m"))


def _case_table_widths(cases) -> tuple[int, ...]:
    """The columns of a table of demagnetization cases: number, case, five figures and the state.

    Each is wide enough for its heading's longest word; the state takes room from the case names only
    when a case reads "PAST THE KNEE", so that long case names stay on one line where it does not.
    """
    state = 14 if any(not case.ok for case in cases) else 10
    return (4, 36 - state, 15, 9, 12, 11, 13, state)


def demagnetization_table(results: Results) -> Table:
    dm = results.demagnetization
    labels = demagnetization_point_labels(results)
    rows = []
    for label, case in zip(labels, dm.cases, strict=True):
        rows.append(Row((label, case.name, *(_number_shown(case, key, results) for key in DEMAGNETIZATION_KEYS),
                         _state_word(case)), _state_kind(case, dm.worst_case)))
    # The units in the header, not in every cell: seven columns of figures must fit the page's width.
    header = ("No.", LABELS["demagnetization_case.name"],
              *(_header_with_unit(key, results) for key in DEMAGNETIZATION_KEYS), LABELS["demagnetization_case.status"])
    return Table(header, tuple(rows),
                 widths=_case_table_widths(dm.cases), numeric_from=2, numeric_until=7, key="demagnetization",
                 caption=f"{figure(DEMAGNETIZATION_KEYS[2]).title}: the mean field over the magnet's worst spot, the "
                         "5 % of its area under the strongest demagnetizing field, wherever along the arc it lies. "
                         "The margin is that field minus the knee field; positive is safe. The knee is where the "
                         "magnet starts to lose flux for good: its "
                         f"intrinsic curve has fallen {KNEE_LOSS_FRACTION:.0%} of Br below the recoil line.")


def _state_word(case) -> str:
    word = DEMAGNETIZATION_STATES.get(case.status, "safe" if case.ok else "past the knee")
    return word.upper() if not case.ok else word


def _state_kind(case, worst_case: str) -> str:
    if not case.ok:
        return "fail"
    if case.status == "marginal":
        return "warning"
    return "worst" if case.name == worst_case else ""


def fault_table(results: Results) -> Table | None:
    """The direct-supply faults (a failed drive, no limiter), in their own table."""
    faults = results.faults
    if faults is None:
        return None
    rows = tuple(Row((label, case.name, *(_number_shown(case, key, results) for key in DEMAGNETIZATION_KEYS),
                      _state_word(case)), _state_kind(case, faults.worst_case))
                 for label, case in zip(fault_labels(results), faults.cases, strict=True))
    must = ("The project requires the magnets to survive these." if faults.must_survive
            else "The project reports these without requiring them to pass (supply.fault_cases).")
    # The required margin follows HcJ, so it is one figure per magnet temperature: said once in the caption
    # rather than as a ninth column, which squeezed the verdict words ("PAST THE KNEE") against the figures.
    required = {_shown(case, "demagnetization_case.temperature_C", results):
                _shown(case, "demagnetization_case.required_margin_A_per_m", results)
                for case in faults.cases}
    required_text = ", ".join(f"{margin} at {temperature}" for temperature, margin in required.items())
    return Table(("No.", LABELS["demagnetization_case.name"],
                  *(_header_with_unit(key, results) for key in DEMAGNETIZATION_KEYS),
                  LABELS["demagnetization_case.status"]), rows,
                 widths=_case_table_widths(faults.cases), numeric_from=2, numeric_until=7, key="faults",
                 caption="Faults: stall and reversal at no-load speed with the supply applied directly, as when a "
                         f"drive fails or a battery is connected without it. {must} Safe: at least the required "
                         f"margin, {results.demagnetization.required_margin_share:.0%} of HcJ at the magnet's "
                         f"temperature ({required_text}), on every demagnetization case; marginal: above the knee "
                         "by less. The numbers F1, F2, ... mark the faults on the magnet chart. "
                         f"{figure(DEMAGNETIZATION_KEYS[2]).title} and margin as in the table of cases.")


def worst_case_sentence(results: Results) -> str:
    dm = results.demagnetization
    margin = _shown(results, "demagnetization.worst_margin_A_per_m", results)
    required = f"{dm.required_margin_share:.0%} of HcJ"
    if dm.ok and dm.status == "marginal":
        marginal = sum(1 for c in dm.cases if c.status == "marginal")
        return (f"Worst case: {dm.worst_case}, margin {margin} to the knee. {marginal} case(s) keep less than the "
                f"required margin ({required}): marginal against a batch's spread of HcJ.")
    if dm.ok:
        return f"Worst case: {dm.worst_case}, margin {margin} to the knee. Every case is safe."
    failing = sum(1 for c in dm.cases if not c.ok)
    return (f"Worst case: {dm.worst_case}, {margin} past the knee. {failing} case(s) demagnetize the magnet: "
            "the design must change before release.")


def thermal_table(results: Results, internal: bool = True) -> Table:
    r, t = results, results.thermal
    duty = {"S1": "S1, continuous", "S2": f"S2, {t.duty_minutes:g} min",
            "S3": f"S3, {t.cycle_duration_factor:.0%} of {t.cycle_minutes:g} min"}[t.duty]
    winding = figure("thermal.winding_temperature_C").title
    winding_label = {"S1": f"{winding}, steady", "S2": f"{winding}, end of the run",
                     "S3": f"{winding}, end of each loaded spell"}[t.duty]
    if not t.converged:
        winding_label = f"{winding} (no steady state: when it reaches the class limit)"
    rows = [
        *_figure_rows(r, "thermal.ambient_C"),
        (LABELS["thermal.duty"], duty),
        *_figure_rows(r, "thermal.losses_W"),
        (winding_label, _shown(r, "thermal.winding_temperature_C", r)),
    ]
    if t.duty != "S1":
        rows += _figure_rows(r, "thermal.steady_winding_temperature_C")
    if t.time_to_limit_s is not None:
        rows += _figure_rows(r, "thermal.time_to_limit_s")
    rows += [
        *_figure_rows(r, "thermal.housing_temperature_C", "thermal.magnet_temperature_C", "thermal.magnet_limit_C"),
        (LABELS["thermal.insulation_class"], t.insulation_class),
        *_figure_rows(r, "thermal.insulation_limit_C", "thermal.winding_to_housing_K_per_W",
                      "thermal.housing_to_ambient_K_per_W", "thermal.winding_time_constant_s",
                      "thermal.thermal_time_constant_s"),
    ]
    if internal:
        rows.append((LABELS["thermal.converged"], "converged" if t.converged else "NO STEADY STATE"))
    return _kv(rows, title="Heat", key="thermal")


def performance_caption(results: Results) -> str:
    """Under the performance chart: how far its torque axis runs."""
    envelope = results.nominal.envelope
    reach = ("to a little past the drive's current limit, the torques beyond it shaded"
             if envelope is not None and envelope.limited else "to stall")
    return f"Speed, current and output power from no load {reach}; efficiency over the working range. " \
           "Cold, nominal and hot cases."


def thermal_caption(results: Results) -> str:
    """Under the duty chart: what it shows, and what the duty means for the winding (no steady state said so)."""
    t = results.thermal
    unit = paper_unit("°C")
    return " ".join(["Winding, magnets and housing from ambient at the rated load, from the two-capacity thermal "
                     "network; the limits as lines.", *chart_notes(t, unit)])


def ratings_table(results: Results) -> Table:
    """The continuous (S1) rating and the permitted stall times at the highest ambient."""
    r = results
    words = no_continuous_rating(r, paper_unit("°C"))
    # Where there is no rating or no stall time the cell says so and the caption says why (a sentence is too
    # wide for a cell).
    rows = (_figure_rows(r, "ratings.continuous_torque_N_m", "ratings.continuous_current_A") if words is None
            else [(figure("ratings.continuous_torque_N_m").title, words.split(":", 1)[0])])
    notes = [] if words is None else [f"{figure('ratings.continuous_torque_N_m').title}: {words}."]
    keys = ("ratings.stall_time_cold_s", "ratings.stall_time_hot_s")
    rows += [(figure(key).title, NO_STALL if stall_time_reason(r, key) else
              stall_time_text(r, key, paper_unit(figure(key).unit))) for key in keys]
    notes += [f"{figure(key).title}: {stall_time_text(r, key)}." for key in keys if stall_time_reason(r, key)]
    caption = " ".join(notes)
    return _kv(rows, caption=caption, title="Ratings up to the class limit, hottest ambient", key="ratings")


def build_tables(results: Results, internal: bool = True) -> tuple[Table, Table, Table]:
    """The winding and construction (slot fill and current density for the internal edition), the masses and
    the material cost (which only the internal edition prints)."""
    r, w, g = results, results.winding, results.geometry
    designer_figures = ("winding.slot_fill_bare", "winding.rated_current_density_A_per_m2") if internal else ()
    winding_rows = [
        (LABELS["geometry.poles"], str(g.poles)),
        (LABELS["winding.type"], f"{w.type}, {w.parallel_paths} parallel paths"),
        (LABELS["geometry.slots"], str(g.slots)),
        (LABELS["winding.commutator_segments"], str(w.commutator_segments)),
        (LABELS["winding.turns_per_coil"], str(w.turns_per_coil)),
        (LABELS["winding.conductors"], str(w.conductors)),
        (LABELS["winding.wire"], f"{w.wire} (grade {w.enamel_grade})"),
        *_figure_rows(r, *designer_figures, "geometry.housing_outer_diameter_m", "geometry.housing_length_m",
                      "geometry.armature_diameter_m", "geometry.stack_length_m", "geometry.airgap_m",
                      "geometry.magnet_thickness_m", "geometry.magnet_arc_rad", "geometry.magnet_length_m",
                      "geometry.overhang_m", "geometry.shaft_diameter_m"),
    ]
    estimated = r.mass.estimated_total_kg is not None
    other_parts = ("mass.other_parts_kg",) if internal and estimated else ()
    mass_rows = _figure_rows(r, "mass.magnet_kg", "mass.copper_kg", "mass.housing_kg", "mass.lamination_kg",
                             "mass.shaft_kg", "mass.total_kg", *other_parts,
                             *(("mass.estimated_total_kg",) if estimated else ()))
    mass_caption = ("The active mass: magnets, copper, housing, laminations and shaft, from their volumes and "
                    "densities. The estimated total adds end caps, brush gear, commutator, bearings and the shaft's "
                    "run-out, estimated from the motor's proportions: weigh a sample to confirm it.")
    if internal and estimated:
        parts = ", ".join(f"{words} {_shown(r, key, r)}" for words, key in (
            ("end caps", "mass.end_caps_kg"), ("brush gear", "mass.brush_gear_kg"),
            ("commutator", "mass.commutator_kg"), ("bearings", "mass.bearings_kg"),
            ("shaft run-out", "mass.shaft_extension_kg")))
        mass_caption += (f" Other parts: {parts}; their proportions are common practice, no source (core/mass.py: "
                         "caps half the wall thick, brush gear half a cap, commutator 0.6 armature diameters, ball "
                         "bearings of the shaft's bore, a run-out of three shaft diameters).")
    currency = r.cost.currency
    cost_rows = [(figure(key).title, text_of(r, key, currency))
                 for key in ("cost.magnet", "cost.copper", "cost.housing", "cost.lamination", "cost.total")]
    return (_kv(winding_rows, title="Winding and construction", key="winding"),
            _kv(mass_rows, caption=mass_caption, title="Masses", key="mass"),
            _kv(cost_rows, caption="Raw material only, at the prices per kilogram set in the project; where it "
                                   "sets no magnet price, at the grade's typical price from the library (from "
                                   "memory).",
                title="Material cost", key="cost"))


def checks_table(results: Results, internal: bool = True) -> Table:
    """Every design check (internal edition), or the verdicts a customer reads: load, start, demagnetization, heat."""
    unit_of = units_of_design(results, paper_unit)
    rows = tuple(
        Row((STATUSES[c.status].word, c.title,
             check_message(c, unit_of) + (f" {c.advice[0].upper() + c.advice[1:]}." if c.advice and internal
                                          else "")), c.status)
        for c in results.checks if internal or c.key in CUSTOMER_CHECKS
    )
    return Table(("Status", "Check", "Finding"), rows, widths=(10, 19, 71), numeric_from=99, key="checks")


def failing_summary(results: Results) -> tuple[Paragraph, ...]:
    """A line that cannot be missed when any check fails (either edition: a failing design is never quietly
    handed on); nothing when all pass."""
    failing = [c.title for c in results.checks if c.status == "fail"]
    if not failing:
        return ()
    return (Paragraph(f"This design fails {len(failing)} check(s): {', '.join(failing)}. "
                      "It is not ready for release.", "fail"),)


#: The tiles at the head of the sheet.
HEADLINE_KEYS = ("supply_voltage_V", "load_torque_N_m", "nominal.rated.speed_rad_per_s",
                 "nominal.no_load_speed_rad_per_s", "nominal.stall_torque_N_m", "constants.ke_V_s_per_rad",
                 "constants.kt_N_m_per_A", "nominal.max_efficiency", "nominal.max_output_power_W",
                 "demagnetization.worst_margin_A_per_m")


#: With a drive limit the tiles show what the motor reaches with it, not the unlimited stall figures.
LIMITED_HEADLINE = {"nominal.stall_torque_N_m": "nominal.envelope.torque_limit_N_m",
                    "nominal.max_output_power_W": "nominal.envelope.max_output_power_W"}


def headline_keys(results: Results) -> tuple[str, ...]:
    envelope = results.nominal.envelope
    limited = envelope is not None and envelope.limited
    return tuple(LIMITED_HEADLINE.get(key, key) if limited else key for key in HEADLINE_KEYS)


def headline(project: Project, results: Results) -> tuple[tuple[str, str], ...]:
    return tuple((figure(key).title, rated(results.nominal, _shown(results, key, results)) if ".rated." in key
                  else _shown(results, key, results)) for key in headline_keys(results))


def model_notes(results: Results) -> tuple[Paragraph, ...]:
    """What the internal reader needs to weigh the figures: sources, the model's reach, what is recalled."""
    r = results
    thermal = ("The thermal fixed point converged." if r.thermal.converged else
               "The thermal fixed point did not converge: the hot case is shown at the insulation class limit.")
    return tuple(Paragraph(text, "note") for text in (
        "Flux per pole from the lumped magnetic circuit (Carter's coefficient, leakage permeance, iron drops "
        "from the steels' B(H) curves); check designs with saturated housing or teeth against the built-in field "
        "solution (datasheet --with-field).",
        thermal,
        "Inductance and the time constants are estimates (two significant figures).",
        ROTATION_SOURCE_NOTE,
    ))


def identity_rows(project: Project, results: Results, issued: _dt.date, options: SheetOptions):
    info, r = project.project, results
    rows = [
        ("Part number", info.part_number), ("Customer", info.customer),
        ("Revision", info.revision), ("Issued", issued.isoformat()), ("Drawn by", info.drawn_by),
        ("Magnet", r.magnet.name), ("Poles", str(r.geometry.poles)),
        ("Winding", f"{r.winding.type}, Z = {r.winding.conductors}"), ("Wire", r.winding.wire),
        ("Duty", r.thermal.duty), ("Insulation", f"class {r.thermal.insulation_class}"),
        ("Edition", f"{options.edition}, {options.units}"),
    ]
    return tuple((k, v) for k, v in rows if v)


def build(project: Project, results: Results, issued: _dt.date | None = None,
          appendix: tuple[Section, ...] = (), options: SheetOptions = DEFAULT_OPTIONS, tolerance=None) -> Datasheet:
    """The datasheet content of one evaluated design in one edition; ``appendix`` sections come last.

    ``tolerance``, a ``core.tolerance_study.ToleranceStudy`` of the same design, adds the tolerance column
    (min / typ / max over the production spread) after the duty chart.
    """
    with printed_in(options.units):
        return _build(project, results, issued, appendix, options, tolerance)


def _build(project: Project, results: Results, issued: _dt.date | None, appendix: tuple[Section, ...],
           options: SheetOptions, tolerance=None) -> Datasheet:
    r = results
    internal = options.internal
    info = project.project
    # The sheet is issued on its revision's date when the project gives one, else on the day of export.
    if issued is None:
        issued = _dt.date.fromisoformat(info.revision_date) if info.revision_date else _dt.date.today()
    magnet_grade, operating_points = magnet_tables(r, internal)
    winding, mass, cost = build_tables(r, internal)
    notes = info.notes.strip()
    construction = Columns((winding,), (mass, cost) if internal else (mass,))
    sections = [
        Section("performance", "What the motor does, at three temperatures", (
            *failing_summary(r),
            Paragraph("Cold: the coldest ambient, motor at rest temperature. Nominal: the nominal ambient. Hot: the "
                      "hottest ambient with winding and magnets at the temperatures they reach at the rated load.",
                      "note"),
            performance_table(r),
        )),
        Section("performance_chart", "Speed, current, power and efficiency against torque", (
            Chart("performance", performance_caption(r)),
            Columns((electrical_table(r), *((ratings_table(r),) if r.ratings is not None else ())),
                    (thermal_table(r, internal),)),
        ), new_page=True),
        Section("thermal_chart", "Temperatures over the duty", (
            Chart("thermal", thermal_caption(r)),
        )),
        Section("magnet", "Magnet and demagnetization", (
            Chart("magnet", "The grade's second quadrant at the three magnet temperatures: load lines, no-load "
                            "points, knees and the cases, numbered as in the table."),
            demagnetization_table(r),
            Paragraph(worst_case_sentence(r), "strong" if r.demagnetization.ok else "fail"),
            Columns((magnet_grade,), (operating_points,)),
        ), new_page=True),
        Section("outline", "Outline", (
            Chart("outline", "End view and side view with the main dimensions. Shaft extension, terminals and "
                             "mounting are set by the mechanical drawing, not by this sheet."),
        )),  # no forced page: the page breaker keeps it whole where the magnet page leaves no room
        Section("construction", "Construction, masses and cost" if internal else "Construction and masses",
                (construction,)),

        Section("terminals", "Terminals and direction of rotation", (
            Table(("Marking", "Meaning"), tuple(Row(t) for t in TERMINAL_ROWS), widths=(15, 85), numeric_from=99,
                  key="terminal_markings"),
            Paragraph(ROTATION_CONVENTION, "note"),
        )),
        # How the built motors spread heads the page of verdicts: a short table that, after the temperatures or
        # the construction, took a page of its own wherever those pages were full.
        *((Section("tolerance", "Production spread", (tolerance_table(r, tolerance),), new_page=True),)
          if tolerance is not None else ()),
        Section("checks", "Design checks" if internal else "Verdicts", (checks_table(r, internal),),
                new_page=tolerance is None),
        *((Section("faults", "Demagnetization with the supply applied directly", (fault_table(r),)),)
          if r.faults is not None else ()),
    ]
    if internal:
        sections += [
            Section("notes", "Notes", tuple(Paragraph(line.strip()) for line in notes.splitlines() if line.strip())
                    or (Paragraph("No notes."),)),
            Section("model_notes", "Model notes", model_notes(r)),
        ]
    sections.append(Section("cautions", "Cautions", tuple(Paragraph(text, "caution") for text in caution_sentences())))
    kind = "internal engineering datasheet" if internal else "datasheet"
    subtitle = f"Brushed permanent-magnet DC motor: {kind} (engineering estimates)"
    return Datasheet(title=info.name, description=info.description.strip(), revision=info.revision,
                     issued=issued.isoformat(), subtitle=subtitle, identity=identity_rows(project, r, issued, options),
                     headline=headline(project, r), sections=tuple(sections) + tuple(appendix),
                     options=options, logo=info.logo)
