"""A comparison for people: the key-figure rows, each side's checks and the re-fit in words.

The terminal (``pmdc-sizer compare``) and the desktop comparison view show the same rows, so both read
them from here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from pmdc_sizer.core.difference import Comparison, FigureDifference
from pmdc_sizer.core.refit import Refit
from pmdc_sizer.core.schema import key_spec
from pmdc_sizer.core.units import from_si

from .formatting import significant


#: The figures an engineer reads first when choosing between two designs: (key, title, display unit).
#: Nominal case unless the title says otherwise.
KEY_FIGURES: tuple[tuple[str, str, str], ...] = (
    ("magnet.remanence_T", "Br", "T"),
    ("magnet.coercivity_HcJ_A_per_m", "HcJ", "kA/m"),
    ("geometry.magnet_thickness_m", "Magnet thickness", "mm"),
    ("magnetics.permeance_coefficient", "Permeance coefficient", "1"),
    ("magnetics.magnet_flux_density_T", "Operating point Bm", "T"),
    ("magnetics.airgap_flux_density_T", "Air-gap flux density", "T"),
    ("magnetics.flux_per_pole_Wb", "Flux per pole", "mWb"),
    ("constants.ke_V_s_per_rad", "Ke = Kt", "V·s/rad"),
    ("constants.terminal_resistance_ohm", "Terminal resistance", "ohm"),
    ("nominal.no_load_speed_rad_per_s", "No-load speed", "rpm"),
    ("nominal.no_load_current_A", "No-load current", "A"),
    ("nominal.stall_torque_N_m", "Stall torque", "mN·m"),
    ("nominal.stall_current_A", "Stall current", "A"),
    ("nominal.rated.speed_rad_per_s", "Rated-torque speed", "rpm"),
    ("hot.rated.speed_rad_per_s", "Rated-torque speed, hot", "rpm"),
    ("nominal.rated.current_A", "Rated-torque current", "A"),
    ("nominal.max_efficiency", "Maximum efficiency", "%"),
    ("nominal.max_output_power_W", "Maximum output power", "W"),
    ("demagnetization.worst_margin_A_per_m", "Least margin to the knee", "kA/m"),
    ("thermal.winding_temperature_C", "Winding temp., hot", "°C"),
    ("mass.magnet_kg", "Magnet mass", "g"),
    ("mass.total_kg", "Active mass", "g"),
    ("cost.magnet", "Magnet material cost", ""),
    ("cost.total", "Material cost", ""),
)


def key_figures(comparison: Comparison) -> tuple[tuple[str, str, FigureDifference], ...]:
    """(title, display unit, difference) for each of :data:`KEY_FIGURES`."""
    return tuple((title, unit, comparison.figure(key)) for key, title, unit in KEY_FIGURES)


@dataclass(frozen=True)
class FigureRow:
    title: str  #: with its unit, e.g. "Stall torque [mN·m]"
    a: str
    b: str
    difference: str  #: B − A in the row's unit ("pt" for per-cent figures)
    percent: str  #: (B − A)/|A|, or "–" where it means nothing


def _shown(value_si: float, unit: str) -> float:
    return value_si if unit in ("", "1") else from_si(value_si, unit)


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
    """One row per key figure, in engineering units, 4 significant figures for A and B."""
    currency = comparison.a.cost.currency
    if comparison.b.cost.currency != currency:
        currency = f"A {currency}, B {comparison.b.cost.currency}"
    rows = []
    for title, unit, item in key_figures(comparison):
        label = f"{title} [{currency if item.key.startswith('cost.') else unit or '1'}]"
        a, b = _shown(item.a, unit), _shown(item.b, unit)
        difference = _difference(b - a, max(abs(a), abs(b)))
        rows.append(FigureRow(
            title=label,
            a=significant(a, 4),
            b=significant(b, 4),
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


_STATUS = {"pass": "ok", "warning": "WARN", "fail": "FAIL"}


def check_lines(results) -> list[str]:
    """Every check that did not pass, worst first; one line saying so when all pass."""
    order = {"fail": 0, "warning": 1, "pass": 2}
    open_checks = sorted((c for c in results.checks if c.status != "pass"), key=lambda c: order[c.status])
    passed = sum(1 for c in results.checks if c.status == "pass")
    if not open_checks:
        return [f"all {passed} checks pass"]
    return [f"{_STATUS[c.status]:<4}  {c.sentence}" for c in open_checks] + [f"({passed} other checks pass)"]


def parameter_text(value, unit: str) -> str:
    """An input value as the file holds it: whole turns as whole numbers, lengths to 4 figures."""
    return f"{value}" if not unit else f"{float(value):.4g} {unit}"


def refit_lines(fit: Refit) -> list[str]:
    """The re-fit in sentences: what changed, how close it came, and what it costs against A."""
    lines = [fit.message if fit.reached else f"Out of reach: {fit.message}"]
    for change in fit.changes:
        unit = key_spec(change.key).unit
        why = f" ({change.reason})" if change.reason else ""
        lines.append(f"  {change.key}: {parameter_text(change.before, unit)} → {parameter_text(change.after, unit)}{why}")
    lines += [f"  {note}" for note in fit.notes]
    lines.append(f"  {fit.title}: A {significant(from_si(fit.target_value, fit.figure_unit), 4)}, B before "
                 f"{significant(from_si(fit.figure_before, fit.figure_unit), 4)}, B after "
                 f"{significant(from_si(fit.figure_after, fit.figure_unit), 4)} {fit.figure_unit} "
                 f"(target error {_percent(fit.target_error_fraction, 1.0, 1.0)})")
    lines.append(f"  Against A, re-fitted B has {_signed(from_si(fit.magnet_mass_difference_kg, 'g'))} g of magnet, "
                 f"{_signed(fit.magnet_cost_difference)} {fit.currency} of magnet material and "
                 f"{_signed(fit.material_cost_difference)} {fit.currency} of all materials.")
    lines += [f"  Now fails: {sentence}" for sentence in fit.new_failures]
    return lines
