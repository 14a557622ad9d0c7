"""The datasheet's two charts, drawn with QPainter on any paint device (image, SVG, PDF page).

No window is needed: the same drawing goes to a QImage for PNG and the PDF, and to a QSvgGenerator
for SVG and the HTML. The charts only plot the arrays and points the core returns; the one line they
add, the load line, is the straight line from the origin through the operating point that the
permeance coefficient defines.

Every chart is drawn in a fixed logical canvas (``CANVAS_WIDTH`` wide, in "chart units"), scaled to
the device, so text and lines keep their proportions at any resolution.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from PySide6.QtCore import QByteArray, QBuffer, QIODevice, QPointF, QRectF, QSize, Qt
from PySide6.QtGui import QBrush, QColor, QFont, QFontMetricsF, QImage, QPainter, QPainterPath, QPen, QPolygonF
from PySide6.QtSvg import QSvgGenerator

from pmdc_sizer.core.results import Results
from pmdc_sizer.core.units import from_si

CANVAS_WIDTH = 1000.0
PERFORMANCE_ASPECT = 0.78  #: height over width of the performance chart
MAGNET_ASPECT = 0.56

FONT_FAMILY = "DejaVu Sans"
TEXT = QColor("#1b1f24")
GRID = QColor("#d9dde3")
AXIS = QColor("#5b6470")
FAIL = QColor("#c0001a")
REQUIRED = QColor("#6a2c91")
LIMIT = QColor("#2e8b57")

#: One colour and one dash per temperature case, so the cases differ in print and in grey scale too.
CASE_STYLE = {
    "cold": (QColor("#1d5fb4"), Qt.PenStyle.DashLine),
    "nominal": (QColor("#1b1f24"), Qt.PenStyle.SolidLine),
    "hot": (QColor("#d0451b"), Qt.PenStyle.DashDotLine),
}

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


@dataclass
class Marker:
    x: float
    y: float
    shape: str  #: "square", "circle", "triangle", "diamond", "cross", "plus"
    colour: QColor
    filled: bool = True
    size: float = 9.0
    label: str = ""


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


def draw_marker(painter: QPainter, centre: QPointF, shape: str, colour: QColor, size: float, filled: bool = True) -> None:
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
        painter.drawPolygon(QPolygonF([QPointF(x, y - h * 1.25), QPointF(x + h * 1.2, y + h), QPointF(x - h * 1.2, y + h)]))
    elif shape == "diamond":
        painter.drawPolygon(QPolygonF([QPointF(x, y - h * 1.3), QPointF(x + h, y), QPointF(x, y + h * 1.3), QPointF(x - h, y)]))
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
    for p, q in zip(points, points[1:]):
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
        painter.drawText(QRectF(p.x() - 50, plot.bottom() + 4, 100, 18), Qt.AlignmentFlag.AlignHCenter, tick_label(t, x_ticks))
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
    painter.drawText(QRectF(plot.left(), plot.bottom() + 24, plot.width(), 22), Qt.AlignmentFlag.AlignHCenter, panel.x_label)
    painter.save()
    painter.translate(frame.left() + 12, plot.center().y())
    painter.rotate(-90)
    painter.drawText(QRectF(-plot.height() / 2, -10, plot.height(), 22), Qt.AlignmentFlag.AlignHCenter, panel.left_label)
    painter.restore()

    # Curves cut to the plot, then markers inside it.
    painter.setBrush(Qt.BrushStyle.NoBrush)
    for s in panel.series:
        finite = np.isfinite(s.x) & np.isfinite(s.y)
        points = [to_point(float(x), float(y)) for x, y in zip(s.x[finite], s.y[finite])]
        if len(points) < 2:
            continue
        painter.setPen(_pen(s.colour, s.width, s.dash))
        painter.drawPath(clipped_path(points, plot))
    painter.setFont(_font(13, bold=True))
    metrics = QFontMetricsF(painter.font())
    inside = plot.adjusted(-2, -2, 2, 2)
    shown = [(m, to_point(m.x, m.y)) for m in panel.markers if math.isfinite(m.x) and math.isfinite(m.y)]
    shown = [(m, centre) for m, centre in shown if inside.contains(centre)]
    # Labels keep clear of every marker and of each other: the first free corner around the point wins.
    taken = [QRectF(c.x() - m.size / 2, c.y() - m.size / 2, m.size, m.size) for m, c in shown]
    for m, centre in shown:
        draw_marker(painter, centre, m.shape, m.colour, m.size, m.filled)
    for m, centre in shown:
        if not m.label:
            continue
        width, height = metrics.horizontalAdvance(m.label) + 4, 18.0
        gap = m.size / 2 + 3
        candidates = [QRectF(centre.x() + gap, centre.y() - gap - height + 4, width, height),
                      QRectF(centre.x() + gap, centre.y() + gap - 4, width, height),
                      QRectF(centre.x() - gap - width, centre.y() - gap - height + 4, width, height),
                      QRectF(centre.x() - gap - width, centre.y() + gap - 4, width, height)]
        fitting = [box for box in candidates if plot.contains(box)] or candidates
        box = next((b for b in fitting if not any(b.intersects(t) for t in taken)), fitting[0])
        taken.append(box)
        painter.setPen(m.colour)
        painter.drawText(box, Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter, m.label)
    if panel.note:
        painter.setFont(_font(12))
        painter.setPen(AXIS)
        painter.drawText(QRectF(plot.left() + 6, plot.bottom() - 24, plot.width() - 12, 18),
                         Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter, panel.note)
    painter.restore()


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


def torque_unit(results: Results) -> str:
    """mN·m for small motors, N·m once the stall torque reaches 10 N·m (the whole sheet uses one)."""
    return "N·m" if max(c.stall_torque_N_m for c in results.cases) >= 10.0 else "mN·m"


def case_label(case) -> str:
    return (f"{case.name}: ambient {case.ambient_C:.0f} °C, winding {case.winding_temperature_C:.0f} °C, "
            f"magnet {case.magnet_temperature_C:.0f} °C")


def working_torque_limit(results: Results) -> float:
    """Upper end of the efficiency panel [N·m]: around the rated and best-efficiency points."""
    stall = max(c.stall_torque_N_m for c in results.cases)
    best = max(c.max_efficiency_point.torque_N_m for c in results.cases)
    span = max(3.0 * results.load_torque_N_m, 2.5 * best)
    return min(stall, span) if span > 0 else stall


def drive_current_limit(results: Results) -> float | None:
    """The drive's current limit [A], as the demagnetization case at that limit carries it; None without one."""
    return next((c.current_A for c in results.demagnetization.cases if c.kind == "current limit"), None)


