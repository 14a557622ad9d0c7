"""Fuzzing every input the tool reads: mutated project files, ``--set`` values, user-library files and
settings files. Each case must end in exit 2 with one line naming what is wrong (beside at most a
warning line per skipped library file), exit 1 with one line (a design without a solution), or a valid
result in which no figure is NaN or infinite; never a traceback, never exit 3 (the crash guard), never a
warning leaking from numpy (warnings are errors in the tests, so one would surface as exit 3).

Counts: 2,200 cases in ``make test`` (1,000 project files, 600 ``--set`` lines, 300 library layouts,
300 settings files), drawn the same way every run; ``HYPOTHESIS_PROFILE=explore`` draws ten times as many,
at random.
"""

from __future__ import annotations

import contextlib
import dataclasses
import datetime
import io
import json
import math
import os
import shutil
import tomllib
from pathlib import Path

import numpy as np
import pytest
import tomli_w
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from pmdc_sizer.app import results_json as results_json_module
from pmdc_sizer.app.cli import main
from pmdc_sizer.app.gui import settings as gui_settings
from pmdc_sizer.core import library
from pmdc_sizer.core.keys import key_specs

from ..conftest import DEMO_FILES
from ..core.test_library import USER_GRADE

SCALE = 10 if os.environ.get("HYPOTHESIS_PROFILE") == "explore" else 1
FUZZ = {"deadline": None, "suppress_health_check": list(HealthCheck)}

DEMO_TEXTS = [path.read_text(encoding="utf-8") for path in DEMO_FILES]
SPECS = [spec for spec in key_specs() if spec.path != "format_version"]
KEYS = [spec.path for spec in SPECS]
STEEL = {"name": "fuzz tube", "kind": "housing", "field_strength_A_per_m": [0.0, 300.0, 3000.0, 30000.0],
         "flux_density_T": [0.0, 0.9, 1.5, 1.9], "density_kg_per_m3": 7850.0, "source": "fuzz"}

# ------------------------------------------------------------------------------------------------
# The generators

odd_floats = st.sampled_from([math.nan, math.inf, -math.inf, -0.0, 0.0, 1e308, -1e308, 5e-324, 1e-9, -1.0,
                              0.999999, 1e6])
odd_values = st.one_of(
    odd_floats,
    st.floats(allow_nan=True, allow_infinity=True),
    st.integers(min_value=-(10**30), max_value=10**30),
    st.booleans(),
    st.text(max_size=30),
    st.sampled_from(["", "x" * 5000, "AWG 24", "0.50 mm", "Y30", "N42SH", "lap", "wave", "S2", "radial",
                     "155 (F)", "\u202e\u0000", "2024-02-30", "2024-05-17"]),
    st.sampled_from([datetime.date(2024, 5, 17), datetime.datetime(2024, 5, 17, 10, 0), datetime.time(10, 0)]),
    st.lists(st.integers(), max_size=3),
    st.dictionaries(st.text(max_size=5), st.integers(), max_size=2),
)


@st.composite
def in_range_value(draw, spec):
    """A value the schema accepts for ``spec`` (so many mutated files are valid designs to evaluate)."""
    if spec.kind == "choice":
        return draw(st.sampled_from(spec.choices))
    if spec.kind == "bool":
        return draw(st.booleans())
    if spec.kind in ("float", "int") and spec.minimum is not None and spec.maximum is not None:
        low, high = spec.minimum, spec.maximum
        if spec.kind == "int":
            return draw(st.integers(min_value=int(low), max_value=int(high)))
        return draw(st.one_of(st.sampled_from([float(low), float(high)]),
                              st.floats(min_value=float(low), max_value=float(high))))
    return draw(odd_values)


@st.composite
def mutated_data(draw):
    """A demo parsed, then 1-4 structural mutations: values in and out of range, keys removed or invented."""
    data = tomllib.loads(draw(st.sampled_from(DEMO_TEXTS)))
    for _ in range(draw(st.integers(1, 4))):
        action = draw(st.sampled_from(["in range", "in range", "in range", "odd", "remove", "unknown",
                                       "section", "version"]))
        spec = draw(st.sampled_from(SPECS))
        *sections, name = spec.path.split(".")
        node = data
        for section in sections:
            if not isinstance(node.get(section), dict):
                node[section] = {}
            node = node[section]
        if action == "in range":
            node[name] = draw(in_range_value(spec))
        elif action == "odd":
            node[name] = draw(odd_values)
        elif action == "remove":
            node.pop(name, None)
        elif action == "unknown":
            node[draw(st.text(min_size=1, max_size=12))] = draw(odd_values)
        elif action == "section":
            data[sections[0]] = draw(st.one_of(odd_values, st.just({})))
        else:
            data["format_version"] = draw(st.one_of(st.integers(-2, 4), odd_values))
    return data


