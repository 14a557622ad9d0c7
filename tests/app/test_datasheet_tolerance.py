"""The datasheet's tolerance column: min / typ / max of the figures a customer reads, with its stated basis."""

from __future__ import annotations

import re
from pathlib import Path

import pypdf
import pytest

from pmdc_sizer.app import datasheet
from pmdc_sizer.app.figures import DATASHEET_TOLERANCE_FIGURES, TOLERANCE_FIGURES, figure
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.tolerance_study import run_study

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"


@pytest.fixture(scope="module")
def ferrite_study():
    design = project_file.load(FERRITE)
    return design, evaluate(design), run_study(design, samples=12, seed=3)


def test_the_sheet_has_a_tolerance_table_only_when_given_a_study(ferrite_study):
    design, results, study = ferrite_study
    plain = datasheet.build(design, results)
    assert "tolerance" not in [s.key for s in plain.sections]
    sheet = datasheet.build(design, results, tolerance=study)
    table = sheet.section("tolerance").blocks[0]
    assert table.header == ("At the nominal temperature", "min", "typ", "max")
    titles = [row.cells[0] for row in table.rows]
    assert titles == [figure(TOLERANCE_FIGURES[name]).label() for name in DATASHEET_TOLERANCE_FIGURES]
    ke = study.figures["nominal.ke_V_s_per_rad"]
    ke_row = table.rows[DATASHEET_TOLERANCE_FIGURES.index("nominal.ke_V_s_per_rad")].cells
    shown = figure("case.ke_V_s_per_rad")
    assert ke_row[1:] == (shown.number(ke.low), shown.number(ke.typical), shown.number(ke.high))
    assert "99.865 %" in table.caption and "12 motors" in table.caption and "seed 3" in table.caption
    assert "Br ±2" in table.caption  # the stated spreads


def test_the_pdf_prints_the_column_in_us_units_too(ferrite_study, tmp_path):
    design, results, study = ferrite_study
    out = tmp_path / "sheet.pdf"
    datasheet.export(design, results, out, options=datasheet.SheetOptions("customer", "Letter", "US customary"),
                     tolerance=study)
    text = re.sub(r"\s+", " ", " ".join(page.extract_text() for page in pypdf.PdfReader(str(out)).pages))
    assert "Production spread" in text and "At the nominal temperature" in text
    assert "Stall torque, no current limit [oz·in]" in text
