"""The project file: validation of every class of bad input, atomic save, exact round trip, what-ifs."""

from __future__ import annotations

import tomllib
from pathlib import Path

import pytest
import tomli_w

from pmdc_sizer.core import project as pf
from pmdc_sizer.core.project import ProjectError

from ..grade_tables import SUPPLIER_FERRITE

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "appliance_ferrite_12v.toml"


def demo_data() -> dict:
    return tomllib.loads(DEMO.read_text(encoding="utf-8"))


def write(tmp_path: Path, data_or_text, name="design.toml") -> Path:
    path = tmp_path / name
    if isinstance(data_or_text, dict):
        path.write_text(tomli_w.dumps(data_or_text), encoding="utf-8")
    elif isinstance(data_or_text, bytes):
        path.write_bytes(data_or_text)
    else:
        path.write_text(data_or_text, encoding="utf-8")
    return path


def edited(section_key: str, value) -> dict:
    data = demo_data()
    node = data
    *parents, last = section_key.split(".")
    for part in parents:
        node = node.setdefault(part, {})
    if value is _DELETE:
        del node[last]
    else:
        node[last] = value
    return data


_DELETE = object()

CUSTOM_GRADE = SUPPLIER_FERRITE


def with_custom_grade(**changes) -> dict:
    data = demo_data()
    del data["magnets"]["grade"]
    data["magnets"]["custom_grade"] = {**CUSTOM_GRADE, **changes}
    return data


# Each bad input with the key its message must name. "missing" keys, wrong types, out-of-range values,
# parts that do not fit, unknown keys and a newer format version.
BAD_INPUTS = {
    "missing key": (edited("airgap.length_mm", _DELETE), "airgap.length_mm"),
    "missing section key": (edited("winding.wire", _DELETE), "winding.wire"),
    "missing format version": ({k: v for k, v in demo_data().items() if k != "format_version"}, "format_version"),
    "missing custom-grade key": (
        {**with_custom_grade(), "magnets": {**with_custom_grade()["magnets"],
                                            "custom_grade": {k: v for k, v in CUSTOM_GRADE.items()
                                                             if k != "remanence_T"}}},
        "magnets.custom_grade.remanence_T"),
    "string for a number": (edited("supply.voltage_V", "12"), "supply.voltage_V"),
    "boolean for a number": (edited("magnets.thickness_mm", True), "magnets.thickness_mm"),
    "float for a count": (edited("armature.slots", 12.5), "armature.slots"),
    "number for a name": (edited("magnets.grade", 30), "magnets.grade"),
    "table for a number": (edited("load.torque_mNm", {"value": 35.0}), "load.torque_mNm"),
    "below range": (edited("airgap.length_mm", 0.01), "airgap.length_mm"),
    "above range": (edited("supply.voltage_V", 6000.0), "supply.voltage_V"),
    "negative": (edited("housing.wall_mm", -1.0), "housing.wall_mm"),
    "not a choice": (edited("motor.poles", 3), "motor.poles"),
    "not an insulation class": (edited("winding.insulation_class", "F"), "winding.insulation_class"),
    "magnet arc over the pole pitch": (edited("magnets.arc_deg", 178.0), "magnets.arc_deg"),
    "magnet shorter than the stack": (edited("magnets.length_mm", 20.0), "magnets.length_mm"),
    "housing shorter than the magnet": (edited("housing.length_mm", 27.0), "housing.length_mm"),
    "slots too deep for the shaft": (edited("armature.slot_depth_mm", 9.6), "armature.slot_depth_mm"),
    "teeth too wide": (edited("armature.tooth_width_mm", 5.0), "armature.tooth_width_mm"),
    "slot opening wider than the slot": (edited("armature.slot_opening_mm", 4.5), "armature.slot_opening_mm"),
    "segments not a multiple of slots": (edited("winding.commutator_segments", 18), "winding.commutator_segments"),
    "over the envelope": (edited("housing.max_outer_diameter_mm", 40.0), "housing.max_outer_diameter_mm"),
    "nominal ambient outside the range": (edited("temperatures.ambient_nominal_C", 60.0),
                                          "temperatures.ambient_nominal_C"),
    "grade and custom grade both": (
        {**with_custom_grade(), "magnets": {**with_custom_grade()["magnets"], "grade": "Y30"}}, "magnets.grade"),
    "custom HcB above HcJ": (with_custom_grade(coercivity_HcB_kA_per_m=300.0),
                             "magnets.custom_grade.coercivity_HcB_kA_per_m"),
    "unknown key": (edited("supply.voltag_V", 12.0), "supply.voltag_V"),
    "unknown section": (edited("cooling.fan", True), "cooling"),
    "unknown custom-grade key": (with_custom_grade(colour="grey"), "magnets.custom_grade.colour"),
    "newer format": (edited("format_version", 99), "format_version"),
    "format version zero": (edited("format_version", 0), "format_version"),
}


