"""The schema as a flat list of keys, for the GUI editor, the docs table, ``--set`` and messages.

Each :class:`KeySpec` reads the schema (:mod:`schema`): the dotted key, its engineering unit, limits,
default, description and kind; :func:`format_validation_error` turns pydantic's first complaint into
one line that names the key and its allowed range.
"""

from __future__ import annotations

import math
import typing
from collections.abc import Iterator
from dataclasses import dataclass
from typing import Any, Literal

from pydantic import BaseModel, ValidationError

from .errors import ProjectError
from .schema import MAY_BE_LEFT_OUT, SECTIONS, UNION_ORIGINS, CustomGrade, Project


@dataclass(frozen=True)
class KeySpec:
    """One scalar key of the file: what the validator, the GUI editor, the docs and ``--set`` know of it."""

    path: str  #: dotted key, e.g. "magnets.thickness_mm"
    unit: str  #: engineering unit as in the file ("" for counts, names and choices)
    minimum: Any  #: inclusive lower limit in ``unit``, or None
    maximum: Any  #: inclusive upper limit in ``unit``, or None
    default: Any  #: in ``unit``; None for a required key or an optional key left out
    description: str  #: one sentence
    kind: str  #: "float", "int", "str", "choice", "bool" or "points" (a list of torque-speed tables)
    choices: tuple[Any, ...] = ()  #: the allowed values of a "choice"
    optional: bool = False  #: the value may be absent (None): the tool then does what the description says
    required_in_file: bool = True  #: a file that leaves the key out is refused


def _spec_of(path: str, info) -> KeySpec:
    annotation = info.annotation
    optional = False
    origin = typing.get_origin(annotation)
    if origin in UNION_ORIGINS:
        args = [a for a in typing.get_args(annotation) if a is not type(None)]
        optional = True
        annotation = args[0]
    minimum = maximum = None
    for meta in info.metadata:
        minimum = getattr(meta, "ge", minimum)
        maximum = getattr(meta, "le", maximum)
    extra = info.json_schema_extra or {}
    if typing.get_origin(annotation) is Literal:
        kind, choices = "choice", typing.get_args(annotation)
    elif typing.get_origin(annotation) is tuple:  # a list of tables, e.g. load.further_points
        kind, choices = "points", ()
    else:
        kind, choices = {float: "float", int: "int", str: "str", bool: "bool"}[annotation], ()
    default = None if info.is_required() else info.default
    required_in_file = not optional and path not in MAY_BE_LEFT_OUT and ".custom_grade." not in path
    if ".custom_grade." in path:
        required_in_file = info.is_required()
    return KeySpec(path, extra.get("unit", ""), minimum, maximum, default, info.description or "", kind,
                   choices, optional, required_in_file)


def key_specs() -> Iterator[KeySpec]:
    """Every scalar key of the file, in file order (the inline custom grade's keys included).

    Yields
    ------
    KeySpec
        One per key, ``format_version`` first.
    """
    yield _spec_of("format_version", Project.model_fields["format_version"])
    for section in SECTIONS:
        # every field of Project but format_version is a section, a model of its own
        model = typing.cast("type[BaseModel]", Project.model_fields[section].annotation)
        for name, info in model.model_fields.items():
            if name == "custom_grade":
                for sub, sub_info in CustomGrade.model_fields.items():
                    yield _spec_of(f"{section}.custom_grade.{sub}", sub_info)
                continue
            yield _spec_of(f"{section}.{name}", info)


def key_spec(path: str) -> KeySpec:
    """What the schema knows of one key.

    Parameters
    ----------
    path : str
        Dotted key, e.g. ``"magnets.thickness_mm"``.

    Returns
    -------
    KeySpec
        Its unit, limits, default and description.

    Raises
    ------
    ProjectError
        When there is no such key.
    """
    for spec in key_specs():
        if spec.path == path:
            return spec
    raise ProjectError(f"{path}: no such key (see docs/project-file.md for the keys)", key=path)


MAX_SHOWN_CHARACTERS = 60  #: a value longer than this is cut in messages, which stay one short line
_RANGE_ERRORS = ("greater_than_equal", "less_than_equal", "greater_than", "less_than", "finite_number")


def one_line(text: str) -> str:
    """``text`` with every line break and control character written as its escape (``\\n``, ``\\x1e``).

    Parameters
    ----------
    text : str
        A message, or a key or value inside one.

    Returns
    -------
    str
        Printable text that stays one line on any terminal (and for ``str.splitlines``).
    """
    if text.isprintable():
        return text
    return "".join(ch if ch.isprintable() else repr(ch)[1:-1] for ch in text)


def shorten(text: str, limit: int = MAX_SHOWN_CHARACTERS) -> str:
    """``text`` cut to about ``limit`` characters, saying how long it was, and on one line.

    Parameters
    ----------
    text : str
        A key or a value as it would be shown.
    limit : int, optional
        Characters kept.

    Returns
    -------
    str
        ``text`` itself when short enough, else its start, an ellipsis and its length.
    """
    text = one_line(text)
    if len(text) <= limit:
        return text
    return f"{text[:limit]}… ({len(text):,} characters)"


def shown_value(value: Any) -> str:
    """A value as a message shows it: its repr, cut by :func:`shorten`, whatever the value.

    Parameters
    ----------
    value : Any
        What the file or the command line gave.

    Returns
    -------
    str
        One short line (an integer too long to print, or a structure nested too deeply, is described
        rather than shown).
    """
    if isinstance(value, int) and not isinstance(value, bool) and value.bit_length() > 3 * MAX_SHOWN_CHARACTERS:
        return f"an integer of about {int(value.bit_length() * 0.30103):,} digits"
    try:
        return shorten(repr(value))
    except (RecursionError, ValueError):
        return f"a {type(value).__name__} nested too deeply to show"


def format_validation_error(error: ValidationError) -> ProjectError:
    """The first problem pydantic found, as one line naming the key, the value and the allowed range.

    Parameters
    ----------
    error : pydantic.ValidationError
        From validating a project or a library table.

    Returns
    -------
    ProjectError
        With ``key`` set to the dotted key.
    """
    first = error.errors()[0]
    path = shorten(".".join(str(part) for part in first["loc"]))
    kind = first["type"]
    value = first.get("input")
    if isinstance(value, float) and not math.isfinite(value) and kind in _RANGE_ERRORS:
        # NaN fails every comparison, so pydantic names whichever bound it tried first: say what it is
        first = {**first, "msg": "is not a number" if math.isnan(value) else "is infinite"}
    if kind == "extra_forbidden":
        return ProjectError(f"{path}: unknown key (check the spelling; see docs/project-file.md)", key=path)
    if kind == "missing":
        return ProjectError(f"{path}: required key is missing", key=path)
    message = first["msg"].removeprefix("Value error, ")
    if kind == "string_pattern_mismatch" and path.endswith("_date"):
        message = "is not a date written YYYY-MM-DD"
    try:
        spec = key_spec(path)
    except ProjectError:
        spec = None
    limits = ""
    if spec is not None and (spec.minimum is not None or spec.maximum is not None):
        unit = f" {spec.unit}" if spec.unit and spec.unit not in ("1",) else ""
        limits = f" (allowed {spec.minimum:g} to {spec.maximum:g}{unit})"
    elif spec is not None and spec.choices:
        limits = " (allowed: " + ", ".join(repr(c) for c in spec.choices) + ")"
    shown = "a table" if isinstance(value, dict) else shown_value(value)
    return ProjectError(f"{path} = {shown}: {message[0].lower() + message[1:]}{limits}", key=path)
