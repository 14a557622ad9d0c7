"""The sizing page: search the free box of the open design for every design that meets its requirement.

Left, what the search may change and what it ranks by (:mod:`app.gui.sizing_setup`): the free keys
and their ranges, the magnet grades, the objectives, the number of candidates and the seed. The search
(``core.sizing.size``) runs off the GUI thread with progress and cancel. Right, its result: a scatter of
every feasible design on two chosen quantities, with a third as colour (its scale titled with its
unit), the trade-off front and the best design for each objective marked; hovering a point gives its
key figures, clicking it offers to open it in the editor as a new unsaved design or as B in the
comparison; below, the table of the returned designs, sortable by any column (double-click a row to
open it). When nothing is feasible the page says why, in words. An edit of the requirement (anything
but the keys the search was free to change) marks the result as sized for an earlier design.
"""

from __future__ import annotations

import html

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QSize, Qt, Signal
from PySide6.QtGui import QColor, QCursor, QFontMetrics
from PySide6.QtWidgets import (
    QAbstractItemView,
    QComboBox,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QMenu,
    QPushButton,
    QSpinBox,
    QSplitter,
    QStyle,
    QStyleOptionComboBox,
    QTableWidget,
    QTableWidgetItem,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.core.edits import with_values
from pmdc_sizer.core.errors import MagneticCircuitError, ProjectError
from pmdc_sizer.core.schema import to_dict
from pmdc_sizer.core.sizing import SizingCancelled, SizingSpec, project_with, size
from pmdc_sizer.core.sizing_objectives import OBJECTIVES
from pmdc_sizer.core.sizing_space import grade_choices, values_at

from ..field_labels import worded_keys
from ..figures import (
    FAIL_COLOUR,
    POINTS,
    SIZING_COLOUR_STOPS,
    SIZING_PLAIN_COLOUR,
)
from ..formatting import in_view_units
from .background_job import CANCELLED, JobPage
from .pages import PAGE_TITLES
from .sizing_quantities import OBJECTIVE, VALUE, Quantity, choice_columns, choice_of, quantities
from .sizing_setup import FreeVariableTable, GradeList, ObjectiveList
from .style import flush_column, mark_style, plot_canvas, wrapped_label

DEFAULT_CANDIDATES = 20_000
MAX_CANDIDATES = 1_000_000
MAX_GENERATIONS = 500
#: Shares of the progress bar by stage of the search.
_STAGES = {"screen": (0.0, 0.7, "screening candidate {done:,} of {total:,}"),
           "refine": (0.7, 0.9, "refining towards the front: generation {done:,} of {total:,}"),
           "verify": (0.9, 1.0, "checking returned design {done:,} of {total:,} with the full evaluation")}
_NO_COLOUR = "no colour"
_SUMMARY_STYLE = "padding: 2px 4px; font-size: 10.5pt;"


def _rgb(colour: str) -> tuple[int, int, int]:
    return int(colour[1:3], 16), int(colour[3:5], 16), int(colour[5:7], 16)


COLOUR_MAP = pg.ColorMap([stop for stop, _ in SIZING_COLOUR_STOPS], [_rgb(c) for _, c in SIZING_COLOUR_STOPS])


def _glyph_key(point: str) -> str:
    style = POINTS[point]
    colour = style.colour or SIZING_COLOUR_STOPS[2][1]
    return f"<span style='color:{colour}'>{style.glyph}</span> {style.key_text}"


class _NumberItem(QTableWidgetItem):
    """A table cell that sorts by its number, not by its text."""

    def __init__(self, text: str, value: float):
        super().__init__(text)
        self.setData(Qt.ItemDataRole.UserRole, value)
        self.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)

    def __lt__(self, other) -> bool:
        mine, theirs = self.data(Qt.ItemDataRole.UserRole), other.data(Qt.ItemDataRole.UserRole)
        if isinstance(mine, float) and isinstance(theirs, float):
            return (np.isnan(theirs) and not np.isnan(mine)) or mine < theirs
        return super().__lt__(other)


