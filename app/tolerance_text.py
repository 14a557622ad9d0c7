"""The tolerance study in words and tables: the terminal's summary, JSON, the per-motor CSV, its stated basis.

The command line, the desktop tool's tolerance page and the datasheet's tolerance column read from
here, so the three state the same basis in the same words. Titles and units come from
:mod:`app.figures` (:data:`~app.figures.TOLERANCE_FIGURES`).
"""

from __future__ import annotations

import csv
import io

import numpy as np

from pmdc_sizer.core.keys import key_spec
from pmdc_sizer.core.tolerance_study import HIGH_QUANTILE, LOW_QUANTILE, ToleranceStudy
from pmdc_sizer.core.tolerances import Spread
from pmdc_sizer.core.units import from_si

from .figures import TOLERANCE_FIGURES, figure
from .formatting import significant

ROUGH_BELOW = 2000  #: fewer motors than this put only a few beyond each ±3σ point, and the shares are noisy
MAX_DRIVERS_SHOWN = 3  #: tolerances named per figure in the summary (all of them are in the JSON)


def spread_text(spread: Spread, wire_from_standard: bool = False) -> str:
    """One tolerance as the file states it: "±2 % (normal, ±3σ)", "±0.005 mm (uniform)"."""
    if spread.relative:
        amount = f"±{significant(100.0 * spread.plus_minus, 3)} %"
    else:
        unit = key_spec(spread.key).unit
        amount = f"±{significant(from_si(spread.plus_minus, unit), 3)} {unit}"
    shape = "normal, ±3σ" if spread.distribution == "normal" else "uniform"
    source = ", IEC 60317-0-1" if wire_from_standard else ""
    return f"{amount} ({shape}{source})"


def check_names(keys, titles: dict[str, str] | None = None) -> str:
    """Check keys as words: their titles from an evaluated design's checks where given ("Rated load")."""
    titles = titles or {}
    return ", ".join(titles.get(key, key.replace("_", " ")) for key in keys)


def basis_text(study: ToleranceStudy) -> str:
    """What the min and max of a tolerance column mean, in one sentence."""
    return (f"min and max are the {100 * LOW_QUANTILE:.3g} % and {100 * HIGH_QUANTILE:.5g} % points (±3σ) of "
            f"{study.samples:,} motors drawn from the stated spreads (seed {study.seed}); typ is their median")


def figure_row(name: str, study: ToleranceStudy, unit: str | None = None) -> tuple[str, str, str, str, str]:
    """(title with unit, min, typ, max, design as drawn) of one key figure, as shown."""
    shown = figure(TOLERANCE_FIGURES[name])
    spread = study.figures[name]
    return (shown.label(unit), shown.number(spread.low, unit), shown.number(spread.typical, unit),
            shown.number(spread.high, unit), shown.number(spread.nominal, unit))


def summary_text(study: ToleranceStudy, source: str = "", titles: dict[str, str] | None = None) -> str:
    """The study as the terminal shows it: the spreads, each key figure's points and drivers, the yield.

    ``titles``: check key → title, from the design's evaluated checks, to name the failing checks.
    """
    lines = [f"Tolerance study{f' of {source}' if source else ''}: {study.samples:,} motors, seed {study.seed}"]
    lines.append("Spreads:")
    for spread in study.spreads:
        if spread.plus_minus > 0.0:
            lines.append(f"  {spread.label:<20}{spread_text(spread)}")
    zero = [s.label for s in study.spreads if s.plus_minus == 0.0]
    if zero:
        lines.append(f"  held at the design's value: {', '.join(zero)}")
    rows = [figure_row(name, study) for name in TOLERANCE_FIGURES]
    width = max(len(r[0]) for r in rows) + 2
    lines.append("")
    lines.append(f"{'figure':<{width}}{'min':>10}{'typ':>10}{'max':>10}{'as drawn':>10}   "
                 "driven by (share of variance)")
    for name, row in zip(TOLERANCE_FIGURES, rows, strict=True):
        drivers = ", ".join(f"{d.label} {100 * d.share:.0f} %" for d in study.drivers[name][:MAX_DRIVERS_SHOWN]
                            if d.share >= 0.005)
        lines.append(f"{row[0]:<{width}}{row[1]:>10}{row[2]:>10}{row[3]:>10}{row[4]:>10}   {drivers or '–'}")
    lines.append("")
    lines.append(f"({basis_text(study)})")
    if study.samples < ROUGH_BELOW:
        lines.append(f"(only {study.samples:,} motors: the ±3σ points and the shares are rough; the study's "
                     f"default is 10,000)")
    lines.append(f"Yield (motors passing every check): {100 * study.yield_fraction:.4g} %")
    if study.nominal_failing_checks:
        lines.append(f"The design as drawn fails already: {check_names(study.nominal_failing_checks, titles)}")
    margin = figure("demagnetization.worst_margin_A_per_m")
    lines.append(f"Worst margin to the knee over every motor and case: "
                 f"{margin.text(study.worst_demagnetization_margin_A_per_m)}")
    if study.failing_checks:
        ranked = sorted(study.failing_checks.items(), key=lambda item: -item[1])
        lines.append("Motors failing each check: " + ", ".join(
            f"{check_names((key,), titles)} {count:,}" for key, count in ranked))
    lines.append(f"Motors whose chain failed: {study.failed:,}")
    for message, count in study.failure_messages.items():
        lines.append(f"  {count:,} × {message}")
    return "\n".join(lines) + "\n"


def _finite_or_none(value: float) -> float | None:
    return float(value) if np.isfinite(value) else None


def study_json(study: ToleranceStudy) -> dict:
    """The study as JSON-ready data; SI throughout, keys carry their unit suffixes."""
    return {
        "samples": study.samples,
        "seed": study.seed,
        "basis": basis_text(study),
        "tolerances": [{"tolerance": s.key, "what": s.label, "plus_minus": s.plus_minus,
                        "plus_minus_unit": "1" if s.relative else s.unit, "distribution": s.distribution}
                       for s in study.spreads],
        "figures": {name: {"typical": _finite_or_none(f.typical), "low": _finite_or_none(f.low),
                           "high": _finite_or_none(f.high), "nominal": _finite_or_none(f.nominal)}
                    for name, f in study.figures.items()},
        "yield_fraction": study.yield_fraction,
        "worst_demagnetization_margin_A_per_m": _finite_or_none(study.worst_demagnetization_margin_A_per_m),
        "drivers": {name: [{"tolerance": d.tolerance, "share": d.share} for d in drivers]
                    for name, drivers in study.drivers.items()},
        "failed_samples": study.failed,
        "failure_messages": study.failure_messages,
        "failing_checks": study.failing_checks,
        "nominal_failing_checks": list(study.nominal_failing_checks),
    }


def study_csv(study: ToleranceStudy) -> str:
    """One row per drawn motor: what it was built from, its key figures and its verdict; SI, units in the header."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    parts = list(study.parts)
    figures = list(study.figures)
    writer.writerow(["motor", *parts, *figures, "passes_all_checks", "chain_failure"])
    for i in range(study.samples):
        row = [str(i + 1)]
        row += [f"{study.parts[name][i]:.9g}" for name in parts]
        row += [f"{study.figures[name].values[i]:.9g}" for name in figures]
        row += ["1" if study.passes[i] else "0", study.failure_message[i]]
        writer.writerow(row)
    return buffer.getvalue()


__all__ = ["basis_text", "check_names", "figure_row", "spread_text", "study_csv", "study_json", "summary_text"]
