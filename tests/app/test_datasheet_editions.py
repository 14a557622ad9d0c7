"""The two editions of the datasheet, its paper sizes and units, its print stylesheet and its outline.

The customer edition is what leaves the company: no material cost, nothing recalled (``from memory``),
no model notes and none of the designer's own warnings. The internal edition keeps all of it. Both are
read back from the written files (PDF text through pypdf, the HTML as text), not from the content
objects, so a phrase that slips in through a chart, a caption or a check message is caught too.
"""

from __future__ import annotations

import datetime as dt
import re

import pypdf
import pytest

from pmdc_sizer.app import datasheet
from pmdc_sizer.app.cli import main
from pmdc_sizer.app.datasheet import SheetOptions
from pmdc_sizer.app.datasheet.content import CUSTOMER_CHECKS
from pmdc_sizer.app.figures import figure, shown_value, value_of
from pmdc_sizer.app.formatting import significant
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.evaluate import evaluate

from .test_datasheet import _pdf_text, _squash

ISSUED = dt.date(2026, 3, 14)
INTERNAL = SheetOptions("internal")
LETTER_POINTS = (612.0, 792.0)  # ANSI Letter, 8.5 in × 11 in, in PostScript points

#: What never reaches a customer: words of cost, recalled values, model notes, internal states.
INTERNAL_ONLY = ("from memory", "Model notes", "Material cost", "cost", "lumped magnetic circuit",
                 "Thermal solution", "converged", "hard to wind", "Notes")


def _html_text(raw: str) -> str:
    """The HTML's visible text and attribute values, without the stylesheet (whose words are not printed)."""
    raw = re.sub(r"<style>.*?</style>", "", raw, flags=re.DOTALL)
    return _squash(re.sub(r"<[^>]+>", " ", raw))


def test_customer_edition_carries_no_cost_no_recalled_values_no_model_notes(evaluated, tmp_path):
    design, results = evaluated
    pdf, page = tmp_path / "customer.pdf", tmp_path / "customer.html"
    datasheet.export(design, results, pdf, ISSUED)  # the default edition is the customer's
    datasheet.export(design, results, page, ISSUED)
    for name, text in (("PDF", _pdf_text(pdf)), ("HTML", _html_text(page.read_text(encoding="utf-8")))):
        lowered = text.lower()
        for phrase in INTERNAL_ONLY:
            assert phrase.lower() not in lowered, f"{name}: {phrase!r} is on the customer's sheet"
        assert results.cost.currency not in text.split(), f"{name}: the currency is on the customer's sheet"
        assert design.project.notes.strip()[:40] not in text, f"{name}: the project's notes are on it"
        # What the customer does get: ratings, constants, verdicts, outline, cautions.
        for phrase in ("No-load speed", "Stall torque", "Back-EMF constant Ke", "Torque constant Kt",
                       "Terminal resistance", "Speed drop per unit torque", "Margin to the knee", "Outline",
                       "Verdicts", "Demagnetization", "Winding temperature", "implanted medical devices",
                       "local codes and licensed practice", "A1 positive"):
            assert phrase in text, f"{name}: {phrase!r} is missing"


def test_customer_edition_states_only_the_customers_verdicts(evaluated):
    design, results = evaluated
    sheet = datasheet.build(design, results, ISSUED)
    checks = sheet.section("checks").blocks[0]
    shown = {row.cells[1] for row in checks.rows}
    assert shown == {c.title for c in results.checks if c.key in CUSTOMER_CHECKS}
    internal = datasheet.build(design, results, ISSUED, options=INTERNAL).section("checks").blocks[0]
    assert {row.cells[1] for row in internal.rows} == {c.title for c in results.checks}


def test_internal_edition_keeps_everything(evaluated, tmp_path):
    design, results = evaluated
    pdf = tmp_path / "internal.pdf"
    datasheet.export(design, results, pdf, ISSUED, options=INTERNAL)
    text = _pdf_text(pdf)
    for phrase in ("Material cost", "Model notes", "Thermal solution", "Design checks", results.cost.currency,
                   "internal engineering datasheet".upper()):
        assert phrase in text, phrase
    assert _squash(design.project.notes.strip())[:60] in text
    for check in results.checks:
        assert _squash(check.title) in text
    if "from memory" in results.magnet.source:
        assert "from memory" in text  # recalled grade data said as such, inside the company