class AxisChoice(QComboBox):
    """A drop-down as wide as the entry it shows, its list as wide as its longest entry.

    Sized to the longest entry (``AdjustToContents``), three of them did not fit beside each other on a
    laptop screen and the layout cut every one short; sized to the chosen entry they fit, and only a row
    too narrow even for that shortens them (down to ``SHORTEST`` characters).
    """

    SHORTEST = 12  #: characters a squeezed drop-down still shows

    def __init__(self):
        super().__init__()
        self.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self.setMinimumContentsLength(self.SHORTEST)
        self.currentIndexChanged.connect(lambda _index: self.updateGeometry())

    def sizeHint(self) -> QSize:  # noqa: N802 - Qt's name
        option = QStyleOptionComboBox()
        self.initStyleOption(option)
        metrics = self.fontMetrics()
        text = QSize(metrics.horizontalAdvance(self.currentText()) + metrics.averageCharWidth(), metrics.height())
        return self.style().sizeFromContents(QStyle.ContentsType.CT_ComboBox, option, text, self)

    def fit_list(self) -> None:
        """Widen the drop-down list to its longest entry (after the entries change)."""
        metrics = self.view().fontMetrics()
        longest = max((metrics.horizontalAdvance(self.itemText(i)) for i in range(self.count())), default=0)
        self.view().setMinimumWidth(longest + 4 * metrics.averageCharWidth()
                                    + self.view().verticalScrollBar().sizeHint().width())
        self.updateGeometry()


