"""What every subcommand starts from: a project file with its ``--set`` overrides, and its evaluation.

Apart from ``cli.py`` so that the subcommands in their own modules (compare, datasheet) can use it
while ``cli.py`` imports them to build its parser.
"""

from __future__ import annotations

from pmdc_sizer.core import project as project_file

from .overrides import apply_overrides


def load_project(path: str, overrides: list[str] | None = None):
    project = project_file.load(path)
    if overrides:
        project = apply_overrides(project, overrides)
    return project


def evaluate_project(project):
    from pmdc_sizer.core.evaluate import evaluate

    return evaluate(project)
