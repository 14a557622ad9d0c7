"""Design checks: pass, warning or fail, each with its reason and what to change, in words.

Thresholds that are engineering judgement rather than a standard are marked so beside them.
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import TYPE_CHECKING

import numpy as np

from .demagnetization import advice_for
from .load_points import points_met
from .results import Check, CommutationResult, FaultsResult, QuotedValue, Results
from .units import from_si

if TYPE_CHECKING:
    from .design import Design

PASS, WARNING, FAIL = "pass", "warning", "fail"

SLOT_FILL_BARE_WARNING = 0.45  #: hard to wind by machine above this (common practice, no source)
#: round wires cannot pack tighter in practice (hexagonal limit 0.907; common practice)
SLOT_FILL_GROSS_FAIL = 0.78
#: [A/m²], enclosed small motors (common practice, no source)
CURRENT_DENSITY_WARNING = {"S1": 8e6, "S2": 15e6, "S3": 12e6}
#: a brush loaded past this multiple of its grade's continuous limit fails (common practice, no source)
BRUSH_DENSITY_FAIL = 1.5
#: commutator surface speed [m/s]: plain small commutators (common practice, no source)
SURFACE_SPEED_WARNING, SURFACE_SPEED_FAIL = 25.0, 40.0
#: reactance voltage [V]: about the brush contact drop is commutated cleanly (common practice, no source)
REACTANCE_WARNING, REACTANCE_FAIL = 2.0, 4.0
SATURATION_MARGIN = 0.25  #: [T] above a steel's recommended flux density counts as saturated (our rule)


def _figures(value: float, digits: int = 3) -> str:
    """``value`` to ``digits`` significant figures in plain notation: 2893 → "2890", 0.04567 → "0.0457"."""
    if value == 0 or not math.isfinite(value):
        return f"{value:g}"
    decimals = digits - 1 - math.floor(math.log10(abs(value)))
    return f"{round(value, decimals):.{max(decimals, 0)}f}"


def _quote(value: float, unit: str, digits: int = 3, spec: str = "", bare: bool = False) -> QuotedValue:
    """A number the message quotes in ``unit`` (SI ``value``; °C for a temperature), for views in other units."""
    return QuotedValue(float(value), unit, digits, spec, bare)


def quoted_text(q: QuotedValue) -> str:
    """A quoted number as the message writes it, in its own unit.

    Parameters
    ----------
    q : QuotedValue
        The value (SI; °C for a temperature), its unit and how it is rounded.

    Returns
    -------
    str
        e.g. "35.0 mN·m", "88 °C", or "8.0" for a bare value.
    """
    shown = from_si(q.value, q.unit)
    number = format(shown, q.spec) if q.spec else _figures(shown, q.digits)
    return number if q.bare else f"{number} {q.unit}"


def _check(key: str, title: str, status: str, template: str, quoted: tuple[QuotedValue, ...] = (),
           advice: str = "") -> Check:
    """A check whose message has ⟦i⟧ where ``quoted[i]`` stands, filled in the quoted units."""
    check = Check(key, title, status, template, advice, template=template, quoted=quoted)
    return replace(check, message=check.filled([quoted_text(q) for q in quoted]))


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


def _commutation_checks(cm: CommutationResult) -> list[Check]:
    """Brush current density, commutator surface speed and reactance voltage, in words."""
    out = []
    density, high = from_si(cm.brush_current_density_A_per_m2, "A/cm2"), from_si(cm.brush_density_high_A_per_m2,
                                                                                 "A/cm2")
    limit = (f"the project's limit of {_figures(high)} A/cm²" if cm.limit_from_project
             else f"the {_figures(high)} A/cm² {cm.brush_grade} carries in continuous service")
    guessed = (f" (brush {', '.join(k.replace('_', ' ') for k in cm.estimated_inputs)} estimated: "
               "give them under [brushes])") if cm.estimated_inputs else ""
    sizes = "⟦0⟧ × ⟦1⟧"
    brush = (_quote(cm.brush_width_m, "mm", spec=".1f", bare=True), _quote(cm.brush_length_m, "mm", spec=".1f"))
    if cm.brush_current_density_A_per_m2 > BRUSH_DENSITY_FAIL * cm.brush_density_high_A_per_m2:
        out.append(_check("brush_current_density", "Brush current density", FAIL,
                          f"{_figures(density)} A/cm² under the {sizes} brushes at the hot rated point, far above "
                          f"{limit}{guessed}.", brush,
                          "use larger or more brushes, or a metal-graphite grade"))
    elif cm.brush_current_density_A_per_m2 > cm.brush_density_high_A_per_m2:
        out.append(_check("brush_current_density", "Brush current density", WARNING,
                          f"{_figures(density)} A/cm² under the {sizes} brushes at the hot rated point, above "
                          f"{limit}{guessed}.", brush,
                          "use larger brushes or a grade rated for more current"))
    else:
        out.append(_check("brush_current_density", "Brush current density", PASS,
                          f"{_figures(density)} A/cm² under the {sizes} brushes at the hot rated point "
                          f"(within {limit}){guessed}.", brush))
    speed = cm.surface_speed_m_per_s
    status = FAIL if speed > SURFACE_SPEED_FAIL else WARNING if speed > SURFACE_SPEED_WARNING else PASS
    words = {PASS: f"within the {SURFACE_SPEED_WARNING:g} m/s that plain commutators run at",
             WARNING: f"above the {SURFACE_SPEED_WARNING:g} m/s of plain commutators: brush bounce and wear",
             FAIL: f"beyond the {SURFACE_SPEED_FAIL:g} m/s a small commutator holds together at"}[status]
    out.append(_check("commutator_speed", "Commutator surface speed", status,
                      f"{_figures(speed)} m/s at the highest no-load speed on a ⟦0⟧ commutator, {words}.",
                      (_quote(cm.commutator_diameter_m, "mm", spec=".1f"),),
                      "" if status == PASS else "use a smaller commutator or a lower no-load speed"))
    e_r = cm.reactance_voltage_V
    status = FAIL if e_r > REACTANCE_FAIL else WARNING if e_r > REACTANCE_WARNING else PASS
    words = {PASS: "commutation without visible sparking is likely",
             WARNING: "expect sparking at the trailing brush edge",
             FAIL: "heavy sparking and brush wear"}[status]
    out.append(Check("reactance_voltage", "Reactance voltage", status,
                     f"about {_figures(e_r, 2)} V in the coil under commutation at the hot rated point "
                     f"(estimate, Pichelmayer's permeance): {words}.",
                     "" if status == PASS else "use fewer turns per coil with more segments, or wider brushes"))
    return out


def _in_ka_per_m(value: float) -> str:
    return _figures(from_si(value, "kA/m"))


def _demagnetization_check(cases, worst_case: str, worst_margin: float, share: float) -> Check:
    """The ordinary cases: fail past the knee, warn inside the required margin, else pass."""
    failing = [c for c in cases if c.status == "past_knee"]
    marginal = [c for c in cases if c.status == "marginal"]
    if failing:
        names = ", ".join(f"{c.name} ({_in_ka_per_m(-c.margin_A_per_m)} kA/m beyond)" for c in failing)
        advice = "; ".join(dict.fromkeys(advice_for(c) for c in failing))
        return Check("demagnetization", "Demagnetization", FAIL,
                     f"the magnet passes its knee in: {names}; worst {worst_case}.", advice)
    if marginal:
        names = ", ".join(
            f"{c.name} ({_in_ka_per_m(c.margin_A_per_m)} of {_in_ka_per_m(c.required_margin_A_per_m)} kA/m)"
            for c in marginal)
        return Check("demagnetization", "Demagnetization", WARNING,
                     f"marginal, inside the required margin of {share:.0%} of HcJ: {names}.",
                     "; ".join(dict.fromkeys(advice_for(c) for c in marginal)))
    return Check("demagnetization", "Demagnetization", PASS,
                 f"every case keeps the required margin ({share:.0%} of HcJ); the least margin is "
                 f"{_in_ka_per_m(worst_margin)} kA/m ({worst_case}).")


def _fault_check(faults: FaultsResult, share: float) -> Check:
    """The direct-supply faults: fail if they must be survived and are not, else warn; pass if safe."""
    worst = min(faults.cases, key=lambda c: c.margin_A_per_m)
    title = "Faults (supply applied directly)"
    duty = "must survive them" if faults.must_survive else "reports them only (supply.fault_cases)"
    if faults.status == "safe":
        return Check("fault_demagnetization", title, PASS,
                     f"stall and reversal with no current limit keep the required margin; the least is "
                     f"{_in_ka_per_m(worst.margin_A_per_m)} kA/m ({worst.name}, {_figures(worst.current_A)} A).")
    bad = [c for c in faults.cases if c.status != "safe"]
    names = ", ".join(
        f"{c.name} at {_figures(c.current_A)} A ("
        + (f"{_in_ka_per_m(-c.margin_A_per_m)} kA/m past the knee" if c.status == "past_knee"
           else f"{_in_ka_per_m(c.margin_A_per_m)} of {_in_ka_per_m(c.required_margin_A_per_m)} kA/m required")
        + ")" for c in bad)
    what = "the magnets demagnetize in" if faults.status == "past_knee" else "marginal (inside the required margin) in"
    status = FAIL if faults.must_survive and faults.status == "past_knee" else WARNING
    return Check("fault_demagnetization", title, status,
                 f"with the drive failed, {what}: {names}; the project {duty}.",
                 "add a fuse or a current-limiting element that survives a drive failure, choose a grade with "
                 "higher HcJ, or thicken the magnet")


def _further_points_check(d: Design, r: Results) -> Check:
    """``load.further_points``: each point reached at its speed in every temperature case."""
    title = "Further load points"
    missed = []  # (share of the required speed reached, point, case name, speed or NaN)
    for index, (_, required) in enumerate(d.load_points):
        for case in r.cases:
            speed = case.further_point_speeds_rad_per_s[index]
            if not points_met(np.array([speed]), required)[0]:
                reached = speed / required if np.isfinite(speed) and required > 0 else 0.0
                missed.append((reached, index, case.name, speed))
    points = len(d.load_points)
    if not missed:
        return Check("load_points", title, PASS, f"all {points} further load points are reached at their speed in "
                                                 "every case.")
    _, index, case_name, speed = min(missed)
    torque, required = d.load_points[index]
    where = (f"point {index + 1} (⟦0⟧ at {_figures(from_si(required, 'rpm'), 4)} rpm): "
             + (f"the stall torque is lower in the {case_name} case" if not np.isfinite(speed) else
                f"{_figures(from_si(speed, 'rpm'), 4)} rpm in the {case_name} case"))
    count = len({i for _, i, _, _ in missed})
    return _check("load_points", title, FAIL, f"{count} of {points} further load points missed; worst {where}.",
                  (_quote(torque, "mN·m"),),
                  "raise the flux or lower Ke and R as for the rated load, or relax the point")


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
    rated = _quote(d.load_torque, "mN·m")
    short = [c for c in r.cases if not c.meets_load]
    if any(not c.rated_reached for c in r.cases):
        worst = min(r.cases, key=lambda c: c.stall_torque_N_m)
        out.append(_check("load", "Rated load", FAIL,
                          f"the rated ⟦0⟧ is beyond the stall torque in the {worst.name} case (⟦1⟧).",
                          (rated, _quote(worst.stall_torque_N_m, "mN·m")),
                          "raise the flux (thicker magnet, stronger grade), lengthen the stack, "
                         "or lower the resistance"))
    elif short:
        slow = min(short, key=lambda c: c.rated.speed_rad_per_s)
        out.append(_check("load", "Rated load", FAIL,
                          f"at ⟦0⟧ the motor turns {_figures(rpm(slow.rated.speed_rad_per_s), 4)} rpm in the "
                          f"{slow.name} case, below the required {_figures(required, 4)} rpm.", (rated,),
                          "use fewer turns per coil or thicker wire (lower Ke and R), or raise the supply voltage"))
    else:
        slowest = min(r.cases, key=lambda c: c.rated.speed_rad_per_s)
        out.append(_check("load", "Rated load", PASS,
                          f"⟦0⟧ at {_figures(rpm(slowest.rated.speed_rad_per_s))} rpm or more in every case "
                          f"(required {_figures(required)} rpm).", (rated,)))
    if d.load_points:
        out.append(_further_points_check(d, r))
    if any(c.stall_torque_N_m <= 0.0 for c in r.cases):
        out.append(Check("start", "Starting", FAIL,
                         "friction and drag exceed the stall torque: the motor cannot start.",
                         "raise the flux or the number of conductors, or lower the friction"))

    # Demagnetization, against the required margin; then the faults (the supply applied directly).
    dm = r.demagnetization
    out.append(_demagnetization_check(dm.cases, dm.worst_case, dm.worst_margin_A_per_m, dm.required_margin_share))
    if r.faults is not None:
        out.append(_fault_check(r.faults, dm.required_margin_share))

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

    if r.commutation is not None:
        out.extend(_commutation_checks(r.commutation))

    # Thermal.
    t = r.thermal
    duty = {"S1": "steady state (S1)", "S2": f"after {t.duty_minutes:g} min (S2)",
            "S3": f"at the end of each loaded spell (S3, {t.cycle_duration_factor:.0%} of "
                  f"{t.cycle_minutes:g} min)"}[t.duty]
    ambient = _quote(t.ambient_C, "°C", spec="g")
    winding = _quote(t.winding_temperature_C, "°C", spec=".0f")
    insulation = _quote(t.insulation_limit_C, "°C", spec=".0f")
    if not t.converged:
        when = ("" if t.time_to_limit_s is None else
                f" The winding reaches its class limit after {_figures(from_si(t.time_to_limit_s, 'min'))} min "
                "at the rated load from ambient; the hot case is shown at that moment.")
        out.append(_check("thermal", "Winding temperature", FAIL,
                          f"no usable thermal state at the rated load and ⟦0⟧ ambient ({t.duty}): "
                          "the losses grow faster than the heat can leave, the hot motor stalls, "
                          "or the magnets would pass the temperature their data hold to." + when, (ambient,),
                          "lower the rated load or the winding resistance, or improve the cooling"))
    elif t.winding_temperature_C > t.insulation_limit_C:
        out.append(_check("thermal", "Winding temperature", FAIL,
                          f"⟦0⟧ {duty} at ⟦1⟧ ambient exceeds class {t.insulation_class} (⟦2⟧, IEC 60085).",
                          (winding, ambient, insulation),
                          "lower the losses (thicker wire, fewer turns), improve the cooling, "
                         "or choose a higher class"))
    else:
        out.append(_check("thermal", "Winding temperature", PASS,
                          f"⟦0⟧ {duty} at ⟦1⟧ ambient, within class {t.insulation_class} (⟦2⟧).",
                          (winding, ambient, insulation)))
    magnets = (_quote(t.magnet_temperature_C, "°C", spec=".0f"), _quote(t.magnet_limit_C, "°C", spec=".0f"))
    if t.magnet_temperature_C > t.magnet_limit_C:
        out.append(_check("magnet_temperature", "Magnet temperature", FAIL,
                          f"the magnets reach ⟦0⟧, above {r.magnet.name}'s working limit of ⟦1⟧.", magnets,
                          "choose a grade rated for higher temperature, or cool the housing"))
    else:
        out.append(_check("magnet_temperature", "Magnet temperature", PASS,
                          "the magnets reach ⟦0⟧ (limit ⟦1⟧).", magnets))

    # Envelope.
    # (a design outside its envelope is refused by the fit rules, core.fit_rules.check_fit)
    envelope, longest = r.geometry.max_outer_diameter_m, r.geometry.max_length_m
    across = (_quote(r.geometry.housing_outer_diameter_m, "mm", spec=".1f"),
              _quote(envelope or 0.0, "mm", spec="g"))
    along = (_quote(r.geometry.overall_length_m, "mm", spec=".1f"), _quote(longest or 0.0, "mm", spec="g"))
    if envelope is not None and longest is not None:
        out.append(_check("envelope", "Envelope", PASS, "housing ⟦0⟧ across, within ⟦1⟧; body ⟦2⟧ long, within ⟦3⟧.",
                          (*across, *along)))
    elif envelope is not None:
        out.append(_check("envelope", "Envelope", PASS, "housing ⟦0⟧ across, within ⟦1⟧.", across))
    elif longest is not None:
        out.append(_check("envelope", "Envelope", PASS, "body ⟦0⟧ long, within ⟦1⟧.", along))
    return out
