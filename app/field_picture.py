"""The picture of a field solution: flux density over the cross-section, flux lines, magnets by margin.

Drawn with QPainter on a QImage (no window needed), so the command line's ``--png``, the desktop tool's
field page and the datasheet's appendix show the same picture. The solution covers the smallest
symmetric sector of the machine; the picture turns it round the whole circumference, the potential
changing sign with every pole (A(θ + k·τp) = (-1)^k·A(θ)), so the engineer sees the whole section.

Nothing here computes physics: the flux lines are contours of the potential the core returned, traced
triangle by triangle (marching triangles), and the colours come from :mod:`.figures`.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass

import numpy as np
from PySide6.QtCore import QPointF, QRectF, Qt
from PySide6.QtGui import QColor, QFont, QImage, QPainter, QPainterPath, QPen, QPolygonF

from pmdc_sizer.core.field.cases import ROTOR_REMOVED
from pmdc_sizer.core.field.mesh import ROTOR_REGIONS, Region

from .figures import FIELD_FLUX_DENSITY_STOPS, FIELD_FLUX_LINE_COLOUR, FIELD_KNEE_MARGIN_STOPS, FIELD_MAX_FLUX_DENSITY_T

#: Regions drawn without colour by flux density (air): a pale tint keeps the parts readable.
_AIR_REGIONS = (Region.SLOT_OPENING, Region.GAP, Region.INTERPOLAR, Region.OUTSIDE_AIR)
_SLOT_REGION = Region.SLOT
_MAGNET_REGION = Region.MAGNET
_AIR_TINT = QColor("#f4f4f0")
_SLOT_TINT = QColor("#ead9c2")
_COLOUR_BINS = 48
_FLUX_LINES = 24


@dataclass(frozen=True)
class WholeSection:
    """The solution's sector turned round the whole circumference (what the picture draws)."""

    nodes: np.ndarray  #: (2, nodes) [m]
    triangles: np.ndarray  #: (3, elements)
    region: np.ndarray  #: per element
    flux_density: np.ndarray  #: |B| per element [T]
    potential: np.ndarray  #: A per node [Wb/m]
    knee_margin: np.ndarray  #: per element, NaN outside the magnets [A/m]
    knee_field: float  #: [A/m]
    outer_radius: float  #: of the meshed outside air [m]


def whole_section(solution, poles: int) -> WholeSection:
    """Copies of the solved sector round the circumference.

    Parameters
    ----------
    solution : FieldSolution
        From :func:`pmdc_sizer.core.field.solve_case`.
    poles : int
        Poles of the machine (the sector holds ``solution.sector_poles`` of them).

    Returns
    -------
    WholeSection
    """
    copies = max(round(poles / solution.sector_poles), 1)
    angle = 2.0 * math.pi * solution.sector_poles / poles
    nodes, triangles, potentials = [], [], []
    count = solution.nodes_m.shape[1]
    for k in range(copies):
        c, s = math.cos(k * angle), math.sin(k * angle)
        x, y = solution.nodes_m
        nodes.append(np.vstack((c * x - s * y, s * x + c * y)))
        triangles.append(solution.triangles + k * count)
        potentials.append(solution.potential_Wb_per_m * (-1.0) ** (k * solution.sector_poles))
    magnitude = solution.flux_density_magnitude_T  # in the steel sheets for the laminations
    region = solution.region
    if solution.case.kind == ROTOR_REMOVED:
        region = np.where(np.isin(region, ROTOR_REGIONS), int(Region.OUTSIDE_AIR), region)
    return WholeSection(
        nodes=np.hstack(nodes), triangles=np.hstack(triangles), region=np.tile(region, copies),
        flux_density=np.tile(magnitude, copies), potential=np.concatenate(potentials),
        knee_margin=np.tile(solution.knee_margin_A_per_m, copies), knee_field=solution.knee_field_A_per_m,
        outer_radius=float(np.hypot(*solution.nodes_m).max()),
    )


def _interpolate(stops: tuple[tuple[float, str], ...], value: float) -> QColor:
    """The colour at ``value`` in [0, 1] along ``stops`` ((position, colour) pairs)."""
    value = min(max(value, 0.0), 1.0)
    for (p0, c0), (p1, c1) in itertools.pairwise(stops):
        if value <= p1:
            t = 0.0 if p1 == p0 else (value - p0) / (p1 - p0)
            a, b = QColor(c0), QColor(c1)
            return QColor(round(a.red() + t * (b.red() - a.red())), round(a.green() + t * (b.green() - a.green())),
                          round(a.blue() + t * (b.blue() - a.blue())))
    return QColor(stops[-1][1])


