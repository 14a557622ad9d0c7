"""The duty chart's content and the heat texts (app/thermal_text.py), and where paper and terminal show them.

Asserted on what is plotted and written: the curves are the results' transient, the spells the S2 run
or the S3 loaded spells, the limits the class's and the grade's; where no steady state exists the notes
say so and name the time to the class limit; a stall time of none reads in words, not "0 s".
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from pmdc_sizer.app import thermal_text
from pmdc_sizer.app.datasheet import charts, content
from pmdc_sizer.app.datasheet.paper_units import printed_in
from pmdc_sizer.app.figures import LINES, POINTS, REGIONS
from pmdc_sizer.app.overrides import apply_overrides
from pmdc_sizer.app.summary import summary_text
from pmdc_sizer.core import project
from pmdc_sizer.core.evaluate import evaluate
from tests.conftest import DEMO_FOLDER

DRILL = DEMO_FOLDER / "power_tool_4pole_48v.toml"  # S2, 5 min; no S1 steady state at its rated load
FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"  # S1 with a steady state


@pytest.fixture(scope="module")
def drill():
    design = project.load(DRILL)
    return design, evaluate(design)


@pytest.fixture(scope="module")
def ferrite():
    design = project.load(FERRITE)
    return design, evaluate(design)


@pytest.fixture(scope="module")
def drill_s1():
    """The drill run continuously: no usable steady state, the winding passes its class limit."""
    design = apply_overrides(project.load(DRILL), ["thermal.duty=S1"])
    return design, evaluate(design)


@pytest.fixture(scope="module")
def drill_s3():
    design = apply_overrides(project.load(DRILL), ["thermal.duty=S3", "thermal.cycle_duration_factor_pct=40",
                                                   "thermal.cycle_minutes=10"])
    return design, evaluate(design)


# ----------------------------------------------------------------------------------------------
# What the chart plots


def test_the_plot_is_the_transient_in_minutes_and_degrees(drill):
    t = drill[1].thermal
    plot = thermal_text.duty_plot(t)
    tr = t.transient
    np.testing.assert_allclose(plot.time, np.asarray(tr.time_s) / 60.0, rtol=1e-12)
    np.testing.assert_allclose(plot.curves["winding_temperature"], tr.winding_C, rtol=1e-12)
    np.testing.assert_allclose(plot.curves["magnet_temperature"], tr.magnet_C, rtol=1e-12)
    np.testing.assert_allclose(plot.curves["housing_temperature"], tr.housing_C, rtol=1e-12)
    assert plot.limits == {"insulation_limit": 180.0, "magnet_limit": t.magnet_limit_C}
    # every curve and both limits inside the default temperature axis
    low, high = plot.temperature_range
    assert low < min(tr.winding_C + tr.magnet_C + tr.housing_C) and high > max(plot.limits.values())
    # the S2 run of 5 minutes, then as long again at rest
    assert plot.spells == [(0.0, 5.0)] and plot.time[-1] == pytest.approx(10.0)
    assert plot.limit_reached is None  # S2 has a usable state: nothing to mark


def test_the_plot_in_fahrenheit(drill):
    plot = thermal_text.duty_plot(drill[1].thermal, "°F")
    assert plot.limits["insulation_limit"] == pytest.approx(180.0 * 9 / 5 + 32)
    np.testing.assert_allclose(plot.curves["winding_temperature"],
                               np.asarray(drill[1].thermal.transient.winding_C) * 9 / 5 + 32, rtol=1e-12)
    assert thermal_text.temperature_label("°F") == "Temperature [°F]"


def test_s3_spells_are_the_loaded_share_of_each_cycle(drill_s3):
    t = drill_s3[1].thermal
    spells = thermal_text.duty_plot(t).spells
    assert len(spells) == round(t.transient.time_s[-1] / 600.0)
    for index, (start, end) in enumerate(spells):
        assert (start, end) == pytest.approx((10.0 * index, 10.0 * index + 4.0))
    assert thermal_text.duty_words(t) == "S3: loaded 40% of every 10 min cycle"


def test_s1_shades_nothing_and_has_its_steady_state_in_words(ferrite):
    t = ferrite[1].thermal
    assert thermal_text.duty_plot(t).spells == []
    notes = " ".join(thermal_text.chart_notes(t))
    assert f"Winding {t.winding_temperature_C:.0f} °C at the steady state, within its class limit of 130 °C" in notes
    assert "No usable steady state" not in notes


def test_without_a_steady_state_the_chart_marks_and_says_the_time_to_the_limit(drill_s1):
    t = drill_s1[1].thermal
    assert not t.steady_state_exists and t.time_to_limit_s is not None
    plot = thermal_text.duty_plot(t)
    assert plot.limit_reached == pytest.approx((t.time_to_limit_s / 60.0, 180.0))
    # the marked moment is where the plotted winding curve crosses the limit
    crossing = np.interp(180.0, plot.curves["winding_temperature"][:60], plot.time[:60])
    assert crossing == pytest.approx(t.time_to_limit_s / 60.0, rel=0.02)
    notes = thermal_text.chart_notes(t)
    assert notes[0].startswith("No usable steady state at the rated load (S1)")
    minutes = f"{t.time_to_limit_s / 60.0:.1f} min"
    assert f"The winding reaches its class limit (180 °C) after {minutes} from ambient" in notes[1]


def test_the_duty_note_says_when_continuous_running_would_pass_the_limit(drill):
    notes = thermal_text.chart_notes(drill[1].thermal)
    assert notes[0].startswith("Winding 164 °C at the end of the run, within its class limit of 180 °C")
    assert "Run on continuously (S1) at this load, the winding would have no steady state" in notes[-1]


# ----------------------------------------------------------------------------------------------
# Stall times in words


def test_a_stall_time_of_none_is_said_in_words(drill, ferrite):
    r = drill[1]
    assert r.ratings.stall_time_hot_s == 0.0
    text = thermal_text.stall_time_text(r, "ratings.stall_time_hot_s")
    assert text == ("no stall allowed: running on (S1) at the rated load has no steady state below the class "
                    "limit")
    assert "0 s" not in text
    assert thermal_text.stall_time_text(r, "ratings.stall_time_cold_s") == "10 s"
    # an S1 hot state that exists but sits at the class limit
    at_limit = replace(ferrite[1], ratings=replace(ferrite[1].ratings, stall_time_hot_s=0.0))
    assert thermal_text.stall_time_text(at_limit, "ratings.stall_time_hot_s") == (
        "no stall allowed: the S1 hot state is already at the class limit")
    never = replace(ferrite[1], ratings=replace(ferrite[1].ratings, stall_time_cold_s=None))
    assert thermal_text.stall_time_text(never, "ratings.stall_time_cold_s") == "never reaches the class limit"
    assert thermal_text.stall_time_text(ferrite[1], "ratings.stall_time_hot_s") == "4.0 s"


def test_summary_and_datasheet_say_it_in_words(drill):
    r = drill[1]
    summary = summary_text(r)
    assert "no stall allowed: running on (S1) at the rated load has no steady state below the class limit" in summary
    assert "from hot (S1)" in summary and " 0 s" not in summary.split("Permitted stall time from hot")[1][:40]
    table = content.ratings_table(r)
    rows = {row.cells[0]: row.cells[1] for row in table.rows}
    assert rows["Permitted stall time from hot (S1)"] == "no stall allowed"
    assert rows["Permitted stall time from cold"] == "10 s"
    # the sentences are too wide for a cell: the caption gives them (the drill has no continuous rating either)
    assert table.caption.endswith("Permitted stall time from hot (S1): no stall allowed: running on (S1) at the "
                                  "rated load has no steady state below the class limit.")


# ----------------------------------------------------------------------------------------------
# On paper


def test_the_paper_chart_draws_the_plot(drill_s1):
    r = drill_s1[1]
    panel = charts.thermal_panel(r)
    plot = thermal_text.duty_plot(r.thermal)
    drawn = {s.line: s for s in panel.series}
    for line in ("winding_temperature", "magnet_temperature", "housing_temperature"):
        np.testing.assert_allclose(drawn[line].y, plot.curves[line])
        np.testing.assert_allclose(drawn[line].x, plot.time)
        assert drawn[line].colour.name() == LINES[line].colour
    assert list(drawn["insulation_limit"].y) == [180.0, 180.0]
    assert list(drawn["magnet_limit"].y) == [r.thermal.magnet_limit_C] * 2
    mark = next(m for m in panel.markers if m.point == "class_limit_reached")
    assert (mark.x, mark.y) == pytest.approx(plot.limit_reached)
    assert mark.colour.name() == POINTS["class_limit_reached"].colour
    assert mark.label == f"{r.thermal.time_to_limit_s / 60.0:.1f} min"
    assert panel.title == "Temperatures over the duty (S1: continuous running) at the rated load, 50 °C ambient"
    assert panel.x_label == "Time from the start at ambient [min]" and panel.left_label == "Temperature [°C]"
    legend = [item.text for row in charts.thermal_legend(r) for item in row]
    assert "insulation class limit, class 180 (H): 180 °C" in legend
    assert POINTS["class_limit_reached"].title in legend


def test_the_paper_chart_shades_the_run_and_prints_in_fahrenheit(drill):
    r = drill[1]
    panel = charts.thermal_panel(r)
    assert panel.bands == [(0.0, 5.0, "loaded")]
    assert REGIONS["loaded"].title in [item.text for row in charts.thermal_legend(r) for item in row]
    with printed_in("US customary"):
        us = charts.thermal_panel(r)
    assert us.left_label == "Temperature [°F]"
    assert next(s for s in us.series if s.line == "insulation_limit").y[0] == pytest.approx(356.0)


def test_the_datasheet_places_the_chart_with_its_notes(drill_s1):
    design, r = drill_s1
    sheet = content.build(design, r)
    section = next(s for s in sheet.sections if s.key == "thermal_chart")
    chart = section.blocks[0]
    assert chart.name == "thermal" and "thermal" in charts.SHEET_DRAWINGS
    assert "No usable steady state at the rated load (S1)" in chart.caption
    assert f"after {r.thermal.time_to_limit_s / 60.0:.1f} min from ambient" in chart.caption
    from pmdc_sizer.app.datasheet import ensure_qt

    ensure_qt()
    image = charts.chart_image("thermal", r, 800)
    assert image.width() == 800 and image.height() == round(800 * charts.THERMAL_ASPECT)
    buffer = np.frombuffer(image.constBits(), dtype=np.uint8).reshape(image.height(), image.bytesPerLine())
    assert float(np.mean(buffer < 200)) > 0.01  # something is drawn
    svg = charts.chart_svg("thermal", r)
    for text in ("Temperature [°C]", "Time from the start at ambient [min]", "winding", "magnets", "housing",
                 "insulation class limit, class 180 (H): 180 °C", POINTS["class_limit_reached"].title):
        assert text in svg, text


def test_no_continuous_rating_is_said_in_words_on_screen_paper_and_terminal(drill, ferrite):
    # The drill's winding reaches its class limit with no load on the shaft: no S1 rating, not "0 mN·m".
    r = drill[1]
    assert r.ratings.continuous_torque_N_m == 0.0
    words = thermal_text.no_continuous_rating(r)
    assert words == "none: at no load the winding already reaches its class limit (180 °C) at 50 °C ambient"
    table = content.ratings_table(r)
    rows = {row.cells[0]: row.cells[1] for row in table.rows}
    assert rows["Continuous torque (S1), hot ambient"] == "none"  # and why, in the caption: a cell is too narrow
    assert table.caption.startswith(f"Continuous torque (S1), hot ambient: {words}.")
    assert "Continuous current (S1), hot ambient" not in rows
    assert words in summary_text(r)
    assert thermal_text.no_continuous_rating(ferrite[1]) is None


def test_a_housing_line_under_the_magnets_line_is_said(ferrite):
    t = ferrite[1].thermal
    tr = t.transient
    apart = float(np.max(np.abs(np.asarray(tr.housing_C) - np.asarray(tr.magnet_C))))
    assert apart < thermal_text.HIDDEN_LINE_K  # the demo's magnets run 0.27 K above the housing
    notes = " ".join(thermal_text.chart_notes(t))
    assert f"The housing stays within {apart:.1f} K of the magnets" in notes
    assert f"within {1.8 * apart:.1f} °F" in " ".join(thermal_text.chart_notes(t, "°F"))
    # a magnet well above its housing (a rotor heating it, say) is drawn apart and not remarked on
    warmer = replace(tr, magnet_C=np.asarray(tr.magnet_C) + 5.0)
    assert "housing stays within" not in " ".join(thermal_text.chart_notes(replace(t, transient=warmer)))
