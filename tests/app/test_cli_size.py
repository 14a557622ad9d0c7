"""``pmdc-sizer size``: the JSON's shape, exit 1 with the reasons, exit 2 naming the key, files that reload,
and the seed reproducing the result. Small searches (few candidates, a short refinement) keep them quick."""

from __future__ import annotations

import contextlib
import io
import json
from pathlib import Path

import pytest

from pmdc_sizer.app.cli import main
from pmdc_sizer.core import project
from pmdc_sizer.core.batch import screening_figures
from pmdc_sizer.core.evaluate import evaluate

from .command_line import run

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"
SEARCH = ("size", FERRITE, "--free", "magnets.thickness_mm=4:8", "--free", "winding.turns_per_coil=12:24",
          "--grades", "Y30BH,Y40", "--candidates", "64", "--generations", "2", "--seed", "5")


@pytest.fixture(scope="module")
def found(tmp_path_factory):
    """One search with two objectives, its JSON and the files it wrote (run once for the module, so without
    capsys, which is per test)."""
    folder = tmp_path_factory.mktemp("sized")
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        status = main([str(a) for a in (*SEARCH, "--objective", "mass", "--objective", "cost", "--json",
                                         "--write", folder)])
    assert status == 0, err.getvalue()
    return json.loads(out.getvalue()), folder


def test_json_has_the_keys_the_issue_names(found):
    data, _ = found
    assert {"designs", "candidates_evaluated", "feasible_count", "seconds", "seed"} <= set(data)
    assert data["seed"] == 5 and data["candidates_evaluated"] >= 64 and data["feasible_count"] >= 1
    assert "explanation" not in data
    assert data["designs"]
    for design in data["designs"]:
        assert set(design["values"]) == {"magnets.thickness_mm", "winding.turns_per_coil", "magnets.grade"}
        assert 4.0 <= design["values"]["magnets.thickness_mm"] <= 8.0
        assert isinstance(design["values"]["winding.turns_per_coil"], int)
        assert design["values"]["magnets.grade"] in ("Y30BH", "Y40")
        assert isinstance(design["pareto"], bool) and set(design["best_for"]) <= {"mass", "cost"}
        assert "mass.active_kg" in design["figures"] and "nominal.no_load_speed_rad_per_s" in design["figures"]
        assert set(design["objectives"]) == {"mass_kg", "cost"}
        assert design["objectives"]["mass_kg"] == pytest.approx(design["figures"]["mass.active_kg"], rel=1e-9)
    best = {name for design in data["designs"] for name in design["best_for"]}
    assert best == {"mass", "cost"}


def test_written_files_reload_and_evaluate_to_the_same_figures(found):
    data, folder = found
    files = sorted(folder.glob("*.toml"))
    assert [f.name for f in files] == [f"appliance_ferrite_12v-sized-{i:02d}.toml"
                                       for i in range(1, len(data["designs"]) + 1)]
    for path, design in zip(files, data["designs"], strict=True):
        assert design["file"] == str(path)
        text = path.read_text(encoding="utf-8")
        assert text.startswith("# Sized by pmdc-sizer size from appliance_ferrite_12v.toml on ")
        assert "# Free: magnets.thickness_mm=4:8; winding.turns_per_coil=12:24; magnets.grade=Y30BH,Y40." in text
        assert "seed 5" in text and "# INVENTED DEMO SCENARIO" in text  # the source's own comments are kept
        loaded = project.load(path)
        assert loaded.magnets.grade == design["values"]["magnets.grade"]
        assert loaded.winding.turns_per_coil == design["values"]["winding.turns_per_coil"]
        figures = screening_figures(evaluate(loaded))
        for name in ("mass.active_kg", "cost.total", "nominal.no_load_speed_rad_per_s", "hot.rated_efficiency"):
            assert figures[name] == pytest.approx(design["figures"][name], rel=1e-12)


def test_existing_files_are_not_overwritten_silently(found, capsys):
    _, folder = found
    before = {p.name: p.read_bytes() for p in folder.glob("*.toml")}
    status, _, err = run(capsys, *SEARCH, "--objective", "mass", "--objective", "cost", "--write", folder)
    assert status == 2
    assert "is already there" in err and "nothing was written" in err and "--replace" in err
    assert {p.name: p.read_bytes() for p in folder.glob("*.toml")} == before
    status, _, err = run(capsys, *SEARCH, "--objective", "mass", "--objective", "cost", "--write", folder,
                         "--replace")
    assert status == 0, err
    assert sorted(p.name for p in folder.glob("*.toml.bak")) == sorted(f"{name}.bak" for name in before)


