"""The design editor: every key of the project schema as a widget, grouped the way a motor engineer
works through a design (duty first, then the magnetic circuit from the magnets inwards, then the
winding, the losses and the money).

Widgets are generated from ``core.project.key_specs()``: the spin-box suffix is the key's unit (or its
US customary equivalent on screen), the limits are the schema's, the tooltip is its description. A
schema key this module does not know still appears, in the last group. Widgets only propose values to
the input model; the model decides.
"""

from __future__ import annotations

import math

from PySide6.QtCore import QSize, Qt
from PySide6.QtWidgets import (
    QAbstractSpinBox,
    QCheckBox,
    QComboBox,
    QDoubleSpinBox,
    QFormLayout,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QScrollArea,
    QSizePolicy,
    QSpinBox,
    QStyle,
    QStyleOptionSpinBox,
    QToolButton,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.app.field_labels import label_for, label_in_sentence
from pmdc_sizer.app.formatting import quantity as format_quantity
from pmdc_sizer.app.formatting import significant, unit_label
from pmdc_sizer.core import library

from .display_units import DisplayUnits
from .input_model import DesignModel, QuantityModel
from .style import flush_column, wrapped_label

#: (title, sections of the file, open at start)
GROUPS = (
    ("Supply, load and temperatures", ("supply", "load", "temperatures"), True),
    ("Poles and magnets", ("motor", "magnets"), True),
    ("Air gap and housing", ("airgap", "housing"), True),
    ("Armature", ("armature",), False),
    ("Winding", ("winding",), False),
    ("Losses, thermal and rotor", ("losses", "thermal", "rotor"), False),
    ("Brushes and commutator", ("brushes",), False),
    ("Prices and project information", ("prices", "project"), False),
    ("Production spread (tolerances)", ("tolerances",), False),
)
OTHER_GROUP = "Other keys"

_STEEL_KIND = {"housing.steel": "housing", "armature.steel": "lamination"}


def number_for_people(value: float) -> str:
    """A typed or stored number as a person writes it: "6", "0.45", "1.2e+04" never, "12000"."""
    return f"{value:.6g}" if abs(value) < 1e6 else f"{value:.0f}"


def _trimmed(text: str) -> str:
    return text.rstrip("0").rstrip(".") if "." in text else text


def edit_text(spec, before, after, display: DisplayUnits) -> str:
    """The undo entry of one edit: "magnet thickness 6 → 5 mm" (in the screen's units)."""
    label = label_in_sentence(spec.path)
    if isinstance(after, bool) or isinstance(before, bool):
        return f"{label} {'on' if after else 'off'}"
    if isinstance(after, int | float) and isinstance(before, int | float) and spec.kind in ("float", "int"):
        unit = display.screen_unit(spec.unit)
        shown = [display.to_screen(float(v), spec.unit) for v in (before, after)]
        texts = [_trimmed(significant(v, QuantitySpinBox.SIGNIFICANT_DIGITS)) for v in shown]
        suffix = f" {unit_label(unit)}" if unit not in ("", "1") else ""
        return f"{label} {texts[0]} → {texts[1]}{suffix}"
    if before is None:
        return f"set {label} to {after}"
    if after is None:
        return f"clear {label}"
    return f"{label} {before} → {after}"


def custom_grade_from_library(grade) -> dict:
    """The inline custom-grade table that reproduces a library grade, in the file's units."""
    table = library.grade_table(grade)
    table["name"] = f"{grade.name} (custom)"[:60]
    table["source"] = (f"copied from the library grade {grade.name}; replace with certified data")[:400]
    return table


class _NoWheelUnlessFocused:
    """Scrolling the editor must not change the value under the pointer by accident."""

    def wheelEvent(self, event):  # noqa: N802 - Qt's name
        if self.hasFocus():
            super().wheelEvent(event)
        else:
            event.ignore()


class QuantitySpinBox(_NoWheelUnlessFocused, QDoubleSpinBox):
    """Shows as few decimals as the value needs ("6 mm", "0.45 mm"), steps adaptively."""

    SIGNIFICANT_DIGITS = 5
    significant_digits = SIGNIFICANT_DIGITS  #: fewer for a value converted to US units, see show_value

    def textFromValue(self, value: float) -> str:  # noqa: N802 - Qt's name
        magnitude = math.floor(math.log10(abs(value))) if value else 0
        decimals = min(self.decimals(), max(self.significant_digits - 1 - magnitude, 0))
        text = f"{value:.{decimals}f}"
        return text.rstrip("0").rstrip(".") if "." in text else text

    #: the values the box is sized for: the schema's limits on screen (set by FieldEditor), not its range
    sized_for: tuple[float, float] | None = None

    def minimumSizeHint(self) -> QSize:  # noqa: N802 - Qt's name
        # Qt sizes a spin box for the text of its range, which is kept a thousand times wider than the
        # schema's limits (see FieldEditor._configure_range): sized that way the boxes pushed the editor's
        # column past its viewport and were cut off on the right. Size for the limits instead.
        if self.sized_for is None:
            return super().minimumSizeHint()
        metrics = self.fontMetrics()
        texts = [self.prefix() + self.textFromValue(value) + self.suffix() for value in self.sized_for]
        texts.append(self.specialValueText())
        width = max(metrics.horizontalAdvance(text) for text in texts) + 2  # and the cursor
        option = QStyleOptionSpinBox()
        self.initStyleOption(option)
        hint = QSize(width, super().minimumSizeHint().height())
        return self.style().sizeFromContents(QStyle.ContentsType.CT_SpinBox, option, hint, self).expandedTo(
            QSize(0, hint.height()))

    def sizeHint(self) -> QSize:  # noqa: N802 - Qt's name
        return self.minimumSizeHint() if self.sized_for is not None else super().sizeHint()


class CountSpinBox(_NoWheelUnlessFocused, QSpinBox):
    pass


class ChoiceBox(_NoWheelUnlessFocused, QComboBox):
    """A combo box that does not widen the editor column to its longest item."""

    def __init__(self):
        super().__init__()
        self.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self.setMinimumContentsLength(10)


class FieldEditor(QWidget):
    """One key's editor with its refusal message underneath."""

    def __init__(self, field: QuantityModel, model: DesignModel, display: DisplayUnits):
        super().__init__()
        self.field, self.model, self.display = field, model, display
        spec = field.spec
        outer = flush_column(self)
        outer.setSpacing(1)
        row = QHBoxLayout()
        row.setSpacing(4)
        outer.addLayout(row)
        self.enable_box: QCheckBox | None = None
        if spec.optional and spec.kind in ("float", "int"):
            self.enable_box = QCheckBox()
            self.enable_box.setToolTip("Tick to set a value; untick to leave the key out of the design.")
            self.enable_box.toggled.connect(self._on_enable_toggled)
            row.addWidget(self.enable_box)
        self.widget = self._make_widget()
        row.addWidget(self.widget, 1)
        tip = spec.description
        if spec.minimum is not None and spec.maximum is not None:
            tip += f"\nAllowed: {spec.minimum:g} to {spec.maximum:g} {spec.unit}".rstrip()
        self.widget.setToolTip(tip)
        self.error_label = QLabel()
        self.error_label.setObjectName("field_error")
        self.error_label.setWordWrap(True)
        self.error_label.setStyleSheet("color: #b3261e;")
        self.error_label.hide()
        outer.addWidget(self.error_label)
        field.changed.connect(self.show_value)
        field.error_changed.connect(self.show_error)
        self.show_value(field.value)

    # -- construction
    def _make_widget(self):
        spec = self.field.spec
        if spec.kind == "float":
            box = QuantitySpinBox()
            box.setKeyboardTracking(False)
            box.setStepType(QAbstractSpinBox.StepType.AdaptiveDecimalStepType)
            box.setAccelerated(True)
            box.setFocusPolicy(Qt.FocusPolicy.StrongFocus)
            box.valueChanged.connect(self._on_number)
            box.editingFinished.connect(self.model.flush)
            self._configure_range(box)
            return box
        if spec.kind == "int":
            box = CountSpinBox()
            box.setKeyboardTracking(False)
            box.setFocusPolicy(Qt.FocusPolicy.StrongFocus)
            box.setRange(int(spec.minimum), int(spec.maximum))
            box.valueChanged.connect(self._on_number)
            box.editingFinished.connect(self.model.flush)
            return box
        if spec.kind == "choice" or spec.path in _STEEL_KIND:
            box = ChoiceBox()
            box.setFocusPolicy(Qt.FocusPolicy.StrongFocus)
            if spec.path in _STEEL_KIND:
                kind = _STEEL_KIND[spec.path]
                for name, steel in sorted(library.steels().items()):
                    if steel.kind == kind:
                        box.addItem(name, name)
            else:
                for choice in spec.choices:
                    box.addItem(str(choice), choice)
            box.activated.connect(self._on_choice)
            return box
        if spec.kind == "bool":
            box = QCheckBox()
            box.toggled.connect(lambda on: self.field.propose(bool(on), final=True))
            return box
        line = QLineEdit()
        line.editingFinished.connect(self._on_text)
        return line

    def _configure_range(self, box: QDoubleSpinBox) -> None:
        spec = self.field.spec
        unit = self.display.screen_unit(spec.unit)
        low = self.display.to_screen(spec.minimum, spec.unit)
        high = self.display.to_screen(spec.maximum, spec.unit)
        box.blockSignals(True)
        box.setDecimals(5 if unit == "in" else 4)
        self.screen_limits = (low, high)
        # Wider than the schema allows, so that a value typed out of range arrives here whole and is refused
        # with its limit (a spin box held to the limits drops the digit it cannot take: 50 → 5).
        reach = 1000.0 * max(abs(low), abs(high), 1.0)
        box.setRange(-reach, reach)
        if isinstance(box, QuantitySpinBox):
            box.sized_for = (low, high)
            box.updateGeometry()
        box.setSuffix(f" {unit}" if unit not in ("", "1") else "")
        if spec.unit == "/kg":
            box.setSuffix(" per kg")
        box.blockSignals(False)

    def refresh_units(self) -> None:
        if isinstance(self.widget, QDoubleSpinBox):
            self._configure_range(self.widget)
            self.show_value(self.field.value)

    # -- model to widget
    def show_value(self, value) -> None:
        spec, w = self.field.spec, self.widget
        w.blockSignals(True)
        try:
            if self.enable_box is not None:
                self.enable_box.blockSignals(True)
                self.enable_box.setChecked(value is not None)
                self.enable_box.blockSignals(False)
                w.setEnabled(value is not None)
            if isinstance(w, QDoubleSpinBox):
                if value is None:  # an absent optional key reads "not set"
                    w.setSpecialValueText("not set")
                    w.setValue(w.minimum())
                else:
                    w.setSpecialValueText("")
                    w.significant_digits = self._digits_on_screen(float(value))
                    w.setValue(self.display.to_screen(float(value), spec.unit))
                self._shown_text = w.cleanText()
            elif isinstance(w, QSpinBox):
                w.setValue(int(value) if value is not None else int(spec.minimum))
            elif isinstance(w, QComboBox):
                index = w.findData(value)
                if index < 0 and value is not None:
                    w.addItem(str(value), value)
                    index = w.count() - 1
                w.setCurrentIndex(index)
            elif isinstance(w, QCheckBox):
                w.setChecked(bool(value))
            else:
                w.setText("" if value is None else str(value))
        finally:
            w.blockSignals(False)

    def _digits_on_screen(self, value: float) -> int:
        """Significant figures for the box: the file's value as written, or, converted to another unit system,
        as many as the file's value shows but at least three (6 mm → 0.236 in, not 0.23622 in)."""
        spec = self.field.spec
        if self.display.screen_unit(spec.unit) == spec.unit:
            return QuantitySpinBox.SIGNIFICANT_DIGITS
        written = _trimmed(significant(value, QuantitySpinBox.SIGNIFICANT_DIGITS)).lstrip("-").lstrip("0.")
        return max(3, len(written.replace(".", "")))

    def show_error(self, message: str) -> None:
        self.error_label.setText(message)
        self.error_label.setVisible(bool(message))
        self.widget.setStyleSheet("background: #fde7e4;" if message else "")

    # -- widget to model
    def _number(self):
        w, spec = self.widget, self.field.spec
        if isinstance(w, QDoubleSpinBox):
            value = float(self.display.from_screen(w.value(), spec.unit))
            # Converting back from inches or °F must not push a value past the schema's limits.
            return min(max(value, spec.minimum), spec.maximum)
        return int(w.value())

    def out_of_range(self) -> str:
        """Why the number in the box cannot be applied ("" when it is inside the schema's limits)."""
        w, spec = self.widget, self.field.spec
        if not isinstance(w, QDoubleSpinBox) or not hasattr(self, "screen_limits"):
            return ""
        low, high = self.screen_limits
        value = w.value()
        slack = 1e-9 * max(abs(low), abs(high), 1.0)
        if low - slack <= value <= high + slack:
            return ""
        unit = unit_label(self.display.screen_unit(spec.unit))
        unit = f" {unit}" if unit not in ("", "1") else ""
        side, limit = ("above the largest", high) if value > high else ("below the smallest", low)
        return (f"{label_for(spec.path)}: {number_for_people(value)}{unit} is {side} allowed value, "
                f"{number_for_people(limit)}{unit} (allowed {number_for_people(low)} to {number_for_people(high)}"
                f"{unit}); not applied.")

    def _on_number(self, _value) -> None:
        if isinstance(self.widget, QDoubleSpinBox) and self.widget.cleanText() == getattr(self, "_shown_text", None):
            # The box re-read its own rounded text (leaving the field): the user changed nothing, and a value
            # converted to inches and rounded for reading must not replace the exact one in the file.
            return
        if isinstance(self.widget, QDoubleSpinBox):
            self._shown_text = self.widget.cleanText()
        refusal = self.out_of_range()
        if refusal:
            self.field.set_error(refusal)  # shown under the field; the design keeps its value
            self.model.edit_rejected.emit(self.field.key, refusal)
            return
        self.field.propose(self._number(), final=False)

    def _on_enable_toggled(self, on: bool) -> None:
        self.widget.setEnabled(on)
        if not on:
            self.field.propose(None, final=True)
            return
        spec = self.field.spec
        if self.widget.specialValueText() and self.widget.value() == self.widget.minimum():
            # A first value in the middle of the range (geometrically), to be typed over.
            start = float(f"{(spec.minimum * spec.maximum) ** 0.5:.2g}")
            self.widget.setSpecialValueText("")
            self.widget.blockSignals(True)
            self.widget.setValue(self.display.to_screen(start, spec.unit))
            self.widget.blockSignals(False)
        self.field.propose(self._number(), final=True)

    def _on_choice(self, index: int) -> None:
        self.field.propose(self.widget.itemData(index), final=True)

    def _on_text(self) -> None:
        text = self.widget.text().strip()
        if text != (self.field.value or ""):
            # an emptied optional text (a revision date) removes the key rather than failing its pattern
            self.field.propose(None if not text and self.field.spec.optional else text, final=True)


class Section(QWidget):
    """A titled group that folds away, so the engineer keeps open what they are working on."""

    def __init__(self, title: str, expanded: bool):
        super().__init__()
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 4)
        layout.setSpacing(2)
        self.header = QToolButton()
        self.header.setText(title)
        self.header.setCheckable(True)
        self.header.setChecked(expanded)
        self.header.setToolButtonStyle(Qt.ToolButtonStyle.ToolButtonTextBesideIcon)
        self.header.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Fixed)
        self.header.setStyleSheet("QToolButton { font-weight: bold; text-align: left; padding: 3px; }")
        self.header.toggled.connect(self._toggle)
        layout.addWidget(self.header)
        self.body = QWidget()
        self.form = QFormLayout(self.body)
        self.form.setContentsMargins(8, 0, 4, 0)
        self.form.setVerticalSpacing(3)
        self.form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
        # In a narrow column a long label goes above its field rather than pushing the field out of view.
        self.form.setRowWrapPolicy(QFormLayout.RowWrapPolicy.WrapLongRows)
        layout.addWidget(self.body)
        self._toggle(expanded)

    def _toggle(self, on: bool) -> None:
        self.header.setArrowType(Qt.ArrowType.DownArrow if on else Qt.ArrowType.RightArrow)
        self.body.setVisible(on)


