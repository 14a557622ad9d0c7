"""The ``pmdc-sizer`` command.

Exit status, the same for every subcommand (the README states them):

* 0: done;
* 1: the design has no solution (one line on stderr saying why);
* 2: bad input: a file, key, value, path, output target or environment, in one line on stderr
  naming the file, the key and the limit;
* 3: an internal error, a defect of pmdc-sizer: one line on stderr saying where the crash report
  (with the traceback) was written; never a traceback on the screen.

A user-library file that cannot be used is reported once per run as a ``warning:`` line and skipped.
"""

from __future__ import annotations

import argparse
import json
import os
import sys

from pmdc_sizer.core.keys import one_line
from pmdc_sizer.core.magnetic_circuit import MagneticCircuitError
from pmdc_sizer.core.project import ProjectError

from . import cli_compare, cli_datasheet, cli_field, cli_size, cli_tolerance
from .cli_inputs import add_json_option, add_set_option, evaluate_project, load_project
from .crash import report_line
from .errors import EXIT_BAD_INPUT, EXIT_INTERNAL, EXIT_NO_SOLUTION, CommandError
from .export_checks import check_csv
from .files import clean_up_stale_temporaries, curves_csv, write_text_or_stdout

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

    loaded = library.current()
    grades = loaded.grades
    if args.json:
        report_library_problems()
        out = [
            {
                "name": g.name, "family": g.family, "remanence_T": g.remanence,
                "coercivity_HcB_A_per_m": g.coercivity_hcb, "coercivity_HcJ_A_per_m": g.coercivity_hcj,
                "energy_product_J_per_m3": g.energy_product, "recoil_permeability": g.recoil_permeability,
                "squareness": g.squareness, "remanence_temp_coeff_per_K": g.remanence_temp_coeff,
                "coercivity_temp_coeff_per_K": g.coercivity_temp_coeff,
                "max_working_temperature_C": g.max_working_temperature_C, "density_kg_per_m3": g.density,
                "source": g.source, "user_library": g.custom, "replaces_builtin": g.name in loaded.replaced,
            }
            for g in grades.values()
        ]
        print(json.dumps(out, indent=2, ensure_ascii=False))
        return 0
    header = (f"{'grade':<18}{'family':<27}{'Br T':>7}{'HcB kA/m':>10}{'HcJ kA/m':>10}{'BHmax kJ/m3':>13}"
              f"{'aBr %/K':>9}{'bHcJ %/K':>10}{'Tmax °C':>9}")
    print(header)
    print("-" * len(header))
    for g in grades.values():
        mark = "+" if g.name in loaded.replaced else "*" if g.custom else ""
        print(f"{g.name + mark:<18}{g.family:<27}{g.remanence:>7.3f}{from_si(g.coercivity_hcb, 'kA/m'):>10.0f}"
              f"{from_si(g.coercivity_hcj, 'kA/m'):>10.0f}{from_si(g.energy_product, 'kJ/m3'):>13.0f}"
              f"{from_si(g.remanence_temp_coeff, '%/K'):>9.3f}{from_si(g.coercivity_temp_coeff, '%/K'):>10.2f}"
              f"{g.max_working_temperature_C:>9.0f}")
    print("\nTypical values at 20 °C; see each grade's source note with --json. "
          "Confirm with the supplier's certified curves.")
    if any(g.custom for g in grades.values()):
        print(f"* from the user library ({library.user_library_folder()}); "
              "+ from the user library, replacing the built-in grade of that name.")
    if loaded.problems:
        print(f"\nNot loaded from the user library ({len(loaded.problems)} file(s) skipped; fix and run again):")
        for problem in loaded.problems:
            print(f"  {problem}")
    return 0


def cmd_curves(args) -> int:
    results = evaluate_project(load_project(args.file, args.set))
    cases = ("cold", "nominal", "hot") if args.case == "all" else (args.case,)
    text = curves_csv(results, cases)
    rows = sum(len(case.curve.torque_N_m) for case in results.cases if case.name in cases)
    write_text_or_stdout(args.output or "-", text, verify=lambda written: check_csv(written, rows))
    return 0


