"""A's and B's magnet curves on the same axes, for the comparison page.

At one temperature case (cold, nominal or hot; by default the one where either design comes closest to
its knee): both grades' normal B(H) and intrinsic J(H) curves in the sides' colours and dashes, their
knees, load lines and no-load operating points, and the demagnetization cases and faults at that
temperature, each marked by its state as on the magnet page and labelled with its side and number
("A4", "BF2"). Everything is drawn from ``Results`` and ``app.magnet_marks``; nothing is computed.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtGui import QFont, QFontMetricsF
from PySide6.QtWidgets import QHBoxLayout, QWidget

from pmdc_sizer.app import magnet_marks
from pmdc_sizer.app.figures import CASE_NAMES, DASH_GLYPHS, LINES, POINTS, SIDES, figure, text_of
from pmdc_sizer.core.units import from_si

from .style import MARKER_PX, black_axes, flush_column, labelled_choice, line_pen, mark_style, wrapped_label

FIELD = figure("magnet_chart_case.curves.field_strength")
WORST = "where either comes closest to its knee"
SAMPLE = "#5b6470"  #: the key's colour for marks that take their side's colour
#: the marks of a case's state, design cases and faults
STATE_POINTS = ("demagnetization_safe", "demagnetization_marginal", "demagnetization_fails",
                "fault_safe", "fault_marginal", "fault_fails")


def worst_temperature(results_a, results_b) -> str:
    """The temperature case ("cold" or "hot") of the design case with the least margin of A and B."""
    cases = [c for r in (results_a, results_b) if r is not None for c in r.demagnetization.cases]
    if not cases:
        return "nominal"
    worst = min(cases, key=lambda c: c.margin_A_per_m)
    return "cold" if "cold" in worst.name else "hot"


def marks_at(results, chart_case) -> list[magnet_marks.CaseMark]:
    """The cases and faults whose magnet temperature is the chart case's (to half a kelvin)."""
    return [m for m in magnet_marks.case_marks(results)
            if abs(m.case.temperature_C - chart_case.curves.temperature_C) < 0.5]


