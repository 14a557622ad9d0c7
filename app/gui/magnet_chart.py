"""The magnet operating chart: where the magnet works on its demagnetization curves, and how close each
demagnetization case comes to the knee.

Draws what ``Results.magnet_chart``, ``Results.demagnetization`` and ``Results.faults`` hold: the normal
B(H) and intrinsic J(H) curves at the cold, nominal and hot magnet temperatures, their knees, the load
line through each no-load operating point, and every case numbered as the datasheet numbers it (faults
F1, F2, ...): the mean over the worst 5 % of the magnet's area (the verdict), the mean over the magnet
and every segment under the case's current, with the load line shifted by the armature reaction for the
worst case. Which case is which, where on the arc its worst spot is and why Pc changes with temperature:
in the key above the plot, in the tooltips and in the table under it (the worst first). The marks and
their labels come from ``app.magnet_marks``, as on paper.
"""

from __future__ import annotations

import textwrap

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt, QTimer
from PySide6.QtGui import QBrush, QColor, QFont, QFontMetricsF
from PySide6.QtWidgets import QHeaderView, QSplitter, QTableWidget, QTableWidgetItem, QWidget

from pmdc_sizer.app import magnet_marks
from pmdc_sizer.app.figures import (
    CASES,
    DASH_GLYPHS,
    DEMAGNETIZATION_STATES,
    LABELS,
    LINES,
    POINTS,
    STATUSES,
    WARNING_COLOUR,
    figure,
    text_of,
)
from pmdc_sizer.core.units import from_si

from .style import MARKER_PX, black_axes, flush_column, line_pen, mark_style, wrapped_label

FIELD = figure("magnet_chart_case.curves.field_strength")
FIELD_UNIT = FIELD.unit
#: The colour of a key's sample for marks that take their case's colour (as on paper).
SAMPLE_COLOUR = "#5b6470"
SAFE_COLOUR, PAST_KNEE_COLOUR = STATUSES["pass"].colour, STATUSES["fail"].colour
#: The marks of a case's state, design cases and faults: one scatter item each.
CASE_POINTS = ("demagnetization_safe", "demagnetization_marginal", "demagnetization_fails",
               "fault_safe", "fault_marginal", "fault_fails")
LABEL_FONT_PT = 9
TABLE_FIGURES = ("temperature_C", "current_A", "magnet_field_A_per_m", "worst_angle_rad", "knee_field_A_per_m",
                 "margin_A_per_m", "magnet_area_past_knee_fraction")


def _header(title: str, unit: str = "") -> str:
    """A column header in short lines, so the table's columns stay narrow."""
    return "\n".join(textwrap.wrap(title, 12) + ([f"[{unit}]"] if unit and unit != "°" else []))


def _scatter_of(point: str, tip=None) -> pg.ScatterPlotItem:
    """A scatter item whose own style is the named point's, in the sample colour; with a tooltip if given."""
    options = {"hoverable": True, "tip": tip} if tip is not None else {}
    return pg.ScatterPlotItem(**mark_style(point, SAMPLE_COLOUR), **options)


def _glyph(point: str) -> str:
    style = POINTS[point]
    return f"<span style='color:{style.colour or SAMPLE_COLOUR}'>{style.glyph}</span> {style.key_text}"


def _line(line: str, text: str = "") -> str:
    style = LINES[line]
    return f"{DASH_GLYPHS[style.dash]} {text or style.key_text}"