def performance_panels(results: Results) -> list[Panel]:
    unit = torque_unit(results)
    stall = max(c.stall_torque_N_m for c in results.cases)
    top = from_si(stall, unit)
    speed_top = max(from_si(c.no_load_speed_rad_per_s, "rpm") for c in results.cases)
    current_top = max(c.stall_current_A for c in results.cases)
    power_top = max(c.max_output_power_W for c in results.cases)
    working = working_torque_limit(results)
    x_full = nice_range(0.0, top)
    x_work = nice_range(0.0, from_si(working, unit))
    panels = [
        Panel("Speed", f"Shaft torque [{unit}]", "Speed [rpm]", x_full, nice_range(0.0, speed_top * 1.02)),
        Panel("Current", f"Shaft torque [{unit}]", "Armature current [A]", x_full, nice_range(0.0, current_top * 1.02)),
        Panel("Output power", f"Shaft torque [{unit}]", "Output power [W]", x_full, nice_range(0.0, power_top * 1.08)),
        Panel("Efficiency, working range", f"Shaft torque [{unit}]", "Efficiency [%]", x_work, (0.0, 100.0),
              note="range narrowed to the working region" if working < stall * 0.999 else ""),
    ]
    quantities = (("speed_rad_per_s", "rpm"), ("current_A", "A"), ("output_power_W", "W"), ("efficiency", "%"))
    for case in results.cases:
        colour, dash = CASE_STYLE[case.name]
        torque = from_si(case.curve.torque_N_m, unit)
        for panel, (name, q_unit) in zip(panels, quantities):
            panel.series.append(Series(torque, from_si(getattr(case.curve, name), q_unit), colour, dash))
            points = (
                (case.rated, "square"),
                (case.max_efficiency_point, "circle"),
                (case.max_power_point, "triangle"),
            )
            for point, shape in points:
                value = {"speed_rad_per_s": point.speed_rad_per_s, "current_A": point.current_A,
                         "output_power_W": point.output_power_W, "efficiency": point.efficiency}[name]
                panel.markers.append(Marker(from_si(point.torque_N_m, unit), from_si(value, q_unit), shape, colour))
    limit = drive_current_limit(results)
    if limit is not None:
        # Above this line the current panel's curves are out of the drive's reach.
        panels[1].series.append(Series(np.array(x_full), np.array([limit, limit]), LIMIT, Qt.PenStyle.DotLine, 2.4))
    required = Marker(from_si(results.load_torque_N_m, unit), from_si(results.load_speed_rad_per_s, "rpm"), "plus",
                      REQUIRED, size=16)
    panels[0].markers.append(required)
    return panels


