"""The datasheet's magnet chart: every case and fault at its worst segment, numbered as in the sheet's
tables, the segments and means, the load line shifted by the armature reaction, a key that says what Pc
is; and labels, as drawn, clear of each other and of the curves."""

from __future__ import annotations

import numpy as np
import pytest

from pmdc_sizer.app import magnet_marks
from pmdc_sizer.app.datasheet import charts
from pmdc_sizer.app.figures import LINES, figure
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.evaluate import evaluate
from tests.conftest import DEMO_FILES, DEMO_FOLDER

CASE_POINTS = ("demagnetization_safe", "demagnetization_marginal", "demagnetization_fails", "fault_safe",
               "fault_marginal", "fault_fails")


@pytest.fixture(scope="module")
def drill():
    return evaluate(project_file.load(DEMO_FOLDER / "power_tool_4pole_48v.toml"))


def test_the_paper_marks_every_case_and_fault_at_its_worst_segment(drill):
    panel = charts.magnet_panel(drill)
    field_unit = "kA/m"
    floor, _bottom = magnet_marks.chart_floor(drill, magnet_marks.case_marks(drill))
    printed = [m for m in panel.markers if m.point in CASE_POINTS]
    # One mark per group of coincident cases, each at the group's worst segment and labelled with its numbers.
    groups = magnet_marks.grouped(magnet_marks.case_marks(drill))
    assert len(printed) == len(groups)
    by_case = {m.case: m for m in printed}
    for label, members in groups:
        mark = by_case[members[0].name]
        assert mark.label.startswith(label)
        assert mark.x == pytest.approx(members[0].worst_field / 1e3)
        assert mark.y == pytest.approx(max(members[0].worst_flux_density, floor))
        assert mark.point == members[0].point
    labels = {m.label for m in printed}
    assert {"1,2,3", "4,5,6 least margin", "7", "8"} <= labels
    assert any(text.startswith("F3 FAILS") for text in labels) and any(text.startswith("F1") for text in labels)
    assert {m.point for m in printed} == {m.point for m in magnet_marks.case_marks(drill)}
    assert {m.point for m in printed} >= {"demagnetization_safe", "fault_safe", "fault_fails"}
    # The segments of every group (those in the second quadrant and above the floor) and the means on the curve.
    segments = [m for m in panel.markers if m.point == "magnet_segment"]
    expected = sum(int(np.count_nonzero((members[0].segments[0] <= 0) & (members[0].segments[1] >= floor)))
                   for _label, members in groups)
    assert len(segments) == expected > 0
    means = [m for m in panel.markers if m.point == "magnet_mean"]
    assert len(means) == sum(members[0].mean_on_curve for _label, members in groups)
    # The shifted load line: from B = 0 at the armature's shift, through the worst case's worst spot.
    line = magnet_marks.shifted_load_line(drill)
    shifted = [s for s in panel.series if s.line == "shifted_load_line"]
    assert len(shifted) == 1
    assert shifted[0].x[0] == pytest.approx(line.shift_A_per_m / 1e3)
    slope = (shifted[0].y[1] - shifted[0].y[0]) / (shifted[0].x[1] - shifted[0].x[0])
    assert slope * (line.mark.worst_field / 1e3 - shifted[0].x[0]) == pytest.approx(line.mark.worst_flux_density)
    assert field_unit in panel.x_label


def test_the_key_names_the_faults_the_shifted_line_and_what_pc_is(drill):
    texts = [item.text for row in charts.magnet_legend(drill) for item in row]
    joined = " ".join(texts)
    cold_pc = figure("magnet_chart_case.permeance_coefficient").text(
        next(c for c in drill.magnet_chart if c.name == "cold").permeance_coefficient)
    assert f"cold (magnet -10 °C, Pc {cold_pc})" in texts  # the cold curve's own Pc, from the results
    assert "iron" in joined and "temperature" in joined
    assert magnet_marks.shifted_load_line(drill).title(short=True) in texts
    assert "F1" in joined and "supply applied directly" in joined and "worst 5 %" in joined
    assert any(text == LINES["shifted_load_line"].key_text + ", case 4 (-141 kA/m)" for text in texts)


@pytest.mark.parametrize("path", DEMO_FILES, ids=[p.stem for p in DEMO_FILES])
def test_printed_labels_clear_each_other_and_the_curves(path, monkeypatch, qapp):
    results = evaluate(project_file.load(path))
    placed = []
    place = magnet_marks.place_labels

    def recording(anchors, sizes, marks, curves, bounds, gap):
        boxes = place(anchors, sizes, marks, curves, bounds, gap)
        placed.append((boxes, curves, bounds))
        return boxes

    monkeypatch.setattr(magnet_marks, "place_labels", recording)
    charts.chart_png("magnet", results, 1200)
    boxes, curves, bounds = placed[-1]
    assert len(boxes) == len(magnet_marks.grouped(magnet_marks.case_marks(results)))
    dense = np.concatenate([magnet_marks._resampled(np.asarray(c), 1.0) for c in curves])
    for index, box in enumerate(boxes):
        assert bounds[0] <= box[0] and box[2] <= bounds[2] and bounds[1] <= box[1] and box[3] <= bounds[3]
        assert all(magnet_marks._overlap(box, other) == 0.0 for other in boxes[:index])
        crossed = np.count_nonzero((dense[:, 0] > box[0] + 1) & (dense[:, 0] < box[2] - 1)
                                   & (dense[:, 1] > box[1] + 1) & (dense[:, 1] < box[3] - 1))
        assert crossed == 0, f"label {index} of {path.stem} sits on a curve"


def test_the_tables_number_the_cases_and_faults_as_the_chart_labels_them(drill):
    from pmdc_sizer.app.datasheet import content

    marks = magnet_marks.case_marks(drill)
    design = content.demagnetization_table(drill)
    faults = content.fault_table(drill)
    assert design.header[0] == faults.header[0] == "No."
    assert [row.cells[0] for row in design.rows] == [m.label for m in marks if not m.fault]
    assert [row.cells[0] for row in faults.rows] == [m.label for m in marks if m.fault] == ["F1", "F2", "F3", "F4"]
    assert [row.cells[1] for row in faults.rows] == [case.name for case in drill.faults.cases]
    assert len(faults.widths) == len(faults.header) and sum(faults.widths) == 100
    # The caption says what the model takes: the worst spot along the arc, not a tip.
    assert "worst spot" in design.caption and "tip" not in design.caption
