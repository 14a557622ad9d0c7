"""Sizing speed: a search on a requirement from each demo, six free variables (five numeric or wire, and
three magnet grades), measured in this one run.

Target (issue 15): at least 100 000 candidates screened per second and the whole search under 30 s.
For each demo it prints ``demo=… candidates_per_s=… sizing_s=… feasible_count=… designs=…`` and where
the time went (the screen, the refinement, the verification). ``--candidates N`` (default 2000),
``--generations N`` (default 5) and ``--population N`` (default 60) set the effort; ``--demo NAME`` runs
one demo.
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from pmdc_sizer.core import project
from pmdc_sizer.core.batch import evaluate_many
from pmdc_sizer.core.sizing import SizingSpec, size
from pmdc_sizer.core.sizing_candidates import fitting_designs
from pmdc_sizer.core.sizing_space import from_unit, grade_choices, parse_free, sample_unit

DEMO_FOLDER = Path(__file__).resolve().parents[1] / "demo_projects"

#: Each demo's requirement as drawn, with free ranges that hold the demo's own values.
REQUIREMENTS = {
    "appliance_ferrite_12v": (("magnets.thickness_mm=4:9", "housing.wall_mm=3:7", "winding.turns_per_coil=12:40",
                               "armature.stack_length_mm=20:28", "winding.wire=AWG 24:AWG 30"),
                              ("Y30BH", "Y35", "Y40")),
    "mobility_ndfeb_24v": (("magnets.thickness_mm=2:6", "housing.wall_mm=4:10", "winding.turns_per_coil=5:14",
                            "armature.stack_length_mm=35:49", "winding.wire=0.50:0.90"),
                           ("N42SH", "N38UH", "N35EH")),
    "power_tool_4pole_48v": (("magnets.thickness_mm=2:6", "housing.wall_mm=4:9", "winding.turns_per_coil=1:4",
                              "armature.tooth_width_mm=2.5:5", "armature.stack_length_mm=25:50"),
                             ("N38UH", "N42SH", "N35EH")),
}



def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--candidates", type=int, default=2000)
    parser.add_argument("--generations", type=int, default=5)
    parser.add_argument("--population", type=int, default=60)
    parser.add_argument("--demo", choices=sorted(REQUIREMENTS))
    args = parser.parse_args()
    for name, (ranges, grades) in REQUIREMENTS.items():
        if args.demo and name != args.demo:
            continue
        base = project.load(DEMO_FOLDER / f"{name}.toml")
        free = (*(parse_free(text, base) for text in ranges), grade_choices(grades, base))
        spec = SizingSpec(free=free, objectives=("mass", "efficiency"), candidates=args.candidates, seed=1,
                          generations=args.generations, population=args.population)
        marks: dict[str, float] = {}
        started = time.perf_counter()

        def progress(stage: str, done: int, total: int, marks=marks, started=started) -> bool:
            marks.setdefault(stage, time.perf_counter() - started)
            marks[f"{stage}_end"] = time.perf_counter() - started
            return True

        result = size(base, spec, progress)
        screen_s = marks.get("screen_end", 0.0)
        refine_s = marks.get("refine_end", screen_s) - screen_s
        verify_s = result.seconds - marks.get("refine_end", screen_s)
        print(f"demo={name} screen {args.candidates} candidates in {screen_s:.2f} s, refine "
              f"{result.candidates_evaluated - args.candidates} in {refine_s:.2f} s, verify {len(result.designs)} "
              f"designs in {verify_s:.2f} s")
        if not result.designs:
            print(f"  no design: {result.explanation}")
        # where the screen's time goes, on the first 400 candidates of the same sample
        values = from_unit(free, sample_unit(len(free), 400, spec.seed))
        tick = time.perf_counter()
        _, designs = fitting_designs(base, free, values)
        built = time.perf_counter() - tick
        tick = time.perf_counter()
        evaluate_many(designs)
        chain = time.perf_counter() - tick
        print(f"  where the screen's time goes (400 candidates): fit rules and designs {1e3 * built / 400:.2f} ms "
              f"per candidate ({len(designs)} fit), evaluate_many {1e3 * chain / max(len(designs), 1):.1f} ms per "
              f"design ({chain / (chain + built):.0%} of the two)")
        print(f"demo={name} candidates_per_s={args.candidates / screen_s:.0f} sizing_s={result.seconds:.2f} "
              f"feasible_count={result.feasible_count} designs={len(result.designs)} (targets 100000 and 30)")


if __name__ == "__main__":
    main()
