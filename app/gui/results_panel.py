"""Key figures of the evaluated design, with units, and the design checks in words.

Only formats what ``core.evaluate.Results`` holds; the screen unit of each figure follows the display
unit system (the underlying values are SI).
"""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtWidgets import (
    QHeaderView,
    QLabel,
    QTableWidget,
    QTableWidgetItem,
    QTextBrowser,
    QTreeWidget,
    QTreeWidgetItem,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.app.formatting import percent, significant
from pmdc_sizer.app.formatting import quantity as format_quantity

from .display_units import DisplayUnits
from .style import CASE_COLOURS, PAST_KNEE_COLOUR, SAFE_COLOUR, STATUS_COLOURS, STATUS_MARKS, STATUS_WORDS, WARNING_COLOUR


class Figures:
    """Formats SI values in the screen unit chosen for their engineering unit."""

    def __init__(self, display: DisplayUnits):
        self.display = display

    def __call__(self, value_si, unit: str, digits: int = 3) -> str:
        shown = self.display.screen_unit(unit)
        if shown in ("°C", "°F"):
            from pmdc_sizer.core.units import from_si

            return f"{from_si(value_si, shown):.0f} {shown}"
        return format_quantity(value_si, shown, digits).replace(" ohm", " Ω")


def _case_rows(f: Figures):
    """(label, function of a CaseResult giving its text)"""
    return (
        ("Magnet temperature", lambda c: f(c.magnet_temperature_C, "°C")),
        ("Winding temperature", lambda c: f(c.winding_temperature_C, "°C")),
        ("No-load speed", lambda c: f(c.no_load_speed_rad_per_s, "rpm")),
        ("No-load current", lambda c: f(c.no_load_current_A, "A")),
        # N·m once the stall torque reaches 10 N·m, so big motors' figures fit their column
        ("Stall torque", lambda c: f(c.stall_torque_N_m, "N·m" if c.stall_torque_N_m >= 10.0 else "mN·m")),
        ("Stall current", lambda c: f(c.stall_current_A, "A")),
        ("Speed at rated torque", lambda c: f(c.rated.speed_rad_per_s, "rpm") if c.rated_reached else "stalls"),
        ("Current at rated torque", lambda c: f(c.rated.current_A, "A")),
        ("Efficiency at rated torque", lambda c: percent(c.rated.efficiency)),
        ("Output power at rated torque", lambda c: f(c.rated.output_power_W, "W")),
        ("Maximum efficiency", lambda c: percent(c.max_efficiency)),
        ("Maximum output power", lambda c: f(c.max_output_power_W, "W")),
        ("Ke = Kt", lambda c: f(c.ke_V_s_per_rad, "mN·m/A")),
        ("Terminal resistance", lambda c: f(c.terminal_resistance_ohm, "ohm")),
    )


def _design_groups(f: Figures, r):
    m, k, w, t, mass, cost = r.magnetics, r.constants, r.winding, r.thermal, r.mass, r.cost
    return (
        ("Constants (nominal)", (
            ("Ke", f(k.ke_V_s_per_rad, "V/krpm")),
            ("Kt", f(k.kt_N_m_per_A, "mN·m/A")),
            ("Terminal resistance", f(k.terminal_resistance_ohm, "ohm")),
            ("Inductance (estimate)", f(k.inductance_H_estimate, "mH", 2)),
            ("Electrical time constant (estimate)", f(k.electrical_time_constant_s_estimate, "ms", 2)),
            ("Mechanical time constant", f(k.mechanical_time_constant_s, "ms")),
            ("Rotor inertia", f(k.rotor_inertia_kg_m2, "g·cm2")),
        )),
        (f"Magnetic circuit at {m.temperature_C:.0f} °C", (
            ("Flux per pole", f(m.flux_per_pole_Wb, "mWb")),
            ("Air-gap flux density", f(m.airgap_flux_density_T, "T")),
            ("Magnet operating point B", f(m.magnet_flux_density_T, "T")),
            ("Magnet operating point H", f(m.magnet_field_A_per_m, "kA/m")),
            ("Permeance coefficient", significant(m.permeance_coefficient, 3)),
            ("Leakage factor", significant(m.leakage_factor, 3)),
            ("Carter factor", significant(m.carter_factor, 3)),
            ("Housing flux density", f(m.housing_flux_density_T, "T")),
            ("Tooth flux density", f(m.tooth_flux_density_T, "T")),
            ("Armature core flux density", f(m.core_flux_density_T, "T")),
        )),
        ("Winding", (
            ("Winding", f"{w.type}, {w.parallel_paths} parallel paths"),
            ("Conductors", f"{w.conductors} ({significant(w.conductors_per_slot, 3)} per slot)"),
            ("Wire", f"{w.wire}, enamel grade {w.enamel_grade}"),
            ("Slot fill (copper / enamelled)", f"{percent(w.slot_fill_bare, 2)} / {percent(w.slot_fill_gross, 2)}"),
            ("Current density, rated, hot", f(w.rated_current_density_A_per_m2, "A/mm2")),
            ("Resistance at 20 °C", f(w.resistance_20C_ohm, "ohm")),
            ("Wire length", f(w.wire_length_m, "m")),
        )),
        (f"Thermal at {t.ambient_C:.0f} °C ambient, {t.duty}", (
            ("Winding temperature", f(t.winding_temperature_C, "°C")),
            ("Insulation limit", f"{f(t.insulation_limit_C, '°C')} (class {t.insulation_class})"),
            ("Magnet temperature", f(t.magnet_temperature_C, "°C")),
            ("Losses at rated torque", f(t.losses_W, "W")),
            ("Housing to ambient", f(t.housing_to_ambient_K_per_W, "K/W")),
        )),
        ("Mass and material cost", (
            ("Magnets", f(mass.magnet_kg, "g")),
            ("Copper", f(mass.copper_kg, "g")),
            ("Housing", f(mass.housing_kg, "g")),
            ("Laminations", f(mass.lamination_kg, "g")),
            ("Total (active parts and shaft)", f(mass.total_kg, "g")),
            ("Material cost", f"{significant(cost.total, 3)} {cost.currency}"),
        )),
    )


class ResultsPanel(QWidget):
    def __init__(self, display: DisplayUnits):
        super().__init__()
        self.figures = Figures(display)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
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
        # Fixed sizes: measuring every cell again on every edit would cost more than the edit.
        self.case_table.verticalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Fixed)
        self.case_table.verticalHeader().setDefaultSectionSize(20)
        layout.addWidget(self.case_table, 3)
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

    def show_results(self, results) -> None:
        self.values = {}
        rows = _case_rows(self.figures)
        table = self.case_table
        if table.rowCount() != len(rows):
            table.setRowCount(len(rows))
            table.setVerticalHeaderLabels([label for label, _ in rows])
        table.setHorizontalHeaderLabels(
            [f"{c.name}\n{self.figures(c.ambient_C, '°C')}" for c in results.cases])
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
                name = label if label not in self.values or label in seen_in_group else f"{group.split(' ')[0]}: {label}"
                seen_in_group.add(label)
                self.values[name] = text
                item = self._items.get((index, label))
                if item is None:
                    item = QTreeWidgetItem(parent, [label, text])
                    item.setTextAlignment(1, Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                    self._items[(index, label)] = item
                item.setText(1, text)
        self._show_verdict(results)

    def _show_verdict(self, results) -> None:
        failed = [c for c in results.checks if c.status == "fail"]
        warned = [c for c in results.checks if c.status == "warning"]
        if failed:
            colour, background = PAST_KNEE_COLOUR, "#fbe3ef"
            text = (f"<b>{len(failed)} check{'s' if len(failed) > 1 else ''} fail</b>: "
                    + ", ".join(c.title.lower() for c in failed) + ". See the checks below for what to change.")
        elif warned:
            colour, background = WARNING_COLOUR, "#fdf3dc"
            text = (f"<b>Works, with {len(warned)} warning{'s' if len(warned) > 1 else ''}</b>: "
                    + ", ".join(c.title.lower() for c in warned) + ".")
        else:
            colour, background = SAFE_COLOUR, "#e3f4e8"
            text = "<b>Every check passes</b>: the motor meets the load at every temperature and does not demagnetize."
        self.verdict.setStyleSheet(f"font-size: 14px; padding: 6px; border-radius: 4px; background: {background};")
        self.verdict.setText(f"<span style='color:{colour}'>{text}</span>")

    def show_failure(self, message: str) -> None:
        self.verdict.setStyleSheet(f"font-size: 14px; padding: 6px; border-radius: 4px; background: #fbe3ef;")
        self.verdict.setText(f"<span style='color:{PAST_KNEE_COLOUR}'><b>No solution for this design</b>: {message}</span>")
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

    ORDER = {"fail": 0, "warning": 1, "pass": 2}

    def __init__(self):
        super().__init__()
        self.setObjectName("checks_panel")
        self.setOpenLinks(False)
        self.statuses: dict[str, str] = {}
        self.shown: list[str] = []  #: check keys in the order shown

    def show_checks(self, checks) -> None:
        ordered = sorted(checks, key=lambda c: self.ORDER.get(c.status, 3))
        self.statuses = {c.key: c.status for c in checks}
        self.shown = [c.key for c in ordered]
        entries = []
        for check in ordered:
            colour = STATUS_COLOURS.get(check.status, "#000")
            advice = (f"<br><i>What to change:</i> {check.advice[0].upper() + check.advice[1:]}."
                      if check.advice and check.status != "pass" else "")
            # Plain paragraphs: a table per check lays out several times slower on every edit.
            entries.append(
                f"<p style='margin-top:0; margin-bottom:6px'>"
                f"<span style='color:{colour}; font-weight:bold'>{STATUS_MARKS.get(check.status, '?')} "
                f"{STATUS_WORDS.get(check.status, check.status)}</span>&nbsp; <b>{check.title}</b><br>"
                f"{check.message}{advice}</p>")
        scroll = self.verticalScrollBar().value()
        self.setHtml("".join(entries))
        self.verticalScrollBar().setValue(scroll)

    def show_failure(self) -> None:
        self.statuses, self.shown = {}, []
        self.setHtml("<i>No checks: the design has no solution (see the key figures).</i>")


__all__ = ["ResultsPanel", "ChecksPanel", "CASE_COLOURS"]
