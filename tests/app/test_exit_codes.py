"""The command line's promises: 0 done, 1 no solution, 2 bad input in one line, 3 a defect with a crash
report (never a traceback); standard output that cannot be written; the user library reported, not fatal;
``--set KEY=`` removing a key; special output files refused; no display said in one sentence."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest
import tomli_w

from pmdc_sizer.app import cli
from pmdc_sizer.app.cli import display_problem
from pmdc_sizer.core import library

from ..conftest import DEMO_FOLDER
from ..core.test_library import USER_GRADE
from .command_line import run

REPO = Path(__file__).resolve().parents[2]
FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"


def one_error_line(err: str, fragment: str = "") -> str:
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith("pmdc-sizer: error: ") and "Traceback" not in err
    assert fragment in lines[0], lines[0]
    return lines[0]


def run_installed(*argv, env=None, stdout=subprocess.PIPE, **kwargs):
    """The real console entry point in a fresh interpreter."""
    environment = {**os.environ, **(env or {})}
    return subprocess.run([sys.executable, "-m", "pmdc_sizer.app.cli", *map(str, argv)], stdout=stdout,
                          stderr=subprocess.PIPE, text=True, cwd=REPO, timeout=120, env=environment, **kwargs)


# ------------------------------------------------------------------------------------------------
# 3: an internal error, with a crash report


def test_a_defect_exits_3_with_one_line_and_a_crash_report(capsys, monkeypatch, _isolated_state_folder):
    # Before: any unexpected exception escaped as a traceback with exit status 1, the "no solution" code.
    def defect(_project):
        raise ZeroDivisionError("an invented defect")

    monkeypatch.setattr(cli, "evaluate_project", defect)
    status, out, err = run(capsys, "evaluate", FERRITE)
    assert status == 3 and out == ""
    line = one_error_line(err, "internal error (ZeroDivisionError)")
    reports = list((_isolated_state_folder / "crash-reports").glob("crash-*.txt"))
    assert len(reports) == 1 and str(reports[0]) in line
    text = reports[0].read_text(encoding="utf-8")
    assert "Traceback" in text and "an invented defect" in text and "pmdc-sizer evaluate" in text


def test_a_crash_report_that_cannot_be_written_still_ends_in_exit_3(capsys, monkeypatch, tmp_path):
    blocked = tmp_path / "state"
    blocked.write_text("a file where the state folder should be", encoding="utf-8")
    monkeypatch.setenv("PMDC_SIZER_STATE_DIR", str(blocked))
    monkeypatch.setattr(cli, "evaluate_project", lambda _p: 1 / 0)
    status, _out, err = run(capsys, "evaluate", FERRITE)
    assert status == 3 and "no crash report could be written" in err.splitlines()[-1]


# ------------------------------------------------------------------------------------------------
# 2: every bad input of the review, in one line


def test_deeply_nested_project_exits_2(capsys, tmp_path):
    path = tmp_path / "deep.toml"
    path.write_text("format_version = 1\nx = " + "[" * 500 + "]" * 500 + "\n", encoding="utf-8")
    status, out, err = run(capsys, "evaluate", path)
    assert status == 2 and out == ""
    one_error_line(err, "nested too deeply")


@pytest.mark.parametrize("value", ["[" * 500 + "]" * 500, "{a=" * 400 + "1" + "}" * 400])
def test_deeply_nested_set_value_exits_2(capsys, value):
    status, _out, err = run(capsys, "evaluate", FERRITE, "--set", f"supply.voltage_V={value}")
    assert status == 2
    one_error_line(err, "supply.voltage_V")


def test_an_integer_of_more_than_4300_digits_exits_2(capsys, tmp_path):
    path = tmp_path / "big.toml"
    path.write_text(FERRITE.read_text(encoding="utf-8").replace("voltage_V = 12.0", "voltage_V = " + "9" * 5000),
                    encoding="utf-8")
    status, _out, err = run(capsys, "evaluate", path)
    assert status == 2
    one_error_line(err, "4300 digits")
    status, _out, err = run(capsys, "evaluate", FERRITE, "--set", "supply.voltage_V=" + "9" * 5000)
    assert status == 2
    one_error_line(err, "4300 digits")


def test_a_table_given_a_value_exits_2(capsys):
    status, _out, err = run(capsys, "evaluate", FERRITE, "--set", "magnets=5", "--set", "magnets.grade=Y30")
    assert status == 2
    one_error_line(err, "magnets: is a table of keys")


def test_a_full_disk_under_stdout_exits_2_in_one_line():
    # Before: only BrokenPipeError was caught; `> /dev/full` gave a traceback and exit 1.
    for argv in (("evaluate", FERRITE), ("evaluate", FERRITE, "--json"), ("curves", FERRITE), ("grades",)):
        with open("/dev/full", "w") as full:
            done = run_installed(*argv, stdout=full)
        assert done.returncode == 2, (argv, done.stderr)
        assert done.stderr.splitlines() == ["pmdc-sizer: error: standard output: cannot write (No space left on "
                                            "device)"], done.stderr


def test_a_reader_that_stops_reading_is_not_an_error():
    with subprocess.Popen([sys.executable, "-c", "import sys; sys.stdin.readline()"], stdin=subprocess.PIPE) as reader:
        done = run_installed("curves", FERRITE, stdout=reader.stdin)
        reader.stdin.close()
        reader.wait(timeout=60)
    assert done.returncode == 0 and "Traceback" not in done.stderr and "Exception ignored" not in done.stderr


@pytest.mark.parametrize("target", ["/dev/stdout", "/dev/null"])
def test_special_files_are_refused_as_output(capsys, target):
    status, _out, err = run(capsys, "curves", FERRITE, "-o", target)
    assert status == 2
    one_error_line(err, "special file")
    status, _out, err = run(capsys, "datasheet", FERRITE, "-o", target + ".pdf" if target == "/dev/null" else target)
    assert status == 2


def test_a_dash_is_standard_output(capsys):
    status, out, err = run(capsys, "curves", FERRITE, "-o", "-", "--case", "hot")
    assert status == 0 and err == "" and out.startswith("case,") and len(out.splitlines()) == 201


def test_a_bare_key_removes_an_optional_key(capsys, tmp_path):
    # Before: `--set KEY=` set the key to the empty string and was refused as not a number.
    path = tmp_path / "limited.toml"
    path.write_text(FERRITE.read_text(encoding="utf-8").replace("[supply]\n", "[supply]\ncurrent_limit_A = 3.0\n"),
                    encoding="utf-8")
    status, out, _err = run(capsys, "evaluate", path, "--json")
    assert status == 0 and json.loads(out)["current_limit_A"] == 3.0
    status, out, _err = run(capsys, "evaluate", path, "--json", "--set", "supply.current_limit_A=")
    assert status == 0 and json.loads(out)["current_limit_A"] is None
    status, _out, err = run(capsys, "evaluate", path, "--set", "supply.voltage_V=")  # a required key
    assert status == 2
    one_error_line(err, "supply.voltage_V: required key is missing")


def test_a_toml_date_is_a_revision_date_on_the_command_line(capsys):
    status, _out, err = run(capsys, "evaluate", FERRITE, "--json", "--set", "project.revision_date=2024-05-17")
    assert status == 0, err


def test_a_long_value_gives_a_short_line(capsys):
    status, _out, err = run(capsys, "evaluate", FERRITE, "--set", 'project.name="' + "x" * 1_000_000 + '"')
    assert status == 2 and len(err) < 400
    one_error_line(err, "1,000,002 characters")


def test_no_display_is_one_sentence():
    # Before: 7 lines of Qt plugin errors and an abort.
    assert display_problem(environ={}, platform="linux").startswith("no display to open the desktop tool on")
    assert display_problem(environ={"DISPLAY": ":0"}, platform="linux") == ""
    assert display_problem(environ={"QT_QPA_PLATFORM": "offscreen"}, platform="linux") == ""
    assert display_problem(screenshot=True, environ={}, platform="linux") == ""
    environment = {k: v for k, v in os.environ.items() if k not in ("DISPLAY", "WAYLAND_DISPLAY", "QT_QPA_PLATFORM")}
    done = subprocess.run([sys.executable, "-m", "pmdc_sizer.app.cli"], capture_output=True, text=True, cwd=REPO,
                          timeout=120, env=environment)
    assert done.returncode == 2
    one_error_line(done.stderr, "no display")


# ------------------------------------------------------------------------------------------------
# The user library: reported and skipped, never fatal


def _bad_library(folder: Path) -> None:
    (folder / "deep.toml").write_text("grade = " + "[" * 500 + "]" * 500 + "\n", encoding="utf-8")
    (folder / "five.toml").write_text("grade = 5\n", encoding="utf-8")
    (folder / "latin1.toml").write_bytes(b"[[grade]]\nname = '\xe9'\n")
    (folder / "folder.toml").mkdir()
    (folder / "good.toml").write_text(tomli_w.dumps({"grade": [USER_GRADE]}), encoding="utf-8")


def test_bad_library_files_are_warnings_and_every_command_still_works(capsys, _isolated_user_library):
    # Before: one bad file made every command fail, even for a project on built-in grades only.
    _bad_library(_isolated_user_library)
    library.reload()
    status, out, err = run(capsys, "evaluate", FERRITE, "--json")
    assert status == 0 and json.loads(out)["magnetics"]["flux_per_pole_Wb"] > 0
    warnings = err.splitlines()
    assert len(warnings) == 4 and all(line.startswith("pmdc-sizer: warning: user library file skipped: ")
                                      for line in warnings), err
    for name in ("deep.toml", "five.toml", "latin1.toml", "folder.toml"):
        assert sum(name in line for line in warnings) == 1  # each once


def test_grades_lists_what_loaded_and_what_did_not(capsys, _isolated_user_library):
    _bad_library(_isolated_user_library)
    (_isolated_user_library / "y30.toml").write_text(tomli_w.dumps({"grade": [{**USER_GRADE, "name": "Y30"}]}),
                                                     encoding="utf-8")
    library.reload()
    status, out, err = run(capsys, "grades")
    assert status == 0 and err == ""
    assert f"{USER_GRADE['name']}*" in out and "Y30+" in out
    assert "replacing the built-in grade of that name" in out
    tail = out[out.index("Not loaded from the user library"):]
    for name in ("deep.toml", "five.toml", "latin1.toml", "folder.toml"):
        assert tail.count(name) == 1
    status, out, err = run(capsys, "grades", "--json")
    rows = {row["name"]: row for row in json.loads(out)}
    assert rows["Y30"]["replaces_builtin"] and rows["Y30"]["user_library"]
    assert not rows["N42SH"]["replaces_builtin"]
    assert len(err.splitlines()) == 4  # the files not loaded, as warnings beside the JSON


def test_a_replacing_user_grade_is_announced_where_it_is_used(capsys, _isolated_user_library):
    (_isolated_user_library / "y40.toml").write_text(
        tomli_w.dumps({"grade": [{**USER_GRADE, "name": "Y40", "source": "lot 9"}]}), encoding="utf-8")
    library.reload()
    status, out, err = run(capsys, "evaluate", FERRITE, "--json")
    assert status == 0
    source = _isolated_user_library / "y40.toml"
    assert err.splitlines() == [f"pmdc-sizer: note: magnets.grade = 'Y40' is the user library's, from {source}, "
                                "which replaces the built-in grade of that name"]
    assert json.loads(out)["magnet"]["source"].startswith("user library file y40.toml, replacing the built-in grade")


def test_a_user_steel_with_nan_is_refused_not_a_crash(capsys, _isolated_user_library):
    # Before: the NaN passed the library's checks and crashed every project using it in the interpolator.
    steel = {"name": "my tube", "kind": "housing", "field_strength_A_per_m": [0.0, 300.0, 3000.0, 30000.0],
             "flux_density_T": [0.0, 0.9, float("nan"), 1.9], "density_kg_per_m3": 7850.0}
    (_isolated_user_library / "tube.toml").write_text(tomli_w.dumps({"steel": [steel]}), encoding="utf-8")
    library.reload()
    status, _out, err = run(capsys, "evaluate", FERRITE, "--set", "housing.steel=my tube")
    assert status == 2
    warning, error = err.splitlines()
    assert "tube.toml" in warning and "is not a number" in warning
    assert error.startswith("pmdc-sizer: error: housing.steel = 'my tube': not in the steel library")


# ------------------------------------------------------------------------------------------------
# Absurd figures a check flags are marked in the JSON


def test_figures_a_failed_check_makes_unusable_are_marked(capsys):
    # Before: slot fill 8.7 (the wire does not fit) reached the JSON like any other number.
    status, out, _err = run(capsys, "evaluate", FERRITE, "--json", "--set", "winding.turns_per_coil=400")
    assert status == 0
    data = json.loads(out)
    flagged = {item["key"]: item for item in data["flagged_values"]}
    assert flagged["winding.slot_fill_gross"]["value"] == data["winding"]["slot_fill_gross"] > 1.0
    assert flagged["winding.slot_fill_gross"]["check"] == "slot_fill"
    assert "does not fit" in flagged["winding.slot_fill_gross"]["reason"]
    status, out, _err = run(capsys, "evaluate", FERRITE, "--json")
    assert json.loads(out)["flagged_values"] == []  # the demo passes its checks
