"""The performance chart's default view (app/performance_view.py) and the paper chart that uses it.

With a drive limit the view frames the drive-limited region: the torque axis ends a margin past the torque
at the limit, and the current and power axes are as tall as the curves there, not as the unlimited stall;
the region beyond the limit stays in view, shaded. Without a limit the view runs to the stall.
"""

from __future__ import annotations

import numpy as np
import pytest

from pmdc_sizer.app import performance_view
from pmdc_sizer.app.datasheet import charts
from pmdc_sizer.app.figures import CURVE_QUANTITIES
from pmdc_sizer.core import project
from pmdc_sizer.core.envelope import CHART_MARGIN
from pmdc_sizer.core.evaluate import evaluate
from tests.conftest import DEMO_FOLDER


@pytest.fixture(scope="module", params=["power_tool_4pole_48v", "mobility_ndfeb_24v"])
def limited(request):
    return evaluate(project.load(DEMO_FOLDER / f"{request.param}.toml"))


@pytest.fixture(scope="module")
def ferrite():
    return evaluate(project.load(DEMO_FOLDER / "appliance_ferrite_12v.toml"))


def test_the_torque_axis_ends_a_margin_past_the_limit(limited):
    r = limited
    end = performance_view.torque_end(r)
    limit_torques = [c.current_limit_torque_N_m for c in r.cases]
    assert end == pytest.approx((1.0 + CHART_MARGIN) * max(limit_torques), rel=1e-9)
    assert end < 0.4 * min(c.stall_torque_N_m for c in r.cases)  # far from the unlimited stall


def test_the_current_axis_is_as_tall_as_the_curves_in_view(limited):
    r = limited
    end = performance_view.torque_end(r)
    top = performance_view.axis_top(r, "current_A", end)
    highest = max(float(np.interp(end, c.curve.torque_N_m, c.curve.current_A)) for c in r.cases)
    assert top == pytest.approx(1.02 * highest, rel=1e-6)
    assert r.current_limit_A < top < 2.0 * r.current_limit_A  # the limit line inside, near the top
    assert top < 0.4 * min(c.stall_current_A for c in r.cases)  # not the unlimited stall current
    power = performance_view.axis_top(r, "output_power_W", end)
    assert power < 0.7 * max(c.max_output_power_W for c in r.cases)  # not the unlimited maximum
    assert power > max(c.envelope.max_output_power_W for c in r.cases)  # the drive's best power in view


def test_without_a_limit_the_view_is_the_whole_curve(ferrite):
    r = ferrite
    assert performance_view.torque_end(r) == max(c.stall_torque_N_m for c in r.cases)
    top = performance_view.axis_top(r, "current_A", performance_view.torque_end(r))
    assert top == pytest.approx(1.02 * max(c.stall_current_A for c in r.cases), rel=1e-3)
    assert performance_view.axis_top(r, "speed_rad_per_s", 1.0) == pytest.approx(
        1.02 * max(c.no_load_speed_rad_per_s for c in r.cases))
    assert performance_view.axis_top(r, "efficiency", 1.0) == 1.0


def test_the_paper_panels_frame_the_limited_region_with_the_shade_in_view(limited):
    r = limited
    panels = dict(zip(CURVE_QUANTITIES, charts.performance_panels(r), strict=True))
    current = panels["current_A"]
    assert r.current_limit_A < current.left_range[1] <= 2.0 * r.current_limit_A
    for name in ("speed_rad_per_s", "current_A", "output_power_W"):  # the efficiency's panel: the working range
        panel = panels[name]
        # the limit's torque and the shaded region beyond it are inside the torque axis
        assert panel.shaded_from is not None and panel.x_range[0] < panel.shaded_from < panel.x_range[1], name
        assert panel.x_range[1] < 0.4 * min(c.stall_torque_N_m for c in r.cases), name
    # every curve stays inside its panel up to the axis's end: no curve is cut at the top
    for name in ("current_A", "output_power_W"):
        panel = panels[name]
        for series in panel.series:
            if series.line.startswith("case:"):
                inside = series.x <= panel.x_range[1]
                assert float(np.max(series.y[inside])) <= panel.left_range[1] * (1 + 1e-9), (name, series.line)
