"""The datasheet export: PDF and HTML of every demo, read back and compared with the evaluation.

The numbers on the page are compared with the evaluation formatted by the same functions the sheet
uses (app.formatting), so a test failure means the page shows a different value, not a rounding
difference.
"""

from __future__ import annotations

import datetime as dt
import io
import re
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pypdf
import pytest

from pmdc_sizer.app import datasheet
from pmdc_sizer.app.cli import main
from pmdc_sizer.app.errors import CommandError
from pmdc_sizer.app.figures import FAIL_COLOUR, figure, torque_unit
from pmdc_sizer.app.formatting import percent, quantity
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.evaluate import evaluate

ISSUED = dt.date(2026, 3, 14)
INTERNAL = datasheet.SheetOptions("internal")  # everything on the sheet: costs, every check, the notes
A4_POINTS = (595.3, 841.9)  # ISO 216: 210 mm × 297 mm in PostScript points


def _squash(text: str) -> str:
    """Whitespace as one plain space, so table layout and line breaks do not matter."""
    return re.sub(r"\s+", " ", text.replace("\u00a0", " "))


def _pdf_text(path: Path) -> str:
    reader = pypdf.PdfReader(str(path))
    return _squash(" ".join(page.extract_text() for page in reader.pages))


def headline_strings(results) -> dict[str, str]:
    n, c, dm = results.nominal, results.constants, results.demagnetization
    unit = torque_unit(results)
    return {
        "no-load speed": quantity(n.no_load_speed_rad_per_s, "rpm"),
        "no-load current": quantity(n.no_load_current_A, "A"),
        "stall torque": quantity(n.stall_torque_N_m, unit),
        "stall current": quantity(n.stall_current_A, "A"),
        "Ke V/krpm": quantity(c.ke_V_s_per_rad, "V/krpm"),
        "Kt": quantity(c.kt_N_m_per_A, "mN·m/A"),
        "max efficiency": percent(n.max_efficiency),
        "max output power": quantity(n.max_output_power_W, "W"),
        "rated speed, hot": quantity(results.hot.rated.speed_rad_per_s, "rpm"),
        "inductance estimate": quantity(c.inductance_H_estimate, "mH", 2),
        "worst demagnetization case": dm.worst_case,
        "worst margin": quantity(dm.worst_margin_A_per_m, "kA/m"),
        "magnet grade": results.magnet.name,
        "winding temperature": f"{results.thermal.winding_temperature_C:.0f} °C",
        "material cost": f"{results.cost.currency}",
    }


# ----------------------------------------------------------------------------------------------
# PDF


def test_pdf_shows_the_evaluated_headline_numbers(evaluated, tmp_path):
    design, results = evaluated
    target = tmp_path / "sheet.pdf"
    assert datasheet.export(design, results, target, ISSUED, options=INTERNAL) == "PDF"
    text = _pdf_text(target)
    for what, expected in headline_strings(results).items():
        assert _squash(expected) in text, f"{what}: {expected!r} is not on the PDF"
    assert design.project.name[:30] in text
    assert f"Revision {design.project.revision}" in text or f"revision {design.project.revision}" in text
    assert ISSUED.isoformat() in text


def test_pdf_carries_markings_notes_checks_and_cautions(evaluated, tmp_path):
    design, results = evaluated
    target = tmp_path / "sheet.pdf"
    datasheet.export(design, results, target, ISSUED, options=INTERNAL)
    text = _pdf_text(target)
    for phrase in ("A1", "A2", "IEC 60034-8", "clockwise seen from the drive end", "(estimate)",
                   "implanted medical devices", "stalled motor", "currents that burn", "confirm it by test",
                   "local codes and licensed practice", "Insulation class (IEC 60085)"):
        assert phrase in text, phrase
    for check in results.checks:
        assert _squash(check.title) in text
    assert _squash(design.project.notes.strip())[:60] in text


def test_pdf_pages_are_a4_and_not_blank(evaluated, tmp_path):
    pdfium = pytest.importorskip("pypdfium2")
    design, results = evaluated
    target = tmp_path / "sheet.pdf"
    datasheet.export(design, results, target, ISSUED)
    document = pdfium.PdfDocument(str(target))
    try:
        assert 3 <= len(document) <= 6
        for index in range(len(document)):
            page = document[index]
            np.testing.assert_allclose(page.get_size(), A4_POINTS, atol=1.0)
            pixels = page.render(scale=0.5, grayscale=True).to_numpy()
            inked = float(np.mean(pixels < 200))
            # A page of tables or charts inks a few per cent of its area; a blank or black page does not.
            assert 0.01 < inked < 0.5, f"page {index + 1}: {inked:.3f} of the page is inked"
    finally:
        document.close()


