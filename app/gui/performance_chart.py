"""The performance chart: speed, current, output power and efficiency against shaft torque.

Four plots share the torque axis, one per quantity so each keeps its own readable axis, in the order
the datasheet prints them; each shows the cold, nominal and hot cases with the rated, best-efficiency
and maximum-power points, marked as on paper (``app.figures``). A vertical cursor follows the mouse
and the readout above the plots gives every case's values at that torque, read from the curves the
core returned.
"""

from __future__ import annotations

import html

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QLabel, QWidget

from pmdc_sizer.app.figures import (
    CASE_POINTS,
    CASES,
    CURVE_QUANTITIES,
    DASH_GLYPHS,
    LINES,
    POINTS,
    REGIONS,
    drive_current_limit,
    figure,
)
from pmdc_sizer.app.figures import torque_unit as design_torque_unit
from pmdc_sizer.app.performance_view import axis_top, torque_end
from pmdc_sizer.core.units import from_si

from .display_units import DisplayUnits
from .style import black_axes, flush_column, line_pen, mark_style

#: (attribute of CurveData and PointResult, title, unit), in the order of the plots.
QUANTITIES = tuple((name, figure(f"curve.{name}").title, figure(f"curve.{name}").unit) for name in CURVE_QUANTITIES)
TORQUE = figure("curve.torque_N_m")


def _key_html(with_drive_limit: bool = True) -> str:
    """The chart's key, from the same table as its marks; the drive limit's entries only where it is drawn."""
    cases = "".join(f"<span style='color:{style.colour}'>{DASH_GLYPHS[style.dash]} {style.title}</span>"
                    "&nbsp;&nbsp;&nbsp;" for style in CASES.values())
    marks = "&nbsp;&nbsp;&nbsp;".join(f"{POINTS[p].glyph} {POINTS[p].title}" for p in CASE_POINTS)
    required, rated, limit = POINTS["required"], LINES["rated_torque"], LINES["drive_limit"]
    drive_limit = (f"&nbsp;&nbsp;&nbsp;<span style='color:{limit.colour}'>{DASH_GLYPHS[limit.dash]} {limit.title} "
                   "(its torque: nominal case)</span>"
                   f"&nbsp;&nbsp;&nbsp;<span style='background:{REGIONS['beyond_limit'].swatch}'>&nbsp;&nbsp;&nbsp;"
                   f"</span> {REGIONS['beyond_limit'].title}")
    return (cases + "&nbsp;&nbsp;" + marks
            + f"&nbsp;&nbsp;&nbsp;<span style='color:{required.colour}'><b>{required.glyph}</b> {required.title}</span>"
            f"&nbsp;&nbsp;&nbsp;<span style='color:{rated.colour}'>{DASH_GLYPHS[rated.dash]} {rated.title}</span>"
            + (drive_limit if with_drive_limit else ""))


def _rgba(colour: str, opacity: float) -> tuple[int, int, int, int]:
    return int(colour[1:3], 16), int(colour[3:5], 16), int(colour[5:7], 16), round(255 * opacity)