def flux_density_colour(flux_density_T: float) -> QColor:
    """The map's colour of a flux density [T], 0 to :data:`FIELD_MAX_FLUX_DENSITY_T`."""
    return _interpolate(FIELD_FLUX_DENSITY_STOPS, flux_density_T / FIELD_MAX_FLUX_DENSITY_T)


def knee_margin_colour(margin: float, knee_field: float) -> QColor:
    """A magnet element's colour by its margin to the knee, as a share of |H_knee| (past the knee: 0)."""
    return _interpolate(FIELD_KNEE_MARGIN_STOPS, margin / max(abs(knee_field), 1.0))


def contour_segments(nodes: np.ndarray, triangles: np.ndarray, values: np.ndarray,
                     level: float) -> np.ndarray:
    """Line segments where a piecewise-linear field equals ``level`` (marching triangles).

    Parameters
    ----------
    nodes : ndarray
        (2, nodes) coordinates.
    triangles : ndarray
        (3, elements) node numbers.
    values : ndarray
        Per node.
    level : float

    Returns
    -------
    ndarray
        (segments, 2, 2): the two end points of each segment.
    """
    v = values[triangles] - level  # (3, elements)
    above = v > 0.0
    crossing = above.any(axis=0) & ~above.all(axis=0)
    if not crossing.any():
        return np.zeros((0, 2, 2))
    t, v = triangles[:, crossing], v[:, crossing]
    points = []
    for i, j in ((0, 1), (1, 2), (2, 0)):
        cut = (v[i] > 0.0) != (v[j] > 0.0)
        share = np.where(cut, v[i] / np.where(cut, v[i] - v[j], 1.0), np.nan)
        a, b = nodes[:, t[i]], nodes[:, t[j]]
        points.append(a + share * (b - a))  # NaN where the edge is not cut
    points = np.stack(points)  # (3 edges, 2, elements)
    cut = ~np.isnan(points[:, 0, :])  # exactly two edges of each crossing triangle are cut
    order = np.argsort(~cut, axis=0, kind="stable")[:2]  # the two cut edges first
    columns = np.arange(points.shape[2])
    first, second = points[order[0], :, columns], points[order[1], :, columns]
    return np.stack((first, second), axis=1)


def draw_section(painter: QPainter, frame: QRectF, section: WholeSection, flux_lines: int = _FLUX_LINES) -> None:
    """The cross-section in ``frame``: |B| per element, magnets by margin to the knee, flux lines."""
    scale = 0.5 * min(frame.width(), frame.height()) / section.outer_radius
    centre = frame.center()
    x = centre.x() + scale * section.nodes[0]
    y = centre.y() - scale * section.nodes[1]
    corners = np.stack((x[section.triangles], y[section.triangles]), axis=-1)  # (3, elements, 2)
    colours: dict[int, QPainterPath] = {}
    bins = _COLOUR_BINS - 1
    share_of_knee = np.nan_to_num(section.knee_margin / max(abs(section.knee_field), 1.0), nan=0.0)
    iron_bin = (np.clip(section.flux_density / FIELD_MAX_FLUX_DENSITY_T, 0.0, 1.0) * bins).astype(np.int64)
    magnet_bin = 1000 + (np.clip(share_of_knee, 0.0, 1.0) * bins).astype(np.int64)
    air_or_iron = np.where(np.isin(section.region, _AIR_REGIONS), -1, iron_bin)
    keys = np.where(section.region == _MAGNET_REGION, magnet_bin,
                    np.where(section.region == _SLOT_REGION, -2, air_or_iron))
    for key in np.unique(keys):
        path = QPainterPath()
        for element in np.nonzero(keys == key)[0]:
            path.addPolygon(QPolygonF([QPointF(*corners[i, element]) for i in range(3)]))
            path.closeSubpath()
        colours[int(key)] = path
    for key, path in colours.items():
        if key == -1:
            colour = _AIR_TINT
        elif key == -2:
            colour = _SLOT_TINT
        elif key >= 1000:
            colour = _interpolate(FIELD_KNEE_MARGIN_STOPS, (key - 1000) / (_COLOUR_BINS - 1))
        else:
            colour = _interpolate(FIELD_FLUX_DENSITY_STOPS, key / (_COLOUR_BINS - 1))
        painter.setPen(QPen(colour, 0.8))  # the outline closes the hairline seams between triangles
        painter.setBrush(colour)
        painter.drawPath(path)
    low, high = float(section.potential.min()), float(section.potential.max())
    if high > low and flux_lines > 0:
        painter.setPen(QPen(QColor(FIELD_FLUX_LINE_COLOUR), 0.9))
        screen = np.vstack((x, y))
        for level in np.linspace(low, high, flux_lines + 2)[1:-1]:
            for (x0, y0), (x1, y1) in contour_segments(screen, section.triangles, section.potential, level):
                painter.drawLine(QPointF(x0, y0), QPointF(x1, y1))


