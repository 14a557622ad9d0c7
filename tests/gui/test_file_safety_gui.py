"""The desktop tool loses nothing: autosave and recovery after a kill, the crash dialog that keeps the design
and saves a copy, the lock warning for a second writer, a change on disk caught before a save, and damaged
files (recent list, settings) answered with a message instead of a traceback."""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest
from PySide6.QtCore import QTimer
from PySide6.QtWidgets import QMessageBox

from pmdc_sizer.app.gui import recovery
from pmdc_sizer.app.gui.crash_dialog import CrashDialog, install_exception_hook
from pmdc_sizer.app.gui.main_window import MainWindow, read_project
from pmdc_sizer.app.gui.settings import load_settings, settings_path
from pmdc_sizer.core import project as pf

from ..conftest import DEMO_FOLDER
from .waits import WAIT_MS

REPO = Path(__file__).resolve().parents[2]
FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"


@pytest.fixture
def design_file(tmp_path) -> Path:
    path = tmp_path / "pump.toml"
    path.write_text(FERRITE.read_text(encoding="utf-8").replace("[supply]\n", "[supply]\n# measured at the pump\n"),
                    encoding="utf-8")
    return path


def _recovery_files(state: Path) -> list[Path]:
    return sorted((state / "recovery").glob("*.json"))


def _record(monkeypatch, name: str, answer=QMessageBox.StandardButton.Ok) -> list[tuple[str, str]]:
    shown: list[tuple[str, str]] = []

    def show(_parent, title, text, *_args, **_kwargs):
        shown.append((title, text))
        return answer

    monkeypatch.setattr(QMessageBox, name, staticmethod(show))
    return shown


# ------------------------------------------------------------------------------------------------
# Autosave and recovery


def test_an_edit_is_autosaved_and_the_copy_goes_when_saved(open_window, qtbot, design_file, _isolated_state_folder):
    # Before: nothing was written until Save.
    window = open_window(design_file)
    assert _recovery_files(_isolated_state_folder) == []
    window.model.fields["load.torque_mNm"].propose(30.0, final=True)
    qtbot.waitUntil(lambda: len(_recovery_files(_isolated_state_folder)) == 1,
                    timeout=recovery.AUTOSAVE_DELAY_MS + 3000)
    data = json.loads(_recovery_files(_isolated_state_folder)[0].read_text(encoding="utf-8"))
    assert data["file"] == str(design_file.resolve())
    assert pf.parse(data["project"]).load.torque_mNm == 30.0
    assert "# measured at the pump" in data["project"]  # the copy keeps the user's comments too
    assert window.save_file()
    assert _recovery_files(_isolated_state_folder) == []
    assert pf.load(design_file).load.torque_mNm == 30.0


def test_a_live_window_copy_is_not_offered_but_an_orphan_is(open_window, qtbot, design_file, _isolated_state_folder):
    window = open_window(design_file)
    window.model.fields["load.torque_mNm"].propose(31.0, final=True)
    window.autosaver.write_now()
    assert recovery.orphaned_records() == []  # its window still holds the lock
    window.autosaver._lock.release()  # as the operating system does when the process dies
    (record,) = recovery.orphaned_records()
    assert record.file == design_file.resolve() and record.project().load.torque_mNm == 31.0
    window.autosaver._lock.acquire()


def test_discarding_changes_removes_the_copy(open_window, qtbot, design_file, monkeypatch, _isolated_state_folder):
    window = open_window(design_file)
    window.model.fields["load.torque_mNm"].propose(32.0, final=True)
    window.autosaver.write_now()
    assert len(_recovery_files(_isolated_state_folder)) == 1
    _record(monkeypatch, "question", QMessageBox.StandardButton.Discard)
    assert window.maybe_keep_changes()
    assert _recovery_files(_isolated_state_folder) == []


_EDIT_THEN_WAIT = """
import sys
from PySide6.QtWidgets import QApplication
from pmdc_sizer.app.gui.main_window import MainWindow, read_project
app = QApplication([])
window = MainWindow(read_project(sys.argv[1]), sys.argv[1])
window.show()
window.model.fields["load.torque_mNm"].propose(27.5, final=True)
print("edited", flush=True)
app.exec()
"""


