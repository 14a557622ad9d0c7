"""The duty chart page (app/gui/thermal_chart.py), the stall-time words in the key figures, and the
performance chart's default view on screen: checked on what the widgets draw."""

from __future__ import annotations

import numpy as np
import pytest

from pmdc_sizer.app.figures import LINES, POINTS
from pmdc_sizer.app.gui.main_window import PAGE_HEAT
from pmdc_sizer.app.gui.pages import PAGE_TITLES
from pmdc_sizer.app.thermal_text import chart_notes, duty_plot
from tests.conftest import DEMO_FOLDER

from .waits import WAIT_MS

DRILL = DEMO_FOLDER / "power_tool_4pole_48v.toml"


@pytest.fixture
def drill_window(open_window):
    return open_window(DRILL)


@pytest.fixture
def drill_s1_file(tmp_path):
    """The drill demo run continuously (S1), where its winding has no usable steady state."""
    text = DRILL.read_text(encoding="utf-8").replace('duty = "S2"', 'duty = "S1"')
    assert 'duty = "S1"' in text
    path = tmp_path / "drill_s1.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_the_page_is_in_the_window_and_on_the_command_line(drill_window):
    titles = [drill_window.pages.tabText(i) for i in range(drill_window.pages.count())]
    assert PAGE_HEAT in titles and PAGE_TITLES["heat"] == PAGE_HEAT
    assert titles.index(PAGE_HEAT) == 3  # beside the other charts of the design, before the comparison


def test_the_chart_draws_the_transient_with_the_limits_and_the_run(drill_window, qtbot):
    chart, results = drill_window.thermal_chart, drill_window.current_results
    qtbot.waitUntil(lambda: chart._results is results, timeout=WAIT_MS)
    plot = duty_plot(results.thermal)
    for line, (x, y) in chart.shown_curves().items():
        np.testing.assert_allclose(x, plot.time)
        np.testing.assert_allclose(y, plot.curves[line])
        assert chart.curves[line].opts["pen"].color().name() == LINES[line].colour
    assert chart.limit_lines["insulation_limit"].value() == 180.0
    assert chart.limit_lines["magnet_limit"].value() == results.thermal.magnet_limit_C
    assert chart.limit_lines["insulation_limit"].label.format == "class 180 (H): 180 °C"
    assert chart.shown_spells() == [pytest.approx((0.0, 5.0))]  # the 5 min S2 run
    assert chart.title.text() == "Temperatures over the duty (S2: a 5 min run, then at rest) at the rated load, " \
                                 "50 °C ambient"
    assert chart.notes.text() == " ".join(chart_notes(results.thermal))
    assert "Winding 164 °C at the end of the run" in chart.notes.text()
    assert chart.limit_mark.points().size == 0  # a usable state: nothing marked
    assert "under the rated load" in chart.key.text()
    assert chart.plot.getAxis("left").labelText == "Temperature [°C]"


def test_without_a_steady_state_the_time_to_the_limit_is_marked_and_said(open_window, drill_s1_file, qtbot):
    window = open_window(drill_s1_file)
    chart, t = window.thermal_chart, window.current_results.thermal
    qtbot.waitUntil(lambda: chart._results is window.current_results, timeout=WAIT_MS)
    assert not t.steady_state_exists
    (spot,) = chart.limit_mark.points()
    assert (spot.pos().x(), spot.pos().y()) == pytest.approx((t.time_to_limit_s / 60.0, 180.0))
    assert spot.brush().color().name() == POINTS["class_limit_reached"].colour
    assert chart.notes.text().startswith("No usable steady state at the rated load (S1)")
    assert f"after {t.time_to_limit_s / 60.0:.1f} min from ambient" in chart.notes.text()
    assert chart.shown_spells() == []  # S1: loaded throughout, nothing shaded
    assert POINTS["class_limit_reached"].title in chart.key.text()


def test_the_chart_follows_the_display_units(drill_window, qtbot):
    chart = drill_window.thermal_chart
    drill_window.set_display_units("US customary")
    qtbot.waitUntil(lambda: chart.temperature_unit == "°F" and chart.limit_lines["insulation_limit"].value() > 300,
                    timeout=WAIT_MS)
    assert chart.limit_lines["insulation_limit"].value() == pytest.approx(356.0)
    assert chart.plot.getAxis("left").labelText == "Temperature [°F]"


def test_the_key_figures_say_why_there_is_no_stall_time_from_hot(drill_window):
    values = drill_window.results_panel.values
    assert drill_window.current_results.ratings.stall_time_hot_s == 0.0
    assert values["Permitted stall time from hot (S1)"] == "no stall allowed"
    reason = "   ↳ running on (S1) at the rated load has no steady state below the class limit"
    assert values[reason] == ""
    assert values["Permitted stall time from cold"] == "10 s"
    assert not any(text == "0 s" for text in values.values())


def test_the_performance_chart_frames_the_drive_limited_region(drill_window):
    chart, r = drill_window.performance_chart, drill_window.current_results
    (x_low, x_high), (_y_low, current_top) = chart.plots["current_A"].viewRange()
    limit_torque = r.nominal.current_limit_torque_N_m  # N·m: the drill's torque unit on screen
    assert chart.torque_unit == "N·m"
    # the limit and a margin beyond it, shaded, in view; the unlimited stall far outside
    assert x_low == pytest.approx(0.0, abs=1e-9) and limit_torque < x_high < 0.2 * r.nominal.stall_torque_N_m
    beyond = chart.beyond_limit[0]
    assert beyond.isVisible() and beyond.getRegion()[0] == pytest.approx(limit_torque)
    # the current axis is as tall as the curves in view: the 80 A limit near its top, not 2 kA of stall
    assert r.current_limit_A < current_top < 2.0 * r.current_limit_A
    _x, (_low, power_top) = chart.plots["output_power_W"].viewRange()
    assert power_top < 0.5 * r.nominal.max_output_power_W
    _x, (_low, efficiency_top) = chart.plots["efficiency"].viewRange()
    assert efficiency_top == pytest.approx(100.0)
