"""``pmdc-sizer tolerance``: the summary, the JSON groups, the per-motor CSV, and bad input refused with exit 2."""

from __future__ import annotations

import csv
import json
from pathlib import Path

import pytest

from pmdc_sizer.app.figures import DATASHEET_TOLERANCE_FIGURES, TOLERANCE_FIGURES
from pmdc_sizer.core import project
from pmdc_sizer.core.tolerance_study import KEY_FIGURES, run_study

from .command_line import run

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"
MOTORS = "12"  #: enough to exercise every path; the statistics are tested in tests/core/test_tolerances.py


def test_every_key_figure_has_a_title_and_the_datasheet_takes_the_customers_five():
    assert tuple(TOLERANCE_FIGURES) == KEY_FIGURES
    assert DATASHEET_TOLERANCE_FIGURES == ("nominal.no_load_speed_rad_per_s", "nominal.no_load_current_A",
                                           "nominal.ke_V_s_per_rad", "nominal.terminal_resistance_ohm",
                                           "nominal.stall_torque_N_m")


def test_json_has_the_groups_the_issue_names(capsys):
    status, out, err = run(capsys, "tolerance", FERRITE, "--samples", MOTORS, "--seed", "4", "--json")
    assert status == 0, err
    data = json.loads(out)
    assert data["samples"] == 12 and data["seed"] == 4
    assert set(data["figures"]) == set(KEY_FIGURES)
    ke = data["figures"]["nominal.ke_V_s_per_rad"]
    assert ke["low"] <= ke["typical"] <= ke["high"]
    assert 0.0 <= data["yield_fraction"] <= 1.0
    margins = data["figures"]["worst_demagnetization_margin_A_per_m"]
    assert data["worst_demagnetization_margin_A_per_m"] <= margins["low"]
    assert data["failed_samples"] == 0 and data["failure_messages"] == {}
    # 12 motors are too few for RBD-FAST's ten harmonics: no ranking rather than a noisy one
    assert data["drivers"] == {name: [] for name in KEY_FIGURES}
    assert data["nominal_failing_checks"] == []  # the ferrite demo meets every check as drawn
    assert "seed 4" in data["basis"]


def test_a_design_that_fails_as_drawn_is_said_to(capsys):
    # two more turns per coil: the ferrite demo then misses its rated speed when cold, before any spread
    status, out, err = run(capsys, "tolerance", FERRITE, "--samples", MOTORS, "--set", "winding.turns_per_coil=22")
    assert status == 0, err
    assert "The design as drawn fails already: Rated load" in out
    status, out, err = run(capsys, "tolerance", FERRITE, "--samples", MOTORS, "--set", "winding.turns_per_coil=22",
                           "--json")
    assert json.loads(out)["nominal_failing_checks"] == ["load"]


def test_summary_and_csv(capsys, tmp_path):
    out_csv = tmp_path / "motors.csv"
    status, out, err = run(capsys, "tolerance", FERRITE, "--samples", MOTORS, "--csv", out_csv)
    assert status == 0, err
    assert "Yield (motors passing every check)" in out and "Back-EMF constant Ke [V/krpm]" in out
    assert "fails already" not in out  # the demo as drawn passes
    assert "only 12 motors" in out  # a small study says its tails are rough
    rows = list(csv.DictReader(out_csv.read_text(encoding="utf-8").splitlines()))
    assert len(rows) == 12
    assert {"remanence_T", "airgap_m", "nominal.ke_V_s_per_rad", "passes_all_checks"} <= set(rows[0])
    # the CSV is the same motors as the study
    study = run_study(project.load(FERRITE), samples=12)
    assert float(rows[3]["airgap_m"]) == pytest.approx(study.parts["airgap_m"][3], rel=1e-8)


@pytest.mark.parametrize(("extra", "says"), [
    (("--samples", "0"), "--samples 0"),
    (("--seed", "-1"), "--seed -1"),
    (("--set", "tolerances.airgap_mm=0.4"), "tolerances.airgap_mm"),
    (("--set", "supply.brush_drop_V=0"), "tolerances.brush_drop_V = 0.2 V"),  # a default that cannot apply
    (("--set", "tolerances.remanence_distribution=flat"), "tolerances.remanence_distribution"),
])
def test_bad_input_is_one_line_and_exit_2(capsys, tmp_path, extra, says):
    out_csv = tmp_path / "never.csv"
    status, _, err = run(capsys, "tolerance", FERRITE, "--samples", MOTORS, "--csv", out_csv, *extra)
    assert status == 2
    assert says in err and len(err.strip().splitlines()) == 1
    assert not out_csv.exists()
