"""The `pmdc-sizer` command: evaluate (summary, --json, --set), grades, curves; exit codes and one-line
errors for every class of bad input."""

from __future__ import annotations

import csv
import io
import itertools
import json
import math
import subprocess
import sys
import tomllib
from pathlib import Path

import pytest
import tomli_w

from pmdc_sizer.app.cli import main
from pmdc_sizer.core import library

from .command_line import run

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"


def evaluate_json(capsys, path, *extra) -> dict:
    status, out, err = run(capsys, "evaluate", path, "--json", *extra)
    assert status == 0, err
    assert err == ""

    def refuse_constant(name):
        raise AssertionError(f"{name} in the JSON: not valid JSON for other tools")

    return json.loads(out, parse_constant=refuse_constant)


def lookup(data: dict, dotted: str):
    node = data
    for part in dotted.split("."):
        assert isinstance(node, dict) and part in node, f"missing key {dotted!r} (at {part!r})"
        node = node[part]
    return node


# The keys the issues require (issue 2 item 5, issue 3 item 8).
REQUIRED_NUMBERS = [
    "magnetics.flux_per_pole_Wb", "magnetics.airgap_flux_density_T", "magnetics.magnet_flux_density_T",
    "magnetics.magnet_field_A_per_m", "magnetics.permeance_coefficient", "magnetics.housing_flux_density_T",
    "magnetics.tooth_flux_density_T", "magnetics.leakage_factor", "magnetics.carter_factor",
    "magnet.remanence_T", "magnet.coercivity_HcJ_A_per_m",
    "constants.ke_V_s_per_rad", "constants.kt_N_m_per_A", "constants.ke_V_per_krpm",
    "constants.terminal_resistance_ohm",
    "performance.no_load_speed_rpm", "performance.no_load_current_A", "performance.stall_torque_N_m",
    "performance.stall_current_A", "performance.max_efficiency", "performance.max_output_power_W",
    "performance.rated.torque_N_m", "performance.rated.speed_rpm", "performance.rated.current_A",
    "performance.rated.efficiency", "performance.rated.output_power_W",
    "demagnetization.worst_margin_A_per_m",
    "thermal.winding_temperature_C", "thermal.magnet_temperature_C",
]
CASE_KEYS = ("name", "temperature_C", "current_A", "magnet_field_A_per_m", "knee_field_A_per_m", "margin_A_per_m", "ok")
PERFORMANCE_KEYS = ("no_load_speed_rpm", "no_load_current_A", "stall_torque_N_m", "stall_current_A", "max_efficiency",
                    "max_output_power_W", "rated")


def test_evaluate_json_has_every_required_key(capsys, demo_path):
    data = evaluate_json(capsys, demo_path)
    for key in REQUIRED_NUMBERS:
        value = lookup(data, key)
        assert isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value), key
    assert lookup(data, "magnetics.magnet_field_A_per_m") < 0.0  # second quadrant
    assert 0.0 < lookup(data, "performance.max_efficiency") < 1.0  # a fraction, not percent
    assert isinstance(lookup(data, "demagnetization.ok"), bool)
    assert isinstance(lookup(data, "thermal.ok"), bool)
    assert isinstance(lookup(data, "thermal.insulation_class"), str)
    cases = lookup(data, "demagnetization.cases")
    assert isinstance(cases, list) and cases
    for case in cases:
        for key in CASE_KEYS:
            assert key in case, key
        assert math.isclose(case["margin_A_per_m"], case["magnet_field_A_per_m"] - case["knee_field_A_per_m"],
                            rel_tol=1e-12)
        assert case["ok"] == (case["margin_A_per_m"] > 0.0)
    assert lookup(data, "demagnetization.worst_case") in {c["name"] for c in cases}
    for name in ("cold", "hot"):
        case = lookup(data, f"cases.{name}")
        assert isinstance(case["temperature_C"], float)
        for key in PERFORMANCE_KEYS:
            assert key in case, (name, key)
    assert lookup(data, "cases.cold.temperature_C") < lookup(data, "cases.hot.temperature_C")
    assert isinstance(data["warnings"], list) and all(isinstance(w, str) for w in data["warnings"])


def test_json_agrees_with_the_library_and_the_units(capsys):
    data = evaluate_json(capsys, FERRITE)
    file_data = tomllib.loads(FERRITE.read_text(encoding="utf-8"))
    grade = library.magnet_grades()[file_data["magnets"]["grade"]]
    nominal = file_data["temperatures"]["ambient_nominal_C"]
    assert math.isclose(data["magnet"]["remanence_T"],
                        grade.remanence * (1 + grade.remanence_temp_coeff * (nominal - 20)), rel_tol=1e-12)
    # rpm at the edge, rad/s in the core: 1 rpm = 2π/60 rad/s
    assert math.isclose(data["constants"]["ke_V_per_krpm"], data["constants"]["ke_V_s_per_rad"] * 2000 * math.pi / 60,
                        rel_tol=1e-12)


