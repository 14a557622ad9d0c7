"""``pmdc-sizer size``: search the free ranges for every design that meets the file's requirement.

::

    pmdc-sizer size FILE --free magnets.thickness_mm=2:10 --free winding.turns_per_coil=10:60
        --grades Y30BH,Y40 [--objective mass --objective cost] [--candidates N] [--seed S]
        [--set KEY=VALUE ...] [--json] [--write DIR [--replace]] [--field-check [--scheduler ADDRESS]]

Exit 0 with designs; 1 when none is feasible (the reasons in words); 2 for bad input (a range outside
what the file accepts, an unknown key, grade or objective), naming the key and the limit.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

from .cli_inputs import add_set_option, load_project
from .errors import EXIT_NO_SOLUTION, CommandError

MAX_CANDIDATES = 1_000_000  #: candidates a run may screen
MAX_SEED = 2**31 - 1
MAX_GENERATIONS = 1000  #: refinement generations a run may take


def _progress(stage: str, done: int, total: int) -> bool:
    if sys.stderr.isatty():
        print(f"\r{stage}: {done:,} of {total:,}", end="" if done < total else "\n", file=sys.stderr, flush=True)
    return True


def _spec(args, project):
    from pmdc_sizer.core.sizing import SizingSpec
    from pmdc_sizer.core.sizing_objectives import validate_objectives
    from pmdc_sizer.core.sizing_space import grade_choices, parse_free

    if args.candidates is not None and not 1 <= args.candidates <= MAX_CANDIDATES:
        raise CommandError(f"--candidates {args.candidates}: give 1 to {MAX_CANDIDATES:,}")
    if args.seed is not None and not 0 <= args.seed <= MAX_SEED:
        raise CommandError(f"--seed {args.seed}: give a whole number from 0 to {MAX_SEED:,}")
    free = [parse_free(text, project) for text in args.free]
    if args.grades:
        free.append(grade_choices([name.strip() for name in args.grades.split(",") if name.strip()], project))
    if not free:
        raise CommandError("give at least one --free KEY=LOW:HIGH (or --grades) to size over")
    keys = [variable.key for variable in free]
    repeated = sorted({key for key in keys if keys.count(key) > 1})
    if repeated:
        raise CommandError(f"--free {repeated[0]}: given more than once")
    objectives = tuple(args.objective or ("mass",))
    try:
        validate_objectives(objectives)
    except ValueError as error:
        raise CommandError(f"--{error}") from None
    if args.generations is not None and not 0 <= args.generations <= MAX_GENERATIONS:
        raise CommandError(f"--generations {args.generations}: give 0 (no refinement) to {MAX_GENERATIONS}")
    extra = {name: value for name, value in (("candidates", args.candidates), ("seed", args.seed),
                                             ("generations", args.generations)) if value is not None}
    return SizingSpec(free=tuple(free), objectives=objectives, **extra)


def design_file_names(source: str, count: int) -> list[str]:
    """The names ``--write`` gives the designs: ``SOURCE-sized-01.toml`` ... in the order returned."""
    stem = Path(source).stem
    return [f"{stem}-sized-{rank:02d}.toml" for rank in range(1, count + 1)]


def refuse_taken_names(source: str, folder: str) -> None:
    """Before a search: refuse a ``--write`` folder that already holds designs sized from ``source``, so that
    an hour's search does not end in a refusal."""
    taken = sorted(Path(folder).glob(f"{Path(source).stem}-sized-*.toml")) if Path(folder).is_dir() else []
    if taken:
        raise CommandError(f"--write {folder}: {taken[0].name} is already there ({len(taken)} such files); "
                           "nothing was written: choose another folder, remove them, or add --replace (the "
                           "previous versions are kept as .bak)")


def write_designs(result, source: str, folder: str, replace: bool) -> list[str]:
    """Write each design as a project file in ``folder``, the source file's comments kept, with a header.

    Refuses (nothing written) when a file of the same name is there and ``replace`` is not set; with it,
    each replaced file's previous version is kept as ``NAME.toml.bak``. Each file is written atomically
    and read back to the same design before it takes the name.
    """
    from pmdc_sizer.core import atomic_files
    from pmdc_sizer.core import project as project_file

    from .sizing_text import design_header

    target = Path(folder)
    if target.exists() and not target.is_dir():
        raise CommandError(f"--write {folder}: exists and is not a folder")
    names = design_file_names(source, len(result.designs))
    present = [name for name in names if (target / name).exists()]
    if present and not replace:
        raise CommandError(f"--write {folder}: {present[0]} is already there ({len(present)} of the "
                           f"{len(names)} names taken); nothing was written: choose another folder, remove them, "
                           "or add --replace (the previous versions are kept as .bak)")
    try:
        target.mkdir(parents=True, exist_ok=True)
    except OSError as error:
        raise CommandError(f"--write {folder}: cannot create the folder ({error.strerror or error})") from None
    layout = project_file.read_text(source)
    written = []
    for rank, (name, design) in enumerate(zip(names, result.designs, strict=True), start=1):
        text = design_header(result, rank, Path(source).name) + project_file.dumps(design.project, layout)
        if project_file.parse(text, name) != design.project:
            raise CommandError(f"--write {name}: the text does not read back as the design; nothing more written",
                               status=3)
        path = target / name
        try:
            atomic_files.write_bytes(path, text.encode("utf-8"), backup=replace and path.exists())
        except OSError as error:
            raise CommandError(f"--write {path}: {error}") from None
        written.append(str(path))
    return written


