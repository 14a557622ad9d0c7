"""Project files kept whole: comments and layout survive a save, the previous version is kept, every bad
file is refused in one line (deep nesting, huge integers, devices, pipes, huge files, a byte-order mark
accepted), the supply-voltage rule, messages that stay short, and the format-migration machinery."""

from __future__ import annotations

import os
import stat
import threading
import tomllib

import pytest

from pmdc_sizer.core import migrations
from pmdc_sizer.core import project as pf
from pmdc_sizer.core.project import ProjectError

from ..conftest import DEMO_FOLDER

DEMO = DEMO_FOLDER / "appliance_ferrite_12v.toml"

COMMENTED = DEMO.read_text(encoding="utf-8").replace(
    "[supply]\n", "[supply]\n# the van's battery, measured at the pump connector\n", 1).replace(
    "brush_drop_V = 1.0", "brush_drop_V = 1.0   # carbon brushes, from the supplier's sheet", 1)


# ------------------------------------------------------------------------------------------------
# Saving keeps what the user wrote


def test_an_unchanged_design_saves_byte_for_byte(tmp_path):
    # Before: every save rewrote the file from scratch (tomli_w), so every comment was dropped.
    target = tmp_path / "pump.toml"
    target.write_text(COMMENTED, encoding="utf-8")
    pf.save(pf.load(target), target)
    assert target.read_text(encoding="utf-8") == COMMENTED


def test_an_edit_keeps_comments_key_order_and_layout(tmp_path):
    target = tmp_path / "pump.toml"
    target.write_text(COMMENTED, encoding="utf-8")
    edited = pf.with_values(pf.load(target), {"supply.voltage_V": 13.5, "supply.current_limit_A": 8.0,
                                              "magnets.thickness_mm": 5.5})
    pf.save(edited, target)
    text = target.read_text(encoding="utf-8")
    assert "# the van's battery, measured at the pump connector" in text
    assert "brush_drop_V = 1.0   # carbon brushes, from the supplier's sheet" in text
    assert "# INVENTED DEMO SCENARIO" in text  # the file's own header comment
    assert "voltage_V = 13.5" in text and "current_limit_A = 8.0" in text and "thickness_mm = 5.5" in text
    # the other lines are where they were, in the same order
    unchanged = [line for line in COMMENTED.splitlines() if "voltage_V = 12.0" not in line
                 and "thickness_mm" not in line]
    assert [line for line in text.splitlines() if line in unchanged] == unchanged
    assert pf.load(target) == edited
    assert (tmp_path / "pump.toml.bak").read_text(encoding="utf-8") == COMMENTED


def test_removing_an_optional_key_removes_only_its_line(tmp_path):
    target = tmp_path / "pump.toml"
    target.write_text(COMMENTED.replace("[supply]\n", "[supply]\ncurrent_limit_A = 8.0  # drive limit\n"),
                      encoding="utf-8")
    pf.save(pf.with_values(pf.load(target), {"supply.current_limit_A": None}), target)
    text = target.read_text(encoding="utf-8")
    assert "current_limit_A" not in text and "# the van's battery" in text


def test_optional_keys_left_out_stay_out(tmp_path):
    # Defaults the user never wrote (supply.reversing, magnets.magnetization, ...) are not added on save.
    target = tmp_path / "pump.toml"
    text = DEMO.read_text(encoding="utf-8")
    assert "magnetization" not in text
    target.write_text(text, encoding="utf-8")
    pf.save(pf.with_values(pf.load(target), {"load.torque_mNm": 30.0}), target)
    assert "magnetization" not in target.read_text(encoding="utf-8")


def test_save_as_keeps_the_comments_of_the_file_the_design_came_from(tmp_path):
    source = tmp_path / "pump.toml"
    source.write_text(COMMENTED, encoding="utf-8")
    pf.save(pf.load(source), tmp_path / "copy.toml", layout=pf.read_text(source))
    assert "# the van's battery" in (tmp_path / "copy.toml").read_text(encoding="utf-8")


def test_a_toml_date_for_the_revision_date_is_accepted_and_kept(tmp_path):
    # Before: TOML's own date type (unquoted 2024-05-17) was refused as "should be a valid string".
    target = tmp_path / "pump.toml"
    target.write_text(COMMENTED.replace('revision = "A"\n', 'revision = "A"\nrevision_date = 2024-05-17\n'),
                      encoding="utf-8")
    project = pf.load(target)
    assert project.project.revision_date == "2024-05-17"
    pf.save(project, target)
    assert "revision_date = 2024-05-17\n" in target.read_text(encoding="utf-8")
    with pytest.raises(ProjectError, match=r"revision_date.*date and time"):
        pf.parse(COMMENTED.replace('revision = "A"\n', 'revision = "A"\nrevision_date = 2024-05-17T10:00:00\n'))


