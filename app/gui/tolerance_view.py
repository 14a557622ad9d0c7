"""The tolerance page: what the production spread does to the open design.

It runs the study of :mod:`core.tolerance_study` off the GUI thread (progress and cancel) for the
number of motors and the seed shown, and draws: the share of motors that pass every check (the yield)
and the worst margin to the knee; a histogram per key figure with the design's own value and the
0.135 % / 99.865 % points; the band of nominal speed-torque curves between the motors at those points;
and the table of each figure's min / typ / max with the tolerances that drive it. While the page is
on screen an edit starts the study again a moment after the last change; until it finishes, the
figures shown are marked as those of an earlier design. Titles, units and colours from ``app.figures``.
"""

from __future__ import annotations

import threading

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QObject, QRunnable, Qt, QThreadPool, QTimer, Signal
from PySide6.QtWidgets import (
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QProgressBar,
    QPushButton,
    QSizePolicy,
    QSpinBox,
    QSplitter,
    QTableWidget,
    QTableWidgetItem,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.errors import MagneticCircuitError, ProjectError
from pmdc_sizer.core.tolerance_study import StudyCancelled, run_study, speed_band

from ..figures import (
    CASES,
    DASH_GLYPHS,
    FAIL_COLOUR,
    SAFE_COLOUR,
    SPREAD_BAND,
    SPREAD_BAR_COLOUR,
    SPREAD_LIMIT_LINE,
    SPREAD_NOMINAL_LINE,
    TOLERANCE_FIGURES,
    figure,
    shown_value,
    unit_for,
)
from ..formatting import unit_label
from ..tolerance_text import basis_text, check_names, figure_row, spread_text
from .style import line_pen

_AUTO_DELAY_MS = 800
_BINS = 40
_COLUMNS = 3  #: histograms per row
MAX_MOTORS = 1_000_000


def _rgba(colour: str, opacity: float) -> tuple[int, int, int, int]:
    return int(colour[1:3], 16), int(colour[3:5], 16), int(colour[5:7], 16), round(255 * opacity)


class _Signals(QObject):
    progress = Signal(int, int, int)  # job, done, total
    done = Signal(int, object, object, object, str)  # job, key, study or None, band or None, error message


class _Job(QRunnable):
    def __init__(self, job: int, key, project, samples: int, seed: int, stop: threading.Event, signals: _Signals):
        super().__init__()
        self.job, self.key, self.project, self.samples, self.seed = job, key, project, samples, seed
        self.stop, self.signals = stop, signals
        self.setAutoDelete(True)

    def run(self) -> None:
        def progress(done: int, total: int) -> bool:
            self.signals.progress.emit(self.job, done, total)
            return not self.stop.is_set()

        try:
            design = design_from_project(self.project)
            study = run_study(self.project, self.samples, self.seed, progress, design=design)
            band = None if self.stop.is_set() else speed_band(design, study)
        except StudyCancelled:
            self.signals.done.emit(self.job, self.key, None, None, "cancelled")
            return
        except (ProjectError, MagneticCircuitError, ValueError, ArithmeticError) as error:
            self.signals.done.emit(self.job, self.key, None, None, str(error))
            return
        except Exception as error:  # noqa: BLE001 - the window must survive any failure of one study
            self.signals.done.emit(self.job, self.key, None, None,
                                   f"the tolerance study failed ({type(error).__name__}: {error}); this is a defect "
                                   "in pmdc-sizer, please report it with the project file")
            return
        self.signals.done.emit(self.job, self.key, study, band, "")


def _sample(colour: str, dash: str, text: str) -> str:
    return f"<span style='color:{colour}'>{DASH_GLYPHS[dash]} {text}</span>"


class ToleranceView(QWidget):
    """The page. ``main_window`` provides ``current_project``, ``current_results`` and ``results_ready``."""

    finished = Signal(object)  #: a ToleranceStudy now shown
    failed = Signal(str)  #: why the last run gave nothing

    def __init__(self, main_window):
        super().__init__()
        self.setObjectName("tolerance_view")
        self.main_window = main_window
        self.project = None
        self.results = None
        self.study = None
        self.band = None
        self._shown_key = None
        self._file_samples = None
        self._pool = QThreadPool(self)
        self._pool.setMaxThreadCount(1)
        self._signals = _Signals(self)
        self._signals.progress.connect(self._on_progress)
        self._signals.done.connect(self._on_done)
        self._job = 0
        self._running_key = None
        self._stop: threading.Event | None = None
        self._auto = QTimer(self)
        self._auto.setSingleShot(True)
        self._auto.setInterval(_AUTO_DELAY_MS)
        self._auto.timeout.connect(self._run_if_needed)
        self._build()
        main_window.results_ready.connect(self.set_design)
        if main_window.current_results is not None:
            self.set_design(main_window.current_project, main_window.current_results)

    # ------------------------------------------------------------------ layout
    def _build(self) -> None:
        layout = QVBoxLayout(self)
        controls = QHBoxLayout()
        controls.addWidget(QLabel("Motors:"))
        self.samples_box = QSpinBox()
        self.samples_box.setObjectName("tolerance_samples")
        self.samples_box.setRange(100, MAX_MOTORS)
        self.samples_box.setSingleStep(1000)
        self.samples_box.setGroupSeparatorShown(True)
        self.samples_box.setToolTip("How many motors to draw from the tolerances (the file's tolerances.samples)")
        self.samples_box.valueChanged.connect(self._on_choice_changed)
        controls.addWidget(self.samples_box)
        controls.addWidget(QLabel("Seed:"))
        self.seed_box = QSpinBox()
        self.seed_box.setObjectName("tolerance_seed")
        self.seed_box.setRange(0, 2**31 - 1)
        self.seed_box.setToolTip("Seed of the draw: the same seed draws the same motors (the file's tolerances.seed)")
        self.seed_box.valueChanged.connect(self._on_choice_changed)
        controls.addWidget(self.seed_box)
        self.run_button = QPushButton("Run study")
        self.run_button.setToolTip("Draw the motors and evaluate every one now")
        self.run_button.clicked.connect(self.run)
        controls.addWidget(self.run_button)
        self.cancel_button = QPushButton("Cancel")
        self.cancel_button.setEnabled(False)
        self.cancel_button.clicked.connect(self.cancel)
        controls.addWidget(self.cancel_button)
        self.progress_bar = QProgressBar()
        self.progress_bar.setRange(0, 100)
        self.progress_bar.setMaximumWidth(180)
        controls.addWidget(self.progress_bar)
        self.state_label = QLabel("")
        self.state_label.setObjectName("tolerance_state")
        self.state_label.setWordWrap(True)
        controls.addWidget(self.state_label, 1)
        layout.addLayout(controls)

        self.headline = QLabel("The study runs when this page is shown.")
        self.headline.setObjectName("tolerance_headline")
        self.headline.setWordWrap(True)
        self.headline.setTextFormat(Qt.TextFormat.RichText)
        self.headline.setStyleSheet("padding: 2px 4px; font-size: 11pt;")
        layout.addWidget(self.headline)

        splitter = QSplitter(Qt.Orientation.Horizontal)
        self.histograms = pg.GraphicsLayoutWidget()
        self.histograms.setObjectName("tolerance_histograms")
        self.histograms.setBackground("w")
        self.histograms.setMinimumSize(560, 420)
        self.histograms.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Expanding)
        self._plots = {}
        for index, name in enumerate(TOLERANCE_FIGURES):
            plot = self.histograms.addPlot(row=index // _COLUMNS, col=index % _COLUMNS)
            plot.setMenuEnabled(False)
            plot.hideAxis("left")
            plot.setMouseEnabled(x=False, y=False)
            plot.getAxis("bottom").setStyle(tickFont=self.font())
            self._plots[name] = plot
        splitter.addWidget(self.histograms)

        right = QSplitter(Qt.Orientation.Vertical)
        self.band_canvas = pg.PlotWidget(background="w")
        self.band_canvas.setObjectName("tolerance_band")
        self.band_plot = self.band_canvas.getPlotItem()
        self.band_plot.showGrid(x=True, y=True, alpha=0.25)
        self.band_plot.setMenuEnabled(False)
        self.band_plot.setTitle("Speed against torque, nominal case", color="#222222")
        right.addWidget(self.band_canvas)
        self.table = QTableWidget(0, 5)
        self.table.setObjectName("tolerance_table")
        self.table.setHorizontalHeaderLabels(["Figure", "min", "typ", "max", "Driven by (share of its variance)"])
        header = self.table.horizontalHeader()
        header.setSectionResizeMode(0, QHeaderView.ResizeMode.ResizeToContents)
        for column in (1, 2, 3):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(4, QHeaderView.ResizeMode.Stretch)
        self.table.verticalHeader().setVisible(False)
        self.table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        self.table.setWordWrap(True)
        right.addWidget(self.table)
        right.setSizes([300, 340])
        right.setMinimumWidth(420)
        splitter.addWidget(right)
        splitter.setSizes([640, 520])
        layout.addWidget(splitter, 1)

        self.key = QLabel(" &nbsp; ".join((
            f"<span style='color:{SPREAD_BAR_COLOUR}'>■ drawn motors</span>",
            _sample(SPREAD_NOMINAL_LINE.colour, SPREAD_NOMINAL_LINE.dash, SPREAD_NOMINAL_LINE.title),
            _sample(SPREAD_LIMIT_LINE.colour, SPREAD_LIMIT_LINE.dash, SPREAD_LIMIT_LINE.title),
            f"<span style='color:{SPREAD_BAND.colour}'>▒ {SPREAD_BAND.title}</span>")))
        self.key.setTextFormat(Qt.TextFormat.RichText)
        self.key.setWordWrap(True)
        layout.addWidget(self.key)
        self.note = QLabel("")
        self.note.setObjectName("tolerance_note")
        self.note.setWordWrap(True)
        self.note.setStyleSheet("color: #555;")
        layout.addWidget(self.note)

    # ------------------------------------------------------------------ design and choices
    def set_design(self, project, results) -> None:
        """A new evaluated design: mark what is shown stale and run again when on screen."""
        self.project, self.results = project, results
        t = project.tolerances
        for box, value in ((self.samples_box, t.samples), (self.seed_box, t.seed)):
            box.blockSignals(True)
            if box is self.seed_box:
                box.setValue(min(value, box.maximum()))
            elif self._file_samples != value:
                box.setValue(value)
            box.blockSignals(False)
        self._file_samples = t.samples
        self._on_choice_changed()

    def _key(self):
        if self.project is None:
            return None
        return (project_file.dumps(self.project), self.samples_box.value(), self.seed_box.value())

    def _on_choice_changed(self) -> None:
        key = self._key()
        if key is None:
            return
        if key == self._shown_key:
            self._set_state("up to date")
            return
        if self.study is not None:
            self._set_state("the design or the draw changed: the figures below are of an earlier design until the "
                            "study runs again", stale=True)
        if self.isVisible():
            self._auto.start()

    def showEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().showEvent(event)
        if self._key() is not None and self._key() != self._shown_key:
            self._auto.start()

    def _run_if_needed(self) -> None:
        key = self._key()
        if key is not None and key != self._shown_key and key != self._running_key:
            self.run()

    # ------------------------------------------------------------------ running
    def run(self) -> None:
        """Run the study of the current design (a running one is cancelled)."""
        key = self._key()
        if key is None:
            return
        if self._stop is not None:
            self._stop.set()
        self._job += 1
        self._running_key = key
        self._stop = threading.Event()
        self._pool.start(_Job(self._job, key, self.project, key[1], key[2], self._stop, self._signals))
        self.cancel_button.setEnabled(True)
        self.progress_bar.setValue(0)
        self._set_state(f"drawing and evaluating {key[1]:,} motors…", stale=self.study is not None)

    def current_study(self):
        """The study shown, if it is of the current design and draw (not stale); else None."""
        key = self._key()
        return self.study if key is not None and key == self._shown_key else None

    def cancel(self) -> None:
        """Stop the running study; nothing of it is kept."""
        if self._stop is not None:
            self._stop.set()

    def wait(self, milliseconds: int = 60000) -> bool:
        """Block until no study runs (tests, closing)."""
        return self._pool.waitForDone(milliseconds)

    def _set_state(self, text: str, stale: bool = False, error: bool = False) -> None:
        self.state_label.setText(text)
        self.state_label.setStyleSheet(f"color: {FAIL_COLOUR};" if error else ("color: #9a6200;" if stale else ""))
        if self.study is not None:
            self.histograms.setEnabled(not stale)
            self.headline.setStyleSheet("padding: 2px 4px; font-size: 11pt;" + (" color: #888;" if stale else ""))

    def _on_progress(self, job: int, done: int, total: int) -> None:
        if job == self._job:
            self.progress_bar.setValue(round(100 * done / total))
            self.state_label.setText(f"{done:,} of {total:,} motors evaluated…")

    def _on_done(self, job: int, key, study, band, message: str) -> None:
        if job != self._job:
            return  # a cancelled or replaced run
        self._running_key = None
        self._stop = None
        self.cancel_button.setEnabled(False)
        if study is None:
            self.progress_bar.setValue(0)
            if message == "cancelled":
                self._set_state("cancelled: nothing was kept", stale=self.study is not None)
            else:
                self._set_state(message, error=True)
            self.failed.emit(message)
            return
        self.progress_bar.setValue(100)
        self.study, self.band, self._shown_key = study, band, key
        self._show(study, band)
        self._set_state("up to date" if key == self._key() else "the design changed while the study ran",
                        stale=key != self._key())
        self.finished.emit(study)

    # ------------------------------------------------------------------ showing
    def _show(self, study, band) -> None:
        share = study.yield_fraction
        colour = SAFE_COLOUR if share >= 0.99 else FAIL_COLOUR
        margin = figure("demagnetization.worst_margin_A_per_m").text(study.worst_demagnetization_margin_A_per_m)
        titles = {check.key: check.title for check in self.results.checks} if self.results is not None else {}
        failing = ", ".join(f"{check_names((key,), titles)} {100 * count / study.samples:.3g} %"
                            for key, count in sorted(study.failing_checks.items(), key=lambda item: -item[1]))
        margin_colour = FAIL_COLOUR if study.worst_demagnetization_margin_A_per_m < 0.0 else "#222222"
        parts = [f"<b style='color:{colour}'>Yield {100 * share:.4g} %</b> of {study.samples:,} motors pass "
                 "every check",
                 f"worst margin to the knee <span style='color:{margin_colour}'>{margin}</span>",
                 f"chains that failed: {study.failed:,}"]
        if failing:
            parts.append(f"failing: {failing}")
        if study.nominal_failing_checks:
            parts.append(f"the design as drawn fails already: {check_names(study.nominal_failing_checks, titles)}")
        self.headline.setText(" &nbsp;·&nbsp; ".join(parts))
        self._draw_histograms(study)
        self._draw_band(band)
        self._fill_table(study)
        wire_from_standard = self.project.tolerances.wire_diameter_mm is None
        spreads = "; ".join(f"{s.label} {spread_text(s, wire_from_standard and s.key.endswith('wire_diameter_mm'))}"
                            for s in study.spreads if s.plus_minus > 0.0)
        messages = "; ".join(f"{count:,} × {text}" for text, count in study.failure_messages.items())
        self.note.setText(f"Spreads: {spreads or 'none'}. {basis_text(study).capitalize()}. The band is the "
                          "envelope of the nominal curves of the motors nearest the ±3σ points of no-load speed, "
                          "rated speed and stall torque. Edit the spreads under Tolerances in the design."
                          + (f" Failed chains: {messages}." if messages else ""))

    def _unit(self, name: str) -> str:
        return unit_for(TOLERANCE_FIGURES[name], self.results) if self.results is not None else figure(
            TOLERANCE_FIGURES[name]).unit

    def _draw_histograms(self, study) -> None:
        for name, plot in self._plots.items():
            plot.clear()
            spread = study.figures[name]
            unit = self._unit(name)
            shown = figure(TOLERANCE_FIGURES[name])
            plot.setTitle(f"<span style='font-size:9pt'>{shown.label(unit)}</span>", color="#222222")
            values = spread.values[np.isfinite(spread.values)]
            if values.size == 0:
                continue
            counts, edges = np.histogram(shown_value(values, unit), bins=_BINS)
            plot.plot(edges, counts, stepMode="center", fillLevel=0, brush=pg.mkBrush(SPREAD_BAR_COLOUR),
                      pen=pg.mkPen(SPREAD_BAR_COLOUR))
            for value, style in ((spread.nominal, SPREAD_NOMINAL_LINE), (spread.low, SPREAD_LIMIT_LINE),
                                 (spread.high, SPREAD_LIMIT_LINE)):
                if np.isfinite(value):
                    plot.addItem(pg.InfiniteLine(float(shown_value(value, unit)), angle=90,
                                                 pen=line_pen(style.colour, style.dash, 1.6)))

    def _draw_band(self, band) -> None:
        plot = self.band_plot
        plot.clear()
        torque_key, speed_key = "curve.torque_N_m", "curve.speed_rad_per_s"
        torque_unit = unit_for(torque_key, self.results) if self.results is not None else figure(torque_key).unit
        speed_unit = figure(speed_key).unit
        plot.setLabel("bottom", f"{figure(torque_key).title} [{unit_label(torque_unit)}]")
        plot.setLabel("left", f"{figure(speed_key).title} [{unit_label(speed_unit)}]")
        if band is None:
            plot.setTitle("Speed against torque: no band (no motor at the ±3σ points solved)", color="#222222")
            return
        torque = shown_value(band.torque_N_m, torque_unit)
        low = plot.plot(torque, shown_value(band.low_speed_rad_per_s, speed_unit),
                        pen=pg.mkPen(SPREAD_BAND.colour, width=0.8))
        high = plot.plot(torque, shown_value(band.high_speed_rad_per_s, speed_unit),
                         pen=pg.mkPen(SPREAD_BAND.colour, width=0.8))
        plot.addItem(pg.FillBetweenItem(low, high, brush=pg.mkBrush(*_rgba(SPREAD_BAND.colour, SPREAD_BAND.opacity))))
        if self.results is not None:
            curve = self.results.nominal.curve
            nominal = CASES["nominal"]
            plot.plot(shown_value(curve.torque_N_m, torque_unit), shown_value(curve.speed_rad_per_s, speed_unit),
                      pen=line_pen(nominal.colour, nominal.dash, 1.8))
        plot.setTitle(f"Nominal speed-torque band: {len(band.motors)} motors at the ±3σ points",
                      color="#222222", size="9pt")

    def _fill_table(self, study) -> None:
        names = list(TOLERANCE_FIGURES)
        self.table.setRowCount(len(names))
        for index, name in enumerate(names):
            title, low, typical, high, _ = figure_row(name, study, self._unit(name))
            drivers = ", ".join(f"{d.label} {100 * d.share:.0f} %" for d in study.drivers[name] if d.share >= 0.005)
            for column, text in enumerate((title, low, typical, high, drivers or "–")):
                item = QTableWidgetItem(text)
                if column in (1, 2, 3):
                    item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                if column == 4:
                    item.setToolTip("First-order Sobol index of each tolerance (RBD-FAST on the drawn motors): the "
                                    "share of the figure's variance it explains on its own")
                self.table.setItem(index, column, item)
        self.table.resizeRowsToContents()
