"""``pmdc-sizer compare``: two designs side by side, or one design with another magnet grade.

    pmdc-sizer compare A.toml B.toml [--refit TARGET] [--json]
    pmdc-sizer compare FILE --grade-b NAME [--refit ke|no-load-speed|stall-torque] [--json]

Exit status as for every subcommand: 0, 2 for a bad file, key or grade (one line on stderr), and 1 when
a re-fit target is out of reach (the comparison and the re-fit's findings are still printed).
"""

from __future__ import annotations

import json

from pmdc_sizer.core import difference, refit
from pmdc_sizer.core.units import from_si

from .cli_inputs import add_command, add_json_option, evaluate_project, load_project
from .compare_text import check_lines, figure_rows, refit_lines, table_lines
from .errors import EXIT_NO_SOLUTION, CommandError
from .refit_text import refit_message, refit_notes, target_title
from .results_json import results_json
from .safety import SHORT_CAUTION


def register(subparsers) -> None:
    p = add_command(
        subparsers, "compare", cmd_compare,
        "compare two designs, or a design with another magnet grade; optionally re-fit B to A",
        "Design A against design B: every figure B − A, each side's checks, and optionally B re-fitted to one "
        "of A's figures (Ke by magnet thickness, no-load speed by turns per coil, stall torque by stack length).")
    p.add_argument("file_a", metavar="A.toml", help="design A, the reference")
    p.add_argument("file_b", metavar="B.toml", nargs="?", help="design B (or give --grade-b instead)")
    p.add_argument("--grade-b", metavar="NAME", help="B is A with this library magnet grade (see `pmdc-sizer grades`)")
    p.add_argument("--refit", choices=tuple(refit.TARGETS),
                   help="change B until it meets A's Ke (magnet thickness), no-load speed (turns per coil) or "
                        "stall torque (stack length)")
    add_json_option(p, "one JSON object: a, b, difference (B − A), relative_difference and refit")


def _design_b(args, design_a):
    if (args.file_b is None) == (args.grade_b is None):
        raise CommandError("compare: give design B either as a second project file or as --grade-b NAME (one of them)")
    if args.grade_b is not None:
        return difference.with_grade(design_a, args.grade_b)
    return load_project(args.file_b)


def refit_json(fit: refit.Refit, results_a) -> dict:
    """The re-fit as plain data; figures in ``figure_unit`` (as in the evaluate JSON: speeds in rpm, the rest SI)."""
    unit = {"nominal.no_load_speed_rad_per_s": "rpm", "nominal.stall_torque_N_m": "N·m",
            "constants.ke_V_s_per_rad": "V·s/rad"}[refit.TARGETS[fit.target].figure_key]

    def figure(value):
        return from_si(value, unit)

    after = results_json(fit.results)
    return {
        "target": fit.target,
        "title": target_title(fit.target),
        "figure_unit": unit,
        "target_value": figure(fit.target_value),
        "figure_before": figure(fit.figure_before),
        "figure_after": figure(fit.figure_after),
        "target_error_fraction": fit.target_error_fraction,
        "reached": fit.reached,
        "parameter": fit.parameter,
        "parameter_unit": fit.parameter_unit,
        "value_before": fit.value_before,
        "value_after": fit.value_after,
        "whole_numbers": refit.TARGETS[fit.target].integer,
        "search_range": list(fit.search_range),
        "range_limits": list(fit.range_limits),
        "changes": [{"key": c.key, "before": c.before, "after": c.after, "reason": c.reason} for c in fit.changes],
        "message": refit_message(fit),
        "notes": list(refit_notes(fit)),
        "new_failures": list(fit.new_failures),
        "magnet_mass_difference_kg": fit.magnet_mass_difference_kg,
        "magnet_cost_difference": fit.magnet_cost_difference,
        "material_cost_difference": fit.material_cost_difference,
        "currency": fit.currency,
        "evaluations": fit.evaluations,
        "b_after": after,
        "difference_after": difference.nested_difference(results_json(results_a), after),
    }


def cmd_compare(args) -> int:
    import sys

    design_a = load_project(args.file_a)
    design_b = _design_b(args, design_a)
    results_a, results_b = evaluate_project(design_a), evaluate_project(design_b)
    comparison = difference.compare(design_a, design_b, results_a, results_b)
    fit = refit.refit(args.refit, results_a, design_b, results_b) if args.refit else None

    if args.json:
        json_a, json_b = results_json(results_a), results_json(results_b)
        out = {
            "a": json_a,
            "b": json_b,
            "difference": difference.nested_difference(json_a, json_b),
            "relative_difference": difference.nested_difference(json_a, json_b, relative=True),
        }
        if fit is not None:
            out["refit"] = refit_json(fit, results_a)
        print(json.dumps(out, indent=2, ensure_ascii=False))
    else:
        print("\n".join(compare_text(args, design_a, design_b, comparison, fit)))
    if fit is not None and not fit.reached:
        print(f"pmdc-sizer: re-fit out of reach: {refit_message(fit)}", file=sys.stderr)
        return EXIT_NO_SOLUTION
    return 0


def _label(design, results) -> str:
    thickness_mm = from_si(results.geometry.magnet_thickness_m, "mm")
    return f"{design.project.name}, {results.magnet.name} ({results.magnet.family}), {thickness_mm:.4g} mm arcs"


def compare_text(args, design_a, design_b, comparison, fit) -> list[str]:
    a, b = comparison.a, comparison.b
    lines = [f"A: {_label(design_a, a)}",
             f"B: {_label(design_b, b)}" + (f"  (A with {args.grade_b})" if args.grade_b else ""),
             "Nominal case unless marked; B − A and B vs A = (B − A)/|A|.", ""]
    lines += table_lines(figure_rows(comparison))
    for side, results in (("A", a), ("B", b)):
        lines += ["", f"Checks of {side}:"] + [f"  {line}" for line in check_lines(results)]
    if fit is not None:
        lines += ["", f"Re-fit of B to A's {target_title(fit.target)}:", *refit_lines(fit)]
        after = difference.compare(design_a, fit.project, a, fit.results)
        lines += ["", "A against re-fitted B:", *table_lines(figure_rows(after), "A", "B re-fit")]
        lines += ["", "Checks of re-fitted B:"] + [f"  {line}" for line in check_lines(fit.results)]
    lines += ["", SHORT_CAUTION]
    return lines
