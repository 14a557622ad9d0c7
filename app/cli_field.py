"""``pmdc-sizer field``: the built-in 2-D field solution of a design, and batches of them on dask.

One design and case::

    pmdc-sizer field FILE [--case no-load|stall-cold|...|all] [--json] [--png OUT.png] [--set KEY=VALUE]

Many designs, in parallel on a local process cluster or an existing dask cluster::

    pmdc-sizer field --batch DIR_OR_FILES... -o results.jsonl [--case NAME] [--workers N] [--scheduler ADDRESS]

A design whose section cannot be meshed is bad input (exit 2, the key named); a solve that does not
converge has no solution (exit 1). In a batch, a failed design is reported on its own line and the
others go on; the exit status is 1 when any failed.
"""

from __future__ import annotations

import json
import math
import sys
from pathlib import Path
from typing import Any

import numpy as np

from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.errors import MagneticCircuitError, ProjectError

from .cli_inputs import add_command, add_json_option, add_set_option, evaluate_project, load_project
from .errors import EXIT_BAD_INPUT, EXIT_NO_SOLUTION, CommandError
from .files import atomic_output, write_text_atomically


def _number(value: float) -> float | None:
    value = float(value)
    return value if math.isfinite(value) else None


def agreement_json(table) -> list[dict[str, Any]]:
    """The agreement table as a list of rows (fast model against field, per cent, flagged)."""
    return [{"quantity": row.quantity, "case": row.case, "unit": row.unit,
             "fast": None if row.fast is None else _number(row.fast), "field": _number(row.field),
             "difference_percent": None if row.difference_percent is None else _number(row.difference_percent),
             "flagged": row.flagged, "note": row.note} for row in table.rows]


def solution_json(solution, results) -> dict[str, Any]:
    """One case's field solution as JSON-ready data: SI, unit-suffixed keys, the agreement group last."""
    from pmdc_sizer.core.field import agreement

    s = solution
    return {
        "design": s.design_name,
        "case": s.case.name,
        "case_kind": s.case.kind,
        "magnet_temperature_C": s.case.magnet_temperature_C,
        "current_A": s.current_A,
        "rotor_position_deg": math.degrees(s.case.rotor_position_rad),
        "flux_per_pole_Wb": _number(s.flux_per_pole_Wb),
        "flux_per_pole_2d_Wb_per_m": _number(s.flux_per_pole_Wb_per_m),
        "flux_per_pole_stack_no_end_effects_Wb": _number(s.flux_per_pole_stack_Wb),
        "end_factor": _number(s.end_factor),
        "stack_length_m": s.stack_length_m,
        "airgap_angle_deg": [round(float(a), 6) for a in np.degrees(s.airgap_angle_rad)],
        "airgap_flux_density_T": [_number(b) for b in s.airgap_flux_density_T],
        "airgap_flux_density_mean_T": _number(s.airgap_flux_density_mean_T),
        "airgap_flux_density_pole_centre_T": _number(s.airgap_flux_density_centre_T),
        "tooth_flux_density_mean_T": _number(s.tooth_flux_density_mean_T),
        "tooth_flux_density_max_T": _number(s.tooth_flux_density_peak_T),
        "core_flux_density_mean_T": _number(s.core_flux_density_mean_T),
        "core_flux_density_max_T": _number(s.core_flux_density_peak_T),
        "housing_flux_density_mean_T": _number(s.housing_flux_density_mean_T),
        "housing_flux_density_max_T": _number(s.housing_flux_density_peak_T),
        "housing_section_flux_density_T": _number(s.housing_section_flux_density_T),
        "flux_outside_housing_Wb_per_m": _number(s.outside_air_flux_Wb_per_m),
        "leakage_factor": _number(s.leakage_factor),
        "knee_field_A_per_m": _number(s.knee_field_A_per_m),
        "worst_magnet_field_A_per_m": _number(s.worst_magnet_field_A_per_m),
        "worst_magnet_position_m": [float(v) for v in s.worst_magnet_position_m],
        "worst_share_magnet_field_A_per_m": _number(s.worst_share_magnet_field_A_per_m),
        "magnet_area_past_knee_fraction": _number(s.magnet_area_past_knee_fraction),
        "magnet_past_knee_fractions": [float(v) for v in s.magnet_past_knee_fractions],
        "torque_N_m": _number(s.torque_N_m),
        "iterations": s.iterations,
        "elements": s.elements,
        "sector_poles": s.sector_poles,
        "seconds": round(s.seconds, 4),
        "agreement": agreement_json(agreement(results, s)),
    }