def _dump(data) -> bytes:
    try:
        return tomli_w.dumps(data).encode("utf-8")
    except (TypeError, ValueError):  # a value TOML cannot hold (a time with a date...): write it as text
        return repr(data).encode("utf-8", "surrogatepass")


@st.composite
def mutated_text(draw):
    """A demo's text damaged the way files are damaged: cut, lines lost or doubled, bytes flipped, oddities."""
    text = draw(st.sampled_from(DEMO_TEXTS)).encode("utf-8")
    kind = draw(st.sampled_from(["truncate", "drop line", "double line", "flip", "insert", "bom", "nest",
                                 "big int", "huge string", "nul", "replace value"]))
    lines = text.split(b"\n")
    where = draw(st.integers(0, max(len(lines) - 1, 0)))
    if kind == "truncate":
        return text[: draw(st.integers(0, len(text)))]
    if kind == "drop line":
        return b"\n".join(lines[:where] + lines[where + 1:])
    if kind == "double line":
        return b"\n".join(lines[: where + 1] + lines[where:])
    if kind == "flip":
        position = draw(st.integers(0, len(text) - 1))
        return text[:position] + bytes([text[position] ^ draw(st.integers(1, 255))]) + text[position + 1:]
    if kind == "insert":
        return text[:where * 10] + draw(st.binary(min_size=1, max_size=20)) + text[where * 10:]
    if kind == "bom":
        return b"\xef\xbb\xbf" + text
    if kind == "nest":
        depth = draw(st.sampled_from([50, 300, 500, 2000]))
        opener, closer = draw(st.sampled_from([(b"[", b"]"), (b"{a=", b"}")]))
        return text + b"\nnested = " + opener * depth + (b"1" if opener != b"[" else b"") + closer * depth + b"\n"
    if kind == "big int":
        return text.replace(b"= 12.0", b"= " + b"9" * draw(st.sampled_from([4300, 4301, 10000])), 1).replace(
            b"= 24.0", b"= " + b"8" * 5000, 1).replace(b"= 48.0", b"= " + b"7" * 5000, 1)
    if kind == "huge string":
        return text.replace(b'revision = "', b'revision = "' + b"r" * 1_000_000, 1)
    if kind == "nul":
        return text[:where] + b"\x00" + text[where:]
    line = lines[where]
    if b"=" in line:
        key = line.split(b"=")[0]
        value = draw(st.sampled_from([b"nan", b"inf", b"-inf", b"1e999", b"0x10", b"0o7", b"1_0", b"+0.0",
                                      b"1979-05-27T07:32:00Z", b"[]", b"{}", b"'''x'''", b"true", b'"\\u0000"']))
        lines[where] = key + b"= " + value
    return b"\n".join(lines)


NUMERIC_SPECS = [spec for spec in SPECS if spec.kind in ("float", "int", "choice", "bool")
                 and ".custom_grade." not in spec.path]


@st.composite
def perturbed_designs(draw):
    """A demo with one to three keys moved anywhere inside their limits: mostly valid designs, evaluated."""
    data = tomllib.loads(draw(st.sampled_from(DEMO_TEXTS)))
    for spec in draw(st.lists(st.sampled_from(NUMERIC_SPECS), min_size=1, max_size=3, unique_by=lambda s: s.path)):
        section, name = spec.path.split(".")
        data.setdefault(section, {})[name] = draw(in_range_value(spec))
    return data


project_files = st.one_of(perturbed_designs().map(_dump), mutated_data().map(_dump), mutated_text())

set_values = st.one_of(
    st.sampled_from(["", "nan", "inf", "-inf", "1e999", "0", "-0.0", "[1, 2]", "{a = 1}", "true", "'x'", '"x"',
                     "2024-05-17", "1979-05-27T07:32:00", "=", "'", '"', "[" * 600, "{a=" * 400, "9" * 5000,
                     '"' + "y" * 100_000 + '"', "AWG 26", "0.45 mm", "N42SH", "Y30", "wave", "S2", "parallel"]),
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(-10**6, 10**6).map(str),
    st.text(max_size=20).filter(lambda text: "\x00" not in text),
)


