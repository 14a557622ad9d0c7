"""The magnet operating chart: where the magnet works on its demagnetization curves, and how close each
demagnetization case comes to the knee.

Draws what ``Results.magnet_chart`` and ``Results.demagnetization`` hold: the normal B(H) and intrinsic
J(H) curves at the cold, nominal and hot magnet temperatures, their knees, the load line through each
no-load operating point, and every demagnetization case's point. A table under the chart lists the
cases with their margins, the worst first.
"""

from __future__ import annotations

import textwrap

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtGui import QBrush, QColor, QFont
from PySide6.QtWidgets import QHeaderView, QLabel, QSplitter, QTableWidget, QTableWidgetItem, QVBoxLayout, QWidget

from pmdc_sizer.app.figures import (
    CASES,
    DEMAGNETIZATION_STATES,
    LABELS,
    LINES,
    POINTS,
    STATUSES,
    WARNING_COLOUR,
    demagnetization_case_colour,
    demagnetization_point,
    figure,
    text_of,
)
from pmdc_sizer.core.units import from_si

from .style import line_pen, mark_style

FIELD = figure("magnet_chart_case.curves.field_strength")
FIELD_UNIT = FIELD.unit
#: The colour of a legend's sample for marks that take their case's colour (as on paper).
SAMPLE_COLOUR = "#5b6470"
SAFE_COLOUR, PAST_KNEE_COLOUR = STATUSES["pass"].colour, STATUSES["fail"].colour


def _header(title: str, unit: str = "") -> str:
    """A column header in short lines, so the table's columns stay narrow."""
    return "\n".join(textwrap.wrap(title, 12) + ([f"[{unit}]"] if unit else []))


def _scatter_of(point: str) -> pg.ScatterPlotItem:
    """A scatter item whose own style (the legend's sample) is the named point's, in the sample colour."""
    return pg.ScatterPlotItem(**mark_style(point, SAMPLE_COLOUR))


