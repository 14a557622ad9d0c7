"""``pmdc-sizer gui FILE --screenshot OUT.png``."""

from __future__ import annotations

import numpy as np
import pytest
from PySide6.QtGui import QImage

from pmdc_sizer.app.cli import main


def _pixels(path) -> np.ndarray:
    image = QImage(str(path)).convertToFormat(QImage.Format.Format_RGB32)
    width, height = image.width(), image.height()
    buffer = np.frombuffer(image.constBits(), dtype=np.uint8, count=image.sizeInBytes())
    # A copy: the image's buffer goes with the image at the end of this function.
    return buffer.reshape(height, image.bytesPerLine())[:, : 4 * width].reshape(height, width, 4)[:, :, :3].copy()


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


def test_screenshot_of_a_chosen_page_at_a_chosen_size(qapp, ferrite_demo, tmp_path):
    magnet, section = tmp_path / "magnet.png", tmp_path / "section.png"
    assert main(["gui", str(ferrite_demo), "--screenshot", str(magnet), "--page", "magnet", "--size", "1366x768"]) == 0
    assert main(["gui", str(ferrite_demo), "--screenshot", str(section), "--page", "cross-section",
                 "--size", "1366x768"]) == 0
    first, second = _pixels(magnet), _pixels(section)
    assert first.shape[:2] == second.shape[:2] == (768, 1366)
    assert np.mean(np.abs(first.astype(int) - second.astype(int))) > 3.0  # a different page is shown


def test_screenshot_of_the_field_page_solves_first(qapp, ferrite_demo, tmp_path):
    out = tmp_path / "field.png"
    assert main(["gui", str(ferrite_demo), "--screenshot", str(out), "--page", "field", "--size", "1920x1080"]) == 0
    pixels = _pixels(out)
    assert pixels.shape[:2] == (1080, 1920)
    assert len(np.unique(pixels.reshape(-1, 3), axis=0)) > 1000  # the coloured field picture, not a placeholder


def test_page_names_are_listed_in_the_help_and_bad_values_refused(qapp, ferrite_demo, tmp_path, capsys):
    from pmdc_sizer.app.gui.pages import PAGE_TITLES

    with pytest.raises(SystemExit):
        main(["gui", "--help"])
    help_text = " ".join(capsys.readouterr().out.split())
    for name in PAGE_TITLES:
        assert name in help_text
    assert "Field solution" in help_text
    assert main(["gui", str(ferrite_demo), "--screenshot", str(tmp_path / "x.png"), "--size", "huge"]) == 2
    assert "--size 'huge'" in capsys.readouterr().err
    assert main(["gui", str(ferrite_demo), "--page", "magnet"]) == 2
    assert "--screenshot" in capsys.readouterr().err
    assert not (tmp_path / "x.png").exists()


def test_screenshot_of_the_compare_page_with_a_design_b(qapp, ferrite_demo, tmp_path, monkeypatch):
    from pmdc_sizer.app.gui import capture

    ndfeb = ferrite_demo.parent / "mobility_ndfeb_24v.toml"
    shown: list[tuple[str, object]] = []
    original = capture.open_design_b

    def spy(window, path, *args):
        problem = original(window, path, *args)
        view = window.compare_view
        shown.append((view.b_source, view.results_b))
        return problem

    monkeypatch.setattr(capture, "open_design_b", spy)
    out = tmp_path / "compare.png"
    assert main(["gui", str(ferrite_demo), "--screenshot", str(out), "--page", "compare", "--size", "1366x768",
                 "--compare-with", str(ndfeb)]) == 0
    assert out.exists()
    (source, results_b), = shown
    assert source == "file mobility_ndfeb_24v.toml"
    assert results_b is not None and results_b.magnet.name == "N35EH"  # B's own grade (A's is Y40)


def test_a_broken_design_b_is_refused_before_anything_is_written(qapp, ferrite_demo, tmp_path, capsys):
    broken = tmp_path / "broken.toml"
    broken.write_text("[airgap]\nlength_mm = -1\n", encoding="utf-8")
    out = tmp_path / "never.png"
    assert main(["gui", str(ferrite_demo), "--screenshot", str(out), "--page", "compare",
                 "--compare-with", str(broken)]) == 2
    error = capsys.readouterr().err
    assert "design B" in error and "airgap.length_mm" in error
    assert not out.exists()
    assert main(["gui", "--compare-with", str(ferrite_demo)]) == 2
    assert "design A" in capsys.readouterr().err
