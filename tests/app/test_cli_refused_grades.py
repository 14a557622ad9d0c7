"""The command line on grades the tool refuses: AlNiCo and data no curve can follow, one clear line each.

The AlNiCo entries the library once carried plotted their straight-from-Br curve down to B = -1.6 T;
now no AlNiCo grade reaches a chart or a computation.
"""

from __future__ import annotations

import json
from pathlib import Path

from ..grade_tables import ALNICO_5, Y40_AS_ONCE_STORED, with_inline_grade
from .command_line import run

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"


def test_no_alnico_grade_is_listed(capsys):
    status, out, _ = run(capsys, "grades", "--json")
    assert status == 0
    assert not [row for row in json.loads(out) if row["family"] == "AlNiCo"]


def test_an_alnico_project_is_refused_with_the_reason_and_no_curves(capsys, tmp_path):
    path = with_inline_grade(FERRITE, tmp_path, ALNICO_5)
    for command in ("evaluate", "curves"):
        status, out, err = run(capsys, command, path, "--json" if command == "evaluate" else "--csv")
        assert status == 2 and out == "", command  # nothing is computed or drawn
        assert len(err.strip().splitlines()) == 1
        assert "magnets.custom_grade" in err and "'AlNiCo 5'" in err and "armature reaction" in err


def test_an_inline_grade_whose_hcb_no_curve_can_meet_names_the_key(capsys, tmp_path):
    status, out, err = run(capsys, "evaluate", with_inline_grade(FERRITE, tmp_path, Y40_AS_ONCE_STORED), "--json")
    assert status == 2 and out == ""
    assert "'Y40 lot'" in err and "coercivity_HcB_kA_per_m" in err and "313" in err
