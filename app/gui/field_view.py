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

import threading
from collections import OrderedDict

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QObject, QRunnable, Qt, QThreadPool, QTimer, Signal
from PySide6.QtGui import QColor, QPixmap
from PySide6.QtWidgets import (
    QComboBox,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QProgressBar,
    QPushButton,
    QSizePolicy,
    QSplitter,
    QTableWidget,
    QTableWidgetItem,
    QVBoxLayout,
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

from ..field_picture import section_image
from ..figures import FAIL_COLOUR, FIELD_FLUX_LINE_COLOUR

#: Mesh settings the page offers: label → mesh fineness.
MESHES = {"Standard mesh": 1.0, "Fine mesh (slower)": 2.0}
_CACHE_SIZE = 12
_AUTO_DELAY_MS = 600
_PICTURE_SIZE = 900

#: The agreement table's SI units shown as (unit, factor).
_SHOWN_UNITS = {"Wb": ("mWb", 1e3), "Wb/m": ("mWb/m", 1e3), "A/m": ("kA/m", 1e-3), "1": ("", 1.0), "T": ("T", 1.0)}


class _Signals(QObject):
    progress = Signal(int, float, str)  # job, fraction, message
    done = Signal(int, object, object, str)  # job, key, solution or None, error message


class _Job(QRunnable):
    def __init__(self, job: int, key, design, case, options: FieldOptions, stop: threading.Event,
                 signals: _Signals):
        super().__init__()
        self.job, self.key, self.design, self.case, self.options = job, key, design, case, options
        self.stop, self.signals = stop, signals
        self.setAutoDelete(True)

    def run(self) -> None:
        def progress(fraction: float, message: str) -> None:
            self.signals.progress.emit(self.job, fraction, message)

        try:
            solution = solve_case(self.design, self.case, self.options, progress, self.stop.is_set)
        except FieldCancelled:
            self.signals.done.emit(self.job, self.key, None, "cancelled")
            return
        except (FieldInputError, FieldConvergenceError, ValueError, ArithmeticError) as error:
            self.signals.done.emit(self.job, self.key, None, str(error))
            return
        except Exception as error:  # noqa: BLE001 - the window must survive any failure of one solve
            self.signals.done.emit(self.job, self.key, None,
                                   f"the field solution failed ({type(error).__name__}: {error}); this is a defect "
                                   "in pmdc-sizer, please report it with the project file")
            return
        self.signals.done.emit(self.job, self.key, solution, "")


class FieldView(QWidget):
    """The page. ``main_window`` provides ``current_project``, ``current_results`` and ``results_ready``."""

    solved = Signal(object)  #: a FieldSolution now shown
    solve_failed = Signal(str)  #: why the last solve gave nothing

    def __init__(self, main_window):
        super().__init__()
        self.setObjectName("field_view")
        self.main_window = main_window
        self.project = None
        self.results = None
        self.solution = None
        self.cache: OrderedDict = OrderedDict()
        self._pool = QThreadPool(self)
        self._pool.setMaxThreadCount(1)
        self._signals = _Signals(self)
        self._signals.progress.connect(self._on_progress)
        self._signals.done.connect(self._on_done)
        self._job = 0
        self._running_key = None
        self._stop: threading.Event | None = None
        self._auto = QTimer(self)
        self._auto.setSingleShot(True)
        self._auto.setInterval(_AUTO_DELAY_MS)
        self._auto.timeout.connect(self._solve_if_needed)
        self._build()
        main_window.results_ready.connect(self.set_design)
        if main_window.current_results is not None:
            self.set_design(main_window.current_project, main_window.current_results)

    # ------------------------------------------------------------------ layout
    def _build(self) -> None:
        layout = QVBoxLayout(self)
        controls = QHBoxLayout()
        controls.addWidget(QLabel("Case:"))
        self.case_combo = QComboBox()
        self.case_combo.setObjectName("field_case")
        self.case_combo.setToolTip("What drives the field: the magnets alone, or with the armature current of a "
                                   "demagnetization case, or with the rotor pulled out")
        self.case_combo.currentIndexChanged.connect(self._on_choice_changed)
        controls.addWidget(self.case_combo)
        self.mesh_combo = QComboBox()
        self.mesh_combo.addItems(list(MESHES))
        self.mesh_combo.currentIndexChanged.connect(self._on_choice_changed)
        controls.addWidget(self.mesh_combo)
        self.solve_button = QPushButton("Solve")
        self.solve_button.setToolTip("Solve the 2-D field of this case now")
        self.solve_button.clicked.connect(self.solve)
        controls.addWidget(self.solve_button)
        self.cancel_button = QPushButton("Cancel")
        self.cancel_button.setEnabled(False)
        self.cancel_button.clicked.connect(self.cancel)
        controls.addWidget(self.cancel_button)
        self.progress_bar = QProgressBar()
        self.progress_bar.setRange(0, 100)
        self.progress_bar.setMaximumWidth(180)
        controls.addWidget(self.progress_bar)
        self.state_label = QLabel("")
        self.state_label.setWordWrap(True)
        controls.addWidget(self.state_label, 1)
        layout.addLayout(controls)

        top = QSplitter(Qt.Orientation.Horizontal)
        self.picture = QLabel("The field appears here once solved.")
        self.picture.setAlignment(Qt.AlignmentFlag.AlignCenter)
        self.picture.setMinimumSize(300, 300)
        self.picture.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Expanding)
        top.addWidget(self.picture)
        self.waveform = pg.PlotWidget(background="w")
        self.waveform.setLabel("left", "radial air-gap flux density", units="T")
        self.waveform.setLabel("bottom", "angle from a neutral axis [°]")
        self.waveform.setTitle("Air-gap flux density at mid-gap", color="#222222")
        self.waveform.showGrid(x=True, y=True, alpha=0.2)
        self.waveform_curve = self.waveform.plot([], [], pen=pg.mkPen(FIELD_FLUX_LINE_COLOUR, width=1.6))
        top.addWidget(self.waveform)
        top.setSizes([520, 420])
        bottom = QWidget()
        bottom_layout = QVBoxLayout(bottom)
        bottom_layout.setContentsMargins(0, 0, 0, 0)
        self.summary = QLabel("")
        self.summary.setWordWrap(True)
        bottom_layout.addWidget(self.summary)
        self.table = QTableWidget(0, 5)
        self.table.setObjectName("field_agreement")
        self.table.setHorizontalHeaderLabels(["Quantity", "Fast model", "Field", "Unit", "Difference"])
        header = self.table.horizontalHeader()
        header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)
        for column in range(1, 5):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.ResizeToContents)
        self.table.verticalHeader().setVisible(False)
        self.table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
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
        if self.isVisible():
            self._auto.start()

    def showEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().showEvent(event)
        if self._key() is not None and self._key() not in self.cache:
            self._auto.start()

    def _solve_if_needed(self) -> None:
        key = self._key()
        if key is not None and key not in self.cache and key != self._running_key:
            self.solve()

    # ------------------------------------------------------------------ solving
    def solve(self) -> None:
        """Solve the chosen case of the current design (a running solve of another one is cancelled)."""
        key = self._key()
        if key is None:
            return
        if self._stop is not None:
            self._stop.set()
        self._job += 1
        self._running_key = key
        self._stop = threading.Event()
        options = FieldOptions(mesh_fineness=key[2])
        self._pool.start(_Job(self._job, key, design_from_project(self.project), key[1], options, self._stop,
                              self._signals))
        self.cancel_button.setEnabled(True)
        self.progress_bar.setValue(0)
        self.state_label.setText(f"solving {key[1].name.replace('-', ' ')}…")

    def cancel(self) -> None:
        """Stop the running solve; nothing of it is kept."""
        if self._stop is not None:
            self._stop.set()

    def wait(self, milliseconds: int = 30000) -> bool:
        """Block until no solve runs (tests, closing)."""
        return self._pool.waitForDone(milliseconds)

    def _on_progress(self, job: int, fraction: float, message: str) -> None:
        if job == self._job:
            self.progress_bar.setValue(round(100 * fraction))
            self.state_label.setText(message)

    def _on_done(self, job: int, key, solution, message: str) -> None:
        if job != self._job:
            return  # a cancelled or replaced solve
        self._running_key = None
        self._stop = None
        self.cancel_button.setEnabled(False)
        if solution is None:
            self.progress_bar.setValue(0)
            self.state_label.setText("cancelled: nothing was kept" if message == "cancelled" else message)
            self.state_label.setStyleSheet("" if message == "cancelled" else f"color: {FAIL_COLOUR};")
            self.solve_failed.emit(message)
            return
        self.state_label.setStyleSheet("")
        self.cache[key] = solution
        while len(self.cache) > _CACHE_SIZE:
            self.cache.popitem(last=False)
        self.progress_bar.setValue(100)
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
        self._pixmap = QPixmap.fromImage(section_image(solution, self.results.geometry.poles, _PICTURE_SIZE))
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
        self.solved.emit(solution)

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
