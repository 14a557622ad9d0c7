"""One long job of a page, off the GUI thread: progress, cancel, and a run again after the last change.

The field-solution, production-spread and sizing pages each own a :class:`BackgroundJob`. The page
hands it the work as a function of ``(report, stop)`` that runs on a worker thread and returns the
result; the job counts its runs, so a run that was cancelled or replaced by a newer one is forgotten
when it ends, and turns whatever the work raises into a message (``CANCELLED`` after a cancel). While
the page is on screen, :meth:`BackgroundJob.schedule` starts the page's run a moment after the last
change of what it shows. :class:`JobControls` is the row of run and cancel buttons, progress bar and
state line those pages share, and says when what the page shows is of an earlier design;
:class:`JobPage` is such a page, following the main window's evaluated design.
"""

from __future__ import annotations

import threading
from collections.abc import Callable, Hashable
from typing import Any

from PySide6.QtCore import QObject, QRunnable, QThreadPool, QTimer, Signal
from PySide6.QtWidgets import (
    QBoxLayout,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QProgressBar,
    QPushButton,
    QSpinBox,
    QTableWidget,
    QVBoxLayout,
    QWidget,
)

from ..figures import FAIL_COLOUR, WARNING_COLOUR

#: The message a run ends with when it was cancelled.
CANCELLED = "cancelled"

#: ``work(report, stop) -> result``: ``report(*progress)`` returns False once the run should stop.
Work = Callable[[Callable[..., bool], threading.Event], Any]


class _Signals(QObject):
    progress = Signal(int, object)  # run, the work's progress arguments (a tuple)
    done = Signal(int, object, object, str)  # run, key, result or None, why there is none


class _Run(QRunnable):
    def __init__(self, number: int, key: Hashable, work: Work, stop: threading.Event, job: BackgroundJob):
        super().__init__()
        self.number, self.key, self.work, self.stop = number, key, work, stop
        self.signals, self.what = job._signals, job.what
        self.cancelled, self.expected = job.cancelled, job.expected
        self.setAutoDelete(True)

    def run(self) -> None:
        def report(*progress) -> bool:
            self.signals.progress.emit(self.number, progress)
            return not self.stop.is_set()

        try:
            result = self.work(report, self.stop)
        except self.cancelled:
            self.signals.done.emit(self.number, self.key, None, CANCELLED)
        except self.expected as error:
            self.signals.done.emit(self.number, self.key, None, str(error))
        except Exception as error:  # noqa: BLE001 - the window must survive any failure of one run
            self.signals.done.emit(self.number, self.key, None,
                                   f"{self.what} failed ({type(error).__name__}: {error}); this is a defect in "
                                   "pmdc-sizer, please report it with the project file")
        else:
            self.signals.done.emit(self.number, self.key, result, "")


