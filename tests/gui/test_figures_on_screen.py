"""Screen and paper draw the same point with the same marker and colour, all from app.figures.

The checks read the objects the chart code builds (the pyqtgraph spots, pens and lines on screen; the
datasheet's Marker and Series objects on paper), not the source text.
"""

from __future__ import annotations

import pytest

from pmdc_sizer.app import figures
from pmdc_sizer.app.datasheet import charts as paper
from pmdc_sizer.app.figures import CASES, CURVE_QUANTITIES, FIGURES, LINES, POINTS, qt_pen_style
from tests.conftest import DEMO_FILES, DEMO_FOLDER

from .waits import WAIT_MS

#: What pyqtgraph's symbol codes draw (its ScatterPlotItem documentation), in app.figures' marker names.
MARKER_OF_SYMBOL = {"o": "circle", "s": "square", "d": "diamond", "t1": "triangle", "+": "plus", "x": "cross",
                    "t": "triangle pointing down", "star": "star", "p": "pentagon", "h": "hexagon"}
NDFEB = DEMO_FOLDER / "mobility_ndfeb_24v.toml"  # its drive limits the current
FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"


def _screen_spots(scatter) -> set[tuple]:
    """(point, case, marker, colour, x, y) of every spot of a pyqtgraph scatter item, as drawn."""
    out = set()
    for spot in scatter.points():
        point, case = spot.data()
        # A filled mark shows its face, a hollow one its outline.
        colour = (spot.brush() if POINTS[point].filled else spot.pen()).color().name()
        out.add((point, case, MARKER_OF_SYMBOL[spot.symbol()], colour, round(spot.pos().x(), 6),
                 round(spot.pos().y(), 6)))
    return out


def _paper_marks(markers, points) -> set[tuple]:
    return {(m.point, m.case, m.shape, m.colour.name(), round(m.x, 6), round(m.y, 6))
            for m in markers if m.point in points}


def _without_position(marks):
    return {mark[:4] for mark in marks}


@pytest.fixture
def scooter(open_window):
    window = open_window(NDFEB)
    return window, window.current_results


def test_performance_points_are_the_same_on_screen_and_paper(scooter):
    window, results = scooter
    chart = window.performance_chart
    assert chart.torque_unit == paper.torque_unit(results)  # SI on screen: the same axes as on paper
    panels = dict(zip(CURVE_QUANTITIES, paper.performance_panels(results), strict=True))
    for attribute in CURVE_QUANTITIES:
        screen = _screen_spots(chart.marks[attribute])
        on_paper = _paper_marks(panels[attribute].markers, ("rated", "best_efficiency", "max_power"))
        assert screen and screen == on_paper, attribute
        for point, case, marker, colour, _x, _y in screen:
            assert marker == POINTS[point].marker and colour == CASES[case].colour
    # The required point, on the speed plot.
    required = chart.required_mark.points()[0]
    paper_required = next(m for m in panels["speed_rad_per_s"].markers if m.point == "required")
    assert MARKER_OF_SYMBOL[required.symbol()] == paper_required.shape == POINTS["required"].marker
    assert required.brush().color().name() == paper_required.colour.name() == POINTS["required"].colour
    assert (required.pos().x(), required.pos().y()) == pytest.approx((paper_required.x, paper_required.y))


def test_curves_and_the_drive_limit_have_the_same_colour_and_dash(scooter):
    window, results = scooter
    chart = window.performance_chart
    panels = paper.performance_panels(results)
    for name, style in CASES.items():
        pen = chart.curves[("speed_rad_per_s", name)].opts["pen"]
        printed = next(s for s in panels[0].series if s.line == f"case:{name}")
        assert pen.color().name() == printed.colour.name() == style.colour
        assert pen.style() == printed.dash == qt_pen_style(style.dash)
    limit = LINES["drive_limit"]
    screen_lines = [*chart.limit_lines, chart.limit_current_line]
    assert all(line.isVisible() for line in screen_lines)
    printed = [s for panel in panels for s in panel.series if s.line == "drive_limit"]
    # The same lines: one per plot at the limit torque, one at the limit current.
    assert len(printed) == len(screen_lines)
    for line in screen_lines:
        assert line.pen.color().name() == limit.colour and line.pen.style() == qt_pen_style(limit.dash)
    for series in printed:
        assert series.colour.name() == limit.colour and series.dash == qt_pen_style(limit.dash)
    current = chart.limit_current_line.value()
    assert current == pytest.approx(results.current_limit_A)
    assert any(list(s.y) == [current, current] for s in printed)


