"""``--set KEY=VALUE`` on the command line (and in the GUI's screenshot mode): parsed as TOML values and
applied through the same validation as a file."""

from __future__ import annotations

import tomllib
from typing import Any

from pmdc_sizer.core.edits import with_values
from pmdc_sizer.core.errors import ProjectError
from pmdc_sizer.core.schema import Project


def parse_cli_value(text: str):
    """A ``--set`` value, parsed as TOML would parse it; a bare word is taken as a string."""
    try:
        return tomllib.loads(f"value = {text}")["value"]
    except tomllib.TOMLDecodeError:
        return text


def apply_overrides(project: Project, assignments: list[str]) -> Project:
    """Apply ``KEY=VALUE`` strings from the command line, through the same validation as a file."""
    changes: dict[str, Any] = {}
    for assignment in assignments:
        key, sep, value = assignment.partition("=")
        if not sep or not key.strip():
            raise ProjectError(f"--set {assignment!r}: expected KEY=VALUE, for example magnets.thickness_mm=4.5")
        key = key.strip()
        changes[key] = parse_cli_value(value.strip())
    return with_values(project, changes)