@st.composite
def set_arguments(draw):
    argv: list[str] = []
    for _ in range(draw(st.integers(1, 3))):
        key = draw(st.one_of(st.sampled_from([s.path for s in NUMERIC_SPECS]), st.sampled_from(KEYS),
                             st.sampled_from(["magnets", "supply", "x", "", "magnets.",
                                                                     ".grade", "magnets.grade.name"]),
                             st.text(max_size=10).filter(lambda text: "\x00" not in text and "=" not in text)))
        spec = next((s for s in NUMERIC_SPECS if s.path == key), None)
        if spec is not None and draw(st.integers(0, 3)):
            value = draw(in_range_value(spec))
            text = tomli_w.dumps({"v": value})[4:].strip() if not isinstance(value, str) else f'"{value}"'
        else:
            text = draw(set_values)
        argv += ["--set", f"{key}={text}"]
    return argv


@st.composite
def library_layouts(draw):
    """One to three files for the user library: tables mutated, bytes damaged, things that are not files."""
    files = []
    for index in range(draw(st.integers(1, 3))):
        kind = draw(st.sampled_from(["grade", "grade", "steel", "steel", "garbage", "folder", "link", "nest",
                                     "shape"]))
        name = f"fuzz{index}.toml"
        if kind in ("grade", "steel"):
            table = dict(USER_GRADE if kind == "grade" else STEEL)
            table["name"] = draw(st.sampled_from(["fuzz grade", "Y30", "N42SH", "fuzz tube", "low-carbon steel 1010",
                                                  "M400-50A"]))
            for _ in range(draw(st.integers(0, 3))):
                key = draw(st.sampled_from(sorted(table)))
                table[key] = draw(st.one_of(odd_values, st.lists(odd_floats, min_size=3, max_size=5)))
            files.append((name, "data", _dump({kind: [table]})))
        elif kind == "garbage":
            files.append((name, "data", draw(st.binary(max_size=60))))
        elif kind == "nest":
            files.append((name, "data", b"grade = " + b"[" * 600 + b"]" * 600))
        elif kind == "shape":
            files.append((name, "data", draw(st.sampled_from([b"grade = 5", b"steel = true", b"grade = [1, 2]",
                                                              b"[grade]\nname = 'x'", b"magnet = []"]))))
        else:
            files.append((name, kind, b""))
    command = draw(st.sampled_from([["grades"], ["grades", "--json"], ["evaluate", "{demo}", "--json"],
                                    ["evaluate", "{demo}", "--json", "--set", "magnets.grade=fuzz grade"],
                                    ["evaluate", "{demo}", "--json", "--set", "housing.steel=fuzz tube"],
                                    ["evaluate", "{demo}", "--json", "--set", "magnets.grade=Y30"]]))
    return files, command


settings_files = st.one_of(
    st.binary(max_size=200),
    st.sampled_from([b"[" * 100_000 + b"]" * 100_000, b'{"recent_files": ' + b"[" * 5000 + b"]" * 5000 + b"}",
                     b'{"window_width": ' + b"9" * 5000 + b"}", b'{"display_units": null}', b"null", b"[]",
                     b'{"recent_files": ["' + b"p" * 100_000 + b'"]}', b"\xff\xfe{}"]),
    st.fixed_dictionaries({}, optional={
        "display_units": odd_values, "recent_files": st.one_of(odd_values, st.lists(odd_values, max_size=12)),
        "window_width": odd_values, "window_height": odd_values,
    }).map(lambda data: json.dumps(data, default=str).encode("utf-8")),
)

# ------------------------------------------------------------------------------------------------
# The harness


#: Figures documented as infinite on purpose (core/results.py: "inf if never"): a stall the winding
#: survives for ever. The JSON writes them as null. Every other figure must be finite.
INFINITE_BY_DESIGN = ("results.ratings.stall_time_cold_s", "results.ratings.stall_time_hot_s")


def _non_finite(value, path="results") -> list[str]:
    """Every figure of the results that is NaN or infinite (but those infinite by design)."""
    if path in INFINITE_BY_DESIGN and isinstance(value, float) and value == math.inf:
        return []
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        return [p for f in dataclasses.fields(value) for p in _non_finite(getattr(value, f.name), f"{path}.{f.name}")]
    if isinstance(value, (list, tuple)):
        return [p for i, item in enumerate(value) for p in _non_finite(item, f"{path}[{i}]")]
    if isinstance(value, np.ndarray) and value.dtype.kind == "f":
        return [] if np.all(np.isfinite(value)) else [path]
    if isinstance(value, (float, np.floating)) and not math.isfinite(value):
        return [path]
    return []


