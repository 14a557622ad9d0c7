"""A to-scale cross-section of the motor, drawn from ``core.geometry.Geometry`` on every edit.

Scene units are millimetres with y upwards. From the outside in: the steel housing (the return path),
the arc magnets (red faces north toward the armature, blue south; arrows give the magnetization
direction), the air gap, the slotted armature with copper in its slots, and the shaft. The drawing only
places the dimensions the design holds; it computes nothing about the motor.
"""

from __future__ import annotations

import math

from PySide6.QtCore import QPointF, QRectF, Qt
from PySide6.QtGui import QBrush, QColor, QPainter, QPainterPath, QPen, QPolygonF
from PySide6.QtWidgets import (
    QGraphicsItem,
    QGraphicsPathItem,
    QGraphicsScene,
    QGraphicsSimpleTextItem,
    QGraphicsView,
    QLabel,
    QWidget,
)

from pmdc_sizer.app.formatting import significant
from pmdc_sizer.core.units import convert, from_si

from .display_units import DisplayUnits
from .style import COPPER_FILL, HOUSING_FILL, LAMINATION_FILL, NORTH_FILL, SHAFT_FILL, SOUTH_FILL, flush_column

ARC_STEPS = 96


def _mm(value_si) -> float:
    return float(from_si(value_si, "mm"))


def _polar(radius: float, angle: float) -> QPointF:
    return QPointF(radius * math.cos(angle), radius * math.sin(angle))


def _arc(radius: float, start: float, end: float, steps: int) -> list[QPointF]:
    return [_polar(radius, start + (end - start) * i / steps) for i in range(steps + 1)]


def circle_path(radius: float) -> QPainterPath:
    path = QPainterPath()
    path.addEllipse(QPointF(0.0, 0.0), radius, radius)
    return path


def annulus_path(outer: float, inner: float) -> QPainterPath:
    path = circle_path(outer)
    path.addEllipse(QPointF(0.0, 0.0), inner, inner)
    path.setFillRule(Qt.FillRule.OddEvenFill)
    return path


def sector_path(outer: float, inner: float, start: float, end: float) -> QPainterPath:
    steps = max(int(ARC_STEPS * abs(end - start) / (2 * math.pi)), 8)
    points = _arc(outer, start, end, steps) + _arc(inner, end, start, steps)
    path = QPainterPath()
    path.addPolygon(QPolygonF(points))
    path.closeSubpath()
    return path


def lamination_outline(radius, slot_bottom, slots, tooth_width, slot_opening, lip) -> QPolygonF:
    """The lamination's outer contour: parallel-sided teeth with a short tip closing to the slot
    opening at the surface, slot bottoms on the root circle."""
    half_tooth = tooth_width / 2.0
    half_opening = math.asin(min(slot_opening / (2.0 * radius), 1.0))
    pitch = 2.0 * math.pi / slots
    lip_radius = max(radius - lip, slot_bottom + 1e-6)
    points: list[QPointF] = []
    for k in range(slots):
        centre = math.pi / 2 + k * pitch
        side_bottom = math.asin(min(half_tooth / slot_bottom, 1.0))
        side_lip = math.asin(min(half_tooth / lip_radius, 1.0))
        points.append(_polar(slot_bottom, centre - side_bottom))
        points.append(_polar(lip_radius, centre - side_lip))
        points += _arc(radius, centre - pitch / 2 + half_opening, centre + pitch / 2 - half_opening, 8)
        points.append(_polar(lip_radius, centre + side_lip))
        points.append(_polar(slot_bottom, centre + side_bottom))
        next_start = centre + pitch - side_bottom
        points += _arc(slot_bottom, centre + side_bottom, next_start, 6)[1:-1]
    return QPolygonF(points)


class _View(QGraphicsView):
    def resizeEvent(self, event):  # noqa: N802 - Qt's name
        super().resizeEvent(event)
        self.fit()

    def fit(self):
        rect = self.scene().itemsBoundingRect()
        if not rect.isEmpty():
            self.fitInView(rect.adjusted(-3, -3, 3, 3), Qt.AspectRatioMode.KeepAspectRatio)


