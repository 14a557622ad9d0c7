"""GUI fixtures: settings go to a temporary folder, and windows close without asking anyone."""

from __future__ import annotations

import gc

import pytest

from .waits import WAIT_MS


@pytest.fixture(autouse=True)
def _isolated_settings(tmp_path_factory, monkeypatch):
    folder = tmp_path_factory.mktemp("gui_settings")
    monkeypatch.setenv("PMDC_SIZER_CONFIG_DIR", str(folder))
    return folder


@pytest.fixture(autouse=True)
def _no_blocking_prompts(monkeypatch):
    """A prompt nobody answers would hang the run: any unexpected one fails the test instead."""
    from PySide6.QtWidgets import QMessageBox

    def unexpected(*args, **kwargs):
        raise AssertionError(f"unexpected message box: {args[1:3]}")

    for name in ("question", "critical", "warning", "information", "about"):
        monkeypatch.setattr(QMessageBox, name, staticmethod(unexpected))


@pytest.fixture
def open_window(qtbot):
    """``open_window(path)``: a shown main window on that project, evaluated once."""
    from pmdc_sizer.app.gui.main_window import MainWindow, read_project

    windows = []

    def make(path=None):
        project = read_project(path) if path is not None else None
        window = MainWindow(project, path)
        window.show()  # closed below, after its changes are marked saved (qtbot.addWidget would close it first)
        qtbot.waitUntil(lambda: window.current_results is not None and not window.evaluator.busy, timeout=WAIT_MS)
        windows.append(window)
        return window

    yield make
    for window in windows:
        window.model.flush()
        window.model.undo_stack.setClean()
        window.evaluator.wait(WAIT_MS)
        window.close()
        window.deleteLater()
    # Windows and their cycles go here, on the GUI thread, not in a later test's worker thread.
    from PySide6.QtCore import QCoreApplication, QEvent

    QCoreApplication.sendPostedEvents(None, QEvent.Type.DeferredDelete)
    gc.collect()


@pytest.fixture
def job_page(open_window):
    """``job_page(path, attribute, timeout_ms)``: a window on that project and its page that runs a long job
    (app/gui/background_job.py); the job is cancelled and waited for afterwards."""
    pages = []

    def make(path, attribute: str, timeout_ms: int):
        window = open_window(path)
        view = getattr(window, attribute)
        pages.append((view, timeout_ms))
        return window, view

    yield make
    for view, timeout_ms in pages:
        view.cancel()
        view.wait(timeout_ms)


@pytest.fixture
def cancelled_run(qtbot):
    """``cancelled_run(view, failed, start, timeout_ms)``: starts a page's long job, cancels it at once and
    waits for the page's ``failed`` signal; the page must say that nothing was kept, with its cancel button
    off again."""
    def run(view, failed, start, timeout_ms: int) -> None:
        with qtbot.waitSignal(failed, timeout=timeout_ms) as blocker:
            start()
            view.cancel()
        assert blocker.args == ["cancelled"]
        assert view.state_label.text() == "cancelled: nothing was kept"
        assert not view.cancel_button.isEnabled()

    return run


@pytest.fixture
def open_compare_view(qtbot):
    """``open_compare_view(window, size)``: a shown comparison page on a stand-in main window; its
    background work is waited for at the end."""
    from pmdc_sizer.app.gui.compare_view import CompareView

    views = []

    def make(window, size=(1500, 950)):
        view = CompareView(window)
        qtbot.addWidget(view)
        view.resize(*size)
        view.show()
        views.append(view)
        return view

    yield make
    for view in views:
        view.evaluator_b.wait()
        view._refit_pool.waitForDone(5000)