class SizingView(JobPage):
    """The sizing page: the search's inputs on the left, its feasible designs and front on the right."""

    opened = Signal(object)  #: a design opened from the page (its Project)

    def __init__(self, main_window):
        super().__init__(main_window, "sizing_view")
        self.display = main_window.display
        self.result = None
        self.base = None  #: the design the shown result was sized from
        self._requirement = None  #: what the shown result was sized for (the base without its free keys)
        self._quantities: list[Quantity] = []
        self._picked = None  #: ("design", index) of result.designs, or ("feasible", index)
        self._shown_in = self.display.system  #: the display units the shown result is drawn in
        self._start_job("the sizing search", SizingCancelled,
                        (ProjectError, MagneticCircuitError, ValueError, ArithmeticError), None,
                        lambda key: False, self.run, "Run search",
                        "Search the free ranges for every design that meets the requirement", "sizing_state")
        self._build()
        self._follow(main_window)

    #: The setup column beside a readable scatter: wider than the window's middle column, so the window
    #: gives the page its whole width (see ``MainWindow.WIDE_PAGES``).
    MINIMUM_WIDTH = 1150

    def heightForWidth(self, _width: int) -> int:  # noqa: N802 - Qt's name
        # The window's scroll area would make the page as tall as its wrapped labels would like, not as tall
        # as the window: the page fits the window and its tables scroll instead.
        return -1

    # ------------------------------------------------------------------ layout
    def _build(self) -> None:
        self.candidates_box = self._count_box("sizing_candidates", MAX_CANDIDATES, 5000,
                                              "How many candidates the space-filling sample of the free ranges draws")
        self.candidates_box.setValue(DEFAULT_CANDIDATES)
        self.seed_box = self._seed_box("sizing_seed",
                                       "Seed of the sample and the refinement: the same seed gives the same designs")
        self.seed_box.setValue(SizingSpec.seed)
        self.generations_box = QSpinBox()
        self.generations_box.setObjectName("sizing_generations")
        self.generations_box.setRange(0, MAX_GENERATIONS)
        self.generations_box.setValue(SizingSpec.generations)
        self.generations_box.setToolTip("Generations of the evolutionary refinement towards the front after the "
                                        "sample (NSGA-II); 0 keeps the sample's designs alone")
        layout = self._page_layout([QLabel("Candidates:"), self.candidates_box, QLabel("Refinement generations:"),
                                    self.generations_box, QLabel("Seed:"), self.seed_box])

        splitter = QSplitter(Qt.Orientation.Horizontal)
        splitter.addWidget(self._build_setup())
        splitter.addWidget(self._build_results())
        splitter.setStretchFactor(1, 1)
        splitter.setSizes([430, 900])
        layout.addWidget(splitter, 1)

    def minimumSizeHint(self) -> QSize:  # noqa: N802 - Qt's name
        hint = super().minimumSizeHint()
        return QSize(max(hint.width(), self.MINIMUM_WIDTH), hint.height())

    def _build_setup(self) -> QWidget:
        box = QWidget()
        column = QVBoxLayout(box)
        column.setContentsMargins(0, 0, 4, 0)
        self.free_table = FreeVariableTable(self.display)
        self.free_table.refused.connect(self._on_refused)
        self.grade_list = GradeList()
        self.objective_list = ObjectiveList()
        column.addWidget(QLabel("<b>Free keys</b> <span style='color:#555'>— tick to free, type the range</span>"))
        column.addWidget(self.free_table, 3)
        column.addWidget(QLabel("<b>Objectives</b>"))
        column.addWidget(self.objective_list)
        column.addWidget(QLabel("<b>Magnet grades to try</b>"))
        column.addWidget(self.grade_list, 1)
        for table in (self.free_table, self.grade_list):
            table.setMinimumHeight(90)
        compact = self.fontMetrics().height() + 8
        self.free_table.verticalHeader().setDefaultSectionSize(compact)
        box.setMinimumWidth(360)
        return box

    def _build_results(self) -> QWidget:
        box = QWidget()
        column = QVBoxLayout(box)
        column.setContentsMargins(4, 0, 0, 0)
        axes = QHBoxLayout()
        self.x_combo, self.y_combo, self.colour_combo = AxisChoice(), AxisChoice(), AxisChoice()
        for text, combo, name in (("Across:", self.x_combo, "sizing_x"), ("Up:", self.y_combo, "sizing_y"),
                                  ("Colour:", self.colour_combo, "sizing_colour")):
            combo.setObjectName(name)
            combo.currentIndexChanged.connect(self._draw)
            axes.addWidget(QLabel(text))
            axes.addWidget(combo)
        axes.addStretch(1)
        column.addLayout(axes)

        self.summary = wrapped_label("sizing_summary", _SUMMARY_STYLE,
                                     "Choose the free keys, grades and objectives, then run the search.", rich=True)
        column.addWidget(self.summary)

        split = QSplitter(Qt.Orientation.Vertical)
        self.canvas = plot_canvas("sizing_scatter")
        self.plot = self.canvas.getPlotItem()
        self._axis_titles = {"bottom": "", "left": ""}
        self.plot.getViewBox().sigResized.connect(self._fit_axis_titles)
        self.feasible_item = pg.ScatterPlotItem(hoverable=True, tip=self._tip, pen=None)
        self.feasible_item.sigClicked.connect(self._on_point_clicked)
        # rings with no face, so that the feasible design under each stays visible with its colour
        self.front_item = pg.ScatterPlotItem(**{**mark_style("sizing_front"), "brush": pg.mkBrush(0, 0, 0, 0)})
        self.best_item = pg.ScatterPlotItem(**{**mark_style("sizing_best"), "brush": pg.mkBrush(0, 0, 0, 0)})
        self.picked_item = pg.ScatterPlotItem(**mark_style("sizing_picked"))
        for item in (self.feasible_item, self.front_item, self.best_item, self.picked_item):
            self.plot.addItem(item)
        self.colour_bar = pg.ColorBarItem(values=(0.0, 1.0), colorMap=COLOUR_MAP, interactive=False, width=14)
        self.plot.layout.addItem(self.colour_bar, 2, 5)
        self.colour_bar.setVisible(False)
        plot_box = QWidget()
        plot_column = flush_column(plot_box)
        plot_column.addWidget(self.canvas, 1)
        self.key = QLabel(" &nbsp; ".join(_glyph_key(p) for p in ("sizing_feasible", "sizing_front", "sizing_best",
                                                                      "sizing_picked"))
                          + " &nbsp; <span style='color:#555'>hover a point for its figures, click it to open "
                            "it</span>")
        self.key.setTextFormat(Qt.TextFormat.RichText)
        self.key.setWordWrap(True)
        plot_column.addWidget(self.key)
        split.addWidget(plot_box)

        table_box = QWidget()
        table_column = flush_column(table_box)
        picked_row = QHBoxLayout()
        self.picked_label = QLabel("Returned designs (the front and the best for each objective); "
                                   "click a heading to sort, double-click a row to open it.")
        self.picked_label.setWordWrap(True)
        picked_row.addWidget(self.picked_label, 1)
        self.open_button = QPushButton("Open in the editor")
        self.open_button.setToolTip("Open the picked design in the editor as a new, unsaved design")
        self.open_button.clicked.connect(lambda: self.open_picked(as_b=False))
        self.b_button = QPushButton("Open as B")
        self.b_button.setToolTip("Show the picked design as B on the comparison page, beside the open design")
        self.b_button.clicked.connect(lambda: self.open_picked(as_b=True))
        for button in (self.open_button, self.b_button):
            button.setEnabled(False)
            picked_row.addWidget(button)
        table_column.addLayout(picked_row)
        self.table = QTableWidget(0, 0)
        self.table.setObjectName("sizing_front_table")
        self.table.setSortingEnabled(True)
        self.table.verticalHeader().setVisible(False)
        self.table.verticalHeader().setDefaultSectionSize(self.fontMetrics().height() + 8)
        self.table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        self.table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.table.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.table.itemSelectionChanged.connect(self._on_row_selected)
        self.table.cellDoubleClicked.connect(lambda _row, _column: self.open_picked(as_b=False))
        table_column.addWidget(self.table, 1)
        split.addWidget(table_box)
        split.setSizes([400, 300])
        column.addWidget(split, 1)
        return box

    # ------------------------------------------------------------------ design and staleness
    def set_design(self, project, results) -> None:
        """A new evaluated design: list its keys; a result sized for another requirement is marked stale."""
        self.project, self.results = project, results
        self.free_table.set_project(project)
        self.grade_list.set_project(project)
        if self.result is not None and not self.job.busy:
            if self._shown_in != self.display.system:  # the display units changed: the same result, redrawn
                self._present()
            self._show_freshness()

    def _key(self):
        return None if self.project is None else self._requirement_of(self.project, self.free_table.free_key_names())

    @staticmethod
    def _requirement_of(project, free: list[str]):
        """The project as text with the free keys (and its name) left out: what a search result stays valid for."""
        data = to_dict(project)
        for key in (*free, "project.name"):
            section, _, name = key.partition(".")
            data.get(section, {}).pop(name, None)
        return repr(sorted((section, repr(values)) for section, values in data.items()))

    def _show_freshness(self) -> None:
        current = self._requirement_of(self.project, [r.key for r in self.result.spec.free])
        if current == self._requirement:
            self._show_state("up to date")
            self.summary.setStyleSheet(_SUMMARY_STYLE)
        else:
            self._show_state("the design changed: the designs shown were sized for an earlier one until "
                                     "the search runs again", stale=True)
            self.summary.setStyleSheet(_SUMMARY_STYLE + " color: #888;")

    def _on_refused(self, key: str, message: str) -> None:
        self._show_state(f"Not applied: {message}", error=True)

    # ------------------------------------------------------------------ running
    def spec(self) -> SizingSpec:
        """The search the page's inputs ask for; raises ProjectError naming what is missing."""
        free = list(self.free_table.free_ranges(self.project))
        grades = self.grade_list.chosen()
        if not grades:
            raise ProjectError("tick at least one magnet grade to try (the design's own keeps it fixed)")
        if grades != [self.project.magnets.grade]:
            free.append(grade_choices(grades, self.project))
        objectives = self.objective_list.chosen()
        if not objectives:
            raise ProjectError("tick at least one objective to rank the designs by")
        if not free:
            raise ProjectError("tick at least one key to free, or more than one grade")
        return SizingSpec(free=tuple(free), objectives=objectives, candidates=self.candidates_box.value(),
                          seed=self.seed_box.value(), generations=self.generations_box.value())

    def run(self) -> None:
        """Start the search of the current design with the page's inputs (a running one is cancelled)."""
        if self.project is None:
            return
        try:
            spec = self.spec()
        except ProjectError as error:
            self._show_state(f"Not started: {worded_keys(str(error))}", error=True)
            self.failed.emit(str(error))
            return
        project = self.project
        key = (self._requirement_of(project, [r.key for r in spec.free]), spec)
        self._running_base = project
        self.job.start(key, lambda report, stop: size(project, spec, report))
        self._show_state(f"searching {spec.candidates:,} candidates…", stale=self.result is not None)

    def _on_progress(self, stage: str, done: int, total: int) -> None:
        start, end, words = _STAGES.get(stage, (0.0, 1.0, stage + " {done:,} of {total:,}"))
        share = start + (end - start) * (done / total if total else 1.0)
        self.progress_bar.setValue(round(100 * share))
        self.state_label.setText(words.format(done=done, total=total) + "…")

    def _on_failed(self, _key, message: str) -> None:
        # a core message names keys: the page words them with the fields' labels
        self._report_failure(message if message == CANCELLED else worded_keys(message), stale=self.result is not None)

    def _on_done(self, key, result) -> None:
        self.result, self.base, self._requirement = result, self._running_base, key[0]
        self._picked = None
        self._present()
        self._show_freshness()
        self.finished.emit(result)

    def _present(self) -> None:
        """The result's quantities, axes, summary, table and scatter, in the display units of the moment."""
        units = {k.key: k.unit for k in self.free_table.keys}
        currency = self.results.cost.currency if self.results is not None else "EUR"
        self._quantities = quantities(self.result, units, self.display, self.results, currency)
        self._shown_in = self.display.system
        self._fill_combos()
        self._show_summary()
        self._fill_table()
        self._draw()

    # ------------------------------------------------------------------ showing
    def _fill_combos(self) -> None:
        objectives = [q for q in self._quantities if q.kind == OBJECTIVE]
        others = [q for q in self._quantities if q.kind != OBJECTIVE]
        x = objectives[0]
        y = objectives[1] if len(objectives) > 1 else (others[0] if others else x)
        values = [q for q in self._quantities if q.kind == VALUE and q not in (x, y)]
        colour = values[0] if values else next((q for q in self._quantities if q not in (x, y)), None)
        for combo, chosen in ((self.x_combo, x), (self.y_combo, y), (self.colour_combo, colour)):
            combo.blockSignals(True)
            combo.clear()
            if combo is self.colour_combo:
                combo.addItem(_NO_COLOUR, None)
            for quantity in self._quantities:
                combo.addItem(quantity.label(), quantity)
            combo.setCurrentIndex(combo.findData(chosen) if chosen is not None else 0)
            combo.blockSignals(False)
            combo.fit_list()

    def _show_summary(self) -> None:
        r = self.result
        if not r.designs:
            said = {r.explanation.strip()}

            def shown(text: str) -> str:  # labels for keys, and the quoted figures in the display units
                return html.escape(in_view_units(worded_keys(text), self.display.screen_unit))

            shortfalls = "".join(f"<li>{shown(s.text)}</li>" for s in r.shortfalls if s.text.strip() not in said)
            self.summary.setText(
                f"<b style='color:{FAIL_COLOUR}'>No design inside the ranges meets the requirement</b> "
                f"({r.candidates_evaluated:,} designs evaluated, {r.seconds:.1f} s, seed {r.seed}). "
                f"{shown(r.explanation)}" + (f"<ul>{shortfalls}</ul>" if shortfalls else ""))
            return
        share = 100 * r.feasible_count / max(r.candidates_evaluated, 1)
        front = sum(d.pareto for d in r.designs)
        self.summary.setText(
            f"<b>{r.feasible_count:,} feasible designs</b> of {r.candidates_evaluated:,} evaluated "
            f"({share:.3g} %: {r.spec.candidates:,} sampled, {r.spec.generations} generations of refinement) · "
            f"<b>{front}</b> on the trade-off front · every returned design re-checked by the full evaluation at "
            f"every temperature · {r.seconds:.1f} s, seed {r.seed}")

    def _fit_axis_titles(self, *_signal) -> None:
        """Each axis title shortened in the middle (keeping its unit) where the chart is shorter than the title:
        on a laptop screen the vertical one was cut off at both ends. The whole title is the axis's tooltip."""
        view = self.plot.getViewBox()
        for side, title in self._axis_titles.items():
            axis = self.plot.getAxis(side)
            room = int(0.8 * (view.height() if side == "left" else view.width()))  # the label font runs larger
            metrics = QFontMetrics(axis.label.font())
            shown = metrics.elidedText(title, Qt.TextElideMode.ElideMiddle, room) if room > 40 else title
            if title:
                axis.setLabel(shown)
                axis.setToolTip(title)

    def _axis(self, combo: QComboBox) -> Quantity | None:
        return combo.currentData()

    def _draw(self, *_signal) -> None:
        for item in (self.feasible_item, self.front_item, self.best_item, self.picked_item):
            item.clear()
        self.colour_bar.setVisible(False)
        if self.result is None or not self._quantities:
            return
        x_q, y_q, colour_q = self._axis(self.x_combo), self._axis(self.y_combo), self._axis(self.colour_combo)
        if x_q is None or y_q is None:
            return
        self._axis_titles = {"bottom": x_q.label(), "left": y_q.label()}
        self._fit_axis_titles()
        x, y = x_q.feasible(self.result, self.display), y_q.feasible(self.result, self.display)
        shown = np.flatnonzero(np.isfinite(x) & np.isfinite(y))
        feasible = mark_style("sizing_feasible", SIZING_PLAIN_COLOUR)
        brushes = [feasible["brush"]] * len(shown)
        if colour_q is not None and len(shown):
            values = colour_q.feasible(self.result, self.display)[shown]
            finite = np.isfinite(values)
            if finite.any():
                low, high = float(np.min(values[finite])), float(np.max(values[finite]))
                span = high - low or 1.0
                colours = COLOUR_MAP.mapToQColor(np.clip((np.where(finite, values, low) - low) / span, 0.0, 1.0))
                brushes = [pg.mkBrush(c) if ok else feasible["brush"] for c, ok in zip(colours, finite, strict=True)]
                self.colour_bar.setLevels((low, high if high > low else low + 1.0))
                self.colour_bar.axis.setLabel(colour_q.label())
                self.colour_bar.setVisible(True)
        self.feasible_item.setData(x=x[shown], y=y[shown], data=list(shown), brush=brushes, symbol=feasible["symbol"],
                                   size=feasible["size"], pen=pg.mkPen(255, 255, 255, 160, width=0.6))
        front = [d for d in self.result.designs if d.pareto]
        best = [d for d in self.result.designs if d.best_for]
        for item, designs in ((self.front_item, front), (self.best_item, best)):
            item.setData(x=[x_q.of_design(d, self.display) for d in designs],
                         y=[y_q.of_design(d, self.display) for d in designs])
        self._draw_picked()
        title = f"{len(shown):,} feasible designs"
        if colour_q is not None:
            title += f"; colour: {colour_q.title}"
        self.plot.setTitle(title, color="#222222", size="10pt")

    def _picked_values(self) -> tuple[float, float] | None:
        if self._picked is None:
            return None
        x_q, y_q = self._axis(self.x_combo), self._axis(self.y_combo)
        kind, index = self._picked
        if kind == "design":
            design = self.result.designs[index]
            return x_q.of_design(design, self.display), y_q.of_design(design, self.display)
        return (float(x_q.feasible(self.result, self.display)[index]),
                float(y_q.feasible(self.result, self.display)[index]))

    def _draw_picked(self) -> None:
        point = self._picked_values()
        self.picked_item.setData(x=[point[0]] if point else [], y=[point[1]] if point else [])

    def _figures_text(self, value_of) -> str:
        return "\n".join(f"{q.title}: {q.text(value_of(q))}" for q in self._quantities)

    def _tip(self, x=None, y=None, data=None) -> str:
        index = int(data)
        chosen = [str(self.result.feasible_values[key][index]) for key, _ in choice_columns(self.result)]
        head = f"Feasible design {index + 1}" + "".join(f", {choice}" for choice in chosen)
        return head + "\n" + self._figures_text(lambda q: float(q.feasible(self.result, self.display)[index]))

    def _on_point_clicked(self, _item, points, _event=None) -> None:
        if len(points) == 0:
            return
        self.pick_feasible(int(points[0].data()))
        menu = QMenu(self)
        menu.addAction("Open in the editor as a new design", lambda: self.open_picked(as_b=False))
        menu.addAction("Open as B in the comparison", lambda: self.open_picked(as_b=True))
        menu.popup(QCursor.pos())

    def pick_feasible(self, index: int) -> None:
        """Pick the feasible candidate ``index`` (of ``result.feasible_values``)."""
        self._picked = ("feasible", index)
        self.table.clearSelection()
        self._after_pick(f"Picked feasible design {index + 1}")

    def _on_row_selected(self) -> None:
        rows = self.table.selectionModel().selectedRows()
        if not rows:
            return
        index = self.table.item(rows[0].row(), 0).data(Qt.ItemDataRole.UserRole + 1)
        self._picked = ("design", int(index))
        design = self.result.designs[int(index)]
        best = (f", best for {', '.join(OBJECTIVES[name].label.lower() for name in design.best_for)}"
                if design.best_for else "")
        self._after_pick(f"Picked returned design {int(index) + 1}{' (on the front)' if design.pareto else ''}{best}")

    def _after_pick(self, text: str) -> None:
        self.picked_label.setText(text + ": open it in the editor as a new, unsaved design, or as B.")
        for button in (self.open_button, self.b_button):
            button.setEnabled(True)
        self._draw_picked()

    def picked_project(self):
        """The picked design as a validated project, named for where it came from."""
        kind, index = self._picked
        if kind == "design":
            project, number = self.result.designs[index].project, f"returned design {index + 1}"
        else:
            values = values_at(self.result.spec.free, self.result.feasible_values, index)
            project, number = project_with(self.base, values), f"feasible design {index + 1}"
        name = f"{self.base.project.name}, sized ({number}, seed {self.result.seed})"[:120]
        try:
            return with_values(project, {"project.name": name}), number
        except ProjectError:
            return project, number

    def open_picked(self, as_b: bool = False) -> bool:
        """Open the picked design in the editor (a new unsaved design) or as B of the comparison."""
        if self._picked is None or self.result is None:
            return False
        try:
            project, number = self.picked_project()
        except ProjectError as error:
            self._show_state(f"Not opened: {worded_keys(str(error))}", error=True)
            return False
        if as_b:
            self.main_window.compare_view.show_as_b(project, f"sizing, {number}")
            self.main_window.show_page(PAGE_TITLES["compare"])
        elif not self.main_window.open_unsaved(project, f"the sizing page's {number}"):
            return False
        self.opened.emit(project)
        return True

    def _fill_table(self) -> None:
        designs = self.result.designs
        # what it is ranked by, then what the engineer would build, then what else it does
        order = {OBJECTIVE: 0, VALUE: 1}
        shown = sorted(self._quantities, key=lambda q: order.get(q.kind, 2))
        chosen = choice_columns(self.result)
        columns = ["Best for", *(heading for _, heading in chosen), *(q.label() for q in shown)]
        self.table.setSortingEnabled(False)
        self.table.clear()
        self.table.setColumnCount(len(columns))
        self.table.setHorizontalHeaderLabels(columns)
        self.table.setRowCount(len(designs))
        for row, design in enumerate(designs):
            best = ", ".join(name.replace("_", " ") for name in design.best_for) or ("front" if design.pareto else "")
            first = QTableWidgetItem(best)
            first.setData(Qt.ItemDataRole.UserRole + 1, row)
            if design.best_for:
                first.setForeground(QColor("#111111"))
                font = first.font()
                font.setBold(True)
                first.setFont(font)
            self.table.setItem(row, 0, first)
            column = 1
            for key, _ in chosen:
                self.table.setItem(row, column, QTableWidgetItem(choice_of(design, key)))
                column += 1
            for quantity in shown:
                value = quantity.of_design(design, self.display)
                self.table.setItem(row, column, _NumberItem(quantity.number(value), value))
                column += 1
        header = self.table.horizontalHeader()
        header.setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        self.table.setWordWrap(False)
        self.table.setSortingEnabled(True)
        self.open_button.setEnabled(False)
        self.b_button.setEnabled(False)
