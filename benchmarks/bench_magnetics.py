"""Magnetic-model speed, old and new in one run: the lumped per-pole circuit (core.magnetic_circuit, the
model before issue 11) and the pole's reluctance network (core.pole_magnetics, what evaluate uses now):
one scalar solve, a vectorised no-load sweep, and (lumped) the same designs one by one in a Python loop.

Targets: one solve under 0.5 ms; at least 200 000 designs/s vectorised (issue 11 asks it of the network).
Last line: ``scalar_solve_ms=… vectorized_designs_per_s=… speedup=…`` for the network, then the lumped
circuit's ``lumped_scalar_solve_ms=… lumped_vectorized_designs_per_s=…`` on the same line.
"""

from __future__ import annotations

import dataclasses
import statistics
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from pmdc_sizer.core import magnetic_circuit as mc
from pmdc_sizer.core import project
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.network_elements import network_elements
from pmdc_sizer.core.reluctance_network import solve_network

DEMO = Path(__file__).resolve().parents[1] / "demo_projects" / "appliance_ferrite_12v.toml"
SWEEP_SIZE = 100_000
NETWORK_SWEEP_SIZE = 20_000
LOOP_SAMPLE = 2_000


def main() -> None:
    design = design_from_project(project.load(DEMO))
    grade, geometry = design.magnet, design.geometry

    def solve(g, temperature=23.0):
        circuit = mc.pole_circuit(g, grade.recoil_permeability)
        return mc.solve(grade, temperature, circuit, design.housing_steel, design.lamination_steel)

    circuit = mc.pole_circuit(geometry, grade.recoil_permeability)
    for _ in range(20):
        mc.solve(grade, 23.0, circuit, design.housing_steel, design.lamination_steel)
    times, build_times = [], []
    for _ in range(400):
        start = time.perf_counter()
        mc.solve(grade, 23.0, circuit, design.housing_steel, design.lamination_steel)
        times.append(time.perf_counter() - start)
        start = time.perf_counter()
        mc.pole_circuit(geometry, grade.recoil_permeability)
        build_times.append(time.perf_counter() - start)
    scalar_ms = statistics.median(times) * 1e3
    build_ms = statistics.median(build_times) * 1e3

    rng = np.random.default_rng(1)
    thickness = geometry.magnet_thickness * rng.uniform(0.6, 1.4, SWEEP_SIZE)
    gap = geometry.airgap * rng.uniform(0.6, 1.6, SWEEP_SIZE)
    temperature = rng.uniform(-20.0, 120.0, SWEEP_SIZE)
    sweep = dataclasses.replace(geometry, magnet_thickness=thickness, airgap=gap)
    vector_times = []
    for _ in range(3):
        start = time.perf_counter()
        result = solve(sweep, temperature)
        vector_times.append(time.perf_counter() - start)
    assert np.all(result.converged)
    vector_s = min(vector_times)
    designs_per_s = SWEEP_SIZE / vector_s

    start = time.perf_counter()
    for i in range(LOOP_SAMPLE):
        solve(dataclasses.replace(geometry, magnet_thickness=float(thickness[i]), airgap=float(gap[i])),
              float(temperature[i]))
    loop_per_design = (time.perf_counter() - start) / LOOP_SAMPLE
    print(f"lumped: vectorised over a loop of scalar solves {loop_per_design * designs_per_s:.0f}x")

    print(f"lumped circuit: scalar solve, median of 400: {scalar_ms:.3f} ms (target < 0.5 ms); "
          f"building the circuit from the geometry adds {build_ms:.3f} ms")
    print(f"vectorised solve of {SWEEP_SIZE} designs: {vector_s * 1e3:.1f} ms, {designs_per_s:,.0f} designs/s "
          f"(target >= 200,000)")
    print(f"python loop of scalar solves ({LOOP_SAMPLE} sampled): {loop_per_design * 1e3:.3f} ms per design")

    def network(g, temperature=23.0):
        elements = network_elements(g, grade.recoil_permeability, design.housing_steel, design.lamination_steel,
                                    design.shaft_magnetic)
        return solve_network(grade, temperature, elements)

    for _ in range(5):
        network(geometry)
    network_times = []
    for _ in range(50):
        start = time.perf_counter()
        network(geometry)
        network_times.append(time.perf_counter() - start)
    network_ms = statistics.median(network_times) * 1e3
    part = slice(0, NETWORK_SWEEP_SIZE)
    network_sweep = dataclasses.replace(geometry, magnet_thickness=thickness[part], airgap=gap[part])
    sweep_times, sweep_cpu = [], []
    for _ in range(3):  # the best of three, as for the lumped sweep (the machine is shared)
        start, start_cpu = time.perf_counter(), time.process_time()
        solution = network(network_sweep, temperature[part])
        sweep_times.append(time.perf_counter() - start)
        sweep_cpu.append(time.process_time() - start_cpu)
    network_per_s = NETWORK_SWEEP_SIZE / min(sweep_times)
    print(f"reluctance network sweep: {min(sweep_times) * 1e3:.0f} ms wall, {min(sweep_cpu) * 1e3:.0f} ms of this "
          f"process's CPU time ({NETWORK_SWEEP_SIZE / min(sweep_cpu):,.0f} designs per CPU-second), "
          f"{solution.iterations.mean():.2f} Newton steps per design")
    print(f"reluctance network: scalar solve (building included), median of 50: {network_ms:.3f} ms; "
          f"vectorised sweep of {NETWORK_SWEEP_SIZE} designs: {network_per_s:,.0f} designs/s (target >= 200,000: "
          f"{'met' if network_per_s >= 2e5 else 'NOT met'})")
    print(f"network / lumped: scalar {network_ms / scalar_ms:.1f}x slower, vectorised "
          f"{designs_per_s / network_per_s:.1f}x slower")
    print(f"scalar_solve_ms={network_ms:.3f} vectorized_designs_per_s={network_per_s:.0f} "
          f"speedup={network_per_s * loop_per_design:.0f} lumped_scalar_solve_ms={scalar_ms:.3f} "
          f"lumped_vectorized_designs_per_s={designs_per_s:.0f}")


if __name__ == "__main__":
    main()
