"""A sizing result in words and tables: the terminal's table, the JSON, and the header of a written design.

Titles and units come from :mod:`app.figures` (:data:`~app.figures.SIZING_FIGURES`, the columns from
:data:`~app.figures.SIZING_COLUMN_HEADINGS`); the free variables are shown in their file units
(:func:`core.keys.key_spec`) under their field labels (:mod:`app.field_labels`), and the core's key-bearing
explanation is worded with those labels, each key in parentheses at its first mention.
"""

from __future__ import annotations

import datetime
import math
import textwrap
from collections.abc import Sequence
from typing import Any

from pmdc_sizer.core.keys import key_spec
from pmdc_sizer.core.sizing_objectives import OBJECTIVES

from .field_labels import label_for, worded_keys
from .figures import SIZING_COLUMN_HEADINGS, SIZING_FIGURES
from .formatting import significant


def _number(value: Any) -> Any:
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def free_text(variable) -> str:
    """One free variable as the command line gave it: ``magnets.thickness_mm=2:10``, ``magnets.grade=Y30BH,Y40``."""
    if variable.choices:
        return f"{variable.key}={','.join(variable.choices)}"
    return f"{variable.key}={variable.low:g}:{variable.high:g}"


def value_text(key: str, value: object) -> str:
    """A free value in its file unit, e.g. "4.73" (the unit is in the column's header)."""
    if isinstance(value, str):
        return value
    if isinstance(value, int):
        return str(value)
    return significant(float(value), 3)  # type: ignore[arg-type]


def _column_label(key: str) -> str:
    unit = key_spec(key).unit
    return label_for(key) + (f" [{unit}]" if unit and unit != "1" else "")


def explanation_text(text: str) -> str:
    """The search's explanation (or a shortfall) for the terminal: each key worded by its field label, the
    key the user typed in parentheses at its first mention ("magnet thickness (magnets.thickness_mm) 9.6 mm")."""
    return worded_keys(text, show_keys=True)


def _figure_label(name: str, currency: str) -> str:
    shown, heading = SIZING_FIGURES[name], SIZING_COLUMN_HEADINGS[name]
    unit = currency if shown.unit == "currency" else shown.unit
    return f"{heading} [{unit}]" if unit != "1" else heading


def _figure_text(name: str, value: float) -> str:
    shown = SIZING_FIGURES[name]
    if shown.unit == "currency":
        return significant(value, shown.digits) if math.isfinite(value) else "–"
    return shown.number(value)


def column_legend(currency: str, keys: Sequence[str] = ()) -> str:
    """What each column of :func:`designs_table` is: the free keys' columns by the key the command line
    took, the figures' in the words of :data:`app.figures.FIGURES`."""
    free = [f"{_column_label(key)}: {key}" for key in keys]
    figures = [f"{_figure_label(name, currency)}: {shown.title}" + (", hot" if name.startswith("hot.") else "")
               for name, shown in ((n, SIZING_FIGURES[n]) for n in SIZING_COLUMN_HEADINGS)]
    return "; ".join([*free, *figures])


def designs_table(result, currency: str) -> str:
    """The returned designs as a table, one row per design: its free values, key figures, front and best marks.

    Parameters
    ----------
    result : SizingResult
        What :func:`core.sizing.size` returned.
    currency : str
        The project's currency, for the cost column.

    Returns
    -------
    str
        Lines of text, a header row first; columns in file and display units.
    """
    keys = [v.key for v in result.spec.free]
    names = [name for name in SIZING_COLUMN_HEADINGS if any(name in d.figures for d in result.designs)]
    header = ["#", *(_column_label(k) for k in keys), *(_figure_label(n, currency) for n in names), "front",
              "best for"]
    rows = []
    for rank, design in enumerate(result.designs, start=1):
        rows.append([str(rank), *(value_text(k, design.values[k]) for k in keys),
                     *(_figure_text(n, design.figures.get(n, float("nan"))) for n in names),
                     "yes" if design.pareto else "", ", ".join(design.best_for)])
    widths = [max(len(row[i]) for row in [header, *rows]) for i in range(len(header))]
    lines = ["  ".join(cell.rjust(w) if i and i < len(header) - 2 else cell.ljust(w)
                       for i, (cell, w) in enumerate(zip(row, widths, strict=True))).rstrip()
             for row in [header, *rows]]
    lines.insert(1, "-" * len(lines[0]))
    return "\n".join(lines) + "\n" + textwrap.fill(column_legend(currency, keys), width=110)


