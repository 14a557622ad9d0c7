"""On a full disk every write fails cleanly and the previous file is intact, byte for byte.

The full disk is real: a small tmpfs mounted in a private mount namespace (``unshare -m``, as root), so
nothing outside the test sees it. Where the machine does not allow that (no ``unshare``, not root, a
container without CAP_SYS_ADMIN), the tests are skipped and say why; they never pass without running.

Before the fix, ``datasheet DEMO -o sheet.pdf`` on a full disk printed "wrote the PDF datasheet", exited
0 and replaced a good file with an unreadable one: the PDF writer's result was never checked before the
rename, and the temporary file was not flushed.
"""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

from ..conftest import DEMO_FOLDER

REPO = Path(__file__).resolve().parents[2]
FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"
DISK_SIZE = "4m"  # room for the previous files (a 1.3 MB PDF) and a little more, then filled up


def _namespace_problem(folder: Path) -> str:
    if shutil.which("unshare") is None:
        return "unshare(1) is not installed"
    probe = subprocess.run(["unshare", "-m", "sh", "-c", f"mount -t tmpfs -o size=64k tmpfs '{folder}'"],
                           capture_output=True, text=True, timeout=60)
    if probe.returncode != 0:
        return f"cannot mount a tmpfs in a private mount namespace here: {probe.stderr.strip() or probe.returncode}"
    return ""


@pytest.fixture(scope="module")
def previous_files(tmp_path_factory):
    """Good files of every kind, made on an ordinary disk, to be put on the full one."""
    folder = tmp_path_factory.mktemp("previous")
    problem = _namespace_problem(folder)
    if problem:
        pytest.skip(problem)
    from pmdc_sizer.app import datasheet
    from pmdc_sizer.app.files import curves_csv
    from pmdc_sizer.core.evaluate import evaluate
    from pmdc_sizer.core.project import load

    project = load(FERRITE)
    results = evaluate(project)
    datasheet.export(project, results, folder / "sheet.pdf")
    datasheet.export(project, results, folder / "sheet.html")
    (folder / "curves.csv").write_text(curves_csv(results), encoding="utf-8")
    shutil.copy(FERRITE, folder / "design.toml")
    return folder


#: Runs inside the namespace with the tmpfs mounted at argv[1]: seeds the previous files, fills the disk,
#: tries every write, and prints what happened as JSON.
_ON_THE_FULL_DISK = textwrap.dedent("""
    import hashlib, json, os, shutil, subprocess, sys
    disk, previous, demo, state = sys.argv[1:5]
    for name in os.listdir(previous):
        shutil.copy(os.path.join(previous, name), disk)
    before = {n: hashlib.sha256(open(os.path.join(disk, n), "rb").read()).hexdigest() for n in os.listdir(disk)}
    filler = os.open(os.path.join(disk, "filler"), os.O_WRONLY | os.O_CREAT)
    for block in (65536, 4096, 512, 1):
        try:
            while True:
                os.write(filler, b"x" * block)
        except OSError:
            pass
    os.close(filler)
    env = dict(os.environ, PMDC_SIZER_STATE_DIR=state, QT_QPA_PLATFORM="offscreen")
    def cli(*argv):
        done = subprocess.run([sys.executable, "-m", "pmdc_sizer.app.cli", *argv], capture_output=True, text=True,
                              env=env, timeout=300)
        return {"status": done.returncode, "stderr": done.stderr}
    outcome = {
        "pdf": cli("datasheet", demo, "-o", os.path.join(disk, "sheet.pdf")),
        "html": cli("datasheet", demo, "-o", os.path.join(disk, "sheet.html")),
        "csv": cli("curves", demo, "-o", os.path.join(disk, "curves.csv")),
    }
    saver = '''
    import sys
    from pmdc_sizer.core import project as pf
    project = pf.with_values(pf.load(sys.argv[1]), {"load.torque_mNm": 30.0})
    try:
        pf.save(project, sys.argv[2])
    except pf.ProjectError as error:
        print(error, file=sys.stderr)
        sys.exit(2)
    '''
    done = subprocess.run([sys.executable, "-c", saver, demo, os.path.join(disk, "design.toml")],
                          capture_output=True, text=True, env=env, timeout=300)
    outcome["project"] = {"status": done.returncode, "stderr": done.stderr}
    window = '''
    import sys
    from PySide6.QtWidgets import QApplication, QMessageBox
    from pmdc_sizer.app.gui.main_window import MainWindow, read_project
    app = QApplication([])
    shown = []
    QMessageBox.critical = staticmethod(lambda parent, title, text, *a: shown.append(title + ": " + text))
    window = MainWindow(read_project(sys.argv[1]), sys.argv[1])
    window.model.propose("load.torque_mNm", 30.0, final=True)
    saved = window.save_file_as(sys.argv[2])
    still_there = window.model.modified and window.current_project.load.torque_mNm == 30.0
    window.model.undo_stack.setClean()
    window.close()
    print(shown[0] if shown else "no dialog", file=sys.stderr)
    sys.exit(0 if saved else (2 if shown and still_there else 1))
    '''
    done = subprocess.run([sys.executable, "-c", window, demo, os.path.join(disk, "design.toml")],
                          capture_output=True, text=True, env=env, timeout=300)
    outcome["gui_save"] = {"status": done.returncode, "stderr": done.stderr}
    after = {n: hashlib.sha256(open(os.path.join(disk, n), "rb").read()).hexdigest() for n in before}
    outcome["intact"] = {n: before[n] == after[n] for n in before}
    outcome["left"] = sorted(n for n in os.listdir(disk) if n not in before and n != "filler")
    print(json.dumps(outcome))
""")


