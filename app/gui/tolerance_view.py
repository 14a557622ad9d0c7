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

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtWidgets import (
    QLabel,
    QSizePolicy,
    QSplitter,
    QTableWidgetItem,
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
from .background_job import JobPage
from .style import line_pen, plot_canvas, wrapped_label

_AUTO_DELAY_MS = 800
_BINS = 40
_COLUMNS = 3  #: histograms per row
MAX_MOTORS = 1_000_000


def _rgba(colour: str, opacity: float) -> tuple[int, int, int, int]:
    return int(colour[1:3], 16), int(colour[3:5], 16), int(colour[5:7], 16), round(255 * opacity)


def _sample(colour: str, dash: str, text: str) -> str:
    return f"<span style='color:{colour}'>{DASH_GLYPHS[dash]} {text}</span>"


class ToleranceView(JobPage):
    """The production-spread page: yield, histograms, band and table of the drawn motors."""

    def __init__(self, main_window):
        super().__init__(main_window, "tolerance_view")
        self.study = None
        self.band = None
        self._shown_key = None
        self._file_samples = None
        self._start_job("the tolerance study", StudyCancelled,
                        (ProjectError, MagneticCircuitError, ValueError, ArithmeticError), _AUTO_DELAY_MS,
                        lambda key: key == self._shown_key, self.run, "Run study",
                        "Draw the motors and evaluate every one now", "tolerance_state")
        self._build()
        self._follow(main_window)

    # ------------------------------------------------------------------ layout
    def _build(self) -> None:
        self.samples_box = self._count_box(
            "tolerance_samples", MAX_MOTORS, 1000, "How many motors to draw from the tolerances (the file's "
            "tolerances.samples)")
        self.samples_box.valueChanged.connect(self._on_choice_changed)
        self.seed_box = self._seed_box(
            "tolerance_seed", "Seed of the draw: the same seed draws the same motors (the file's tolerances.seed)")
        self.seed_box.valueChanged.connect(self._on_choice_changed)
        layout = self._page_layout([QLabel("Motors:"), self.samples_box, QLabel("Seed:"), self.seed_box])

        self.headline = wrapped_label("tolerance_headline", "padding: 2px 4px; font-size: 11pt;",
                                      "The study runs when this page is shown.", rich=True)
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
        self.band_canvas = plot_canvas("tolerance_band")
        self.band_plot = self.band_canvas.getPlotItem()
        self.band_plot.setTitle("Speed against torque, nominal case", color="#222222")
        right.addWidget(self.band_canvas)
        self.table = self._figure_table(
            "tolerance_table", ["Figure", "min", "typ", "max", "Driven by (share of its variance)"], stretch=4)
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
            self._show_state("up to date")
            return
        if self.study is not None:
            self._show_state("the design or the draw changed: the figures below are of an earlier design until the "
                            "study runs again", stale=True)
        self.job.schedule()

    # ------------------------------------------------------------------ running
    def run(self) -> None:
        """Run the study of the current design (a running one is cancelled)."""
        key = self._key()
        if key is None:
            return
        project, samples, seed = self.project, key[1], key[2]

        def work(report, stop):
            design = design_from_project(project)
            study = run_study(project, samples, seed, report, design=design)
            return study, None if stop.is_set() else speed_band(design, study)

        self.job.start(key, work)
        self._show_state(f"drawing and evaluating {samples:,} motors…", stale=self.study is not None)

    def current_study(self):
        """The study shown, if it is of the current design and draw (not stale); else None."""
        key = self._key()
        return self.study if key is not None and key == self._shown_key else None

    def _show_state(self, text: str, stale: bool = False, error: bool = False) -> None:
        self.controls.show_state(text, stale, error)
        if self.study is not None:
            self.histograms.setEnabled(not stale)
            self.headline.setStyleSheet("padding: 2px 4px; font-size: 11pt;" + (" color: #888;" if stale else ""))

    def _on_progress(self, done: int, total: int) -> None:
        self.progress_bar.setValue(round(100 * done / total))
        self.state_label.setText(f"{done:,} of {total:,} motors evaluated…")

    def _on_failed(self, _key, message: str) -> None:
        self._report_failure(message, stale=self.study is not None)

    def _on_done(self, key, result) -> None:
        study, band = result
        self.study, self.band, self._shown_key = study, band, key
        self._show(study, band)
        self._show_state("up to date" if key == self._key() else "the design changed while the study ran",
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
