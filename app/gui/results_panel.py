"""Key figures of the evaluated design, with units, and the design checks in words.

Only formats what ``pmdc_sizer.core.results.Results`` holds; the screen unit of each figure follows the display
unit system (the underlying values are SI).
"""

from __future__ import annotations

from typing import ClassVar

from PySide6.QtCore import Qt
from PySide6.QtWidgets import (
    QHeaderView,
    QLabel,
    QTableWidget,
    QTableWidgetItem,
    QTextBrowser,
    QTreeWidget,
    QTreeWidgetItem,
    QWidget,
)

from pmdc_sizer.app.figures import LABELS, STATUSES, figure, unit_for, units_of_design, value_of
from pmdc_sizer.app.formatting import check_message
from pmdc_sizer.app.thermal_text import NEVER_REACHED, NO_STALL, no_continuous_rating, stall_time_reason

from .display_units import DisplayUnits
from .style import flush_column


class Figures:
    """Shows a figure of the results as ``app.figures`` says, in the screen unit of the display system."""

    def __init__(self, display: DisplayUnits):
        self.display = display

    def __call__(self, source, key: str, results) -> str:
        """``key``'s value in ``source`` (the results, or one case of them) as text."""
        unit = self.display.screen_unit(unit_for(key, results))
        return figure(key).text(value_of(source, key), unit)

    def title(self, key: str) -> str:
        return figure(key).title


#: The rows of the table of temperature cases.
CASE_KEYS = (
    "case.magnet_temperature_C",
    "case.winding_temperature_C",
    "case.no_load_speed_rad_per_s",
    "case.no_load_current_A",
    "case.stall_torque_N_m",
    "case.stall_current_A",
    "case.rated.speed_rad_per_s",
    "case.rated.current_A",
    "case.rated.efficiency",
    "case.rated.output_power_W",
    "case.max_efficiency",
    "case.max_output_power_W",
    "case.kt_N_m_per_A",
    "case.terminal_resistance_ohm",
)
#: Where the rated torque is beyond the stall torque there is no rated point to show.
NOT_REACHED = "stalls"


def _wrapped(title: str, fits) -> str:
    """``title`` on one line if it fits, else broken onto two at the last comma or space that lets the
    first line fit ("Maximum output power,\nno current limit")."""
    if fits(title):
        return title
    for separator in (", ", " "):
        cuts = [index for index in range(len(title)) if title.startswith(separator, index)]
        for index in reversed(cuts):
            head = title[:index + len(separator)].rstrip()
            if fits(head):
                return f"{head}\n{title[index + len(separator):]}"
    return title


def _case_rows(f: Figures, results):
    """(label, function of a CaseResult giving its text)"""
    def text_of(key):
        if key.startswith("case.rated."):
            return lambda c: f(c, key, results) if c.rated_reached else NOT_REACHED
        return lambda c: f(c, key, results)

    return tuple((f.title(key), text_of(key)) for key in CASE_KEYS)


def _stall_time_rows(f: Figures, r, key: str):
    """A permitted stall time; where there is none, "no stall allowed" and the reason on a row of its own."""
    if value_of(r, key) is None:
        return ((f.title(key), NEVER_REACHED),)
    reason = stall_time_reason(r, key)
    if reason:
        return ((f.title(key), NO_STALL), (f"   ↳ {reason}", ""))
    return (key,)


def _continuous_rows(f: Figures, r):
    """The continuous rating; where the winding reaches its limit at no load, that in words on one row."""
    words = no_continuous_rating(r, f.display.screen_unit("°C"))
    if words is None:
        return ("ratings.continuous_torque_N_m", "ratings.continuous_current_A",
                "ratings.continuous_speed_rad_per_s", "ratings.continuous_output_power_W")
    return ((f.title("ratings.continuous_torque_N_m"), words),)


