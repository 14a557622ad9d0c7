"""Writing a file so that a failure never costs the user the file they had.

Every file the tool writes (project files, datasheets, tables, charts, settings, recovery copies) goes
through :func:`replacing`, as trusted editors write:

1. the target is resolved: a symbolic link is followed, so the link stays and its target is written;
   a target that exists and is not a regular file (a device such as ``/dev/stdout``, a pipe, a folder)
   is refused rather than replaced by a regular file;
2. the new content goes to a temporary file in the target's own folder (so the rename cannot cross file
   systems), named ``.NAME.XXXXXXXX.pmdc-sizer.tmp``;
3. the temporary file is flushed to disk (fsync), its size and, where the caller gives one, a parse of
   it are checked; only then does it take the old file's permissions and owner (or the usual
   0666 less the umask for a new file);
4. with ``backup=True`` the previous version is kept as ``NAME.bak`` (a hard link where the file
   system has them, so a full disk does not stop it; a copy otherwise);
5. the temporary file is renamed over the target and the folder is flushed (fsync), so the rename
   itself survives a power cut.

A failure at any step removes the temporary file and leaves the target as it was, byte for byte. A
write killed outright (SIGKILL, power cut) can leave a temporary file; :func:`remove_stale_temporaries`
deletes those older than a minute, and every write clears its own folder's first.

This module is the one writer of the package; ``core.project.save`` uses it, and so does the app's
``app/files.py`` for everything else.
"""

from __future__ import annotations

import contextlib
import os
import shutil
import stat
import tempfile
import time
from collections.abc import Callable, Iterator
from pathlib import Path

TEMPORARY_SUFFIX = ".pmdc-sizer.tmp"  #: every temporary file this module makes ends so
BACKUP_SUFFIX = ".bak"  #: ``motor.toml`` keeps its previous version as ``motor.toml.bak``
STALE_AFTER_S = 60.0  #: a temporary file older than this belongs to a write that was killed
FULL_DISK_BYTES = 256 * 1024  #: less free space than this, and a quiet writer failure is put down to it
#: File systems whose "files" are not documents: writing a temporary file there makes no sense.
SPECIAL_FOLDERS = ("/dev/", "/proc/", "/sys/")


class FileWriteError(OSError):
    """A file could not be written, or was refused as a target; the message is one line for the user,
    naming the file, and the previous file is unchanged."""


def _kind_of(mode: int) -> str:
    if stat.S_ISDIR(mode):
        return "a folder"
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        return "a device"
    if stat.S_ISFIFO(mode):
        return "a named pipe"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not a regular file"


def resolve_target(path: str | os.PathLike[str]) -> Path:
    """The file a write to ``path`` really goes to, or :class:`FileWriteError` if it must not be written.

    Parameters
    ----------
    path : str or os.PathLike
        The target as the user gave it, perhaps a symbolic link or a file that does not exist yet.

    Returns
    -------
    Path
        ``path`` with symbolic links followed (a dangling link gives the file it names).

    Raises
    ------
    FileWriteError
        When the target is a device, a pipe, a socket or a folder, lies on a special file system, or its
        folder does not exist.
    """
    given = Path(path)
    target = Path(os.path.realpath(given))
    if any(str(target).startswith(folder) for folder in SPECIAL_FOLDERS) or str(given).startswith(SPECIAL_FOLDERS):
        raise FileWriteError(f"{given}: is a special file, not a document; write to a file name "
                             "(or '-' for standard output where the command offers it)")
    try:
        mode = target.stat().st_mode
    except FileNotFoundError:
        mode = None
    except OSError as error:
        raise FileWriteError(f"{given}: cannot write here ({error.strerror or error})") from None
    if mode is not None and not stat.S_ISREG(mode):
        raise FileWriteError(f"{given}: is {_kind_of(mode)}, not a file; choose a file name")
    if not target.parent.is_dir():
        raise FileWriteError(f"{given}: the folder {given.parent} does not exist")
    return target


def remove_stale_temporaries(folder: str | os.PathLike[str], older_than_s: float = STALE_AFTER_S) -> list[Path]:
    """Delete the temporary files of killed writes in ``folder``; returns those removed.

    Parameters
    ----------
    folder : str or os.PathLike
        A folder the tool writes into.
    older_than_s : float, optional
        Only files last changed longer ago than this [s] are removed, so a write in progress in another
        process is never disturbed.

    Returns
    -------
    list of Path
        The files removed (none when the folder cannot be read: clean-up never stands in the way).
    """
    removed: list[Path] = []
    now = time.time()
    try:
        entries = list(os.scandir(folder))
    except OSError:
        return removed
    for entry in entries:
        if not (entry.name.startswith(".") and entry.name.endswith(TEMPORARY_SUFFIX)):
            continue
        try:
            if entry.is_file(follow_symlinks=False) and now - entry.stat(follow_symlinks=False).st_mtime > older_than_s:
                os.unlink(entry.path)
                removed.append(Path(entry.path))
        except OSError:
            continue
    return removed


