"""The input model: the design being edited, one field per key of the project schema, undo and redo.

Views never touch the project directly: a widget *proposes* a value for its key; the model validates it
through ``core.project.with_values`` (and resolves materials and wire through
``core.design.design_from_project``), so a bad value is refused with the core's message naming the key
and the limit, and the design stays as it was.

Signals are named for what happened:

* ``QuantityModel.changing(value)``: a value was proposed during a drag (spin-box arrows, wheel); the
  design shown and evaluated follows it at once, but nothing is on the undo stack yet.
* ``QuantityModel.changed(value)``: the value is now part of the design (edit done, undo, redo, open).
* ``DesignModel.project_updated(project)``: the design to show and evaluate has changed.
* ``DesignModel.edit_rejected(key, message)``: a proposed value was refused; the design is unchanged.

A drag becomes one undo step: proposals are committed when the user stops for ``COMMIT_AFTER_IDLE_MS``
or finishes the edit, and consecutive commits of the same key merge.
"""

from __future__ import annotations

import time
from typing import Any

from PySide6.QtCore import QObject, QTimer, Signal
from PySide6.QtGui import QUndoCommand, QUndoStack

from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.project import KeySpec, Project, ProjectError, get_value, key_specs, with_values

COMMIT_AFTER_IDLE_MS = 500  #: a drag that pauses this long becomes an undo step
MERGE_WINDOW_S = 2.0  #: commits of one key this close together are one undo step
EDITABLE_KINDS = ("float", "int", "str", "choice", "bool")


def checked_project(project: Project, changes: dict[str, Any]) -> Project:
    """``project`` with ``changes``, validated like a file and with its materials resolved."""
    candidate = with_values(project, changes)
    design_from_project(candidate)
    return candidate


def value_of(project: Project, key: str):
    """The key's value in the project, or None where it (or its table) is absent."""
    try:
        return get_value(project, key)
    except ProjectError:
        return None


class QuantityModel(QObject):
    """One key of the design: its schema entry, current value (file units) and refusal message."""

    changing = Signal(object)
    changed = Signal(object)
    error_changed = Signal(str)

    def __init__(self, spec: KeySpec, design: DesignModel):
        super().__init__(design)
        self.spec = spec
        self.key = spec.path
        self._design = design
        self.error = ""

    @property
    def value(self):
        return value_of(self._design.project, self.key)

    @property
    def unit(self) -> str:
        return self.spec.unit

    @property
    def minimum(self):
        return self.spec.minimum

    @property
    def maximum(self):
        return self.spec.maximum

    def propose(self, value, final: bool = False) -> bool:
        return self._design.propose(self.key, value, final=final)

    def set_error(self, message: str) -> None:
        if message != self.error:
            self.error = message
            self.error_changed.emit(message)


class _EditCommand(QUndoCommand):
    MERGE_ID = 4101

    def __init__(self, design: DesignModel, before: Project, after: Project, keys: tuple[str, ...], text: str):
        super().__init__(text)
        self.design, self.before, self.after, self.keys = design, before, after, keys
        self.stamp = time.monotonic()
        self._first = True

    def id(self) -> int:
        return self.MERGE_ID

    def mergeWith(self, other) -> bool:  # noqa: N802 - Qt's name
        if not isinstance(other, _EditCommand) or other.keys != self.keys or len(self.keys) != 1:
            return False
        if other.stamp - self.stamp > MERGE_WINDOW_S:
            return False
        self.after, self.stamp = other.after, other.stamp
        return True

    def redo(self) -> None:
        if self._first:
            self._first = False  # the design already shows this state
            return
        self.design._apply(self.after)

    def undo(self) -> None:
        self.design._apply(self.before)


