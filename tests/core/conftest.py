"""Fixtures shared by the core tests."""

from __future__ import annotations

import pytest

from pmdc_sizer.core import evaluate, project

from ..conftest import DEMO_FOLDER


@pytest.fixture(scope="module")
def ferrite():
    """The ferrite demo and its results, evaluated once per module."""
    design = project.load(DEMO_FOLDER / "appliance_ferrite_12v.toml")
    return design, evaluate(design)
