"""The datasheet's two charts, drawn with QPainter on any paint device (image, SVG, PDF page).

No window is needed: the same drawing goes to a QImage for PNG and the PDF, and to a QSvgGenerator
for SVG and the HTML. The charts only plot the arrays and points the core returns; the one line they
add, the load line, is the straight line from the origin through the operating point that the
permeance coefficient defines. Titles, units, colours and marker shapes come from ``app.figures``, as
on screen, so the same point looks the same in both.

Every chart is drawn in a fixed logical canvas (``CANVAS_WIDTH`` wide, in "chart units"), scaled to
the device, so text and lines keep their proportions at any resolution.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass, field

import numpy as np
from PySide6.QtCore import QBuffer, QByteArray, QIODevice, QPointF, QRectF, QSize, Qt
from PySide6.QtGui import QBrush, QColor, QFont, QFontMetricsF, QImage, QPainter, QPainterPath, QPen, QPolygonF
from PySide6.QtSvg import QSvgGenerator

from pmdc_sizer.core.results import Results
from pmdc_sizer.core.units import from_si, to_si

from .. import magnet_marks
from ..figures import (
    CASE_POINTS,
    CASES,
    CURVE_QUANTITIES,
    LINES,
    POINTS,
    REGIONS,
    drive_current_limit,
    figure,
    qt_pen_style,
    torque_unit,
)
from ..performance_view import axis_top, torque_end
from ..thermal_text import chart_title, duty_plot, limit_reached_at, temperature_label
from .outline import OUTLINE_ASPECT, draw_outline
from .paper_units import paper_unit

CANVAS_WIDTH = 1000.0
PERFORMANCE_ASPECT = 0.78  #: height over width of the performance chart
MAGNET_ASPECT = 0.56  #: a taller chart would push the magnet page's tables onto a page of their own
THERMAL_ASPECT = 0.5

FONT_FAMILY = "DejaVu Sans"
TEXT = QColor("#1b1f24")
GRID = QColor("#d9dde3")
AXIS = QColor("#5b6470")  #: axes, notes, and the legend's samples of marks that take their case's colour
PERFORMANCE_MARKER = 9.0  #: a marker of relative size 1 on the performance chart, in chart units
MAGNET_MARKER = 12.0  #: ... and on the magnet chart, which has the whole width


def case_colour(name: str) -> QColor:
    return QColor(CASES[name].colour)


def point_marker(point: str, x: float, y: float, case: str = "", base_size: float = PERFORMANCE_MARKER,
                 colour: str | None = None, label: str = "") -> Marker:
    """The named point ``point`` of :data:`app.figures.POINTS` at (x, y), in its case's colour if it takes one."""
    style = POINTS[point]
    shown = style.colour or colour or (CASES[case].colour if case else None)
    if shown is None:
        raise ValueError(f"{point}: a point coloured by its temperature case needs the case")
    return Marker(x, y, style.marker, QColor(shown), style.filled, base_size * style.size, label, point, case)

CHART_NAMES = ("performance", "magnet")


# ----------------------------------------------------------------------------------------------
# A small plotting kit: panels of curves and markers against one x and one y axis.


@dataclass
class Series:
    x: np.ndarray
    y: np.ndarray
    colour: QColor
    dash: Qt.PenStyle = Qt.PenStyle.SolidLine
    width: float = 2.2
    line: str = ""  #: what it draws: a key of app.figures.LINES, or "case:<name>" for a case's curve


@dataclass
class Marker:
    x: float
    y: float
    shape: str  #: "square", "circle", "triangle", "diamond", "cross", "plus"
    colour: QColor
    filled: bool = True
    size: float = 9.0
    label: str = ""
    point: str = ""  #: the key of app.figures.POINTS it marks
    case: str = ""  #: the temperature case or demagnetization case it belongs to


@dataclass
class Panel:
    title: str
    x_label: str
    left_label: str
    x_range: tuple[float, float]
    left_range: tuple[float, float]
    series: list[Series] = field(default_factory=list)
    markers: list[Marker] = field(default_factory=list)
    note: str = ""
    shaded_from: float | None = None  #: x from which the panel is shaded as beyond the drive's limit
    bands: list[tuple[float, float, str]] = field(default_factory=list)  #: (x from, x to, a key of REGIONS)


def nice_ticks(low: float, high: float, count: int = 7) -> list[float]:
    """Round tick values covering [low, high] (steps of 1, 2, 2.5 or 5 times a power of ten)."""
    if not (math.isfinite(low) and math.isfinite(high)) or high <= low:
        return [low]
    raw = (high - low) / max(count - 1, 1)
    power = 10.0 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1.0, 2.0, 2.5, 5.0, 10.0) if m * power >= raw * 0.999)
    first = math.ceil(low / step - 1e-9) * step
    ticks = []
    value = first
    while value <= high + step * 1e-9:
        ticks.append(0.0 if abs(value) < step * 1e-9 else value)
        value += step
    return ticks