#: The terminal shows the agreement table's SI values in these units (unit, factor).
_SHOWN_UNITS = {"Wb": ("mWb", 1e3), "Wb/m": ("mWb/m", 1e3), "A/m": ("kA/m", 1e-3), "1": ("", 1.0)}


def _summary_lines(solution, results) -> list[str]:
    from pmdc_sizer.core.field import agreement

    s = solution
    lines = [
        f"{s.design_name}: field solution, {s.case.name} (magnets at {s.case.magnet_temperature_C:.0f} °C"
        + (f", {s.current_A:.4g} A" if s.current_A else "") + ")",
        f"  flux per pole            {1e3 * s.flux_per_pole_Wb:.4g} mWb  "
        f"(2-D {1e3 * s.flux_per_pole_Wb_per_m:.4g} mWb/m × {1e3 * s.stack_length_m:.4g} mm × end factor "
        f"{s.end_factor:.3f})",
        f"  air-gap flux density     mean {s.airgap_flux_density_mean_T:.3f} T under the magnet, "
        f"{s.airgap_flux_density_centre_T:.3f} T at the pole centre",
        f"  housing, teeth, core     max {s.housing_flux_density_peak_T:.2f} T, "
        f"{s.tooth_flux_density_peak_T:.2f} T, {s.core_flux_density_peak_T:.2f} T",
        f"  magnets past the knee    {100 * s.magnet_area_past_knee_fraction:.1f} % of their area; worst 5 % "
        f"{s.worst_share_magnet_field_A_per_m / 1e3:.0f} kA/m (worst element {s.worst_magnet_field_A_per_m / 1e3:.0f}) "
        f"against a knee of {s.knee_field_A_per_m / 1e3:.0f} kA/m",
        f"  solve                    {s.iterations} Newton steps, {s.elements} elements, {s.seconds:.2f} s",
        "  fast model against the field solution:",
    ]
    lines.append(f"    {'':<44} {'fast':>9} {'field':>9}")
    for row in agreement(results, s).rows:
        if row.fast is None or row.difference_percent is None:
            continue
        unit, scale = _SHOWN_UNITS.get(row.unit, (row.unit, 1.0))
        flag = "  <- over 3 %" if row.flagged else ""
        lines.append(f"    {row.quantity:<44} {scale * row.fast:>9.4g} {scale * row.field:>9.4g} {unit:<6} "
                     f"{row.difference_percent:+6.1f} %{flag}")
    return lines


def _cases_of(design, results, wanted: str):
    from pmdc_sizer.core.field import field_cases

    cases = field_cases(design, results)
    if wanted == "all":
        return cases
    chosen = [case for case in cases if case.name == wanted]
    if not chosen:
        raise CommandError(f"--case {wanted}: this design has no such case (it has: "
                           f"{', '.join(case.name for case in cases)})")
    return chosen


def _options(args):
    from pmdc_sizer.core.field import FieldOptions

    try:
        return FieldOptions(mesh_fineness=args.fineness)
    except ValueError as error:
        raise CommandError(f"--fineness {args.fineness:g}: {error}") from None


def _solve(design, case, options):
    from pmdc_sizer.core.field import FieldConvergenceError, FieldInputError, solve_case

    try:
        return solve_case(design, case, options)
    except FieldInputError as error:
        raise CommandError(str(error)) from None
    except FieldConvergenceError as error:
        raise CommandError(str(error), status=EXIT_NO_SOLUTION) from None


def cmd_field(args) -> int:
    if args.batch:
        return _batch(args)
    if len(args.files) != 1 and args.png:
        raise CommandError("--png takes one project file (give one FILE, or use --batch for many)")
    if not args.files:
        raise CommandError("give a project file, or --batch with files or folders")
    options = _options(args)
    out = []
    for path in args.files:
        project = load_project(path, args.set)
        results = evaluate_project(project)
        design = design_from_project(project)
        cases = _cases_of(design, results, args.case)
        if args.png and len(cases) != 1:
            raise CommandError("--png draws one case: choose it with --case")
        for case in cases:
            solution = _solve(design, case, options)
            if args.json:
                out.append(solution_json(solution, results))
            else:
                print("\n".join(_summary_lines(solution, results)))
            if args.png:
                from .datasheet import ensure_qt
                from .field_picture import write_field_png

                ensure_qt()
                with atomic_output(args.png) as temporary:
                    write_field_png(solution, results.geometry.poles, temporary,
                                    title=f"{solution.design_name}: {solution.case.name}")
                if not args.json:
                    print(f"wrote the field picture to {args.png}")
    if args.json:
        print(json.dumps(out[0] if len(out) == 1 else out, indent=2, ensure_ascii=False))
    return 0