class MagnetChart(QWidget):
    def __init__(self):
        super().__init__()
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        self.headline = QLabel()
        self.headline.setObjectName("magnet_headline")
        self.headline.setWordWrap(True)
        self.headline.setStyleSheet("font-size: 13px; padding: 2px 4px;")
        layout.addWidget(self.headline)
        splitter = QSplitter(Qt.Orientation.Vertical)
        layout.addWidget(splitter, 1)
        self.plot = pg.PlotWidget(background="w")
        self.plot.setObjectName("magnet_plot")
        item = self.plot.getPlotItem()
        item.showGrid(x=True, y=True, alpha=0.25)
        item.setLabel("bottom", f"{FIELD.title} in the magnet", units=FIELD_UNIT)
        density = figure("magnet_chart_case.curves.flux_density")
        item.setLabel("left", f"{density.title} (B solid, J dashed)", units=density.unit)
        for axis in ("bottom", "left"):
            item.getAxis(axis).enableAutoSIPrefix(False)
            item.getAxis(axis).setTextPen("k")
            item.getAxis(axis).setPen("k")
            # Grid lines at the labelled ticks only: the finer levels cost most of a frame to paint.
            item.getAxis(axis).setStyle(maxTickLevel=0)
        self.legend = item.addLegend(offset=(10, 10), labelTextColor="k", brush=pg.mkBrush(255, 255, 255, 220))
        # Plain curve and scatter items (not PlotDataItem): every edit redraws them, so they must be light.
        self.normal_curves, self.intrinsic_curves, self.load_lines = {}, {}, {}
        load_dash = LINES["load_line"].dash
        for name, style in CASES.items():
            self.normal_curves[name] = self._curve(item, line_pen(style.colour, "solid", 2.4))
            self.legend.addItem(self.normal_curves[name], name)
            self.intrinsic_curves[name] = self._curve(item, line_pen(style.colour, "dash", 1.6))
            self.load_lines[name] = self._curve(item, line_pen(style.colour, load_dash, 1.3))
        # Every named point in its own item, styled per spot from app.figures as the datasheet's chart is.
        self.operating_item = self._add(item, _scatter_of("operating_point"))
        self.knee_item = self._add(item, _scatter_of("knee"))
        self.legend.addItem(self.knee_item, f"{POINTS['knee'].title} (on B and J)")
        self.legend.addItem(self.operating_item, f"{POINTS['operating_point'].title} (dotted)")
        self.safe_item = self._add(item, _scatter_of("demagnetization_safe"))
        self.legend.addItem(self.safe_item, POINTS["demagnetization_safe"].title)
        self.failed_item = self._add(item, _scatter_of("demagnetization_fails"))
        self.legend.addItem(self.failed_item, POINTS["demagnetization_fails"].title)
        self.legend.setColumnCount(2)
        self._legend_texts: dict[str, str] = {}
        self._failed_background = QBrush(QColor(STATUSES["fail"].shade))
        self._failed_foreground = QBrush(QColor(PAST_KNEE_COLOUR))
        self.case_labels: list[pg.TextItem] = []
        splitter.addWidget(self.plot)
        self.table = QTableWidget(0, 7)
        self.table.setObjectName("demagnetization_table")
        self.table.setHorizontalHeaderLabels(
            ["Demagnetization case"]
            + [_header(figure(f"demagnetization_case.{name}").title) for name in ("temperature_C", "current_A")]
            + [_header(figure(f"demagnetization_case.{name}").title, FIELD_UNIT)
               for name in ("magnet_field_A_per_m", "knee_field_A_per_m", "margin_A_per_m")]
            + [LABELS["demagnetization_case.status"]])
        self.table.verticalHeader().hide()
        self.table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        # Column widths are measured once, on the first results: measuring every cell on every edit
        # (ResizeToContents) costs more than drawing the chart.
        self.table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        self.table.verticalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Fixed)
        self.table.verticalHeader().setDefaultSectionSize(2 * self.table.fontMetrics().height() + 6)
        self.table.setWordWrap(True)  # a long case name wraps onto a second line rather than being cut
        self.table.setTextElideMode(Qt.TextElideMode.ElideNone)
        self._columns_sized = False
        splitter.addWidget(self.table)
        splitter.setSizes([640, 200])

    LEGEND_TWO_COLUMNS_FROM_PX = 860  #: narrower plots get a one-column legend, which then is not cut off

    def resizeEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().resizeEvent(event)
        columns = 2 if self.plot.width() >= self.LEGEND_TWO_COLUMNS_FROM_PX else 1
        if self.legend.columnCount != columns:
            self.legend.setColumnCount(columns)
            # A one-column legend is tall: at the bottom left it covers only the steep part of the intrinsic
            # curves, not the knees and Br near the top.
            corner = (0, 0) if columns == 2 else (0, 1)
            self.legend.anchor(itemPos=corner, parentPos=corner, offset=(10, 10) if columns == 2 else (10, -10))
            # See-through when it sits over the plot's lower left, so marks and case labels there still show.
            self.legend.setBrush(pg.mkBrush(255, 255, 255, 220 if columns == 2 else 150))

    @staticmethod
    def _curve(plot_item, pen) -> pg.PlotCurveItem:
        curve = pg.PlotCurveItem(pen=pen, skipFiniteCheck=True)
        plot_item.addItem(curve)
        return curve

    @staticmethod
    def _add(plot_item, scatter: pg.ScatterPlotItem) -> pg.ScatterPlotItem:
        plot_item.addItem(scatter)
        return scatter

    def operating_points(self) -> dict[str, tuple[float, float]]:
        """The drawn no-load operating points, (H [kA/m], B [T]) by case name."""
        return {spot.data()[1]: (float(spot.pos().x()), float(spot.pos().y())) for spot in self.operating_item.points()}

    def show_results(self, results) -> None:
        chart = results.magnet_chart
        knees, operating = [], []
        for case in chart:
            colour = CASES[case.name].colour
            c = case.curves
            h = from_si(c.field_strength, FIELD_UNIT)
            self.normal_curves[case.name].setData(h, c.flux_density)
            self.intrinsic_curves[case.name].setData(h, c.polarization)
            knee_h = from_si(c.knee_field, FIELD_UNIT)
            knee_style = mark_style("knee", colour)
            for knee_b in (c.knee_flux_density, float(np.interp(c.knee_field, c.field_strength, c.polarization))):
                knees.append({"pos": (knee_h, knee_b), "data": ("knee", case.name), **knee_style})
            op_h, op_b = from_si(case.operating_field_A_per_m, FIELD_UNIT), case.operating_flux_density_T
            reach = c.remanence / op_b if op_b > 0 else 1.0
            self.load_lines[case.name].setData([0.0, op_h * reach], [0.0, op_b * reach])
            operating.append({"pos": (op_h, op_b), "data": ("operating_point", case.name),
                              **mark_style("operating_point", colour)})
            pc = figure("magnet_chart_case.permeance_coefficient").text(case.permeance_coefficient)
            text = f"{case.name}: magnet at {c.temperature_C:.0f} °C, Pc = {pc}"
            if self._legend_texts.get(case.name) != text:  # relaying out the legend costs more than the curves
                self._legend_texts[case.name] = text
                self.legend.getLabel(self.normal_curves[case.name]).setText(text)
        self.operating_item.setData(operating)
        self.knee_item.setData(knees)
        cases = results.demagnetization.cases
        for ok, scatter in ((True, self.safe_item), (False, self.failed_item)):
            scatter.setData([{"pos": (from_si(c.magnet_field_A_per_m, FIELD_UNIT), c.magnet_flux_density_T),
                              "data": (demagnetization_point(c), c.name),
                              **mark_style(demagnetization_point(c), demagnetization_case_colour(c))}
                             for c in cases if c.ok == ok])
        self._label_cases(cases)
        self._fill_table(cases)
        self._headline(results)
        self._fit_view(results)

    def _label_cases(self, cases) -> None:
        """Name the cases past the knee on the chart, or the one with the least margin when none is;
        the table below names them all (labels for every case would pile up)."""
        failed = [c for c in cases if not c.ok]
        named = failed if failed else [min(cases, key=lambda c: c.margin_A_per_m)]
        item = self.plot.getPlotItem()
        while len(self.case_labels) < len(named):
            label = pg.TextItem(anchor=(0, 1.1))
            label.setFont(QFont("Sans", 9))
            item.addItem(label)
            self.case_labels.append(label)
        for index, label in enumerate(self.case_labels):
            if index >= len(named):
                label.hide()
                continue
            case = named[index]
            text = f"{case.name}: past the knee" if not case.ok else f"least margin: {case.name}"
            if label.textItem.toPlainText() != text:
                label.setColor(SAFE_COLOUR if case.ok else PAST_KNEE_COLOUR)
                label.setText(text)
            # Alternate above and below so neighbouring cases stay readable.
            label.setAnchor((0, 1.1) if index % 2 == 0 else (0, -0.1))
            label.setPos(from_si(case.magnet_field_A_per_m, FIELD_UNIT), case.magnet_flux_density_T)
            label.show()

    def _fill_table(self, cases) -> None:
        # Numbered as on the datasheet (in the results' order), listed least margin first.
        number = {id(case): index + 1 for index, case in enumerate(cases)}
        ordered = sorted(cases, key=lambda c: c.margin_A_per_m)
        if self.table.rowCount() != len(ordered):
            self.table.setRowCount(len(ordered))
            self._columns_sized = False
        for row, case in enumerate(ordered):
            cells = (
                f"{number[id(case)]}  {case.name}",
                text_of(case, "demagnetization_case.temperature_C"),
                text_of(case, "demagnetization_case.current_A") if case.current_A else "–",
                *(figure(f"demagnetization_case.{name}").number(getattr(case, name))
                  for name in ("magnet_field_A_per_m", "knee_field_A_per_m", "margin_A_per_m")),
                DEMAGNETIZATION_STATES.get(case.status, "safe" if case.ok else "past the knee").upper()
                if not case.ok else DEMAGNETIZATION_STATES.get(case.status, "safe"),
            )
            for column, text in enumerate(cells):
                cell = self.table.item(row, column)
                if cell is None:
                    cell = QTableWidgetItem()
                    if column:
                        cell.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                    self.table.setItem(row, column, cell)
                if cell.text() != text:
                    cell.setText(text)
                    if column == 0:
                        cell.setToolTip(case.name)  # the whole name, where a narrow window wraps it
                cell.setBackground(self._failed_background if not case.ok else QBrush())
                cell.setForeground(self._failed_foreground if not case.ok else QBrush())
        if not self._columns_sized:
            self.table.resizeColumnsToContents()
            header = self.table.horizontalHeader()
            header.setStretchLastSection(False)
            header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)  # the case name takes what is left
            result_column = self.table.columnCount() - 1
            word = "PAST THE KNEE" if any(not c.ok for c in cases) else "marginal"
            self.table.setColumnWidth(result_column, self.table.fontMetrics().horizontalAdvance(word) + 16)
            self._columns_sized = True

    def _headline(self, results) -> None:
        d = results.demagnetization
        margin = text_of(results, "demagnetization.worst_margin_A_per_m")
        faults = results.faults
        fault_text = "" if faults is None or faults.status == "safe" else (
            f" <span style='color:{PAST_KNEE_COLOUR if faults.status == 'past_knee' else WARNING_COLOUR}'>"
            f"<b>With the supply applied directly</b></span> (a failed drive): {faults.worst_case}, "
            f"{text_of(results, 'faults.worst_margin_A_per_m')} to the knee.")
        if d.ok and d.status == "marginal":
            self.headline.setText(
                f"<span style='color:{WARNING_COLOUR}'><b>Marginal</b></span>: every case stays right of its knee, "
                f"not all by the required margin. Least margin {margin} ({d.worst_case})." + fault_text)
        elif d.ok:
            self.headline.setText(
                f"<span style='color:{SAFE_COLOUR}'><b>No demagnetization</b></span>: every case stays right of its "
                f"knee. Least margin {margin} ({d.worst_case})." + fault_text)
        else:
            failed = sum(not c.ok for c in d.cases)
            self.headline.setText(
                f"<span style='color:{PAST_KNEE_COLOUR}'><b>{failed} case{'s' if failed > 1 else ''} past the knee"
                "</b></span>: "
                f"the magnet loses flux for good. Worst: {d.worst_case}, {margin} beyond the knee.")

    def _fit_view(self, results) -> None:
        cases = results.demagnetization.cases
        lowest = min(min(float(c.curves.field_strength[0]) for c in results.magnet_chart),
                     min(c.magnet_field_A_per_m for c in cases))
        top = max(c.curves.remanence for c in results.magnet_chart)
        # A case past the knee can sit below B = 0: it must stay in view, it is the point of the chart.
        bottom = min(0.0, min(c.magnet_flux_density_T for c in cases) - 0.04 * top)
        # Head room above Br keeps the legend clear of the curves.
        self.plot.getPlotItem().setRange(xRange=(from_si(lowest, FIELD_UNIT) * 1.03, 0.0), yRange=(bottom, top * 1.3),
                                         padding=0.0)

    def clear(self) -> None:
        for items in (self.normal_curves, self.intrinsic_curves, self.load_lines):
            for curve in items.values():
                curve.setData([], [])
        for scatter in (self.operating_item, self.knee_item, self.safe_item, self.failed_item):
            scatter.setData([], [])
        for label in self.case_labels:
            label.hide()
        self.table.setRowCount(0)