def nice_range(low: float, high: float) -> tuple[float, float]:
    """[low, high] widened to the nearest ticks, so curves end on a labelled line."""
    if not (math.isfinite(low) and math.isfinite(high)):
        return (0.0, 1.0)
    if high <= low:
        high = low + (abs(low) if low else 1.0)
    ticks = nice_ticks(low, high)
    step = ticks[1] - ticks[0] if len(ticks) > 1 else 1.0
    return (min(ticks[0], math.floor(low / step + 1e-9) * step), max(ticks[-1], math.ceil(high / step - 1e-9) * step))


def tick_label(value: float, ticks: list[float]) -> str:
    step = abs(ticks[1] - ticks[0]) if len(ticks) > 1 else abs(value) or 1.0
    decimals = max(0, -math.floor(math.log10(step) + 1e-9))
    if step * 10**decimals % 1 > 1e-6:
        decimals += 1
    text = f"{value:.{decimals}f}"
    return "0" if float(text) == 0 else text.replace("-", "−")


def plain_font(pixel_size: float, bold: bool = False) -> QFont:
    """The sheet's font at a pixel size, without ligatures, so "fi" stays two letters in PDF text search."""
    font = QFont(FONT_FAMILY)
    font.setPixelSize(max(1, round(pixel_size)))
    font.setBold(bold)
    for tag in ("liga", "clig"):
        font.setFeature(QFont.Tag(tag), 0)
    return font


_font = plain_font


def _pen(colour: QColor, width: float, dash: Qt.PenStyle = Qt.PenStyle.SolidLine) -> QPen:
    pen = QPen(colour, width, dash)
    pen.setCapStyle(Qt.PenCapStyle.FlatCap)
    pen.setJoinStyle(Qt.PenJoinStyle.RoundJoin)
    return pen


def draw_marker(painter: QPainter, centre: QPointF, shape: str, colour: QColor, size: float,
                filled: bool = True) -> None:
    painter.save()
    if shape in ("cross", "plus"):
        painter.setPen(_pen(colour, 3.0))
        painter.setBrush(Qt.BrushStyle.NoBrush)
    elif filled:
        painter.setPen(_pen(QColor("white"), 1.6))  # a white rim keeps overlapping markers apart
        painter.setBrush(QBrush(colour))
    else:
        painter.setPen(_pen(colour, 2.0))
        painter.setBrush(QBrush(QColor("white")))
    h = size / 2.0
    x, y = centre.x(), centre.y()
    if shape == "square":
        painter.drawRect(QRectF(x - h, y - h, size, size))
    elif shape == "circle":
        painter.drawEllipse(centre, h * 1.1, h * 1.1)
    elif shape == "triangle":
        painter.drawPolygon(QPolygonF([QPointF(x, y - h * 1.25), QPointF(x + h * 1.2, y + h),
                                       QPointF(x - h * 1.2, y + h)]))
    elif shape == "diamond":
        painter.drawPolygon(QPolygonF([QPointF(x, y - h * 1.3), QPointF(x + h, y), QPointF(x, y + h * 1.3),
                                       QPointF(x - h, y)]))
    elif shape == "cross":
        painter.drawLine(QPointF(x - h, y - h), QPointF(x + h, y + h))
        painter.drawLine(QPointF(x - h, y + h), QPointF(x + h, y - h))
    elif shape == "plus":
        painter.drawLine(QPointF(x - h, y), QPointF(x + h, y))
        painter.drawLine(QPointF(x, y - h), QPointF(x, y + h))
    painter.restore()


def _clip_segment(p: QPointF, q: QPointF, box: QRectF) -> tuple[QPointF, QPointF] | None:
    """The part of segment p–q inside ``box`` (Liang–Barsky line clipping), or None."""
    dx, dy = q.x() - p.x(), q.y() - p.y()
    t0, t1 = 0.0, 1.0
    for edge_p, edge_q in ((-dx, p.x() - box.left()), (dx, box.right() - p.x()),
                           (-dy, p.y() - box.top()), (dy, box.bottom() - p.y())):
        if edge_p == 0:
            if edge_q < 0:
                return None
            continue
        t = edge_q / edge_p
        if edge_p < 0:
            t0 = max(t0, t)
        else:
            t1 = min(t1, t)
        if t0 > t1:
            return None
    return QPointF(p.x() + t0 * dx, p.y() + t0 * dy), QPointF(p.x() + t1 * dx, p.y() + t1 * dy)


