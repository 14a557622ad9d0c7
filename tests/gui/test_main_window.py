"""The main window driven through its own widgets, offscreen."""

from __future__ import annotations

import shutil
import tomllib

import numpy as np
import pytest
import tomli_w
from PySide6.QtWidgets import QMessageBox

from pmdc_sizer.app.figures import figure, units_of_design
from pmdc_sizer.app.formatting import check_message
from pmdc_sizer.app.gui.main_window import PAGE_MAGNET, PAGE_PERFORMANCE, PAGE_SECTION
from pmdc_sizer.core import library
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.units import from_si

from .waits import WAIT_MS


def _thickness_box(window):
    return window.editor.editor("magnets.thickness_mm").widget


def test_each_demo_opens_evaluated_with_every_view_filled(open_window, demo_path):
    window = open_window(demo_path)
    results = window.current_results
    assert window.current_project == project_file.load(demo_path)
    assert demo_path.name in window.windowTitle()
    assert not window.isWindowModified()
    assert [window.pages.tabText(i) for i in range(3)] == [PAGE_MAGNET, PAGE_PERFORMANCE, PAGE_SECTION]
    # Every case's curves are drawn from the results' arrays.
    for case in results.cases:
        _x, y = window.performance_chart.curves[("speed_rad_per_s", case.name)].getData()
        np.testing.assert_allclose(y, from_si(case.curve.speed_rad_per_s, "rpm"))
        _h, b = window.magnet_chart.normal_curves[case.name].getData()
        assert len(b) == len(results.magnet_chart[0].curves.flux_density)
    # the demagnetization cases, then the faults with the supply applied directly
    assert window.magnet_chart.table.rowCount() == len(results.demagnetization.cases) + len(results.faults.cases)
    assert sorted(window.checks_panel.shown) == sorted(c.key for c in results.checks)
    text = window.checks_panel.toPlainText()
    # each check's message as the panel words it: its torques in the design's torque unit (N·m for the
    # scooter and the drill, whose core messages quote mN·m)
    shown = units_of_design(results, window.display.screen_unit)
    assert all(c.title in text and check_message(c, shown)[:20] in text for c in results.checks)
    assert window.results_panel.values[figure("constants.ke_V_s_per_rad").title].endswith("V/krpm")


def test_magnet_thickness_edit_changes_figures_and_chart(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    flux_before = window.results_panel.values[figure("magnetics.flux_per_pole_Wb").title]
    operating_before = window.magnet_chart.operating_points()["nominal"][1]
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS) as blocker:
        _thickness_box(window).setValue(4.0)
    project, results = blocker.args
    assert project.magnets.thickness_mm == pytest.approx(4.0)
    qtbot.waitUntil(lambda: not window.evaluator.busy, timeout=WAIT_MS)
    assert window.current_project.magnets.thickness_mm == pytest.approx(4.0)
    # A thinner ferrite magnet works at a lower permeance coefficient: less flux, lower B.
    assert window.results_panel.values[figure("magnetics.flux_per_pole_Wb").title] != flux_before
    assert window.magnet_chart.operating_points()["nominal"][1] < operating_before
    permeance = results.magnetics.permeance_coefficient
    assert window.current_results.magnetics.permeance_coefficient == pytest.approx(permeance)


