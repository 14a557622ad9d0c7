"""load.further_points: each point checked at every temperature, evaluate and the batch agreeing."""

from __future__ import annotations

import numpy as np
import pytest

from pmdc_sizer.core import ProjectError, evaluate, parse
from pmdc_sizer.core.batch import check_status, evaluate_many, screening_figures
from pmdc_sizer.core.units import from_si

from ..conftest import DEMO_FOLDER

TEXT = (DEMO_FOLDER / "mobility_ndfeb_24v.toml").read_text(encoding="utf-8")


def _with_points(points: str):
    return parse(TEXT.replace("[load]\n", f"[load]\nfurther_points = {points}\n", 1))


def test_points_met_and_missed_agree_with_the_batch():
    reachable = _with_points("[{ torque_mNm = 50.0, speed_rpm = 2000.0 }, { torque_mNm = 200.0, speed_rpm = 1000.0 }]")
    too_fast = _with_points("[{ torque_mNm = 50.0, speed_rpm = 2000.0 }, { torque_mNm = 50.0, speed_rpm = 9000.0 }]")
    beyond_stall = _with_points("[{ torque_mNm = 90000.0, speed_rpm = 10.0 }]")
    batch = evaluate_many([reachable, too_fast, beyond_stall])
    expected = []
    for index, design in enumerate((reachable, too_fast, beyond_stall)):
        results = evaluate(design)
        check = next(c for c in results.checks if c.key == "load_points")
        expected.append(check.status)
        assert batch.status["load_points"][index] == check_status(results)["load_points"]
        share = screening_figures(results)["load_points.least_speed_share"]
        assert batch.figures["load_points.least_speed_share"][index] == pytest.approx(share, rel=1e-9)
    assert expected == ["pass", "fail", "fail"]
    # the shortfall named in words: the slowest case of the 9000 rpm point
    too_fast_results = evaluate(too_fast)
    slowest = min(from_si(c.further_point_speeds_rad_per_s[1], "rpm") for c in too_fast_results.cases)
    message = next(c for c in too_fast_results.checks if c.key == "load_points").message
    assert "point 2" in message and "9000 rpm" in message and f"{slowest:.0f}"[:3] in message
    assert np.isnan(evaluate(beyond_stall).cases[0].further_point_speeds_rad_per_s[0])
    assert batch.figures["load_points.least_speed_share"][2] == 0.0


def test_without_points_nothing_changes():
    plain = parse(TEXT)
    results = evaluate(plain)
    assert "load_points" not in {c.key for c in results.checks}
    assert all(c.further_point_speeds_rad_per_s == () for c in results.cases)
    assert evaluate_many([plain]).status["load_points"][0] == 0


def test_bad_points_name_the_key():
    with pytest.raises(ProjectError, match=r"load\.further_points\.0\.torque_mNm"):
        _with_points("[{ torque_mNm = -5.0, speed_rpm = 100.0 }]")
    with pytest.raises(ProjectError, match=r"load\.further_points\.0\.speed_rpm: required key is missing"):
        _with_points("[{ torque_mNm = 5.0 }]")
    with pytest.raises(ProjectError, match=r"load\.further_points"):
        _with_points("[]")
