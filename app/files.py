"""Files the app writes: every one through the one safe writer, and the speed-torque table as CSV.

Every export, table, chart, settings file and recovery copy goes through
``pmdc_sizer.core.atomic_files`` (the same writer ``core.project.save`` uses): a temporary file in the
target's folder, flushed to disk, its size and a parse of it checked (``verify``, see
:mod:`app.export_checks`), the old file's permissions kept, renamed over the target, the folder flushed.
A failure (a full disk, a folder in the way, an exception while drawing, a file that does not check
out) leaves the old file byte for byte, or nothing, never half a file. A symbolic link is written
through; a device, pipe or folder is refused as a target (``-`` means standard output where a command
offers it). Failures are :class:`CommandError` with one line.

The folders written into are remembered in the state folder so that :func:`clean_up_stale_temporaries`
can remove, at the next start, the temporary files of writes that were killed.
"""

from __future__ import annotations

import contextlib
import csv
import io
import os
import sys
from collections.abc import Callable, Iterable, Iterator
from pathlib import Path

from pmdc_sizer.core import atomic_files
from pmdc_sizer.core.units import from_si

from .errors import CommandError
from .state import WRITTEN_FOLDERS_FILE, state_folder

STDOUT = "-"  #: the one spelling of standard output as an output file
MAX_REMEMBERED_FOLDERS = 200

Check = Callable[[Path], None]


def _remember_folder(target: str | os.PathLike) -> None:
    """Note the folder of ``target`` for the clean-up at the next start (best effort, never in the way)."""
    try:
        folder = str(Path(os.path.realpath(target)).parent)
        journal = state_folder() / WRITTEN_FOLDERS_FILE
        known = journal.read_text(encoding="utf-8").splitlines() if journal.is_file() else []
        if folder in known:
            return
        journal.parent.mkdir(parents=True, exist_ok=True)
        lines = [*known, folder][-MAX_REMEMBERED_FOLDERS:]
        atomic_files.write_bytes(journal, ("\n".join(lines) + "\n").encode("utf-8"))
    except (OSError, UnicodeDecodeError):
        return


def clean_up_stale_temporaries(extra_folders: Iterable[str | os.PathLike] = ()) -> list[Path]:
    """Remove the temporary files of killed writes (older than a minute) in every folder the tool wrote to.

    Parameters
    ----------
    extra_folders : iterable of path-like, optional
        Further folders to sweep (the desktop tool adds those of its recent files).

    Returns
    -------
    list of Path
        The files removed.
    """
    folders: list[str] = [str(Path(f)) for f in extra_folders]
    with contextlib.suppress(OSError, UnicodeDecodeError):
        journal = state_folder() / WRITTEN_FOLDERS_FILE
        if journal.is_file():
            folders += journal.read_text(encoding="utf-8").splitlines()
    removed: list[Path] = []
    for folder in dict.fromkeys(f for f in folders if f):
        removed += atomic_files.remove_stale_temporaries(folder)
    return removed


@contextlib.contextmanager
def atomic_output(path: str | os.PathLike, verify: Check | None = None, backup: bool = False,
                  remember_folder: bool = True) -> Iterator[str]:
    """A temporary path beside ``path`` to write into, put over ``path`` only if the block and ``verify`` succeed.

    Nothing is left behind on failure. A new file gets the usual permissions (0666 less the umask),
    not the private 0600 of a temporary file, since exports are meant to be handed on; a replaced file
    keeps its own.
    """
    if remember_folder:
        _remember_folder(path)
    try:
        with atomic_files.replacing(path, backup=backup, verify=verify) as temporary:
            yield str(temporary)
    except atomic_files.FileWriteError as error:
        raise CommandError(str(error)) from None


def write_bytes_atomically(path: str | os.PathLike, data: bytes, verify: Check | None = None,
                           remember_folder: bool = True) -> None:
    """Write ``data`` to ``path`` safely; the size on disk and ``verify`` are checked before the rename."""
    if remember_folder:
        _remember_folder(path)
    try:
        atomic_files.write_bytes(path, data, verify=verify)
    except atomic_files.FileWriteError as error:
        raise CommandError(str(error)) from None


def write_text_atomically(path: str | os.PathLike, text: str, verify: Check | None = None,
                          remember_folder: bool = True) -> None:
    """Write ``text`` (UTF-8, line ends as given) to ``path`` through :func:`write_bytes_atomically`."""
    write_bytes_atomically(path, text.encode("utf-8"), verify, remember_folder)


def write_text_or_stdout(path: str | os.PathLike, text: str, verify: Check | None = None) -> None:
    """Write ``text`` to ``path``, or to standard output when ``path`` is ``-``."""
    if str(path) == STDOUT:
        sys.stdout.write(text)
        sys.stdout.flush()
    else:
        write_text_atomically(path, text, verify)


#: The curve table's columns: (CSV header with its unit, field of core's CurveData, unit shown).
CURVE_COLUMNS = (
    ("torque_mN_m", "torque_N_m", "mN·m"),
    ("speed_rpm", "speed_rad_per_s", "rpm"),
    ("current_A", "current_A", "A"),
    ("input_power_W", "input_power_W", "W"),
    ("output_power_W", "output_power_W", "W"),
    ("efficiency_pct", "efficiency", "%"),
    ("copper_loss_W", "copper_loss_W", "W"),
    ("brush_loss_W", "brush_loss_W", "W"),
    ("friction_loss_W", "friction_loss_W", "W"),
    ("viscous_loss_W", "viscous_loss_W", "W"),
    ("iron_loss_W", "iron_loss_W", "W"),
)


def curves_csv(results, cases=("cold", "nominal", "hot")) -> str:
    """The speed-torque tables of the chosen cases as CSV; the header names every unit."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["case", "winding_temperature_C", "magnet_temperature_C"] + [c[0] for c in CURVE_COLUMNS])
    for case in results.cases:
        if case.name not in cases:
            continue
        columns = [from_si(getattr(case.curve, field), unit) for _, field, unit in CURVE_COLUMNS]
        for row in zip(*columns, strict=True):
            writer.writerow([case.name, f"{case.winding_temperature_C:.2f}", f"{case.magnet_temperature_C:.2f}"]
                            + [f"{v:.6g}" for v in row])
    return buffer.getvalue()
