"""The checks run on every export before it replaces anything: each accepts a whole file of its kind and
refuses the same file cut short or damaged; and the clean-up of killed writes at the next start."""

from __future__ import annotations

import os
import time

import pytest

from pmdc_sizer.app import datasheet
from pmdc_sizer.app.cli import main
from pmdc_sizer.app.export_checks import check_csv, check_html, check_pdf, check_png, check_svg
from pmdc_sizer.app.files import clean_up_stale_temporaries, curves_csv, write_text_atomically
from pmdc_sizer.core import atomic_files
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.project import load

from ..conftest import DEMO_FOLDER


@pytest.fixture(scope="module")
def exports(tmp_path_factory):
    folder = tmp_path_factory.mktemp("exports")
    project = load(DEMO_FOLDER / "appliance_ferrite_12v.toml")
    results = evaluate(project)
    datasheet.export(project, results, folder / "sheet.pdf")
    datasheet.export(project, results, folder / "sheet.html")
    datasheet.write_charts(results, folder, "sheet")
    (folder / "curves.csv").write_text(curves_csv(results), encoding="utf-8")
    return folder


def _cut(path, tmp_path, keep=0.6):
    damaged = tmp_path / f"cut{path.suffix}"
    data = path.read_bytes()
    damaged.write_bytes(data[: int(len(data) * keep)])
    return damaged


@pytest.mark.parametrize(("name", "check"), [("sheet.pdf", check_pdf), ("sheet_performance.png", check_png),
                                             ("sheet_magnet.svg", check_svg), ("sheet.html", check_html),
                                             ("curves.csv", check_csv)])
def test_a_whole_file_passes_and_a_cut_one_does_not(exports, tmp_path, name, check):
    check(exports / name)
    with pytest.raises(ValueError):
        check(_cut(exports / name, tmp_path))
    empty = tmp_path / f"empty{(exports / name).suffix}"
    empty.write_bytes(b"")
    with pytest.raises(ValueError):
        check(empty)


def test_the_pdf_check_reads_the_page_count_and_the_cross_references(exports, tmp_path):
    path = exports / "sheet.pdf"
    data = path.read_bytes()
    pages = int(data.split(b"/Type /Pages")[1].split(b"/Count ")[1].split()[0])
    check_pdf(path, pages)
    with pytest.raises(ValueError, match="pages"):
        check_pdf(path, pages + 1)
    shifted = tmp_path / "shifted.pdf"  # every object 7 bytes from where the table says
    shifted.write_bytes(data[:9] + b"%extra\n" + data[9:])
    with pytest.raises(ValueError, match="cross-reference"):
        check_pdf(shifted)


def test_a_damaged_png_chunk_is_found(exports, tmp_path):
    data = bytearray((exports / "sheet_performance.png").read_bytes())
    data[100] ^= 0xFF
    damaged = tmp_path / "damaged.png"
    damaged.write_bytes(bytes(data))
    with pytest.raises(ValueError, match="damaged"):
        check_png(damaged)


def test_a_csv_row_count_is_checked(exports):
    rows = len((exports / "curves.csv").read_text(encoding="utf-8").splitlines()) - 1
    check_csv(exports / "curves.csv", rows)
    with pytest.raises(ValueError, match="rows"):
        check_csv(exports / "curves.csv", rows + 1)


def test_killed_writes_are_cleaned_up_at_the_next_start(tmp_path, capsys):
    # Before: a killed export left its hidden temporary file beside the target for ever.
    target = tmp_path / "out" / "table.csv"
    target.parent.mkdir()
    write_text_atomically(target, "a,b\n1,2\n")  # the folder is now one the tool writes to
    stale = target.parent / f".table.csv.k1ll3d{atomic_files.TEMPORARY_SUFFIX}"
    fresh = target.parent / f".table.csv.wr1t1ng{atomic_files.TEMPORARY_SUFFIX}"
    stale.write_bytes(b"half a table")
    fresh.write_bytes(b"a write in progress elsewhere")
    os.utime(stale, (time.time() - 120, time.time() - 120))
    assert main(["grades"]) == 0  # any command cleans up first
    capsys.readouterr()
    assert not stale.exists() and fresh.exists() and target.exists()
    other = tmp_path / "elsewhere"
    other.mkdir()
    old = other / f".x.toml.abc{atomic_files.TEMPORARY_SUFFIX}"
    old.write_bytes(b"")
    os.utime(old, (time.time() - 120, time.time() - 120))
    assert clean_up_stale_temporaries([other]) == [old]  # the desktop tool adds its recent files' folders
