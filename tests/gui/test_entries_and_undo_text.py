"""Typing into the editor as a user does: out-of-range entries, messages in the fields' words, undo texts.

The keys are typed into the spin box's line edit and confirmed with Enter (qtbot.keyClicks), not set
through ``setValue``: the fault being guarded against (50 typed where 40 is the limit became 5 mm and
was evaluated) lived in the spin box's own validator, which ``setValue`` goes around.
"""

from __future__ import annotations

import pytest
from PySide6.QtCore import Qt

from .waits import WAIT_MS

TORQUE_KEY = "load.torque_mNm"


def _type_into(qtbot, editor, text: str) -> None:
    line = editor.widget.lineEdit()
    editor.widget.setFocus()
    line.selectAll()
    qtbot.keyClicks(line, text)
    qtbot.keyClick(line, Qt.Key.Key_Return)


@pytest.mark.parametrize(("typed", "limit"), [("50", "40 mm"), ("0.2", "0.5 mm")], ids=["above", "below"])
def test_a_value_typed_past_its_limit_is_refused_with_the_limit_and_not_applied(open_window, qtbot, ferrite_demo,
                                                                                 typed, limit):
    window = open_window(ferrite_demo)
    before = window.current_project
    editor = window.editor.editor("magnets.thickness_mm")
    with qtbot.waitSignal(window.model.edit_rejected, timeout=2000) as blocker:
        _type_into(qtbot, editor, typed)
    key, message = blocker.args
    assert key == "magnets.thickness_mm"
    assert f"{typed} mm" in message and limit in message and "not applied" in message
    assert not editor.error_label.isHidden() and limit in editor.error_label.text()  # next to the field
    assert "Magnet thickness" in window.status_label.text() and "magnets.thickness_mm" not in window.status_label.text()
    qtbot.wait(400)  # longer than the drag's idle commit: nothing may arrive late
    assert window.current_project == before  # neither the typed value nor a clipped one went in
    assert window.model.undo_stack.count() == 0


def test_correcting_a_refused_value_clears_the_message_and_the_status_bar(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    editor = window.editor.editor("magnets.thickness_mm")
    _type_into(qtbot, editor, "50")
    assert "Not applied" in window.status_label.text()
    with qtbot.waitSignal(window.model.edit_committed, timeout=WAIT_MS):
        _type_into(qtbot, editor, "5")
    assert editor.error_label.isHidden()
    assert "Not applied" not in window.status_label.text()
    assert window.current_project.magnets.thickness_mm == pytest.approx(5.0)


def test_correcting_a_refused_cross_field_value_clears_the_status_bar(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    editor = window.editor.editor("magnets.arc_deg")
    with qtbot.waitSignal(window.model.edit_rejected, timeout=2000):
        editor.widget.setValue(177.0)  # past 98 % of the pole pitch: refused by the fit rules
    assert "Not applied" in window.status_label.text() and "Magnet arc" in window.status_label.text()
    with qtbot.waitSignal(window.model.edit_committed, timeout=WAIT_MS):
        editor.widget.setValue(150.0)
        editor.widget.editingFinished.emit()
    assert "Not applied" not in window.status_label.text()
    assert editor.error_label.isHidden()


def test_undo_text_names_the_field_and_both_values(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    editor = window.editor.editor("magnets.thickness_mm")
    before = window.current_project.magnets.thickness_mm
    with qtbot.waitSignal(window.model.edit_committed, timeout=WAIT_MS):
        _type_into(qtbot, editor, "5")
    assert window.model.undo_stack.undoText() == f"magnet thickness {before:g} → 5 mm"
    assert window.undo_action.text() == f"&Undo magnet thickness {before:g} → 5 mm"


def _significant_figures(text: str) -> int:
    """Significant figures of the number that starts ``text`` ("0.0157 in" → 3, "2920 rpm" → 3 or 4)."""
    number = text.split()[0].replace("−", "").replace("-", "")
    digits = number.replace(".", "").lstrip("0")
    return len(digits) if "." in number else len(digits.rstrip("0")) or 1


def test_us_customary_figures_are_rounded_like_si(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    si = dict(window.results_panel.values)
    window.set_display_units("US customary")
    qtbot.waitUntil(lambda: window.results_panel.values != si, timeout=WAIT_MS)
    us = dict(window.results_panel.values)
    assert us.keys() == si.keys()
    converted = 0
    for key, si_text in si.items():
        us_text = us[key]
        if si_text == us_text or not si_text[:1].lstrip("-").isdigit() or "°" in si_text:
            continue  # words, counts, unchanged units and temperatures (whole degrees in both)
        converted += 1
        # Whole numbers lose the trailing zeros' meaning ("2920"): compare at most what both can show.
        assert _significant_figures(us_text) <= max(3, _significant_figures(si_text)), (key, si_text, us_text)
        assert _significant_figures(us_text) >= min(2, _significant_figures(si_text)), (key, si_text, us_text)
    assert converted >= 10, "the US system converts the lengths, torques, masses and inertia"


def test_editor_shows_converted_inputs_rounded_and_keeps_the_exact_file_value(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    before = window.current_project
    window.set_display_units("US customary")
    thickness = window.editor.editor("magnets.thickness_mm").widget
    torque = window.editor.editor(TORQUE_KEY).widget
    assert thickness.cleanText() == "0.236"  # 6 mm, not 0.23622
    assert len(torque.cleanText().replace(".", "").lstrip("0")) == 3  # 35 mN·m → 4.96 oz·in, not 4.9564
    # Leaving the field re-reads its rounded text: the file's exact 6 mm must stay.
    thickness.setFocus()
    thickness.interpretText()
    thickness.editingFinished.emit()
    qtbot.wait(400)
    assert window.current_project == before
    assert window.model.undo_stack.count() == 0


def test_splitters_are_remembered(open_window, qtbot, ferrite_demo):
    from pmdc_sizer.app.gui.main_window import MainWindow, read_project
    from pmdc_sizer.app.gui.settings import load_settings

    window = open_window(ferrite_demo)
    window.remember_settings = True
    qtbot.waitUntil(lambda: window._splitter_placed, timeout=WAIT_MS)
    total = sum(window.splitter.sizes())
    window.splitter.setSizes([int(total * 0.3), int(total * 0.4), total - int(total * 0.3) - int(total * 0.4)])
    columns, _figures = window.splitter_shares()
    window.model.undo_stack.setClean()
    window.close()
    saved = load_settings()
    assert saved.column_shares == pytest.approx(columns, abs=0.01)
    again = MainWindow(read_project(ferrite_demo), ferrite_demo)
    qtbot.addWidget(again)
    again.resize(1600, 1000)
    again.show()
    qtbot.waitUntil(lambda: again._splitter_placed, timeout=WAIT_MS)
    assert again.splitter_shares()[0] == pytest.approx(columns, abs=0.02)
    again.remember_settings = False


def test_comparison_page_fits_a_laptop_window_without_scrolling_sideways(open_window, qtbot, ndfeb_demo):
    window = open_window(ndfeb_demo)
    window.resize(1366, 768)
    qtbot.wait(50)
    index = next(i for i in range(window.pages.count()) if window.pages.tabText(i) == "Compare designs")
    before = window.splitter.sizes()
    window.pages.setCurrentIndex(index)
    qtbot.wait(50)
    holder = window.pages.widget(index)
    assert not holder.horizontalScrollBar().isVisible() or holder.horizontalScrollBar().maximum() == 0
    window.pages.setCurrentIndex(0)
    assert window.splitter.sizes() == before  # the columns come back as they were
