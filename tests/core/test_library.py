"""The material library: built-in data, the user's own folder, and resolving a project's materials."""

from __future__ import annotations

import pytest
import tomli_w

from pmdc_sizer.core import library
from pmdc_sizer.core import project as pf
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.project import CustomGrade, ProjectError
from pmdc_sizer.core.units import to_si

from ..grade_tables import CERTIFIED_LOT

USER_GRADE = CERTIFIED_LOT


def test_builtin_library_has_grades_and_steels_with_sources():
    grades, steels = library.magnet_grades(), library.steels()
    assert len(grades) >= 15 and len(steels) >= 3
    assert all(g.source for g in grades.values()) and all(s.source for s in steels.values())
    assert not any(g.custom for g in grades.values())


def test_user_grade_is_added_and_can_replace_a_builtin(_isolated_user_library):
    folder = _isolated_user_library
    # Br 0.40 with μrec 1.07 puts (BH)max at Br²/(4·μ0·μrec) = 29.7 kJ/m³: the grade check wants it consistent
    replacement = {**USER_GRADE, "name": "Y30", "remanence_T": 0.40, "energy_product_kJ_per_m3": 29.7}
    (folder / "mine.toml").write_text(tomli_w.dumps({"grade": [USER_GRADE, replacement]}), encoding="utf-8")
    library.reload()
    grades = library.magnet_grades()
    assert grades["certified Y30 lot 7"].custom
    assert grades["certified Y30 lot 7"].coercivity_hcj == to_si(205.0, "kA/m")
    assert grades["Y30"].remanence == 0.40 and grades["Y30"].custom


def test_user_steel_is_added(_isolated_user_library):
    steel = {"name": "my tube", "kind": "housing", "field_strength_A_per_m": [0.0, 300.0, 3000.0, 30000.0],
             "flux_density_T": [0.0, 0.9, 1.5, 1.9], "density_kg_per_m3": 7850.0, "source": "my test"}
    (_isolated_user_library / "steel.toml").write_text(tomli_w.dumps({"steel": [steel]}), encoding="utf-8")
    library.reload()
    assert library.steel("my tube", "housing", "housing.steel").density == 7850.0


@pytest.mark.parametrize(
    ("content", "fragment"),
    [
        ({"grade": [{k: v for k, v in USER_GRADE.items() if k != "remanence_T"}]}, "grade[0].remanence_T"),
        ({"grade": [{**USER_GRADE, "remanence_T": 3.0}]}, "grade[0].remanence_T"),
        ({"grade": [{**USER_GRADE, "colour": "grey"}]}, "grade[0].colour"),
        ({"grade": [{**USER_GRADE, "recoil_permeability": 1.6, "squareness": 0.9}]}, "squareness"),
        ({"magnet": []}, "unknown table 'magnet'"),
        ({"steel": [{"name": "x", "kind": "housing", "field_strength_A_per_m": [0.0, 1.0, 0.5],
                     "flux_density_T": [0.0, 1.0, 1.2], "density_kg_per_m3": 7800.0}]}, "steel[0]"),
    ],
)
def test_bad_user_library_file_names_file_and_key(content, fragment, _isolated_user_library):
    # The file is skipped and reported once, naming the file and the entry; the built-ins stay in use.
    path = _isolated_user_library / "bad.toml"
    path.write_text(tomli_w.dumps(content), encoding="utf-8")
    library.reload()
    assert "Y30" in library.magnet_grades()
    (problem,) = library.problems()
    assert problem.path == path and fragment in str(problem) and str(path) in str(problem)


def test_broken_toml_in_the_user_library(_isolated_user_library):
    (_isolated_user_library / "broken.toml").write_text("[[grade]\nname = 1", encoding="utf-8")
    library.reload()
    assert "Y30" in library.magnet_grades()
    (problem,) = library.problems()
    assert "not a valid TOML" in problem.reason


def test_unknown_names_name_the_key():
    with pytest.raises(ProjectError, match=r"magnets\.grade = 'N99'.*pmdc-sizer grades") as caught:
        library.magnet_grade("N99")
    assert caught.value.key == "magnets.grade"
    with pytest.raises(ProjectError, match=r"housing\.steel") as caught:
        library.steel("M400-50A", "housing", "housing.steel")  # a lamination steel as the housing
    assert "lamination" in str(caught.value)
    with pytest.raises(ProjectError, match=r"armature\.steel.*lamination steels: "):
        library.steel("unobtainium", "lamination", "armature.steel")


@pytest.mark.parametrize(
    ("key", "value"),
    [("magnets.grade", "N99"), ("housing.steel", "M400-50A"), ("armature.steel", "low-carbon steel 1010"),
     ("winding.wire", "AWG 99"), ("winding.wire", "0.47 mm")],
)
def test_resolving_a_project_names_the_key_of_a_bad_material(ferrite_demo, key, value):
    # These pass the file schema (a name is a string) and are refused when the materials are resolved,
    # which every evaluation does first.
    project = pf.with_values(pf.load(ferrite_demo), {key: value})
    with pytest.raises(ProjectError) as caught:
        design_from_project(project)
    assert caught.value.key == key and key in str(caught.value)


def test_grade_table_is_the_inverse_of_grade_from_spec():
    # Every library grade, written out as a file table and read back, is the same grade.
    for name, grade in library.magnet_grades().items():
        table = library.grade_table(grade)
        again = library.grade_from_spec(CustomGrade.model_validate(table))
        assert again == grade, name