@pytest.mark.parametrize("case", sorted(BAD_INPUTS))
def test_every_class_of_bad_input_names_its_key(case, tmp_path):
    data, key = BAD_INPUTS[case]
    path = write(tmp_path, data)
    with pytest.raises(ProjectError) as caught:
        pf.load(path)
    message = str(caught.value)
    assert key in message
    assert caught.value.key == key or caught.value.key.startswith(key)
    assert "\n" not in message  # one line, for the command line and the status bar


def test_range_errors_give_the_allowed_range_and_unit(tmp_path):
    with pytest.raises(ProjectError, match=r"airgap\.length_mm = 0\.01: .*allowed 0\.05 to 5 mm"):
        pf.load(write(tmp_path, edited("airgap.length_mm", 0.01)))
    with pytest.raises(ProjectError, match=r"newer pmdc-sizer"):
        pf.load(write(tmp_path, edited("format_version", 2)))


def test_integers_are_accepted_where_decimals_belong(tmp_path):
    # TOML users write 12 for 12.0: strict typing must not refuse that.
    assert pf.load(write(tmp_path, edited("supply.voltage_V", 12))).supply.voltage_V == 12.0


@pytest.mark.parametrize(
    ("content", "fragment"),
    [
        ("", "empty"),
        ("   \n\t\n", "empty"),
        ("# only a comment\n", "required key is missing"),
        (b"\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR", "binary"),
        (b"format_version = 1\n\xff\xfe[supply]\n", "UTF-8"),
        ("format_version = 1\n[supply\nvoltage_V = 12.0\n", "TOML"),
    ],
    ids=["empty", "blank", "comment only", "binary", "not utf-8", "bad syntax"],
)
def test_empty_binary_and_broken_files(content, fragment, tmp_path):
    path = write(tmp_path, content)
    with pytest.raises(ProjectError, match=fragment) as caught:
        pf.load(path)
    if fragment != "required key is missing":  # a key error names the key; the others name the file
        assert str(path) in str(caught.value)


@pytest.mark.parametrize("fraction", [0.1, 0.35, 0.5, 0.8, 0.97])
def test_truncated_file_is_refused(fraction, tmp_path):
    text = DEMO.read_text(encoding="utf-8")
    path = write(tmp_path, text[: int(len(text) * fraction)])
    with pytest.raises(ProjectError) as caught:
        pf.load(path)
    assert "\n" not in str(caught.value)


def test_missing_file_is_a_project_error(tmp_path):
    with pytest.raises(ProjectError, match="cannot read"):
        pf.load(tmp_path / "nowhere.toml")


def test_custom_grade_loads(tmp_path):
    project = pf.load(write(tmp_path, with_custom_grade()))
    assert project.magnets.custom_grade.name == "supplier ABC-30"
    assert project.magnets.grade is None


# ------------------------------------------------------------------------------------------------
# Saving


def test_round_trip_is_exact(demo_path, tmp_path):
    # load → save → load gives an equal design; save → load → save gives identical bytes.
    original = pf.load(demo_path)
    first = tmp_path / "first.toml"
    second = tmp_path / "second.toml"
    pf.save(original, first)
    reloaded = pf.load(first)
    assert reloaded == original
    pf.save(reloaded, second)
    assert first.read_bytes() == second.read_bytes()


def test_round_trip_keeps_a_custom_grade_and_optional_keys(tmp_path):
    data = with_custom_grade()
    data["supply"]["current_limit_A"] = 12.5
    data["thermal"]["housing_to_ambient_K_per_W"] = 3.25
    original = pf.load(write(tmp_path, data))
    pf.save(original, tmp_path / "out.toml")
    assert pf.load(tmp_path / "out.toml") == original


def test_save_is_atomic_when_the_rename_fails(tmp_path, monkeypatch):
    target = tmp_path / "design.toml"
    target.write_text("precious old content\n", encoding="utf-8")
    project = pf.load(DEMO)

    def refuse(*_args, **_kwargs):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(pf.os, "replace", refuse)
    with pytest.raises(ProjectError, match=r"design\.toml"):
        pf.save(project, target)
    assert target.read_text(encoding="utf-8") == "precious old content\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["design.toml"]  # no temporary left behind


