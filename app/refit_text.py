"""A re-fit in words: what changed, or what B would need and why it cannot have it.

The core returns the re-fit as numbers (SI figures, the parameter in the file's unit, which limit it
met and why); the titles and units here come from the one table of shown figures (:mod:`.figures`).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from pmdc_sizer.core.keys import key_spec
from pmdc_sizer.core.refit import TARGETS, Refit
from pmdc_sizer.core.units import to_si

from .figures import figure


def _same_unit(unit: str) -> str:
    return unit


@dataclass(frozen=True)
class RefitWords:
    """How one re-fit target is spoken of."""

    parameter_title: str  #: e.g. "magnet thickness"
    need_more: str  #: what B needs beyond the upper limit, e.g. "a magnet thicker than"
    need_less: str  #: the same below the lower limit
    figure_key: str | None = None  #: the changed input as a figure of the results, for its title, unit and digits


WORDS: dict[str, RefitWords] = {
    "ke": RefitWords("magnet thickness", "a magnet thicker than", "a magnet thinner than",
                     "geometry.magnet_thickness_m"),
    "no-load-speed": RefitWords("turns per coil", "more turns per coil than", "fewer turns per coil than"),
    "stall-torque": RefitWords("stack length", "a stack longer than", "a stack shorter than",
                               "geometry.stack_length_m"),
}


def target_title(target: str) -> str:
    """The re-fitted figure's title, e.g. "Back-EMF constant Ke"."""
    return figure(TARGETS[target].figure_key).title


def parameter_title(target: str) -> str:
    """The name of the input a re-fit changes, e.g. "magnet thickness"."""
    return WORDS[target].parameter_title


def figure_text(fit: Refit, value_si: float, unit_of: Callable[[str], str] = _same_unit) -> str:
    """A value of the re-fitted figure with its unit (in a view's units, ``unit_of``), as the views show it."""
    shown = figure(TARGETS[fit.target].figure_key)
    return shown.text(value_si, unit_of(shown.unit), digits=4)


def parameter_shown(fit: Refit, value: float, unit_of: Callable[[str], str] = _same_unit) -> str:
    """The changed input as the key figures show it, in a view's units: "9.63 mm", "0.379 in", "14" (turns)."""
    key = WORDS[fit.target].figure_key
    if TARGETS[fit.target].integer or key is None:
        return f"{int(value)}"
    shown = figure(key)
    return shown.text(to_si(float(value), key_spec(fit.parameter).unit), unit_of(shown.unit))


def parameter_value_text(fit: Refit, value: float) -> str:
    """The parameter as the file holds it: whole turns as whole numbers, lengths to 4 figures."""
    if TARGETS[fit.target].integer:
        return f"{int(value)}"
    return f"{float(value):.4g} {key_spec(fit.parameter).unit}"


def refit_message(fit: Refit, unit_of: Callable[[str], str] | None = None) -> str:
    """One paragraph: what changed and how close it came, or what B would need.

    Without ``unit_of`` the input reads as the file holds it (the terminal's words); with it, as the key
    figures show it in that view's units.
    """
    words, title = WORDS[fit.target], target_title(fit.target)
    units = unit_of or _same_unit

    def value(v: float) -> str:
        return parameter_value_text(fit, v) if unit_of is None else parameter_shown(fit, v, unit_of)

    def shown(v: float) -> str:
        return figure_text(fit, v, units)

    goal = shown(fit.target_value)
    if not fit.reached:
        at_upper = fit.limit_side == "upper"
        need = words.need_more if at_upper else words.need_less
        reason = fit.range_limits[1 if at_upper else 0]
        at = value(fit.value_after)
        return (f"B needs {need} {at} ({reason}) to reach A's {title} of {goal}; at {at} its {title} is "
                f"{shown(fit.figure_after)}.")
    if TARGETS[fit.target].integer:
        return (f"B's turns per coil go from {value(fit.value_before)} to {value(fit.value_after)}: its {title} "
                f"is {shown(fit.figure_after)} against A's {goal} ({100.0 * fit.target_error_fraction:+.2g} %).")
    closeness = ("(within 0.01 %)." if abs(fit.target_error_fraction) < 1e-4
                 else f"(off by {100.0 * fit.target_error_fraction:+.2g} %).")
    return (f"B's {words.parameter_title} goes from {value(fit.value_before)} to {value(fit.value_after)} to give "
            f"A's {title} of {goal} {closeness}")


def refit_notes(fit: Refit, unit_of: Callable[[str], str] | None = None) -> tuple[str, ...]:
    """What the reader should know besides: whole turns, an unfinished solve, mixed currencies, what followed.

    Lengths as the file holds them without ``unit_of`` (the terminal), else as the key figures show them.
    """
    notes = []
    length = figure("geometry.overhang_m")
    if fit.alternative_value is not None and fit.alternative_error_fraction is not None:
        alternative_figure = fit.target_value * (1.0 + fit.alternative_error_fraction)
        notes.append(f"Turns are whole numbers: {int(fit.alternative_value)} turns would give "
                     f"{figure_text(fit, alternative_figure, unit_of or _same_unit)} "
                     f"({100.0 * fit.alternative_error_fraction:+.2g} %), "
                     f"so {parameter_value_text(fit, fit.value_after)} is the closer.")
    if not fit.solver_converged:
        notes.append(f"The solve stopped after {fit.solver_iterations} iterations before meeting its tolerance.")
    if fit.currency_a != fit.currency:
        notes.append(f"A's prices are in {fit.currency_a} and B's in {fit.currency}: the cost differences mix "
                     "currencies and mean nothing until the prices agree.")
    if fit.overhang_mm is not None and fit.end_room_mm is not None:
        overhang, end_room = ((f"{value:.3g} mm" if unit_of is None else length.text(to_si(value, "mm"), unit_of("mm")))
                              for value in (fit.overhang_mm, fit.end_room_mm))
        notes.append("The magnets and the housing tube change length with the stack, so that the magnets keep B's "
                     f"overhang of {overhang} and the housing its {end_room} beyond the magnets.")
    return tuple(notes)
