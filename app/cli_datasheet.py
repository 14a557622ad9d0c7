"""``pmdc-sizer datasheet``: the design datasheet as PDF or HTML, and optionally its charts."""

from __future__ import annotations

from pathlib import Path

from .cli_inputs import add_command, add_set_option, evaluate_project, load_project
from .datasheet.options import EDITIONS, PAPER_SIZES_MM
from .errors import EXIT_NO_SOLUTION, CommandError


def cmd_datasheet(args) -> int:
    from . import datasheet

    datasheet.format_of(args.output)  # an unknown extension fails before any work
    if args.charts is not None and not Path(args.charts).is_dir():
        raise CommandError(f"{args.charts}: the chart folder does not exist")
    options = datasheet.SheetOptions(args.edition, args.paper, "US customary" if args.units == "US" else "SI")
    if args.with_field and not options.internal:
        raise CommandError("--with-field: the field solution's appendix compares the model with itself, a matter "
                           "for the internal edition: add --edition internal")
    project = load_project(args.file, args.set)
    results = evaluate_project(project)
    appendix = ()
    if args.with_field:
        from pmdc_sizer.core.field import FieldConvergenceError, FieldInputError

        try:
            appendix = datasheet.field_appendix(project, results)
        except FieldInputError as error:
            raise CommandError(f"--with-field: {error}") from None
        except FieldConvergenceError as error:
            raise CommandError(f"--with-field: {error}", status=EXIT_NO_SOLUTION) from None
    tolerance = None
    if args.with_tolerance:
        from pmdc_sizer.core.tolerance_study import run_study

        tolerance = run_study(project)
    kind = datasheet.export(project, results, args.output, appendix=appendix, options=options,
                            project_folder=Path(args.file).parent, tolerance=tolerance)
    print(f"wrote the {options.edition} edition of the {kind} datasheet ({options.paper}, {options.units}) "
          f"to {args.output}")
    if args.charts is not None:
        for path in datasheet.write_charts(results, args.charts, Path(args.output).stem):
            print(f"wrote {path}")
    return 0


def register(subparsers) -> None:
    p = add_command(
        subparsers, "datasheet", cmd_datasheet, "write the design datasheet as PDF or HTML",
        "Evaluate a project and write its datasheet; the format follows the file name (.pdf or .html).")
    p.add_argument("file", help="project file (.toml)")
    p.add_argument("-o", "--output", required=True, metavar="OUT.pdf|OUT.html", help="the datasheet file to write")
    p.add_argument("--charts", metavar="DIR",
                   help="also write the performance and magnet charts as PNG and SVG into this folder")
    p.add_argument("--edition", choices=EDITIONS, default="customer",
                   help="customer (default): ratings, constants, curves, verdicts, outline and cautions; "
                        "internal: everything, with material sources, costs, every check and the model notes")
    p.add_argument("--paper", choices=tuple(PAPER_SIZES_MM), default="A4", help="paper size (default A4)")
    p.add_argument("--units", choices=("SI", "US"), default="SI",
                   help="units on paper: SI (default) or US customary (in, oz·in, °F, lb)")
    p.add_argument("--with-field", action="store_true",
                   help="add an appendix page with the built-in field solution (no load and the worst "
                        "demagnetization case) and its agreement with the sheet's figures (internal edition)")
    p.add_argument("--with-tolerance", action="store_true",
                   help="add the tolerance column (min / typ / max of no-load speed and current, Ke, terminal "
                        "resistance and stall torque over the production spread): runs the tolerance study with the "
                        "file's tolerances.samples and tolerances.seed")
    add_set_option(p)
