"""The field-solution page: it solves the open design off the GUI thread, shows map, waveform and table,
keeps results per design and case, cancels cleanly, and follows every edit."""

from __future__ import annotations

from pathlib import Path

import pytest

from .waits import WAIT_MS

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"


@pytest.fixture
def page(open_window, qtbot):
    window = open_window(FERRITE)
    view = window.field_view
    view.mesh_combo.setCurrentIndex(0)
    yield window, view
    view.cancel()
    view.wait(30000)


def _solve(qtbot, view):
    with qtbot.waitSignal(view.finished, timeout=60000):
        view.solve()


def test_the_page_is_in_the_window_and_lists_the_designs_cases(page):
    window, view = page
    titles = [window.pages.tabText(i) for i in range(window.pages.count())]
    assert "Field solution" in titles
    names = [view.case_combo.itemData(i).name for i in range(view.case_combo.count())]
    assert names == ["no-load", "stall-cold", "stall-hot", "rotor-removed-cold", "rotor-removed-hot"]


def test_solving_shows_the_picture_the_waveform_and_the_agreement(page, qtbot):
    _, view = page
    _solve(qtbot, view)
    assert view.solution.case.name == "no-load"
    assert view.picture.pixmap() is not None and not view.picture.pixmap().isNull()
    x, y = view.waveform_curve.getData()
    assert len(x) == len(view.solution.airgap_angle_rad) and abs(y).max() > 0.3  # a ferrite gap, tenths of a tesla
    quantities = [view.table.item(row, 0).text() for row in range(view.table.rowCount())]
    assert "flux per pole" in quantities and "air-gap flux density" in quantities
    assert "solved" in view.state_label.text()


def test_the_colour_scales_are_drawn_at_the_screen_font_not_shrunk_with_the_picture(page, qtbot):
    # Drawn into the 900-pixel picture and scaled to a laptop's column, their text was about 4 pixels high.
    _, view = page
    _solve(qtbot, view)
    assert view.scales.knee_field_A_per_m == view.solution.knee_field_A_per_m
    assert view._pixmap.width() == view._pixmap.height()  # the section alone: the scales are their own widget
    assert view.scales.height() >= 2 * view.scales.fontMetrics().height()
    image = view.scales.grab().toImage()
    colours = {image.pixelColor(x, image.height() // 2).name() for x in range(0, image.width(), 4)}
    assert len(colours) > 10  # the two colour bars are painted


def test_a_solved_case_is_kept_and_an_edit_makes_a_new_design(page, qtbot):
    window, view = page
    _solve(qtbot, view)
    first = view.solution
    view.case_combo.setCurrentIndex(1)  # stall, cold
    _solve(qtbot, view)
    view.case_combo.setCurrentIndex(0)  # back: shown at once from the cache
    assert view.solution is first and "kept" in view.state_label.text()
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        window.model.propose("housing.wall_mm", 3.0, final=True)
    assert view._key() not in view.cache  # the thinner housing is another design
    _solve(qtbot, view)
    assert view.solution.flux_per_pole_Wb < first.flux_per_pole_Wb  # less steel to carry the return flux


def test_cancel_leaves_nothing_half_done(page, cancelled_run):
    _, view = page
    view.mesh_combo.setCurrentIndex(1)  # the fine mesh, slow enough to stop
    cancelled_run(view, view.failed, view.solve, 60000)
    assert view.solution is None and not view.cache
