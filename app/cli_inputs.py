"""What every subcommand starts from: a project file with its ``--set`` overrides, and its evaluation.

Apart from ``cli.py`` so that the subcommands in their own modules (compare, datasheet) can use it
while ``cli.py`` imports them to build its parser.
"""

from __future__ import annotations

import sys

from pmdc_sizer.core import library
from pmdc_sizer.core import project as project_file

from .overrides import apply_overrides


def load_project(path: str, overrides: list[str] | None = None):
    """The project of ``path`` with its ``--set`` overrides; a user grade that replaces a built-in one is noted."""
    project = project_file.load(path)
    if overrides:
        project = apply_overrides(project, overrides)
    grade = project.magnets.grade
    replaced_by = library.current().replaced.get(grade) if grade else None
    if replaced_by is not None:
        print(f"pmdc-sizer: note: magnets.grade = {grade!r} is the user library's, from {replaced_by}, which replaces "
              "the built-in grade of that name", file=sys.stderr)
    return project


def evaluate_project(project):
    from pmdc_sizer.core.evaluate import evaluate

    return evaluate(project)


#: The ``--json`` help of the subcommands that print one results object.
JSON_HELP = "one JSON object on stdout; keys carry SI unit suffixes"


def add_command(subparsers, name: str, handler, summary: str, description: str):
    """A subcommand's parser: its one-line summary for ``--help``, its description, and its handler."""
    parser = subparsers.add_parser(name, help=summary, description=description)
    parser.set_defaults(handler=handler)
    return parser


def add_json_option(parser, what: str = JSON_HELP) -> None:
    """The ``--json`` switch: print JSON instead of the text summary."""
    parser.add_argument("--json", action="store_true", help=what)


def add_set_option(parser) -> None:
    """The ``--set KEY=VALUE`` option every subcommand that reads a project takes."""
    parser.add_argument("--set", action="append", default=[], metavar="KEY=VALUE",
                        help="override a key for this run, e.g. --set magnets.thickness_mm=4.5 (repeatable); "
                             "validated like the file")
