"""The user's state folder: crash reports, recovery copies of unsaved designs, file locks.

``$PMDC_SIZER_STATE_DIR`` if set (the tests point it at a temporary folder), else
``platformdirs.user_state_dir("pmdc-sizer")`` (``~/.local/state/pmdc-sizer`` on Linux,
``~/Library/Application Support/pmdc-sizer`` on macOS, ``%LOCALAPPDATA%\\pmdc-sizer`` on Windows).
Nothing in it is needed to open a project: it only keeps what would otherwise be lost.
"""

from __future__ import annotations

import os
from pathlib import Path

CRASH_FOLDER = "crash-reports"
RECOVERY_FOLDER = "recovery"
LOCK_FOLDER = "locks"
WRITTEN_FOLDERS_FILE = "written-folders.txt"  #: folders the tool wrote into, for the clean-up at start


def state_folder() -> Path:
    """The state folder (not created here).

    Returns
    -------
    Path
        ``$PMDC_SIZER_STATE_DIR`` or the platform's user state folder for pmdc-sizer.
    """
    override = os.environ.get("PMDC_SIZER_STATE_DIR")
    if override:
        return Path(override)
    import platformdirs

    return Path(platformdirs.user_state_dir("pmdc-sizer", appauthor=False))


def state_subfolder(name: str) -> Path:
    """A subfolder of the state folder, created if need be (OSError if it cannot be).

    Parameters
    ----------
    name : str
        One of the ``*_FOLDER`` names.

    Returns
    -------
    Path
        The folder.
    """
    folder = state_folder() / name
    folder.mkdir(parents=True, exist_ok=True)
    return folder
