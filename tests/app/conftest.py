"""Fixtures of the app tests: a demo project with its evaluation, read the way the command line reads it."""

from __future__ import annotations

import pytest

from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.evaluate import evaluate


@pytest.fixture
def evaluated(demo_path):
    """(project, results) of each demo in turn."""
    design = project_file.load(demo_path)
    return design, evaluate(design)


@pytest.fixture
def ferrite(ferrite_demo):
    """(project, results) of the ferrite demo."""
    design = project_file.load(ferrite_demo)
    return design, evaluate(design)
