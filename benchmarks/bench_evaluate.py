"""Full evaluation speed: the whole chain (three temperature cases, curves of 200 points, every
demagnetization case, thermal iteration, checks) on each demo project, measured in this one run.

Target (issue: motor chain): under 5 ms. Last line: ``evaluate_ms=…`` (the median over the demos), with
``before_ms=…`` beside it: the same measurement, in the same run, of the code at a git revision
(``--before REV``, default ``HEAD``: the committed tree, read with ``git archive`` into a temporary
folder and run there in a child process), so the cost of a change is visible. ``--runs N`` sets the runs.
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, os.environ.get("PMDC_SIZER_BENCH_TREE", str(ROOT)))

from pmdc_sizer.core import project  # noqa: E402 - after the path of the tree to measure
from pmdc_sizer.core.design import design_from_project  # noqa: E402
from pmdc_sizer.core.evaluate import evaluate  # noqa: E402

# the demos of the tree being measured (a revision's code reads its own files)
DEMOS = sorted((Path(os.environ.get("PMDC_SIZER_BENCH_TREE", str(ROOT))) / "demo_projects").glob("*.toml"))


def measure(runs: int) -> float:
    medians = []
    for path in DEMOS:
        design = design_from_project(project.load(path))
        for _ in range(10):
            evaluate(design, curve_points=200)
        times = []
        for _ in range(runs):
            start = time.perf_counter()
            evaluate(design, curve_points=200)
            times.append(time.perf_counter() - start)
        median_ms = statistics.median(times) * 1e3
        medians.append(median_ms)
        print(f"{path.stem:<32} median {median_ms:.2f} ms, best {min(times) * 1e3:.2f} ms ({runs} runs)")
        start = time.perf_counter()
        for _ in range(50):
            evaluate(project.load(path))
        print(f"{'':<32} with file load and validation: {(time.perf_counter() - start) / 50 * 1e3:.2f} ms")
    return statistics.median(medians)


def before(revision: str, runs: int) -> float | None:
    """The same measurement on the tree of a git revision, in a child process (None if it fails)."""
    with tempfile.TemporaryDirectory() as folder:
        tree = Path(folder) / "tree"
        tree.mkdir()
        archive = subprocess.run(["git", "-C", str(ROOT), "archive", revision, "core", "app", "demo_projects"],
                                 capture_output=True)
        if archive.returncode != 0:
            print(f"before: git archive {revision} failed: {archive.stderr.decode().strip()}")
            return None
        subprocess.run(["tar", "-x", "-C", str(tree)], input=archive.stdout, check=True)
        package = tree / "pmdc_sizer"
        package.mkdir()
        (package / "__init__.py").write_text("")
        (package / "core").symlink_to(tree / "core")
        (package / "app").symlink_to(tree / "app")
        child = subprocess.run([sys.executable, __file__, "--runs", str(runs), "--no-before"], capture_output=True,
                               text=True, env={**os.environ, "PMDC_SIZER_BENCH_TREE": str(tree)})
        lines = [line for line in child.stdout.splitlines() if line.startswith("evaluate_ms=")]
        if child.returncode != 0 or not lines:
            print(f"before: the tree of {revision} did not run: {child.stderr.strip()[-300:]}")
            return None
        return float(lines[-1].split("=")[1])


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--runs", type=int, default=200)
    parser.add_argument("--before", default="HEAD")
    parser.add_argument("--no-before", action="store_true")
    args = parser.parse_args()
    now = measure(args.runs)
    if args.no_before:
        print(f"evaluate_ms={now:.2f}")
        return
    then = before(args.before, args.runs)
    if then is None:
        print(f"evaluate_ms={now:.2f}")
        return
    print(f"this tree {now:.2f} ms against {args.before} {then:.2f} ms: {now / then:.1f}x")
    print(f"evaluate_ms={now:.2f} before_ms={then:.2f}")


if __name__ == "__main__":
    main()
