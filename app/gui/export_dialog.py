"""The export dialog: a page-by-page preview of the datasheet and buttons that save each format.

The preview pages are painted by the same routine as the PDF, so what is shown is what is saved.
Saving never blocks on a message box: the outcome (the path written, or the reason it failed) is
shown in the dialog's status line.

The production spread (the min/typ/max column of the figures a customer reads, as ``datasheet
--with-tolerance`` writes it) is offered when the dialog opens: the study already run on the
production-spread page is taken if it is of this design and draw; otherwise ticking the box runs one
here, with the file's motors and seed, behind a progress bar that can cancel it.
"""

from __future__ import annotations

import datetime as _dt
from pathlib import Path

from PySide6.QtCore import Qt
from PySide6.QtGui import QPixmap
from PySide6.QtWidgets import (
    QApplication,
    QCheckBox,
    QComboBox,
    QDialog,
    QFileDialog,
    QFormLayout,
    QHBoxLayout,
    QLabel,
    QMessageBox,
    QProgressDialog,
    QPushButton,
    QScrollArea,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.app import datasheet
from pmdc_sizer.app.datasheet.options import EDITIONS, PAPER_SIZES_MM, UNIT_SYSTEMS, SheetOptions
from pmdc_sizer.app.errors import CommandError
from pmdc_sizer.app.export_checks import check_csv
from pmdc_sizer.app.files import curves_csv, write_text_atomically
from pmdc_sizer.app.safety import DEFER_NOTE, ESTIMATES_NOTE

from .style import outcome_text

PREVIEW_DPI = 80.0

#: What each save button writes: (button text, dialog title, file filter, default suffix).
TARGETS = {
    "pdf": ("Save PDF…", "Save the datasheet as PDF", "PDF document (*.pdf)", ".pdf"),
    "html": ("Save HTML…", "Save the datasheet as HTML", "Web page, self-contained (*.html *.htm)", ".html"),
    "csv": ("Save curves CSV…", "Save the speed-torque curves as CSV", "Comma-separated values (*.csv)", ".csv"),
    "performance": ("Save performance chart…", "Save the performance chart",
                    "PNG image (*.png);;SVG drawing (*.svg)", ".png"),
    "magnet": ("Save magnet chart…", "Save the magnet operating chart",
               "PNG image (*.png);;SVG drawing (*.svg)", ".png"),
}
_SUFFIXES = {"pdf": (".pdf",), "html": (".html", ".htm"), "csv": (".csv",),
             "performance": (".png", ".svg"), "magnet": (".png", ".svg")}


def _safe_stem(text: str) -> str:
    keep = "".join(ch if ch.isalnum() or ch in "-_" else "_" for ch in text.strip())
    return "_".join(part for part in keep.split("_") if part)[:60] or "datasheet"


class ExportDialog(QDialog):
    """Preview of the datasheet of one evaluated design, with a save button per format."""

    def __init__(self, project, results, path_hint=None, parent: QWidget | None = None, issued: _dt.date | None = None,
                 study=None):
        super().__init__(parent)
        self.project = project
        self.results = results
        self.study = study  #: a ToleranceStudy of this design (the production-spread page's), or None
        self.issued = issued or _dt.date.today()
        self.path_hint = Path(path_hint) if path_hint else None
        self.last_saved: Path | None = None
        self.setWindowTitle(f"Export datasheet: {project.project.name}")
        self.setObjectName("export_dialog")
        self.resize(980, 860)

        self.page_labels: list[QLabel] = []
        self.preview = QScrollArea()
        self.preview.setWidgetResizable(True)
        self.preview.setMinimumWidth(720)

        side = QVBoxLayout()
        # Who the sheet is for, its paper and its units: the preview follows each choice.
        choices = QFormLayout()
        self.edition = self._choice("edition", {"customer": "Customer", "internal": "Internal (costs, all checks, "
                                                "model notes)"}, EDITIONS)
        self.paper = self._choice("paper", {name: name for name in PAPER_SIZES_MM}, tuple(PAPER_SIZES_MM))
        self.units = self._choice("units", {name: name for name in UNIT_SYSTEMS}, UNIT_SYSTEMS)
        choices.addRow("Edition", self.edition)
        choices.addRow("Paper", self.paper)
        choices.addRow("Units", self.units)
        side.addLayout(choices)
        self.spread = QCheckBox("Production spread column")
        self.spread.setObjectName("export_spread")
        self.spread.setToolTip("Add the min / typ / max column of no-load speed and current, Ke, terminal resistance "
                               "and stall torque over the production spread (±3σ of the file's tolerances)")
        self.spread_note = QLabel()
        self.spread_note.setObjectName("export_spread_note")
        self.spread_note.setWordWrap(True)
        self.spread_note.setStyleSheet("color: #5b6470; margin-left: 22px;")
        self._label_spread()
        self.spread.setChecked(study is not None)
        self.spread.toggled.connect(self._on_spread_toggled)
        side.addWidget(self.spread)
        side.addWidget(self.spread_note)
        self.heading = heading = QLabel()
        heading.setObjectName("export_heading")
        heading.setWordWrap(True)
        side.addWidget(heading)
        self.buttons: dict[str, QPushButton] = {}
        for key, (text, *_rest) in TARGETS.items():
            button = QPushButton(text)
            button.setObjectName(f"save_{key}")
            button.clicked.connect(lambda _checked=False, key=key: self.save(key))
            side.addWidget(button)
            self.buttons[key] = button
        side.addSpacing(12)
        self.status = QLabel("Choose a format to save.")
        self.status.setObjectName("export_status")
        self.status.setWordWrap(True)
        self.status.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        side.addWidget(self.status)
        side.addStretch(1)
        note = QLabel(f"{ESTIMATES_NOTE} The sheet carries the safety cautions. {DEFER_NOTE}")
        note.setWordWrap(True)
        note.setStyleSheet("color: #5b6470;")
        side.addWidget(note)
        close = QPushButton("Close")
        close.setObjectName("close")
        close.clicked.connect(self.accept)
        side.addWidget(close)

        layout = QHBoxLayout(self)
        layout.addWidget(self.preview, 1)
        side_box = QWidget()
        side_box.setLayout(side)
        side_box.setFixedWidth(250)
        layout.addWidget(side_box)
        self.show_preview()

    def _choice(self, name: str, texts: dict[str, str], values) -> QComboBox:
        box = QComboBox()
        box.setObjectName(f"export_{name}")
        for value in values:
            box.addItem(texts[value], value)
        box.currentIndexChanged.connect(self.show_preview)
        return box

    def _label_spread(self) -> None:
        if self.study is not None:
            self.spread_note.setText(f"min / typ / max of {self.study.samples:,} motors (seed {self.study.seed})")
        else:
            t = self.project.tolerances
            self.spread_note.setText(f"no study of this design yet: ticking runs {t.samples:,} motors (seed {t.seed})")

    @property
    def tolerance(self):
        """The study the sheet carries: the current one while the box is ticked, else None."""
        return self.study if self.spread.isChecked() else None

    def _on_spread_toggled(self, checked: bool) -> None:
        if checked and self.study is None:
            self.study = self.run_study()
            self._label_spread()
            if self.study is None:  # cancelled or refused: the box goes back, the reason in the status line
                self.spread.blockSignals(True)
                self.spread.setChecked(False)
                self.spread.blockSignals(False)
        self.show_preview()

    def run_study(self):
        """Run the project's tolerance study here, with a progress bar that can cancel it; None if it did not
        finish (the status line says why)."""
        from pmdc_sizer.core.errors import ProjectError
        from pmdc_sizer.core.tolerance_study import StudyCancelled, run_study

        samples = self.project.tolerances.samples
        progress = QProgressDialog(f"Drawing and evaluating {samples:,} motors…", "Cancel", 0, samples, self)
        progress.setObjectName("export_spread_progress")
        progress.setWindowTitle("Production spread")
        progress.setWindowModality(Qt.WindowModality.WindowModal)
        progress.setMinimumDuration(0)

        def report(done: int, total: int) -> bool:
            progress.setValue(done)
            QApplication.processEvents()
            return not progress.wasCanceled()

        try:
            return run_study(self.project, progress=report)
        except StudyCancelled:
            self.status.setText("The production spread was not added: the study was cancelled.")
        except ProjectError as error:
            self.status.setText(outcome_text("fail", "No production spread.", str(error)))
        finally:
            progress.close()
        return None

    @property
    def options(self) -> SheetOptions:
        """The sheet as chosen in the dialog: edition, paper and units."""
        return SheetOptions(self.edition.currentData(), self.paper.currentData(), self.units.currentData())

    def show_preview(self) -> None:
        """Lay the pages out again for the current choices (what Save PDF will write)."""
        options = self.options
        pages_box = QWidget()
        pages_layout = QVBoxLayout(pages_box)
        pages_layout.setSpacing(14)
        pages_layout.setContentsMargins(14, 14, 14, 14)
        self.page_labels = []
        folder = self.path_hint.parent if self.path_hint else None
        try:
            images = datasheet.preview_pages(self.project, self.results, PREVIEW_DPI, self.issued, options, folder,
                                             self.tolerance)
        except CommandError as error:  # e.g. the project's logo cannot be read: say so, keep the dialog
            images = []
            self.status.setText(outcome_text("fail", "No preview.", str(error)))
        for index, image in enumerate(images):
            label = QLabel()
            label.setObjectName(f"preview_page_{index + 1}")
            label.setPixmap(QPixmap.fromImage(image))
            label.setStyleSheet("background: white; border: 1px solid #9aa4b1;")
            label.setAlignment(Qt.AlignmentFlag.AlignCenter)
            pages_layout.addWidget(label, 0, Qt.AlignmentFlag.AlignHCenter)
            self.page_labels.append(label)
        pages_box.setStyleSheet("background: #d5dae1;")
        self.preview.setWidget(pages_box)
        self.pages_box = pages_box
        self.heading.setText(f"<b>{len(self.page_labels)} {options.paper} pages</b>, {options.edition} edition, "
                             f"{options.units}<br/>Revision {self.project.project.revision}, "
                             f"issued {self.issued.isoformat()}")

    # ------------------------------------------------------------------ saving
    def suggested_path(self, key: str) -> str:
        folder = self.path_hint.parent if self.path_hint else Path.home()
        stem = self.path_hint.stem if self.path_hint else _safe_stem(self.project.project.name)
        sheet = f"{stem}_internal" if self.options.internal else stem  # an internal sheet is never mistaken
        names = {"csv": f"{stem}_curves", "performance": f"{stem}_performance", "magnet": f"{stem}_magnet",
                 "pdf": sheet, "html": sheet}
        name = names.get(key, stem)
        return str(folder / f"{name}{TARGETS[key][3]}")

    def _ask_path(self, key: str) -> Path | None:
        _text, title, file_filter, default_suffix = TARGETS[key]
        chosen, selected_filter = QFileDialog.getSaveFileName(self, title, self.suggested_path(key), file_filter)
        if not chosen:
            return None
        path = Path(chosen)
        if path.suffix.lower() not in _SUFFIXES[key]:
            chose_svg = "svg" in (selected_filter or "").lower() and key in ("performance", "magnet")
            suffix = ".svg" if chose_svg else default_suffix
            path = path.with_name(path.name + suffix)
        return path

    def save(self, key: str) -> Path | None:
        """Ask for a file name and write that format; returns the path written, or None."""
        path = self._ask_path(key)
        if path is None:
            return None
        try:
            self.write(key, path)
        except CommandError as error:
            self.status.setText(outcome_text("fail", "Not saved.", str(error)))
            return None
        self.last_saved = path
        self.status.setText(outcome_text("pass", "Saved", str(path)))
        return path

    def write(self, key: str, path: Path) -> None:
        if key in ("pdf", "html"):
            folder = self.path_hint.parent if self.path_hint else None
            datasheet.export(self.project, self.results, path, self.issued, options=self.options,
                             project_folder=folder, tolerance=self.tolerance)
        elif key == "csv":
            write_text_atomically(path, curves_csv(self.results), verify=check_csv)
        else:
            datasheet.write_chart(self.results, key, path)


def open_export_dialog(parent, project, results, path_hint=None, study=None):
    """Open the export dialog for the current design (window-modal, not blocking); returns it.

    ``study``: the tolerance study of this design already run (the production-spread page's), if any.
    """
    if project is None or results is None:
        QMessageBox.information(parent, "Export datasheet",
                                "There is nothing to export yet: the design has no results. "
                                "Correct the inputs the checks panel names, then export again.")
        return None
    dialog = ExportDialog(project, results, path_hint, parent, study=study)
    dialog.setAttribute(Qt.WidgetAttribute.WA_DeleteOnClose)
    dialog.setWindowModality(Qt.WindowModality.WindowModal)
    dialog.show()
    return dialog
