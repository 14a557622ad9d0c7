"""The field-solution page: the open design's 2-D field, one click (or one look) away.

For the case chosen (no load, stall cold or hot, reversal, the drive's limit, rotor removed) the page
shows the flux-density map with flux lines over the whole cross-section and the magnets coloured by
their margin to the knee, the radial air-gap flux density against angle, and the table of the fast
model against the field solution. The solve runs off the GUI thread with progress and cancel; while the
page is on screen, a changed design or case is solved by itself a moment after the last edit. Results
are kept per design (the project's text), case and mesh, so going back to a case shows it at once, and
any edit that changes the design makes a new one.
"""

from __future__ import annotations

from collections import OrderedDict

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QRectF, Qt
from PySide6.QtGui import QColor, QPainter, QPixmap
from PySide6.QtWidgets import (
    QComboBox,
    QLabel,
    QSizePolicy,
    QSplitter,
    QTableWidgetItem,
    QWidget,
)

from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.field import (
    FieldCancelled,
    FieldConvergenceError,
    FieldInputError,
    FieldOptions,
    agreement,
    field_cases,
    solve_case,
)

from ..field_picture import draw_colour_scales, section_image
from ..figures import FAIL_COLOUR, FIELD_FLUX_LINE_COLOUR
from .background_job import JobPage
from .style import flush_column

#: Mesh settings the page offers: label → mesh fineness.
MESHES = {"Standard mesh": 1.0, "Fine mesh (slower)": 2.0}
_CACHE_SIZE = 12
_AUTO_DELAY_MS = 600
_PICTURE_SIZE = 900

#: The agreement table's SI units shown as (unit, factor).
_SHOWN_UNITS = {"Wb": ("mWb", 1e3), "Wb/m": ("mWb/m", 1e3), "A/m": ("kA/m", 1e-3), "1": ("", 1.0), "T": ("T", 1.0)}