def clipped_path(points: list[QPointF], box: QRectF) -> QPainterPath:
    """A polyline cut to ``box`` in our own code, since not every paint device (SVG) honours a clip."""
    path = QPainterPath()
    last_end: QPointF | None = None
    for p, q in itertools.pairwise(points):
        piece = _clip_segment(p, q, box)
        if piece is None:
            last_end = None
            continue
        start, end = piece
        if last_end is None or (start - last_end).manhattanLength() > 1e-6:
            path.moveTo(start)
        path.lineTo(end)
        last_end = end
    return path


def draw_panel(painter: QPainter, frame: QRectF, panel: Panel) -> None:
    """One panel: title, grid, axes with tick labels and a unit label each, clipped curves and markers."""
    title_font, label_font, tick_font = _font(18, bold=True), _font(15), _font(14)
    left_pad = 78.0
    right_pad = 22.0
    plot = QRectF(frame.left() + left_pad, frame.top() + 30.0, frame.width() - left_pad - right_pad,
                  frame.height() - 30.0 - 54.0)

    x0, x1 = panel.x_range
    y0, y1 = panel.left_range

    def to_point(x, y):
        px = plot.left() + (x - x0) / (x1 - x0) * plot.width()
        py = plot.bottom() - (y - y0) / (y1 - y0) * plot.height()
        return QPointF(px, py)

    painter.save()
    painter.setFont(title_font)
    painter.setPen(TEXT)
    painter.drawText(QRectF(frame.left(), frame.top(), frame.width(), 26.0),
                     Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter, panel.title)

    # Grid and tick labels.
    painter.setFont(tick_font)
    x_ticks = nice_ticks(x0, x1)
    for t in x_ticks:
        p = to_point(t, y0)
        painter.setPen(_pen(GRID, 1.0))
        painter.drawLine(QPointF(p.x(), plot.top()), QPointF(p.x(), plot.bottom()))
        painter.setPen(TEXT)
        painter.drawText(QRectF(p.x() - 50, plot.bottom() + 4, 100, 18), Qt.AlignmentFlag.AlignHCenter,
                         tick_label(t, x_ticks))
    left_ticks = nice_ticks(*panel.left_range)
    for t in left_ticks:
        p = to_point(x0, t)
        painter.setPen(_pen(GRID, 1.0))
        painter.drawLine(QPointF(plot.left(), p.y()), QPointF(plot.right(), p.y()))
        painter.setPen(TEXT)
        painter.drawText(QRectF(plot.left() - 70, p.y() - 9, 64, 18),
                         Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter, tick_label(t, left_ticks))

    # Axis lines and unit labels.
    painter.setPen(_pen(AXIS, 1.4))
    painter.setBrush(Qt.BrushStyle.NoBrush)
    painter.drawRect(plot)
    painter.setFont(label_font)
    painter.setPen(TEXT)
    painter.drawText(QRectF(plot.left(), plot.bottom() + 24, plot.width(), 22), Qt.AlignmentFlag.AlignHCenter,
                     panel.x_label)
    painter.save()
    painter.translate(frame.left() + 12, plot.center().y())
    painter.rotate(-90)
    painter.drawText(QRectF(-plot.height() / 2, -10, plot.height(), 22), Qt.AlignmentFlag.AlignHCenter,
                     panel.left_label)
    painter.restore()

    if panel.shaded_from is not None and panel.shaded_from < x1:
        shade = REGIONS["beyond_limit"]
        colour = QColor(shade.colour)
        colour.setAlphaF(shade.opacity)
        left = to_point(max(panel.shaded_from, x0), y0).x()
        painter.fillRect(QRectF(left, plot.top(), plot.right() - left, plot.height()), colour)
    for start, end, region in panel.bands:
        colour = QColor(REGIONS[region].colour)
        colour.setAlphaF(REGIONS[region].opacity)
        left, right = to_point(max(start, x0), y0).x(), to_point(min(end, x1), y0).x()
        if right > left:
            painter.fillRect(QRectF(left, plot.top(), right - left, plot.height()), colour)

    # Curves cut to the plot, then markers inside it.
    painter.setBrush(Qt.BrushStyle.NoBrush)
    drawn: list[np.ndarray] = []  #: the curves as drawn, which the labels keep off
    for s in panel.series:
        finite = np.isfinite(s.x) & np.isfinite(s.y)
        points = [to_point(float(x), float(y)) for x, y in zip(s.x[finite], s.y[finite], strict=False)]
        if len(points) < 2:
            continue
        painter.setPen(_pen(s.colour, s.width, s.dash))
        painter.drawPath(clipped_path(points, plot))
        drawn.append(np.array([(p.x(), p.y()) for p in points]))
    painter.setFont(_font(13, bold=True))
    metrics = QFontMetricsF(painter.font())
    inside = plot.adjusted(-2, -2, 2, 2)
    shown = [(m, to_point(m.x, m.y)) for m in panel.markers if math.isfinite(m.x) and math.isfinite(m.y)]
    shown = [(m, centre) for m, centre in shown if inside.contains(centre)]
    for m, centre in shown:
        draw_marker(painter, centre, m.shape, m.colour, m.size, m.filled)
    _draw_labels(painter, plot, shown, drawn, metrics)
    if panel.note:
        painter.setFont(_font(12))
        painter.setPen(AXIS)
        painter.drawText(QRectF(plot.left() + 6, plot.bottom() - 24, plot.width() - 12, 18),
                         Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter, panel.note)
    painter.restore()


