"""The outline drawing: an end view and a side view with the main dimensions, from ``results.geometry``.

Drawn to scale with QPainter in the charts' logical canvas (``CANVAS_WIDTH`` wide). Only what the
design fixes is dimensioned: housing diameter and length, shaft diameter, magnet length and its
overhang beyond the stack. The shaft extension, terminals and mounting are not part of the design, so
the shaft stub is drawn short and unlabelled in length. Titles and digits come from :mod:`app.figures`,
the unit from the sheet's unit system (:func:`app.datasheet.content.paper_unit`).
"""

from __future__ import annotations

import math

from PySide6.QtCore import QPointF, QRectF, Qt
from PySide6.QtGui import QBrush, QColor, QFont, QPainter, QPainterPath, QPen, QPolygonF

from pmdc_sizer.core.results import Results

from ..figures import figure
from ..formatting import unit_label
from .paper_units import paper_unit

CANVAS_WIDTH = 1000.0
OUTLINE_ASPECT = 0.46  #: height over width
INK = QColor("#1b1f24")
DIMENSION = QColor("#24476b")
MAGNET_FILL = QColor("#c9d3de")
STEEL_FILL = QColor("#eef2f6")
COPPER_FILL = QColor("#e8d6c4")
SHAFT_STUB_FRACTION = 0.22  #: drawn shaft extension over housing length: a picture, not a dimension


def _font(size: float, bold: bool = False) -> QFont:
    font = QFont("DejaVu Sans")
    font.setPixelSize(max(1, round(size)))
    font.setBold(bold)
    for tag in ("liga", "clig"):
        font.setFeature(QFont.Tag(tag), 0)
    return font


def _length(key: str, value_m: float) -> str:
    return figure(key).text(value_m, paper_unit("mm"))


def _arrow_head(painter: QPainter, tip: QPointF, towards: QPointF, size: float = 7.0) -> None:
    angle = math.atan2(towards.y() - tip.y(), towards.x() - tip.x())
    left = QPointF(tip.x() + size * math.cos(angle + 0.35), tip.y() + size * math.sin(angle + 0.35))
    right = QPointF(tip.x() + size * math.cos(angle - 0.35), tip.y() + size * math.sin(angle - 0.35))
    painter.setBrush(QBrush(DIMENSION))
    painter.drawPolygon(QPolygonF([tip, left, right]))


def dimension(painter: QPainter, a: QPointF, b: QPointF, text: str, offset: float, label_side: int = -1) -> None:
    """A dimension between ``a`` and ``b``: extension lines, the dimension line ``offset`` away, arrows, text."""
    dx, dy = b.x() - a.x(), b.y() - a.y()
    length = math.hypot(dx, dy) or 1.0
    nx, ny = -dy / length, dx / length  # unit normal
    a2 = QPointF(a.x() + nx * offset, a.y() + ny * offset)
    b2 = QPointF(b.x() + nx * offset, b.y() + ny * offset)
    painter.setPen(QPen(DIMENSION, 0.8))
    overshoot = 4.0 if offset >= 0 else -4.0
    for start, end in ((a, a2), (b, b2)):
        painter.drawLine(start, QPointF(end.x() + nx * overshoot, end.y() + ny * overshoot))
    painter.setPen(QPen(DIMENSION, 1.1))
    painter.drawLine(a2, b2)
    _arrow_head(painter, a2, b2)
    _arrow_head(painter, b2, a2)
    painter.save()
    middle = QPointF((a2.x() + b2.x()) / 2, (a2.y() + b2.y()) / 2)
    painter.translate(middle)
    angle = math.degrees(math.atan2(dy, dx))
    if angle > 90 or angle <= -90:
        angle -= 180
    painter.rotate(angle)
    painter.setPen(DIMENSION)
    painter.setFont(_font(13))
    box = QRectF(-150, -22 if label_side < 0 else 3, 300, 19)
    painter.drawText(box, Qt.AlignmentFlag.AlignCenter, text)
    painter.restore()


def _title(painter: QPainter, x: float, y: float, text: str) -> None:
    painter.setPen(INK)
    painter.setFont(_font(15, bold=True))
    painter.drawText(QPointF(x, y), text)


