"""Reading a text file the user named (a project file, a user-library file) without trusting it.

A path from the user may name a folder, a device that never ends (``/dev/zero``), a named pipe that
blocks until some writer comes, a link to nothing, a file of gigabytes or a binary one. Each is refused
with one line naming the file and what is wrong, before anything is read where the file's kind already
tells; what reaches the parser is bounded UTF-8 text without a byte-order mark. The TOML parse refuses,
in the same words for every kind of file, text that is not TOML, tables nested deeply enough to exhaust
Python's recursion, and integers past Python's int-to-string limit of 4300 digits.

Both readers raise :class:`~core.errors.ProjectError`, the type the edges turn into a message.
"""

from __future__ import annotations

import os
import stat
import tomllib
from pathlib import Path
from typing import Any

from .errors import ProjectError

BYTE_ORDER_MARK = "\ufeff"  #: some editors start a UTF-8 file with it; it is not part of the text


def read_text(path: str | os.PathLike[str], *, kind: str, max_bytes: int) -> str:
    """The UTF-8 text of a file, refused before it is read if it cannot be a ``kind``.

    Parameters
    ----------
    path : str or os.PathLike
        The file as the user named it.
    kind : str
        What the file should be, for the messages: ``"project file"``, ``"library file"``.
    max_bytes : int
        The largest file accepted [bytes]; at most ``max_bytes + 1`` bytes are ever read.

    Returns
    -------
    str
        Its text, a leading byte-order mark removed.

    Raises
    ------
    ProjectError
        Naming the file: missing, a link to nothing, unreadable, a folder, a device or a pipe (which
        would block or never end), larger than ``max_bytes``, binary (a NUL byte), or not UTF-8 (naming
        the first byte that is not).
    """
    path = Path(path)
    if path.is_symlink() and not path.exists():
        raise ProjectError(f"{path}: is a link to a file that does not exist")
    try:
        mode = path.stat().st_mode
        if stat.S_ISDIR(mode):
            raise ProjectError(f"{path}: is a folder, not a {kind}")
        if not stat.S_ISREG(mode):
            raise ProjectError(f"{path}: is a device or a pipe, not a {kind}; give a .toml file")
        with open(path, "rb") as stream:
            raw = stream.read(max_bytes + 1)
    except OSError as error:
        raise ProjectError(f"{path}: cannot read the file ({error.strerror or error})") from None
    if len(raw) > max_bytes:
        raise ProjectError(f"{path}: is larger than any {kind} (more than {max_bytes // 1024} kB)")
    if b"\x00" in raw:
        raise ProjectError(f"{path}: this is a binary file, not a {kind}")
    try:
        return raw.decode("utf-8").removeprefix(BYTE_ORDER_MARK)
    except UnicodeDecodeError as error:
        raise ProjectError(f"{path}: the file is not UTF-8 text (byte {error.start + 1} cannot be read as "
                           "UTF-8; save it from your editor as UTF-8)") from None


def parse_toml(text: str, source: str, kind: str) -> dict[str, Any]:
    """The tables of a TOML text, or one line saying why it is not a ``kind``.

    Parameters
    ----------
    text : str
        TOML text (a leading byte-order mark is allowed).
    source : str
        What to call it in messages (the file's path, or ``"built-in"``).
    kind : str
        What the text should be, for the messages: ``"project file"``, ``"library file"``.

    Returns
    -------
    dict
        The parsed document (not yet validated).

    Raises
    ------
    ProjectError
        Naming ``source``: not TOML (with the parser's position), nested too deeply, or holding an
        integer of more than 4300 digits.

    References
    ----------
    .. [1] TOML v1.0.0, https://toml.io/en/v1.0.0 (the format, as Python's ``tomllib`` reads it)
    """
    try:
        return tomllib.loads(text.removeprefix(BYTE_ORDER_MARK))
    except tomllib.TOMLDecodeError as error:
        raise ProjectError(f"{source}: not a valid TOML file ({error})") from None
    except RecursionError:
        raise ProjectError(f"{source}: not a {kind} (its tables or arrays are nested too deeply)") from None
    except ValueError:  # an integer past Python's int-to-string limit of 4300 digits
        raise ProjectError(f"{source}: not a {kind} (it holds a number of more than 4300 digits)") from None


__all__ = ["BYTE_ORDER_MARK", "parse_toml", "read_text"]
