"""Shared fixtures. Qt runs offscreen; the user library points at an empty temporary folder so a
developer's own grades never change a test's result."""

from __future__ import annotations

import os
from pathlib import Path

import pytest
from hypothesis import settings

# Property tests draw the same examples on every run, so CI cannot turn red by chance; widen the search
# locally with HYPOTHESIS_PROFILE=explore.
settings.register_profile("repeatable", derandomize=True, deadline=None)
settings.register_profile("explore", deadline=None, max_examples=300)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "repeatable"))

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

REPO = Path(__file__).resolve().parents[1]
DEMO_FOLDER = REPO / "demo_projects"
DEMO_FILES = sorted(DEMO_FOLDER.glob("*.toml"))


@pytest.fixture(autouse=True)
def _isolated_user_library(tmp_path_factory, monkeypatch):
    from pmdc_sizer.core import library

    folder = tmp_path_factory.mktemp("user_library")
    monkeypatch.setenv("PMDC_SIZER_LIBRARY", str(folder))
    library.reload()
    yield folder
    library.reload()


@pytest.fixture(autouse=True)
def _isolated_state_folder(tmp_path_factory, monkeypatch):
    """Crash reports, recovery copies and locks go to a temporary folder, never the developer's own."""
    folder = tmp_path_factory.mktemp("state")
    monkeypatch.setenv("PMDC_SIZER_STATE_DIR", str(folder))
    return folder


@pytest.fixture(params=DEMO_FILES, ids=[p.stem for p in DEMO_FILES])
def demo_path(request) -> Path:
    return request.param


@pytest.fixture
def ferrite_demo() -> Path:
    return DEMO_FOLDER / "appliance_ferrite_12v.toml"


@pytest.fixture
def ndfeb_demo() -> Path:
    return DEMO_FOLDER / "mobility_ndfeb_24v.toml"