def draw_end_view(painter: QPainter, frame: QRectF, results: Results, scale: float) -> None:
    """Seen from the drive end: housing ring, magnets, armature and shaft, concentric."""
    g = results.geometry
    centre = QPointF(frame.center().x(), frame.center().y() + 6)
    _title(painter, frame.left(), frame.top() + 14, "End view, from the drive end")

    def circle(diameter_m: float, pen: QPen, brush: QBrush | None = None) -> float:
        radius = diameter_m / 2 * scale
        painter.setPen(pen)
        painter.setBrush(brush or Qt.BrushStyle.NoBrush)
        painter.drawEllipse(centre, radius, radius)
        return radius

    outer = circle(g.housing_outer_diameter_m, QPen(INK, 1.6), QBrush(STEEL_FILL))
    circle(g.housing_inner_diameter_m, QPen(INK, 1.0), QBrush(QColor("white")))
    # Magnets: one arc segment per pole, centred on the pole axes.
    inner_r = g.magnet_inner_diameter_m / 2 * scale
    outer_r = inner_r + g.magnet_thickness_m * scale
    half_arc = math.degrees(g.magnet_arc_rad) / 2
    painter.setPen(QPen(INK, 0.9))
    painter.setBrush(QBrush(MAGNET_FILL))
    for pole in range(g.poles):
        axis = 90.0 + pole * 360.0 / g.poles
        path = QPainterPath()
        path.arcMoveTo(QRectF(centre.x() - outer_r, centre.y() - outer_r, 2 * outer_r, 2 * outer_r), axis - half_arc)
        path.arcTo(QRectF(centre.x() - outer_r, centre.y() - outer_r, 2 * outer_r, 2 * outer_r),
                   axis - half_arc, 2 * half_arc)
        path.arcTo(QRectF(centre.x() - inner_r, centre.y() - inner_r, 2 * inner_r, 2 * inner_r),
                   axis + half_arc, -2 * half_arc)
        path.closeSubpath()
        painter.drawPath(path)
    circle(g.armature_diameter_m, QPen(INK, 1.0), QBrush(COPPER_FILL))
    shaft = circle(g.shaft_diameter_m, QPen(INK, 1.0), QBrush(QColor("#9aa4b1")))
    # Centre lines.
    painter.setPen(QPen(QColor("#9aa4b1"), 0.7, Qt.PenStyle.DashDotLine))
    reach = outer + 12
    painter.drawLine(QPointF(centre.x() - reach, centre.y()), QPointF(centre.x() + reach, centre.y()))
    painter.drawLine(QPointF(centre.x(), centre.y() - reach), QPointF(centre.x(), centre.y() + reach))
    # Rotation for A1 positive: clockwise seen from the drive end.
    painter.setPen(QPen(DIMENSION, 1.3))
    painter.setBrush(Qt.BrushStyle.NoBrush)
    arrow_r = outer + 20
    rect = QRectF(centre.x() - arrow_r, centre.y() - arrow_r, 2 * arrow_r, 2 * arrow_r)
    painter.drawArc(rect, 120 * 16, -60 * 16)  # Qt: positive angles run counter-clockwise
    tip = QPointF(centre.x() + arrow_r * math.cos(math.radians(60)), centre.y() - arrow_r * math.sin(math.radians(60)))
    before = QPointF(centre.x() + arrow_r * math.cos(math.radians(66)),
                     centre.y() - arrow_r * math.sin(math.radians(66)))
    _arrow_head(painter, tip, before, 9.0)
    painter.setPen(DIMENSION)
    painter.setFont(_font(12))
    painter.drawText(QRectF(centre.x() - 120, centre.y() - arrow_r - 26, 240, 16), Qt.AlignmentFlag.AlignCenter,
                     "rotation with A1 positive")
    # Dimensions: housing diameter below, shaft diameter beside.
    dimension(painter, QPointF(centre.x() - outer, centre.y()), QPointF(centre.x() + outer, centre.y()),
              "Ø " + _length("geometry.housing_outer_diameter_m", g.housing_outer_diameter_m), outer + 28, 1)
    painter.setPen(QPen(DIMENSION, 0.8))
    leader_end = QPointF(centre.x() + outer + 24, centre.y() + outer * 0.55)
    painter.drawLine(QPointF(centre.x() + shaft * 0.7, centre.y() + shaft * 0.7), leader_end)
    painter.setFont(_font(13))
    painter.drawText(QPointF(leader_end.x() + 3, leader_end.y() + 5),
                     "shaft Ø " + _length("geometry.shaft_diameter_m", g.shaft_diameter_m))