@pytest.fixture(scope="module")
def full_disk_outcome(previous_files, tmp_path_factory):
    disk = tmp_path_factory.mktemp("full_disk")
    state = tmp_path_factory.mktemp("state_outside")
    script = tmp_path_factory.mktemp("script") / "on_full_disk.py"
    script.write_text(_ON_THE_FULL_DISK, encoding="utf-8")
    done = subprocess.run(
        ["unshare", "-m", "sh", "-c",
         f"mount -t tmpfs -o size={DISK_SIZE} tmpfs '{disk}' && exec '{sys.executable}' '{script}' '{disk}' "
         f"'{previous_files}' '{FERRITE}' '{state}'"],
        capture_output=True, text=True, cwd=REPO, timeout=900)
    assert done.returncode == 0, done.stderr
    return json.loads(done.stdout.splitlines()[-1])


@pytest.mark.parametrize("kind", ["pdf", "html", "csv"])
def test_exports_fail_with_exit_2_in_one_line(full_disk_outcome, kind):
    outcome = full_disk_outcome[kind]
    assert outcome["status"] == 2, outcome
    lines = outcome["stderr"].splitlines()
    assert len(lines) == 1 and lines[0].startswith("pmdc-sizer: error: ") and "Traceback" not in outcome["stderr"]
    assert "unchanged" in lines[0] or "No space left" in lines[0]


def test_a_project_save_fails_with_its_reason(full_disk_outcome):
    outcome = full_disk_outcome["project"]
    assert outcome["status"] == 2 and "design.toml" in outcome["stderr"], outcome


def test_the_desktop_tool_shows_a_dialog_and_keeps_the_design(full_disk_outcome):
    outcome = full_disk_outcome["gui_save"]
    assert outcome["status"] == 2, outcome
    assert outcome["stderr"].startswith("Cannot save the design: ") and "still open, unsaved" in outcome["stderr"]


def test_every_previous_file_is_intact_byte_for_byte(full_disk_outcome):
    assert full_disk_outcome["intact"] == {"sheet.pdf": True, "sheet.html": True, "curves.csv": True,
                                           "design.toml": True}
    assert full_disk_outcome["left"] == []  # no temporary file, no half backup