def _design_groups(f: Figures, r):
    """(group title, ((label, text), ...)); an entry given as a key is a figure of the results."""
    w, t, cost = r.winding, r.thermal, r.cost
    groups = (
        ("Constants (nominal)", (
            "constants.ke_V_s_per_rad", "constants.kt_N_m_per_A", "constants.terminal_resistance_ohm",
            "constants.inductance_H_estimate", "constants.electrical_time_constant_s_estimate",
            "constants.mechanical_time_constant_s", "constants.rotor_inertia_kg_m2")),
        (f"Magnetic circuit at {f(r, 'magnetics.temperature_C', r)}", (
            "magnetics.flux_per_pole_Wb", "magnetics.airgap_flux_density_T", "magnetics.magnet_flux_density_T",
            "magnetics.magnet_field_A_per_m", "magnetics.permeance_coefficient", "magnetics.leakage_factor",
            "magnetics.carter_factor", "magnetics.housing_flux_density_T", "magnetics.tooth_flux_density_T",
            "magnetics.core_flux_density_T")),
        ("Winding", (
            (LABELS["winding.type"], f"{w.type}, {w.parallel_paths} parallel paths"),
            (LABELS["winding.conductors"], f"{w.conductors} ({f(r, 'winding.conductors_per_slot', r)} per slot)"),
            (LABELS["winding.wire"], f"{w.wire}, enamel grade {w.enamel_grade}"),
            "winding.slot_fill_bare", "winding.slot_fill_gross", "winding.rated_current_density_A_per_m2",
            "winding.resistance_20C_ohm", "winding.wire_length_m")),
        (f"Thermal at {f(r, 'thermal.ambient_C', r)} ambient, {t.duty}", (
            "thermal.winding_temperature_C",
            (f.title("thermal.insulation_limit_C"),
             f"{f(r, 'thermal.insulation_limit_C', r)} (class {t.insulation_class})"),
            "thermal.magnet_temperature_C", "thermal.losses_W", "thermal.housing_to_ambient_K_per_W")),
        (f"Ratings at {f(r, 'thermal.ambient_C', r)} ambient, winding up to its class", (
            *_continuous_rows(f, r), "ratings.stall_current_A",
            *(entry for key in ("ratings.stall_time_cold_s", "ratings.stall_time_hot_s")
              for entry in _stall_time_rows(f, r, key))) if r.ratings is not None else ()),
        ("Thermal network", (
            "thermal.housing_temperature_C", "thermal.steady_winding_temperature_C",
            (f.title("thermal.time_to_limit_s"), "not reached") if t.time_to_limit_s is None
            else "thermal.time_to_limit_s",
            "thermal.winding_heat_capacity_J_per_K", "thermal.housing_heat_capacity_J_per_K",
            "thermal.winding_to_housing_K_per_W", "thermal.winding_to_magnet_K_per_W",
            "thermal.winding_time_constant_s", "thermal.thermal_time_constant_s")),
        ("Demagnetization margins", (
            "demagnetization.required_margin_share", "demagnetization.required_margin_A_per_m",
            *(("faults.worst_margin_A_per_m",) if r.faults is not None else ()))),
        (f"Brushes ({r.commutation.brush_grade}) and commutator" if r.commutation else "Brushes", (
            "commutation.brush_current_density_A_per_m2", "commutation.brush_density_high_A_per_m2",
            "commutation.surface_speed_m_per_s", "commutation.reactance_voltage_V",
            "commutation.commutator_diameter_m") if r.commutation is not None else ()),
        ("Mass and material cost", (
            "mass.magnet_kg", "mass.copper_kg", "mass.housing_kg", "mass.lamination_kg", "mass.total_kg",
            *(("mass.end_caps_kg", "mass.brush_gear_kg", "mass.commutator_kg", "mass.bearings_kg",
               "mass.shaft_extension_kg", "mass.estimated_total_kg") if r.mass.estimated_total_kg is not None else ()),
            (f.title("cost.total"), figure("cost.total").text(cost.total, cost.currency)))),
    )
    return tuple((title, tuple((f.title(e), f(r, e, r)) if isinstance(e, str) else e for e in entries))
                 for title, entries in groups)