def draw_side_view(painter: QPainter, frame: QRectF, results: Results, scale: float) -> None:
    """Side view, drive end on the left: housing outline, magnets and stack hidden (dashed), shaft stub."""
    g = results.geometry
    _title(painter, frame.left(), frame.top() + 14, "Side view, drive end left")
    length = g.housing_length_m * scale
    radius = g.housing_outer_diameter_m / 2 * scale
    stub = SHAFT_STUB_FRACTION * length
    centre_y = frame.center().y() + 2
    left = frame.left() + stub + 20 + (frame.width() - stub - 20 - length - 150) / 2
    housing = QRectF(left, centre_y - radius, length, 2 * radius)
    shaft_r = g.shaft_diameter_m / 2 * scale
    painter.setPen(QPen(INK, 1.0))
    painter.setBrush(QBrush(QColor("#9aa4b1")))
    painter.drawRect(QRectF(left - stub, centre_y - shaft_r, stub, 2 * shaft_r))
    painter.setPen(QPen(INK, 1.6))
    painter.setBrush(QBrush(STEEL_FILL))
    painter.drawRect(housing)
    # Hidden parts: magnets (top and bottom) and the armature stack, centred on the housing's length.
    middle = housing.center().x()
    magnet_length = g.magnet_length_m * scale
    stack_length = g.stack_length_m * scale
    magnet_outer = g.magnet_inner_diameter_m / 2 * scale + g.magnet_thickness_m * scale
    magnet_inner = g.magnet_inner_diameter_m / 2 * scale
    hidden = QPen(INK, 0.9, Qt.PenStyle.DashLine)
    painter.setPen(hidden)
    painter.setBrush(QBrush(MAGNET_FILL))
    for sign in (-1, 1):
        top = centre_y - magnet_outer if sign < 0 else centre_y + magnet_inner
        painter.drawRect(QRectF(middle - magnet_length / 2, top, magnet_length, magnet_outer - magnet_inner))
    armature_r = g.armature_diameter_m / 2 * scale
    painter.setBrush(Qt.BrushStyle.NoBrush)
    painter.drawRect(QRectF(middle - stack_length / 2, centre_y - armature_r, stack_length, 2 * armature_r))
    painter.setPen(QPen(QColor("#9aa4b1"), 0.7, Qt.PenStyle.DashDotLine))
    painter.drawLine(QPointF(left - stub - 10, centre_y), QPointF(housing.right() + 10, centre_y))
    # Dimensions.
    dimension(painter, QPointF(housing.left(), housing.bottom()), QPointF(housing.right(), housing.bottom()),
              _length("geometry.housing_length_m", g.housing_length_m), 26, 1)
    dimension(painter, QPointF(housing.right(), housing.top()), QPointF(housing.right(), housing.bottom()),
              "Ø " + _length("geometry.housing_outer_diameter_m", g.housing_outer_diameter_m), -36, -1)
    dimension(painter, QPointF(middle - magnet_length / 2, housing.top()),
              QPointF(middle + magnet_length / 2, housing.top()),
              f"magnet {_length('geometry.magnet_length_m', g.magnet_length_m)}", -18, -1)
    dimension(painter, QPointF(middle - stack_length / 2, centre_y + armature_r),
              QPointF(middle + stack_length / 2, centre_y + armature_r),
              f"stack {_length('geometry.stack_length_m', g.stack_length_m)}", -(radius - armature_r) - 4, 1)
    painter.setPen(DIMENSION)
    painter.setFont(_font(12))
    overhang = _length("geometry.overhang_m", g.overhang_m)
    painter.drawText(QRectF(frame.left(), frame.top() + 22, frame.width(), 16), Qt.AlignmentFlag.AlignLeft,
                     f"magnet overhang beyond the stack: {overhang} at each end")


def draw_outline(painter: QPainter, width: float, height: float, results: Results) -> None:
    """End view and side view to one scale, dimensioned, with a scale note."""
    g = results.geometry
    painter.save()
    painter.scale(width / CANVAS_WIDTH, width / CANVAS_WIDTH)
    canvas_height = CANVAS_WIDTH * height / width
    painter.fillRect(QRectF(0, 0, CANVAS_WIDTH, canvas_height), QColor("white"))
    painter.setRenderHint(QPainter.RenderHint.Antialiasing)
    end_frame = QRectF(10, 10, 390, canvas_height - 20)
    side_frame = QRectF(410, 10, CANVAS_WIDTH - 420, canvas_height - 20)
    # One scale for both views: the larger of what the end view's diameter and the side view's length allow.
    by_diameter = (min(end_frame.width(), end_frame.height()) - 130) / g.housing_outer_diameter_m
    by_side = min((side_frame.width() - 190) / (g.housing_length_m * (1 + SHAFT_STUB_FRACTION)),
                  (side_frame.height() - 150) / g.housing_outer_diameter_m)
    scale = min(by_diameter, by_side)
    draw_end_view(painter, end_frame, results, scale)
    draw_side_view(painter, side_frame, results, scale)
    painter.setPen(QColor("#5b6470"))
    painter.setFont(_font(11))
    painter.drawText(QRectF(10, canvas_height - 22, CANVAS_WIDTH - 20, 16), Qt.AlignmentFlag.AlignRight,
                     f"Both views to one scale; dimensions in {unit_label(paper_unit('mm'))}. Magnets and stack "
                     "hidden, dashed.")
    painter.restore()
