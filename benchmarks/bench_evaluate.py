"""Full evaluation speed: the whole chain (three temperature cases, curves of 200 points, every
demagnetization case, thermal iteration, checks) on each demo project, measured in this one run.

Target (issue: motor chain): under 5 ms. Last line: ``evaluate_ms=…`` (the median over the demos).
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from pmdc_sizer.core import project
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.evaluate import evaluate

DEMOS = sorted((Path(__file__).resolve().parents[1] / "demo_projects").glob("*.toml"))


def main() -> None:
    medians = []
    for path in DEMOS:
        design = design_from_project(project.load(path))
        for _ in range(10):
            evaluate(design, curve_points=200)
        times = []
        for _ in range(200):
            start = time.perf_counter()
            evaluate(design, curve_points=200)
            times.append(time.perf_counter() - start)
        median_ms = statistics.median(times) * 1e3
        medians.append(median_ms)
        print(f"{path.stem:<32} median {median_ms:.2f} ms, best {min(times) * 1e3:.2f} ms (200 runs)")
        start = time.perf_counter()
        for _ in range(50):
            evaluate(project.load(path))
        print(f"{'':<32} with file load and validation: {(time.perf_counter() - start) / 50 * 1e3:.2f} ms")
    print(f"evaluate_ms={statistics.median(medians):.2f}")


if __name__ == "__main__":
    main()
