"""Every public function and class of the core carries a numpydoc docstring.

The check reads the docstrings' section headings itself (numpydoc is not a dependency): a heading is a
line followed by a line of dashes of the same length, as numpydoc writes them. It asks for a summary on
every public function, method, property and class; a ``Parameters`` section naming every parameter
wherever there are parameters; and a ``Returns`` (or ``Yields``) section wherever the body returns a
value or yields. Units in brackets and the References are for a reviewer to read, not for a test to
count. Public means a name without a leading underscore, defined in the module itself (re-exports are
checked where they are defined).
"""

from __future__ import annotations

import ast
import dataclasses
import functools
import importlib
import importlib.util
import inspect
import pkgutil
import re
import sys
import textwrap
import types
from collections.abc import Callable, Iterator

import pytest

import pmdc_sizer.core

# Every module of core, found by walking the package: a module is checked from the day it is added.
ALL_CORE_MODULES = tuple(
    info.name for info in pkgutil.walk_packages(pmdc_sizer.core.__path__, prefix="pmdc_sizer.core.")
)

_UNDERLINE = re.compile(r"^-{3,}$")
_PARAMETER_LINE = re.compile(r"^(?P<names>\*{0,2}\w+(?:\s*,\s*\*{0,2}\w+)*)\s*(?::.*)?$")
_PROPERTIES = (property, functools.cached_property)


def sections(docstring: str) -> dict[str, list[str]]:
    """The numpydoc sections of a docstring: heading → the lines under it (the summary under "")."""
    lines = inspect.cleandoc(docstring).splitlines()
    found: dict[str, list[str]] = {"": []}
    current, index = "", 0
    while index < len(lines):
        heading, underline = lines[index].strip(), lines[index + 1].strip() if index + 1 < len(lines) else ""
        if heading and _UNDERLINE.match(underline) and len(underline) == len(heading):
            current = heading
            found[current] = []
            index += 2
            continue
        found[current].append(lines[index])
        index += 1
    return found


def documented_parameters(section: list[str]) -> set[str]:
    """Names a Parameters section lists: its unindented lines ``name : type`` or ``a, b : type``."""
    names: set[str] = set()
    for line in section:
        if line.strip() and not line[0].isspace():
            match = _PARAMETER_LINE.match(line.strip())
            if match:
                names.update(name.strip().lstrip("*") for name in match["names"].split(","))
    return names


def returns_a_value(function: Callable[..., object]) -> bool:
    """True when the function's own body (not a nested function's) returns a value or yields."""
    definition = ast.parse(textwrap.dedent(inspect.getsource(function))).body[0]

    def visit(node: ast.AST) -> bool:
        for child in ast.iter_child_nodes(node):
            if isinstance(child, ast.FunctionDef | ast.AsyncFunctionDef | ast.Lambda | ast.ClassDef):
                continue
            if isinstance(child, ast.Yield | ast.YieldFrom):
                return True
            if isinstance(child, ast.Return) and child.value is not None and not (
                    isinstance(child.value, ast.Constant) and child.value.value is None):
                return True
            if visit(child):
                return True
        return False

    return visit(definition)


def _public_members(module: types.ModuleType) -> Iterator[tuple[str, object]]:
    """Public functions and classes defined in ``module``, and the public methods and properties of the
    classes."""
    for name, item in vars(module).items():
        if name.startswith("_") or getattr(item, "__module__", None) != module.__name__:
            continue
        if inspect.isclass(item):
            yield name, item
            for member_name, member in vars(item).items():
                if member_name.startswith("_"):
                    continue
                if isinstance(member, staticmethod | classmethod):
                    member = member.__func__
                if inspect.isfunction(member) or isinstance(member, _PROPERTIES):
                    yield f"{name}.{member_name}", member
        elif callable(item) and inspect.isfunction(inspect.unwrap(item)):
            yield name, item


def _own_docstring(name: str, item: object) -> str | None:
    """The docstring written for ``item``, not one it inherits or one that dataclasses makes up."""
    docstring = item.__doc__
    if inspect.isclass(item):
        if any(docstring == base.__doc__ for base in item.__mro__[1:]):
            return None
        if dataclasses.is_dataclass(item) and docstring and docstring.startswith(f"{name}("):
            return None  # the signature that dataclasses writes when the class has no docstring
    return docstring


