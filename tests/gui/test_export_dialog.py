"""The export dialog, offscreen: its preview pages and every save button, with the file dialog stubbed."""

from __future__ import annotations

import datetime as dt
import xml.etree.ElementTree as ET

import pytest

from pmdc_sizer.app.gui import export_dialog
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core import with_values
from pmdc_sizer.core.evaluate import evaluate


@pytest.fixture
def dialog(qtbot, ferrite_demo):
    design = project_file.load(ferrite_demo)
    window = export_dialog.ExportDialog(design, evaluate(design), ferrite_demo, issued=dt.date(2026, 3, 14))
    qtbot.addWidget(window)
    window.show()
    return window


def _answer_save_dialog(monkeypatch, path, chosen_filter=""):
    asked = []

    def fake(parent, title, suggested, file_filter):
        asked.append((title, suggested, file_filter))
        return (str(path) if path is not None else "", chosen_filter)

    monkeypatch.setattr(export_dialog.QFileDialog, "getSaveFileName", staticmethod(fake))
    return asked


def test_preview_shows_every_page(dialog):
    assert len(dialog.page_labels) >= 3
    for label in dialog.page_labels:
        pixmap = label.pixmap()
        assert not pixmap.isNull()
        assert pixmap.height() / pixmap.width() == pytest.approx(297 / 210, rel=0.01)  # A4 portrait
    heading = dialog.findChild(export_dialog.QLabel, "export_heading").text()
    assert f"{len(dialog.page_labels)} A4 pages" in heading and "2026-03-14" in heading


@pytest.mark.parametrize("key, name, magic", [
    ("pdf", "sheet.pdf", b"%PDF-"),
    ("html", "sheet.html", b"<!DOCTYPE html>"),
    ("csv", "curves.csv", b"case,winding_temperature_C"),
    ("performance", "performance.png", b"\x89PNG"),
    ("magnet", "magnet.png", b"\x89PNG"),
])
def test_each_save_button_writes_its_file(dialog, monkeypatch, tmp_path, qtbot, key, name, magic):
    asked = _answer_save_dialog(monkeypatch, tmp_path / name)
    dialog.buttons[key].click()
    assert (tmp_path / name).read_bytes().startswith(magic)
    assert "Saved" in dialog.status.text() and str(tmp_path / name) in dialog.status.text()
    assert asked[0][1].startswith(str(dialog.path_hint.parent))  # suggested beside the project file


def test_chart_as_svg_from_the_chosen_filter(dialog, monkeypatch, tmp_path):
    _answer_save_dialog(monkeypatch, tmp_path / "magnet_chart", "SVG drawing (*.svg)")
    dialog.buttons["magnet"].click()
    written = tmp_path / "magnet_chart.svg"
    assert ET.parse(written).getroot().tag.endswith("svg")
    assert dialog.last_saved == written


def test_missing_suffix_is_added(dialog, monkeypatch, tmp_path):
    _answer_save_dialog(monkeypatch, tmp_path / "datasheet")
    dialog.buttons["pdf"].click()
    assert (tmp_path / "datasheet.pdf").read_bytes()[:5] == b"%PDF-"


def test_cancel_writes_nothing(dialog, monkeypatch, tmp_path):
    _answer_save_dialog(monkeypatch, None)
    dialog.buttons["pdf"].click()
    assert list(tmp_path.iterdir()) == []
    assert dialog.last_saved is None


def test_unwritable_file_shows_why_and_leaves_nothing(dialog, monkeypatch, tmp_path):
    blocked = tmp_path / "sheet.pdf"
    blocked.mkdir()
    _answer_save_dialog(monkeypatch, blocked)
    dialog.buttons["pdf"].click()
    assert "Not saved" in dialog.status.text() and "is a folder, not a file" in dialog.status.text()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["sheet.pdf"]
    assert blocked.is_dir()


def test_open_without_results_explains_instead(qtbot, monkeypatch, ferrite_demo):
    told = []
    monkeypatch.setattr(export_dialog.QMessageBox, "information",
                        staticmethod(lambda parent, title, text: told.append(text)))
    assert export_dialog.open_export_dialog(None, project_file.load(ferrite_demo), None, ferrite_demo) is None
    assert told and "nothing to export" in told[0]


def test_open_export_dialog_shows_it(qtbot, ferrite_demo):
    design = project_file.load(ferrite_demo)
    shown = export_dialog.open_export_dialog(None, design, evaluate(design), None)
    qtbot.addWidget(shown)
    assert shown.isVisible()
    assert shown.suggested_path("pdf").endswith(".pdf")


def _pdf_text(path) -> str:
    import pypdf

    return " ".join(" ".join(page.extract_text().split()) for page in pypdf.PdfReader(str(path)).pages)