def _draw_labels(painter: QPainter, plot: QRectF, shown: list[tuple[Marker, QPointF]], curves: list[np.ndarray],
                 metrics: QFontMetricsF) -> None:
    """The markers' labels, clear of every marker, of each other and of the curves (app.magnet_marks, as on
    screen); a thin line leads to a label that had to move away from its marker."""
    labelled = [(m, centre) for m, centre in shown if m.label]
    if not labelled:
        return
    marks = [(c.x() - m.size / 2, c.y() - m.size / 2, c.x() + m.size / 2, c.y() + m.size / 2) for m, c in shown]
    gap = MAGNET_MARKER / 2 + 3
    boxes = magnet_marks.place_labels([(c.x(), c.y()) for _m, c in labelled],
                                      [(metrics.horizontalAdvance(m.label) + 4, 18.0) for m, _c in labelled],
                                      marks, curves, (plot.left(), plot.top(), plot.right(), plot.bottom()), gap)
    for (m, centre), box in zip(labelled, boxes, strict=True):
        ends = magnet_marks.leader((centre.x(), centre.y()), box, gap)
        if ends is not None:
            painter.setPen(_pen(AXIS, 0.8))
            painter.drawLine(QPointF(*ends[0]), QPointF(*ends[1]))
        painter.setPen(m.colour)
        painter.drawText(QRectF(box[0], box[1], box[2] - box[0], box[3] - box[1]),
                         Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter, m.label)


@dataclass
class LegendItem:
    text: str
    colour: QColor
    dash: Qt.PenStyle | None = None  #: a line sample
    shape: str = ""  #: or a marker sample
    filled: bool = True


LEGEND_ROW = 24.0


def _legend_layout(rows: list[list[LegendItem]], width: float) -> list[tuple[float, float, LegendItem]]:
    """(x, y) of every item, wrapping onto a new line where a row would run past ``width``."""
    metrics = QFontMetricsF(_font(15))
    placed = []
    y = 0.0
    for row in rows:
        x = 0.0
        for item in row:
            sample = 40.0 if item.dash is not None else (22.0 if item.shape else 0.0)
            needed = sample + metrics.horizontalAdvance(item.text)
            if x > 0 and x + needed > width:
                x, y = 0.0, y + LEGEND_ROW
            placed.append((x, y, item))
            x += needed + 26.0
        y += LEGEND_ROW
    return placed


def legend_height(rows: list[list[LegendItem]], width: float) -> float:
    placed = _legend_layout(rows, width)
    return (max(y for _, y, _ in placed) + LEGEND_ROW) if placed else 0.0


def draw_legend(painter: QPainter, frame: QRectF, rows: list[list[LegendItem]]) -> None:
    """Rows of legend items, each a line or marker sample (or none) followed by its text."""
    painter.save()
    font = _font(15)
    painter.setFont(font)
    metrics = QFontMetricsF(font)
    for dx, dy, item in _legend_layout(rows, frame.width()):
        x = frame.left() + dx
        centre_y = frame.top() + dy + 10
        if item.dash is not None:
            painter.setPen(_pen(item.colour, 2.6, item.dash))
            painter.drawLine(QPointF(x, centre_y), QPointF(x + 34, centre_y))
            x += 40
        elif item.shape:
            draw_marker(painter, QPointF(x + 8, centre_y), item.shape, item.colour, 11, item.filled)
            x += 22
        painter.setPen(TEXT if item.shape or item.dash is not None else AXIS)
        painter.drawText(QPointF(x, centre_y + metrics.ascent() / 2 - 1), item.text)
    painter.restore()


# ----------------------------------------------------------------------------------------------
# The two charts


def _temperature(value_C: float) -> str:
    """A temperature as the sheet prints it (°C, or °F on a US customary sheet), to the whole degree."""
    return figure("case.ambient_C").text(value_C, paper_unit("°C"))