def _draw_scale(painter: QPainter, frame: QRectF, title: str, stops, low: str, high: str) -> None:
    painter.setPen(QColor("#222222"))
    painter.setBrush(Qt.BrushStyle.NoBrush)
    painter.drawText(QPointF(frame.left(), frame.top() - 8), title)
    for i in range(int(frame.height())):
        painter.setPen(_interpolate(stops, 1.0 - i / max(frame.height() - 1, 1)))
        painter.drawLine(QPointF(frame.left(), frame.top() + i), QPointF(frame.right(), frame.top() + i))
    painter.setPen(QColor("#222222"))
    painter.setBrush(Qt.BrushStyle.NoBrush)
    painter.drawRect(frame)
    painter.drawText(QPointF(frame.right() + 4, frame.top() + 10), high)
    painter.drawText(QPointF(frame.right() + 4, frame.bottom()), low)


def draw_waveform(painter: QPainter, frame: QRectF, solution) -> None:
    """The radial air-gap flux density against angle, two pole pitches, with its axes."""
    angle = np.degrees(solution.airgap_angle_rad)
    b = solution.airgap_flux_density_T
    limit = max(float(np.abs(b).max()) * 1.1, 0.05)
    painter.setPen(QColor("#222222"))
    painter.setBrush(Qt.BrushStyle.NoBrush)
    painter.drawRect(frame)
    zero_y = frame.center().y()
    painter.setPen(QPen(QColor("#999999"), 0.8, Qt.PenStyle.DashLine))
    painter.drawLine(QPointF(frame.left(), zero_y), QPointF(frame.right(), zero_y))
    span = max(float(angle.max() - angle.min()), 1e-9)
    xs = frame.left() + (angle - angle.min()) / span * frame.width()
    ys = zero_y - b / limit * 0.5 * frame.height()
    painter.setPen(QPen(QColor(FIELD_FLUX_LINE_COLOUR), 1.6))
    painter.drawPolyline(QPolygonF([QPointF(float(u), float(v)) for u, v in zip(xs, ys, strict=True)]))
    painter.setPen(QColor("#222222"))
    painter.drawText(QPointF(frame.left(), frame.top() - 6), "Air-gap flux density, radial, at mid-gap [T]")
    painter.drawText(QPointF(frame.left() - 44, frame.top() + 10), f"{limit:+.2f}")
    painter.drawText(QPointF(frame.left() - 44, frame.bottom()), f"{-limit:+.2f}")
    painter.drawText(QPointF(frame.left(), frame.bottom() + 16), f"{angle.min():.0f}°")
    painter.drawText(QPointF(frame.right() - 34, frame.bottom() + 16), f"{angle.max():.0f}°")
    painter.drawText(QPointF(frame.center().x() - 60, frame.bottom() + 16), "angle from a neutral axis")


def section_image(solution, poles: int, size: int = 900, scales: bool = True) -> QImage:
    """The cross-section, with its two colour scales below it unless ``scales`` is False.

    Parameters
    ----------
    solution : FieldSolution
    poles : int
    size : int
        Width in pixels; with the scales, the height adds room for them.
    scales : bool
        False for a view that draws the scales itself at its own size (:func:`draw_colour_scales`): scaled
        down with the picture, their text would be too small to read.

    Returns
    -------
    QImage
    """
    image = QImage(size, size + (SCALES_HEIGHT if scales else 0), QImage.Format.Format_RGB32)
    image.fill(QColor("white"))
    painter = QPainter(image)
    try:
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        painter.setFont(QFont("DejaVu Sans", 9))
        draw_section(painter, QRectF(4, 4, size - 8, size - 8), whole_section(solution, poles))
        if scales:
            draw_colour_scales(painter, QRectF(0, size, size, SCALES_HEIGHT), solution.knee_field_A_per_m)
    finally:
        painter.end()
    return image


#: Room the two colour scales take below a section [px]: title, bar and end labels.
SCALES_HEIGHT = 90