GUI_LIBRARIES = ("PySide6", "shiboken6", "pyqtgraph")


def cmd_gui(args) -> int:
    try:
        from .gui.main_window import run
    except ModuleNotFoundError as error:
        # Only a missing GUI library means "install the extra"; any other failed import is a defect to see.
        if (error.name or "").split(".")[0] not in GUI_LIBRARIES:
            raise
        raise CommandError(f"the desktop tool needs the 'gui' extra (PySide6, pyqtgraph): {error}") from None
    if args.screenshot is None and (args.page or args.size):
        raise CommandError("--page and --size go with --screenshot OUT.png")
    if args.compare_with is not None and args.file is None:
        raise CommandError("--compare-with B.toml needs a design A to compare with: give FILE first")
    size = None
    if args.size:
        from .gui.pages import parse_size

        try:
            size = parse_size(args.size)
        except ValueError as error:
            raise CommandError(str(error)) from None
    problem = display_problem(screenshot=args.screenshot is not None)
    if problem:
        raise CommandError(problem)
    if args.screenshot is None:
        return run(args.file, compare_with=args.compare_with)
    return run(args.file, screenshot=args.screenshot, page=args.page, compare_with=args.compare_with,
               **({"size": size} if size else {}))


def display_problem(screenshot: bool = False, environ=os.environ, platform: str = sys.platform) -> str:
    """Why the desktop tool cannot open a window here, in one sentence, or "" when it can try.

    Qt, left to find out for itself, prints several lines of plugin errors and aborts.
    """
    if screenshot or environ.get("QT_QPA_PLATFORM") or not platform.startswith("linux"):
        return ""
    if environ.get("DISPLAY") or environ.get("WAYLAND_DISPLAY"):
        return ""
    return ("no display to open the desktop tool on (neither DISPLAY nor WAYLAND_DISPLAY is set); on this "
            "machine use the subcommands (pmdc-sizer evaluate FILE, datasheet, curves), or set "
            "QT_QPA_PLATFORM=offscreen")


class OneLineParser(argparse.ArgumentParser):
    """argparse, but a usage error is one line (exit 2) like every other bad input; ``--help`` shows the rest."""

    def error(self, message: str):  # type: ignore[override]
        self.exit(EXIT_BAD_INPUT, f"{self.prog}: error: {one_line(message)} (see {self.prog} --help)\n")


def build_parser() -> argparse.ArgumentParser:
    parser = OneLineParser(
        prog="pmdc-sizer",
        description="Size brushed permanent-magnet DC motors: load line, constants, curves, demagnetization, thermal.",
    )
    sub = parser.add_subparsers(dest="command")

    p = sub.add_parser("evaluate", help="evaluate a project file and print a summary or JSON")
    p.add_argument("file")
    add_json_option(p)
    add_set_option(p)
    p.set_defaults(handler=cmd_evaluate)

    p = sub.add_parser("grades", help="list the magnet library")
    add_json_option(p, "one JSON object per grade, SI")
    p.set_defaults(handler=cmd_grades)

    p = sub.add_parser("curves", help="the speed-torque table")
    p.add_argument("file")
    p.add_argument("--csv", action="store_true", help="CSV (the only format; accepted for clarity)")
    p.add_argument("-o", "--output", help="write to this file instead of stdout ('-' is stdout)")
    p.add_argument("--case", choices=("all", "cold", "nominal", "hot"), default="all")
    add_set_option(p)
    p.set_defaults(handler=cmd_curves)

    p = sub.add_parser("gui", help="open the desktop tool (the default)")
    p.add_argument("file", nargs="?")
    p.add_argument("--screenshot", metavar="OUT.png", help="render the main window offscreen to a PNG and exit")
    from .gui.pages import PAGE_TITLES

    p.add_argument("--page", choices=tuple(PAGE_TITLES), metavar="NAME",
                   help="with --screenshot: the page to show, one of "
                        + ", ".join(f"{name} ({title})" for name, title in PAGE_TITLES.items())
                        + "; the field page solves its case first")
    p.add_argument("--size", metavar="WxH", help="with --screenshot: the window size in pixels, e.g. 1366x768 "
                                                 "(default 1600x1000)")
    p.add_argument("--compare-with", metavar="B.toml",
                   help="open this second project file as design B on the comparison page")
    p.set_defaults(handler=cmd_gui)

    # Subcommands that live in their own modules.
    cli_compare.register(sub)
    cli_datasheet.register(sub)
    cli_field.register(sub)
    cli_size.register(sub)
    cli_tolerance.register(sub)
    return parser


