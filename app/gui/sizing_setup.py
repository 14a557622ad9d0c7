"""What a sizing search may change and what it ranks by: the left side of the sizing page.

:class:`FreeVariableTable` lists every numeric key a search may free (``core.sizing_space.free_keys``):
tick a key to free it, edit its low and high ends in screen units. An end outside the schema's limits,
a low end above the high one or a fraction for a whole-number key is refused: the cell keeps its last
value and the limit is written in the row's last column, in the failure colour. :class:`GradeList` ticks
the magnet grades to consider (from the library) and :class:`ObjectiveList` the objectives.
"""

from __future__ import annotations

import math

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QColor
from PySide6.QtWidgets import (
    QAbstractItemView,
    QCheckBox,
    QHeaderView,
    QListWidget,
    QListWidgetItem,
    QTableWidget,
    QTableWidgetItem,
    QWidget,
)

from pmdc_sizer.core import library
from pmdc_sizer.core.sizing_objectives import OBJECTIVES
from pmdc_sizer.core.sizing_space import FreeKey, FreeRange, free_keys, parse_free

from ..figures import FAIL_COLOUR
from ..formatting import unit_label
from .display_units import DisplayUnits
from .editor import label_for
from .style import flush_column

#: Keys ticked when the page first opens on a design: what an engineer sizes first.
FIRST_FREE_KEYS = ("magnets.thickness_mm", "housing.wall_mm", "armature.stack_length_mm",
                   "winding.turns_per_coil")
#: A range's first ends around the design's own value, as shares of it.
FIRST_RANGE_SHARES = (0.6, 1.5)
FREE, NAME, LOW, HIGH, LIMITS = range(5)


def _number(value: float) -> str:
    return f"{value:.6g}"


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
        self.keys: list[FreeKey] = []
        self.ranges: dict[str, tuple[float, float]] = {}  #: key → (low, high), file units
        self.setHorizontalHeaderLabels(["Free", "Key", "Low", "High", "Allowed (unit)"])
        header = self.horizontalHeader()
        header.setSectionResizeMode(NAME, QHeaderView.ResizeMode.Stretch)
        for column in (FREE, LOW, HIGH):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(LIMITS, QHeaderView.ResizeMode.Interactive)
        header.resizeSection(LIMITS, 150)
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
        self.blockSignals(True)
        self.setRowCount(len(self.keys))
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
        self.blockSignals(False)

    def refresh_units(self) -> None:
        for row in range(self.rowCount()):
            self._show_row(row)

    # ------------------------------------------------------------------ reading
    def free_key_names(self) -> list[str]:
        return [key.key for row, key in enumerate(self.keys)
                if self.item(row, FREE).checkState() == Qt.CheckState.Checked]

    def free_ranges(self, project) -> tuple[FreeRange, ...]:
        """The ticked keys with their ranges, read as the command line's ``--free KEY=LOW:HIGH`` is (so that the
        pole count, for one, takes only even values); raises ProjectError naming the key and its limit."""
        return tuple(parse_free(f"{name}={self.ranges[name][0]!r}:{self.ranges[name][1]!r}", project)
                     for name in self.free_key_names())

    def row_of(self, name: str) -> int:
        return next(row for row, key in enumerate(self.keys) if key.key == name)

    def set_free(self, name: str, free: bool, low: float | None = None, high: float | None = None) -> None:
        """Tick or untick ``name``; with ``low`` and ``high`` (file units), set its range too (tests, scripts)."""
        row = self.row_of(name)
        if low is not None and high is not None:
            self.ranges[name] = (low, high)
            self._show_row(row)
        self.item(row, FREE).setCheckState(Qt.CheckState.Checked if free else Qt.CheckState.Unchecked)

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
        if column not in (LOW, HIGH):
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
