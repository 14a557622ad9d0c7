"""The key table in docs/project-file.md is generated from the schema and must be current."""

from pmdc_sizer.app.project_docs import project_file_markdown
from pmdc_sizer.core.project import key_specs
from tests.conftest import REPO


def test_committed_key_table_is_current():
    committed = (REPO / "docs" / "project-file.md").read_text(encoding="utf-8")
    assert committed == project_file_markdown(), "run: python -m pmdc_sizer.app.project_docs > docs/project-file.md"


def test_every_key_is_documented_with_a_description():
    text = project_file_markdown()
    for spec in key_specs():
        assert f"`{spec.path}`" in text
        assert spec.description, f"{spec.path} has no description in the schema"