@pytest.mark.parametrize("thickness_mm", [None, 2.0], ids=["safe", "past the knee"])
def test_magnet_chart_points_are_the_same_on_screen_and_paper(open_window, qtbot, thickness_mm):
    window = open_window(FERRITE)
    if thickness_mm is not None:
        assert window.model.propose("magnets.thickness_mm", thickness_mm, final=True)
        qtbot.waitUntil(lambda: window.current_results is not None and not window.evaluator.busy
                        and window.current_results.geometry.magnet_thickness_m == pytest.approx(thickness_mm / 1e3),
                        timeout=WAIT_MS)
    results = window.current_results
    chart = window.magnet_chart
    panel = paper.magnet_panel(results)
    for item, point in ((chart.operating_item, "operating_point"), (chart.knee_item, "knee")):
        screen = _screen_spots(item)
        assert screen == _paper_marks(panel.markers, (point,)), point
        assert len(screen) == (3 if point == "operating_point" else 6)  # knees on B and on J, both charts
    # Demagnetization cases and faults, in each of their states: the paper draws coincident cases as one
    # numbered mark, the screen one mark per case at the same place.
    states = ("demagnetization_safe", "demagnetization_marginal", "demagnetization_fails", "fault_safe",
              "fault_marginal", "fault_fails")
    screen = set().union(*(_screen_spots(chart.case_items[point]) for point in states))
    on_paper = _paper_marks(panel.markers, states)
    assert on_paper <= screen
    assert {(p, m, c) for p, _case, m, c in _without_position(screen)} == \
        {(p, m, c) for p, _case, m, c in _without_position(on_paper)}
    assert len(screen) == len(results.demagnetization.cases) + len(results.faults.cases)
    failing = {mark for mark in screen if mark[0] == "demagnetization_fails"}
    assert bool(failing) == (not results.demagnetization.ok)
    assert all(mark[2] == "cross" and mark[3] == POINTS["demagnetization_fails"].colour for mark in failing)
    marginal = {mark[1] for mark in screen if mark[0] == "demagnetization_marginal"}
    assert marginal == {c.name for c in results.demagnetization.cases if c.status == "marginal"}
    # The magnet's segments and means: the same points, shapes and colours on both.
    for point, item in (("magnet_segment", chart.segment_item), ("magnet_mean", chart.mean_item)):
        assert _screen_spots(item) == _paper_marks(panel.markers, (point,)), point


def test_every_entry_of_the_table_is_shown_somewhere(open_window, qtbot, monkeypatch):
    """Screen, paper, terminal and comparison together read every figure of the table (none is stale)."""
    from pmdc_sizer.app.compare_text import figure_rows
    from pmdc_sizer.app.datasheet import content
    from pmdc_sizer.app.summary import summary_text
    from pmdc_sizer.core import difference

    asked = set()

    class Recording(dict):
        def __getitem__(self, key):
            asked.add(key)
            return super().__getitem__(key)

    monkeypatch.setattr(figures, "FIGURES", Recording(FIGURES))
    for path in DEMO_FILES:  # between them: a drive limit, a plain supply, an S2 duty
        window = open_window(path)
        window.performance_chart.show_cursor(1.0)
        design, results = window.current_project, window.current_results
        summary_text(results)
        content.build(design, results)
        paper.performance_panels(results)
        paper.performance_legend(results)
        paper.magnet_panel(results)
        figure_rows(difference.compare(design, design, results, results))
    assert set(FIGURES) - asked == set()


def test_legends_take_their_text_from_the_table(scooter):
    window, results = scooter
    key = window.performance_chart.key.text()
    legend = [item.text for row in paper.performance_legend(results) for item in row]
    for point in ("rated", "best_efficiency", "max_power", "required"):
        assert POINTS[point].title in key and POINTS[point].title in legend
        assert POINTS[point].glyph in key
    assert LINES["drive_limit"].title in key and any(LINES["drive_limit"].title in text for text in legend)
