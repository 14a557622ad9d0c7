"""One writer per project file, and no silent overwrite of a change made by someone else.

Each window keeps a :class:`FileGuard` for the file its design came from:

* **a lock**: opening a file takes an exclusive lock on it (``filelock``, held for as long as the window
  shows that file). A second window or process that opens the same file finds the lock taken and is
  told who holds it (process, machine, since when), so the user can open it anyway or not at all.
  The locks live in the state folder (``locks/``, one per file, named by a hash of its real path), not
  beside the project, so a read-only or shared project folder gets no litter; they therefore warn about
  writers on the same machine and account, which is where two windows of the tool meet.
* **a fingerprint**: the file's bytes (SHA-256) as they were when opened or last saved. Before a save
  over the same file the guard reads it again; if another program changed it meanwhile, the window asks
  before overwriting.
* **the layout**: the text the design was read from, so a save keeps the user's comments even when the
  design is saved under another name.
"""

from __future__ import annotations

import contextlib
import datetime
import hashlib
import json
import os
import socket
from dataclasses import dataclass
from pathlib import Path

import filelock

from pmdc_sizer.app.state import LOCK_FOLDER, state_subfolder
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.errors import ProjectError

UNCHANGED, CHANGED, MISSING = "unchanged", "changed", "missing"


@dataclass(frozen=True)
class LockHolder:
    """Who holds a project file's lock, as its holder wrote it down."""

    pid: int | None
    host: str
    since: str  #: ISO time the lock was taken

    def describe(self) -> str:
        """One phrase: ``process 1234 on bench-7 since 14:02``."""
        when = self.since[11:16] if len(self.since) >= 16 else self.since
        who = f"process {self.pid}" if self.pid else "another process"
        return f"{who} on {self.host or 'this machine'} since {when}".strip()


def _fingerprint(path: Path) -> str | None:
    try:
        return hashlib.sha256(path.read_bytes()).hexdigest()
    except OSError:
        return None


def _lock_paths(path: Path) -> tuple[Path, Path]:
    digest = hashlib.sha1(str(Path(os.path.realpath(path))).encode("utf-8")).hexdigest()[:20]
    folder = state_subfolder(LOCK_FOLDER)
    return folder / f"{digest}.lock", folder / f"{digest}.json"


class FileGuard:
    """The lock, fingerprint and layout of the one project file a window shows."""

    def __init__(self) -> None:
        self.path: Path | None = None
        self.layout: str | None = None  #: the text the design came from (comments to keep)
        self._fingerprint: str | None = None
        self._lock: filelock.BaseFileLock | None = None
        self._info: Path | None = None

    # -- the lock
    def holder_of(self, path: str | os.PathLike) -> LockHolder | None:
        """Who else holds ``path``'s lock, or None when it is free (or held by this guard).

        Parameters
        ----------
        path : str or os.PathLike
            A project file.

        Returns
        -------
        LockHolder or None
            None also when the lock folder cannot be used: a lock is a courtesy, never an obstacle.
        """
        path = Path(path)
        if self._lock is not None and self.path is not None and _same_file(self.path, path):
            return None
        try:
            lock_path, info_path = _lock_paths(path)
            probe = filelock.FileLock(lock_path, timeout=0)
            probe.acquire()
        except filelock.Timeout:
            return _read_holder(info_path)
        except OSError:
            return None
        probe.release()
        return None

    def _take_lock(self, path: Path) -> None:
        self.release_lock()
        try:
            lock_path, info_path = _lock_paths(path)
            lock = filelock.FileLock(lock_path, timeout=0)
            lock.acquire()
        except (filelock.Timeout, OSError):
            return  # someone else has it (the user chose to open anyway), or no lock folder
        self._lock, self._info = lock, info_path
        record = {"pid": os.getpid(), "host": socket.gethostname(), "path": str(path),
                  "since": datetime.datetime.now().astimezone().isoformat(timespec="seconds")}
        with contextlib.suppress(OSError):
            info_path.write_text(json.dumps(record), encoding="utf-8")

    def release_lock(self) -> None:
        """Let other windows and processes have the file."""
        if self._lock is not None:
            if self._info is not None:
                self._info.unlink(missing_ok=True)
            self._lock.release()
        self._lock = self._info = None

    @property
    def holds_lock(self) -> bool:
        return self._lock is not None

    # -- what the file was
    def opened(self, path: str | os.PathLike | None) -> None:
        """The window now shows ``path`` (None: a new design without a file): remember and lock it."""
        if path is None:
            self.path = self.layout = self._fingerprint = None
            self.release_lock()
            return
        self.path = Path(path)
        try:
            self.layout = project_file.read_text(self.path)
        except ProjectError:
            self.layout = None
        self._fingerprint = _fingerprint(self.path)
        self._take_lock(self.path)

    def saved(self, path: str | os.PathLike) -> None:
        """The design was just saved to ``path``: that is now the file, as it is on disk."""
        path = Path(path)
        moved = self.path is None or not _same_file(self.path, path)
        self.path = path
        with contextlib.suppress(ProjectError):
            self.layout = project_file.read_text(path)
        self._fingerprint = _fingerprint(path)
        if moved or self._lock is None:
            self._take_lock(path)

    def state_on_disk(self, path: str | os.PathLike) -> str:
        """Whether ``path`` is as it was when opened or last saved here.

        Parameters
        ----------
        path : str or os.PathLike
            The file about to be saved over.

        Returns
        -------
        str
            ``"unchanged"`` (or a file this guard has not seen: a save-as target), ``"changed"`` when
            its bytes differ, ``"missing"`` when it was deleted or moved away.
        """
        path = Path(path)
        if self.path is None or self._fingerprint is None or not _same_file(self.path, path):
            return UNCHANGED
        now = _fingerprint(path)
        if now is None:
            return MISSING
        return UNCHANGED if now == self._fingerprint else CHANGED


def _same_file(a: Path, b: Path) -> bool:
    return os.path.realpath(a) == os.path.realpath(b)


def _read_holder(info_path: Path) -> LockHolder:
    try:
        data = json.loads(info_path.read_text(encoding="utf-8"))
        pid = data.get("pid")
        return LockHolder(pid if isinstance(pid, int) else None, str(data.get("host", "")), str(data.get("since", "")))
    except (OSError, ValueError, AttributeError):
        return LockHolder(None, "", "")