def _project_files(paths: list[str]) -> list[Path]:
    files: list[Path] = []
    for name in paths:
        path = Path(name)
        if path.is_dir():
            files += sorted(path.glob("*.toml"))
        else:
            files.append(path)
    if not files:
        raise CommandError(f"--batch {' '.join(paths)}: no project files (*.toml) found")
    return files


def _batch(args) -> int:
    from pmdc_sizer.core.field import BatchItem, solve_many

    if not args.output:
        raise CommandError("--batch writes JSON lines: give the file with -o results.jsonl")
    options = _options(args)
    lines: list[str] = []
    failures = 0
    items, evaluated = [], {}
    for path in _project_files(args.files + args.batch):
        label = str(path)
        try:
            project = load_project(label, args.set)
            results = evaluate_project(project)
            design = design_from_project(project)
            cases = _cases_of(design, results, args.case)
        except (ProjectError, MagneticCircuitError, CommandError) as error:
            failures += 1
            lines.append(json.dumps({"file": label, "ok": False, "error": str(error)}, ensure_ascii=False))
            print(f"pmdc-sizer: {label}: skipped: {error}", file=sys.stderr)
            continue
        evaluated[label] = results
        items += [BatchItem(label, design, case) for case in cases]

    def progress(finished: int, total: int, outcome) -> None:
        state = "ok" if outcome.ok else f"failed: {outcome.error}"
        print(f"[{finished}/{total}] {outcome.label} {outcome.case_name}: {state} ({outcome.seconds:.1f} s)",
              file=sys.stderr, flush=True)

    outcomes = solve_many(items, scheduler=args.scheduler, workers=args.workers, progress=progress,
                          options=options) if items else []
    for outcome in outcomes:
        if outcome.ok:
            record = {"file": outcome.label, "ok": True, **solution_json(outcome.solution, evaluated[outcome.label])}
        else:
            failures += 1
            record = {"file": outcome.label, "case": outcome.case_name, "ok": False, "error": outcome.error,
                      "error_type": outcome.error_type}
        lines.append(json.dumps(record, ensure_ascii=False))
    write_text_atomically(args.output, "\n".join(lines) + "\n")
    print(f"wrote {len(lines)} results to {args.output} ({failures} failed)")
    return EXIT_NO_SOLUTION if failures else 0


def register(subparsers) -> None:
    p = add_command(
        subparsers, "field", cmd_field, "the built-in 2-D field solution of a design (one, or a batch on dask)",
        "Solve the motor's cross-section as a 2-D nonlinear magnetostatic field (scikit-fem) for a case, compare "
        "it with the fast model, and optionally draw it. With --batch, solve many designs in parallel on "
        "dask.distributed.")
    p.add_argument("files", nargs="*", metavar="FILE", help="project file(s) (.toml)")
    p.add_argument("--case", default="no-load",
                   help="no-load (default), stall-cold, stall-hot, reversal-cold, reversal-hot, drive-limit-cold, "
                        "drive-limit-hot, rotor-removed-cold, rotor-removed-hot, or all")
    add_json_option(p, "print JSON (SI, unit-suffixed keys)")
    p.add_argument("--png", metavar="OUT.png", help="draw the flux-density map, flux lines and air-gap waveform")
    p.add_argument("--fineness", type=float, default=1.0, help="mesh fineness (1 default, 2 for twice as fine)")
    add_set_option(p)
    p.add_argument("--batch", nargs="+", default=[], metavar="DIR_OR_FILE",
                   help="solve every project file given (folders: their *.toml) in parallel")
    p.add_argument("-o", "--output", metavar="OUT.jsonl", help="with --batch: the JSON-lines file to write")
    p.add_argument("--workers", type=int, default=2, help="with --batch: local worker processes (default 2)")
    p.add_argument("--scheduler", metavar="ADDRESS",
                   help="with --batch: an existing dask scheduler (e.g. tcp://10.0.0.5:8786) instead of a local "
                        "cluster")


__all__ = ["EXIT_BAD_INPUT", "agreement_json", "cmd_field", "register", "solution_json"]
