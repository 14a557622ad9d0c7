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

from app.formatting import significant
from core.units import from_si

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
        self.legend = item.addLegend(offset=(10, 10), labelTextColor="k", brush=pg.mkBrush(255, 255, 255, 220))
        self.normal_curves, self.intrinsic_curves, self.knee_marks, self.load_lines, self.operating_marks = {}, {}, {}, {}, {}
        for name, colour in CASE_COLOURS.items():
            self.normal_curves[name] = item.plot(pen=_pen(colour, 2.4), name=name)
            self.intrinsic_curves[name] = item.plot(pen=_pen(colour, 1.6, dashed=True))
            load_pen = pg.mkPen(colour, width=1.3)
            load_pen.setStyle(Qt.PenStyle.DotLine)
            self.load_lines[name] = item.plot(pen=load_pen)
            self.operating_marks[name] = item.plot(pen=None, symbol="o", symbolSize=11, symbolBrush=colour,
                                                   symbolPen=pg.mkPen("w", width=1.5))
        self.knee_item = item.plot(pen=None, symbol="t", symbolSize=11, symbolBrush=KNEE_COLOUR, symbolPen=None,
                                   name="knee (Hk) on B and J")
        self.legend.addItem(self.operating_marks["nominal"], "no-load operating point, on its load line")
        self.safe_item = item.plot(pen=None, symbol="o", symbolSize=12, symbolBrush=None,
                                   symbolPen=pg.mkPen(SAFE_COLOUR, width=2.2), name="demagnetization case: safe")
        self.failed_item = item.plot(pen=None, symbol="x", symbolSize=20, symbolBrush=PAST_KNEE_COLOUR,
                                     symbolPen=pg.mkPen(PAST_KNEE_COLOUR, width=1.5),
                                     name="demagnetization case: PAST THE KNEE")
        self.case_labels: list[pg.TextItem] = []
        splitter.addWidget(self.plot)
        self.table = QTableWidget(0, 7)
        self.table.setObjectName("demagnetization_table")
        self.table.setHorizontalHeaderLabels(
            ["Demagnetization case", "Magnet temp.", "Current", f"H in magnet ({FIELD_UNIT})",
             f"Knee ({FIELD_UNIT})", f"Margin ({FIELD_UNIT})", "Result"])
        self.table.verticalHeader().hide()
        self.table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        self.table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        self.table.horizontalHeader().setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)
        splitter.addWidget(self.table)
        splitter.setSizes([640, 200])

    def show_results(self, results) -> None:
        chart = results.magnet_chart
        knees_h, knees_b = [], []
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
            self.operating_marks[case.name].setData([op_h], [op_b])
            legend_label = self.legend.getLabel(self.normal_curves[case.name])
            legend_label.setText(f"{case.name}: magnet at {c.temperature_C:.0f} °C, Pc = {significant(case.permeance_coefficient, 3)}")
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
        item = self.plot.getPlotItem()
        while len(self.case_labels) < len(cases):
            label = pg.TextItem(anchor=(0, 1.1))
            label.setFont(QFont("Sans", 8))
            item.addItem(label)
            self.case_labels.append(label)
        for index, label in enumerate(self.case_labels):
            if index >= len(cases):
                label.hide()
                continue
            case = cases[index]
            label.setColor(SAFE_COLOUR if case.ok else PAST_KNEE_COLOUR)
            label.setText(case.name if case.ok else f"{case.name}: past the knee")
            # Alternate above and below so neighbouring cases stay readable.
            label.setAnchor((0, 1.1) if index % 2 == 0 else (0, -0.1))
            label.setPos(from_si(case.magnet_field_A_per_m, FIELD_UNIT), case.magnet_flux_density_T)
            label.show()

    def _fill_table(self, cases) -> None:
        ordered = sorted(cases, key=lambda c: c.margin_A_per_m)
        self.table.setRowCount(len(ordered))
        for row, case in enumerate(ordered):
            cells = (
                case.name,
                f"{case.temperature_C:.0f} °C",
                f"{significant(case.current_A, 3)} A" if case.current_A else "–",
                significant(from_si(case.magnet_field_A_per_m, FIELD_UNIT), 3),
                significant(from_si(case.knee_field_A_per_m, FIELD_UNIT), 3),
                significant(from_si(case.margin_A_per_m, FIELD_UNIT), 3),
                "safe" if case.ok else "PAST THE KNEE: irreversible loss",
            )
            for column, text in enumerate(cells):
                cell = QTableWidgetItem(text)
                if column:
                    cell.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                if not case.ok:
                    cell.setBackground(QBrush(QColor("#fbe3ef")))
                    cell.setForeground(QBrush(QColor(PAST_KNEE_COLOUR)))
                self.table.setItem(row, column, cell)

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
        lowest = min(min(float(c.curves.field_strength[0]) for c in results.magnet_chart),
                     min(c.magnet_field_A_per_m for c in results.demagnetization.cases))
        top = max(c.curves.remanence for c in results.magnet_chart)
        self.plot.getPlotItem().setRange(xRange=(from_si(lowest, FIELD_UNIT) * 1.03, 0.0), yRange=(0.0, top * 1.08),
                                         padding=0.0)

    def clear(self) -> None:
        for items in (self.normal_curves, self.intrinsic_curves, self.load_lines, self.operating_marks):
            for curve in items.values():
                curve.setData([], [])
        for curve in (self.knee_item, self.safe_item, self.failed_item):
            curve.setData([], [])
        for label in self.case_labels:
            label.hide()
        self.table.setRowCount(0)
