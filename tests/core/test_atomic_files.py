"""The one safe writer: symbolic links written through, permissions kept, one backup, special files refused,
file and folder flushed, a write that does not check out never replacing anything, stale temporaries cleaned."""

from __future__ import annotations

import os
import stat
import time
from pathlib import Path

import pytest

from pmdc_sizer.core import atomic_files
from pmdc_sizer.core.atomic_files import FileWriteError, remove_stale_temporaries, write_bytes


def test_a_new_file_gets_the_usual_permissions(tmp_path):
    umask = os.umask(0o022)
    try:
        write_bytes(tmp_path / "new.txt", b"hello")
    finally:
        os.umask(umask)
    assert stat.S_IMODE((tmp_path / "new.txt").stat().st_mode) == 0o644
    assert sorted(p.name for p in tmp_path.iterdir()) == ["new.txt"]


@pytest.mark.parametrize("mode", [0o600, 0o664, 0o640])
def test_a_replaced_file_keeps_its_permissions(tmp_path, mode):
    # Before: every save came back 0644 (0666 less the umask), whatever the file had.
    target = tmp_path / "design.toml"
    target.write_bytes(b"old")
    target.chmod(mode)
    write_bytes(target, b"new")
    assert target.read_bytes() == b"new"
    assert stat.S_IMODE(target.stat().st_mode) == mode


def test_a_symbolic_link_is_written_through_to_its_target(tmp_path):
    # Before: the link was replaced by a regular file and the real file was left unchanged.
    real = tmp_path / "real" / "design.toml"
    real.parent.mkdir()
    real.write_bytes(b"old")
    link = tmp_path / "link.toml"
    link.symlink_to(real)
    write_bytes(link, b"new")
    assert link.is_symlink() and os.readlink(link) == str(real)
    assert real.read_bytes() == b"new"


def test_backup_keeps_the_previous_version(tmp_path):
    target = tmp_path / "design.toml"
    target.write_bytes(b"version 1")
    write_bytes(target, b"version 2", backup=True)
    assert target.read_bytes() == b"version 2"
    assert (tmp_path / "design.toml.bak").read_bytes() == b"version 1"
    write_bytes(target, b"version 3", backup=True)  # one backup: the version before the last save
    assert (tmp_path / "design.toml.bak").read_bytes() == b"version 2"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["design.toml", "design.toml.bak"]


def test_no_backup_of_a_file_that_did_not_exist(tmp_path):
    write_bytes(tmp_path / "design.toml", b"first", backup=True)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["design.toml"]


@pytest.mark.parametrize("target", ["/dev/null", "/dev/stdout", "/dev/full", "/proc/self/fd/1"])
def test_special_files_are_refused(target):
    # Before: `-o /dev/stdout` replaced the device node with a regular file (as root) or failed obscurely.
    with pytest.raises(FileWriteError, match="special file"):
        write_bytes(target, b"x")


def test_a_fifo_and_a_folder_are_refused(tmp_path):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    with pytest.raises(FileWriteError, match="named pipe"):
        write_bytes(fifo, b"x")
    assert stat.S_ISFIFO(fifo.stat().st_mode)
    (tmp_path / "folder").mkdir()
    with pytest.raises(FileWriteError, match="is a folder"):
        write_bytes(tmp_path / "folder", b"x")


def test_file_and_folder_are_flushed(tmp_path, monkeypatch):
    # Before: the PDF's temporary file was never fsynced, nor was any folder after its rename.
    flushed: list[str] = []
    real_fsync = os.fsync

    def recording_fsync(handle):
        flushed.append(os.readlink(f"/proc/self/fd/{handle}"))
        real_fsync(handle)

    monkeypatch.setattr(atomic_files.os, "fsync", recording_fsync)
    target = tmp_path / "sheet.pdf"
    with atomic_files.replacing(target) as temporary:
        temporary.write_bytes(b"%PDF-")
    assert any(name.endswith(atomic_files.TEMPORARY_SUFFIX) for name in flushed), flushed  # the file
    assert str(tmp_path) in flushed  # the folder, after the rename


def test_a_file_that_does_not_check_out_replaces_nothing(tmp_path):
    target = tmp_path / "sheet.pdf"
    target.write_bytes(b"the good old datasheet")

    def refuse(_written: Path) -> None:
        raise ValueError("the PDF ends early")

    with pytest.raises(FileWriteError, match=r"did not check out.*the PDF ends early.*previous file is unchanged"):
        write_bytes(target, b"%PDF- half", verify=refuse)
    assert target.read_bytes() == b"the good old datasheet"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["sheet.pdf"]


def test_a_failing_writer_leaves_the_target_and_no_temporary(tmp_path):
    target = tmp_path / "sheet.pdf"
    target.write_bytes(b"good")
    with pytest.raises(RuntimeError), atomic_files.replacing(target) as temporary:
        temporary.write_bytes(b"half")
        raise RuntimeError("the painter failed")
    assert target.read_bytes() == b"good"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["sheet.pdf"]


def test_stale_temporaries_older_than_a_minute_are_removed(tmp_path):
    # Before: a killed export left `.sheet.pdf.XXXX.tmp` files that nothing ever removed.
    stale = tmp_path / f".sheet.pdf.abc123{atomic_files.TEMPORARY_SUFFIX}"
    fresh = tmp_path / f".other.pdf.def456{atomic_files.TEMPORARY_SUFFIX}"
    unrelated = tmp_path / ".hidden.tmp"
    for path in (stale, fresh, unrelated):
        path.write_bytes(b"x")
    two_minutes_ago = time.time() - 120
    os.utime(stale, (two_minutes_ago, two_minutes_ago))
    os.utime(unrelated, (two_minutes_ago, two_minutes_ago))
    assert remove_stale_temporaries(tmp_path) == [stale]
    assert fresh.exists() and unrelated.exists() and not stale.exists()


def test_every_write_clears_its_folder_of_stale_temporaries(tmp_path):
    stale = tmp_path / f".design.toml.zz{atomic_files.TEMPORARY_SUFFIX}"
    stale.write_bytes(b"x")
    os.utime(stale, (time.time() - 300, time.time() - 300))
    write_bytes(tmp_path / "design.toml", b"new")
    assert not stale.exists()


def test_a_missing_folder_is_named(tmp_path):
    with pytest.raises(FileWriteError, match="does not exist"):
        write_bytes(tmp_path / "no" / "such.toml", b"x")
