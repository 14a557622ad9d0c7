"""What a sizing search may change and what it ranks by: the left side of the sizing page.

:class:`FreeVariableTable` lists every numeric key a search may free (``core.sizing_space.free_keys``):
tick a key to free it, edit its low and high ends in screen units. An end outside the schema's limits,
a low end above the high one or a fraction for a whole-number key is refused: the cell keeps its last
value and the limit is written in the row's last column, in the failure colour. Below them, the choices:
the wire, from one size to another of the design's own series (AWG or metric), and each steel, a ticked
list of the library's steels of that part's kind; they reach the search as the command line's
``--free winding.wire=AWG 24:AWG 28`` and ``--free housing.steel=A,B`` do. :class:`GradeList` ticks the
magnet grades to consider (from the library) and :class:`ObjectiveList` the objectives.
"""

from __future__ import annotations

import math

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QColor
from PySide6.QtWidgets import (
    QAbstractItemView,
    QCheckBox,
    QComboBox,
    QHeaderView,
    QListWidget,
    QListWidgetItem,
    QTableWidget,
    QTableWidgetItem,
    QWidget,
)

from pmdc_sizer.core import library
from pmdc_sizer.core.conductors import parse_wire_size, wire_series
from pmdc_sizer.core.edits import get_value
from pmdc_sizer.core.sizing_objectives import OBJECTIVES
from pmdc_sizer.core.sizing_space import (
    STEEL_KEYS,
    WIRE_KEY,
    FreeKey,
    FreeRange,
    free_keys,
    parse_free,
    steel_choices,
)

from ..field_labels import label_for
from ..figures import FAIL_COLOUR
from ..formatting import unit_label
from .display_units import DisplayUnits
from .style import flush_column

#: Keys ticked when the page first opens on a design: what an engineer sizes first.
FIRST_FREE_KEYS = ("magnets.thickness_mm", "housing.wall_mm", "armature.stack_length_mm",
                   "winding.turns_per_coil")
#: A range's first ends around the design's own value, as shares of it.
FIRST_RANGE_SHARES = (0.6, 1.5)
#: The choice rows, below the numeric keys: the wire size and the steels.
CHOICE_ROWS = (WIRE_KEY, *STEEL_KEYS)
#: The wire row's first range: this many sizes of the series either side of the design's own.
FIRST_WIRE_STEPS = 2
FREE, NAME, LOW, HIGH, LIMITS = range(5)


def _number(value: float) -> str:
    return f"{value:.6g}"


def first_wire_range(size: str) -> tuple[str, str]:
    """The sizes ``FIRST_WIRE_STEPS`` either side of ``size`` in its own series (AWG or metric)."""
    series = wire_series(size)
    own = parse_wire_size(size)
    index = min(range(len(series)), key=lambda i: abs(parse_wire_size(series[i]) - own))
    return series[max(index - FIRST_WIRE_STEPS, 0)], series[min(index + FIRST_WIRE_STEPS, len(series) - 1)]


def first_range(key: FreeKey) -> tuple[float, float]:
    """A starting range around the design's value, inside the schema's limits (file units)."""
    low, high = sorted(share * key.current for share in FIRST_RANGE_SHARES)
    if key.current == 0.0:
        low, high = 0.0, 1.0
    if key.low_limit is not None:
        low = max(low, key.low_limit)
    if key.high_limit is not None:
        high = min(high, key.high_limit)
    if key.integer:
        low, high = math.ceil(low), math.floor(high)
    return low, max(low, high)


