"""The input model's signals, and the two extension points other modules plug into."""

from __future__ import annotations

import pytest

from pmdc_sizer.app.gui.input_model import DesignModel
from pmdc_sizer.app.gui.main_window import PAGE_COMPARE
from pmdc_sizer.core import project as project_file

from .waits import WAIT_MS


def test_a_drag_signals_changing_then_one_changed(qtbot, ferrite_demo):
    model = DesignModel(project_file.load(ferrite_demo))
    field = model.fields["magnets.thickness_mm"]
    assert (field.unit, field.minimum, field.maximum) == ("mm", 0.5, 40.0)
    changing, changed = [], []
    field.changing.connect(changing.append)
    field.changed.connect(changed.append)
    start = field.value
    for step in (0.1, 0.2, 0.3):
        assert field.propose(start - step)
    assert changing == pytest.approx([start - 0.1, start - 0.2, start - 0.3])
    assert changed == [] and model.modified
    assert model.committed.magnets.thickness_mm == start  # shown, not yet committed
    with qtbot.waitSignal(model.edit_committed, timeout=WAIT_MS):
        pass
    assert changed == pytest.approx([start - 0.3])
    assert model.undo_stack.count() == 1


def test_a_refused_value_leaves_model_and_undo_alone(ferrite_demo):
    model = DesignModel(project_file.load(ferrite_demo))
    before = model.project
    errors = []
    model.edit_rejected.connect(lambda key, message: errors.append((key, message)))
    assert not model.fields["armature.slot_depth_mm"].propose(40.0, final=True)
    assert errors and errors[0][0] == "armature.slot_depth_mm" and "1 mm of core" in errors[0][1]
    assert model.fields["armature.slot_depth_mm"].error == errors[0][1]
    assert model.project == before and model.undo_stack.count() == 0 and not model.modified


def test_unknown_wire_is_refused_with_the_core_message(ferrite_demo):
    model = DesignModel(project_file.load(ferrite_demo))
    assert not model.fields["winding.wire"].propose("AWG 99", final=True)
    assert model.fields["winding.wire"].error.startswith("winding.wire")


def test_export_action_hands_over_the_current_design(open_window, qtbot, ferrite_demo, monkeypatch):
    from pmdc_sizer.app.gui import export_dialog

    window = open_window(ferrite_demo)
    calls = []

    def open_export_dialog(parent, project, results, path_hint, study=None):
        calls.append((parent, project, results, path_hint, study))

    monkeypatch.setattr(export_dialog, "open_export_dialog", open_export_dialog)
    assert window.export_action.isEnabled()
    window.export_action.trigger()
    # no production spread has been run on this window, so none is handed over
    assert calls == [(window, window.current_project, window.current_results, window.current_path, None)]


def test_compare_page_is_always_there(open_window, ferrite_demo):
    # The page is imported like any module: a broken import fails loudly instead of leaving the tab out.
    window = open_window(ferrite_demo)
    titles = [window.pages.tabText(i) for i in range(window.pages.count())]
    assert PAGE_COMPARE in titles and window.compare_view is not None


def test_about_box_is_shown_with_the_cautions(open_window, ferrite_demo, monkeypatch):
    from PySide6.QtWidgets import QMessageBox

    window = open_window(ferrite_demo)
    shown = []
    monkeypatch.setattr(QMessageBox, "about", staticmethod(lambda parent, title, text: shown.append(text)))
    window.about_action.trigger()
    assert shown and "implanted medical device" in shown[0] and "licensed" in shown[0]


def test_an_optional_text_can_be_set_and_emptied(ferrite_demo):
    # The revision date is optional text: a date sets it, an empty field removes it again.
    from pmdc_sizer.app.gui.input_model import DesignModel
    from pmdc_sizer.core import project as pf

    model = DesignModel(pf.load(ferrite_demo))
    assert model.propose("project.revision_date", "2026-11-20", final=True)
    assert model.project.project.revision_date == "2026-11-20"
    assert model.propose("project.revision_date", None, final=True)
    assert model.project.project.revision_date is None
    assert not model.propose("project.revision_date", "", final=True)  # what an emptied field would send
