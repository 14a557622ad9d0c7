"""``--set KEY=VALUE``: values parse as TOML would parse them and pass the same validation as a file."""

from __future__ import annotations

from pathlib import Path

import pytest

from pmdc_sizer.app.overrides import apply_overrides
from pmdc_sizer.core import project as pf
from pmdc_sizer.core.project import ProjectError

from ..core.test_project import with_custom_grade, write

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "appliance_ferrite_12v.toml"


@pytest.mark.parametrize(
    ("assignment", "key", "value"),
    [
        ("magnets.thickness_mm=4.5", "magnets.thickness_mm", 4.5),
        ("magnets.thickness_mm = 5", "magnets.thickness_mm", 5.0),
        ("magnets.grade=Y35", "magnets.grade", "Y35"),
        ('magnets.grade="Y40"', "magnets.grade", "Y40"),
        ("supply.reversing=true", "supply.reversing", True),
        ("winding.wire=AWG 25", "winding.wire", "AWG 25"),
        ("armature.slots=12", "armature.slots", 12),
    ],
)
def test_overrides_parse_like_the_file(assignment, key, value):
    project = apply_overrides(pf.load(DEMO), [assignment])
    assert pf.get_value(project, key) == value


@pytest.mark.parametrize(
    ("assignment", "key"),
    [
        ("magnets.thickness_mm=0.1", "magnets.thickness_mm"),
        ("magnets.thickness_mm=thick", "magnets.thickness_mm"),
        ("armature.slots=12.5", "armature.slots"),
        ("magnets.thicknes_mm=4", "magnets.thicknes_mm"),
        ("nosuchsection.key=1", "nosuchsection.key"),
        ("magnets.arc_deg=179", "magnets.arc_deg"),
        ("supply.voltage_V", "supply.voltage_V"),
        ("=4", "=4"),
    ],
)
def test_overrides_go_through_the_same_validation(assignment, key):
    with pytest.raises(ProjectError) as caught:
        apply_overrides(pf.load(DEMO), [assignment])
    assert key in str(caught.value)


def test_overrides_reach_into_an_inline_custom_grade(tmp_path):
    project = pf.load(write(tmp_path, with_custom_grade()))
    changed = apply_overrides(project, ["magnets.custom_grade.coercivity_HcJ_kA_per_m=260"])
    assert changed.magnets.custom_grade.coercivity_HcJ_kA_per_m == 260.0
    with pytest.raises(ProjectError, match=r"magnets\.custom_grade\.coercivity_HcB_kA_per_m"):
        apply_overrides(project, ["magnets.custom_grade.coercivity_HcB_kA_per_m=300"])  # above HcJ