class FreeVariableTable(QTableWidget):
    """The free keys and their ranges (file units inside, screen units shown)."""

    refused = Signal(str, str)  #: key, why an entry was not applied
    changed = Signal()  #: a key was freed or fixed, or a range end changed

    def __init__(self, display: DisplayUnits):
        super().__init__(0, 5)
        self.setObjectName("sizing_free_variables")
        self.display = display
        self.keys: list[FreeKey] = []  #: the numeric keys, one row each; the CHOICE_ROWS follow them
        self.ranges: dict[str, tuple[float, float]] = {}  #: key → (low, high), file units
        self.wire_range: tuple[str, str] | None = None  #: the wire row's two ends, sizes as a file writes them
        self.steels: dict[str, list[str]] = {}  #: steel key → the steels ticked for it
        self.wire_boxes: tuple[QComboBox, QComboBox] | None = None
        self.steel_lists: dict[str, QListWidget] = {}
        self.setHorizontalHeaderLabels(["Free", "Quantity", "Low", "High", "Allowed (unit)"])
        header = self.horizontalHeader()
        # the quantity's name is never cut short (on a laptop the pane is narrow, and a stretched name
        # column came out as "Magnet …"); the ranges get what a number needs, the limits what is left
        header.setSectionResizeMode(FREE, QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(NAME, QHeaderView.ResizeMode.ResizeToContents)
        number_width = self.fontMetrics().horizontalAdvance("00000.00") + 12
        for column in (LOW, HIGH):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.Fixed)
            header.resizeSection(column, number_width)
        header.setSectionResizeMode(LIMITS, QHeaderView.ResizeMode.Stretch)
        self.setWordWrap(False)
        self.verticalHeader().setVisible(False)
        self.setSelectionMode(QAbstractItemView.SelectionMode.NoSelection)
        self.setToolTip("Tick a key to let the search change it within Low and High; every other key stays as "
                        "in the design")
        self.itemChanged.connect(self._on_item_changed)

    def set_project(self, project) -> None:
        """List the keys of ``project``; keys already listed keep their tick and range."""
        freed = set(self.free_key_names()) if self.keys else set(FIRST_FREE_KEYS)
        self.keys = list(free_keys(project))
        for key in self.keys:
            self.ranges.setdefault(key.key, first_range(key))
        series = wire_series(project.winding.wire)
        if self.wire_range is None or self.wire_range[0] not in series:
            self.wire_range = first_wire_range(project.winding.wire)
        for key in STEEL_KEYS:
            self.steels.setdefault(key, [get_value(project, key)])
        self.blockSignals(True)
        self.clearSpans()
        self.setRowCount(len(self.keys) + len(CHOICE_ROWS))
        for row, key in enumerate(self.keys):
            tick = QTableWidgetItem()
            tick.setFlags(Qt.ItemFlag.ItemIsUserCheckable | Qt.ItemFlag.ItemIsEnabled)
            tick.setCheckState(Qt.CheckState.Checked if key.key in freed else Qt.CheckState.Unchecked)
            self.setItem(row, FREE, tick)
            name = QTableWidgetItem(label_for(key.key))
            name.setFlags(Qt.ItemFlag.ItemIsEnabled)
            name.setToolTip(f"{key.key}; the design has {_number(self._shown(key.current, key))} "
                            f"{unit_label(self._unit(key))}".rstrip())
            self.setItem(row, NAME, name)
            for column in (LOW, HIGH):
                self.setItem(row, column, QTableWidgetItem())
            limits = QTableWidgetItem()
            limits.setFlags(Qt.ItemFlag.ItemIsEnabled)
            self.setItem(row, LIMITS, limits)
            self._show_row(row)
        for offset, key in enumerate(CHOICE_ROWS):
            self._fill_choice_row(len(self.keys) + offset, key, key in freed, project)
        self.blockSignals(False)

    def _fill_choice_row(self, row: int, key: str, freed: bool, project) -> None:
        tick = QTableWidgetItem()
        tick.setFlags(Qt.ItemFlag.ItemIsUserCheckable | Qt.ItemFlag.ItemIsEnabled)
        tick.setCheckState(Qt.CheckState.Checked if freed else Qt.CheckState.Unchecked)
        self.setItem(row, FREE, tick)
        name = QTableWidgetItem(label_for(key))
        name.setFlags(Qt.ItemFlag.ItemIsEnabled)
        name.setToolTip(f"{key}; the design has {get_value(project, key)}")
        self.setItem(row, NAME, name)
        for column in (LOW, HIGH, LIMITS):
            self.setItem(row, column, QTableWidgetItem())
            self.item(row, column).setFlags(Qt.ItemFlag.ItemIsEnabled)
        if key == WIRE_KEY:
            self._fill_wire_row(row, project.winding.wire)
        else:
            self._fill_steel_row(row, key)

    def _fill_wire_row(self, row: int, size: str) -> None:
        series = wire_series(size)
        boxes = (QComboBox(), QComboBox())
        for box, end, column in zip(boxes, self.wire_range, (LOW, HIGH), strict=True):
            box.addItems(series)
            box.setCurrentText(end)
            box.setObjectName(f"sizing_wire_{'low' if column == LOW else 'high'}")
            box.setToolTip("The search tries every standard size of the series from one end to the other")
            box.currentTextChanged.connect(self._on_wire_changed)
            self.setCellWidget(row, column, box)
        self.wire_boxes = boxes
        limits = self.item(row, LIMITS)
        limits.setText("AWG series" if series[0].startswith("AWG") else "metric series (IEC 60317)")
        limits.setForeground(QColor("#555555"))

    def _on_wire_changed(self, _text: str) -> None:
        self.wire_range = (self.wire_boxes[0].currentText(), self.wire_boxes[1].currentText())
        self.changed.emit()

    def _fill_steel_row(self, row: int, key: str) -> None:
        steels = QListWidget()
        steels.setObjectName(f"sizing_steels_{key.split('.')[0]}")
        steels.setToolTip(f"The search tries every ticked {STEEL_KEYS[key]} steel of the library")
        for name, steel in sorted(library.steels().items()):
            if steel.kind != STEEL_KEYS[key]:
                continue
            item = QListWidgetItem(name)
            item.setFlags(Qt.ItemFlag.ItemIsUserCheckable | Qt.ItemFlag.ItemIsEnabled)
            item.setCheckState(Qt.CheckState.Checked if name in self.steels[key] else Qt.CheckState.Unchecked)
            steels.addItem(item)
        steels.itemChanged.connect(lambda _item, key=key: self._on_steels_changed(key))
        self.setSpan(row, LOW, 1, 3)
        self.setCellWidget(row, LOW, steels)
        self.steel_lists[key] = steels
        shown = min(steels.count(), 4)  # a longer user library scrolls inside the cell
        self.setRowHeight(row, shown * steels.sizeHintForRow(0) + 2 * steels.frameWidth() + 2)

    def _on_steels_changed(self, key: str) -> None:
        steels = self.steel_lists[key]
        self.steels[key] = [steels.item(i).text() for i in range(steels.count())
                            if steels.item(i).checkState() == Qt.CheckState.Checked]
        self.changed.emit()

    def refresh_units(self) -> None:
        for row in range(len(self.keys)):
            self._show_row(row)

    # ------------------------------------------------------------------ reading
    def _ticked(self, row: int) -> bool:
        return self.item(row, FREE).checkState() == Qt.CheckState.Checked

    def free_key_names(self) -> list[str]:
        """The ticked keys: the numeric ones, then the wire and the steels."""
        numeric = [key.key for row, key in enumerate(self.keys) if self._ticked(row)]
        return numeric + [key for key in CHOICE_ROWS if self.keys and self._ticked(self.row_of(key))]

    def free_ranges(self, project) -> tuple[FreeRange, ...]:
        """The ticked keys with their ranges, read as the command line's ``--free KEY=LOW:HIGH`` is (so that the
        pole count, for one, takes only even values, and the wire every standard size between its two ends);
        raises ProjectError naming the key and its limit."""
        out = []
        for name in self.free_key_names():
            if name == WIRE_KEY:
                out.append(parse_free(f"{name}={self.wire_range[0]}:{self.wire_range[1]}", project))
            elif name in STEEL_KEYS:
                out.append(steel_choices(name, self.steels[name], project))
            else:
                out.append(parse_free(f"{name}={self.ranges[name][0]!r}:{self.ranges[name][1]!r}", project))
        return tuple(out)

    def row_of(self, name: str) -> int:
        if name in CHOICE_ROWS:
            return len(self.keys) + CHOICE_ROWS.index(name)
        return next(row for row, key in enumerate(self.keys) if key.key == name)

    def set_free(self, name: str, free: bool, low: float | str | None = None, high: float | str | None = None
                 ) -> None:
        """Tick or untick ``name``; with ``low`` and ``high`` (file units; wire sizes for the wire), set its range
        too (tests, scripts)."""
        row = self.row_of(name)
        if low is not None and high is not None and name == WIRE_KEY:
            for box, end in zip(self.wire_boxes, (low, high), strict=True):
                box.setCurrentText(str(end))
        elif low is not None and high is not None:
            self.ranges[name] = (low, high)  # type: ignore[assignment]
            self._show_row(row)
        self.item(row, FREE).setCheckState(Qt.CheckState.Checked if free else Qt.CheckState.Unchecked)

    def set_steels(self, key: str, names) -> None:
        """Tick exactly the steels ``names`` in the list of ``key`` (tests, scripts)."""
        steels = self.steel_lists[key]
        for i in range(steels.count()):
            item = steels.item(i)
            item.setCheckState(Qt.CheckState.Checked if item.text() in names else Qt.CheckState.Unchecked)

    # ------------------------------------------------------------------ showing and editing
    def _unit(self, key: FreeKey) -> str:
        return self.display.screen_unit(key.unit) if key.unit else "1"

    def _shown(self, value: float, key: FreeKey) -> float:
        return self.display.to_screen(value, key.unit) if key.unit else value

    def _limits_text(self, key: FreeKey) -> str:
        unit = unit_label(self._unit(key))
        unit = "" if unit == "1" else f" {unit}"
        low = None if key.low_limit is None else _number(self._shown(key.low_limit, key))
        high = None if key.high_limit is None else _number(self._shown(key.high_limit, key))
        whole = ", whole" if key.integer else ""
        if low is not None and high is not None:
            return f"{low} to {high}{unit}{whole}"
        if low is not None:
            return f"at least {low}{unit}{whole}"
        return f"at most {high}{unit}{whole}" if high is not None else ("whole numbers" if key.integer else "any")

    def _show_row(self, row: int, refusal: str = "") -> None:
        key = self.keys[row]
        low, high = self.ranges[key.key]
        blocked = self.signalsBlocked()
        self.blockSignals(True)
        for column, value in ((LOW, low), (HIGH, high)):
            self.item(row, column).setText(_number(self._shown(value, key)))
        limits = self.item(row, LIMITS)
        limits.setText(refusal or self._limits_text(key))
        limits.setForeground(QColor(FAIL_COLOUR) if refusal else QColor("#555555"))
        limits.setToolTip(refusal or f"What the project file accepts for {key.key}: {self._limits_text(key)}")
        self.blockSignals(blocked)

    def _on_item_changed(self, item: QTableWidgetItem) -> None:
        row, column = item.row(), item.column()
        if column == FREE:
            self.changed.emit()
            return
        if column not in (LOW, HIGH) or row >= len(self.keys):
            return
        key = self.keys[row]
        message = self.apply_entry(key.key, column == LOW, item.text())
        if message:
            self.refused.emit(key.key, message)
        else:
            self.changed.emit()

    def apply_entry(self, name: str, low_end: bool, text: str) -> str:
        """Take a typed range end (screen units); "" when applied, else why not (also shown in the row)."""
        row = self.row_of(name)
        key = self.keys[row]
        unit = unit_label(self._unit(key))
        unit = "" if unit == "1" else f" {unit}"
        end = "low" if low_end else "high"
        low, high = self.ranges[name]
        try:
            shown = float(text.replace(",", "."))
            if not math.isfinite(shown):
                raise ValueError
        except ValueError:
            return self._refuse(row, f"{end} end {text!r} is not a number; allowed {self._limits_text(key)}")
        value = self.display.from_screen(shown, key.unit) if key.unit else shown
        if key.integer and value != round(value):
            return self._refuse(row, f"{end} end {text}: a whole number, please ({self._limits_text(key)})")
        limit_low = key.low_limit if key.low_limit is not None else -math.inf
        limit_high = key.high_limit if key.high_limit is not None else math.inf
        # the limits are inclusive; a screen-unit round trip may miss them by a rounding error
        tolerance = 1e-9 * max(1.0, abs(value))
        if value < limit_low - tolerance:
            return self._refuse(row, f"{end} end {text}{unit} is below the least allowed, "
                                     f"{_number(self._shown(limit_low, key))}{unit}")
        if value > limit_high + tolerance:
            return self._refuse(row, f"{end} end {text}{unit} is above the most allowed, "
                                     f"{_number(self._shown(limit_high, key))}{unit}")
        value = min(max(value, limit_low), limit_high)
        if (low_end and value > high) or (not low_end and value < low):
            other = "high" if low_end else "low"
            return self._refuse(row, f"{end} end {text}{unit} is beyond the {other} end, "
                                     f"{_number(self._shown(high if low_end else low, key))}{unit}")
        self.ranges[name] = (value, high) if low_end else (low, value)
        self._show_row(row)
        return ""

    def _refuse(self, row: int, message: str) -> str:
        self._show_row(row, refusal=f"not applied: {message}")
        return message