class DesignModel(QObject):
    """The design under edit: the committed project, the shown project (committed plus a drag in
    progress), a :class:`QuantityModel` per key, and the undo stack."""

    project_updated = Signal(object)
    edit_committed = Signal(str)
    edit_rejected = Signal(str, str)

    def __init__(self, project: Project | None = None, parent: QObject | None = None):
        super().__init__(parent)
        self.committed = project if project is not None else Project()
        self.project = self.committed
        self.undo_stack = QUndoStack(self)
        #: How an edit of one key reads in the Undo menu; the editor gives it the fields' labels and units.
        self.describe_edit = lambda spec, before, after: f"change {spec.path}"
        self.fields: dict[str, QuantityModel] = {
            spec.path: QuantityModel(spec, self)
            for spec in key_specs() if spec.kind in EDITABLE_KINDS and spec.path != "format_version"
        }
        self._pending: dict[str, Any] = {}
        self._idle = QTimer(self, singleShot=True, interval=COMMIT_AFTER_IDLE_MS)
        self._idle.timeout.connect(self.flush)

    # -- editing
    def propose(self, key: str, value, final: bool = False) -> bool:
        """Try ``value`` for ``key``; True when the shown design now has it."""
        if self._pending and key not in self._pending:
            self.flush()
        field = self.fields[key]
        try:
            candidate = checked_project(self.committed, {**self._pending, key: value})
        except ProjectError as error:
            field.set_error(str(error))
            self.edit_rejected.emit(key, str(error))
            return False
        field.set_error("")
        self._pending[key] = value
        self.project = candidate
        field.changing.emit(value)
        self.project_updated.emit(candidate)
        if final:
            self.flush()
        else:
            self._idle.start()
        return True

    def propose_many(self, changes: dict[str, Any], text: str) -> bool:
        """Several keys at once as one undo step (e.g. switching to a custom grade)."""
        self.flush()
        try:
            candidate = checked_project(self.committed, changes)
        except ProjectError as error:
            key = error.key if error.key in self.fields else next(iter(changes))
            self.fields[key].set_error(str(error))
            self.edit_rejected.emit(key, str(error))
            return False
        self._commit(candidate, tuple(changes), text)
        self._sync_fields()
        self.project_updated.emit(candidate)
        return True

    def flush(self) -> None:
        """Commit a drag in progress as one undo step."""
        self._idle.stop()
        if not self._pending:
            return
        keys = tuple(self._pending)
        self._pending = {}
        if self.project == self.committed:
            return
        if len(keys) == 1:
            spec = self.fields[keys[0]].spec
            text = self.describe_edit(spec, value_of(self.committed, keys[0]), value_of(self.project, keys[0]))
        else:
            text = "change several values"
        self._commit(self.project, keys, text)
        for key in keys:
            self.fields[key].changed.emit(self.fields[key].value)
        self._revert_refused_fields()

    def _commit(self, after: Project, keys: tuple[str, ...], text: str) -> None:
        before = self.committed
        self.committed = self.project = after
        self.undo_stack.push(_EditCommand(self, before, after, keys, text))
        for key in keys:
            self.edit_committed.emit(key)

    def _revert_refused_fields(self) -> None:
        for field in self.fields.values():
            if field.error:
                field.set_error("")
                field.changed.emit(field.value)

    # -- whole-design changes
    def _apply(self, project: Project) -> None:
        self._idle.stop()
        self._pending = {}
        self.committed = self.project = project
        self._sync_fields()
        self.project_updated.emit(project)

    def _sync_fields(self) -> None:
        for field in self.fields.values():
            field.set_error("")
            field.changed.emit(field.value)

    def replace_project(self, project: Project) -> None:
        """A new or opened design: the undo history starts again and the design is unmodified."""
        self.undo_stack.clear()
        self._apply(project)
        self.undo_stack.setClean()

    def undo(self) -> None:
        self.flush()
        self.undo_stack.undo()

    def redo(self) -> None:
        self.flush()
        self.undo_stack.redo()

    @property
    def modified(self) -> bool:
        return not self.undo_stack.isClean() or bool(self._pending)

    def mark_saved(self) -> None:
        self.flush()
        self.undo_stack.setClean()