def test_undo_restores_the_value_and_the_results(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    figures_before = dict(window.results_panel.values)
    thickness_before = window.current_project.magnets.thickness_mm
    with qtbot.waitSignal(window.model.edit_committed, timeout=WAIT_MS):
        _thickness_box(window).setValue(4.5)
        _thickness_box(window).editingFinished.emit()
    qtbot.waitUntil(lambda: not window.evaluator.busy, timeout=WAIT_MS)
    assert window.results_panel.values != figures_before
    assert window.isWindowModified()
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        window.undo_action.trigger()
    qtbot.waitUntil(lambda: not window.evaluator.busy, timeout=WAIT_MS)
    assert _thickness_box(window).value() == pytest.approx(thickness_before)
    assert window.current_project == project_file.load(ferrite_demo)
    assert window.results_panel.values == figures_before
    assert not window.isWindowModified()
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        window.redo_action.trigger()
    assert _thickness_box(window).value() == pytest.approx(4.5)


def test_a_drag_is_one_undo_step(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    box = _thickness_box(window)
    thickness_before = box.value()
    for step in range(1, 6):
        box.setValue(thickness_before - 0.1 * step)
    assert window.model.undo_stack.count() == 0  # still dragging: shown, not yet an undo step
    with qtbot.waitSignal(window.model.edit_committed, timeout=WAIT_MS):
        pass  # the idle timer commits the drag
    assert window.model.undo_stack.count() == 1
    qtbot.waitUntil(lambda: not window.evaluator.busy, timeout=WAIT_MS)
    assert window.current_results is not None
    assert window.current_project.magnets.thickness_mm == pytest.approx(thickness_before - 0.5)
    window.undo_action.trigger()
    assert window.current_project.magnets.thickness_mm == pytest.approx(thickness_before)


def test_refused_edit_names_the_limit_and_keeps_the_design(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    before = window.current_project
    editor = window.editor.editor("magnets.arc_deg")
    with qtbot.waitSignal(window.model.edit_rejected, timeout=2000) as blocker:
        editor.widget.setValue(177.0)  # more than 98 % of the 180° pole pitch
    key, message = blocker.args
    assert key == "magnets.arc_deg"
    assert "98 %" in message and "176.4" in message
    assert not editor.error_label.isHidden()
    assert "Magnet arc" in window.status_label.text()  # the field's label, not its key
    assert window.current_project == before
    assert window.model.undo_stack.count() == 0


def test_broken_file_shows_the_message_and_keeps_the_design(open_window, qtbot, ferrite_demo, tmp_path, monkeypatch):
    window = open_window(ferrite_demo)
    before, path_before = window.current_project, window.current_path
    data = tomllib.loads(ferrite_demo.read_text(encoding="utf-8"))
    data["magnets"]["thickness_mm"] = 60.0  # the schema allows at most 40 mm
    broken = tmp_path / "broken.toml"
    broken.write_text(tomli_w.dumps(data), encoding="utf-8")
    shown = []
    monkeypatch.setattr(QMessageBox, "critical", staticmethod(lambda parent, title, text, *a: shown.append(text)))
    assert window.open_file(broken) is False
    assert len(shown) == 1
    assert "magnets.thickness_mm" in shown[0] and "40" in shown[0]
    assert "magnets.thickness_mm" in window.status_label.text()
    assert window.current_project == before
    assert window.current_path == path_before
    assert not window.isWindowModified()


def test_unsaved_changes_prompt_on_close_and_open(open_window, qtbot, ferrite_demo, ndfeb_demo, tmp_path, monkeypatch):
    copy = tmp_path / "pump.toml"
    shutil.copy(ferrite_demo, copy)
    window = open_window(copy)
    with qtbot.waitSignal(window.model.edit_committed, timeout=WAIT_MS):
        _thickness_box(window).setValue(5.0)
        _thickness_box(window).editingFinished.emit()
    asked = []

    def answer_with(button):
        def question(parent, title, text, *args):
            asked.append(text)
            return button
        monkeypatch.setattr(QMessageBox, "question", staticmethod(question))

    answer_with(QMessageBox.StandardButton.Cancel)
    assert window.close() is False  # the user kept the window
    assert window.isVisible() and len(asked) == 1
    assert window.open_file(ndfeb_demo) is False
    assert window.current_project.magnets.thickness_mm == pytest.approx(5.0)
    assert len(asked) == 2

    answer_with(QMessageBox.StandardButton.Save)
    assert window.open_file(ndfeb_demo) is True  # saved first, then opened
    assert project_file.load(copy).magnets.thickness_mm == pytest.approx(5.0)
    assert window.current_path == ndfeb_demo

    with qtbot.waitSignal(window.model.edit_committed, timeout=WAIT_MS):
        _thickness_box(window).setValue(3.0)
        _thickness_box(window).editingFinished.emit()
    answer_with(QMessageBox.StandardButton.Discard)
    qtbot.waitUntil(lambda: not window.evaluator.busy, timeout=WAIT_MS)
    assert window.close() is True
    assert project_file.load(ndfeb_demo).magnets.thickness_mm != pytest.approx(3.0)


def test_save_as_writes_the_edited_design(open_window, qtbot, ferrite_demo, tmp_path):
    window = open_window(ferrite_demo)
    with qtbot.waitSignal(window.model.edit_committed, timeout=WAIT_MS):
        window.editor.editor("airgap.length_mm").widget.setValue(0.6)
        window.editor.editor("airgap.length_mm").widget.editingFinished.emit()
    assert window.isWindowModified()
    target = tmp_path / "wider_gap"
    assert window.save_file_as(target) is True
    saved = target.with_suffix(".toml")
    assert project_file.load(saved).airgap.length_mm == pytest.approx(0.6)
    assert not window.isWindowModified()
    assert "wider_gap.toml" in window.windowTitle()
    assert str(saved.resolve()) == window.settings.recent_files[0]


def test_cross_section_is_drawn_to_the_design_dimensions(open_window, qtbot, demo_path):
    window = open_window(demo_path)
    geometry = design_from_project(window.current_project).geometry
    drawn = window.cross_section
    outer_mm = from_si(geometry.housing_outer_radius, "mm")
    assert drawn.housing_outer_radius_drawn_mm() == pytest.approx(outer_mm, rel=1e-6)
    assert len(drawn.magnet_items) == window.current_project.motor.poles
    magnet_outer = max(item.path().boundingRect().top() + item.path().boundingRect().height()
                       for item in drawn.magnet_items)
    assert magnet_outer == pytest.approx(from_si(geometry.housing_inner_radius, "mm"), rel=1e-3)
    shaft = drawn.shaft_item.path().boundingRect().width() / 2
    assert shaft == pytest.approx(from_si(geometry.shaft_radius, "mm"), rel=1e-6)
    box = window.editor.editor("housing.wall_mm").widget
    new_wall = box.value() + 1.0
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        box.setValue(new_wall)
    expected = from_si(design_from_project(window.current_project).geometry.housing_outer_radius, "mm")
    assert drawn.housing_outer_radius_drawn_mm() == pytest.approx(expected, rel=1e-6)


def test_display_units_change_the_screen_not_the_file(open_window, qtbot, ferrite_demo, _isolated_settings):
    window = open_window(ferrite_demo)
    thickness_mm = window.current_project.magnets.thickness_mm
    window.set_display_units("US customary")
    box = _thickness_box(window)
    assert box.suffix() == " in"
    assert box.value() == pytest.approx(thickness_mm / 25.4, abs=1e-5)  # Source: 1 in = 25.4 mm exactly (NIST SP 811)
    assert window.editor.editor("temperatures.ambient_max_C").widget.suffix() == " °F"
    assert window.current_project == project_file.load(ferrite_demo)
    qtbot.waitUntil(lambda: not window.evaluator.busy and window.current_results is not None)
    assert window.results_panel.values[figure("constants.kt_N_m_per_A").title].endswith("oz·in/A")
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        box.setValue(0.2)  # inches
    assert window.current_project.magnets.thickness_mm == pytest.approx(5.08, abs=1e-3)
    assert (_isolated_settings / "settings.json").is_file()
    from pmdc_sizer.app.gui.settings import load_settings

    assert load_settings().display_units == "US customary"


def test_custom_grade_can_be_chosen_and_edited(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    picker = window.editor.grade_picker
    library_grade = library.magnet_grades()[window.current_project.magnets.grade]
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        picker.source_box.setCurrentIndex(picker.CUSTOM)
        picker.source_box.activated.emit(picker.CUSTOM)
    grade = window.current_project.magnets.custom_grade
    assert grade is not None and window.current_project.magnets.grade is None
    assert grade.remanence_T == pytest.approx(library_grade.remanence)
    assert grade.coercivity_HcJ_kA_per_m == pytest.approx(from_si(library_grade.coercivity_hcj, "kA/m"))
    remanence = window.editor.editor("magnets.custom_grade.remanence_T")
    assert remanence.isVisibleTo(window)
    flux_before = window.current_results.magnetics.flux_per_pole_Wb
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        # +0.5 %: a larger step alone would move the curve's (BH)max more than 2 % from the grade's, and the
        # grade check (core.magnet_grade_check) refuses that until (BH)max is edited too
        remanence.widget.setValue(1.005 * library_grade.remanence)
    assert window.current_results.magnetics.flux_per_pole_Wb > flux_before
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        picker.source_box.setCurrentIndex(picker.LIBRARY)
        picker.source_box.activated.emit(picker.LIBRARY)
    assert window.current_project.magnets.grade == library_grade.name
    assert not remanence.isVisibleTo(window)


def test_library_grade_choice_shows_its_properties(open_window, qtbot, ferrite_demo):
    window = open_window(ferrite_demo)
    picker = window.editor.grade_picker
    current = window.current_project.magnets.grade
    assert current in picker.properties.text() and "kA/m" in picker.properties.text()
    other = next(name for name, grade in library.magnet_grades().items()
                 if grade.family == library.magnet_grades()[current].family and name != current)
    index = picker.grade_box.findData(other)
    assert index >= 0
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        picker.grade_box.setCurrentIndex(index)
        picker.grade_box.activated.emit(index)
    assert window.current_project.magnets.grade == other
    assert other in picker.properties.text()


def test_extension_points(open_window, qtbot, ferrite_demo):
    from PySide6.QtWidgets import QLabel

    window = open_window(ferrite_demo)
    page = QLabel("extra")
    index = window.add_page("Extra page", page)
    assert window.pages.widget(index).widget() is page and window.pages.tabText(index) == "Extra page"
    received = []
    window.results_ready.connect(lambda project, results: received.append((project, results)))
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        _thickness_box(window).setValue(5.5)
    project, results = received[-1]
    assert project is window.current_project and results is window.current_results


def test_cursor_readout_reads_every_case(open_window, ferrite_demo):
    window = open_window(ferrite_demo)
    chart = window.performance_chart
    chart.show_cursor(35.0)
    text = chart.readout.text()
    nominal = window.current_results.nominal
    expected_speed = np.interp(35.0, from_si(nominal.curve.torque_N_m, "mN·m"),
                               from_si(nominal.curve.speed_rad_per_s, "rpm"))
    from pmdc_sizer.app.formatting import significant

    assert f"{significant(expected_speed, 3)} rpm" in text
    assert "Efficiency" in text and "cold" in text and "hot" in text


def test_about_text_carries_the_safety_cautions():
    from pmdc_sizer.app.gui.main_window import about_text

    text = about_text().lower()
    for phrase in ("pinch", "shatter", "medical device", "stalled motor overheats", "burn", "confirm", "local codes",
                   "licensed"):
        assert phrase in text


def test_drive_current_limit_is_marked_on_the_performance_chart(open_window, qtbot, ndfeb_demo, ferrite_demo):
    # The scooter demo's drive limits the current: its torque there is drawn on every plot.
    window = open_window(ndfeb_demo)
    chart = window.performance_chart
    limit = window.current_results.nominal.current_limit_torque_N_m
    assert limit is not None
    assert all(line.isVisible() and line.value() == pytest.approx(from_si(limit, chart.torque_unit))
               for line in chart.limit_lines)
    # The ferrite demo's plain supply has no limit, and no line.
    plain = open_window(ferrite_demo)
    assert not any(line.isVisible() for line in plain.performance_chart.limit_lines)
    # and the key lists the limit only where it is drawn
    from pmdc_sizer.app.figures import LINES
    assert LINES["drive_limit"].title in chart.key.text()
    assert LINES["drive_limit"].title not in plain.performance_chart.key.text()