class CrossSection(QWidget):
    def __init__(self, display: DisplayUnits):
        super().__init__()
        self.display = display
        layout = flush_column(self)
        self.dimensions = QLabel()
        self.dimensions.setObjectName("cross_section_dimensions")
        self.dimensions.setWordWrap(True)
        self.dimensions.setStyleSheet("padding: 2px 4px;")
        layout.addWidget(self.dimensions)
        self.scene = QGraphicsScene(self)
        self.view = _View(self.scene)
        self.view.setRenderHint(QPainter.RenderHint.Antialiasing)
        self.view.setBackgroundBrush(QBrush(QColor("white")))
        self.view.scale(1.0, -1.0)  # y upwards, as on a drawing; fitInView keeps the flip
        layout.addWidget(self.view, 1)
        self.housing_item: QGraphicsPathItem | None = None
        self.magnet_items: list[QGraphicsPathItem] = []
        self.armature_item: QGraphicsPathItem | None = None
        self.shaft_item: QGraphicsPathItem | None = None

    def _path_item(self, path: QPainterPath, fill: str, outline: str = "#222", width: float = 0.0):
        item = QGraphicsPathItem(path)
        item.setBrush(QBrush(QColor(fill)))
        pen = QPen(QColor(outline))
        pen.setWidthF(width)
        pen.setCosmetic(True)
        item.setPen(pen)
        self.scene.addItem(item)
        return item

    def _text(self, text: str, x: float, y: float, colour: str = "#000", bold: bool = False):
        item = QGraphicsSimpleTextItem(text)
        if bold:
            font = item.font()
            font.setBold(True)
            font.setPointSize(font.pointSize() + 4)
            item.setFont(font)
        item.setBrush(QBrush(QColor(colour)))
        item.setFlag(QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations)
        item.setPos(x, y)
        self.scene.addItem(item)
        return item

    def show_geometry(self, geometry) -> None:
        g = geometry
        self.scene.clear()
        shaft, core_root = _mm(g.shaft_radius), _mm(g.slot_bottom_radius)
        armature, magnet_in = _mm(g.armature_radius), _mm(g.magnet_inner_radius)
        housing_in, housing_out = _mm(g.housing_inner_radius), _mm(g.housing_outer_radius)
        poles, slots = int(g.poles), int(g.slots)
        self.housing_item = self._path_item(annulus_path(housing_out, housing_in), HOUSING_FILL)
        self.magnet_items = []
        pitch = 2.0 * math.pi / poles
        arc = float(g.magnet_arc)
        for k in range(poles):
            centre = math.pi / 2 + k * pitch
            north = k % 2 == 0
            item = self._path_item(sector_path(housing_in, magnet_in, centre - arc / 2, centre + arc / 2),
                                   NORTH_FILL if north else SOUTH_FILL)
            self.magnet_items.append(item)
            self._magnetization_arrows(centre, arc, magnet_in, housing_in, inwards=north)
            label_at = _polar(0.5 * (magnet_in + housing_in), centre + 0.4 * arc)
            self._text("N" if north else "S", label_at.x(), label_at.y(), "#ffffff", bold=True)
        copper_outer = armature - min(0.12 * float(from_si(g.slot_depth, "mm")), 0.8)
        self._path_item(annulus_path(copper_outer, core_root), COPPER_FILL, COPPER_FILL)
        outline = lamination_outline(armature, core_root, slots, _mm(g.tooth_width), _mm(g.slot_opening),
                                     armature - copper_outer)
        path = QPainterPath()
        path.addPolygon(outline)
        path.closeSubpath()
        path.addEllipse(QPointF(0.0, 0.0), shaft, shaft)
        path.setFillRule(Qt.FillRule.OddEvenFill)
        # The copper ring shows only in the slots: the lamination, drawn over it, covers teeth and core.
        self.armature_item = self._path_item(path, LAMINATION_FILL)
        self.shaft_item = self._path_item(circle_path(shaft), SHAFT_FILL)
        self._scale_bar(housing_out)
        self.view.fit()
        self._describe(g)

    def _magnetization_arrows(self, centre, arc, inner, outer, inwards: bool) -> None:
        pen = QPen(QColor("#ffffff"))
        pen.setWidthF(1.6)
        pen.setCosmetic(True)
        for fraction in (-0.3, 0.0, 0.3):
            angle = centre + fraction * arc
            start, end = (outer - 0.15 * (outer - inner), inner + 0.15 * (outer - inner))
            if not inwards:
                start, end = end, start
            tail, head = _polar(start, angle), _polar(end, angle)
            path = QPainterPath(tail)
            path.lineTo(head)
            back = 0.3 * (outer - inner)
            direction = -1.0 if inwards else 1.0
            for side in (-1.0, 1.0):
                wing = _polar(end - direction * back, angle + side * back / end * 0.6)
                path.moveTo(head)
                path.lineTo(wing)
            item = QGraphicsPathItem(path)
            item.setPen(pen)
            self.scene.addItem(item)

    def _scale_bar(self, housing_out: float) -> None:
        unit = self.display.screen_unit("mm")
        shown = (10.0 if housing_out > 12 else 5.0) if unit == "mm" else 0.5 if housing_out > 15 else 0.25
        length = float(convert(shown, unit, "mm"))
        y = -housing_out - 0.08 * housing_out
        x = -housing_out
        path = QPainterPath(QPointF(x, y))
        path.lineTo(x + length, y)
        path.moveTo(x, y - 0.6)
        path.lineTo(x, y + 0.6)
        path.moveTo(x + length, y - 0.6)
        path.lineTo(x + length, y + 0.6)
        item = QGraphicsPathItem(path)
        pen = QPen(QColor("#000"))
        pen.setWidthF(1.5)
        pen.setCosmetic(True)
        item.setPen(pen)
        self.scene.addItem(item)
        self._text(f"{shown:g} {unit}", x + length + 0.8, y + 1.2)

    def _describe(self, g) -> None:
        unit = self.display.screen_unit("mm")

        def length(value_si):
            return f"{significant(convert(from_si(value_si, 'mm'), 'mm', unit), 3)} {unit}"

        self.dimensions.setText(
            f"To scale. Housing Ø {length(2 * g.housing_outer_radius)} (wall {length(g.housing_wall)}), "
            f"magnets {length(g.magnet_thickness)} thick over {math.degrees(float(g.magnet_arc)):.0f}°, "
            f"air gap {length(g.airgap)}, armature Ø {length(2 * g.armature_radius)} with {int(g.slots)} slots "
            f"{length(g.slot_depth)} deep, shaft Ø {length(2 * g.shaft_radius)}. "
            "Red faces north toward the armature, blue south; arrows show the magnetization.")

    def housing_outer_radius_drawn_mm(self) -> float:
        """The drawn housing's outer radius, read back from the scene (for checks and tests)."""
        rect: QRectF = self.housing_item.path().boundingRect()
        return rect.width() / 2.0