def case_label(case) -> str:
    return (f"{case.name}: ambient {_temperature(case.ambient_C)}, winding {_temperature(case.winding_temperature_C)}, "
            f"magnet {_temperature(case.magnet_temperature_C)}")


def working_torque_limit(results: Results) -> float:
    """Upper end of the efficiency panel [N·m]: around the rated and best-efficiency points."""
    stall = max(c.stall_torque_N_m for c in results.cases)
    best = max(c.max_efficiency_point.torque_N_m for c in results.cases)
    span = max(3.0 * results.load_torque_N_m, 2.5 * best)
    return min(stall, span) if span > 0 else stall


def _vertical(x: float, panel: Panel, colour: str, dash: str, line: str, width: float = 1.4) -> Series:
    """A vertical line across the panel at ``x``."""
    return Series(np.array([x, x]), np.array(panel.left_range), QColor(colour), qt_pen_style(dash), width, line)


def performance_panels(results: Results) -> list[Panel]:
    unit = paper_unit(torque_unit(results))  # the sheet's system: oz·in or lbf·in on a US customary sheet
    torque = figure("curve.torque_N_m")
    stall = max(c.stall_torque_N_m for c in results.cases)
    # With a drive limit the torque axis ends a little past it, and each axis is as tall as its curves there
    # (app.performance_view, as on screen): the working range fills the panels, the region beyond is shaded.
    shown_to = torque_end(results)
    x_full = nice_range(0.0, from_si(shown_to, unit))
    torque_to = to_si(x_full[1], unit)
    tops = {name: from_si(axis_top(results, name, torque_to), figure(f"curve.{name}").unit)
            for name in CURVE_QUANTITIES if name != "efficiency"}
    working = min(working_torque_limit(results), shown_to)
    x_work = nice_range(0.0, from_si(working, unit))
    panels = []
    for name in CURVE_QUANTITIES:
        quantity = figure(f"curve.{name}")
        if name == "efficiency":
            panels.append(Panel(f"{quantity.title}, working range", torque.label(unit), quantity.label(), x_work,
                                (0.0, 100.0),
                                note="range narrowed to the working region" if working < stall * 0.999 else ""))
        else:
            panels.append(Panel(quantity.title, torque.label(unit), quantity.label(), x_full,
                                nice_range(0.0, tops[name])))
    for case in results.cases:
        style = CASES[case.name]
        torque_shown = from_si(case.curve.torque_N_m, unit)
        for panel, name in zip(panels, CURVE_QUANTITIES, strict=True):
            q_unit = figure(f"curve.{name}").unit
            panel.series.append(Series(torque_shown, from_si(getattr(case.curve, name), q_unit), QColor(style.colour),
                                       qt_pen_style(style.dash), line=f"case:{case.name}"))
            for point, field_name in CASE_POINTS.items():
                if point == "rated" and not case.rated_reached:
                    continue  # the motor stalls before the rated torque: there is no rated point
                at = getattr(case, field_name)
                panel.markers.append(point_marker(point, from_si(at.torque_N_m, unit),
                                                  from_si(getattr(at, name), q_unit), case.name))
    rated, limit_style = LINES["rated_torque"], LINES["drive_limit"]
    for panel in panels:
        panel.series.insert(0, _vertical(from_si(results.load_torque_N_m, unit), panel, rated.colour, rated.dash,
                                         "rated_torque", 1.0))
    limit = drive_current_limit(results)
    limit_torque = results.nominal.current_limit_torque_N_m
    if limit is not None:
        # Above this line the current panel's curves are out of the drive's reach.
        current = panels[CURVE_QUANTITIES.index("current_A")]
        current.series.append(Series(np.array(x_full), np.array([limit, limit]), QColor(limit_style.colour),
                                     qt_pen_style(limit_style.dash), 1.6, "drive_limit"))
    if limit_torque is not None:
        for panel in panels:
            panel.series.append(_vertical(from_si(limit_torque, unit), panel, limit_style.colour, limit_style.dash,
                                          "drive_limit", 1.6))
            panel.shaded_from = from_si(limit_torque, unit)
    speed = panels[CURVE_QUANTITIES.index("speed_rad_per_s")]
    speed.markers.append(point_marker("required", from_si(results.load_torque_N_m, unit),
                                      from_si(results.load_speed_rad_per_s, "rpm")))
    return panels


def _legend_point(point: str) -> LegendItem:
    style = POINTS[point]
    return LegendItem(style.title, QColor(style.colour) if style.colour else AXIS, shape=style.marker,
                      filled=style.filled)


