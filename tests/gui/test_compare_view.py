"""The comparison page, driven through its own methods and buttons, offscreen."""

from __future__ import annotations

import pytest
from PySide6.QtCore import QObject, Qt, Signal

from pmdc_sizer.app.figures import COMPARE_KEYS, STATUSES, figure
from pmdc_sizer.core import evaluate, project
from tests.conftest import DEMO_FOLDER

from .waits import WAIT_MS

pytest.importorskip("pyqtgraph")


FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"


class StandInWindow(QObject):
    """What the page needs of the main window: the current design and its results, and the signal."""

    results_ready = Signal(object, object)

    def __init__(self, path):
        super().__init__()
        self.current_project = project.load(path)
        self.current_results = evaluate(self.current_project)

    def edit(self, changes):
        self.current_project = project.with_values(self.current_project, changes)
        self.current_results = evaluate(self.current_project)
        self.results_ready.emit(self.current_project, self.current_results)


@pytest.fixture
def page(open_compare_view):
    window = StandInWindow(FERRITE)
    return window, open_compare_view(window)


def cell(table, row, column):
    return table.item(row, column).text()


def row_of(table, title):
    for row in range(table.rowCount()):
        if cell(table, row, 0).startswith(title):
            return row
    raise AssertionError(f"no row {title!r}")


def test_pinned_copy_of_a_shows_no_difference_then_follows_edits_of_a(page, qtbot):
    window, view = page
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        view.pin_button.click()
    table = view.figures_table
    assert table.rowCount() == len(COMPARE_KEYS)
    assert all(cell(table, row, 3) == "0" for row in range(table.rowCount()))
    # Editing A moves A only: the pinned B stays at 6 mm.
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        window.edit({"magnets.thickness_mm": 7.0})
    row = row_of(table, "Magnet thickness")
    # A and B as the key figures show them (three figures); B − A one figure finer
    assert (cell(table, row, 1), cell(table, row, 2), cell(table, row, 3)) == ("7.00", "6.00", "-1.00")
    assert cell(table, row_of(table, figure("constants.ke_V_s_per_rad").title), 4).startswith("-")


def test_another_grade_follows_a_and_shows_checks_curves_and_magnet_charts(page, qtbot):
    window, view = page
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        view.grade_combo.setCurrentText("N42")
    assert view.results_b.magnet.name == "N42"
    table = view.figures_table
    # NdFeB against ferrite
    assert float(cell(table, row_of(table, "Br ["), 2)) > 2.5 * float(cell(table, row_of(table, "Br ["), 1))
    # Each side's checks: the ferrite demo stays above the knee (with the reluctance network its rotor-removed
    # margin is under the required share, a warning), N42 in its frame fails demagnetization when hot.
    checks = view.checks_table
    demag = row_of(checks, "Demagnetization")
    a_status = next(c.status for c in view.results_a.checks if c.key == "demagnetization")
    assert a_status != "fail" and STATUSES[a_status].word in cell(checks, demag, 1)
    assert STATUSES["fail"].word in cell(checks, demag, 2)
    assert "knee" in checks.item(demag, 2).toolTip()
    # Both sides drawn: speed-torque curves overlaid, both magnet charts.
    for side in ("A", "B"):
        x, y = view.curve_items[("speed_rad_per_s", side)].getData()
        assert len(x) > 10 and y[0] > y[-1]
    view.range_combo.setCurrentIndex(1)
    _left, right = view.curve_plots["speed_rad_per_s"].getViewBox().viewRange()[0]
    assert right == pytest.approx(3 * 35.0)  # three times the rated 35 mN·m
    view.tabs.setCurrentIndex(2)  # each side's magnet chart is drawn when its tab is in view
    for side, grade in (("A", "Y40"), ("B", "N42")):
        assert view.magnet_titles[side].text().startswith(f"{side}: {grade}, 6.00 mm arcs")
        normal, _ = view.magnet_charts[side].normal_curves["nominal"].getData()
        assert len(normal) > 10
    assert "N42" in view.curve_key.text() and "Y40" in view.curve_key.text()
    # B follows A's edits with its own grade.
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS, check_params_cb=lambda c: c.b.magnet.name == "N42"
                          and view.project_b.magnets.thickness_mm == 5.0):
        window.edit({"magnets.thickness_mm": 5.0})


def test_refit_buttons_run_off_the_gui_thread_and_report(page, qtbot, tmp_path):
    _window, view = page
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        view.use_grade_for_b("Y25")
    with qtbot.waitSignal(view.refit_finished, timeout=WAIT_MS) as blocker:
        qtbot.mouseClick(view.refit_buttons["stall-torque"], Qt.MouseButton.LeftButton)
        assert not view.refit_buttons["ke"].isEnabled()  # one re-fit at a time
    fit = blocker.args[0]
    assert fit.reached and abs(fit.target_error_fraction) < 5e-3
    assert view.b_mode == "refit" and view.project_b is fit.project
    assert view.grade_combo.currentText() == "Y25"  # B's box still names the grade B is made of
    report = view.refit_report.toPlainText()
    # the changed inputs as the key figures name and round them, not as file keys
    assert "Reached" in report and "Stack length: 25.0 mm → " in report and "Magnet length: 28.0 mm → " in report
    assert "armature.stack_length_mm" not in report
    table = view.figures_table
    assert cell(table, row_of(table, "Stall torque"), 3) == "0"
    assert all(button.isEnabled() for button in view.refit_buttons.values())
    # The re-fitted B can be kept as a project file of its own, exactly as re-fitted.
    saved = tmp_path / "b_refitted.toml"
    assert view.save_b(saved)
    assert project.load(saved) == fit.project


