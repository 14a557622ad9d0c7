"""Save screenshots of the main views for the documentation.

    QT_QPA_PLATFORM=offscreen python -m app.gui.screenshots [OUT_FOLDER] [PROJECT.toml]
        [--set KEY=VALUE ...] [--prefix NAME_]

Writes one PNG per page (magnet chart, performance curves, cross-section) of the given project, by
default the ferrite demo into ``assets/screenshots``; ``--set`` shows a what-if of it (as the command
line's ``--set``), for example a magnet too thin for stall.
"""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from PySide6.QtWidgets import QApplication

from pmdc_sizer.app.overrides import apply_overrides
from pmdc_sizer.core.units import from_si

from .main_window import DEMO_FOLDER, MainWindow, _application, read_project, render_screenshot

PAGES = ("magnet_chart", "performance_curves", "cross_section")


def save_all(folder: Path, project_path: Path, prefix: str = "", overrides: list[str] | None = None) -> list[Path]:
    _application()
    project = read_project(project_path)
    if overrides:
        project = apply_overrides(project, overrides)
    window = MainWindow(project, project_path)
    window.remember_settings = False
    written = []
    for index, name in enumerate(PAGES):
        window.pages.setCurrentIndex(index)
        if name == "performance_curves":
            chart = window.performance_chart
            chart.show_cursor(from_si(window.current_results.load_torque_N_m, chart.torque_unit))
        out = folder / f"{prefix}{name}.png"
        render_screenshot(window, out)
        QApplication.processEvents()
        written.append(out)
    window.close()
    return written


def main(argv: list[str]) -> int:
    parser = argparse.ArgumentParser(prog="python -m app.gui.screenshots")
    parser.add_argument("folder", nargs="?",
                        default=str(Path(__file__).resolve().parents[2] / "assets" / "screenshots"))
    parser.add_argument("project", nargs="?", default=str(DEMO_FOLDER / "appliance_ferrite_12v.toml"))
    parser.add_argument("--set", action="append", default=[], metavar="KEY=VALUE")
    parser.add_argument("--prefix", default="")
    args = parser.parse_args(argv)
    folder = Path(args.folder)
    folder.mkdir(parents=True, exist_ok=True)
    for path in save_all(folder, Path(args.project), args.prefix, args.set):
        print(path)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
