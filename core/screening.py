"""The screening figures and check codes of one evaluated design, under the names a batch gives them.

:func:`screening_figures` reads, off one design's :class:`~core.results.Results`, every figure a study
reads (the magnetic solution, the constants, the named points of each case, the demagnetization margins,
the thermal state, the ratings, masses, cost), and :func:`check_status` each check's verdict as a code;
:func:`core.batch.evaluate_many` returns the same names as arrays over many designs, so the two compare
like for like. Figure names are ``group.name_unit``, SI throughout, temperatures in °C; a figure a design
does not have is NaN.
"""

from __future__ import annotations

import dataclasses

import numpy as np

from .results import CaseResult, DemagnetizationCase, Results

#: Check verdicts as the status arrays carry them.
PASS_CODE, WARNING_CODE, FAIL_CODE = 0, 1, 2
_STATUS_CODE = {"pass": PASS_CODE, "warning": WARNING_CODE, "fail": FAIL_CODE}

_CASE_NAMES = ("cold", "nominal", "hot")
#: The demagnetization cases by a stable key: (kind, temperature label).
_DEMAGNETIZATION_KEYS = (*(f"{kind}_{label}" for label in ("cold", "hot")
                           for kind in ("stall", "reversal", "current_limit")),
                         "rotor_removed_cold", "rotor_removed_hot")
_FAULT_KEYS = ("stall_cold", "reversal_cold", "stall_hot", "reversal_hot")
#: Every check a design can carry (a check a design does not carry, e.g. the envelope without a limit,
#: counts as passed).
CHECK_KEYS = ("load", "load_points", "start", "demagnetization", "fault_demagnetization", "housing_flux_density",
              "tooth_flux_density", "core_flux_density", "slot_fill", "current_density", "brush_current_density",
              "commutator_speed", "reactance_voltage", "thermal", "magnet_temperature", "envelope")



def _optional(value: float | None) -> float:
    return float("nan") if value is None else float(value)


def _group_figures(prefix: str, group: object, names: tuple[str, ...]) -> dict[str, float]:
    """``prefix.name`` → the group's field ``name`` for each of ``names`` (NaN where it is None)."""
    return {f"{prefix}.{name}": _optional(getattr(group, name)) for name in names}


def _case_figures(case: CaseResult) -> dict[str, float]:
    return {
        "flux_per_pole_Wb": case.flux_per_pole_Wb,
        "ke_V_s_per_rad": case.ke_V_s_per_rad,
        "terminal_resistance_ohm": case.terminal_resistance_ohm,
        "magnet_temperature_C": case.magnet_temperature_C,
        "winding_temperature_C": case.winding_temperature_C,
        "no_load_speed_rad_per_s": case.no_load_speed_rad_per_s,
        "no_load_current_A": case.no_load_current_A,
        "stall_torque_N_m": case.stall_torque_N_m,
        "stall_current_A": case.stall_current_A,
        "flux_per_pole_stall_Wb": case.flux_per_pole_stall_Wb,
        "ke_stall_V_s_per_rad": case.ke_stall_V_s_per_rad,
        "rated_torque_N_m": case.rated.torque_N_m,
        "rated_speed_rad_per_s": case.rated.speed_rad_per_s,
        "rated_current_A": case.rated.current_A,
        "rated_input_power_W": case.rated.input_power_W,
        "rated_output_power_W": case.rated.output_power_W,
        "rated_efficiency": case.rated.efficiency,
        "current_limit_torque_N_m": _optional(case.current_limit_torque_N_m),
        "max_efficiency": case.max_efficiency,
        "max_efficiency_torque_N_m": case.max_efficiency_point.torque_N_m,
        "max_efficiency_speed_rad_per_s": case.max_efficiency_point.speed_rad_per_s,
        "max_efficiency_current_A": case.max_efficiency_point.current_A,
        "max_efficiency_output_power_W": case.max_efficiency_point.output_power_W,
        "max_output_power_W": case.max_output_power_W,
        "max_power_torque_N_m": case.max_power_point.torque_N_m,
        "max_power_speed_rad_per_s": case.max_power_point.speed_rad_per_s,
        "max_power_current_A": case.max_power_point.current_A,
        "max_power_efficiency": case.max_power_point.efficiency,
    }


def _demagnetization_key(case: DemagnetizationCase) -> str:
    label = "cold" if ", cold" in case.name else "hot"
    return f"{case.kind.replace(' ', '_')}_{label}"


def _case_margins(prefix: str, cases: tuple[DemagnetizationCase, ...], keys: tuple[str, ...]) -> dict[str, float]:
    """Each case's margin to the knee and its current under ``prefix.key``; NaN for a case not evaluated."""
    by_key = {_demagnetization_key(c): c for c in cases}
    out = {}
    for key in keys:
        found = by_key.get(key)
        out[f"{prefix}.{key}.margin_A_per_m"] = float("nan") if found is None else found.margin_A_per_m
        out[f"{prefix}.{key}.current_A"] = float("nan") if found is None else found.current_A
    return out