def _short_point(point: str) -> LegendItem:
    """A point's sample with its short text, for a key that is short of room."""
    item = _legend_point(point)
    item.text = POINTS[point].key_text
    return item


def _legend_line(line: str, text: str = "") -> LegendItem:
    style = LINES[line]
    return LegendItem(text or style.title, QColor(style.colour), qt_pen_style(style.dash))


def performance_legend(results: Results) -> list[list[LegendItem]]:
    limit = drive_current_limit(results)
    return [
        [LegendItem(style.title, QColor(style.colour), qt_pen_style(style.dash)) for style in CASES.values()]
        + [_legend_point(point) for point in CASE_POINTS] + [_legend_point("required"), _legend_line("rated_torque")]
        + ([_legend_line("drive_limit", f"{LINES['drive_limit'].title}, {figure('current_limit_A').text(limit)} "
                                        "(its torque: nominal case)"),
            LegendItem(REGIONS["beyond_limit"].title, QColor(REGIONS["beyond_limit"].colour), shape="square")]
           if limit is not None else []),
        [LegendItem(case_label(c), AXIS) for c in results.cases],
    ]


def _begin_chart(painter: QPainter, width: float, height: float, legend: list[list[LegendItem]]) -> tuple[float, float]:
    """Scale the painter to the canvas, paint the background and the legend; returns (canvas height, panels' top)."""
    painter.save()
    painter.scale(width / CANVAS_WIDTH, width / CANVAS_WIDTH)
    canvas_height = CANVAS_WIDTH * height / width
    painter.fillRect(QRectF(0, 0, CANVAS_WIDTH, canvas_height), QColor("white"))
    legend_width = CANVAS_WIDTH - 28
    draw_legend(painter, QRectF(14, 10, legend_width, 0), legend)
    return canvas_height, 18.0 + legend_height(legend, legend_width)


def draw_performance_chart(painter: QPainter, width: float, height: float, results: Results) -> None:
    """Speed, current, power and efficiency against torque for the cold, nominal and hot cases."""
    h, top = _begin_chart(painter, width, height, performance_legend(results))
    cell_w = (CANVAS_WIDTH - 10) / 2
    cell_h = (h - top - 6) / 2
    for index, panel in enumerate(performance_panels(results)):
        row, col = divmod(index, 2)
        draw_panel(painter, QRectF(5 + col * cell_w, top + row * cell_h, cell_w - 6, cell_h - 6), panel)
    painter.restore()


def demagnetization_point_labels(results: Results) -> list[str]:
    """The numbers of the demagnetization cases, as the datasheet's table and the chart print them."""
    return magnet_marks.design_labels(results)


def magnet_panel(results: Results) -> Panel:
    """Curves, load lines, knees and every case's marks, from :mod:`app.magnet_marks` as on screen."""
    chart = results.magnet_chart
    marks = magnet_marks.case_marks(results)
    field_figure = figure("magnet_chart_case.curves.field_strength")
    density = figure("magnet_chart_case.curves.flux_density")
    field_unit = field_figure.unit
    fields = [from_si(c.curves.field_strength, field_unit) for c in chart]
    x_low = min(float(np.min(f)) for f in fields)
    x_low = min([x_low] + [from_si(m.worst_field, field_unit) * 1.05 for m in marks])
    b_top = max(c.curves.remanence for c in chart)
    floor, bottom = magnet_marks.chart_floor(results, marks)
    y_range = nice_range(bottom, b_top * 1.08)
    panel = Panel(f"Magnet {results.magnet.name}: second quadrant", field_figure.label(), density.label(),
                  nice_range(x_low, 0.0), y_range)
    load_dash = qt_pen_style(LINES["load_line"].dash)
    for c in chart:
        colour = case_colour(c.name)
        h = from_si(c.curves.field_strength, field_unit)
        panel.series.append(Series(h, c.curves.flux_density, colour, Qt.PenStyle.SolidLine, 2.4, f"case:{c.name}"))
        panel.series.append(Series(h, c.curves.polarization, colour, Qt.PenStyle.DashLine, 2.0, f"case:{c.name}"))
        # Load line: from the origin through the operating point (slope −μ0·Pc).
        hm = from_si(c.operating_field_A_per_m, field_unit)
        scale = panel.x_range[0] / hm if hm < 0 else 1.0
        panel.series.append(Series(np.array([0.0, hm * scale]), np.array([0.0, c.operating_flux_density_T * scale]),
                                   colour, load_dash, 1.6, "load_line"))
        panel.markers.append(point_marker("operating_point", hm, c.operating_flux_density_T, c.name, MAGNET_MARKER))
        knee_h = from_si(c.curves.knee_field, field_unit)
        # The knee on both curves, as on screen: where J falls off, and the B it takes there.
        knee_j = float(np.interp(c.curves.knee_field, c.curves.field_strength, c.curves.polarization))
        for knee_b in (c.curves.knee_flux_density, knee_j):
            panel.markers.append(point_marker("knee", knee_h, knee_b, c.name, MAGNET_MARKER))
    shifted = magnet_marks.shifted_load_line(results)
    if shifted is not None:
        h, b = shifted.points()
        panel.series.append(Series(from_si(h, field_unit), b, case_colour(shifted.temperature_case),
                                   qt_pen_style(LINES["shifted_load_line"].dash), 2.0, "shifted_load_line"))
    least = magnet_marks.least_margin_mark(marks)
    # The segments and the means first, so that the cases' own marks are drawn over them.
    case_markers = []
    for label, members in magnet_marks.grouped(marks):
        mark = members[0]
        seg_h, seg_b = mark.segments
        shown = (seg_b >= floor) & (seg_h <= 0.0)  # magnetized segments sit right of the chart
        for x, y in zip(from_si(seg_h[shown], field_unit), seg_b[shown], strict=True):
            panel.markers.append(point_marker("magnet_segment", float(x), float(y), mark.name, MAGNET_MARKER,
                                              mark.colour))
        mean_h, mean_b = mark.mean
        if mark.mean_on_curve and mean_b >= floor:
            panel.markers.append(point_marker("magnet_mean", from_si(mean_h, field_unit), mean_b, mark.name,
                                              MAGNET_MARKER, mark.colour))
        b, off_scale = magnet_marks.on_scale(mark.worst_flux_density, floor)
        text = magnet_marks.group_label(label, members, least) + (f" {magnet_marks.OFF_SCALE}" if off_scale else "")
        case_markers.append(point_marker(mark.point, from_si(mark.worst_field, field_unit), b, mark.name,
                                         MAGNET_MARKER, mark.colour, text))
    # Labels are placed in this order: the failed cases first, they are what the chart is for.
    panel.markers += sorted(case_markers, key=lambda m: "FAILS" not in m.label)
    return panel