class MagnetGradePicker(QWidget):
    """Library grade or the design's own custom grade; shows the chosen grade's properties."""

    LIBRARY, CUSTOM = 0, 1

    def __init__(self, model: DesignModel):
        super().__init__()
        self.model = model
        layout = flush_column(self)
        self.source_box = ChoiceBox()
        self.source_box.addItem("From the library", self.LIBRARY)
        self.source_box.addItem("Custom (supplier's certified data)", self.CUSTOM)
        self.source_box.setToolTip("Use a typical library grade, or enter the numbers from your supplier's "
                                   "certificate.")
        self.source_box.activated.connect(self._on_source)
        layout.addWidget(self.source_box)
        self.grade_box = ChoiceBox()
        self.grade_box.setToolTip(model.fields["magnets.grade"].spec.description)
        grades = library.magnet_grades()
        for name, grade in sorted(grades.items(), key=lambda item: (item[1].family, item[0])):
            self.grade_box.addItem(f"{name}   ({grade.family})", name)
        self.grade_box.activated.connect(self._on_grade)
        layout.addWidget(self.grade_box)
        self.properties = wrapped_label("grade_properties",
                                        "color: #333; background: #f4f4f0; padding: 4px; border-radius: 3px;",
                                        rich=True)
        layout.addWidget(self.properties)
        self.error_label = wrapped_label(style="color: #b3261e;")
        self.error_label.hide()
        layout.addWidget(self.error_label)
        model.fields["magnets.grade"].changed.connect(lambda _v: self.refresh())
        model.fields["magnets.grade"].error_changed.connect(self._show_error)
        model.project_updated.connect(lambda _p: self.refresh())
        self._last_library_grade = model.fields["magnets.grade"].value or "Y30"
        self.custom_rows: list[QWidget] = []
        self.refresh()

    def _show_error(self, message: str) -> None:
        self.error_label.setText(message)
        self.error_label.setVisible(bool(message))

    @property
    def is_custom(self) -> bool:
        return self.model.project.magnets.custom_grade is not None

    def refresh(self) -> None:
        magnets = self.model.project.magnets
        self.source_box.setCurrentIndex(self.CUSTOM if self.is_custom else self.LIBRARY)
        self.grade_box.setVisible(not self.is_custom)
        if magnets.grade:
            self._last_library_grade = magnets.grade
            index = self.grade_box.findData(magnets.grade)
            self.grade_box.setCurrentIndex(index)
        for row in self.custom_rows:
            row.setVisible(self.is_custom)
        if self.is_custom:
            text = "Custom grade: edit its data below. Values are at 20 °C."
        else:
            grade = library.magnet_grades().get(magnets.grade)
            text = grade_summary(grade) if grade else ""
        if text != self.properties.text():  # laying out rich text again on every edit is not free
            self.properties.setText(text)

    def _on_grade(self, index: int) -> None:
        self.model.fields["magnets.grade"].propose(self.grade_box.itemData(index), final=True)

    def _on_source(self, index: int) -> None:
        wanted = self.source_box.itemData(index)
        if wanted == self.CUSTOM and not self.is_custom:
            grade = library.magnet_grades()[self._last_library_grade]
            self.model.propose_many({"magnets.grade": None, "magnets.custom_grade": custom_grade_from_library(grade)},
                                    "switch to a custom grade")
        elif wanted == self.LIBRARY and self.is_custom:
            self.model.propose_many({"magnets.custom_grade": None, "magnets.grade": self._last_library_grade},
                                    "switch to a library grade")
        self.refresh()


