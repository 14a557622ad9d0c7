"""A comparison for people: the key-figure rows, each side's checks and the re-fit in words.

The terminal (``pmdc-sizer compare``) and the desktop comparison view show the same rows, so both read
them from here.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

from pmdc_sizer.core.difference import Comparison
from pmdc_sizer.core.keys import key_spec
from pmdc_sizer.core.refit import TARGETS, Refit
from pmdc_sizer.core.units import from_si, to_si

from .figures import COMPARE_KEYS, STATUSES, figure, shown_value, title_of, unit_for, units_of_design
from .formatting import check_sentence, significant, unit_label
from .refit_text import refit_message, refit_notes


def _same_unit(unit: str) -> str:
    return unit


#: Maps a figure's own unit to the unit a view shows it in (the display or paper units); SI by default.
UnitOf = Callable[[str], str]


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


def _difference(difference: float, scale: float, digits: int) -> str:
    """B − A to one figure past the last A and B are shown with: below that it is solver noise."""
    if scale > 0:
        difference = round(difference, digits - math.floor(math.log10(scale)))
    return "0" if difference == 0 else _signed(difference)


def _percent(fraction: float | None, a: float, b: float) -> str:
    # A per cent across a change of sign (a margin that turns negative) would only mislead.
    if fraction is None or a * b < 0:
        return "–"
    return "0 %" if abs(fraction) < 5e-5 else f"{_signed(100.0 * fraction, 2)} %"


def figure_rows(comparison: Comparison, unit_of: UnitOf = _same_unit) -> tuple[FigureRow, ...]:
    """One row per figure of :data:`app.figures.COMPARE_KEYS`, in the view's units (``unit_of``).

    A and B read exactly as the key figures and the datasheet show them: the figure's own significant
    figures and unit (torques in N·m for a large motor), so that the same design shows the same number
    everywhere; B − A is given to one figure more, so that a small difference still shows.
    """
    currency = comparison.a.cost.currency
    if comparison.b.cost.currency != currency:
        currency = f"A {currency}, B {comparison.b.cost.currency}"
    rows = []
    for key in COMPARE_KEYS:
        item = comparison.figure(key)
        shown = figure(key)
        unit = unit_of(unit_for(key, comparison.a))
        if shown.unit == "currency":
            unit = currency
        a, b = shown_value(item.a, unit), shown_value(item.b, unit)
        difference = _difference(b - a, max(abs(a), abs(b)), shown.digits)
        rows.append(FigureRow(
            title=f"{title_of(key)} [{unit_label(unit)}]",
            a=_shown_number(item.a, unit, shown.digits),
            b=_shown_number(item.b, unit, shown.digits),
            difference=difference + (" pt" if unit == "%" and difference != "0" else ""),
            percent=_percent(item.fraction, item.a, item.b),
        ))
    return tuple(rows)


def _shown_number(value_si: float, unit: str, digits: int) -> str:
    from .figures import number_text

    return number_text(value_si, unit, digits) if unit in ("°C", "°F") else significant(shown_value(value_si, unit),
                                                                                        digits)


def table_lines(rows: tuple[FigureRow, ...], heading_a: str = "A", heading_b: str = "B") -> list[str]:
    width = max(len(r.title) for r in rows) + 2
    lines = [f"{'':<{width}}{heading_a:>12}{heading_b:>12}{'B − A':>12}{'B vs A':>10}"]
    lines.append("-" * len(lines[0]))
    lines += [f"{r.title:<{width}}{r.a:>12}{r.b:>12}{r.difference:>12}{r.percent:>10}" for r in rows]
    return lines


def check_lines(results, unit_of: UnitOf = _same_unit) -> list[str]:
    """Every check that did not pass, worst first, in the view's units; one line saying so when all pass."""
    order = {"fail": 0, "warning": 1, "pass": 2}
    open_checks = sorted((c for c in results.checks if c.status != "pass"), key=lambda c: order[c.status])
    passed = sum(1 for c in results.checks if c.status == "pass")
    if not open_checks:
        return [f"all {passed} checks pass"]
    shown_in = units_of_design(results, unit_of)
    return ([f"{STATUSES[c.status].tag:<4}  {check_sentence(c, shown_in)}" for c in open_checks]
            + [f"({passed} other checks pass)"])


def parameter_text(value, unit: str) -> str:
    """An input value as the file holds it: whole turns as whole numbers, lengths to 4 figures."""
    return f"{value}" if not unit else f"{float(value):.4g} {unit}"


#: The inputs a re-fit changes, as figures of the results (for a view that shows them in its own units).
CHANGED_INPUTS = {"magnets.thickness_mm": "geometry.magnet_thickness_m",
                  "armature.stack_length_mm": "geometry.stack_length_m",
                  "magnets.length_mm": "geometry.magnet_length_m", "housing.length_mm": "geometry.housing_length_m"}
REFIT_DIGITS = 4  #: the re-fitted figure to one more figure than elsewhere: how close it came shows


def refit_lines(fit: Refit, unit_of: UnitOf | None = None) -> list[str]:
    """The re-fit in sentences: what changed, how close it came, and what it costs against A.

    Without ``unit_of`` the changed inputs read as the file holds them (the terminal); with it, as the key
    figures show them in that view's units (the desktop tool's display units).
    """
    units = unit_of or _same_unit
    message = refit_message(fit, unit_of)
    lines = [message if fit.reached else f"Out of reach: {message}"]
    for change in fit.changes:
        unit = key_spec(change.key).unit
        why = f" ({change.reason})" if change.reason else ""
        if unit_of is not None and change.key in CHANGED_INPUTS:
            shown_input = figure(CHANGED_INPUTS[change.key])
            before, after = (shown_input.text(to_si(float(v), unit), units(shown_input.unit))
                             for v in (change.before, change.after))
            lines.append(f"  {shown_input.title}: {before} → {after}{why}")
        else:
            lines.append(f"  {change.key}: {parameter_text(change.before, unit)} → "
                         f"{parameter_text(change.after, unit)}{why}")
    lines += [f"  {note}" for note in refit_notes(fit, unit_of)]
    target = figure(TARGETS[fit.target].figure_key)
    target_unit = units(target.unit)

    def shown(value_si: float) -> str:
        return target.number(value_si, target_unit, digits=REFIT_DIGITS)

    lines.append(f"  {target.title}: A {shown(fit.target_value)}, B before {shown(fit.figure_before)}, B after "
                 f"{shown(fit.figure_after)} {unit_label(target_unit)} "
                 f"(target error {_percent(fit.target_error_fraction, 1.0, 1.0)})")
    mass = figure("mass.magnet_kg")
    mass_unit = units(mass.unit)
    lines.append(f"  Against A, re-fitted B has {_signed(from_si(fit.magnet_mass_difference_kg, mass_unit))} "
                 f"{unit_label(mass_unit)} of magnet, "
                 f"{_signed(fit.magnet_cost_difference)} {fit.currency} of magnet material and "
                 f"{_signed(fit.material_cost_difference)} {fit.currency} of all materials.")
    lines += [f"  Now fails: {sentence}" for sentence in fit.new_failures]
    return lines