def _editing_process(design_file: Path, state: Path, tmp_path: Path) -> subprocess.Popen:
    """Another pmdc-sizer process with ``design_file`` open and edited (it has said so on its stdout)."""
    environment = {**os.environ, "QT_QPA_PLATFORM": "offscreen", "PMDC_SIZER_STATE_DIR": str(state),
                   "PMDC_SIZER_CONFIG_DIR": str(tmp_path / "config")}
    child = subprocess.Popen([sys.executable, "-c", _EDIT_THEN_WAIT, str(design_file)], stdout=subprocess.PIPE,
                             stderr=subprocess.DEVNULL, text=True, cwd=REPO, env=environment)
    assert child.stdout.readline().strip() == "edited"
    return child


def test_a_design_killed_3_s_after_an_edit_is_offered_back(qtbot, design_file, tmp_path, monkeypatch,
                                                           _isolated_state_folder):
    # The acceptance test: SIGKILL 3 s after an edit; the next start offers the edit back, with its file and time.
    with _editing_process(design_file, _isolated_state_folder, tmp_path) as child:
        edited_at = time.time()
        time.sleep(3.0)
        child.send_signal(signal.SIGKILL)
        child.wait(timeout=30)
        child.stdout.close()
    assert child.returncode == -signal.SIGKILL
    window = MainWindow()
    qtbot.addWidget(window)
    dialog = recovery.offer_recovery(window, lambda project, file: window.adopt_recovered(project, file))
    assert dialog is not None and dialog.isVisible()
    (record,) = dialog.records
    assert record.file == design_file.resolve()
    assert edited_at - 1 <= record.saved_at.timestamp() <= edited_at + 3  # written after the edit, before the kill
    text = dialog.list.item(0).text()
    assert str(design_file.resolve()) in text and f"{record.saved_at:%H:%M}" in text
    dialog.restore_button.click()
    assert window.current_project.load.torque_mNm == 27.5
    assert window.current_path == design_file.resolve() and window.model.modified
    assert pf.load(design_file).load.torque_mNm == 35.0  # the file itself was never touched
    assert recovery.orphaned_records() == []  # the old copy is gone; the window keeps its own
    window.model.undo_stack.setClean()
    window.autosaver.close()


def test_discarding_all_recovered_designs(qtbot, _isolated_state_folder):
    folder = _isolated_state_folder / "recovery"
    folder.mkdir(parents=True, exist_ok=True)
    (folder / "gone.json").write_text(json.dumps({
        "saved_at": "2026-01-02T03:04:05+00:00", "file": None, "name": "lost design",
        "project": FERRITE.read_text(encoding="utf-8")}), encoding="utf-8")
    (folder / "damaged.json").write_text("{not json", encoding="utf-8")
    restored = []
    window = MainWindow()
    qtbot.addWidget(window)
    dialog = recovery.offer_recovery(window, lambda project, file: restored.append(project))
    assert [r.name for r in dialog.records] == ["lost design"]
    assert "never saved to a file" in dialog.list.item(0).text()
    dialog.discard_button.click()
    assert restored == [] and _recovery_files(_isolated_state_folder) == []
    window.autosaver.close()


# ------------------------------------------------------------------------------------------------
# The crash dialog


def test_a_defect_in_a_slot_shows_the_dialog_and_keeps_the_design(open_window, qtbot, design_file, tmp_path,
                                                                  _isolated_state_folder):
    window = open_window(design_file)
    window.model.fields["load.torque_mNm"].propose(33.0, final=True)
    hook = install_exception_hook(lambda: window)
    try:
        def defect():
            raise ZeroDivisionError("an invented defect in a slot")

        QTimer.singleShot(0, defect)
        qtbot.waitUntil(lambda: hook.dialog is not None and hook.dialog.isVisible(), timeout=WAIT_MS)
    finally:
        hook.uninstall()
    dialog = hook.dialog
    (report,) = hook.reports
    assert report.parent == _isolated_state_folder / "crash-reports"
    assert "an invented defect in a slot" in report.read_text(encoding="utf-8")
    assert str(report) in dialog.message.text() and "still open" in dialog.message.text()
    assert window.isVisible() and window.current_project.load.torque_mNm == 33.0  # the design is kept
    copy = dialog.save_copy(tmp_path / "pump (copy).toml")
    assert copy is not None and pf.load(copy).load.torque_mNm == 33.0
    assert "# measured at the pump" in copy.read_text(encoding="utf-8")
    assert pf.load(design_file).load.torque_mNm == 35.0 and window.model.modified  # a copy, not a save
    dialog.close()


