"""The reluctance network against the built-in field solution over a sample of the design space.

Two steps, both run from the repository root:

* ``python benchmarks/network_calibration.py solve`` draws the sample (fixed seed, so the same designs
  every time), solves every case with the field solution (core.field, default mesh, dask.distributed with
  two local workers) and stores the reference values in ``tests/core/data/network_reference.json``
  together with how they were made. Slow (minutes); rerun only when the field solution or the sample
  changes. ``solve-demos`` re-solves only the demos' own cases (after a demo project changed) and keeps
  the stored sample.
* ``python benchmarks/network_calibration.py report`` solves the same designs and cases with the fast
  model (core.reluctance_network), writes ``docs/network-calibration.md`` (the table, worst cases first per
  target) and ``docs/network-calibration.png`` (the plot).

The sample (see :func:`sample`): poles 2, 4, 6; air gaps 0.3-1.5 mm; magnets 2-10 mm thick with arcs of
50-90 % of the pole pitch; hard ferrite, bonded NdFeB, sintered NdFeB and SmCo grades; housing walls
from generous to thin enough that the housing saturates past 2 T; 8-24 slots. Magnets as long as the
stack (no overhang), so the 2-D field solution is the right reference. The three demos' own cases are
added as they are (their overhang is then treated alike by both, see core.field.postprocess).
"""

from __future__ import annotations

import json
import math
import sys
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

REFERENCE = ROOT / "tests" / "core" / "data" / "network_reference.json"
DEMOS = ("appliance_ferrite_12v", "mobility_ndfeb_24v", "power_tool_4pole_48v")
GRADES = ("Y30", "Y40", "bonded NdFeB 10", "N42SH", "N38UH", "Sm2Co17 26", "SmCo5 20")
SLOTS = (8, 10, 12, 14, 16, 18, 20, 21, 22, 24)
SAMPLE_SIZE = 96
SEED = 20261202
#: ratio of the armature's peak MMF per pole to the magnet's own MMF Br·lm/(μ0·μrec) for the loaded cases
LOAD_RATIOS = (0.3, 1.0)


def _project(demo: str):
    from pmdc_sizer.core import project
    return project.load(ROOT / "demo_projects" / f"{demo}.toml")


def sample(size: int = SAMPLE_SIZE, seed: int = SEED) -> list[dict]:
    """The sampled designs: a base demo and the keys changed on it, each validated like a file.

    Returns
    -------
    list of dict
        ``{"label", "demo", "changes"}`` per design.
    """
    from pmdc_sizer.core import with_values
    from pmdc_sizer.core.errors import ProjectError
    from pmdc_sizer.core.library import magnet_grade

    rng = np.random.default_rng(seed)
    designs: list[dict] = []
    attempts = 0
    while len(designs) < size:
        attempts += 1
        demo = DEMOS[int(rng.integers(len(DEMOS)))]
        base = _project(demo)
        poles = int((2, 4, 6)[len(designs) % 3])
        slots = int(rng.choice([s for s in SLOTS if s >= poles + 2]))
        embrace = float(rng.uniform(0.5, 0.9))
        thickness = float(rng.uniform(2.0, 10.0))
        gap = float(rng.uniform(0.3, 1.5))
        grade = str(GRADES[int(rng.integers(len(GRADES)))])
        diameter = base.armature.outer_diameter_mm
        stack = base.armature.stack_length_mm
        # the wall from the housing flux density it would carry with ideal iron: 0.8 to 2.8 T
        data = magnet_grade(grade)
        gap_b = data.remanence * thickness / (thickness + data.recoil_permeability * gap)
        pole_arc = embrace * math.pi * (diameter + 2 * gap + thickness) / poles
        housing_b = float(rng.uniform(0.8, 2.8))
        wall = float(np.clip(0.5 * gap_b * pole_arc / housing_b, 1.0, 12.0))
        pitch = math.pi * diameter / slots
        slot_depth = min(base.armature.slot_depth_mm, 0.5 * (diameter - base.armature.shaft_diameter_mm) - 2.5)
        root_pitch = math.pi * (diameter - 2 * slot_depth) / slots
        tooth = round(0.5 * root_pitch, 2)
        opening = round(min(0.3 * pitch, pitch - tooth - 0.3), 2)
        changes = {
            "motor.poles": poles, "armature.slots": slots, "winding.type": "lap", "winding.multiplicity": 1,
            "winding.commutator_segments": slots, "magnets.grade": grade,
            "magnets.thickness_mm": round(thickness, 2), "magnets.arc_deg": round(embrace * 360.0 / poles, 2),
            "magnets.length_mm": stack, "airgap.length_mm": round(gap, 2), "housing.wall_mm": round(wall, 2),
            "armature.tooth_width_mm": tooth, "armature.slot_opening_mm": opening,
            "armature.slot_depth_mm": round(slot_depth, 2), "housing.max_outer_diameter_mm": None,
            "armature.shaft_magnetic": bool(rng.random() < 0.75),
            # pinned, so that a stored design stays the one solved when a demo's winding is changed later
            "winding.turns_per_coil": base.winding.turns_per_coil,
        }
        try:
            with_values(base, changes)
        except ProjectError as error:
            if attempts > 20 * size:
                raise RuntimeError(f"the sample cannot be drawn: {error}") from error
            continue
        designs.append({"label": f"S{len(designs) + 1:02d}", "demo": demo, "changes": changes})
    return designs


