"""The screen's side of :mod:`app.figures`: its marker shapes and dashes as pyqtgraph draws them.

Colours, shapes and titles come from ``app.figures`` (the paper's charts read the same); only the
cross-section's fills, which nothing else draws, are chosen here.
"""

from __future__ import annotations

import pyqtgraph as pg

from pmdc_sizer.app.figures import POINTS, qt_pen_style

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


def line_pen(colour: str, dash: str, width: float = 1.4):
    return pg.mkPen(colour, width=width, style=qt_pen_style(dash))


# Cross-section fills.
HOUSING_FILL = "#8a9099"
LAMINATION_FILL = "#b9c2cc"
COPPER_FILL = "#c8793a"
SHAFT_FILL = "#5c6570"
NORTH_FILL = "#d45d5d"
SOUTH_FILL = "#5d7fd4"
