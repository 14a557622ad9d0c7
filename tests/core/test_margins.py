"""Required margin to the knee, the three states, and the direct-supply fault cases."""

from __future__ import annotations

from dataclasses import replace

import pytest

from pmdc_sizer.core import checks, margins
from pmdc_sizer.core import project as pf
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.magnets import intrinsic_coercivity_at


@pytest.fixture(scope="module")
def drill():
    return pf.load("demo_projects/power_tool_4pole_48v.toml")


@pytest.fixture(scope="module")
def drill_results(drill):
    return evaluate(drill)


def test_three_states_by_hand():
    assert margins.status_of(-1.0, 10e3) == "past_knee"
    assert margins.status_of(0.0, 10e3) == "past_knee"
    assert margins.status_of(1e3, 10e3) == "marginal"
    assert margins.status_of(10e3, 10e3) == "safe"


def test_one_ka_per_m_is_marginal_under_the_default_required_margin(drill, drill_results):
    # The example: 1.3 kA/m to the knee passed as a green OK. The default, 5 % of HcJ, asks for
    # tens of kA/m of any grade in the library (HcJ ≥ 200 kA/m), so 1 kA/m is marginal.
    grade = design_from_project(drill).magnet
    share = pf.key_spec("magnets.required_margin_pct_of_HcJ").default / 100.0
    case = replace(drill_results.demagnetization.cases[0], margin_A_per_m=1e3, ok=True)
    judged = margins.judged(case, grade, share)
    assert judged.status == "marginal"
    assert judged.required_margin_A_per_m == pytest.approx(
        share * float(intrinsic_coercivity_at(grade, case.temperature_C)), rel=1e-12)


def test_every_case_carries_its_state_and_required_margin(drill_results):
    dm = drill_results.demagnetization
    for case in (*dm.cases, *drill_results.faults.cases):
        assert case.status in ("safe", "marginal", "past_knee")
        assert case.required_margin_A_per_m > 0.0
        assert (case.status == "past_knee") == (not case.ok)
    assert dm.required_margin_A_per_m == max(c.required_margin_A_per_m for c in dm.cases)


def test_faults_are_the_unlimited_stall_and_reversal_cold_and_hot(drill_results, drill):
    faults = drill_results.faults
    assert [c.kind for c in faults.cases] == ["stall", "reversal", "stall", "reversal"]
    assert all("direct supply" in c.name for c in faults.cases)
    # far above the drive's 80 A: the supply's own stall current (V - Vb)/R
    assert min(c.current_A for c in faults.cases) > 10.0 * drill_results.current_limit_A
    # the demo relies on its pack's fuse and reports the faults; the drill reverses, so the default setting
    # would ask the magnets to survive them
    assert not faults.must_survive
    assert evaluate(pf.with_values(drill, {"supply.fault_cases": "must survive if reversing"})).faults.must_survive


def test_removing_the_drills_limit_fails_demagnetization_with_the_margins(drill):
    # with the faults required to be survived again (the default for a reversing motor)
    r = evaluate(pf.with_values(drill, {"supply.current_limit_A": None,
                                        "supply.fault_cases": "must survive if reversing"}))
    stall_cases = [c for c in r.demagnetization.cases if c.kind in ("stall", "reversal")]
    assert any(c.status == "past_knee" for c in stall_cases)
    assert r.faults.status == "past_knee" and not r.faults.ok
    by_key = {c.key: c for c in r.checks}
    assert by_key["demagnetization"].status == "fail" and by_key["fault_demagnetization"].status == "fail"
    worst = min(stall_cases, key=lambda c: c.margin_A_per_m)
    # the verdict names the failing case and by how much, in kA/m
    assert worst.name in by_key["demagnetization"].message
    assert f"{checks._figures(-worst.margin_A_per_m / 1e3)} kA/m beyond" in by_key["demagnetization"].message
    assert "kA/m past the knee" in by_key["fault_demagnetization"].message


def test_faults_only_warn_when_the_project_says_report(drill):
    r = evaluate(pf.with_values(drill, {"supply.fault_cases": "report"}))
    check = next(c for c in r.checks if c.key == "fault_demagnetization")
    assert not r.faults.must_survive
    assert check.status == ("warning" if r.faults.status != "safe" else "pass")


def test_must_survive_follows_reversing():
    assert margins.must_survive_faults("must survive if reversing", True)
    assert not margins.must_survive_faults("must survive if reversing", False)
    assert margins.must_survive_faults("must survive", False)
    assert not margins.must_survive_faults("report", True)