def test_save_keeps_permissions_and_writes_through_links(tmp_path):
    real = tmp_path / "pump.toml"
    real.write_text(COMMENTED, encoding="utf-8")
    real.chmod(0o600)
    link = tmp_path / "current.toml"
    link.symlink_to(real)
    pf.save(pf.with_values(pf.load(link), {"load.torque_mNm": 30.0}), link)
    assert link.is_symlink() and stat.S_IMODE(real.stat().st_mode) == 0o600
    assert pf.load(real).load.torque_mNm == 30.0


@pytest.mark.parametrize("target", ["/dev/null", "/dev/stdout"])
def test_save_refuses_special_files(target):
    with pytest.raises(ProjectError, match="special file"):
        pf.save(pf.load(DEMO), target)


# ------------------------------------------------------------------------------------------------
# Every bad file: one line, no traceback, nothing blocked


def _write(tmp_path, name, data: bytes):
    path = tmp_path / name
    path.write_bytes(data)
    return path


def test_deeply_nested_toml_is_refused_in_one_line(tmp_path):
    # Before: RecursionError (a traceback and exit 1).
    path = _write(tmp_path, "deep.toml", b"format_version = 1\nx = " + b"[" * 500 + b"]" * 500 + b"\n")
    with pytest.raises(ProjectError, match="nested too deeply"):
        pf.load(path)
    path = _write(tmp_path, "deep_tables.toml", b"format_version = 1\nx = " + b"{a = " * 500 + b"1" + b"}" * 500)
    with pytest.raises(ProjectError, match="nested too deeply"):
        pf.load(path)


def test_an_integer_of_more_than_4300_digits_is_refused_in_one_line(tmp_path):
    # Before: ValueError from Python's int-to-string limit (a traceback and exit 1).
    path = _write(tmp_path, "big.toml", b"format_version = 1\n[supply]\nvoltage_V = " + b"7" * 5000 + b"\n")
    with pytest.raises(ProjectError, match="more than 4300 digits"):
        pf.load(path)


def test_a_utf8_byte_order_mark_is_accepted(tmp_path):
    # Before: refused as "not a valid TOML file (Invalid statement (at line 1, column 1))", not saying why.
    path = _write(tmp_path, "bom.toml", b"\xef\xbb\xbf" + DEMO.read_bytes())
    assert pf.load(path) == pf.load(DEMO)


def test_a_file_that_is_not_utf8_says_where(tmp_path):
    path = _write(tmp_path, "latin1.toml", DEMO.read_bytes().replace(b"invented", "inventé".encode("latin-1"), 1))
    with pytest.raises(ProjectError, match=r"not UTF-8 text.*byte"):
        pf.load(path)


def test_a_device_is_refused_without_reading_it():
    # Before: `evaluate /dev/zero` read until memory ran out (2 GB and growing).
    with pytest.raises(ProjectError, match="device or a pipe"):
        pf.load("/dev/zero")


def test_a_fifo_is_refused_without_blocking(tmp_path):
    # Before: opening a named pipe blocked for ever, waiting for a writer.
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    outcome: list[BaseException] = []

    def attempt():
        try:
            pf.load(fifo)
        except ProjectError as error:
            outcome.append(error)

    worker = threading.Thread(target=attempt, daemon=True)
    worker.start()
    worker.join(timeout=10)
    if worker.is_alive():  # unblock the reader before failing, so the test run can end
        with open(fifo, "wb"):
            pass
        pytest.fail("loading a FIFO blocked")
    assert outcome and "device or a pipe" in str(outcome[0])


def test_a_file_larger_than_any_project_is_refused(tmp_path):
    path = _write(tmp_path, "huge.toml", b"# " + b"x" * (pf.MAX_PROJECT_BYTES + 10) + b"\n")
    with pytest.raises(ProjectError, match="larger than any project file"):
        pf.load(path)


def test_a_folder_is_refused(tmp_path):
    (tmp_path / "design.toml").mkdir()
    with pytest.raises(ProjectError, match="is a folder"):
        pf.load(tmp_path / "design.toml")


def test_a_huge_value_is_cut_in_the_message():
    # Before: the message repeated the whole value: a 1,000,000-character name gave a 1 MB error line.
    text = DEMO.read_text(encoding="utf-8").replace('name = "Camper', 'name = "' + "x" * 1_000_000 + '"\nold = "', 1)
    with pytest.raises(ProjectError) as caught:
        pf.parse(text)
    message = str(caught.value)
    assert len(message) < 300 and "1,000,0" in message and "\n" not in message


@pytest.mark.parametrize(("value", "words"), [("nan", "is not a number"), ("inf", "is infinite"),
                                              ("-inf", "is infinite")])
def test_nan_and_infinity_are_named_as_such(value, words):
    # Before: `nan` was reported as "should be less than or equal to 40".
    text = DEMO.read_text(encoding="utf-8").replace("thickness_mm = 6.0", f"thickness_mm = {value}", 1)
    with pytest.raises(ProjectError, match=rf"magnets\.thickness_mm = -?(nan|inf): {words} \(allowed 0.5 to 40 mm\)"):
        pf.parse(text)


