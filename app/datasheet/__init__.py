"""The design datasheet: PDF and HTML for the customer, test and purchasing; charts as PNG and SVG.

    from pmdc_sizer.app import datasheet
    datasheet.export(project, results, "motor.pdf")          # or .html; the customer edition on A4 in SI
    datasheet.export(project, results, "motor.pdf", options=SheetOptions("internal", "Letter", "US customary"))
    datasheet.write_charts(results, "charts/", "motor")      # motor_performance.png/.svg, motor_magnet.png/.svg

Every file is written atomically and checked before it replaces anything (``app/files.py``,
``app/export_checks.py``): to a temporary file in the same folder, read back and parsed, then renamed over the
target, so a failure leaves no partial file. Errors are :class:`app.errors.CommandError` with one line.
"""

from __future__ import annotations

import datetime as _dt
import os
from pathlib import Path

from pmdc_sizer.core.project import Project
from pmdc_sizer.core.results import Results

from ..errors import CommandError
from ..export_checks import check_html, check_pdf, check_png, check_svg
from ..files import atomic_output, write_bytes_atomically, write_text_atomically
from .options import DEFAULT_OPTIONS, EDITIONS, PAPER_SIZES_MM, UNIT_SYSTEMS, SheetOptions

__all__ = ["DEFAULT_OPTIONS", "EDITIONS", "PAPER_SIZES_MM", "UNIT_SYSTEMS", "SheetOptions", "build", "export",
           "field_appendix", "html_text", "logo_png", "preview_pages", "write_chart", "write_charts"]

FORMATS = {".pdf": "PDF", ".html": "HTML", ".htm": "HTML"}


def ensure_qt() -> None:
    """A Qt application for fonts and painting; offscreen when there is no display (command line).

    A full QApplication rather than a QGuiApplication, so that widgets (the GUI, its tests) can still
    come later in the same process.
    """
    from PySide6.QtWidgets import QApplication

    if QApplication.instance() is None:
        if not os.environ.get("DISPLAY") and not os.environ.get("WAYLAND_DISPLAY"):
            os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
        ensure_qt.application = QApplication(["pmdc-sizer"])  # kept alive for the life of the process


def format_of(path: str | os.PathLike) -> str:
    suffix = Path(path).suffix.lower()
    if suffix not in FORMATS:
        raise CommandError(f"{path}: unknown datasheet format {suffix or '(no extension)'!r}; "
                           "use a file name ending in .pdf or .html")
    return FORMATS[suffix]


def build(project: Project, results: Results, issued: _dt.date | None = None, appendix: tuple = (),
          options: SheetOptions = DEFAULT_OPTIONS, tolerance=None):
    from .content import build as build_content

    return build_content(project, results, issued, appendix, options, tolerance)


def logo_png(project: Project, project_folder: str | os.PathLike | None = None) -> bytes | None:
    """The project's logo (``project.logo``) as PNG bytes, or None when it sets none.

    A relative path is read from the project file's folder. A missing or unreadable image is refused with
    the key's name: a sheet without the logo it asked for is not quietly written.
    """
    written = project.project.logo.strip()
    if not written:
        return None
    path = Path(written).expanduser()
    if not path.is_absolute() and project_folder is not None:
        path = Path(project_folder) / path
    ensure_qt()
    from PySide6.QtCore import QBuffer, QByteArray, QIODevice
    from PySide6.QtGui import QImage

    image = QImage(str(path))
    if image.isNull():
        raise CommandError(f"project.logo: {path} is not a readable PNG or JPEG image")
    data = QByteArray()
    buffer = QBuffer(data)
    buffer.open(QIODevice.OpenModeFlag.WriteOnly)
    image.save(buffer, "PNG")
    buffer.close()
    return bytes(data.data())


def html_text(project: Project, results: Results, issued: _dt.date | None = None, appendix: tuple = (),
              options: SheetOptions = DEFAULT_OPTIONS, project_folder: str | os.PathLike | None = None,
              tolerance=None) -> str:
    ensure_qt()
    from .document import browser_html

    return browser_html(build(project, results, issued, appendix, options, tolerance), results,
                        logo_png(project, project_folder))


def export(project: Project, results: Results, path: str | os.PathLike, issued: _dt.date | None = None,
           appendix: tuple = (), options: SheetOptions = DEFAULT_OPTIONS,
           project_folder: str | os.PathLike | None = None, tolerance=None) -> str:
    """Write the datasheet to ``path`` as PDF or HTML (from the extension); returns the format.

    ``appendix``: sections added at the end (:func:`field_appendix` makes the field solution's).
    ``options``: the edition (customer by default), the paper and the unit system.
    ``project_folder``: where a relative ``project.logo`` path is read from.
    ``tolerance``: a ``core.tolerance_study.ToleranceStudy`` of the design, for the tolerance column.
    """
    kind = format_of(path)
    ensure_qt()
    if kind == "HTML":
        text = html_text(project, results, issued, appendix, options, project_folder, tolerance)
        write_text_atomically(path, text, verify=check_html)
        return kind
    from .document import write_pdf_file

    sheet = build(project, results, issued, appendix, options, tolerance)
    logo = logo_png(project, project_folder)
    pages: list[int] = []  # the written file must parse, with as many pages as were painted
    with atomic_output(path, verify=lambda written: check_pdf(written, pages[0] if pages else None)) as temporary:
        pages.append(write_pdf_file(sheet, results, temporary, logo))
    return kind


def field_appendix(project: Project, results: Results) -> tuple:
    """The field-solution appendix of a design (solves no load and the worst demagnetization case)."""
    ensure_qt()
    from .field_page import appendix_section, field_solutions

    return (appendix_section(results, field_solutions(project, results)),)


def preview_pages(project: Project, results: Results, dots_per_inch: float = 96.0, issued: _dt.date | None = None,
                  options: SheetOptions = DEFAULT_OPTIONS, project_folder: str | os.PathLike | None = None,
                  tolerance=None):
    """The PDF's pages as images, for the preview (``tolerance`` as :func:`export` takes it)."""
    ensure_qt()
    from .document import PagedDatasheet

    paged = PagedDatasheet(build(project, results, issued, (), options, tolerance), results,
                           logo_png(project, project_folder))
    return [paged.page_image(i, dots_per_inch) for i in range(paged.page_count)]


def write_chart(results: Results, name: str, path: str | os.PathLike) -> None:
    """One chart ("performance" or "magnet") as PNG or SVG, from the extension."""
    ensure_qt()
    from . import charts

    suffix = Path(path).suffix.lower()
    if suffix == ".svg":
        write_text_atomically(path, charts.chart_svg(name, results, f"{results.name}: {name} chart"), verify=check_svg)
    elif suffix == ".png":
        write_bytes_atomically(path, charts.chart_png(name, results), verify=check_png)
    else:
        raise CommandError(f"{path}: unknown chart format {suffix or '(no extension)'!r}; use .png or .svg")


def write_charts(results: Results, folder: str | os.PathLike, stem: str) -> list[Path]:
    """Both charts as PNG and SVG into ``folder``: ``{stem}_performance.png`` and so on."""
    from .charts import CHART_NAMES

    folder = Path(folder)
    if not folder.is_dir():
        raise CommandError(f"{folder}: the chart folder does not exist")
    written = []
    for name in CHART_NAMES:
        for suffix in (".png", ".svg"):
            target = folder / f"{stem}_{name}{suffix}"
            write_chart(results, name, target)
            written.append(target)
    return written
