"""The main window's pages by the short names the command line uses (``gui --page NAME``).

No Qt here, so ``pmdc-sizer --help`` can list the names without loading the desktop tool.
"""

from __future__ import annotations

#: short name → the page's tab title, in the window's order.
PAGE_TITLES: dict[str, str] = {
    "magnet": "Magnet operating chart",
    "performance": "Performance curves",
    "cross-section": "Cross-section",
    "heat": "Duty temperatures",
    "compare": "Compare designs",
    "field": "Field solution",
    "tolerance": "Production spread",
    "sizing": "Sizing search",
}
#: Window sizes worth checking a page at: a common laptop and a common desktop screen.
REVIEW_SIZES = ((1366, 768), (1920, 1080))


def parse_size(text: str) -> tuple[int, int]:
    """"1366x768" → (1366, 768); a clear ValueError for anything else."""
    width, sep, height = text.lower().replace("×", "x").partition("x")
    try:
        size = (int(width), int(height))
    except ValueError:
        size = None
    if not sep or size is None or not (320 <= size[0] <= 7680 and 240 <= size[1] <= 4320):
        raise ValueError(f"--size {text!r}: write WIDTHxHEIGHT in pixels, e.g. 1366x768 (320x240 to 7680x4320)")
    return size
