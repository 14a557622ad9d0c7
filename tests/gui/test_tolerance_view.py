"""The production-spread page: it runs the tolerance study off the GUI thread, shows yield, histograms, the
band and the table, marks its figures stale after an edit, and cancels cleanly."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from .waits import WAIT_MS

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"
STUDY_TIMEOUT_MS = 180_000  #: 100 motors through the per-design chain on a loaded machine


@pytest.fixture
def page(job_page):
    window, view = job_page(FERRITE, "tolerance_view", STUDY_TIMEOUT_MS)
    view.samples_box.setValue(100)
    return window, view


def _run(qtbot, view):
    with qtbot.waitSignal(view.finished, timeout=STUDY_TIMEOUT_MS):
        view.run()


def test_the_page_is_in_the_window_with_the_files_motors_and_seed(open_window):
    window = open_window(FERRITE)
    titles = [window.pages.tabText(i) for i in range(window.pages.count())]
    assert "Production spread" in titles
    view = window.tolerance_view
    assert view.samples_box.value() == window.current_project.tolerances.samples == 10000
    assert view.seed_box.value() == window.current_project.tolerances.seed


def test_a_study_shows_the_yield_the_histograms_the_band_and_the_drivers(page, qtbot):
    _, view = page
    _run(qtbot, view)
    study = view.study
    assert study.samples == 100
    assert "Yield" in view.headline.text() and "worst margin to the knee" in view.headline.text()
    assert "drawn fails already" not in view.headline.text()  # the ferrite demo passes as drawn
    plot = view._plots["nominal.ke_V_s_per_rad"]
    counts = next(iter(plot.listDataItems())).getData()[1]
    assert int(np.sum(counts)) == 100
    assert view.band is not None and np.all(view.band.high_speed_rad_per_s >= view.band.low_speed_rad_per_s)
    assert view.table.rowCount() == len(view._plots)
    ke_row = next(r for r in range(view.table.rowCount()) if view.table.item(r, 0).text().startswith("Back-EMF"))
    assert view.table.item(ke_row, 4).text().startswith("Br")  # Br drives Ke
    assert view.state_label.text() == "up to date"


def test_an_edit_marks_the_figures_stale_until_the_study_runs_again(page, qtbot):
    window, view = page
    _run(qtbot, view)
    shown = view.study
    assert view.current_study() is shown  # what the export dialog is handed
    # the page is not the one on screen, so nothing runs by itself: the state must say what is shown
    with qtbot.waitSignal(window.results_ready, timeout=WAIT_MS):
        window.model.propose("airgap.length_mm", 0.5, final=True)
    assert view.study is shown and "earlier design" in view.state_label.text()
    assert view.current_study() is None  # a stale study never reaches a datasheet
    _run(qtbot, view)
    assert view.study is not shown and view.state_label.text() == "up to date"
    assert view.current_study() is view.study


def test_cancel_stops_the_study_and_keeps_nothing(page, cancelled_run):
    _, view = page
    view.samples_box.setValue(5000)
    cancelled_run(view, view.failed, view.run, STUDY_TIMEOUT_MS)
    assert view.study is None