def test_out_of_reach_refit_says_why(page, qtbot):
    _window, view = page
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        view.use_grade_for_b("N42")
    with qtbot.waitSignal(view.refit_finished, timeout=WAIT_MS) as blocker:
        view.start_refit("ke")
    assert not blocker.args[0].reached
    report = view.refit_report.toPlainText()
    assert "Out of reach" in report and "thinner than 0.500 mm" in report
    assert "out of reach" in view.side_labels.text()


def test_a_hidden_page_waits_and_catches_up_when_shown(page, qtbot):
    _window, view = page
    view.hide()
    view.pin_current_as_b()
    qtbot.wait(20)
    assert view.comparison is None  # nothing drawn for a page nobody sees
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        view.show()
    assert view.comparison is not None


def test_b_from_a_file_and_a_bad_file(page, qtbot, tmp_path):
    _window, view = page
    broken = tmp_path / "broken.toml"
    broken.write_text("format_version = 1\n[magnets]\nthickness_mm = -3\n", encoding="utf-8")
    assert not view.load_b_file(broken)
    assert "B not changed" in view.side_labels.text() and view.results_b is None
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        assert view.load_b_file(DEMO_FOLDER / "mobility_ndfeb_24v.toml")
    assert view.results_b.magnet.name == "N35EH" and "mobility_ndfeb_24v.toml" in view.side_labels.text()
    # the scooter's stall torque is 16.7 N·m: the shared torque axis is in N·m, not in thousands of mN·m
    assert view.curve_plots["speed_rad_per_s"].getAxis("bottom").labelUnits == "N·m"
    assert not view.save_b(tmp_path / "no such folder" / "b.toml")
    assert "B not saved" in view.side_labels.text() and not (tmp_path / "no such folder").exists()
    assert not view.grab().isNull()


class UsWindow(StandInWindow):
    """The stand-in window with the display set to US customary units."""

    def __init__(self, path):
        super().__init__(path)
        from pmdc_sizer.app.gui.display_units import DisplayUnits

        self.display = DisplayUnits("US customary")


def test_the_page_follows_us_customary_units(qtbot, open_compare_view):
    view = open_compare_view(UsWindow(FERRITE), size=(1366, 768))
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        view.use_grade_for_b("N42SH")
    table = view.figures_table
    titles = [cell(table, row, 0) for row in range(table.rowCount())]
    assert not any(unit in title for title in titles for unit in ("[mm]", "[mN·m]", "[°C]", "[g]"))
    assert any("[in]" in t for t in titles) and any("[oz·in]" in t for t in titles) and any("[°F]" in t for t in titles)
    tips = [view.checks_table.item(row, column).toolTip() for row in range(view.checks_table.rowCount())
            for column in (1, 2)]
    assert not any("°C" in tip or "mN·m" in tip for tip in tips) and any("°F" in tip for tip in tips)
    assert "°F" in view.curve_key.text() and "°C" not in view.curve_key.text()
    assert view.curve_plots["speed_rad_per_s"].getAxis("bottom").labelUnits == "oz·in"
    with qtbot.waitSignal(view.refit_finished, timeout=20000) as blocker:
        view.start_refit("stall-torque")
    fit = blocker.args[0]
    assert view.grade_combo.currentText() == "N42SH"
    # the re-fitted value in the B line rounded as the key figures round it, in the display unit
    assert f"→ {figure('geometry.stack_length_m').text(fit.project.armature.stack_length_mm / 1000, 'in')}" \
        in view.side_labels.text()
    assert " mm" not in view.refit_report.toPlainText()
    view.evaluator_b.wait()
    view._refit_pool.waitForDone(5000)


def test_b_with_another_grade_is_priced_as_that_grade(page, qtbot):
    from pmdc_sizer.core import library

    _window, view = page
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        view.use_grade_for_b("N42SH")
    price = library.magnet_grade("N42SH").price_per_kg
    assert view.results_b.cost.magnet == pytest.approx(view.results_b.mass.magnet_kg * price, rel=1e-12)
    table = view.figures_table
    for title in ("Housing outer diameter", "Housing length", "Magnet mass", "Estimated total mass"):
        row_of(table, title)  # shown


def test_the_page_fits_a_laptop_screen_without_scrolling(open_window, qtbot):
    # At 1366×768 the comparison page gets the window's height: a word-wrapped label must not make the scroll
    # area stretch the page to its preferred height and cut off the lower charts.
    window = open_window(FERRITE)
    window.resize(1366, 768)
    index = next(i for i in range(window.pages.count()) if window.pages.tabText(i) == "Compare designs")
    window.pages.setCurrentIndex(index)
    scroller = window.pages.widget(index)
    page = scroller.widget()
    assert page.minimumSizeHint().height() < scroller.viewport().height()
    qtbot.waitUntil(lambda: page.height() <= scroller.viewport().height() and page.height() > 600, timeout=3000)
    assert not scroller.verticalScrollBar().isVisible()
