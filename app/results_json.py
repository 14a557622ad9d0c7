"""Results as plain JSON-ready data: every key carries its unit as a suffix.

The core's results are SI with the unit in each field name; this edge turns them into nested dicts.
Speeds leave the core in rad/s and are shown in rpm here, as engineers read them (``*_rad_per_s``
becomes ``*_rpm``). Array fields (curve tables, chart data) are left out; ``pmdc-sizer curves`` writes
those.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from pmdc_sizer.core.results import CaseResult, Results
from pmdc_sizer.core.units import from_si

_SPEED_SUFFIX = "_rad_per_s"


def _plain(value):
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        out = {}
        for f in dataclasses.fields(value):
            item = getattr(value, f.name)
            if isinstance(item, np.ndarray) or f.name in ("curve", "curves"):
                continue
            key, item = _rename(f.name, item)
            out[key] = _plain(item)
        return out
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, dict):
        return {k: _plain(v) for k, v in value.items()}
    if isinstance(value, (np.floating, float)):
        number = float(value)
        return number if math.isfinite(number) else None
    if isinstance(value, (np.integer,)):
        return int(value)
    if isinstance(value, np.bool_):
        return bool(value)
    return value


def _rename(name: str, value):
    if name.endswith(_SPEED_SUFFIX):
        if isinstance(value, tuple):  # one speed per further load point
            return name[: -len(_SPEED_SUFFIX)] + "_rpm", tuple(from_si(v, "rpm") for v in value)
        return name[: -len(_SPEED_SUFFIX)] + "_rpm", from_si(value, "rpm")
    if name == "speed_torque_gradient_rad_per_s_per_N_m":
        return "speed_torque_gradient_rpm_per_N_m", from_si(value, "rpm")
    return name, value


#: The figures a failed check makes unusable, by check key: the JSON marks them (``flagged_values``) so
#: a script reading, say, a slot fill of 1.6 is told the winding it describes does not fit.
FLAGGED_BY_CHECK = {
    "slot_fill": ("winding.slot_fill_bare", "winding.slot_fill_gross", "winding.resistance_20C_ohm",
                  "constants.terminal_resistance_ohm"),
    "demagnetization": ("magnetics.magnet_flux_density_T", "magnetics.magnet_field_A_per_m",
                        "demagnetization.worst_margin_A_per_m"),
    "housing_flux_density": ("magnetics.housing_flux_density_T", "magnetics.flux_per_pole_Wb"),
    "tooth_flux_density": ("magnetics.tooth_flux_density_T", "magnetics.flux_per_pole_Wb"),
    "core_flux_density": ("magnetics.core_flux_density_T", "magnetics.flux_per_pole_Wb"),
    "thermal": ("thermal.winding_temperature_C", "thermal.magnet_temperature_C"),
    "magnet_temperature": ("thermal.magnet_temperature_C",),
}


def flagged_values(data: dict, checks) -> list[dict]:
    """The figures of ``data`` that a failed check makes unusable, each with the check and its reason."""
    flagged: dict[str, dict] = {}
    for check in checks:
        if check.status != "fail":
            continue
        for key in FLAGGED_BY_CHECK.get(check.key, ()):
            node = data
            for part in key.split("."):
                node = node.get(part) if isinstance(node, dict) else None
            if node is not None and key not in flagged:
                flagged[key] = {"key": key, "value": node, "check": check.key, "reason": check.sentence}
    return list(flagged.values())


def case_json(case: CaseResult) -> dict:
    return _plain(case)


def results_json(results: Results) -> dict:
    """The evaluation as one JSON object (see README: "Reading the JSON").

    ``flagged_values`` lists every figure a failed check makes unusable (:data:`FLAGGED_BY_CHECK`), with
    the check's key and sentence, so no absurd figure leaves unmarked.
    """
    data = _plain(results)
    nominal = data.pop("nominal")
    cold = data.pop("cold")
    hot = data.pop("hot")
    data["performance"] = nominal
    data["cases"] = {"cold": cold, "nominal": nominal, "hot": hot}
    data["checks"] = [
        {"key": c.key, "title": c.title, "status": c.status, "message": c.message, "advice": c.advice}
        for c in results.checks
    ]
    data["warnings"] = results.warnings
    data["flagged_values"] = flagged_values(data, results.checks)
    return data
