"""The evaluation worker (latest wins), failures shown without losing the design, templates, recent
files and the settings file."""

from __future__ import annotations

import json

import pytest
from PySide6.QtGui import QKeySequence

from pmdc_sizer.app.gui.evaluation import Evaluator
from pmdc_sizer.app.gui.settings import MAX_RECENT_FILES, Settings, load_settings, save_settings, settings_path
from pmdc_sizer.core import project as project_file

from .waits import WAIT_MS


def test_evaluator_runs_the_newest_request_and_skips_the_ones_in_between(qtbot, ferrite_demo):
    base = project_file.load(ferrite_demo)
    designs = [project_file.with_values(base, {"magnets.thickness_mm": t}) for t in (5.0, 5.5, 6.5, 7.0)]
    evaluator = Evaluator()
    finished = []
    evaluator.finished.connect(lambda project, results: finished.append((project, results)))
    for design in designs:
        evaluator.request(design)  # the first starts; each later one replaces the waiting one
    qtbot.waitUntil(lambda: not evaluator.busy, timeout=20000)
    evaluated = [project.magnets.thickness_mm for project, _ in finished]
    assert evaluated == [5.0, 7.0]
    assert finished[-1][1].magnetics.flux_per_pole_Wb > finished[0][1].magnetics.flux_per_pole_Wb
    evaluator.wait()


def test_a_design_without_solution_is_reported_and_undo_brings_the_results_back(open_window, qtbot, ndfeb_demo):
    window = open_window(ndfeb_demo)
    with qtbot.waitSignal(window.evaluator.failed, timeout=WAIT_MS) as blocker:
        # N35's coercivity coefficient puts 145 °C outside the range where its temperature model holds.
        assert window.model.propose_many({"magnets.grade": "N35", "temperatures.ambient_max_C": 145.0}, "what-if")
    message = blocker.args[1]
    assert "N35" in message and "145" in message
    assert window.current_results is None
    assert "No solution" in window.results_panel.verdict.text()
    assert "No solution" in window.status_label.text()
    assert window.current_project.magnets.grade == "N35"  # the edit is kept: it is valid input
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        window.undo_action.trigger()
    assert window.current_results is not None
    assert window.current_project == project_file.load(ndfeb_demo)


def test_new_from_template_starts_an_unsaved_design(open_window, qtbot, ferrite_demo, ndfeb_demo):
    window = open_window(ferrite_demo)
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        assert window.new_design(ndfeb_demo)
    assert window.current_path is None
    assert window.current_project == project_file.load(ndfeb_demo)
    assert "unsaved design" in window.windowTitle()
    assert window.model.undo_stack.count() == 0 and not window.isWindowModified()
    assert window.new_design(defaults=True)
    assert window.current_project == project_file.Project()
    qtbot.waitUntil(lambda: not window.evaluator.busy, timeout=WAIT_MS)
    # Whatever the core makes of the bare defaults, the window shows a result or says why there is none.
    assert window.current_results is not None or "No solution" in window.status_label.text()


def test_recent_files_are_remembered_newest_first(open_window, qtbot, ferrite_demo, ndfeb_demo):
    window = open_window(ferrite_demo)
    assert window.open_file(ndfeb_demo)
    assert window.open_file(ferrite_demo)
    assert load_settings().recent_files[:2] == [str(ferrite_demo.resolve()), str(ndfeb_demo.resolve())]
    recent = [str(ferrite_demo.resolve()), str(ndfeb_demo.resolve())]
    assert [a.text() for a in window.recent_menu.actions()][:2] == recent


def test_settings_survive_a_damaged_file_and_keep_a_short_recent_list(tmp_path):
    settings_path().parent.mkdir(parents=True, exist_ok=True)
    settings_path().write_text("{ not json", encoding="utf-8")
    assert load_settings() == Settings()
    settings = Settings(display_units="US customary")
    for index in range(MAX_RECENT_FILES + 3):
        settings.add_recent_file(tmp_path / f"design_{index}.toml")
    save_settings(settings)
    loaded = load_settings()
    assert loaded.display_units == "US customary"
    assert len(loaded.recent_files) == MAX_RECENT_FILES
    assert loaded.recent_files[0].endswith(f"design_{MAX_RECENT_FILES + 2}.toml")
    settings_path().write_text(json.dumps({"display_units": "imperial", "window_width": -5}), encoding="utf-8")
    assert load_settings() == Settings()


def test_usual_shortcuts_are_bound(open_window, ferrite_demo):
    window = open_window(ferrite_demo)
    expected = {
        window.open_action: QKeySequence.StandardKey.Open,
        window.save_action: QKeySequence.StandardKey.Save,
        window.save_as_action: QKeySequence.StandardKey.SaveAs,
        window.undo_action: QKeySequence.StandardKey.Undo,
        window.redo_action: QKeySequence.StandardKey.Redo,
        window.new_action: QKeySequence.StandardKey.New,
        window.quit_action: QKeySequence.StandardKey.Quit,
    }
    for action, standard in expected.items():
        assert action.shortcut() == QKeySequence(standard), action.text()
    assert window.export_action.shortcut() == QKeySequence("Ctrl+E")


@pytest.mark.parametrize("system, suffix", [("SI", " mN·m"), ("US customary", " oz·in")])
def test_display_units_are_restored_in_a_new_window(open_window, ferrite_demo, system, suffix):
    first = open_window(ferrite_demo)
    first.set_display_units(system)
    second = open_window(ferrite_demo)
    assert second.display.system == system
    assert second.editor.editor("load.torque_mNm").widget.suffix() == suffix
