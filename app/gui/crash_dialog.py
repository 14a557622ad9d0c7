"""The desktop tool's answer to a defect: a report file, a dialog, and the design kept.

:func:`install_exception_hook` replaces ``sys.excepthook`` (which PySide6 calls for an exception that
escapes a slot) and ``threading.excepthook``. For any exception it writes a crash report
(:mod:`app.crash`: the traceback goes to a file under the state folder, never to the screen) and shows a
:class:`CrashDialog` that says what happened, where the report is, that the design is still open, and
offers to save a copy of it, so no work is lost to the defect. Nothing is closed: the window carries on.
"""

from __future__ import annotations

import sys
import threading
from collections.abc import Callable
from pathlib import Path

from PySide6.QtCore import QObject, Qt, Signal
from PySide6.QtWidgets import (
    QApplication,
    QDialog,
    QDialogButtonBox,
    QFileDialog,
    QLabel,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.app.crash import write_crash_report
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.errors import ProjectError

from .style import outcome_text

FILE_FILTER = "pmdc-sizer project (*.toml);;All files (*)"


class CrashDialog(QDialog):
    """Tells the user of a defect and offers to save a copy of the design.

    Parameters
    ----------
    error : BaseException
        What went wrong.
    report : Path or None
        The crash report written, or None if none could be.
    window : QWidget or None
        The main window whose design to save (``current_project``, ``current_path``, ``file_guard``).
    """

    def __init__(self, error: BaseException, report: Path | None, window: QWidget | None = None):
        super().__init__(window)
        self.setObjectName("crash_dialog")
        self.setWindowTitle("pmdc-sizer ran into a defect")
        self.window_ = window
        self.saved_copy: Path | None = None
        layout = QVBoxLayout(self)
        where = (f"The details are in the crash report<br><code>{report}</code><br>Please send it with the project "
                 "file.") if report else "No crash report could be written (the state folder is not writable)."
        self.message = QLabel(
            f"<p><b>Something went wrong inside pmdc-sizer</b> ({type(error).__name__}). This is a defect "
            "of the tool, not of your design.</p>"
            "<p>Your design is still open, with all its changes; nothing was closed. To be safe, save a copy "
            f"of it now, then carry on or restart the tool.</p><p>{where}</p>")
        self.message.setObjectName("crash_message")
        self.message.setWordWrap(True)
        self.message.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.message.setMinimumWidth(520)
        layout.addWidget(self.message)
        self.status = QLabel()
        self.status.setWordWrap(True)
        layout.addWidget(self.status)
        buttons = QDialogButtonBox()
        self.save_button = QPushButton("Save a copy of the design…")
        self.save_button.setEnabled(window is not None and getattr(window, "current_project", None) is not None)
        self.save_button.clicked.connect(lambda: self.save_copy())
        self.continue_button = QPushButton("Continue working")
        self.continue_button.clicked.connect(self.accept)
        buttons.addButton(self.save_button, QDialogButtonBox.ButtonRole.ActionRole)
        buttons.addButton(self.continue_button, QDialogButtonBox.ButtonRole.AcceptRole)
        if self.save_button.isEnabled():
            self.save_button.setDefault(True)
        layout.addWidget(buttons)

    def suggested_copy(self) -> str:
        """Beside the design's file (``motor (copy).toml``), or ``motor (copy).toml`` in the home folder."""
        path = getattr(self.window_, "current_path", None)
        if path:
            return str(Path(path).with_name(f"{Path(path).stem} (copy).toml"))
        return str(Path.home() / "motor (copy).toml")

    def save_copy(self, path: str | Path | None = None) -> Path | None:
        """Save the design to ``path`` (asked for when None); the window's own file is left as it is."""
        if path is None:
            path, _ = QFileDialog.getSaveFileName(self, "Save a copy of the design", self.suggested_copy(), FILE_FILTER)
            if not path:
                return None
        target = Path(path)
        guard = getattr(self.window_, "file_guard", None)
        try:
            project_file.save(self.window_.current_project, target, layout=getattr(guard, "layout", None))
        except ProjectError as error:
            self.status.setText(outcome_text("fail", "Not saved.", str(error)))
            return None
        self.saved_copy = target
        self.status.setText(outcome_text("pass", "Saved a copy", f"to {target}"))
        return target


class _Relay(QObject):
    """Carries an exception from any thread to the GUI thread, where the dialog may be shown."""

    raised = Signal(object)


class ExceptionHook:
    """The installed hook: writes the report, then shows one dialog at a time in the GUI thread."""

    def __init__(self, window_of: Callable[[], QWidget | None]):
        self.window_of = window_of
        self.dialog: CrashDialog | None = None
        self.reports: list[Path | None] = []
        self._relay = _Relay()
        self._relay.raised.connect(self._show, Qt.ConnectionType.QueuedConnection)
        self._previous = sys.excepthook, threading.excepthook

    def __call__(self, kind, error, trace) -> None:
        if issubclass(kind, KeyboardInterrupt):
            self._previous[0](kind, error, trace)
            return
        if error.__traceback__ is None and trace is not None:
            error = error.with_traceback(trace)
        report = write_crash_report(error, "desktop tool")
        self.reports.append(report)
        self._relay.raised.emit((error, report))

    def thread_hook(self, arguments) -> None:
        self(arguments.exc_type, arguments.exc_value or arguments.exc_type(), arguments.exc_traceback)

    def _show(self, payload) -> None:
        error, report = payload
        if self.dialog is not None and self.dialog.isVisible():
            return  # one dialog at a time; every report is still written
        self.dialog = CrashDialog(error, report, self.window_of())
        self.dialog.setWindowModality(Qt.WindowModality.ApplicationModal)
        self.dialog.open()

    def uninstall(self) -> None:
        sys.excepthook, threading.excepthook = self._previous


def install_exception_hook(window_of: Callable[[], QWidget | None]) -> ExceptionHook:
    """Route every uncaught exception of the desktop tool to a crash report and a :class:`CrashDialog`.

    Parameters
    ----------
    window_of : callable
        Returns the window whose design the dialog offers to save (the active one).

    Returns
    -------
    ExceptionHook
        The hook (``uninstall()`` puts the previous hooks back).
    """
    hook = ExceptionHook(window_of)
    sys.excepthook = hook
    threading.excepthook = hook.thread_hook
    return hook


def active_main_window() -> QWidget | None:
    """The active main window, or else any visible one."""
    app = QApplication.instance()
    if app is None:
        return None
    active = QApplication.activeWindow()
    candidates = ([active] if active is not None else []) + list(QApplication.topLevelWidgets())
    for widget in candidates:
        if hasattr(widget, "current_project") and hasattr(widget, "model"):
            return widget
    return None
