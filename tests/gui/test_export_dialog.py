"""The export dialog, offscreen: its preview pages and every save button, with the file dialog stubbed."""

from __future__ import annotations

import datetime as dt
import xml.etree.ElementTree as ET

import pytest

from pmdc_sizer.app.gui import export_dialog
from pmdc_sizer.core import project as project_file
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
    assert "Not saved" in dialog.status.text() and "cannot write the file" in dialog.status.text()
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