class FieldView(JobPage):
    """The field-solution page: the case and mesh, the picture, the gap waveform and the agreement table."""

    def __init__(self, main_window):
        super().__init__(main_window, "field_view")
        self.solution = None
        self.cache: OrderedDict = OrderedDict()
        self._start_job("the field solution", FieldCancelled,
                        (FieldInputError, FieldConvergenceError, ValueError, ArithmeticError), _AUTO_DELAY_MS,
                        lambda key: key in self.cache, self.solve, "Solve", "Solve the 2-D field of this case now")
        self._build()
        self._follow(main_window)

    # ------------------------------------------------------------------ layout
    def _build(self) -> None:
        self.case_combo = QComboBox()
        self.case_combo.setObjectName("field_case")
        self.case_combo.setToolTip("What drives the field: the magnets alone, or with the armature current of a "
                                   "demagnetization case, or with the rotor pulled out")
        self.case_combo.currentIndexChanged.connect(self._on_choice_changed)
        self.mesh_combo = QComboBox()
        self.mesh_combo.addItems(list(MESHES))
        self.mesh_combo.currentIndexChanged.connect(self._on_choice_changed)
        layout = self._page_layout([QLabel("Case:"), self.case_combo, self.mesh_combo])

        top = QSplitter(Qt.Orientation.Horizontal)
        picture_column = QWidget()
        picture_layout = flush_column(picture_column)
        self.picture = QLabel("The field appears here once solved.")
        self.picture.setAlignment(Qt.AlignmentFlag.AlignCenter)
        self.picture.setMinimumSize(300, 300)
        self.picture.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Expanding)
        picture_layout.addWidget(self.picture, 1)
        self.scales = ColourScales()
        picture_layout.addWidget(self.scales)
        top.addWidget(picture_column)
        self.waveform = pg.PlotWidget(background="w")
        self.waveform.setLabel("left", "radial air-gap flux density", units="T")
        self.waveform.setLabel("bottom", "angle from a neutral axis [°]")
        self.waveform.setTitle("Air-gap flux density at mid-gap", color="#222222")
        self.waveform.showGrid(x=True, y=True, alpha=0.2)
        self.waveform_curve = self.waveform.plot([], [], pen=pg.mkPen(FIELD_FLUX_LINE_COLOUR, width=1.6))
        top.addWidget(self.waveform)
        top.setSizes([520, 420])
        bottom = QWidget()
        bottom_layout = flush_column(bottom)
        self.summary = QLabel("")
        self.summary.setWordWrap(True)
        bottom_layout.addWidget(self.summary)
        self.table = self._figure_table("field_agreement", ["Quantity", "Fast model", "Field", "Unit", "Difference"],
                                        stretch=0)
        bottom_layout.addWidget(self.table, 1)
        splitter = QSplitter(Qt.Orientation.Vertical)
        splitter.addWidget(top)
        splitter.addWidget(bottom)
        splitter.setSizes([560, 300])
        layout.addWidget(splitter, 1)
        note = QLabel("2-D section per metre of stack, no end effects; the flux per pole is multiplied by the fast "
                      "model's end factor so both stand on the same basis. Differences over 3 % are marked.")
        note.setWordWrap(True)
        note.setStyleSheet("color: #555;")
        layout.addWidget(note)

    # ------------------------------------------------------------------ design and cases
    def set_design(self, project, results) -> None:
        """A new evaluated design: list its cases, show what the cache has, and solve when on screen."""
        self.project, self.results = project, results
        wanted = self.case_combo.currentData()
        self.case_combo.blockSignals(True)
        self.case_combo.clear()
        design = design_from_project(project)
        for case in field_cases(design, results):
            label = case.name.replace("-", " ")
            if case.current_A:
                label += f" ({case.current_A:.4g} A)"
            self.case_combo.addItem(label, case)
        names = [self.case_combo.itemData(i).name for i in range(self.case_combo.count())]
        if wanted is not None and wanted.name in names:
            self.case_combo.setCurrentIndex(names.index(wanted.name))
        self.case_combo.blockSignals(False)
        self._on_choice_changed()

    def _key(self):
        case = self.case_combo.currentData()
        if self.project is None or case is None:
            return None
        return (project_file.dumps(self.project), case, MESHES[self.mesh_combo.currentText()])

    def _on_choice_changed(self) -> None:
        key = self._key()
        if key is None:
            return
        if key in self.cache:
            self.cache.move_to_end(key)
            self._show(self.cache[key])
            self.state_label.setText("solved (kept from before)")
            return
        self._mark_stale()
        self.job.schedule()

    # ------------------------------------------------------------------ solving
    def solve(self) -> None:
        """Solve the chosen case of the current design (a running solve of another one is cancelled)."""
        key = self._key()
        if key is None:
            return
        design, case, options = design_from_project(self.project), key[1], FieldOptions(mesh_fineness=key[2])
        self.job.start(key, lambda report, stop: solve_case(design, case, options, report, stop.is_set))
        self.state_label.setText(f"solving {case.name.replace('-', ' ')}…")

    def _on_progress(self, fraction: float, message: str) -> None:
        self.progress_bar.setValue(round(100 * fraction))
        self.state_label.setText(message)

    def _on_failed(self, _key, message: str) -> None:
        self._report_failure(message)

    def _on_done(self, key, solution) -> None:
        self.state_label.setStyleSheet("")
        self.cache[key] = solution
        while len(self.cache) > _CACHE_SIZE:
            self.cache.popitem(last=False)
        self.state_label.setText(f"solved: {solution.iterations} Newton steps, {solution.elements} elements, "
                                 f"{solution.seconds:.1f} s")
        if key == self._key():
            self._show(solution)

    # ------------------------------------------------------------------ showing
    def _mark_stale(self) -> None:
        if self.solution is not None:
            self.state_label.setText("the design or case changed: the picture is of an earlier one until solved")

    def _show(self, solution) -> None:
        self.solution = solution
        self._pixmap = QPixmap.fromImage(section_image(solution, self.results.geometry.poles, _PICTURE_SIZE,
                                                       scales=False))
        self.scales.show_for(solution.knee_field_A_per_m)
        self._fit_picture()
        angle = np.degrees(solution.airgap_angle_rad)
        self.waveform_curve.setData(angle, solution.airgap_flux_density_T)
        self.waveform.setTitle(f"Air-gap flux density at mid-gap: {solution.case.name.replace('-', ' ')}",
                               color="#222222")
        self._fill_table(solution)
        self.summary.setText(
            f"Flux per pole {1e3 * solution.flux_per_pole_Wb:.4g} mWb (2-D {1e3 * solution.flux_per_pole_Wb_per_m:.4g} "
            f"mWb/m). Housing up to {solution.housing_flux_density_peak_T:.2f} T, teeth "
            f"{solution.tooth_flux_density_peak_T:.2f} T, core {solution.core_flux_density_peak_T:.2f} T. "
            f"Magnets past the knee: {100 * solution.magnet_area_past_knee_fraction:.1f} % of their area "
            f"(worst 5 % {solution.worst_share_magnet_field_A_per_m / 1e3:.0f} kA/m, worst element "
            f"{solution.worst_magnet_field_A_per_m / 1e3:.0f} kA/m, knee "
            f"{solution.knee_field_A_per_m / 1e3:.0f} kA/m).")
        self.finished.emit(solution)

    def _fill_table(self, solution) -> None:
        rows = agreement(self.results, solution).rows
        self.table.setRowCount(len(rows))
        for index, row in enumerate(rows):
            unit, scale = _SHOWN_UNITS.get(row.unit, (row.unit, 1.0))
            fast = "–" if row.fast is None else f"{scale * row.fast:.4g}"
            difference = "–" if row.difference_percent is None else f"{row.difference_percent:+.1f} %"
            cells = (row.quantity, fast, f"{scale * row.field:.4g}", unit, difference)
            for column, text in enumerate(cells):
                item = QTableWidgetItem(text)
                item.setToolTip(row.note)
                if column:
                    item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                if row.flagged:
                    item.setForeground(QColor(FAIL_COLOUR))
                self.table.setItem(index, column, item)

    def _fit_picture(self) -> None:
        pixmap = getattr(self, "_pixmap", None)
        if pixmap is not None:
            self.picture.setPixmap(pixmap.scaled(self.picture.size(), Qt.AspectRatioMode.KeepAspectRatio,
                                                 Qt.TransformationMode.SmoothTransformation))

    def resizeEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().resizeEvent(event)
        self._fit_picture()


class ColourScales(QWidget):
    """The section's two colour scales, drawn at the screen's font under the scaled picture."""

    def __init__(self):
        super().__init__()
        self.knee_field_A_per_m: float | None = None
        self.setFixedHeight(3 * self.fontMetrics().height() + 14)
        self.setObjectName("field_colour_scales")

    def show_for(self, knee_field_A_per_m: float) -> None:
        self.knee_field_A_per_m = knee_field_A_per_m
        self.update()

    def paintEvent(self, event) -> None:  # noqa: N802 - Qt's name
        if self.knee_field_A_per_m is None:
            return
        painter = QPainter(self)
        try:
            painter.setFont(self.font())
            draw_colour_scales(painter, QRectF(self.rect()), self.knee_field_A_per_m)
        finally:
            painter.end()
