"""``pmdc-sizer compare``: exit codes, the JSON's keys, and the table."""

from __future__ import annotations

import json

import pytest

from pmdc_sizer.app.cli import main
from pmdc_sizer.app.safety import SHORT_CAUTION
from pmdc_sizer.core import difference
from tests.conftest import DEMO_FOLDER

from .command_line import run

FERRITE = str(DEMO_FOLDER / "appliance_ferrite_12v.toml")
NDFEB = str(DEMO_FOLDER / "mobility_ndfeb_24v.toml")


def leaves(node):
    return [value for _, value in difference.flatten(node)]


def test_two_files_as_json_hold_a_b_and_their_difference(capsys):
    status, out, err = run(capsys, "compare", FERRITE, NDFEB, "--json")
    assert status == 0 and err == ""
    data = json.loads(out)
    assert {"a", "b", "difference", "relative_difference"} <= data.keys() and "refit" not in data
    assert data["a"]["magnet"]["name"] == "Y40" and data["b"]["magnet"]["name"] == "N35EH"
    # Same keys as the evaluate JSON, B − A, numbers only.
    assert data["difference"]["performance"]["no_load_speed_rpm"] == pytest.approx(
        data["b"]["performance"]["no_load_speed_rpm"] - data["a"]["performance"]["no_load_speed_rpm"])
    assert data["difference"]["constants"].keys() <= data["a"]["constants"].keys()
    assert all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in leaves(data["difference"]))


def test_a_file_against_itself_differs_in_nothing(capsys):
    status, out, _ = run(capsys, "compare", FERRITE, FERRITE, "--json")
    assert status == 0
    assert set(leaves(json.loads(out)["difference"])) == {0}


def test_grade_b_with_refit_reports_the_refit(capsys):
    status, out, err = run(capsys, "compare", FERRITE, "--grade-b", "Y25", "--refit", "stall-torque", "--json")
    assert status == 0 and err == ""
    data = json.loads(out)
    fit = data["refit"]
    for key in ("target", "parameter", "value_before", "value_after", "target_error_fraction"):
        assert key in fit
    assert fit["target"] == "stall-torque" and fit["parameter"] == "armature.stack_length_mm"
    assert fit["value_before"] == 25.0 and fit["value_after"] > 25.0
    assert abs(fit["target_error_fraction"]) < 5e-3
    assert fit["b_after"]["performance"]["stall_torque_N_m"] == pytest.approx(
        data["a"]["performance"]["stall_torque_N_m"], rel=5e-3)
    assert data["b"]["magnet"]["name"] == "Y25"


def test_turns_refit_says_turns_are_whole(capsys):
    status, out, _ = run(capsys, "compare", FERRITE, "--grade-b", "N42", "--refit", "no-load-speed")
    assert status == 0
    assert "turns per coil go from 20 to" in out and "Turns are whole numbers" in out


def test_unreachable_refit_exits_1_with_one_line_and_still_prints(capsys):
    status, out, err = run(capsys, "compare", FERRITE, "--grade-b", "N42", "--refit", "ke", "--json")
    assert status == 1
    assert len(err.strip().splitlines()) == 1 and "thinner than 0.5 mm" in err
    fit = json.loads(out)["refit"]
    assert fit["reached"] is False and fit["value_after"] == 0.5


def test_table_shows_key_figures_checks_and_cautions(capsys):
    status, out, _ = run(capsys, "compare", FERRITE, "--grade-b", "N42")
    assert status == 0
    for text in ("A: ", "B: ", "B − A", "Back-EMF constant Ke [V/krpm]", "Torque constant Kt [mN·m/A]",
                 "No-load speed [rpm]", "Magnet mass [g]", "Speed at rated torque, hot [rpm]", "Checks of A:",
                 "Checks of B:", "FAIL  Demagnetization", SHORT_CAUTION):
        assert text in out


@pytest.mark.parametrize("argv, words", [
    (["compare", FERRITE, "--grade-b", "N4X"], "magnets.grade = 'N4X'"),
    (["compare", FERRITE], "either as a second project file or as --grade-b"),
    (["compare", FERRITE, NDFEB, "--grade-b", "N42"], "either as a second project file or as --grade-b"),
    (["compare", FERRITE, "missing.toml"], "missing.toml: cannot read the file"),
])
def test_bad_input_exits_2_with_one_line(capsys, argv, words):
    status, out, err = run(capsys, *argv)
    assert status == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and words in err


def test_unknown_refit_target_is_refused_by_the_parser(capsys):
    with pytest.raises(SystemExit) as exit_info:
        main(["compare", FERRITE, "--grade-b", "N42", "--refit", "power"])
    assert exit_info.value.code == 2
    assert "invalid choice: 'power'" in capsys.readouterr().err
