"""A grade's data against its own curve: refused by name and key when they cannot be fitted, and
AlNiCo refused for this motor type wherever a grade comes from."""

from __future__ import annotations

import dataclasses

import pytest
import tomli_w

from pmdc_sizer.core import library
from pmdc_sizer.core import project as pf
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.magnet_grade_check import FIT_TOLERANCE, require_faithful_curve
from pmdc_sizer.core.magnet_grades import REFUSED_FAMILIES, GradeDataError
from pmdc_sizer.core.project import ProjectError

from ..grade_tables import ALNICO_5, Y40_AS_ONCE_STORED, with_inline_grade

GRADES = library.magnet_grades()



@pytest.mark.parametrize("name", sorted(GRADES))
def test_every_builtin_grade_passes_its_own_check(name):
    require_faithful_curve(GRADES[name])


@pytest.mark.parametrize(
    ("name", "changes", "key"),
    [
        # Y40 as it was stored: squareness 0.90 pins J = 0.9·Br before the stored HcB, where the data put
        # J = 0.93·Br; no monotone curve has both, the model's HcB came out 313 kA/m against 330.
        ("Y40", {"squareness": 0.90}, "coercivity_HcB_kA_per_m"),
        # a straight recoil line from Br = 0.90 T to HcB = 680 kA/m allows at most 155 kJ/m³
        ("SmCo5 20", {"energy_product": 160e3}, "energy_product_kJ_per_m3"),
        ("N42SH", {"coercivity_hcb": 930e3}, "coercivity_HcB_kA_per_m"),
    ],
)
def test_data_no_curve_can_follow_are_refused_naming_grade_and_key(name, changes, key):
    grade = dataclasses.replace(GRADES[name], **changes)
    with pytest.raises(GradeDataError, match=rf"'{name}'.*{key}") as caught:
        require_faithful_curve(grade)
    assert caught.value.key == key


def test_the_tolerance_is_two_percent():
    assert FIT_TOLERANCE == 0.02


def test_no_alnico_in_the_builtin_library():
    assert not [g for g in GRADES.values() if g.family in REFUSED_FAMILIES]


def test_alnico_in_a_user_library_file_is_refused_with_the_reason(_isolated_user_library):
    path = _isolated_user_library / "legacy.toml"
    path.write_text(tomli_w.dumps({"grade": [ALNICO_5]}), encoding="utf-8")
    library.reload()
    (problem,) = library.problems()
    assert str(path) in str(problem) and "'AlNiCo 5'" in str(problem) and "family" in str(problem)
    assert "armature reaction" in str(problem) and "AlNiCo 5" not in library.magnet_grades()


def test_a_user_grade_that_misses_its_hcb_is_refused_when_loaded(_isolated_user_library):
    bad = {**Y40_AS_ONCE_STORED, "name": "lot 9"}
    (_isolated_user_library / "lots.toml").write_text(tomli_w.dumps({"grade": [bad]}), encoding="utf-8")
    library.reload()
    (problem,) = library.problems()
    assert "'lot 9'" in str(problem) and "coercivity_HcB_kA_per_m" in str(problem)


def test_an_inline_alnico_grade_is_refused_before_any_curve_is_drawn(ferrite_demo, tmp_path):
    # AlNiCo's recoil lines start from its working point; the tool refuses it rather than plot its old
    # straight-from-Br curve down to B = -1.6 T.
    path = with_inline_grade(ferrite_demo, tmp_path, ALNICO_5)
    with pytest.raises(ProjectError, match=r"'AlNiCo 5'.*armature reaction") as caught:
        design_from_project(pf.load(path))
    assert caught.value.key == "magnets.custom_grade.family"


def test_an_inline_grade_that_misses_its_energy_product_names_the_key(ferrite_demo, tmp_path):
    table = {**ALNICO_5, "name": "supplier SmCo", "family": "SmCo 1:5", "remanence_T": 0.90,
             "coercivity_HcB_kA_per_m": 680.0, "coercivity_HcJ_kA_per_m": 1500.0, "energy_product_kJ_per_m3": 175.0,
             "recoil_permeability": 1.04, "squareness": 0.85, "remanence_temp_coeff_pct_per_K": -0.04,
             "coercivity_temp_coeff_pct_per_K": -0.3, "max_working_temperature_C": 250.0}
    path = with_inline_grade(ferrite_demo, tmp_path, table)
    with pytest.raises(ProjectError, match=r"'supplier SmCo'.*energy_product_kJ_per_m3") as caught:
        design_from_project(pf.load(path))
    assert caught.value.key == "magnets.custom_grade.energy_product_kJ_per_m3"