def test_cli_edition_option(ferrite_demo, tmp_path, capsys):
    customer, internal = tmp_path / "c.pdf", tmp_path / "i.pdf"
    assert main(["datasheet", str(ferrite_demo), "-o", str(customer)]) == 0
    assert "customer edition" in capsys.readouterr().out
    assert main(["datasheet", str(ferrite_demo), "-o", str(internal), "--edition", "internal"]) == 0
    assert "Material cost" in _pdf_text(internal) and "Material cost" not in _pdf_text(customer)


def test_field_appendix_belongs_to_the_internal_edition(ferrite_demo, tmp_path, capsys):
    assert main(["datasheet", str(ferrite_demo), "-o", str(tmp_path / "x.pdf"), "--with-field"]) == 2
    assert "--edition internal" in capsys.readouterr().err
    assert not (tmp_path / "x.pdf").exists()


# ----------------------------------------------------------------------------------------------
# Layout


def test_demagnetization_margin_and_result_columns_do_not_run_together(ferrite):
    from pmdc_sizer.app.datasheet.document import _qt_table

    design, results = ferrite
    table = datasheet.build(design, results, ISSUED).section("magnet").blocks[1]
    result_column = len(table.header) - 1
    assert table.is_numeric(result_column - 1) and not table.is_numeric(result_column)  # the words sit left
    # Every column after the first keeps a gap on its left, headers included, so "95.0 kA/m" and "safe" (or
    # "Margin to the knee" and its neighbour) never touch.
    qt = _qt_table(table, px_per_mm=10.0)
    cells = re.findall(r"<t[hd](?:\s[^>]*)?>", qt)  # cells, not <thead>
    columns = len(table.header)
    for index, cell in enumerate(cells[:columns]):
        assert ("padding-left: 16px" in cell) == (index > 0), cell


def test_html_prints_with_page_numbers_and_keeps_tables_whole(ferrite):
    design, results = ferrite
    raw = datasheet.html_text(design, results, ISSUED)
    style = re.search(r"<style>(.*?)</style>", raw, flags=re.DOTALL).group(1)
    page_rule = re.search(r"@page\s*\{(.*?)\}\s*\}", style, flags=re.DOTALL)
    assert page_rule, "an @page rule"
    assert "size: A4" in page_rule.group(1)
    assert re.search(r"@bottom-\w+\s*\{[^}]*counter\(page\)[^}]*counter\(pages\)", page_rule.group(1))
    assert re.search(r"(^|[\s,}])table[^{]*\{[^}]*break-inside:\s*avoid", style, flags=re.MULTILINE)
    assert re.search(r"section\.keep[^{]*\{[^}]*break-inside:\s*avoid", style)
    assert re.search(r"h2[^{]*\{[^}]*break-after:\s*avoid", style)
    # Each titled table travels with its title and caption.
    assert re.search(r'<div class="block">\s*<h3>Magnet grade</h3>\s*<table id="magnet_grade">', raw)


# ----------------------------------------------------------------------------------------------
# Paper and units


def test_letter_paper(ferrite, tmp_path):
    design, results = ferrite
    pdf = tmp_path / "letter.pdf"
    datasheet.export(design, results, pdf, ISSUED, options=SheetOptions(paper="Letter"))
    for page in pypdf.PdfReader(str(pdf)).pages:
        assert (float(page.mediabox.width), float(page.mediabox.height)) == pytest.approx(LETTER_POINTS, abs=1.0)
    assert "size: Letter" in datasheet.html_text(design, results, ISSUED, options=SheetOptions(paper="Letter"))