class BackgroundJob(QObject):
    """The runs of one page, one at a time on a worker thread of its own.

    Parameters
    ----------
    page : QWidget
        The page; a scheduled run starts only while it is visible.
    what : str
        The job in words, for a message about a defect ("the field solution").
    cancelled : type of Exception
        What the work raises when it stops because ``stop`` was set.
    expected : tuple of Exception types
        What the work raises for a design it cannot handle; the message is shown as it is.
    delay_ms : int or None
        How long after the last change a scheduled run starts; None: the page runs only when asked.
    wanted : callable
        The key of what the page would show now (its inputs), or None when it has nothing to run on.
    have : callable
        ``have(key)``: True when the page already shows (or keeps) the result for ``key``.
    run : callable
        The page's own run, started when a scheduled run is due.
    """

    started = Signal(object)  #: key of the run that just started
    progress = Signal(object)  #: the running run's progress arguments, as a tuple
    finished = Signal(object, object)  #: key, result
    failed = Signal(object, str)  #: key, why nothing came (``CANCELLED`` after a cancel)

    def __init__(self, page: QWidget, what: str, cancelled: type[BaseException],
                 expected: tuple[type[BaseException], ...], delay_ms: int | None, wanted: Callable[[], Hashable | None],
                 have: Callable[[Hashable], bool], run: Callable[[], None]):
        super().__init__(page)
        self.page, self.what, self.cancelled, self.expected = page, what, cancelled, expected
        self._wanted, self._have, self._run = wanted, have, run
        self._pool = QThreadPool(self)
        self._pool.setMaxThreadCount(1)
        self._signals = _Signals(self)
        self._signals.progress.connect(self._on_progress)
        self._signals.done.connect(self._on_done)
        self._number = 0
        self.running_key: Hashable | None = None
        self._stop: threading.Event | None = None
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(delay_ms or 0)
        self._runs_by_itself = delay_ms is not None
        self._timer.timeout.connect(self._run_if_needed)

    @property
    def busy(self) -> bool:
        return self._stop is not None

    def start(self, key: Hashable, work: Work) -> None:
        """Run ``work`` for ``key`` now; a run in progress is cancelled and forgotten."""
        if self._stop is not None:
            self._stop.set()
        self._number += 1
        self.running_key = key
        self._stop = threading.Event()
        self._pool.start(_Run(self._number, key, work, self._stop, self))
        self.started.emit(key)

    def cancel(self) -> None:
        """Stop the running run; it ends with ``CANCELLED`` and nothing of it is kept."""
        if self._stop is not None:
            self._stop.set()

    def wait(self, milliseconds: int) -> bool:
        """Block until no run is left on the worker (tests, closing)."""
        return self._pool.waitForDone(milliseconds)

    def schedule(self) -> None:
        """What the page shows changed: run it again a moment after the last change, if the page is on screen."""
        if self._runs_by_itself and self.page.isVisible():
            self._timer.start()

    def page_shown(self) -> None:
        """The page came on screen: run what it does not show yet, a moment later."""
        key = self._wanted()
        if self._runs_by_itself and key is not None and not self._have(key):
            self._timer.start()

    def _run_if_needed(self) -> None:
        key = self._wanted()
        if key is not None and not self._have(key) and key != self.running_key:
            self._run()

    def _on_progress(self, number: int, progress: tuple) -> None:
        if number == self._number:
            self.progress.emit(progress)

    def _on_done(self, number: int, key: Hashable, result, message: str) -> None:
        if number != self._number:
            return  # a cancelled or replaced run
        self.running_key = None
        self._stop = None
        if result is None:
            self.failed.emit(key, message)
        else:
            self.finished.emit(key, result)


class JobControls(QObject):
    """The run button, cancel button, progress bar and state line of a page that owns a :class:`BackgroundJob`.

    The cancel button is live while a run is in progress; the bar is full when a run finished and empty
    when it gave nothing. The page sets the bar during a run and the state line's words.
    """

    def __init__(self, job: BackgroundJob, run_text: str, run_tip: str, run: Callable[[], None],
                 state_name: str = ""):
        super().__init__(job)
        self.run_button = QPushButton(run_text)
        self.run_button.setToolTip(run_tip)
        self.run_button.clicked.connect(run)
        self.cancel_button = QPushButton("Cancel")
        self.cancel_button.setEnabled(False)
        self.cancel_button.clicked.connect(job.cancel)
        self.progress_bar = QProgressBar()
        self.progress_bar.setRange(0, 100)
        self.progress_bar.setMaximumWidth(180)
        self.state_label = QLabel("")
        if state_name:
            self.state_label.setObjectName(state_name)
        self.state_label.setWordWrap(True)
        job.started.connect(self._on_started)
        job.finished.connect(lambda _key, _result: self._on_ended(100))
        job.failed.connect(lambda _key, _message: self._on_ended(0))

    def add_to(self, layout: QBoxLayout) -> None:
        """Append the controls to a row; the state line takes the room left."""
        for widget in (self.run_button, self.cancel_button, self.progress_bar):
            layout.addWidget(widget)
        layout.addWidget(self.state_label, 1)

    def show_state(self, text: str, stale: bool = False, error: bool = False) -> None:
        """The state line: an error in the failure colour, figures of an earlier design in amber."""
        self.state_label.setText(text)
        self.state_label.setStyleSheet(f"color: {FAIL_COLOUR};" if error else (
            f"color: {WARNING_COLOUR};" if stale else ""))

    def _on_started(self, _key) -> None:
        self.cancel_button.setEnabled(True)
        self.progress_bar.setValue(0)

    def _on_ended(self, bar: int) -> None:
        self.cancel_button.setEnabled(False)
        self.progress_bar.setValue(bar)


