"""Batch speed: the screening figures of a mixed set of designs of the three demos (each perturbed:
magnet thickness, air gap, turns, supply voltage, wire resistivity) by one ``evaluate_many`` call, against
the loop of ``evaluate`` calls that returns the same figures, measured in this one run.

Target (issue 14): at least 100 000 designs/s and at least 100 times the loop, and a 10 000-motor
tolerance study under 1 s. Last line: ``batch_designs_per_s=… speedup_vs_loop=…
tolerance_ms_per_motor=…``; the lines before it say where the batch's time goes (the reluctance
network's share). ``--designs N`` sets the batch (default 3000), ``--loop N`` the designs the loop is
timed on (default 30, their time per design scaled), ``--motors N`` the tolerance study of the ferrite
demo (default 1000; 0 skips it).
"""

from __future__ import annotations

import argparse
import cProfile
import dataclasses
import pstats
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from pmdc_sizer.core import project
from pmdc_sizer.core.batch import evaluate_each, evaluate_many
from pmdc_sizer.core.design import Design, design_from_project
from pmdc_sizer.core.pole_load_table import LOAD_POINTS, TURNING_POSITIONS

DEMOS = sorted((Path(__file__).resolve().parents[1] / "demo_projects").glob("*.toml"))


def mixed_designs(count: int, seed: int = 14) -> list[Design]:
    """``count`` designs, the demos in turn, each with its dimensions and supply spread a little."""
    rng = np.random.default_rng(seed)
    bases = [design_from_project(project.load(path)) for path in DEMOS]
    designs = []
    for i in range(count):
        d = bases[i % len(bases)]
        g = d.geometry
        geometry = dataclasses.replace(g, magnet_thickness=g.magnet_thickness * rng.uniform(0.95, 1.05),
                                       airgap=g.airgap * rng.uniform(0.9, 1.1))
        winding = dataclasses.replace(d.winding, resistivity_factor=float(rng.uniform(0.98, 1.03)))
        designs.append(dataclasses.replace(d, geometry=geometry, winding=winding,
                                           supply_voltage=d.supply_voltage * rng.uniform(0.95, 1.05)))
    return designs


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--designs", type=int, default=3000)
    parser.add_argument("--loop", type=int, default=30)
    parser.add_argument("--motors", type=int, default=1000)
    args = parser.parse_args()
    designs = mixed_designs(args.designs)
    evaluate_many(designs[:6])  # warm the caches (grades' model ranges, steels) outside the timing
    evaluate_each(designs[:3])

    profile = cProfile.Profile()
    start = time.perf_counter()
    profile.enable()
    batch = evaluate_many(designs)
    profile.disable()
    batch_s = time.perf_counter() - start
    stats = pstats.Stats(profile)
    network_s = sum(value[3] for key, value in stats.stats.items()  # type: ignore[attr-defined]
                    if key[2] == "solve_network")
    start = time.perf_counter()
    evaluate_each(designs[:args.loop])
    loop_per_design = (time.perf_counter() - start) / args.loop

    tolerance_ms = float("nan")
    if args.motors > 0:
        from pmdc_sizer.core.tolerance_study import run_study

        ferrite = project.load(next(path for path in DEMOS if "ferrite" in path.name))
        start = time.perf_counter()
        run_study(ferrite, samples=args.motors)
        tolerance_ms = (time.perf_counter() - start) / args.motors * 1e3

    assert not batch.failed.any(), [m for m in batch.failure_messages if m]
    per_s = len(designs) / batch_s
    print(f"{len(designs)} designs ({len(DEMOS)} demos, perturbed) in {batch_s:.2f} s (profiled); "
          f"loop of evaluate: {loop_per_design * 1e3:.1f} ms per design ({args.loop} timed)")
    under_load = TURNING_POSITIONS * (3 * LOAD_POINTS - 2)
    print(f"the reluctance network's solves take {network_s / batch_s:.0%} of the batch (per design: 25 no-load "
          f"temperatures; {under_load} under load, {TURNING_POSITIONS} rotor positions x (3 cases x {LOAD_POINTS} "
          f"currents less the 2 at no load); 2 rotor removed; the magnets' judged currents at every rotor position "
          f"the network tells apart)")
    if args.motors > 0:
        print(f"tolerance study of the ferrite demo, {args.motors} motors: {tolerance_ms:.2f} ms per motor "
              f"(10 000 motors: {tolerance_ms * 10:.1f} s; target 1 s)")
    print(f"batch_designs_per_s={per_s:.0f} speedup_vs_loop={loop_per_design * per_s:.1f} "
          f"tolerance_ms_per_motor={tolerance_ms:.2f} (targets 100000, 100 and 0.1)")


if __name__ == "__main__":
    main()
