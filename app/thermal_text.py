"""Heat in words and the duty chart's content: title, notes, curves, limits, loaded spells; stall times.

Screen (``app.gui.thermal_chart``, the key figures), paper (``app.datasheet``) and the terminal summary
all read these, so a stall time or a missing steady state reads the same everywhere, and the chart on
screen plots the same numbers as the one on paper. No Qt here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from pmdc_sizer.core.results import Results, ThermalResult
from pmdc_sizer.core.units import from_si

from .figures import TEMPERATURE_AXIS, figure, value_of

NEVER_REACHED = "never reaches the class limit"  #: a stall time where the winding never gets there
NO_STALL = "no stall allowed"  #: a stall time where the winding is at its class limit when the stall begins


def _temperature(value_C: float, unit: str) -> str:
    return figure("thermal.insulation_limit_C").text(value_C, unit)


def _minutes(seconds: float) -> str:
    return figure("thermal.time_to_limit_s").text(seconds)


def duty_words(t: ThermalResult) -> str:
    """The duty as the chart's title names it: "S2: a 5 min run, then at rest"."""
    if t.duty == "S2":
        return f"S2: a {t.duty_minutes:g} min run, then at rest"
    if t.duty == "S3":
        return f"S3: loaded {t.cycle_duration_factor:.0%} of every {t.cycle_minutes:g} min cycle"
    return "S1: continuous running"


def chart_title(t: ThermalResult, unit: str = "°C") -> str:
    """The duty chart's title: the duty, the load and the ambient."""
    return f"Temperatures over the duty ({duty_words(t)}) at the rated load, {_temperature(t.ambient_C, unit)} ambient"


def loaded_spells(t: ThermalResult) -> list[tuple[float, float]]:
    """(start, end) of every spell under load within the transient [s]; S1 is loaded throughout.

    The transient's pieces are those of :func:`core.ratings.duty_transient`: S2 the run and as long again
    at rest, S3 whole cycles of the cycle duration factor's share under load.
    """
    tr = t.transient
    if tr is None or not tr.time_s:
        return []
    end = float(tr.time_s[-1])
    if t.duty == "S2":
        return [(0.0, min(60.0 * t.duty_minutes, end))]
    if t.duty == "S3":
        cycle = 60.0 * t.cycle_minutes
        if cycle <= 0.0:
            return [(0.0, end)]
        on = t.cycle_duration_factor * cycle
        return [(k * cycle, min(k * cycle + on, end)) for k in range(math.ceil(end / cycle - 1e-9))
                if k * cycle < end]
    return [(0.0, end)]


def no_continuous_rating(results: Results, unit: str = "°C") -> str | None:
    """Where the winding reaches its class limit with no load on the shaft, the continuous rating in words
    ("none: ..."), since "0 mN·m" reads as a number to be worked with; None where a rating exists."""
    ra = results.ratings
    if ra is None or ra.continuous_torque_N_m > 0.0:
        return None
    return (f"none: at no load the winding already reaches its class limit "
            f"({_temperature(ra.insulation_limit_C, unit)}) at {_temperature(ra.ambient_C, unit)} ambient")


def limit_reached_at(t: ThermalResult) -> float | None:
    """When the winding reaches its class limit at the rated load from ambient, where no steady state
    exists and the duty passes the limit [s]; None otherwise (the chart marks it)."""
    if t.steady_state_exists or t.time_to_limit_s is None:
        return None
    return float(t.time_to_limit_s)


#: Below this gap between the housing and magnet curves the chart says the housing's line lies under the
#: magnets' (the two are drawn a line width apart at most at a chart's usual scale) [K].
HIDDEN_LINE_K = 1.0


def chart_notes(t: ThermalResult, unit: str = "°C") -> list[str]:
    """Sentences under the duty chart: what the curves mean for the duty, and where no steady state exists."""
    limit = _temperature(t.insulation_limit_C, unit)
    if not t.steady_state_exists:
        at = limit_reached_at(t)
        reached = (f"The winding reaches its class limit ({limit}) after {_minutes(at)} from ambient; the hot case "
                   "is taken at that moment, and the curves beyond it, drawn with that moment's losses, are no "
                   "rating." if at is not None else "The hot case is taken at the class limit.")
        return [f"No usable steady state at the rated load ({t.duty}): the losses grow faster than the heat can "
                "leave, or the magnets pass the temperature their data hold to (see the winding temperature check).",
                reached]

    def against(value: float, limit_C: float) -> str:
        return "within" if value <= limit_C else "above"

    end = {"S1": "steady state", "S2": "end of the run", "S3": "end of each loaded spell"}[t.duty]
    notes = [f"Winding {_temperature(t.winding_temperature_C, unit)} at the {end}, "
             f"{against(t.winding_temperature_C, t.insulation_limit_C)} its class limit of {limit}; magnets "
             f"{_temperature(t.magnet_temperature_C, unit)}, {against(t.magnet_temperature_C, t.magnet_limit_C)} "
             f"their grade's limit of {_temperature(t.magnet_limit_C, unit)}."]
    if t.transient is not None and len(t.transient.time_s):
        apart = float(np.max(np.abs(np.asarray(t.transient.housing_C) - np.asarray(t.transient.magnet_C))))
        if apart < HIDDEN_LINE_K:
            shown_apart = f"{apart:.1f} K" if unit == "°C" else f"{1.8 * apart:.1f} °F"
            notes.append(f"The housing stays within {shown_apart} of the magnets, which sit on its inner wall: its "
                         "line lies under theirs.")
    if t.duty != "S1" and not t.steady_state_s1_exists:
        notes.append("Run on continuously (S1) at this load, the winding would have no steady state below its "
                     "class limit" + (": keep to the duty." if t.ok else "."))
    return notes


