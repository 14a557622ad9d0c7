"""Results as JSON-ready data: unit suffixes, rpm at the edge, no arrays, no NaN."""

from __future__ import annotations

import dataclasses
import json
import math

import numpy as np
from numpy.testing import assert_allclose

from pmdc_sizer.app.results_json import _plain, results_json
from pmdc_sizer.core import project as pf
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.units import from_si


@dataclasses.dataclass(frozen=True)
class _Sample:
    speed_rad_per_s: float
    speed_torque_gradient_rad_per_s_per_N_m: float
    torque_N_m: float
    curve: np.ndarray
    table: np.ndarray
    count: np.int64
    flag: np.bool_
    missing: float
    nested: tuple


def test_plain_renames_speeds_drops_arrays_and_nan():
    sample = _Sample(
        speed_rad_per_s=2.0 * math.pi * 50.0, speed_torque_gradient_rad_per_s_per_N_m=2.0 * math.pi,
        torque_N_m=np.float64(0.25), curve=np.arange(3.0), table=np.ones(2), count=np.int64(7),
        flag=np.bool_(True), missing=float("nan"), nested=({"x": np.float64(1.5)},),
    )
    data = _plain(sample)
    assert set(data) == {"speed_rpm", "speed_torque_gradient_rpm_per_N_m", "torque_N_m", "count", "flag", "missing",
                         "nested"}
    assert data["nested"] == [{"x": 1.5}] and data["count"] == 7 and data["flag"] is True
    assert_allclose(data["speed_rpm"], 3000.0, rtol=1e-14)
    assert_allclose(data["speed_torque_gradient_rpm_per_N_m"], 60.0, rtol=1e-14)
    assert "curve" not in data and "table" not in data
    assert data["missing"] is None
    assert type(data["count"]) is int and type(data["flag"]) is bool and type(data["torque_N_m"]) is float
    json.dumps(data, allow_nan=False)


def test_results_json_layout(ferrite_demo):
    results = evaluate(pf.load(ferrite_demo))
    data = results_json(results)
    text = json.dumps(data, allow_nan=False)  # strict JSON: NaN and infinity are not allowed
    assert json.loads(text) == data
    assert data["performance"] == data["cases"]["nominal"]
    assert set(data["cases"]) == {"cold", "nominal", "hot"}
    assert_allclose(data["cases"]["hot"]["no_load_speed_rpm"], from_si(results.hot.no_load_speed_rad_per_s, "rpm"),
                    rtol=1e-14)
    assert data["warnings"] == results.warnings
    assert [c["key"] for c in data["checks"]] == [c.key for c in results.checks]
    assert all(set(c) == {"key", "title", "status", "message", "advice"} for c in data["checks"])

    def no_rad_per_s(node):
        if isinstance(node, dict):
            for key, value in node.items():
                assert "rad_per_s" not in key, key
                no_rad_per_s(value)
        elif isinstance(node, list):
            for value in node:
                no_rad_per_s(value)

    no_rad_per_s(data)
