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


def load_settings() -> Settings:
    try:
        data = json.loads(settings_path().read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return Settings()
    if not isinstance(data, dict):
        return Settings()
    settings = Settings()
    if data.get("display_units") in DISPLAY_UNIT_SYSTEMS:
        settings.display_units = data["display_units"]
    recent = data.get("recent_files")
    if isinstance(recent, list):
        settings.recent_files = [p for p in recent if isinstance(p, str)][:MAX_RECENT_FILES]
    for name in ("window_width", "window_height"):
        value = data.get(name)
        if isinstance(value, int) and 400 <= value <= 10000:
            setattr(settings, name, value)
    return settings


def save_settings(settings: Settings) -> None:
    """Write atomically; a settings file that cannot be written is not worth interrupting the user."""
    try:
        config_folder().mkdir(parents=True, exist_ok=True)
        write_text_atomically(settings_path(), json.dumps(asdict(settings), indent=2))
    except (OSError, CommandError):
        pass
