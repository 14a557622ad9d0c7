"""The design editor's column shows every label, value box and unit whole at laptop and desktop sizes."""

from __future__ import annotations

import pytest
from PySide6.QtCore import QPoint
from PySide6.QtWidgets import QAbstractSpinBox

from pmdc_sizer.app.gui.main_window import MainWindow, read_project

from .waits import WAIT_MS


@pytest.fixture
def window_at(qtbot):
    """``window_at(path, width, height)``: a main window opened at that size, placed and evaluated."""
    windows = []

    def make(path, width: int, height: int) -> MainWindow:
        window = MainWindow(read_project(path), path)
        window.remember_settings = False
        window.resize(width, height)
        window.show()
        windows.append(window)
        qtbot.waitUntil(lambda: window._splitter_placed and window.current_results is not None
                        and not window.evaluator.busy, timeout=WAIT_MS)
        return window

    yield make
    for window in windows:
        window.model.undo_stack.setClean()
        window.evaluator.wait(WAIT_MS)
        window.close()
        window.deleteLater()


@pytest.mark.parametrize("size", [(1366, 768), (1920, 1080)])
def test_every_value_box_ends_inside_the_editor(window_at, qtbot, ndfeb_demo, size):
    window = window_at(ndfeb_demo, *size)
    editor = window.editor
    for section in editor.sections.values():  # the longest labels are in the groups that start folded
        section.header.setChecked(True)
    qtbot.wait(50)
    viewport = editor.viewport()
    assert editor.widget().width() <= viewport.width()
    cut = []
    for key, field in editor.editors.items():
        if not field.widget.isVisibleTo(editor):
            continue
        right = field.widget.mapTo(viewport, QPoint(field.widget.width(), 0)).x()
        if right > viewport.width():
            cut.append(f"{key}: right edge {right} px, viewport {viewport.width()} px")
        line = field.widget.lineEdit() if isinstance(field.widget, QAbstractSpinBox) else None
        if line is not None and line.width() < line.fontMetrics().horizontalAdvance(line.text()):
            cut.append(f"{key}: {line.text()!r} does not fit its {line.width()} px box")
    properties = editor.grade_picker.properties
    right = properties.mapTo(viewport, QPoint(properties.width(), 0)).x()
    if right > viewport.width():
        cut.append(f"grade data: right edge {right} px, viewport {viewport.width()} px")
    assert not cut, "\n".join(cut)
    # and the charts keep most of the width
    assert window.splitter.sizes()[1] >= 0.35 * size[0]
