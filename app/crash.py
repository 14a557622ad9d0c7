"""What happens when pmdc-sizer itself fails: a crash report in a file, one line on the screen.

A defect must never look like a bad input or a design without a solution, and a traceback is of no
use to the engineer at the screen: the command line's top-level guard and the desktop tool's
exception hook both call :func:`write_crash_report`, which puts the traceback, the command and the
versions in ``crash-reports/`` under the state folder (:mod:`app.state`), and show one line saying where
it is. If even that file cannot be written the traceback goes to stderr, the one place left.
"""

from __future__ import annotations

import datetime
import os
import platform
import sys
import traceback
from pathlib import Path

from .state import CRASH_FOLDER, state_subfolder

MAX_CRASH_REPORTS = 50  #: older reports beyond this many are deleted, so the folder cannot grow without end


def _versions() -> str:
    from importlib import metadata

    lines = [f"python {platform.python_version()} on {platform.platform()}"]
    for name in ("pmdc-sizer", "numpy", "scipy", "pydantic", "tomlkit", "PySide6-Essentials"):
        try:
            lines.append(f"{name} {metadata.version(name)}")
        except metadata.PackageNotFoundError:
            continue
    return "\n".join(lines)


def crash_report_text(error: BaseException, context: str = "") -> str:
    """The text of a crash report: when, what was running, versions, and the full traceback.

    Parameters
    ----------
    error : BaseException
        The exception that escaped.
    context : str, optional
        What was being done (the command line, or "desktop tool").

    Returns
    -------
    str
        Plain text for the report file.
    """
    when = datetime.datetime.now().astimezone().isoformat(timespec="seconds")
    trace = "".join(traceback.format_exception(type(error), error, error.__traceback__))
    return (f"pmdc-sizer crash report, {when}\n"
            f"while: {context or 'running'}\n"
            f"command line: {' '.join(sys.argv)}\n\n{_versions()}\n\n{trace}")


def _prune(folder: Path) -> None:
    reports = sorted(folder.glob("crash-*.txt"))
    for old in reports[:-MAX_CRASH_REPORTS]:
        old.unlink(missing_ok=True)


def write_crash_report(error: BaseException, context: str = "") -> Path | None:
    """Write a crash report for ``error``; returns its path, or None if no report could be written.

    Parameters
    ----------
    error, context
        As for :func:`crash_report_text`, which words the report.

    Returns
    -------
    Path or None
        The report file (``crash-YYYYmmdd-HHMMSS-PID.txt``), or None when the state folder cannot be
        written (the caller then prints the traceback instead).
    """
    from .files import write_text_atomically

    try:
        folder = state_subfolder(CRASH_FOLDER)
        stamp = datetime.datetime.now().strftime("%Y%m%d-%H%M%S")
        path = folder / f"crash-{stamp}-{os.getpid()}.txt"
        write_text_atomically(path, crash_report_text(error, context), remember_folder=False)
        _prune(folder)
        return path
    except Exception:  # noqa: BLE001 - the report of one failure must not raise another
        return None


def report_line(error: BaseException, context: str = "") -> str:
    """Write the crash report and say in one line where it is (the traceback on stderr as a last resort).

    Parameters
    ----------
    error : BaseException
        The exception that escaped; the line names its type.
    context : str, optional
        What was being done, for the report (:func:`write_crash_report`).

    Returns
    -------
    str
        One line for the user.
    """
    path = write_crash_report(error, context)
    kind = type(error).__name__
    if path is None:
        traceback.print_exception(type(error), error, error.__traceback__, file=sys.stderr)
        return f"internal error ({kind}); this is a defect in pmdc-sizer, and no crash report could be written"
    return (f"internal error ({kind}), a defect in pmdc-sizer; the report is in {path}. Please send it "
            "with the project file")


