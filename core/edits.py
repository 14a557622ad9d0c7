"""What-if edits: a copy of a project with some keys changed, validated exactly like a file."""

from __future__ import annotations

import typing
from typing import Any

from pydantic import BaseModel

from .errors import ProjectError
from .fit_rules import validate
from .keys import shorten
from .schema import UNION_ORIGINS, Project, to_dict


def get_value(project: Project, path: str) -> Any:
    """The value of a dotted key in the file's units.

    Parameters
    ----------
    project : Project
        A validated project.
    path : str
        Dotted key, e.g. ``"magnets.thickness_mm"``.

    Returns
    -------
    Any
        The value as stored (in the key's engineering unit), or None for an absent optional key.

    Raises
    ------
    ProjectError
        When there is no such key.
    """
    node: Any = project
    for part in path.split("."):
        if not hasattr(node, part) or part not in type(node).model_fields:
            raise ProjectError(f"{path}: no such key (see docs/project-file.md)", key=path)
        node = getattr(node, part)
    return node


def with_values(project: Project, changes: dict[str, Any]) -> Project:
    """A copy of ``project`` with dotted keys changed, validated like a file (a what-if).

    Parameters
    ----------
    project : Project
        The design to start from.
    changes : dict
        Dotted key → new value in the key's engineering unit; None removes an optional key.

    Returns
    -------
    Project
        The changed design, validated by the schema and the fit rules.

    Raises
    ------
    ProjectError
        Naming the key and the limit.
    """
    data = to_dict(project)
    for path, value in changes.items():
        parts = path.split(".")
        node = data
        model: Any = Project
        for depth, part in enumerate(parts):
            fields = getattr(model, "model_fields", {})
            if part not in fields:
                raise ProjectError(f"{shorten(path)}: no such key (see docs/project-file.md)", key=path)
            annotation = fields[part].annotation
            if typing.get_origin(annotation) in UNION_ORIGINS:
                annotation = next(a for a in typing.get_args(annotation) if a is not type(None))
            is_table = isinstance(annotation, type) and issubclass(annotation, BaseModel)
            if depth == len(parts) - 1:
                if value is None:
                    node.pop(part, None)
                elif is_table and not isinstance(value, dict):
                    raise ProjectError(f"{path}: is a table of keys, not a value; set one of its keys instead "
                                       f"(e.g. {path}.{next(iter(annotation.model_fields))})", key=path)
                else:
                    node[part] = value
            else:
                model = annotation
                node = node.setdefault(part, {})
                if not isinstance(node, dict):
                    raise ProjectError(f"{path}: {'.'.join(parts[:depth + 1])} is not a table of keys", key=path)
    return validate(data)