def magnet_legend(results: Results) -> list[list[LegendItem]]:
    temperatures = {c.name: c for c in results.magnet_chart}
    marks = magnet_marks.case_marks(results)
    present = {m.point for m in marks}
    shifted = magnet_marks.shifted_load_line(results)
    states = [point for point in ("demagnetization_safe", "demagnetization_marginal", "demagnetization_fails",
                                  "fault_safe", "fault_marginal", "fault_fails")
              if point in present or point == "demagnetization_safe"]
    numbers = "cases numbered as in the table" + ("; faults (supply applied directly) F1, F2, ..."
                                                   if results.faults is not None else "")
    return [
        [LegendItem(f"{name} (magnet {_temperature(temperatures[name].curves.temperature_C)}, Pc "
                    f"{figure('magnet_chart_case.permeance_coefficient').text(temperatures[name].permeance_coefficient)})",
                    QColor(style.colour), Qt.PenStyle.SolidLine)
         for name, style in CASES.items()],
        [LegendItem("normal curve B", AXIS, Qt.PenStyle.SolidLine),
         LegendItem("intrinsic curve J", AXIS, Qt.PenStyle.DashLine), _legend_line("load_line")]
        + ([_legend_line("shifted_load_line", shifted.title(short=True))] if shifted is not None else []),
        [_short_point("operating_point"), _legend_point("knee")] + [_short_point(point) for point in states]
        + [_short_point("magnet_mean"), _short_point("magnet_segment")],
        [LegendItem(numbers if numbers.endswith("...") else numbers + ".", AXIS)],
        [LegendItem("Each case's mark is the mean field over the worst 5 % of its magnet's area.", AXIS)],
        [LegendItem(magnet_marks.PC_NOTE_PRINTED, AXIS)],
    ]


def draw_magnet_chart(painter: QPainter, width: float, height: float, results: Results) -> None:
    """Normal and intrinsic curves, load lines, operating points, knees and demagnetization cases."""
    h, top = _begin_chart(painter, width, height, magnet_legend(results))
    draw_panel(painter, QRectF(5, top, CANVAS_WIDTH - 10, h - top - 6), magnet_panel(results))
    painter.restore()