def screening_figures(results: Results) -> dict[str, float]:
    """The screening figures of one evaluated design, under the names :func:`evaluate_many` gives them.

    Parameters
    ----------
    results : Results
        What :func:`core.evaluate.evaluate` returned for the design.

    Returns
    -------
    dict of str to float
        Figure name to value, SI (temperatures in °C); NaN where the design has no such figure.
    """
    r = results
    out: dict[str, float] = {}
    for temperature_case in r.cases:
        out.update({f"{temperature_case.name}.{name}": float(value)
                    for name, value in _case_figures(temperature_case).items()})
    m = r.magnetics
    out.update({
        "magnetics.airgap_flux_density_T": m.airgap_flux_density_mean_T,
        "magnetics.magnet_field_A_per_m": m.magnet_field_A_per_m,
        "magnetics.permeance_coefficient": m.permeance_coefficient,
        "magnetics.housing_flux_density_T": m.housing_flux_density_T,
        "magnetics.tooth_flux_density_T": m.tooth_flux_density_T,
        "magnetics.core_flux_density_T": m.core_flux_density_T,
        "magnetics.worst_magnet_field_A_per_m": m.worst_magnet_field_A_per_m,
    })
    out.update(_group_figures("constants", r.constants, (
        "machine_constant", "ke_V_s_per_rad", "terminal_resistance_ohm", "inductance_H_estimate",
        "electrical_time_constant_s_estimate", "mechanical_time_constant_s", "rotor_inertia_kg_m2")))
    out.update(_group_figures("winding", r.winding, (
        "resistance_20C_ohm", "slot_fill_bare", "slot_fill_gross", "rated_current_density_A_per_m2")))
    out.update(_case_margins("demagnetization", r.demagnetization.cases, _DEMAGNETIZATION_KEYS))
    out["worst_demagnetization_margin_A_per_m"] = r.demagnetization.worst_margin_A_per_m
    if r.faults is not None:
        out.update(_case_margins("faults", r.faults.cases, _FAULT_KEYS))
        out["faults.worst_margin_A_per_m"] = r.faults.worst_margin_A_per_m
    out.update(_group_figures("thermal", r.thermal, (
        "winding_temperature_C", "housing_temperature_C", "magnet_temperature_C", "steady_winding_temperature_C",
        "losses_W", "time_to_limit_s")))
    if r.ratings is not None:
        out.update(_group_figures("ratings", r.ratings, (
            "continuous_torque_N_m", "continuous_current_A", "continuous_speed_rad_per_s",
            "continuous_output_power_W", "stall_current_A", "stall_time_cold_s", "stall_time_hot_s")))
    out["load_points.least_speed_share"] = _least_speed_share(results)
    ms = r.mass
    out.update({f"mass.{f.name}": getattr(ms, f.name) for f in dataclasses.fields(ms)})
    out["mass.active_kg"] = ms.magnet_kg + ms.copper_kg + ms.housing_kg + ms.lamination_kg
    co = r.cost
    out.update({"cost.magnet": co.magnet, "cost.copper": co.copper, "cost.housing": co.housing,
                "cost.lamination": co.lamination, "cost.total": co.total})
    if r.commutation is not None:
        out.update(_group_figures("commutation", r.commutation, (
            "brush_current_density_A_per_m2", "surface_speed_m_per_s", "reactance_voltage_V")))
    return {name: float(value) for name, value in out.items()}


def _least_speed_share(results: Results) -> float:
    """The least share of a further point's required speed reached over the cases (NaN without points)."""
    required = results.further_point_required_speeds_rad_per_s
    shares = [(speed / need if np.isfinite(speed) else 0.0) for case in results.cases
              for speed, need in zip(case.further_point_speeds_rad_per_s, required, strict=True) if need > 0]
    return min(shares) if shares else float("nan")


def check_status(results: Results) -> dict[str, int]:
    """Each check's verdict as a code (0 pass, 1 warning, 2 fail); a check the design lacks passes.

    Parameters
    ----------
    results : Results
        One design's results.

    Returns
    -------
    dict of str to int
        Check key (:data:`CHECK_KEYS`) to its code.
    """
    codes = dict.fromkeys(CHECK_KEYS, PASS_CODE)
    codes.update({c.key: _STATUS_CODE[c.status] for c in results.checks})
    return codes


__all__ = ["CHECK_KEYS", "FAIL_CODE", "PASS_CODE", "WARNING_CODE", "check_status", "screening_figures"]