def test_pdf_and_preview_have_the_same_pages(ferrite, tmp_path):
    design, results = ferrite
    target = tmp_path / "sheet.pdf"
    datasheet.export(design, results, target, ISSUED)
    pages = datasheet.preview_pages(design, results, 40.0, ISSUED)
    assert len(pages) == len(pypdf.PdfReader(str(target)).pages)
    assert all(not page.isNull() for page in pages)


def test_failing_demagnetization_is_obvious(ferrite, tmp_path):
    design, _ = ferrite
    thin = project_file.with_values(design, {"magnets.thickness_mm": 2.0})
    results = evaluate(thin)
    assert not results.demagnetization.ok
    target = tmp_path / "thin.pdf"
    datasheet.export(thin, results, target, ISSUED)
    text = _pdf_text(target)
    assert "PAST THE KNEE" in text
    assert "This design fails" in text and "Demagnetization" in text
    assert f"Worst case: {results.demagnetization.worst_case}" in text
    assert "FAIL" in text


# ----------------------------------------------------------------------------------------------
# HTML


def test_html_is_well_formed_and_complete(evaluated, tmp_path):
    design, results = evaluated
    target = tmp_path / "sheet.html"
    assert datasheet.export(design, results, target, ISSUED, options=INTERNAL) == "HTML"
    raw = target.read_text(encoding="utf-8")
    assert raw.startswith("<!DOCTYPE html>")
    root = ET.fromstring(raw.split("\n", 1)[1])  # XHTML syntax: an XML parser must accept it
    namespace = {"h": "http://www.w3.org/1999/xhtml", "svg": "http://www.w3.org/2000/svg"}
    ids = {element.get("id") for element in root.iter() if element.get("id")}
    for key in ("headline", "performance", "performance_table", "electrical", "thermal", "magnet", "demagnetization",
                "magnet_grade", "operating_point", "winding", "mass", "cost", "terminals", "checks", "notes",
                "cautions", "chart-performance", "chart-magnet", "chart-outline", "model_notes", "thermal_chart",
                "chart-thermal"):
        assert key in ids, key
    assert len(root.findall(".//svg:svg", namespace)) == 4, "the three charts and the outline inline as SVG"
    assert "src=\"http" not in raw and "href=\"http" not in raw, "self-contained: nothing fetched"
    text = _squash(" ".join(root.itertext()))
    for what, expected in headline_strings(results).items():
        assert _squash(expected) in text, f"{what}: {expected!r} is not in the HTML"
    demag_rows = root.findall(".//h:table[@id='demagnetization']/h:tbody/h:tr", namespace)
    assert len(demag_rows) == len(results.demagnetization.cases)


def test_html_parses_with_the_html_parser_too(ferrite):
    from html.parser import HTMLParser

    design, results = ferrite
    text = datasheet.html_text(design, results, ISSUED)
    void = {"meta", "br", "hr", "img", "link", "input"}

    class Balance(HTMLParser):
        def __init__(self):
            super().__init__()
            self.stack: list[str] = []

        def handle_starttag(self, tag, attrs):
            if tag not in void:
                self.stack.append(tag)

        def handle_startendtag(self, tag, attrs):
            pass

        def handle_endtag(self, tag):
            assert self.stack and self.stack[-1] == tag, f"</{tag}> closes <{self.stack[-1] if self.stack else None}>"
            self.stack.pop()

    parser = Balance()
    parser.feed(text)
    parser.close()
    assert parser.stack == []


# ----------------------------------------------------------------------------------------------
# Charts


@pytest.mark.parametrize("name", ["performance", "magnet"])
def test_charts_as_png_and_svg(ferrite, tmp_path, name):
    _design, results = ferrite
    png, svg = tmp_path / f"{name}.png", tmp_path / f"{name}.svg"
    datasheet.write_chart(results, name, png)
    datasheet.write_chart(results, name, svg)
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    root = ET.parse(svg).getroot()
    assert root.tag.endswith("svg")
    texts = " ".join(t for t in root.itertext())
    labels = {"performance": ("Speed [rpm]", "Armature current [A]", "Efficiency [%]", "rated point", "cold", "hot"),
              "magnet": ("Field strength H [kA/m]", "normal curve B", "intrinsic curve J", "load line", "knee")}[name]
    for label in labels:
        assert label in texts, label


