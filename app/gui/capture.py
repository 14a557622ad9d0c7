"""Capture one page of the main window at a chosen window size, as the user would see it.

``pmdc-sizer gui FILE --screenshot OUT.png --page NAME --size WxH`` calls :func:`capture_page`. The
field-solution page solves its case first (the picture is the point of that page) and waits for the
``solved`` or ``solve_failed`` signal; the tolerance page runs its study first in the same way.
"""

from __future__ import annotations

import os

from PySide6.QtCore import QEventLoop, QTimer
from PySide6.QtWidgets import QApplication

from pmdc_sizer.core.errors import ProjectError

from .pages import PAGE_TITLES

FIELD_SOLVE_TIMEOUT_MS = 600_000  #: a fine mesh of a large design on a slow machine


def show_page(window, name: str) -> None:
    """Bring the page with short name ``name`` to the front."""
    title = PAGE_TITLES[name]
    for index in range(window.pages.count()):
        if window.pages.tabText(index) == title:
            window.pages.setCurrentIndex(index)
            return
    raise ProjectError(f"--page {name}: the window has no page {title!r}")


def solve_field(window, timeout_ms: int = FIELD_SOLVE_TIMEOUT_MS) -> str:
    """Solve the field page's case and wait for it; returns "" or why it gave nothing."""
    view = window.field_view
    loop = QEventLoop()
    outcome: list[str] = []

    def solved(_solution) -> None:
        outcome.append("")
        loop.quit()

    def failed(message: str) -> None:
        outcome.append(message or "the field solution failed")
        loop.quit()

    view.solved.connect(solved)
    view.solve_failed.connect(failed)
    try:
        view.solve()
        QTimer.singleShot(timeout_ms, loop.quit)
        if not outcome:
            loop.exec()
    finally:
        view.solved.disconnect(solved)
        view.solve_failed.disconnect(failed)
    return outcome[0] if outcome else f"the field solution took longer than {timeout_ms / 1000:.0f} s"


def run_tolerance_study(window, timeout_ms: int = FIELD_SOLVE_TIMEOUT_MS) -> str:
    """Run the tolerance page's study (the file's motors and seed) and wait; returns "" or why it gave nothing."""
    view = window.tolerance_view
    loop = QEventLoop()
    outcome: list[str] = []

    def finished(_study) -> None:
        outcome.append("")
        loop.quit()

    def failed(message: str) -> None:
        outcome.append(message or "the tolerance study failed")
        loop.quit()

    view.finished.connect(finished)
    view.failed.connect(failed)
    try:
        view.run()
        QTimer.singleShot(timeout_ms, loop.quit)
        if not outcome:
            loop.exec()
    finally:
        view.finished.disconnect(finished)
        view.failed.disconnect(failed)
    return outcome[0] if outcome else f"the tolerance study took longer than {timeout_ms / 1000:.0f} s"


def capture_page(window, out: str | os.PathLike, page: str | None, size: tuple[int, int]) -> None:
    """Resize, show ``page`` (or the page the window opens on), wait for the results, save a PNG."""
    window.resize(*size)
    window.show()
    QApplication.processEvents()
    window.wait_for_evaluation()
    if page is not None:
        show_page(window, page)
        QApplication.processEvents()
        if page == "field":
            problem = solve_field(window)
            if problem:
                raise ProjectError(f"--page field: {problem}")
        if page == "tolerance":
            problem = run_tolerance_study(window)
            if problem:
                raise ProjectError(f"--page tolerance: {problem}")
    for _ in range(3):
        QApplication.processEvents()
    if not window.grab().save(str(out)):
        raise ProjectError(f"{out}: cannot write the PNG file")