def test_dialog_offers_both_editions_and_saves_the_chosen_one(dialog, monkeypatch, tmp_path):
    assert dialog.options.edition == "customer"  # the default: what may leave the company
    assert [dialog.edition.itemData(i) for i in range(dialog.edition.count())] == ["customer", "internal"]
    _answer_save_dialog(monkeypatch, tmp_path / "customer.pdf")
    dialog.buttons["pdf"].click()
    assert "Material cost" not in _pdf_text(tmp_path / "customer.pdf")
    customer_pages = len(dialog.page_labels)

    dialog.edition.setCurrentIndex(dialog.edition.findData("internal"))
    assert "internal edition" in dialog.heading.text()
    assert len(dialog.page_labels) >= customer_pages  # the preview follows the choice
    asked = _answer_save_dialog(monkeypatch, tmp_path / "internal.pdf")
    dialog.buttons["pdf"].click()
    assert asked[0][1].endswith("_internal.pdf")  # the suggested name says which edition it is
    text = _pdf_text(tmp_path / "internal.pdf")
    assert "Material cost" in text and "Model notes" in text


def test_dialog_letter_paper_and_us_units(dialog, monkeypatch, tmp_path):
    dialog.paper.setCurrentIndex(dialog.paper.findData("Letter"))
    dialog.units.setCurrentIndex(dialog.units.findData("US customary"))
    pixmap = dialog.page_labels[0].pixmap()
    assert pixmap.height() / pixmap.width() == pytest.approx(11.0 / 8.5, rel=0.01)
    assert "Letter pages" in dialog.heading.text()
    _answer_save_dialog(monkeypatch, tmp_path / "us.pdf")
    dialog.buttons["pdf"].click()
    text = _pdf_text(tmp_path / "us.pdf")
    assert "oz·in" in text and "°F" in text


SPREAD_CAPTION = "Production spread: min and max are the"  #: the tolerance table's caption on the sheet
FEW_MOTORS = 120  #: enough for the drivers' ranking (core.tolerance_study.MIN_MOTORS_RANKED), quick to run


def _few_motors(design):
    return with_values(design, {"tolerances.samples": FEW_MOTORS})


def _saved_html(dialog, monkeypatch, path) -> str:
    _answer_save_dialog(monkeypatch, path)
    dialog.buttons["html"].click()
    return path.read_text(encoding="utf-8")


def test_the_study_of_the_spread_page_goes_on_the_sheet(qtbot, ferrite_demo, monkeypatch, tmp_path):
    from pmdc_sizer.core.tolerance_study import run_study

    design = _few_motors(project_file.load(ferrite_demo))
    study = run_study(design)
    window = export_dialog.ExportDialog(design, evaluate(design), ferrite_demo, issued=dt.date(2026, 3, 14),
                                        study=study)
    qtbot.addWidget(window)
    assert window.spread.isChecked() and f"{FEW_MOTORS} motors" in window.spread_note.text()
    assert window.tolerance is study
    assert SPREAD_CAPTION in _saved_html(window, monkeypatch, tmp_path / "with.html")
    window.spread.setChecked(False)  # the engineer may leave it off
    assert window.tolerance is None
    assert SPREAD_CAPTION not in _saved_html(window, monkeypatch, tmp_path / "without.html")


def test_without_a_study_ticking_the_box_runs_one(qtbot, ferrite_demo, monkeypatch, tmp_path):
    design = _few_motors(project_file.load(ferrite_demo))
    window = export_dialog.ExportDialog(design, evaluate(design), ferrite_demo, issued=dt.date(2026, 3, 14))
    qtbot.addWidget(window)
    assert not window.spread.isChecked() and "ticking runs" in window.spread_note.text()
    assert SPREAD_CAPTION not in _saved_html(window, monkeypatch, tmp_path / "before.html")
    pages = len(window.page_labels)
    window.spread.setChecked(True)
    assert window.study is not None and window.study.samples == FEW_MOTORS
    assert window.study.seed == design.tolerances.seed
    assert len(window.page_labels) >= pages  # the preview was laid out again, with the section
    assert SPREAD_CAPTION in _saved_html(window, monkeypatch, tmp_path / "after.html")


def test_a_cancelled_study_leaves_the_box_unticked(qtbot, ferrite_demo, monkeypatch):
    design = _few_motors(project_file.load(ferrite_demo))
    window = export_dialog.ExportDialog(design, evaluate(design), ferrite_demo, issued=dt.date(2026, 3, 14))
    qtbot.addWidget(window)
    monkeypatch.setattr(export_dialog.QProgressDialog, "wasCanceled", lambda self: True)
    window.spread.setChecked(True)
    assert not window.spread.isChecked() and window.study is None and window.tolerance is None
    assert "cancelled" in window.status.text()