class OutputError(CommandError):
    """Standard output cannot be written (a full disk under ``> file``, ``/dev/full``, a closed terminal)."""


class _GuardedOutput:
    """Standard output whose write failures become one line and exit 2 rather than a traceback."""

    def __init__(self, stream):
        self._stream = stream

    def write(self, text: str) -> int:
        try:
            return self._stream.write(text)
        except BrokenPipeError:
            raise
        except OSError as error:
            raise OutputError(f"standard output: cannot write ({error.strerror or error})") from None

    def flush(self) -> None:
        try:
            self._stream.flush()
        except BrokenPipeError:
            raise
        except OSError as error:
            raise OutputError(f"standard output: cannot write ({error.strerror or error})") from None

    def __getattr__(self, name: str):
        return getattr(self._stream, name)


def _discard_pending_output(stream) -> None:
    """Point the real standard output at the null device, so the interpreter's last flush cannot fail."""
    try:
        if stream.fileno() == 1:
            os.dup2(os.open(os.devnull, os.O_WRONLY), 1)
    except (OSError, ValueError, AttributeError):
        return


def report_library_problems() -> None:
    """Each user-library file that was skipped, once, as a warning line on stderr."""
    from pmdc_sizer.core import library

    for problem in library.problems():
        print(f"pmdc-sizer: warning: user library file skipped: {one_line(str(problem))}", file=sys.stderr)


def main(argv: list[str] | None = None) -> int:
    """Run the command; returns the exit status (see the module's docstring). Never raises but SystemExit."""
    argv = sys.argv[1:] if argv is None else argv
    parser = build_parser()
    if not argv:
        argv = ["gui"]
    args = parser.parse_args(argv)
    if not getattr(args, "handler", None):
        parser.print_help()
        return EXIT_BAD_INPUT
    real_stdout = sys.stdout
    sys.stdout = _GuardedOutput(real_stdout)  # type: ignore[assignment]
    try:
        clean_up_stale_temporaries()
        if args.command not in ("gui", "grades"):
            report_library_problems()
        status = args.handler(args)
        sys.stdout.flush()
        return status
    except ProjectError as error:
        print(f"pmdc-sizer: error: {one_line(str(error))}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except CommandError as error:
        if isinstance(error, OutputError):
            _discard_pending_output(real_stdout)
        print(f"pmdc-sizer: error: {one_line(str(error))}", file=sys.stderr)
        return error.status
    except MagneticCircuitError as error:
        print(f"pmdc-sizer: error: {one_line(str(error))}", file=sys.stderr)
        return EXIT_NO_SOLUTION
    except BrokenPipeError:  # the reader stopped reading (``| head``): what it read was fine
        _discard_pending_output(real_stdout)
        return 0
    except KeyboardInterrupt:
        print("pmdc-sizer: interrupted", file=sys.stderr)
        return 130
    except Exception as error:  # noqa: BLE001 - the top-level guard: a defect gets a report, not a traceback
        print(f"pmdc-sizer: error: {report_line(error, f'pmdc-sizer {args.command}')}", file=sys.stderr)
        return EXIT_INTERNAL
    finally:
        sys.stdout = real_stdout


if __name__ == "__main__":
    sys.exit(main())
