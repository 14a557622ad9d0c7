"""A comparison for people: the key-figure rows, each side's checks and the re-fit in words.

The terminal (``pmdc-sizer compare``) and the desktop comparison view show the same rows, so both read
them from here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from pmdc_sizer.core.difference import Comparison
from pmdc_sizer.core.keys import key_spec
from pmdc_sizer.core.refit import TARGETS, Refit
from pmdc_sizer.core.units import from_si

from .figures import COMPARE_KEYS, STATUSES, figure, shown_value, title_of
from .formatting import significant, unit_label
from .refit_text import refit_message, refit_notes

#: A and B are shown to one figure more than elsewhere, so that small differences between them show.
COMPARE_DIGITS = 4


@dataclass(frozen=True)
class FigureRow:
    title: str  #: with its unit, e.g. "Stall torque [mN·m]"
    a: str
    b: str
    difference: str  #: B − A in the row's unit ("pt" for per-cent figures)
    percent: str  #: (B − A)/|A|, or "–" where it means nothing


def _signed(value: float, digits: int = 3) -> str:
    text = significant(value, digits)
    return text if text.startswith(("-", "–")) or text == "0" else "+" + text


def _difference(difference: float, scale: float) -> str:
    """B − A to the last figure A and B are shown with: what is below it is solver noise."""
    if scale > 0:
        difference = round(difference, 3 - math.floor(math.log10(scale)))
    return "0" if difference == 0 else _signed(difference)


def _percent(fraction: float | None, a: float, b: float) -> str:
    # A per cent across a change of sign (a margin that turns negative) would only mislead.
    if fraction is None or a * b < 0:
        return "–"
    return "0 %" if abs(fraction) < 5e-5 else f"{_signed(100.0 * fraction, 2)} %"


def figure_rows(comparison: Comparison) -> tuple[FigureRow, ...]:
    """One row per figure of :data:`app.figures.COMPARE_KEYS`, in engineering units."""
    currency = comparison.a.cost.currency
    if comparison.b.cost.currency != currency:
        currency = f"A {currency}, B {comparison.b.cost.currency}"
    rows = []
    for key in COMPARE_KEYS:
        item = comparison.figure(key)
        unit = figure(key).unit
        if unit == "currency":
            unit = currency
        a, b = shown_value(item.a, unit), shown_value(item.b, unit)
        difference = _difference(b - a, max(abs(a), abs(b)))
        rows.append(FigureRow(
            title=f"{title_of(key)} [{unit_label(unit)}]",
            a=significant(a, COMPARE_DIGITS),
            b=significant(b, COMPARE_DIGITS),
            difference=difference + (" pt" if unit == "%" and difference != "0" else ""),
            percent=_percent(item.fraction, item.a, item.b),
        ))
    return tuple(rows)


def table_lines(rows: tuple[FigureRow, ...], heading_a: str = "A", heading_b: str = "B") -> list[str]:
    width = max(len(r.title) for r in rows) + 2
    lines = [f"{'':<{width}}{heading_a:>12}{heading_b:>12}{'B − A':>12}{'B vs A':>10}"]
    lines.append("-" * len(lines[0]))
    lines += [f"{r.title:<{width}}{r.a:>12}{r.b:>12}{r.difference:>12}{r.percent:>10}" for r in rows]
    return lines


def check_lines(results) -> list[str]:
    """Every check that did not pass, worst first; one line saying so when all pass."""
    order = {"fail": 0, "warning": 1, "pass": 2}
    open_checks = sorted((c for c in results.checks if c.status != "pass"), key=lambda c: order[c.status])
    passed = sum(1 for c in results.checks if c.status == "pass")
    if not open_checks:
        return [f"all {passed} checks pass"]
    return [f"{STATUSES[c.status].tag:<4}  {c.sentence}" for c in open_checks] + [f"({passed} other checks pass)"]


def parameter_text(value, unit: str) -> str:
    """An input value as the file holds it: whole turns as whole numbers, lengths to 4 figures."""
    return f"{value}" if not unit else f"{float(value):.4g} {unit}"


def refit_lines(fit: Refit) -> list[str]:
    """The re-fit in sentences: what changed, how close it came, and what it costs against A."""
    message = refit_message(fit)
    lines = [message if fit.reached else f"Out of reach: {message}"]
    for change in fit.changes:
        unit = key_spec(change.key).unit
        why = f" ({change.reason})" if change.reason else ""
        lines.append(f"  {change.key}: {parameter_text(change.before, unit)} → "
                     f"{parameter_text(change.after, unit)}{why}")
    lines += [f"  {note}" for note in refit_notes(fit)]
    target = figure(TARGETS[fit.target].figure_key)

    def shown(value_si: float) -> str:
        return target.number(value_si, digits=COMPARE_DIGITS)

    lines.append(f"  {target.title}: A {shown(fit.target_value)}, B before {shown(fit.figure_before)}, B after "
                 f"{shown(fit.figure_after)} {unit_label(target.unit)} "
                 f"(target error {_percent(fit.target_error_fraction, 1.0, 1.0)})")
    mass = figure("mass.magnet_kg")
    lines.append(f"  Against A, re-fitted B has {_signed(from_si(fit.magnet_mass_difference_kg, mass.unit))} "
                 f"{mass.unit} of magnet, "
                 f"{_signed(fit.magnet_cost_difference)} {fit.currency} of magnet material and "
                 f"{_signed(fit.material_cost_difference)} {fit.currency} of all materials.")
    lines += [f"  Now fails: {sentence}" for sentence in fit.new_failures]
    return lines