def design_of(entry: dict):
    """The Design (SI) of one sample entry."""
    from pmdc_sizer.core import with_values
    from pmdc_sizer.core.design import design_from_project
    return design_from_project(with_values(_project(entry["demo"]), entry["changes"]))


def sample_cases(entry: dict, index: int):
    """The field cases of one sampled design: no load; two armature currents for every second design;
    the rotor removed for every third."""
    from pmdc_sizer.core.field import FieldCase, no_load_case
    from pmdc_sizer.core.units import MU_0
    from pmdc_sizer.core.winding import parallel_paths, total_conductors

    design = design_of(entry)
    g, grade, w = design.geometry, design.magnet, design.winding
    cases = [no_load_case(20.0)]
    if index % 2 == 0:
        paths = int(parallel_paths(w.kind, g.poles, w.multiplicity))
        conductors = int(total_conductors(w.commutator_segments, w.turns_per_coil))
        magnet_mmf = grade.remanence * float(g.magnet_thickness) / (MU_0 * grade.recoil_permeability)
        for ratio in LOAD_RATIOS:
            # peak armature MMF per pole at the brush axis: (Z/p)/2 conductors carrying I/a
            current = ratio * magnet_mmf * 2.0 * int(g.poles) * paths / conductors
            cases.append(FieldCase(f"load-{ratio:g}", "armature current", 20.0, float(current)))
        # the larger current again with the rotor half a slot pitch on (a tooth centre on the pole centre),
        # which moves the slots' steps against the magnet's tips (core.armature_mmf)
        cases.append(FieldCase(f"load-{LOAD_RATIOS[-1]:g}-half-slot", "armature current", 20.0,
                               float(current), rotor_position_rad=math.pi / int(g.slots)))
    if index % 3 == 0:
        cases.append(FieldCase("rotor-removed", "rotor removed", 20.0))
    return design, cases


def _solution_record(solution) -> dict:
    return {
        "flux_per_pole_Wb_per_m": solution.flux_per_pole_Wb_per_m,
        "flux_per_pole_Wb": solution.flux_per_pole_Wb,
        "end_factor": solution.end_factor,
        "leakage_factor": solution.leakage_factor,
        "airgap_flux_density_mean_T": solution.airgap_flux_density_mean_T,
        "airgap_flux_density_centre_T": solution.airgap_flux_density_centre_T,
        "housing_section_flux_density_T": solution.housing_section_flux_density_T,
        "housing_flux_density_peak_T": solution.housing_flux_density_peak_T,
        "outside_air_flux_Wb_per_m": solution.outside_air_flux_Wb_per_m,
        "housing_section_flux_Wb_per_m": solution.housing_section_flux_Wb_per_m,
        "core_section_flux_density_T": solution.core_section_flux_density_T,
        "tooth_flux_density_mean_T": solution.tooth_flux_density_mean_T,
        "worst_magnet_field_A_per_m": solution.worst_magnet_field_A_per_m,
        "worst_share_magnet_field_A_per_m": solution.worst_share_magnet_field_A_per_m,
        "knee_field_A_per_m": solution.knee_field_A_per_m,
        "magnet_area_past_knee_fraction": solution.magnet_area_past_knee_fraction,
        "torque_N_m_per_m": solution.torque_N_m_per_m,
    }


