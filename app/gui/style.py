"""The screen's side of :mod:`app.figures`: its marker shapes and dashes as pyqtgraph draws them, and the
charts' axes, the margin-free columns, wrapped text lines, labelled drop-downs and the status lines of what
a command did, as the pages and dialogs build them.

Colours, shapes and titles come from ``app.figures`` (the paper's charts read the same); only the
cross-section's fills, which nothing else draws, are chosen here.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QBoxLayout, QComboBox, QLabel, QVBoxLayout, QWidget

from pmdc_sizer.app.figures import POINTS, STATUSES, qt_pen_style

#: app.figures marker name → pyqtgraph symbol ("t1" is pyqtgraph's upward triangle).
SYMBOLS = {"circle": "o", "square": "s", "diamond": "d", "triangle": "t1", "plus": "+", "cross": "x"}
MARKER_PX = 11.0  #: a marker of relative size 1 on screen


def mark_style(point: str, colour: str | None = None) -> dict:
    """``symbol``, ``size``, ``brush`` and ``pen`` for the named point ``point`` of :data:`app.figures.POINTS`.

    ``colour`` is the case's colour for points that take it (the table's own colour wins otherwise).
    Filled marks get a white rim so that overlapping marks stay apart; hollow ones a white face; the
    plus and the cross are filled in their colour, as on paper.
    """
    style = POINTS[point]
    colour = style.colour or colour
    if colour is None:
        raise ValueError(f"{point}: a point coloured by its temperature case needs the case's colour")
    if style.marker in ("plus", "cross"):
        brush, pen = pg.mkBrush(colour), pg.mkPen(colour, width=1.0)
    elif style.filled:
        brush, pen = pg.mkBrush(colour), pg.mkPen("w", width=1.0)
    else:
        brush, pen = pg.mkBrush("w"), pg.mkPen(colour, width=2.0)
    return {"symbol": SYMBOLS[style.marker], "size": MARKER_PX * style.size, "brush": brush, "pen": pen}


def plot_canvas(object_name: str) -> pg.PlotWidget:
    """A chart on white with a light grid and no context menu, as the pages draw theirs."""
    canvas = pg.PlotWidget(background="w")
    canvas.setObjectName(object_name)
    plot = canvas.getPlotItem()
    plot.showGrid(x=True, y=True, alpha=0.25)
    plot.setMenuEnabled(False)
    return canvas


def black_axes(plot: pg.PlotItem, coarse_grid: bool = True) -> None:
    """The plot's left and bottom axes in black, their units as the table gives them (no SI prefix of
    pyqtgraph's choosing); ``coarse_grid``: grid lines at the labelled ticks only, as the finer levels cost
    most of a frame to paint."""
    for axis in ("left", "bottom"):
        plot.getAxis(axis).enableAutoSIPrefix(False)
        plot.getAxis(axis).setTextPen("k")
        plot.getAxis(axis).setPen("k")
        if coarse_grid:
            plot.getAxis(axis).setStyle(maxTickLevel=0)


def flush_column(parent: QWidget) -> QVBoxLayout:
    """A column layout on ``parent`` with no margin of its own: the frame it sits in gives the room."""
    column = QVBoxLayout(parent)
    column.setContentsMargins(0, 0, 0, 0)
    return column


def wrapped_label(object_name: str = "", style: str = "", text: str = "", rich: bool = False) -> QLabel:
    """A label that wraps its text (``rich``: always read as rich text, even without a tag in it)."""
    label = QLabel(text)
    if object_name:
        label.setObjectName(object_name)
    label.setWordWrap(True)
    if rich:
        label.setTextFormat(Qt.TextFormat.RichText)
    if style:
        label.setStyleSheet(style)
    return label


def labelled_choice(row: QBoxLayout, label: str, object_name: str, texts: Sequence[str],
                    changed: Callable[[], None]) -> QComboBox:
    """A drop-down of ``texts`` after its label, appended to ``row``; ``changed()`` runs when another text
    is chosen."""
    row.addWidget(QLabel(label))
    box = QComboBox()
    box.setObjectName(object_name)
    box.addItems(list(texts))
    box.currentTextChanged.connect(lambda _text: changed())
    row.addWidget(box)
    return box


def outcome_text(status: str, headline: str, detail: str) -> str:
    """Rich text of what a command did: the headline in bold in the colour of ``status`` ("pass" or "fail",
    :data:`app.figures.STATUSES`); a failure's detail (why) in that colour too, a success's (where) not."""
    colour = STATUSES[status].colour
    if status == "pass":
        return f'<span style="color: {colour};"><b>{headline}</b></span> {detail}'
    return f'<span style="color: {colour};"><b>{headline}</b> {detail}</span>'


def line_pen(colour: str, dash: str, width: float = 1.4):
    return pg.mkPen(colour, width=width, style=qt_pen_style(dash))


# Cross-section fills.
HOUSING_FILL = "#8a9099"
LAMINATION_FILL = "#b9c2cc"
COPPER_FILL = "#c8793a"
SHAFT_FILL = "#5c6570"
NORTH_FILL = "#d45d5d"
SOUTH_FILL = "#5d7fd4"
