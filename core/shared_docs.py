"""Parameter descriptions that many functions share, written once and filled into each docstring.

Where several functions take the same argument (the motor model, the thermal network and its designs),
its numpydoc entry is written once, in a table of entries beside the type it describes
(:func:`parameter_table`). :func:`shared_parameters` writes the Parameters section of each function that
names the table: the function's own entries where it has them (a narrower meaning wins), the table's for
the rest, in the signature's order. The docstring that ``help()`` and the documentation read is then
complete; the source keeps only what is particular to the function.
"""

from __future__ import annotations

import inspect
from collections.abc import Callable, Mapping
from typing import TypeVar

#: A numpydoc entry: its line ``name : type`` and the indented lines under it.
Entry = tuple[str, ...]

_Function = TypeVar("_Function", bound=Callable[..., object])


def parameter_table(entries: str) -> dict[str, Entry]:
    """Shared entries, written as a numpydoc Parameters section is, by the name each describes.

    Parameters
    ----------
    entries : str
        ``name : type`` lines, each with its indented description [with its unit] under it.

    Returns
    -------
    dict of str to tuple of str
        Name → the entry's lines (an entry naming several parameters, ``a, b : type``, under each).
    """
    return _entries(inspect.cleandoc(entries).splitlines())


def shared_parameters(table: Mapping[str, Entry]) -> Callable[[_Function], _Function]:
    """Decorator: completes the function's numpydoc Parameters section from ``table``.

    Parameters
    ----------
    table : mapping of str to tuple of str
        Parameter name → its entry (:func:`parameter_table`) for the arguments the functions share.

    Returns
    -------
    callable
        The decorator; it returns the function itself, with its docstring completed.
    """
    def decorate(function: _Function) -> _Function:
        names = [name for name in inspect.signature(function).parameters if name not in ("self", "cls")]
        function.__doc__ = with_parameters(function.__doc__ or "", names, table)
        return function

    return decorate


def with_parameters(docstring: str, names: list[str], table: Mapping[str, Entry]) -> str:
    """A numpydoc docstring whose Parameters section lists ``names``, its own entries first choice.

    Parameters
    ----------
    docstring : str
        The docstring as written, with or without a Parameters section.
    names : list of str
        The function's parameters, in the signature's order.
    table : mapping of str to tuple of str
        Shared entries by name (:func:`parameter_table`), for the names the docstring leaves out.

    Returns
    -------
    str
        The docstring (cleaned of its indentation) with one Parameters section, placed where numpydoc puts
        it: before the first other section, or at the end when there is none. A name neither the docstring
        nor the table describes stays out (tests/core/test_docstrings.py reports it).
    """
    lines = inspect.cleandoc(docstring).splitlines()
    headings = [i for i in range(len(lines) - 1) if _is_heading(lines, i)]
    start = next((i for i in headings if lines[i].strip() == "Parameters"), None)
    if start is None:
        own: dict[str, Entry] = {}
        cut_from = cut_to = headings[0] if headings else len(lines)
    else:
        cut_from = start
        cut_to = next((i for i in headings if i > start), len(lines))
        own = _entries(lines[start + 2:cut_to])
    chosen: list[Entry] = []
    # an entry naming several parameters is written once; entries naming no parameter of the signature
    # are kept, not dropped
    for entry in [own.get(name, table.get(name)) for name in names] + list(own.values()):
        if entry is not None and entry not in chosen:
            chosen.append(entry)
    written = [line for entry in chosen for line in entry]
    before = lines[:cut_from]
    if before and before[-1].strip():
        before.append("")
    section = ["Parameters", "-" * len("Parameters"), *written] if written else []
    after = lines[cut_to:]
    if section and after:
        section.append("")
    return "\n".join([*before, *section, *after]).rstrip() + "\n"


def _is_heading(lines: list[str], index: int) -> bool:
    """A numpydoc heading: a line over a line of dashes of its length."""
    heading, underline = lines[index].strip(), lines[index + 1].strip()
    return bool(heading) and len(underline) == len(heading) and set(underline) == {"-"}


def _entries(section: list[str]) -> dict[str, Entry]:
    """A Parameters section's entries by name: each unindented line with the indented lines under it (an
    entry naming several parameters, ``a, b : type``, stands under each of its names)."""
    names: list[list[str]] = []
    lines: list[list[str]] = []
    for line in section:
        if line.strip() and not line[0].isspace():
            names.append([name.strip().lstrip("*") for name in line.partition(" : ")[0].split(",")])
            lines.append([line])
        elif lines and line.strip():
            lines[-1].append(line)
    return {name: tuple(entry) for group, entry in zip(names, lines, strict=True) for name in group}
