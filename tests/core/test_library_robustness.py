"""One bad file in the user library never breaks the tool: each is skipped and reported once with its
reason; a user grade that replaces a built-in says so; the library is as strict as the inline grade."""

from __future__ import annotations

import pytest
import tomli_w

from pmdc_sizer.core import library, text_files
from pmdc_sizer.core import project as pf
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.project import ProjectError

from ..conftest import DEMO_FOLDER
from .test_library import USER_GRADE

DEMO = DEMO_FOLDER / "appliance_ferrite_12v.toml"
GOOD_STEEL = {"name": "my tube", "kind": "housing", "field_strength_A_per_m": [0.0, 300.0, 3000.0, 30000.0],
              "flux_density_T": [0.0, 0.9, 1.5, 1.9], "density_kg_per_m3": 7850.0, "source": "test"}


def _bad_files(folder):
    """Every kind of bad file the review found, each with a phrase its reason must contain."""
    (folder / "not_utf8.toml").write_bytes(b'[[grade]]\nname = "\xff\xfe"\n')
    (folder / "a_folder.toml").mkdir()
    (folder / "dangling.toml").symlink_to(folder / "nowhere.toml")
    (folder / "grade_is_5.toml").write_text("grade = 5\n", encoding="utf-8")
    (folder / "steel_is_true.toml").write_text("steel = true\n", encoding="utf-8")
    (folder / "deep.toml").write_text("grade = " + "[" * 500 + "]" * 500 + "\n", encoding="utf-8")
    (folder / "big_int.toml").write_text("x = " + "1" * 5000 + "\n", encoding="utf-8")
    (folder / "nan_steel.toml").write_text(tomli_w.dumps({"steel": [
        {**GOOD_STEEL, "name": "nan tube", "field_strength_A_per_m": [0.0, 300.0, float("nan"), 30000.0]}]}),
        encoding="utf-8")
    (folder / "hcb_above_hcj.toml").write_text(tomli_w.dumps({"grade": [
        {**USER_GRADE, "name": "impossible", "coercivity_HcB_kA_per_m": 250.0, "coercivity_HcJ_kA_per_m": 205.0}]}),
        encoding="utf-8")
    return {
        "not_utf8.toml": "not UTF-8", "a_folder.toml": "is a folder", "dangling.toml": "does not exist",
        "grade_is_5.toml": "[[grade]] tables", "steel_is_true.toml": "[[steel]] tables",
        "deep.toml": "nested too deeply", "big_int.toml": "4300 digits", "nan_steel.toml": "is not a number",
        "hcb_above_hcj.toml": "HcB ≤ HcJ",
    }


def test_each_bad_file_is_skipped_and_reported_once_with_its_reason(_isolated_user_library):
    # Before: every one of these raised (RecursionError, TypeError, UnicodeDecodeError, IsADirectoryError,
    # FileNotFoundError, ValueError) out of every command, even for projects using only built-in grades.
    folder = _isolated_user_library
    expected = _bad_files(folder)
    (folder / "good.toml").write_text(tomli_w.dumps({"grade": [USER_GRADE], "steel": [GOOD_STEEL]}), encoding="utf-8")
    library.reload()
    grades, steels = library.magnet_grades(), library.steels()
    assert "Y30" in grades and USER_GRADE["name"] in grades and "my tube" in steels  # the rest is in use
    assert "nan tube" not in steels and "impossible" not in grades
    problems = library.problems()
    assert sorted(p.path.name for p in problems) == sorted(expected)  # each once
    for problem in problems:
        assert expected[problem.path.name] in problem.reason, problem
        assert str(problem.path) in str(problem) and "\n" not in str(problem)
    design_from_project(pf.load(DEMO))  # a project on built-in materials is untouched by all this


def test_an_unreadable_file_is_skipped(_isolated_user_library, monkeypatch):
    # Root reads every file, so the refusal is made by hand: the reader's open() answers as the OS would.
    path = _isolated_user_library / "locked.toml"
    path.write_text(tomli_w.dumps({"grade": [USER_GRADE]}), encoding="utf-8")

    def refused(*_args, **_kwargs):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(text_files, "open", refused, raising=False)
    library.reload()
    (problem,) = library.problems()
    assert problem.reason == "cannot read the file (Permission denied)"


def test_a_user_steel_with_nan_never_reaches_the_interpolator(_isolated_user_library):
    # Before: NaN passed the "increasing" and "slope" tests (comparisons with NaN are false), and every
    # project using the steel crashed inside the interpolator.
    (_isolated_user_library / "tube.toml").write_text(tomli_w.dumps({"steel": [
        {**GOOD_STEEL, "flux_density_T": [0.0, 0.9, float("nan"), 1.9]}]}), encoding="utf-8")
    library.reload()
    with pytest.raises(ProjectError, match=r"housing\.steel = 'my tube': not in the steel library"):
        library.steel("my tube", "housing", "housing.steel")
    (problem,) = library.problems()
    assert "flux_density_T" in problem.reason and "is not a number" in problem.reason


def test_a_user_grade_is_as_strictly_checked_as_an_inline_one(_isolated_user_library):
    # Before: a user grade with HcB above HcJ was listed and used; inline, the fit rules refuse it.
    impossible = {**USER_GRADE, "coercivity_HcB_kA_per_m": 250.0, "coercivity_HcJ_kA_per_m": 205.0}
    (_isolated_user_library / "lot.toml").write_text(tomli_w.dumps({"grade": [impossible]}), encoding="utf-8")
    library.reload()
    assert USER_GRADE["name"] not in library.magnet_grades()
    with pytest.raises(ProjectError, match="HcB"):
        pf.with_values(pf.load(DEMO), {"magnets.grade": None, "magnets.custom_grade": impossible})


def test_a_user_grade_replacing_a_built_in_is_announced(_isolated_user_library):
    builtin_source = library.magnet_grades()["Y30"].source
    (_isolated_user_library / "certified.toml").write_text(
        tomli_w.dumps({"grade": [{**USER_GRADE, "name": "Y30", "source": "lot 7 certificate"}]}), encoding="utf-8")
    library.reload()
    grade = library.magnet_grades()["Y30"]
    assert grade.custom and grade.source != builtin_source
    assert grade.source.startswith("user library file certified.toml, replacing the built-in grade")
    assert "lot 7 certificate" in grade.source
    assert library.current().replaced == {"Y30": _isolated_user_library / "certified.toml"}