def test_chart_image_is_drawn(ferrite):
    from pmdc_sizer.app.datasheet.charts import chart_image

    _, results = ferrite
    image = chart_image("magnet", results, 600)
    buffer = np.frombuffer(image.constBits(), dtype=np.uint8).reshape(image.height(), image.bytesPerLine())
    assert float(np.mean(buffer < 200)) > 0.01


def test_magnet_chart_marks_failing_cases(ferrite):
    from pmdc_sizer.app.datasheet.charts import magnet_panel

    design, _ = ferrite
    results = evaluate(project_file.with_values(design, {"magnets.thickness_mm": 2.0}))
    failing = [m for m in magnet_panel(results).markers if m.point == "demagnetization_fails"]
    assert failing and all(m.shape == "cross" and m.colour.name() == FAIL_COLOUR and "FAILS" in m.label
                           for m in failing)


# ----------------------------------------------------------------------------------------------
# Errors leave nothing behind


def _leftovers(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir())


@pytest.mark.parametrize("suffix", [".pdf", ".html"])
def test_unwritable_target_gives_a_clear_error_and_no_partial_file(ferrite, tmp_path, suffix):
    design, results = ferrite
    blocked = tmp_path / f"sheet{suffix}"
    blocked.mkdir()  # a folder where the file should go: refused before anything is written
    with pytest.raises(CommandError, match="is a folder, not a file"):
        datasheet.export(design, results, blocked, ISSUED)
    assert _leftovers(tmp_path) == [blocked.name]
    with pytest.raises(CommandError, match="does not exist"):
        datasheet.export(design, results, tmp_path / "missing" / f"sheet{suffix}", ISSUED)
    assert _leftovers(tmp_path) == [blocked.name]


def test_unknown_extension_is_refused(ferrite, tmp_path):
    design, results = ferrite
    with pytest.raises(CommandError, match=r"\.pdf or \.html"):
        datasheet.export(design, results, tmp_path / "sheet.docx")
    assert _leftovers(tmp_path) == []


def test_export_is_readable_by_others(ferrite, tmp_path):
    design, results = ferrite
    target = tmp_path / "sheet.pdf"
    datasheet.export(design, results, target, ISSUED)
    assert target.stat().st_mode & 0o044, "a datasheet is for handing on, not a private temporary file"


# ----------------------------------------------------------------------------------------------
# Command line


def test_cli_writes_pdf_and_charts(ferrite_demo, tmp_path, capsys):
    target = tmp_path / "motor.pdf"
    charts = tmp_path / "charts"
    charts.mkdir()
    assert main(["datasheet", str(ferrite_demo), "-o", str(target), "--charts", str(charts)]) == 0
    assert target.read_bytes()[:5] == b"%PDF-"
    assert _leftovers(charts) == ["motor_magnet.png", "motor_magnet.svg", "motor_performance.png",
                                  "motor_performance.svg"]
    assert "of the PDF datasheet" in capsys.readouterr().out


def test_cli_set_changes_the_sheet(ndfeb_demo, tmp_path):
    target = tmp_path / "motor.html"
    assert main(["datasheet", str(ndfeb_demo), "-o", str(target), "--set", "supply.voltage_V=36"]) == 0
    assert "36.0 V" in target.read_text(encoding="utf-8")


@pytest.mark.parametrize("name, message", [
    ("motor.docx", "unknown datasheet format '.docx'"),
    ("missing/motor.pdf", "does not exist"),
    ("blocked.pdf", "is a folder, not a file"),
])
def test_cli_errors_exit_2_with_one_line(ferrite_demo, tmp_path, capsys, name, message):
    (tmp_path / "blocked.pdf").mkdir()
    assert main(["datasheet", str(ferrite_demo), "-o", str(tmp_path / name)]) == 2
    err = capsys.readouterr().err
    assert message in err and err.count("\n") == 1, err
    assert _leftovers(tmp_path) == ["blocked.pdf"]


def test_cli_bad_project_exits_2(tmp_path, capsys):
    broken = tmp_path / "broken.toml"
    broken.write_text("[magnets]\nthickness_mm = -1\n", encoding="utf-8")
    assert main(["datasheet", str(broken), "-o", str(tmp_path / "x.pdf")]) == 2
    assert "magnets.thickness_mm" in capsys.readouterr().err
    assert not (tmp_path / "x.pdf").exists()