class MagnetOverlay(QWidget):
    def __init__(self):
        super().__init__()
        column = flush_column(self)
        row = QHBoxLayout()
        self.temperature_combo = labelled_choice(row, "Temperature case", "magnet_overlay_temperature",
                                                 [WORST, *CASE_NAMES], self.redraw)
        row.addStretch(1)
        column.addLayout(row)
        self.key = wrapped_label("magnet_overlay_key", rich=True)
        self.key.setToolTip(magnet_marks.PC_NOTE)
        column.addWidget(self.key)
        self.plot = pg.PlotWidget(background="w")
        self.plot.setObjectName("magnet_overlay_plot")
        item = self.plot.getPlotItem()
        item.showGrid(x=True, y=True, alpha=0.25)
        item.setMenuEnabled(False)
        item.setLabel("bottom", f"{FIELD.title} in the magnet", units=FIELD.unit)
        density = figure("magnet_chart_case.curves.flux_density")
        item.setLabel("left", f"{density.title} (B thick, J thin)", units=density.unit)
        black_axes(item)
        column.addWidget(self.plot, 1)
        self.normal_curves, self.intrinsic_curves, self.load_lines = {}, {}, {}
        self.operating_items, self.knee_items, self.case_items = {}, {}, {}
        for side, style in SIDES.items():
            self.normal_curves[side] = self._curve(line_pen(style.colour, style.dash, 2.6))
            self.intrinsic_curves[side] = self._curve(line_pen(style.colour, style.dash, 1.2))
            self.load_lines[side] = self._curve(line_pen(style.colour, LINES["load_line"].dash, 1.2))
            self.operating_items[side] = self._scatter()
            self.knee_items[side] = self._scatter()
            self.case_items[side] = self._scatter()
        self.labels: list[pg.TextItem] = []
        self._font = QFont("Sans", 9)
        self._results = {"A": None, "B": None}

    def _curve(self, pen) -> pg.PlotCurveItem:
        curve = pg.PlotCurveItem(pen=pen, skipFiniteCheck=True)
        self.plot.getPlotItem().addItem(curve)
        return curve

    def _scatter(self) -> pg.ScatterPlotItem:
        scatter = pg.ScatterPlotItem(hoverable=True, tip=lambda x, y, data: data[2])
        self.plot.getPlotItem().addItem(scatter)
        return scatter

    def show_results(self, results_a, results_b) -> None:
        self._results = {"A": results_a, "B": results_b}
        self.redraw()

    def temperature_case(self) -> str:
        chosen = self.temperature_combo.currentText()
        return worst_temperature(self._results["A"], self._results["B"]) if chosen == WORST else chosen

    def redraw(self) -> None:
        name = self.temperature_case()
        keys, labels, lefts, bottoms, tops = [], [], [], [0.0], []
        for side, style in SIDES.items():
            results = self._results[side]
            items = (self.normal_curves[side], self.intrinsic_curves[side], self.load_lines[side])
            if results is None:
                for curve in items:
                    curve.setData([], [])
                for scatter in (self.operating_items[side], self.knee_items[side], self.case_items[side]):
                    scatter.setData([])
                continue
            chart = next(c for c in results.magnet_chart if c.name == name)
            c = chart.curves
            h = from_si(c.field_strength, FIELD.unit)
            self.normal_curves[side].setData(h, c.flux_density)
            self.intrinsic_curves[side].setData(h, c.polarization)
            op_h, op_b = from_si(chart.operating_field_A_per_m, FIELD.unit), chart.operating_flux_density_T
            reach = c.remanence / op_b if op_b > 0 else 1.0
            self.load_lines[side].setData([0.0, op_h * reach], [0.0, op_b * reach])
            pc = text_of(chart, "magnet_chart_case.permeance_coefficient")
            operating_tip = f"{side}: {POINTS['operating_point'].title}, Pc {pc}\n{magnet_marks.PC_NOTE}"
            self.operating_items[side].setData([{"pos": (op_h, op_b), "data": ("operating_point", side, operating_tip),
                                                 **mark_style("operating_point", style.colour)}])
            knee_h = from_si(c.knee_field, FIELD.unit)
            knee_j = float(np.interp(c.knee_field, c.field_strength, c.polarization))
            knee_tip = f"{side}: {POINTS['knee'].title}, {text_of(chart, 'magnet_chart_case.curves.knee_field')}"
            self.knee_items[side].setData([{"pos": (knee_h, b), "data": ("knee", side, knee_tip),
                                            **mark_style("knee", style.colour)} for b in (c.knee_flux_density, knee_j)])
            marks = marks_at(results, chart)
            floor, bottom = magnet_marks.chart_floor(results, marks)
            spots = []
            for _numbers, members in magnet_marks.grouped(marks):
                mark = members[0]
                b, off_scale = magnet_marks.on_scale(mark.worst_flux_density, floor)
                mark_h = from_si(mark.worst_field, FIELD.unit)
                tip = "\n\n".join(f"{side}: {m.description()}" for m in members)
                spots += [{"pos": (mark_h, b), "data": (m.point, side, tip), **mark_style(m.point, style.colour)}
                          for m in members]
                text = side + ",".join(m.label for m in members) + (" FAILS" if not mark.case.ok else "") \
                    + (f" {magnet_marks.OFF_SCALE}" if off_scale else "")
                labels.append((text, POINTS[mark.point].colour or style.colour, mark_h, b))
                lefts.append(mark_h)
            self.case_items[side].setData(spots)
            bottoms.append(bottom)
            lefts.append(float(from_si(c.field_strength[0], FIELD.unit)))
            tops.append(c.remanence)
            thickness = text_of(results, "geometry.magnet_thickness_m")
            keys.append(f"<span style='color:{style.colour}'><b>{style.line_glyph} {side}</b>: "
                        f"{_escape(results.magnet.name)}, {thickness}, magnet {c.temperature_C:.0f} °C, Pc {pc}; "
                        f"least margin {text_of(results, 'demagnetization.worst_margin_A_per_m')} "
                        f"({_escape(results.demagnetization.worst_case)})</span>")
        present = {d[0] for side in SIDES for d in (s.data() for s in self.case_items[side].points())}
        marks_key = [f"<span style='color:{POINTS[p].colour or SAMPLE}'>{POINTS[p].glyph}</span> {POINTS[p].key_text}"
                     for p in STATE_POINTS if p in present]
        lines = [f"{DASH_GLYPHS[LINES['load_line'].dash]} {LINES['load_line'].title}",
                 f"{POINTS['operating_point'].glyph} {POINTS['operating_point'].key_text}",
                 f"{POINTS['knee'].glyph} {POINTS['knee'].key_text}"]
        cases = ("cases at this temperature, labelled by side and number as on each side's magnet page"
                 if marks_key else "no demagnetization case at this temperature")
        self.key.setText("<br>".join(keys) + "<br>" + "&nbsp;&nbsp; ".join(lines + marks_key)
                         + f" <span style='color:{SAMPLE}'>({cases})</span>")
        if tops:
            self.plot.getPlotItem().setRange(xRange=(min(lefts) * 1.03, 0.0), yRange=(min(bottoms), max(tops) * 1.12),
                                             padding=0.0)
        self._label(labels)

    def _label(self, labels) -> None:
        view = self.plot.getPlotItem().getViewBox()
        width, height = max(view.width(), 200.0), max(view.height(), 150.0)
        (x0, x1), (y0, y1) = view.viewRange()

        def to_pixels(h, b):
            return np.column_stack(((np.asarray(h, dtype=float) - x0) / (x1 - x0) * width,
                                    (y1 - np.asarray(b, dtype=float)) / (y1 - y0) * height))

        curves = [to_pixels(*curve.getData()) for group in (self.normal_curves, self.intrinsic_curves, self.load_lines)
                  for curve in group.values() if curve.getData()[0] is not None and len(curve.getData()[0])]
        metrics = QFontMetricsF(self._font)
        anchors = [tuple(to_pixels([h], [b])[0]) for _t, _c, h, b in labels]
        half = MARKER_PX * 0.8
        pad = 9  # the margins of a TextItem's document, both sides, and a pixel
        boxes = magnet_marks.place_labels(anchors, [(metrics.horizontalAdvance(t) + pad, metrics.height() + pad)
                                                    for t, *_ in labels],
                                          [(x - half, y - half, x + half, y + half) for x, y in anchors], curves,
                                          (0.0, 0.0, width, height), half + 2)
        while len(self.labels) < len(labels):
            label = pg.TextItem(anchor=(0, 0))
            label.setFont(self._font)
            self.plot.getPlotItem().addItem(label)
            self.labels.append(label)
        for index, label in enumerate(self.labels):
            if index >= len(labels):
                label.hide()
                continue
            text, colour, *_ = labels[index]
            left, top_px, *_ = boxes[index]
            label.setText(text)
            label.setColor(colour)
            label.setPos(x0 + left / width * (x1 - x0), y1 - top_px / height * (y1 - y0))
            label.show()

    def label_texts(self) -> list[str]:
        return [label.textItem.toPlainText() for label in self.labels if label.isVisible()]


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