@dataclass(frozen=True)
class DutyPlot:
    """What the duty chart draws, in the shown units: time in minutes, temperatures in ``unit``."""

    unit: str  #: "°C" or "°F"
    time: np.ndarray  #: [min]
    curves: dict[str, np.ndarray]  #: a key of app.figures.LINES ("winding_temperature", ...) → temperatures
    limits: dict[str, float]  #: "insulation_limit" and "magnet_limit" → their temperatures
    spells: list[tuple[float, float]] = field(default_factory=list)  #: under load, for S2 and S3 [min]
    limit_reached: tuple[float, float] | None = None  #: (time, temperature) the winding hits its class limit
    temperature_range: tuple[float, float] = (0.0, 1.0)  #: the axis's default span


def duty_plot(t: ThermalResult, unit: str = "°C") -> DutyPlot | None:
    """The duty chart's content from the results' transient; None when the results carry none."""
    tr = t.transient
    if tr is None or len(tr.time_s) < 2:
        return None
    time_unit = figure("thermal.transient.time_s").unit

    def shown(values) -> np.ndarray:
        return from_si(np.asarray(values, dtype=float), unit)

    # In drawing order: the housing first, the winding on top.
    curves = {"housing_temperature": shown(tr.housing_C), "magnet_temperature": shown(tr.magnet_C),
              "winding_temperature": shown(tr.winding_C)}
    limits = {"insulation_limit": float(shown([tr.insulation_limit_C])[0]),
              "magnet_limit": float(shown([t.magnet_limit_C])[0])}
    at = limit_reached_at(t)
    reached = None if at is None else (from_si(at, time_unit), limits["insulation_limit"])
    low = min(float(np.min(c)) for c in curves.values())
    high = max([float(np.max(c)) for c in curves.values()] + list(limits.values()))
    span = max(high - low, 1.0)
    return DutyPlot(unit=unit, time=from_si(np.asarray(tr.time_s, dtype=float), time_unit), curves=curves,
                    limits=limits, spells=[(from_si(a, time_unit), from_si(b, time_unit))
                                           for a, b in loaded_spells(t) if t.duty != "S1"],
                    limit_reached=reached, temperature_range=(low - 0.04 * span, high + 0.08 * span))


def temperature_label(unit: str) -> str:
    """The duty chart's temperature axis, "Temperature [°C]"."""
    return TEMPERATURE_AXIS.label(unit)


def stall_time_reason(results: Results, key: str) -> str:
    """Why a permitted stall time (``ratings.stall_time_cold_s`` or ``..._hot_s``) is none, or "" when it is
    not: the winding is already at its class limit when the stall begins."""
    seconds = value_of(results, key)
    if seconds is None or seconds > 0.0:
        return ""
    if not key.endswith("_hot_s"):
        return "the winding starts at the class limit"
    if not results.thermal.steady_state_s1_exists:
        return "running on (S1) at the rated load has no steady state below the class limit"
    return "the S1 hot state is already at the class limit"


def stall_time_text(results: Results, key: str, unit: str | None = None) -> str:
    """A permitted stall time as text, in words where there is none: "never reaches the class limit", or
    "no stall allowed: the S1 hot state is already at the class limit" rather than "0 s"."""
    seconds = value_of(results, key)
    if seconds is None:
        return NEVER_REACHED
    reason = stall_time_reason(results, key)
    return f"{NO_STALL}: {reason}" if reason else figure(key).text(seconds, unit)


__all__ = [
    "DutyPlot",
    "chart_notes",
    "chart_title",
    "duty_plot",
    "duty_words",
    "limit_reached_at",
    "loaded_spells",
    "stall_time_reason",
    "stall_time_text",
    "temperature_label",
]
