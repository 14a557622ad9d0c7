"""The project file: one complete motor design as human-editable, versioned TOML, read and written.

Loading never half-succeeds: a file is read, parsed and validated (:func:`fit_rules.validate`) or
refused with one line naming the file, the key and the limit; a file from a newer format version is
refused with a clear message; an older one is carried forward (:mod:`migrations`). Saving keeps the
user's comments and layout (tomlkit), writes through :mod:`atomic_files` (temporary file, fsync, read
back, permissions kept, previous version as ``NAME.toml.bak``, rename, folder fsync) and never leaves
half a file.

The schema (:mod:`schema`, its flat key list in :mod:`keys`), the fit rules (:mod:`fit_rules`) and
what-if edits (:mod:`edits`) live in modules of their own; their public names are re-exported here so
that ``project.load``, ``project.with_values`` and ``project.Project`` read naturally at the call site.
"""

from __future__ import annotations

import datetime
import os
from pathlib import Path
from typing import Any

import tomli_w
import tomlkit
import tomlkit.exceptions

from . import atomic_files, text_files
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
        TOML text (a leading UTF-8 byte-order mark is allowed, as some editors write one).
    source : str
        What to call it in messages (the file's path).

    Returns
    -------
    Project
        The file's project, checked against the schema and the fit rules.

    Raises
    ------
    ProjectError
        Naming the file, the key and the limit.
    """
    if not text.removeprefix(text_files.BYTE_ORDER_MARK).strip():
        raise ProjectError(f"{source}: the file is empty")
    data = text_files.parse_toml(text, source, "project file")
    try:
        return validate(data)
    except RecursionError:
        raise ProjectError(f"{source}: not a project file (its tables or arrays are nested too deeply)") from None


def read_text(path: str | os.PathLike[str]) -> str:
    """The text of a project file, refused before it is read if it cannot be one.

    Parameters
    ----------
    path : str or os.PathLike
        The file.

    Returns
    -------
    str
        Its UTF-8 text (a byte-order mark removed).

    Raises
    ------
    ProjectError
        Naming the file: missing, a link to nothing, unreadable, a folder, a device or a pipe, larger
        than :data:`MAX_PROJECT_BYTES`, binary, or not UTF-8 (:func:`core.text_files.read_text`).
    """
    return text_files.read_text(path, kind="project file", max_bytes=MAX_PROJECT_BYTES)


def load(path: str | os.PathLike[str]) -> Project:
    """Read and validate a project file; never returns half a design.

    Parameters
    ----------
    path : str or os.PathLike
        The project file (UTF-8 TOML).

    Returns
    -------
    Project
        Validated; a file of an older format version is carried forward first (:mod:`migrations`).

    Raises
    ------
    ProjectError
        Naming the file, and the key and the limit where a value is at fault: a file that cannot be
        read (see :func:`read_text`), is not TOML, or does not validate.
    """
    path = Path(path)
    text = read_text(path)
    try:
        return parse(text, source=str(path))
    except ProjectError as error:
        message = str(error)
        if message.startswith(str(path)):
            raise
        raise ProjectError(f"{path}: {message}", key=error.key) from None


MAX_PROJECT_BYTES = 1024 * 1024  #: a project file is a few kB; anything past 1 MiB is not one

_HEADER = (
    "# pmdc-sizer project file. Keys carry their units in their names; every key is described in\n"
    "# docs/project-file.md. Lengths in mm, temperatures in °C, torques in mN·m, speeds in rpm.\n"
)


def dumps(project: Project, layout: str | None = None) -> str:
    """The text of a project file for ``project``, keeping the comments and layout of ``layout``.

    Parameters
    ----------
    project : Project
        A validated project.
    layout : str, optional
        The text of the file the design came from. Its comments, key order, blank lines and number
        spellings are kept (tomlkit edits the document in place): changed values are replaced, removed
        keys deleted, new keys added at the end of their table, and optional keys the file left out
        stay out while they hold their defaults. Without it (or when it is not TOML), a fresh file
        with a header that says where the keys are described.

    Returns
    -------
    str
        TOML text that :func:`parse` reads back as ``project``.
    """
    fresh = _HEADER + tomli_w.dumps(to_dict(project))
    if layout is None:
        return fresh
    try:
        document = tomlkit.parse(layout.removeprefix(text_files.BYTE_ORDER_MARK))
        _merge(document, to_dict(project), "")
        text = document.as_string()
        if parse(text) == project:
            return text
    except (tomlkit.exceptions.TOMLKitError, ProjectError, ValueError, TypeError, RecursionError):
        pass
    return fresh  # a layout tomlkit cannot edit faithfully: the design matters more than its comments


def _same_value(old: Any, new: Any) -> bool:
    """True when the file's value already says ``new`` (kept as the user wrote it: 12 for 12.0)."""
    if isinstance(old, datetime.date) and isinstance(new, str):
        return old.isoformat() == new
    if isinstance(old, bool) != isinstance(new, bool):
        return False
    return bool(old == new)


def _merge(table: Any, values: dict[str, Any], prefix: str) -> None:
    """Make the tomlkit ``table`` hold ``values``, touching only what differs."""
    for key in [k for k in table if k not in values]:
        del table[key]
    for key, value in values.items():
        path = f"{prefix}{key}"
        if isinstance(value, dict):
            if key in table and isinstance(table[key], dict):
                _merge(table[key], value, f"{path}.")
            else:  # a table the file lacks: only what differs from what leaving it out would mean
                needed = {k: v for k, v in value.items()
                          if not (f"{path}.{k}" in MAY_BE_LEFT_OUT and v == _default_of(f"{path}.{k}"))}
                if needed:
                    table[key] = needed
        elif key in table:
            if not _same_value(table[key], value):
                table[key] = value
        elif not (path in MAY_BE_LEFT_OUT and value == _default_of(path)):
            table[key] = value


def _default_of(path: str) -> Any:
    try:
        return key_spec(path).default
    except ProjectError:
        return None


def save(project: Project, path: str | os.PathLike[str], layout: str | None = None) -> None:
    """Write a project file as trusted editors do, keeping the user's comments and the previous version.

    The text keeps the layout of ``layout`` or, by default, of the file being replaced (see
    :func:`dumps`); it is written through :func:`atomic_files.replacing`: a temporary file in the same
    folder, flushed to disk and read back (it must parse as ``project``), given the old file's
    permissions, the old file kept as ``NAME.bak``, renamed over the target, the folder flushed. A
    symbolic link is written through to its target; a device, pipe or folder is refused.

    Parameters
    ----------
    project : Project
        A validated project.
    path : str or os.PathLike
        The file to write; an existing file is replaced only once the new one is complete and checked.
    layout : str, optional
        The text whose comments and layout to keep; by default the current text of ``path`` if it is
        a readable TOML file.

    Raises
    ------
    ProjectError
        Naming the file, when it cannot be written; the previous file is then unchanged, byte for
        byte, and no temporary file is left.
    """
    path = Path(path)
    if layout is None:
        try:
            layout = read_text(path)
        except ProjectError:
            layout = None
    text = dumps(project, layout)

    def reads_back(written: Path) -> None:
        again = parse(written.read_bytes().decode("utf-8"), source=str(path))
        if again != project:
            raise ValueError("it does not read back as the design")

    try:
        atomic_files.write_bytes(path, text.encode("utf-8"), backup=True, verify=reads_back)
    except atomic_files.FileWriteError as error:
        raise ProjectError(str(error)) from None


__all__ = [
    "FORMAT_VERSION", "MAX_PROJECT_BYTES", "MAY_BE_LEFT_OUT", "SECTIONS", "CustomGrade", "KeySpec", "Project",
    "ProjectError", "check_fit", "dumps", "format_validation_error", "get_value", "key_spec", "key_specs", "load",
    "parse", "read_text", "save", "to_dict", "validate", "with_values",
]