def draw_colour_scales(painter: QPainter, frame: QRectF, knee_field_A_per_m: float) -> None:
    """The two colour scales of the section side by side in ``frame``: |B| in the iron, the magnets' margin.

    Drawn in the painter's font, so that a view can draw them at its own size under a scaled picture.
    """
    line = painter.fontMetrics().height()
    half = frame.width() / 2
    bar = QRectF(frame.left() + 20, frame.top() + line + 10, half - 60, max(0.8 * line, 8))
    _draw_horizontal_scale(painter, bar, "|B| in the iron [T]", FIELD_FLUX_DENSITY_STOPS, "0",
                           f"{FIELD_MAX_FLUX_DENSITY_T:g}")
    _draw_horizontal_scale(painter, bar.translated(half, 0),
                           f"magnets: margin to the knee (|H knee| {abs(knee_field_A_per_m) / 1e3:.0f} kA/m)",
                           FIELD_KNEE_MARGIN_STOPS, "past", "≥ |H knee|")


def _draw_horizontal_scale(painter: QPainter, frame: QRectF, title: str, stops, low: str, high: str) -> None:
    painter.setPen(QColor("#222222"))
    painter.setBrush(Qt.BrushStyle.NoBrush)
    painter.drawText(QPointF(frame.left(), frame.top() - 6), title)
    for i in range(int(frame.width())):
        painter.setPen(_interpolate(stops, i / max(frame.width() - 1, 1)))
        painter.drawLine(QPointF(frame.left() + i, frame.top()), QPointF(frame.left() + i, frame.bottom()))
    painter.setPen(QColor("#222222"))
    painter.drawRect(frame)
    metrics = painter.fontMetrics()
    below = frame.bottom() + metrics.ascent() + 3
    painter.drawText(QPointF(frame.left(), below), low)
    painter.drawText(QPointF(frame.right() - metrics.horizontalAdvance(high), below), high)


def field_image(solution, poles: int, width: int = 1400, height: int = 800, title: str = "") -> QImage:
    """The whole picture: the section with its two colour scales, and the air-gap waveform beside it.

    Parameters
    ----------
    solution : FieldSolution
        One case's solution.
    poles : int
        Poles of the machine.
    width, height : int
        Pixels.
    title : str
        Printed at the top (the design and the case).

    Returns
    -------
    QImage
    """
    image = QImage(width, height, QImage.Format.Format_RGB32)
    image.fill(QColor("white"))
    painter = QPainter(image)
    try:
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        painter.setFont(QFont("DejaVu Sans", 10))
        painter.setPen(QColor("#222222"))
        if title:
            bold = QFont("DejaVu Sans", 12)
            bold.setBold(True)
            painter.setFont(bold)
            painter.drawText(QRectF(16, 8, width - 32, 24), title)
            painter.setFont(QFont("DejaVu Sans", 10))
        side = min(height - 70, int(width * 0.55))
        draw_section(painter, QRectF(16, 44, side, side), whole_section(solution, poles))
        scales_left = 16 + side + 24
        _draw_scale(painter, QRectF(scales_left, 70, 18, 180), "|B| in the iron [T]",
                    FIELD_FLUX_DENSITY_STOPS, "0", f"{FIELD_MAX_FLUX_DENSITY_T:g}")
        knee_kA_per_m = abs(solution.knee_field_A_per_m) / 1e3
        _draw_scale(painter, QRectF(scales_left + 170, 70, 18, 180), "magnets: margin to the knee",
                    FIELD_KNEE_MARGIN_STOPS, "past the knee", f"≥ |H knee| ({knee_kA_per_m:.0f} kA/m)")
        wave = QRectF(scales_left + 50, 320, width - scales_left - 80, height - 420)
        draw_waveform(painter, wave, solution)
        painter.drawText(QRectF(scales_left, height - 60, width - scales_left - 16, 50),
                         "Flux lines: equal steps of the vector potential. 2-D section per metre of stack; "
                         "no end effects.")
    finally:
        painter.end()
    return image


def write_field_png(solution, poles: int, path, title: str = "", width: int = 1400, height: int = 800) -> None:
    """Render :func:`field_image` and save it as PNG; raises OSError when it cannot be written.

    Parameters
    ----------
    solution : FieldSolution
    poles : int
    path : str or Path
        Where to write (the caller makes it atomic).
    title : str
    width, height : int
    """
    image = field_image(solution, poles, width, height, title)
    if not image.save(str(path), "PNG"):
        raise OSError(f"{path}: the picture could not be written")