def _field_check(result, args):
    from pmdc_sizer.core.field import COARSE, FieldOptions
    from pmdc_sizer.core.sizing_field_check import check_designs

    options = COARSE if args.coarse_field else FieldOptions()

    def progress(finished: int, total: int) -> None:
        print(f"field check: {finished} of {total} designs", file=sys.stderr, flush=True)

    return check_designs([d.project for d in result.designs], scheduler=args.scheduler, workers=args.workers,
                         options=options, progress=progress)


def cmd_size(args) -> int:
    from pmdc_sizer.core.sizing import size

    from .sizing_text import explanation_text, result_json, summary_text

    if args.scheduler and not args.field_check:
        raise CommandError("--scheduler goes with --field-check")
    project = load_project(args.file, args.set)
    spec = _spec(args, project)
    if args.write and not args.replace:
        refuse_taken_names(args.file, args.write)
    try:
        result = size(project, spec, progress=_progress)
    except ValueError as error:  # a spec the search refuses (the free ranges, the objectives), in words
        raise CommandError(str(error)) from None
    checks = _field_check(result, args) if args.field_check and result.designs else ()
    written = write_designs(result, args.file, args.write, args.replace) if args.write and result.designs else []
    if args.json:
        print(json.dumps(result_json(result, checks, written), indent=2, ensure_ascii=False, allow_nan=False))
    else:
        print(summary_text(result, args.file, project.prices.currency, checks, written), end="")
    if not result.designs:
        reason = result.shortfalls[0].text if result.shortfalls else result.explanation
        print(f"pmdc-sizer: no feasible design: {explanation_text(reason)}", file=sys.stderr)
        return EXIT_NO_SOLUTION
    return 0


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "size", help="search free ranges for the designs that meet the file's requirement, and their trade-offs",
        description="Sample the free ranges (scrambled Sobol), screen every candidate with the batch chain, refine "
                    "towards the trade-off front of the chosen objectives, and re-evaluate each returned design: "
                    "every one passes every check at every temperature. The requirement is the file's (supply, "
                    "load, temperatures, duty, envelope), changed for the run with --set.")
    p.add_argument("file", help="project file (.toml): the requirement and the parts that stay fixed")
    p.add_argument("--free", action="append", default=[], metavar="KEY=LOW:HIGH",
                   help="a key to size, with its range in the file's unit (repeatable), e.g. "
                        "magnets.thickness_mm=2:10, winding.turns_per_coil=10:60, winding.wire=AWG 22:AWG 30")
    p.add_argument("--grades", metavar="A,B,C", help="magnet grades to consider, e.g. Y30BH,Y40,N42SH")
    p.add_argument("--objective", action="append", metavar="NAME",
                   help="mass (default), cost, efficiency, diameter, length, margin or copper_loss (repeatable)")
    p.add_argument("--candidates", type=int, metavar="N", help="candidates of the space-filling sample")
    p.add_argument("--generations", type=int, metavar="G",
                   help="generations of the refinement towards the front (default 30; 0: the sample alone)")
    p.add_argument("--seed", type=int, metavar="S", help="seed of the sample; the same seed gives the same result")
    p.add_argument("--json", action="store_true", help="one JSON object on stdout; figures SI, unit-suffixed")
    p.add_argument("--write", metavar="DIR", help="save each returned design as a project file in DIR")
    p.add_argument("--replace", action="store_true",
                   help="with --write: replace files of the same names (previous versions kept as .bak)")
    p.add_argument("--field-check", action="store_true",
                   help="solve each returned design's no-load field and mark flux per pole differing by over 3 %%")
    p.add_argument("--scheduler", metavar="ADDRESS", help="with --field-check: a running dask scheduler "
                                                          "(default: a local cluster)")
    p.add_argument("--workers", type=int, default=2, help="with --field-check: local worker processes (default 2)")
    p.add_argument("--coarse-field", action="store_true",
                   help="with --field-check: the coarse mesh (quicker, less exact)")
    add_set_option(p)
    p.set_defaults(handler=cmd_size)
