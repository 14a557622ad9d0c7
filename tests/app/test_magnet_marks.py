"""What the magnet chart marks (app.magnet_marks), on the demos' own results: every case and fault at its
worst segment, numbered as the datasheet numbers it; the mean and the segments; the load line shifted by
the armature reaction; labels clear of marks, curves and each other."""

from __future__ import annotations

import math

import numpy as np
import pytest

from pmdc_sizer.app import magnet_marks
from pmdc_sizer.app.figures import POINTS
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.library import magnet_grade
from pmdc_sizer.core.magnets import flux_density
from tests.conftest import DEMO_FOLDER

DRILL = DEMO_FOLDER / "power_tool_4pole_48v.toml"  # drive-limited; without the drive three faults pass the knee


@pytest.fixture(scope="module")
def drill():
    return evaluate(project_file.load(DRILL))


def test_every_case_and_fault_is_marked_at_its_worst_segment_and_numbered_as_on_the_sheet(drill):
    marks = magnet_marks.case_marks(drill)
    cases, faults = drill.demagnetization.cases, drill.faults.cases
    assert [m.label for m in marks] == [str(i + 1) for i in range(len(cases))] + [f"F{i + 1}" for i in
                                                                                  range(len(faults))]
    assert [m.case for m in marks] == [*cases, *faults]
    for mark in marks:
        fields = mark.case.segment_field_A_per_m
        assert len(fields) >= 5
        # The mark is the case's verdict: the mean field over the most-demagnetized 5 % of the magnet's
        # area (core.magnet_field_share), beyond the magnet's mean and near its worst segment, at one
        # of the segments' angles.
        assert mark.worst_field == mark.case.magnet_field_A_per_m
        assert mark.worst_field < mark.case.mean_field_A_per_m
        assert abs(mark.worst_field - fields.min()) < 0.25 * abs(fields.min())
        assert np.isclose(mark.case.segment_angle_rad, mark.case.worst_angle_rad).any()
        state = "fails" if not mark.case.ok else ("marginal" if mark.case.status == "marginal" else "safe")
        assert mark.point == ("fault_" if mark.fault else "demagnetization_") + state
        assert POINTS[mark.point].marker == {"safe": "triangle", "marginal": "square", "fails": "cross"}[state]
    # Without its limiter the drill's hot faults and its cold reversal pass the knee (the worst 5 % of the
    # magnet past it), with a share of the magnet past it.
    failed = [m for m in marks if m.point == "fault_fails"]
    assert {m.label for m in failed} == {"F2", "F3", "F4"}
    assert all(0.0 < m.case.magnet_area_past_knee_fraction < 1.0 for m in failed)
    # Armature-current cases are worst at a tip; the rotor-removed ones at the pole centre.
    tip = magnet_marks.worst_spot_text(cases[0])
    assert tip.startswith("+") and "tip" in tip
    assert magnet_marks.worst_spot_text(cases[-1]).startswith("0° (the pole centre)")
    text = failed[0].description()
    assert "F2" in text and "past the knee" in text and "supply applied directly" in text and "°" in text


def test_the_mean_is_the_area_weighted_mean_of_the_segments_and_is_drawn_only_on_the_curve(drill):
    for mark in magnet_marks.case_marks(drill):
        share = mark.case.segment_area_fraction
        assert share.sum() == pytest.approx(1.0)
        h, b = mark.segments
        mean_h, mean_b = mark.mean
        assert mean_h == pytest.approx(float(np.dot(share, h)))
        assert mean_b == pytest.approx(float(np.dot(share, b)))
        assert h.min() <= mean_h <= h.max()
        # B of every segment is the normal curve's at its field, as the case's B is at the verdict's field
        grade = magnet_grade(drill.magnet.name)
        assert b == pytest.approx(flux_density(grade, h, mark.case.temperature_C))
        assert mark.worst_flux_density == pytest.approx(float(flux_density(grade, mark.worst_field,
                                                                           mark.case.temperature_C)))
        assert mark.mean_on_curve == (mark.case.magnet_area_past_knee_fraction == 0.0)
    assert any(not m.mean_on_curve for m in magnet_marks.case_marks(drill))