def performance_legend(results: Results) -> list[list[LegendItem]]:
    return [
        [LegendItem(f"{name}", colour, dash) for name, (colour, dash) in CASE_STYLE.items()]
        + [LegendItem("rated point", AXIS, shape="square"), LegendItem("best efficiency", AXIS, shape="circle"),
           LegendItem("maximum power", AXIS, shape="triangle"),
           LegendItem("required speed at rated torque", REQUIRED, shape="plus")]
        + ([LegendItem(f"drive current limit, {drive_current_limit(results):g} A", LIMIT, Qt.PenStyle.DotLine)]
           if drive_current_limit(results) is not None else []),
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
    """Number labels for the demagnetization cases; cases at the same point share one label."""
    return [str(i + 1) for i in range(len(results.demagnetization.cases))]


def _demagnetization_colour(case) -> QColor:
    """Cold cases in the cold colour, the others (hot) in the hot colour, as their names say."""
    return CASE_STYLE["cold" if "cold" in case.name else "hot"][0]


def magnet_panel(results: Results) -> Panel:
    chart = results.magnet_chart
    cases = results.demagnetization.cases
    fields = [from_si(c.curves.field_strength, "kA/m") for c in chart]
    x_low = min(float(np.min(f)) for f in fields)
    x_low = min([x_low] + [from_si(c.magnet_field_A_per_m, "kA/m") * 1.05 for c in cases])
    b_top = max(c.curves.remanence for c in chart)
    b_low = min([0.0] + [c.curves.knee_flux_density for c in chart] + [c.magnet_flux_density_T for c in cases])
    y_range = nice_range(b_low - (0.05 * b_top if b_low < 0 else 0.0), b_top * 1.08)
    panel = Panel(f"Magnet {results.magnet.name}: second quadrant", "Field strength H [kA/m]",
                  "Flux density B, polarization J [T]", nice_range(x_low, 0.0), y_range)
    for c in chart:
        colour, _ = CASE_STYLE[c.name]
        h = from_si(c.curves.field_strength, "kA/m")
        panel.series.append(Series(h, c.curves.flux_density, colour, Qt.PenStyle.SolidLine, 2.4))
        panel.series.append(Series(h, c.curves.polarization, colour, Qt.PenStyle.DashLine, 2.0))
        # Load line: from the origin through the operating point (slope −μ0·Pc).
        hm = from_si(c.operating_field_A_per_m, "kA/m")
        scale = panel.x_range[0] / hm if hm < 0 else 1.0
        panel.series.append(Series(np.array([0.0, hm * scale]), np.array([0.0, c.operating_flux_density_T * scale]),
                                   colour, Qt.PenStyle.DotLine, 1.6))
        panel.markers.append(Marker(hm, c.operating_flux_density_T, "circle", colour, size=12))
        panel.markers.append(Marker(from_si(c.curves.knee_field, "kA/m"), c.curves.knee_flux_density, "diamond", colour,
                                    filled=False, size=12))
    labels = demagnetization_point_labels(results)
    groups: dict[tuple[float, float], list[int]] = {}
    for index, case in enumerate(cases):
        key = (round(case.magnet_field_A_per_m, -2), round(case.magnet_flux_density_T, 3), case.ok)
        groups.setdefault(key, []).append(index)
    for key, members in groups.items():
        case = cases[members[0]]
        colour = _demagnetization_colour(case)
        text = ",".join(labels[i] for i in members)
        if case.ok:
            panel.markers.append(Marker(from_si(case.magnet_field_A_per_m, "kA/m"), case.magnet_flux_density_T, "triangle",
                                        colour, filled=False, size=12, label=text))
        else:
            panel.markers.append(Marker(from_si(case.magnet_field_A_per_m, "kA/m"), case.magnet_flux_density_T, "cross",
                                        FAIL, size=18, label=f"{text} FAILS"))
    return panel


def magnet_legend(results: Results) -> list[list[LegendItem]]:
    temperatures = {c.name: c.curves.temperature_C for c in results.magnet_chart}
    return [
        [LegendItem(f"{name} (magnet {temperatures[name]:.0f} °C)", colour, Qt.PenStyle.SolidLine)
         for name, (colour, _) in CASE_STYLE.items()],
        [LegendItem("normal curve B", AXIS, Qt.PenStyle.SolidLine), LegendItem("intrinsic curve J", AXIS, Qt.PenStyle.DashLine),
         LegendItem("load line", AXIS, Qt.PenStyle.DotLine), LegendItem("no-load operating point", AXIS, shape="circle")],
        [LegendItem("knee", AXIS, shape="diamond", filled=False),
         LegendItem("demagnetization case n, safe", AXIS, shape="triangle", filled=False),
         LegendItem("case past the knee: demagnetizes", FAIL, shape="cross")],
    ]


def draw_magnet_chart(painter: QPainter, width: float, height: float, results: Results) -> None:
    """Normal and intrinsic curves, load lines, operating points, knees and demagnetization cases."""
    h, top = _begin_chart(painter, width, height, magnet_legend(results))
    draw_panel(painter, QRectF(5, top, CANVAS_WIDTH - 10, h - top - 6), magnet_panel(results))
    painter.restore()


DRAWERS = {"performance": (draw_performance_chart, PERFORMANCE_ASPECT), "magnet": (draw_magnet_chart, MAGNET_ASPECT)}


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
    draw(painter, width_px, height_px, results)
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