def test_the_seed_reproduces_the_result(found, capsys):
    data, _ = found
    status, out, err = run(capsys, *SEARCH, "--objective", "mass", "--objective", "cost", "--json")
    assert status == 0, err
    again = json.loads(out)
    assert [d["values"] for d in again["designs"]] == [d["values"] for d in data["designs"]]
    assert again["feasible_count"] == data["feasible_count"]


def test_text_output_is_a_table_with_units(capsys):
    status, out, err = run(capsys, *SEARCH)
    assert status == 0, err
    assert "candidates evaluated" in out and "pass every check at every temperature" in out
    assert "Magnet thickness [mm]" in out and "mass [g]" in out and "cost [EUR]" in out
    assert "mass [g]: Active mass: magnets, copper, steel" in out


@pytest.fixture(scope="module")
def impossible():
    """The search with ten times the rated torque, as text and as JSON: (status, out, err) of each, run once.
    The sample alone (no refinement): nothing passes anywhere, and the explanation is what is under test."""
    runs = {}
    sample_only = (*SEARCH[:SEARCH.index("--generations") + 1], "0", *SEARCH[SEARCH.index("--generations") + 2:])
    for form in ("text", "json"):
        out, err = io.StringIO(), io.StringIO()
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            status = main([str(a) for a in (*sample_only, "--set", "load.torque_mNm=350",
                                            *(("--json",) if form == "json" else ()))])
        runs[form] = (status, out.getvalue(), err.getvalue())
    return runs


def test_an_impossible_requirement_exits_1_with_the_explanation(impossible):
    status, out, err = impossible["json"]
    assert status == 1
    data = json.loads(out)
    assert data["designs"] == [] and data["feasible_count"] == 0
    assert "None of the" in data["explanation"] and "closest design" in data["explanation"]
    assert "Re-evaluated with the requirement relaxed" in data["explanation"]
    assert any(s["requirement"] == "load" for s in data["shortfalls"])
    assert err.startswith("pmdc-sizer: no feasible design: ")
    status, out, _ = impossible["text"]
    assert status == 1 and "No feasible design." in out


def test_the_explanation_names_fields_by_label_with_the_typed_key_once(impossible):
    status, out, _ = impossible["text"]
    assert status == 1
    explanation = " ".join(out.split("No feasible design.", 1)[1].split())  # the wrapped paragraph, one line
    assert "magnet thickness (magnets.thickness_mm) " in explanation
    assert explanation.count("magnets.thickness_mm") == 1 and explanation.count("winding.turns_per_coil") == 1
    assert "magnets.thickness_mm =" not in explanation and "turns per coil" in explanation
    data = json.loads(impossible["json"][1])
    assert "magnet thickness (magnets.thickness_mm) " in data["explanation"]


@pytest.mark.parametrize(("arguments", "named"), [
    (("--free", "magnets.thickness_mm=0.01:8"), "magnets.thickness_mm"),
    (("--free", "magnets.nonsense_mm=1:2"), "magnets.nonsense_mm"),
    (("--set", "supply.voltage_V=-3"), "supply.voltage_V"),
    (("--grades", "Y40,NOSUCH"), "NOSUCH"),
    (("--objective", "speed"), "speed"),
    (("--candidates", "0"), "--candidates"),
])
def test_bad_input_exits_2_naming_the_field(capsys, arguments, named):
    status, out, err = run(capsys, "size", FERRITE, "--free", "winding.turns_per_coil=12:24", "--candidates", "8",
                           *arguments)
    assert status == 2, err
    assert named in err and "\n" not in err.strip() and out == ""


def test_field_check_marks_each_design(capsys):
    status, out, err = run(capsys, "size", FERRITE, "--free", "winding.turns_per_coil=14:18", "--candidates", "8",
                           "--generations", "0", "--seed", "2", "--json", "--field-check", "--coarse-field",
                           "--workers", "1", "--set", "magnets.thickness_mm=7.5")  # keeps the required margin
    assert status == 0, err
    for design in json.loads(out)["designs"]:
        check = design["field_check"]
        assert check["error"] is None and isinstance(check["flagged"], bool)
        assert check["flagged"] == (abs(check["difference"]) > 0.03)
