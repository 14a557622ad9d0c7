"""Screen preferences remembered between sessions: display units, recent files, window size.

A small JSON file in ``platformdirs.user_config_dir("pmdc-sizer")``, or in ``$PMDC_SIZER_CONFIG_DIR``
when that is set (tests point it at a temporary folder). Project files never depend on it: it only
changes what the screen shows. A missing or damaged settings file falls back to the defaults.
"""

from __future__ import annotations

import json
import os
from dataclasses import asdict, dataclass, field
from pathlib import Path

from pmdc_sizer.app.errors import CommandError
from pmdc_sizer.app.files import write_text_atomically

SETTINGS_FILE_NAME = "settings.json"
MAX_RECENT_FILES = 8
DISPLAY_UNIT_SYSTEMS = ("SI", "US customary")


@dataclass
class Settings:
    display_units: str = "SI"
    recent_files: list[str] = field(default_factory=list)
    window_width: int = 1600
    window_height: int = 1000
    #: shares of the window's width: editor, pages, key figures and checks (empty: the window's defaults)
    column_shares: list[float] = field(default_factory=list)
    #: shares of the right column's height: key figures, checks
    figure_shares: list[float] = field(default_factory=list)

    def add_recent_file(self, path: str | os.PathLike) -> None:
        text = str(Path(path).resolve())
        self.recent_files = [text] + [p for p in self.recent_files if p != text]
        del self.recent_files[MAX_RECENT_FILES:]


def config_folder() -> Path:
    override = os.environ.get("PMDC_SIZER_CONFIG_DIR")
    if override:
        return Path(override)
    import platformdirs

    return Path(platformdirs.user_config_dir("pmdc-sizer", appauthor=False))


def settings_path() -> Path:
    return config_folder() / SETTINGS_FILE_NAME


MAX_SETTINGS_BYTES = 64 * 1024  #: the real file is a few hundred bytes


def load_settings() -> Settings:
    """The saved preferences, or the defaults for whatever is missing, damaged or not a settings file."""
    path = settings_path()
    try:
        if not path.is_file():  # absent, or a folder or a pipe that would block the start
            return Settings()
        with open(path, "rb") as stream:
            raw = stream.read(MAX_SETTINGS_BYTES + 1)
        if len(raw) > MAX_SETTINGS_BYTES:
            return Settings()
        data = json.loads(raw.decode("utf-8"))
    except (OSError, ValueError, RecursionError):  # unreadable, not UTF-8 or JSON, nested too deeply
        return Settings()
    if not isinstance(data, dict):
        return Settings()
    settings = Settings()
    if data.get("display_units") in DISPLAY_UNIT_SYSTEMS:
        settings.display_units = data["display_units"]
    recent = data.get("recent_files")
    if isinstance(recent, list):
        settings.recent_files = [p for p in recent if isinstance(p, str) and 0 < len(p) < 4096][:MAX_RECENT_FILES]
    for name in ("window_width", "window_height"):
        value = data.get(name)
        if isinstance(value, int) and 400 <= value <= 10000:
            setattr(settings, name, value)
    for name, count in (("column_shares", 3), ("figure_shares", 2)):
        shares = data.get(name)
        if (isinstance(shares, list) and len(shares) == count
                and all(isinstance(v, float) and 0.05 <= v <= 0.9 for v in shares) and abs(sum(shares) - 1) < 0.01):
            setattr(settings, name, shares)
    return settings


def save_settings(settings: Settings) -> None:
    """Write atomically; a settings file that cannot be written is not worth interrupting the user."""
    try:
        config_folder().mkdir(parents=True, exist_ok=True)
        write_text_atomically(settings_path(), json.dumps(asdict(settings), indent=2), remember_folder=False)
    except (OSError, CommandError):
        pass
