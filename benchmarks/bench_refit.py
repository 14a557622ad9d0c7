"""Re-fit speed: each of the three re-fits of design B to design A's figure, against one evaluation,
measured in this one run (the machines are shared, so the ratio is the figure to read).

Target (issue: compare two grades or designs): a re-fit costs no more than about 30 evaluations, so
that the comparison page answers in well under a second. Last line: ``refit_over_evaluate=…`` (the
largest ratio over the cases below).
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from pmdc_sizer.core import difference, project, refit
from pmdc_sizer.core.evaluate import evaluate

DEMO_FOLDER = Path(__file__).resolve().parents[1] / "demo_projects"
#: (demo, grade of B): a weaker ferrite, sintered NdFeB in a ferrite frame, and a hot-rated NdFeB swap.
CASES = (("appliance_ferrite_12v", "Y25"), ("appliance_ferrite_12v", "N42"), ("power_tool_4pole_48v", "N42SH"))


def _median_seconds(work, repeats: int) -> float:
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        work()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> None:
    worst = 0.0
    for demo, grade in CASES:
        design_a = project.load(DEMO_FOLDER / f"{demo}.toml")
        results_a = evaluate(design_a)
        design_b = difference.with_grade(design_a, grade)
        results_b = evaluate(design_b)
        one = _median_seconds(lambda design_b=design_b: evaluate(design_b), 50)
        for target in refit.TARGETS:
            fit = refit.refit(target, results_a, design_b, results_b)
            seconds = _median_seconds(
                lambda target=target, results_a=results_a, design_b=design_b, results_b=results_b:
                refit.refit(target, results_a, design_b, results_b), 5)
            ratio = seconds / one
            worst = max(worst, ratio)
            print(f"{demo:<24} B = {grade:<6} {target:<14} {seconds * 1e3:7.1f} ms = {ratio:5.1f} evaluations "
                  f"({fit.evaluations} made; {'reached' if fit.reached else 'out of reach'}, "
                  f"error {100 * fit.target_error_fraction:+.2g} %)")
    print(f"refit_over_evaluate={worst:.1f}")


if __name__ == "__main__":
    main()