class PerformanceChart(QWidget):
    def __init__(self, display: DisplayUnits):
        super().__init__()
        self.display = display
        layout = flush_column(self)
        self.readout = QLabel("Move the pointer over the curves to read every case at one torque.")
        self.readout.setObjectName("cursor_readout")
        self.readout.setTextFormat(Qt.TextFormat.RichText)
        self.readout.setStyleSheet("font-size: 12px; padding: 2px 4px;")
        self.readout.setMinimumHeight(78)
        layout.addWidget(self.readout)
        self.canvas = pg.GraphicsLayoutWidget()
        self.canvas.setBackground("w")
        self.canvas.setObjectName("performance_plots")
        layout.addWidget(self.canvas, 1)
        self.plots: dict[str, pg.PlotItem] = {}
        self.curves: dict[tuple[str, str], pg.PlotCurveItem] = {}
        self.marks: dict[str, pg.ScatterPlotItem] = {}  #: per quantity: every case's named points
        self.cursors: list[pg.InfiniteLine] = []
        self.rated_lines: list[pg.InfiniteLine] = []
        self.limit_lines: list[pg.InfiniteLine] = []  # torque at the drive's current limit, when it has one
        self.beyond_limit: list[pg.LinearRegionItem] = []  # torques the drive never lets the motor reach
        limit_style = LINES["drive_limit"]
        first = None
        for index, (attribute, title, unit) in enumerate(QUANTITIES):
            plot = self.canvas.addPlot(row=index // 2, col=index % 2)
            plot.showGrid(x=True, y=True, alpha=0.25)
            plot.setLabel("left", title, units=unit)
            black_axes(plot)
            plot.setMenuEnabled(False)
            if first is None:
                first = plot
            else:
                plot.setXLink(first)
            # Plain curve and scatter items (not PlotDataItem): every edit redraws them, so they must be light.
            for case, style in CASES.items():
                curve = pg.PlotCurveItem(pen=line_pen(style.colour, style.dash, 2.2), skipFiniteCheck=True)
                plot.addItem(curve)
                self.curves[(attribute, case)] = curve
            marks = pg.ScatterPlotItem()
            plot.addItem(marks)
            self.marks[attribute] = marks
            rated_style = LINES["rated_torque"]
            rated = pg.InfiniteLine(angle=90, pen=line_pen(rated_style.colour, rated_style.dash, 1.0))
            plot.addItem(rated, ignoreBounds=True)
            self.rated_lines.append(rated)
            limit = pg.InfiniteLine(angle=90, pen=line_pen(limit_style.colour, limit_style.dash, 1.6))
            limit.hide()
            plot.addItem(limit, ignoreBounds=True)
            self.limit_lines.append(limit)
            shade = REGIONS["beyond_limit"]
            beyond = pg.LinearRegionItem(values=(0.0, 1.0), movable=False, pen=pg.mkPen(None),
                                         brush=pg.mkBrush(_rgba(shade.colour, shade.opacity)))
            beyond.setZValue(-10)
            beyond.hide()
            plot.addItem(beyond, ignoreBounds=True)
            self.beyond_limit.append(beyond)
            cursor = pg.InfiniteLine(angle=90, pen=pg.mkPen("#000", width=1))
            cursor.hide()
            plot.addItem(cursor, ignoreBounds=True)
            self.cursors.append(cursor)
            self.plots[attribute] = plot
        # Above this line the current plot's curves are out of the drive's reach (drawn so on paper too).
        self.limit_current_line = pg.InfiniteLine(angle=0, pen=line_pen(limit_style.colour, limit_style.dash, 1.6))
        self.limit_current_line.hide()
        self.plots["current_A"].addItem(self.limit_current_line, ignoreBounds=True)
        self.required_mark = pg.ScatterPlotItem(**mark_style("required"))
        self.plots["speed_rad_per_s"].addItem(self.required_mark)
        self._x_range: tuple[float, ...] | None = None  #: the default view shown last: torque end, then tops
        self.key = QLabel(_key_html())
        self.key.setObjectName("performance_key")
        self.key.setWordWrap(True)
        self.key.setStyleSheet("padding: 2px 4px;")
        layout.insertWidget(1, self.key)
        self._results = None
        self.canvas.scene().sigMouseMoved.connect(self._on_mouse_moved)
        self._labelled_unit = None
        self.set_torque_unit()

    @property
    def torque_unit(self) -> str:
        """The torque axis's unit on screen: the design's (mN·m, N·m for big motors) in the display units."""
        unit = design_torque_unit(self._results) if self._results is not None else TORQUE.unit
        return self.display.screen_unit(unit)

    def set_torque_unit(self) -> None:
        if self._labelled_unit == self.torque_unit:
            return  # relabelling relays out all four plots
        self._labelled_unit = self.torque_unit
        for plot in self.plots.values():
            plot.setLabel("bottom", TORQUE.title, units=self.torque_unit)

    def _to_screen(self, attribute: str, values):
        unit = figure(f"curve.{attribute}").unit
        return from_si(np.asarray(values, dtype=float), unit)

    def show_results(self, results) -> None:
        self._results = results
        self.set_torque_unit()
        torque_unit = self.torque_unit
        for attribute, _title, _unit in QUANTITIES:
            spots = []
            for case in results.cases:
                torque = from_si(case.curve.torque_N_m, torque_unit)
                values = self._to_screen(attribute, getattr(case.curve, attribute))
                self.curves[(attribute, case.name)].setData(torque, values)
                for point, field in CASE_POINTS.items():
                    if point == "rated" and not case.rated_reached:
                        continue  # the motor stalls before the rated torque: there is no rated point
                    at = getattr(case, field)
                    spots.append({"pos": (from_si(at.torque_N_m, torque_unit),
                                          float(self._to_screen(attribute, getattr(at, attribute)))),
                                  "data": (point, case.name), **mark_style(point, CASES[case.name].colour)})
            self.marks[attribute].setData(spots)
        load_torque = from_si(results.load_torque_N_m, torque_unit)
        for line in self.rated_lines:
            line.setValue(load_torque)
        self.required_mark.setData([load_torque], [from_si(results.load_speed_rad_per_s, "rpm")])
        limit_torque = results.nominal.current_limit_torque_N_m
        self.key.setText(_key_html(with_drive_limit=limit_torque is not None))
        highest_stall = max(from_si(c.stall_torque_N_m, torque_unit) for c in results.cases)
        for line, beyond in zip(self.limit_lines, self.beyond_limit, strict=True):
            if limit_torque is None:
                line.hide()
                beyond.hide()
            else:
                line.setValue(from_si(limit_torque, torque_unit))
                beyond.setRegion((from_si(limit_torque, torque_unit), 1.05 * highest_stall))
                line.show()
                beyond.show()
        limit_current = drive_current_limit(results)
        self.limit_current_line.setVisible(limit_current is not None)
        if limit_current is not None:
            self.limit_current_line.setValue(limit_current)
        # The default view, as on paper (app.performance_view): with a drive limit the torques end a little past
        # it and each axis is as tall as its curves there, not as the unlimited stall; else up to the stall.
        torque_to = 1.02 * torque_end(results)
        view = (from_si(torque_to, torque_unit),
                *(float(self._to_screen(name, axis_top(results, name, torque_to))) for name, _t, _u in QUANTITIES))
        if self._x_range is None or any(abs(a - b) > 1e-3 * abs(b) for a, b in zip(self._x_range, view, strict=True)):
            self._x_range = view
            self.plots["speed_rad_per_s"].setXRange(0.0, view[0], padding=0.0)  # the other plots are linked
            for (name, _title, _unit), top in zip(QUANTITIES, view[1:], strict=True):
                self.plots[name].setYRange(0.0, top, padding=0.0)
        if self.cursors[0].isVisible():
            self.show_cursor(self.cursors[0].value())

    def marked_points(self, attribute: str) -> list[tuple[float, float]]:
        """The drawn rated, best-efficiency and maximum-power points of one quantity (screen units)."""
        x, y = self.marks[attribute].getData()
        return list(zip(map(float, x), map(float, y), strict=True))

    def clear(self) -> None:
        self._results = None
        for item in list(self.curves.values()) + list(self.marks.values()):
            item.setData([], [])
        self.limit_current_line.hide()
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
        header = f"At {TORQUE.number(torque_on_screen, '1')} {unit}"
        # a table in the window's own font: the columns line up without a fixed-pitch font
        cell = "<td align='right' style='padding-left: 18px; color:{colour}'>{text}</td>"
        rows = [f"<tr><td><b>{html.escape(header)}</b></td>" + "".join(
            cell.format(colour=CASES[c.name].colour, text=html.escape(f"{c.name} ({c.ambient_C:.0f} °C)"))
            for c in self._results.cases) + "</tr>"]
        for attribute, title, quantity_unit in QUANTITIES:
            cells = []
            for case in self._results.cases:
                torque = from_si(case.curve.torque_N_m, unit)
                if torque_on_screen < 0 or torque_on_screen > torque[-1]:
                    cells.append(cell.format(colour="#555555", text="beyond stall"))
                    continue
                value = float(np.interp(torque_on_screen, torque, getattr(case.curve, attribute)))
                text = figure(f"curve.{attribute}").text(value, quantity_unit)
                cells.append(cell.format(colour=CASES[case.name].colour, text=html.escape(text)))
            rows.append(f"<tr><td>{html.escape(title)}</td>" + "".join(cells) + "</tr>")
        self.readout.setText("<table cellspacing='0' cellpadding='0'>" + "".join(rows) + "</table>")
