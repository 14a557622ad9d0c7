"""The comparison page: the current design (A, live) against a second design (B).

B is one of: the current design with another magnet grade (it follows every edit of A), a pinned copy
of the current design as it was when pinned, or a second project file. The page shows the key figures
of both with B − A, each side's checks, the speed-torque curves and the magnet curves of A and B on
the same axes, and each side's own magnet operating chart. Three buttons re-fit B to one of A's
figures (Ke by magnet thickness, no-load speed by turns per coil, stall torque by stack length); a
re-fit runs off the GUI thread and leaves B pinned at its re-fitted design.

The page computes nothing: ``core.compare`` differences and re-fits, ``core.evaluate`` evaluates.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QObject, QRunnable, Qt, QThreadPool, QTimer, Signal
from PySide6.QtGui import QBrush, QColor
from PySide6.QtWidgets import (
    QComboBox,
    QFileDialog,
    QGroupBox,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QPushButton,
    QSplitter,
    QTableWidget,
    QTableWidgetItem,
    QTabWidget,
    QTextBrowser,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.app.compare_text import figure_rows, refit_lines
from pmdc_sizer.app.figures import POINTS, SIDES, STATUSES, figure, text_of, torque_unit, units_of_design
from pmdc_sizer.app.formatting import check_sentence, unit_label
from pmdc_sizer.app.refit_text import parameter_shown, parameter_title, refit_message, target_title
from pmdc_sizer.core import difference, library, refit
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.magnetic_circuit import MagneticCircuitError
from pmdc_sizer.core.project import ProjectError
from pmdc_sizer.core.units import from_si

from .display_units import DisplayUnits
from .evaluation import Evaluator
from .magnet_chart import MagnetChart
from .magnet_overlay import MagnetOverlay
from .performance_chart import QUANTITIES
from .style import black_axes, flush_column, labelled_choice, line_pen, mark_style

NO_GRADE = "— choose a grade —"
TORQUE = figure("curve.torque_N_m")
REFIT_BUTTONS = (
    ("ke", "Ke\nby magnet thickness", "Change B's magnet thickness until its Ke equals A's."),
    ("no-load-speed", "No-load speed\nby turns per coil",
     "Change B's turns per coil (whole turns) until its no-load speed is as close to A's as whole turns allow."),
    ("stall-torque", "Stall torque\nby stack length",
     "Change B's stack length until its stall torque equals A's; magnets and housing keep their overhang."),
)


class _RefitSignals(QObject):
    done = Signal(int, object, str)  # generation, Refit or None, error message


class _RefitJob(QRunnable):
    def __init__(self, generation, target, results_a, project_b, results_b, signals):
        super().__init__()
        self.arguments = (target, results_a, project_b, results_b)
        self.generation, self.signals = generation, signals
        self.setAutoDelete(True)

    def run(self) -> None:
        try:
            fit = refit.refit(*self.arguments)
        except (ProjectError, MagneticCircuitError, ValueError, ArithmeticError) as error:
            self.signals.done.emit(self.generation, None, str(error))
            return
        except Exception as error:  # noqa: BLE001 - a failed re-fit must not take the window down
            self.signals.done.emit(self.generation, None, f"re-fit failed: {error!r}")
            return
        self.signals.done.emit(self.generation, fit, "")


class CompareView(QWidget):
    """The comparison page. ``main_window`` provides ``current_project``, ``current_results`` and the
    signal ``results_ready(project, results)``."""

    page_title = "A against B"
    comparison_updated = Signal(object)  #: the new core.difference.Comparison
    refit_finished = Signal(object)  #: core.refit.Refit, or None when it failed

    def __init__(self, main_window):
        super().__init__()
        self.setObjectName("compare_view")
        self.main_window = main_window
        #: every figure, check text and axis follows the window's display units (SI without a window)
        self.display: DisplayUnits = getattr(main_window, "display", None) or DisplayUnits()
        self.project_a = self.results_a = None
        self.project_b = self.results_b = None
        self.b_mode = ""  # "grade", "pinned", "file", "design" (handed in, e.g. by the sizing page) or "refit"
        self.b_source = ""  # words for the B line
        self.comparison: difference.Comparison | None = None
        self.last_refit: refit.Refit | None = None
        self._refit_generation = 0
        self._refit_running = False
        self._refit_for_a = None
        self.status_text = ""

        self.evaluator_b = Evaluator(self)
        self.evaluator_b.finished.connect(self._on_b_evaluated)
        self.evaluator_b.failed.connect(self._on_b_failed)
        self._refit_pool = QThreadPool(self)
        self._refit_pool.setMaxThreadCount(1)
        self._refit_signals = _RefitSignals(self)
        self._refit_signals.done.connect(self._on_refit_done)

        layout = QVBoxLayout(self)
        layout.setContentsMargins(6, 6, 6, 6)
        layout.addWidget(self._build_choice_bar())
        self.side_labels = QLabel()
        self.side_labels.setObjectName("side_labels")
        self.side_labels.setTextFormat(Qt.TextFormat.RichText)
        self.side_labels.setWordWrap(True)
        layout.addWidget(self.side_labels)
        # The re-fit buttons under B's choice, above the tables: in view at 1366×768 without scrolling.
        layout.addWidget(self._build_refit_bar())
        splitter = QSplitter(Qt.Orientation.Horizontal)
        layout.addWidget(splitter, 1)
        splitter.addWidget(self._build_numbers_panel())
        self.tabs = QTabWidget()
        self.tabs.setObjectName("compare_tabs")
        self.tabs.addTab(self._build_curves(), "Speed-torque, A and B")
        # A's and B's magnet curves on the same axes; then each side's own chart with all its cases.
        self.magnet_overlay = MagnetOverlay()
        self.tabs.addTab(self.magnet_overlay, "Magnets, A and B")
        self.tabs.addTab(self._build_magnet_charts(), "Magnet cases, A | B")
        splitter.addWidget(self.tabs)
        splitter.setStretchFactor(0, 2)
        splitter.setStretchFactor(1, 3)
        splitter.setSizes([480, 920])

        # Updates are coalesced (many edits of A in one turn of the event loop draw once) and wait
        # while the page is hidden; only the chart tab in view is drawn.
        self._update_timer = QTimer(self)
        self._update_timer.setSingleShot(True)
        self._update_timer.setInterval(0)
        self._update_timer.timeout.connect(self._update_if_shown)
        self._stale = False
        self.tabs.currentChanged.connect(lambda _index: self._draw_charts())

        if hasattr(main_window, "results_ready"):
            main_window.results_ready.connect(self.set_design_a)
        if getattr(main_window, "current_results", None) is not None:
            self.set_design_a(main_window.current_project, main_window.current_results)
        self._show_sides()

    # ------------------------------------------------------------------------------------------
    # Building

    def _build_choice_bar(self) -> QWidget:
        bar = QGroupBox("Design B")
        row = QHBoxLayout(bar)
        row.addWidget(QLabel("A with the grade"))
        self.grade_combo = QComboBox()
        self.grade_combo.setObjectName("grade_b_combo")
        self.grade_combo.addItem(NO_GRADE)
        for grade in library.magnet_grades().values():
            self.grade_combo.addItem(grade.name)
            self.grade_combo.setItemData(self.grade_combo.count() - 1, grade.family, Qt.ItemDataRole.ToolTipRole)
        self.grade_combo.setToolTip("B follows every edit of A, with this magnet grade instead of A's.")
        self.grade_combo.currentTextChanged.connect(self._on_grade_chosen)
        row.addWidget(self.grade_combo)
        row.addWidget(QLabel("or"))
        self.pin_button = QPushButton("Pin the current design as B")
        self.pin_button.setObjectName("pin_button")
        self.pin_button.setToolTip("B keeps the design as it is now; go on editing A and watch the difference.")
        self.pin_button.clicked.connect(self.pin_current_as_b)
        row.addWidget(self.pin_button)
        self.open_button = QPushButton("Open a project file as B…")
        self.open_button.setObjectName("open_b_button")
        self.open_button.clicked.connect(self._choose_b_file)
        row.addWidget(self.open_button)
        row.addStretch(1)
        self.save_button = QPushButton("Save B as…")
        self.save_button.setObjectName("save_b_button")
        self.save_button.setToolTip("Write design B (a re-fitted one too) to a project file of its own.")
        self.save_button.clicked.connect(self._choose_b_save_path)
        row.addWidget(self.save_button)
        return bar

    def _build_numbers_panel(self) -> QWidget:
        # Figures, checks and the re-fit report in a splitter the user can move: at 1366×768 none of them
        # needs all its rows in view at once, and each scrolls within its share.
        column = QSplitter(Qt.Orientation.Vertical)
        column.setObjectName("numbers_splitter")
        column.setChildrenCollapsible(False)
        column.setMinimumWidth(440)  # the figure titles and five columns, unclipped
        panel = column
        self.figures_table = QTableWidget(0, 5)
        self.figures_table.setObjectName("figures_table")
        self.figures_table.setHorizontalHeaderLabels(["Nominal case unless marked", "A", "B", "B − A", "B vs A"])
        self._tidy_table(self.figures_table)
        column.addWidget(self.figures_table)

        self.checks_table = QTableWidget(0, 3)
        self.checks_table.setObjectName("checks_table")
        self.checks_table.setHorizontalHeaderLabels(["Check", "A", "B"])
        self._tidy_table(self.checks_table)
        column.addWidget(self.checks_table)

        self.refit_report = QTextBrowser()
        self.refit_report.setObjectName("refit_report")
        # As grey text rather than a placeholder: Qt does not wrap a placeholder, and a narrow column cut it off.
        self.refit_report.setHtml(
            "<span style='color: #6b7280;'>No re-fit yet. A re-fit changes one input of B until B meets A's figure; "
            "it takes a few dozen evaluations, well under a second.</span>")
        column.addWidget(self.refit_report)
        for index, stretch in enumerate((3, 2, 1)):
            column.setStretchFactor(index, stretch)
        column.setSizes([420, 280, 140])
        return panel

    def _build_refit_bar(self) -> QWidget:
        box = QGroupBox("Re-fit B to A's figure (B is then pinned at the re-fitted design)")
        box.setToolTip("Each re-fit changes one input of B; what else follows is listed in the report below.")
        row = QHBoxLayout(box)
        self.refit_buttons: dict[str, QPushButton] = {}
        for target, label, tip in REFIT_BUTTONS:
            button = QPushButton(label.replace("\n", " "))  # one line: the bar spans the page
            button.setToolTip(tip)
            button.setObjectName(f"refit_{target}")
            button.clicked.connect(lambda _checked=False, t=target: self.start_refit(t))
            row.addWidget(button)
            self.refit_buttons[target] = button
        row.addStretch(1)
        return box

    @staticmethod
    def _tidy_table(table: QTableWidget) -> None:
        table.verticalHeader().hide()
        table.verticalHeader().setDefaultSectionSize(21)
        table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        table.setSelectionMode(QTableWidget.SelectionMode.NoSelection)
        header = table.horizontalHeader()
        header.setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)

    def _build_curves(self) -> QWidget:
        page = QWidget()
        column = flush_column(page)
        row = QHBoxLayout()
        self.case_combo = labelled_choice(row, "Temperature case", "curve_case_combo", ["nominal", "cold", "hot"],
                                          self._draw_curves)
        self.range_combo = labelled_choice(row, "Torque range", "curve_range_combo",
                                           ["no load to stall", "around the rated point"], self._draw_curves)
        self.range_combo.setToolTip("Around the rated point: 0 to 3 × the rated torque, where a motor with a "
                                    "current-limited drive actually works.")
        self.curve_note = QLabel()
        row.addWidget(self.curve_note, 1)
        column.addLayout(row)
        # The key sits above the plots rather than on them, so it never hides a curve.
        self.curve_key = QLabel()
        self.curve_key.setObjectName("curve_key")
        self.curve_key.setTextFormat(Qt.TextFormat.RichText)
        self.curve_key.setStyleSheet("padding: 2px 4px;")
        self.curve_key.setWordWrap(True)
        column.addWidget(self.curve_key)
        self.curves_canvas = pg.GraphicsLayoutWidget()
        self.curves_canvas.setObjectName("compare_curves")
        self.curves_canvas.setBackground("w")
        column.addWidget(self.curves_canvas, 1)
        self.curve_plots, self.curve_items, self.rated_marks = {}, {}, {}
        first = None
        for index, (attribute, title, unit) in enumerate(QUANTITIES):
            plot = self.curves_canvas.addPlot(row=index // 2, col=index % 2)
            plot.showGrid(x=True, y=True, alpha=0.25)
            plot.setLabel("left", title, units=unit)
            plot.setLabel("bottom", TORQUE.title, units=TORQUE.unit)
            plot.setMenuEnabled(False)
            black_axes(plot, coarse_grid=False)
            if first is None:
                first = plot
            else:
                plot.setXLink(first)
            for side, style in SIDES.items():
                self.curve_items[(attribute, side)] = plot.plot(pen=line_pen(style.colour, style.dash, 2.4))
                # A's mark is the larger, so that B's, at the same rated torque, still lets it show.
                mark = mark_style("rated", style.colour)
                self.rated_marks[(attribute, side)] = plot.plot(
                    pen=None, symbol=mark["symbol"], symbolSize=mark["size"] * style.size, symbolBrush=mark["brush"],
                    symbolPen=mark["pen"])
            self.curve_plots[attribute] = plot
        required = mark_style("required")
        self.required_mark = self.curve_plots["speed_rad_per_s"].plot(
            pen=None, symbol=required["symbol"], symbolSize=required["size"], symbolBrush=required["brush"],
            symbolPen=required["pen"])
        return page

    def _build_magnet_charts(self) -> QWidget:
        page = QWidget()
        row = QHBoxLayout(page)
        row.setContentsMargins(0, 0, 0, 0)
        self.magnet_charts, self.magnet_titles = {}, {}
        for side in ("A", "B"):
            box = QWidget()
            column = flush_column(box)
            title = QLabel()
            title.setObjectName(f"magnet_title_{side}")
            title.setStyleSheet(f"font-weight: bold; color: {SIDES[side].colour}; padding: 2px;")
            column.addWidget(title)
            chart = MagnetChart()
            chart.setObjectName(f"magnet_chart_{side}")
            column.addWidget(chart, 1)
            self.magnet_charts[side], self.magnet_titles[side] = chart, title
            row.addWidget(box, 1)
        return page

    # ------------------------------------------------------------------------------------------
    # Design A, live

    def set_design_a(self, project, results) -> None:
        """A was evaluated (the main window's ``results_ready``): follow it."""
        self.project_a, self.results_a = project, results
        if self.b_mode == "grade":
            self._request_b_with_grade()
        self._update_later()

    # ------------------------------------------------------------------------------------------
    # Choosing B

    def _on_grade_chosen(self, name: str) -> None:
        if name and name != NO_GRADE:
            self.use_grade_for_b(name)

    def use_grade_for_b(self, grade_name: str) -> None:
        """B = A with ``grade_name``, following A from now on."""
        if self.grade_combo.currentText() != grade_name:
            self.grade_combo.blockSignals(True)
            self.grade_combo.setCurrentText(grade_name)
            self.grade_combo.blockSignals(False)
        self.status_text = ""
        self.b_mode, self.b_source = "grade", f"A with {grade_name}, following A"
        self.project_b = self.results_b = None
        self._request_b_with_grade()
        self._update_later()

    def _request_b_with_grade(self) -> None:
        if self.project_a is None:
            return
        try:
            design_b = difference.with_grade(self.project_a, self.grade_combo.currentText())
        except ProjectError as error:
            self._on_b_failed(None, str(error))
            return
        self.evaluator_b.request(design_b)

    def pin_current_as_b(self) -> None:
        """B = the current design as it is now; it stays so while A is edited."""
        if self.project_a is None:
            return
        self._reset_grade_combo()
        self.status_text = ""
        self.b_mode, self.b_source = "pinned", f"A as it was when pinned ({self.results_a.magnet.name})"
        self.project_b, self.results_b = self.project_a, self.results_a
        self._update_later()

    def _choose_b_file(self) -> None:
        path, _filter = QFileDialog.getOpenFileName(self, "Open a project file as B", "",
                                                    "pmdc-sizer projects (*.toml)")
        if path:
            self.load_b_file(path)

    def load_b_file(self, path) -> bool:
        """B = the design in ``path``. A bad file leaves B as it was and says why."""
        try:
            design_b = project_file.load(path)
        except ProjectError as error:
            self._set_status(f"B not changed: {error}", "fail")
            return False
        self._reset_grade_combo()
        self.status_text = ""
        self.b_mode, self.b_source = "file", f"file {Path(path).name}"
        self.project_b = self.results_b = None
        self.evaluator_b.request(design_b)
        self._update_later()
        return True

    def show_as_b(self, project, source: str) -> None:
        """B = ``project`` (a validated design handed in by another page); ``source`` says where it came from."""
        self._reset_grade_combo()
        self.status_text = ""
        self.b_mode, self.b_source = "design", source
        self.project_b = self.results_b = None
        self.evaluator_b.request(project)
        self._update_later()

    def _choose_b_save_path(self) -> None:
        path, _filter = QFileDialog.getSaveFileName(self, "Save design B", "", "pmdc-sizer projects (*.toml)")
        if path:
            self.save_b(path if path.endswith(".toml") else path + ".toml")

    def save_b(self, path) -> bool:
        """Write B to ``path`` (atomically, by the project module); a failure says why and writes nothing."""
        if self.project_b is None:
            return False
        try:
            project_file.save(self.project_b, path)
        except ProjectError as error:
            self._set_status(f"B not saved: {error}", "fail")
            return False
        self._set_status(f"B saved to {Path(path).name}.", "pass")
        return True

    def _reset_grade_combo(self) -> None:
        self.grade_combo.blockSignals(True)
        self.grade_combo.setCurrentText(NO_GRADE)
        self.grade_combo.blockSignals(False)

    def _on_b_evaluated(self, project, results) -> None:
        if self.b_mode not in ("grade", "file", "design"):
            return  # B was pinned or re-fitted meanwhile
        if self.b_mode == "grade" and project.magnets.grade != self.grade_combo.currentText():
            return  # an earlier choice of grade, overtaken
        self.status_text = ""
        self.project_b, self.results_b = project, results
        self._update_later()

    def _on_b_failed(self, _project, message: str) -> None:
        self.project_b = self.results_b = None
        self._update_later()
        self._set_status(f"B has no solution: {message}", "fail")

    # ------------------------------------------------------------------------------------------
    # Re-fits

    def start_refit(self, target: str) -> bool:
        """Re-fit B to A's figure ``target`` (a key of core.refit.TARGETS) off the GUI thread."""
        if self._refit_running or self.results_a is None or self.results_b is None:
            return False
        self._refit_generation += 1
        self._refit_running = True
        self._refit_for_a = self.project_a
        for button in self.refit_buttons.values():
            button.setEnabled(False)
        self.refit_report.setPlainText(f"Re-fitting B to A's {target_title(target)}…")
        self._refit_pool.start(_RefitJob(self._refit_generation, target, self.results_a, self.project_b,
                                         self.results_b, self._refit_signals))
        return True

    def _on_refit_done(self, generation: int, fit, message: str) -> None:
        self._refit_running = False
        for button in self.refit_buttons.values():
            button.setEnabled(True)
        if generation != self._refit_generation:
            return
        if fit is None:
            self.refit_report.setPlainText(f"The re-fit failed: {message}")
            self.refit_finished.emit(None)
            return
        self.last_refit = fit
        # B becomes the re-fitted design, pinned: it no longer follows A's edits, but its box still names the
        # grade it is made of.
        self.grade_combo.blockSignals(True)
        self.grade_combo.setCurrentText(fit.project.magnets.grade or NO_GRADE)
        self.grade_combo.blockSignals(False)
        self.b_mode = "refit"
        unit_of = self.display.screen_unit
        self.b_source = (f"re-fitted to A's {target_title(fit.target)} "
                         f"({'reached' if fit.reached else 'out of reach'}): {parameter_title(fit.target)} "
                         f"{parameter_shown(fit, fit.value_before, unit_of)}"
                         f" → {parameter_shown(fit, fit.value_after, unit_of)}, pinned")
        self.project_b, self.results_b = fit.project, fit.results
        self._show_refit(fit)
        # At once, not later: whoever hears refit_finished finds the page already showing it.
        self._stale = True
        self._update_if_shown()
        self.refit_finished.emit(fit)

    def _show_refit(self, fit) -> None:
        colour = STATUSES["pass" if fit.reached else "fail"].colour
        unit_of = self.display.screen_unit
        lines = refit_lines(fit, unit_of)
        head = "Reached" if fit.reached else "Out of reach"
        html = [f"<p><b style='color:{colour}'>{head}.</b> {_escape(refit_message(fit, unit_of))}</p><ul>"]
        html += [f"<li>{_escape(line.strip())}</li>" for line in lines[1:]]
        html.append(f"</ul><p style='color:#666'>{fit.evaluations} evaluations. To start again from B before the "
                    "re-fit, choose it again above; to keep this B, save it as a project file.</p>")
        if self.project_a is not self._refit_for_a:
            html.append("<p><b>A changed while B was re-fitted; re-fit again to match the new A.</b></p>")
        self.refit_report.setHtml("".join(html))

    # ------------------------------------------------------------------------------------------
    # Showing

    def _set_status(self, text: str, status: str = "pass") -> None:
        self.status_text = f"<br><span style='color:{STATUSES[status].colour}'>{_escape(text)}</span>" if text else ""
        self._show_sides()

    def _side_text(self, side: str, results, source: str) -> str:
        style = SIDES[side]
        mark = style.line_glyph
        if results is None:
            return f"<span style='color:{style.colour}'><b>{mark} {side}</b></span>: {_escape(source)}"
        m = results.magnet
        return (f"<span style='color:{style.colour}'><b>{mark} {side}</b></span>: {_escape(results.name)} · "
                f"<b>{_escape(m.name)}</b> ({_escape(m.family)}) · {_escape(source)}")

    def _show_sides(self) -> None:
        a_text = self._side_text("A", self.results_a, "the current design, live" if self.results_a is not None
                                 else "no evaluated design yet")
        if not self.b_mode:
            b_source = "choose a grade, pin the current design, or open a project file"
        elif self.results_b is None:
            b_source = f"{self.b_source} (evaluating…)"
        else:
            b_source = self.b_source
        self.side_labels.setText(a_text + "<br>" + self._side_text("B", self.results_b, b_source) + self.status_text)

    def _update_later(self) -> None:
        self._show_sides()
        self._stale = True
        self._update_timer.start()

    def _update_if_shown(self) -> None:
        if self.isVisible():
            self._update()

    def showEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().showEvent(event)
        if self._stale:
            self._update()

    def _update(self) -> None:
        self._stale = False
        self._show_sides()
        ready = self.results_a is not None and self.results_b is not None
        self.save_button.setEnabled(self.project_b is not None)
        for button in self.refit_buttons.values():
            button.setEnabled(ready and not self._refit_running)
        if self.last_refit is not None and self.b_mode == "refit" and self.project_a is not self._refit_for_a:
            self._show_refit(self.last_refit)
        if not ready:
            self.comparison = None
            self.figures_table.setRowCount(0)
            self.checks_table.setRowCount(0)
            self._draw_charts()
            return
        self.comparison = difference.compare(self.project_a, self.project_b, self.results_a, self.results_b)
        self._fill_figures()
        self._fill_checks()
        self._draw_charts()
        self.comparison_updated.emit(self.comparison)

    def _draw_charts(self) -> None:
        index = self.tabs.currentIndex()
        if index == 0:
            self._draw_curves()
        elif self.tabs.widget(index) is self.magnet_overlay:
            self.magnet_overlay.show_results(self.results_a, self.results_b)
        else:
            self._draw_magnets()

    def _fill_figures(self) -> None:
        rows = figure_rows(self.comparison, self.display.screen_unit)
        table = self.figures_table
        if table.rowCount() != len(rows):
            table.setRowCount(len(rows))
            for index in range(len(rows)):
                for column in range(5):
                    cell = QTableWidgetItem()
                    if column:
                        cell.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                    if column in (1, 2):
                        cell.setForeground(QBrush(QColor(SIDES["A" if column == 1 else "B"].colour)))
                    table.setItem(index, column, cell)
        # Sizing the columns to their contents once, after all the texts, not after each of them.
        header = table.horizontalHeader()
        header.setSectionResizeMode(QHeaderView.ResizeMode.Fixed)
        for index, row in enumerate(rows):
            for column, text in enumerate((row.title, row.a, row.b, row.difference, row.percent)):
                table.item(index, column).setText(text)
        header.setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)

    def _fill_checks(self) -> None:
        by_key_a = {c.key: c for c in self.results_a.checks}
        by_key_b = {c.key: c for c in self.results_b.checks}
        keys = list(by_key_a) + [k for k in by_key_b if k not in by_key_a]
        self.checks_table.setRowCount(len(keys))
        for index, key in enumerate(keys):
            titled = by_key_a.get(key) or by_key_b[key]
            self.checks_table.setItem(index, 0, QTableWidgetItem(titled.title))
            for column, check in ((1, by_key_a.get(key)), (2, by_key_b.get(key))):
                if check is None:
                    cell = QTableWidgetItem("–")
                    cell.setToolTip("this side has no such check")
                else:
                    status = STATUSES[check.status]
                    cell = QTableWidgetItem(f"{status.mark} {status.word}")
                    cell.setForeground(QBrush(QColor(status.colour)))
                    results = self.results_a if column == 1 else self.results_b
                    cell.setToolTip(check_sentence(check, units_of_design(results, self.display.screen_unit)))
                self.checks_table.setItem(index, column, cell)
        self.checks_table.setToolTip("Point at a result to read the reason and what to change.")
        # No taller than its rows; the splitter gives it less on a small screen and it scrolls.
        self.checks_table.setMaximumHeight(self.checks_table.horizontalHeader().height() + 21 * len(keys) + 4)

    def _torque_unit(self) -> str:
        """The torque axis's unit, in the display units: N·m if either design is a large motor (its stall torque
        in thousands of mN·m would crowd the axis), else mN·m."""
        units = {torque_unit(r) for r in (self.results_a, self.results_b) if r is not None}
        return self.display.screen_unit("N·m" if "N·m" in units else TORQUE.unit)

    def _draw_curves(self) -> None:
        case_name = self.case_combo.currentText()
        highest_stall = 0.0
        keys = []
        torque_in = self._torque_unit()
        temperature = figure("case.winding_temperature_C")
        degrees = self.display.screen_unit(temperature.unit)
        for plot in self.curve_plots.values():
            plot.setLabel("bottom", TORQUE.title, units=unit_label(torque_in))
        for side, results in (("A", self.results_a), ("B", self.results_b)):
            case = getattr(results, case_name) if results is not None else None
            for attribute, _title, unit in QUANTITIES:
                curve, mark = self.curve_items[(attribute, side)], self.rated_marks[(attribute, side)]
                if case is None:
                    curve.setData([], [])
                    mark.setData([], [])
                    continue
                torque = from_si(case.curve.torque_N_m, torque_in)
                curve.setData(torque, from_si(np.asarray(getattr(case.curve, attribute)), unit))
                if case.rated_reached:
                    mark.setData([from_si(case.rated.torque_N_m, torque_in)],
                                 [from_si(getattr(case.rated, attribute), unit)])
                else:
                    mark.setData([], [])
            if case is not None:
                highest_stall = max(highest_stall, from_si(case.stall_torque_N_m, torque_in))
                style, rated = SIDES[side], POINTS["rated"]
                keys.append(f"<span style='color:{style.colour}'><b>{style.line_glyph} {side}</b>: "
                            f"{_escape(results.magnet.name)}, winding "
                            f"{temperature.text(case.winding_temperature_C, degrees)}, magnet "
                            f"{temperature.text(case.magnet_temperature_C, degrees)}; "
                            f"{rated.glyph} {rated.title}</span>")
        if self.results_a is not None:
            self.required_mark.setData([from_si(self.results_a.load_torque_N_m, torque_in)],
                                       [from_si(self.results_a.load_speed_rad_per_s, "rpm")])
            self.curve_note.setText(f"{case_name} case")
            required = POINTS["required"]
            keys.append(f"<span style='color:{required.colour}'><b>{required.glyph}</b> {required.title}</span>")
        self.curve_key.setText("&nbsp;&nbsp;&nbsp;".join(keys))
        if highest_stall > 0:
            right = highest_stall * 1.02
            if self.range_combo.currentIndex() == 1 and self.results_a is not None:
                right = min(right, 3.0 * from_si(self.results_a.load_torque_N_m, torque_in))
            for plot in self.curve_plots.values():
                plot.setXRange(0.0, right, padding=0.0)
                plot.getViewBox().setAutoVisible(y=True)  # scale each quantity to the torques in view
                plot.enableAutoRange(axis="y")

    def _draw_magnets(self) -> None:
        for side, results, _design in (("A", self.results_a, self.project_a), ("B", self.results_b, self.project_b)):
            chart, title = self.magnet_charts[side], self.magnet_titles[side]
            if results is None:
                chart.clear()
                title.setText(f"{side}: –")
                continue
            chart.show_results(results)
            thickness = figure("geometry.magnet_thickness_m")
            arcs = thickness.text(results.geometry.magnet_thickness_m, self.display.screen_unit(thickness.unit))
            title.setText(f"{side}: {results.magnet.name}, {arcs} arcs, "
                          f"Pc {text_of(results, 'magnetics.permeance_coefficient')} at no load")


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
