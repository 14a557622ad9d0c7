"""How a key of the project-file schema is declared: a quantity with its unit and limits, a choice, the table.

:func:`quantity` and :func:`choice` write a key's engineering unit, inclusive limits, default and
one-sentence description where the key is declared (:mod:`core.schema`), once; :class:`Section` is the
table every part of the file is: unknown keys refused, values strictly typed, frozen.
"""

from __future__ import annotations

import types
import typing
from typing import Any

from pydantic import BaseModel, ConfigDict, Field

#: What ``typing.get_origin`` gives for an optional key's annotation, ``X | None`` or ``Optional[X]``
#: (different objects at run time on Python 3.11).
UNION_ORIGINS = (types.UnionType, typing.Union)


def quantity(default: Any, unit: str, minimum: float | None = None, maximum: float | None = None,
             description: str = "", **kwargs: Any) -> Any:
    """A numeric field with its engineering unit, inclusive limits and a one-sentence description.

    Parameters
    ----------
    default : float, int, None or Ellipsis
        The default in the key's unit; ``...`` for a required key, None for an optional one.
    unit : str
        The key's engineering unit as written in the file (``"mm"``, ``"°C"``; ``""`` for a count).
    minimum, maximum : float or None, optional
        Inclusive limits in the key's unit; None for no limit.
    description : str, optional
        One sentence for the docs table, the GUI's tooltip and the messages.
    **kwargs
        Passed on to :func:`pydantic.Field`.

    Returns
    -------
    pydantic.fields.FieldInfo
        The field (typed ``Any``, as :func:`pydantic.Field` is, so that it can stand as a default).
    """
    return Field(
        default,
        ge=minimum,
        le=maximum,
        description=description,
        json_schema_extra={"unit": unit},
        **kwargs,
    )


def choice(default: Any, description: str) -> Any:
    """A field that takes one of a fixed set of values (its annotation's ``Literal``), without a unit.

    Parameters
    ----------
    default : str or int
        The default choice.
    description : str
        One sentence for the docs table, the GUI's tooltip and the messages.

    Returns
    -------
    pydantic.fields.FieldInfo
        The field (typed ``Any``, as :func:`pydantic.Field` is).
    """
    return Field(default, description=description, json_schema_extra={"unit": ""})


class Section(BaseModel):
    """A table of the file: unknown keys refused, values strictly typed, frozen."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True, validate_default=True)


__all__ = ["UNION_ORIGINS", "Section", "choice", "quantity"]
