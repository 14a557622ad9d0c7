"""The command line on grades the tool refuses: AlNiCo and data no curve can follow, one clear line each.

The AlNiCo entries the library once carried plotted their straight-from-Br curve down to B = -1.6 T;
now no AlNiCo grade reaches a chart or a computation.
"""

from __future__ import annotations

import json
import tomllib
from pathlib import Path

import tomli_w

from pmdc_sizer.app.cli import main

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"

# The old built-in AlNiCo 5 (typical, from memory: cast AlNiCo 5, MMPA 0100-00 class).
ALNICO_5 = {
    "name": "AlNiCo 5", "family": "AlNiCo", "remanence_T": 1.25, "coercivity_HcB_kA_per_m": 50.0,
    "coercivity_HcJ_kA_per_m": 52.0, "energy_product_kJ_per_m3": 40.0, "recoil_permeability": 3.0,
    "squareness": 0.55, "remanence_temp_coeff_pct_per_K": -0.02, "coercivity_temp_coeff_pct_per_K": 0.01,
    "max_working_temperature_C": 525.0, "density_kg_per_m3": 7300.0, "source": "test copy of the old entry",
}


def run(capsys, *argv):
    status = main([str(a) for a in argv])
    out, err = capsys.readouterr()
    return status, out, err


def with_inline_grade(tmp_path, grade_table) -> Path:
    data = tomllib.loads(FERRITE.read_text(encoding="utf-8"))
    del data["magnets"]["grade"]
    data["magnets"]["custom_grade"] = grade_table
    path = tmp_path / "inline.toml"
    path.write_text(tomli_w.dumps(data), encoding="utf-8")
    return path


def test_no_alnico_grade_is_listed(capsys):
    status, out, _ = run(capsys, "grades", "--json")
    assert status == 0
    assert not [row for row in json.loads(out) if row["family"] == "AlNiCo"]


def test_an_alnico_project_is_refused_with_the_reason_and_no_curves(capsys, tmp_path):
    path = with_inline_grade(tmp_path, ALNICO_5)
    for command in ("evaluate", "curves"):
        status, out, err = run(capsys, command, path, "--json" if command == "evaluate" else "--csv")
        assert status == 2 and out == "", command  # nothing is computed or drawn
        assert len(err.strip().splitlines()) == 1
        assert "magnets.custom_grade" in err and "'AlNiCo 5'" in err and "armature reaction" in err


def test_an_inline_grade_whose_hcb_no_curve_can_meet_names_the_key(capsys, tmp_path):
    # Y40 as once stored: squareness 0.90 with HcB 330 kA/m (J = 0.93·Br there) cannot lie on one curve
    y40 = {**ALNICO_5, "name": "Y40 lot", "family": "hard ferrite, anisotropic", "remanence_T": 0.445,
           "coercivity_HcB_kA_per_m": 330.0, "coercivity_HcJ_kA_per_m": 345.0, "energy_product_kJ_per_m3": 37.5,
           "recoil_permeability": 1.05, "squareness": 0.90, "remanence_temp_coeff_pct_per_K": -0.19,
           "coercivity_temp_coeff_pct_per_K": 0.15, "max_working_temperature_C": 250.0}
    status, out, err = run(capsys, "evaluate", with_inline_grade(tmp_path, y40), "--json")
    assert status == 2 and out == ""
    assert "'Y40 lot'" in err and "coercivity_HcB_kA_per_m" in err and "313" in err