def _case_record(case) -> dict:
    return {"name": case.name, "kind": case.kind, "magnet_temperature_C": case.magnet_temperature_C,
            "current_A": case.current_A, "rotor_position_rad": case.rotor_position_rad,
            "demagnetization_case": case.demagnetization_case}


def solve_references(demos_only: bool = False) -> None:
    """Solve the sample and the demos' cases with the field solution and store the reference file.

    ``demos_only`` re-solves the demos' own cases alone (after a demo project changed) and keeps the
    stored sample, whose designs are pinned by their stored changes.
    """
    from pmdc_sizer.core import evaluate
    from pmdc_sizer.core.design import design_from_project
    from pmdc_sizer.core.field import BatchItem, field_cases, solve_many

    started = time.perf_counter()
    entries, items = [], []
    kept: list[dict] = []
    if demos_only:
        stored = json.loads(REFERENCE.read_text(encoding="utf-8"))
        kept = [entry for entry in stored["designs"] if entry["label"] not in DEMOS]
        how_sample_was_made = stored["how_made"]
    else:
        for index, entry in enumerate(sample()):
            design, cases = sample_cases(entry, index)
            entries.append(entry)
            items += [BatchItem(entry["label"], design, case) for case in cases]
    for demo in DEMOS:
        design = design_from_project(_project(demo))
        entries.append({"label": demo, "demo": demo, "changes": {}})
        items += [BatchItem(demo, design, case) for case in field_cases(design, evaluate(design))]

    def progress(done, total, outcome):
        state = "ok" if outcome.ok else f"FAILED: {outcome.error}"
        print(f"  {done}/{total} {outcome.label} {outcome.case_name}: {outcome.seconds:.1f} s {state}", flush=True)

    outcomes = solve_many(items, workers=2, progress=progress)
    records: dict[str, dict] = {entry["label"]: {**entry, "cases": []} for entry in entries}
    for item, outcome in zip(items, outcomes, strict=True):
        record = {"case": _case_record(item.case)}
        if outcome.ok:
            record["field"] = _solution_record(outcome.solution)
        else:
            record["error"] = outcome.error
        records[item.label]["cases"].append(record)
    how_made = ("benchmarks/network_calibration.py solve: core.field.solve_case with the default "
                "FieldOptions, rotor position 0 (half a slot pitch on the half-slot cases), "
                f"{len(items)} cases, sample seed {SEED}; "
                f"{time.strftime('%Y-%m-%d', time.gmtime())}, {time.perf_counter() - started:.0f} s on 2 workers")
    if demos_only:
        how_made = (f"{how_sample_was_made.split(' | ')[0]} | the demos' cases re-solved by "
                    f"benchmarks/network_calibration.py solve-demos: {len(items)} cases; "
                    f"{time.strftime('%Y-%m-%d', time.gmtime())}, {time.perf_counter() - started:.0f} s")
    data = {"how_made": how_made, "designs": kept + list(records.values())}
    REFERENCE.write_text(json.dumps(data, indent=1) + "\n", encoding="utf-8")
    print(f"wrote {REFERENCE.relative_to(ROOT)}: {len(items)} cases in {time.perf_counter() - started:.0f} s")


if __name__ == "__main__":
    if sys.argv[1:] == ["solve"]:
        solve_references()
    elif sys.argv[1:] == ["solve-demos"]:
        solve_references(demos_only=True)
    elif sys.argv[1:] == ["report"]:
        from network_report import write_report  # the report lives beside this script
        write_report()
    else:
        sys.exit("usage: network_calibration.py solve|solve-demos|report")