def summary_text(result, source: str, currency: str, field_checks: Sequence = (),
                 written: Sequence[str] = ()) -> str:
    """What the terminal shows after a search: how it went, the designs, the field check, the files written.

    Parameters
    ----------
    result : SizingResult
        The search's result.
    source : str
        The project file the search started from.
    currency : str
        The project's currency.
    field_checks : sequence of FluxCheck, optional
        The field check of the designs, in their order.
    written : sequence of str, optional
        The files written, in the designs' order.

    Returns
    -------
    str
        The text, ending with a newline.
    """
    objectives = ", ".join(OBJECTIVES[name].label.lower() for name in result.spec.objectives)
    lines = [f"{source}: sized over {', '.join(free_text(v) for v in result.spec.free)}",
             f"{result.candidates_evaluated:,} candidates evaluated, {result.feasible_count:,} pass every check "
             f"at every temperature ({result.seconds:.1f} s, seed {result.seed}); objectives: {objectives}."]
    if not result.designs:
        lines += ["", "No feasible design.",
                  textwrap.fill(explanation_text(result.explanation), width=100, break_on_hyphens=False)]
        return "\n".join(lines) + "\n"
    front = sum(d.pareto for d in result.designs)
    count = f"{len(result.designs)} design" + ("s" if len(result.designs) > 1 else "")
    lines += [f"{count} returned: {front} on the trade-off front, plus the best for each "
              "objective alone; each re-evaluated and passing every check.", "", designs_table(result, currency)]
    if field_checks:
        lines += ["", "Field check (no-load flux per pole, fast model against the 2-D field solution):"]
        for check in field_checks:
            if check.error:
                lines.append(f"  #{check.label}: not verified ({check.error})")
                continue
            mark = "  <- differs by more than 3 %" if check.flagged else ""
            lines.append(f"  #{check.label}: fast {1e3 * check.fast_Wb:.4g} mWb, field {1e3 * check.field_Wb:.4g} mWb, "
                         f"{100 * check.difference:+.1f} %{mark}")
    if written:
        lines += ["", f"wrote {len(written)} project files: {', '.join(written)}"]
    return "\n".join(lines) + "\n"


def result_json(result, field_checks: Sequence = (), written: Sequence[str] = ()) -> dict[str, Any]:
    """The search's result as JSON-ready data (SI figures, unit-suffixed names; values in file units).

    Parameters
    ----------
    result : SizingResult
        The search's result.
    field_checks : sequence of FluxCheck, optional
        The field check, one per design.
    written : sequence of str, optional
        The files written, one per design.

    Returns
    -------
    dict
        ``designs`` (``values``, ``figures``, ``objectives``, ``pareto``, ``best_for``, and ``field_check``
        / ``file`` when made), ``candidates_evaluated``, ``feasible_count``, ``seconds``, ``seed``,
        ``objectives``, ``free``; ``explanation`` and ``shortfalls`` when nothing is feasible.
    """
    designs = []
    for i, design in enumerate(result.designs):
        entry: dict[str, Any] = {
            "rank": i + 1,
            "values": dict(design.values),
            "figures": {name: _number(float(value)) for name, value in design.figures.items()},
            "objectives": {objective_key(name): _number(float(value)) for name, value in design.objectives.items()},
            "pareto": bool(design.pareto),
            "best_for": list(design.best_for),
        }
        if field_checks:
            check = field_checks[i]
            entry["field_check"] = {"fast_flux_per_pole_Wb": _number(check.fast_Wb),
                                    "field_flux_per_pole_Wb": _number(check.field_Wb),
                                    "difference": _number(check.difference), "flagged": check.flagged,
                                    "error": check.error or None}
        if written:
            entry["file"] = written[i]
        designs.append(entry)
    out: dict[str, Any] = {
        "designs": designs,
        "candidates_evaluated": int(result.candidates_evaluated),
        "feasible_count": int(result.feasible_count),
        "seconds": round(float(result.seconds), 3),
        "seed": int(result.seed),
        "objectives": list(result.spec.objectives),
        "free": [free_text(v) for v in result.spec.free],
    }
    if not result.designs:
        out["explanation"] = explanation_text(result.explanation)
        out["shortfalls"] = [{"requirement": s.requirement, "text": explanation_text(s.text),
                              "closest_share": _number(float(s.closest_share))} for s in result.shortfalls]
    return out


def objective_key(name: str) -> str:
    """An objective's JSON key with its SI unit suffix, as the batch figures spell units: ``mass_kg``,
    ``margin_A_per_m``, ``efficiency`` (a pure number), ``cost`` (the project's currency)."""
    unit = OBJECTIVES[name].unit
    return name if unit in ("", "1") else f"{name}_{unit.replace('/', '_per_')}"


def design_header(result, rank: int, source: str, when: datetime.datetime | None = None) -> str:
    """The comment block at the top of a design file written by ``size --write``: how the design was found.

    Parameters
    ----------
    result : SizingResult
        The search.
    rank : int
        The design's place in ``result.designs``, from 1.
    source : str
        The file the search started from.
    when : datetime, optional
        The time stamped (now, UTC, if not given).

    Returns
    -------
    str
        ``#`` lines ending with a blank line.
    """
    design = result.designs[rank - 1]
    when = when or datetime.datetime.now(datetime.UTC)
    spec = result.spec
    place = "on the trade-off front" if design.pareto else "not on the front"
    best = f"; best for {', '.join(design.best_for)}" if design.best_for else ""
    lines = [
        f"Sized by pmdc-sizer size from {source} on {when:%Y-%m-%d %H:%M} UTC.",
        f"Design {rank} of {len(result.designs)} returned ({place}{best}).",
        f"Free: {'; '.join(free_text(v) for v in spec.free)}.",
        f"Objectives: {', '.join(spec.objectives)}; {result.candidates_evaluated:,} candidates, seed {result.seed}, "
        f"{result.feasible_count:,} feasible.",
        "Values found: " + ", ".join(f"{k} = {value_text(k, v)}" for k, v in design.values.items()) + ".",
        "Everything else is as in the source file. Check it as any design before use.",
    ]
    return "".join(f"# {line}\n" for line in lines) + "\n"


__all__ = ["column_legend", "design_header", "designs_table", "explanation_text", "free_text", "objective_key",
           "result_json", "summary_text", "value_text"]
