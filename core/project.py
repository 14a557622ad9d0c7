"""The project file: one complete motor design as human-editable, versioned TOML, read and written.

Loading never half-succeeds: a file is read, parsed and validated (:func:`fit_rules.validate`) or
refused with one line naming the file, the key and the limit; a file from a newer format version is
refused with a clear message. Saving writes a temporary file in the same folder and renames it over
the target.

The schema (:mod:`schema`, its flat key list in :mod:`keys`), the fit rules (:mod:`fit_rules`) and
what-if edits (:mod:`edits`) live in modules of their own; their public names are re-exported here so that ``project.load``,
``project.with_values`` and ``project.Project`` read naturally at the call site.
"""

from __future__ import annotations

import os
import tempfile
import tomllib
from pathlib import Path

import tomli_w

from .edits import get_value, with_values
from .errors import ProjectError
from .fit_rules import check_fit, validate
from .keys import KeySpec, format_validation_error, key_spec, key_specs
from .schema import (
    FORMAT_VERSION,
    MAY_BE_LEFT_OUT,
    SECTIONS,
    CustomGrade,
    Project,
    to_dict,
)


def parse(text: str, source: str = "project") -> Project:
    """A validated project from the text of a project file.

    Parameters
    ----------
    text : str
        TOML text.
    source : str
        What to call it in messages (the file's path).

    Returns
    -------
    Project
        Validated.

    Raises
    ------
    ProjectError
        Naming the file, the key and the limit.
    """
    if not text.strip():
        raise ProjectError(f"{source}: the file is empty")
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise ProjectError(f"{source}: not a valid TOML file ({error})") from None
    return validate(data)


def load(path: str | os.PathLike[str]) -> Project:
    """Read and validate a project file; never returns half a design.

    Parameters
    ----------
    path : str or os.PathLike
        The project file (UTF-8 TOML).

    Returns
    -------
    Project
        Validated.

    Raises
    ------
    ProjectError
        Naming the file, and the key and the limit where a value is at fault: a file that cannot be
        read, is binary or not UTF-8, is not TOML, or does not validate.
    """
    path = Path(path)
    try:
        raw = path.read_bytes()
    except OSError as error:
        raise ProjectError(f"{path}: cannot read the file ({error.strerror or error})") from None
    if b"\x00" in raw:
        raise ProjectError(f"{path}: this is a binary file, not a project file")
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise ProjectError(f"{path}: the file is not UTF-8 text") from None
    try:
        return parse(text, source=str(path))
    except ProjectError as error:
        message = str(error)
        if message.startswith(str(path)):
            raise
        raise ProjectError(f"{path}: {message}", key=error.key) from None


_HEADER = (
    "# pmdc-sizer project file. Keys carry their units in their names; every key is described in\n"
    "# docs/project-file.md. Lengths in mm, temperatures in °C, torques in mN·m, speeds in rpm.\n"
)


def dumps(project: Project) -> str:
    """The text of a project file for ``project``, with a header that says where the keys are described.

    Parameters
    ----------
    project : Project
        A validated project.

    Returns
    -------
    str
        TOML text.
    """
    return _HEADER + tomli_w.dumps(to_dict(project))


def save(project: Project, path: str | os.PathLike[str]) -> None:
    """Write a project file atomically: a temporary file in the same folder, flushed, renamed over ``path``.

    Parameters
    ----------
    project : Project
        A validated project.
    path : str or os.PathLike
        The file to write; an existing file is replaced only once the new one is complete.

    Raises
    ------
    ProjectError
        Naming the file, when the folder or the file cannot be written (no temporary file is left).
    """
    path = Path(path)
    text = dumps(project)
    folder = path.parent if str(path.parent) else Path(".")
    try:
        handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    except OSError as error:
        raise ProjectError(f"{path}: cannot write here ({error.strerror or error})") from None
    try:
        with os.fdopen(handle, "w", encoding="utf-8", newline="\n") as stream:
            stream.write(text)
            stream.flush()
            os.fsync(stream.fileno())
        # mkstemp makes the file private (0600); a project file is an ordinary document
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(temporary, 0o666 & ~umask)
        os.replace(temporary, path)
    except OSError as error:
        Path(temporary).unlink(missing_ok=True)
        raise ProjectError(f"{path}: cannot write the file ({error.strerror or error})") from None


__all__ = [
    "FORMAT_VERSION", "MAY_BE_LEFT_OUT", "SECTIONS", "CustomGrade", "KeySpec", "Project", "ProjectError",
    "check_fit", "dumps", "format_validation_error", "get_value", "key_spec", "key_specs", "load", "parse",
    "save", "to_dict", "validate", "with_values",
]