class GradeList(QListWidget):
    """The magnet grades a search may use, ticked; the design's own grade ticked at first."""

    changed = Signal()

    def __init__(self):
        super().__init__()
        self.setObjectName("sizing_grades")
        self.setToolTip("The search tries every ticked grade; untick all but one to keep the grade fixed")
        self._filled = False
        self.itemChanged.connect(lambda _item: self.changed.emit())

    def set_project(self, project) -> None:
        if self._filled:
            return
        self.blockSignals(True)
        for name, grade in library.magnet_grades().items():
            item = QListWidgetItem(f"{name}  ({grade.family})")
            item.setData(Qt.ItemDataRole.UserRole, name)
            item.setFlags(Qt.ItemFlag.ItemIsUserCheckable | Qt.ItemFlag.ItemIsEnabled)
            item.setCheckState(Qt.CheckState.Checked if name == project.magnets.grade else Qt.CheckState.Unchecked)
            self.addItem(item)
        self.blockSignals(False)
        self._filled = True

    def chosen(self) -> list[str]:
        return [self.item(i).data(Qt.ItemDataRole.UserRole) for i in range(self.count())
                if self.item(i).checkState() == Qt.CheckState.Checked]

    def set_chosen(self, names) -> None:
        for i in range(self.count()):
            item = self.item(i)
            item.setCheckState(Qt.CheckState.Checked if item.data(Qt.ItemDataRole.UserRole) in names
                               else Qt.CheckState.Unchecked)


class ObjectiveList(QWidget):
    """One tick box per objective of ``core.sizing_objectives.OBJECTIVES``; active mass ticked at first."""

    changed = Signal()

    def __init__(self):
        super().__init__()
        layout = flush_column(self)
        layout.setSpacing(1)
        self.boxes: dict[str, QCheckBox] = {}
        for name, objective in OBJECTIVES.items():
            box = QCheckBox(f"{objective.label} ({'highest' if objective.maximise else 'lowest'})")
            box.setObjectName(f"sizing_objective_{name}")
            box.setChecked(name in ("mass", "efficiency"))
            box.toggled.connect(lambda _on: self.changed.emit())
            layout.addWidget(box)
            self.boxes[name] = box

    def chosen(self) -> tuple[str, ...]:
        return tuple(name for name, box in self.boxes.items() if box.isChecked())

    def set_chosen(self, names) -> None:
        for name, box in self.boxes.items():
            box.setChecked(name in names)
