"""Every demo's full ``evaluate --json`` against the golden copy stored before the code was restructured.

A change to any figure must be deliberate: a bug fix named in its commit message, with the golden
files regenerated in the same commit (``pmdc-sizer evaluate DEMO --json > tests/golden/DEMO.json``).
New keys may appear in the results; every stored one must still be there with the same value.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest

from pmdc_sizer.app.results_json import results_json
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.project import load

from ..conftest import DEMO_FILES

GOLDEN = Path(__file__).resolve().parents[1] / "golden"
RELATIVE_TOLERANCE = 1e-12  # the restructuring moves code, not arithmetic: only rounding may differ


def _differences(stored, current, key=""):
    if isinstance(stored, dict):
        if not isinstance(current, dict):
            yield f"{key}: was a group, now {current!r}"
            return
        for name, value in stored.items():
            if name not in current:
                yield f"{key}.{name}: missing"
            else:
                yield from _differences(value, current[name], f"{key}.{name}")
    elif isinstance(stored, list):
        if not isinstance(current, list) or len(current) != len(stored):
            yield f"{key}: list changed length"
            return
        for index, (a, b) in enumerate(zip(stored, current, strict=False)):
            yield from _differences(a, b, f"{key}[{index}]")
    elif isinstance(stored, float) and isinstance(current, (int, float)) and not isinstance(current, bool):
        if not math.isclose(stored, current, rel_tol=RELATIVE_TOLERANCE, abs_tol=1e-300):
            yield f"{key}: {stored!r} → {current!r}"
    elif stored != current:
        yield f"{key}: {stored!r} → {current!r}"


@pytest.mark.parametrize("path", DEMO_FILES, ids=[p.stem for p in DEMO_FILES])
def test_results_match_the_golden_copy(path):
    stored = json.loads((GOLDEN / f"{path.stem}.json").read_text(encoding="utf-8"))
    current = json.loads(json.dumps(results_json(evaluate(load(path)))))
    differences = list(_differences(stored, current))
    assert not differences, "\n".join(differences[:40])


def test_the_comparison_can_fail():
    stored = {"a": {"b": 1.0, "c": "x"}, "d": [1.0, 2.0]}
    assert list(_differences(stored, {"a": {"b": 1.0 + 1e-9, "c": "y"}, "d": [1.0]})) == [
        ".a.b: 1.0 → 1.000000001", ".a.c: 'x' → 'y'", ".d: list changed length"]
