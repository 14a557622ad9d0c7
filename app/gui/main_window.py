"""The main window of the desktop tool.

Layout, left to right: the design editor (every key of the project file, in groups); the pages (magnet
operating chart, performance curves, cross-section, and any page a colleague's module adds); the key
figures and the design checks. The status line says what happened to the last edit.

Extension points (names kept stable for other modules):

``MainWindow.current_project``
    The design shown, a ``core.project.Project`` (includes a spin-box drag in progress).
``MainWindow.current_results``
    The ``pmdc_sizer.core.results.Results`` of the last evaluation, or None while the design has no solution.
``MainWindow.results_ready``
    Qt signal ``(project, results)`` emitted after every successful evaluation, once the window's own
    views show it (from the event loop, right after their paint).
``MainWindow.add_page(title, widget)``
    Adds a page (inside a scroll area, so its minimum size cannot squeeze the other columns) to the
    central area and returns its index.
``MainWindow.current_path``
    The file the design came from or was saved to, or None for an unsaved design.
``app.gui.export_dialog.open_export_dialog(parent, project, results, path_hint, study)``
    Called by File ▸ Export datasheet….
``app.gui.compare_view.CompareView(main_window)``
    Its widget is the "Compare designs" page.

``run(file=None, screenshot=None) -> int`` starts the tool; with ``screenshot`` it renders the window
offscreen to that PNG and returns (2 with one line on stderr when the file cannot be used).
"""

from __future__ import annotations

import html
import os
import sys
from pathlib import Path

