"""The operating envelope a drive's current limit leaves of each curve."""

from __future__ import annotations

import pytest

from pmdc_sizer.core import project as pf
from pmdc_sizer.core.evaluate import evaluate


@pytest.mark.parametrize("path", ["demo_projects/power_tool_4pole_48v.toml", "demo_projects/mobility_ndfeb_24v.toml"])
def test_limited_envelope_stays_inside_the_limit(path):
    r = evaluate(pf.load(path))
    for case in r.cases:
        e = case.envelope
        assert e is not None and e.limited
        assert e.torque_limit_N_m == case.current_limit_torque_N_m < case.stall_torque_N_m
        assert e.max_output_power_W <= case.max_output_power_W + 1e-9
        assert e.max_power_torque_N_m <= e.torque_limit_N_m + 1e-12
        # the charts end a little past the limit, never past the stall
        assert e.torque_limit_N_m < e.chart_torque_max_N_m <= case.stall_torque_N_m


def test_without_a_limit_the_envelope_is_the_whole_curve(ferrite_demo):
    r = evaluate(pf.load(ferrite_demo))
    e = r.nominal.envelope
    assert not e.limited
    assert e.torque_limit_N_m == r.nominal.stall_torque_N_m
    assert e.max_output_power_W == r.nominal.max_output_power_W
