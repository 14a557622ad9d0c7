"""Design checks: pass, warning or fail, each with its reason and what to change, in words.

Thresholds that are engineering judgement rather than a standard are marked so beside them.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from .demagnetization import advice_for
from .results import Check, Results
from .units import from_si

if TYPE_CHECKING:
    from .design import Design

PASS, WARNING, FAIL = "pass", "warning", "fail"

SLOT_FILL_BARE_WARNING = 0.45  #: hard to wind by machine above this (common practice, no source)
#: round wires cannot pack tighter in practice (hexagonal limit 0.907; common practice)
SLOT_FILL_GROSS_FAIL = 0.78
#: [A/m²], enclosed small motors (common practice, no source)
CURRENT_DENSITY_WARNING = {"S1": 8e6, "S2": 15e6}
SATURATION_MARGIN = 0.25  #: [T] above a steel's recommended flux density counts as saturated (our rule)


def _figures(value: float, digits: int = 3) -> str:
    """``value`` to ``digits`` significant figures in plain notation: 2893 → "2890", 0.04567 → "0.0457"."""
    if value == 0 or not math.isfinite(value):
        return f"{value:g}"
    decimals = digits - 1 - math.floor(math.log10(abs(value)))
    return f"{round(value, decimals):.{max(decimals, 0)}f}"


def _flux_check(key, title, value, steel, part, advice):
    limit = steel.recommended_max_flux_density
    if value > limit + SATURATION_MARGIN:
        return Check(key, title, FAIL,
                     f"{value:.2f} T in the {part} saturates {steel.name} (works up to about {limit:.2f} T).", advice)
    if value > limit:
        return Check(key, title, WARNING,
                     f"{value:.2f} T in the {part} is above the {limit:.2f} T that {steel.name} carries comfortably.",
                     advice)
    return Check(key, title, PASS,
                 f"{value:.2f} T in the {part} (up to {limit:.2f} T is comfortable for {steel.name}).")


def run_checks(design: Design, results: Results) -> list[Check]:
    """What passes, what warns and what fails in a design's results, each with its reason and advice.

    In order: the load at every temperature case, starting, demagnetization, the flux densities of
    housing, teeth and core, slot fill, current density, winding and magnet temperatures, and the
    envelope when the project sets one.

    Parameters
    ----------
    design : Design
        The design in SI (the load, the steels and the duty the checks compare with).
    results : Results
        What :func:`core.evaluate.evaluate` computed for it.

    Returns
    -------
    list of Check
        One check per topic, with status ``"pass"``, ``"warning"`` or ``"fail"``, a message with the
        numbers in engineering units and, where it did not pass, what to change.

    References
    ----------
    .. [1] IEC 60085 (thermal classes); the slot-fill, current-density and saturation thresholds are
       common practice, no source, as marked beside each constant.
    """
    d, r = design, results
    out: list[Check] = []

    # Meeting the load at every temperature.
    def rpm(speed: float) -> float:
        return from_si(speed, "rpm")

    required = rpm(d.load_speed)
    torque_mNm = from_si(d.load_torque, "mN·m")
    short = [c for c in r.cases if not c.meets_load]
    if any(not c.rated_reached for c in r.cases):
        worst = min(r.cases, key=lambda c: c.stall_torque_N_m)
        out.append(Check("load", "Rated load", FAIL,
                         f"the rated {_figures(torque_mNm)} mN·m is beyond the stall torque in the {worst.name} case "
                         f"({_figures(from_si(worst.stall_torque_N_m, 'mN·m'))} mN·m).",
                         "raise the flux (thicker magnet, stronger grade), lengthen the stack, "
                         "or lower the resistance"))
    elif short:
        slow = min(short, key=lambda c: c.rated.speed_rad_per_s)
        out.append(Check("load", "Rated load", FAIL,
                         f"at {_figures(torque_mNm)} mN·m the motor turns "
                         f"{_figures(rpm(slow.rated.speed_rad_per_s), 4)} rpm in the "
                         f"{slow.name} case, below the required {_figures(required, 4)} rpm.",
                         "use fewer turns per coil or thicker wire (lower Ke and R), or raise the supply voltage"))
    else:
        slowest = min(r.cases, key=lambda c: c.rated.speed_rad_per_s)
        out.append(Check("load", "Rated load", PASS,
                         f"{_figures(torque_mNm)} mN·m at {_figures(rpm(slowest.rated.speed_rad_per_s))} rpm "
                         "or more in every case "
                         f"(required {_figures(required)} rpm)."))
    if any(c.stall_torque_N_m <= 0.0 for c in r.cases):
        out.append(Check("start", "Starting", FAIL,
                         "friction and drag exceed the stall torque: the motor cannot start.",
                         "raise the flux or the number of conductors, or lower the friction"))

    # Demagnetization.
    dm = r.demagnetization
    failing = [c for c in dm.cases if not c.ok]
    if failing:
        names = ", ".join(c.name for c in failing)
        advice = "; ".join(dict.fromkeys(advice_for(c) for c in failing))
        out.append(Check("demagnetization", "Demagnetization", FAIL,
                         f"the magnet passes its knee in: {names} (worst {dm.worst_case}, "
                         f"{_figures(from_si(dm.worst_margin_A_per_m, 'kA/m'))} kA/m beyond).", advice))
    else:
        out.append(Check("demagnetization", "Demagnetization", PASS,
                         "every case stays above the knee; the least margin is "
                         f"{_figures(from_si(dm.worst_margin_A_per_m, 'kA/m'))} kA/m "
                         f"({dm.worst_case})."))

    # Iron.
    m = r.magnetics
    out.append(_flux_check("housing_flux_density", "Housing flux", m.housing_flux_density_T, d.housing_steel,
                           "housing wall", "thicken the housing wall or shorten the magnet arc"))
    out.append(_flux_check("tooth_flux_density", "Tooth flux", m.tooth_flux_density_T, d.lamination_steel, "teeth",
                           "widen the teeth or use more slots with the same tooth fraction"))
    out.append(_flux_check("core_flux_density", "Armature core flux", m.core_flux_density_T, d.lamination_steel,
                           "armature core", "make the slots shallower or the shaft smaller"))

    # Winding.
    w = r.winding
    if w.slot_fill_gross > SLOT_FILL_GROSS_FAIL:
        out.append(Check("slot_fill", "Slot fill", FAIL,
                         f"the enamelled wire fills {w.slot_fill_gross:.0%} of the slot: it does not fit.",
                         "use fewer turns, thinner wire or deeper slots"))
    elif w.slot_fill_bare > SLOT_FILL_BARE_WARNING:
        out.append(Check("slot_fill", "Slot fill", WARNING,
                         f"copper fills {w.slot_fill_bare:.0%} of the slot, hard to wind by machine.",
                         "use thinner wire with fewer turns, or deeper slots"))
    else:
        out.append(Check("slot_fill", "Slot fill", PASS, f"copper fills {w.slot_fill_bare:.0%} of the slot."))
    limit = CURRENT_DENSITY_WARNING[d.thermal.duty]
    density = from_si(w.rated_current_density_A_per_m2, "A/mm2")
    if w.rated_current_density_A_per_m2 > limit:
        out.append(Check("current_density", "Current density", WARNING,
                         f"{density:.1f} A/mm² at the rated point is high for {d.thermal.duty} duty "
                         f"(about {from_si(limit, 'A/mm2'):.0f} A/mm² is usual).", "use thicker wire"))
    else:
        out.append(Check("current_density", "Current density", PASS, f"{density:.1f} A/mm² at the rated point."))

    # Thermal.
    t = r.thermal
    duty = "steady state (S1)" if t.duty == "S1" else f"after {t.duty_minutes:g} min (S2)"
    if not t.converged:
        out.append(Check("thermal", "Winding temperature", FAIL,
                         f"no usable thermal steady state at the rated load and {t.ambient_C:g} °C ambient: "
                         "the losses grow faster than the heat can leave, the hot motor stalls, "
                         "or the magnets would pass the temperature their data hold to; the hot case is shown at the "
                         f"class limit of {t.insulation_limit_C:.0f} °C.",
                         "lower the rated load or the winding resistance, or improve the cooling"))
    elif t.winding_temperature_C > t.insulation_limit_C:
        out.append(Check("thermal", "Winding temperature", FAIL,
                         f"{t.winding_temperature_C:.0f} °C {duty} at {t.ambient_C:g} °C ambient exceeds class "
                         f"{t.insulation_class} ({t.insulation_limit_C:.0f} °C, IEC 60085).",
                         "lower the losses (thicker wire, fewer turns), improve the cooling, "
                         "or choose a higher class"))
    else:
        out.append(Check("thermal", "Winding temperature", PASS,
                         f"{t.winding_temperature_C:.0f} °C {duty} at {t.ambient_C:g} °C ambient, within class "
                         f"{t.insulation_class} ({t.insulation_limit_C:.0f} °C)."))
    if t.magnet_temperature_C > t.magnet_limit_C:
        out.append(Check("magnet_temperature", "Magnet temperature", FAIL,
                         f"the magnets reach {t.magnet_temperature_C:.0f} °C, above {r.magnet.name}'s working limit "
                         f"of {t.magnet_limit_C:.0f} °C.",
                         "choose a grade rated for higher temperature, or cool the housing"))
    else:
        out.append(Check("magnet_temperature", "Magnet temperature", PASS,
                         f"the magnets reach {t.magnet_temperature_C:.0f} °C (limit {t.magnet_limit_C:.0f} °C)."))

    # Envelope.
    envelope = r.geometry.max_outer_diameter_m
    if envelope is not None:
        out.append(Check("envelope", "Envelope", PASS,
                         f"housing {from_si(r.geometry.housing_outer_diameter_m, 'mm'):.1f} mm across, "
                         f"within {from_si(envelope, 'mm'):g} mm."))
    return out
