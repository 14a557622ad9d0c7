"""The ``pmdc-sizer`` command.

Exit status: 0 on success; 2 with one line on stderr for any bad file, key or value; 1 when a
computation has no solution.
"""

from __future__ import annotations

import argparse
import contextlib
import csv
import io
import json
import os
import sys
import tempfile
from pathlib import Path

from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.magnetic_circuit import MagneticCircuitError
from pmdc_sizer.core.project import ProjectError

EXIT_BAD_INPUT = 2
EXIT_NO_SOLUTION = 1


class CommandError(Exception):
    """A user-facing error: one line, no traceback."""

    def __init__(self, message: str, status: int = EXIT_BAD_INPUT):
        super().__init__(message)
        self.status = status


def load_project(path: str, overrides: list[str] | None = None):
    project = project_file.load(path)
    if overrides:
        project = project_file.apply_overrides(project, overrides)
    return project


def evaluate_project(project):
    from pmdc_sizer.core.evaluate import evaluate

    return evaluate(project)


@contextlib.contextmanager
def atomic_output(path: str | os.PathLike):
    """A temporary path beside ``path`` to write into, renamed over ``path`` only if the block succeeds.

    Nothing is left behind on failure. The file gets the usual permissions (0666 less the umask), not
    the private 0600 of a temporary file, since exports are meant to be handed on.
    """
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise CommandError(f"{path}: the folder {folder} does not exist")
    try:
        handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    except OSError as error:
        raise CommandError(f"{path}: cannot write here ({error.strerror or error})") from None
    os.close(handle)
    try:
        yield temporary
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(temporary, 0o666 & ~umask)
        os.replace(temporary, path)
    except OSError as error:
        raise CommandError(f"{path}: cannot write the file ({error.strerror or error})") from None
    finally:
        Path(temporary).unlink(missing_ok=True)


def write_text_atomically(path: str | os.PathLike, text: str) -> None:
    """Write ``text`` to ``path`` through a temporary file in the same folder; no partial file is left."""
    with atomic_output(path) as temporary:
        with open(temporary, "w", encoding="utf-8", newline="") as stream:
            stream.write(text)


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


CURVE_COLUMNS = (
    ("torque_mN_m", "torque_N_m", "mN·m"),
    ("speed_rpm", "speed_rad_per_s", "rpm"),
    ("current_A", "current_A", "A"),
    ("input_power_W", "input_power_W", "W"),
    ("output_power_W", "output_power_W", "W"),
    ("efficiency_pct", "efficiency", "%"),
    ("copper_loss_W", "copper_loss_W", "W"),
    ("brush_loss_W", "brush_loss_W", "W"),
    ("friction_loss_W", "friction_loss_W", "W"),
    ("viscous_loss_W", "viscous_loss_W", "W"),
    ("iron_loss_W", "iron_loss_W", "W"),
)


def curves_csv(results, cases=("cold", "nominal", "hot")) -> str:
    """The speed-torque tables of the chosen cases as CSV; the header names every unit."""
    from pmdc_sizer.core.units import from_si

    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["case", "winding_temperature_C", "magnet_temperature_C"] + [c[0] for c in CURVE_COLUMNS])
    for case in results.cases:
        if case.name not in cases:
            continue
        columns = [from_si(getattr(case.curve, field), unit) for _, field, unit in CURVE_COLUMNS]
        for row in zip(*columns):
            writer.writerow([case.name, f"{case.winding_temperature_C:.2f}", f"{case.magnet_temperature_C:.2f}"]
                            + [f"{v:.6g}" for v in row])
    return buffer.getvalue()


def cmd_curves(args) -> int:
    results = evaluate_project(load_project(args.file, args.set))
    cases = ("cold", "nominal", "hot") if args.case == "all" else (args.case,)
    text = curves_csv(results, cases)
    if args.output:
        write_text_atomically(args.output, text)
    else:
        sys.stdout.write(text)
    return 0


def cmd_gui(args) -> int:
    try:
        from .gui.main_window import run
    except ImportError as error:
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

    for register in _extensions():
        register(sub)
    return parser


def _extensions():
    """Subcommands that live in their own modules (compare, datasheet)."""
    registrations = []
    for module_name in ("pmdc_sizer.app.cli_compare", "pmdc_sizer.app.cli_datasheet"):
        try:
            module = __import__(module_name, fromlist=["register"])
        except ModuleNotFoundError as error:
            if error.name == module_name:
                continue
            raise
        registrations.append(module.register)
    return registrations


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