def grade_summary(grade) -> str:
    """The grade's catalogue data at 20 °C in three short lines that wrap in a narrow column."""
    return (
        f"<b>{grade.name}</b>, {grade.family}, typical at 20 °C:<br>"
        f"Br <b>{format_quantity(grade.remanence, 'T')}</b>, "
        f"HcB <b>{format_quantity(grade.coercivity_hcb, 'kA/m')}</b>, "
        f"HcJ <b>{format_quantity(grade.coercivity_hcj, 'kA/m')}</b>, "
        f"(BH)max <b>{format_quantity(grade.energy_product, 'kJ/m3')}</b><br>"
        f"μrec <b>{significant(grade.recoil_permeability, 3)}</b>, Hk/HcJ <b>{significant(grade.squareness, 2)}</b>; "
        f"per K: Br <b>{100 * grade.remanence_temp_coeff:+.2g} %</b>, "
        f"HcJ <b>{100 * grade.coercivity_temp_coeff:+.2g} %</b><br>"
        f"max. working <b>{grade.max_working_temperature_C:.0f} °C</b>, "
        f"density <b>{format_quantity(grade.density, 'kg/m3')}</b><br>"
        f"<small>Source: {grade.source}</small>"
    )


class DesignEditor(QScrollArea):
    """All groups in one scrolling column."""

    def __init__(self, model: DesignModel, display: DisplayUnits):
        super().__init__()
        self.model, self.display = model, display
        self.setWidgetResizable(True)
        self.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        content = QWidget()
        column = QVBoxLayout(content)
        column.setContentsMargins(4, 4, 4, 4)
        column.setSpacing(2)
        self.editors: dict[str, FieldEditor] = {}
        self.sections: dict[str, Section] = {}
        section_of_group = {section: title for title, sections, _ in GROUPS for section in sections}
        for title, _sections, expanded in GROUPS:
            self.sections[title] = Section(title, expanded)
        self.grade_picker = MagnetGradePicker(model)
        for key, field in model.fields.items():
            title = section_of_group.get(key.split(".")[0], OTHER_GROUP)
            if title not in self.sections:
                self.sections[title] = Section(title, False)
            form = self.sections[title].form
            if key == "magnets.grade":
                form.addRow(self._label(label_for(key), field.spec.description), self.grade_picker)
                continue
            editor = FieldEditor(field, model, display)
            self.editors[key] = editor
            label = self._label(label_for(key), field.spec.description)
            form.addRow(label, editor)
            if key.startswith("magnets.custom_grade."):
                self.grade_picker.custom_rows.extend((label, editor))
        for section in self.sections.values():
            column.addWidget(section)
            # an opened group may need a wider column: tell the splitter (see minimumSizeHint)
            section.header.toggled.connect(lambda _on: self.updateGeometry())
        column.addStretch(1)
        self.setWidget(content)
        self.grade_picker.refresh()
        model.describe_edit = lambda spec, before, after: edit_text(spec, before, after, self.display)

    def minimumSizeHint(self) -> QSize:  # noqa: N802 - Qt's name
        # Sideways scrolling is off, so the column must never be narrower than its content plus the
        # vertical scroll bar: a QScrollArea's own hint ignores both, and the splitter honours only this.
        content = self.widget().minimumSizeHint()
        frame = 2 * self.frameWidth()
        return QSize(content.width() + self.verticalScrollBar().sizeHint().width() + frame,
                     super().minimumSizeHint().height())

    @staticmethod
    def _label(text: str, tip: str) -> QLabel:
        label = QLabel(text)
        label.setToolTip(tip)
        return label

    def refresh_units(self) -> None:
        for editor in self.editors.values():
            editor.refresh_units()

    def editor(self, key: str) -> FieldEditor:
        return self.editors[key]


__all__ = ["DesignEditor", "FieldEditor", "custom_grade_from_library", "edit_text"]