@pytest.fixture
def fuzz_run(monkeypatch):
    """``fuzz_run(argv)`` → (status, stdout, stderr lines, non-finite figures of the result)."""
    found: list[str] = []
    real = results_json_module.results_json

    def checked(results):
        found.extend(_non_finite(results))
        return real(results)

    monkeypatch.setattr(results_json_module, "results_json", checked)

    def run(argv):
        found.clear()
        out, err = io.StringIO(), io.StringIO()
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            try:
                status = main(argv)
            except SystemExit as stop:  # argparse's usage errors: one line too, and exit 2
                status = stop.code
        return status, out.getvalue(), err.getvalue().splitlines(), list(found)

    return run


def _assert_answered(status, out, lines, non_finite, argv, allow_warnings=False):
    context = f"argv={[a[:80] for a in argv]} stderr={[line[:300] for line in lines]}"
    assert not any("Traceback" in line for line in lines), context
    errors = [line for line in lines if line.startswith(("pmdc-sizer: error: ", "pmdc-sizer evaluate: error: "))]
    others = [line for line in lines if line not in errors]
    if allow_warnings:
        assert all(line.startswith(("pmdc-sizer: warning: user library file skipped: ", "pmdc-sizer: note: "))
                   for line in others), context
    else:
        assert all(line.startswith("pmdc-sizer: note: ") for line in others), context
    assert status in (0, 1, 2), context  # 3 would be the crash guard catching a defect
    if status == 0:
        assert errors == [] and non_finite == [], f"{context} non-finite: {non_finite}"
        if argv[0] == "evaluate":
            json.loads(out, parse_constant=lambda name: pytest.fail(f"{name} in the JSON; {context}"))
    else:
        assert len(errors) == 1 and out == "", context
        assert len(errors[0]) < 600, context  # short, however long the bad value was


@settings(max_examples=1000 * SCALE, **FUZZ)
@given(content=project_files)
def test_mutated_project_files(fuzz_run, tmp_path_factory, content):
    folder = tmp_path_factory.getbasetemp() / "fuzz_projects"
    folder.mkdir(exist_ok=True)
    path = folder / "design.toml"
    path.write_bytes(content)
    argv = ["evaluate", str(path), "--json"]
    _assert_answered(*fuzz_run(argv), argv)


@settings(max_examples=600 * SCALE, **FUZZ)
@given(demo=st.sampled_from([str(p) for p in DEMO_FILES]), assignments=set_arguments())
def test_set_values(fuzz_run, demo, assignments):
    argv = ["evaluate", demo, "--json", *assignments]
    _assert_answered(*fuzz_run(argv), argv)


@settings(max_examples=300 * SCALE, **FUZZ)
@given(layout=library_layouts())
def test_user_library_layouts(fuzz_run, _isolated_user_library, layout):
    folder = _isolated_user_library
    for entry in folder.iterdir():
        if entry.is_dir() and not entry.is_symlink():
            shutil.rmtree(entry)
        else:
            entry.unlink()
    files, command = layout
    for name, kind, data in files:
        path = folder / name
        if kind == "folder":
            path.mkdir()
        elif kind == "link":
            path.symlink_to(folder / "nowhere")
        else:
            path.write_bytes(data)
    library.reload()
    argv = [part.replace("{demo}", str(DEMO_FILES[0])) for part in command]
    status, out, lines, non_finite = fuzz_run(argv)
    _assert_answered(status, out, lines, non_finite, argv, allow_warnings=True)
    if argv == ["grades"]:
        assert status == 0 and "Y30" in out  # the built-ins stay, whatever the user folder holds
    skipped = [line for line in lines if "user library file skipped" in line]
    assert len(skipped) == len({line.split(": ")[3] for line in skipped})  # each file once


@settings(max_examples=300 * SCALE, **FUZZ)
@given(content=settings_files)
def test_settings_files(content):
    path: Path = gui_settings.settings_path()
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_bytes(content)
    loaded = gui_settings.load_settings()
    assert loaded.display_units in gui_settings.DISPLAY_UNIT_SYSTEMS
    assert 400 <= loaded.window_width <= 10000 and 400 <= loaded.window_height <= 10000
    assert all(isinstance(p, str) and len(p) < 4096 for p in loaded.recent_files)
    assert len(loaded.recent_files) <= gui_settings.MAX_RECENT_FILES


@pytest.fixture(autouse=True)
def _settings_in_a_temporary_folder(tmp_path_factory, monkeypatch):
    monkeypatch.setenv("PMDC_SIZER_CONFIG_DIR", str(tmp_path_factory.mktemp("fuzz_settings")))
