"""Evaluation off the GUI thread, latest wins.

One worker thread runs ``pmdc_sizer.core.evaluate``. While it is busy, new requests replace each other
and only the newest waits; when the worker finishes it starts that one. Results arrive in the GUI
thread through queued signals, so the window keeps painting during a drag on a slow machine.
"""

from __future__ import annotations

from PySide6.QtCore import QObject, QRunnable, QThreadPool, Signal

from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.magnetic_circuit import MagneticCircuitError
from pmdc_sizer.core.project import Project, ProjectError


class _Signals(QObject):
    done = Signal(int, object, object, str)  # generation, project, results or None, error message


class _Job(QRunnable):
    def __init__(self, generation: int, project: Project, signals: _Signals):
        super().__init__()
        self.generation, self.project, self.signals = generation, project, signals
        self.setAutoDelete(True)

    def run(self) -> None:
        try:
            results = evaluate(self.project)
        except (ProjectError, MagneticCircuitError, ValueError, ArithmeticError) as error:
            self.signals.done.emit(self.generation, self.project, None, str(error))
            return
        except Exception as error:  # noqa: BLE001 - the window must survive any failure of one design
            self.signals.done.emit(
                self.generation, self.project, None,
                f"the calculation failed on this design ({type(error).__name__}: {error}); this is a defect in "
                "pmdc-sizer, please report it with the project file")
            return
        self.signals.done.emit(self.generation, self.project, results, "")


class Evaluator(QObject):
    """``request(project)``; ``finished(project, results)`` or ``failed(project, message)`` follow."""

    finished = Signal(object, object)
    failed = Signal(object, str)
    busy_changed = Signal(bool)

    def __init__(self, parent: QObject | None = None):
        super().__init__(parent)
        self._pool = QThreadPool(self)
        self._pool.setMaxThreadCount(1)
        self._signals = _Signals(self)
        self._signals.done.connect(self._on_done)
        self._generation = 0
        self._running = False
        self._waiting: Project | None = None

    @property
    def busy(self) -> bool:
        return self._running

    def request(self, project: Project) -> None:
        if self._running:
            self._waiting = project
            return
        self._start(project)

    def _start(self, project: Project) -> None:
        self._generation += 1
        was_running = self._running
        self._running = True
        self._pool.start(_Job(self._generation, project, self._signals))
        if not was_running:
            self.busy_changed.emit(True)

    def _on_done(self, generation: int, project, results, message: str) -> None:
        self._running = False
        if self._waiting is not None:
            waiting, self._waiting = self._waiting, None
            self._start(waiting)
        # A result for an older design is still shown: during a drag it is the freshest picture there is.
        if results is not None:
            self.finished.emit(project, results)
        else:
            self.failed.emit(project, message)
        if not self._running:
            self.busy_changed.emit(False)

    def wait(self, milliseconds: int = 5000) -> bool:
        return self._pool.waitForDone(milliseconds)
