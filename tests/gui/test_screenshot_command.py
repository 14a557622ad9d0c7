"""``pmdc-sizer gui FILE --screenshot OUT.png``."""

from __future__ import annotations

import numpy as np
from PySide6.QtGui import QImage

from pmdc_sizer.app.cli import main


def _pixels(path) -> np.ndarray:
    image = QImage(str(path)).convertToFormat(QImage.Format.Format_RGB32)
    width, height = image.width(), image.height()
    buffer = np.frombuffer(image.constBits(), dtype=np.uint8, count=image.sizeInBytes())
    return buffer.reshape(height, image.bytesPerLine())[:, : 4 * width].reshape(height, width, 4)[:, :, :3]


def test_screenshot_writes_a_non_blank_image(qapp, ferrite_demo, tmp_path):
    out = tmp_path / "window.png"
    assert main(["gui", str(ferrite_demo), "--screenshot", str(out)]) == 0
    pixels = _pixels(out)
    assert pixels.shape[:2] == (1000, 1600)
    assert pixels.std() > 20.0  # text, curves and a drawing, not one flat colour
    assert len(np.unique(pixels.reshape(-1, 3), axis=0)) > 200


def test_screenshot_of_a_broken_file_exits_2_with_one_line(qapp, tmp_path, capsys):
    broken = tmp_path / "broken.toml"
    broken.write_text("[magnets]\nthickness_mm = 'thick'\n", encoding="utf-8")
    out = tmp_path / "never.png"
    assert main(["gui", str(broken), "--screenshot", str(out)]) == 2
    error = capsys.readouterr().err
    assert len(error.strip().splitlines()) == 1 and "magnets.thickness_mm" in error
    assert not out.exists()
