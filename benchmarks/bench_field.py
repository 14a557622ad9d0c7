"""Field-solution speed: one no-load and one loaded solve of each demo (median of a few), and a batch
of six solves on a local dask.distributed cluster of two worker processes against the same six in a
loop, all measured in this one run.

Targets (issue 10): under 3 s per solve at the default mesh on a two-core machine; the batch's
speed-up over the loop with 2 workers (the cluster's start-up included, as a user waits for it).
Last lines: ``field_no_load_s=…``, ``field_with_current_s=…`` (the slowest demo's median),
``batch_speedup_2_workers=…`` (a local cluster started for the batch) and
``batch_speedup_2_workers_running_cluster=…`` (the same batch on a cluster already running).
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
from pmdc_sizer.core.field import BatchItem, FieldOptions, field_cases, solve_case, solve_many

DEMOS = sorted((Path(__file__).resolve().parents[1] / "demo_projects").glob("*.toml"))
REPEATS = 3


def _median_seconds(design, case, options) -> tuple[float, object]:
    times, solution = [], None
    for _ in range(REPEATS):
        started = time.perf_counter()
        solution = solve_case(design, case, options)
        times.append(time.perf_counter() - started)
    return statistics.median(times), solution


def main() -> None:
    options = FieldOptions()
    no_load, loaded, items = [], [], []
    for path in DEMOS:
        design = design_from_project(project.load(path))
        results = evaluate(design)
        cases = {c.name: c for c in field_cases(design, results)}
        seconds, solution = _median_seconds(design, cases["no-load"], options)
        no_load.append(seconds)
        stall = cases["stall-cold"]
        seconds_loaded, loaded_solution = _median_seconds(design, stall, options)
        loaded.append(seconds_loaded)
        print(f"{path.stem}: no load {seconds:.2f} s ({solution.elements} elements, {solution.iterations} iterations, "
              f"{solution.sector_poles} of {int(design.geometry.poles)} poles); stall-cold at {stall.current_A:.4g} A "
              f"{seconds_loaded:.2f} s ({loaded_solution.iterations} iterations)")
        items += [BatchItem(path.stem, design, cases["no-load"]), BatchItem(path.stem, design, stall)]
    started = time.perf_counter()
    for item in items:
        solve_case(item.design, item.case, options)
    loop = time.perf_counter() - started
    started = time.perf_counter()
    outcomes = solve_many(items, workers=2, options=options)
    batch = time.perf_counter() - started
    assert all(o.ok for o in outcomes), [o.error for o in outcomes if not o.ok]
    # The same batch on a cluster that is already running (passed by address): the solves and their
    # scheduling only, as a sizing study that checks candidates one batch after another would see it.
    from dask.distributed import LocalCluster

    with LocalCluster(n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None) as cluster:
        solve_many(items[:2], scheduler=cluster.scheduler_address, options=options)  # workers import the core
        started = time.perf_counter()
        solve_many(items, scheduler=cluster.scheduler_address, options=options)
        running = time.perf_counter() - started
    print(f"batch of {len(items)}: loop {loop:.2f} s, 2 workers {batch:.2f} s (cluster start-up included), "
          f"{running:.2f} s on a running cluster")
    print(f"field_no_load_s={max(no_load):.2f}")
    print(f"field_with_current_s={max(loaded):.2f}")
    print(f"batch_speedup_2_workers={loop / batch:.2f}")
    print(f"batch_speedup_2_workers_running_cluster={loop / running:.2f}")


if __name__ == "__main__":
    main()