def test_save_is_atomic_when_the_write_fails(tmp_path, monkeypatch):
    target = tmp_path / "design.toml"
    target.write_text("precious old content\n", encoding="utf-8")

    def broken_fsync(_fd):
        raise OSError(5, "Input/output error")

    monkeypatch.setattr(pf.os, "fsync", broken_fsync)
    with pytest.raises(ProjectError):
        pf.save(pf.load(DEMO), target)
    assert target.read_text(encoding="utf-8") == "precious old content\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["design.toml"]


def test_save_into_a_missing_folder_is_a_project_error(tmp_path):
    with pytest.raises(ProjectError, match="does not exist"):
        pf.save(pf.load(DEMO), tmp_path / "no" / "such" / "folder" / "design.toml")


def test_saved_file_documents_itself(tmp_path):
    pf.save(pf.load(DEMO), tmp_path / "out.toml")
    text = (tmp_path / "out.toml").read_text(encoding="utf-8")
    assert text.startswith("#")
    assert "format_version = 1" in text


# ------------------------------------------------------------------------------------------------
# What-if edits and --set


def test_with_values_changes_and_validates():
    project = pf.load(DEMO)
    thinner = pf.with_values(project, {"magnets.thickness_mm": 4.5, "winding.wire": "0.40 mm"})
    assert thinner.magnets.thickness_mm == 4.5 and thinner.winding.wire == "0.40 mm"
    assert project.magnets.thickness_mm == 6.0  # the original is untouched
    with pytest.raises(ProjectError, match=r"magnets\.thickness_mm"):
        pf.with_values(project, {"magnets.thickness_mm": 0.1})
    with pytest.raises(ProjectError, match=r"magnets\.thicknes_mm"):
        pf.with_values(project, {"magnets.thicknes_mm": 4.0})
    with pytest.raises(ProjectError, match=r"magnets\.arc_deg"):
        pf.with_values(project, {"magnets.arc_deg": 177.0})


def test_with_values_sets_and_removes_optional_keys():
    project = pf.load(DEMO)
    limited = pf.with_values(project, {"supply.current_limit_A": 8.0})
    assert limited.supply.current_limit_A == 8.0
    assert pf.with_values(limited, {"supply.current_limit_A": None}).supply.current_limit_A is None


# ------------------------------------------------------------------------------------------------
# The schema as the single source of truth


def test_key_specs_describe_every_key():
    specs = list(pf.key_specs())
    paths = [s.path for s in specs]
    assert len(paths) == len(set(paths))
    for spec in specs:
        assert spec.description, spec.path
        if spec.kind in ("float", "int"):
            assert spec.minimum is not None and spec.maximum is not None, spec.path
            if spec.default is not None:
                assert spec.minimum <= spec.default <= spec.maximum, spec.path
        if spec.kind == "float" and spec.path.rsplit(".", 1)[-1] not in ("stacking_factor", "recoil_permeability",
                                                                           "squareness", "iron_loss_build_factor",
                                                                           "end_turn_factor"):
            assert spec.unit, spec.path
    assert pf.key_spec("magnets.thickness_mm").unit == "mm"
    with pytest.raises(ProjectError):
        pf.key_spec("magnets.colour")


def test_every_key_of_a_demo_file_is_in_the_schema(demo_path):
    data = tomllib.loads(demo_path.read_text(encoding="utf-8"))
    known = {s.path for s in pf.key_specs()}

    def walk(node, prefix=""):
        for key, value in node.items():
            path = f"{prefix}{key}"
            if isinstance(value, dict):
                yield from walk(value, path + ".")
            else:
                yield path

    assert set(walk(data)) <= known


@pytest.mark.parametrize("value, words", [("2026-02-30", "calendar date"), ("yesterday", "YYYY-MM-DD"),
                                          ("2026-1-5", "YYYY-MM-DD")])
def test_revision_date_must_be_a_calendar_date(ferrite_demo, value, words):
    with pytest.raises(ProjectError) as error:
        pf.with_values(pf.load(ferrite_demo), {"project.revision_date": value})
    assert str(error.value).startswith("project.revision_date") and words in str(error.value)


def test_revision_date_round_trips(ferrite_demo, tmp_path):
    dated = pf.with_values(pf.load(ferrite_demo), {"project.revision_date": "2026-11-20"})
    pf.save(dated, tmp_path / "dated.toml")
    assert pf.load(tmp_path / "dated.toml").project.revision_date == "2026-11-20"