def test_cli_curves_csv_still_works(ferrite_demo, tmp_path):
    target = tmp_path / "curves.csv"
    assert main(["curves", str(ferrite_demo), "--csv", "-o", str(target)]) == 0
    header = io.StringIO(target.read_text(encoding="utf-8")).readline()
    assert header.startswith("case,winding_temperature_C")


def test_curves_are_cut_to_the_plot_in_our_own_code():
    # SVG ignores a painter's clip, so the charts cut their polylines themselves.
    from PySide6.QtCore import QPointF, QRectF

    from pmdc_sizer.app.datasheet.charts import clipped_path

    box = QRectF(0, 0, 10, 10)
    path = clipped_path([QPointF(-5, 5), QPointF(5, 5), QPointF(15, 5), QPointF(15, 20)], box)
    bounds = path.boundingRect()
    assert (bounds.left(), bounds.right(), bounds.top(), bounds.bottom()) == pytest.approx((0, 10, 5, 5))
    assert clipped_path([QPointF(20, 20), QPointF(30, 30)], box).isEmpty()


def _figures(number: str) -> int:
    """Significant figures of a printed number; an integer's trailing zeros are not counted."""
    digits = number.lstrip("-−").replace(".", "")
    digits = digits.lstrip("0")
    if "." not in number:
        digits = digits.rstrip("0")
    return max(len(digits), 1)


def test_no_figure_shows_more_digits_than_the_model_deserves(evaluated):
    from pmdc_sizer.app.datasheet.content import build, electrical_table, performance_table, thermal_table

    design, results = evaluated
    sheet = build(design, results, ISSUED)
    assert sheet.headline
    tables = (performance_table(results), electrical_table(results), thermal_table(results))
    for table in tables:
        for row in table.rows:
            if row.kind == "group":
                continue
            allowed = 2 if "estimate" in row.cells[0] else 3
            for cell in row.cells[1:]:
                for number in re.findall(r"[-−]?\d+(?:\.\d+)?", cell.split("(")[0]):
                    if cell.startswith(("S1", "S2")) or "°C" in cell or "IEC" in row.cells[0]:
                        continue  # duty names, whole degrees and class names are not measurements
                    assert _figures(number) <= allowed, f"{row.cells[0]}: {cell}"


def test_rated_load_beyond_stall_says_so(ferrite, tmp_path):
    design, _ = ferrite
    overloaded = project_file.with_values(design, {"load.torque_mNm": 500.0})
    results = evaluate(overloaded)
    assert not any(c.rated_reached for c in results.cases)
    target = tmp_path / "overloaded.html"
    datasheet.export(overloaded, results, target, ISSUED)
    root = ET.fromstring(target.read_text(encoding="utf-8").split("\n", 1)[1])
    text = _squash(" ".join(root.itertext()))
    assert f"{figure('case.rated.speed_rad_per_s').title} stalls stalls stalls" in text
    assert "This design fails" in text and "Rated load" in text


def test_sheet_is_issued_on_the_revision_date_when_the_project_gives_one(ferrite_demo):
    from pmdc_sizer.app.datasheet.content import build
    from pmdc_sizer.core import project as pf
    from pmdc_sizer.core.evaluate import evaluate

    dated = pf.with_values(pf.load(ferrite_demo), {"project.revision_date": "2026-11-20"})
    assert build(dated, evaluate(dated)).issued == "2026-11-20"


def test_headline_shows_what_the_drive_limit_lets_the_motor_reach():
    # The issue: the drill's sheet showed a 42.7 N·m stall torque and 23 500 W from a drive limited to 80 A.
    from pmdc_sizer.app.datasheet import content

    design = project_file.load("demo_projects/power_tool_4pole_48v.toml")
    results = evaluate(design)
    tiles = dict(content.headline(design, results))
    envelope = results.nominal.envelope
    assert envelope.limited
    limit_title = figure("case.envelope.torque_limit_N_m").title
    power_title = figure("case.envelope.max_output_power_W").title
    assert tiles[limit_title] == quantity(envelope.torque_limit_N_m, torque_unit(results))
    assert tiles[power_title] == quantity(envelope.max_output_power_W, "W")
    assert figure("case.stall_torque_N_m").title not in tiles  # the unlimited stall stays in the tables
