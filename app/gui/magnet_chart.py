"""The magnet operating chart: where the magnet works on its demagnetization curves, and how close each
demagnetization case comes to the knee.

Draws what ``Results.magnet_chart`` and ``Results.demagnetization`` hold: the normal B(H) and intrinsic
J(H) curves at the cold, nominal and hot magnet temperatures, their knees, the load line through each
no-load operating point, and every demagnetization case's point. A table under the chart lists the
cases with their margins, the worst first.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtGui import QBrush, QColor, QFont
from PySide6.QtWidgets import QHeaderView, QLabel, QSplitter, QTableWidget, QTableWidgetItem, QVBoxLayout, QWidget

from pmdc_sizer.app.formatting import significant
from pmdc_sizer.core.units import from_si

from .style import CASE_COLOURS, KNEE_COLOUR, PAST_KNEE_COLOUR, SAFE_COLOUR

FIELD_UNIT = "kA/m"


def _pen(colour, width=2.0, dashed=False):
    pen = pg.mkPen(colour, width=width)
    if dashed:
        pen.setStyle(Qt.PenStyle.DashLine)
    return pen


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
        item.setLabel("bottom", "Field strength in the magnet H", units=FIELD_UNIT)
        item.setLabel("left", "Flux density B (solid) and polarization J (dashed)", units="T")
        for axis in ("bottom", "left"):
            item.getAxis(axis).enableAutoSIPrefix(False)
            item.getAxis(axis).setTextPen("k")
            item.getAxis(axis).setPen("k")
            # Grid lines at the labelled ticks only: the finer levels cost most of a frame to paint.
            item.getAxis(axis).setStyle(maxTickLevel=0)
        self.legend = item.addLegend(offset=(10, 10), labelTextColor="k", brush=pg.mkBrush(255, 255, 255, 220))
        # Plain curve and scatter items (not PlotDataItem): every edit redraws them, so they must be light.
        self.normal_curves, self.intrinsic_curves, self.load_lines = {}, {}, {}
        for name, colour in CASE_COLOURS.items():
            self.normal_curves[name] = self._curve(item, _pen(colour, 2.4))
            self.legend.addItem(self.normal_curves[name], name)
            self.intrinsic_curves[name] = self._curve(item, _pen(colour, 1.6, dashed=True))
            load_pen = pg.mkPen(colour, width=1.3)
            load_pen.setStyle(Qt.PenStyle.DotLine)
            self.load_lines[name] = self._curve(item, load_pen)
        self.operating_item = self._scatter(item, symbol="o", size=11, brush=CASE_COLOURS["nominal"],
                                            pen=pg.mkPen("w", width=1.5))
        self._case_brushes = [pg.mkBrush(colour) for colour in CASE_COLOURS.values()]
        self.knee_item = self._scatter(item, symbol="t", size=11, brush=KNEE_COLOUR, pen=None)
        self.legend.addItem(self.knee_item, "knee: irreversible loss begins (on B and J)")
        self.legend.addItem(self.operating_item, "no-load operating point, on its load line (dotted)")
        self.safe_item = self._scatter(item, symbol="o", size=12, brush=None, pen=pg.mkPen(SAFE_COLOUR, width=2.2))
        self.legend.addItem(self.safe_item, "demagnetization case: safe")
        self.failed_item = self._scatter(item, symbol="x", size=20, brush=PAST_KNEE_COLOUR,
                                         pen=pg.mkPen(PAST_KNEE_COLOUR, width=1.5))
        self.legend.addItem(self.failed_item, "demagnetization case: PAST THE KNEE")
        self.legend.setColumnCount(2)
        self._legend_texts: dict[str, str] = {}
        self._failed_background = QBrush(QColor("#fbe3ef"))
        self._failed_foreground = QBrush(QColor(PAST_KNEE_COLOUR))
        self.case_labels: list[pg.TextItem] = []
        splitter.addWidget(self.plot)
        self.table = QTableWidget(0, 7)
        self.table.setObjectName("demagnetization_table")
        self.table.setHorizontalHeaderLabels(
            ["Demagnetization case", "Magnet temp.", "Current", f"H in magnet ({FIELD_UNIT})",
             f"Knee ({FIELD_UNIT})", f"Margin ({FIELD_UNIT})", "Result"])
        self.table.verticalHeader().hide()
        self.table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        # Column widths are measured once, on the first results: measuring every cell on every edit
        # (ResizeToContents) costs more than drawing the chart.
        self.table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        self.table.verticalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Fixed)
        self._columns_sized = False
        splitter.addWidget(self.table)
        splitter.setSizes([640, 200])

    @staticmethod
    def _curve(plot_item, pen) -> pg.PlotCurveItem:
        curve = pg.PlotCurveItem(pen=pen, skipFiniteCheck=True)
        plot_item.addItem(curve)
        return curve

    @staticmethod
    def _scatter(plot_item, symbol, size, brush, pen) -> pg.ScatterPlotItem:
        scatter = pg.ScatterPlotItem(symbol=symbol, size=size, brush=brush, pen=pen)
        plot_item.addItem(scatter)
        return scatter

    def operating_points(self) -> dict[str, tuple[float, float]]:
        """The drawn no-load operating points, (H [kA/m], B [T]) by case name."""
        x, y = self.operating_item.getData()
        return {name: (float(h), float(b)) for name, h, b in zip(CASE_COLOURS, x, y)}

    def show_results(self, results) -> None:
        chart = results.magnet_chart
        knees_h, knees_b, operating_h, operating_b = [], [], [], []
        for case in chart:
            c = case.curves
            h = from_si(c.field_strength, FIELD_UNIT)
            self.normal_curves[case.name].setData(h, c.flux_density)
            self.intrinsic_curves[case.name].setData(h, c.polarization)
            knee_h = from_si(c.knee_field, FIELD_UNIT)
            knees_h += [knee_h, knee_h]
            knees_b += [c.knee_flux_density, float(np.interp(c.knee_field, c.field_strength, c.polarization))]
            op_h, op_b = from_si(case.operating_field_A_per_m, FIELD_UNIT), case.operating_flux_density_T
            reach = c.remanence / op_b if op_b > 0 else 1.0
            self.load_lines[case.name].setData([0.0, op_h * reach], [0.0, op_b * reach])
            operating_h.append(op_h)
            operating_b.append(op_b)
            text = f"{case.name}: magnet at {c.temperature_C:.0f} °C, Pc = {significant(case.permeance_coefficient, 3)}"
            if self._legend_texts.get(case.name) != text:  # relaying out the legend costs more than the curves
                self._legend_texts[case.name] = text
                self.legend.getLabel(self.normal_curves[case.name]).setText(text)
        self.operating_item.setData(operating_h, operating_b, brush=self._case_brushes)
        self.knee_item.setData(knees_h, knees_b)
        cases = results.demagnetization.cases
        safe = [c for c in cases if c.ok]
        failed = [c for c in cases if not c.ok]
        self.safe_item.setData([from_si(c.magnet_field_A_per_m, FIELD_UNIT) for c in safe],
                               [c.magnet_flux_density_T for c in safe])
        self.failed_item.setData([from_si(c.magnet_field_A_per_m, FIELD_UNIT) for c in failed],
                                 [c.magnet_flux_density_T for c in failed])
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
        ordered = sorted(cases, key=lambda c: c.margin_A_per_m)
        if self.table.rowCount() != len(ordered):
            self.table.setRowCount(len(ordered))
            self._columns_sized = False
        for row, case in enumerate(ordered):
            cells = (
                case.name,
                f"{case.temperature_C:.0f} °C",
                f"{significant(case.current_A, 3)} A" if case.current_A else "–",
                significant(from_si(case.magnet_field_A_per_m, FIELD_UNIT), 3),
                significant(from_si(case.knee_field_A_per_m, FIELD_UNIT), 3),
                significant(from_si(case.margin_A_per_m, FIELD_UNIT), 3),
                "safe" if case.ok else "PAST THE KNEE",
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
                cell.setBackground(self._failed_background if not case.ok else QBrush())
                cell.setForeground(self._failed_foreground if not case.ok else QBrush())
        if not self._columns_sized:
            self.table.resizeColumnsToContents()
            header = self.table.horizontalHeader()
            header.setStretchLastSection(False)
            header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)  # the case name takes what is left
            result_column = self.table.columnCount() - 1
            width = self.table.fontMetrics().horizontalAdvance("PAST THE KNEE") + 16
            self.table.setColumnWidth(result_column, max(self.table.columnWidth(result_column), width))
            self._columns_sized = True

    def _headline(self, results) -> None:
        d = results.demagnetization
        margin = significant(from_si(d.worst_margin_A_per_m, FIELD_UNIT), 3)
        if d.ok:
            self.headline.setText(
                f"<span style='color:{SAFE_COLOUR}'><b>No demagnetization</b></span>: every case stays right of its "
                f"knee. Least margin {margin} {FIELD_UNIT} ({d.worst_case}).")
        else:
            failed = sum(not c.ok for c in d.cases)
            self.headline.setText(
                f"<span style='color:{PAST_KNEE_COLOUR}'><b>{failed} case{'s' if failed > 1 else ''} past the knee</b></span>: "
                f"the magnet loses flux for good. Worst: {d.worst_case}, {margin} {FIELD_UNIT} beyond the knee.")

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
