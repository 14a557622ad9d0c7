"""Capture one page of the main window at a chosen window size, as the user would see it.

``pmdc-sizer gui FILE --screenshot OUT.png --page NAME --size WxH`` calls :func:`capture_page`. The
field-solution page solves its case first (the picture is the point of that page) and waits for the
``finished`` or ``failed`` signal; the tolerance page runs its study first in the same way, and the
sizing page a small search (:data:`SCREENSHOT_CANDIDATES` candidates, a short refinement, its first
free keys and objectives). With ``--compare-with B.toml`` the comparison page is captured with that design
as B, once B's results are in.
"""

from __future__ import annotations

import os

from PySide6.QtCore import QEventLoop, QTimer
from PySide6.QtWidgets import QApplication

from pmdc_sizer.core.errors import ProjectError

from .pages import PAGE_TITLES

FIELD_SOLVE_TIMEOUT_MS = 600_000  #: a fine mesh of a large design on a slow machine
SCREENSHOT_CANDIDATES = 2_000  #: enough feasible designs to show the front, quick on a shared machine
SCREENSHOT_GENERATIONS = 10  #: a short refinement towards the front


def show_page(window, name: str) -> None:
    """Bring the page with short name ``name`` to the front."""
    title = PAGE_TITLES[name]
    if not window.show_page(title):
        raise ProjectError(f"--page {name}: the window has no page {title!r}")


def solve_field(window, timeout_ms: int = FIELD_SOLVE_TIMEOUT_MS) -> str:
    """Solve the field page's case and wait for it; returns "" or why it gave nothing."""
    view = window.field_view
    return _run_and_wait(view.finished, view.failed, view.solve, timeout_ms, "the field solution")


def _run_and_wait(finished_signal, failed_signal, start, timeout_ms: int, what: str) -> str:
    """Call ``start()`` and wait for ``finished_signal`` or ``failed_signal``; returns "" or why nothing came."""
    loop = QEventLoop()
    outcome: list[str] = []

    # the signals carry different arguments (a result; a project and a result; a message; a project and
    # a message): the message, where there is one, comes last
    def finished(*_arguments) -> None:
        outcome.append("")
        loop.quit()

    def failed(*arguments) -> None:
        outcome.append((arguments[-1] if arguments else "") or f"{what} failed")
        loop.quit()

    finished_signal.connect(finished)
    failed_signal.connect(failed)
    try:
        start()
        QTimer.singleShot(timeout_ms, loop.quit)
        if not outcome:
            loop.exec()
    finally:
        finished_signal.disconnect(finished)
        failed_signal.disconnect(failed)
    return outcome[0] if outcome else f"{what} took longer than {timeout_ms / 1000:.0f} s"


def run_tolerance_study(window, timeout_ms: int = FIELD_SOLVE_TIMEOUT_MS) -> str:
    """Run the tolerance page's study (the file's motors and seed) and wait; returns "" or why it gave nothing."""
    view = window.tolerance_view
    return _run_and_wait(view.finished, view.failed, view.run, timeout_ms, "the tolerance study")


def run_sizing_search(window, timeout_ms: int = FIELD_SOLVE_TIMEOUT_MS) -> str:
    """Run a small search on the sizing page and wait; returns "" or why it gave nothing."""
    view = window.sizing_view
    view.candidates_box.setValue(SCREENSHOT_CANDIDATES)
    view.generations_box.setValue(SCREENSHOT_GENERATIONS)
    return _run_and_wait(view.finished, view.failed, view.run, timeout_ms, "the sizing search")


def open_design_b(window, path: str | os.PathLike, timeout_ms: int = FIELD_SOLVE_TIMEOUT_MS) -> str:
    """Open ``path`` (already checked) as design B on the comparison page and wait for B's results;
    returns "" or why there are none."""
    view = window.compare_view
    return _run_and_wait(view.evaluator_b.finished, view.evaluator_b.failed, lambda: view.load_b_file(path),
                         timeout_ms, f"design B ({path})")


def capture_page(window, out: str | os.PathLike, page: str | None, size: tuple[int, int],
                 design_b: str | os.PathLike | None = None) -> None:
    """Resize, show ``page`` (or the page the window opens on), wait for the results, save a PNG.

    ``design_b``: a project file (already checked) to open as B on the comparison page first.
    """
    window.resize(*size)
    window.show()
    QApplication.processEvents()
    window.wait_for_evaluation()
    if design_b is not None:
        problem = open_design_b(window, design_b)
        if problem:
            raise ProjectError(f"--compare-with: {problem}")
    if page is not None:
        show_page(window, page)
        QApplication.processEvents()
        if page == "field":
            problem = solve_field(window)
            if problem:
                raise ProjectError(f"--page field: {problem}")
        runs = {"tolerance": run_tolerance_study, "sizing": run_sizing_search}
        if page in runs:
            problem = runs[page](window)
            if problem:
                raise ProjectError(f"--page {page}: {problem}")
    for _ in range(3):
        QApplication.processEvents()
    if not window.grab().save(str(out)):
        raise ProjectError(f"{out}: cannot write the PNG file")
