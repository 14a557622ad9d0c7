"""The ``pmdc-sizer`` command.

Exit status: 0 on success; 2 with one line on stderr for any bad file, key or value; 1 when a
computation has no solution.
"""

from __future__ import annotations

import argparse
import json
import sys

from pmdc_sizer.core.magnetic_circuit import MagneticCircuitError
from pmdc_sizer.core.project import ProjectError

from . import cli_compare, cli_datasheet
from .cli_inputs import evaluate_project, load_project
from .errors import EXIT_BAD_INPUT, EXIT_NO_SOLUTION, CommandError
from .files import curves_csv, write_text_atomically

# --------------------------------------------------------------------------------------------
# Subcommands


def cmd_evaluate(args) -> int:
    from .results_json import results_json
    from .summary import summary_text

    results = evaluate_project(load_project(args.file, args.set))
    if args.json:
        print(json.dumps(results_json(results), indent=2, ensure_ascii=False))
    else:
        print(summary_text(results))
    return 0


def cmd_grades(args) -> int:
    from pmdc_sizer.core import library
    from pmdc_sizer.core.units import from_si

    grades = library.magnet_grades()
    if args.json:
        out = [
            {
                "name": g.name, "family": g.family, "remanence_T": g.remanence,
                "coercivity_HcB_A_per_m": g.coercivity_hcb, "coercivity_HcJ_A_per_m": g.coercivity_hcj,
                "energy_product_J_per_m3": g.energy_product, "recoil_permeability": g.recoil_permeability,
                "squareness": g.squareness, "remanence_temp_coeff_per_K": g.remanence_temp_coeff,
                "coercivity_temp_coeff_per_K": g.coercivity_temp_coeff,
                "max_working_temperature_C": g.max_working_temperature_C, "density_kg_per_m3": g.density,
                "source": g.source, "user_library": g.custom,
            }
            for g in grades.values()
        ]
        print(json.dumps(out, indent=2, ensure_ascii=False))
        return 0
    header = f"{'grade':<18}{'family':<27}{'Br T':>7}{'HcB kA/m':>10}{'HcJ kA/m':>10}{'BHmax kJ/m3':>13}{'aBr %/K':>9}{'bHcJ %/K':>10}{'Tmax °C':>9}"
    print(header)
    print("-" * len(header))
    for g in grades.values():
        print(f"{g.name:<18}{g.family:<27}{g.remanence:>7.3f}{from_si(g.coercivity_hcb, 'kA/m'):>10.0f}"
              f"{from_si(g.coercivity_hcj, 'kA/m'):>10.0f}{from_si(g.energy_product, 'kJ/m3'):>13.0f}"
              f"{from_si(g.remanence_temp_coeff, '%/K'):>9.3f}{from_si(g.coercivity_temp_coeff, '%/K'):>10.2f}"
              f"{g.max_working_temperature_C:>9.0f}")
    print("\nTypical values at 20 °C; see each grade's source note with --json. Confirm with the supplier's certified curves.")
    return 0


def cmd_curves(args) -> int:
    results = evaluate_project(load_project(args.file, args.set))
    cases = ("cold", "nominal", "hot") if args.case == "all" else (args.case,)
    text = curves_csv(results, cases)
    if args.output:
        write_text_atomically(args.output, text)
    else:
        sys.stdout.write(text)
    return 0


GUI_LIBRARIES = ("PySide6", "shiboken6", "pyqtgraph")


def cmd_gui(args) -> int:
    try:
        from .gui.main_window import run
    except ModuleNotFoundError as error:
        # Only a missing GUI library means "install the extra"; any other failed import is a defect to see.
        if (error.name or "").split(".")[0] not in GUI_LIBRARIES:
            raise
        raise CommandError(f"the desktop tool needs the 'gui' extra (PySide6, pyqtgraph): {error}", status=1) from None
    return run(args.file, screenshot=args.screenshot)


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="pmdc-sizer",
        description="Size brushed permanent-magnet DC motors: load line, constants, curves, demagnetization, thermal.",
    )
    sub = parser.add_subparsers(dest="command")

    p = sub.add_parser("evaluate", help="evaluate a project file and print a summary or JSON")
    p.add_argument("file")
    p.add_argument("--json", action="store_true", help="one JSON object on stdout; keys carry SI unit suffixes")
    p.add_argument("--set", action="append", default=[], metavar="KEY=VALUE",
                   help="override a key for this run, e.g. --set magnets.thickness_mm=4.5 (repeatable)")
    p.set_defaults(handler=cmd_evaluate)

    p = sub.add_parser("grades", help="list the magnet library")
    p.add_argument("--json", action="store_true")
    p.set_defaults(handler=cmd_grades)

    p = sub.add_parser("curves", help="the speed-torque table")
    p.add_argument("file")
    p.add_argument("--csv", action="store_true", help="CSV (the only format; accepted for clarity)")
    p.add_argument("-o", "--output", help="write to this file instead of stdout")
    p.add_argument("--case", choices=("all", "cold", "nominal", "hot"), default="all")
    p.add_argument("--set", action="append", default=[], metavar="KEY=VALUE")
    p.set_defaults(handler=cmd_curves)

    p = sub.add_parser("gui", help="open the desktop tool (the default)")
    p.add_argument("file", nargs="?")
    p.add_argument("--screenshot", metavar="OUT.png", help="render the main window offscreen to a PNG and exit")
    p.set_defaults(handler=cmd_gui)

    # Subcommands that live in their own modules.
    cli_compare.register(sub)
    cli_datasheet.register(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    parser = build_parser()
    if not argv:
        argv = ["gui"]
    args = parser.parse_args(argv)
    if not getattr(args, "handler", None):
        parser.print_help()
        return EXIT_BAD_INPUT
    try:
        return args.handler(args)
    except ProjectError as error:
        print(f"pmdc-sizer: error: {error}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except CommandError as error:
        print(f"pmdc-sizer: error: {error}", file=sys.stderr)
        return error.status
    except MagneticCircuitError as error:
        print(f"pmdc-sizer: error: {error}", file=sys.stderr)
        return EXIT_NO_SOLUTION
    except BrokenPipeError:
        return 0


if __name__ == "__main__":
    sys.exit(main())
