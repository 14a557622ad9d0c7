"""The duty chart on screen: winding, magnet and housing temperatures against time over the duty.

It draws what :func:`app.thermal_text.duty_plot` takes from the results' transient, the same numbers as
the datasheet's chart: the three temperatures from ambient at the rated load and the highest ambient,
the insulation class limit and the magnet grade's maximum working temperature as lines, the S2 run or
the S3 loaded spells shaded, and, where the duty has no steady state, the moment the winding reaches
its class limit, marked and said in words below the plot. Titles, colours and dashes from
``app.figures``. The page follows the main window's results (``results_ready``).
"""

from __future__ import annotations

import pyqtgraph as pg
from PySide6.QtWidgets import QVBoxLayout, QWidget

from pmdc_sizer.app.figures import DASH_GLYPHS, LINES, POINTS, REGIONS, figure
from pmdc_sizer.app.thermal_text import chart_notes, chart_title, duty_plot, limit_reached_at, temperature_label

from .display_units import DisplayUnits
from .style import black_axes, line_pen, mark_style, wrapped_label

CURVES = ("housing_temperature", "magnet_temperature", "winding_temperature")  #: drawing order: winding on top
LIMITS = ("insulation_limit", "magnet_limit")


def _sample(line: str, text: str = "") -> str:
    style = LINES[line]
    return f"<span style='color:{style.colour}'>{DASH_GLYPHS[style.dash]} {text or style.title}</span>"