from PySide6.QtCore import QEventLoop, Qt, QTimer, Signal, qInstallMessageHandler
from PySide6.QtGui import QAction, QActionGroup, QKeySequence
from PySide6.QtWidgets import (
    QApplication,
    QFileDialog,
    QLabel,
    QMainWindow,
    QMessageBox,
    QScrollArea,
    QSplitter,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

from pmdc_sizer.app.field_labels import field_message, label_for, label_in_sentence
from pmdc_sizer.app.files import clean_up_stale_temporaries
from pmdc_sizer.app.safety import CAUTIONS
from pmdc_sizer.core import library
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.project import Project, ProjectError

from . import compare_view, export_dialog, field_view, sizing_view, tolerance_view
from .collection import collect_on_gui_thread
from .crash_dialog import active_main_window, install_exception_hook
from .cross_section import CrossSection
from .display_units import DisplayUnits
from .editor import DesignEditor
from .evaluation import Evaluator
from .file_guard import CHANGED, FileGuard
from .input_model import DesignModel, checked_project
from .magnet_chart import MagnetChart
from .performance_chart import PerformanceChart
from .recovery import AutoSaver, offer_recovery
from .results_panel import ChecksPanel, ResultsPanel
from .settings import DISPLAY_UNIT_SYSTEMS, load_settings, save_settings
from .style import flush_column
from .thermal_chart import ThermalChart

APP_NAME = "pmdc-sizer"
DEMO_FOLDER = Path(__file__).resolve().parents[2] / "demo_projects"
FILE_FILTER = "pmdc-sizer project (*.toml);;All files (*)"
SCREENSHOT_SIZE = (1600, 1000)

PAGE_MAGNET = "Magnet operating chart"
PAGE_PERFORMANCE = "Performance curves"
PAGE_SECTION = "Cross-section"
PAGE_HEAT = "Duty temperatures"
PAGE_COMPARE = "Compare designs"
PAGE_FIELD = "Field solution"
PAGE_TOLERANCE = "Production spread"
PAGE_SIZING = "Sizing search"

def demo_templates() -> list[Path]:
    return sorted(DEMO_FOLDER.glob("*.toml")) if DEMO_FOLDER.is_dir() else []


def read_project(path: str | os.PathLike) -> Project:
    """A project from a file, checked like an edit (schema, fit, materials, wire); raises ProjectError."""
    return checked_project(project_file.load(path), {})


class _NoHeightForWidthLayout(QVBoxLayout):
    """A layout that tells its scroll area the page's height does not follow its width.

    A page with a word-wrapped label reports a height for its width, and QScrollArea then makes the page
    as tall as its preferred height (the comparison page 947 px in a 701 px window, with a scroll bar and
    its lower charts cut off). Without it, the page gets the window's height and scrolls only below its
    minimum size; the labels inside still wrap to their width."""

    def hasHeightForWidth(self) -> bool:  # noqa: N802 (Qt's name)
        return False


class PageScroller(QScrollArea):
    """A page in a scroll area that scrolls only when the window is smaller than the page's minimum."""

    def __init__(self, page: QWidget):
        super().__init__()
        self.setWidgetResizable(True)
        self.setFrameShape(QScrollArea.Shape.NoFrame)
        holder = QWidget()
        layout = _NoHeightForWidthLayout(holder)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(page)
        self._page = page
        self.setWidget(holder)

    def widget(self) -> QWidget:  # the page itself, not the holder around it
        return self._page


class MainWindow(QMainWindow):
    results_ready = Signal(object, object)

    def __init__(self, project: Project | None = None, path: str | os.PathLike | None = None):
        super().__init__()
        collect_on_gui_thread()  # before any worker thread starts (see app/gui/collection.py)
        self.settings = load_settings()
        self.display = DisplayUnits(self.settings.display_units)
        self.current_path: Path | None = Path(path) if path else None
        self.current_results = None
        self.last_error = ""
        self.remember_settings = True  #: False for screenshots: they must not touch the user's settings
        self.model = DesignModel(project if project is not None else self._default_project(), self)
        self.file_guard = FileGuard()  # the file's lock, its state on disk and its comments (file_guard.py)
        self.file_guard.opened(self.current_path)
        self.autosaver = AutoSaver(self.model, lambda: self.current_path, lambda: self.file_guard.layout, self)
        self.evaluator = Evaluator(self)
        self._results_to_announce: list = []
        self._announce_timer = QTimer(self, singleShot=True, interval=0)
        self._announce_timer.timeout.connect(self._announce_results)
        self._build_central()
        self._build_actions()
        self._build_menus()
        self._build_status()
        self.model.project_updated.connect(self._on_project_updated)
        self.model.edit_rejected.connect(self._on_edit_rejected)
        self.model.edit_committed.connect(self._on_edit_committed)
        self._refused_key: str | None = None  #: the field whose refusal the status bar shows
        self.model.undo_stack.cleanChanged.connect(self._update_title)
        self.model.undo_stack.indexChanged.connect(self._update_title)
        self.evaluator.finished.connect(self._on_results)
        self.evaluator.failed.connect(self._on_failure)
        self.evaluator.busy_changed.connect(self._show_busy)
        self.resize(self.settings.window_width, self.settings.window_height)
        self._update_title()
        self._on_project_updated(self.model.project)
        self._report_library_problems()

    def _report_library_problems(self) -> None:
        problems = library.problems()
        if problems:
            self.show_status(f"User library: {len(problems)} file(s) skipped, the rest is in use: "
                             + "; ".join(str(problem) for problem in problems), error=True)

    # ------------------------------------------------------------------ construction
    @staticmethod
    def _default_project() -> Project:
        for template in demo_templates():
            try:
                return read_project(template)
            except ProjectError:
                continue
        return Project()

    def _build_central(self) -> None:
        splitter = QSplitter(Qt.Orientation.Horizontal)
        self.editor = DesignEditor(self.model, self.display)
        self.editor.setMinimumWidth(330)
        editor_box = QWidget()
        editor_layout = flush_column(editor_box)
        heading = QLabel("<b>Design</b> <span style='color:#555'>— every edit is evaluated at once; hover a "
                         "name for its meaning</span>")
        heading.setWordWrap(True)
        heading.setStyleSheet("padding: 4px;")
        editor_layout.addWidget(heading)
        editor_layout.addWidget(self.editor, 1)
        splitter.addWidget(editor_box)
        self.pages = QTabWidget()
        self.pages.setDocumentMode(True)
        self.magnet_chart = MagnetChart()
        self.performance_chart = PerformanceChart(self.display)
        self.cross_section = CrossSection(self.display)
        self.pages.addTab(self.magnet_chart, PAGE_MAGNET)
        self.pages.addTab(self.performance_chart, PAGE_PERFORMANCE)
        self.pages.addTab(self.cross_section, PAGE_SECTION)
        splitter.addWidget(self.pages)
        right = QSplitter(Qt.Orientation.Vertical)
        self.results_panel = ResultsPanel(self.display)
        self.checks_panel = ChecksPanel(self.display)
        right.addWidget(self._titled("Key figures", self.results_panel))
        right.addWidget(self._titled("Design checks", self.checks_panel))
        right.setSizes([560, 420])
        self.figures_splitter = right
        splitter.addWidget(right)
        splitter.setStretchFactor(1, 1)
        self.splitter = splitter
        self._splitter_placed = False
        self.setCentralWidget(splitter)
        self.thermal_chart = ThermalChart(self)
        self.add_page(PAGE_HEAT, self.thermal_chart)
        self.compare_view = compare_view.CompareView(self)
        self.add_page(PAGE_COMPARE, self.compare_view)
        self.field_view = field_view.FieldView(self)
        self.add_page(PAGE_FIELD, self.field_view)
        self.tolerance_view = tolerance_view.ToleranceView(self)
        self.add_page(PAGE_TOLERANCE, self.tolerance_view)
        self.sizing_view = sizing_view.SizingView(self)
        self.add_page(PAGE_SIZING, self.sizing_view)
        self._sizes_before_wide_page: list[int] | None = None
        self.pages.currentChanged.connect(self._fit_wide_page)
        # A solved field shows its numbers beside the picture: the page may need more room than before.
        self.field_view.finished.connect(lambda _solution: self._fit_wide_page(self.pages.currentIndex()))

    @staticmethod
    def _titled(title: str, widget: QWidget) -> QWidget:
        box = QWidget()
        layout = QVBoxLayout(box)
        layout.setContentsMargins(2, 2, 2, 2)
        layout.setSpacing(2)
        label = QLabel(f"<b>{title}</b>")
        label.setStyleSheet("padding: 2px;")
        layout.addWidget(label)
        layout.addWidget(widget, 1)
        return box

    def _action(self, text, slot, shortcut=None, tip=""):
        action = QAction(text, self)
        if shortcut is not None:
            action.setShortcut(QKeySequence(shortcut))
        if tip:
            action.setStatusTip(tip)
            action.setToolTip(tip)
        action.triggered.connect(slot)
        return action

    def _build_actions(self) -> None:
        self.new_action = self._action("&New design", lambda: self.new_design(), QKeySequence.StandardKey.New,
                                       "Start a new design from the first template")
        self.open_action = self._action("&Open…", lambda: self.open_file(), QKeySequence.StandardKey.Open)
        self.save_action = self._action("&Save", lambda: self.save_file(), QKeySequence.StandardKey.Save)
        self.save_as_action = self._action("Save &as…", lambda: self.save_file_as(), QKeySequence.StandardKey.SaveAs)
        self.export_action = self._action("&Export datasheet…", self.export_datasheet, "Ctrl+E",
                                          "Write a datasheet of the current design")
        self.quit_action = self._action("&Quit", self.close, QKeySequence.StandardKey.Quit)
        self.undo_action = self.model.undo_stack.createUndoAction(self, "&Undo")
        self.undo_action.setShortcut(QKeySequence.StandardKey.Undo)
        self.redo_action = self.model.undo_stack.createRedoAction(self, "&Redo")
        self.redo_action.setShortcut(QKeySequence.StandardKey.Redo)
        # Commit a drag in progress first, so undo takes back what the user sees.
        self.undo_action.triggered.disconnect()
        self.undo_action.triggered.connect(self.model.undo)
        self.redo_action.triggered.disconnect()
        self.redo_action.triggered.connect(self.model.redo)
        self.unit_actions = QActionGroup(self)
        for system in DISPLAY_UNIT_SYSTEMS:
            action = QAction(f"{system} units on screen", self, checkable=True)
            action.setChecked(system == self.display.system)
            action.triggered.connect(lambda _checked=False, s=system: self.set_display_units(s))
            self.unit_actions.addAction(action)
        self.about_action = self._action("&About and safety", self.show_about, QKeySequence.StandardKey.HelpContents)

    def _build_menus(self) -> None:
        bar = self.menuBar()
        file_menu = bar.addMenu("&File")
        file_menu.addAction(self.new_action)
        self.template_menu = file_menu.addMenu("New from &template")
        for template in demo_templates():
            self.template_menu.addAction(template.stem.replace("_", " "),
                                         lambda t=template: self.new_design(t))
        self.template_menu.addAction("Schema defaults", lambda: self.new_design(None, defaults=True))
        file_menu.addAction(self.open_action)
        self.recent_menu = file_menu.addMenu("Open &recent")
        self._fill_recent_menu()
        file_menu.addSeparator()
        file_menu.addAction(self.save_action)
        file_menu.addAction(self.save_as_action)
        file_menu.addAction(self.export_action)
        file_menu.addSeparator()
        file_menu.addAction(self.quit_action)
        edit_menu = bar.addMenu("&Edit")
        edit_menu.addAction(self.undo_action)
        edit_menu.addAction(self.redo_action)
        view_menu = bar.addMenu("&View")
        for action in self.unit_actions.actions():
            view_menu.addAction(action)
        view_menu.addSeparator()
        self.page_menu = view_menu
        for index in range(self.pages.count()):
            self._add_page_action(index)
        help_menu = bar.addMenu("&Help")
        help_menu.addAction(self.about_action)

    def _add_page_action(self, index: int) -> None:
        action = QAction(f"Show {self.pages.tabText(index).lower()}", self)
        if index < 9:
            action.setShortcut(QKeySequence(f"Ctrl+{index + 1}"))
        action.triggered.connect(lambda _checked=False, i=index: self.pages.setCurrentIndex(i))
        self.page_menu.addAction(action)
        self.addAction(action)

    def _build_status(self) -> None:
        self.status_label = QLabel()
        self.status_label.setObjectName("status_message")
        self.busy_label = QLabel()
        self.units_label = QLabel()
        self.statusBar().addWidget(self.status_label, 1)
        self.statusBar().addPermanentWidget(self.busy_label)
        self.statusBar().addPermanentWidget(self.units_label)
        self._show_units_label()
        self.show_status("Ready. Edit any value on the left; charts, figures and checks follow.")

    def _fill_recent_menu(self) -> None:
        self.recent_menu.clear()
        for path in self.settings.recent_files:
            self.recent_menu.addAction(path, lambda p=path: self.open_file(p))
        self.recent_menu.setEnabled(bool(self.settings.recent_files))

    # ------------------------------------------------------------------ extension points
    @property
    def current_project(self) -> Project:
        return self.model.project

    def add_page(self, title: str, widget: QWidget) -> int:
        # In a scroll area, so a page's minimum width cannot squeeze the editor and the checks.
        index = self.pages.addTab(PageScroller(widget), title)
        if hasattr(self, "page_menu"):
            self._add_page_action(index)
        return index

    def show_page(self, title: str) -> bool:
        """Bring the page titled ``title`` to the front; False when the window has none."""
        for index in range(self.pages.count()):
            if self.pages.tabText(index) == title:
                self.pages.setCurrentIndex(index)
                return True
        return False

    # ------------------------------------------------------------------ status and title
    def show_status(self, message: str, error: bool = False) -> None:
        self.status_label.setText(message)
        self.status_label.setStyleSheet("color: #b3261e;" if error else "")
        self.status_label.setToolTip(message)

    def _show_busy(self, busy: bool) -> None:
        self.busy_label.setText("evaluating…" if busy else "")

    def _update_title(self, *_signal_arguments) -> None:
        name = self.current_path.name if self.current_path else "unsaved design"
        self.setWindowTitle(f"{self.model.project.project.name} — {name}[*] — {APP_NAME}")
        self.setWindowModified(self.model.modified)

    def _show_units_label(self) -> None:
        self.units_label.setText(f"Screen units: {self.display.system}")

    # ------------------------------------------------------------------ live evaluation
    def _on_project_updated(self, project: Project) -> None:
        # Everything, the drawing included, is redrawn when the evaluation returns: one paint per edit,
        # and the worker does not compete with a paint for the interpreter.
        self.evaluator.request(project)
        self._update_title()

    def _on_results(self, project: Project, results) -> None:
        self.current_results = results
        self.last_error = ""
        self.cross_section.show_geometry(design_from_project(project).geometry)
        self.magnet_chart.show_results(results)
        self.performance_chart.show_results(results)
        self.results_panel.show_results(results)
        self.checks_panel.show_checks(results)
        # Listeners (other pages, exports) hear of the results after this paint, so the charts the
        # user is looking at never wait for them.
        self._results_to_announce.append((project, results))
        self._announce_timer.start()

    def _announce_results(self) -> None:
        while self._results_to_announce:
            project, results = self._results_to_announce.pop(0)
            self.results_ready.emit(project, results)

    def _on_failure(self, project: Project, message: str) -> None:
        self.current_results = None
        self.last_error = message
        self.cross_section.show_geometry(design_from_project(project).geometry)
        self.magnet_chart.clear()
        self.performance_chart.clear()
        self.results_panel.show_failure(message)
        self.checks_panel.show_failure()
        self.show_status(f"No solution: {message}", error=True)

    def _on_edit_rejected(self, key: str, message: str) -> None:
        self._refused_key = key
        self.show_status(f"Not applied, the design is unchanged: {field_message(key, message)}", error=True)

    def _on_edit_committed(self, key: str) -> None:
        """A value went in: a refusal the status bar still shows is now out of date."""
        if self._refused_key is not None:
            refused, self._refused_key = self._refused_key, None
            fixed = "" if refused == key else f" ({label_for(refused)} keeps its value)"
            self.show_status(f"Applied {label_in_sentence(key)}{fixed}.")

    def wait_for_evaluation(self, timeout_ms: int = 10000) -> bool:
        """Process events until the design shown has been evaluated (for the screenshot and tests)."""
        loop = QEventLoop()
        done = []

        def finish(*_args):
            if not self.evaluator.busy:
                done.append(True)
                loop.quit()

        self.results_ready.connect(finish)
        self.evaluator.failed.connect(finish)
        QTimer.singleShot(timeout_ms, loop.quit)
        if self.evaluator.busy:
            loop.exec()
        self.results_ready.disconnect(finish)
        self.evaluator.failed.disconnect(finish)
        return not self.evaluator.busy

    # ------------------------------------------------------------------ files
    def maybe_keep_changes(self) -> bool:
        """Ask about unsaved changes; True when it is fine to go on (saved or discarded)."""
        self.model.flush()
        if not self.model.modified:
            return True
        answer = QMessageBox.question(
            self, "Unsaved changes",
            f"“{self.model.project.project.name}” has changes that are not saved. Save them first?",
            QMessageBox.StandardButton.Save | QMessageBox.StandardButton.Discard | QMessageBox.StandardButton.Cancel,
            QMessageBox.StandardButton.Save,
        )
        if answer == QMessageBox.StandardButton.Save:
            return self.save_file()
        if answer == QMessageBox.StandardButton.Discard:
            self.autosaver.discard()
            return True
        return False

    def new_design(self, template: Path | None = None, defaults: bool = False) -> bool:
        if not self.maybe_keep_changes():
            return False
        if defaults:
            project = Project()
        else:
            templates = demo_templates()
            template = template or (templates[0] if templates else None)
            try:
                project = read_project(template) if template else Project()
            except ProjectError as error:
                QMessageBox.critical(self, "Cannot use the template", str(error))
                return False
        self.current_path = None
        self.file_guard.opened(None)
        self.model.replace_project(project)
        self.show_status("New design from " + (template.name if template and not defaults else "the schema defaults")
                         + ". Save as… to give it a file.")
        self._update_title()
        return True

    def open_unsaved(self, project: Project, origin: str) -> bool:
        """Open ``project`` (validated) as a new design with no file, its changes unsaved until saved."""
        if not self.maybe_keep_changes():
            return False
        self.current_path = None
        self.file_guard.opened(None)
        self.model.replace_project(project)
        self.model.undo_stack.resetClean()  # unsaved until the user saves it
        self.show_status(f"Opened {origin} as a new design; Save as… to give it a file.")
        self._update_title()
        return True

    def open_file(self, path: str | os.PathLike | None = None) -> bool:
        if not self.maybe_keep_changes():
            return False
        if path is None:
            folder = str(self.current_path.parent) if self.current_path else str(DEMO_FOLDER)
            path, _ = QFileDialog.getOpenFileName(self, "Open a design", folder, FILE_FILTER)
            if not path:
                return False
        try:
            project = read_project(path)
        except ProjectError as error:
            self.show_status(f"Not opened, the current design is unchanged: {error}", error=True)
            QMessageBox.critical(self, "Cannot open the design",
                                 f"{error}\n\nThe design you were working on is unchanged.")
            return False
        if not self.confirm_open_elsewhere(Path(path)):
            return False
        self.current_path = Path(path)
        self.file_guard.opened(self.current_path)
        self.model.replace_project(project)
        self._remember(self.current_path)
        self.show_status(f"Opened {self.current_path}.")
        self._update_title()
        return True

    def save_file(self) -> bool:
        if self.current_path is None:
            return self.save_file_as()
        return self._write(self.current_path)

    def save_file_as(self, path: str | os.PathLike | None = None) -> bool:
        if path is None:
            suggested = str(self.current_path or Path.cwd() / "motor.toml")
            path, _ = QFileDialog.getSaveFileName(self, "Save the design as", suggested, FILE_FILTER)
            if not path:
                return False
        path = Path(path)
        if not path.suffix:
            path = path.with_suffix(".toml")
        return self._write(path)

    def _write(self, path: Path) -> bool:
        self.model.flush()
        if not self.confirm_overwrite_change_on_disk(path):
            return False
        try:
            project_file.save(self.model.project, path, layout=self.file_guard.layout)
        except ProjectError as error:
            self.show_status(f"Not saved: {error}", error=True)
            QMessageBox.critical(self, "Cannot save the design", f"{error}\n\nThe design is still open, unsaved.")
            return False
        self.current_path = path
        self.file_guard.saved(path)
        self.model.mark_saved()
        self.autosaver.discard()
        self._remember(path)
        self.show_status(f"Saved {path}.")
        self._update_title()
        return True

    def confirm_open_elsewhere(self, path: Path) -> bool:
        """True to go on opening ``path``: no other window or process has it, or the user opens it anyway."""
        holder = self.file_guard.holder_of(path)
        if holder is None:
            return True
        answer = QMessageBox.warning(
            self, "The design is open elsewhere",
            f"{path} is already open in pmdc-sizer ({holder.describe()}).\n\nIf both of you save, the later save "
            "overwrites the other's changes (this tool asks first when it sees the file changed). Open it anyway?",
            QMessageBox.StandardButton.Open | QMessageBox.StandardButton.Cancel, QMessageBox.StandardButton.Cancel)
        return answer == QMessageBox.StandardButton.Open

    def confirm_overwrite_change_on_disk(self, path: Path) -> bool:
        """True to save over ``path``: it is as it was when opened, or the user chose to overwrite it."""
        if self.file_guard.state_on_disk(path) != CHANGED:
            return True
        answer = QMessageBox.warning(
            self, "The file changed on disk",
            f"{path} was changed by another program or window since you opened it here.\n\nYes: overwrite it "
            "with this design (the other change is kept as the .bak file). No: save this design under another name "
            "instead. Cancel: save nothing.",
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No | QMessageBox.StandardButton.Cancel,
            QMessageBox.StandardButton.Cancel)
        if answer == QMessageBox.StandardButton.No:
            QTimer.singleShot(0, lambda: self.save_file_as())
        return answer == QMessageBox.StandardButton.Yes

    def adopt_recovered(self, project: Project, file: Path | None) -> None:
        """Show a design recovered after a crash: its file as before, its changes unsaved."""
        self.current_path = Path(file) if file else None
        self.file_guard.opened(self.current_path)
        self.model.replace_project(project)
        self.model.undo_stack.resetClean()  # unsaved until the user saves it
        self.show_status(f"Recovered the unsaved changes of “{project.project.name}”; save them to keep them.")
        self._update_title()
        self.autosaver.write_now()

    def _remember(self, path: Path) -> None:
        self.settings.add_recent_file(path)
        save_settings(self.settings)
        self._fill_recent_menu()

    def export_datasheet(self) -> None:
        self.model.flush()
        export_dialog.open_export_dialog(self, self.current_project, self.current_results, self.current_path,
                                         study=self.tolerance_view.current_study())

    # ------------------------------------------------------------------ display units, about, closing
    def set_display_units(self, system: str) -> None:
        if system not in DISPLAY_UNIT_SYSTEMS:
            raise ValueError(f"display units must be one of {DISPLAY_UNIT_SYSTEMS}, not {system!r}")
        self.display.system = system
        self.settings.display_units = system
        save_settings(self.settings)
        for action in self.unit_actions.actions():
            action.setChecked(action.text().startswith(system))
        self.editor.refresh_units()
        self._show_units_label()
        self._on_project_updated(self.model.project)

    def show_about(self) -> None:
        QMessageBox.about(self, f"About {APP_NAME}", about_text())

    COLUMN_SHARES = (0.24, 0.47, 0.29)  #: editor, pages, figures and checks
    NARROW_COLUMN_SHARES = (0.22, 0.45, 0.33)  #: below 1800 px the figures need a larger share to stay whole
    FIGURE_SHARES = (0.6, 0.4)  #: key figures over checks

    def showEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().showEvent(event)
        if not self._splitter_placed:
            # After the first layout: before it the splitter does not know its width yet.
            QTimer.singleShot(0, self._place_columns)

    def _place_columns(self) -> None:
        width = self.splitter.width()
        if width > 600 and not self._splitter_placed:
            default = self.COLUMN_SHARES if width >= 1800 else self.NARROW_COLUMN_SHARES
            shares = self.settings.column_shares if self.remember_settings and self.settings.column_shares else default
            self.splitter.setSizes([int(width * share) for share in shares])
            height = self.figures_splitter.height()
            shares = (self.settings.figure_shares if self.remember_settings and self.settings.figure_shares
                      else self.FIGURE_SHARES)
            self.figures_splitter.setSizes([int(height * share) for share in shares])
            self._splitter_placed = True

    #: pages with side-by-side views that need the whole width
    WIDE_PAGES = (PAGE_COMPARE, PAGE_FIELD, PAGE_TOLERANCE, PAGE_SIZING)

    def _fit_wide_page(self, index: int) -> None:
        """The comparison gets the window's width when the editor and figures would squeeze it into scrolling;
        the columns come back, as the user left them, on leaving the page (and can be dragged out meanwhile)."""
        wide = self.pages.tabText(index) in self.WIDE_PAGES
        if wide:
            page = self.pages.widget(index)
            needed = page.widget().minimumSizeHint().width() if hasattr(page, "widget") else 0
            sizes = self.splitter.sizes()
            if needed > sizes[1]:
                if self._sizes_before_wide_page is None:
                    self._sizes_before_wide_page = sizes
                self.splitter.setSizes([0, sum(sizes), 0])
        elif not wide and self._sizes_before_wide_page is not None:
            self.splitter.setSizes(self._sizes_before_wide_page)
            self._sizes_before_wide_page = None

    def splitter_shares(self) -> tuple[list[float], list[float]]:
        """Where the user has put the splitters, as shares of the width and of the right column's height."""
        def shares(sizes: list[int]) -> list[float]:
            total = sum(sizes) or 1
            return [round(size / total, 4) for size in sizes]

        return shares(self.splitter.sizes()), shares(self.figures_splitter.sizes())

    def closeEvent(self, event) -> None:  # noqa: N802 - Qt's name
        if not self.maybe_keep_changes():
            event.ignore()
            return
        if self.remember_settings:
            self.settings.window_width, self.settings.window_height = self.width(), self.height()
            if self._splitter_placed:
                columns, figures = self.splitter_shares()
                if all(0.05 <= v <= 0.9 for v in columns + figures):
                    self.settings.column_shares, self.settings.figure_shares = columns, figures
            save_settings(self.settings)
        self.evaluator.wait(5000)
        self.autosaver.close()
        self.file_guard.release_lock()
        event.accept()


def about_text() -> str:
    return (
        f"<h3>{APP_NAME}</h3>"
        "<p>Sizing of brushed permanent-magnet DC motors: the magnet's load line and demagnetization "
        "margins, flux per pole, Ke and Kt, speed-torque curves at the coldest, nominal and hottest "
        "temperatures, winding temperature, mass and material cost.</p>"
        "<p><b>Safety</b></p><ul>"
        + "".join(f"<li><b>{html.escape(lead)}</b> {html.escape(rest)}</li>" for lead, rest in CAUTIONS)
        + "</ul>"
    )


def _application() -> QApplication:
    app = QApplication.instance()
    if app is None:
        app = QApplication(sys.argv[:1])
        app.setApplicationName(APP_NAME)
    return app


def render_screenshot(window: MainWindow, out: str | os.PathLike, page: str | None = None,
                      size: tuple[int, int] = SCREENSHOT_SIZE, design_b: str | os.PathLike | None = None) -> None:
    from .capture import capture_page

    capture_page(window, out, page, size, design_b)


def _quiet_offscreen_notice(mode, context, message) -> None:
    """Drop the offscreen platform's notice about window size hints; pass everything else on."""
    if "propagateSizeHints" not in message:
        sys.stderr.write(message + "\n")


def run(file: str | os.PathLike | None = None, screenshot: str | os.PathLike | None = None,
        page: str | None = None, size: tuple[int, int] = SCREENSHOT_SIZE,
        compare_with: str | os.PathLike | None = None) -> int:
    """Open the tool (or, with ``screenshot``, render ``page`` at ``size`` to a PNG and return).

    ``compare_with``: a second project file, opened as design B on the comparison page.
    """
    if screenshot is not None and "QT_QPA_PLATFORM" not in os.environ and QApplication.instance() is None:
        os.environ["QT_QPA_PLATFORM"] = "offscreen"
    if screenshot is not None and QApplication.instance() is None:
        qInstallMessageHandler(_quiet_offscreen_notice)
    project = None
    error = ""
    if file is not None:
        try:
            project = read_project(file)
        except ProjectError as problem:
            error = str(problem)
            if screenshot is not None:
                print(f"{APP_NAME}: error: {error}", file=sys.stderr)
                return 2
    error_b = ""
    if compare_with is not None:
        try:
            read_project(compare_with)
        except ProjectError as problem:
            error_b = f"{compare_with} (design B): {problem}"
            if screenshot is not None:
                print(f"{APP_NAME}: error: {error_b}", file=sys.stderr)
                return 2
    app = _application()
    held_by = FileGuard().holder_of(file) if project is not None and screenshot is None else None
    window = MainWindow(project, file if project is not None else None)
    if screenshot is not None:
        window.remember_settings = False
        try:
            render_screenshot(window, screenshot, page, size, compare_with)
        except ProjectError as problem:
            print(f"{APP_NAME}: error: {problem}", file=sys.stderr)
            return 2
        finally:
            window.model.undo_stack.setClean()
            window.close()
        return 0
    hook = install_exception_hook(active_main_window)
    clean_up_stale_temporaries(Path(recent).parent for recent in window.settings.recent_files)
    window.show()
    if error:
        window.show_status(f"Not opened: {error}", error=True)
        QMessageBox.critical(window, "Cannot open the design", f"{error}\n\nA template design is open instead.")
    elif project is not None:
        window._remember(Path(file))
    if error_b:
        QMessageBox.critical(window, "Cannot open design B", f"{error_b}\n\nThe comparison page keeps its own B.")
    elif compare_with is not None:
        window.compare_view.load_b_file(compare_with)
    if held_by is not None:
        QMessageBox.warning(window, "The design is open elsewhere",
                            f"{file} is also open in pmdc-sizer ({held_by.describe()}). If both of you save, the "
                            "later save overwrites the other's changes; this window asks first when it sees the file "
                            "changed on disk.")
    offer_recovery(window, lambda recovered, path: restore_design(window, recovered, path))
    try:
        return app.exec()
    finally:
        hook.uninstall()


_RESTORED_WINDOWS: list[MainWindow] = []  #: windows opened for recovered designs, kept alive here


def restore_design(first: MainWindow, project: Project, file: Path | None) -> MainWindow:
    """Open a recovered design: in ``first`` if it holds nothing of the user's yet, else in a new window."""
    untouched = not first.model.modified and first.current_path is None and not first.autosaver.timer.isActive()
    window = first if untouched and not _RESTORED_WINDOWS else MainWindow()
    if window is not first:
        _RESTORED_WINDOWS.append(window)
        window.show()
    window.adopt_recovered(project, file)
    return window