def test_us_customary_sheet_prints_in_us_units_to_the_same_figures(ferrite, tmp_path):
    design, results = ferrite
    si = datasheet.build(design, results, ISSUED)
    us = datasheet.build(design, results, ISSUED, options=SheetOptions(units="US customary"))
    si_rows = {row.cells[0]: row.cells[1:] for row in si.section("construction").blocks[0].left[0].rows}
    us_rows = {row.cells[0]: row.cells[1:] for row in us.section("construction").blocks[0].left[0].rows}
    title = figure("geometry.housing_outer_diameter_m").title
    assert si_rows[title][0].endswith(" mm") and us_rows[title][0].endswith(" in")
    performance = {row.cells[0]: row.cells[1:] for row in us.section("performance").blocks[-1].rows}
    assert performance[figure("case.stall_torque_N_m").title][1].endswith("oz·in")
    assert performance[figure("case.ambient_C").title][1].endswith("°F")
    # Rounded alike: the US figure is the converted value to the same significant figures as the SI one.
    for key in ("case.stall_torque_N_m", "case.kt_N_m_per_A", "case.speed_torque_gradient_rad_per_s_per_N_m",
                "case.no_load_speed_rad_per_s"):
        item = figure(key)
        for case, us_text in zip(results.cases, performance[item.title], strict=True):
            unit = us_text.split(" ", 1)[1]
            expected = significant(shown_value(value_of(case, key), unit), item.digits)
            assert us_text.split()[0] == expected, (key, us_text, expected)


# ----------------------------------------------------------------------------------------------
# Outline and project keys


def test_outline_drawing_is_on_the_sheet_with_its_dimensions(ferrite, tmp_path):
    design, results = ferrite
    pdf = tmp_path / "sheet.pdf"
    datasheet.export(design, results, pdf, ISSUED)
    svg = datasheet.html_text(design, results, ISSUED)
    g = results.geometry
    for key, value in (("geometry.housing_outer_diameter_m", g.housing_outer_diameter_m),
                       ("geometry.housing_length_m", g.housing_length_m),
                       ("geometry.shaft_diameter_m", g.shaft_diameter_m),
                       ("geometry.overhang_m", g.overhang_m)):
        assert figure(key).text(value) in svg, key  # the outline's SVG carries its dimension texts
    assert 'id="chart-outline"' in svg
    image = datasheet.charts.chart_image("outline", results, 800)

    def inked(x_from: int, x_to: int) -> float:
        """The share of non-white pixels in a band of columns (sampled every 3 px)."""
        points = [(x, y) for x in range(x_from, x_to, 3) for y in range(0, image.height(), 3)]
        return sum(image.pixelColor(x, y).lightness() < 245 for x, y in points) / len(points)

    # Both views are drawn: filled housing, magnets and armature ink a good part of each half.
    assert inked(0, 320) > 0.05, "the end view is drawn"
    assert inked(330, 800) > 0.03, "the side view is drawn"


def test_project_keys_for_the_title_block(ferrite_demo, tmp_path):
    from PySide6.QtGui import QColor, QImage

    logo = tmp_path / "logo.png"
    image = QImage(120, 40, QImage.Format.Format_RGB32)
    image.fill(QColor("#24476b"))
    assert image.save(str(logo))
    design = project_file.with_values(project_file.load(ferrite_demo), {
        "project.part_number": "PM-4711-B", "project.customer": "Invented Pumps Ltd",
        "project.drawn_by": "J. Example", "project.logo": "logo.png"})
    results = evaluate(design)
    pdf = tmp_path / "sheet.pdf"
    datasheet.export(design, results, pdf, ISSUED, project_folder=tmp_path)
    text = _pdf_text(pdf)
    for phrase in ("PM-4711-B", "Invented Pumps Ltd", "J. Example"):
        assert phrase in text
    assert "data:image/png;base64," in datasheet.html_text(design, results, ISSUED, project_folder=tmp_path)
    missing = project_file.with_values(design, {"project.logo": "nowhere.png"})
    with pytest.raises(datasheet.CommandError, match=r"project\.logo"):
        datasheet.export(missing, results, tmp_path / "x.pdf", ISSUED, project_folder=tmp_path)
    assert not (tmp_path / "x.pdf").exists()


def test_paper_units_convert_each_side_of_a_ratio_and_keep_watts():
    from pmdc_sizer.app.datasheet.paper_units import paper_unit, printed_in

    with printed_in("US customary"):
        assert paper_unit("rpm/mN·m") == "rpm/oz·in"
        assert paper_unit("K/W") == "K/W"  # a thermal resistance, not per horsepower
        assert paper_unit("W") == "W"
        assert paper_unit("mm") == "in" and paper_unit("°C") == "°F"
    assert paper_unit("mm") == "mm"  # outside the block: SI again
