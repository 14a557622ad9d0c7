"""``pmdc-sizer tolerance``: what the production spread does to a design (the Monte Carlo study)."""

from __future__ import annotations

import json
import sys

from .cli_inputs import add_command, add_json_option, add_set_option, load_project
from .errors import CommandError
from .export_checks import check_csv
from .files import write_text_atomically

MAX_SAMPLES = 1_000_000  #: the schema's limit on tolerances.samples
MAX_SEED = 2**31 - 1  #: ... and on tolerances.seed


def _progress(done: int, total: int) -> bool:
    if sys.stderr.isatty():
        print(f"\r{done:,} of {total:,} motors", end="" if done < total else "\n", file=sys.stderr, flush=True)
    return True


def cmd_tolerance(args) -> int:
    from pmdc_sizer.core.tolerance_study import run_study

    from .tolerance_text import study_csv, study_json, summary_text

    if args.samples is not None and not 1 <= args.samples <= MAX_SAMPLES:
        raise CommandError(f"--samples {args.samples}: give 1 to {MAX_SAMPLES:,} motors")
    if args.seed is not None and not 0 <= args.seed <= MAX_SEED:
        raise CommandError(f"--seed {args.seed}: give a whole number from 0 to {MAX_SEED:,}")
    project = load_project(args.file, args.set)
    study = run_study(project, samples=args.samples, seed=args.seed, progress=_progress)
    if args.csv:
        write_text_atomically(args.csv, study_csv(study), verify=lambda written: check_csv(written, study.samples))
    if args.json:
        print(json.dumps(study_json(study), indent=2, ensure_ascii=False, allow_nan=False))
    else:
        from pmdc_sizer.core.evaluate import evaluate

        titles = {check.key: check.title for check in evaluate(project).checks}
        print(summary_text(study, args.file, titles), end="")
        if args.csv:
            print(f"wrote one row per motor to {args.csv}")
    return 0


def register(subparsers) -> None:
    p = add_command(
        subparsers, "tolerance", cmd_tolerance,
        "the spread of the key figures over the production tolerances, the yield and what drives it",
        "Draw motors from the project's [tolerances] (Br, HcJ, magnet thickness, air gap, wire, copper, "
        "brush drop, friction, supply), evaluate every one, and report each key figure's median and "
        "0.135 %% / 99.865 %% points, the share passing every check, the worst margin to the knee, and "
        "which tolerance drives each figure (first-order Sobol indices, RBD-FAST).")
    p.add_argument("file", help="project file (.toml)")
    p.add_argument("--samples", type=int, metavar="N", help="motors to draw (default: tolerances.samples, 10000)")
    p.add_argument("--seed", type=int, metavar="S", help="seed of the draw (default: tolerances.seed); the same seed "
                                                         "draws the same motors")
    add_json_option(p)
    p.add_argument("--csv", metavar="OUT.csv", help="also write one row per motor (its parts, figures, verdict), SI")
    add_set_option(p)