def thermal_panel(results: Results) -> Panel:
    """Winding, magnet and housing temperatures against time over the duty, with both limits as lines."""
    t = results.thermal
    unit = paper_unit("°C")
    plot = duty_plot(t, unit)
    time = figure("thermal.transient.time_s")
    if plot is None:
        return Panel(chart_title(t, unit), time.label(), temperature_label(unit), (0.0, 1.0), (0.0, 1.0),
                     note="no temperatures against time in these results")
    panel = Panel(chart_title(t, unit), time.label(), temperature_label(unit),
                  (0.0, float(plot.time[-1])), nice_range(*plot.temperature_range))  # time: to the transient's end
    panel.bands = [(start, end, "loaded") for start, end in plot.spells]
    for line, value in plot.limits.items():
        style = LINES[line]
        panel.series.append(Series(np.array(panel.x_range), np.array([value, value]), QColor(style.colour),
                                   qt_pen_style(style.dash), 1.4, line))
    for line, values in plot.curves.items():
        style = LINES[line]
        panel.series.append(Series(plot.time, values, QColor(style.colour), qt_pen_style(style.dash),
                                   2.6 if line == "winding_temperature" else 2.0, line))
    if plot.limit_reached is not None:
        at, value = plot.limit_reached
        panel.markers.append(point_marker("class_limit_reached", at, value, base_size=MAGNET_MARKER,
                                          label=f"{figure('thermal.time_to_limit_s').text(at * 60.0)}"))
    return panel


def thermal_legend(results: Results) -> list[list[LegendItem]]:
    t = results.thermal
    limit = _temperature(t.insulation_limit_C)
    rows = [[_legend_line(line) for line in ("winding_temperature", "magnet_temperature", "housing_temperature")]
            + ([LegendItem(REGIONS["loaded"].title, QColor(REGIONS["loaded"].colour), shape="square")]
               if t.duty != "S1" else []),
            [_legend_line("insulation_limit", f"{LINES['insulation_limit'].title}, class {t.insulation_class}: "
                                              f"{limit}"),
             _legend_line("magnet_limit", f"{LINES['magnet_limit'].title} ({results.magnet.name}): "
                                          f"{_temperature(t.magnet_limit_C)}")]]
    if limit_reached_at(t) is not None:
        rows[-1].append(_legend_point("class_limit_reached"))
    return rows


def draw_thermal_chart(painter: QPainter, width: float, height: float, results: Results) -> None:
    """Temperatures against time over the duty, at the highest ambient."""
    h, top = _begin_chart(painter, width, height, thermal_legend(results))
    draw_panel(painter, QRectF(5, top, CANVAS_WIDTH - 10, h - top - 6), thermal_panel(results))
    painter.restore()


DRAWERS = {"performance": (draw_performance_chart, PERFORMANCE_ASPECT), "magnet": (draw_magnet_chart, MAGNET_ASPECT),
           "thermal": (draw_thermal_chart, THERMAL_ASPECT), "outline": (draw_outline, OUTLINE_ASPECT)}
#: what the datasheet embeds; the performance and magnet charts are also exported alone
SHEET_DRAWINGS = (*CHART_NAMES, "thermal", "outline")


# ----------------------------------------------------------------------------------------------
# Output


def chart_image(name: str, results: Results, width_px: int = 2000) -> QImage:
    draw, aspect = DRAWERS[name]
    height_px = round(width_px * aspect)
    image = QImage(width_px, height_px, QImage.Format.Format_RGB32)
    image.fill(QColor("white"))
    painter = QPainter(image)
    painter.setRenderHint(QPainter.RenderHint.Antialiasing)
    painter.setRenderHint(QPainter.RenderHint.TextAntialiasing)
    try:
        draw(painter, width_px, height_px, results)
    finally:  # a painter left open on an image crashes Qt when the image goes
        painter.end()
    return image


def chart_png(name: str, results: Results, width_px: int = 2000) -> bytes:
    image = chart_image(name, results, width_px)
    data = QByteArray()
    buffer = QBuffer(data)
    buffer.open(QIODevice.OpenModeFlag.WriteOnly)
    if not image.save(buffer, "PNG"):
        raise RuntimeError(f"the {name} chart could not be encoded as PNG")
    buffer.close()
    return bytes(data.data())


def chart_svg(name: str, results: Results, title: str = "") -> str:
    """The chart as an SVG document (vector; text stays text)."""
    draw, aspect = DRAWERS[name]
    width = CANVAS_WIDTH
    height = round(width * aspect)
    data = QByteArray()
    buffer = QBuffer(data)
    buffer.open(QIODevice.OpenModeFlag.WriteOnly)
    generator = QSvgGenerator()
    generator.setOutputDevice(buffer)
    generator.setSize(QSize(int(width), int(height)))
    generator.setViewBox(QRectF(0, 0, width, height))
    generator.setTitle(title or f"{name} chart")
    generator.setDescription("pmdc-sizer chart; engineering estimates, to be confirmed by test")
    painter = QPainter(generator)
    draw(painter, width, height, results)
    painter.end()
    buffer.close()
    return bytes(data.data()).decode("utf-8")