class ResultsPanel(QWidget):
    def __init__(self, display: DisplayUnits):
        super().__init__()
        self.figures = Figures(display)
        layout = flush_column(self)
        self.verdict = QLabel("Evaluating…")
        self.verdict.setObjectName("verdict")
        self.verdict.setWordWrap(True)
        self.verdict.setTextFormat(Qt.TextFormat.RichText)
        self.verdict.setStyleSheet("font-size: 14px; padding: 6px; border-radius: 4px; background: #eef1f4;")
        layout.addWidget(self.verdict)
        self.case_table = QTableWidget(0, 3)
        self.case_table.setObjectName("case_table")
        self.case_table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        self.case_table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Stretch)
        self.case_table.horizontalHeader().setMinimumSectionSize(64)
        self.case_table.setWordWrap(False)
        self.case_table.setTextElideMode(Qt.TextElideMode.ElideNone)  # a figure is never cut to "317…"
        # Fixed sizes: measuring every cell again on every edit would cost more than the edit.
        self.case_table.verticalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Fixed)
        self.case_table.verticalHeader().setDefaultSectionSize(20)
        layout.addWidget(self.case_table, 4)  # as tall as the figures below: both are read first
        self.tree = QTreeWidget()
        self.tree.setObjectName("design_figures")
        self.tree.setColumnCount(2)
        self.tree.setHeaderLabels(["Design figure", "Value"])
        self.tree.header().setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)
        self.tree.header().setSectionResizeMode(1, QHeaderView.ResizeMode.Fixed)
        self.tree.header().setStretchLastSection(False)
        self.tree.setColumnWidth(1, 130)
        self.tree.setRootIsDecorated(True)
        self.tree.setUniformRowHeights(True)
        layout.addWidget(self.tree, 4)
        self.values: dict[str, str] = {}
        self._groups: dict[str, QTreeWidgetItem] = {}
        self._items: dict[tuple[int, str], QTreeWidgetItem] = {}

    def resizeEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().resizeEvent(event)
        self._fit_case_columns()
        self._fit_verdict()

    def _fit_verdict(self) -> None:
        """As tall as its wrapped text: inside a splitter the layout would give it one line and cut the rest."""
        width = self.verdict.width() or self.width()
        if width > 0:
            self.verdict.setMinimumHeight(self.verdict.heightForWidth(width))

    def _fit_case_columns(self) -> None:
        """The three figures keep the room their widest text needs ("19800 rpm", "4.96 oz·in"); the row
        titles take all that is left and are whole: one too long for it wraps onto a second line of a
        taller row (the full title is also the row's tooltip)."""
        table = self.case_table
        metrics = table.fontMetrics()
        texts = [item.text() for row in range(table.rowCount()) for column in range(table.columnCount())
                 if (item := table.item(row, column)) is not None] or ["00000 mN·m"]
        headers = [line for column in range(table.columnCount())
                   if (header := table.horizontalHeaderItem(column)) is not None
                   for line in header.text().splitlines()]
        column = max(metrics.horizontalAdvance(text) for text in texts + headers) + 10
        room = table.viewport().width() + table.verticalHeader().width()
        title_room = max(90, room - 3 * column)
        widest = 90
        line = table.verticalHeader().defaultSectionSize()
        for row in range(table.rowCount()):
            item = table.verticalHeaderItem(row)
            if item is None:
                continue
            title = item.toolTip() or item.text().replace("\n", " ")
            text = _wrapped(title, lambda s: metrics.horizontalAdvance(s) + 12 <= title_room)
            if item.text() != text:
                item.setText(text)
            widest = max(widest, *(metrics.horizontalAdvance(part) for part in text.splitlines()))
            height = line if "\n" not in text else 2 * metrics.height() + 6
            if table.rowHeight(row) != height:
                table.setRowHeight(row, height)
        table.verticalHeader().setMaximumWidth(min(widest + 12, title_room))

    def show_results(self, results) -> None:
        self.values = {}
        rows = _case_rows(self.figures, results)
        table = self.case_table
        if table.rowCount() != len(rows):
            table.setRowCount(len(rows))
            table.setVerticalHeaderLabels([label for label, _ in rows])
            for row, (label, _) in enumerate(rows):
                table.verticalHeaderItem(row).setToolTip(label)
        table.setHorizontalHeaderLabels(
            [f"{c.name}\n{self.figures(c, 'case.ambient_C', results)}" for c in results.cases])
        for column, case in enumerate(results.cases):
            for row, (label, text_of) in enumerate(rows):
                text = text_of(case)
                self.values[f"{case.name}: {label}"] = text
                item = table.item(row, column)
                if item is None:
                    item = QTableWidgetItem()
                    item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                    table.setItem(row, column, item)
                item.setText(text)
        for index, (group, entries) in enumerate(_design_groups(self.figures, results)):
            seen_in_group = set()
            parent = self._groups.get(index)
            if parent is None:
                parent = QTreeWidgetItem(self.tree, [group])
                parent.setFirstColumnSpanned(True)
                font = parent.font(0)
                font.setBold(True)
                parent.setFont(0, font)
                parent.setExpanded(True)
                self._groups[index] = parent
            parent.setText(0, group)
            for label, text in entries:
                # The plain label names the figure unless an earlier group already used it.
                plain = label not in self.values or label in seen_in_group
                name = label if plain else f"{group.split(' ')[0]}: {label}"
                seen_in_group.add(label)
                self.values[name] = text
                item = self._items.get((index, label))
                if item is None:
                    item = QTreeWidgetItem(parent, [label, text])
                    item.setTextAlignment(1, Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                    self._items[(index, label)] = item
                item.setText(1, text)
        self._fit_case_columns()  # the texts changed: so may the room the figures need
        self._show_verdict(results)

    def _show_verdict(self, results) -> None:
        failed = [c for c in results.checks if c.status == "fail"]
        warned = [c for c in results.checks if c.status == "warning"]
        if failed:
            colour, background = STATUSES["fail"].colour, STATUSES["fail"].shade
            text = (f"<b>{len(failed)} check{'s' if len(failed) > 1 else ''} fail</b>: "
                    + ", ".join(c.title.lower() for c in failed) + ". See the checks below for what to change.")
        elif warned:
            colour, background = STATUSES["warning"].colour, STATUSES["warning"].shade
            text = (f"<b>Works, with {len(warned)} warning{'s' if len(warned) > 1 else ''}</b>: "
                    + ", ".join(c.title.lower() for c in warned) + ".")
        else:
            colour, background = STATUSES["pass"].colour, STATUSES["pass"].shade
            text = "<b>Every check passes</b>: the motor meets the load at every temperature and does not demagnetize."
        self.verdict.setStyleSheet(f"font-size: 14px; padding: 6px; border-radius: 4px; background: {background};")
        self.verdict.setText(f"<span style='color:{colour}'>{text}</span>")
        self._fit_verdict()

    def show_failure(self, message: str) -> None:
        fail = STATUSES["fail"]
        self.verdict.setStyleSheet(f"font-size: 14px; padding: 6px; border-radius: 4px; background: {fail.shade};")
        self.verdict.setText(f"<span style='color:{fail.colour}'><b>No solution for this design</b>: {message}</span>")
        self._fit_verdict()
        for row in range(self.case_table.rowCount()):
            for column in range(self.case_table.columnCount()):
                item = self.case_table.item(row, column)
                if item is not None:
                    item.setText("–")
        for item in self._items.values():
            item.setText(1, "–")
        self.values = {}


class ChecksPanel(QTextBrowser):
    """One entry per check, failures first: a mark and word for its status, the reason, what to change.

    One rich-text document rather than a label per check: the checks' numbers change on every edit, and
    laying out one document is much cheaper than relaying out a column of word-wrapped labels.
    """

    ORDER: ClassVar[dict[str, int]] = {"fail": 0, "warning": 1, "pass": 2}

    def __init__(self, display: DisplayUnits | None = None):
        super().__init__()
        self.display = display or DisplayUnits()  #: the checks' numbers follow the display units
        self.setObjectName("checks_panel")
        self.setOpenLinks(False)
        self.statuses: dict[str, str] = {}
        self.shown: list[str] = []  #: check keys in the order shown

    def show_checks(self, results) -> None:
        """Every check of ``results``, worst first; quoted figures in the display units and the design's torque unit."""
        checks = results.checks
        unit_of = units_of_design(results, self.display.screen_unit)
        ordered = sorted(checks, key=lambda c: self.ORDER.get(c.status, 3))
        self.statuses = {c.key: c.status for c in checks}
        self.shown = [c.key for c in ordered]
        entries = []
        for check in ordered:
            status = STATUSES[check.status]
            advice = (f"<br><i>What to change:</i> {check.advice[0].upper() + check.advice[1:]}."
                      if check.advice and check.status != "pass" else "")
            # Plain paragraphs: a table per check lays out several times slower on every edit.
            entries.append(
                f"<p style='margin-top:0; margin-bottom:6px'>"
                f"<span style='color:{status.colour}; font-weight:bold'>{status.mark} {status.word}</span>"
                f"&nbsp; <b>{check.title}</b><br>"
                f"{check_message(check, unit_of)}{advice}</p>")
        scroll = self.verticalScrollBar().value()
        self.setHtml("".join(entries))
        self.verticalScrollBar().setValue(scroll)

    def show_failure(self) -> None:
        self.statuses, self.shown = {}, []
        self.setHtml("<i>No checks: the design has no solution (see the key figures).</i>")


__all__ = ["ChecksPanel", "ResultsPanel"]