# ------------------------------------------------------------------------------------------------
# Cross-field rules and edits


@pytest.mark.parametrize(("voltage", "drop"), [(1.0, 1.0), (2.0, 2.5), (5.0, 10.0)])
def test_a_supply_at_or_below_the_brush_drop_is_refused_naming_both_keys(voltage, drop):
    # Before: accepted, giving negative currents, an "OK" current density of -2.5 A/mm², every
    # demagnetization case "ok" and a numpy RuntimeWarning on stderr.
    project = pf.load(DEMO)
    with pytest.raises(ProjectError) as caught:
        pf.with_values(project, {"supply.voltage_V": voltage, "supply.brush_drop_V": drop})
    assert caught.value.key == "supply.voltage_V"
    assert "supply.voltage_V" in str(caught.value) and "supply.brush_drop_V" in str(caught.value)


def test_just_above_the_brush_drop_is_accepted():
    assert pf.with_values(pf.load(DEMO), {"supply.voltage_V": 1.5, "supply.brush_drop_V": 1.4}).supply.voltage_V == 1.5


def test_a_value_for_a_table_is_refused_not_a_type_error():
    # Before: `--set magnets=5 --set magnets.grade=Y30` raised TypeError inside with_values.
    project = pf.load(DEMO)
    with pytest.raises(ProjectError, match="magnets: is a table of keys"):
        pf.with_values(project, {"magnets": 5, "magnets.grade": "Y30"})
    with pytest.raises(ProjectError, match="magnets: is a table of keys"):
        pf.with_values(project, {"magnets.grade": "Y30", "magnets": 5})


# ------------------------------------------------------------------------------------------------
# Format versions: the machinery, exercised on a synthetic format 2


def test_format_1_is_current_and_has_no_real_migration_yet():
    # Honest state: no key has changed since format 1, so no real step is registered.
    assert pf.FORMAT_VERSION == 1 and migrations.MIGRATIONS == {}
    data = tomllib.loads(DEMO.read_text(encoding="utf-8"))
    assert migrations.migrate(data) == data


def _synthetic_steps():
    """A format 2 in which ``airgap.length_mm`` became ``airgap.radial_clearance_mm`` (invented for the test)."""
    steps: dict[int, migrations.Migration] = {}

    @migrations.register(1, steps)
    def rename_gap(data):
        data["airgap"]["radial_clearance_mm"] = data["airgap"].pop("length_mm")
        return data

    return steps


def test_a_registered_step_carries_a_format_1_file_to_format_2():
    data = tomllib.loads(DEMO.read_text(encoding="utf-8"))
    original = tomllib.loads(DEMO.read_text(encoding="utf-8"))
    migrated = migrations.migrate(data, _synthetic_steps(), target=2)
    assert migrated["format_version"] == 2
    assert migrated["airgap"] == {"radial_clearance_mm": original["airgap"]["length_mm"]}
    assert data == original  # the caller's data are left alone
    assert migrations.migrate(migrated, _synthetic_steps(), target=2) == migrated  # already there


def test_a_missing_step_is_named():
    data = tomllib.loads(DEMO.read_text(encoding="utf-8"))
    with pytest.raises(ProjectError, match=r"format_version = 1: .*no way to read format 1") as caught:
        migrations.migrate(data, {}, target=2)
    assert caught.value.key == "format_version"


def test_a_failing_step_is_named():
    steps: dict[int, migrations.Migration] = {}
    migrations.register(1, steps)(lambda data: data["no such table"])
    with pytest.raises(ProjectError, match="could not be carried forward to format 2"):
        migrations.migrate({"format_version": 1}, steps, target=2)


def test_a_step_cannot_be_registered_twice():
    steps = _synthetic_steps()
    with pytest.raises(ValueError, match="already registered"):
        migrations.register(1, steps)(lambda data: data)


def test_the_loader_migrates_before_it_validates(monkeypatch):
    # The wiring: validate() hands the parsed file to migrate() before the schema sees it. With the format
    # still at 1 no real step exists, so a synthetic one stands in: it reads an invented older spelling
    # (airgap.radial_clearance_mm) as today's airgap.length_mm.
    from pmdc_sizer.core import fit_rules

    seen = []

    def synthetic_migrate(data):
        seen.append(data["format_version"])
        data = dict(data, airgap={"length_mm": data["airgap"]["radial_clearance_mm"]})
        return data

    monkeypatch.setattr(fit_rules, "migrate", synthetic_migrate)
    text = DEMO.read_text(encoding="utf-8").replace("[airgap]\nlength_mm", "[airgap]\nradial_clearance_mm")
    assert "radial_clearance_mm" in text
    assert pf.parse(text).airgap.length_mm == 0.4 and seen == [1]