def _if_full(target: Path) -> str:
    """``", the disk is full"`` when that is the likely reason a writer failed quietly, else ``""``."""
    try:
        free = shutil.disk_usage(target.parent).free
    except OSError:
        return ""
    return ", the disk is full" if free < FULL_DISK_BYTES else ""


def _fsync_folder(folder: Path) -> None:
    if os.name == "nt":  # Windows cannot open a folder for fsync; NTFS journals the rename itself
        return
    handle = os.open(folder, os.O_RDONLY)
    try:
        os.fsync(handle)
    except OSError as error:  # some file systems (and FUSE mounts) cannot flush a folder
        if error.errno not in (22, 95):  # EINVAL, EOPNOTSUPP
            raise
    finally:
        os.close(handle)


def _temporary_beside(target: Path, tag: str = "") -> Path:
    handle, name = tempfile.mkstemp(prefix=f".{target.name}.{tag}", suffix=TEMPORARY_SUFFIX, dir=target.parent)
    os.close(handle)
    return Path(name)


def _keep_backup(target: Path) -> None:
    backup = target.with_name(target.name + BACKUP_SUFFIX)
    temporary = _temporary_beside(target, "bak.")
    try:
        temporary.unlink()
        try:
            os.link(target, temporary)  # no data to copy: works on a full disk, keeps the old inode
        except OSError:
            shutil.copy2(target, temporary)
        os.replace(temporary, backup)
    finally:
        temporary.unlink(missing_ok=True)


def _take_permissions(temporary: Path, previous: os.stat_result | None) -> None:
    if previous is None:
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(temporary, 0o666 & ~umask)
        return
    os.chmod(temporary, stat.S_IMODE(previous.st_mode))
    if hasattr(os, "chown"):
        with contextlib.suppress(OSError):  # only the owner's group, or root, may hand a file on
            os.chown(temporary, previous.st_uid, previous.st_gid)


@contextlib.contextmanager
def replacing(path: str | os.PathLike[str], *, backup: bool = False,
              verify: Callable[[Path], None] | None = None) -> Iterator[Path]:
    """A temporary file to write into, put in the place of ``path`` only if the block and the checks succeed.

    Parameters
    ----------
    path : str or os.PathLike
        The file to write (see :func:`resolve_target` for what is refused).
    backup : bool, optional
        Keep the previous version of ``path`` as ``path.bak``.
    verify : callable, optional
        Called with the temporary file once it is on disk; raises ``ValueError`` (or ``OSError``) with
        a reason if the file is not what it should be, and the target is then left alone.

    Yields
    ------
    Path
        The temporary file (already created, empty) in the target's folder.

    Raises
    ------
    FileWriteError
        One line naming ``path`` and the reason; the target is unchanged and no temporary file is left.
    """
    given = Path(path)
    target = resolve_target(given)
    remove_stale_temporaries(target.parent)
    try:
        previous = target.stat()
    except FileNotFoundError:
        previous = None
    except OSError as error:
        raise FileWriteError(f"{given}: cannot write the file ({error.strerror or error})") from None
    try:
        temporary = _temporary_beside(target)
    except OSError as error:
        raise FileWriteError(f"{given}: cannot write here ({error.strerror or error})") from None
    try:
        yield temporary
        handle = os.open(temporary, os.O_RDWR)
        try:
            os.fsync(handle)
        finally:
            os.close(handle)
        if verify is not None:
            try:
                verify(temporary)
            except (ValueError, OSError) as error:
                raise FileWriteError(f"{given}: the file written did not check out ({error}{_if_full(target)}); "
                                     "the previous file is unchanged") from None
        _take_permissions(temporary, previous)
        if backup and previous is not None:
            _keep_backup(target)
        os.replace(temporary, target)
        _fsync_folder(target.parent)
    except FileWriteError:
        raise
    except OSError as error:
        raise FileWriteError(f"{given}: cannot write the file ({error.strerror or error}); the previous file, "
                             "if any, is unchanged") from None
    finally:
        temporary.unlink(missing_ok=True)


def write_bytes(path: str | os.PathLike[str], data: bytes, *, backup: bool = False,
                verify: Callable[[Path], None] | None = None) -> None:
    """Write ``data`` to ``path`` through :func:`replacing`, checking the size on disk first.

    Parameters
    ----------
    path : str or os.PathLike
        The file to write.
    data : bytes
        The whole content.
    backup : bool, optional
        Keep the previous version as ``path.bak``.
    verify : callable, optional
        A further check of the written file (see :func:`replacing`).

    Raises
    ------
    FileWriteError
        One line naming ``path``; the previous file is unchanged.
    """

    def check(temporary: Path) -> None:
        written = temporary.stat().st_size
        if written != len(data):
            raise ValueError(f"{written} bytes on disk instead of {len(data)}")
        if verify is not None:
            verify(temporary)

    with replacing(path, backup=backup, verify=check) as temporary, open(temporary, "wb") as stream:
        stream.write(data)
        stream.flush()


__all__ = ["BACKUP_SUFFIX", "TEMPORARY_SUFFIX", "FileWriteError", "remove_stale_temporaries", "replacing",
           "resolve_target", "write_bytes"]
