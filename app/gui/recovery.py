"""Autosave of unsaved designs and their recovery after a crash.

Each window has an :class:`AutoSaver`. A short while after the last edit (:data:`AUTOSAVE_DELAY_MS`)
it writes the unsaved design to ``recovery/<session>.json`` in the state folder (:mod:`app.state`),
through the same safe writer as every other file; once the design is saved or its changes discarded,
the copy is removed. While the window lives it holds a lock on ``recovery/<session>.lock``, released by
the operating system however the process ends, so a copy whose lock is free belongs to a window that
is gone: a crash, a kill, a power cut.

At the next start :func:`offer_recovery` lists every such copy (the design's name, its file, the time
it was written) in a :class:`RecoveryDialog`; the user restores some (each into a window, marked
unsaved, with its file as before) and discards the rest, or leaves them all for later.
"""

from __future__ import annotations

import datetime
import json
import os
import uuid
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import filelock
from PySide6.QtCore import QObject, Qt, QTimer
from PySide6.QtWidgets import (
    QDialog,
    QDialogButtonBox,
    QLabel,
    QListWidget,
    QListWidgetItem,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.app.errors import CommandError
from pmdc_sizer.app.files import write_text_atomically
from pmdc_sizer.app.state import RECOVERY_FOLDER, state_subfolder
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.errors import ProjectError
from pmdc_sizer.core.project import Project

AUTOSAVE_DELAY_MS = 1500  #: after the last edit; well inside the few seconds a crash may follow an edit
RECORD_VERSION = 1


@dataclass(frozen=True)
class RecoveryRecord:
    """One recovery copy on disk: an unsaved design of a window that is gone."""

    path: Path  #: the ``.json`` copy
    saved_at: datetime.datetime  #: when it was written (local time, with zone)
    file: Path | None  #: the project file the design belongs to, None for a design never saved
    name: str  #: the design's name
    text: str  #: the design as project-file text

    def describe(self) -> str:
        """Two lines for the list: the name and the time of the changes, then the file."""
        where = f"file: {self.file}" if self.file else "never saved to a file"
        return f"{self.name}   (unsaved changes from {self.saved_at:%Y-%m-%d %H:%M:%S})\n    {where}"

    def project(self) -> Project:
        """The design, validated like any file (ProjectError if the copy is damaged)."""
        return project_file.parse(self.text, source=str(self.path))


def recovery_folder() -> Path:
    """``recovery/`` in the state folder, created if need be."""
    return state_subfolder(RECOVERY_FOLDER)


def _read_record(path: Path) -> RecoveryRecord | None:
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
        saved_at = datetime.datetime.fromisoformat(data["saved_at"])
        file = Path(data["file"]) if data.get("file") else None
        return RecoveryRecord(path, saved_at, file, str(data["name"]), str(data["project"]))
    except (OSError, ValueError, KeyError, TypeError, RecursionError):
        return None


def orphaned_records() -> list[RecoveryRecord]:
    """The recovery copies whose window is gone (its lock is free), oldest first.

    Returns
    -------
    list of RecoveryRecord
        Damaged copies are left out (and removed: they can restore nothing).
    """
    try:
        folder = recovery_folder()
    except OSError:
        return []
    found = []
    for path in sorted(folder.glob("*.json")):
        lock = filelock.FileLock(path.with_suffix(".lock"), timeout=0)
        try:
            lock.acquire()
        except filelock.Timeout:
            continue  # a live window's copy
        except OSError:
            continue
        lock.release()
        record = _read_record(path)
        if record is None:
            path.unlink(missing_ok=True)
            continue
        found.append(record)
    return sorted(found, key=lambda record: record.saved_at)


def discard_record(record: RecoveryRecord) -> None:
    """Delete a recovery copy and its lock file."""
    record.path.unlink(missing_ok=True)
    record.path.with_suffix(".lock").unlink(missing_ok=True)


class AutoSaver(QObject):
    """Writes a window's unsaved design to its recovery copy shortly after each edit.

    Parameters
    ----------
    model : DesignModel
        The window's design model (``project``, ``modified``, ``project_updated``, ``undo_stack``).
    current_file : callable
        Returns the file the design belongs to (or None).
    layout : callable
        Returns the text whose comments the copy keeps (or None).
    parent : QObject, optional
        Owner.
    """

    def __init__(self, model, current_file: Callable[[], Path | None], layout: Callable[[], str | None],
                 parent: QObject | None = None):
        super().__init__(parent)
        self.model = model
        self._current_file = current_file
        self._layout = layout
        self.session = uuid.uuid4().hex
        self.last_error = ""
        self.path: Path | None = None
        self._lock: filelock.BaseFileLock | None = None
        try:
            folder = recovery_folder()
            self.path = folder / f"{self.session}.json"
            self._lock = filelock.FileLock(self.path.with_suffix(".lock"), timeout=0)
            self._lock.acquire()
        except (OSError, filelock.Timeout) as error:
            self.path, self._lock = None, None
            self.last_error = f"no recovery copies this session: {error}"
        self.timer = QTimer(self, singleShot=True, interval=AUTOSAVE_DELAY_MS)
        self.timer.timeout.connect(self.write_now)
        model.project_updated.connect(self._edited)
        model.undo_stack.indexChanged.connect(self._edited)
        model.undo_stack.cleanChanged.connect(self._edited)

    def _edited(self, *_signal_arguments) -> None:
        self.timer.start()

    def write_now(self) -> None:
        """Write the copy if the design has unsaved changes, remove it if it has none."""
        self.timer.stop()
        if self.path is None:
            return
        if not self.model.modified:
            self.path.unlink(missing_ok=True)
            return
        file = self._current_file()
        record = {
            "version": RECORD_VERSION,
            "saved_at": datetime.datetime.now().astimezone().isoformat(timespec="seconds"),
            "file": str(Path(file).resolve()) if file else None,
            "name": self.model.project.project.name,
            "pid": os.getpid(),
            "project": project_file.dumps(self.model.project, self._layout()),
        }
        try:
            write_text_atomically(self.path, json.dumps(record, ensure_ascii=False, indent=1), remember_folder=False)
            self.last_error = ""
        except CommandError as error:  # a full disk must not interrupt the user's work
            self.last_error = str(error)

    def discard(self) -> None:
        """The design was saved or its changes thrown away: no copy is needed."""
        self.timer.stop()
        if self.path is not None:
            self.path.unlink(missing_ok=True)

    def close(self) -> None:
        """The window closes with nothing unsaved: remove the copy and free the lock."""
        self.discard()
        if self._lock is not None:
            self._lock.release()
            if self.path is not None:
                self.path.with_suffix(".lock").unlink(missing_ok=True)
            self._lock = None


class RecoveryDialog(QDialog):
    """Lists the designs a crash left unsaved; each can be restored (checked) or discarded."""

    RESTORE, DISCARD, LATER = 1, 2, 3

    def __init__(self, records: list[RecoveryRecord], parent: QWidget | None = None):
        super().__init__(parent)
        self.setObjectName("recovery_dialog")
        self.setWindowTitle("Recover unsaved designs")
        self.records = records
        self.choice = self.LATER
        layout = QVBoxLayout(self)
        heading = QLabel(
            f"<b>pmdc-sizer stopped before {len(records)} design{'s' if len(records) != 1 else ''} "
            "{was} saved.</b><br>Their unsaved changes were kept. Tick the ones to restore; each opens with its "
            "file as before, marked unsaved. The others are discarded.".replace(
                "{was}", "was" if len(records) == 1 else "were"))
        heading.setWordWrap(True)
        layout.addWidget(heading)
        self.list = QListWidget()
        self.list.setObjectName("recovery_list")
        for record in records:
            item = QListWidgetItem(record.describe())
            item.setFlags(item.flags() | Qt.ItemFlag.ItemIsUserCheckable)
            item.setCheckState(Qt.CheckState.Checked)
            self.list.addItem(item)
        self.list.setMinimumWidth(760)
        self.list.setWordWrap(True)
        self.list.setMinimumHeight(min(60 + 44 * len(records), 360))
        layout.addWidget(self.list)
        buttons = QDialogButtonBox()
        self.restore_button = QPushButton("Restore ticked, discard the rest")
        self.discard_button = QPushButton("Discard all")
        self.later_button = QPushButton("Decide later")
        for button, role, choice in ((self.restore_button, QDialogButtonBox.ButtonRole.AcceptRole, self.RESTORE),
                                     (self.discard_button, QDialogButtonBox.ButtonRole.DestructiveRole, self.DISCARD),
                                     (self.later_button, QDialogButtonBox.ButtonRole.RejectRole, self.LATER)):
            buttons.addButton(button, role)
            button.clicked.connect(lambda _checked=False, c=choice: self._choose(c))
        self.restore_button.setDefault(True)
        layout.addWidget(buttons)

    def _choose(self, choice: int) -> None:
        self.choice = choice
        self.accept() if choice != self.LATER else self.reject()

    def ticked(self) -> list[RecoveryRecord]:
        """The records ticked for restoring."""
        return [record for index, record in enumerate(self.records)
                if self.list.item(index).checkState() == Qt.CheckState.Checked]


def apply_choice(dialog: RecoveryDialog, restore: Callable[[Project, Path | None], None]) -> list[str]:
    """Carry out the dialog's choice: restore the ticked designs through ``restore``, discard the others.

    Parameters
    ----------
    dialog : RecoveryDialog
        After the user chose.
    restore : callable
        ``restore(project, file)`` opens one recovered design.

    Returns
    -------
    list of str
        A sentence for each copy that could not be restored (it is kept on disk).
    """
    problems: list[str] = []
    if dialog.choice == RecoveryDialog.LATER:
        return problems
    ticked = dialog.ticked() if dialog.choice == RecoveryDialog.RESTORE else []
    for record in dialog.records:
        if record in ticked:
            try:
                project = record.project()
            except ProjectError as error:
                problems.append(f"{record.name}: the recovery copy cannot be read ({error}); it is kept in "
                                f"{record.path}")
                continue
            restore(project, record.file)
        discard_record(record)
    return problems


def offer_recovery(parent: QWidget, restore: Callable[[Project, Path | None], None]) -> RecoveryDialog | None:
    """Show the recovery dialog if a crash left unsaved designs (window-modal, not blocking).

    Parameters
    ----------
    parent : QWidget
        The first window.
    restore : callable
        ``restore(project, file)``, called for each design the user restores.

    Returns
    -------
    RecoveryDialog or None
        The dialog shown, or None when there is nothing to recover.
    """
    records = orphaned_records()
    if not records:
        return None
    dialog = RecoveryDialog(records, parent)
    dialog.setWindowModality(Qt.WindowModality.WindowModal)

    def done(_result: int) -> None:
        problems = apply_choice(dialog, restore)
        if problems and hasattr(parent, "show_status"):
            parent.show_status(" ".join(problems), error=True)

    dialog.finished.connect(done)
    dialog.open()
    return dialog
