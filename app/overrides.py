"""``--set KEY=VALUE`` on the command line (and in the GUI's screenshot mode): parsed as TOML values and
applied through the same validation as a file. ``--set KEY=`` (nothing after the sign) removes an
optional key, as leaving it out of the file would."""

from __future__ import annotations

import tomllib
from typing import Any

from pmdc_sizer.core.edits import with_values
from pmdc_sizer.core.errors import ProjectError
from pmdc_sizer.core.keys import shorten, shown_value
from pmdc_sizer.core.schema import Project


def parse_cli_value(text: str, key: str = "value"):
    """A ``--set`` value, parsed as TOML would parse it; a bare word is taken as a string, nothing as None."""
    if not text:
        return None
    try:
        return tomllib.loads(f"value = {text}")["value"]
    except tomllib.TOMLDecodeError:
        return text
    except RecursionError:
        raise ProjectError(f"--set {key}: the value is nested too deeply to be a value of the file", key=key) from None
    except ValueError:  # an integer past Python's int-to-string limit
        raise ProjectError(f"--set {key}: a number of more than 4300 digits is no value of the file", key=key) from None


def apply_overrides(project: Project, assignments: list[str]) -> Project:
    """Apply ``KEY=VALUE`` strings from the command line, through the same validation as a file."""
    changes: dict[str, Any] = {}
    for assignment in assignments:
        key, sep, value = assignment.partition("=")
        if not sep or not key.strip():
            raise ProjectError(f"--set {shown_value(assignment)}: expected KEY=VALUE, for example "
                               "magnets.thickness_mm=4.5")
        key = key.strip()
        changes[key] = parse_cli_value(value.strip(), shorten(key))
    return with_values(project, changes)
