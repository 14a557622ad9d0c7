"""``pmdc-sizer field``: the JSON the issue promises, the picture, the batch, and refusals with their codes."""

from __future__ import annotations

import json
import math
from pathlib import Path

from PySide6.QtGui import QImage

from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.project import load

from .command_line import run

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"
SCOOTER = REPO / "demo_projects" / "mobility_ndfeb_24v.toml"
COARSE = ("--fineness", "0.5")  # a quarter of the default's elements: the command's behaviour, not accuracy

PROMISED_KEYS = ("flux_per_pole_Wb", "flux_per_pole_2d_Wb_per_m", "airgap_flux_density_T", "airgap_angle_deg",
                 "housing_flux_density_max_T", "magnet_area_past_knee_fraction", "iterations", "elements",
                 "seconds", "agreement")


def test_json_has_every_promised_key_on_the_same_basis_as_evaluate(capsys):
    status, out, err = run(capsys, "field", FERRITE, "--json", *COARSE)
    assert status == 0, err
    data = json.loads(out)
    assert set(PROMISED_KEYS) <= set(data)
    assert len(data["airgap_flux_density_T"]) == len(data["airgap_angle_deg"]) > 50
    # Same basis as evaluate's figure: 2-D flux × stack × the fast model's end factor.
    assert math.isclose(data["flux_per_pole_Wb"],
                        data["flux_per_pole_2d_Wb_per_m"] * data["stack_length_m"] * data["end_factor"], rel_tol=1e-9)
    fast = evaluate(load(FERRITE)).magnetics.flux_per_pole_Wb
    row = next(r for r in data["agreement"] if r["quantity"] == "flux per pole")
    assert math.isclose(row["fast"], fast, rel_tol=1e-12)
    assert math.isclose(row["difference_percent"], 100 * (fast - data["flux_per_pole_Wb"]) / data["flux_per_pole_Wb"],
                        rel_tol=1e-9)
    assert row["flagged"] == (abs(row["difference_percent"]) > 3.0)


def test_every_case_of_a_design_is_solved_and_named(capsys):
    status, out, err = run(capsys, "field", SCOOTER, "--case", "all", "--json", *COARSE)
    assert status == 0, err
    names = [item["case"] for item in json.loads(out)]
    # The scooter reverses and has a drive limit: every kind of case exists, cold and hot.
    assert names == ["no-load", "stall-cold", "stall-hot", "reversal-cold", "reversal-hot", "drive-limit-cold",
                     "drive-limit-hot", "rotor-removed-cold", "rotor-removed-hot"]


def test_a_case_the_design_does_not_have_is_refused_naming_those_it_has(capsys):
    status, _, err = run(capsys, "field", FERRITE, "--case", "reversal-cold", *COARSE)
    assert status == 2
    assert "--case reversal-cold" in err and "stall-cold" in err and len(err.strip().splitlines()) == 1


def test_a_section_that_cannot_be_meshed_is_bad_input_naming_the_key(capsys):
    # The file's fit rules compare the slot opening with the slot at the surface (4.08 mm here); the
    # mesh needs it to fit below the 0.5 mm tooth tips too, where the parallel teeth leave 3.80 mm.
    status, out, err = run(capsys, "field", FERRITE, "--set", "armature.slot_opening_mm=4.0", *COARSE)
    assert status == 2 and out == ""
    assert err.startswith("pmdc-sizer: error: armature.slot_opening_mm: 4 mm is wider than the slot below the tooth")
    assert len(err.strip().splitlines()) == 1


def test_png_is_written_and_shows_a_picture(capsys, tmp_path):
    out = tmp_path / "field.png"
    status, text, err = run(capsys, "field", FERRITE, "--case", "stall-cold", "--png", out, *COARSE)
    assert status == 0, err
    assert f"wrote the field picture to {out}" in text
    image = QImage(str(out))
    assert image.width() >= 800 and image.height() >= 600
    # A real picture has many colours (the map's scale, the magnets, the lines), not a blank canvas.
    colours = {image.pixel(x, y) for x in range(0, image.width(), 7) for y in range(0, image.height(), 7)}
    assert len(colours) > 200
    assert not list(tmp_path.glob(".*.tmp"))  # the atomic write left nothing behind


def test_png_needs_one_case(capsys, tmp_path):
    status, _, err = run(capsys, "field", FERRITE, "--case", "all", "--png", tmp_path / "x.png", *COARSE)
    assert status == 2 and "--case" in err
    assert not (tmp_path / "x.png").exists()


def test_fineness_out_of_range_is_refused(capsys):
    status, _, err = run(capsys, "field", FERRITE, "--fineness", "-1")
    assert status == 2 and "--fineness" in err


def test_batch_writes_one_line_per_design_and_a_broken_file_does_not_stop_the_rest(capsys, tmp_path):
    broken = tmp_path / "broken.toml"
    broken.write_text("format_version = 1\n[supply]\nvoltage_V = 'twelve'\n", encoding="utf-8")
    out = tmp_path / "results.jsonl"
    status, text, err = run(capsys, "field", "--batch", FERRITE, broken, "-o", out, "--workers", "2", *COARSE)
    assert status == 1  # one design failed
    records = [json.loads(line) for line in out.read_text(encoding="utf-8").splitlines()]
    assert [r["ok"] for r in records] == [False, True]
    assert "supply.voltage_V" in records[0]["error"]
    assert records[1]["case"] == "no-load" and records[1]["flux_per_pole_Wb"] > 0
    assert "[1/1]" in err and "wrote 2 results" in text


def test_batch_without_output_is_refused(capsys):
    status, _, err = run(capsys, "field", "--batch", FERRITE)
    assert status == 2 and "-o" in err