class ThermalChart(QWidget):
    """Temperatures over the duty; ``main_window`` gives ``display``, ``current_results`` and ``results_ready``."""

    def __init__(self, main_window=None, display: DisplayUnits | None = None):
        super().__init__()
        self.setObjectName("thermal_chart")
        self.display = display or getattr(main_window, "display", None) or DisplayUnits()
        layout = QVBoxLayout(self)
        layout.setContentsMargins(4, 4, 4, 4)
        self.title = wrapped_label("thermal_title", "font-weight: bold; padding: 2px 4px;",
                                   "Temperatures over the duty")
        layout.addWidget(self.title)
        self.key = wrapped_label("thermal_key", "padding: 2px 4px;", rich=True)
        layout.addWidget(self.key)
        self.canvas = pg.PlotWidget(background="w")
        self.canvas.setObjectName("thermal_plot")
        self.plot = self.canvas.getPlotItem()
        self.plot.showGrid(x=True, y=True, alpha=0.25)
        self.plot.setMenuEnabled(False)
        black_axes(self.plot)
        time = figure("thermal.transient.time_s")
        self.plot.setLabel("bottom", time.title, units=time.unit)
        layout.addWidget(self.canvas, 1)
        self.notes = wrapped_label("thermal_notes", "padding: 4px;")
        layout.addWidget(self.notes)
        self.curves: dict[str, pg.PlotCurveItem] = {}
        for line in CURVES:
            style = LINES[line]
            curve = pg.PlotCurveItem(pen=line_pen(style.colour, style.dash, 2.6 if line == "winding_temperature"
                                                  else 2.0))
            self.plot.addItem(curve)
            self.curves[line] = curve
        self.limit_lines: dict[str, pg.InfiniteLine] = {}
        # The class limit's label above its line at the left, the grade's below its line at the right: they
        # stay apart where the two limits coincide.
        for line, position, anchor in zip(LIMITS, (0.02, 0.98), ((0, 1), (1, 0)), strict=True):
            style = LINES[line]
            limit = pg.InfiniteLine(angle=0, pen=line_pen(style.colour, style.dash, 1.4), movable=False,
                                    label="", labelOpts={"position": position, "color": style.colour,
                                                         "anchors": [anchor, anchor]})
            self.plot.addItem(limit, ignoreBounds=True)
            self.limit_lines[line] = limit
        self.spells: list[pg.LinearRegionItem] = []  #: the S2 run or the S3 loaded spells
        self.limit_mark = pg.ScatterPlotItem(**mark_style("class_limit_reached"))
        self.plot.addItem(self.limit_mark)
        self._unit = ""
        self._results = None
        if main_window is not None and hasattr(main_window, "results_ready"):
            main_window.results_ready.connect(lambda _project, results: self.show_results(results))
            if getattr(main_window, "evaluator", None) is not None:
                main_window.evaluator.failed.connect(lambda _project, _message: self.clear())
        if getattr(main_window, "current_results", None) is not None:
            self.show_results(main_window.current_results)

    @property
    def temperature_unit(self) -> str:
        return self.display.screen_unit("°C")

    def show_results(self, results) -> None:
        self._results = results
        t, unit = results.thermal, self.temperature_unit
        if unit != self._unit:
            self._unit = unit
            self.plot.setLabel("left", temperature_label(unit))
        plot = duty_plot(t, unit)
        self.title.setText(chart_title(t, unit))
        if plot is None:
            self.clear("No temperatures against time in these results.")
            return
        for line, curve in self.curves.items():
            curve.setData(plot.time, plot.curves[line])
        limit_words = {"insulation_limit": f"class {t.insulation_class}",
                       "magnet_limit": results.magnet.name}
        for line, item in self.limit_lines.items():
            item.setValue(plot.limits[line])
            item.label.setFormat(f"{limit_words[line]}: "
                                 f"{figure('thermal.insulation_limit_C').text(plot.limits[line], unit)}")
            item.show()
        self._show_spells(plot.spells)
        if plot.limit_reached is None:
            self.limit_mark.setData([], [])
        else:
            self.limit_mark.setData([plot.limit_reached[0]], [plot.limit_reached[1]])
        self.key.setText(self._key_html(results))
        self.notes.setText(" ".join(chart_notes(t, unit)))
        self.plot.setXRange(0.0, float(plot.time[-1]), padding=0.0)
        self.plot.setYRange(*plot.temperature_range, padding=0.0)

    def _show_spells(self, spells) -> None:
        shade = pg.mkColor(REGIONS["loaded"].colour)
        shade.setAlphaF(REGIONS["loaded"].opacity)
        while len(self.spells) < len(spells):
            region = pg.LinearRegionItem(values=(0.0, 1.0), movable=False, pen=pg.mkPen(None),
                                         brush=pg.mkBrush(shade))
            region.setZValue(-10)
            self.plot.addItem(region, ignoreBounds=True)
            self.spells.append(region)
        for index, region in enumerate(self.spells):
            if index < len(spells):
                region.setRegion(spells[index])
                region.show()
            else:
                region.hide()

    def _key_html(self, results) -> str:
        parts = [_sample(line) for line in reversed(CURVES)]
        if results.thermal.duty != "S1":
            shade = REGIONS["loaded"]
            parts.append(f"<span style='background:{shade.swatch}'>&nbsp;&nbsp;&nbsp;</span> {shade.title}")
        parts += [_sample(line) for line in LIMITS]
        if limit_reached_at(results.thermal) is not None:
            point = POINTS["class_limit_reached"]
            parts.append(f"<span style='color:{point.colour}'>{point.glyph} {point.title}</span>")
        return "&nbsp;&nbsp;&nbsp;".join(parts)

    def shown_curves(self) -> dict[str, tuple[list[float], list[float]]]:
        """What each temperature curve draws (screen units), for checks."""
        out = {}
        for line, curve in self.curves.items():
            x, y = curve.getData()
            out[line] = ([] if x is None else list(map(float, x)), [] if y is None else list(map(float, y)))
        return out

    def shown_spells(self) -> list[tuple[float, float]]:
        return [tuple(map(float, region.getRegion())) for region in self.spells if region.isVisible()]

    def clear(self, message: str = "No temperatures: the design has no solution (see the status line).") -> None:
        self._results = None
        for curve in self.curves.values():
            curve.setData([], [])
        for line in self.limit_lines.values():
            line.hide()
        self._show_spells([])
        self.limit_mark.setData([], [])
        self.notes.setText(message)


__all__ = ["ThermalChart"]