def test_set_overrides_a_key_for_this_run(capsys):
    base = evaluate_json(capsys, FERRITE)
    thinner = evaluate_json(capsys, FERRITE, "--set", "magnets.thickness_mm=4.0", "--set", "supply.voltage_V=13.5")
    assert thinner["magnetics"]["flux_per_pole_Wb"] < base["magnetics"]["flux_per_pole_Wb"]
    assert thinner["supply_voltage_V"] == 13.5
    grade = evaluate_json(capsys, FERRITE, "--set", "magnets.grade=Y30BH")
    assert grade["magnet"]["name"] == "Y30BH"
    # the file itself is untouched
    assert tomllib.loads(FERRITE.read_text(encoding="utf-8"))["magnets"]["thickness_mm"] == 6.0


def test_summary_reads_like_a_report(capsys, demo_path):
    status, out, err = run(capsys, "evaluate", demo_path)
    assert status == 0 and err == ""
    for fragment in ("Operating point", "Flux per pole", "Ke", "Kt", "No-load speed", "Stall torque",
                     "Demagnetization", "Insulation class", "Checks", "confirm by test", "medical"):
        assert fragment in out, fragment


def _bad_files(tmp_path: Path) -> dict[str, tuple[Path, str]]:
    data = tomllib.loads(FERRITE.read_text(encoding="utf-8"))

    def variant(name, section, key, value):
        copy = json.loads(json.dumps(data))
        if value is None:
            del copy[section][key]
        else:
            copy[section][key] = value
        path = tmp_path / f"{name}.toml"
        path.write_text(tomli_w.dumps(copy), encoding="utf-8")
        return path

    text = FERRITE.read_text(encoding="utf-8")
    (tmp_path / "empty.toml").write_text("", encoding="utf-8")
    (tmp_path / "binary.toml").write_bytes(b"\x00\x01\x02PK\x03\x04" * 20)
    (tmp_path / "truncated.toml").write_text(text[: len(text) // 2], encoding="utf-8")
    return {
        "missing key": (variant("missing", "airgap", "length_mm", None), "airgap.length_mm"),
        "wrong type": (variant("type", "supply", "voltage_V", "twelve"), "supply.voltage_V"),
        "out of range": (variant("range", "airgap", "length_mm", 9.0), "airgap.length_mm"),
        "parts do not fit": (variant("fit", "magnets", "arc_deg", 178.0), "magnets.arc_deg"),
        "unknown key": (variant("unknown", "magnets", "thicknes_mm", 6.0), "magnets.thicknes_mm"),
        "newer format": (_newer(tmp_path, data), "format_version"),
        "unknown grade": (variant("grade", "magnets", "grade", "N99"), "magnets.grade"),
        "bad wire": (variant("wire", "winding", "wire", "AWG 99"), "winding.wire"),
        "empty": (tmp_path / "empty.toml", "empty"),
        "binary": (tmp_path / "binary.toml", "binary"),
        "truncated": (tmp_path / "truncated.toml", "truncated.toml"),
        "missing file": (tmp_path / "no_such_file.toml", "no_such_file.toml"),
    }


def _newer(tmp_path, data):
    path = tmp_path / "newer.toml"
    path.write_text(tomli_w.dumps({**data, "format_version": 7}), encoding="utf-8")
    return path


@pytest.mark.parametrize("case", ["missing key", "wrong type", "out of range", "parts do not fit", "unknown key",
                                  "newer format", "unknown grade", "bad wire", "empty", "binary", "truncated",
                                  "missing file"])
@pytest.mark.parametrize("command", ["evaluate", "curves"])
def test_bad_input_exits_2_with_one_line(capsys, tmp_path, case, command):
    path, fragment = _bad_files(tmp_path)[case]
    status, out, err = run(capsys, command, path)
    assert status == 2
    assert out == ""
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert fragment in lines[0]
    assert "Traceback" not in err


@pytest.mark.parametrize(
    ("assignment", "fragment"),
    [("magnets.thickness_mm=0.1", "magnets.thickness_mm"), ("magnets.thicknes_mm=4", "magnets.thicknes_mm"),
     ("armature.slots=twelve", "armature.slots"), ("magnets.arc_deg=179", "magnets.arc_deg"),
     ("supply.voltage_V", "KEY=VALUE"), ("magnets.grade=N99", "magnets.grade")],
)
def test_bad_set_exits_2_with_one_line(capsys, assignment, fragment):
    status, out, err = run(capsys, "evaluate", FERRITE, "--json", "--set", assignment)
    assert status == 2 and out == ""
    assert len(err.splitlines()) == 1 and fragment in err


def test_the_installed_command_prints_no_traceback(tmp_path):
    # The real console entry point in a fresh interpreter: bad file → exit 2, one stderr line.
    path = tmp_path / "broken.toml"
    path.write_text("format_version = 1\n[supply\n", encoding="utf-8")
    done = subprocess.run([sys.executable, "-m", "pmdc_sizer.app.cli", "evaluate", str(path)], capture_output=True,
                          text=True,
                          cwd=REPO, timeout=120)
    assert done.returncode == 2
    assert done.stdout == ""
    assert len(done.stderr.splitlines()) == 1 and "Traceback" not in done.stderr
    assert "TOML" in done.stderr
    good = subprocess.run([sys.executable, "-m", "pmdc_sizer.app.cli", "evaluate", str(FERRITE), "--json"],
                          capture_output=True,
                          text=True, cwd=REPO, timeout=120)
    assert good.returncode == 0 and json.loads(good.stdout)["magnetics"]["flux_per_pole_Wb"] > 0.0


def test_unknown_command_and_missing_argument_exit_2(capsys):
    with pytest.raises(SystemExit) as caught:
        main(["frobnicate"])
    assert caught.value.code == 2
    with pytest.raises(SystemExit) as caught:
        main(["evaluate"])
    assert caught.value.code == 2
    capsys.readouterr()


def test_grades_text_lists_the_library(capsys):
    status, out, err = run(capsys, "grades")
    assert status == 0 and err == ""
    for name in library.magnet_grades():
        assert name in out
    assert "kA/m" in out and "20 °C" in out


def test_grades_json(capsys):
    status, out, _ = run(capsys, "grades", "--json")
    assert status == 0
    rows = json.loads(out)
    grades = library.magnet_grades()
    assert [row["name"] for row in rows] == list(grades)
    for row in rows:
        grade = grades[row["name"]]
        assert row["family"] == grade.family
        assert row["remanence_T"] == grade.remanence  # at 20 °C, SI
        assert row["coercivity_HcJ_A_per_m"] == grade.coercivity_hcj


def test_grades_json_includes_user_grades(capsys, _isolated_user_library):
    (_isolated_user_library / "mine.toml").write_text(tomli_w.dumps({"grade": [{
        "name": "lot 42", "family": "SmCo 2:17", "remanence_T": 1.05, "coercivity_HcB_kA_per_m": 810.0,
        "coercivity_HcJ_kA_per_m": 1900.0, "energy_product_kJ_per_m3": 210.0, "recoil_permeability": 1.03,
        "squareness": 0.8, "remanence_temp_coeff_pct_per_K": -0.035, "coercivity_temp_coeff_pct_per_K": -0.2,
        "max_working_temperature_C": 300.0, "density_kg_per_m3": 8400.0, "source": "test"}]}), encoding="utf-8")
    library.reload()
    _status, out, _ = run(capsys, "grades", "--json")
    row = next(r for r in json.loads(out) if r["name"] == "lot 42")
    assert row["user_library"] is True and row["coercivity_HcJ_A_per_m"] == 1.9e6


_UNIT_SUFFIXES = ("_C", "_mN_m", "_rpm", "_A", "_W", "_pct")


def test_curves_csv_header_names_units(capsys, demo_path):
    status, out, err = run(capsys, "curves", demo_path, "--csv")
    assert status == 0 and err == ""
    rows = list(csv.reader(io.StringIO(out)))
    header, body = rows[0], rows[1:]
    assert header[0] == "case"
    assert all(column.endswith(_UNIT_SUFFIXES) for column in header[1:]), header
    assert {"torque_mN_m", "speed_rpm", "current_A", "efficiency_pct", "output_power_W"} <= set(header)
    assert len(body) == 3 * 200  # cold, nominal, hot; 200 points each
    assert [r[0] for r in body[::200]] == ["cold", "nominal", "hot"]
    speed = header.index("speed_rpm")
    for start in (0, 200, 400):
        speeds = [float(r[speed]) for r in body[start:start + 200]]
        assert speeds[0] > speeds[-1] == 0.0
        # the speed falls with torque, except that the armature's reaction can hold it level where the flux
        # falls as fast as the resistance's drop grows: the drill demo's cold curve rises 1.2 rpm (0.006 %
        # of its no-load speed) at 8.5 N·m; never by more than 0.05 %
        assert all(b - a <= 5e-4 * speeds[0] for a, b in itertools.pairwise(speeds))
        assert sum(a >= b for a, b in itertools.pairwise(speeds)) >= 195


def test_curves_to_a_file_and_one_case(capsys, tmp_path):
    target = tmp_path / "hot.csv"
    status, out, _ = run(capsys, "curves", FERRITE, "--csv", "--case", "hot", "-o", target)
    assert status == 0 and out == ""
    rows = list(csv.reader(io.StringIO(target.read_text(encoding="utf-8"))))
    assert len(rows) == 201 and {r[0] for r in rows[1:]} == {"hot"}
    assert [p.name for p in tmp_path.iterdir()] == ["hot.csv"]  # no temporary left behind


def test_curves_into_a_missing_folder_exits_2(capsys, tmp_path):
    status, _out, err = run(capsys, "curves", FERRITE, "--csv", "-o", tmp_path / "nowhere" / "x.csv")
    assert status == 2 and len(err.splitlines()) == 1 and "does not exist" in err
