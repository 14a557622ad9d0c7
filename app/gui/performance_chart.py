"""The performance chart: speed, current, efficiency and output power against shaft torque.

Four stacked plots share the torque axis, one per quantity so each keeps its own readable axis; each
shows the cold, nominal and hot cases with the rated, maximum-efficiency and maximum-power points. A
vertical cursor follows the mouse and the readout above the plots gives every case's values at that
torque, read from the curves the core returned.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QLabel, QVBoxLayout, QWidget

from pmdc_sizer.app.formatting import significant
from pmdc_sizer.core.units import from_si

from .display_units import DisplayUnits
from .style import CASE_COLOURS, LIMIT_COLOUR

# (attribute of CurveData and PointResult, title, unit)
QUANTITIES = (
    ("speed_rad_per_s", "Speed", "rpm"),
    ("current_A", "Current", "A"),
    ("efficiency", "Efficiency", "%"),
    ("output_power_W", "Output power", "W"),
)
MARKS = (("rated", "star", 15, "rated point"), ("max_efficiency_point", "d", 12, "maximum efficiency"),
         ("max_power_point", "s", 10, "maximum output power"))


class PerformanceChart(QWidget):
    def __init__(self, display: DisplayUnits):
        super().__init__()
        self.display = display
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        self.readout = QLabel("Move the pointer over the curves to read every case at one torque.")
        self.readout.setObjectName("cursor_readout")
        self.readout.setTextFormat(Qt.TextFormat.RichText)
        self.readout.setStyleSheet("font-family: monospace; font-size: 12px; padding: 2px 4px;")
        self.readout.setMinimumHeight(78)
        layout.addWidget(self.readout)
        self.canvas = pg.GraphicsLayoutWidget()
        self.canvas.setBackground("w")
        self.canvas.setObjectName("performance_plots")
        layout.addWidget(self.canvas, 1)
        self.plots: dict[str, pg.PlotItem] = {}
        self.curves: dict[tuple[str, str], pg.PlotCurveItem] = {}
        self.marks: dict[str, pg.ScatterPlotItem] = {}  #: per quantity: every case's marked points
        self.cursors: list[pg.InfiniteLine] = []
        self.rated_lines: list[pg.InfiniteLine] = []
        self.limit_lines: list[pg.InfiniteLine] = []  # torque at the drive's current limit, when it has one
        first = None
        for index, (attribute, title, unit) in enumerate(QUANTITIES):
            plot = self.canvas.addPlot(row=index // 2, col=index % 2)
            plot.showGrid(x=True, y=True, alpha=0.25)
            plot.setLabel("left", title, units=unit)
            for axis in ("left", "bottom"):
                plot.getAxis(axis).enableAutoSIPrefix(False)
                plot.getAxis(axis).setTextPen("k")
                plot.getAxis(axis).setPen("k")
                # Grid lines at the labelled ticks only: the finer levels cost most of a frame to paint.
                plot.getAxis(axis).setStyle(maxTickLevel=0)
            plot.setMenuEnabled(False)
            if first is None:
                first = plot
            else:
                plot.setXLink(first)
            # Plain curve and scatter items (not PlotDataItem): every edit redraws them, so they must be light.
            for case, colour in CASE_COLOURS.items():
                curve = pg.PlotCurveItem(pen=pg.mkPen(colour, width=2.2), skipFiniteCheck=True)
                plot.addItem(curve)
                self.curves[(attribute, case)] = curve
            marks = pg.ScatterPlotItem(pen=pg.mkPen("w", width=1))
            plot.addItem(marks)
            self.marks[attribute] = marks
            rated = pg.InfiniteLine(angle=90, pen=pg.mkPen("#777", width=1, style=Qt.PenStyle.DashLine))
            plot.addItem(rated, ignoreBounds=True)
            self.rated_lines.append(rated)
            limit = pg.InfiniteLine(angle=90, pen=pg.mkPen(LIMIT_COLOUR, width=1.4, style=Qt.PenStyle.DashDotLine))
            limit.hide()
            plot.addItem(limit, ignoreBounds=True)
            self.limit_lines.append(limit)
            cursor = pg.InfiniteLine(angle=90, pen=pg.mkPen("#000", width=1))
            cursor.hide()
            plot.addItem(cursor, ignoreBounds=True)
            self.cursors.append(cursor)
            self.plots[attribute] = plot
        self.required_mark = pg.ScatterPlotItem(symbol="+", size=22, pen=pg.mkPen("#000", width=2.5), brush=None)
        self.plots["speed_rad_per_s"].addItem(self.required_mark)
        self._brushes = {name: pg.mkBrush(colour) for name, colour in CASE_COLOURS.items()}
        self._x_range = None
        self.key = QLabel(
            "".join(f"<span style='color:{colour}'>━━ {case}</span>&nbsp;&nbsp;&nbsp;" for case, colour in CASE_COLOURS.items())
            + "&nbsp;&nbsp;★ rated point&nbsp;&nbsp;&nbsp;◆ maximum efficiency&nbsp;&nbsp;&nbsp;■ maximum output power"
            "&nbsp;&nbsp;&nbsp;<b>+</b> required: rated torque at this speed or faster&nbsp;&nbsp;&nbsp;"
            "<span style='color:#777'>┆ rated torque</span>&nbsp;&nbsp;&nbsp;"
            f"<span style='color:{LIMIT_COLOUR}'>┆ drive current limit (nominal case)</span>")
        self.key.setObjectName("performance_key")
        self.key.setWordWrap(True)
        self.key.setStyleSheet("padding: 2px 4px;")
        layout.insertWidget(1, self.key)
        self._results = None
        self.canvas.scene().sigMouseMoved.connect(self._on_mouse_moved)
        self.set_torque_unit()

    @property
    def torque_unit(self) -> str:
        return self.display.screen_unit("mN·m")

    def set_torque_unit(self) -> None:
        if getattr(self, "_labelled_unit", None) == self.torque_unit:
            return  # relabelling relays out all four plots
        self._labelled_unit = self.torque_unit
        for plot in self.plots.values():
            plot.setLabel("bottom", "Shaft torque", units=self.torque_unit)

    def _to_screen(self, attribute: str, values):
        unit = dict((a, u) for a, _t, u in QUANTITIES)[attribute]
        return from_si(np.asarray(values, dtype=float), unit)

    def show_results(self, results) -> None:
        self._results = results
        self.set_torque_unit()
        torque_unit = self.torque_unit
        brushes = self._brushes
        for attribute, _title, _unit in QUANTITIES:
            xs, ys, symbols, sizes, case_brushes = [], [], [], [], []
            for case in results.cases:
                torque = from_si(case.curve.torque_N_m, torque_unit)
                self.curves[(attribute, case.name)].setData(torque, self._to_screen(attribute, getattr(case.curve, attribute)))
                for mark, symbol, size, _label in MARKS:
                    if mark == "rated" and not case.rated_reached:
                        continue  # the motor stalls before the rated torque: there is no rated point
                    point = getattr(case, mark)
                    xs.append(from_si(point.torque_N_m, torque_unit))
                    ys.append(float(self._to_screen(attribute, getattr(point, attribute))))
                    symbols.append(symbol)
                    sizes.append(size)
                    case_brushes.append(brushes[case.name])
            self.marks[attribute].setData(xs, ys, symbol=symbols, size=sizes, brush=case_brushes)
        load_torque = from_si(results.load_torque_N_m, torque_unit)
        for line in self.rated_lines:
            line.setValue(load_torque)
        self.required_mark.setData([load_torque], [from_si(results.load_speed_rad_per_s, "rpm")])
        limit_torque = results.nominal.current_limit_torque_N_m
        for line in self.limit_lines:
            if limit_torque is None:
                line.hide()
            else:
                line.setValue(from_si(limit_torque, torque_unit))
                line.show()
        highest_stall = max(from_si(c.stall_torque_N_m, torque_unit) for c in results.cases)
        x_range = (0.0, highest_stall * 1.02)
        if self._x_range is None or abs(self._x_range[1] - x_range[1]) > 1e-3 * x_range[1]:
            self._x_range = x_range
            self.plots["speed_rad_per_s"].setXRange(*x_range, padding=0.0)  # the other plots are linked
        if self.cursors[0].isVisible():
            self.show_cursor(self.cursors[0].value())

    def marked_points(self, attribute: str) -> list[tuple[float, float]]:
        """The drawn rated, maximum-efficiency and maximum-power points of one quantity (screen units)."""
        x, y = self.marks[attribute].getData()
        return list(zip(map(float, x), map(float, y)))

    def clear(self) -> None:
        self._results = None
        for item in list(self.curves.values()) + list(self.marks.values()):
            item.setData([], [])
        self._x_range = None
        self.readout.setText("No curves: the design has no solution (see the status line).")

    def _on_mouse_moved(self, position) -> None:
        for plot in self.plots.values():
            if plot.sceneBoundingRect().contains(position):
                self.show_cursor(plot.vb.mapSceneToView(position).x())
                return

    def show_cursor(self, torque_on_screen: float) -> None:
        """Put the cursor at a torque (screen unit) and read every case there."""
        for cursor in self.cursors:
            cursor.setValue(torque_on_screen)
            cursor.show()
        if self._results is None:
            return
        unit = self.torque_unit
        header = f"At {significant(torque_on_screen, 3)} {unit}"
        rows = [f"<b>{header:<24}</b>" + "".join(
            f"<span style='color:{CASE_COLOURS[c.name]}'>{c.name + f' ({c.ambient_C:.0f} °C)':>22}</span>"
            for c in self._results.cases)]
        for attribute, title, quantity_unit in QUANTITIES:
            cells = []
            for case in self._results.cases:
                torque = from_si(case.curve.torque_N_m, unit)
                if torque_on_screen < 0 or torque_on_screen > torque[-1]:
                    cells.append(f"{'beyond stall':>22}")
                    continue
                value = float(np.interp(torque_on_screen, torque, self._to_screen(attribute, getattr(case.curve, attribute))))
                cells.append(f"<span style='color:{CASE_COLOURS[case.name]}'>{significant(value, 3) + ' ' + quantity_unit:>22}</span>")
            rows.append(f"{title:<24}" + "".join(cells))
        self.readout.setText("<pre style='margin:0'>" + "\n".join(rows) + "</pre>")
