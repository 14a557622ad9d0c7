"""Save screenshots of the main views for the documentation.

    QT_QPA_PLATFORM=offscreen python -m app.gui.screenshots [OUT_FOLDER] [PROJECT.toml]

Writes one PNG per page (magnet chart, performance curves, cross-section) of the given project, by
default the ferrite demo into ``assets/screenshots``.
"""

from __future__ import annotations

import os
import sys
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from PySide6.QtWidgets import QApplication  # noqa: E402

from .main_window import DEMO_FOLDER, MainWindow, _application, read_project, render_screenshot  # noqa: E402

PAGES = ("magnet_chart", "performance_curves", "cross_section")


def save_all(folder: Path, project_path: Path, prefix: str = "") -> list[Path]:
    _application()
    window = MainWindow(read_project(project_path), project_path)
    window.remember_settings = False
    written = []
    for index, name in enumerate(PAGES):
        window.pages.setCurrentIndex(index)
        if name == "performance_curves":
            window.performance_chart.show_cursor(
                float(window.current_project.load.torque_mNm) if window.display.system == "SI" else 0.0)
        out = folder / f"{prefix}{name}.png"
        render_screenshot(window, out)
        QApplication.processEvents()
        written.append(out)
    window.close()
    return written


def main(argv: list[str]) -> int:
    folder = Path(argv[0]) if argv else Path(__file__).resolve().parents[2] / "assets" / "screenshots"
    project_path = Path(argv[1]) if len(argv) > 1 else DEMO_FOLDER / "appliance_ferrite_12v.toml"
    folder.mkdir(parents=True, exist_ok=True)
    for path in save_all(folder, project_path):
        print(path)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