class JobPage(QWidget):
    """A page of the main window whose figures come from one long job of the evaluated design.

    ``main_window`` provides ``current_project``, ``current_results`` and ``results_ready``. A subclass
    calls :meth:`_start_job` in its ``__init__`` before building its layout (from :meth:`_page_layout`),
    then :meth:`_follow`; it provides ``_key()`` (what :class:`BackgroundJob` calls ``wanted``),
    ``set_design(project, results)``, ``_on_progress(*progress)``, ``_on_done(key, result)`` and
    ``_on_failed(key, message)`` (which reports through :meth:`_report_failure`).
    """

    finished = Signal(object)  #: the page's new result, now shown
    failed = Signal(str)  #: why the last run gave nothing (``CANCELLED`` after a cancel)

    def __init__(self, main_window, object_name: str):
        super().__init__()
        self.setObjectName(object_name)
        self.main_window = main_window
        self.project = None  #: the design the page follows, and its results
        self.results = None

    def _start_job(self, what: str, cancelled: type[BaseException], expected: tuple[type[BaseException], ...],
                   delay_ms: int | None, have: Callable[[Hashable], bool], run: Callable[[], None], run_text: str,
                   run_tip: str, state_name: str = "") -> None:
        self.job = BackgroundJob(self, what, cancelled, expected, delay_ms, self._key, have, run)
        self.controls = JobControls(self.job, run_text, run_tip, run, state_name)
        # the controls' widgets under the page's own names (pages and tests reach them there)
        self.run_button, self.cancel_button = self.controls.run_button, self.controls.cancel_button
        self.progress_bar, self.state_label = self.controls.progress_bar, self.controls.state_label
        self.job.progress.connect(lambda progress: self._on_progress(*progress))
        self.job.finished.connect(self._on_done)
        self.job.failed.connect(self._on_failed)

    def _page_layout(self, inputs: list[QWidget]) -> QVBoxLayout:
        """The page's layout, its first row holding ``inputs`` and then the controls."""
        layout = QVBoxLayout(self)
        row = QHBoxLayout()
        for widget in inputs:
            row.addWidget(widget)
        self.controls.add_to(row)
        layout.addLayout(row)
        return layout

    def _seed_box(self, object_name: str, tip: str) -> QSpinBox:
        """A spin box for a random seed (any 31-bit integer)."""
        box = QSpinBox()
        box.setObjectName(object_name)
        box.setRange(0, 2**31 - 1)
        box.setToolTip(tip)
        return box

    def _count_box(self, object_name: str, maximum: int, step: int, tip: str) -> QSpinBox:
        """A spin box for how many designs a run draws: from 100, its thousands separated."""
        box = QSpinBox()
        box.setObjectName(object_name)
        box.setRange(100, maximum)
        box.setSingleStep(step)
        box.setGroupSeparatorShown(True)
        box.setToolTip(tip)
        return box

    @staticmethod
    def _figure_table(object_name: str, headers: list[str], stretch: int) -> QTableWidget:
        """A read-only table of the job's figures under ``headers``: column ``stretch`` takes the room
        left, the others fit their contents; no row numbers."""
        table = QTableWidget(0, len(headers))
        table.setObjectName(object_name)
        table.setHorizontalHeaderLabels(headers)
        header = table.horizontalHeader()
        for column in range(len(headers)):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.Stretch if column == stretch
                                        else QHeaderView.ResizeMode.ResizeToContents)
        table.verticalHeader().setVisible(False)
        table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        return table

    def _follow(self, main_window) -> None:
        """Take every design the main window evaluates, starting with the one it shows now."""
        main_window.results_ready.connect(self.set_design)
        if main_window.current_results is not None:
            self.set_design(main_window.current_project, main_window.current_results)

    def _show_state(self, text: str, stale: bool = False, error: bool = False) -> None:
        """The state line (:meth:`JobControls.show_state`); a page that greys its figures when they are
        stale overrides this."""
        self.controls.show_state(text, stale, error)

    def _report_failure(self, message: str, stale: bool = False) -> None:
        """A run gave nothing: the state line says why (a cancel, that nothing was kept; ``stale``: an
        earlier run's figures stay shown; anything else as an error), then :attr:`failed` is emitted."""
        if message == CANCELLED:
            self._show_state("cancelled: nothing was kept", stale=stale)
        else:
            self._show_state(message, error=True)
        self.failed.emit(message)

    def cancel(self) -> None:
        """Stop the running job; nothing of it is kept."""
        self.job.cancel()

    def wait(self, milliseconds: int = 60000) -> bool:
        """Block until no job runs (tests, closing)."""
        return self.job.wait(milliseconds)

    def showEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().showEvent(event)
        self.job.page_shown()