class MagnetChart(QWidget):
    def __init__(self):
        super().__init__()
        layout = flush_column(self)
        layout.setSpacing(2)
        self.headline = wrapped_label("magnet_headline", "font-size: 13px; padding: 2px 4px;")
        layout.addWidget(self.headline)
        # The key sits above the plot, not on it, so it never hides a curve, a mark or a label.
        self.key = wrapped_label("magnet_key", "padding: 0px 4px;", rich=True)
        self.key.setToolTip(magnet_marks.PC_NOTE)
        layout.addWidget(self.key)
        splitter = QSplitter(Qt.Orientation.Vertical)
        layout.addWidget(splitter, 1)
        self.plot = pg.PlotWidget(background="w")
        self.plot.setObjectName("magnet_plot")
        item = self.plot.getPlotItem()
        item.showGrid(x=True, y=True, alpha=0.25)
        item.setLabel("bottom", f"{FIELD.title} in the magnet", units=FIELD_UNIT)
        density = figure("magnet_chart_case.curves.flux_density")
        item.setLabel("left", f"{density.title} (B solid, J dashed)", units=density.unit)
        black_axes(item)
        # Plain curve and scatter items (not PlotDataItem): every edit redraws them, so they must be light.
        self.normal_curves, self.intrinsic_curves, self.load_lines = {}, {}, {}
        load_dash = LINES["load_line"].dash
        for name, style in CASES.items():
            self.normal_curves[name] = self._curve(item, line_pen(style.colour, "solid", 2.4))
            self.intrinsic_curves[name] = self._curve(item, line_pen(style.colour, "dash", 1.6))
            self.load_lines[name] = self._curve(item, line_pen(style.colour, load_dash, 1.3))
        self.shifted_line = self._curve(item, line_pen(SAMPLE_COLOUR, LINES["shifted_load_line"].dash, 1.8))
        self.shifted: magnet_marks.ShiftedLoadLine | None = None
        self._tips: dict[str, str] = {}
        tip = self._tip
        # The magnet's segments and their mean under each case's current, beneath the cases' own marks.
        self.segment_item = self._add(item, _scatter_of("magnet_segment"))
        self.mean_item = self._add(item, _scatter_of("magnet_mean", tip))
        # Every named point in its own item, styled per spot from app.figures as the datasheet's chart is.
        self.operating_item = self._add(item, _scatter_of("operating_point", tip))
        self.knee_item = self._add(item, _scatter_of("knee", tip))
        self.case_items = {point: self._add(item, _scatter_of(point, tip)) for point in CASE_POINTS}
        self.safe_item = self.case_items["demagnetization_safe"]
        self.failed_item = self.case_items["demagnetization_fails"]
        self.marks: list[magnet_marks.CaseMark] = []
        self.case_labels: list[pg.TextItem] = []
        self.leaders: list[pg.PlotCurveItem] = []  #: from a mark to its label, where the label had to move off
        self._label_font = QFont("Sans", LABEL_FONT_PT)
        self._label_texts: list[tuple[str, str, float, float]] = []  #: text, colour, H [kA/m], B [T] (as drawn)
        self._placing = QTimer(self)
        self._placing.setSingleShot(True)
        self._placing.setInterval(0)
        self._placing.timeout.connect(self._place_labels)
        item.getViewBox().sigRangeChanged.connect(lambda *_: self._placing.start())
        self._failed_background = QBrush(QColor(STATUSES["fail"].shade))
        self._failed_foreground = QBrush(QColor(PAST_KNEE_COLOUR))
        self._fault_background = QBrush(QColor("#f1f3f6"))
        splitter.addWidget(self.plot)
        self.table = QTableWidget(0, 2 + len(TABLE_FIGURES))
        self.table.setObjectName("demagnetization_table")
        headers = []
        for name in TABLE_FIGURES:
            shown = figure(f"demagnetization_case.{name}")
            headers.append(_header(shown.title, shown.unit if name not in ("temperature_C", "current_A") else ""))
        self.table.setHorizontalHeaderLabels(["Demagnetization case", *headers, LABELS["demagnetization_case.status"]])
        self.table.horizontalHeaderItem(1 + TABLE_FIGURES.index("worst_angle_rad")).setToolTip(
            "Where on the arc the field is most demagnetizing, in degrees from the pole centre; "
            "+ toward the direction of rotation.")
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

    TEXT_MARGIN_PX = 4  #: QTextDocument's default margin, round a TextItem's text

    #: Columns a narrow table leaves out first (each row's tooltip still gives them), in this order.
    OPTIONAL_COLUMNS = ("magnet_area_past_knee_fraction", "worst_angle_rad", "knee_field_A_per_m", "current_A")

    def resizeEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().resizeEvent(event)
        self._placing.start()
        self._fit_columns()

    def _fit_columns(self) -> None:
        """Leave out the optional columns, one by one, until the table fits its width without scrolling."""
        if not self._columns_sized:
            return
        available = self.table.viewport().width()
        header = self.table.horizontalHeader()
        name_width = self.table.fontMetrics().horizontalAdvance("reversal at no-load speed, ")
        for name in self.OPTIONAL_COLUMNS:
            self.table.setColumnHidden(1 + TABLE_FIGURES.index(name), False)
        for name in self.OPTIONAL_COLUMNS:
            shown = sum(header.sectionSize(i) for i in range(1, self.table.columnCount())
                        if not self.table.isColumnHidden(i))
            if shown + name_width <= available:
                break
            self.table.setColumnHidden(1 + TABLE_FIGURES.index(name), True)

    @staticmethod
    def _curve(plot_item, pen) -> pg.PlotCurveItem:
        curve = pg.PlotCurveItem(pen=pen, skipFiniteCheck=True)
        plot_item.addItem(curve)
        return curve

    @staticmethod
    def _add(plot_item, scatter: pg.ScatterPlotItem) -> pg.ScatterPlotItem:
        plot_item.addItem(scatter)
        return scatter

    def _tip(self, x, y, data) -> str:
        return self._tips.get(f"{data[0]}|{data[1]}", f"{data[1]}")

    def operating_points(self) -> dict[str, tuple[float, float]]:
        """The drawn no-load operating points, (H [kA/m], B [T]) by case name."""
        return {spot.data()[1]: (float(spot.pos().x()), float(spot.pos().y())) for spot in self.operating_item.points()}

    def show_results(self, results) -> None:
        chart = results.magnet_chart
        knees, operating = [], []
        self._tips = {}
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
            self._tips[f"knee|{case.name}"] = (
                f"{POINTS['knee'].title}, {case.name} curve "
                f"({text_of(case, 'magnet_chart_case.curves.temperature_C')}): "
                f"H = {text_of(case, 'magnet_chart_case.curves.knee_field')}")
            op_h, op_b = from_si(case.operating_field_A_per_m, FIELD_UNIT), case.operating_flux_density_T
            reach = c.remanence / op_b if op_b > 0 else 1.0
            self.load_lines[case.name].setData([0.0, op_h * reach], [0.0, op_b * reach])
            operating.append({"pos": (op_h, op_b), "data": ("operating_point", case.name),
                              **mark_style("operating_point", colour)})
            self._tips[f"operating_point|{case.name}"] = (
                f"{POINTS['operating_point'].title}, {case.name}: "
                f"Hm = {text_of(case, 'magnet_chart_case.operating_field_A_per_m')}, "
                f"Bm = {text_of(case, 'magnet_chart_case.operating_flux_density_T')}, "
                f"Pc = {text_of(case, 'magnet_chart_case.permeance_coefficient')}\n"
                + textwrap.fill(magnet_marks.PC_NOTE, 70))
        self.operating_item.setData(operating)
        self.knee_item.setData(knees)
        self.marks = magnet_marks.case_marks(results)
        self._draw_cases(results)
        self._draw_shifted_line(results)
        self._fill_key(results)
        self._fill_table()
        self._headline(results)
        self._fit_view(results)
        self._placing.start()

    def _draw_cases(self, results) -> None:
        floor, _bottom = magnet_marks.chart_floor(results, self.marks)
        spots: dict[str, list[dict]] = {point: [] for point in CASE_POINTS}
        segments, means = [], []
        least = magnet_marks.least_margin_mark(self.marks)
        self._label_texts = []
        for label, members in magnet_marks.grouped(self.marks):
            mark = members[0]
            b, off_scale = magnet_marks.on_scale(mark.worst_flux_density, floor)
            h = from_si(mark.worst_field, FIELD_UNIT)
            for member in members:
                spots[member.point].append({"pos": (h, b), "data": (member.point, member.name),
                                            **mark_style(member.point, member.colour)})
            self._tips[f"{mark.point}|{mark.name}"] = "\n\n".join(m.description() for m in members)
            for member in members[1:]:
                self._tips[f"{member.point}|{member.name}"] = self._tips[f"{mark.point}|{mark.name}"]
            text = magnet_marks.group_label(label, members, least) + (f" {magnet_marks.OFF_SCALE}" if off_scale else "")
            self._label_texts.append((text, mark.shown_colour, h, b))
            seg_h, seg_b = mark.segments
            segment_style = mark_style("magnet_segment", mark.colour)
            shown = (seg_b >= floor) & (seg_h <= 0.0)  # magnetized segments sit right of the chart
            segments += [{"pos": (x, y), "data": ("magnet_segment", mark.name), **segment_style}
                         for x, y in zip(from_si(seg_h[shown], FIELD_UNIT), seg_b[shown], strict=True)]
            mean_h, mean_b = mark.mean
            if mark.mean_on_curve and mean_b >= floor:
                means.append({"pos": (from_si(mean_h, FIELD_UNIT), mean_b), "data": ("magnet_mean", mark.name),
                              **mark_style("magnet_mean", mark.colour)})
                self._tips[f"magnet_mean|{mark.name}"] = (
                    f"{POINTS['magnet_mean'].title}, {label}: H = {magnet_marks.text('mean_field_A_per_m', mark.case)}"
                    f", B = {magnet_marks.text('mean_flux_density_T', mark.case)}")
        # The failed marks last: they are what the chart is for.
        self._label_texts.sort(key=lambda t: t[1] != PAST_KNEE_COLOUR)
        for point, scatter in self.case_items.items():
            scatter.setData(spots[point])
        self.segment_item.setData(segments)
        self.mean_item.setData(means)

    def _draw_shifted_line(self, results) -> None:
        self.shifted = magnet_marks.shifted_load_line(results)
        if self.shifted is None:
            self.shifted_line.setData([], [])
            return
        h, b = self.shifted.points()
        self.shifted_line.setPen(line_pen(CASES[self.shifted.temperature_case].colour,
                                          LINES["shifted_load_line"].dash, 1.8))
        self.shifted_line.setData(from_si(h, FIELD_UNIT), b)

    def shifted_line_points(self) -> tuple[np.ndarray, np.ndarray]:
        """The drawn shifted load line, (H [kA/m], B [T]) of its ends."""
        return self.shifted_line.getData()

    def _fill_key(self, results) -> None:
        """A short key (the tooltips and the table say the rest): the curves, the lines, the marks present."""
        temperatures = []
        for case in results.magnet_chart:
            style = CASES[case.name]
            pc = text_of(case, "magnet_chart_case.permeance_coefficient")
            temperatures.append(f"<span style='color:{style.colour}'><b>{DASH_GLYPHS['solid']} {case.name}</b> "
                                f"{case.curves.temperature_C:.0f} °C, Pc {pc}</span>")
        kinds = [f"{DASH_GLYPHS['solid']} B", f"{DASH_GLYPHS['dash']} J", _line("load_line"),
                 _glyph("operating_point"), _glyph("knee")]
        if self.shifted is not None:
            kinds.append(_line("shifted_load_line", _escape(self.shifted.title(short=True))))
        present = {m.point for m in self.marks}
        states = [_glyph(point) for point in CASE_POINTS if point in present or point == "demagnetization_safe"]
        states += [_glyph("magnet_mean"), _glyph("magnet_segment")]
        numbers = "numbered as in the datasheet" + ("; F: supply applied directly" if results.faults is not None
                                                   else "")
        gap = "&nbsp;&nbsp; "
        self.key.setText(gap.join(temperatures) + "<br>" + gap.join(kinds) + "<br>" + gap.join(states)
                         + f" <span style='color:{SAMPLE_COLOUR}'>({numbers})<br>"
                         f"{_escape(magnet_marks.PC_NOTE_SHORT)} (point here for more)</span>")
        self.key.setToolTip("<p>" + "</p><p>".join(_escape(t) for t in (
            magnet_marks.PC_NOTE,
            "Each case's mark sits at the mean field over the worst 5 % of its magnet's area, the one its "
            "verdict rests on; the small dots "
            "are the other segments, the hollow circle the mean over the magnet (left out where part of the "
            "magnet is past the knee: the mean of such a magnet is no point of its curve).",
            f"{LINES['shifted_load_line'].title}: the no-load load line moved along H by the armature's MMF "
            "until it passes through the worst case's mark.")) + "</p>")

    def _place_labels(self) -> None:
        """Number every mark, clear of the marks, of each other and of the curves (in the plot's pixels)."""
        view = self.plot.getPlotItem().getViewBox()
        width, height = view.width(), view.height()
        if width < 20 or height < 20 or not self._label_texts:
            for label in self.case_labels:
                label.hide()
            for line in self.leaders:
                line.setData([], [])
            return
        (x0, x1), (y0, y1) = view.viewRange()

        def to_pixels(h, b):
            return np.column_stack(((np.asarray(h) - x0) / (x1 - x0) * width,
                                    (y1 - np.asarray(b)) / (y1 - y0) * height))

        curves = [to_pixels(*curve.getData()) for group in (self.normal_curves, self.intrinsic_curves, self.load_lines)
                  for curve in group.values() if curve.getData()[0] is not None]
        if self.shifted is not None:
            curves.append(to_pixels(*self.shifted_line.getData()))
        half = MARKER_PX * 0.8
        marks = []
        for scatter in (*self.case_items.values(), self.operating_item, self.knee_item, self.mean_item):
            for spot in scatter.points():
                px, py = to_pixels([spot.pos().x()], [spot.pos().y()])[0]
                marks.append((px - half, py - half, px + half, py + half))
        metrics = QFontMetricsF(self._label_font)
        anchors = [tuple(to_pixels([h], [b])[0]) for _text, _colour, h, b in self._label_texts]
        # A TextItem draws its text inside the margins of its document, a few pixels each side.
        pad = 2 * self.TEXT_MARGIN_PX + 1
        sizes = [(metrics.horizontalAdvance(text) + pad, metrics.height() + pad) for text, *_ in self._label_texts]
        boxes = magnet_marks.place_labels(anchors, sizes, marks, curves, (0.0, 0.0, width, height), half + 2)
        item = self.plot.getPlotItem()
        while len(self.case_labels) < len(boxes):
            label = pg.TextItem(anchor=(0, 0))
            label.setFont(self._label_font)
            item.addItem(label)
            self.case_labels.append(label)
            self.leaders.append(self._curve(item, line_pen(SAMPLE_COLOUR, "solid", 0.8)))

        def to_view(px, py):
            return x0 + px / width * (x1 - x0), y1 - py / height * (y1 - y0)

        for index, (label, line) in enumerate(zip(self.case_labels, self.leaders, strict=True)):
            if index >= len(boxes):
                label.hide()
                line.setData([], [])
                continue
            text, colour, *_ = self._label_texts[index]
            left, top, *_ = boxes[index]
            if label.textItem.toPlainText() != text:
                label.setText(text)
            label.setColor(colour)
            label.setPos(*to_view(left, top))
            label.show()
            ends = magnet_marks.leader(anchors[index], boxes[index], half + 2)
            if ends is None:
                line.setData([], [])
            else:
                (ax, ay), (bx, by) = to_view(*ends[0]), to_view(*ends[1])
                line.setData([ax, bx], [ay, by])

    def label_texts(self) -> list[str]:
        """The texts beside the marks, as drawn."""
        return [label.textItem.toPlainText() for label in self.case_labels if label.isVisible()]

    def _fill_table(self) -> None:
        # Numbered as on the datasheet (in the results' order), listed least margin first; faults after.
        ordered = (sorted((m for m in self.marks if not m.fault), key=lambda m: m.case.margin_A_per_m)
                   + sorted((m for m in self.marks if m.fault), key=lambda m: m.case.margin_A_per_m))
        if self.table.rowCount() != len(ordered):
            self.table.setRowCount(len(ordered))
            self._columns_sized = False
        for row, mark in enumerate(ordered):
            case = mark.case
            word = DEMAGNETIZATION_STATES.get(case.status, "safe" if case.ok else "past the knee")
            figures = []
            for name in TABLE_FIGURES:
                shown = figure(f"demagnetization_case.{name}")
                if name in ("temperature_C", "current_A"):
                    figures.append(shown.text(getattr(case, name)) if name != "current_A" or case.current_A else "–")
                elif name == "worst_angle_rad":
                    figures.append(magnet_marks.angle_text(case))
                else:
                    figures.append(shown.number(getattr(case, name)))
            cells = (f"{mark.label}  {case.name}", *figures, word.upper() if not case.ok else word)
            background = (self._failed_background if not case.ok
                          else self._fault_background if mark.fault else QBrush())
            for column, text in enumerate(cells):
                cell = self.table.item(row, column)
                if cell is None:
                    cell = QTableWidgetItem()
                    if column:
                        cell.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                    self.table.setItem(row, column, cell)
                if cell.text() != text:
                    cell.setText(text)
                cell.setToolTip(mark.description())  # the whole name and the worst spot, where a cell is narrow
                cell.setBackground(background)
                cell.setForeground(self._failed_foreground if not case.ok else QBrush())
        if not self._columns_sized:
            self.table.resizeColumnsToContents()
            header = self.table.horizontalHeader()
            header.setStretchLastSection(False)
            header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)  # the case name takes what is left
            result_column = self.table.columnCount() - 1
            word = "PAST THE KNEE" if any(not m.case.ok for m in self.marks) else "marginal"
            self.table.setColumnWidth(result_column, self.table.fontMetrics().horizontalAdvance(word) + 16)
            self._columns_sized = True
            self._fit_columns()

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
                f"the magnet loses flux for good. Worst: {d.worst_case}, {margin} beyond the knee." + fault_text)

    def _fit_view(self, results) -> None:
        lowest = min(min(float(c.curves.field_strength[0]) for c in results.magnet_chart),
                     min(m.worst_field for m in self.marks))
        top = max(c.curves.remanence for c in results.magnet_chart)
        # A case past the knee can sit below B = 0: it must stay in view, it is the point of the chart.
        _floor, bottom = magnet_marks.chart_floor(results, self.marks)
        # Head room above Br for the labels of the marks near it.
        self.plot.getPlotItem().setRange(xRange=(from_si(lowest, FIELD_UNIT) * 1.03, 0.0), yRange=(bottom, top * 1.12),
                                         padding=0.0)

    def clear(self) -> None:
        for items in (self.normal_curves, self.intrinsic_curves, self.load_lines):
            for curve in items.values():
                curve.setData([], [])
        self.shifted_line.setData([], [])
        self.shifted = None
        for scatter in (self.operating_item, self.knee_item, self.segment_item, self.mean_item,
                        *self.case_items.values()):
            scatter.setData([], [])
        self.marks, self._label_texts = [], []
        for label in self.case_labels:
            label.hide()
        for line in self.leaders:
            line.setData([], [])
        self.key.setText("")
        self.table.setRowCount(0)


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
