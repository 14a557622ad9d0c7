"""The magnet page as drawn: every case and fault at its worst segment, numbered as the datasheet numbers
it, the segments and means, the load line shifted by the armature reaction, a key that says what Pc is
and sits off the plot, labels that do not overlap; the same marks as on paper."""

from __future__ import annotations

import numpy as np
import pytest
from PySide6.QtCore import QPoint

from pmdc_sizer.app import magnet_marks
from pmdc_sizer.app.datasheet import charts as paper
from pmdc_sizer.app.figures import POINTS, figure
from tests.conftest import DEMO_FOLDER

from .waits import WAIT_MS

pytest.importorskip("pyqtgraph")

DRILL = DEMO_FOLDER / "power_tool_4pole_48v.toml"
FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"


def _spots(scatter) -> dict[str, tuple[float, float]]:
    return {spot.data()[1]: (spot.pos().x(), spot.pos().y()) for spot in scatter.points()}


@pytest.fixture
def drill(open_window, qtbot):
    window = open_window(DRILL)
    window.resize(1600, 1000)
    chart = window.magnet_chart
    qtbot.waitUntil(lambda: bool(chart.label_texts()), timeout=WAIT_MS)
    return window, chart, window.current_results


def test_every_case_and_fault_is_drawn_at_its_worst_segment(drill):
    _window, chart, results = drill
    marks = magnet_marks.case_marks(results)
    floor, _bottom = magnet_marks.chart_floor(results, marks)
    assert len(marks) == len(results.demagnetization.cases) + len(results.faults.cases)
    for mark in marks:
        drawn = _spots(chart.case_items[mark.point])
        assert drawn[mark.name] == pytest.approx((mark.worst_field / 1e3, max(mark.worst_flux_density, floor)))
        # Its tooltip says where on the arc the worst segment is, and how much of the magnet is past the knee.
        tip = chart._tip(0, 0, (mark.point, mark.name))
        assert magnet_marks.angle_text(mark.case) in tip and "past the knee" in tip
    assert set(_spots(chart.case_items["fault_fails"])) == {
        "reversal, direct supply, cold", "stall, direct supply, hot", "reversal, direct supply, hot"}
    # The other segments of each group of coincident cases, and the means where they lie on the curve.
    groups = magnet_marks.grouped(marks)
    segments = chart.segment_item.points()
    assert len(segments) == sum(int(np.count_nonzero((m[0].segments[0] <= 0) & (m[0].segments[1] >= floor)))
                                for _label, m in groups)
    seg_h = sorted(round(s.pos().x(), 6) for s in segments if s.data()[1] == "stall, direct supply, cold")
    h, b = next(m for m in marks if m.name == "stall, direct supply, cold").segments
    assert seg_h == sorted(round(x, 6) for x in h[(h <= 0) & (b >= floor)] / 1e3)
    means = _spots(chart.mean_item)
    for _label, members in groups:
        if members[0].mean_on_curve:
            assert means[members[0].name] == pytest.approx((members[0].mean[0] / 1e3, members[0].mean[1]))
        else:
            assert members[0].name not in means


def test_cases_are_numbered_as_on_the_datasheet_in_the_chart_and_the_table(drill):
    _window, chart, results = drill
    texts = chart.label_texts()
    assert {"1,2,3", "4,5,6 least margin", "7", "8"} <= set(texts)
    assert {"F2 FAILS ↓", "F3 FAILS ↓", "F4 FAILS ↓"} <= set(texts)
    printed = {m.label for m in paper.magnet_panel(results).markers if m.label}
    assert set(texts) == printed
    numbers = [chart.table.item(row, 0).text().split()[0] for row in range(chart.table.rowCount())]
    assert sorted(numbers) == sorted([str(i + 1) for i in range(8)] + ["F1", "F2", "F3", "F4"])
    state = chart.table.columnCount() - 1
    failed = [chart.table.item(row, state).text() for row in range(chart.table.rowCount())
              if chart.table.item(row, 0).text().startswith(("F2", "F3", "F4"))]
    assert failed == ["PAST THE KNEE", "PAST THE KNEE", "PAST THE KNEE"]


def test_labels_do_not_overlap_and_the_key_sits_off_the_plot(drill, qtbot):
    window, chart, results = drill
    for size in ((1366, 768), (1920, 1080)):
        window.resize(*size)
        qtbot.wait(50)
        labels = [label for label in chart.case_labels if label.isVisible()]
        rects = [label.sceneBoundingRect() for label in labels]
        for index, rect in enumerate(rects):
            assert chart.plot.getPlotItem().getViewBox().sceneBoundingRect().adjusted(-2, -2, 2, 2).contains(rect)
            for other in rects[:index]:
                overlap = rect.intersected(other)
                assert overlap.width() * overlap.height() < 4.0, (labels[index].textItem.toPlainText(), size)
        # The key (and with it the Pc note) is above the plot, so it can hide no label.
        assert chart.key.geometry().bottom() <= chart.plot.mapTo(chart, QPoint(0, 0)).y()
    key = chart.key.text()
    cold_pc = figure("magnet_chart_case.permeance_coefficient").text(
        next(c for c in results.magnet_chart if c.name == "cold").permeance_coefficient)
    assert f"Pc {cold_pc}" in key and "iron" in key and "temperature" in key  # the cold curve's own Pc
    assert magnet_marks.PC_NOTE.split(":")[0] in chart.key.toolTip()
    assert "shifted load line, case 4" in key


def test_the_shifted_load_line_is_drawn_as_on_paper(drill):
    _window, chart, results = drill
    h, b = chart.shifted_line_points()
    printed = next(s for s in paper.magnet_panel(results).series if s.line == "shifted_load_line")
    np.testing.assert_allclose(h, printed.x)
    np.testing.assert_allclose(b, printed.y)
    line = magnet_marks.shifted_load_line(results)
    assert h[0] == pytest.approx(line.shift_A_per_m / 1e3) and b[0] == 0.0
    assert chart.shifted_line.opts["pen"].color().name() == paper.case_colour(line.temperature_case).name()


def test_a_magnet_past_the_knee_is_drawn_and_named(open_window, qtbot):
    window = open_window(FERRITE)
    assert window.model.propose("magnets.thickness_mm", 2.0, final=True)
    qtbot.waitUntil(lambda: window.current_results is not None and not window.evaluator.busy
                    and window.current_results.geometry.magnet_thickness_m == pytest.approx(2e-3), timeout=WAIT_MS)
    chart = window.magnet_chart
    results = window.current_results
    failed = [c for c in results.demagnetization.cases if not c.ok]
    assert failed
    assert {c.name for c in failed} <= set(_spots(chart.case_items["demagnetization_fails"]))
    qtbot.waitUntil(lambda: any("FAILS" in text for text in chart.label_texts()), timeout=WAIT_MS)
    assert POINTS["demagnetization_fails"].colour in chart.headline.text()