def test_the_crash_dialog_without_a_report_says_so(qtbot):
    dialog = CrashDialog(RuntimeError("x"), None, None)
    qtbot.addWidget(dialog)
    assert "No crash report could be written" in dialog.message.text()
    assert not dialog.save_button.isEnabled()


# ------------------------------------------------------------------------------------------------
# A second writer, and a change on disk


def test_a_second_window_on_the_same_file_is_warned(open_window, qtbot, design_file, monkeypatch):
    # Before: a second window opened the same file without a word.
    open_window(design_file)
    second = open_window(FERRITE)
    warned = _record(monkeypatch, "warning", QMessageBox.StandardButton.Cancel)
    assert not second.open_file(design_file)
    assert len(warned) == 1 and "already open in pmdc-sizer (process" in warned[0][1]
    assert second.current_path == FERRITE
    warned = _record(monkeypatch, "warning", QMessageBox.StandardButton.Open)
    assert second.open_file(design_file) and second.current_path == Path(design_file)


def test_a_second_process_on_the_same_file_is_warned(open_window, qtbot, design_file, tmp_path, monkeypatch,
                                                    _isolated_state_folder):
    with _editing_process(design_file, _isolated_state_folder, tmp_path) as child:
        window = open_window(FERRITE)
        warned = _record(monkeypatch, "warning", QMessageBox.StandardButton.Cancel)
        opened = window.open_file(design_file)
        child.kill()
        child.wait(timeout=30)
        child.stdout.close()
    assert not opened and f"process {child.pid}" in warned[0][1]


def test_a_change_on_disk_is_caught_before_saving(open_window, qtbot, design_file, monkeypatch):
    # Before: a change written by someone else while the file was open was silently overwritten by Save.
    window = open_window(design_file)
    window.model.fields["load.torque_mNm"].propose(30.0, final=True)
    theirs = design_file.read_text(encoding="utf-8").replace("speed_rpm = 2800.0", "speed_rpm = 2900.0")
    design_file.write_text(theirs, encoding="utf-8")
    asked = _record(monkeypatch, "warning", QMessageBox.StandardButton.Cancel)
    assert not window.save_file()
    assert len(asked) == 1 and "changed by another program" in asked[0][1]
    assert design_file.read_text(encoding="utf-8") == theirs and window.model.modified
    _record(monkeypatch, "warning", QMessageBox.StandardButton.Yes)
    assert window.save_file()
    assert pf.load(design_file).load.torque_mNm == 30.0
    assert (design_file.parent / "pump.toml.bak").read_text(encoding="utf-8") == theirs  # theirs is kept
    again = _record(monkeypatch, "warning", QMessageBox.StandardButton.Cancel)
    window.model.fields["load.torque_mNm"].propose(29.0, final=True)
    assert window.save_file() and again == []  # the file is as this window left it: no question


# ------------------------------------------------------------------------------------------------
# Damaged files


@pytest.mark.parametrize("content", [
    b"format_version = 1\nx = " + b"[" * 500 + b"]" * 500,
    b"format_version = 1\n[supply]\nvoltage_V = " + b"9" * 5000,
    b"\xff\xfe\x00garbage",
])
def test_a_damaged_recent_file_opens_a_message_not_a_traceback(open_window, qtbot, tmp_path, monkeypatch, content,
                                                              capfd):
    # Before: opening it from the recent list printed a traceback to stderr and showed the user nothing.
    damaged = tmp_path / "damaged.toml"
    damaged.write_bytes(content)
    window = open_window(FERRITE)
    window.settings.add_recent_file(damaged)
    window._fill_recent_menu()
    shown = _record(monkeypatch, "critical")
    action = next(a for a in window.recent_menu.actions() if a.text() == str(damaged.resolve()))
    action.trigger()
    assert len(shown) == 1 and str(damaged) in shown[0][1] and "unchanged" in shown[0][1]
    assert window.current_path == FERRITE
    assert "Traceback" not in capfd.readouterr().err


def test_a_deeply_nested_settings_file_falls_back_to_the_defaults(qtbot):
    # Before: RecursionError, and the desktop tool did not start.
    settings_path().parent.mkdir(parents=True, exist_ok=True)
    settings_path().write_text('{"recent_files": ' + "[" * 100_000 + "]" * 100_000 + "}", encoding="utf-8")
    assert load_settings().recent_files == []
    window = MainWindow(read_project(FERRITE), FERRITE)
    qtbot.addWidget(window)
    assert window.settings.display_units == "SI"
    window.autosaver.close()