def problems(module: types.ModuleType) -> list[str]:
    """What is missing from the docstrings of a module's public functions and classes."""
    found = []
    for name, item in _public_members(module):
        docstring = _own_docstring(name.rpartition(".")[2], item)
        if not docstring or not docstring.strip():
            found.append(f"{name}: no docstring")
            continue
        if inspect.isclass(item) or isinstance(item, _PROPERTIES):
            continue  # a class documents its fields beside them; a property is a value with a summary
        function = inspect.unwrap(item)
        parts = sections(docstring)
        parameters = [p for p in inspect.signature(function).parameters if p not in ("self", "cls")]
        if parameters and "Parameters" not in parts:
            found.append(f"{name}: no Parameters section")
        elif parameters:
            missing = set(parameters) - documented_parameters(parts["Parameters"])
            if missing:
                found.append(f"{name}: Parameters leaves out {', '.join(sorted(missing))}")
        if returns_a_value(function) and "Returns" not in parts and "Yields" not in parts:
            found.append(f"{name}: returns a value but has no Returns section")
    return found


@pytest.mark.parametrize("module_name", ALL_CORE_MODULES)
def test_public_functions_and_classes_have_numpydoc_docstrings(module_name):
    assert problems(importlib.import_module(module_name)) == []


# The check itself, on a module written for it: each kind of gap is found, and nothing else.
_SAMPLE = '''
import dataclasses
import functools
from math import sqrt


def documented(length, *, count=1):
    """A documented function.

    Parameters
    ----------
    length : float
        A length [m].
    count : int, optional
        How many [1].

    Returns
    -------
    float
        The total [m].
    """
    return length * count


@functools.lru_cache
def cached_without_returns(length):
    """A cached function whose Returns section is missing.

    Parameters
    ----------
    length : float
        A length [m].
    """
    return length


def without_docstring(x):
    return x


def without_parameters(length, width):
    """Says nothing of its parameters.

    Returns
    -------
    float
        An area [m²].
    """
    return length * width


def leaves_one_out(length, width):
    """Lists one of two.

    Parameters
    ----------
    length : float
        A length [m].
    """


def nested_return_only(values):
    """Returns nothing itself; only the function inside it does.

    Parameters
    ----------
    values : list
        Anything.
    """
    def inner():
        return values
    inner()


def generator(count):
    """Yields without a Yields section.

    Parameters
    ----------
    count : int
        How many.
    """
    yield from range(count)


@dataclasses.dataclass
class Undocumented:
    size: float


class Documented:
    """A class with a docstring."""

    @property
    def area(self):
        return 1.0

    def scaled(self, factor):
        """Scaled [m²].

        Parameters
        ----------
        factor : float
            Scale [1].

        Returns
        -------
        float
            The area [m²].
        """
        return factor


def _private(x):
    return x
'''


@pytest.fixture
def sample_module(tmp_path):
    path = tmp_path / "docstring_sample.py"
    path.write_text(_SAMPLE, encoding="utf-8")
    spec = importlib.util.spec_from_file_location("docstring_sample", path)
    module = importlib.util.module_from_spec(spec)
    sys.modules["docstring_sample"] = module  # inspect.getsource finds the file through it
    spec.loader.exec_module(module)
    yield module
    del sys.modules["docstring_sample"]


def test_the_check_finds_each_kind_of_gap_and_nothing_else(sample_module):
    assert sorted(problems(sample_module)) == sorted([
        "cached_without_returns: returns a value but has no Returns section",
        "without_docstring: no docstring",
        "without_parameters: no Parameters section",
        "leaves_one_out: Parameters leaves out width",
        "generator: returns a value but has no Returns section",
        "Undocumented: no docstring",
        "Documented.area: no docstring",
    ])  # not `documented`, `nested_return_only`, `Documented`, `Documented.scaled`, `_private`, `sqrt`


def test_a_heading_needs_an_underline_of_its_length():
    parts = sections("""Summary.

    Parameters
    ----------
    a, b : float
        Lengths [m].

    Returns
    ---
        The underline is shorter than the word: not a heading.
    """)
    assert set(parts) == {"", "Parameters"}
    assert {"a", "b"} <= documented_parameters(parts["Parameters"])