@pytest.mark.parametrize("demo", ["appliance_ferrite_12v", "mobility_ndfeb_24v", "power_tool_4pole_48v"])
def test_the_shifted_load_line_is_the_no_load_line_moved_through_the_worst_spot(demo):
    results = evaluate(project_file.load(DEMO_FOLDER / f"{demo}.toml"))
    line = magnet_marks.shifted_load_line(results)
    carrying = [c for c in results.demagnetization.cases if c.current_A > 0]
    assert line.mark.case is min(carrying, key=lambda c: c.margin_A_per_m)
    chart = next(c for c in results.magnet_chart if c.name == line.temperature_case)
    assert chart.curves.temperature_C == pytest.approx(line.mark.case.temperature_C)
    # Parallel to the no-load load line (the origin through the no-load point) ...
    assert line.slope_T_per_A_per_m == pytest.approx(chart.operating_flux_density_T / chart.operating_field_A_per_m)
    h, b = line.points()
    assert (b[1] - b[0]) / (h[1] - h[0]) == pytest.approx(line.slope_T_per_A_per_m)
    # ... moved left along H (the armature opposes the magnet) until it meets the worst spot.
    assert line.shift_A_per_m < 0.0
    at_worst = line.slope_T_per_A_per_m * (line.mark.worst_field - line.shift_A_per_m)
    assert at_worst == pytest.approx(line.mark.worst_flux_density)
    assert b[0] == 0.0 and b[1] == pytest.approx(chart.curves.remanence)
    assert f"case {line.mark.label}" in line.title() and "kA/m" in line.title(short=True)


def test_coincident_cases_share_one_label_and_the_least_margin_is_named(drill):
    marks = magnet_marks.case_marks(drill)
    least = magnet_marks.least_margin_mark(marks)
    assert least.name == drill.demagnetization.worst_case
    texts = {magnet_marks.group_label(label, members, least) for label, members in magnet_marks.grouped(marks)}
    # stall, reversal and the drive's limit are one current at each temperature: one mark each
    assert {"1,2,3", "4,5,6 least margin", "7", "8", "F2 FAILS", "F3 FAILS", "F4 FAILS"} <= texts


def test_marks_far_below_zero_are_drawn_at_the_floor(drill):
    marks = magnet_marks.case_marks(drill)
    floor, bottom = magnet_marks.chart_floor(drill, marks)
    top = max(c.curves.remanence for c in drill.magnet_chart)
    lowest_knee = min(c.curves.knee_flux_density for c in drill.magnet_chart)
    assert floor == pytest.approx(min(-magnet_marks.FLOOR_SHARE_OF_BR * top, lowest_knee))
    assert bottom < floor
    below = [m for m in marks if m.worst_flux_density < floor]
    assert below and all(magnet_marks.on_scale(m.worst_flux_density, floor) == (floor, True) for m in below)
    assert magnet_marks.on_scale(0.5, floor) == (0.5, False)


def _inside(box, points) -> int:
    return int(np.count_nonzero((points[:, 0] >= box[0]) & (points[:, 0] <= box[2])
                                & (points[:, 1] >= box[1]) & (points[:, 1] <= box[3])))


def test_labels_keep_off_curves_marks_and_each_other():
    bounds = (0.0, 0.0, 400.0, 300.0)
    # A curve straight through the anchors, both ways: the labels must sit beside it, not on it.
    curves = [np.array([[0.0, 150.0], [400.0, 150.0]]), np.array([[200.0, 0.0], [200.0, 300.0]])]
    anchors = [(200.0, 150.0), (200.0, 150.0), (205.0, 150.0)]
    sizes = [(40.0, 14.0), (60.0, 14.0), (30.0, 14.0)]
    marks = [(x - 6, y - 6, x + 6, y + 6) for x, y in anchors]
    boxes = magnet_marks.place_labels(anchors, sizes, marks, curves, bounds, 8.0)
    dense = np.concatenate([magnet_marks._resampled(c, 1.0) for c in curves])
    for index, box in enumerate(boxes):
        assert box[2] - box[0] == pytest.approx(sizes[index][0])
        assert bounds[0] <= box[0] and box[2] <= bounds[2] and bounds[1] <= box[1] and box[3] <= bounds[3]
        assert _inside(box, dense) == 0
        assert all(magnet_marks._overlap(box, m) == 0.0 for m in marks)
        assert all(magnet_marks._overlap(box, other) == 0.0 for other in boxes[:index])
    # Close to its mark when it can be: the first label sits at the nearest free corner.
    assert math.dist(anchors[0], ((boxes[0][0] + boxes[0][2]) / 2, (boxes[0][1] + boxes[0][3]) / 2)) < 40.0
    # A label that had to move off gets a leader; one beside its mark does not.
    assert magnet_marks.leader(anchors[0], boxes[0], 8.0) is None
    assert magnet_marks.leader((0.0, 0.0), (100.0, 100.0, 120.0, 110.0), 8.0) is not None
