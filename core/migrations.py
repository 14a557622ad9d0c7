"""Project-file format versions: each step carries a file one version forward, so no file is stranded.

A project file names its ``format_version``. When a key is renamed, moved, split or given a new unit,
:data:`schema.FORMAT_VERSION` goes up by one and a step ``n → n + 1`` is registered here with
:func:`register`; :func:`migrate` then runs every step from the file's version up to the current one
before the file is validated, and the next save writes the current version (the previous file is kept
as ``NAME.toml.bak`` by the save).

Where things stand, honestly: the format is still at version 1 and no key has changed since, so
:data:`MIGRATIONS` holds no real step. The machinery is exercised by the tests on a synthetic format
(a registered 1 → 2 step that renames a key, applied with ``target=2``), so the first real change of a
key only has to add its step and raise ``FORMAT_VERSION``.
"""

from __future__ import annotations

import copy
from collections.abc import Callable, Mapping
from typing import Any

from .errors import ProjectError
from .schema import FORMAT_VERSION

#: A step: the parsed file at version n (a copy it may change) → the same design at version n + 1.
Migration = Callable[[dict[str, Any]], dict[str, Any]]

#: Registered steps by the version they start from. Empty while the format is at version 1.
MIGRATIONS: dict[int, Migration] = {}


def register(from_version: int, steps: dict[int, Migration] | None = None) -> Callable[[Migration], Migration]:
    """Decorator: register ``function`` as the step from ``from_version`` to ``from_version + 1``.

    Parameters
    ----------
    from_version : int
        The version the step reads.
    steps : dict, optional
        The registry to add to (tests pass their own); :data:`MIGRATIONS` by default.

    Returns
    -------
    callable
        The decorator, which returns the step unchanged.
    """
    registry = MIGRATIONS if steps is None else steps

    def add(function: Migration) -> Migration:
        if from_version in registry:
            raise ValueError(f"a migration from format {from_version} is already registered")
        registry[from_version] = function
        return function

    return add


def migrate(data: Mapping[str, Any], steps: Mapping[int, Migration] | None = None,
            target: int = FORMAT_VERSION) -> dict[str, Any]:
    """The parsed file carried forward to format ``target``, one registered step at a time.

    Parameters
    ----------
    data : mapping
        A parsed project file (left unchanged: the steps work on a copy).
    steps : mapping, optional
        Steps by starting version; :data:`MIGRATIONS` by default.
    target : int, optional
        The version to reach; the current ``FORMAT_VERSION`` by default.

    Returns
    -------
    dict
        The data at ``target`` with ``format_version = target``; the same data (copied) when the file
        is already there, or when its version is not a whole number (the schema then says so), or is
        newer (the validator refuses it, naming the version).

    Raises
    ------
    ProjectError
        Naming ``format_version``, when a step on the way is missing or fails.
    """
    registry = MIGRATIONS if steps is None else steps
    result = copy.deepcopy(dict(data))
    version = result.get("format_version")
    if not isinstance(version, int) or isinstance(version, bool) or version < 1 or version >= target:
        return result
    while version < target:
        step = registry.get(version)
        if step is None:
            raise ProjectError(f"format_version = {version}: this pmdc-sizer has no way to read format {version} "
                               f"files (it reads format {target})", key="format_version")
        try:
            result = step(result)
        except (KeyError, TypeError, ValueError) as error:
            raise ProjectError(f"format_version = {version}: the file could not be carried forward to format "
                               f"{version + 1} ({error})", key="format_version") from None
        version += 1
        result["format_version"] = version
    return result


__all__ = ["MIGRATIONS", "Migration", "migrate", "register"]
